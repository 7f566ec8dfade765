#!/usr/bin/env python3
"""Lists or flips the constants a generated header's self-check covers.

  flip_constant.py list HEADER          one line per constant: NAME or NAME[i]
  flip_constant.py uncovered HEADER     numeric macros and tables NOT covered
                                        (prints nothing when the list is complete)
  flip_constant.py flip HEADER ITEM     the header with ITEM changed, on stdout

The covered list is the one the header states above PREFIX_TABLE_CRC32
("... in this order NAME, NAME[0..n], ...; see prefix_table_crc32()").
A flip changes the value of one constant and nothing else: an integer literal
gets its last digit's lowest bit toggled (value +-1, never an overflow), a
floating literal its first significant digit (a change far beyond rounding).
"""
import re
import sys

# Macros that are not constants of the evaluation: codes, versions, flags.
NOT_EVALUATION = re.compile(
    r"_(FORMAT_VERSION|NUMERIC_\w+|TABLE_CRC32|TABLE_OK|TABLE_CORRUPT|TABLE_UNCHECKABLE|"
    r"IN_RANGE|BELOW_RANGE|ABOVE_RANGE|NOT_A_NUMBER|AUX_BELOW_RANGE|AUX_ABOVE_RANGE|"
    r"AUX_NOT_A_NUMBER|VERDICT\w*|EXTENDED_MODEL|HAS_AUX|RECORD_SHA256|CALIBRATION_DATE)$")


def covered(text):
    m = re.search(r"in this order\s+(.*?);\s+see \w+_table_crc32", text, re.S)
    if not m:
        sys.exit("no covered-constant list above the TABLE_CRC32 macro")
    items = []
    for name in re.split(r",\s*", " ".join(m.group(1).split())):
        t = re.fullmatch(r"(\w+)\[0\.\.(\d+)\]", name)
        if t:
            items += [f"{t.group(1)}[{i}]" for i in range(int(t.group(2)) + 1)]
        else:
            items.append(name)
    return items


def numeric_macros(text):
    return [m.group(1) for m in re.finditer(r"^#define (\w+) [-(]*\(?(?:\(\w+\))?-?[0-9]", text, re.M)]


def tables(text):
    return re.findall(r"^static const \w+ (\w+)\[", text, re.M)


def flip_token(body, mask=None):
    """Flips the last number of `body`; `mask` (same length, comments blanked)
    says where the numbers are when body has comments."""
    toks = list(re.finditer(r"[0-9][0-9.]*(?:[eE][-+]?[0-9]+)?", mask if mask is not None else body))
    if not toks:
        sys.exit(f"no number in {body!r}")
    tok = toks[-1]
    s = tok.group(0)
    if "." in s or "e" in s.lower():
        # the first significant digit; 0.0 (no such digit) becomes 1.0
        i = next((k for k, ch in enumerate(s) if ch in "123456789"), 0)
        if s[i] == "0":
            return body[:tok.start()] + "1" + s[1:] + body[tok.end():]
    else:
        i = len(s) - 1
    flipped = s[:i] + chr(ord(s[i]) ^ 1) + s[i + 1:]
    return body[:tok.start()] + flipped + body[tok.end():]


def flip(text, item):
    t = re.fullmatch(r"(\w+)\[(\d+)\]", item)
    if t:
        name, idx = t.group(1), int(t.group(2))
        m = re.search(r"static const \w+ " + name + r"\[[^\]]*\] = \{(.*?)\};", text, re.S)
        if not m:
            sys.exit(f"no table {name}")
        body = m.group(1)
        # entries: split at commas outside comments
        clean = re.sub(r"/\*.*?\*/", lambda c: " " * len(c.group(0)), body, flags=re.S)
        starts, depth = [0], 0
        for k, ch in enumerate(clean):
            if ch == "(":
                depth += 1
            elif ch == ")":
                depth -= 1
            elif ch == "," and depth == 0:
                starts.append(k + 1)
        if idx >= len(starts):
            sys.exit(f"{item}: the table has {len(starts)} entries")
        a = starts[idx]
        b = starts[idx + 1] - 1 if idx + 1 < len(starts) else len(body)
        new_body = body[:a] + flip_token(body[a:b], clean[a:b]) + body[b:]
        return text[:m.start(1)] + new_body + text[m.end(1):]
    m = re.search(r"^#define " + item + r" (.*)$", text, re.M)
    if not m:
        sys.exit(f"no macro {item}")
    body = m.group(1)
    mask = re.sub(r"/\*.*?\*/", lambda c: " " * len(c.group(0)), body)
    return text[:m.start(1)] + flip_token(body, mask) + text[m.end(1):]


def main():
    cmd, path = sys.argv[1], sys.argv[2]
    text = open(path).read()
    if cmd == "list":
        print("\n".join(covered(text)))
    elif cmd == "uncovered":
        names = {re.sub(r"\[\d+\]$", "", c) for c in covered(text)}
        for n in numeric_macros(text) + tables(text):
            if n not in names and not NOT_EVALUATION.search(n):
                print(n)
    elif cmd == "flip":
        out = flip(text, sys.argv[3])
        if out == text:
            sys.exit(f"flipping {sys.argv[3]} changed nothing")
        sys.stdout.write(out)
    else:
        sys.exit(__doc__)


if __name__ == "__main__":
    main()
