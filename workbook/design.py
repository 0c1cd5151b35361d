"""Design files: one machine and its axes, written by hand as TOML (parsing only).

A design file looks like this (every quantity is text with its unit)::

    [machine]
    name = "BT-2 bin tipper"
    revision = "A"
    author = "R. Okafor"
    date = "2026-11-30"

    [defaults.supply]            # shared by every axis, overridden per axis
    relief_cracking = "160 bar"

    [axes.lift]
    title = "Lift"

    [axes.lift.cylinder]
    bore = "80 mm"
    rod = "45 mm"

    [axes.lift.operation]
    loads = ["2 kN", "9 kN"]

The sub-tables of an axis (and of ``[defaults]``) are the sections of
:mod:`workbook.inputs` and their keys are the sections' field keys; both lists come from
the catalogue, so a field added there is at once a key of the design file. A missing
entry takes, in this order, the value in ``[defaults]`` or the field's default. The
``[machine]`` table holds the identity fields of the catalogue except ``axis`` (the axis key
names the axis), with ``machine`` spelled ``name``.

Quantities must carry their unit ("80 mm", "160 bar", "40 L/min", "40 degC"); only
fields without a display unit (a ratio such as ``pilot_ratio``) take a bare number. Every
wrong, missing or unknown entry raises :class:`DesignFileError`, whose message names the
file, the line and the dotted key, and says what is allowed.

>>> text = '''
... [machine]
... name = "BT-2"
... [axes.lift.cylinder]
... bore = "80 mm"
... '''
>>> d = loads_design(text, "demo.toml")
>>> d.axes["lift"].values["cylinder"]["bore"], d.identity_for("lift")["axis"]
(0.08, 'lift')
>>> loads_design(text.replace('"80 mm"', '"-80 mm"'), "demo.toml")
Traceback (most recent call last):
...
workbook.design.DesignFileError: demo.toml, line 5, axes.lift.cylinder.bore: got '-80 mm'; allowed: a length greater than 0 mm and at most 1000 mm
"""

from __future__ import annotations

import datetime as _dt
import json
import re
from dataclasses import dataclass
from dataclasses import field as dc_field
from pathlib import Path
from typing import Any, Mapping

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib

from . import __version__, safetext, units
from .errors import InputError
from .fields import Field, Section
from .inputs import AXIS_SECTIONS, IDENTITY

#: key of the identity field that the [machine] table spells differently
_MACHINE_RENAME = {"machine": "name"}
#: top-level tables of a design file
TOP_LEVEL = ("machine", "defaults", "axes", "cycle")
_BARE_NUMBER = re.compile(r"^\s*[-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?\s*$")
_BARE_KEY = re.compile(r"^[A-Za-z0-9_-]+$")
#: an axis key becomes part of a file name: letters, digits, "-" and "_", at most 64
SAFE_AXIS_KEY = re.compile(r"^[A-Za-z0-9][A-Za-z0-9_-]{0,63}$")
SAFE_AXIS_WORDS = ("a plain name of letters, digits, '-' and '_' (at most 64 characters, starting with a "
                   "letter or digit), e.g. [axes.lift]; it becomes part of the record's file name")
#: a design file's stem also becomes part of a file name (dots allowed inside)
SAFE_STEM = re.compile(r"^[A-Za-z0-9][A-Za-z0-9._-]{0,99}$")


class DesignFileError(InputError):
    """A wrong, missing or unknown entry in a design file.

    ``field`` reads ``"<file>, line <n>, <dotted key>"``; the parts are also kept as
    ``file``, ``line`` (None when unknown) and ``key``.
    """

    def __init__(self, field: str, given: object, allowed: str, *, file: str = "", line: int | None = None,
                 key: str = ""):
        self.file, self.line, self.key = file, line, key
        super().__init__(field, given, allowed)

    @classmethod
    def at(cls, file: str, line: int | None, key: str, given: object, allowed: str) -> "DesignFileError":
        where = ", ".join(p for p in (file, f"line {line}" if line else "", key) if p)
        return cls(where, given, allowed, file=file, line=line, key=key)


def machine_fields() -> dict[str, Field]:
    """Keys of the ``[machine]`` table -> identity fields (from the catalogue)."""
    return {_MACHINE_RENAME.get(f.key, f.key): f for f in IDENTITY.fields if f.key != "axis"}


