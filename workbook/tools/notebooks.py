"""Create and refresh the study notebooks.

``python -m workbook.tools.notebooks refresh notebooks`` brings the cells of every study notebook
back to its template (when the template changed), executes it with
the library as it is now (nbclient), keeps the text outputs that nbval compares, keeps the
panel's static snapshot (its verdict, results, findings and SVG figures as HTML, so the saved
notebook reads as a design record without a kernel), drops the widget's own output (its
model id changes on every run) and the saved widget state, and writes the notebooks back,
small and free of absolute paths.

Creating rewrites a notebook whose cells no longer follow the template (``create --force``).

``python -m workbook.tools.notebooks create notebooks`` writes a study notebook from the
template of each study in :data:`STUDIES` when it does not exist yet.
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
from pathlib import Path

from .. import CAUTION

#: file name -> (study kind, axis of the demo design, title, purpose, what to look at)
STUDIES = {
    "1-restrictor-sizing.ipynb": (
        "restrictor-sizing", "lift", "Restrictor sizing",
        "Size a sharp orifice, a long throttle and a needle throttle for the lowering flow of the "
        "lift axis, round the orifice to a drill, and see how each candidate holds its flow as the "
        "pressure drop and the oil temperature change.",
        "The orifice and the needle keep their flow from cold to warm oil; the long throttle follows the "
        "viscosity while it is laminar. Where it runs into the transition band (shaded in the figures, "
        "Re 2300 to 4000) its flow rises, peaks and falls with temperature and is uncertain: make it longer "
        "or give it a lower drop. A candidate that cannot be sized for the duty is marked \"not possible "
        "here\" with the reason; the others still answer.",
        'panel.set("study.target_flow", "9 L/min")',
    ),
    "2-speed-against-load.ipynb": (
        "speed-vs-load", "lift", "Load sensitivity of speed",
        "Speed of the controlled motion against load for an orifice, a long throttle and a "
        "pressure-compensated valve, in the chosen metering arrangement; pump pressure and losses "
        "against load; and the speed variation over the load range as one figure of merit.",
        "Dotted stretches of a curve are points where the valve is not simply metering (starved "
        "compensator, relief bypassing, stall, runaway): hover for the regime of each point.",
        'panel.set("flow_valve.arrangement", "meter-out")',
    ),
    "3-rod-side-pressure.ipynb": (
        "rod-pressure", "tip", "Rod-side pressure check",
        "Every operating case of the tip axis in both directions, including the flow valve fully "
        "closed and the overrunning load, with chamber pressures against load, the ratings drawn, "
        "margins, and what to change when a case fails.",
        "With the meter-out valve closed the rod side sees supply pressure times the area ratio, "
        "plus a pulling load over the annulus: check it against the cylinder, hose and valve ratings.",
        'panel.set("cylinder.rod", "40 mm")',
    ),
    "4-counterbalance-setting.ipynb": (
        "counterbalance", "lift", "Counterbalance setting",
        "The counterbalance setting of the lift axis from its load cases, pilot ratios side by side "
        "(pilot pressure to lower, pump pressure, heat), the same duty with a back-pressure valve in "
        "series, and the ratings check of the chosen setting.",
        "A low pilot ratio is steadier with an unstable load; a high ratio wastes less energy. The "
        "back-pressure valve costs its setting times the flow as heat all the time.",
        'panel.set("holding.setting", "35 bar")',
    ),
    "5-axis-in-motion.ipynb": (
        "axis-motion", "tip", "The axis in motion",
        "One full stroke out and back of the tip axis simulated in time on the same valve laws as the "
        "steady studies: position and speed, chamber and pump-line pressures against the ratings, the "
        "counterbalance pilot, end-stop impact, ramps against the natural frequency, and the lowering "
        "over the pilot ratios.",
        "Peaks at the start, stop and reversal of a move and dips towards cavitation while decelerating "
        "are what the steady studies cannot show. The lift axis takes about 20 s to simulate (its lowering "
        "hunts); the tip about 1 s.",
        'panel.set("motion.ramp_open", "200 ms")',
    ),
    "6-machine-cycle.ipynb": (
        "machine-cycle", None, "Machine cycle and heat",
        "The bin tipper's cycle over both axes on the one power unit (lift the full bin, tip, tip back, "
        "lower, wait for the next bin): energy and heat of every step by where it arises, the RMS and peak "
        "shaft power against the motor, the oil temperature the tank settles at, the cooler or tank that "
        "would hold 60 degC, and the changes an engineer weighs, side by side on the same cycle.",
        "The timeline shades each step by its axis; dwells and the idle rest of the period are unshaded. "
        "A fixed pump with a flow valve runs at its relief pressure while it meters, so most of its "
        "power becomes heat; the alternatives table shows which change cuts that most.",
        'panel.controls["cooler_duty"].submit("6 kW")',
    ),
}

DESIGN = "designs/bin-tipper.toml"


#: the nbval tag of the panel cell (widget model ids change on every run)
IGNORE_TAG = "nbval-ignore-output"


#: the cell that loads BokehJS, on its own before any widget exists
BOKEHJS_SOURCE = (
    "# BokehJS from the installed bokeh package (no CDN: the figures work offline), in a cell of\n"
    "# its own so that its large script is in the page before the panel's widgets arrive\n"
    "from workbook.ui.panel import load_bokehjs\n\n"
    "load_bokehjs()")


def _bokehjs_cell():
    import nbformat.v4 as nbf

    cell = nbf.new_code_cell(BOKEHJS_SOURCE)
    cell.metadata["tags"] = [IGNORE_TAG]   # its output is the script itself: nothing to compare
    return cell


def _sentence(text: str) -> str:
    """``text`` starting with a capital letter."""
    return text[:1].upper() + text[1:]


def _cells(kind, axis, title, purpose, hint, try_line):
    import nbformat.v4 as nbf

    if kind == "machine-cycle":
        return _machine_cells(title, purpose, hint, try_line)

    panel = nbf.new_code_cell(
        "from workbook.ui import open_study\n\n"
        f'panel = open_study("{kind}", "{DESIGN}", axis="{axis}")\n'
        "panel.show()")
    panel.metadata["tags"] = [IGNORE_TAG]
    return [
        nbf.new_markdown_cell(
            f"# {title}\n\n{purpose}\n\n> **Caution.** {_sentence(CAUTION.removeprefix('Caution: '))}\n\n"
            f"Design: `{DESIGN}`, axis `{axis}` (an invented bin tipper). The panel opens on the design "
            "file's values and shows, at the top, the verdict of the whole axis (every study of the axis, "
            "the same findings as `axisbook evaluate`). Type values with units (\"80 mm\", \"3.15 in\", "
            "\"160 bar\", \"2300 psi\"); a refused entry is explained beside its field and the last valid "
            "results stay, marked out of date. **Record study** re-runs every study on the panel's inputs, "
            "writes the axis record and writes the changed inputs into the design file; **Export HTML** "
            "writes the record's review copy."),
        _bokehjs_cell(),
        panel,
        nbf.new_markdown_cell(
            f"{hint}\n\nTo change an input from code, add a cell such as `{try_line}`: the panel above "
            "follows it, and **Record study** writes it into the design file. The cells of this notebook "
            "never change the design."),
        nbf.new_markdown_cell("## Summary\n\nThe whole axis's verdict, then this study's inputs, results and "
                              "findings as plain text; nbval compares this output on every test run."),
        nbf.new_code_cell("print(panel.summary())"),
    ]


def _machine_cells(title, purpose, hint, try_line):
    """The machine study's notebook: the panel on the design's [cycle] (every axis), its summary."""
    import nbformat.v4 as nbf

    panel = nbf.new_code_cell(
        "from workbook.ui.machine_panel import open_machine\n\n"
        f'panel = open_machine("{DESIGN}")\n'
        "panel.show()")
    panel.metadata["tags"] = [IGNORE_TAG]
    return [
        nbf.new_markdown_cell(
            f"# {title}\n\n{purpose}\n\n> **Caution.** {_sentence(CAUTION.removeprefix('Caution: '))}\n\n"
            f"Design: `{DESIGN}`, its `[cycle]` table and both axes (an invented bin tipper). The panel opens "
            "on the design file and shows, at the top, the machine's verdict (the same findings as "
            "`axisbook evaluate`). Its entries are the cycle's own inputs (tank, cooling, idle state, cycles "
            "per hour); change an axis in its own study. **Record machine** writes the machine record and its "
            "review copy beside the axis records."),
        _bokehjs_cell(),
        panel,
        nbf.new_markdown_cell(
            f"{hint}\n\nTo try a value from code, add a cell such as `{try_line}`: the panel above follows "
            "it. The cells of this notebook never change the design."),
        nbf.new_markdown_cell("## Summary\n\nThe machine's verdict, the cycle, results, findings and the "
                              "alternatives as plain text; nbval compares this output on every test run."),
        nbf.new_code_cell("print(panel.summary())"),
    ]


def create(folder: Path, force: bool = False) -> list[Path]:
    """Write the notebook of every study in :data:`STUDIES` that has none (all with ``force``)."""
    import nbformat

    written = []
    for name, spec in STUDIES.items():
        path = folder / name
        if path.exists() and not force:
            continue
        nb = nbformat.v4.new_notebook()
        nb.cells = _cells(*spec)
        nb.metadata["kernelspec"] = {"name": "python3", "display_name": "Python 3", "language": "python"}
        nb.metadata["language_info"] = {"name": "python"}
        nbformat.write(nb, path)
        written.append(path)
    return written


def nbformat_output(page: str):
    """A display output holding only the snapshot's HTML (no metadata, no transient id)."""
    import nbformat.v4 as nbf

    return nbf.new_output("display_data", data={"text/html": page})


