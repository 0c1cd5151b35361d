"""Tests of workbook.checks: each rule against a hand calculation or a fact of the trade."""

import math

import pytest

import workbook
from workbook import inputs
from workbook.checks import LEVELS, RULES, evaluate
from workbook.circuit import Axis, axis_from_values
from workbook.cylinder import Cylinder
from workbook.errors import InputError
from workbook.fluid import Oil
from workbook.restrictor import SharpOrifice
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import CheckValve, CompensatedFlowValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
BAR = 1e5
OIL = Oil.from_grade("VG46")
CYL = Cylinder(0.080, 0.045, 0.6, 210e5)
QP = 21.6 * LPM
SUPPLY = Supply(Pump(QP), ReliefValve(160e5, 172e5, QP), drive_power=7500.0)


def comp(q=12 * LPM):
    return CompensatedFlowValve.from_setting(q, float(OIL.density(313.15)), check=CheckValve(0.5e5))


def axis(**kw):
    args = dict(cylinder=CYL, oil=OIL, supply=SUPPLY, flow_valve=comp(), arrangement="meter-out",
                controlled="extend", loads=(5e3,), temp_min=293.15, temp_max=333.15)
    args.update(kw)
    return Axis(**args)


def by_id(findings):
    return {f.rule_id: f for f in findings}


def test_findings_sorted_and_complete():
    # every finding carries a level, a source, finite SI numbers; sorted fail > caution > pass
    fs = evaluate(axis_from_values({s.key: s.parse({}) for s in inputs.AXIS_SECTIONS}))
    assert [LEVELS.index(f.level) for f in fs] == sorted(LEVELS.index(f.level) for f in fs)
    for f in fs:
        assert f.source and f.statement and math.isfinite(f.value) and math.isfinite(f.limit)
    assert len({r.rule_id for r in RULES}) == len(RULES)
    assert "ISO 4413" in workbook.CAUTION


def test_meter_out_closed_intensification_fails_rod_rating():
    """Common practice: meter-out valve closed, p3 = (p_full A1 - F)/A3. With a 10 kN pulling
    load (F = -10 kN): (172e5 * 5.0265e-3 + 1e4)/3.4361e-3 = 280.7 bar > 210 bar rating."""
    f = by_id(evaluate(axis(loads=(-10e3, 5e3))))["P-ROD-RATING"]
    assert f.level == "fail"
    assert f.value == pytest.approx((172e5 * CYL.a1 + 10e3) / CYL.a3, rel=1e-9)
    assert f.margin == pytest.approx((210e5 - f.value) / 210e5)
    assert "valve closed" in f.detail


def test_meter_in_overrunning_load_runs_away():
    # common practice: meter-in with no holding valve cannot restrain an overrunning load
    fs = by_id(evaluate(axis(arrangement="meter-in", loads=(-10e3, 5e3))))
    assert fs["RUNAWAY"].level == "fail"
    assert fs["CAV-CAP"].level == "fail" and fs["CAV-CAP"].value < 0.3e5


def test_starved_compensator_is_found():
    # common practice: near the relief setting the compensated valve runs out of drop
    # 80 kN / A1 = 159.2 bar leaves less than 8 bar of the ~165 bar pump pressure
    f = by_id(evaluate(axis(arrangement="meter-in", loads=(5e3, 80e3))))["FV-STARVED"]
    assert f.level == "fail" and f.value < 8e5


def test_counterbalance_setting_rules():
    """Load-holding pressure in the cap: 10 kN / A1 = 19.89 bar. Setting 22 bar holds it
    (H-HOLDS pass) but is below 1.3 x 19.89 = 25.86 bar (H-CB-FACTOR caution, common practice);
    15 bar does not hold it (H-HOLDS fail)."""
    def run(setting):
        cb = CounterbalanceValve(setting, 3.0, 0.5 * BAR / LPM)
        return by_id(evaluate(axis(arrangement="meter-in", controlled="retract", holding=cb, holding_side="cap",
                                   loads=(2e3, 10e3))))
    ok = run(22e5)
    assert ok["H-HOLDS"].level == "pass" and ok["H-CB-FACTOR"].level == "caution"
    assert ok["H-CB-FACTOR"].limit == pytest.approx(1.3 * 10e3 / CYL.a1)
    bad = run(15e5)
    assert bad["H-HOLDS"].level == "fail"


