"""Every rule of :mod:`workbook.checks` at its boundaries, in the unit its limit is given in.

For each rule, by hand from its statement (the sense of the limit and what a breach is), a
limit typical of the trade in its display unit, and the value just beyond, at and just inside
the limit and either side of the caution band (``limits.pressure_margin`` for the rules that
name it, 10 % for the others; none on a limit of 0). The grading rule (checks module docstring,
DEVELOPERS.md "How to add a check"): margin = (limit - value)/|limit| for an upper limit,
(value - limit)/|limit| for a lower one; broken below -1e-12, a caution below the band.

The stated tolerance, 1e-12 of the limit, is tested on both sides: a value 0.5e-12 beyond its
limit (the noise of a unit conversion) is not a breach, a value 1.5e-12 beyond it is. So a rule
that let 5 % over-pressure pass fails here at 0.5 ppm over.
"""

from __future__ import annotations

import pytest

from workbook import checks, units

#: rule id: (sense, level of a breach, caution band key or None for 10 %, limit as text) by hand
#: from each rule's statement; limits of the trade (common practice, from memory):
#: 210 bar cylinder, 3000 psi rod, 250 bar hose, 31.5 MPa valve ratings; 0.3 bar abs cavitation;
#: 6 bar compensator drop; 120 bar holding setting, 1.3 x 120 = 156 bar counterbalance factor;
#: 40 kN buckling limit; 2.25 kW heat (30 % of 7.5 kW); suction 1.2, pressure 6, return 4 m/s
TABLE = {
    "P-CAP-RATING": ("max", "fail", "pressure_margin", "210 bar"),
    "P-ROD-RATING": ("max", "fail", "pressure_margin", "3000 psi"),
    "P-HOSE-RATING": ("max", "fail", "pressure_margin", "250 bar"),
    "P-VALVE-RATING": ("max", "fail", "pressure_margin", "31.5 MPa"),
    "CAV-CAP": ("min", "fail", None, "0.3 bar"),
    "CAV-ROD": ("min", "fail", None, "0.3 bar"),
    "RUNAWAY": ("max", "fail", None, "0"),
    "FV-STARVED": ("min", "fail", "pressure_margin", "6 bar"),
    "H-HOLDS": ("min", "fail", None, "120 bar"),
    "H-CB-FACTOR": ("min", "caution", None, "156 bar"),
    "H-RATING": ("max", "fail", "pressure_margin", "210 bar"),
    "ROD-BUCKLING": ("max", "fail", None, "40 kN"),
    # every cylinder can reach its stop: a stall beyond the buckling limit fails (common practice)
    "ROD-BUCKLING-STALL": ("max", "fail", None, "40 kN"),
    "WORK-FORCE": ("min", "fail", None, "120 kN"),
    "HEAT-SHARE": ("max", "caution", None, "2.25 kW"),
    "DRIVE-POWER": ("max", "fail", None, "7.5 kW"),
    "V-SUCTION": ("max", "caution", None, "1.2 m/s"),
    "V-PRESSURE": ("max", "caution", None, "6 m/s"),
    "V-RETURN": ("max", "caution", None, "4 m/s"),
    "V-CAP-LINE": ("max", "caution", None, "6 m/s"),
    "V-ROD-LINE": ("max", "caution", None, "6 m/s"),
    "SPEED-TARGET": ("max", "fail", None, "0.15"),
    "SUPPLY-STALL": ("max", "fail", None, "0"),
}

DIMENSION = {"P-": "pressure", "CAV": "pressure", "FV-": "pressure", "H-": "pressure", "ROD": "force", "WORK": "force",
             "HEAT": "power", "DRIVE": "power", "V-": "velocity"}


def _rule(rule_id):
    return next(r for r in checks.RULES if r.rule_id == rule_id)


def _dimension(rule_id):
    return next((d for k, d in DIMENSION.items() if rule_id.startswith(k)), "dimensionless")


def _si(number: float, text: str, dimension: str) -> float:
    """``number`` in the unit of the limit text ``text`` (e.g. 210.0001 in "210 bar"), SI."""
    unit = text.split(" ", 1)[1] if " " in text else ""
    return units.to_si(f"{number!r} {unit}".strip(), dimension, field="value")


def test_the_table_covers_every_rule():
    # a new rule must be added to this table (and so be graded at its boundaries)
    assert set(TABLE) == {r.rule_id for r in checks.RULES}


@pytest.mark.parametrize("rule_id", sorted(TABLE))
def test_rule_data_as_its_statement_says(rule_id):
    sense, broken, key, _ = TABLE[rule_id]
    rule = _rule(rule_id)
    assert (rule.sense, rule.broken, rule.margin_key) == (sense, broken, key)
    assert rule.dimension == _dimension(rule_id)
    assert rule.source and rule.statement and rule.quantity


