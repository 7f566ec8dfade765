#!/usr/bin/env python3
"""Independent check of the record digest, with Python's hashlib and an own serialiser.

usage: check_record_digest.py RIDGECAL SAMPLES_DIR [--mutate NAME]

fitter/include/ridgecal/record.hpp: integrity.sha256 is the SHA-256 of the
record without its "integrity" member, serialised compactly with the keys
sorted. This script re-serialises the record file itself (numbers keep their
exact text from the file, strings are escaped as JSON requires with non-ASCII
characters kept as UTF-8, object keys sorted by their UTF-8 bytes, no spaces),
hashes it with hashlib and compares. Records: a 1-D fit whose sensor name and
units hold non-ASCII text, a quote and a backslash, and an extended
(pressure + temperature) fit.

Then the CLI must refuse tampered copies: one coefficient changed in its last
digit, and the sensor name changed, each given to `verify` and `export`: exit
2, the message that the record was modified after ridgecal wrote it, and no
output file.
The same tampered copy re-signed with the digest computed here must be
accepted (exit 0): so the digest here is the library's, not merely a hash.

Mutations (self-test: the check must fail with the named message):
  digest-digit  one hex digit of the stored digest is changed before comparing
  no-tamper     the "tampered" copy is written unchanged (the CLI then accepts it)
  ascii-escape  this script serialises non-ASCII as \\uXXXX (a wrong canonical form)
"""
import hashlib
import json
import os
import re
import sys

sys.dont_write_bytecode = True  # no __pycache__ in the source tree
from xcheck_common import Failures, require_numpy, run_check, run_cli, work_dir

require_numpy()  # not used for the digest; kept so all cross-checks need the same tools

MUTATIONS = {
    "digest-digit": "integrity.sha256 of",
    "no-tamper": "accepted the tampered",
    "ascii-escape": "integrity.sha256 of",
}
# verify and export word the refusal slightly differently (verify: "... was
# modified after 'ridgecal fit' wrote it", export: "... was modified after
# ridgecal wrote it"); both name the modification.
MODIFIED_MSG = re.compile(r"modified after '?ridgecal( fit)?'? wrote it")


class Num:
    """A JSON number kept as the text of the file."""

    def __init__(self, text):
        self.text = text


def load_raw(path):
    def pairs(kv):
        keys = [k for k, _ in kv]
        if len(keys) != len(set(keys)):
            raise RuntimeError(f"{path}: duplicate key in an object")
        return dict(kv)

    with open(path, encoding="utf-8") as f:
        return json.load(f, parse_float=Num, parse_int=Num, object_pairs_hook=pairs)


def esc(s, ascii_only):
    out = ['"']
    for ch in s:
        o = ord(ch)
        if ch == '"':
            out.append('\\"')
        elif ch == "\\":
            out.append("\\\\")
        elif ch in "\b\f\n\r\t":
            out.append({"\b": "\\b", "\f": "\\f", "\n": "\\n", "\r": "\\r", "\t": "\\t"}[ch])
        elif o < 0x20:
            out.append(f"\\u{o:04x}")
        elif o > 0x7E and ascii_only:
            out.append(f"\\u{o:04x}")
        else:
            out.append(ch)
    out.append('"')
    return "".join(out)


def canon(v, ascii_only=False):
    if isinstance(v, dict):
        items = sorted(v.items(), key=lambda kv: kv[0].encode("utf-8"))
        return "{" + ",".join(esc(k, ascii_only) + ":" + canon(x, ascii_only) for k, x in items) + "}"
    if isinstance(v, list):
        return "[" + ",".join(canon(x, ascii_only) for x in v) + "]"
    if isinstance(v, Num):
        return v.text
    if isinstance(v, str):
        return esc(v, ascii_only)
    if v is True:
        return "true"
    if v is False:
        return "false"
    if v is None:
        return "null"
    raise RuntimeError(f"unexpected JSON value {v!r}")


def digest(rec, ascii_only=False):
    body = {k: v for k, v in rec.items() if k != "integrity"}
    return hashlib.sha256(canon(body, ascii_only).encode("utf-8")).hexdigest()


def write_raw(rec, path):
    with open(path, "w", encoding="utf-8") as f:
        f.write(canon(rec))


def last_digit_changed(text):
    i = max(i for i, ch in enumerate(text) if ch.isdigit() and "e" not in text[i:].lower())
    return text[:i] + ("1" if text[i] != "1" else "2") + text[i + 1:]


