"""The guide to the design file, rendered from the catalogue so that it cannot drift.

``python -m workbook.tools.design_guide notebooks/designs/README.md`` (or ``make
design-guide``) writes the guide; without a path it prints it; ``--check PATH`` exits 1 when
the file is not what the catalogue gives now. :func:`render` returns the Markdown: how a
design file is laid out, how quantities are written (the spellings
:mod:`workbook.unit_spelling` reads and the marks it refuses), the sign conventions the
catalogue's help texts state, a worked example design file (:data:`EXAMPLE`, an invented
vertical press on the line of the BT-2 bin tipper) with the loads the workbook makes of it,
and for every table a list of its keys: meaning (label and help), unit, allowed range, and
required or the default with its source (all from :mod:`workbook.inputs` and
:mod:`workbook.cycle_file`).

>>> text = render()
>>> text.startswith("# Design files") and "| `bore` |" in text and "[[cycle.steps]]" in text
True
"""

from __future__ import annotations

import argparse
import math
import sys
from pathlib import Path

from .. import CAUTION, cycle_file, unit_spelling, units
from ..circuit import design_loads
from ..constants import G_STANDARD
from ..design import TOP_LEVEL, loads_design, machine_fields
from ..fields import Field, Section
from ..formatting import number, pretty_unit
from ..inputs import AXIS_SECTIONS, CYCLE, IDENTITY

#: where the guide lives in the repository
GUIDE_PATH = Path("notebooks/designs/README.md")

#: the worked example: an invented machine of the demo's world, every machine datum given
EXAMPLE = '''\
# CP-1 hopper compactor (invented): a platen above the hopper of the BT-2 recycling line
# presses the waste down. One vertical cylinder, rod pointing down, on its own power unit.

[machine]
name = "CP-1 hopper compactor"
revision = "A"
author = "design team"
date = "2026-12-01"

[defaults.oil]                  # shared by every axis (here there is one)
grade = "VG46"
nu40 = "46 cSt"
nu100 = "6.8 cSt"

[axes.press]
title = "Press (vertical platen, rod down)"

[axes.press.cylinder]
bore = "100 mm"
rod = "56 mm"
stroke = "800 mm"
rated_pressure = "250 bar"
mounting = "fixed-pinned"
buckling_length = "1900 mm"     # pin to pin, extended

[axes.press.supply]
# 32 cm3 x 1450 rpm x 0.93 (the default volumetric efficiency) = 43.2 L/min
displacement = "32 cc/rev"
shaft_speed = "1450 rpm"
relief_cracking = "160 bar"
relief_full_flow = "170 bar"
drive_power = "18.5 kW"

[axes.press.flow_valve]
# pressing down is the controlled motion, metered into the cap side:
# 80 mm/s x A1 (100 mm bore: 78.54 cm2) = 37.7 L/min
arrangement = "meter-in"
direction = "extend"
kind = "compensated"
setting = "38 L/min"

[axes.press.holding]
# the platen's weight pulls the rod out, so the rod side holds it: highest load-induced
# rod pressure 7.38 kN / A3 (100/56 mm: 53.91 cm2) = 13.7 bar; x 1.3 = 17.8 bar; set at 25 bar
kind = "counterbalance"
side = "rod"
setting = "25 bar"
pilot_ratio = 4

[axes.press.operation]
# loads are external forces on the rod, positive pushing it in; the platen's own weight is
# added from mass and inclination (-90 deg: rod pointing straight down), so the load cases
# are the platen alone (0 kN) and with the 150 kg scraper plate hung on it (-1.5 kN, pulling)
loads = ["0 kN", "-1.5 kN"]
mass = "600 kg"
inclination = "-90 deg"
friction = "1.5 kN"
temp_min = "20 °C"
temp_max = "55 °C"
tank_pressure = "2 bar"
target_speed = "80 mm/s"

[axes.press.ratings]
hose_rating = "280 bar"
valve_rating = "315 bar"
pressure_line_bore = "16 mm"
return_line_bore = "20 mm"
suction_line_bore = "32 mm"
cap_line_bore = "20 mm"
rod_line_bore = "16 mm"
cap_line_length = "2 m"
rod_line_length = "2 m"

[axes.press.study]
# the restrictor-sizing study sizes the alternatives for the pressing flow
target_flow = "38 L/min"
available_drop = "15 bar"

[cycle]
cycles_per_hour = 30
idle = "unloaded"
ambient = "25 °C"
tank_volume = "160 L"
cooler_duty = "1.5 kW"

[[cycle.steps]]
label = "press the platen down"
axis = "press"
motion = "extend"
load_case = 2

[[cycle.steps]]
label = "lift the platen"
axis = "press"
motion = "retract"
load_case = 2

[[cycle.steps]]
label = "fill the hopper"
dwell = "60 s"
'''

