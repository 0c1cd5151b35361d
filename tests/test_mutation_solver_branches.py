"""Every branch of the steady solver against its laws written out by hand: each arrangement
(meter-in, meter-out, bleed-off) x controlled motion (extend, retract) x direction solved
(the controlled one and the free one) x holding valve (none; counterbalance outlet-referenced
and vented; back-pressure) on the cap side and on the rod side.

At every moving point that is neither clamped nor running away, the solved pressures must
satisfy each law, each re-evaluated here from the component's own parameters (no solver
output is taken as a law), so every term is exercised: the friction, the tank back pressure,
the check valves' cracking, linear and quadratic terms, the counterbalance's setting, pilot,
outlet and flow-gradient terms and its fully-open drop, the back-pressure valve's setting
and gradient, the orifice and the relief.

By hand (circuit module docstring; DEVELOPERS.md sign convention, gauge pressures; s = +1
extending, -1 retracting; d the driving chamber, o the driven one):

- force balance on the piston: p_d A_d - p_o A_o = s F + F_fr (friction opposes motion);
- continuity: Q_in = A_d v, Q_out = A_o v;
- return line, cylinder -> holding valve (if on the driven side) -> flow valve -> tank at p_t:
  counterbalance (valve module docstring, poppet force balance):
  Q_out = min(max(p_o - (p_set + k p_mid - R p_d), 0)/g, (p_o - p_mid)/r), k = 1 + R
  outlet-referenced, 0 vented; back-pressure: p_o - p_mid = p_set + g Q_out; none: p_mid = p_o;
  then the controlled meter-out orifice passes Q_out at p_mid - p_t, the free direction's
  reverse check of a flow valve in that line drops p_crack + k Q + c Q², else p_mid = p_t;
- supply line, pump -> flow valve -> holding valve's check (if on the driving side) -> cylinder:
  the controlled meter-in orifice passes Q_in, the free direction's reverse check drops its
  law, the holding check drops p_crack + k Q_in;
- sharp orifice: Q = min(Q_lam, Q_turb), Q_turb = Cd A sqrt(2 dp/rho) with Cd 0.61,
  Q_lam = 8 delta^2 A^2 dp/(pi d mu) with delta 0.2 (Merritt 1967, from memory);
- relief (direct acting, draining to the tank port): Q_r = max(p - p_t - p_crack, 0)/g_r,
  g_r = (p_full - p_crack)/Q_rated; fixed pump: Q_p = Q_in + Q_bleed + Q_r.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from workbook import circuit
from workbook.cylinder import Cylinder
from workbook.fluid import Oil
from workbook.restrictor import SharpOrifice
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import BackPressureValve, CheckValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
BAR = 1e5
T = 313.15
OIL = Oil.from_grade("VG46")
RHO = float(OIL.density(T))
MU = float(OIL.dynamic_viscosity(T))
CYL = Cylinder(0.080, 0.045, 0.6, 210e5)
A1 = math.pi * 0.080 ** 2 / 4
A3 = A1 - math.pi * 0.045 ** 2 / 4
QP = 21.6 * LPM
P_CRACK, P_FULL = 160 * BAR, 172 * BAR
G_RELIEF = (P_FULL - P_CRACK) / QP
D_OR = 1.6e-3
FRICTION = 400.0
TANK = 1.5 * BAR
FV_CHECK = (0.5 * BAR, 0.2 * BAR / LPM, 0.01 * BAR / LPM ** 2)     # cracking, linear, quadratic
HOLD_CHECK = (1.0 * BAR, 0.1 * BAR / LPM)
CB = dict(setting=120 * BAR, ratio=3.0, gradient=2 * BAR / LPM, open_gradient=0.4 * BAR / LPM)
BP = dict(setting=40 * BAR, gradient=1 * BAR / LPM)
LOADS = np.linspace(-24e3, 24e3, 13)
MOVING = ("metering", "pump-limited", "relief bypassing")


def _holding(kind):
    check = CheckValve(HOLD_CHECK[0], HOLD_CHECK[1])
    if kind == "bp":
        return BackPressureValve(BP["setting"], BP["gradient"], check)
    if kind in ("cb-outlet", "cb-vented"):
        return CounterbalanceValve(CB["setting"], CB["ratio"], CB["gradient"], check,
                                   spring_chamber="outlet-referenced" if kind == "cb-outlet" else "vented",
                                   open_gradient=CB["open_gradient"])
    return None


def _axis(arrangement, controlled, kind, side):
    fv = RestrictorValve(SharpOrifice(D_OR), check=CheckValve(*FV_CHECK))
    supply = Supply(Pump(QP), ReliefValve(P_CRACK, P_FULL, QP))
    return circuit.Axis(CYL, OIL, supply, fv, arrangement=arrangement, controlled=controlled,
                        holding=_holding(kind), holding_side=side, friction=FRICTION, tank_pressure=TANK)


def _orifice(dp):
    a = math.pi * D_OR ** 2 / 4
    dp = np.maximum(dp, 0.0)
    turb = 0.61 * a * np.sqrt(2 * dp / RHO)
    lam = 8 * 0.2 ** 2 * a * a * dp / (math.pi * D_OR * MU)
    return np.minimum(turb, lam)


def _fv_check_drop(q):
    c, k, qq = FV_CHECK
    return c + k * q + qq * q * q


def _valve_side(arrangement, controlled):
    if arrangement == "bleed-off":
        return None
    if arrangement == "meter-in":
        return "cap" if controlled == "extend" else "rod"
    return "rod" if controlled == "extend" else "cap"


CASES = [(arr, ctrl, kind, side, direction)
         for arr in ("meter-in", "meter-out", "bleed-off")
         for ctrl in ("extend", "retract")
         for kind, side in [("none", "cap"), ("cb-outlet", "cap"), ("cb-outlet", "rod"), ("cb-vented", "cap"),
                            ("cb-vented", "rod"), ("bp", "cap"), ("bp", "rod")]
         for direction in ("extend", "retract")]


def _check_laws(arrangement, controlled, kind, side, direction):
    """Assert every law at the moving points; return what was exercised."""
    ax = _axis(arrangement, controlled, kind, side)
    sol = circuit.solve(ax, LOADS, T, direction, 1.0)
    ok = np.isin(sol.regime, MOVING) & (sol.speed > 0)
    assert ok.sum() >= 3, (sol.regime, sol.speed)
    v, f = sol.speed[ok], LOADS[ok]
    ext = direction == "extend"
    s = 1.0 if ext else -1.0
    driving, driven = ("cap", "rod") if ext else ("rod", "cap")
    a_d, a_o = (A1, A3) if ext else (A3, A1)
    p1, p3, p_pump, p_mid = sol.p1[ok], sol.p3[ok], sol.p_pump[ok], sol.p_mid[ok]
    p_d, p_o = (p1, p3) if ext else (p3, p1)
    q_in, q_out = a_d * v, a_o * v
    scale = 1e-6 * QP
    # force balance and continuity
    assert np.allclose(p_d * a_d - p_o * a_o, s * f + FRICTION, rtol=1e-7, atol=1e-3)
    assert np.allclose(sol.q_cylinder_in[ok], q_in, rtol=1e-12) and np.allclose(sol.q_cylinder_out[ok], q_out,
                                                                                   rtol=1e-12)
    controlled_now = direction == controlled
    vside = _valve_side(arrangement, controlled)
    seen = set()
    # the holding valve on the driven side
    if kind != "none" and side == driven:
        if kind == "bp":
            assert np.allclose(p_o - p_mid, BP["setting"] + BP["gradient"] * q_out, rtol=1e-7, atol=1.0)
        else:
            k = 1.0 + CB["ratio"] if kind == "cb-outlet" else 0.0
            p_open = CB["setting"] + k * p_mid - CB["ratio"] * p_d
            q_meter = np.maximum(p_o - p_open, 0.0) / CB["gradient"]
            q_wide = np.maximum(p_o - p_mid, 0.0) / CB["open_gradient"]
            assert np.allclose(np.minimum(q_meter, q_wide), q_out, rtol=1e-6, atol=scale)
            seen |= {"metering" if m else "wide open" for m in q_meter < q_wide}
            assert np.allclose(sol.p_pilot[ok], p_d)
    else:
        assert np.allclose(p_mid, p_o, rtol=1e-12, atol=1e-6)
    # the flow valve element between p_mid and tank
    if controlled_now and arrangement == "meter-out":
        assert np.allclose(_orifice(p_mid - TANK), q_out, rtol=1e-6, atol=scale)
    elif not controlled_now and vside == driven:
        assert np.allclose(p_mid - TANK, _fv_check_drop(q_out), rtol=1e-9, atol=1e-3)
    else:
        assert np.allclose(p_mid, TANK, rtol=1e-12, atol=1e-6)
    # the supply line: flow valve element, then the holding valve's check at the port
    hold_check = (HOLD_CHECK[0] + HOLD_CHECK[1] * q_in) if (kind != "none" and side == driving) else 0.0
    p_up = p_d + hold_check                     # pressure upstream of the port's holding valve
    if controlled_now and arrangement == "meter-in":
        assert np.allclose(_orifice(p_pump - p_up), q_in, rtol=1e-6, atol=scale)
    elif not controlled_now and vside == driving:
        assert np.allclose(p_pump - p_up, _fv_check_drop(q_in), rtol=1e-9, atol=1e-3)
    else:
        assert np.allclose(p_pump, p_up, rtol=1e-9, atol=1e-3)
    # the bleed and the relief share what the cylinder does not take
    q_bleed = _orifice(p_pump - TANK) if (controlled_now and arrangement == "bleed-off") else 0.0 * v
    assert np.allclose(sol.q_bleed[ok], q_bleed, rtol=1e-6, atol=scale)
    q_relief = np.maximum(p_pump - TANK - P_CRACK, 0.0) / G_RELIEF
    assert np.allclose(q_in + q_bleed + q_relief, QP, rtol=1e-6, atol=scale), (p_pump, q_in)
    if np.any(q_relief > scale):
        seen.add("relief open")
    return seen


@pytest.mark.parametrize("arrangement, controlled, kind, side, direction", CASES)
def test_every_law_closes_in_every_branch(arrangement, controlled, kind, side, direction):
    _check_laws(arrangement, controlled, kind, side, direction)


def test_both_counterbalance_branches_and_the_relief_are_exercised():
    # the hand laws above must have met the metering branch (setting, pilot, outlet and gradient
    # terms in force) and the branch held wide open by the pilot, for each spring chamber
    for kind in ("cb-outlet", "cb-vented"):
        seen = set()
        for case in CASES:
            if case[2] == kind:
                seen |= _check_laws(*case)
        assert {"metering", "wide open", "relief open"} <= seen, (kind, seen)
