"""Input declarations: each input of the workbook is declared once, here.

A :class:`Field` says what an input is: its key, label, dimension and display unit, its
bounds, its default, one line of help and where the default comes from. That single
declaration drives

* parsing and validation (:meth:`Field.parse`, with an :class:`~workbook.errors.InputError`
  that names the field and what is allowed),
* the widgets of the study panels (label, unit, slider range, help text),
* the JSON Schema of the design record (:meth:`Section.json_schema`),
* the input tables of the exported record.

A :class:`Section` is a named group of fields (the cylinder, the oil, the supply, ...).
The catalogue of sections lives in :mod:`workbook.inputs`.

>>> bore = Field("bore", "Bore", "length", "mm", 80, low=0, low_open=True, high=1000,
...              help="piston diameter", source="user's data sheet")
>>> bore.parse("3.15 in")
0.08001
>>> bore.parse("-5 mm")
Traceback (most recent call last):
...
workbook.errors.InputError: bore: got -5 mm; allowed: a length greater than 0 mm and at most 1000 mm
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any, Mapping

from . import safetext, units
from .errors import InputError
from .formatting import with_article

#: field kinds that are not physical quantities
NON_QUANTITY = ("text", "choice", "flag", "quantity_list")


@dataclass(frozen=True)
class Field:
    """One declared input.

    Parameters
    ----------
    key : str
        Identifier used in design files, records and code (``"bore"``).
    label : str
        Words shown to a person (``"Bore"``).
    dimension : str
        A dimension name of :mod:`workbook.units` (``"length"``), or one of ``"text"``,
        ``"choice"``, ``"flag"`` (true/false) or ``"quantity_list"`` (a list of quantities of
        ``list_dimension``).
    unit : str
        Display unit; bare numbers are taken in it; bounds and default are given in it.
    default : Any
        Default in the display unit (a number), or text, choice or list.
    low, high : float, optional
        Bounds in the display unit. ``low_open``/``high_open`` make them exclusive.
    help : str
        One line of help.
    source : str
        Where the default comes from: a standard, "common practice", "from memory",
        "demo scenario" or "user's data sheet".
    choices : tuple of str
        Allowed values of a ``"choice"`` field.
    slider : tuple, optional
        ``(min, max, step)`` in the display unit, for a slider beside the text entry.
    list_dimension : str
        Dimension of each entry of a ``"quantity_list"``.
    optional : bool
        The field may be left empty (None).
    integer : bool
        Only whole numbers are accepted (``points = 20.5`` is refused, not rounded).
    required : bool
        Machine data a design file must give (bore, loads, pump, ratings...): the default is
        the demo scenario's, used only where the workbook opens on the demo, never silently
        for a design file that leaves the field out.
    """

    key: str
    label: str
    dimension: str
    unit: str = ""
    default: Any = None
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    high_open: bool = False
    help: str = ""
    source: str = ""
    choices: tuple = ()
    slider: tuple | None = None
    list_dimension: str = ""
    optional: bool = False
    integer: bool = False
    required: bool = False

    # ------------------------------------------------------------------ parsing
    @property
    def is_quantity(self) -> bool:
        return self.dimension not in NON_QUANTITY

    def allowed(self) -> str:
        """Plain words for what this field accepts."""
        if self.dimension == "text":
            return "text"
        if self.dimension == "flag":
            return "true or false"
        if self.dimension == "choice":
            return "one of " + ", ".join(repr(c) for c in self.choices)
        dim = self.list_dimension if self.dimension == "quantity_list" else self.dimension
        words = "whole number" if self.integer else units.noun(dim)
        if self.dimension == "quantity_list":
            words = f"a list of {words}s"
        else:
            words = with_article(words)
        parts = []
        if self.low is not None:
            parts.append(f"{'greater than' if self.low_open else 'at least'} {_fmt(self.low)} {self.unit}".rstrip())
        if self.high is not None:
            parts.append(f"{'less than' if self.high_open else 'at most'} {_fmt(self.high)} {self.unit}".rstrip())
        if parts:
            words += " " + " and ".join(parts)
        return words

    def _bounds_si(self, dim: str):
        cached = self.__dict__.get("_bounds_cache")
        if cached is not None and cached[0] == dim:
            return cached[1]
        lo = None if self.low is None else units.to_si(self.low, dim, self.key, self.unit)
        hi = None if self.high is None else units.to_si(self.high, dim, self.key, self.unit)
        object.__setattr__(self, "_bounds_cache", (dim, (lo, hi)))  # the field is frozen: its bounds too
        return lo, hi

    def _parse_one(self, value: Any, dim: str) -> float:
        si = units.to_si(value, dim, self.key, self.unit or None)
        if not isinstance(si, float):
            raise InputError(self.key, value, "a single value, not a list")
        lo, hi = self._bounds_si(dim)
        tol = 1e-12 * max(1.0, abs(si))
        bad = False
        if lo is not None and (si < lo - tol or (self.low_open and si <= lo + tol)):
            bad = True
        if hi is not None and (si > hi + tol or (self.high_open and si >= hi - tol)):
            bad = True
        if self.integer and si != int(si):
            raise InputError(self.key, value if isinstance(value, str) else _fmt(si, 17), self.allowed())
        if bad:
            shown = value if isinstance(value, str) else f"{_fmt(units.from_si(si, dim, self.unit))} {self.unit}".strip()
            raise InputError(self.key, shown, self.allowed())
        return si

    def parse(self, value: Any):
        """Parse and validate ``value``; return an SI float (or text, choice, bool, list).

        Raises :class:`~workbook.errors.InputError` naming this field.
        """
        if value is None or (self.optional and isinstance(value, str) and not value.strip()):
            if self.optional:
                return None
            raise InputError(self.key, "nothing", self.allowed())
        if self.dimension == "text":
            if not isinstance(value, str):
                raise InputError(self.key, repr(value), "text")
            return safetext.check(value, self.key)
        if self.dimension == "flag":
            if isinstance(value, bool):
                return value
            if isinstance(value, str) and value.strip().lower() in ("true", "false", "yes", "no"):
                return value.strip().lower() in ("true", "yes")
            raise InputError(self.key, repr(value), self.allowed())
        if self.dimension == "choice":
            if not isinstance(value, str):
                raise InputError(self.key, safetext.excerpt(repr(value)), self.allowed())
            text = value.strip()
            if text not in self.choices:
                raise InputError(self.key, repr(value), self.allowed())
            return text
        if self.dimension == "quantity_list":
            if isinstance(value, str):
                value = [v for v in value.replace(";", ",").split(",") if v.strip()]
            if isinstance(value, (list, tuple)) and not value and self.optional:
                return []                      # an optional list may be empty
            if not isinstance(value, (list, tuple)) or not value:
                raise InputError(self.key, repr(value), self.allowed() + " (at least one)")
            return [self._parse_one(v, self.list_dimension) for v in value]
        return self._parse_one(value, self.dimension)

    # ------------------------------------------------------------------ display
    def to_display(self, si_value):
        """SI value to a number in the display unit (lists and text pass through)."""
        if self.dimension in ("text", "choice", "flag") or si_value is None:
            return si_value
        if self.dimension == "quantity_list":
            return [units.from_si(v, self.list_dimension, self.unit) for v in si_value]
        return units.from_si(si_value, self.dimension, self.unit)

    def as_text(self, si_value, digits: int = 6) -> str:
        """SI value as text with its display unit, e.g. ``"80 mm"``; round-trips through parse."""
        if self.dimension in ("text", "choice"):
            return str(si_value)
        if self.dimension == "flag":
            return "true" if si_value else "false"
        if si_value is None:
            return ""
        if self.dimension == "quantity_list":
            return ", ".join(f"{_fmt(v, digits)} {self.unit}".strip() for v in self.to_display(si_value))
        return f"{_fmt(self.to_display(si_value), digits)} {self.unit}".strip()

    def default_text(self) -> str:
        """The default as text a person would type."""
        if self.dimension in ("text", "choice"):
            return "" if self.default is None else str(self.default)
        if self.dimension == "flag":
            return "true" if self.default else "false"
        if self.default is None:
            return ""
        if self.dimension == "quantity_list":
            return ", ".join(f"{_fmt(v)} {self.unit}".strip() for v in self.default)
        return f"{_fmt(self.default)} {self.unit}".strip()

    def default_si(self):
        """The default parsed to SI (None for an optional field with no default)."""
        if self.default is None:
            return None
        if self.dimension == "quantity_list":
            return [self._parse_one(v, self.list_dimension) for v in self.default]
        if self.dimension in ("text", "choice", "flag"):
            return self.parse(self.default)
        return self.parse(self.default)

    def json_schema(self) -> dict:
        """JSON Schema of this field's entry in a design record (text with unit, etc.)."""
        base: dict[str, Any] = {"description": f"{self.label}: {self.help}".strip(": ")}
        if self.dimension == "text":
            base["type"] = "string"
        elif self.dimension == "flag":
            base["type"] = "boolean"
        elif self.dimension == "choice":
            base["enum"] = list(self.choices)
        elif self.dimension == "quantity_list":
            base.update({"type": "array", "items": {"type": "number"}, "minItems": 0 if self.optional else 1})
        else:
            base["type"] = "number"
        if self.optional:
            base = {"anyOf": [base, {"type": "null"}], "description": base["description"]}
        return base


