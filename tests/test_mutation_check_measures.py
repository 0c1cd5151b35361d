"""What each rule of workbook.checks measures, recomputed here from the solver's own solutions
over the documented grid (checks module docstring: every load case x N_TEMPERATURES = 5 oil
temperatures from temp_min to temp_max, both directions, the flow valve open and closed), so
that the aggregation of every rule is pinned: which quantity, which extreme, which limit, and
the worst case its detail names (load in kN, oil in degC, the first case of the grid on a tie,
so that a record is the same on every run).

Formulas by hand, each with its source as in the rule: pressures against the ratings (ISO 4413,
no component above its rating); absolute pressure = gauge + 101 325 Pa (standard atmosphere,
ISO 2533); holding valve settings against the load-induced pressure F/A (force balance);
P = p Q / eta (common practice); v = Q / (pi d²/4) (continuity); buckling load divided by the
safety factor (Euler / Johnson, Shigley).
"""

from __future__ import annotations

import dataclasses
import math

import numpy as np
import pytest
from scipy.optimize import brentq

from workbook import checks, circuit
from workbook.cylinder import Cylinder
from workbook.fluid import Oil
from workbook.restrictor import SharpOrifice
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import BackPressureValve, CheckValve, CompensatedFlowValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
BAR = 1e5
P_ATM = 101325.0                      # ISO 2533 standard atmosphere
T0 = 273.15
OIL = Oil.from_grade("VG46")
CYL = Cylinder(0.080, 0.045, 0.6, 210e5)
QP = 21.6 * LPM
RATINGS = circuit.Ratings(hose_rating=230 * BAR, valve_rating=250 * BAR, pressure_line_bore=0.008,
                          return_line_bore=0.010, suction_line_bore=0.020, cap_line_bore=0.010, rod_line_bore=0.007)


def _supply(eta=0.8):
    return Supply(Pump(QP), ReliefValve(160 * BAR, 172 * BAR, QP), drive_power=6000.0, overall_efficiency=eta)


def _axes():
    comp = CompensatedFlowValve.from_setting(12 * LPM, float(OIL.density(313.15)), check=CheckValve(0.5 * BAR))
    return {
        "meter-out cb cap, retract": circuit.Axis(
            CYL, OIL, _supply(), comp, arrangement="meter-out", controlled="retract",
            holding=CounterbalanceValve(120 * BAR, 3.0, 2 * BAR / LPM), holding_side="cap", friction=300.0,
            tank_pressure=2 * BAR, loads=(-8e3, 4e3, 15e3), temp_min=293.15, temp_max=333.15,
            target_speed=0.05, ratings=RATINGS),
        "meter-in bp rod, extend": circuit.Axis(
            CYL, OIL, _supply(0.9), RestrictorValve(SharpOrifice(1.4e-3)), arrangement="meter-in",
            controlled="extend", holding=BackPressureValve(50 * BAR, 1 * BAR / LPM), holding_side="rod",
            loads=(-30e3, -5e3, 10e3), temp_min=313.15, temp_max=313.15, target_speed=0.06, ratings=RATINGS),
        "bleed-off, extend": circuit.Axis(
            CYL, OIL, _supply(), comp, arrangement="bleed-off", controlled="extend", loads=(2e3, 20e3, 45e3),
            temp_min=283.15, temp_max=323.15, target_speed=0.02, ratings=RATINGS),
        # held in both directions: no point runs away
        "meter-out cb cap, retract, held": circuit.Axis(
            CYL, OIL, _supply(), comp, arrangement="meter-out", controlled="retract",
            holding=CounterbalanceValve(120 * BAR, 3.0, 2 * BAR / LPM), holding_side="cap",
            loads=(4e3, 15e3), temp_min=293.15, temp_max=313.15, target_speed=0.05, ratings=RATINGS),
        # the relief's 172 bar on the 80 mm bore holds 86.5 kN: with 8 kN of friction a 90 kN load
        # neither moves nor drives the rod back (stalled, by hand); the 5 kN case moves
        "meter-in compensated, stalls at one load": circuit.Axis(
            CYL, OIL, _supply(), comp, arrangement="meter-in", controlled="extend", loads=(5e3, 90e3),
            friction=8e3, target_speed=0.04, ratings=RATINGS),
        # every load case stalled: the controlled motion never moves
        "meter-in compensated, stalls at every load": circuit.Axis(
            CYL, OIL, _supply(), comp, arrangement="meter-in", controlled="extend", loads=(88e3, 92e3),
            friction=8e3, target_speed=0.04, ratings=RATINGS),
    }


