"""The studies' shared grading and finding helpers (workbook.studies.base) by hand: the exact
edges of the grading rule, the order of the levels, and a finding's numbers in its display unit;
then the rule itself (workbook.grading.grade_margin): its default sense, its tolerance and its zero limit.

The rule (grade's docstring): margin = (limit - value)/|limit| (higher worse) or
(value - limit)/|limit|; a margin below -1e-12 fails, a margin below the caution share is a
caution, a margin equal to the share passes; a limit of 0 scales by 1.
Conversions against NIST SP 811 (1 bar = 1e5 Pa, 1 psi = 6894.757 Pa) and by hand.
"""

from __future__ import annotations

import pytest

from workbook.errors import InternalDefect
from workbook.grading import TOLERANCE, ZERO_LIMIT, grade_margin
from workbook.studies import base

BAR = 1e5


def test_a_margin_equal_to_the_caution_share_passes():
    # 189 bar against 210 bar: margin 21/210 = 0.1 exactly (the division rounds to the float 0.1)
    assert (210e5 - 189e5) / 210e5 == 0.1
    assert base.grade(189e5, 210e5, 0.10) == ("pass", 0.1)
    assert base.grade(231e5, 210e5, 0.10, higher_is_worse=False) == ("pass", 0.1)
    assert base.grade(189.0001e5, 210e5, 0.10)[0] == "caution"


def test_the_tolerance_is_one_part_in_a_million_million():
    lim = 210e5
    assert base.grade(lim * (1 + 1.5e-12), lim, 0.1)[0] == "fail"
    assert base.grade(lim * (1 + 0.5e-12), lim, 0.1)[0] == "caution"
    assert base.grade(lim * (1 - 1.5e-12), lim, 0.1, higher_is_worse=False)[0] == "fail"


def test_a_zero_limit_scales_by_one():
    # a share of points against 0 (by hand): margin is minus the share itself
    assert base.grade(1e-3, 0.0, 0.1) == ("fail", pytest.approx(-1e-3, rel=1e-12))
    assert base.grade(0.25, 0.0, 0.1, higher_is_worse=False) == ("pass", pytest.approx(0.25, rel=1e-12))


def _f(rule_id, level):
    return {"rule_id": rule_id, "level": level}


def test_findings_sort_fail_caution_pass_and_the_worst_level():
    items = [_f("a", "pass"), _f("b", "caution"), _f("c", "fail"), _f("d", "pass"), _f("e", "fail"),
             _f("f", "caution")]
    assert [f["rule_id"] for f in base.sort_findings(items)] == ["c", "e", "b", "f", "a", "d"]
    assert base.LEVEL_ORDER == {"fail": 0, "caution": 1, "pass": 2}
    out = base.Outcome("k", "t", {}, (), findings=[_f("a", "pass"), _f("b", "caution")])
    assert out.worst_level == "caution" and [f["rule_id"] for f in out.findings] == ["b", "a"]
    assert base.Outcome("k", "t", {}, (), findings=[_f("a", "pass"), _f("c", "fail")]).worst_level == "fail"
    assert base.Outcome("k", "t", {}, ()).worst_level == "pass"


def test_a_finding_in_its_display_unit():
    f = base.finding("P-X", "stays within", "cap pressure", 231e5, 210e5, "pressure", "bar", "fail",
                     "ISO 4413", margin=-0.1, detail="where")
    assert f == {"rule_id": "P-X", "statement": "stays within", "quantity": "cap pressure", "value": pytest.approx(231.0),
                 "limit": pytest.approx(210.0), "unit": "bar", "margin": -0.1, "level": "fail", "source": "ISO 4413",
                 "detail": "where"}
    psi = base.finding("P-X", "s", "q", 6894.757293168361, None, "pressure", "psi", "pass", "src")
    assert psi["value"] == pytest.approx(1.0, rel=1e-12) and psi["limit"] is None and psi["margin"] is None
    assert psi["detail"] == ""
    share = base.finding("S", "s", "q", 0.15, 0.1, "dimensionless", "%", "fail", "src")
    assert (share["value"], share["limit"]) == (pytest.approx(15.0), pytest.approx(10.0))
    plain = base.finding("S", "s", "q", 0.15, 0.1, "dimensionless", "", "fail", "src")
    assert (plain["value"], plain["limit"]) == (0.15, 0.1)
    with pytest.raises(InternalDefect) as err:
        base.finding("P-X", "s", "q", float("nan"), 1.0, "pressure", "bar", "fail", "src")
    assert (err.value.where, err.value.what) == ("finding P-X", "a value that is not finite")
    with pytest.raises(InternalDefect) as err:
        base.finding("P-X", "s", "q", 1.0, 1.0, "pressure", "bar", "fail", "src", margin=float("inf"))
    assert (err.value.where, err.value.what) == ("finding P-X", "a margin that is not finite")


