"""Tests of workbook.valve: orifice equation, continuity of the compensated curve,
counterbalance opening condition, and bad input."""

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from workbook.errors import InputError
from workbook.restrictor import SharpOrifice
from workbook.valve import DROOP_SPAN, BackPressureValve, CheckValve, CompensatedFlowValve, CounterbalanceValve, RestrictorValve

LPM = 1 / 60000
RHO, MU = 870.0, 0.04


def comp(**kw):
    args = dict(cd=0.61, compensator_drop=6e5, min_drop=8e5, droop=0.02)
    args.update(kw)
    return CompensatedFlowValve.from_setting(12 * LPM, RHO, **args)


def test_metering_area_from_orifice_equation():
    # orifice equation Q = Cd A sqrt(2 dp / rho) (Merritt 1967): A = Q / (Cd sqrt(2 dpc/rho))
    v = comp()
    assert v.area == pytest.approx(12 * LPM / (0.61 * math.sqrt(2 * 6e5 / RHO)), rel=1e-12)
    assert float(v.nominal_flow(RHO)) == pytest.approx(12 * LPM, rel=1e-12)


def test_compensated_flow_curve_continuous_and_droops_upwards():
    # common practice: fixed orifice below dp_min (sqrt law), setting with droop above, continuous
    v = comp()
    eps = 1.0
    below, at, above = v.flow(np.array([8e5 - eps, 8e5, 8e5 + eps]), RHO)
    assert below == pytest.approx(at, rel=1e-5) and above == pytest.approx(at, rel=1e-5)
    assert float(v.flow(2e5, RHO)) == pytest.approx(12 * LPM * math.sqrt(2 / 8), rel=1e-12)
    # 100 bar above the minimum drop: +2 % (droop definition)
    assert float(v.flow(108e5, RHO)) == pytest.approx(12 * LPM * 1.02, rel=1e-12)


def test_compensated_reverse_free_flow_through_check():
    # common practice: reverse flow through the built-in check (0.5 bar cracking here)
    v = comp()
    q = v.flow(np.array([-0.4e5, -2.5e5]), RHO)
    assert q[0] == 0.0
    # 2.5 bar reverse drop = 0.5 bar cracking + 2.0 bar on the check's documented default
    # gradient of 0.1 bar per L/min (valve.py; from memory): 20 L/min back through it
    assert q[1] == pytest.approx(-20 * LPM, rel=1e-12)


def test_closed_valves_pass_no_flow_and_no_warning():
    # opening 0 = fully closed: zero flow, never a division by zero
    with np.errstate(all="raise"):
        assert float(comp().flow(50e5, RHO, opening=0.0)) == 0.0
        rv = RestrictorValve(SharpOrifice(2e-3))
        assert float(rv.flow(50e5, RHO, MU, opening=0.0)) == 0.0
    assert math.isinf(float(comp().pressure_drop(1e-5, RHO, opening=0.0)))


@given(st.floats(1e-7, 30 * LPM), st.floats(0.05, 1.0))
def test_compensated_pressure_drop_inverts_flow(q, opening):
    # inverse and forward characteristic round trip (exact algebra of the model)
    v = comp()
    dp = v.pressure_drop(q, RHO, opening=opening)
    assert float(v.flow(dp, RHO, opening=opening)) == pytest.approx(q, rel=1e-9)


def test_restrictor_valve_is_orifice_scaled_by_opening():
    # turbulent orifice: Q = Cd A sqrt(2 dp/rho) (Merritt 1967), opening scales the flow
    rv = RestrictorValve(SharpOrifice(2e-3))
    q = float(rv.flow(50e5, RHO, MU, opening=0.5))
    assert q == pytest.approx(0.5 * 0.61 * math.pi * 0.002 ** 2 / 4 * math.sqrt(2 * 50e5 / RHO), rel=1e-9)
    assert float(rv.pressure_drop(q, RHO, MU, opening=0.5)) == pytest.approx(50e5, rel=1e-9)


def test_restrictor_valve_orifice_against_fluids_library():
    # reference library: fluids.flow_meter.flow_meter_discharge gives m = C eps A sqrt(2 rho dp)/sqrt(1-beta^4);
    # with beta -> 0 (orifice in a very large pipe), epsilon 1 (liquid) this is the orifice equation
    fm = pytest.importorskip("fluids.flow_meter")
    m = fm.flow_meter_discharge(D=1.0, Do=0.002, P1=60e5, P2=10e5, rho=RHO, C=0.61, expansibility=1.0)
    q = float(RestrictorValve(SharpOrifice(2e-3)).flow(50e5, RHO, MU))
    assert q == pytest.approx(m / RHO, rel=1e-6)