def _grid(axis):
    """The documented grid: [(direction, opening, solution)] in the order extend, retract x open, closed."""
    n = 5 if axis.temp_max > axis.temp_min else 1
    temps = np.linspace(axis.temp_min, axis.temp_max, n)[None, :]
    loads = np.asarray(axis.loads)[:, None]
    return [(d, o, circuit.solve(axis, loads, temps, d, o)) for d in ("extend", "retract") for o in (1.0, 0.0)]


def _worst(grid, getter, largest=True):
    """(value, case text) of the extreme over the grid; the first case wins a tie."""
    best = None
    for d, o, s in grid:
        arr = np.asarray(getter(s), dtype=float)
        idx = np.unravel_index(np.argmax(arr) if largest else np.argmin(arr), arr.shape)
        val = float(arr[idx])
        if best is None or (val > best[0] if largest else val < best[0]):
            where = (f"{d}, valve {'closed' if o == 0.0 else 'open'}, load {float(s.load[idx]) / 1e3:g} kN, "
                     f"oil {float(s.temperature[idx]) - T0:.0f} degC, {s.regime[idx]}")
            best = (val, where)
    return best


def _stalls(axis):
    """The axis on its stop at the end of each motion, by hand (documented in DEVELOPERS.md and
    :func:`workbook.circuit.stall`): nothing flows to the cylinder, so the relief (and the bleed
    valve, bleed-off) takes the whole pump flow at the line pressure p, found here with scipy's
    brentq on the valves' own laws; the driving chamber at p, the other at the tank back
    pressure, behind a back-pressure valve at tank + setting, behind a counterbalance at
    max(tank, setting + k tank - R p). Returns [(direction, {name: array})]."""
    n = 5 if axis.temp_max > axis.temp_min else 1
    temps = np.linspace(axis.temp_min, axis.temp_max, n)
    pt, qp = axis.tank_pressure, axis.supply.flow
    out = []
    for d in ("extend", "retract"):
        p_line = []
        for t in temps:
            rho, mu = float(axis.oil.density(t)), float(axis.oil.dynamic_viscosity(t))

            def resid(p):
                q = float(axis.supply.relief.flow(p, pt)) - qp
                if axis.arrangement == "bleed-off" and d == axis.controlled:   # it tees off the controlled line
                    q += float(axis.flow_valve.forward_flow(np.array(p - pt), rho, mu, 1.0))
                return q
            p_line.append(brentq(resid, pt, 400 * BAR, xtol=1e-6))
        p = np.array(p_line)
        driving = "cap" if d == "extend" else "rod"
        hold = axis.holding
        if hold is not None and axis.holding_side != driving:
            if isinstance(hold, CounterbalanceValve):
                p_o = np.maximum(pt, hold.setting + hold.outlet_factor * pt - hold.pilot_ratio * p)
            else:
                p_o = pt + hold.setting + 0 * p
        else:
            p_o = pt + 0 * p
        p1, p3 = (p, p_o) if driving == "cap" else (p_o, p)
        out.append((d, {"p1": p1, "p3": p3, "p_pump": p, "p_mid": p, "temperature": temps}))
    return out