# ---------------------------------------------------------------------------- where things are
def _split_key(text: str) -> tuple[list[str], int]:
    """Split a TOML dotted key at the start of ``text``; return its parts and where it ended."""
    parts, cur, i, n = [], "", 0, len(text)
    quoted = False
    while i < n:
        ch = text[i]
        if ch == '"':
            j = i + 1
            while j < n and text[j] != '"':
                j += 2 if text[j] == "\\" else 1
            try:
                cur += json.loads(text[i:j + 1])
            except ValueError:
                cur += text[i + 1:j]
            quoted, i = True, j + 1
            continue
        if ch == "'":
            j = text.find("'", i + 1)
            j = n if j < 0 else j
            cur += text[i + 1:j]
            quoted, i = True, j + 1
            continue
        if ch == ".":
            parts.append(cur.strip() if not quoted else cur)
            cur, quoted = "", False
        elif ch in "=]":
            break
        elif not ch.isspace():
            cur += ch
        i += 1
    parts.append(cur.strip() if not quoted else cur)
    return parts, i


def _bracket_delta(text: str) -> int:
    depth, i, n = 0, 0, len(text)
    while i < n:
        ch = text[i]
        if ch == "#":
            break
        if ch in "\"'":
            j = i + 1
            while j < n and text[j] != ch:
                j += 2 if (ch == '"' and text[j] == "\\") else 1
            i = j + 1
            continue
        depth += (ch in "[{") - (ch in "]}")
        i += 1
    return depth


def key_lines(text: str) -> dict[tuple, int]:
    """Line (1-based) of every table header and key of a TOML text, by dotted key tuple.

    >>> key_lines('[axes.lift]\\ntitle = "Lift"\\n[axes."lift".cylinder]\\nbore = "80 mm"\\n')
    {('axes',): 1, ('axes', 'lift'): 1, ('axes', 'lift', 'title'): 2, ('axes', 'lift', 'cylinder'): 3, ('axes', 'lift', 'cylinder', 'bore'): 4}
    """
    out: dict[tuple, int] = {}
    table: tuple = ()
    depth, ml = 0, None
    for n, line in enumerate(text.splitlines(), 1):
        if ml is not None:
            if line.count(ml) % 2 == 1:
                ml = None
            continue
        if depth > 0:
            depth += _bracket_delta(line)
            continue
        s = line.strip()
        if not s or s.startswith("#"):
            continue
        if s.startswith("["):
            body = s[2:] if s.startswith("[[") else s[1:]
            parts, _ = _split_key(body)
            table = tuple(parts)
            for k in range(1, len(table) + 1):
                out.setdefault(table[:k], n)
            continue
        parts, end = _split_key(s)
        key = table + tuple(parts)
        for k in range(len(table) + 1, len(key) + 1):
            out.setdefault(key[:k], n)
        value = s[end + 1:].strip()
        for delim in ('"""', "'''"):
            if value.startswith(delim) and value.count(delim) % 2 == 1:
                ml = delim
        if ml is None:
            depth = max(0, _bracket_delta(value))
    return out


# ---------------------------------------------------------------------------- model
@dataclass(frozen=True)
class AxisSpec:
    """One axis of a design: its key, title and SI values ``{section_key: {field: SI}}``."""

    key: str
    title: str
    values: dict


@dataclass(frozen=True)
class Design:
    """A parsed design file: the machine's identity and its axes in file order."""

    machine: dict
    axes: dict
    source: str = dc_field(default="", compare=False)
    lines: dict = dc_field(default_factory=dict, compare=False, repr=False)
    #: the machine cycle (``[cycle]``, :func:`workbook.cycle_file.parse_cycle`), or None
    cycle: Any = dc_field(default=None, compare=False, repr=False)

    def identity_for(self, axis_key: str) -> dict:
        """The identity of the record of ``axis_key`` (catalogue keys, catalogue order)."""
        if axis_key not in self.axes:
            raise InputError("axis", repr(axis_key), "one of " + ", ".join(self.axes))
        out = {}
        for f in IDENTITY.fields:
            out[f.key] = axis_key if f.key == "axis" else self.machine.get(f.key, f.default or "")
        return out

    def where(self, dotted_key: str) -> tuple[str, int | None]:
        """``(file, line)`` of a dotted key (or of its nearest enclosing table)."""
        parts = tuple(dotted_key.split("."))
        for k in range(len(parts), 0, -1):
            if parts[:k] in self.lines:
                return self.source, self.lines[parts[:k]]
        return self.source, None

    def error(self, dotted_key: str, given: object, allowed: str) -> DesignFileError:
        """A :class:`DesignFileError` located at ``dotted_key`` (for checks made after parsing)."""
        file, line = self.where(dotted_key)
        return DesignFileError.at(file, line, dotted_key, given, allowed)