def test_line_velocities_by_hand():
    # v = Q / (pi d^2 / 4): 21.6 L/min in a 25 mm suction line = 0.7334 m/s (< 1.2, common practice);
    # in a 10 mm pressure line 4.584 m/s (within 3 to 6 m/s)
    fs = by_id(evaluate(axis()))
    assert fs["V-SUCTION"].value == pytest.approx(QP / (math.pi * 0.025 ** 2 / 4))
    assert fs["V-PRESSURE"].value == pytest.approx(QP / (math.pi * 0.010 ** 2 / 4))
    assert fs["V-SUCTION"].level == "pass"


def test_relief_below_load_pressure_is_a_stall_finding():
    # force balance: 90 kN / A1 = 179 bar is above the 172 bar full-flow pressure
    fs = by_id(evaluate(axis(loads=(5e3, 90e3))))
    assert fs["SUPPLY-STALL"].level == "fail" and fs["SUPPLY-STALL"].value == pytest.approx(0.5)


def test_speed_target_and_heat():
    # compensated meter-out holds Q/A3 = 12 L/min / 34.36 cm2 = 58.2 mm/s (within droop):
    # target 58 mm/s within 15 % passes; target 80 mm/s fails
    ok = by_id(evaluate(axis(target_speed=0.058)))["SPEED-TARGET"]
    assert ok.level == "pass"
    bad = by_id(evaluate(axis(target_speed=0.080)))["SPEED-TARGET"]
    assert bad.level == "fail"
    heat = by_id(evaluate(axis()))["HEAT-SHARE"]
    assert heat.limit == pytest.approx(0.30 * 7500.0)      # limits default 30 % (common practice)


def test_limits_override_and_bad_limits():
    fs = by_id(evaluate(axis(), limits={"v_suction": 0.5}))
    assert fs["V-SUCTION"].level == "caution" and fs["V-SUCTION"].limit == 0.5
    with pytest.raises(InputError) as e:
        evaluate(axis(), limits={"nonsense": 1.0})
    assert e.value.field == "limits.nonsense"


def test_orifice_axis_has_no_compensator_rule():
    fs = by_id(evaluate(axis(flow_valve=RestrictorValve(SharpOrifice(1.5e-3)))))
    assert "FV-STARVED" not in fs and "P-CAP-RATING" in fs


def test_rod_buckling_rules_by_hand():
    """Euler (pinned-pinned, K = 1): F_E = pi^2 E I / L^2 with I = pi d^4 / 64.

    45 mm rod: I = pi 0.045^4 / 64 = 2.0129e-7 m^4; no buckling length given, so the
    pin-to-pin length is estimated as twice the 0.6 m stroke plus four 80 mm bores (1.52 m);
    slenderness 1.52 / (0.045/4) = 135 is above the transition pi sqrt(2 E / 355 MPa) = 108:
    Euler, F_E = pi^2 * 2.1e11 * 2.0129e-7 / 1.52^2 = 180.6 kN; with the safety factor 3.5
    (common practice, from memory) the limit is 51.6 kN. Stalled against a stop the piston
    sees the relief full-flow pressure: 172e5 * 5.0265e-3 = 86.46 kN, above the limit: a fail,
    since every cylinder can reach its stop (common practice). A 5 kN working load passes."""
    fs = by_id(evaluate(axis(loads=(5e3,), controlled="extend")))
    i = math.pi * 0.045 ** 4 / 64
    limit = math.pi ** 2 * 2.1e11 * i / 1.52 ** 2 / 3.5
    assert "ESTIMATED" in fs["ROD-BUCKLING"].detail and "Euler" in fs["ROD-BUCKLING"].detail
    assert fs["ROD-BUCKLING"].limit == pytest.approx(limit, rel=1e-12)
    assert fs["ROD-BUCKLING"].level == "pass"
    stall = fs["ROD-BUCKLING-STALL"]
    # tank pressure 0 in this axis; the relief's pressure at the pump flow is solved (rel 1e-9)
    assert stall.value == pytest.approx(172e5 * CYL.a1, rel=1e-8)
    assert stall.level == "fail"
    # a fixed-fixed mounting (K = 0.5) halves the slenderness to 68, below the transition: the
    # Johnson parabola, 355e6 - (355e6 * 67.56 / (2 pi))^2 / 2.1e11 = 285.6 MPa on 15.90 cm2 =
    # 454.3 kN, / 3.5 = 129.8 kN: the stall check then passes
    stiff = Cylinder(0.080, 0.045, 0.6, 210e5, mounting="fixed-fixed")
    st = by_id(evaluate(axis(cylinder=stiff)))["ROD-BUCKLING-STALL"]
    assert st.level == "pass" and st.limit == pytest.approx(454.3e3 / 3.5, rel=1e-3)
    assert "Johnson" in st.detail
