#!/usr/bin/env python3
"""Fails on a module import cycle in a Rust crate.

Usage:
    python3 .ci/module_cycles.py CRATE_DIR [CRATE_DIR ...]
    python3 .ci/module_cycles.py --self-test

For each crate it reads every `.rs` file under `CRATE_DIR/src` (file modules
and inline `mod name { ... }` blocks), collects every path that starts with
`crate::`, `super::` or `self::` outside comments and string literals (in
`use` trees, braces included, and in expressions), and resolves it to the
deepest module it names. A reference from module `a::b::x` to module
`a::c::y` is an edge `b -> c` among the children of `a`: the modules that
share a parent must form a directed acyclic graph, at every level of the
tree. References to an ancestor or a descendant (a parent re-exporting its
child, a child using its parent's items) are not edges. Every cycle is
printed with the lines that make its edges; the exit status is 1 when there
is at least one, 0 otherwise, 2 on a usage error.

Python 3 standard library only; no network, no third-party packages.
"""

from __future__ import annotations

import os
import re
import sys
import tempfile
from collections import defaultdict

IDENT = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")


def strip(text: str) -> str:
    """Blanks comments, string and char literals, keeping line breaks."""
    out = []
    i, n = 0, len(text)
    while i < n:
        c = text[i]
        if text.startswith("//", i):
            j = text.find("\n", i)
            j = n if j < 0 else j
            out.append(" " * (j - i))
            i = j
        elif text.startswith("/*", i):
            depth, j = 1, i + 2
            while j < n and depth:
                if text.startswith("/*", j):
                    depth, j = depth + 1, j + 2
                elif text.startswith("*/", j):
                    depth, j = depth - 1, j + 2
                else:
                    j += 1
            out.append("".join(ch if ch == "\n" else " " for ch in text[i:j]))
            i = j
        elif c == "r" and re.match(r'r#*"', text[i:]) and (i == 0 or not (text[i - 1].isalnum() or text[i - 1] == "_")):
            m = re.match(r'r(#*)"', text[i:])
            end = '"' + m.group(1)
            j = text.find(end, i + len(m.group(0)))
            j = n if j < 0 else j + len(end)
            out.append("".join(ch if ch == "\n" else " " for ch in text[i:j]))
            i = j
        elif c == '"':
            j = i + 1
            while j < n and text[j] != '"':
                j += 2 if text[j] == "\\" else 1
            j = min(j + 1, n)
            out.append("".join(ch if ch == "\n" else " " for ch in text[i:j]))
            i = j
        elif c == "'":
            # A char literal ('a', '\n', '\u{..}') or a lifetime ('a).
            m = re.match(r"'(\\u\{[0-9a-fA-F]+\}|\\.|[^\\'])'", text[i:])
            if m:
                out.append(" " * len(m.group(0)))
                i += len(m.group(0))
            else:
                out.append(c)
                i += 1
        else:
            out.append(c)
            i += 1
    return "".join(out)


def file_module(src: str, path: str) -> tuple[str, ...]:
    rel = os.path.relpath(path, src)[: -len(".rs")].split(os.sep)
    if rel in (["lib"], ["main"]):
        return ()
    if rel[-1] == "mod":
        rel = rel[:-1]
    return tuple(rel)


def use_paths(tree: str) -> list[str]:
    """Expands a `use` tree (without `use` and `;`) into flat paths."""
    tree = re.sub(r"\s+", "", tree)
    out: list[str] = []

    def expand(prefix: str, s: str) -> None:
        depth, start, parts = 0, 0, []
        for k, ch in enumerate(s):
            if ch == "{":
                depth += 1
            elif ch == "}":
                depth -= 1
            elif ch == "," and depth == 0:
                parts.append(s[start:k])
                start = k + 1
        parts.append(s[start:])
        for p in parts:
            if not p:
                continue
            b = p.find("{")
            if b >= 0 and p.endswith("}"):
                expand(prefix + p[:b], p[b + 1 : -1])
            else:
                out.append(prefix + re.sub(r"as\w+$", "", p) if "::" in prefix + p else prefix + p)

    expand("", tree)
    return out