# ---------------------------------------------------------------------------- parsing
class _Parser:
    def __init__(self, text: str, name: str):
        self.name = name
        if text.startswith("\ufeff"):  # a byte-order mark some editors write: not part of the TOML
            text = text[1:]
        self.text = text
        try:
            self.lines = key_lines(text)
            self.data = tomllib.loads(text)
        except RecursionError:
            raise DesignFileError.at(name, None, "", "values nested too deeply to read",
                                     "TOML text whose arrays and inline tables nest a few levels at most") from None
        except tomllib.TOMLDecodeError as exc:
            msg = str(exc)
            m = re.search(r"line (\d+)", msg)
            line = int(m.group(1)) if m else getattr(exc, "lineno", None)
            raise DesignFileError.at(name, line, "", f"TOML it cannot read ({msg})",
                                     "TOML text: key = \"value\" lines under [table] headers; "
                                     "quantities in quotes with their unit, e.g. bore = \"80 mm\"") from None

    def line(self, parts: tuple) -> int | None:
        for k in range(len(parts), 0, -1):
            if parts[:k] in self.lines:
                return self.lines[parts[:k]]
        return None

    def fail(self, parts: tuple, given: object, allowed: str):
        raise DesignFileError.at(self.name, self.line(parts), ".".join(parts), given, allowed)

    def table(self, value: Any, parts: tuple, allowed: str) -> dict:
        if not isinstance(value, dict):
            self.fail(parts, f"{_describe(value)}, not a table", allowed)
        return value

    def unknown(self, mapping: Mapping, known, parts: tuple, what: str):
        for key in mapping:
            if key not in known:
                self.fail(parts + (key,), f"an unknown {what}", "one of " + ", ".join(known))

    # ------------------------------------------------------------------
    def parse(self) -> Design:
        data = self.data
        self.unknown(data, TOP_LEVEL, (), "table")
        machine = self.machine(data.get("machine", {}))
        sections = {s.key: s for s in AXIS_SECTIONS}
        defaults = self.table(data.get("defaults", {}), ("defaults",), "a table of sections: " + ", ".join(sections))
        self.unknown(defaults, sections, ("defaults",), "section")
        for key, sub in defaults.items():
            self.table(sub, ("defaults", key), f"a table of {key} entries")
            self.unknown(sub, sections[key].keys, ("defaults", key), f"{key} entry")
        if "axes" not in data:
            self.fail(("axes",), "a design without axes", "at least one [axes.<key>] table, e.g. [axes.lift]")
        axes_in = self.table(data["axes"], ("axes",), "a table of axes, e.g. [axes.lift]")
        if not axes_in:
            self.fail(("axes",), "an empty [axes] table", "at least one [axes.<key>] table, e.g. [axes.lift]")
        axes = {}
        for axis_key, spec in axes_in.items():
            if not SAFE_AXIS_KEY.match(axis_key):
                self.fail(("axes", axis_key), f"the axis key {axis_key!r}", SAFE_AXIS_WORDS)
            axes[axis_key] = self.axis(axis_key, spec, defaults)
        cycle = None
        if "cycle" in data:
            from .cycle_file import parse_cycle

            cycle = parse_cycle(data["cycle"], axes, self)
        return Design(machine, axes, self.name, self.lines, cycle)

    def machine(self, table: Any) -> dict:
        known = machine_fields()
        table = self.table(table, ("machine",), "a table with " + ", ".join(known))
        self.unknown(table, known, ("machine",), "entry")
        out = {}
        for key, f in known.items():
            raw = table.get(key, f.default if f.default is not None else "")
            if isinstance(raw, (_dt.date, _dt.datetime)):
                raw = raw.isoformat()
            out[f.key] = self.value(f, raw, ("machine", key))
        return out

    def axis(self, axis_key: str, spec: Any, defaults: dict) -> AxisSpec:
        parts = ("axes", axis_key)
        sections = {s.key: s for s in AXIS_SECTIONS}
        spec = self.table(spec, parts, "a table with title and the sections " + ", ".join(sections))
        self.unknown(spec, ("title", *sections), parts, "section or entry")
        title = spec.get("title", axis_key)
        if not isinstance(title, str):
            self.fail(parts + ("title",), f"{_describe(title)}", "text")
        try:
            safetext.check(title, "title")
        except InputError as exc:
            self.fail(parts + ("title",), exc.given, exc.allowed)
        values = {}
        for sec in AXIS_SECTIONS:
            own = self.table(spec.get(sec.key, {}), parts + (sec.key,), f"a table of {sec.key} entries")
            self.unknown(own, sec.keys, parts + (sec.key,), f"{sec.key} entry")
            shared = defaults.get(sec.key, {})
            values[sec.key] = self.section(sec, own, shared, parts + (sec.key,), ("defaults", sec.key))
        return AxisSpec(axis_key, title, values)

    def section(self, sec: Section, own: dict, shared: dict, own_parts: tuple, shared_parts: tuple) -> dict:
        out = {}
        for f in sec.fields:
            if f.key in own:
                out[f.key] = self.value(f, own[f.key], own_parts + (f.key,))
            elif f.key in shared:
                out[f.key] = self.value(f, shared[f.key], shared_parts + (f.key,))
            else:
                out[f.key] = f.default_si()
        return out

    def value(self, f: Field, raw: Any, parts: tuple):
        def needs_unit(item) -> bool:
            if not f.unit:
                return False
            return isinstance(item, (int, float)) and not isinstance(item, bool) or (
                isinstance(item, str) and _BARE_NUMBER.match(item) is not None)

        example = f.default_text() or f"1 {f.unit}"
        if f.dimension == "quantity_list":
            items = raw if isinstance(raw, list) else [raw] if isinstance(raw, str) else None
            if items is None:
                self.fail(parts, _describe(raw), f.allowed() + f", as a list of text with units, e.g. "
                          f"[{', '.join(json.dumps(x.strip()) for x in example.split(','))}]")
            for item in items:
                if isinstance(item, str):
                    pieces = [p for p in item.replace(";", ",").split(",") if p.strip()]
                else:
                    pieces = [item]
                for p in pieces:
                    plain = not f.unit and isinstance(p, (int, float)) and not isinstance(p, bool)
                    if needs_unit(p) or not (isinstance(p, str) or plain):
                        self.fail(parts, f"{p!r} (the unit is missing)" if needs_unit(p) else _describe(p),
                                  f.allowed() + f", each written with its unit, e.g. \"{example.split(',')[0]}\"")
        elif f.is_quantity and needs_unit(raw):
            self.fail(parts, f"{raw!r} (the unit is missing)",
                      f.allowed() + f", written as text with its unit, e.g. \"{example}\"")
        elif f.is_quantity and f.unit and not isinstance(raw, str):
            self.fail(parts, _describe(raw), f.allowed() + f", written as text with its unit, e.g. \"{example}\"")
        elif f.dimension in ("text", "choice") and not isinstance(raw, str):
            self.fail(parts, _describe(raw), f.allowed())
        elif f.dimension == "flag" and not isinstance(raw, bool):
            self.fail(parts, _describe(raw), "true or false (without quotes)")
        try:
            return f.parse(raw)
        except InputError as exc:
            # the error echoes an excerpt; give fail() the whole text so it counts every character
            echoed = isinstance(raw, str) and (exc.given in (raw, repr(raw)) or exc.given.startswith(repr(raw)[:40]))
            given = repr(raw) if echoed else exc.given
            self.fail(parts, given, exc.allowed)


