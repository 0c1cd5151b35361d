"""Conservation at the solved points, every line from quantities the solver does not define
in terms of each other: each valve's characteristic is written out by hand here and
re-evaluated at the solved pressures, the holding valve included, partly open (metering)
and, on a meter-in sweep from an overrunning to a resisting load, held wide open by its pilot.
A changed valve law in the solver (pilot ratio, metering gradient, outlet factor, fully-open
drop, back-pressure gradient, relief gradient) or a changed force balance fails a line here.

By hand (DEVELOPERS.md sign convention, gauge pressures):
- force balance on the piston: p1 A1 - p3 A3 = F + F_fr extending, F - F_fr retracting;
- continuity: the driven chamber's outflow A_o v passes the holding valve and the flow
  valve in series (meter-out), the pump flow splits into cylinder and relief (meter-in);
- relief valve: q = Q_p (p - p_crack)/(p_full - p_crack) between cracking and full flow;
- counterbalance metering (poppet force balance, valve module docstring): q = (p_in - p_open)/g
  with p_open = p_set + k p_out - R p_pilot, k = 1 + R outlet-referenced, 0 vented, while
  q < (p_in - p_out)/r (not yet held wide open by the pilot), else q = (p_in - p_out)/r;
- back-pressure valve: q = (p_in - p_out - p_set)/g;
- sharp orifice flow valve: q = Cd a sqrt(2 dp / rho), Cd 0.61 (Merritt 1967, turbulent).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from workbook.circuit import Axis, solve
from workbook.cylinder import Cylinder
from workbook.fluid import Oil
from workbook.restrictor import SharpOrifice
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import BackPressureValve, CheckValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
BAR = 1e5
T40 = 313.15
OIL = Oil.from_grade("VG46")
CYL = Cylinder(0.080, 0.045, 0.6, 210e5)
A1, A3 = CYL.a1, CYL.a3
QP = 21.6 * LPM
P_CRACK, P_FULL = 160e5, 172e5
SUPPLY = Supply(Pump(QP), ReliefValve(P_CRACK, P_FULL, QP))
D_ORIFICE = 1.4e-3
FRICTION = 400.0
TANK = 1.5 * BAR
G_CB = 2 * BAR / LPM          # 2 bar per L/min
G_BP = 1 * BAR / LPM


def _holding(kind):
    if kind == "cb-outlet":
        return CounterbalanceValve(120 * BAR, 3.0, G_CB, CheckValve(1 * BAR), spring_chamber="outlet-referenced")
    if kind == "cb-vented":
        return CounterbalanceValve(120 * BAR, 3.0, G_CB, CheckValve(1 * BAR), spring_chamber="vented")
    return BackPressureValve(60 * BAR, G_BP, CheckValve(1 * BAR))


def _orifice_flow(dp):
    rho = float(OIL.density(T40))
    return 0.61 * math.pi * D_ORIFICE ** 2 / 4 * np.sqrt(2 * np.maximum(dp, 0.0) / rho)


# (arrangement, holding side, direction): the holding valve restrains the driven chamber
CASES = [("meter-out", "cap", "retract"), ("meter-out", "rod", "extend"),
         ("meter-in", "cap", "retract"), ("meter-in", "rod", "extend")]


def _axis(h, arrangement, side, direction):
    return Axis(CYL, OIL, SUPPLY, RestrictorValve(SharpOrifice(D_ORIFICE)), arrangement=arrangement,
                controlled=direction, holding=h, holding_side=side, friction=FRICTION, tank_pressure=TANK)


def _check_laws(h, kind, arrangement, direction, loads, s):
    """Every law of the module docstring at the solved points of ``s``; returns the masks of
    the points where the counterbalance meters (partly open) and where its pilot holds it
    wide open (both False for the back-pressure valve)."""
    v = s.speed
    assert np.all(v > 0), s.regime
    a_d, a_o = (A1, A3) if direction == "extend" else (A3, A1)
    p_d, p_o = (s.p1, s.p3) if direction == "extend" else (s.p3, s.p1)
    # force balance, from the pressures alone (no term the solver reports as unbalanced)
    fr = FRICTION if direction == "extend" else -FRICTION
    assert np.allclose(s.p1 * A1 - s.p3 * A3, loads + fr, rtol=1e-7, atol=1e-3)
    # the holding valve, its law written out here, at the solved pressures: p_in the held
    # (driven) chamber, pilot the driving chamber, p_out the line after it
    q_out = a_o * v
    p_after = s.p_mid if arrangement == "meter-out" else TANK + 0.0 * v
    metering = wide = np.zeros(v.shape, dtype=bool)
    if kind == "bp":
        q_hand = (p_o - p_after - h.setting) / G_BP
    else:
        k = 1.0 + h.pilot_ratio if kind == "cb-outlet" else 0.0
        q_meter = np.maximum(p_o - (h.setting + k * p_after - h.pilot_ratio * p_d), 0.0) / G_CB
        q_wide = (p_o - p_after) / h.open_gradient        # held wide open by the pilot
        q_hand = np.minimum(q_meter, q_wide)
        metering, wide = q_meter < q_wide, q_wide < q_meter
    assert np.allclose(q_hand, q_out, rtol=1e-6, atol=1e-6 * QP), (q_hand / LPM, q_out / LPM)
    assert np.all(q_out > 0.05 * QP)
    if arrangement == "meter-out":
        # the orifice between the holding valve and tank passes the same flow
        assert np.allclose(_orifice_flow(s.p_mid - TANK), q_out, rtol=1e-6, atol=1e-9)
        q_in = a_d * v
    else:
        # the orifice between pump and driving chamber passes the driving chamber's inflow
        q_in = _orifice_flow(s.p_pump - p_d)
        assert np.allclose(q_in, a_d * v, rtol=1e-6, atol=1e-9)
    # the pump flow splits into cylinder and relief, the relief on its own characteristic
    q_relief = QP * np.clip((s.p_pump - TANK - P_CRACK) / (P_FULL - P_CRACK), 0.0, None)
    assert np.allclose(q_relief + q_in, QP, rtol=1e-6, atol=1e-6 * QP), (s.p_pump, q_in)
    return metering, wide


@pytest.mark.parametrize("kind", ["cb-outlet", "cb-vented", "bp"])
@pytest.mark.parametrize("arrangement, side, direction", CASES)
def test_each_law_closes_at_the_solved_pressures(arrangement, side, direction, kind):
    h = _holding(kind)
    # an overrunning load on the held side (it pushes oil out of the holding chamber)
    sign_load = 1.0 if side == "cap" else -1.0
    loads = sign_load * np.array([5e3, 12e3, 20e3])
    s = solve(_axis(h, arrangement, side, direction), loads, T40, direction, 1.0)
    metering, _wide = _check_laws(h, kind, arrangement, direction, loads, s)
    if kind != "bp" and (arrangement == "meter-in" or (side, kind) == ("rod", "cb-outlet")):
        # partly open here: the metering branch (and so its gradient and pilot terms) is the one in force
        assert np.all(metering)


@pytest.mark.parametrize("kind", ["cb-outlet", "cb-vented"])
@pytest.mark.parametrize("side, direction, sign", [("cap", "retract", 1.0), ("rod", "extend", -1.0)])
def test_counterbalance_meters_then_its_pilot_holds_it_wide_open(kind, side, direction, sign):
    """Meter-in, from an overrunning load (the counterbalance meters, partly open, its pilot
    pressure just what opening it takes) to a resisting one (the driving pressure, and so the
    pilot, rises until the valve is held wide open and drops r q): both branches of the
    valve's characteristic, re-evaluated at the solved pressures, are met on one sweep."""
    spring = "vented" if kind == "cb-vented" else "outlet-referenced"
    h = CounterbalanceValve(30 * BAR, 3.0, G_CB, CheckValve(1 * BAR), spring_chamber=spring)
    loads = sign * np.array([5e3, 0.0, -2e3, -8e3, -15e3])
    s = solve(_axis(h, "meter-in", side, direction), loads, T40, direction, 1.0)
    metering, wide = _check_laws(h, kind, "meter-in", direction, loads, s)
    assert metering[:3].all() and wide[-2:].all(), (metering, wide)
