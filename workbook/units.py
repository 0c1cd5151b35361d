"""One unit registry for the whole workbook, used at the boundary only.

Inputs arrive as text (``"63 mm"``, ``"2300 psi"``, ``"10 gpm"``, ``"46 cSt"``,
``"40 degC"``), as :mod:`pint` quantities, or as bare numbers in a field's display unit.
:func:`to_si` turns them into plain SI floats once; the physics never sees pint.
:func:`from_si` turns an SI float back into a display unit.

SI units used inside the workbook (the *internal* units):

==================  ==================  ==========================================
dimension name      internal unit       note
==================  ==================  ==========================================
length              m
area                m**2
volume              m**3
pressure            Pa                  gauge unless a name says ``abs``
flow                m**3/s
kinematic_viscosity m**2/s              1 cSt = 1 mm²/s = 1e-6 m²/s
dynamic_viscosity   Pa*s
temperature         K                   offset units (degC, degF) handled here
force               N
mass                kg
density             kg/m**3
velocity            m/s
angle               rad
time                s
power               W
shaft_speed         revolution/s        ``rpm`` is accepted
displacement        m**3                per revolution of a pump shaft
per_temperature     1/K                 thermal expansion coefficient
pressure_per_flow   Pa/(m**3/s)         valve override or opening gradient
dimensionless       1
==================  ==================  ==========================================

``gallon`` and ``gpm`` are US liquid gallons (NIST SP 811: 1 gal = 3.785 411 784 L).

>>> round(to_si("160 bar", "pressure", field="relief setting"))
16000000
>>> round(to_si("10 gpm", "flow", field="pump flow") * 60000, 4)   # L/min
37.8541
>>> round(to_si("40 degC", "temperature", field="oil temperature"), 2)
313.15
>>> round(from_si(0.063, "length", "in"), 4)
2.4803
"""

from __future__ import annotations

import math
import re
from functools import lru_cache
from typing import Any

import numpy as np

from . import safetext, unit_spelling
from .errors import InputError
from .formatting import kind_of, with_article

#: internal (SI) unit of each dimension name, as a pint unit expression
INTERNAL_UNIT: dict[str, str] = {
    "length": "m",
    "area": "m**2",
    "volume": "m**3",
    "pressure": "Pa",
    "flow": "m**3/s",
    "kinematic_viscosity": "m**2/s",
    "dynamic_viscosity": "Pa*s",
    "temperature": "K",
    "force": "N",
    "mass": "kg",
    "density": "kg/m**3",
    "velocity": "m/s",
    "angle": "rad",
    "time": "s",
    "power": "W",
    "shaft_speed": "revolution/s",
    "displacement": "m**3",
    "per_temperature": "1/K",
    "pressure_per_flow": "Pa/(m**3/s)",
    "dimensionless": "dimensionless",
}

#: examples shown in error messages, one per dimension name
EXAMPLES: dict[str, str] = {
    "length": "63 mm, 2.5 in",
    "area": "12 mm**2, 0.02 in**2",
    "volume": "1.5 L, 90 in**3",
    "pressure": "160 bar, 2300 psi, 16 MPa",
    "flow": "40 L/min, 10 gpm",
    "kinematic_viscosity": "46 cSt, 46 mm**2/s",
    "dynamic_viscosity": "0.04 Pa*s, 40 cP",
    "temperature": "40 degC, 104 degF, 313 K",
    "force": "25 kN, 5000 lbf",
    "mass": "800 kg, 1800 lb",
    "density": "870 kg/m**3",
    "velocity": "0.1 m/s, 100 mm/s",
    "angle": "30 deg",
    "time": "2 s",
    "power": "7.5 kW, 10 hp",
    "shaft_speed": "1500 rpm",
    "displacement": "16 cm**3, 1 in**3 (per revolution)",
    "per_temperature": "7e-4 1/K",
    "pressure_per_flow": "0.5 bar/(L/min)",
    "dimensionless": "0.61, 3",
}

