"""Cylinder geometry, force balance and the ISO 3320 series."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbook import cylinder as cyl
from workbook.cylinder import Cylinder, smallest_standard_bore


def test_areas_by_hand():
    # geometry by hand: A1 = pi D²/4, A3 = pi (D² - d²)/4
    c = Cylinder(0.063, 0.036)
    assert c.a1 == pytest.approx(math.pi * 0.063 ** 2 / 4)
    assert c.a3 == pytest.approx(math.pi * (0.063 ** 2 - 0.036 ** 2) / 4)
    assert c.phi == pytest.approx(0.063 ** 2 / (0.063 ** 2 - 0.036 ** 2))
    assert c.a1 - c.a3 == pytest.approx(c.rod_area)


def test_closed_meter_out_intensification_is_phi_times_supply():
    # common practice: rod-side pressure with meter-out valve closed and no load = supply x area ratio
    c = Cylinder(0.080, 0.056)
    assert c.rod_pressure(0.0, 160e5) == pytest.approx(160e5 * c.phi)
    # a pulling load (negative, pulling the rod out) adds its force over the annulus
    assert c.rod_pressure(-10e3, 160e5) == pytest.approx(160e5 * c.phi + 10e3 / c.a3)


@settings(max_examples=100, deadline=None)
@given(bore=st.floats(0.01, 0.5), ratio=st.floats(0.1, 0.95), p1=st.floats(0, 4e7), f=st.floats(-1e6, 1e6))
def test_force_balance_inverts(bore, ratio, p1, f):
    c = Cylinder(bore, bore * ratio)
    p3 = c.rod_pressure(f, p1)
    assert c.force(p1, p3) == pytest.approx(f, abs=1e-6 * max(1.0, abs(f), p1 * c.a1))
    assert c.cap_pressure(f, p3) == pytest.approx(p1, abs=1e-6 * max(1.0, p1, abs(f) / c.a1))


def test_iso3320_series_membership():
    # ISO 3320 first-choice bores (from memory of the standard's table)
    for mm in (25, 32, 40, 50, 63, 80, 100, 125, 160, 200):
        assert cyl.is_standard_bore(mm / 1000)
    for mm in (30, 70, 75, 90, 150):
        assert not cyl.is_standard_bore(mm / 1000)
    # ISO 3320 rods include 36, 45, 56 (R20 series) but not 35 or 60 (from memory of the standard's table)
    for mm in (36, 45, 56, 70):
        assert cyl.is_standard_rod(mm / 1000)
    for mm in (35, 60):
        assert not cyl.is_standard_rod(mm / 1000)
    assert all(r < 0.080 for r in cyl.standard_rods_for(0.080))
    # the series are the R10 / R20 preferred numbers (ISO 3): every step is between 1.12 and 1.6
    steps = np.diff(np.log(cyl.ISO3320_BORES_MM[3:]))
    assert np.all(steps > math.log(1.12)) and np.all(steps < math.log(1.6))


def test_smallest_standard_bore():
    # by hand: 60 kN at 160 bar needs A = 3.75e-3 m2, D = 69.1 mm -> next ISO 3320 bore is 80 mm
    assert smallest_standard_bore(60e3, 160e5) == pytest.approx(0.080)
    # exactly the area of a 63 mm bore at 100 bar stays at 63
    f63 = math.pi * 0.063 ** 2 / 4 * 100e5
    assert smallest_standard_bore(f63 * 0.999, 100e5) == pytest.approx(0.063)
    # pulling with d/D = 0.7 needs a larger bore
    assert smallest_standard_bore(60e3, 160e5, rod_ratio=0.7) == pytest.approx(0.100)


def test_euler_buckling():
    # Euler: F = pi² E I / (K L)², I = pi d⁴/64; fixed-free has K = 2 (four times less than pinned-pinned)
    c = Cylinder(0.1, 0.056, stroke=1.0)
    i = math.pi * 0.056 ** 4 / 64
    assert c.euler_buckling_load() == pytest.approx(math.pi ** 2 * 2.1e11 * i / 1.0)
    assert c.euler_buckling_load(mounting="fixed-free") == pytest.approx(c.euler_buckling_load() / 4)


def test_natural_frequency_minimum_is_inside_stroke():
    # Merritt (1967): w0 = sqrt(E/m (A1²/V1 + A3²/V3)); the minimum lies inside the stroke, never at the ends
    c = Cylinder(0.08, 0.045, stroke=1.0)
    x = np.linspace(0.01, 0.99, 99)
    w = c.natural_frequency(1.4e9, 800.0, x)
    i = int(np.argmin(w))
    assert 0 < i < len(x) - 1
    v1, v3 = c.a1 * x[i], c.a3 * (1 - x[i])
    assert w[i] == pytest.approx(math.sqrt(1.4e9 / 800 * (c.a1 ** 2 / v1 + c.a3 ** 2 / v3)))


def test_short_rod_johnson_below_the_euler_limit():
    """Johnson parabola (J. B. Johnson; Shigley, Mechanical Engineering Design): below the
    transition slenderness lambda_c = pi sqrt(2 E / s_y) the critical stress is
    s_y - (s_y lambda / (2 pi))^2 / E, tangent to Euler's pi^2 E / lambda^2 at lambda_c.

    By hand, 36 mm rod, 355 MPa, pinned, 0.5 m: lambda = 0.5 / 0.009 = 55.6 < 108.1;
    s = 355e6 - (355e6 * 55.56 / (2 pi))^2 / 2.1e11 = 355e6 - 46.92e6 = 308.1 MPa; A_rod =
    10.179 cm^2; F = 313.6 kN, where Euler (I = pi 0.036^4 / 64 = 8.2448e-8 m^4,
    pi^2 2.1e11 I / 0.5^2 = 683.5 kN) would claim more than twice as much."""
    c = Cylinder(0.063, 0.036, 0.2, 210e5)
    assert c.slenderness(0.5) == pytest.approx(55.556, rel=1e-4)
    assert c.transition_slenderness() == pytest.approx(108.06, rel=1e-3)
    assert c.buckling_load(0.5) == pytest.approx(313.6e3, rel=1e-3)
    assert c.euler_buckling_load(length=0.5) == pytest.approx(683.5e3, rel=1e-3)
    # the two laws meet at the transition: half the yield stress on the rod area
    lc = c.transition_slenderness() * 0.009
    assert c.buckling_load(lc * (1 - 1e-9)) == pytest.approx(c.rod_area * 355e6 / 2, rel=1e-6)
    assert c.buckling_load(lc * (1 + 1e-9)) == pytest.approx(c.rod_area * 355e6 / 2, rel=1e-6)


def test_buckling_length_estimate_is_longer_than_twice_a_short_stroke():
    """With no pin-to-pin length given the extended length is taken as stroke + closed length,
    the closed length stroke + 4 bores (from memory: heads, piston, guide and pin eyes take
    three to four bores): 100 mm stroke, 63 mm bore -> 0.452 m, more than twice the stroke
    (0.2 m), which would under-estimate a short cylinder's length."""
    c = Cylinder(0.063, 0.036, 0.1)
    assert c.free_length == pytest.approx(0.452) and c.length_estimated
    assert Cylinder(0.063, 0.036, 0.1, buckling_length=0.3).free_length == 0.3