def _strip(nb) -> None:
    nb.metadata.pop("widgets", None)
    nb.metadata["language_info"] = {"name": "python"}
    for cell in nb.cells:
        if cell.cell_type != "code":
            continue
        cell.metadata.pop("execution", None)
        if IGNORE_TAG in cell.metadata.get("tags", ()):
            # the widget's own output (its model id changes every run) goes; the panel's static
            # snapshot stays, so the saved notebook reads as a design record without a kernel
            kept = []
            for o in cell.outputs:
                page = o.get("data", {}).get("text/html", "")
                page = "".join(page) if isinstance(page, list) else page
                if o.get("output_type") in ("display_data", "execute_result") and "wb-snapshot" in page:
                    kept.append(nbformat_output(page))
            cell.outputs = kept
        else:
            cell.outputs = [o for o in cell.outputs if o.get("output_type") == "stream"
                            or "text/plain" in o.get("data", {})]
            for o in cell.outputs:
                if "data" in o:
                    o["data"] = {"text/plain": o["data"]["text/plain"]}
                o.pop("metadata", None) if o.get("output_type") == "stream" else None


def _sources(cells) -> list:
    """What a cell of the template fixes: its type, source and tags."""
    return [(c.cell_type, "".join(c.source), tuple(c.get("metadata", {}).get("tags", ()))) for c in cells]