@pytest.mark.parametrize("band_pct", [10.0, 20.0])
@pytest.mark.parametrize("rule_id", sorted(TABLE))
def test_rule_below_at_and_above_its_limit(rule_id, band_pct):
    sense, broken, key, text = TABLE[rule_id]
    rule = _rule(rule_id)
    dim = _dimension(rule_id)
    limits = dict(checks.default_limits(), pressure_margin=band_pct / 100.0)
    band = band_pct / 100.0 if key else 0.10
    limit_num = float(text.split(" ", 1)[0])
    lim = _si(limit_num, text, dim)
    beyond = 1.0 if sense == "max" else -1.0            # direction in which the value breaks the limit

    def level(number):
        return checks._level(rule, _si(number, text, dim), lim, limits)

    if limit_num == 0.0:
        # a share of points: 0 passes, any point at all breaks it; no caution band on 0
        assert level(0.0) == (0.0, "pass")
        assert level(1e-3)[1] == broken and level(1e-3)[0] == pytest.approx(-1e-3)
        assert level(0.5)[1] == broken
        return
    # beyond the limit: 5 %, 0.5 %, 0.5 ppm, 1.5e-12 (just past the tolerance)
    for share in (0.05, 0.005, 5e-7, 1.5e-12):
        margin, lvl = level(limit_num * (1 + beyond * share))
        assert lvl == broken, (share, margin)
        assert margin == pytest.approx(-share, rel=1e-3)
    # at the limit and within the stated tolerance: not broken, in the caution band
    assert level(limit_num) == (0.0, "caution")
    assert level(limit_num * (1 + beyond * 0.5e-12))[1] == "caution"
    # just inside the limit, inside the band
    assert level(limit_num * (1 - beyond * 1e-6))[1] == "caution"
    # either side of the caution band edge
    margin, lvl = level(limit_num * (1 - beyond * band * (1 - 1e-6)))
    assert lvl == "caution" and margin == pytest.approx(band, rel=1e-5)
    margin, lvl = level(limit_num * (1 - beyond * band * (1 + 1e-6)))
    assert lvl == "pass" and margin == pytest.approx(band, rel=1e-5)
    # far inside
    assert level(limit_num * (1 - beyond * 0.5))[1] == "pass"
    assert level(limit_num * (1 - beyond * 0.5))[0] == pytest.approx(0.5, rel=1e-9)


def test_a_rating_in_psi_is_graded_in_psi():
    # 3000 psi = 206.84 bar (NIST SP 811: 1 psi = 6894.757 Pa): 207 bar is over it, 206.8 bar is not
    rule = _rule("P-ROD-RATING")
    lim = units.to_si("3000 psi", "pressure")
    assert lim == pytest.approx(3000 * 6894.757293168361, rel=1e-12)
    assert checks._level(rule, units.to_si("207 bar", "pressure"), lim, checks.default_limits())[1] == "fail"
    assert checks._level(rule, units.to_si("206.8 bar", "pressure"), lim, checks.default_limits())[1] == "caution"


def test_a_margin_equal_to_the_band_passes():
    # 189 bar against a 210 bar rating: margin 21/210 = 0.1 exactly, the band's edge: not below
    # the band, so a pass (checks module docstring: a caution "within" the margin); by hand
    limits = dict(checks.default_limits(), pressure_margin=0.1)
    assert checks._level(_rule("P-CAP-RATING"), 189e5, 210e5, limits) == (0.1, "pass")
    assert checks._level(_rule("H-HOLDS"), 231e5, 210e5, limits) == (0.1, "pass")      # 10 % band
    assert checks._level(_rule("H-HOLDS"), 230.99e5, 210e5, limits)[1] == "caution"


def test_a_negative_limit_scales_by_its_size():
    # a limit below zero (none of the rules has one today): the margin is still a share of |limit|
    rule = _rule("CAV-CAP")
    assert checks._level(rule, -0.9, -1.0, checks.default_limits()) == (pytest.approx(0.1), "caution")
    assert checks._level(rule, -1.1, -1.0, checks.default_limits())[1] == "fail"
    assert checks._level(rule, -0.5, -1.0, checks.default_limits())[1] == "pass"


@pytest.mark.parametrize("higher_is_worse", [True, False])
def test_the_studies_grade_has_the_same_tolerance(higher_is_worse):
    from workbook.studies import base

    lim, beyond = 210e5, (1.0 if higher_is_worse else -1.0)
    assert base.grade(lim * (1 + beyond * 1.5e-12), lim, 0.1, higher_is_worse)[0] == "fail"
    assert base.grade(lim * (1 + beyond * 0.5e-12), lim, 0.1, higher_is_worse)[0] == "caution"
    assert base.grade(lim * (1 + beyond * 0.05), lim, 0.1, higher_is_worse) == ("fail", pytest.approx(-0.05))
    assert base.grade(lim * (1 - beyond * 0.3), lim, 0.1, higher_is_worse) == ("pass", pytest.approx(0.3))
    assert base.grade(lim * (1 - beyond * 0.0999), lim, 0.1, higher_is_worse)[0] == "caution"
    assert base.grade(lim * (1 - beyond * 0.1001), lim, 0.1, higher_is_worse)[0] == "pass"
    # on a negative limit the margin is still a share of its size
    assert base.grade(-90.0, -100.0, 0.05, higher_is_worse)[1] == pytest.approx(-0.1 * beyond)   # by hand
