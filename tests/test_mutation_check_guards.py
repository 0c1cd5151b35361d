"""The guards of :func:`workbook.checks.evaluate` around its rules (mutation testing of the
ratings checks): a bad limit is refused naming its own field, a rule that measures a
non-finite number is an internal defect, never a silent NaN in a finding (house rule: bad
input gets a clear message naming the field; never a silent NaN), and a rule's own level
overrides the graded one where the value is only a bound (the ``Rule`` docstring).
"""

from __future__ import annotations

import math

import pytest

from workbook import checks, inputs
from workbook.circuit import axis_from_values
from workbook.errors import InputError


@pytest.fixture(scope="module")
def default_axis():
    # every field at its declared default (the catalogue, workbook/inputs.py)
    return axis_from_values({s.key: s.parse({}) for s in inputs.AXIS_SECTIONS})


@pytest.mark.parametrize("given", ["abc", None, math.inf, math.nan])
def test_a_bad_limit_is_refused_at_its_own_field(default_axis, given):
    with pytest.raises(InputError) as err:
        checks.evaluate(default_axis, limits={"pressure_margin": given})
    assert err.value.field == "limits.pressure_margin"
    assert err.value.allowed == inputs.LIMITS["pressure_margin"].allowed()


def _one_rule(measure):
    return (checks.Rule("T-ONE", "A test rule.", "test quantity", "pressure", "max", "by hand", measure),)


@pytest.mark.parametrize("value, limit", [(math.inf, 1.0), (1.0, math.inf), (math.nan, 1.0), (1.0, math.nan)])
def test_a_non_finite_measure_is_a_defect_not_a_finding(default_axis, monkeypatch, value, limit):
    monkeypatch.setattr(checks, "RULES", _one_rule(lambda ctx: (value, limit, "")))
    with pytest.raises(RuntimeError, match="rule T-ONE produced a non-finite value"):
        checks.evaluate(default_axis)


def test_a_rules_own_level_overrides_the_graded_one(default_axis, monkeypatch):
    # 1 bar against 2 bar grades as a pass (margin 0.5, by hand); the rule says caution (a bound only)
    monkeypatch.setattr(checks, "RULES", _one_rule(lambda ctx: (1e5, 2e5, "only a bound", "caution")))
    (f,) = checks.evaluate(default_axis)
    assert (f.level, f.margin, f.detail) == ("caution", pytest.approx(0.5), "only a bound")
    monkeypatch.setattr(checks, "RULES", _one_rule(lambda ctx: (1e5, 2e5, "graded")))
    (f,) = checks.evaluate(default_axis)
    assert (f.level, f.margin) == ("pass", pytest.approx(0.5))