@given(st.floats(0.0, 5e-4))
def test_check_valve_quadratic_inverse(q):
    # dp = crack + k q + c q^2 and its closed-form inverse (algebra)
    c = CheckValve(0.5e5, gradient=1e8, quadratic=1e13)
    assert float(c.flow(c.pressure_drop(q))) == pytest.approx(q, rel=1e-9, abs=1e-15)


def test_counterbalance_opening_condition():
    # force balance on the poppet (common practice): closed until p_load + R p_pilot >= p_set; Q = (p_load + R p_pilot - p_set)/g
    g = 0.5e5 / LPM
    cb = CounterbalanceValve(130e5, 3.0, g)
    assert float(cb.flow(40e5, 29.9e5)) == 0.0              # 40 + 89.7 < 130
    assert float(cb.flow(40e5, 32e5)) == pytest.approx(6e5 / g)
    # spring chamber draining to the outlet (the default): 2 bar on the outlet adds (1 + R) 2 = 8 bar
    # to the opening pressure (poppet force balance: outlet on the seat annulus, the spring side
    # and the back of the pilot piston; common practice, from memory)
    assert float(cb.flow(48e5, 32e5, 2e5)) == pytest.approx(6e5 / g)
    assert float(cb.inlet_pressure(6e5 / g, 32e5)) == pytest.approx(40e5)
    assert float(cb.inlet_pressure(6e5 / g, 32e5, 2e5)) == pytest.approx(48e5)
    # vented to air: the outlet pressure does not move the opening point
    vented = CounterbalanceValve(130e5, 3.0, g, spring_chamber="vented")
    assert float(vented.flow(40e5, 32e5, 2e5)) == pytest.approx(6e5 / g)
    assert float(vented.opening_pressure(32e5, 50e5)) == pytest.approx(130e5 - 96e5)
    # reverse free flow through its check (1 bar cracking)
    assert float(cb.flow(0.0, 0.0, 3e5)) < 0.0


@pytest.mark.parametrize("chamber", ["outlet-referenced", "vented"])
def test_counterbalance_fully_open_keeps_a_drop(chamber):
    """Held fully open by its pilot the valve is a fully open restriction, dp = r Q (our
    linear law, r the open gradient): with 0.2 bar per L/min, 15 L/min costs 3 bar whatever
    the pilot (by hand). The inverse in the outlet pressure gives the inlet back."""
    g, r = 0.5e5 / LPM, 0.2e5 / LPM
    cb = CounterbalanceValve(130e5, 4.0, g, spring_chamber=chamber, open_gradient=r)
    q = 15 * LPM
    for pilot in (60e5, 120e5):
        assert float(cb.inlet_pressure(q, pilot, 10e5)) == pytest.approx(13e5)
        assert float(cb.flow(13e5, pilot, 10e5)) == pytest.approx(q)
    p_in = np.array([20e5, 80e5, 150e5])
    p_out = cb.outlet_pressure(q, p_in, 40e5)
    assert np.allclose(cb.inlet_pressure(q, 40e5, p_out), p_in, rtol=1e-12)
    assert np.allclose(cb.flow(p_in, 40e5, p_out), q, rtol=1e-9)


def test_back_pressure_valve_holds_upstream_at_setting():
    # direct-acting relief in series: p_in = p_out + p_set + g q (force balance on the poppet, common practice)
    bp = BackPressureValve(30e5, 1e5 / LPM)
    assert float(bp.inlet_pressure(np.array(0.0), 2e5)) == pytest.approx(32e5)
    assert float(bp.flow(42e5, 2e5)) == pytest.approx(10 * LPM)
    assert float(bp.flow(31e5, 2e5)) == 0.0


@pytest.mark.parametrize("ctor,field", [
    (lambda: CounterbalanceValve(130e5, 0.0, 1e9), "pilot_ratio"),
    (lambda: CounterbalanceValve(130e5, 3.0, 0.0), "gradient"),
    (lambda: comp(min_drop=4e5), "min_drop"),
    (lambda: comp(droop=-0.1), "droop"),
    (lambda: CheckValve(-1.0), "check_cracking"),
    (lambda: comp().flow(1e5, RHO, opening=1.5), "opening"),
    (lambda: comp().flow(1e5, RHO, opening=float("nan")), "opening"),
])
def test_bad_valve_input_names_the_field(ctor, field):
    with pytest.raises(InputError) as e:
        ctor()
    assert e.value.field == field and e.value.allowed


def test_droop_span_is_100_bar():
    # droop is quoted per 100 bar of valve drop (data-sheet convention, common practice)
    assert DROOP_SPAN == 100e5
