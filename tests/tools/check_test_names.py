#!/usr/bin/env python3
"""Every CTest test is named <area>.<name> and has exactly one kind label.

usage: check_test_names.py CTEST BUILD_DIR

Reads the registered tests with `CTEST --show-only=json-v1` and fails (exit 1,
naming each offending test) when a name does not follow the scheme of
DEVELOPERS.md ("Tests") or when a test does not carry exactly one of the
labels unit, slow, firmware, browser.
"""
import json
import re
import subprocess
import sys

AREAS = ("fitter", "cli", "firmware", "report", "fuzz", "infra", "golden", "install", "crosscheck", "bench", "python")
KINDS = ("unit", "slow", "firmware", "browser")
NAME = re.compile(r"^(%s)(\.[a-z0-9_-]+)+$" % "|".join(AREAS))


def main(argv):
    ctest, build = argv
    listing = subprocess.run([ctest, "--test-dir", build, "--show-only=json-v1"], capture_output=True, text=True)
    if listing.returncode != 0:
        print(f"FAIL: ctest --show-only exited {listing.returncode}: {listing.stderr}")
        return 1
    tests = json.loads(listing.stdout)["tests"]
    problems = []
    for t in tests:
        name = t["name"]
        labels = []
        for p in t.get("properties", []):
            if p["name"] == "LABELS":
                labels = p["value"]
        if not NAME.match(name):
            problems.append(f"{name}: not <area>.<name> with area one of {', '.join(AREAS)}")
        kinds = [label for label in labels if label in KINDS]
        if len(kinds) != 1:
            problems.append(f"{name}: labels {labels}, need exactly one of {', '.join(KINDS)}")
    if len(tests) < 10:
        problems.append(f"only {len(tests)} tests registered")
    for p in problems:
        print(f"FAIL: {p}")
    counts = {k: sum(1 for t in tests for p in t.get("properties", []) if p["name"] == "LABELS" and k in p["value"])
              for k in KINDS}
    print(f"{len(tests)} tests; labels: " + ", ".join(f"{k} {n}" for k, n in counts.items()))
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
