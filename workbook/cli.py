"""The command line: ``axisbook`` (or ``python -m workbook``) over the same library.

Subcommands::

    axisbook evaluate DESIGN.toml [--out DIR] [--axis AXIS ...] [--study KIND ...] [--markdown]
    axisbook export RECORD.json [--html FILE | --markdown FILE]
    axisbook compare OLD.json NEW.json [--rtol R] [--force]
    axisbook recheck RECORD.json [--rtol R] [--atol A]

Exit codes (the same for every subcommand):

* ``0``: all is well (no failing finding; records equal; nothing drifted);
* ``1``: a check did not pass (a finding is "fail"; the records differ; a result drifted);
* ``2``: bad input or usage (a wrong design file, a damaged record, a missing file, an
  unknown option). The message is one line on stderr, ``axisbook: error: ...``, naming the
  file, line and key where it can, and what is allowed; never a traceback;
* ``3``: an internal defect of the workbook (a result that is not finite, say), never
  blamed on the input: please report it.

>>> main(["evaluate", "no-such-design.toml"])
2
"""

from __future__ import annotations

import argparse
import os
import sys
import textwrap
from pathlib import Path

from . import CAUTION, __version__, safetext

PROG = "axisbook"
EXIT_OK, EXIT_CHECK, EXIT_INPUT, EXIT_DEFECT = 0, 1, 2, 3

EXIT_TEXT = """\
exit codes:
  0  all is well
  1  a check did not pass (a failing finding, records that differ, a drifted result)
  2  bad input or usage (the message names the file, line and key, and what is allowed)
  3  an internal defect of the workbook (please report it)"""

_DESCRIPTIONS = {
    "top": (
        "Design workbook for flow-controlled hydraulic cylinder axes, from the command line.\n\n"
        "Evaluate a design file into design records, export a record for review, compare two "
        "records, or re-check a saved record against the current library.\n\n" + CAUTION,
        "examples:\n"
        "  axisbook evaluate notebooks/designs/bin-tipper.toml --out records-out\n"
        "  axisbook compare old/bin-tipper-lift.json records-out/bin-tipper-lift.json\n\n" + EXIT_TEXT,
    ),
    "evaluate": (
        "Run the studies on every axis of a design file (TOML) and write one design record per "
        "axis, DIR/<design>-<axis>.json, with an HTML review copy beside it (and Markdown with "
        "--markdown). Prints the caution and a summary of the findings of each axis.\n\n"
        "The restrictor-sizing and speed-vs-load studies compare candidate restrictors; a "
        "candidate the design did not choose that misses its tolerance is a caution, never a "
        "failure, so the exit code speaks of the axis as drawn. --study axis-check runs the "
        "design rules alone.",
        "examples:\n"
        "  axisbook evaluate notebooks/designs/bin-tipper.toml\n"
        "  axisbook evaluate notebooks/designs/bin-tipper.toml --out build/records --axis lift --markdown\n"
        "  axisbook evaluate notebooks/designs/bin-tipper.toml --study axis-check\n\n"
        "exit codes: 0 no failing finding, 1 a failing finding, 2 bad input",
    ),
    "export": (
        "Write the review form of a saved design record: self-contained HTML (the default, "
        "beside the record with the suffix .html) or Markdown.",
        "examples:\n"
        "  axisbook export records-out/bin-tipper-lift.json\n"
        "  axisbook export records-out/bin-tipper-lift.json --markdown lift.md\n\n"
        "exit codes: 0 written, 2 bad input",
    ),
    "compare": (
        "List what moved from one record of an axis to another: identity, studies, inputs, "
        "results (with the relative change), finding levels, curves and notes.",
        "example:\n"
        "  axisbook compare old/bin-tipper-tip.json records-out/bin-tipper-tip.json\n\n"
        "Records of different machines or axes are refused (exit 2) unless --force.\n\n"
        "exit codes: 0 nothing moved, 1 something moved, 2 bad input",
    ),
    "recheck": (
        "Re-run every study of a saved record with the library as installed now, on the inputs "
        "the record holds, and list what drifted: results beyond the tolerance, findings whose "
        "level changed, results, findings or curves that appeared or vanished, and studies the "
        "library now refuses. A result drifts when |new - old| > max(rtol*|old|, atol); atol is "
        "in the result's display unit (bar, mm/s, kW, ...) and keeps round-off near zero quiet.",
        "example:\n"
        "  axisbook recheck records-out/bin-tipper-lift.json --rtol 1e-6\n\n"
        "exit codes: 0 nothing drifted, 1 drift, 2 bad input",
    ),
}