def _worst_with_stalls(axis, grid, getter):
    """:func:`_worst` over the grid and the stalls at the end of each stroke."""
    best = _worst(grid, getter)
    for d, st in _stalls(axis):
        arr = np.asarray(getter(dataclasses.make_dataclass("S", list(st))(**st)), dtype=float)
        i = int(np.argmax(arr))
        if float(arr[i]) > best[0]:
            best = (float(arr[i]), f"{d}, stalled at the end of the stroke or on the work (the relief passes the "
                                   f"whole pump flow), oil {float(st['temperature'][i]) - T0:.0f} degC")
    return best


AXES = _axes()


@pytest.fixture(scope="module", params=sorted(AXES))
def case(request):
    axis = AXES[request.param]
    return axis, _grid(axis), {f.rule_id: f for f in checks.evaluate(axis)}


def test_pressures_against_the_ratings(case):
    axis, grid, found = case
    for rule_id, getter, limit in [
        ("P-CAP-RATING", lambda s: s.p1, CYL.rated_pressure),
        ("P-ROD-RATING", lambda s: s.p3, CYL.rated_pressure),
        ("P-HOSE-RATING", lambda s: np.maximum(np.maximum(s.p1, s.p3), s.p_pump), RATINGS.hose_rating),
        ("P-VALVE-RATING", lambda s: np.maximum(np.maximum(np.maximum(s.p1, s.p3), s.p_pump), s.p_mid),
         RATINGS.valve_rating),
    ]:
        f = found[rule_id]
        val, where = _worst_with_stalls(axis, grid, getter)
        assert (f.value, f.limit) == (pytest.approx(val, rel=1e-8), limit), rule_id
        assert f.dimension == "pressure" and f.unit == "pressure"
        assert where in f.detail, (rule_id, where, f.detail)
        assert f.margin == pytest.approx((limit - val) / limit, rel=1e-9, abs=1e-15)


def test_cavitation_in_absolute_pressure(case):
    axis, grid, found = case
    for rule_id, getter in [("CAV-CAP", lambda s: s.p1_demand), ("CAV-ROD", lambda s: s.p3_demand)]:
        f = found[rule_id]
        val, where = _worst(grid, lambda s: getter(s) + P_ATM, largest=False)
        assert f.value == pytest.approx(val, rel=1e-12) and f.limit == axis.cavitation_abs
        assert f.detail.endswith(where)


def test_runaway_and_stall_shares(case):
    axis, grid, found = case
    bad = [np.isin(s.regime, circuit.UNCONTROLLED) | ((s.regime == circuit.CLOSED) & (np.abs(s.unbalanced_force) > 1.0))
           for _, _, s in grid]
    n, tot = sum(int(b.sum()) for b in bad), sum(b.size for b in bad)
    n_temps = 5 if axis.temp_max > axis.temp_min else 1
    assert tot == 4 * len(axis.loads) * n_temps
    f = found["RUNAWAY"]
    assert f.value == pytest.approx(n / tot, rel=1e-12) and f.limit == 0.0
    if n:
        # the example is the first point that runs away, in the grid's order
        k = next(j for j, b in enumerate(bad) if b.any())
        d, _, s = grid[k]
        i = np.unravel_index(np.argmax(bad[k]), bad[k].shape)
        where = f"e.g. {d}, load {float(s.load[i]) / 1e3:g} kN, oil {float(s.temperature[i]) - T0:.0f} degC"
        assert f.detail == f"{n} of {tot} points run away; {where}"
    else:
        assert f.detail == "no point runs away"
    s = next(s for d, o, s in grid if d == axis.controlled and o == 1.0)
    stalled = np.isin(s.regime, (circuit.STALLED, circuit.HELD, circuit.CLOSED, circuit.DRIVEN_BACK))
    assert found["SUPPLY-STALL"].value == pytest.approx(stalled.mean(), rel=1e-12)


