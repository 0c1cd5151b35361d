"""The ``[cycle]`` table of a design file: the machine cycle over the axes of one power unit.

A design file may end with a cycle (every quantity text with its unit; the entries of the
table are the fields of :data:`workbook.inputs.CYCLE`, missing ones take their defaults)::

    [cycle]
    cycles_per_hour = 40
    idle = "relief"                 # or "unloaded" (at unload_pressure)
    ambient = "30 degC"
    tank_volume = "100 L"

    [[cycle.steps]]
    label = "lift a full bin"
    axis = "lift"
    motion = "extend"
    load = "9 kN"                   # or load_case = 3 (the third of the axis's load cases)
    # duration = "15 s"             # optional: from the stroke and the solved speed
    # stroke = "600 mm"             # optional: part of the stroke (default the whole)

    [[cycle.steps]]
    label = "new bin"
    dwell = "20 s"

A given ``load`` is the external force on the rod, as a load case, and the moving mass's
weight along the rod is added as it is to the load cases (``operation.inclination``).
Every wrong, missing or unknown entry raises :class:`~workbook.design.DesignFileError`
naming the file, the line and the dotted key (``cycle.steps[2].axis``) and what is allowed.

>>> from workbook.design import loads_design
>>> text = '''
... [axes.lift.cylinder]
... bore = "80 mm"
... [cycle]
... cycles_per_hour = 30
... [[cycle.steps]]
... axis = "lift"
... motion = "extend"
... load = "2 kN"
... [[cycle.steps]]
... dwell = "-5 s"
... '''
>>> loads_design(text, "demo.toml")
Traceback (most recent call last):
...
workbook.design.DesignFileError: demo.toml, line 11, cycle.steps[2].dwell: got '-5 s'; allowed: a time greater than 0 s and at most 86400 s
"""

from __future__ import annotations

import re
from typing import Any, Mapping

from .circuit import design_loads
from .cycle import Step
from .fields import Field
from .inputs import CYCLE

#: keys of one step of ``[[cycle.steps]]``
STEP_KEYS = ("label", "axis", "motion", "load", "load_case", "duration", "stroke", "dwell")
_TIME = Field("duration", "Duration", "time", "s", None, low=0, low_open=True, high=86400, optional=True)
_DWELL = Field("dwell", "Dwell", "time", "s", None, low=0, low_open=True, high=86400)
_LOAD = Field("load", "Load", "force", "kN", None, low=-1e5, high=1e5)
_STROKE = Field("stroke", "Stroke travelled", "length", "mm", None, low=0, low_open=True, high=20000)
_HEADER = re.compile(r"^\s*\[\[\s*cycle\s*\.\s*steps\s*\]\]")


def step_lines(text: str) -> list[int]:
    """Line (1-based) of each ``[[cycle.steps]]`` header of a TOML text, in order.

    >>> step_lines('[cycle]\\n[[cycle.steps]]\\naxis = "lift"\\n[[cycle.steps]]\\n')
    [2, 4]
    """
    return [n for n, line in enumerate(text.splitlines(), 1) if _HEADER.match(line)]


def parse_cycle(table: Any, axes: Mapping, parser) -> dict:
    """The cycle of a design file: ``{"values": {field: SI}, "steps": (Step, ...)}``.

    ``axes`` maps axis keys to their parsed :class:`~workbook.design.AxisSpec`; ``parser``
    is the design file's parser (its ``fail``, ``value``, ``table`` and ``lines``).
    """
    parts = ("cycle",)
    table = parser.table(table, parts, "a table of cycle entries and [[cycle.steps]]")
    parser.unknown(table, ("steps", *CYCLE.keys), parts, "cycle entry")
    values = {}
    for f in CYCLE.fields:
        values[f.key] = parser.value(f, table[f.key], parts + (f.key,)) if f.key in table else f.default_si()
    steps_in = table.get("steps")
    if steps_in is None or (isinstance(steps_in, list) and not steps_in):
        parser.fail(parts + ("steps",), "a cycle with no steps",
                    "at least one [[cycle.steps]] table with axis and motion, or a dwell")
    if not isinstance(steps_in, list):
        parser.fail(parts + ("steps",), "not an array of tables", "[[cycle.steps]] tables, one per step")
    lines = step_lines(getattr(parser, "text", ""))
    steps = []
    for i, raw in enumerate(steps_in, 1):
        where = ("cycle", f"steps[{i}]")
        line = lines[i - 1] if i - 1 < len(lines) else parser.line(("cycle", "steps"))
        steps.append(_step(raw, where, line, axes, parser, i))
    return {"values": values, "steps": tuple(steps)}


