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


_AN_WORDS = ("hour", "honest", "heir")
_A_WORDS = ("uni", "use", "usu", "user", "one", "once", "euro")


def with_article(words: str) -> str:
    """``words`` after "a" or "an", as it is spoken: the one place messages choose the article.

    >>> with_article("angle"), with_article("length"), with_article("area"), with_article("unit")
    ('an angle', 'a length', 'an area', 'a unit')
    >>> with_article("80 mm bore"), with_article("18 kN load"), with_article("180 mm bore"), with_article("int")
    ('an 80 mm bore', 'an 18 kN load', 'a 180 mm bore', 'an int')
    """
    text = words.strip()
    low = text.lower()
    digits = len(low) - len(low.lstrip("0123456789"))
    if digits:
        # spoken numbers: 8, 80, 800 ("eight..."), 11 and 18 ("eleven", "eighteen"), 11,000 and 18,000
        lead = low[:digits]
        an = lead.startswith("8") or (lead[:2] in ("11", "18") and len(lead) in (2, 5))
    elif low.startswith(_AN_WORDS):
        an = True
    elif low.startswith(_A_WORDS):
        an = False
    else:
        an = low[:1] in tuple("aeiou")
    return f"{'an' if an else 'a'} {text}"


def kind_of(value) -> str:
    """What kind of Python value ``value`` is, in words for a message: ``"an int"``, ``"a list"``,
    ``"None"``.

    >>> kind_of(3), kind_of([1]), kind_of(None), kind_of({})
    ('an int', 'a list', 'None', 'a dict')
    """
    if value is None:
        return "None"
    return with_article(type(value).__name__)


__all__ = ["MISSING", "number", "pretty_unit", "quantity", "with_article", "kind_of"]
