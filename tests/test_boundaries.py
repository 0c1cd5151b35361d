"""The grading rule at its boundaries: just below, at and just above each limit and each
caution band, for both senses, in the unit the limit is given in.

The rule (DEVELOPERS.md, checks module docstring): margin = (limit - value)/|limit| for an
upper limit, (value - limit)/|limit| for a lower one; broken when margin < -1e-12 (the
stated tolerance: a value equal to its limit to twelve significant digits passes, by hand);
caution when 0 <= margin < band; pass otherwise."""

from __future__ import annotations

import pytest

from workbook.checks import RULES, _level, default_limits
from workbook.studies.base import grade

BAR = 1e5
TOL = 1e-12
LIMITS = default_limits()


def _rule(rule_id):
    return next(r for r in RULES if r.rule_id == rule_id)


RATING_RULES = ["P-CAP-RATING", "P-ROD-RATING", "P-HOSE-RATING", "P-VALVE-RATING", "H-RATING"]


@pytest.mark.parametrize("rule_id", RATING_RULES)
def test_a_rating_fails_just_above_it_and_passes_at_it(rule_id):
    # a 210 bar rating (ISO 4413: no component above its rating); by hand
    rule, lim = _rule(rule_id), 210 * BAR
    band = LIMITS[rule.margin_key]
    assert _level(rule, 210.0001 * BAR, lim, LIMITS)[1] == "fail"       # 0.5 ppm over
    assert _level(rule, 211 * BAR, lim, LIMITS)[1] == "fail"            # 0.5 % over
    assert _level(rule, 220 * BAR, lim, LIMITS)[1] == "fail"            # 4.8 % over
    assert _level(rule, 230 * BAR, lim, LIMITS)[1] == "fail"
    assert _level(rule, 210 * BAR, lim, LIMITS)[1] == "caution"         # at the limit: margin 0
    assert _level(rule, 210 * BAR * (1 + 0.5 * TOL), lim, LIMITS)[1] == "caution"   # inside the tolerance
    # the caution band, margin (210 - p)/210
    assert _level(rule, 210 * BAR * (1 - band) * (1 + 1e-9), lim, LIMITS)[1] == "caution"
    assert _level(rule, 210 * BAR * (1 - band) * (1 - 1e-9), lim, LIMITS)[1] == "pass"
    m, lvl = _level(rule, 231 * BAR, lim, LIMITS)
    assert m == pytest.approx(-0.1, rel=1e-12) and lvl == "fail"


def test_the_pressure_caution_band_is_the_limits_entry():
    # the band follows limits.pressure_margin (checks module docstring); by hand
    rule = _rule("P-CAP-RATING")
    lim = dict(LIMITS, pressure_margin=0.2)
    assert _level(rule, 170 * BAR, 210 * BAR, lim)[1] == "caution"   # margin 0.19
    assert _level(rule, 167 * BAR, 210 * BAR, lim)[1] == "pass"      # margin 0.205
    lim = dict(LIMITS, pressure_margin=0.0)
    assert _level(rule, 209.9 * BAR, 210 * BAR, lim)[1] == "pass"


def test_a_lower_limit_fails_just_below_it():
    # H-HOLDS: the setting must be at least the load-induced pressure (force balance); by hand
    rule = _rule("H-HOLDS")                      # sense min, no margin key: 10 % band
    assert rule.sense == "min" and rule.margin_key is None
    lim = 100 * BAR
    assert _level(rule, 99.999 * BAR, lim, LIMITS)[1] == "fail"
    assert _level(rule, 95 * BAR, lim, LIMITS)[1] == "fail"
    assert _level(rule, 100 * BAR, lim, LIMITS)[1] == "caution"
    assert _level(rule, 109.99 * BAR, lim, LIMITS)[1] == "caution"
    assert _level(rule, 110.01 * BAR, lim, LIMITS)[1] == "pass"
    m, _ = _level(rule, 90 * BAR, lim, LIMITS)
    assert m == pytest.approx(-0.1, rel=1e-12)


def test_a_caution_only_rule_breaks_to_caution():
    # V-SUCTION: broken is a caution, not a fail (common practice: a velocity guide)
    rule = _rule("V-SUCTION")
    assert _level(rule, 1.3, 1.2, LIMITS)[1] == "caution"
    assert _level(rule, 1.2 * 0.9 * (1 - 1e-9), 1.2, LIMITS)[1] == "pass"


def test_a_zero_limit_has_no_caution_band():
    # RUNAWAY / SUPPLY-STALL: share of points, limit 0; any point fails; none passes (by hand)
    rule = _rule("RUNAWAY")
    assert _level(rule, 0.0, 0.0, LIMITS) == (0.0, "pass")
    assert _level(rule, 1e-3, 0.0, LIMITS)[1] == "fail"
    assert _level(rule, 1e-3, 0.0, LIMITS)[0] == pytest.approx(-1e-3)


@pytest.mark.parametrize("share", [0.05, 0.10])
def test_grade_of_the_studies_at_its_boundaries(share):
    # studies.base.grade: the same rule; by hand on a 210 bar rating
    lim = 210 * BAR
    assert grade(210.0001 * BAR, lim, share)[0] == "fail"
    assert grade(211 * BAR, lim, share)[0] == "fail"
    assert grade(220 * BAR, lim, share)[0] == "fail"                 # 4.8 % over
    assert grade(210 * BAR, lim, share)[0] == "caution"
    assert grade(lim * (1 - share) * (1 + 1e-9), lim, share)[0] == "caution"
    assert grade(lim * (1 - share) * (1 - 1e-9), lim, share)[0] == "pass"
    # a lower limit
    assert grade(99.99 * BAR, 100 * BAR, share, higher_is_worse=False)[0] == "fail"
    assert grade(100 * BAR, 100 * BAR, share, higher_is_worse=False)[0] == "caution"
    assert grade(100 * BAR * (1 + share) * (1 + 1e-9), 100 * BAR, share, higher_is_worse=False)[0] == "pass"
    level, margin = grade(231 * BAR, lim, share)
    assert margin == pytest.approx(-0.1, rel=1e-12)
    # one grading rule with the checks (workbook.grading): a zero limit has no caution band
    assert grade(1e-3, 0.0, share)[0] == "fail" and grade(0.0, 0.0, share)[0] == "pass"
    # a vanishing limit (a denormal load pressure) is a zero limit, never an infinite margin
    level, margin = grade(30 * BAR, 4e-318, share, higher_is_worse=False)
    assert (level, margin) == ("pass", pytest.approx(30 * BAR))
    assert grade(-1e-3, 4e-318, share, higher_is_worse=False)[0] == "fail"
