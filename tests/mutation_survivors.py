"""Counts of a mutmut run and the surviving mutants not yet judged harmless.

Run in the directory of the run (``make mutation`` does)::

    python tests/mutation_survivors.py tests/mutation-equivalent.txt [workbook/checks.py ...]

It reads mutmut's cache (``.mutmut-cache``, SQLite), prints killed / survived / equivalent /
timeout / untested per module, and lists every survivor that no entry of the equivalents
file matches, with its line before and after the mutation. An entry of the equivalents file
is one line of four fields separated by `` || `` (Python has no ``||``, so no line of code holds it)::

    file || source line (stripped) || mutated line (stripped) || why no test can or need tell it apart

Lines that start with ``#`` and blank lines are comments. An entry matches a survivor of
that file whose line, before and after the mutation, is the same text with its white space
removed; so an entry keeps matching when the line moves. A field that starts or ends with
``*`` is a pattern
(:func:`fnmatch.fnmatchcase`, ``*`` any text, ``?`` one character) matched against the
stripped line with its spaces kept, for a kind of mutant, e.g. prose wrapped in ``XX``; keep
patterns narrow. Give the module paths to count only those (default: every module in the cache).

Not a test module (its name does not start with ``test_``); importing it runs nothing.
"""

from __future__ import annotations

import collections
import fnmatch
import pathlib
import sqlite3
import sys

#: mutmut's status words; "ok_suspicious" is a mutant the tests killed, slowly (a loaded machine)
STATUS = {"ok_killed": "killed", "bad_survived": "survived", "bad_timeout": "timeout",
          "ok_suspicious": "killed", "untested": "untested", "skipped": "skipped"}


def _squash(text: str) -> str:
    return "".join(text.split())


def read_equivalents(path) -> dict:
    """``{(file, squashed source line, squashed mutated line): why}`` of the equivalents file."""
    out = {}
    for n, raw in enumerate(pathlib.Path(path).read_text(encoding="utf-8").splitlines(), 1):
        if not raw.strip() or raw.lstrip().startswith("#"):
            continue
        parts = [p.strip() for p in raw.split(" || ")]
        if len(parts) != 4 or not parts[3]:
            raise SystemExit(f"{path}:{n}: an entry needs four fields 'file || line || mutated || why'")
        if _is_pattern(parts[1]) or _is_pattern(parts[2]):
            out[(parts[0], parts[1], parts[2])] = parts[3]          # a pattern: spaces kept
        else:
            out[(parts[0], _squash(parts[1]), _squash(parts[2]))] = parts[3]
    return out


def _is_pattern(field: str) -> bool:
    return field.startswith("*") or field.endswith("*")


def _match(equivalents: dict, filename: str, before: str, after: str):
    """The key of the entry that explains this survivor (lines stripped, spaces kept), or None.

    >>> eq = {("a.py", "x=1", "x=2"): "why", ("a.py", "*", '*"XX* *XX"*'): "wording"}
    >>> _match(eq, "a.py", "x = 1", "x = 2"), _match(eq, "a.py", 'f"a {b}"', 'f"XXa {b}XX"')
    (('a.py', 'x=1', 'x=2'), ('a.py', '*', '*"XX* *XX"*'))
    >>> _match(eq, "a.py", 'k = "max"', 'k = "XXmaxXX"') is None
    True
    """
    key = (filename, _squash(before), _squash(after))
    if key in equivalents:
        return key
    for k in equivalents:
        if k[0] == filename and (_is_pattern(k[1]) or _is_pattern(k[2])) and fnmatch.fnmatchcase(before, k[1]) \
                and fnmatch.fnmatchcase(after, k[2]):
            return k
    return None