@dataclass(frozen=True)
class Section:
    """A named group of fields, e.g. the cylinder or the supply."""

    key: str
    title: str
    fields: tuple[Field, ...]
    help: str = ""
    #: the study kind that alone uses this section ("" for every study): a review copy shows
    #: the section's inputs only when that study is in the record
    only_for: str = ""

    def __post_init__(self):
        keys = [f.key for f in self.fields]
        if len(keys) != len(set(keys)):
            raise ValueError(f"duplicate field keys in section {self.key}")

    def __getitem__(self, key: str) -> Field:
        for f in self.fields:
            if f.key == key:
                return f
        raise KeyError(f"section {self.key!r} has no field {key!r}")

    def __iter__(self):
        return iter(self.fields)

    @property
    def keys(self) -> tuple[str, ...]:
        return tuple(f.key for f in self.fields)

    def parse(self, mapping: Mapping[str, Any] | None, where: str = "", use_defaults: bool = True) -> dict:
        """Parse a mapping of raw entries into SI values, filling defaults.

        Unknown keys are refused with the list of known ones. ``where`` (for example
        ``"lift.cylinder"``) is prefixed to field names in error messages.
        """
        mapping = dict(mapping or {})
        prefix = f"{where}." if where else ""
        unknown = sorted(set(mapping) - set(self.keys))
        if unknown:
            raise InputError(prefix + unknown[0], "an unknown entry", "one of " + ", ".join(self.keys))
        out = {}
        for f in self.fields:
            if f.key in mapping:
                try:
                    out[f.key] = f.parse(mapping[f.key])
                except InputError as exc:
                    raise type(exc)(prefix + exc.field, exc.given, exc.allowed) from None
            elif use_defaults and (f.default is not None or f.optional):
                out[f.key] = f.default_si()
            else:
                raise InputError(prefix + f.key, "nothing (the entry is missing)", f.allowed())
        return out

    def defaults(self) -> dict:
        """Defaults of every field, in SI."""
        return {f.key: f.default_si() for f in self.fields}

    def as_text(self, values: Mapping[str, Any]) -> dict[str, str]:
        """SI values back to text entries with units (what a design file holds)."""
        return {f.key: f.as_text(values[f.key]) for f in self.fields if f.key in values and values[f.key] is not None}

    def json_schema(self) -> dict:
        return {
            "type": "object",
            "title": self.title,
            "properties": {f.key: f.json_schema() for f in self.fields},
            "additionalProperties": False,
        }


def _fmt(x: float, digits: int = 6) -> str:
    if isinstance(x, str):
        return x
    if x == 0:
        return "0"
    if not math.isfinite(x):
        return str(x)
    return f"{x:.{digits}g}"


__all__ = ["Field", "Section", "NON_QUANTITY"]
