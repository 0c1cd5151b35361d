"""Oil model against ISO 3448 and ASTM D341."""

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from workbook.errors import InputError, ModelValidityError
from workbook.fluid import ISO3448_MIDPOINT_CST, Oil, iso3448_limits, walther_constants

C = 273.15


@pytest.mark.parametrize("grade, lo, hi", [
    # ISO 3448 Table 1: kinematic viscosity limits at 40 °C, mm²/s
    ("VG10", 9.0, 11.0), ("VG15", 13.5, 16.5),
    ("VG22", 19.8, 24.2), ("VG32", 28.8, 35.2), ("VG46", 41.4, 50.6), ("VG68", 61.2, 74.8), ("VG100", 90.0, 110.0),
    ("VG150", 135.0, 165.0),
])
def test_iso3448_grade_limits(grade, lo, hi):
    got_lo, got_hi = iso3448_limits(grade)
    assert got_lo * 1e6 == pytest.approx(lo) and got_hi * 1e6 == pytest.approx(hi)
    oil = Oil.from_grade(grade)
    assert lo <= oil.kinematic_viscosity(40 + C) * 1e6 <= hi  # ISO 3448: grade midpoint at 40 °C


def test_astm_d341_reproduces_its_two_points_and_is_monotonic_between():
    # ASTM D341: the line through two points passes through both
    oil = Oil(nu40=46e-6, nu100=6.8e-6)
    assert oil.kinematic_viscosity(313.15) == pytest.approx(46e-6, rel=1e-12)
    assert oil.kinematic_viscosity(373.15) == pytest.approx(6.8e-6, rel=1e-12)
    t = np.linspace(273.15, 373.15, 101)
    nu = oil.kinematic_viscosity(t)
    assert np.all(np.diff(nu) < 0)


def test_astm_d341_hand_computation_at_60C():
    """ASTM D341 by hand for 46 / 6.8 cSt:

    W40 = log10(log10(46.7)) = 0.222539, W100 = log10(log10(7.5)) = -0.057962,
    B = (W40 - W100)/(log10 373.15 - log10 313.15) = 0.280500/0.076131 = 3.68444,
    A = W40 + B log10 313.15 = 9.41799; at 333.15 K: log10 log10(nu+0.7) = 0.12347,
    nu = 10**(10**0.12347) - 0.7 = 20.62 cSt.
    """
    a, b = walther_constants(46e-6, 313.15, 6.8e-6, 373.15)
    assert b == pytest.approx(3.68444, rel=2e-5)
    assert a == pytest.approx(9.41799, rel=2e-6)
    nu60 = Oil(46e-6, 6.8e-6).kinematic_viscosity(333.15) * 1e6
    assert nu60 == pytest.approx(10 ** (10 ** (a - b * math.log10(333.15))) - 0.7, rel=1e-12)
    assert nu60 == pytest.approx(20.62, abs=0.01)


def test_typical_vg46_viscosity_index_oil_values():
    # from memory: a VG46 mineral oil of VI about 100 has roughly 20 cSt at 60 °C and 400 to 600 cSt at 0 °C
    oil = Oil.from_grade("VG46")
    assert 18 < oil.kinematic_viscosity(60 + C) * 1e6 < 23
    assert 350 < oil.kinematic_viscosity(0 + C) * 1e6 < 700


def test_density_and_dynamic_viscosity():
    # density: rho15/(1 + alpha (T-15 °C)) with 870 kg/m3 and 7e-4 1/K (from memory); mu = rho nu (definition)
    oil = Oil(46e-6, 6.8e-6, density15=870.0, expansion=7e-4)
    assert oil.density(288.15) == pytest.approx(870.0)
    assert oil.density(313.15) == pytest.approx(870 / (1 + 7e-4 * 25))
    assert oil.dynamic_viscosity(313.15) == pytest.approx(oil.density(313.15) * 46e-6)