class _Parser(argparse.ArgumentParser):
    """argparse that prints ``axisbook: error: ...`` and exits 2, as every other input error."""

    def error(self, message):  # noqa: D401 - argparse API
        self.print_usage(sys.stderr)
        self.exit(EXIT_INPUT, f"{PROG}: error: {message}\n")


def _formatter(prog):
    return argparse.RawDescriptionHelpFormatter(prog, max_help_position=30, width=96)


def _wrap(text: str) -> str:
    return "\n\n".join(textwrap.fill(p, 90) for p in text.split("\n\n"))


def _tolerance(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"got {text!r}; allowed: a number of 0 or more, e.g. 1e-6") from None
    if not value >= 0 or value == float("inf"):
        raise argparse.ArgumentTypeError(f"got {text!r}; allowed: a finite number of 0 or more, e.g. 1e-6")
    return value


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of ``axisbook`` (its help texts carry examples)."""
    desc, epi = _DESCRIPTIONS["top"]
    parser = _Parser(prog=PROG, description=_wrap(desc), epilog=epi, formatter_class=_formatter)
    parser.add_argument("--version", action="version", version=f"{PROG} (workbook {__version__})")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)

    def add(name, help_):
        d, e = _DESCRIPTIONS[name]
        return sub.add_parser(name, help=help_, description=_wrap(d), epilog=e, formatter_class=_formatter)

    p = add("evaluate", "evaluate a design file into design records")
    p.add_argument("design", metavar="DESIGN.toml", help="the design file")
    p.add_argument("--out", metavar="DIR", default="records-out",
                   help="folder for the records and review copies (default: records-out)")
    p.add_argument("--axis", metavar="AXIS", nargs="+", action="extend", dest="axes",
                   help="evaluate only these axes (keys of [axes.<key>]; give DESIGN.toml first); "
                        "default: every axis")
    p.add_argument("--study", metavar="KIND", nargs="+", action="extend", dest="studies",
                   help="run only these studies (axis-check, restrictor-sizing, speed-vs-load, rod-pressure, "
                        "counterbalance, and machine-cycle for the design's [cycle]; give DESIGN.toml first); "
                        "default: all of them (the machine cycle only without --axis); axis-motion, the "
                        "stroke simulated in time, runs only when named here")
    p.add_argument("--markdown", action="store_true", help="also write a Markdown review copy of each record")
    p.set_defaults(run=_cmd_evaluate)

    p = add("export", "write the HTML or Markdown review form of a record")
    p.add_argument("record", metavar="RECORD.json", help="a saved design record")
    group = p.add_mutually_exclusive_group()
    group.add_argument("--html", metavar="FILE", help="write HTML here (default: beside the record, .html)")
    group.add_argument("--markdown", metavar="FILE", help="write Markdown here instead of HTML")
    p.set_defaults(run=_cmd_export)

    p = add("compare", "list what moved between two records of an axis")
    p.add_argument("old", metavar="OLD.json", help="the earlier record")
    p.add_argument("new", metavar="NEW.json", help="the later record")
    p.add_argument("--rtol", type=_tolerance, default=0.0, metavar="R",
                   help="results within this relative change count as unmoved (default: 0, any change)")
    p.add_argument("--force", action="store_true",
                   help="compare records of different machines or axes (refused otherwise)")
    p.set_defaults(run=_cmd_compare)

    p = add("recheck", "re-run a record's studies with the current library and list drift")
    p.add_argument("record", metavar="RECORD.json", help="a saved design record")
    p.add_argument("--rtol", type=_tolerance, default=1e-6, metavar="R",
                   help="relative tolerance (default: 1e-6)")
    p.add_argument("--atol", type=_tolerance, default=1e-9, metavar="A",
                   help="absolute floor in each result's display unit (default: 1e-9)")
    p.set_defaults(run=_cmd_recheck)
    return parser


def axis_summary(record, path: Path) -> list[str]:
    """Summary lines of one evaluated axis: the verdict (the same the panels and the review
    copy show: counts of distinct findings, then each fail and caution once, worded as the
    breach, with the studies that found it), then the record's notes."""
    from .record import record_verdict

    v = record_verdict(record)
    lines = [f"Axis {record.axis}: {v.headline()} -> {path}"]
    lines += ["  " + item.to_line() for item in v.items]
    lines += [f"  note: {n}" for n in record.notes[1:]]
    return lines