#: spellings the workbook reads, shown in the guide: (typed, dimension, what it is read as);
#: tests/test_design_guide.py checks each against the canonical spelling
SPELLINGS = (
    ("16 cm3", "volume", "16 cm**3"),
    ("16 cm³", "volume", "16 cm**3"),
    ("12 mm2", "area", "12 mm**2"),
    ("870 kg/m3", "density", "870 kg/m**3"),
    ("46 mm2/s", "kinematic_viscosity", "46 cSt"),
    ("40 °C", "temperature", "40 degC"),
    ("40 deg C", "temperature", "40 degC"),
    ("40 ℃", "temperature", "40 degC"),
    ("104 °F", "temperature", "104 degF"),
    ("40 lpm", "flow", "40 L/min"),
    ("40 l/min", "flow", "40 L/min"),
    ("10 GPM", "flow", "10 gpm"),
    ("16 cc/rev", "displacement", "16 cm**3"),
    ("16 cm3/rev", "displacement", "16 cm**3"),
    ("1450 min-1", "shaft_speed", "1450 rpm"),
    ("1450 1/min", "shaft_speed", "1450 rpm"),
    ("24 Hz", "shaft_speed", "1440 rpm"),
    ("5 t", "mass", "5000 kg"),
    ("2300 PSI", "pressure", "2300 psi"),
)

#: meaning of each key of a ``[[cycle.steps]]`` table (the keys come from cycle_file.STEP_KEYS)
STEP_HELP = {
    "label": ("text", "a name for the step in the machine record"),
    "axis": ("text", "the key of the axis that moves (`press` for `[axes.press]`)"),
    "motion": ("choice", "the direction the axis moves in the step"),
    "load": ("field", "the external force on the rod during the step, positive pushing it in (as a load "
                      "case; the weight from mass and inclination is added); give this or `load_case`"),
    "load_case": ("whole", "the number of one of the axis's load cases, 1 for the first; give this or `load`"),
    "duration": ("field", "how long the step takes (left out: from the stroke and the solved speed)"),
    "stroke": ("field", "the part of the stroke the step travels (left out: the whole stroke)"),
    "dwell": ("field", "a pause of the whole machine; a dwell step holds only `dwell` and `label`"),
}
_STEP_FIELDS = {"load": cycle_file._LOAD, "duration": cycle_file._TIME, "stroke": cycle_file._STROKE,
                "dwell": cycle_file._DWELL}


# ---------------------------------------------------------------------------- cells
def _cell(text: str) -> str:
    """Text safe inside a Markdown table cell (code spans between backticks kept as they are)."""
    parts = str(text).replace("\n", " ").split("`")
    for i in range(0, len(parts), 2):   # outside the code spans
        parts[i] = parts[i].replace("\\", "\\\\").replace("*", "\\*").replace("<", "&lt;")
    return "`".join(parts).replace("|", "\\|")


def _num(x) -> str:
    """A bound as a person types it: whole numbers in full (10000000, not 1e+07)."""
    x = float(x)
    if x == int(x) and abs(x) < 1e12:
        return str(int(x))
    return number(x, 6)


def _unit(f: Field) -> str:
    if f.dimension in ("text", "choice", "flag"):
        return "—"
    dim = f.list_dimension if f.dimension == "quantity_list" else f.dimension
    if dim == "dimensionless":
        return f"{f.unit} (ratio)" if f.unit else "— (plain number)"
    words = units.noun(dim)
    return f"{pretty_unit(f.unit)} ({words})"


def _range(f: Field) -> str:
    if f.dimension == "text":
        return "text"
    if f.dimension == "flag":
        return "`true` or `false`"
    if f.dimension == "choice":
        return ", ".join(f"`{c}`" for c in f.choices)
    parts = []
    if f.low is not None:
        parts.append(f"{'>' if f.low_open else '≥'} {_num(f.low)}")
    if f.high is not None:
        parts.append(f"{'<' if f.high_open else '≤'} {_num(f.high)}")
    text = " and ".join(parts) or "any"
    if f.unit and parts:
        text += f" {pretty_unit(f.unit)}"
    if f.integer:
        text = f"whole number, {text}"
    if f.dimension == "quantity_list":
        text = f"a list, each {text}"
    if f.optional:
        text += "; may be empty" if getattr(f, "required", False) else "; may be left out"
    return text