def test_speed_of_the_controlled_motion(case):
    axis, grid, found = case
    s = next(s for d, o, s in grid if d == axis.controlled and o == 1.0)
    dev = np.abs(s.speed - axis.target_speed) / axis.target_speed
    f = found["SPEED-TARGET"]
    assert f.value == pytest.approx(float(dev.max()), rel=1e-12) and f.limit == axis.speed_tolerance
    i = np.unravel_index(np.argmax(dev), dev.shape)
    assert f.detail.startswith(f"worst speed {float(s.speed[i]) * 1e3:.1f} mm/s against target "
                               f"{axis.target_speed * 1e3:g} mm/s at load {float(s.load[i]) / 1e3:g} kN, "
                               f"oil {float(s.temperature[i]) - T0:.0f} degC")


def test_compensator_drop(case):
    axis, grid, found = case
    if not isinstance(axis.flow_valve, CompensatedFlowValve):
        assert "FV-STARVED" not in found
        return
    s = next(s for d, o, s in grid if d == axis.controlled and o == 1.0)
    moving = s.speed > 0
    f = found["FV-STARVED"]
    if not moving.any():
        assert (f.value, f.limit, f.detail) == (0.0, axis.flow_valve.min_drop,
                                                "the controlled motion does not move at any load")
        return
    dp = s.dp_flow_valve[moving]                        # only where the controlled motion moves
    assert f.value == pytest.approx(float(np.min(dp)), rel=1e-12) and f.limit == axis.flow_valve.min_drop
    assert f"{int((s.regime == circuit.STARVED).sum())} starved points" in f.detail


def test_holding_valve_settings(case):
    axis, grid, found = case
    h = axis.holding
    if h is None:
        assert not {"H-HOLDS", "H-CB-FACTOR", "H-RATING"} & set(found)
        return
    f_load = np.asarray(axis.loads)
    p = (np.maximum(f_load, 0) / CYL.a1 if axis.holding_side == "cap" else np.maximum(-f_load, 0) / CYL.a3).max()
    assert (found["H-HOLDS"].value, found["H-HOLDS"].limit) == (h.setting, pytest.approx(p, rel=1e-12))
    assert f"({p / BAR:.1f} bar)" in found["H-HOLDS"].detail and axis.holding_side in found["H-HOLDS"].detail
    assert found["H-RATING"].limit == min(CYL.rated_pressure, RATINGS.valve_rating, RATINGS.hose_rating)
    if isinstance(h, CounterbalanceValve):
        f = found["H-CB-FACTOR"]
        assert (f.value, f.limit) == (h.setting, pytest.approx(1.3 * p, rel=1e-12))      # default factor 1.3
        assert f"setting against 1.3 x the highest load-induced pressure ({p / BAR:.1f} bar)" == f.detail
    else:
        assert "H-CB-FACTOR" not in found


def test_power_and_heat(case):
    axis, grid, found = case
    eta, drive = axis.supply.overall_efficiency, axis.supply.drive_power
    val, where = _worst(grid, lambda s: s.input_power / eta)
    assert found["DRIVE-POWER"].value == pytest.approx(val, rel=1e-12) and found["DRIVE-POWER"].limit == drive
    assert where in found["DRIVE-POWER"].detail and f"overall efficiency {eta:g}" in found["DRIVE-POWER"].detail
    val, where = _worst(grid, lambda s: np.where(s.opening > 0, s.loss_total, 0.0) + 0.0 * s.speed)
    f = found["HEAT-SHARE"]
    assert f.value == pytest.approx(val, rel=1e-12) and f.limit == pytest.approx(0.30 * drive, rel=1e-12)
    assert where in f.detail and f"drive {drive / 1e3:g} kW" in f.detail