def mutated_line(filename: str, line: str, line_number: int, index: int) -> str:
    """The text of ``line`` after mutant ``index`` of it (mutmut's own mutation)."""
    from mutmut import Context, RelativeMutationID, mutate

    source = pathlib.Path(filename).read_text(encoding="utf-8")
    lines = source.split("\n")
    if not (0 <= line_number < len(lines) and lines[line_number] == line):
        # the file changed since mutmut numbered its lines: the nearest line of the same text
        same = [i for i, text in enumerate(lines) if text == line]
        if not same:
            return "?"
        line_number = min(same, key=lambda i: abs(i - line_number))
    ctx = Context(source=source, filename=filename,
                  mutation_id=RelativeMutationID(line=line, index=index, line_number=line_number))
    new, n = mutate(ctx)
    if not n:
        return "?"
    new_lines = new.split("\n")
    if len(new_lines) < len(source.split("\n")):
        return "<line removed>"                     # a decorator taken away
    return new_lines[line_number] if line_number < len(new_lines) else "?"


def main(argv) -> int:
    equivalents = read_equivalents(argv[1]) if len(argv) > 1 else {}
    only = set(argv[2:])
    from mutmut.cache import hash_of_tests

    current = hash_of_tests(["tests"])
    db = sqlite3.connect(".mutmut-cache")
    rows = db.execute("SELECT s.filename, l.line, l.line_number, m.\"index\", m.status, m.tested_against_hash "
                      "FROM Mutant m JOIN Line l ON m.line = l.id JOIN SourceFile s ON l.sourcefile = s.id "
                      "ORDER BY s.filename, l.line_number, m.\"index\"").fetchall()
    counts: dict = collections.defaultdict(collections.Counter)
    new = []
    used = set()
    tried = set()                    # (file, squashed line) of every line mutated in this run
    for filename, line, line_number, index, status, tested in rows:
        if only and filename not in only:
            continue
        tried.add((filename, _squash(line)))
        word = STATUS.get(status, status)
        if word == "survived" and tested != current:
            # a survivor of an earlier run that this run did not try again: mutmut 2 keeps a
            # stale row for a line whose text occurs more than once in the file; not counted
            continue
        if word == "survived":
            after = mutated_line(filename, line, line_number, index)
            key = _match(equivalents, filename, line.strip(), after.strip())
            if key is not None:
                used.add(key)
                word = "equivalent"
            else:
                new.append((filename, line_number + 1, line.strip(), after.strip()))
        counts[filename][word] += 1
    total: collections.Counter = collections.Counter()
    print(f"{'module':<32} {'killed':>7} {'survived':>9} {'equivalent':>11} {'timeout':>8} {'untested':>9}")
    for filename, c in counts.items():
        total.update(c)
        print(f"{filename:<32} {c['killed']:>7} {c['survived']:>9} {c['equivalent']:>11} "
              f"{c['timeout']:>8} {c['untested']:>9}")
    print(f"{'total':<32} {total['killed']:>7} {total['survived']:>9} "
          f"{total['equivalent']:>11} {total['timeout']:>8} {total['untested']:>9}")
    if new:
        print(f"\n{len(new)} surviving mutant(s) not in the equivalents file:")
        for filename, n, before, after in new:
            print(f"{filename}:{n}\n    - {before}\n    + {after}")
    stale = [(k, why) for k in equivalents if k not in used and k[0] in counts
             and (why := _stale_why(k, tried)) is not None]
    if stale:
        print(f"\n{len(stale)} entr(y/ies) of the equivalents file matched no survivor this run: "
              "check and remove them")
        for (filename, before, after), why in stale:
            print(f"{filename} || {before} || {after}  ({why})")
    return 2 if new else 0


def _stale_why(key, tried) -> str | None:
    """Why an entry that matched no survivor is stale, or None when this run did not mutate its
    line (a ``MUTATION_ONLY`` selection) or it is a pattern (a kind of mutant that may not occur)."""
    filename, before, _after = key
    if _is_pattern(before) or _is_pattern(_after):
        return None
    if (filename, before) in tried:
        return "its line was mutated and no mutant survived: killed now"
    source = {_squash(t) for t in pathlib.Path(filename).read_text(encoding="utf-8").splitlines()} \
        if pathlib.Path(filename).is_file() else set()
    return None if before in source else "its line is no longer in the file"


if __name__ == "__main__":
    sys.exit(main(sys.argv))
