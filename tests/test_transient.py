"""The axis in time (workbook.transient) against the steady solver, Merritt's natural
frequency, conservation of energy and a sudden stop derived by hand; bad input refused."""

from __future__ import annotations

import math

import numpy as np
import pytest

from workbook.circuit import Axis, solve
from workbook.cylinder import Cylinder
from workbook.errors import InputError
from workbook.fluid import Oil
from workbook.restrictor import SharpOrifice
from workbook.supply import Pump, ReliefValve, Supply
from workbook.transient import Model, Move, initial_state, simulate
from workbook.valve import CheckValve, CompensatedFlowValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
BAR = 1e5
T40 = 313.15
OIL = Oil.from_grade("VG46")


def _axis(arrangement="meter-out", controlled="extend", holding=None, side="cap", stroke=2.0, mass=200.0,
          friction=300.0, valve="compensated"):
    rho = float(OIL.density(T40))
    if valve == "compensated":
        fv = CompensatedFlowValve.from_setting(12 * LPM, rho, droop=0.02, check=CheckValve())
    else:
        fv = RestrictorValve(SharpOrifice(2.0e-3), CheckValve(), kind="orifice")
    return Axis(Cylinder(0.080, 0.045, stroke, 210e5), OIL,
                Supply(Pump(21.6 * LPM), ReliefValve(160e5, 172e5, 21.6 * LPM)), fv,
                arrangement=arrangement, controlled=controlled, holding=holding, holding_side=side,
                friction=friction, mass=mass, tank_pressure=2 * BAR)


def _cb():
    return CounterbalanceValve(60 * BAR, 3.0, 0.5 * BAR / LPM, CheckValve(1 * BAR))


# arrangement, controlled, direction simulated, holding, holding side, load (N), start (m)
STEADY = [
    ("meter-out", "extend", "extend", None, "cap", 20e3, 0.2),
    ("meter-out", "retract", "retract", None, "cap", -10e3, 1.8),
    ("meter-in", "extend", "extend", None, "cap", 20e3, 0.2),
    ("meter-in", "retract", "retract", None, "cap", -10e3, 1.8),
    ("bleed-off", "extend", "extend", None, "cap", 20e3, 0.2),
    ("meter-in", "retract", "retract", "cb", "cap", 15e3, 1.8),     # lowering on a counterbalance
    ("meter-out", "extend", "extend", "cb", "rod", -15e3, 0.2),
    ("meter-in", "retract", "extend", "cb", "cap", 15e3, 0.2),      # lifting through its check
]


@pytest.mark.parametrize("arr,ctl,direction,hold,side,load,x0", STEADY)
def test_steady_limit_matches_circuit_solve(arr, ctl, direction, hold, side, load, x0):
    """After settling, the simulated speed and the cap, rod and pump pressures agree with
    circuit.solve (the steady force balance and continuity of the same component objects)
    within 0.5 %; pressures within 0.5 % of their value or of 1 bar, whichever is larger (the
    directional valve, ideal in the steady solver, is given 0.05 bar at pump flow here)."""
    # a sharp orifice where nothing else damps the axis (bleed-off, meter-in with the return
    # open to tank: a compensated valve there leaves the mass on its oil spring undamped)
    plain = arr == "bleed-off" or (arr == "meter-in" and hold is None)
    axis = _axis(arr, ctl, _cb() if hold else None, side, valve="orifice" if plain else "compensated")
    m = Model(axis, (0.0, axis.cylinder.stroke), (load, load), temperature=T40)
    tr = simulate(m, [Move(direction, duration=6.0)], x0=x0, rtol=1e-6, atol_p=1.0)
    s = solve(axis, load, T40, direction)
    assert 0.0 < tr.x[-1] < axis.cylinder.stroke
    v = abs(tr.v[-1])
    assert v == pytest.approx(float(s.speed), rel=5e-3)
    for got, want in ((tr.p1[-1], s.p1), (tr.p3[-1], s.p3), (tr.ps[-1], s.p_pump)):
        assert abs(got - float(want)) <= max(5e-3 * abs(float(want)), 5e-3 * BAR * 200)


@pytest.mark.parametrize("x", [0.3, 1.0, 1.7])
def test_natural_frequency_merritt(x):
    """A small disturbance on the trapped axis (valves shut, no friction) oscillates at
    w0 = sqrt(E'/m (A1²/V1 + A3²/V3)) (Merritt, Hydraulic Control Systems, 1967), V the
    chamber plus its dead volume, within 2 %."""
    e = 1.2e9
    axis = _axis(friction=0.0, mass=500.0)
    m = Model(axis, (0.0, 2.0), (20e3, 20e3), temperature=T40, modulus=e, opening=0.0)
    y0 = initial_state(m, x, 0.0)
    y0[m.i_v] = 2e-4
    c = axis.cylinder
    w0 = float(c.natural_frequency(e, 500.0, x, m.vol0[m.i1], m.vol0[m.i3]))
    period = 2 * math.pi / w0
    tr = simulate(m, [Move("stop", duration=20 * period)], x0=x, y0=y0, rtol=1e-9, atol_p=1e-3,
                  max_step=period / 40)
    v = tr.v
    up = np.where((v[:-1] < 0) & (v[1:] >= 0))[0]
    # zero crossings by linear interpolation
    tz = tr.t[up] - v[up] * (tr.t[up + 1] - tr.t[up]) / (v[up + 1] - v[up])
    measured = 2 * math.pi / np.mean(np.diff(tz))
    assert measured == pytest.approx(w0, rel=0.02)