def references(text: str):
    """Yields (line, inline-module path, path string) for every relative path."""
    stack: list[tuple[str, int]] = []  # inline modules: (name, brace depth inside)
    depth = 0
    pending_mod = None
    line = 1
    i, n = 0, len(text)
    while i < n:
        c = text[i]
        if c == "\n":
            line += 1
            i += 1
            continue
        if c == "{":
            depth += 1
            if pending_mod is not None:
                stack.append((pending_mod, depth))
                pending_mod = None
            i += 1
            continue
        if c == "}":
            if stack and stack[-1][1] == depth:
                stack.pop()
            depth -= 1
            i += 1
            continue
        if c == ";":
            pending_mod = None
            i += 1
            continue
        m = IDENT.match(text, i)
        if not m or (i > 0 and (text[i - 1].isalnum() or text[i - 1] == "_")):
            i += 1
            continue
        word = m.group(0)
        inner = tuple(name for name, _ in stack)
        if word == "mod":
            nm = IDENT.match(text, m.end() + len(text[m.end():]) - len(text[m.end():].lstrip()))
            if nm:
                pending_mod = nm.group(0)
            i = m.end()
            continue
        if word == "use":
            j = text.find(";", m.end())
            j = n if j < 0 else j
            body = text[m.end() : j]
            for p in use_paths(body):
                p = p.lstrip(":")
                if p.split("::")[0] in ("crate", "super", "self"):
                    yield line, inner, p
            line += body.count("\n")
            i = j
            continue
        if word in ("crate", "super", "self") and text.startswith("::", m.end()):
            pm = re.match(r"(?:(?:crate|super|self)::)+(?:[A-Za-z_][A-Za-z0-9_]*::)*[A-Za-z_][A-Za-z0-9_]*", text[i:])
            if pm and not (i > 0 and text[i - 1] == "$"):
                yield line, inner, pm.group(0)
                i += len(pm.group(0))
                continue
        i = m.end()
    return


def resolve(here: tuple[str, ...], path: str, modules: set[tuple[str, ...]]):
    segs = path.split("::")
    cur: list[str]
    k = 0
    if segs[0] == "crate":
        cur, k = [], 1
    else:
        cur = list(here)
        while k < len(segs) and segs[k] in ("super", "self"):
            if segs[k] == "super":
                if not cur:
                    return None
                cur.pop()
            k += 1
    target = tuple(cur)
    for s in segs[k:]:
        if target + (s,) in modules:
            target = target + (s,)
        else:
            break
    return target


def crate_graph(crate: str):
    src = os.path.join(crate, "src")
    files = []
    for root, dirs, names in os.walk(src):
        dirs.sort()
        for name in sorted(names):
            if name.endswith(".rs"):
                files.append(os.path.join(root, name))
    modules: set[tuple[str, ...]] = {()}
    parsed = []
    for f in files:
        fm = file_module(src, f)
        for k in range(len(fm) + 1):
            modules.add(fm[:k])
        with open(f, encoding="utf-8") as fh:
            text = strip(fh.read())
        refs = list(references(text))
        parsed.append((f, fm, refs))
        for m in re.finditer(r"\bmod\s+([A-Za-z_][A-Za-z0-9_]*)\s*[{;]", text):
            modules.add(fm + (m.group(1),))
    # Inline modules nested deeper than one level.
    for f, fm, refs in parsed:
        for _, inner, _ in refs:
            for k in range(len(inner) + 1):
                modules.add(fm + inner[:k])
    edges: dict[tuple, dict[tuple[str, str], list[str]]] = defaultdict(lambda: defaultdict(list))
    for f, fm, refs in parsed:
        for line, inner, p in refs:
            here = fm + inner
            t = resolve(here, p, modules)
            if t is None:
                continue
            k = 0
            while k < len(here) and k < len(t) and here[k] == t[k]:
                k += 1
            if k == len(here) or k == len(t):
                continue  # ancestor or descendant (or itself)
            where = f"{os.path.relpath(f, crate)}:{line}"
            edges[t[:k]][(here[k], t[k])].append(where)
    return modules, edges


