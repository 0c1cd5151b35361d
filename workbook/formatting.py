"""How the workbook writes a number and a unit, in one place for every screen and file.

One number rule (``digits`` significant digits, 4 on screens and in summaries, zero as
``0``, a list as its items joined by commas, a flag as yes/no, infinity as ``∞``) and one
missing-value token, :data:`MISSING`. The panels, the verdict, the command line and the
study summaries call :func:`number`; the review copy calls it with more digits where a
reviewer re-checks by hand. :func:`pretty_unit` writes a unit as people write it.

>>> number(269.7312), number(0.0), number(None), number(1234567.0), number([1.5, 2.0])
('269.7', '0', '–', '1.235e+06', '1.5, 2')
>>> number(float("inf")), number(True), number(12.3456789, 6)
('∞', 'yes', '12.3457')
>>> quantity(0.5, "m**3")
'0.5 m³'
"""

from __future__ import annotations

import math

#: what every screen and summary shows where a value is missing
MISSING = "–"


def number(value, digits: int = 4, missing: str = MISSING) -> str:
    """``value`` to ``digits`` significant digits (see the module docstring for the rule)."""
    if value is None:
        return missing
    if isinstance(value, bool):
        return "yes" if value else "no"
    if isinstance(value, (list, tuple)):
        return ", ".join(number(v, digits, missing) for v in value)
    if isinstance(value, str):
        return value
    value = float(value)
    if not math.isfinite(value):
        return "∞" if value > 0 else ("–∞" if value < 0 else missing)
    if value == 0:
        return "0"
    return f"{value:.{digits}g}"


def pretty_unit(unit: str) -> str:
    """A unit as people write it: ``cm**3`` as ``cm³``, ``degC`` as ``°C``.

    >>> pretty_unit("kg/m**3"), pretty_unit("degC")
    ('kg/m³', '°C')
    """
    return (unit.replace("**2", "\u00b2").replace("**3", "\u00b3").replace("degC", "\u00b0C")
            .replace("degF", "\u00b0F"))


def quantity(value, unit: str, digits: int = 4) -> str:
    """A number and its unit as people write them (``%`` set off by a space)."""
    unit = pretty_unit(unit or "")
    return f"{number(value, digits)} {unit}".strip()


__all__ = ["MISSING", "number", "pretty_unit", "quantity"]
