"""What people type for a unit: the spellings read, the marks refused, the traps explained.

:mod:`workbook.units` hands every unit text here before pint reads it. Three jobs, all on
plain text (no pint here, so the tables can be read and tested on their own):

* :func:`normalise` turns the spellings of the trade into pint's: ``°C``, ``deg C``, ``℃``
  as ``degC``; ``cm3``, ``mm2/s``, ``kg/m3`` (a digit power after a unit) as ``cm**3`` ...;
  ``min-1`` and ``min⁻¹`` as ``min**-1``; ``lpm`` as ``(L/min)``; ``cc/rev``, ``N·m``.
* :func:`mark_problem` refuses a gauge or absolute mark after a pressure (``barg``,
  ``bar g``, ``psig``, ``bara``, ``bar abs``): the workbook's pressures are gauge, and the one
  absolute limit says so in its name, so a mark is never needed and a wrong one would move
  a value by an atmosphere without a word.
* :func:`trap` explains a unit that pint reads as something else in SI (``15 C`` is 15
  coulomb, ``15 F`` 15 farad, ``10 lb`` a mass where a force is wanted, ``1 %`` a ratio
  where an angle is wanted) and says what to write; :func:`case_hint` names the unit a
  wrongly cased symbol was meant to be (``Mpa`` for ``MPa``).

>>> normalise("cm3/rev"), normalise("deg C"), normalise("40 lpm".split()[1]), normalise("min⁻¹")
('cm**3/rev', 'degC', '(L/min)', 'min**-1')
>>> mark_problem("barg", "160")
"pressures are gauge here: write 160 bar, without the gauge mark 'g'"
>>> trap("C", "temperature", "15", "a quantity of dimension [current] * [time]")
'C is the coulomb, an electric charge; for a temperature write 15 degC or 15 °C'
"""

from __future__ import annotations

import math
import re

#: symbols replaced as they stand, before anything else (pint reads the right-hand side)
SYMBOLS = {
    "°C": "degC",
    "°F": "degF",
    "℃": "degC",
    "℉": "degF",
    "⁻¹": "**-1",
    "⁻²": "**-2",
    "⁻³": "**-3",
    "²": "**2",
    "³": "**3",
    "µ": "u",
    "μ": "u",
    "·": "*",
}

#: whole words replaced (a word is a run of letters and underscores): spellings of the trade
#: that pint does not know, each unambiguous
WORDS = {
    "lpm": "(L/min)",
    "LPM": "(L/min)",
    "Lpm": "(L/min)",
    "GPM": "gpm",
    "RPM": "rpm",
    "PSI": "psi",
    "HP": "hp",
    "Celsius": "degC",
    "Fahrenheit": "degF",
}

_WORD = re.compile(r"[A-Za-z_]+")
#: "deg C", "degree C", "degrees F", "° C", "deg c": a temperature scale written in two parts
_SCALE = re.compile(r"(?<![A-Za-z_])(?:°|degrees?|deg)\s*([CFcf]|[Cc]elsius|[Ff]ahrenheit)(?![A-Za-z_])")
#: a digit power written straight after a unit (cm3, mm2, kg/m3), and a negative one (min-1)
_DIGIT_POWER = re.compile(r"(?<=[A-Za-z])([23])(?=$|[\s/*)^])")
_NEGATIVE_POWER = re.compile(r"(?<=[A-Za-z])-([123])(?=$|[\s/*)^])")

#: a pressure unit followed by a gauge or absolute mark: barg, bar g, bar(g), psig, bara, bar abs
_MARK = re.compile(r"^\s*(?P<unit>[kMm]?(?:bar|Pa)|psi)\s*(?:\(\s*)?(?P<mark>g|gauge|gage|a|abs|absolute)"
                   r"(?:\s*\))?\s*$")
_GAUGE_MARKS = ("g", "gauge", "gage")


def normalise(unit: str) -> str:
    """``unit`` as pint's expression; spellings pint knows pass unchanged.

    >>> normalise("°C"), normalise("mm2/s"), normalise("kg/m3"), normalise("cm**3"), normalise("N·m")
    ('degC', 'mm**2/s', 'kg/m**3', 'cm**3', 'N*m')
    >>> normalise("cmH2O"), normalise("1/min"), normalise("bar/lpm"), normalise("/°C")
    ('cmH2O', '1/min', 'bar/(L/min)', '1/degC')
    """
    for old, new in SYMBOLS.items():
        unit = unit.replace(old, new)
    unit = _SCALE.sub(lambda m: "deg" + m.group(1)[0].upper(), unit)
    unit = _WORD.sub(lambda m: WORDS.get(m.group(0), m.group(0)), unit)
    unit = _DIGIT_POWER.sub(r"**\1", unit)
    unit = _NEGATIVE_POWER.sub(r"**-\1", unit)
    return "1" + unit if unit.startswith("/") else unit   # "/K" for "1/K"


def mark_problem(unit: str, number: str = "160") -> str | None:
    """Why a gauge or absolute mark after a pressure is refused, or None when there is none.

    >>> mark_problem("bar")
    >>> print(mark_problem("bar abs", "0.3"))  # doctest: +NORMALIZE_WHITESPACE
    write the pressure without the absolute mark 'abs': pressures here are gauge except in a field
    whose name says absolute, such as the cavitation limit, which takes the absolute value as written: 0.3 bar
    """
    m = _MARK.match(unit)
    if m is None:
        return None
    plain = f"{number} {m.group('unit')}"
    if m.group("mark") in _GAUGE_MARKS:
        return f"pressures are gauge here: write {plain}, without the gauge mark '{m.group('mark')}'"
    return (f"write the pressure without the absolute mark '{m.group('mark')}': pressures here are gauge except "
            f"in a field whose name says absolute, such as the cavitation limit, which takes the absolute value "
            f"as written: {plain}")