def _width() -> int:
    """The terminal's width when printing to one, else 80 columns (a file, a pipe, a CI log)."""
    import shutil

    try:
        if sys.stdout.isatty():
            return max(40, shutil.get_terminal_size((80, 24)).columns)
    except (AttributeError, ValueError, OSError):
        pass
    return 80


def wrap_lines(text: str, width: int | None = None) -> str:
    """``text`` with every line wrapped to ``width``; a continued line is indented under the
    start of its text (after a level word such as ``FAIL``), so the verdict reads as a list.

    >>> print(wrap_lines("  FAIL     Rod chamber pressure reaches 272.7 bar, above the 210 bar limit", 40))
      FAIL     Rod chamber pressure reaches
               272.7 bar, above the 210 bar
               limit
    """
    width = width or _width()
    out = []
    for line in text.split("\n"):
        if len(line) <= width:
            out.append(line)
            continue
        lead = len(line) - len(line.lstrip(" "))
        body = line[lead:]
        head = body.split(" ", 1)[0]
        hang = lead + (9 if head in ("FAIL", "CAUTION", "PASS", "NOT") else 2)
        out.append(textwrap.fill(line, width, subsequent_indent=" " * min(hang, width // 2),
                                 break_long_words=False, break_on_hyphens=False))
    return "\n".join(out)


def machine_summary(record, outcome, path: Path) -> list[str]:
    """Summary lines of the machine cycle: its verdict, the oil temperature and cooler, and
    the alternatives compared (:mod:`workbook.studies.machine_cycle`)."""
    from .record import record_verdict
    from .studies.machine_cycle import alternatives_text, best_alternative

    v = record_verdict(record)
    r = outcome.results
    lines = [f"Machine cycle: {v.headline()} -> {path}"]
    lines += ["  " + item.to_line() for item in v.items]
    lines.append(f"  oil {r['oil_temperature']['value']:.4g} degC steady (tank alone "
                 f"{r['oil_temperature_tank']['value']:.4g} degC); cooler needed {r['cooler_needed']['value']:.3g} kW "
                 f"or a tank of about {r['tank_needed']['value']:.4g} L; mean heat {r['mean_heat']['value']:.3g} kW, "
                 f"RMS shaft {r['rms_power']['value']:.3g} kW, peak {r['peak_power']['value']:.3g} kW")
    lines += ["  " + line for line in alternatives_text(outcome.alternatives)]
    best = best_alternative(outcome.alternatives)
    if best is not None:
        lines.append(f"  helps most: {best['key']} (mean heat {best['heat_kw']:.3g} kW, oil {best['oil_c']:.4g} degC)")
    return lines


# ---------------------------------------------------------------------------- commands
def _cmd_evaluate(args) -> int:
    from .design import load_design
    from .errors import InputError
    from .record import export_html, export_markdown, save
    from .record.store import folder_lock
    from .review import DEFAULT_STUDIES, evaluate_design, evaluate_machine
    from .studies import KINDS
    from .studies.machine_cycle import KIND as MACHINE_KIND

    design = load_design(args.design)
    kinds = tuple(dict.fromkeys(args.studies)) if args.studies else DEFAULT_STUDIES
    for kind in kinds:
        if kind not in KINDS and kind != MACHINE_KIND:
            raise InputError("--study", repr(kind), "one of " + ", ".join((*DEFAULT_STUDIES, MACHINE_KIND)))
    for key in args.axes or ():
        if key not in design.axes:
            raise InputError("--axis", repr(key), f"one of the axes of {design.source}: " + ", ".join(design.axes))
    # the machine cycle (every axis) runs when the design has one, unless --study leaves it out or
    # --axis picks axes without naming it in --study
    asked = bool(args.studies) and MACHINE_KIND in kinds
    with_machine = design.cycle is not None and (asked or (not args.studies and not args.axes))
    kinds = tuple(k for k in kinds if k != MACHINE_KIND)
    evaluated = evaluate_design(design, studies=kinds, axes=args.axes) if kinds or not with_machine else {}
    machine = evaluate_machine(design) if with_machine else None
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    stem = Path(args.design).stem
    lines = [CAUTION, "", f"Design {design.source}: {design.machine.get('machine', '')}, "
             f"revision {design.machine.get('revision', '')}; studies: {', '.join(kinds)}", ""]
    failing = []
    written_sets = {}
    with folder_lock(out):  # a concurrent evaluation into this folder waits: each set is from one run
        for axis_key, (record, _outcomes) in evaluated.items():
            path = _inside(out, f"{stem}-{axis_key}.json")
            save(record, path)
            export_html(record, _inside(out, path.with_suffix(".html").name))
            if args.markdown:
                export_markdown(record, _inside(out, path.with_suffix(".md").name))
            written_sets[axis_key] = path
        if machine is not None:  # "<design>.machine.json": an axis key holds no dot, so it never collides
            path = _inside(out, f"{stem}.machine.json")
            save(machine[0], path)
            from .studies.machine_cycle import review_record

            shown = review_record(machine[0])   # readable inputs in place of the record's JSON note
            export_html(shown, _inside(out, path.with_suffix(".html").name))
            if args.markdown:
                export_markdown(shown, _inside(out, path.with_suffix(".md").name))
            written_sets[None] = path
    for axis_key, (record, _outcomes) in evaluated.items():
        path = written_sets[axis_key]
        lines += axis_summary(record, path)
        lines.append("")
        if any(f["level"] == "fail" for f in record.findings()):
            failing.append(axis_key)
    if machine is not None:
        lines += machine_summary(*machine, written_sets[None])
        lines.append("")
        if any(f["level"] == "fail" for f in machine[0].findings()):
            failing.append("machine")
    written = "HTML" + (" and Markdown" if args.markdown else "")
    lines.append(f"Wrote {len(evaluated) + (machine is not None)} record(s) with {written} review copies to {out}.")
    if failing:
        lines.append(f"Result: FAIL on axis {', '.join(failing)} (exit code 1).")
    else:
        lines.append("Result: no failing finding (exit code 0). Cautions still need a look.")
    print(wrap_lines("\n".join(lines)))
    return EXIT_CHECK if failing else EXIT_OK


def _inside(folder: Path, name: str) -> Path:
    """``folder / name`` if that file lies directly in ``folder`` once both are resolved; refused otherwise."""
    from .errors import InputError

    target = folder / name
    if (Path(name).name != name or name in (".", "..")
            or os.path.realpath(target.parent) != os.path.realpath(folder)):
        raise InputError("--out", f"a file {name!r} that would land outside {folder}",
                         "records and review copies written inside the output folder only")
    return target


def _cmd_export(args) -> int:
    from .record import export_html, export_markdown, load

    record = load(args.record)
    target = Path(args.markdown or args.html or Path(args.record).with_suffix(".html"))
    target.parent.mkdir(parents=True, exist_ok=True)
    if args.markdown:
        path = export_markdown(record, args.markdown)
    else:
        path = export_html(record, args.html or Path(args.record).with_suffix(".html"))
    print(f"Wrote {path}")
    return EXIT_OK


def _cmd_compare(args) -> int:
    from .errors import InputError
    from .record import diff, load

    old, new = load(args.old), load(args.new)
    for key, what in (("machine", "machine"), ("axis", "axis")):
        a, b = old.identity.get(key, ""), new.identity.get(key, "")
        if a != b and not args.force:
            raise InputError(f"compare {args.new}", f"a record of {what} {b!r} against one of {what} {a!r} "
                             f"({args.old})", "two records of the same machine and axis (or --force to "
                             "compare them anyway)")
    d = diff(old, new, rtol=args.rtol)
    print(f"Compare {args.old} -> {args.new}")
    print(wrap_lines(d.to_text()))
    return EXIT_OK if d.is_empty else EXIT_CHECK


def _cmd_recheck(args) -> int:
    from .record import load
    from .review import recheck

    report = recheck(load(args.record), rtol=args.rtol, atol=args.atol)
    print(f"Record {args.record}")
    print(wrap_lines(report.to_text()))
    return EXIT_OK if report.ok else EXIT_CHECK


# ---------------------------------------------------------------------------- entry point
def _os_message(exc: OSError) -> str:
    where = exc.filename or ""
    what = exc.strerror or str(exc)
    return f"{where}: {what}" if where else what


class _Escaping:
    """A text stream that writes control, zero-width and bidirectional characters as escapes.

    Text from a design file or a record (a machine name, an axis key, a note) reaches the
    terminal through it, so an escape sequence in that text is shown, not obeyed.
    """

    def __init__(self, stream):
        self._stream = stream

    def write(self, text):
        return self._stream.write(safetext.printable(text, keep="\n\t"))

    def __getattr__(self, name):
        return getattr(self._stream, name)


def main(argv=None) -> int:
    """Run the command line with ``argv`` (default: ``sys.argv[1:]``); return the exit code.

    Everything printed goes through :class:`_Escaping`.
    """
    saved = sys.stdout, sys.stderr
    sys.stdout, sys.stderr = _Escaping(sys.stdout), _Escaping(sys.stderr)
    try:
        return _main(argv)
    finally:
        sys.stdout, sys.stderr = saved


def _main(argv=None) -> int:
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.reconfigure(errors="replace")
        except (AttributeError, ValueError):
            pass
    parser = build_parser()
    args = parser.parse_args(argv)
    if getattr(args, "run", None) is None:
        parser.print_help()
        return EXIT_INPUT
    from .errors import InputError, InternalDefect

    try:
        try:
            return args.run(args)
        finally:
            sys.stdout.flush()
    except BrokenPipeError:
        # the reader went away (`axisbook compare a b | head -1`): end quietly, as a filter does
        _quiet_stdout()
        return EXIT_OK
    except InputError as exc:  # includes DesignFileError and RecordError
        message = str(exc)
    except InternalDefect as exc:
        print(f"{PROG}: internal defect: {exc}", file=sys.stderr)
        return EXIT_DEFECT
    except OSError as exc:
        message = _os_message(exc)
    print(f"{PROG}: error: {message}", file=sys.stderr)
    return EXIT_INPUT


def _quiet_stdout() -> None:
    """Point stdout at the null device so the interpreter's final flush cannot fail again."""
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
        os.close(devnull)
    except (OSError, ValueError, AttributeError):
        pass


__all__ = ["main", "build_parser", "axis_summary", "machine_summary", "wrap_lines",
           "EXIT_OK", "EXIT_CHECK", "EXIT_INPUT", "EXIT_DEFECT"]