_NUMBER = re.compile(r"^\s*([-+]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$")


@lru_cache(maxsize=1)
def registry():
    """The workbook's single :class:`pint.UnitRegistry`, built on first use.

    Adds ``gpm`` (US gallon per minute), the customary ``cc`` and ``rev`` (a revolution, as
    in ``cc/rev``) if absent.
    """
    import pint

    reg = pint.UnitRegistry(autoconvert_offset_to_baseunit=True)
    if "gpm" not in reg:
        reg.define("gpm = gallon / minute")
    if "cc" not in reg:
        reg.define("cc = cm**3")
    if "rev" not in reg:
        reg.define("rev = revolution")
    return reg


@lru_cache(maxsize=64)
def _dimensionality(dimension: str):
    return registry().Quantity(1.0, INTERNAL_UNIT[dimension]).dimensionality


def _check_dimension_name(dimension: str) -> None:
    if dimension not in INTERNAL_UNIT:
        raise KeyError(f"unknown dimension name {dimension!r}; known: {sorted(INTERNAL_UNIT)}")


def _clean_unit(text: str) -> str:
    """Unit text as pint's expression (:func:`workbook.unit_spelling.normalise`)."""
    return unit_spelling.normalise(text)


#: dimension names whose words are not the name itself
NOUNS = {"dimensionless": "plain number", "per_temperature": "coefficient per temperature"}


def noun(dimension: str) -> str:
    """A dimension name as words: ``"kinematic viscosity"``, ``"plain number"``."""
    return NOUNS.get(dimension, dimension.replace("_", " "))


def _words(dimension: str) -> str:
    """A dimension name as words with its article: ``"an angle"``, ``"a plain number"``."""
    return with_article(noun(dimension))


def _allowed(dimension: str) -> str:
    """What a quantity of ``dimension`` may be written as, e.g. ``an angle with a unit, e.g. 30 deg``."""
    if dimension == "dimensionless":
        return f"a plain number or a percentage, e.g. {EXAMPLES[dimension]}, 15 %"
    return f"{_words(dimension)} with a unit, e.g. {EXAMPLES[dimension]}"


#: the longest quantity text (number and unit) parsed; longer text is refused before pint sees it
MAX_TEXT = 80
#: the largest exponent magnitude of a unit power (``mm**3``, ``m**-1``)
MAX_EXPONENT = 12
_POWER = re.compile(r"(\*\*|\^)\s*")
_EXPONENT = re.compile(r"[-+]?\s*(?:\d+(?:\.\d*)?|\.\d+)")
#: units a dimensionless field accepts: a plain number or a percentage, never an angle
DIMENSIONLESS_UNITS = ("dimensionless", "percent")


def unit_problem(unit: str) -> str | None:
    """Why the unit text ``unit`` is refused before pint parses it, or None when it may be parsed.

    Pint evaluates a unit expression: a power of a power (``mm**9**9**9``) runs for hours and
    a very long name takes quadratic time. So the text is capped at :data:`MAX_TEXT`
    characters, every power must be a plain number of magnitude at most
    :data:`MAX_EXPONENT`, one power at a time, and control, zero-width and bidirectional
    characters (which the tokenizer would silently drop) are refused.

    >>> unit_problem("bar/(L/min)") is None
    True
    >>> unit_problem("mm**9**9**9")
    'one power at a time (a power of a power such as mm**9**9 is not a unit)'
    >>> unit_problem("m**40")
    'powers of at most 12 (m**40 was given)'
    """
    if len(unit) > MAX_TEXT:
        return f"a unit of at most {MAX_TEXT} characters ({len(unit)} were given)"
    found = safetext.first_unsafe(unit)
    if found is not None:
        return f"{safetext.ALLOWED} (found {safetext.describe(found[1])})"
    for m in _POWER.finditer(unit):
        exp = _EXPONENT.match(unit, m.end())
        if exp is None:
            return "powers that are plain numbers, e.g. mm**3"
        try:
            size = abs(float(exp.group(0).replace(" ", "")))
        except ValueError:
            return "powers that are plain numbers, e.g. mm**3"
        if _POWER.match(unit, exp.end()) or unit[exp.end():exp.end() + 1] == "(":
            return "one power at a time (a power of a power such as mm**9**9 is not a unit)"
        if size > MAX_EXPONENT:
            return f"powers of at most {MAX_EXPONENT} ({unit[m.start() - 1 if m.start() else 0:exp.end()].strip()} was given)"
    return None