def _default(f: Field) -> tuple[str, str]:
    """(default cell, source cell) of a field."""
    if getattr(f, "required", False):
        return "**required**", "—"
    if f.dimension in ("choice", "flag"):
        shown = f"`{f.default_text()}`"
    elif f.default is None or f.default_text() == "":
        shown = "empty"
    else:
        shown = pretty_unit(f.default_text())
    return shown, f.source or "—"


def _meaning(f: Field) -> str:
    return f"**{_cell(f.label)}**: {_cell(f.help)}" if f.help else f"**{_cell(f.label)}**"


def _table(fields, key_of=lambda f: f.key) -> list[str]:
    out = ["| Key | Meaning | Unit | Allowed | Default | Source of the default |",
           "|---|---|---|---|---|---|"]
    for f in fields:
        default, source = _default(f)
        out.append(f"| `{key_of(f)}` | {_meaning(f)} | {_unit(f)} | {_range(f)} | {default} | {_cell(source)} |")
    return out


def _section_heading(sec: Section) -> str:
    return f"### `[axes.<key>.{sec.key}]` and `[defaults.{sec.key}]`: {sec.title}"


# ---------------------------------------------------------------------------- parts of the guide
def _caution() -> str:
    """The workbook's caution without its leading "Caution:"."""
    text = CAUTION.split(":", 1)[1].strip() if CAUTION.lower().startswith("caution:") else CAUTION
    return text[:1].upper() + text[1:]


def _intro() -> list[str]:
    return [
        "# Design files",
        "",
        "<!-- Generated from the catalogue (workbook/inputs.py) by `make design-guide`; do not edit by hand: "
        "tests/test_design_guide.py fails when this file and the catalogue disagree. -->",
        "",
        f"> **Caution.** {_caution()}",
        "",
        "A design file describes one machine and its cylinder axes as TOML that a person edits by hand. "
        "`axisbook evaluate <file>.toml` evaluates it (in Python: `workbook.design.load_design(path)` reads "
        "it). Every wrong, missing or unknown entry is reported with the file name, the line, the dotted key "
        "(for example `axes.lift.cylinder.bore`) and what is allowed; nothing is evaluated until the file is "
        "right.",
        "",
    ]


def _layout() -> list[str]:
    sections = ", ".join(f"`{s.key}`" for s in AXIS_SECTIONS)
    tops = {
        "machine": "who and what: " + ", ".join(f"`{k}`" for k in machine_fields()) + " (see below)",
        "defaults": "`[defaults.<section>]`: entries shared by every axis (a power unit that feeds all of "
                    "them); an axis's own entry wins",
        "axes": "`[axes.<key>]` holds `title`; `[axes.<key>.<section>]` the axis's entries. The key (`lift`, "
                "`press`) names the axis and its record file: letters, digits, `-` and `_`",
        "cycle": "optional: the machine cycle over the axes of one power unit, with `[[cycle.steps]]`",
    }
    out = ["## How a design file is laid out", "",
           "| Table | What it holds |", "|---|---|"]
    for top in TOP_LEVEL:
        out.append(f"| `[{top}]` | {tops.get(top, '')} |")
    out += [
        "",
        f"The sections of an axis, in the order the tables below list them: {sections}. Under each the keys "
        "are the fields listed for it. An entry an axis leaves out takes the value under "
        "`[defaults.<section>]`, else the workbook's default shown in the tables. An entry marked "
        "**required** is machine data the workbook cannot guess: the file must give it, in the axis's "
        "table or under `[defaults]`.",
        "",
    ]
    return out


