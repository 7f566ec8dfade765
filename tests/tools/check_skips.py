#!/usr/bin/env python3
"""Fails when CTest skipped a test that the allow-list does not excuse.

usage: check_skips.py JUNIT.xml ALLOWED_SKIPS.txt

JUNIT.xml is CTest's --output-junit file. A test counts as skipped when its
status is anything but "run" or "fail": a SKIP_RETURN_CODE exit, a disabled
test, a missing executable or a failed fixture. (Failed tests are CTest's own
business: it already exits non-zero for them.) ALLOWED_SKIPS.txt holds lines
"NAME REASON"; '#' starts a comment. Exit 0 when every skipped test is listed
with a reason, 1 otherwise (each unexcused skip is printed with its output,
which names the missing tool), 2 on unreadable input.
"""
import sys
import xml.etree.ElementTree as ET


def read_allow_list(path):
    allowed, problems = {}, []
    with open(path, encoding="utf-8") as f:
        for number, line in enumerate(f, 1):
            line = line.split("#", 1)[0].strip()
            if not line:
                continue
            name, _, reason = line.partition(" ")
            if not reason.strip():
                problems.append(f"{path}:{number}: '{name}' has no reason; write 'NAME REASON'")
            allowed[name] = reason.strip()
    return allowed, problems


def main(argv):
    if len(argv) != 2:
        print("usage: check_skips.py JUNIT.xml ALLOWED_SKIPS.txt", file=sys.stderr)
        return 2
    try:
        suite = ET.parse(argv[0]).getroot()
        allowed, problems = read_allow_list(argv[1])
    except (OSError, ET.ParseError) as e:
        print(f"check_skips: {e}", file=sys.stderr)
        return 2
    cases = suite.findall(".//testcase")
    if not cases:
        problems.append(f"{argv[0]}: no test ran at all")
    skipped, excused = [], []
    for case in cases:
        status = case.get("status", "")
        if status in ("run", "fail"):
            continue
        name = case.get("name", "?")
        why = case.find("skipped")
        message = why.get("message", "") if why is not None else status
        output = (case.findtext("system-out") or "").strip()
        if allowed.get(name):
            excused.append(f"{name}: {allowed[name]}")
        else:
            skipped.append((name, message, output))
    for line in excused:
        print(f"check_skips: skipped, allowed by {argv[1]}: {line}")
    for name, message, output in skipped:
        print(f"check_skips: FAIL: test {name} did not run ({message}) and is not in {argv[1]}")
        for line in output.splitlines()[-10:]:
            print(f"    {line}")
    for p in problems:
        print(f"check_skips: FAIL: {p}")
    ran = sum(1 for c in cases if c.get("status") in ("run", "fail"))
    print(f"check_skips: {ran} tests ran, {len(skipped)} skipped without leave, {len(excused)} allowed skips")
    return 1 if skipped or problems else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
