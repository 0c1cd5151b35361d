"""Every refusal of the unit layer, word for word: the message names the field, what was given
and what is allowed (DEVELOPERS.md "Bad input": ``field: got <given>; allowed: <allowed>``), and
each guard of ``units.unit_problem`` refuses exactly beyond its stated limit (80 characters,
powers of at most 12, one power at a time, no invisible characters; DEVELOPERS.md "Hostile
input"). The wording is the contract a notebook shows beside the field, so it is pinned here.
"""

from __future__ import annotations

import numpy as np
import pint
import pytest

from workbook import units
from workbook.errors import InputError

LENGTH = "a length with a unit, e.g. 63 mm, 2.5 in"


@pytest.mark.parametrize("unit, problem", [
    ("x" * 80, None),                                           # at the limit: allowed
    ("x" * 81, "a unit of at most 80 characters (81 were given)"),
    ("m**12", None),
    ("m**13", "powers of at most 12 (m**13 was given)"),
    ("m**- 12", None),
    ("m**- 13", "powers of at most 12 (m**- 13 was given)"),   # sign and space read as one number
    ("**40", "powers of at most 12 (**40 was given)"),          # a power at the very start
    ("m**x", "powers that are plain numbers, e.g. mm**3"),
    ("m**2(s)", "one power at a time (a power of a power such as mm**9**9 is not a unit)"),
    ("m**2**2", "one power at a time (a power of a power such as mm**9**9 is not a unit)"),
    ("mm\u200b", "text without control, zero-width or bidirectional characters (found U+200B ZERO WIDTH SPACE)"),
    ("bar/(L/min)", None),
])
def test_unit_problem_at_each_limit(unit, problem):
    assert units.unit_problem(unit) == problem


def _message(*args, **kw):
    with pytest.raises(InputError) as err:
        units.to_si(*args, **kw)
    return str(err.value)


class _OnlyMagnitude:
    magnitude = 3.0


@pytest.mark.parametrize("args, kw, message", [
    (("5 m**40", "length"), {"field": "bore"},
     f"bore: got '5 m**40'; allowed: {LENGTH} (powers of at most 12 (m**40 was given))"),
    ((_OnlyMagnitude(), "length"), {}, f"value: got a _OnlyMagnitude; allowed: {LENGTH}"),
    ((10 ** 400, "length"), {"default_unit": "mm"},
     f"value: got a number of 401 digits; allowed: {LENGTH} (a number this large is not finite)"),
    ((3, "length"), {}, f"value: got 3; allowed: {LENGTH} (a bare number needs a unit here)"),
    ((np.array([1.0, 2.0]), "length"), {}, f"value: got an array without a unit; allowed: {LENGTH}"),
    ((np.array(["a"]), "length"), {"default_unit": "mm"}, f"value: got an array that is not numbers; allowed: {LENGTH}"),
    ((np.array([1.0]), "length"), {"default_unit": "furlongz"},
     f"value: got an array; allowed: {LENGTH} ('furlongz' is not a unit known here)"),
    (("  ", "length"), {}, f"value: got an empty entry; allowed: {LENGTH}"),
    (("1" * 81, "length"), {}, f"value: got '{'1' * 81}'; allowed: {LENGTH} (at most 80 characters)"),
    (("abc", "length"), {}, f"value: got 'abc'; allowed: {LENGTH} (start with a number)"),
    (("12", "length"), {}, f"value: got '12'; allowed: {LENGTH} (the unit is missing)"),
    (([1], "length"), {}, f"value: got a list; allowed: {LENGTH}"),
    (("5 bar", "kinematic_viscosity"), {},
     "value: got '5 bar'; allowed: a kinematic viscosity with a unit, e.g. 46 cSt, 46 mm**2/s (a pressure was given)"),
    (("30 deg", "dimensionless"), {},
     "value: got '30 deg'; allowed: a plain number or a percentage, e.g. 0.61, 3, 15 % (not a quantity in degree)"),
    ((float("nan"), "kinematic_viscosity"), {"default_unit": "cSt"},
     "value: got nan; allowed: a finite kinematic viscosity (not NaN or infinite)"),
    (("1 L", "length"), {}, f"value: got '1 L'; allowed: {LENGTH} (a volume was given)"),
    (("1 mm**2", "length"), {}, f"value: got '1 mm**2'; allowed: {LENGTH} (an area was given)"),
    (("1 m**4", "length"), {}, f"value: got '1 m**4'; allowed: {LENGTH} (a quantity of dimension [length] ** 4 was given)"),
    (("1 cSt", "length"), {}, f"value: got '1 cSt'; allowed: {LENGTH} (a kinematic viscosity was given)"),
    (("1 1/K", "length"), {}, f"value: got '1 1/K'; allowed: {LENGTH} (a coefficient per temperature was given)"),
    (("1 bar/(L/min)", "length"), {}, f"value: got '1 bar/(L/min)'; allowed: {LENGTH} (a pressure per flow was given)"),
    (("abc", "kinematic_viscosity"), {},
     "value: got 'abc'; allowed: a kinematic viscosity with a unit, e.g. 46 cSt, 46 mm**2/s (start with a number)"),
])
def test_each_refusal_word_for_word(args, kw, message):
    assert _message(*args, **kw) == message


def test_what_each_branch_accepts():
    # by hand: 63 mm = 0.063 m; a bare number takes the field's unit; a plain number or an
    # array is dimensionless without one; a quantity of another pint registry is taken by its text
    other = pint.UnitRegistry()
    assert units.to_si(other.Quantity(63, "mm"), "length") == pytest.approx(0.063, rel=1e-12)
    assert units.to_si(3, "dimensionless") == 3.0
    assert units.to_si("12", "dimensionless") == 12.0
    assert units.to_si("12", "length", default_unit="mm") == pytest.approx(0.012, rel=1e-12)
    assert units.to_si(np.array([0.5, 2.0]), "dimensionless").tolist() == [0.5, 2.0]
    assert units.to_si(np.array([63.0]), "length", default_unit="mm").tolist() == pytest.approx([0.063])


def test_check_unit_and_unknown_dimension_names():
    assert units.check_unit("mm", "length") == "mm"
    with pytest.raises(KeyError) as err:
        units.check_unit("bar", "length")
    assert err.value.args[0] == "unit 'bar' does not measure length"
    with pytest.raises(KeyError) as err:
        units.to_si("1 m", "lenght")
    assert err.value.args[0].startswith("unknown dimension name 'lenght'; known: ['angle', 'area', ")


def test_a_quantity_text_of_eighty_characters_is_read():
    # the limit is "at most 80 characters" (DEVELOPERS.md, Hostile input): 80 are read, 81 refused
    text = "1" + "0" * 76 + " mm"
    assert len(text) == 80 and units.to_si(text, "length") == pytest.approx(1e73, rel=1e-12)
    with pytest.raises(InputError, match="at most 80 characters"):
        units.to_si("1" + text, "length")


def test_format_value_to_four_significant_digits():
    # by hand: 271828.1 Pa = 2.718281 bar -> 4 significant digits "2.718"
    assert units.format_value(2.718281e5, "pressure", "bar") == "2.718 bar"
    assert units.format_value(0.0, "pressure", "bar") == "0 bar"
    assert units.format_value(0.5, "dimensionless", "dimensionless") == "0.5"
    assert units.format_value(2.718281e5, "pressure", "bar", digits=6) == "2.71828 bar"
