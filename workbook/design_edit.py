"""Changed inputs written back into a design file, keeping its comments, order and layout.

The design file is the one the engineer edits by hand; a panel's **Record study** also
writes the inputs it changed back into it, so that the file and the record never disagree.
The file is edited in place with a round-trip TOML library (tomlkit): only the changed keys
move, every comment, blank line and table order stays. A changed input goes to the axis's
own table ``[axes.<axis>.<section>]`` (created at the end of the file when missing), so an
entry shared under ``[defaults]`` is overridden for this axis only and the other axes keep
theirs. The new text is read back with :func:`workbook.design.loads_design` and must give
the requested values before it replaces the file (atomically).

>>> import pathlib, tempfile
>>> from workbook.design import load_design
>>> path = pathlib.Path(tempfile.mkdtemp()) / "press.toml"
>>> _ = path.write_text('''[machine]
... name = "Press"
... [axes.ram.cylinder]
... # bore from the first sketch
... bore = "100 mm"
... ''')
>>> design_changes(load_design(path).axes["ram"].values, {"cylinder": {"bore": 0.125}})
[('cylinder', 'bore', 0.1, 0.125)]
>>> write_inputs(path, "ram", {"cylinder": {"bore": 0.125}})
['axes.ram.cylinder.bore']
>>> print(path.read_text())
[machine]
name = "Press"
[axes.ram.cylinder]
# bore from the first sketch
bore = "125 mm"
<BLANKLINE>
>>> load_design(path).axes["ram"].values["cylinder"]["bore"]
0.125
"""

from __future__ import annotations

import math
from pathlib import Path
from typing import Any, Mapping

from .design import DesignFileError, _value_text, load_design, loads_design
from .errors import InputError, InternalDefect
from .inputs import BY_KEY
from .record.store import atomic_write_text


def same_value(a: Any, b: Any) -> bool:
    """Whether two SI values of one field are the same input (floats to 1e-12 relative)."""
    if isinstance(a, (list, tuple)) or isinstance(b, (list, tuple)):
        if not (isinstance(a, (list, tuple)) and isinstance(b, (list, tuple))) or len(a) != len(b):
            return False
        return all(same_value(x, y) for x, y in zip(a, b))
    if isinstance(a, bool) or isinstance(b, bool) or not isinstance(a, (int, float)) \
            or not isinstance(b, (int, float)):
        return a == b
    return math.isclose(float(a), float(b), rel_tol=1e-12, abs_tol=0.0)


def design_changes(file_values: Mapping, values: Mapping, fields=None) -> list[tuple]:
    """``[(section, key, file value, new value)]`` where ``values`` differ from the file's.

    Only the sections of the catalogue are compared (``fields``, pairs ``(section, key)``,
    narrows it), in catalogue order.
    """
    wanted = None if fields is None else set(fields)
    out = []
    for sec_key, sec in BY_KEY.items():
        if sec_key not in values or sec_key == "identity":
            continue
        for f in sec.fields:
            if wanted is not None and (sec_key, f.key) not in wanted:
                continue
            if f.key not in values[sec_key]:
                continue
            new = values[sec_key][f.key]
            old = file_values.get(sec_key, {}).get(f.key, f.default_si())
            if not same_value(old, new):
                out.append((sec_key, f.key, old, new))
    return out


def _toml_value(f, si, typed: str | None = None):
    """The value as the design file writes it: what the user typed when it reads back to
    exactly ``si`` ("3 in"), else the shortest text in the display unit that does ("76.2 mm");
    a list of such texts; a bare number for a plain ratio; true/false for a flag."""
    import tomlkit

    if typed is not None and isinstance(si, float) and f.unit:
        try:
            if f.parse(typed) == si:
                return typed.strip()
        except InputError:
            pass
    text = _value_text(f, si)           # TOML source text of the value
    return tomlkit.parse(f"v = {text}\n")["v"]


def write_inputs(path, axis_key: str, values: Mapping[str, Mapping[str, Any]],
                 typed: Mapping[tuple, str] | None = None) -> list[str]:
    """Write ``values`` (``{section: {field: SI}}``) into axis ``axis_key`` of the design file.

    Returns the dotted keys written. Entries equal to what the file already gives the axis
    are left alone. ``typed`` (``{(section, key): text}``) gives what the user typed, kept
    when it reads back to the same value. Raises :class:`~workbook.design.DesignFileError` if the file cannot be
    read, and :class:`~workbook.errors.InputError` if the edited text would not read back
    to the requested values (the file is then left unchanged).
    """
    import tomlkit

    path = Path(path)
    design = load_design(path)
    if axis_key not in design.axes:
        raise design.error("axes", repr(axis_key), "one of the axes of the design: " + ", ".join(design.axes))
    current = design.axes[axis_key].values
    changes = design_changes(current, values)
    if not changes:
        return []
    text = path.read_text(encoding="utf-8")
    doc = tomlkit.parse(text)
    axes = doc["axes"]
    axis = axes[axis_key]
    written = []
    for sec_key, key, _old, new in changes:
        f = BY_KEY[sec_key][key]
        if sec_key not in axis:
            axis[sec_key] = tomlkit.table()
        axis[sec_key][key] = _toml_value(f, new, (typed or {}).get((sec_key, key)))
        written.append(f"axes.{axis_key}.{sec_key}.{key}")
    out = tomlkit.dumps(doc)
    check = loads_design(out, path.name).axes[axis_key].values
    left = design_changes(check, values)
    if left:
        sec_key, key, got, want = left[0]
        raise InternalDefect(f"{sec_key}.{key}", f"the design file would read back {got!r} instead of {want!r}")
    atomic_write_text(path, out)
    return written


__all__ = ["write_inputs", "design_changes", "same_value", "DesignFileError"]
