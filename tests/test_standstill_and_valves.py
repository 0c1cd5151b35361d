"""Regression tests of issue 11 (and issue 10, defect 6): standstill tested rather than
assumed, counterbalance spring-chamber types and fully-open drop, the relief's outlet, the
closed needle, the speed target on a runaway, and the practitioner's inputs (pump overall
efficiency, suction and port line velocities, effective bulk modulus). Each expected value is
worked by hand in the docstring (force balance, continuity, the valve laws of
workbook.valve) or is a fact of the trade marked "common practice"."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbook import inputs
from workbook.checks import evaluate
from workbook.circuit import (
    CAVITATING,
    DRIVEN_BACK,
    HELD,
    METERING,
    REGIMES,
    RUNAWAY,
    SINKING,
    STALLED,
    Axis,
    Ratings,
    axis_from_values,
    natural_frequency,
    solve,
)
from workbook.cylinder import Cylinder
from workbook.fluid import P_ATM, Oil
from workbook.restrictor import NeedleThrottle, SharpOrifice
from workbook.studies import counterbalance
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import BackPressureValve, CheckValve, CompensatedFlowValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
BAR = 1e5
T40 = 313.15
OIL = Oil.from_grade("VG46")
RHO40 = float(OIL.density(T40))
CYL = Cylinder(0.080, 0.045, 0.6, 210e5)
A1, A3 = CYL.a1, CYL.a3
QP = 21.6 * LPM
SUPPLY = Supply(Pump(QP), ReliefValve(160e5, 172e5, QP))
G = 0.5 * BAR / LPM                    # counterbalance opening gradient, 0.5 bar per L/min
PCAV = 0.3e5 - P_ATM                   # default cavitation limit, gauge


def comp(q=12 * LPM):
    return CompensatedFlowValve.from_setting(q, RHO40, check=CheckValve(0.5e5))


def axis(valve=None, **kw):
    kw.setdefault("arrangement", "meter-in")
    kw.setdefault("controlled", "retract")
    return Axis(CYL, OIL, kw.pop("supply", SUPPLY), comp() if valve is None else valve, **kw)


def by_id(findings):
    return {f.rule_id: f for f in findings}


# ----------------------------------------------------------------- defect 1: a weak holding valve
def test_weak_counterbalance_with_closed_meter_in_sinks():
    """Reproducer: 80/45 cylinder, 40 kN pushing the rod in, counterbalance on the cap side set
    at 50 bar, 3:1, meter-in on retract, opening 0. Before: 79.6 bar trapped behind a 50 bar
    valve, reported as "valve closed".

    By hand: the closed meter-in valve cannot feed the rod side, so it voids at the cavitation
    limit (0.3 bar abs = -0.71325 bar gauge); force balance moving (no friction here)
    p1 = (F + p_cav A3)/A1 = (40000 - 71325 x 3.4361e-3)/5.0265e-3 = 79.09 bar. The valve
    (outlet-referenced, outlet at 0 bar) opens at 50 - 3 x (-0.71325) = 52.14 bar and passes
    (79.09 - 52.14)/0.5 = 53.90 L/min (fully open it could pass 79.09/0.2 = 395 L/min), so the
    load sinks at 53.90 L/min / A1 = 0.1787 m/s."""
    cb = CounterbalanceValve(50e5, 3.0, G)
    ax = axis(holding=cb, holding_side="cap")
    s = solve(ax, 40e3, T40, opening=0.0)
    p1 = (40e3 + PCAV * A3) / A1
    q = (p1 - (50e5 - 3 * PCAV)) / G
    assert str(s.regime) == SINKING
    assert float(s.p1) == pytest.approx(p1, rel=1e-12) and float(s.p1) / BAR == pytest.approx(79.09, abs=0.01)
    assert float(s.q_holding) == pytest.approx(q, rel=1e-12) and float(s.q_holding) / LPM == pytest.approx(53.90, abs=0.01)
    assert float(s.speed) == pytest.approx(q / A1, rel=1e-12)
    assert float(s.q_void) == pytest.approx(A3 * q / A1, rel=1e-12)       # the rod side voids
    assert float(s.p3) == pytest.approx(PCAV)
    # the runaway rule sees it
    fs = by_id(evaluate(axis(holding=cb, holding_side="cap", loads=(40e3,))))
    assert fs["RUNAWAY"].level == "fail"
    # set above the load pressure (1.3 x 79.6 bar) the same valve holds with the flow valve closed
    strong = solve(axis(holding=CounterbalanceValve(104e5, 3.0, G), holding_side="cap"), 40e3, T40, opening=0.0)
    assert float(strong.speed) == 0.0 and str(strong.regime) != SINKING


def test_weak_back_pressure_valve_with_closed_meter_in_sinks():
    """Back-pressure valve on the cap side, 30 bar + 0.5 bar per L/min, tank at 2 bar, 20 kN:
    p1 = (20000 + p_cav A3)/A1 = 39.30 bar; Q = (39.30 - 2 - 30)/0.5 = 14.60 L/min (by hand,
    BackPressureValve law)."""
    bp = BackPressureValve(30e5, G)
    s = solve(axis(holding=bp, holding_side="cap", tank_pressure=2e5), 20e3, T40, opening=0.0)
    p1 = (20e3 + PCAV * A3) / A1
    assert str(s.regime) == SINKING
    assert float(s.q_holding) == pytest.approx((p1 - 2e5 - 30e5) / G, rel=1e-12)


# ----------------------------------------------------------------- defect 4: driven back
def test_load_beyond_the_relief_drives_the_axis_back():
    """Meter-in extending against 90 kN, tank 0: the relief at full flow (172 bar) holds
    172e5 x A1 = 86.46 kN, so the piston moves back. Unknown: back speed u; the cap oil
    A1 u returns through the meter-in valve's check (0.5 bar + 0.1 bar per L/min) and joins
    the pump flow over the relief: p_pump = 160 + 12 (Qp + A1 u)/Qp bar; p1 = p_pump + 0.5 +
    0.1 A1 u [L/min]; the rod side refills from tank at 0 (no valve in its line). Force balance
    backwards (friction 0): p1 A1 = F. Solved by hand (linear in u):
    F/A1 = 179.049 bar = 160 + 12 + 0.5 + (12/21.6 + 0.1) q  ->  q = 9.9945 L/min,
    u = q / A1 = 0.03314 m/s; relief flow 21.6 + 9.9945 = 31.59 L/min."""
    s = solve(axis(arrangement="meter-in", controlled="extend"), 90e3, T40)
    q = (90e3 / A1 / BAR - 172.5) / (12 / 21.6 + 0.1) * LPM
    assert str(s.regime) == DRIVEN_BACK
    assert float(s.speed) == pytest.approx(-q / A1, rel=1e-9)
    assert float(s.q_relief) == pytest.approx(QP + q, rel=1e-9)
    assert float(s.p1) == pytest.approx(90e3 / A1, rel=1e-9)
    # the supply-stall rule counts it and the speed target cannot pass
    fs = by_id(evaluate(axis(arrangement="meter-in", controlled="extend", loads=(10e3, 90e3), target_speed=0.05)))
    assert fs["SUPPLY-STALL"].level == "fail" and fs["SPEED-TARGET"].level == "fail"


def test_friction_band_between_stall_and_driven_back():
    """Force balance: with 2 kN friction the piston stands while F - F_fr <= 172 bar x A1
    (86.46 kN) and F + F_fr >= it; above F = 88.46 kN it is driven back (common practice:
    static friction holds a stalled piston)."""
    ax = axis(arrangement="meter-in", controlled="extend", friction=2e3)
    s = solve(ax, np.array([87.0e3, 88.3e3, 89e3]), T40)
    assert list(s.regime[:2]) == [STALLED, STALLED] and s.regime[2] == DRIVEN_BACK


def test_driven_back_through_a_holding_valve_on_the_driving_side():
    """Lift raised (extend) with the counterbalance on the cap side: to be driven back the cap
    oil must open the valve against its outlet at pump pressure. Outlet-referenced, 30 bar,
    3:1, pilot from the rod side at 0: it opens at 30 + 4 p_out, so 90 kN (179 bar) at about
    172 bar on its outlet stays held and 130 kN (258.6 bar) is driven back (force balance and
    the opening law by hand: 30 + 4 x 172 = 718 bar > 258.6 -> held!); with a vented valve
    (opening 30 bar, independent of the outlet) the same 130 kN drives it back."""
    cb = CounterbalanceValve(30e5, 3.0, G)
    ax = axis(arrangement="meter-in", controlled="retract", holding=cb, holding_side="cap")
    s = solve(ax, np.array([90e3, 130e3]), T40, direction="extend")
    assert np.all(s.speed == 0.0)
    vented = CounterbalanceValve(30e5, 3.0, G, spring_chamber="vented")
    ax_v = axis(arrangement="meter-in", controlled="retract", holding=vented, holding_side="cap")
    sv = solve(ax_v, np.array([130e3]), T40, direction="extend")
    assert sv.regime[0] == DRIVEN_BACK and sv.speed[0] < 0
    # vented: p1 = p_set - R p3 + g Q, with Q = A1 u and p3 refilled from tank (0 bar) at -check drop 0
    q = -sv.speed[0] * A1
    assert sv.p1[0] == pytest.approx(max(30e5 - 3 * sv.p3[0] + G * q, sv.p_mid[0] + 0.2 * BAR / LPM * q), rel=1e-9)


# ----------------------------------------------------------------- defect 2 and 3: valve types
def test_downstream_meter_out_raises_an_outlet_referenced_valve_only():
    """Lowering (retract) with a cap-side counterbalance and a compensated meter-out valve
    downstream in the cap line (12 L/min out of the cap: v = 12 L/min / A1 = 39.79 mm/s).
    Both types pass the same flow (the meter-out valve sets it). Outlet-referenced: the
    opening law (p1 - p_m) + R (p3 - p_m) = p_set + g Q couples the outlet p_m into the
    chambers; vented: p1 + R p3 = p_set + g Q. Checked on the solution by the valve laws."""
    for chamber in ("outlet-referenced", "vented"):
        cb = CounterbalanceValve(60e5, 3.0, G, spring_chamber=chamber)
        ax = axis(arrangement="meter-out", controlled="retract", holding=cb, holding_side="cap", tank_pressure=2e5)
        s = solve(ax, 10e3, T40)
        assert str(s.regime) == METERING
        q = float(s.q_holding)
        assert float(cb.flow(s.p1, s.p3, s.p_mid)) == pytest.approx(q, rel=1e-7)
        k = 4.0 if chamber == "outlet-referenced" else 0.0
        meter = float(s.p1) + 3 * float(s.p3) - 60e5 - k * float(s.p_mid)
        wide = float(s.p1) - float(s.p_mid)
        assert min(meter / G, wide / (0.2 * BAR / LPM)) == pytest.approx(q, rel=1e-7)


def test_counterbalance_study_shows_both_types_on_the_demo_tip_axis():
    """Demo scenario (tip axis, meter-out downstream of the counterbalance): the study gives
    the lowering pressures for both spring-chamber types; the outlet-referenced valve needs at
    least as much pilot pressure as the vented one (its opening pressure is higher by
    (1 + R) p_out >= 0: force balance on the poppet)."""
    import copy
    import pathlib

    from workbook.design import load_design
    design = pathlib.Path(__file__).resolve().parents[1] / "notebooks" / "designs" / "bin-tipper.toml"
    out = counterbalance.run(copy.deepcopy(load_design(design).axes["tip"].values))
    r = out.results
    assert r["lowering_pilot_outlet"]["value"] >= r["lowering_pilot_vented"]["value"] - 1e-9
    f = next(f for f in out.findings if f["rule_id"] == "CB-OUTLET")
    assert "vented" in f["detail"] and "outlet-referenced" in f["detail"]


def test_fully_open_counterbalance_keeps_its_drop_and_heat():
    """A vented 3:1 counterbalance at 60 bar lowering 10 kN (retract) with a compensated
    meter-out valve downstream passing 12 L/min: its pilot is the rod side at about pump
    pressure (~160 bar), so p1 + 3 p3 is far above the setting and the pilot alone holds it
    wide open. Its drop is then the fully-open law r Q = 0.2 bar per L/min x 12.24 L/min
    (the valve's 2 % droop) = 2.45 bar, not zero, and its heat r Q² (by hand)."""
    cb = CounterbalanceValve(60e5, 3.0, G, spring_chamber="vented")
    ax = axis(arrangement="meter-out", controlled="retract", holding=cb, holding_side="cap")
    s = solve(ax, 10e3, T40)
    q = float(s.q_holding)
    r = 0.2 * BAR / LPM
    assert q == pytest.approx(12 * LPM, rel=0.03)
    assert float(s.dp_holding) == pytest.approx(r * q, rel=1e-9) and float(s.dp_holding) > 2e5
    assert float(s.loss_holding) == pytest.approx(r * q * q, rel=1e-9)


# ----------------------------------------------------------------- defect 6, 7; issue 10 defect 6
def test_closed_needle_is_a_closed_valve():
    """Reproducer: a needle at lift 0 made solve raise "through a closed restrictor"; it is a
    closed valve like opening 0 (common practice: a needle screwed shut passes nothing)."""
    needle = RestrictorValve(NeedleThrottle(4e-3, math.radians(15), 0.0))
    for arr in ("meter-in", "meter-out"):
        s = solve(axis(needle, arrangement=arr, controlled="extend"), np.array([0.0, 10e3, -10e3]), T40)
        ref = solve(axis(RestrictorValve(SharpOrifice(1e-3)), arrangement=arr, controlled="extend"),
                    np.array([0.0, 10e3, -10e3]), T40, opening=0.0)
        assert s.opening == 0.0
        assert np.allclose(s.speed, ref.speed) and np.allclose(s.p3, ref.p3) and list(s.regime) == list(ref.regime)


def test_relief_drains_to_the_tank_back_pressure():
    """With the meter-in valve closed all pump flow crosses the relief: its inlet sits at the
    full-flow setting above its outlet, 172 + 5 = 177 bar with a 5 bar return line; the heat
    is split (p_pump - p_t) Q over the relief and p_t Q in the return line (by hand)."""
    s = solve(axis(controlled="extend", tank_pressure=5e5), 10e3, T40, opening=0.0)
    assert float(s.p_pump) == pytest.approx(177e5)
    assert float(s.loss_relief) == pytest.approx(172e5 * QP) and float(s.loss_return_line) == pytest.approx(5e5 * QP)


def test_cavitating_meter_out_pump_never_above_its_relief():
    """Reproducer (issue 10): an overrunning load outruns a small pump in meter-out; the pump
    fills the voiding cap side through a stiff holding-valve check (5 bar per L/min). All of
    the 5 L/min would need 0.5 + 25 = 25.5 bar... here the check is 40 bar per L/min: 200 bar,
    above the 143 bar full-flow pressure. The relief opens instead: p_pump = relief(Qp - q) =
    p_cav + check(q) (continuity at the pump, by hand): 130 + 13 (5 - q)/5 = -0.713 + 1 + 40 q
    -> q = 3.1496 L/min, p_pump = 134.8 bar."""
    small = Supply(Pump(5 * LPM), ReliefValve(130e5, 143e5, 5 * LPM))
    bp = BackPressureValve(20e5, G, CheckValve(1e5, 40 * BAR / LPM))
    ax = Axis(CYL, OIL, small, comp(), arrangement="meter-out", controlled="extend", holding=bp, holding_side="cap")
    s = solve(ax, -60e3, T40, direction="extend")
    assert str(s.regime) == CAVITATING
    q = (130 + 13 - PCAV / BAR - 1) / (40 + 13 / 5) * LPM
    assert float(s.p_pump) <= 143e5 and float(s.q_relief) == pytest.approx(5 * LPM - q, rel=1e-6)
    assert float(s.p_pump) == pytest.approx(130e5 + 13e5 * (5 * LPM - q) / (5 * LPM), rel=1e-6)


# ----------------------------------------------------------------- defect 5
def test_speed_target_never_passes_on_a_runaway_point():
    """Meter-in extending with a pulling load runs away; its speed is only the speed the pump
    fills (a lower bound). Even with the target set at that speed the check must fail."""
    ax = axis(arrangement="meter-in", controlled="extend", loads=(-20e3,))
    v = float(solve(ax, -20e3, T40).speed)
    assert str(solve(ax, -20e3, T40).regime) == RUNAWAY
    f = by_id(evaluate(axis(arrangement="meter-in", controlled="extend", loads=(-20e3,), target_speed=v)))
    assert f["SPEED-TARGET"].level == "fail" and "lower bound" in f["SPEED-TARGET"].detail


# ----------------------------------------------------------------- new inputs
def values(**over):
    v = {s.key: s.parse({}) for s in inputs.AXIS_SECTIONS}
    for k, d in over.items():
        v[k] = {**v[k], **d}
    return v


def test_pump_overall_efficiency_sets_the_shaft_power():
    """P_shaft = p Q / eta_total (common practice). The catalogue pump: 16 cm3 x 1450 rpm x
    0.93 = 21.576 L/min; at the 172 bar (+2 bar tank) full-flow pressure the hydraulic power is
    174e5 x 3.596e-4 = 6257 W; with eta 0.70 the drive must give 8939 W."""
    ax = axis_from_values(values(supply={"overall_efficiency": 0.70}))
    f = by_id(evaluate(ax))["DRIVE-POWER"]
    q = 16e-6 * 1450 / 60 * 0.93
    assert f.value == pytest.approx(174e5 * q / 0.70, rel=1e-9)


def test_suction_velocity_from_the_geometric_flow():
    """Suction line velocity from displacement x speed (leakage to a case drain; common
    practice): 16 cm3 x 1450 rpm = 23.2 L/min in a 25 mm line: 3.8667e-4 / 4.9087e-4 =
    0.7877 m/s (not the delivered 21.576 L/min)."""
    ax = axis_from_values(values())
    f = by_id(evaluate(ax))["V-SUCTION"]
    assert f.value == pytest.approx(16e-6 * 1450 / 60 / (math.pi * 0.025 ** 2 / 4), rel=1e-12)


def test_cap_line_carries_the_area_ratio_on_retraction():
    """Retracting at the pump's full 21.6 L/min into the rod side, the cap line returns
    phi x 21.6 = 1.4628 x 21.6 = 31.60 L/min: 5.266e-4 m3/s in a 10 mm line = 6.705 m/s,
    above the 4 m/s return-line limit (common practice: the case people forget)."""
    ax = axis(RestrictorValve(SharpOrifice(20e-3)), arrangement="meter-out", controlled="extend", loads=(0.0,),
              ratings=Ratings(cap_line_bore=0.010, rod_line_bore=0.010))
    f = by_id(evaluate(ax))["V-CAP-LINE"]
    assert f.value == pytest.approx(QP * CYL.phi / (math.pi * 0.01 ** 2 / 4), rel=1e-6)
    assert f.limit == pytest.approx(4.0) and f.level == "caution"


def test_natural_frequency_uses_the_effective_modulus_and_line_volumes():
    """Merritt (1967): w0² = (E1' A1²/V1 + E3' A3²/V3)/m. With no air and steel tubes so stiff
    they hardly count, the lowest frequency over the stroke with 1.5 m lines of 10 mm
    (V_line = 117.8 cm3) must lie below the dead-volume-free value and above the one with
    the oil softened by the tube share (by hand the bounds are the two limits of series
    springs: a softer element only lowers E')."""
    r = Ratings(line_kind="steel tube", tube_wall=0.002)
    ax = axis(mass=800.0, ratings=r)
    w = natural_frequency(ax, 50e5, 20e5)
    x = np.linspace(0, 1, 97) * CYL.stroke
    bare = float(np.min(CYL.natural_frequency(OIL.bulk_modulus, 800.0, x)))
    v = r.line_volume("cap")
    assert v == pytest.approx(math.pi * 0.01 ** 2 / 4 * 1.5)
    dead = float(np.min(CYL.natural_frequency(OIL.bulk_modulus, 800.0, x, v, v)))
    assert w < dead < bare
    assert w > 0.9 * dead                 # steel tube 2.1e11 x 2 / 10 = 4.2e10 Pa, thirty times the oil
    # with hoses of 3000 bar the frequency falls further (series springs)
    assert natural_frequency(axis(mass=800.0, ratings=Ratings()), 50e5, 20e5) < w


# ----------------------------------------------------------------- energy over random designs
MODES = ("weak-hold", "back-driven", "any")


@given(st.sampled_from(["cb-out", "cb-vent", "bp"]), st.sampled_from(["meter-in", "meter-out", "bleed-off"]),
       st.sampled_from(["extend", "retract"]), st.floats(5e5, 200e5), st.floats(1.0, 8.0),
       st.lists(st.floats(-140e3, 140e3), min_size=1, max_size=6), st.floats(283.15, 353.15),
       st.sampled_from([1.0, 0.0]), st.floats(0.0, 5e5), st.floats(0.0, 3e3))
@settings(max_examples=200, deadline=None)
def test_energy_and_force_balance_in_the_new_regimes(hk, arr, ctrl, setting, ratio, loads, temp, opening, tank,
                                                     friction):
    """Random designs, weak holding valves and loads beyond the relief included: force balance
    and pump continuity close everywhere; where the motion is steady (driven back included)
    and no chamber is clamped, input power = useful + friction + every loss (to 1e-6)."""
    hold = {"cb-out": CounterbalanceValve(setting, ratio, G), "bp": BackPressureValve(setting, G),
            "cb-vent": CounterbalanceValve(setting, ratio, G, spring_chamber="vented")}[hk]
    valve = RestrictorValve(SharpOrifice(1.4e-3)) if arr == "bleed-off" else comp()
    side = "cap" if ctrl == "retract" else "rod"
    ax = axis(valve, arrangement=arr, controlled=ctrl, holding=hold, holding_side=side, tank_pressure=tank,
              friction=friction)
    f = np.array(loads)
    for direction in ("extend", "retract"):
        s = solve(ax, f, temp, direction, opening)
        assert set(s.regime) <= set(REGIMES)
        for name in ("speed", "p1", "p3", "p_pump", "p_mid", "q_relief", "loss_total", "input_power"):
            assert np.all(np.isfinite(getattr(s, name))), name
        assert np.all(s.p_pump <= SUPPLY.relief.full_flow + tank + 1e-6 * BAR + SUPPLY.relief.gradient
                      * np.maximum(-s.q_cylinder_in, 0.0) * 1.000001)
        assert np.allclose(s.q_cylinder_in + s.q_relief + s.q_bleed, QP, rtol=0, atol=1e-10 * QP)
        sign = 1.0 if direction == "extend" else -1.0
        lhs = s.p1 * A1 - s.p3 * A3
        rhs = f + sign * s.friction_force - sign * s.unbalanced_force
        assert np.allclose(lhs, rhs, rtol=1e-9, atol=1e-6 * (np.abs(f).max() + 1e3))
        pcav = ax.cavitation_gauge
        ok = ((s.speed != 0) & (s.q_void == 0) & (s.p1_demand > pcav) & (s.p3_demand > pcav)
              & ~np.isin(s.regime, (RUNAWAY, CAVITATING, SINKING, STALLED, HELD)))
        total = s.useful_power + s.friction_power + s.loss_total
        assert np.allclose(s.input_power[ok], total[ok], rtol=1e-6, atol=1e-3)


def test_the_new_regimes_are_reached_by_the_energy_property():
    """The random designs above do reach the new regimes (else the property proves nothing):
    a weak cap-side valve with a closed meter-in sinks; 120 kN beyond the relief drives back."""
    weak = axis(arrangement="meter-in", controlled="retract", holding=CounterbalanceValve(10e5, 2.0, G),
                holding_side="cap")
    assert SINKING in set(solve(weak, np.array([30e3, 60e3]), T40, opening=0.0).regime)
    assert DRIVEN_BACK in set(solve(weak, np.array([-120e3]), T40, direction="retract").regime)


def test_new_inputs_reach_the_axis_and_bad_ones_name_their_field():
    """Declared once in the catalogue: parsed with units, bounded, and carried to the physics;
    a value outside the catalogue's bounds is refused naming section.key (common practice of
    the workbook's boundary, DEVELOPERS.md "Bad input")."""
    from workbook.errors import InputError
    v = values()
    v["holding"] = inputs.HOLDING.parse({"spring_chamber": "vented", "open_gradient": "0.4 bar/(L/min)"})
    v["supply"] = inputs.SUPPLY.parse({"overall_efficiency": "0.8"})
    v["ratings"] = inputs.RATINGS.parse({"cap_line_bore": "12 mm", "line_kind": "steel tube"})
    v["oil"] = inputs.OIL.parse({"grade": "VG150", "nu40": "150 cSt", "nu100": "14.7 cSt", "air_content": "1 %"})
    ax = axis_from_values(v)
    assert ax.holding.spring_chamber == "vented" and ax.holding.open_gradient == pytest.approx(0.4 * BAR / LPM)
    assert ax.supply.overall_efficiency == pytest.approx(0.8)
    assert ax.ratings.cap_line_bore == pytest.approx(0.012) and ax.ratings.line_kind == "steel tube"
    assert ax.air_content == pytest.approx(0.01) and ax.oil.nu40 == pytest.approx(150e-6)
    for section, entry, field in ((inputs.HOLDING, {"spring_chamber": "sideways"}, "spring_chamber"),
                                  (inputs.SUPPLY, {"overall_efficiency": "1.5"}, "overall_efficiency"),
                                  (inputs.CYLINDER, {"rod_yield": "5 MPa"}, "rod_yield")):
        with pytest.raises(InputError) as e:
            section.parse(entry)
        assert field in e.value.field and e.value.allowed


def test_cautious_spring_chamber_takes_the_higher_lowering_pressures():
    """Spring chamber 'cautious' (the default): of the two types the one whose lowering gives
    this design the higher peak pressure (cap, rod, pump line, valve outlet). With nothing
    metering downstream (meter-in lowering, outlet at the 5 bar tank port) the outlet-referenced
    3:1 valve opens (1 + R) p_t = 4 x 5 = 20 bar higher than the vented one (force balance on
    the poppet), so it is taken; with a meter-out valve downstream the comparison is made on
    the solutions themselves."""
    def peak(ax):
        s = solve(ax, np.array(ax.loads), ax.temp_min, "retract")
        return float(np.max(np.maximum(np.maximum(s.p1, s.p3), np.maximum(s.p_pump, s.p_mid))))

    for arrangement in ("meter-in", "meter-out"):
        v = values(flow_valve={"arrangement": arrangement}, operation={"tank_pressure": 5e5})
        chosen = axis_from_values(v)
        assert chosen.holding.spring_chamber in ("outlet-referenced", "vented")
        other = "vented" if chosen.holding.spring_chamber == "outlet-referenced" else "outlet-referenced"
        alt = axis_from_values(values(flow_valve={"arrangement": arrangement}, operation={"tank_pressure": 5e5},
                                      holding={"spring_chamber": other}))
        assert peak(chosen) >= peak(alt)
        if arrangement == "meter-in":
            assert chosen.holding.spring_chamber == "outlet-referenced"
