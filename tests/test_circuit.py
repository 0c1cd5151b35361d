"""Tests of workbook.circuit: hand-worked examples, facts of the trade, conservation laws
(property-based) and bad input. Numbers of the bin tipper demo are marked "demo scenario"
and are never the evidence that a formula is right."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbook import inputs
from workbook.circuit import (
    CAVITATING,
    CLOSED,
    DRIVEN_BACK,
    HELD,
    METERING,
    PUMP_LIMITED,
    REGIMES,
    RUNAWAY,
    SINKING,
    STALLED,
    STARVED,
    Axis,
    axis_from_values,
    solve,
)
from workbook.cylinder import Cylinder
from workbook.errors import InputError
from workbook.fluid import P_ATM, Oil
from workbook.restrictor import SharpOrifice
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


def comp(q=12 * LPM, droop=0.02):
    return CompensatedFlowValve.from_setting(q, RHO40, droop=droop, check=CheckValve(0.5e5))


def axis(valve=None, arrangement="meter-out", controlled="extend", holding=None, side="cap", friction=0.0,
         tank=0.0, **kw):
    return Axis(CYL, OIL, SUPPLY, comp() if valve is None else valve, arrangement=arrangement,
                controlled=controlled, holding=holding, holding_side=side, friction=friction,
                tank_pressure=tank, **kw)


# ----------------------------------------------------------------- hand-worked examples
def test_meter_out_compensated_worked_example():
    """80/45 cylinder, 160/172 bar relief, 21.6 L/min pump, 12 L/min compensated meter-out in
    the rod line, extending against 20 kN, no droop (by hand):

    v = Q/A3 = 2e-4 / 3.4361e-3 = 0.058205 m/s; cap inflow A1 v = 17.554 L/min;
    relief flow 21.6 - 17.554 = 4.046 L/min; p_pump = 160 + 12 * 4.046/21.6 = 162.248 bar;
    p3 = (p_pump A1 - F)/A3 = (162.248e5 * 5.0265e-3 - 2e4)/3.4361e-3 = 179.14 bar.
    """
    s = solve(axis(comp(droop=0.0)), 20e3, T40)
    assert float(s.speed) == pytest.approx(12 * LPM / A3, rel=1e-9)
    assert float(s.q_relief) == pytest.approx(QP - A1 * 12 * LPM / A3, rel=1e-9)
    p_pump = 160e5 + 12e5 * (QP - A1 * 12 * LPM / A3) / QP
    assert float(s.p_pump) == pytest.approx(p_pump, rel=1e-9)
    assert float(s.p3) == pytest.approx((p_pump * A1 - 20e3) / A3, rel=1e-9)
    assert float(s.p3) / BAR == pytest.approx(179.14, abs=0.01)
    assert str(s.regime) == METERING


def test_meter_in_orifice_worked_example():
    """Meter-in sharp orifice 1.5 mm (Cd 0.61, turbulent) into the cap, extending against
    30 kN, tank 0, no friction (by hand, orifice equation, Merritt 1967):
    p1 = F/A1 = 59.683 bar; relief open, so p_pump = 160 + 12 (Qp - Q)/Qp and
    Q = Cd A sqrt(2 (p_pump - p1)/rho): a quadratic in sqrt; solved here by fixed point
    iteration in plain Python on one point (independent of the solver's bracketing).
    """
    d = 1.5e-3
    s = solve(axis(RestrictorValve(SharpOrifice(d)), arrangement="meter-in"), 30e3, T40)
    p1 = 30e3 / A1
    k = 0.61 * math.pi * d * d / 4 * math.sqrt(2 / RHO40)
    q = 0.0
    for _ in range(200):
        q = k * math.sqrt(160e5 + 12e5 * (QP - q) / QP - p1)
    assert float(s.speed) == pytest.approx(q / A1, rel=1e-9)
    assert float(s.p1) == pytest.approx(p1, rel=1e-12)


# ----------------------------------------------------------------- facts of the trade
@given(st.floats(-20e3, 60e3), st.sampled_from(["meter-in", "meter-out"]))
@settings(max_examples=60, deadline=None)
def test_relief_flow_is_pump_flow_minus_cylinder_flow(load, arrangement):
    # common practice: with a fixed pump, relief flow = pump flow - cylinder flow
    s = solve(axis(arrangement=arrangement), load, T40)
    assert float(s.q_relief) == pytest.approx(QP - float(s.q_cylinder_in), abs=1e-12 * QP)
    assert float(s.q_relief) == pytest.approx(float(SUPPLY.relief.flow(s.p_pump)), abs=1e-9 * QP)


def test_closing_meter_in_raises_pump_pressure_to_relief():
    # common practice: closing the flow valve sends all pump flow over the relief at full-flow pressure
    s = solve(axis(arrangement="meter-in"), np.array([0.0, 10e3, 50e3]), T40, opening=0.0)
    assert np.all(s.speed == 0.0)
    assert np.allclose(s.p_pump, 172e5) and np.allclose(s.q_relief, QP)
    assert set(s.regime) == {CLOSED}


@pytest.mark.parametrize("load", [0.0, -15e3, 10e3])
def test_meter_out_closed_rod_pressure_intensified(load):
    # common practice: with the meter-out valve closed p3 = p_supply * A1/A3; a pulling load
    # (negative here) adds its force over the annulus: p3 = (p_pump A1 - F)/A3
    s = solve(axis(friction=500.0), load, T40, opening=0.0)
    assert float(s.speed) == 0.0 and float(s.p_pump) == pytest.approx(172e5)
    assert float(s.p3) == pytest.approx((172e5 * A1 - load) / A3, rel=1e-12)
    if load == 0.0:
        assert float(s.p3) == pytest.approx(172e5 * CYL.phi, rel=1e-12)


def test_compensated_holds_flow_within_droop_until_starved_throttle_falls():
    # common practice: a compensated valve holds its flow within its droop over the load range
    # until starved; a plain restrictor's speed falls with load
    loads = np.linspace(0.0, 88e3, 800)
    s = solve(axis(comp(), arrangement="meter-in"), loads, T40)
    ok = s.regime == METERING
    assert ok.sum() > 600
    q = s.q_flow_valve[ok]
    assert np.all(np.abs(q / (12 * LPM) - 1) <= 0.02 * 172 / 100 + 1e-12)
    # starved once p1 = F/A1 comes within dp_min (8 bar) of the pump pressure (about 165 bar)
    starved = s.regime == STARVED
    assert starved.any() and np.all(loads[starved] > (165e5 - 8e5) * A1 * 0.99)
    assert np.all(s.q_flow_valve[starved] < 12 * LPM)
    # between 172 bar x A1 = 86.46 kN and beyond, the load drives the piston back over the relief
    assert s.regime[-1] == DRIVEN_BACK and s.speed[-1] < 0
    t = solve(axis(RestrictorValve(SharpOrifice(1.2e-3)), arrangement="meter-in"), loads[loads < 75e3], T40)
    moving = t.speed > 0
    assert np.all(np.diff(t.speed[moving]) < 0)
    assert t.speed[0] / t.speed[moving][-1] > 1.3


def test_meter_in_cannot_hold_overrunning_load_meter_out_can():
    # common practice: meter-in cannot restrain an overrunning load (cavitation / runaway);
    # meter-out can, and its speed stays at the valve setting
    pulling = -20e3        # pulls the rod out while extending
    mi = solve(axis(arrangement="meter-in"), pulling, T40)
    assert str(mi.regime) == RUNAWAY
    assert float(mi.p1) + P_ATM >= 0.0 and float(mi.p1_demand) + P_ATM < 0.3e5
    mo = solve(axis(arrangement="meter-out"), pulling, T40)
    assert str(mo.regime) == METERING
    dp = float(mo.dp_flow_valve)            # setting with its droop above the minimum drop (valve model)
    assert float(mo.q_cylinder_out) == pytest.approx(12 * LPM * (1 + 0.02 * (dp - 8e5) / 100e5), rel=1e-9)


def test_meter_out_small_pump_cavitates_but_valve_sets_speed():
    # force balance: an overrunning load faster than the pump fills -> driving chamber at the
    # cavitation limit, speed from the meter-out valve alone
    small = Supply(Pump(5 * LPM), ReliefValve(160e5, 172e5, 5 * LPM))
    ax = Axis(CYL, OIL, small, comp(), arrangement="meter-out", controlled="extend")
    s = solve(ax, -60e3, T40)
    assert str(s.regime) == CAVITATING
    assert float(s.p1) == pytest.approx(ax.cavitation_gauge)
    assert float(s.q_void) > 0
    q = float(ax.flow_valve.flow(s.p3 - 0.0, RHO40))
    assert float(s.speed) == pytest.approx(q / A3, rel=1e-9)


def test_counterbalance_lowering_equations():
    """Lowering the lift (retracting, weight F > 0 pushes the rod in) with a compensated
    meter-in in the rod line and a counterbalance on the cap side, pilot from the rod side.

    Force balance, retracting:           p1 A1 - p3 A3 = F - F_fr
    Counterbalance passing Q = A1 v, its spring chamber draining to its outlet at p_t
    (outlet-referenced):                 (p1 - p_t) + R (p3 - p_t) - p_set = g A1 v
    so p1 = (1 + R) p_t + p_set + g A1 v - R p3, and substituting:
        p3 = (((1 + R) p_t + p_set + g A1 v) A1 - F + F_fr) / (R A1 + A3)
    and the speed is the meter-in valve's flow over A3.
    """
    g = 0.5 * BAR / LPM
    cb = CounterbalanceValve(130e5, 3.0, g, CheckValve(1e5))
    ax = axis(comp(), arrangement="meter-in", controlled="retract", holding=cb, side="cap", friction=400.0,
              tank=2e5)
    loads = np.array([2e3, 6e3, 10e3])
    s = solve(ax, loads, T40)
    v = s.speed
    p3 = ((4 * 2e5 + 130e5 + g * A1 * v) * A1 - loads + 400.0) / (3.0 * A1 + A3)
    p1 = 4 * 2e5 + 130e5 + g * A1 * v - 3.0 * p3
    assert np.allclose(s.p3, p3, rtol=1e-9) and np.allclose(s.p1, p1, rtol=1e-9)
    assert np.allclose(s.p_pilot, s.p3)
    assert np.allclose(v * A3, ax.flow_valve.flow(s.dp_flow_valve, RHO40), rtol=1e-9)
    assert np.allclose(cb.flow(s.p1, s.p3, s.p_mid), A1 * v, rtol=1e-9)
    assert set(s.regime) == {METERING}


def test_counterbalance_not_opening_holds_the_load():
    # force balance + opening condition: a counterbalance that even full relief pressure on
    # its pilot cannot open holds the load (speed 0)
    cb = CounterbalanceValve(600e5, 1.0, 1e9)
    ax = axis(comp(), arrangement="meter-in", controlled="retract", holding=cb, side="cap")
    s = solve(ax, 5e3, T40)
    assert float(s.speed) == 0.0 and str(s.regime) == HELD


def test_back_pressure_valve_sets_counter_pressure():
    # common practice: a back-pressure valve in series holds the annulus at its setting + g q
    g = 0.5 * BAR / LPM
    bp = BackPressureValve(30e5, g)
    ax = axis(comp(), arrangement="meter-in", controlled="extend", holding=bp, side="rod", tank=2e5)
    s = solve(ax, -10e3, T40)            # pulling load: held back by the back pressure
    assert str(s.regime) == METERING
    assert float(s.p3) == pytest.approx(2e5 + 30e5 + g * A3 * float(s.speed), rel=1e-9)


def test_bleed_off_sends_remainder_to_cylinder():
    # common practice: bleed-off, pump pressure = load pressure, cylinder gets pump flow - bled flow
    ax = axis(RestrictorValve(SharpOrifice(1.0e-3)), arrangement="bleed-off")
    s = solve(ax, np.array([10e3, 40e3]), T40)
    assert np.allclose(s.p_pump, s.p1)
    assert np.allclose(s.q_cylinder_in + s.q_bleed + s.q_relief, QP, rtol=1e-9)
    assert s.speed[1] < s.speed[0]


def test_broadcasting_loads_against_temperatures():
    s = solve(axis(RestrictorValve(SharpOrifice(1.2e-3)), arrangement="meter-in"),
              np.array([0.0, 1e4, 2e4])[:, None], np.array([293.15, 313.15, 333.15])[None, :])
    assert s.speed.shape == (3, 3) and s.regime.shape == (3, 3)


# ----------------------------------------------------------------- property-based conservation
CONFIGS = []
for arr in ("meter-in", "meter-out", "bleed-off"):
    for ctrl in ("extend", "retract"):
        for hk in (None, "cb", "bp"):
            CONFIGS.append((arr, ctrl, hk))


def make(arr, ctrl, hk, kind="comp"):
    valve = comp() if kind == "comp" else RestrictorValve(SharpOrifice(1.4e-3))
    hold = {None: None, "cb": CounterbalanceValve(60e5, 3.0, 0.5 * BAR / LPM),
            "bp": BackPressureValve(30e5, 0.5 * BAR / LPM)}[hk]
    side = "cap" if ctrl == "retract" else "rod"
    return axis(valve, arrangement=arr, controlled=ctrl, holding=hold, side=side, friction=400.0, tank=2e5)


@given(st.sampled_from(CONFIGS), st.sampled_from(["extend", "retract"]), st.sampled_from(["comp", "orifice"]),
       st.lists(st.floats(-60e3, 90e3), min_size=1, max_size=8), st.floats(283.15, 353.15),
       st.sampled_from([1.0, 0.5, 0.0]))
@settings(max_examples=150, deadline=None)
def test_conservation_and_limits(cfg, direction, kind, loads, temp, opening):
    """Force balance, continuity and every valve characteristic close at each solved point;
    no pressure below absolute zero; never NaN (force balance and continuity by hand)."""
    ax = make(*cfg, kind=kind)
    f = np.array(loads)
    s = solve(ax, f, temp, direction, opening)
    for name in ("speed", "p1", "p3", "p_pump", "q_relief", "efficiency", "loss_flow_valve"):
        assert np.all(np.isfinite(getattr(s, name))), name
    for p in (s.p1, s.p3, s.p_pump, s.p_mid):
        assert np.all(p + P_ATM >= 0.0)
    assert set(s.regime) <= set(REGIMES)
    # continuity at the pump, the relief flow from its own characteristic at the solved pump
    # pressure (the solver's q_relief is the remainder, so a sum with it would be an identity)
    q_relief_law = ax.supply.relief.flow(s.p_pump, ax.tank_pressure)
    assert np.allclose(s.q_cylinder_in + q_relief_law + s.q_bleed, QP, rtol=1e-7, atol=1e-9 * QP)
    a_d, a_o = (A1, A3) if direction == "extend" else (A3, A1)
    assert np.allclose(s.q_cylinder_out, a_o * s.speed)
    assert np.allclose(s.q_cylinder_in + s.q_void, a_d * s.speed, rtol=1e-12, atol=1e-15)
    # force balance (DEVELOPERS.md sign convention) where the solution is balanced
    # (from the pressures, the load and the friction alone: the solver's unbalanced_force is
    # defined as the remainder, so a balance with it in would be an identity)
    sign = 1.0 if direction == "extend" else -1.0
    lhs = s.p1 * A1 - s.p3 * A3
    balanced = ~np.isin(s.regime, (RUNAWAY, STALLED, CAVITATING, HELD, CLOSED, SINKING))
    # moving, friction (400 N, see make) opposes the motion; driven back (speed < 0) it turns
    moving = balanced & (s.speed != 0)
    rhs = f + sign * 400.0 * np.sign(s.speed)
    assert np.allclose(lhs[moving], rhs[moving], rtol=1e-9, atol=1e-6 * (np.abs(f).max() + 1e3))
    assert np.all(s.unbalanced_force[balanced] == 0.0)
    # the relief characteristic, its outlet at the tank back pressure
    assert np.allclose(s.q_relief, ax.supply.relief.flow(s.p_pump, ax.tank_pressure), rtol=1e-7, atol=1e-9 * QP)
    # the metering valve's own characteristic at its reported drop
    moving = s.speed > 0
    if s.controlled and ax.arrangement != "bleed-off" and opening > 0:
        rho = OIL.density(temp)
        mu = OIL.dynamic_viscosity(temp)
        qv = ax.flow_valve.flow(s.dp_flow_valve, rho, mu, opening)
        sel = moving & (s.regime != PUMP_LIMITED) & (s.regime != RUNAWAY)
        assert np.allclose(s.q_flow_valve[sel], qv[sel], rtol=1e-7, atol=1e-10 * QP)
    # energy: input = useful + friction + losses at balanced moving points without voids,
    # driven back (speed < 0: the load's power enters) included, refill not cavitating
    pcav = ax.cavitation_gauge
    unclamped = (s.p1_demand > pcav) & (s.p3_demand > pcav)
    ok = balanced & (s.speed != 0) & (s.q_void == 0) & unclamped
    total = s.useful_power + s.friction_power + s.loss_total
    assert np.allclose(s.input_power[ok], total[ok], rtol=1e-6, atol=1e-3)


@pytest.mark.parametrize("cfg", CONFIGS)
@pytest.mark.parametrize("direction", ["extend", "retract"])
def test_speed_continuous_in_load(cfg, direction):
    # regimes change continuously: no jump in speed between neighbouring loads (common practice)
    ax = make(*cfg)
    jumps = []
    for n in (3001, 48001):
        loads = np.linspace(-60e3, 90e3, n)
        jumps.append(np.max(np.abs(np.diff(solve(ax, loads, T40, direction).speed))))
    v_scale = QP / min(A1, A3)
    # a jump that does not shrink when the load grid is refined 16-fold would be a discontinuity;
    # the square-root law of a starved compensator near zero drop shrinks like sqrt(step)
    assert jumps[1] < 0.03 * v_scale
    assert jumps[1] <= 0.5 * jumps[0] or jumps[1] < 1e-4 * v_scale


# ----------------------------------------------------------------- building from inputs, bad input
def values(**over):
    v = {s.key: s.parse({}) for s in inputs.AXIS_SECTIONS}
    for k, d in over.items():
        v[k] = {**v[k], **d}
    return v


def test_axis_from_default_values():
    # catalogue defaults (meter-out lowering under a cap-side counterbalance): every load case moves
    ax = axis_from_values(values())
    assert ax.arrangement == "meter-out" and isinstance(ax.holding, CounterbalanceValve)
    s = solve(ax, np.array(ax.loads), ax.temp_min)
    assert np.all(s.speed > 0)


@pytest.mark.parametrize("over,field", [
    ({"cylinder": {"rod": 0.08}}, "cylinder.rod"),
    # meter-out retracting passes cap oil: the pump (21.6 L/min) drives at most 21.6 x A1/A3 = 31.6 L/min
    ({"flow_valve": {"setting": 35 * LPM}}, "flow_valve.setting"),
    # meter-in passes pump oil: at most the pump flow
    ({"flow_valve": {"setting": 25 * LPM, "arrangement": "meter-in"}}, "flow_valve.setting"),
    ({"holding": {"pilot_ratio": 0.0}}, "holding.pilot_ratio"),
    ({"supply": {"relief_full_flow": 150e5}}, "supply.relief_full_flow"),
    ({"operation": {"temp_min": 200.0}}, "operation.temp_min"),
    ({"operation": {"temp_max": 280.0}}, "operation.temp_max"),
    ({"flow_valve": {"min_drop": 3e5}}, "flow_valve.min_drop"),
])
def test_bad_cross_field_input(over, field):
    with pytest.raises(InputError) as e:
        axis_from_values(values(**over))
    assert e.value.field == field and e.value.allowed
    if field == "cylinder.rod":
        assert e.value.allowed == "a rod diameter smaller than the bore (80 mm)"


@pytest.mark.parametrize("kw,field", [
    ({"temperature": 150.0}, "temperature"), ({"temperature": 600.0}, "temperature"),
    ({"load": float("nan")}, "load"), ({"opening": -0.1}, "opening"), ({"direction": "up"}, "direction"),
])
def test_bad_solve_input(kw, field):
    args = {"load": 1e3, "temperature": T40}
    args.update(kw)
    with pytest.raises(InputError) as e:
        solve(axis(), **args)
    assert e.value.field == field


def test_throttle_speed_follows_viscosity_orifice_barely():
    # common practice: a long throttle's laminar flow follows viscosity, an
    # orifice's barely; lowering the lift (meter-out, cap side) from 20 degC to 60 degC oil
    from workbook.restrictor import LongThrottle
    temps = np.array([293.15, 333.15])
    thr = solve(axis(RestrictorValve(LongThrottle(0.6e-3, 60e-3)), controlled="retract"), 6e3, temps)
    ori = solve(axis(RestrictorValve(SharpOrifice(1.2e-3)), controlled="retract"), 6e3, temps)
    assert thr.speed[1] / thr.speed[0] > 1.8
    assert abs(ori.speed[1] / ori.speed[0] - 1) < 0.05


def test_inclination_adds_the_weight_along_the_rod():
    """Statics: a mass m on a rod inclined at angle a above horizontal (rod end up) pushes the
    rod in with m g sin(a); g = 9.80665 m/s² (standard gravity, NIST SP 811). Vertical:
    800 kg -> 7845.3 N added to every load case; horizontal: nothing added."""
    v = values(operation={"loads": [1000.0, 2000.0], "mass": 800.0, "inclination": math.pi / 2})
    ax = axis_from_values(v)
    assert ax.loads == pytest.approx((1000.0 + 800 * 9.80665, 2000.0 + 800 * 9.80665))
    v = values(operation={"loads": [1000.0], "mass": 800.0, "inclination": 0.0})
    assert axis_from_values(v).loads == pytest.approx((1000.0,))
    v = values(operation={"loads": [0.0], "mass": 800.0, "inclination": -math.pi / 6})   # rod end down
    assert axis_from_values(v).loads == pytest.approx((-0.5 * 800 * 9.80665,))