def cycles(edges: dict[tuple[str, str], list[str]]):
    """Strongly connected components with more than one node (Tarjan)."""
    graph: dict[str, set[str]] = defaultdict(set)
    for a, b in edges:
        graph[a].add(b)
        graph.setdefault(b, set())
    index: dict[str, int] = {}
    low: dict[str, int] = {}
    on: set[str] = set()
    stack: list[str] = []
    out = []
    counter = [0]

    def visit(v: str) -> None:
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on.add(v)
        for w in sorted(graph[v]):
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            comp = []
            while True:
                w = stack.pop()
                on.discard(w)
                comp.append(w)
                if w == v:
                    break
            if len(comp) > 1:
                out.append(sorted(comp))

    sys.setrecursionlimit(10000)
    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def check(crate: str, quiet: bool = False) -> int:
    modules, edges = crate_graph(crate)
    found = 0
    for parent in sorted(edges):
        for comp in cycles(edges[parent]):
            found += 1
            if quiet:
                continue
            name = "::".join(("crate",) + parent)
            print(f"{crate}: cycle among the children of {name}: {', '.join(comp)}")
            members = set(comp)
            for (a, b), where in sorted(edges[parent].items()):
                if a in members and b in members:
                    more = f" (+{len(where) - 1} more)" if len(where) > 1 else ""
                    print(f"  {a} -> {b}: {where[0]}{more}")
    n_edges = sum(len(e) for e in edges.values())
    if not quiet:
        print(f"{crate}: {len(modules)} modules, {n_edges} edges between sibling modules, {found} cycles")
    return found


def self_test() -> int:
    """A synthetic crate with a cycle must fail; the same crate without it must pass."""
    failures = 0
    with tempfile.TemporaryDirectory() as d:
        src = os.path.join(d, "src")
        os.makedirs(os.path.join(src, "model"))
        os.makedirs(os.path.join(src, "render"))

        def write(rel: str, text: str) -> None:
            with open(os.path.join(src, rel), "w", encoding="utf-8") as fh:
                fh.write(text)

        write("lib.rs", "pub mod model;\npub mod render;\n")
        write("model/mod.rs", "pub mod replay;\npub mod chart;\n")
        write("model/replay.rs", "use super::chart::Points;\n// use crate::render::text;\nconst S: &str = \"crate::render::x\";\n")
        write("model/chart.rs", "pub struct Points;\n")
        write("render/mod.rs", "use crate::{model::{replay, chart::Points}};\npub fn f() {}\n")
        if check(d, quiet=True) != 0:
            print("self-test: an acyclic crate (comments and strings naming other modules) was reported")
            failures += 1
        # A top-level cycle through an expression path.
        write("model/replay.rs", "use super::chart::Points;\npub fn g() { crate::render::f() }\n")
        if check(d, quiet=True) != 1:
            print("self-test: the cycle model <-> render was not reported")
            failures += 1
        # A nested cycle between siblings, through an inline module's `super::super`.
        write("model/replay.rs", "use super::chart::Points;\n")
        write("model/chart.rs", "pub struct Points;\nmod tests {\n    use super::super::replay;\n}\n")
        if check(d, quiet=True) != 1:
            print("self-test: the cycle replay <-> chart was not reported")
            failures += 1
    print("self-test: " + ("passed" if failures == 0 else f"{failures} failed"))
    return failures


def main(argv: list[str]) -> int:
    if argv == ["--self-test"]:
        return 1 if self_test() else 0
    if not argv or any(a.startswith("-") for a in argv):
        print("usage: module_cycles.py CRATE_DIR [CRATE_DIR ...] | --self-test", file=sys.stderr)
        return 2
    total = 0
    for crate in argv:
        if not os.path.isdir(os.path.join(crate, "src")):
            print(f"{crate}: no src folder", file=sys.stderr)
            return 2
        total += check(crate)
    print("module import cycles: " + ("none" if total == 0 else str(total)))
    return 1 if total else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