def _step(raw: Any, where: tuple, line: int | None, axes: Mapping, parser, index: int) -> Step:
    from .design import DesignFileError

    def fail(key, given, allowed):
        dotted = ".".join(where + ((key,) if key else ()))
        raise DesignFileError.at(parser.name, _key_line(parser, line, key), dotted, given, allowed)

    def value(f: Field, key: str):
        try:
            return parser.value(f, raw[key], where + (key,))
        except DesignFileError as exc:
            raise DesignFileError.at(parser.name, _key_line(parser, line, key), ".".join(where + (key,)),
                                     exc.given, exc.allowed) from None

    if not isinstance(raw, dict):
        fail("", "not a table", "a [[cycle.steps]] table")
    for key in raw:
        if key not in STEP_KEYS:
            fail(key, "an unknown step entry", "one of " + ", ".join(STEP_KEYS))
    label = raw.get("label", "")
    if not isinstance(label, str):
        fail("label", repr(label)[:60], "text")
    if "dwell" in raw:
        other = [k for k in raw if k not in ("dwell", "label")]
        if other:
            fail(other[0], "an entry beside a dwell", "a dwell step holds only dwell and label")
        return Step("dwell", value(_DWELL, "dwell"), label=label or f"dwell {index}")
    if "axis" not in raw:
        fail("axis", "a step without an axis or a dwell", "axis = \"<key>\" and motion, or dwell = \"20 s\"")
    axis_key = raw["axis"]
    if not isinstance(axis_key, str) or axis_key not in axes:
        fail("axis", repr(axis_key)[:60], "one of the axes of the design: " + ", ".join(axes))
    motion = raw.get("motion")
    if motion not in ("extend", "retract"):
        fail("motion", repr(motion)[:60], "'extend' or 'retract'")
    op = axes[axis_key].values["operation"]
    if "load" in raw and "load_case" in raw:
        fail("load_case", "both load and load_case", "one of them")
    if "load" in raw:
        load = float(design_loads({**op, "loads": [value(_LOAD, "load")]})[0])
    elif "load_case" in raw:
        n = raw["load_case"]
        cases = design_loads(op)
        if isinstance(n, bool) or not isinstance(n, int) or not 1 <= n <= len(cases):
            fail("load_case", repr(n)[:60], f"a whole number from 1 to {len(cases)} (the axis's load cases, in order)")
        load = float(cases[n - 1])
    else:
        fail("load", "a motion without a load", "load = \"5 kN\" or load_case = 1")
    duration = value(_TIME, "duration") if "duration" in raw else None
    stroke = value(_STROKE, "stroke") if "stroke" in raw else None
    full = axes[axis_key].values["cylinder"]["stroke"]
    if stroke is not None and stroke > full * (1 + 1e-12):
        fail("stroke", f"{stroke * 1e3:g} mm", f"at most the axis's stroke ({full * 1e3:g} mm)")
    return Step("motion", duration, axis_key, motion, load, stroke, label or f"{axis_key} {motion}")


def _key_line(parser, header_line: int | None, key: str) -> int | None:
    """Line of ``key`` inside the step table that starts at ``header_line`` (the header's
    own line when the key is not found there)."""
    text = getattr(parser, "text", "")
    if header_line is None or not text or not key:
        return header_line
    lines = text.splitlines()
    pat = re.compile(rf"^\s*{re.escape(key)}\s*=")
    for n in range(header_line, len(lines)):
        s = lines[n].strip()
        if s.startswith("["):
            break
        if pat.match(lines[n]):
            return n + 1
    return header_line


__all__ = ["parse_cycle", "step_lines", "STEP_KEYS"]