def test_line_velocities(case):
    axis, grid, found = case
    def area(d):
        return math.pi * d * d / 4
    q_geom = axis.supply.suction_flow
    f = found["V-SUCTION"]
    assert (f.value, f.limit) == (pytest.approx(q_geom / area(0.020), rel=1e-12), 1.2)
    assert "bore 20 mm" in f.detail and f"{q_geom * 60000:.4g} L/min" in f.detail
    val, where = _worst(grid, lambda s: s.q_pump / area(0.008))
    f = found["V-PRESSURE"]
    assert (f.value, f.limit) == (pytest.approx(val, rel=1e-12), 6.0) and where in f.detail and "bore 8 mm" in f.detail
    val, where = _worst(grid, lambda s: (s.q_cylinder_out + s.q_relief + s.q_bleed) / area(0.010))
    f = found["V-RETURN"]
    assert (f.value, f.limit) == (pytest.approx(val, rel=1e-12), 4.0) and where in f.detail


def test_port_line_velocities(case):
    # each port line against the pressure-line limit while it feeds its chamber and the
    # return-line limit while it drains it; the case nearest its limit is reported (common practice)
    axis, grid, found = case
    for side, bore in (("cap", 0.010), ("rod", 0.007)):
        best = None
        for d, o, s in grid:
            feeding_side = "cap" if d == "extend" else "rod"
            q = s.q_cylinder_in if side == feeding_side else s.q_cylinder_out
            into = (q > 0) if side == feeding_side else (q < 0)
            v = np.abs(q) / (math.pi * bore * bore / 4)
            lim = np.where(into, 6.0, 4.0)
            ratio = v / lim
            i = np.unravel_index(np.argmax(ratio), ratio.shape)
            if best is None or ratio[i] > best[0]:
                where = (f"{d}, valve {'closed' if o == 0.0 else 'open'}, load {float(s.load[i]) / 1e3:g} kN, "
                         f"oil {float(s.temperature[i]) - T0:.0f} degC, {s.regime[i]}, "
                         f"{'feeding' if into[i] else 'draining'} the {side} side")
                best = (float(ratio[i]), float(v[i]), float(lim[i]), where)
        f = found[f"V-{side.upper()}-LINE"]
        assert (f.value, f.limit) == (pytest.approx(best[1], rel=1e-12), best[2])
        kind = "pressure" if best[2] == 6.0 else "return"
        assert f.detail == (f"mean velocity in the {side} line, bore {bore * 1e3:g} mm, at: {best[3]}; "
                            f"limit of a {kind} line")


def test_rod_buckling(case):
    axis, grid, found = case
    k = 3.5                                                        # default safety factor (from memory)
    val, where = _worst(grid, lambda s: np.maximum(CYL.force(s.p1, s.p3), 0.0))
    f = found["ROD-BUCKLING"]
    assert (f.value, f.limit) == (pytest.approx(val, rel=1e-12, abs=1e-9), pytest.approx(CYL.buckling_load() / k))
    assert where in f.detail and f"/ {k:g}" in f.detail
    # extending onto the stop: the stall pressures by hand on the piston (p1 A1 - p3 A3)
    st = dict(_stalls(axis))["extend"]
    push = CYL.a1 * st["p1"] - CYL.a3 * st["p3"]
    force = float(np.max(push))
    f = found["ROD-BUCKLING-STALL"]
    assert (f.value, f.limit) == (pytest.approx(force, rel=1e-8), pytest.approx(CYL.buckling_load() / k))
    i = int(np.argmax(push))
    assert (f"extending onto the stop or the work, cap chamber at {st['p1'][i] / BAR:.4g} bar, rod side at "
            f"{st['p3'][i] / BAR:.4g} bar") in f.detail


def test_findings_are_frozen_records():
    f = checks.Finding("R", "s", "q", 1.0, 2.0, "pressure", 0.5, "pass", "src")
    assert f.detail == "" and f.unit == "pressure"
    with pytest.raises(dataclasses.FrozenInstanceError):
        f.level = "fail"
    with pytest.raises(dataclasses.FrozenInstanceError):
        checks.RULES[0].sense = "min"
    assert checks.PUMP_OVERALL_EFFICIENCY == 0.85                # default overall efficiency (from memory)
    assert checks.N_TEMPERATURES == 5


