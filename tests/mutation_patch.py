"""A patch file that marks the lines of named functions and classes as added, so that
``mutmut run --use-patch-file`` mutates only those (``make mutation MUTATION_ONLY=...``).

    python tests/mutation_patch.py out.patch workbook/valve.py:CounterbalanceValve,BackPressureValve \\
        workbook/checks.py:_level workbook/units.py

Each argument after the output file is ``path`` (the whole module) or ``path:name,name``
with top-level function or class names (a class brings all its methods, a function its
nested functions). ``NAME@key`` takes one element of a top-level tuple or list ``NAME``:
the element whose source holds the string literal ``key`` (``RULES@P-CAP-RATING``, the
entry of that rule in the rules table). Names follow the code, not line numbers, so a
selection survives a refactor that moves them; a name or key that no longer exists is an
error.

Not a test module (its name does not start with ``test_``); importing it runs nothing.
"""

from __future__ import annotations

import ast
import pathlib
import sys


def selected_lines(path: str, names: list[str]) -> list[int]:
    """1-based numbers of the lines of ``names`` in ``path`` (every line when ``names`` is empty)."""
    source = pathlib.Path(path).read_text(encoding="utf-8")
    n_lines = len(source.splitlines())
    if not names:
        return list(range(1, n_lines + 1))
    tree = ast.parse(source)
    found = {}
    elements = {}
    for node in tree.body:
        if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
            start = min([node.lineno] + [d.lineno for d in node.decorator_list])
            found[node.name] = range(start, node.end_lineno + 1)
        elif isinstance(node, (ast.Assign, ast.AnnAssign)):
            targets = node.targets if isinstance(node, ast.Assign) else [node.target]
            for t in targets:
                if isinstance(t, ast.Name):
                    found[t.id] = range(node.lineno, node.end_lineno + 1)
                    if isinstance(node.value, (ast.Tuple, ast.List)):
                        elements[t.id] = node.value.elts
    for n in names:
        table, at, key = n.partition("@")
        if at and table in elements:
            hits = [e for e in elements[table]
                    if any(isinstance(c, ast.Constant) and c.value == key for c in ast.walk(e))]
            if hits:
                found[n] = range(hits[0].lineno, hits[0].end_lineno + 1)
    missing = [n for n in names if n not in found]
    if missing:
        raise SystemExit(f"{path}: no top-level function, class or assignment named {', '.join(missing)}")
    return sorted({i for n in names for i in found[n]})


def patch_text(selections: list[str]) -> str:
    """A unified diff in which the selected lines are added (context lines around them none)."""
    out = []
    for sel in selections:
        path, _, names = sel.partition(":")
        lines = pathlib.Path(path).read_text(encoding="utf-8").splitlines()
        numbers = selected_lines(path, [n for n in names.split(",") if n])
        out += [f"diff -u {path} {path}", f"--- {path}", f"+++ {path}"]
        # one hunk per run of consecutive lines; each hunk adds its lines to an empty stretch
        runs, start, prev = [], None, None
        for i in numbers:
            if start is None or i != prev + 1:
                if start is not None:
                    runs.append((start, prev))
                start = i
            prev = i
        if start is not None:
            runs.append((start, prev))
        added_before = 0
        for a, b in runs:
            old_start = a - 1 - added_before
            out.append(f"@@ -{old_start},0 +{a},{b - a + 1} @@")
            out += ["+" + lines[i - 1] for i in range(a, b + 1)]
            added_before += b - a + 1
    return "\n".join(out) + "\n"


def main(argv) -> int:
    if len(argv) < 3:
        raise SystemExit(__doc__)
    pathlib.Path(argv[1]).write_text(patch_text(argv[2:]), encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