@lru_cache(maxsize=1024)
def _parsed_unit(unit: str):
    """The pint unit of ``unit`` text, parsed once (pint's parser costs more than the arithmetic)."""
    return registry().Unit(unit)


def _number_text(number) -> str:
    """The number of a value as a person would retype it (for the advice in a message)."""
    if isinstance(number, np.ndarray):
        return "1" if number.size == 0 else _number_text(float(number.flat[0]))
    return f"{float(number):g}"


def _is_known(word: str) -> bool:
    try:
        _parsed_unit(word)
    except Exception:  # noqa: BLE001 - pint raises several types
        return False
    return True


def _quantity_of(number, unit: str, field: str, shown: Any, allowed: str):
    """``Quantity(number, unit)`` after :func:`unit_problem` and
    :func:`~workbook.unit_spelling.mark_problem`; every pint error as InputError."""
    reg = registry()
    problem = unit_problem(unit) or unit_spelling.mark_problem(unit, _number_text(number))
    if problem is not None:
        raise InputError(field, shown, f"{allowed} ({problem})")
    typed, unit = unit, _clean_unit(unit)
    try:
        return reg.Quantity(number, _parsed_unit(unit))
    except Exception as exc:  # noqa: BLE001 - pint raises several types (UndefinedUnitError, TokenError, ...)
        hint = unit_spelling.case_hint(unit, _is_known)
        raise InputError(field, shown, allowed + f" ('{typed}' is not a unit known here"
                         + (f"; {hint})" if hint else ")")) from exc


def _as_quantity(value: Any, dimension: str, field: str, default_unit: str | None):
    """Turn text, a pint quantity or a number into a pint quantity (not yet converted)."""
    reg = registry()
    allowed = _allowed(dimension)
    if isinstance(value, reg.Quantity):
        return value
    if hasattr(value, "magnitude") and hasattr(value, "units"):
        # a quantity from another pint registry: go through its text form
        try:
            return reg.Quantity(value.magnitude, str(value.units))
        except Exception as exc:  # noqa: BLE001 - re-raised as InputError
            raise InputError(field, value, allowed) from exc
    if isinstance(value, bool):
        raise InputError(field, value, allowed)
    if isinstance(value, (int, float, np.floating, np.integer)):
        try:
            number = float(value)
        except OverflowError:
            raise InputError(field, f"a number of {len(str(value))} digits",
                             allowed + " (a number this large is not finite)") from None
        if default_unit is None:
            if dimension == "dimensionless":
                return reg.Quantity(number, "dimensionless")
            raise InputError(field, value, allowed + " (a bare number needs a unit here)")
        return _quantity_of(number, str(default_unit), field, value, allowed)
    if isinstance(value, np.ndarray):
        unit = default_unit or ("dimensionless" if dimension == "dimensionless" else None)
        if unit is None:
            raise InputError(field, "an array without a unit", allowed)
        try:
            numbers = value.astype(float)
        except (TypeError, ValueError):
            raise InputError(field, "an array that is not numbers", allowed) from None
        return _quantity_of(numbers, str(unit), field, "an array", allowed)
    if isinstance(value, str):
        text = value.strip()
        if not text:
            raise InputError(field, "an empty entry", allowed)
        if len(text) > MAX_TEXT:
            raise InputError(field, repr(text), f"{allowed} (at most {MAX_TEXT} characters)")
        safetext.check(value, field)
        match = _NUMBER.match(text)
        if match is None:
            raise InputError(field, repr(value), allowed + " (start with a number)")
        number = float(match.group(1))
        unit = match.group(2)
        if not unit:
            if default_unit is None and dimension != "dimensionless":
                raise InputError(field, repr(value), allowed + " (the unit is missing)")
            unit = default_unit or "dimensionless"
        return _quantity_of(number, unit, field, repr(value), allowed)
    raise InputError(field, kind_of(value), allowed)


