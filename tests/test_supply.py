"""Tests of workbook.supply against hand calculations and facts of the trade."""

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st

from workbook.errors import InputError
from workbook.supply import Pump, ReliefValve, Supply

LPM = 1 / 60000


def test_pump_flow_is_displacement_times_speed_times_efficiency():
    # by hand: 16 cm3/rev * 1450 rpm * 0.93 = 21.576 L/min
    p = Pump.from_displacement(16e-6, 1450 / 60, 0.93)
    assert p.flow == pytest.approx(21.576 * LPM, rel=1e-12)


def test_fixed_pump_flow_is_constant_with_pressure():
    # common practice: a fixed-displacement pump delivers nearly constant flow whatever the pressure
    q = Pump(20 * LPM).delivered(np.array([0.0, 50e5, 250e5]))
    assert np.all(q == 20 * LPM)


def test_relief_closed_below_cracking_and_full_flow_at_full_flow_pressure():
    # definition of a relief valve's override characteristic (common practice), checked by hand
    r = ReliefValve(160e5, 172e5, 20 * LPM)
    q = r.flow(np.array([0.0, 159.9e5, 160e5, 166e5, 172e5]))
    assert q[:3].tolist() == [0.0, 0.0, 0.0]
    assert q[3] == pytest.approx(10 * LPM, rel=1e-12)     # half-way up the override: half the flow
    assert q[4] == pytest.approx(20 * LPM, rel=1e-12)
    assert r.gradient == pytest.approx(12e5 / (20 * LPM))


@given(st.floats(0.0, 1e-3, allow_nan=False))
def test_relief_pressure_is_inverse_of_flow(q):
    # the linear characteristic and its inverse, round trip (exact algebra)
    r = ReliefValve(100e5, 110e5, 5e-4)
    assert float(r.flow(r.pressure(q))) == pytest.approx(q, rel=1e-9, abs=1e-15)


def _values(**kw):
    v = {"displacement": 16e-6, "shaft_speed": 1450 / 60, "volumetric_efficiency": 0.93, "pump_flow": None,
         "relief_cracking": 160e5, "relief_full_flow": 172e5, "drive_power": 7500.0}
    v.update(kw)
    return v


def test_from_values_and_pump_flow_override():
    s = Supply.from_values(_values())
    assert s.flow == pytest.approx(21.576 * LPM)
    assert s.relief.rated_flow == s.flow
    s2 = Supply.from_values(_values(pump_flow=30 * LPM))
    assert s2.flow == pytest.approx(30 * LPM)


@pytest.mark.parametrize("full", [160e5, 150e5])
def test_relief_full_flow_must_exceed_cracking(full):
    with pytest.raises(InputError) as e:
        Supply.from_values(_values(relief_full_flow=full))
    assert e.value.field == "relief_full_flow" and "160 bar" in e.value.allowed


@pytest.mark.parametrize("field,value", [("volumetric_efficiency", 1.2), ("displacement", -1.0),
                                         ("shaft_speed", math.nan)])
def test_bad_pump_inputs(field, value):
    with pytest.raises(InputError) as e:
        Supply.from_values(_values(**{field: value}))
    assert e.value.field == field


def test_pressure_for_delivery_follows_relief_override():
    # common practice: what the axis does not take crosses the relief
    s = Supply(Pump(20 * LPM), ReliefValve(160e5, 172e5, 20 * LPM))
    p = s.pressure_for_delivery(np.array([0.0, 5 * LPM, 20 * LPM]))
    assert p.tolist() == pytest.approx([172e5, 169e5, 160e5])