def check(argv, mutation):
    ridgecal, samples = argv
    work = work_dir("digest")
    fails = Failures()
    ntc = f"{samples}/ntc-coldstore/ntc-coldstore.csv"
    pres = f"{samples}/pressure-tempco/pressure-tempco.csv"
    one_d, ext = f"{work}/ntc.json", f"{work}/pressure.json"
    run_cli([ridgecal, "fit", ntc, "--setpoint", "setpoint", "--sensor", "NTC \"cold\" store \\ ch2 \u00e9\u2103",
             "--reading-unit", "counts", "--reference-unit", "\u00b0C", "--tol-offset", "0.2",
             "--timestamp", "2026-01-02T03:04:05Z", "-o", one_d])
    run_cli([ridgecal, "fit", pres, "--setpoint", "setpoint", "--aux", "temperature", "--aux-setpoint", "chamber",
             "--timestamp", "none", "-o", ext])
    checked = 0
    for path in (one_d, ext):
        rec = load_raw(path)
        integ = rec.get("integrity", {})
        stored = integ.get("sha256", "")
        if mutation == "digest-digit":
            stored = stored[:10] + ("0" if stored[10] != "0" else "1") + stored[11:]
        mine = digest(rec, ascii_only=(mutation == "ascii-escape"))
        if integ.get("algorithm") != "sha256":
            fails.add(f"integrity.algorithm of {os.path.basename(path)}: {integ.get('algorithm')!r}, documented 'sha256'")
        if stored != mine:
            fails.add(f"integrity.sha256 of {os.path.basename(path)}: record {stored}, hashlib {mine}")
        checked += 1

    # Tampered copies of the 1-D record.
    rec = load_raw(one_d)
    coef = rec["model"]["chebyshev_coefficients"]
    tampers = []
    t1 = load_raw(one_d)
    t1["model"]["chebyshev_coefficients"][1] = Num(last_digit_changed(coef[1].text))
    tampers.append(("coefficient c1 " + coef[1].text + " -> " + t1["model"]["chebyshev_coefficients"][1].text, t1))
    t2 = load_raw(one_d)
    t2["sensor"]["name"] = t2["sensor"]["name"].replace("cold", "warm")
    tampers.append(("sensor name cold -> warm", t2))
    refused = 0
    for i, (what, t) in enumerate(tampers):
        if mutation == "no-tamper":
            t = load_raw(one_d)
        bad = f"{work}/tampered-{i}.json"
        write_raw(t, bad)
        for cmd in (["verify", bad, ntc, "-o", f"{work}/asfound-{i}.json"],
                    ["export", bad, "--prefix", "xck", "--numeric", "double", "-o", f"{work}/xck-{i}.h"]):
            out = cmd[cmd.index("-o") + 1]
            r = run_cli([ridgecal] + cmd, expect_rc=None)
            msg = r.stdout + r.stderr
            if r.returncode != 2 or not MODIFIED_MSG.search(msg):
                fails.add(f"{cmd[0]} accepted the tampered record ({what}) or refused it wrongly: exit "
                          f"{r.returncode}, expected 2 with /{MODIFIED_MSG.pattern}/; output: {msg.strip()[:300]}")
            elif os.path.exists(out):
                fails.add(f"{cmd[0]} refused the tampered record ({what}) but wrote {os.path.basename(out)}")
            else:
                refused += 1
        # Re-signed with the digest computed here: now ridgecal must accept it.
        t["integrity"] = {"algorithm": "sha256", "sha256": digest(t)}
        good = f"{work}/resigned-{i}.json"
        write_raw(t, good)
        for cmd in (["verify", good, ntc], ["export", good, "--prefix", "xck", "--numeric", "double",
                                             "--allow-unpassed", "-o", f"{work}/xck-ok-{i}.h"]):
            r = run_cli([ridgecal] + cmd, expect_rc=None)
            if r.returncode != 0:
                fails.add(f"integrity.sha256 of the re-signed copy ({what}): {cmd[0]} exit {r.returncode}, "
                          f"expected 0; output: {(r.stdout + r.stderr).strip()[:200]}")
    return fails, (f"{checked} records: hashlib digest equals integrity.sha256; {refused} of 4 refusals of tampered "
                   "copies (verify, export) with exit 2 and the message; re-signed copies accepted")


if __name__ == "__main__":
    sys.exit(run_check(check, MUTATIONS, sys.argv[1:]))