def _quantities() -> list[str]:
    out = [
        "## Writing quantities",
        "",
        "Every quantity is text in quotes with its unit: `bore = \"80 mm\"`, `relief_cracking = \"160 bar\"`. "
        "A list (the load cases) is a list of such texts: `loads = [\"2 kN\", \"9 kN\"]`. A bare number is "
        "refused wherever a unit is expected; only plain ratios without a unit (`pilot_ratio = 3`, "
        "`cd = 0.61`) are bare numbers, and a percentage is written `\"15 %\"`. Any unit of the right kind is "
        "accepted; each field's table gives the unit it is shown in.",
        "",
        "| Kind of quantity | For example |", "|---|---|",
    ]
    for dim, examples in units.EXAMPLES.items():
        typed, _, note = examples.partition(" (")
        shown = ", ".join(f"`{e.strip()}`" for e in typed.split(","))
        out.append(f"| {units.noun(dim)} | {shown}{' (' + note if note else ''} |")
    out += ["", "Spellings of the trade are read too:", "", "| You write | Read as |", "|---|---|"]
    for typed, dim, canonical in SPELLINGS:
        per = " per revolution" if dim == "displacement" else ""
        out.append(f"| `{typed}` | {_cell(pretty_unit(canonical))}{per} |")
    out += [
        "",
        "Pressures are gauge throughout; the one absolute pressure, the cavitation limit, says so in its "
        "name. A gauge or absolute mark (`barg`, `bar g`, `psig`, `bara`, `bar abs`) is refused with that "
        "advice rather than guessed. Unit symbols are case-sensitive (`mm` is not `Mm`); a wrongly cased one "
        "is named (`16 Mpa`: did you mean MPa?). Symbols that mean something else in SI are refused with "
        "what they were read as and what to write:",
        "",
    ]
    samples = {"temperature": "15", "per_temperature": "7e-4", "force": "10", "time": "2", "dimensionless": "5"}
    for key, (meaning, advice) in unit_spelling.TRAPS.items():
        for wanted, words in advice.items():
            n = samples.get(wanted, "1")
            out.append(f"- `{n} {key}`: {_cell(meaning)}; {_cell(words.format(n=n))}")
    out += ["- `1 %` for an angle: a percent is a ratio, not an angle; write an angle such as `3 deg`",
            "- a mass (`800 kg`, `5 t`) for a force: a mass is not a force; write N, kN or lbf "
            "(a mass of 1 t weighs 9.807 kN)", ""]
    return out


def _and(items: list[str]) -> str:
    return items[0] if len(items) == 1 else ", ".join(items[:-1]) + " and " + items[-1]


def _signs(example_loads: list[float], mass: float, angle: float, cases: list[str]) -> list[str]:
    quoted = []
    for sec in (*AXIS_SECTIONS, CYCLE):
        for f in sec.fields:
            if "positive" in f.help or "above horizontal" in f.help:
                quoted.append(f"- `{sec.key}.{f.key}` ({_cell(f.label)}): {_cell(f.help)}")
    weight = mass * G_STANDARD * math.sin(angle)
    if not all(x < 0 for x in example_loads):
        raise ValueError("the guide's prose on the example assumes every load case pulls the rod out: "
                         "rewrite _signs for the new example")
    shown = _and([f"{x / 1e3:.4g} kN" for x in example_loads])
    return [
        "## Signs and directions",
        "",
        "The catalogue states the conventions in its help texts:",
        "",
        *quoted,
        "",
        "**Load.** A load is the external force on the rod, positive when it pushes the rod in. A positive "
        "load resists extension and overruns (drives) retraction; a negative load pulls the rod out, "
        "overrunning extension and resisting retraction. Friction is given as a size and always opposes "
        "the motion. The cap chamber is the full-bore side, the rod side the annulus; `extend` moves the "
        "rod out.",
        "",
        "**Inclination.** The angle of the rod axis above horizontal, with the rod end up for a positive "
        "angle: `90 deg` is a vertical cylinder with the rod pointing up, `-90 deg` a vertical cylinder "
        "with the rod pointing down, `0 deg` a horizontal one. The moving mass's weight along the rod, "
        "m·g·sin(angle), is added to every load case: with the rod up it pushes the rod in (positive), with "
        "the rod down it pulls it out (negative). Leave the inclination at 0 when the load cases already "
        "include the weight, or the weight is counted twice.",
        "",
        f"In the example below, the platen of {number(mass)} kg hangs on a rod pointing down "
        f"(`inclination = \"{number(math.degrees(angle))} deg\"`): its weight is "
        f"{number(mass)} kg × {number(G_STANDARD, 6)} m/s² × sin({number(math.degrees(angle))}°) = "
        f"{weight / 1e3:.4g} kN, so the load cases {_and(cases)} become {shown}. Both are negative: "
        "the weight overruns the pressing stroke (extend), so the rod side needs the holding valve, and it "
        "resists the return stroke (retract).",
        "",
    ]