def test_vectorised_over_temperature_arrays():
    oil = Oil.from_grade("VG32")
    t = np.array([[20.0], [40.0], [60.0]]) + C
    nu = oil.kinematic_viscosity(t)
    assert nu.shape == (3, 1)
    assert nu[1, 0] == pytest.approx(32e-6)


def test_refuses_outside_validity():
    oil = Oil.from_grade("VG46", pour_point=-30 + C)
    with pytest.raises(ModelValidityError, match="pour point"):
        oil.kinematic_viscosity(-40 + C)
    # ASTM D341: the constant 0.7 holds down to about 2 mm²/s; above that temperature we refuse
    t_hi = oil.max_temperature
    assert oil.kinematic_viscosity(t_hi) == pytest.approx(2e-6, rel=1e-9)
    with pytest.raises(ModelValidityError, match="2 cSt"):
        oil.kinematic_viscosity(t_hi + 5)
    with pytest.raises(InputError):
        oil.kinematic_viscosity(np.array([300.0, np.nan]))


@settings(max_examples=60, deadline=None)
@given(nu40=st.floats(10, 500), ratio=st.floats(3, 12), t=st.floats(-20, 90))
def test_no_nan_and_positive_for_valid_oils(nu40, ratio, t):
    oil = Oil(nu40 * 1e-6, max(nu40 / ratio, 2.5) * 1e-6)
    tk = t + C
    if tk > oil.max_temperature:
        return
    nu = oil.kinematic_viscosity(tk)
    assert math.isfinite(nu) and nu >= 2e-6 * (1 - 1e-9)
    assert oil.temperature_for_viscosity(nu) == pytest.approx(tk, rel=1e-9)


def test_grade_check_against_nu40():
    with pytest.raises(InputError, match="ISO 3448 VG46"):
        Oil.from_values({"grade": "VG46", "nu40": 60e-6, "nu100": 7e-6, "density15": 870, "expansion": 7e-4,
                         "bulk_modulus": 1.4e9, "pour_point": 243.15})
    assert set(ISO3448_MIDPOINT_CST) == {"VG10", "VG15", "VG22", "VG32", "VG46", "VG68", "VG100", "VG150"}


def test_effective_bulk_modulus_series_springs_by_hand():
    """Springs in series (Merritt 1967, from memory): 1/E' = 1/E_oil + (V_l/V)/K_l + x/(kappa p_abs).

    By hand: oil 1.4e9 Pa with 40 % of the column in a hose of 3e8 Pa: 1/E' = 7.1429e-10 +
    1.3333e-9 = 2.0476e-9, E' = 4.884e8 Pa, inside the 0.7 to 1.2 GPa typical with hoses only
    when the hose share is small (from memory). Steel tube 10 x 1.5 mm: K = E t/d = 3.15e10 Pa
    (thin wall, Barlow). Air: 0.5 % at atmospheric, at 1 bar gauge (p_abs = 2.01325e5 Pa):
    x = 0.005 x 0.6121 / (0.995 + 0.0031) = 0.003066; term 0.003066/(1.4 x 2.01325e5) = 1.088e-8,
    1/E' = 1.159e-8, E' = 8.6e7 Pa: sixteen times softer than the oil alone; at 200 bar the
    air hardly counts."""
    from workbook.fluid import effective_bulk_modulus, tube_modulus
    assert float(effective_bulk_modulus(1.4e9, 0.0, 0.0, 0.4, 3e8)) == pytest.approx(4.884e8, rel=1e-3)
    assert tube_modulus(0.010, 0.0015) == pytest.approx(3.15e10)
    soft = float(effective_bulk_modulus(1.4e9, 1e5, 0.005))
    r = (101325 / 201325) ** (1 / 1.4)
    x = 0.005 * r / (0.995 + 0.005 * r)
    assert soft == pytest.approx(1 / (1 / 1.4e9 + x / (1.4 * 201325)), rel=1e-12)
    assert soft == pytest.approx(8.63e7, rel=2e-3) and soft < 1.4e9 / 15
    assert float(effective_bulk_modulus(1.4e9, 200e5, 0.005)) > 0.95 * 1.4e9