def test_results_in_display_units():
    assert base.result("Bore", 0.08, "length", "mm") == {"value": pytest.approx(80.0), "unit": "mm", "label": "Bore"}
    assert base.result("Ratio", 1.5, "dimensionless", "") == {"value": 1.5, "unit": "", "label": "Ratio"}
    assert base.result("Ratio", 1.5, "dimensionless", "x") == {"value": 1.5, "unit": "x", "label": "Ratio"}
    assert base.ratio_result("Share", 0.25) == {"value": 0.25, "unit": "", "label": "Share"}
    assert base.ratio_result("Share", 0.25, percent=True) == {"value": 25.0, "unit": "%", "label": "Share"}
    with pytest.raises(InternalDefect) as err:
        base.result("Bore", float("inf"), "length", "mm")
    assert (err.value.where, err.value.what) == ("result Bore", "a value that is not finite")


def test_an_alternative_is_at_worst_a_caution():
    fail = {"level": "fail", "detail": "too low"}
    out = base.as_alternative(fail, "The vented valve")
    assert out["level"] == "caution"
    assert out["detail"] == "too low; The vented valve is an alternative, not the design's valve"
    assert fail["level"] == "fail"                       # the original is not changed
    out = base.as_alternative({"level": "pass", "detail": ""}, "X")
    assert out == {"level": "pass", "detail": "X is an alternative, not the design's valve"}
    assert base.as_alternative({"level": "caution", "detail": ""}, "X")["level"] == "caution"


# --- workbook.grading.grade_margin itself: the rule both the checks and the studies grade by.
# Its documented rule (module docstring): margin < -TOLERANCE breaches, margin < band is a caution,
# a limit smaller in magnitude than ZERO_LIMIT (1e-6 SI units) is zero: scaled by 1, no band.


def test_grade_margin_takes_a_higher_value_as_worse_unless_told():
    # 211 bar against a 210 bar rating, higher worse by default: margin (210 - 211)/210 = -1/210 (by hand)
    margin, level = grade_margin(211e5, 210e5, 0.10)
    assert (margin, level) == (pytest.approx(-1 / 210, rel=1e-12), "fail")
    assert grade_margin(211e5, 210e5, 0.10, higher_is_worse=False) == (pytest.approx(1 / 210, rel=1e-12), "caution")
    assert grade_margin(211e5, 210e5, 0.10, broken="caution")[1] == "caution"


def test_grade_margin_breaches_only_below_minus_the_tolerance():
    """The tolerance itself is not a breach: 1e12 + 1 against a limit of 1e12 has the margin
    -1/1e12, which is exactly the float -1e-12 (1e12 and 1e12 + 1 are exact binary floats, and
    the quotient rounds correctly, IEEE 754), so it sits on the tolerance: a caution, not a
    failure; the next representable value above is one."""
    assert -1 / 1e12 == -TOLERANCE == -1e-12
    assert grade_margin(1e12 + 1, 1e12, 0.10) == (-1e-12, "caution")
    assert grade_margin(1e12 - 1, 1e12, 0.10, higher_is_worse=False) == (-1e-12, "caution")
    assert grade_margin(1e12 + 2, 1e12, 0.10) == (-2e-12, "fail")


def test_a_limit_below_one_millionth_is_zero_and_one_at_it_is_not():
    """ZERO_LIMIT = 1e-6 SI units. A limit of 1e-6 or 1.5e-6 is a real limit, scaled by
    itself with its caution band: 0.95e-6 against 1e-6 leaves 5 % (a caution, by hand), 1.4e-6
    against 1.5e-6 leaves 1/15 = 6.7 %. A limit of 0.99e-6 is zero: the margin is the plain
    difference (0.04e-6 on a scale of 1) and has no band, so it passes."""
    assert ZERO_LIMIT == 1e-6
    margin, level = grade_margin(0.95e-6, 1e-6, 0.10)
    assert (margin, level) == (pytest.approx(0.05, rel=1e-9), "caution")
    margin, level = grade_margin(1.4e-6, 1.5e-6, 0.10)
    assert (margin, level) == (pytest.approx(1 / 15, rel=1e-9), "caution")
    margin, level = grade_margin(0.95e-6, 0.99e-6, 0.10)
    assert (margin, level) == (pytest.approx(0.04e-6, rel=1e-9), "pass")