def to_si(value: Any, dimension: str, field: str = "value", default_unit: str | None = None):
    """Convert ``value`` to the internal SI unit of ``dimension``.

    Parameters
    ----------
    value : str, pint.Quantity, float or numpy.ndarray
        ``"63 mm"``, ``Q_(63, "mm")``, or a bare number taken in ``default_unit``.
    dimension : str
        One of :data:`INTERNAL_UNIT`'s keys, e.g. ``"pressure"``.
    field : str
        Name of the input, used in error messages.
    default_unit : str, optional
        Unit of a bare number. Without it a bare number is refused (except dimensionless).

    Returns
    -------
    float or numpy.ndarray
        Value in the internal unit (Pa, m, m³/s, K, ...). Never NaN or infinite.

    Raises
    ------
    InputError
        Unknown unit, wrong dimension, NaN or infinite value; the message names ``field``.

    >>> to_si("2.5 in", "length", field="bore")
    0.0635
    >>> to_si("5 bar", "length", field="rod")
    Traceback (most recent call last):
    ...
    workbook.errors.InputError: rod: got '5 bar'; allowed: a length with a unit, e.g. 63 mm, 2.5 in (a pressure was given)
    """
    _check_dimension_name(dimension)
    q = _as_quantity(value, dimension, field, default_unit)
    target = INTERNAL_UNIT[dimension]
    shown = repr(value) if isinstance(value, str) else value
    if q.dimensionality != _dimensionality(dimension):
        raise InputError(field, shown, f"{_allowed(dimension)} ({_understood(value, q, dimension)})")
    if dimension == "dimensionless" and str(q.units) not in DIMENSIONLESS_UNITS:
        raise InputError(field, shown, f"{_allowed(dimension)} (not a quantity in {q.units})")
    q = _per_turn(q, dimension, field, shown)
    magnitude = q.to(target).magnitude
    arr = np.asarray(magnitude, dtype=float)
    if not np.all(np.isfinite(arr)):
        words = "number" if dimension == "dimensionless" else noun(dimension)
        raise InputError(field, value, f"a finite {words} (not NaN or infinite)")
    if arr.ndim == 0:
        return float(arr)
    return arr


#: per dimension, the powers of the angle (radian) its units may carry, the internal unit's
#: first: an angle 1; a shaft speed 1 (rpm) or 0 (``1/min``, ``Hz``: revolutions understood);
#: a displacement 0 (``cm**3``: per revolution understood) or -1 (``cc/rev``). Pint counts the
#: radian as dimensionless, so the power is checked here.
ANGLE_POWERS = {"angle": (1,), "shaft_speed": (1, 0), "displacement": (0, -1)}


@lru_cache(maxsize=256)
def _angle_power(unit) -> int:
    """The power of the radian in ``unit`` (a pint unit), e.g. 1 for rpm, -1 for cm**3/rev."""
    root = registry().Quantity(1.0, unit).to_root_units()
    return int(round(dict(root.unit_items()).get("radian", 0)))


def _per_turn(q, dimension: str, field: str, shown: Any):
    """``q`` with the angle of its dimension's internal unit (see :data:`ANGLE_POWERS`).

    An angle must be written in an angle unit (``1 %`` is a ratio, refused). A shaft speed
    written without the revolution (``1450 1/min``, ``25 Hz``) counts revolutions, as motor
    plates mean it; a displacement written with it (``16 cc/rev``) is the volume of one
    revolution. Pint alone would read ``1/min`` as a radian a minute (a sixth of the rpm).
    """
    allowed = ANGLE_POWERS.get(dimension)
    if allowed is None:
        return q
    power = _angle_power(q.units)
    if power not in allowed:
        raise InputError(field, shown, f"{_allowed(dimension)} ({_understood(shown, q, dimension)})")
    if power == allowed[0]:
        return q
    return q * registry().Quantity(1.0, "revolution") ** (allowed[0] - power)