def _preloaded(m, x0, v0, load, p3=50 * BAR):
    """A state at rest-balance with the rod side at ``p3`` and the cap side holding the load
    (so neither column nears cavitation)."""
    c = m.cyl
    y0 = initial_state(m, x0, v0)
    y0[m.i3] = p3
    y0[m.i1] = (load + p3 * c.a3) / c.a1
    return y0


def _column_energy(p, p0, vol, vol0, e):
    """Stored energy of a trapped column, J: -∫ p dV with p = p0 - E ln(V/V0) (the model's
    dp/dt = -E/V dV/dt integrated, by hand); its leading term is (p - p0)²V/(2E) + p0 (V0 - V)."""
    return -p0 * (vol - vol0) + e * (vol * np.log(vol / vol0) - vol + vol0)


def test_energy_conserved_valves_shut():
    """Valves shut, no friction: kinetic + hydraulic spring energy + the load's work is
    constant (a conservative system; energy derived by hand in _column_energy) within 1e-4 of
    the oscillation energy over 50 periods."""
    e, mass, x0, load = 1.4e9, 800.0, 0.8, 20e3
    axis = _axis(friction=0.0, mass=mass)
    m = Model(axis, (0.0, 2.0), (load, load), temperature=T40, modulus=e, opening=0.0)
    y0 = _preloaded(m, x0, 0.02, load)
    c = axis.cylinder
    w0 = float(c.natural_frequency(e, mass, x0, m.vol0[m.i1], m.vol0[m.i3]))
    period = 2 * math.pi / w0
    tr = simulate(m, [Move("stop", duration=50 * period)], x0=x0, y0=y0, rtol=1e-10, atol_p=1e-4,
                  max_step=period / 30)
    v1 = c.a1 * tr.x + m.vol0[m.i1]
    v3 = c.a3 * (c.stroke - tr.x) + m.vol0[m.i3]
    en = (0.5 * mass * tr.v ** 2 + _column_energy(tr.p1, tr.p1[0], v1, v1[0], e)
          + _column_energy(tr.p3, tr.p3[0], v3, v3[0], e) + load * (tr.x - x0))
    e0 = 0.5 * mass * 0.02 ** 2
    assert np.max(np.abs(en - en[0])) / e0 < 1e-4
    assert tr.t[-1] == pytest.approx(50 * period, rel=1e-9)


def test_sudden_stop_peak_pressure():
    """A mass moving at v onto trapped columns (valves shut at once, no friction): the
    kinetic energy goes into the two oil springs, ½ m v² = ½ k δ², k = E(A1²/V1 + A3²/V3);
    the cap pressure rises by E A1 δ / V1 = (E A1/V1) v sqrt(m/k), which for one trapped
    column (A3²/V3 -> 0) is v sqrt(E m / V1) (by hand). Within 3 %."""
    e, mass, x0, vel = 1.4e9, 800.0, 1.0, -0.1          # retracting into the cap column
    axis = _axis(friction=0.0, mass=mass)
    m = Model(axis, (0.0, 2.0), (0.0, 0.0), temperature=T40, modulus=e, opening=0.0)
    y0 = _preloaded(m, x0, vel, 0.0)
    c = axis.cylinder
    v1, v3 = c.a1 * x0 + m.vol0[m.i1], c.a3 * (c.stroke - x0) + m.vol0[m.i3]
    k = e * (c.a1 ** 2 / v1 + c.a3 ** 2 / v3)
    dp1 = e * c.a1 / v1 * abs(vel) * math.sqrt(mass / k)
    period = 2 * math.pi / math.sqrt(k / mass)
    tr = simulate(m, [Move("stop", duration=period)], x0=x0, y0=y0, rtol=1e-9, atol_p=1e-3, max_step=period / 200)
    assert np.max(tr.p1) - tr.p1[0] == pytest.approx(dp1, rel=0.03)


def test_bad_input_names_the_field():
    """Each refusal is an InputError naming its field (DEVELOPERS.md, Bad input)."""
    axis = _axis()
    with pytest.raises(InputError) as e:
        Model(axis, (0.0, 1.0, 0.5), (0.0, 0.0, 0.0))
    assert e.value.field == "motion.load_table"
    with pytest.raises(InputError) as e:
        Move("extend", ramp=0.0)
    assert e.value.field == "motion.ramp"
    m = Model(axis, (0.0, 2.0), (0.0, 0.0))
    with pytest.raises(InputError) as e:
        simulate(m, [Move("extend", target=2.5)])
    assert e.value.field == "motion.profile"
    with pytest.raises(InputError) as e:
        Model(_axis(mass=0.0), (0.0, 2.0), (0.0, 0.0))
    assert e.value.field == "operation.mass"