def _example() -> list[str]:
    return [
        "## A worked example",
        "",
        "An invented machine on the same recycling line as the demo bin tipper: a compactor whose platen, "
        "driven by one vertical cylinder with the rod pointing down, presses the waste in the hopper. Save "
        "it as `compactor.toml` and run `axisbook evaluate compactor.toml`. It gives every machine datum "
        "the workbook cannot guess; its numbers are invented and no evidence that a formula is right.",
        "",
        "```toml",
        *EXAMPLE.rstrip("\n").split("\n"),
        "```",
        "",
    ]


def _entries() -> list[str]:
    out = ["## Every entry", "", "### `[machine]`: Identity", "",
           "The identity of every record the file gives (the `axis` of a record is the axis key)."
           " `date` is the date you give: nothing reads the clock.", ""]
    renamed = {f.key: k for k, f in machine_fields().items()}
    out += _table([f for f in IDENTITY.fields if f.key in renamed], key_of=lambda f: renamed[f.key])
    out += ["", "### `[axes.<key>]`", "",
            "| Key | Meaning | Default |", "|---|---|---|",
            "| `title` | **Title**: the axis's name in records and on screens | the axis key |", ""]
    for sec in AXIS_SECTIONS:
        out += [_section_heading(sec), ""]
        if sec.help:
            out += [_cell(sec.help), ""]
        if sec.only_for:
            out += [f"Read only by the `{sec.only_for}` study.", ""]
        out += _table(sec.fields) + [""]
    out += [f"### `[cycle]`: {CYCLE.title}", "",
            "Optional, once per file: the machine cycle over the axes that share one power unit. With it "
            "`axisbook evaluate` also writes the machine record (energy, heat, oil temperature, cooler).", ""]
    out += _table(CYCLE.fields) + [""]
    out += ["### `[[cycle.steps]]`", "",
            "One table per step, in the order the machine runs them. A step moves one axis (`axis`, "
            "`motion` and `load` or `load_case`) or is a dwell.", "",
            "| Key | Meaning | Unit | Allowed |", "|---|---|---|---|"]
    for key in cycle_file.STEP_KEYS:
        kind, help_text = STEP_HELP[key]
        if kind == "field":
            f = _STEP_FIELDS[key]
            unit, allowed = _unit(f), _range(f)
        elif kind == "whole":
            unit, allowed = "—", "whole number from 1 to the number of load cases"
        elif kind == "choice":
            unit, allowed = "—", "`extend`, `retract`"
        else:
            unit, allowed = "—", "text"
        out.append(f"| `{key}` | {_cell(help_text)} | {unit} | {allowed} |")
    return out + [""]


def _demo() -> list[str]:
    return [
        "## The demo files",
        "",
        "`bin-tipper.toml` is the demo, `bin-tipper-rev-b.toml` its revision B (its header says what changed "
        "and why). Their scenario is **invented**: a bin tipper on a recycling line with a vertical lift axis "
        "(an overrunning load when lowering) and a tip axis whose load goes over centre, both fed by one "
        "small power unit. Their numbers show how the workbook is used; they are not data of any real "
        "machine and are no evidence that a formula is right.",
        "",
    ]


def render() -> str:
    """The guide as Markdown (deterministic: the same catalogue gives the same bytes)."""
    design = loads_design(EXAMPLE, "compactor.toml")
    axis = next(iter(design.axes.values()))
    op = axis.values["operation"]
    cases = [f"{x / 1e3:g} kN" for x in op["loads"]]
    loads = [float(x) for x in design_loads(op)]
    lines = (_intro() + _layout() + _quantities() + _signs(loads, op["mass"], op["inclination"], cases)
             + _example() + _entries() + _demo())
    return "\n".join(lines).rstrip("\n") + "\n"


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(prog="python -m workbook.tools.design_guide", description=__doc__,
                                     formatter_class=argparse.RawDescriptionHelpFormatter)
    parser.add_argument("path", type=Path, nargs="?", help="file to write (default: print the guide)")
    parser.add_argument("--check", action="store_true",
                        help="write nothing; exit 1 when PATH differs from the guide the catalogue gives")
    args = parser.parse_args(argv)
    text = render()
    if args.path is None:
        sys.stdout.write(text)
        return 0
    if args.check:
        current = args.path.read_text(encoding="utf-8") if args.path.exists() else ""
        if current != text:
            print(f"{args.path} is out of date: run `make design-guide`", file=sys.stderr)
            return 1
        return 0
    from ..record.store import atomic_write_text

    atomic_write_text(args.path, text)
    print(f"wrote {args.path}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