def _understood(value: Any, q, dimension: str) -> str:
    """What the refused ``value`` (of quantity ``q``) was read as, and what to write instead."""
    given = _describe(q)
    number = unit = None
    if isinstance(value, str):
        match = _NUMBER.match(value.strip().strip("'"))
        if match is not None:
            number, unit = match.group(1), _clean_unit(match.group(2))
    hint = unit_spelling.trap(unit or "", dimension, number, given)
    return hint or f"{given} was given"


def _describe(q) -> str:
    """Words for the kind of quantity ``q`` is: ``"a mass"``, ``"an angle"``, ``"a percentage"``."""
    if q.dimensionless:
        if _angle_power(q.units) != 0:
            return "an angle"
        return "a percentage" if str(q.units) == "percent" else "a plain number"
    return _describe_dimension(q.dimensionality)


def from_si(value, dimension: str, unit: str):
    """Convert an SI float (or array) of ``dimension`` to ``unit``.

    >>> round(from_si(16e6, "pressure", "psi"), 1)
    2320.6
    >>> round(from_si(313.15, "temperature", "degC"), 2)
    40.0
    """
    _check_dimension_name(dimension)
    reg = registry()
    q = reg.Quantity(np.asarray(value, dtype=float), INTERNAL_UNIT[dimension]).to(_clean_unit(unit))
    mag = q.magnitude
    return float(mag) if np.ndim(mag) == 0 else np.asarray(mag)


def quantity(value, dimension: str, unit: str | None = None):
    """A pint quantity of an SI value, optionally converted to ``unit``.

    >>> str(quantity(0.063, "length", "mm"))
    '63.0 millimeter'
    """
    _check_dimension_name(dimension)
    q = registry().Quantity(value, INTERNAL_UNIT[dimension])
    return q.to(_clean_unit(unit)) if unit else q


def check_unit(unit: str, dimension: str) -> str:
    """Return ``unit`` if it measures ``dimension``; raise :class:`KeyError` otherwise."""
    _check_dimension_name(dimension)
    q = registry().Quantity(1.0, _clean_unit(unit))
    if q.dimensionality != _dimensionality(dimension):
        raise KeyError(f"unit {unit!r} does not measure {dimension}")
    return unit


_DIM_WORDS = None


def _describe_dimension(dimensionality) -> str:
    global _DIM_WORDS
    if _DIM_WORDS is None:
        _DIM_WORDS = {}
        for name in INTERNAL_UNIT:
            if name in ("displacement",):
                continue
            _DIM_WORDS.setdefault(_dimensionality(name), noun(name))
    word = _DIM_WORDS.get(dimensionality)   # by the dimensionality itself: its text depends on the order
    if word is None:
        return f"a quantity of dimension {dimensionality}"
    return with_article(word)


def format_value(si_value: float, dimension: str, unit: str, digits: int = 4) -> str:
    """Format an SI value in ``unit`` with ``digits`` significant digits.

    >>> format_value(16e6, "pressure", "bar")
    '160 bar'
    >>> format_value(6.6666e-4, "flow", "L/min")
    '40 L/min'
    """
    v = from_si(si_value, dimension, unit)
    if v == 0 or not math.isfinite(v):
        text = f"{v:g}"
    else:
        text = f"{v:.{digits}g}"
    return f"{text} {unit}".strip() if unit != "dimensionless" else text


__all__ = [
    "INTERNAL_UNIT",
    "EXAMPLES",
    "registry",
    "to_si",
    "from_si",
    "quantity",
    "check_unit",
    "unit_problem",
    "MAX_TEXT",
    "format_value",
    "noun",
    "NOUNS",
    "ANGLE_POWERS",
]