def _describe(value: Any) -> str:
    kinds = {bool: "a true/false", int: "a number", float: "a number", str: "text", list: "a list",
             dict: "a table"}
    kind = next((v for k, v in kinds.items() if isinstance(value, k)), f"a {type(value).__name__}")
    shown = repr(value)
    return f"{kind} {shown[:60]}" if kind != "a table" else kind


def loads_design(text: str, name: str = "design.toml") -> Design:
    """Parse design-file text; ``name`` (the file name) starts every error message."""
    return _Parser(text, name).parse()


def load_design(path) -> Design:
    """Read and parse the design file at ``path``."""
    path = Path(path)
    if not SAFE_STEM.match(path.stem):
        raise DesignFileError.at(safetext.printable(path.name, keep=""), None, "", "a file name that cannot name records",
                                 "a design file named with letters, digits, '.', '-' and '_' (the name of each "
                                 "record starts with it), e.g. bin-tipper.toml")
    try:
        raw = path.read_bytes()
    except FileNotFoundError:
        raise DesignFileError.at(str(path), None, "", "no such file", "the path of a design file (.toml)") from None
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = raw[: exc.start].count(b"\n") + 1
        raise DesignFileError.at(path.name, line, "", "bytes that are not UTF-8 text",
                                 "a TOML design file saved as UTF-8") from None
    return loads_design(text, path.name)