def test_speed_and_stall_details_in_full(case):
    axis, grid, found = case
    s = next(s for d, o, s in grid if d == axis.controlled and o == 1.0)
    dev = np.abs(s.speed - axis.target_speed) / axis.target_speed
    i = np.unravel_index(np.argmax(dev), dev.shape)
    detail = (f"worst speed {float(s.speed[i]) * 1e3:.1f} mm/s against target {axis.target_speed * 1e3:g} mm/s at "
              f"load {float(s.load[i]) / 1e3:g} kN, oil {float(s.temperature[i]) - T0:.0f} degC ({s.regime[i]})")
    loose = np.isin(s.regime, circuit.UNCONTROLLED)
    f = found["SPEED-TARGET"]
    if loose.any():
        # a load that runs away: its speed is only a lower bound, so the check fails whatever it reads
        j = np.unravel_index(np.argmax(loose), loose.shape)
        detail += (f"; {int(loose.sum())} point(s) not under control (e.g. load {float(s.load[j]) / 1e3:g} kN, "
                   f"{s.regime[j]}): their speed is only a lower bound")
        assert f.level == "fail"
    assert f.detail == detail
    stalled = np.isin(s.regime, (circuit.STALLED, circuit.HELD, circuit.CLOSED, circuit.DRIVEN_BACK))
    if stalled.any():
        k = np.unravel_index(np.argmax(stalled), stalled.shape)
        assert found["SUPPLY-STALL"].detail == f"e.g. load {float(s.load[k]) / 1e3:g} kN ({s.regime[k]})"
    else:
        assert found["SUPPLY-STALL"].detail == "the controlled motion moves at every load and temperature"


def test_the_cavitation_rules_name_their_chamber(case):
    axis, grid, found = case
    for side in ("cap", "rod"):
        f = found[f"CAV-{side.upper()}"]
        assert f.statement == f"The {side} chamber never needs less than the cavitation limit (absolute)."
        assert f.detail.startswith(f"lowest absolute pressure the {side} chamber is asked for at: ")


@pytest.mark.parametrize("cylinder, words", [
    # 45 mm rod, K = 1 pinned at both ends, L estimated as 2 x 0.6 + 4 x 0.08 = 1.52 m: slenderness
    # 4 L / d = 135 (by hand), above the transition: Euler
    (CYL, "Euler, pinned-pinned, pin-to-pin length 1520 mm ESTIMATED as twice the stroke plus four bores: "
          "give cylinder.buckling_length, slenderness 135 (transition {t:.0f}), E 210 GPa"),
    # a 0.3 m pin-to-pin length: slenderness 4 x 0.3 / 0.045 = 27, a short rod: Johnson parabola
    (Cylinder(0.080, 0.045, 0.2, 210e5, buckling_length=0.3),
     "Johnson parabola (short rod, below the Euler limit; yield {y:g} MPa), pinned-pinned, pin-to-pin length 300 mm, "
     "slenderness 27 (transition {t:.0f}), E 210 GPa"),
])
def test_the_buckling_details_say_how_the_load_was_found(cylinder, words):
    axis = circuit.Axis(cylinder, OIL, _supply(), RestrictorValve(SharpOrifice(1.4e-3)), arrangement="meter-out",
                        controlled="extend", loads=(10e3,), tank_pressure=1 * BAR, ratings=RATINGS)
    found = {f.rule_id: f for f in checks.evaluate(axis)}
    text = words.format(t=cylinder.transition_slenderness(), y=cylinder.rod_yield / 1e6)
    f_crit = cylinder.buckling_load()
    stall = found["ROD-BUCKLING-STALL"]
    # relief 172 bar over its outlet on the 1 bar return line: 173 bar in the cap chamber at the stop
    assert stall.detail == f"{text}; extending onto the stop or the work, cap chamber at 173 bar, rod side at 1 bar"
    f = found["ROD-BUCKLING"]
    assert f.detail.endswith(f"; buckling load {f_crit / 1e3:.4g} kN ({text}) / 3.5")