#: unit text that pint reads as another quantity: what it is, and per wanted dimension what to
#: write (``{n}`` is the number the user typed)
TRAPS = {
    "C": ("C is the coulomb, an electric charge",
          {"temperature": "for a temperature write {n} degC or {n} °C"}),
    "F": ("F is the farad, an electric capacitance",
          {"temperature": "for a temperature write {n} degF or {n} °F"}),
    "c": ("c is the speed of light",
          {"temperature": "for a temperature write {n} degC or {n} °C"}),
    "1/C": ("C is the coulomb, an electric charge",
            {"per_temperature": "for a coefficient per degree write {n} 1/K or {n} 1/degC"}),
    "1/F": ("F is the farad, an electric capacitance",
            {"per_temperature": "for a coefficient per degree Fahrenheit write {n} 1/degF"}),
    "deg": ("deg is the degree of arc, an angle",
            {"temperature": "for a temperature write {n} degC or {n} degF"}),
    "degree": ("degree is the degree of arc, an angle",
               {"temperature": "for a temperature write {n} degC or {n} degF"}),
    "°": ("° alone is the degree of arc, an angle",
          {"temperature": "for a temperature write {n} °C or {n} °F"}),
    "lb": ("lb is the pound as a mass",
           {"force": "the pound-force is lbf: write {n} lbf"}),
    "kn": ("kn is the knot, a speed",
           {"force": "for kilonewtons write {n} kN"}),
    "m": ("m is the metre",
          {"time": "for minutes write {n} min"}),
    "pct": ("pct reads as the picocarat, a mass",
            {"dimensionless": "for a percentage write {n} %"}),
}

#: what to write when the dimension given is a classic stand-in for the one wanted
#: ((given, wanted) -> advice); given words as :mod:`workbook.units` describes them
STAND_INS = {
    ("a mass", "force"): "a mass is not a force: write the force in N, kN or lbf; "
                         "a mass of 1 t weighs 9.807 kN at standard gravity",
    ("a force", "mass"): "a force is not a mass: write the mass in kg, t or lb",
}


def trap(unit: str, wanted: str, number: str | None, given: str) -> str | None:
    """What ``unit`` was understood as and what to write for a quantity of ``wanted``.

    ``unit`` is the unit text as normalised, ``number`` the number typed (None when the value
    was not text), ``given`` the words for the dimension pint found ("a mass").

    >>> trap("%", "angle", "1", "a percentage")
    'a percent is a ratio, not an angle: write an angle such as 3 deg; a slope of 1 % is an angle of 0.5729 deg'
    >>> trap("lb", "force", "10", "a mass")
    'lb is the pound as a mass; the pound-force is lbf: write 10 lbf'
    >>> trap("kg", "force", "80", "a mass")
    'a mass is not a force: write the force in N, kN or lbf; a mass of 1 t weighs 9.807 kN at standard gravity'
    """
    key = unit.strip()
    n = number if number is not None else "1"
    if wanted == "angle" and key in ("%", "percent"):
        text = "a percent is a ratio, not an angle: write an angle such as 3 deg"
        try:
            slope = math.degrees(math.atan(float(n) / 100.0))
        except ValueError:
            return text
        return text + f"; a slope of {n} % is an angle of {slope:.4g} deg"
    if wanted == "angle" and given in ("a plain number", "a percentage"):
        return "a plain number or ratio is not an angle: write the angle with its unit, e.g. 3 deg"
    if key in TRAPS and wanted in TRAPS[key][1]:
        meaning, advice = TRAPS[key]
        return f"{meaning}; {advice[wanted].format(n=n)}"
    return STAND_INS.get((given, wanted))


#: unit symbols a wrongly cased spelling is matched against (case matters in SI: mm and Mm)
KNOWN = ("mm", "cm", "m", "in", "ft", "bar", "mbar", "psi", "Pa", "kPa", "MPa", "N", "kN", "lbf", "L", "mL",
         "cSt", "cP", "degC", "degF", "K", "rpm", "W", "kW", "hp", "kg", "lb", "s", "ms", "min", "h", "deg",
         "rad", "turn", "Hz", "gpm", "cc")
_BY_FOLDED = {}
for _k in KNOWN:
    _BY_FOLDED.setdefault(_k.casefold(), _k)


def case_hint(unit: str, is_known) -> str | None:
    """For a unit pint does not know: the symbol a wrongly cased word was meant to be.

    ``is_known(word)`` tells whether the registry knows ``word``.

    >>> case_hint("Mpa", lambda w: False), case_hint("KN/mm", lambda w: w == "mm"), case_hint("zz", lambda w: False)
    ('did you mean MPa? unit symbols are case-sensitive', 'did you mean kN? unit symbols are case-sensitive', None)
    """
    for word in _WORD.findall(unit):
        if is_known(word):
            continue
        meant = _BY_FOLDED.get(word.casefold())
        if meant is not None and meant != word:
            return f"did you mean {meant}? unit symbols are case-sensitive"
    return None


__all__ = ["SYMBOLS", "WORDS", "TRAPS", "STAND_INS", "KNOWN", "normalise", "mark_problem", "trap", "case_hint"]
