"""Property-based tests of workbook.restrictor (hypothesis) across wide input ranges.

Properties, each a consequence of the laws the module implements (orifice equation with
Cd = min(delta*sqrt(Re), cd), Merritt 1967 from memory; Hagen-Poiseuille plus kinetic
losses; Colebrook): inverses undo forward functions, sizing reproduces the flow, flow is
monotonic in drop and size, no NaN for valid input, and flow is continuous where the regime
changes.
"""

from __future__ import annotations

import math

import numpy as np
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from workbook.errors import ModelValidityError
from workbook.restrictor import (
    RE_LAMINAR_LIMIT,
    RE_TURBULENT_FROM,
    LongThrottle,
    NeedleThrottle,
    SharpOrifice,
    needle_lift,
    orifice_diameter,
    throttle_diameter,
)

SETTINGS = settings(max_examples=60, deadline=None)


def logs(lo, hi):
    """Floats spread evenly in log between lo and hi."""
    return st.floats(math.log10(lo), math.log10(hi)).map(lambda x: 10.0**x)


flows = logs(1e-10, 1e-2)          # m^3/s: 6e-6 L/min .. 600 L/min
drops = logs(1e2, 1e8)             # Pa: 1 mbar .. 1000 bar
rhos = st.floats(600.0, 1300.0)    # kg/m^3
mus = logs(5e-4, 5.0)              # Pa*s: water-like .. cold heavy oil
bores = logs(1e-4, 2e-2)           # m: 0.1 mm .. 20 mm
angles = st.floats(0.05, 1.45)     # rad


def throttles():
    return st.builds(
        lambda d, ratio, ke, kx, er: LongThrottle(d, d * ratio, ke, kx, er * d),
        bores, logs(1.0, 1e3), st.floats(0.0, 1.0), st.floats(0.0, 1.5), st.floats(0.0, 0.03))


def needles():
    return st.builds(lambda d, a, frac: NeedleThrottle(d, a, frac * float(NeedleThrottle(d, a, 0).full_open_lift)),
                     bores, angles, logs(1e-4, 1.5))


def restrictors():
    return st.one_of(st.builds(SharpOrifice, bores, st.floats(0.3, 1.0), st.floats(0.05, 0.5)),
                     throttles(), needles())


@SETTINGS
@given(r=restrictors(), q=flows, rho=rhos, mu=mus)
def test_flow_undoes_pressure_drop(r, q, rho, mu):
    """flow(pressure_drop(q)) == q, no NaN, same regime both ways (away from ties)."""
    qs = np.array([-q, 0.0, q, q * 3.7])
    dp = r.pressure_drop(qs, rho, mu)
    assert np.isfinite(dp.pressure_drop).all() and np.isfinite(dp.reynolds).all()
    back = r.flow(dp.pressure_drop, rho, mu)
    np.testing.assert_allclose(back.flow, qs, rtol=1e-10, atol=0)
    assert back.flow[1] == 0.0 and back.reynolds[1] == 0.0


@SETTINGS
@given(r=restrictors(), dp=drops, rho=rhos, mu=mus)
def test_pressure_drop_undoes_flow_and_flow_rises_with_dp(r, dp, rho, mu):
    """pressure_drop(flow(dp)) == dp; flow strictly rises with dp; odd in dp."""
    dps = dp * np.array([0.5, 0.9, 1.0, 1.1, 2.0])
    res = r.flow(dps, rho, mu)
    assert np.isfinite(res.flow).all() and (res.flow > 0).all()
    assert (np.diff(res.flow) > 0).all()
    np.testing.assert_allclose(r.pressure_drop(res.flow, rho, mu).pressure_drop, dps, rtol=1e-10)
    np.testing.assert_array_equal(r.flow(-dps, rho, mu).flow, -res.flow)