# ---------------------------------------------------------------------------- writing
def _toml_str(text: str) -> str:
    out = json.dumps(text, ensure_ascii=False)
    return out.replace("\x7f", "\\u007f")


def _toml_key(key: str) -> str:
    return key if _BARE_KEY.match(key) else _toml_str(key)


def _quantity_text(f: Field, si: float, dimension: str) -> str:
    """Shortest text in the display unit that parses back to exactly ``si``; SI unit if none does."""
    reg_unit = f.unit
    disp = units.from_si(si, dimension, reg_unit)
    for digits in (6, 9, 12, 15, 16, 17):
        text = f"{disp:.{digits}g} {reg_unit}"
        try:
            if units.to_si(text, dimension, f.key) == si:
                return text
        except InputError:
            break
    return f"{si!r} {units.INTERNAL_UNIT[dimension]}"


def _value_text(f: Field, si: Any) -> str:
    if f.dimension in ("text", "choice"):
        return _toml_str(si)
    if f.dimension == "flag":
        return "true" if si else "false"
    if f.dimension == "quantity_list":
        if not f.unit:
            return "[" + ", ".join(repr(float(v)) for v in si) + "]"
        return "[" + ", ".join(_toml_str(_quantity_text(f, v, f.list_dimension)) for v in si) + "]"
    if not f.unit:
        return repr(float(si))
    return _toml_str(_quantity_text(f, si, f.dimension))


def _lines_for(sec: Section, values: Mapping, keep) -> list[str]:
    out = []
    for f in sec.fields:
        if f.key not in values or values[f.key] is None or not keep(f, values[f.key]):
            continue
        out.append(f"{f.key} = {_value_text(f, values[f.key])}  # {f.label}")
    return out


def dump_design(design: Design, complete: bool = True) -> str:
    """TOML text of ``design`` that :func:`loads_design` reads back to an equal design.

    Values common to every axis (when there are several) go to ``[defaults]``. With
    ``complete=False`` values equal to the field's default are left out.
    """
    lines = [f"# Design file written by workbook {__version__}. Quantities are text with their unit.", "",
             "[machine]"]
    for key, f in machine_fields().items():
        lines.append(f"{_toml_key(key)} = {_toml_str(str(design.machine.get(f.key, '')))}")
    axes = list(design.axes.values())

    def keep_default(f, v):
        return complete or v != f.default_si()

    shared: dict = {}
    if len(axes) > 1:
        for sec in AXIS_SECTIONS:
            common = {}
            for f in sec.fields:
                vals = [a.values.get(sec.key, {}).get(f.key) for a in axes]
                if all(v is not None and v == vals[0] for v in vals):
                    common[f.key] = vals[0]
            body = _lines_for(sec, common, keep_default)
            if body:
                shared[sec.key] = common
                lines += ["", f"[defaults.{sec.key}]", *body]
    for a in axes:
        head = f"axes.{_toml_key(a.key)}"
        lines += ["", f"[{head}]", f"title = {_toml_str(a.title)}"]
        for sec in AXIS_SECTIONS:
            vals = a.values.get(sec.key, {})
            common = shared.get(sec.key, {})
            own = {k: v for k, v in vals.items() if k not in common}
            body = _lines_for(sec, own, keep_default)
            if body:
                lines += ["", f"[{head}.{sec.key}]", *body]
    return "\n".join(lines) + "\n"


__all__ = ["Design", "AxisSpec", "DesignFileError", "load_design", "loads_design", "dump_design", "key_lines",
           "machine_fields", "TOP_LEVEL"]
