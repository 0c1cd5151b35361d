"""Tests of workbook.restrictor against outside sources.

Sources named beside each check: the ``fluids`` library (orifice relation, Colebrook, loss
coefficients), laws worked by hand in the docstrings (orifice equation, Hagen-Poiseuille,
cone-seat area), Merritt 1967 (laminar orifice coefficient, from memory), and facts of the
trade marked "common practice".
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from fluids.core import K_from_f, dP_from_K
from fluids.fittings import exit_normal
from fluids.flow_meter import flow_meter_discharge
from fluids.friction import Colebrook, friction_laminar

from workbook.errors import InputError, ModelValidityError
from workbook.restrictor import (
    DRILL_SERIES_MM,
    RE_LAMINAR_LIMIT,
    RE_TURBULENT_FROM,
    REGIMES,
    LongThrottle,
    NeedleThrottle,
    RestrictorFlow,
    SharpOrifice,
    colebrook,
    darcy_friction_factor,
    drilled_orifice,
    needle_lift,
    orifice_diameter,
    round_to_drill,
    throttle_diameter,
)

# VG 46 mineral oil. nu40 = 46 cSt is the ISO 3448 grade midpoint; nu60 = 20.5 cSt is a
# typical datasheet value (from memory); densities from 870 kg/m^3 at 15 degC with a
# volumetric expansion of 7e-4 1/K (from memory).
RHO40 = 870.0 / (1 + 7e-4 * 25)
RHO60 = 870.0 / (1 + 7e-4 * 45)
MU40 = 46e-6 * RHO40
MU60 = 20.5e-6 * RHO60


# --------------------------------------------------------------------------- sharp orifice


@pytest.mark.parametrize("d, dp, rho, mu", [
    (1.0e-3, 50e5, 870.0, 0.040),     # turbulent, Re about 1400
    (0.5e-3, 2e5, 850.0, 0.020),      # turbulent
    (2.0e-3, 300e5, 1000.0, 0.001),   # water-like, high Re
    (1.0e-3, 1e5, 870.0, 10.0),       # laminar branch, Re < 9.3
])
def test_orifice_matches_fluids_flow_meter_discharge(d, dp, rho, mu):
    """fluids.flow_meter.flow_meter_discharge computes m = C·A·sqrt(2·dp·rho)/sqrt(1-beta^4)
    for a GIVEN discharge coefficient. We pass it our Cd at the solved Reynolds number and
    remove its velocity-of-approach factor 1/sqrt(1 - beta^4) (beta = 0.1 here: our orifice
    discharges from a large chamber, no approach velocity)."""
    o = SharpOrifice(d)
    r = o.flow(dp, rho, mu)
    cd = float(o.discharge_coefficient(r.reynolds))
    beta = 0.1
    m = flow_meter_discharge(D=d / beta, Do=d, P1=dp + 1e5, P2=1e5, rho=rho, C=cd,
                             expansibility=1.0)
    q_ref = m / rho * math.sqrt(1 - beta**4)
    assert float(r.flow) == pytest.approx(q_ref, rel=1e-12)   # fluids.flow_meter_discharge


def test_orifice_worked_example_by_hand():
    """Orifice equation by hand: d = 1 mm, A = pi/4 mm^2 = 7.853982e-7 m^2, dp = 50 bar,
    rho = 870: sqrt(2*5e6/870) = 107.2113 m/s; Q = 0.61*7.853982e-7*107.2113
    = 5.13641e-5 m^3/s; v = Q/A = 65.399 m/s; Re = 870*65.399*1e-3/0.040 = 1422.4."""
    r = SharpOrifice(1e-3).flow(50e5, 870.0, 0.040)
    assert float(r.flow) == pytest.approx(5.13641e-5, rel=2e-5)      # by hand
    assert float(r.reynolds) == pytest.approx(1422.4, rel=1e-4)     # by hand
    assert str(r.regime) == "turbulent"


def test_orifice_laminar_branch_is_merritt_linear_law():
    """Merritt 1967 (from memory): Cd = delta*sqrt(Re) at low Re gives, by hand,
    Q = 8*delta^2*A^2*dp/(pi*d*mu), linear in dp. d = 0.5 mm, mu = 5 Pa*s, dp = 2 bar:
    A = 1.963495e-7 m^2, Q = 8*0.04*3.855314e-14*2e5/(pi*5e-4*5) = 3.14159e-7 m^3/s."""
    o = SharpOrifice(0.5e-3)
    r = o.flow(2e5, 870.0, 5.0)
    assert str(r.regime) == "laminar"
    assert float(r.flow) == pytest.approx(3.14159e-7, rel=1e-5)      # by hand
    # Cd from its definition Q/(A*sqrt(2 dp/rho)) equals delta*sqrt(Re)   (Merritt 1967)
    cd_seen = float(r.flow) / (o.area * math.sqrt(2 * 2e5 / 870.0))
    assert cd_seen == pytest.approx(0.2 * math.sqrt(float(r.reynolds)), rel=1e-12)
    # linear in dp while laminar: half the drop, half the flow
    assert float(o.flow(1e5, 870.0, 5.0).flow) == pytest.approx(float(r.flow) / 2, rel=1e-12)


def test_orifice_cd_is_continuous_at_transition_reynolds():
    """Merritt 1967 (from memory): Cd = min(delta*sqrt(Re), cd) meets cd at Re_t = (cd/delta)^2."""
    o = SharpOrifice(1e-3, cd=0.61, delta=0.2)
    ret = o.transition_reynolds
    assert ret == pytest.approx((0.61 / 0.2) ** 2)                 # definition
    below, at, above = o.discharge_coefficient([ret * (1 - 1e-9), ret, ret * (1 + 1e-9)])
    assert below == pytest.approx(0.61, rel=1e-8) and at == pytest.approx(0.61) and above == 0.61


def test_orifice_turbulent_flow_follows_root_of_dp_and_barely_viscosity():
    """Common practice: a turbulent sharp orifice's flow follows sqrt(dp) and changes
    little (< 2 %) between cold and warm oil (VG 46 at 40 and 60 degC)."""
    o = SharpOrifice(1.0e-3)
    q1 = o.flow(20e5, RHO40, MU40)
    q2 = o.flow(40e5, RHO40, MU40)
    assert set(np.ravel([q1.regime, q2.regime])) == {"turbulent"}
    assert float(q2.flow / q1.flow) == pytest.approx(math.sqrt(2), rel=1e-12)   # common practice
    warm = o.flow(20e5, RHO60, MU60)
    change = abs(float(warm.flow / q1.flow) - 1)
    assert change < 0.02                                                       # common practice
    assert change > 0   # density does change with temperature, so the flow moves a little


def test_orifice_diameter_is_exact_inverse():
    """Inverse of the orifice equation (by hand, Merritt 1967 branches)."""
    q = np.array([1e-8, 1e-6, 1e-5, 1e-4, 1e-3])
    for mu in (0.001, 0.04, 5.0):
        s = orifice_diameter(q, 30e5, 870.0, mu)
        back = SharpOrifice(s.diameter).flow(30e5, 870.0, mu)
        np.testing.assert_allclose(back.flow, q, rtol=1e-12)
        np.testing.assert_allclose(s.state.flow, q, rtol=1e-12)


# --------------------------------------------------------------------------- friction


@pytest.mark.filterwarnings("ignore:overflow encountered:RuntimeWarning")  # inside fluids
@pytest.mark.parametrize("ed", [0.0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05])
def test_colebrook_matches_fluids(ed):
    """fluids.friction.Colebrook (an analytic Lambert-W solution) over Re 4e3..1e7."""
    re = np.logspace(np.log10(4e3), 7, 60)
    ref = np.array([Colebrook(x, ed) for x in re])
    np.testing.assert_allclose(colebrook(re, ed), ref, rtol=1e-12)          # fluids.friction.Colebrook
    np.testing.assert_allclose(darcy_friction_factor(re, ed), ref, rtol=1e-12)


def test_friction_factor_laminar_and_blend():
    """fluids.friction.friction_laminar (64/Re) below 2300; our documented linear blend
    between 64/2300 and Colebrook(4000) in the transitional band, continuous at both ends."""
    re = np.array([10.0, 500.0, 2000.0, 2299.0])
    np.testing.assert_allclose(darcy_friction_factor(re), [friction_laminar(x) for x in re], rtol=1e-14)
    ed = 1e-3
    f_lo, f_mid, f_hi = darcy_friction_factor([2300.0, 3150.0, 4000.0], ed)
    assert f_lo == pytest.approx(64 / 2300, rel=1e-14)                          # Hagen-Poiseuille
    assert f_hi == pytest.approx(Colebrook(4000.0, ed), rel=1e-12)             # fluids Colebrook
    assert f_mid == pytest.approx((f_lo + f_hi) / 2, rel=1e-12)                # the blend's midpoint
    eps = 1e-7
    for edge in (RE_LAMINAR_LIMIT, RE_TURBULENT_FROM):
        a, b = darcy_friction_factor([edge * (1 - eps), edge * (1 + eps)], ed)
        assert abs(b / a - 1) < 1e-5


# --------------------------------------------------------------------------- long throttle


def test_hagen_poiseuille_by_hand():
    """Hagen-Poiseuille by hand: d = 1.5 mm, L = 30 mm, VG 46 at 40 degC taken as
    mu = 0.0400 Pa*s, rho = 870 kg/m^3, Q = 1 L/min = 1.66667e-5 m^3/s.

    dp = 128*mu*L*Q/(pi*d^4) = 128*0.04*0.03*1.66667e-5/(pi*5.0625e-12)
       = 2.56000e-6/1.590431e-11 = 160 963 Pa (1.61 bar).
    v = Q/(pi*d^2/4) = 1.66667e-5/1.767146e-6 = 9.43140 m/s; Re = 870*9.4314*0.0015/0.04
    = 307.7, laminar. Entry + exit losses 1.5*870*9.4314^2/2 = 58 040 Pa.
    """
    q = 1 / 60000
    bare = LongThrottle(1.5e-3, 30e-3, entry_loss=0.0, exit_loss=0.0)
    r = bare.pressure_drop(q, 870.0, 0.040)
    assert float(r.pressure_drop) == pytest.approx(160963, rel=1e-5)           # by hand
    assert float(r.reynolds) == pytest.approx(307.7, rel=1e-4)                 # by hand
    assert str(r.regime) == "laminar"
    full = LongThrottle(1.5e-3, 30e-3).pressure_drop(q, 870.0, 0.040)
    assert float(full.pressure_drop - r.pressure_drop) == pytest.approx(58040, rel=1e-4)  # by hand
    # and the kinetic part agrees with fluids.core.dP_from_K
    v = q / (math.pi * 1.5e-3**2 / 4)
    assert float(full.pressure_drop - r.pressure_drop) == pytest.approx(dP_from_K(1.5, 870.0, v), rel=1e-12)


def test_exit_loss_default_matches_fluids():
    """fluids.fittings.exit_normal(): an exit into a large chamber loses one velocity head."""
    assert LongThrottle(1e-3, 0.02).exit_loss == exit_normal()


@pytest.mark.parametrize("q, ed", [(2e-4, 0.0), (5e-4, 1e-3), (1e-3, 1e-2)])
def test_turbulent_throttle_drop_matches_fluids(q, ed):
    """Turbulent throttle: dp = (f*L/d + K)*rho*v^2/2 with f from fluids.friction.Colebrook,
    K_from_f and dP_from_K from fluids.core (water-like fluid, Re well above 4000)."""
    d, length, rho, mu = 3e-3, 0.1, 1000.0, 1e-3
    t = LongThrottle(d, length, roughness=ed * d)
    r = t.pressure_drop(q, rho, mu)
    v = q / (math.pi * d**2 / 4)
    re = rho * v * d / mu
    assert re > RE_TURBULENT_FROM and str(r.regime) == "turbulent"
    ref = dP_from_K(K_from_f(Colebrook(re, ed), length, d) + 1.5, rho, v)
    assert float(r.pressure_drop) == pytest.approx(ref, rel=1e-12)            # fluids
    assert float(t.flow(r.pressure_drop, rho, mu).flow) == pytest.approx(q, rel=1e-12)


def test_long_throttle_flow_follows_dp_and_viscosity():
    """Common practice: a long throttle's flow rises about in proportion to dp and falls with
    viscosity; with VG 46 it more than doubles from 40 to 60 degC (mu ratio here 2.28)."""
    t = LongThrottle(0.8e-3, 40e-3)   # L/d = 50
    cold1 = t.flow(1e5, RHO40, MU40)
    cold2 = t.flow(2e5, RHO40, MU40)
    warm1 = t.flow(1e5, RHO60, MU60)
    assert set(np.ravel([cold1.regime, cold2.regime, warm1.regime])) == {"laminar"}
    assert 1.8 < float(cold2.flow / cold1.flow) <= 2.0                        # common practice
    assert MU40 / MU60 == pytest.approx(2.28, abs=0.01)                       # from the values above
    assert float(warm1.flow / cold1.flow) > 2.0                               # common practice
    assert float(warm1.flow / cold1.flow) < MU40 / MU60   # kinetic losses keep it below


def test_throttle_diameter_reproduces_flow_in_all_regimes():
    """Inverse of the throttle drop (Hagen-Poiseuille, blend, Colebrook)."""
    q = np.logspace(-7, -2, 40)
    s = throttle_diameter(q, 50e5, 870.0, 0.004, 0.03, roughness=1e-6)
    assert set(np.unique(s.state.regime)) == set(REGIMES)
    back = LongThrottle(s.diameter, 0.03, roughness=1e-6).pressure_drop(q, 870.0, 0.004)
    np.testing.assert_allclose(back.pressure_drop, 50e5, rtol=1e-11)
    np.testing.assert_allclose(s.state.flow, q, rtol=1e-11)


def test_throttle_worked_example_inverse():
    """Hagen-Poiseuille worked example above, backwards: 219 003 Pa -> 1 L/min, d = 1.5 mm."""
    t = LongThrottle(1.5e-3, 30e-3)
    assert float(t.flow(219003.0, 870.0, 0.040).flow) * 60000 == pytest.approx(1.0, rel=1e-5)
    s = throttle_diameter(1 / 60000, 219003.0, 870.0, 0.040, 30e-3)
    assert float(s.diameter) == pytest.approx(1.5e-3, rel=1e-5)


# --------------------------------------------------------------------------- needle throttle


def test_needle_area_by_hand_and_cap():
    """Cone-seat area by hand: d = 4 mm, alpha = 15 deg, h = 0.5 mm: h*sin(a) = 0.1294095 mm,
    h*sin(a)*cos(a) = 0.125 mm, A = pi*0.1294095*3.875 = 1.575390 mm^2; D_h = 2*h*sin(a)
    = 0.258819 mm. Full-open lift where A = pi*d^2/4 (quadratic, rising root):
    d*(1 - sqrt(1 - cos a))/(2 sin a cos a) = 4*(1 - 0.184591)/0.5 = 6.52327 mm."""
    a = math.radians(15)
    n = NeedleThrottle(4e-3, a, 0.5e-3)
    assert float(n.area) == pytest.approx(1.575390e-6, rel=1e-6)               # by hand
    assert float(n.hydraulic_diameter) == pytest.approx(0.258819e-3, rel=1e-6)  # by hand
    assert float(n.full_open_lift) == pytest.approx(6.52327e-3, rel=1e-5)      # by hand
    seat = math.pi * 4e-3**2 / 4
    at_open = NeedleThrottle(4e-3, a, float(n.full_open_lift))
    assert float(at_open.area) == pytest.approx(seat, rel=1e-12)                # continuous at cap
    beyond = NeedleThrottle(4e-3, a, 20e-3)
    assert float(beyond.area) == pytest.approx(seat, rel=1e-15)                 # capped
    # small-lift limit: A -> pi*d*h*sin(a) (a thin annulus at the seat edge), by hand
    tiny = NeedleThrottle(4e-3, a, 1e-7)
    assert float(tiny.area) == pytest.approx(math.pi * 4e-3 * 1e-7 * math.sin(a), rel=1e-5)


def test_needle_from_turns_and_flow_by_hand():
    """Lift = turns * pitch; 1.5 turns of a 0.5 mm thread = 0.75 mm (from_turns takes turns,
    from_angle the same opening in radians, 3 pi). Flow at 50 bar
    (orifice equation by hand): A = pi*h*s*(d - h*s*c) with h*s = 0.1941142 mm,
    h*s*c = 0.1875 mm (s*c = sin(30 deg)/2): A = pi*0.1941142*3.8125 = pi*0.7400606
    = 2.324969 mm^2; Q = 0.61*2.324969e-6*107.2113 = 1.520505e-4 m^3/s."""
    n = NeedleThrottle.from_turns(4e-3, math.radians(15), 1.5, 0.5e-3)
    assert n.lift == pytest.approx(0.75e-3, rel=1e-15)                          # by hand
    assert NeedleThrottle.from_angle(4e-3, math.radians(15), 3 * math.pi, 0.5e-3).lift == pytest.approx(0.75e-3)
    r = n.flow(50e5, 870.0, 0.040)
    assert str(r.regime) == "turbulent"
    assert float(r.flow) == pytest.approx(1.520505e-4, rel=1e-5)               # by hand
    assert float(n.pressure_drop(r.flow, 870.0, 0.040).pressure_drop) == pytest.approx(50e5, rel=1e-12)


def test_closed_needle_passes_nothing():
    """A closed needle (lift 0) passes no flow at any drop and refuses a flow."""
    n = NeedleThrottle(4e-3, 0.3, 0.0)
    r = n.flow([-1e6, 0.0, 1e6], 870.0, 0.04)
    assert r.flow.tolist() == [0.0, 0.0, 0.0] and r.reynolds.tolist() == [0.0, 0.0, 0.0]
    assert float(n.pressure_drop(0.0, 870.0, 0.04).pressure_drop) == 0.0
    with pytest.raises(InputError) as e:
        n.pressure_drop(1e-5, 870.0, 0.04)
    assert e.value.field == "q"


def test_needle_lift_inverse_and_refusal():
    """needle_lift is the inverse of NeedleThrottle.flow; past the seat area it refuses."""
    q = np.logspace(-10, -4, 30)
    for mu in (0.04, 2.0):
        s = needle_lift(q, 20e5, 870.0, mu, 4e-3, math.radians(20))
        np.testing.assert_allclose(NeedleThrottle(4e-3, math.radians(20), s.lift).flow(20e5, 870.0, mu).flow,
                                   q, rtol=1e-11)
        assert (s.lift > 0).all() and (s.lift <= NeedleThrottle(4e-3, math.radians(20), 0).full_open_lift).all()
    full = NeedleThrottle(4e-3, math.radians(20), 1.0).flow(20e5, 870.0, 0.04).flow
    with pytest.raises(InputError) as e:
        needle_lift(float(full) * 1.01, 20e5, 870.0, 0.04, 4e-3, math.radians(20))
    assert e.value.field == "q" and "seat" in str(e.value)


# --------------------------------------------------------------------------- results, signs


@pytest.mark.parametrize("r", [
    SharpOrifice(1e-3), LongThrottle(1e-3, 0.02, roughness=1e-6), NeedleThrottle(4e-3, 0.3, 3e-4)])
def test_sign_zero_and_broadcast(r):
    """Contract of DEVELOPERS.md: odd in dp, zero gives zero with Re 0, arrays broadcast."""
    dp = np.array([-300e5, -1e5, 0.0, 1e5, 300e5])[:, None]
    mu = np.array([[0.005, 0.04, 0.5]])
    res = r.flow(dp, 870.0, mu)
    assert isinstance(res, RestrictorFlow)
    assert res.flow.shape == res.reynolds.shape == res.regime.shape == res.pressure_drop.shape == (5, 3)
    np.testing.assert_array_equal(res.flow[0], -res.flow[4])
    np.testing.assert_array_equal(res.flow[2], 0.0)
    np.testing.assert_array_equal(res.reynolds[2], 0.0)
    assert (res.reynolds >= 0).all() and np.isfinite(res.flow).all()
    assert set(np.unique(res.regime)) <= set(REGIMES)
    back = r.pressure_drop(res.flow, 870.0, mu)
    np.testing.assert_allclose(back.pressure_drop, np.broadcast_to(dp, (5, 3)), rtol=1e-11, atol=1e-9)
    np.testing.assert_array_equal(back.regime, res.regime)


# --------------------------------------------------------------------------- drills


def test_drill_series_is_sane():
    """Series documented as a preferred subset of ISO 235 metric drill sizes (from memory):
    ascending, 0.05 mm steps to 3 mm, 0.1 mm to 10 mm, 0.5 mm to 20 mm."""
    s = np.array(DRILL_SERIES_MM)
    assert (np.diff(s) > 0).all()
    assert s[0] == 0.3 and s[-1] == 20.0
    for size in (0.5, 0.8, 1.0, 1.25, 1.5, 2.0, 2.5, 3.0, 4.2, 6.8, 8.5, 10.0, 12.0):   # from memory
        assert size in DRILL_SERIES_MM
    steps = np.round(np.diff(s), 6)
    assert set(steps[s[:-1] < 3.0]) == {0.05} and set(steps[(s[:-1] >= 3.0) & (s[:-1] < 10.0)]) == {0.1}


def test_round_to_drill_modes():
    """Rounding to the series: nearest, down (less flow), up (more flow); exact sizes stay."""
    d = np.array([1.23e-3, 1.26e-3, 1.5e-3, 4.04e-3])
    assert np.allclose(round_to_drill(d), [1.25e-3, 1.25e-3, 1.5e-3, 4.0e-3], rtol=1e-12)
    assert np.allclose(round_to_drill(d, mode="down"), [1.2e-3, 1.25e-3, 1.5e-3, 4.0e-3], rtol=1e-12)
    assert np.allclose(round_to_drill(d, mode="up"), [1.25e-3, 1.3e-3, 1.5e-3, 4.1e-3], rtol=1e-12)
    assert float(round_to_drill(1.0e-3 * (1 + 1e-12), mode="down")) == 1.0e-3
    own = [0.5e-3, 1e-3, 2e-3]
    assert float(round_to_drill(1.6e-3, series=own)) == 2e-3
    assert float(round_to_drill(1.4e-3, series=own)) == 1e-3


def test_drilled_orifice_reports_flow_of_the_drill():
    """Turbulent orifice equation: at a fixed drop the flow goes with d^2, so the drill
    passes q*(d_drill/d_exact)^2 (by hand from Q = cd*pi*d^2/4*sqrt(2 dp/rho))."""
    q = np.array([2e-5, 5e-5, 1e-4])
    r = drilled_orifice(q, 50e5, 870.0, 0.04)
    assert (np.abs(r.drill_diameter - r.exact_diameter) <= 0.025e-3 + 1e-15).all()
    np.testing.assert_allclose(r.flow, q * (r.drill_diameter / r.exact_diameter) ** 2, rtol=1e-12)
    np.testing.assert_allclose(r.flow_ratio, r.flow / q, rtol=1e-15)
    up = drilled_orifice(q, 50e5, 870.0, 0.04, mode="up")
    assert (up.flow >= q).all()
    down = drilled_orifice(q, 50e5, 870.0, 0.04, mode="down")
    assert (down.flow <= q).all()


# --------------------------------------------------------------------------- bad input

ORIFICE = SharpOrifice(1e-3)
T = LongThrottle(1e-3, 0.02)

BAD = [
    (lambda: SharpOrifice(0.0), "diameter"),
    (lambda: SharpOrifice(-1e-3), "diameter"),
    (lambda: SharpOrifice(float("nan")), "diameter"),
    (lambda: SharpOrifice(float("inf")), "diameter"),
    (lambda: SharpOrifice("1 mm"), "diameter"),
    (lambda: SharpOrifice(1e-3, cd=0.0), "cd"),
    (lambda: SharpOrifice(1e-3, cd=1.2), "cd"),
    (lambda: SharpOrifice(1e-3, delta=0.0), "delta"),
    (lambda: ORIFICE.flow(float("nan"), 870.0, 0.04), "dp"),
    (lambda: ORIFICE.flow(1e5, -870.0, 0.04), "rho"),
    (lambda: ORIFICE.flow(1e5, 870.0, 0.0), "mu"),
    (lambda: ORIFICE.pressure_drop(float("inf"), 870.0, 0.04), "q"),
    (lambda: ORIFICE.discharge_coefficient(-1.0), "re"),
    (lambda: LongThrottle(1e-3, 0.0), "length"),
    (lambda: LongThrottle(1e-3, 0.02, entry_loss=-0.1), "entry_loss"),
    (lambda: LongThrottle(1e-3, 0.02, exit_loss=float("nan")), "exit_loss"),
    (lambda: LongThrottle(1e-3, 0.02, roughness=-1e-6), "roughness"),
    (lambda: LongThrottle(1e-3, 0.02, roughness=1e-4), "roughness"),
    (lambda: T.flow([1e5, float("nan")], 870.0, 0.04), "dp"),
    (lambda: NeedleThrottle(4e-3, 0.0, 1e-3), "half_angle"),
    (lambda: NeedleThrottle(4e-3, math.pi / 2, 1e-3), "half_angle"),
    (lambda: NeedleThrottle(0.0, 0.3, 1e-3), "seat_diameter"),
    (lambda: NeedleThrottle(4e-3, 0.3, -1e-3), "lift"),
    (lambda: NeedleThrottle.from_turns(4e-3, 0.3, 6.0, 0.0), "pitch"),
    (lambda: NeedleThrottle.from_turns(4e-3, 0.3, -6.0, 5e-4), "turns"),
    (lambda: orifice_diameter(-1e-5, 1e6, 870.0, 0.04), "q"),
    (lambda: orifice_diameter(0.0, 1e6, 870.0, 0.04), "q"),
    (lambda: orifice_diameter(1e-5, 0.0, 870.0, 0.04), "dp"),
    (lambda: orifice_diameter(1e-5, 1e6, 870.0, 0.04, cd=1.5), "cd"),
    (lambda: throttle_diameter(1e-5, 1e6, 870.0, 0.04, -0.02), "length"),
    (lambda: throttle_diameter(1e-5, -1e6, 870.0, 0.04, 0.02), "dp"),
    (lambda: needle_lift(1e-5, 1e6, 870.0, 0.04, 4e-3, 2.0), "half_angle"),
    (lambda: needle_lift(1.0, 1e6, 870.0, 0.04, 4e-3, 0.3), "q"),
    (lambda: round_to_drill(0.0), "diameter"),
    (lambda: round_to_drill(1e-4, mode="down"), "diameter"),
    (lambda: round_to_drill(0.05, mode="up"), "diameter"),
    (lambda: round_to_drill(0.05), "diameter"),
    (lambda: round_to_drill(1e-3, mode="sideways"), "mode"),
    (lambda: round_to_drill(1e-3, series=[]), "series"),
    (lambda: round_to_drill(1e-3, series=[0.5, 1.0, 1.5]), "series"),  # mm given, not m
    (lambda: colebrook(0.0), "re"),
    (lambda: colebrook(1e4, -1e-3), "relative_roughness"),
    (lambda: drilled_orifice(1e-5, 1e6, 870.0, -0.04), "mu"),
]


@pytest.mark.parametrize("call, field", BAD, ids=[f"{i}-{f}" for i, (_, f) in enumerate(BAD)])
def test_bad_input_names_the_field(call, field):
    """DEVELOPERS.md: every bad input raises InputError naming the field and what is allowed."""
    with pytest.raises(InputError) as e:
        call()
    assert e.value.field == field
    assert str(e.value).startswith(field + ":") and "allowed:" in str(e.value)
    assert e.value.allowed


def test_roughness_beyond_colebrook_range_is_a_validity_error():
    """Colebrook/Moody range ends near eps/d = 0.05 (from memory): a model-validity error."""
    with pytest.raises(ModelValidityError):
        LongThrottle(1e-3, 0.02, roughness=1e-4)
