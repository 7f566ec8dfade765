#!/usr/bin/env python3
"""Independent structural check of a report, with Python's own parsers.

    check_report.py [--render RENDERER RECORD.json] REPORT.html
    check_report.py --expect-fail [--expect-problem TEXT] REPORT.html

With --render, RENDERER (tests/report/render_record) first writes REPORT.html
from RECORD.json with a fixed date. Checks:
  * every <svg>...</svg> parses as XML (xml.etree);
  * the whole document nests properly (html.parser, void elements allowed);
  * no <script>, <iframe>, <img>, <link>, <object>, <embed>; no src/href
    attributes; no url() other than #fragment; no @import;
  * the report sections appear in reading order.
Exit 0 when all hold (or, with --expect-fail, when some check fails and,
with --expect-problem, one of the problems found contains TEXT).
"""
import html.parser
import re
import subprocess
import sys
import xml.etree.ElementTree as ET

VOID = {"meta", "br", "hr", "img", "input", "link", "col", "area", "base", "wbr", "source"}
FORBIDDEN_TAGS = {"script", "iframe", "img", "link", "object", "embed", "frame", "audio", "video", "base"}
ORDER = ['id="header"', 'id="verdict"', 'id="plots"', 'id="metrics"', 'id="warnings"', 'id="model"',
         'id="split"', 'id="cautions"', 'id="sign-off"']


class Nesting(html.parser.HTMLParser):
    def __init__(self):
        super().__init__(convert_charrefs=True)
        self.stack, self.problems = [], []

    def handle_starttag(self, tag, attrs):
        self._attrs(tag, attrs)
        if tag not in VOID:
            self.stack.append(tag)

    def handle_startendtag(self, tag, attrs):
        self._attrs(tag, attrs)

    def handle_endtag(self, tag):
        if not self.stack or self.stack[-1] != tag:
            self.problems.append(f"</{tag}> does not close <{self.stack[-1] if self.stack else 'nothing'}>"
                                 f" (line {self.getpos()[0]})")
        else:
            self.stack.pop()

    def _attrs(self, tag, attrs):
        if tag in FORBIDDEN_TAGS:
            self.problems.append(f"forbidden element <{tag}> (line {self.getpos()[0]})")
        for name, value in attrs:
            if name in ("src", "href", "xlink:href", "srcset", "action", "formaction", "data", "poster"):
                self.problems.append(f"resource attribute {name}={value!r} on <{tag}> (line {self.getpos()[0]})")
            if name.startswith("on"):
                self.problems.append(f"event handler {name} on <{tag}>")
            if value and re.search(r"url\(\s*[^#\s]", value):
                self.problems.append(f"external url() in {name} on <{tag}>")


def check(text):
    problems = []
    svgs = re.findall(r"<svg\b.*?</svg>", text, flags=re.S)
    for k, svg in enumerate(svgs):
        try:
            ET.fromstring(svg)
        except ET.ParseError as e:
            problems.append(f"svg #{k + 1} is not well-formed XML: {e}")
    p = Nesting()
    p.feed(text)
    p.close()
    problems += p.problems
    if p.stack:
        problems.append(f"unclosed elements at end: {p.stack}")
    for m in re.finditer(r"<style>(.*?)</style>", text, flags=re.S):
        if "@import" in m.group(1) or re.search(r"url\(\s*[^#\s]", m.group(1)):
            problems.append("stylesheet refers to an external resource")
    if re.search(r"<script", text, flags=re.I):
        problems.append("contains <script")
    pos = [text.find(marker) for marker in ORDER]
    if any(p_ < 0 for p_ in pos) or pos != sorted(pos):
        problems.append(f"sections missing or out of order: {dict(zip(ORDER, pos))}")
    return len(svgs), problems


def main(argv):
    expect_fail = False
    if argv and argv[0] == "--expect-fail":
        expect_fail, argv = True, argv[1:]
    expect_problem = None
    if expect_fail and argv and argv[0] == "--expect-problem":
        expect_problem, argv = argv[1], argv[2:]
    if argv and argv[0] == "--render":
        renderer, record, out = argv[1], argv[2], argv[3]
        subprocess.run([renderer, record, out, "--date", "2026-12-02 09:00 UTC"], check=True)
        argv = [out]
    if len(argv) != 1:
        print(__doc__)
        return 2
    with open(argv[0], encoding="utf-8") as fh:
        text = fh.read()
    n_svg, problems = check(text)
    for pr in problems:
        print("problem:", pr)
    if expect_fail:
        if expect_problem is not None and not any(expect_problem in pr for pr in problems):
            print(f"check_report: {argv[0]} was rejected, but not for the expected problem '{expect_problem}'")
            return 1
        if problems:
            print(f"check_report: {argv[0]} rejected as expected ({len(problems)} problems)")
            return 0
        print(f"check_report: {argv[0]} was expected to fail the checks but passed")
        return 1
    if problems:
        return 1
    print(f"check_report: {argv[0]} ok ({n_svg} svg elements parsed)")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