def refresh(folder: Path) -> list[Path]:
    """Execute and strip every study notebook in ``folder``."""
    import nbformat
    from nbclient import NotebookClient

    done = []
    with tempfile.TemporaryDirectory() as records:
        os.environ["WORKBOOK_RECORDS_DIR"] = records
        for name in STUDIES:
            path = folder / name
            nb = nbformat.read(path, as_version=4)
            template = _cells(*STUDIES[name])
            if _sources(nb.cells) != _sources(template):
                # the template changed since the notebook was written: its cells follow it
                # (their outputs are written again below anyway)
                nb.cells = template
                print(f"template: {path}")
            NotebookClient(nb, timeout=300, kernel_name="python3",
                           resources={"metadata": {"path": str(folder)}}).execute()
            _strip(nb)
            nbformat.write(nb, path)
            done.append(path)
    return done


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python -m workbook.tools.notebooks", description=__doc__,
                                     formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("action", choices=("create", "refresh"))
    parser.add_argument("folder", type=Path, nargs="?", default=Path("notebooks"))
    parser.add_argument("--force", action="store_true", help="rewrite existing notebooks from the template")
    args = parser.parse_args(argv)
    if args.action == "create":
        paths = create(args.folder, force=args.force)
    else:
        create(args.folder, force=args.force)
        paths = refresh(args.folder)
    for p in paths:
        print(f"{args.action}: {p}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