@SETTINGS
@given(d=bores, dp=drops, rho=rhos, mu=mus, ratio=logs(1.0, 300.0), grow=st.floats(1.01, 3.0))
def test_flow_rises_with_size(d, dp, rho, mu, ratio, grow):
    """A larger bore (or lift) passes more flow at the same drop, in every model."""
    length = d * ratio
    assert SharpOrifice(d * grow).flow(dp, rho, mu).flow > SharpOrifice(d).flow(dp, rho, mu).flow
    assert (LongThrottle(d * grow, length).flow(dp, rho, mu).flow
            > LongThrottle(d, length).flow(dp, rho, mu).flow)
    h = 0.1 * float(NeedleThrottle(4e-3, 0.3, 0).full_open_lift)
    assert (NeedleThrottle(4e-3, 0.3, h * grow).flow(dp, rho, mu).flow
            > NeedleThrottle(4e-3, 0.3, h).flow(dp, rho, mu).flow)


@SETTINGS
@given(q=flows, dp=drops, rho=rhos, mu=mus)
def test_orifice_diameter_reproduces_flow(q, dp, rho, mu):
    s = orifice_diameter(q, dp, rho, mu)
    assert np.isfinite(s.diameter) and s.diameter > 0
    np.testing.assert_allclose(SharpOrifice(s.diameter).flow(dp, rho, mu).flow, q, rtol=1e-12)


@SETTINGS
@given(q=flows, dp=drops, rho=rhos, mu=mus, length=logs(1e-3, 1.0), rough=st.floats(0.0, 1e-6))
def test_throttle_diameter_reproduces_flow(q, dp, rho, mu, length, rough):
    try:
        s = throttle_diameter(q, dp, rho, mu, length, roughness=rough)
    except ModelValidityError as exc:
        # a bore so small that the roughness exceeds 0.05 d is refused by design (Colebrook's range)
        assert exc.field == "roughness"
        assume(False)
    assert np.isfinite(s.diameter) and s.diameter > 0
    t = LongThrottle(s.diameter, length, roughness=rough)
    np.testing.assert_allclose(t.flow(dp, rho, mu).flow, q, rtol=1e-10)
    np.testing.assert_allclose(t.pressure_drop(q, rho, mu).pressure_drop, dp, rtol=1e-10)


@SETTINGS
@given(d=bores, a=angles, frac=logs(1e-6, 0.999), dp=drops, rho=rhos, mu=mus)
def test_needle_lift_reproduces_flow(d, a, frac, dp, rho, mu):
    """Pick a flow that a needle can pass (a fraction of the full-open flow), size the lift."""
    full = NeedleThrottle(d, a, 2 * float(NeedleThrottle(d, a, 0).full_open_lift)).flow(dp, rho, mu).flow
    q = float(full) * frac
    s = needle_lift(q, dp, rho, mu, d, a)
    np.testing.assert_allclose(NeedleThrottle(d, a, s.lift).flow(dp, rho, mu).flow, q, rtol=1e-10)


@SETTINGS
@given(t=throttles(), rho=rhos, mu=mus, which=st.sampled_from([RE_LAMINAR_LIMIT, RE_TURBULENT_FROM]))
def test_throttle_flow_continuous_across_regime_edges(t, rho, mu, which):
    """Flow and drop are continuous where the throttle regime changes (Re 2300 and 4000)."""
    q_edge = which * mu * math.pi * t.diameter / (4 * rho)
    eps = 1e-9
    lo, hi = t.pressure_drop(q_edge * np.array([1 - eps, 1 + eps]), rho, mu).pressure_drop
    assert 0 < hi / lo - 1 < 1e-7
    f = t.flow(np.array([lo, hi]), rho, mu).flow
    assert 0 < f[1] / f[0] - 1 < 1e-7


@SETTINGS
@given(d=bores, rho=rhos, mu=mus, cd=st.floats(0.3, 1.0), delta=st.floats(0.05, 0.5))
def test_orifice_flow_continuous_across_cd_corner(d, rho, mu, cd, delta):
    """Flow is continuous where Cd changes branch (Re = (cd/delta)^2)."""
    o = SharpOrifice(d, cd, delta)
    q_edge = o.transition_reynolds * mu * o.area / (rho * d)
    eps = 1e-9
    r = o.pressure_drop(q_edge * np.array([1 - eps, 1 + eps]), rho, mu)
    assert list(r.regime) == ["laminar", "turbulent"]
    assert 0 < r.pressure_drop[1] / r.pressure_drop[0] - 1 < 1e-7
