#!/usr/bin/env python3
"""Fails on a Rust function longer than a limit (issue 11: none in the host
longer than about 120 lines).

Usage:
    python3 .ci/fn_length.py [--max N] [--top K] [--allow PATH:NAME:LINES ...] DIR [DIR ...]
    python3 .ci/fn_length.py --self-test

Every `.rs` file under each DIR is read with comments and string literals
blanked (the same scanner as `.ci/module_cycles.py`); each `fn` item with a
body is measured from the line of its `fn` keyword to the line of its
closing brace, both included (its attributes and doc comment are not
counted). A function inside another counts on its own and inside its
parent. Prints the K longest, and every function over the limit; the exit
status is 1 when there is one, 0 otherwise, 2 on a usage error. `--allow
PATH:NAME:LINES` lets the function NAME of file PATH be up to LINES long (a
known exception to split; it fails again if it grows).

Python 3 standard library only.
"""

from __future__ import annotations

import os
import re
import sys
import tempfile

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from module_cycles import strip  # noqa: E402

FN = re.compile(r"\bfn\s+([A-Za-z_][A-Za-z0-9_]*)")


def functions(text: str):
    """Yields (name, first line, last line) of every fn with a body."""
    s = strip(text)
    line_of = []
    line = 1
    for ch in s:
        line_of.append(line)
        if ch == "\n":
            line += 1
    for m in FN.finditer(s):
        # The body starts at the first `{` outside the signature's
        # parentheses and angle brackets; a `;` first means no body.
        i, depth = m.end(), 0
        while i < len(s):
            c = s[i]
            if c in "([":
                depth += 1
            elif c in ")]":
                depth -= 1
            elif depth == 0 and c == ";":
                i = -1
                break
            elif depth == 0 and c == "{":
                break
            i += 1
        if i < 0 or i >= len(s):
            continue
        j, braces = i, 0
        while j < len(s):
            if s[j] == "{":
                braces += 1
            elif s[j] == "}":
                braces -= 1
                if braces == 0:
                    break
            j += 1
        j = min(j, len(s) - 1)
        yield m.group(1), line_of[m.start()], line_of[j]


def measure(dirs):
    found = []
    for d in dirs:
        for root, _, files in os.walk(d):
            for f in sorted(files):
                if not f.endswith(".rs"):
                    continue
                path = os.path.join(root, f)
                with open(path, encoding="utf-8") as fh:
                    text = fh.read()
                for name, a, b in functions(text):
                    found.append((b - a + 1, path, a, name))
    found.sort(key=lambda t: (-t[0], t[1], t[2]))
    return found


def self_test() -> int:
    src = (
        "/// fn not_me() { }\n"
        "fn short() -> u8 { 1 }\n"
        "fn long(a: [u8; 2]) -> Vec<u8> {\n"
        "    let s = \"}\";\n"
        "    fn inner() {\n"
        "    }\n"
        "    vec![a[0]]\n"
        "}\n"
        "trait T { fn decl(&self); }\n"
    )
    with tempfile.TemporaryDirectory() as d:
        with open(os.path.join(d, "x.rs"), "w", encoding="utf-8") as fh:
            fh.write(src)
        got = {(name, line, line + n - 1) for n, _, line, name in measure([d])}
    want = {("short", 2, 2), ("long", 3, 8), ("inner", 5, 6)}
    if got != want:
        print(f"self-test failed: {sorted(got)} != {sorted(want)}")
        return 1
    print("self-test: ok")
    return 0


def main(argv) -> int:
    if argv == ["--self-test"]:
        return self_test()
    limit, top, dirs, allow = 120, 5, [], {}
    it = iter(argv)
    for a in it:
        if a == "--max":
            limit = int(next(it, "120"))
        elif a == "--top":
            top = int(next(it, "5"))
        elif a == "--allow":
            path, name, lines = next(it, "::0").rsplit(":", 2)
            allow[(path, name)] = int(lines)
        elif a.startswith("-"):
            print(__doc__)
            return 2
        else:
            dirs.append(a)
    if not dirs:
        print(__doc__)
        return 2
    found = measure(dirs)
    print(f"{len(found)} functions in {', '.join(dirs)}; the longest:")
    for n, path, line, name in found[:top]:
        print(f"  {n:4} lines  {path}:{line}  {name}")
    over = [f for f in found if f[0] > allow.get((f[1], f[3]), limit)]
    for (path, name), lines in sorted(allow.items()):
        print(f"  allowed: {path} {name} up to {lines} lines (a known exception)")
    for n, path, line, name in over:
        print(f"too long (over {limit} lines): {path}:{line} {name}: {n} lines")
    return 1 if over else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
