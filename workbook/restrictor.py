"""Fixed restrictors: sharp-edged orifice, long throttle, needle (cone-seat) throttle.

Every model here answers the same two questions over numpy arrays that broadcast together
(``dp`` of shape ``(N, 1)`` against oil properties of shape ``(1, M)``, for example):

* ``flow(dp, rho, mu)``: the flow through the restrictor at a pressure drop, and
* ``pressure_drop(q, rho, mu)``: the drop that a flow costs,

each returning a :class:`RestrictorFlow` with the flow, the drop, the Reynolds number and the
flow regime. Both are odd functions (a negative drop gives a negative flow of the same size),
zero gives zero with a Reynolds number of 0, and no valid input gives NaN. Sizing functions
answer the inverse questions: the bore of an orifice or a throttle, and the lift of a needle,
that pass a flow at a drop; :func:`drilled_orifice` rounds an orifice to a standard drill
and reports the flow the drill really passes.

Units are SI throughout: pressure drop in Pa, flow in m³/s, density ``rho`` in kg/m³,
dynamic viscosity ``mu`` in Pa·s, lengths in m, angles in rad.

Regime labels (:data:`REGIMES`), and what they mean in each model:

=============  ==========================================  ===============================
label          sharp orifice and needle throttle            long throttle
=============  ==========================================  ===============================
laminar        Re below ``(cd/delta)**2``: Cd = delta·√Re   Re < 2300: Hagen-Poiseuille
transitional   never reported (the Cd model has no band)    2300 ≤ Re < 4000: blended f
turbulent      Re at or above ``(cd/delta)**2``: Cd = cd    Re ≥ 4000: Colebrook
=============  ==========================================  ===============================

References: H. E. Merritt, *Hydraulic Control Systems*, Wiley 1967 (orifice equation and the
laminar discharge coefficient Cd = delta·√Re, delta about 0.2 for a sharp circular orifice,
from memory); Hagen-Poiseuille law for laminar pipe flow; C. F. Colebrook, J. Inst. Civil
Eng. 11 (1939) for the turbulent friction factor.

>>> o = SharpOrifice(1.0e-3)
>>> r = o.flow(50e5, 870.0, 0.040)
>>> round(float(r.flow) * 60000, 3), str(r.regime)       # L/min
(3.082, 'turbulent')
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Callable

import numpy as np

from .errors import InputError, ModelValidityError

#: the regime labels a :class:`RestrictorFlow` can carry
LAMINAR = "laminar"
TRANSITIONAL = "transitional"
TURBULENT = "turbulent"
REGIMES = (LAMINAR, TRANSITIONAL, TURBULENT)

#: long throttle: Hagen-Poiseuille below this pipe Reynolds number (common practice)
RE_LAMINAR_LIMIT = 2300.0
#: long throttle: Colebrook from this pipe Reynolds number on (common practice)
RE_TURBULENT_FROM = 4000.0
#: largest relative roughness accepted; the Colebrook equation and the Moody chart it
#: underlies stop at about 0.05 (from memory)
MAX_RELATIVE_ROUGHNESS = 0.05

_LN10 = math.log(10.0)
_REGIME_DTYPE = "<U12"


# --------------------------------------------------------------------------- results


@dataclass(frozen=True, eq=False)
class RestrictorFlow:
    """State of a restrictor at one or many operating points (all numpy arrays).

    Attributes
    ----------
    flow : numpy.ndarray
        Volume flow, m³/s; same sign as ``pressure_drop``.
    pressure_drop : numpy.ndarray
        Pressure drop across the restrictor, Pa.
    reynolds : numpy.ndarray
        Reynolds number (never negative), on the model's own length scale: the bore for an
        orifice or a throttle, the hydraulic diameter of the gap for a needle.
    regime : numpy.ndarray of str
        One of :data:`REGIMES` per point; see the module docstring for what each means.
    """

    flow: np.ndarray
    pressure_drop: np.ndarray
    reynolds: np.ndarray
    regime: np.ndarray


@dataclass(frozen=True, eq=False)
class DiameterSizing:
    """A bore sized for a flow at a drop: the ``diameter`` (m) and the ``state``
    (:class:`RestrictorFlow`) of the sized restrictor at that drop."""

    diameter: np.ndarray
    state: RestrictorFlow


@dataclass(frozen=True, eq=False)
class LiftSizing:
    """A needle lift sized for a flow at a drop: the ``lift`` (m), the flow ``area`` (m²)
    and the ``state`` (:class:`RestrictorFlow`) at that drop."""

    lift: np.ndarray
    area: np.ndarray
    state: RestrictorFlow


@dataclass(frozen=True, eq=False)
class DrilledOrifice:
    """An orifice sized exactly and rounded to a drill.

    Attributes
    ----------
    exact_diameter : numpy.ndarray
        Bore that passes the asked flow at the asked drop, m.
    drill_diameter : numpy.ndarray
        Standard drill chosen for it, m.
    state : RestrictorFlow
        The drilled orifice at the asked drop: ``state.flow`` is what it really passes.
    flow_ratio : numpy.ndarray
        ``state.flow`` divided by the asked flow (1.0 means the drill is exact).
    """

    exact_diameter: np.ndarray
    drill_diameter: np.ndarray
    state: RestrictorFlow
    flow_ratio: np.ndarray

    @property
    def flow(self) -> np.ndarray:
        """Flow the drilled orifice passes at the asked drop, m³/s."""
        return self.state.flow


# --------------------------------------------------------------------------- validation


def _fmt(value: float, unit: str) -> str:
    return f"{value:g} {unit}".strip()


def _array(value, field: str, unit: str, what: str, kind: str) -> np.ndarray:
    """Convert ``value`` to a float array and check it.

    ``kind``: ``"positive"`` (> 0), ``"nonnegative"`` (>= 0) or ``"finite"`` (any sign).
    """
    allowed = {
        "positive": f"{what} greater than 0 {unit}, finite".replace("  ", " "),
        "nonnegative": f"{what} of 0 {unit} or more, finite".replace("  ", " "),
        "finite": f"a finite {what} in {unit} (either sign)" if unit else f"a finite {what}",
    }[kind]
    if isinstance(value, (str, bytes)) or value is None:
        raise InputError(field, repr(value), allowed)
    try:
        arr = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputError(field, repr(value), allowed) from None
    bad = ~np.isfinite(arr)
    if kind == "positive":
        bad |= ~(arr > 0)
    elif kind == "nonnegative":
        bad |= ~(arr >= 0)
    if bad.any():
        raise InputError(field, _fmt(float(arr[bad].flat[0]), unit), allowed)
    return arr


def _out(arr):
    """A float for a 0-d result, the array otherwise."""
    arr = np.asarray(arr, dtype=float)
    return float(arr) if arr.ndim == 0 else arr


def _stored(arr: np.ndarray):
    """A size as stored on a restrictor: a float for a scalar, a read-only array else."""
    if arr.ndim == 0:
        return float(arr)
    out = np.array(arr, dtype=float)
    out.setflags(write=False)
    return out


def _cd_delta(cd, delta) -> tuple[np.ndarray, np.ndarray]:
    cd_a = _array(cd, "cd", "", "a discharge coefficient", "positive")
    if (cd_a > 1).any():
        raise InputError("cd", _fmt(float(cd_a[cd_a > 1].flat[0]), ""),
                         "a discharge coefficient greater than 0 and at most 1")
    delta_a = _array(delta, "delta", "", "a laminar discharge factor", "positive")
    return cd_a, delta_a


def _finite(result: np.ndarray, field: str, given, unit: str) -> np.ndarray:
    if not np.isfinite(result).all():
        bad = np.asarray(given, dtype=float)
        raise InputError(field, _fmt(float(np.max(np.abs(bad))), unit),
                         "a value whose result stays within floating-point range")
    return result


def _regime_of(laminar: np.ndarray, transitional: np.ndarray | None = None) -> np.ndarray:
    out = np.full(laminar.shape, TURBULENT, dtype=_REGIME_DTYPE)
    if transitional is not None:
        out[transitional] = TRANSITIONAL
    out[laminar] = LAMINAR
    return out


# --------------------------------------------------------------------------- solver


def _solve_log(resid: Callable[[np.ndarray, np.ndarray], np.ndarray], lo: np.ndarray,
               hi: np.ndarray, tol: float = 1e-14, maxiter: int = 200) -> np.ndarray:
    """Vectorised bracketed root of an increasing function, in log coordinates.

    ``resid(u, idx)`` returns the residual at ``x = exp(u)`` for the points ``idx`` of the
    flat problem; it must be increasing in ``u`` with ``resid(log lo) <= 0 <= resid(log hi)``.
    Illinois (modified regula falsi) with a bisection fallback, so every point stays
    bracketed; stops when the residual or the bracket in ``ln x`` is below ``tol``.
    Returns ``x`` (flat array).
    """
    a = np.log(lo).astype(float)
    b = np.log(hi).astype(float)
    n = a.size
    idx_all = np.arange(n)
    fa = resid(a, idx_all)
    fb = resid(b, idx_all)
    x = 0.5 * (a + b)
    done = np.zeros(n, dtype=bool)
    at_a = fa >= 0
    at_b = (fb <= 0) & ~at_a
    x[at_a] = a[at_a]
    x[at_b] = b[at_b]
    done |= at_a | at_b
    side = np.zeros(n, dtype=int)
    for _ in range(maxiter):
        act = np.nonzero(~done)[0]
        if act.size == 0:
            break
        A, B, FA, FB = a[act], b[act], fa[act], fb[act]
        with np.errstate(divide="ignore", invalid="ignore"):
            c = (A * FB - B * FA) / (FB - FA)
        bad = ~((c > A) & (c < B))
        c[bad] = 0.5 * (A[bad] + B[bad])
        fc = resid(c, act)
        x[act] = c
        neg = fc < 0
        pos = fc > 0
        s = side[act]
        # Illinois: halve the residual kept at the end that was not moved twice running
        ia = act[neg]
        a[ia] = c[neg]
        fa[ia] = fc[neg]
        fb[act[neg & (s == -1)]] *= 0.5
        ib = act[pos]
        b[ib] = c[pos]
        fb[ib] = fc[pos]
        fa[act[pos & (s == 1)]] *= 0.5
        side[ia] = -1
        side[ib] = 1
        conv = (np.abs(fc) <= tol) | ((b[act] - a[act]) <= tol * np.maximum(1.0, np.abs(c)))
        done[act[conv]] = True
    return np.exp(x)


# --------------------------------------------------------------------------- Cd(Re) orifice core


def _cd_of_re(re, cd, delta):
    return np.minimum(delta * np.sqrt(re), cd)


def _orifice_flow(dp, rho, mu, area, length, cd, delta) -> RestrictorFlow:
    """Flow through an opening of ``area`` with Reynolds length ``length`` and
    Cd = min(delta·√Re, cd); closed forms both ways (see :class:`SharpOrifice`)."""
    dp, rho, mu, area, length, cd, delta = np.broadcast_arrays(dp, rho, mu, area, length, cd, delta)
    adp = np.abs(dp)
    q_turb = cd * area * np.sqrt(2.0 * adp / rho)
    q_lam = 2.0 * delta**2 * length * adp * area / mu
    laminar = q_lam < q_turb
    q = np.where(laminar, q_lam, q_turb)
    with np.errstate(divide="ignore", invalid="ignore"):
        re = np.where(area > 0, rho * q * length / np.where(area > 0, area, 1.0) / mu, 0.0)
    laminar = laminar | (q == 0)
    q = _finite(np.sign(dp) * q, "dp", dp, "Pa")
    return RestrictorFlow(q, np.array(dp, dtype=float), _finite(re, "dp", dp, "Pa"), _regime_of(laminar))


def _orifice_drop(q, rho, mu, area, length, cd, delta, closed_field="lift") -> RestrictorFlow:
    q, rho, mu, area, length, cd, delta = np.broadcast_arrays(q, rho, mu, area, length, cd, delta)
    aq = np.abs(q)
    closed = area <= 0
    if (closed & (aq > 0)).any():
        raise InputError("q", _fmt(float(aq[closed & (aq > 0)].flat[0]), "m^3/s"),
                         f"0 m^3/s through a closed restrictor ({closed_field} 0)")
    a_safe = np.where(closed, 1.0, area)
    l_safe = np.where(closed, 1.0, length)
    dp_turb = rho * aq**2 / (2.0 * cd**2 * a_safe**2)
    dp_lam = mu * aq / (2.0 * delta**2 * l_safe * a_safe)
    re = np.where(closed, 0.0, rho * aq * l_safe / (a_safe * mu))
    laminar = dp_lam > dp_turb
    dp = np.where(closed, 0.0, np.maximum(dp_lam, dp_turb))
    laminar = laminar | (aq == 0)
    dp = _finite(np.sign(q) * dp, "q", q, "m^3/s")
    return RestrictorFlow(np.array(q, dtype=float), dp, _finite(re, "q", q, "m^3/s"), _regime_of(laminar))


# --------------------------------------------------------------------------- sharp orifice


@dataclass(frozen=True, eq=False)
class SharpOrifice:
    r"""Sharp-edged orifice (length much shorter than the bore).

    .. math::

        Q = C_d\,A\,\sqrt{2\,\Delta p/\rho},\qquad A = \pi d^2/4,\qquad
        C_d = \min(\delta\sqrt{Re},\ c_d),\qquad Re = \rho v d/\mu,\ v = Q/A

    Below the transition Reynolds number :math:`Re_t = (c_d/\delta)^2` (9.3 with the
    defaults) the flow is laminar and linear in the drop,
    :math:`Q = 2\delta^2 d A\,\Delta p/\mu = 8\delta^2 A^2\Delta p/(\pi d \mu)`; above it the
    coefficient is constant and the flow follows :math:`\sqrt{\Delta p}`, almost free of
    viscosity. Both branches are closed forms and meet at :math:`Re_t`, so
    ``flow = min(Q_laminar, Q_turbulent)`` and ``pressure_drop = max(dp_laminar, dp_turbulent)``.

    Parameters
    ----------
    diameter : float or array
        Bore d, m (> 0). An array gives a family of orifices that broadcasts with the
        operating points.
    cd : float
        Turbulent discharge coefficient, in (0, 1]; 0.61 for a sharp edge (Merritt 1967,
        from memory).
    delta : float
        Laminar factor: Cd = delta·√Re at low Re; about 0.2 for a sharp circular orifice
        (Merritt 1967, from memory).

    Regimes: ``"laminar"`` where Re < Re_t (Cd on the delta·√Re branch), ``"turbulent"``
    where Re ≥ Re_t (Cd = cd); ``"transitional"`` is never reported.

    Worked example (checked by hand): d = 1 mm, A = 0.785398 mm²; 50 bar of VG 46 oil at
    40 °C (rho 870 kg/m³, mu 0.040 Pa·s): √(2·5e6/870) = 107.211 m/s, Q = 0.61 ×
    7.85398e-7 × 107.211 = 5.1364e-5 m³/s = 3.082 L/min, v = 65.40 m/s,
    Re = 870 × 65.40 × 0.001/0.040 = 1422, far above Re_t = 9.3: turbulent.

    >>> o = SharpOrifice(1.0e-3)
    >>> round(o.area * 1e6, 6), round(o.transition_reynolds, 4)
    (0.785398, 9.3025)
    >>> r = o.flow(50e5, 870.0, 0.040)
    >>> round(float(r.flow), 9), round(float(r.reynolds)), str(r.regime)
    (5.1364e-05, 1422, 'turbulent')
    >>> float(o.pressure_drop(5.136415e-5, 870.0, 0.040).pressure_drop) / 1e5   # bar
    50.0

    Laminar branch, by hand: at 1 bar with mu = 10 Pa·s the linear law gives
    Q = 2 × 0.2² × 0.001 × 1e5 × 7.85398e-7/10 = 6.2832e-7 m³/s at Re = 0.0696:

    >>> r = SharpOrifice(1.0e-3).flow(1e5, 870.0, 10.0)
    >>> float(r.flow), round(float(r.reynolds), 4), str(r.regime)
    (6.2832e-07, 0.0696, 'laminar')
    """

    diameter: float | np.ndarray
    cd: float = 0.61
    delta: float = 0.2

    def __post_init__(self):
        d = _array(self.diameter, "diameter", "m", "a diameter", "positive")
        cd, delta = _cd_delta(self.cd, self.delta)
        object.__setattr__(self, "diameter", _stored(d))
        object.__setattr__(self, "cd", _stored(cd))
        object.__setattr__(self, "delta", _stored(delta))

    @property
    def area(self):
        """Bore area pi·d²/4, m² (a float for a scalar bore)."""
        return _out(math.pi * np.asarray(self.diameter) ** 2 / 4.0)

    @property
    def transition_reynolds(self):
        """Reynolds number (cd/delta)² where the laminar Cd reaches the turbulent cd."""
        return (self.cd / self.delta) ** 2

    def discharge_coefficient(self, re) -> np.ndarray:
        """Cd = min(delta·√Re, cd) at Reynolds number ``re`` (>= 0).

        >>> SharpOrifice(1e-3).discharge_coefficient([0.0, 4.0, 100.0]).tolist()
        [0.0, 0.4, 0.61]
        """
        re = _array(re, "re", "", "a Reynolds number", "nonnegative")
        return _cd_of_re(re, self.cd, self.delta)

    def flow(self, dp, rho, mu) -> RestrictorFlow:
        """Flow at pressure drop ``dp`` (Pa, either sign) for density ``rho`` (kg/m³) and
        dynamic viscosity ``mu`` (Pa·s); arrays broadcast."""
        dp = _array(dp, "dp", "Pa", "pressure drop", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        d = np.asarray(self.diameter)
        return _orifice_flow(dp, rho, mu, math.pi * d**2 / 4.0, d, self.cd, self.delta)

    def pressure_drop(self, q, rho, mu) -> RestrictorFlow:
        """Pressure drop at flow ``q`` (m³/s, either sign); the exact inverse of :meth:`flow`."""
        q = _array(q, "q", "m^3/s", "flow", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        d = np.asarray(self.diameter)
        return _orifice_drop(q, rho, mu, math.pi * d**2 / 4.0, d, self.cd, self.delta, "diameter")


def _sizing_inputs(q, dp, rho, mu):
    q = _array(q, "q", "m^3/s", "a flow", "positive")
    dp = _array(dp, "dp", "Pa", "a pressure drop", "positive")
    rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
    mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
    return np.broadcast_arrays(q, dp, rho, mu)


def orifice_diameter(q, dp, rho, mu, cd=0.61, delta=0.2) -> DiameterSizing:
    r"""Bore of a sharp-edged orifice that passes flow ``q`` at drop ``dp``.

    Closed form, the exact inverse of :meth:`SharpOrifice.flow`: the flow grows with the
    bore on both branches, so the bore is the larger of the turbulent and the laminar one,

    .. math::

        d_t = \sqrt{\frac{4 q}{\pi c_d \sqrt{2\Delta p/\rho}}},\qquad
        d_l = \left(\frac{2 q \mu}{\pi \delta^2 \Delta p}\right)^{1/3},\qquad
        d = \max(d_t, d_l)

    Parameters
    ----------
    q : float or array
        Flow to pass, m³/s (> 0).
    dp : float or array
        Pressure drop available, Pa (> 0).
    rho, mu : float or array
        Density, kg/m³, and dynamic viscosity, Pa·s.
    cd, delta : float
        As for :class:`SharpOrifice`.

    Worked example (checked by hand): 3.082 L/min = 5.1364e-5 m³/s at 50 bar with rho 870:
    A = 5.1364e-5/(0.61 × 107.211) = 7.8540e-7 m², d = √(4A/π) = 1.000 mm (the example of
    :class:`SharpOrifice` backwards).

    >>> s = orifice_diameter(5.1364e-5, 50e5, 870.0, 0.040)
    >>> round(float(s.diameter) * 1e3, 4), str(s.state.regime)
    (1.0, 'turbulent')

    Reference: Merritt 1967 (orifice equation; delta·√Re from memory).
    """
    q, dp, rho, mu = _sizing_inputs(q, dp, rho, mu)
    cd, delta = _cd_delta(cd, delta)
    a_t = q / (cd * np.sqrt(2.0 * dp / rho))
    d_t = np.sqrt(4.0 * a_t / math.pi)
    d_l = np.cbrt(2.0 * q * mu / (math.pi * delta**2 * dp))
    d = np.maximum(d_t, d_l)
    d = _finite(d, "q", q, "m^3/s")
    state = SharpOrifice(d, float(cd) if cd.ndim == 0 else cd,
                         float(delta) if delta.ndim == 0 else delta).flow(dp, rho, mu)
    return DiameterSizing(d, state)


# --------------------------------------------------------------------------- friction


def colebrook(re, relative_roughness=0.0) -> np.ndarray:
    r"""Darcy friction factor from the Colebrook equation, solved by Newton iteration.

    .. math::

        \frac{1}{\sqrt f} = -2\log_{10}\left(\frac{\varepsilon/d}{3.7}
        + \frac{2.51}{Re\sqrt f}\right)

    Parameters
    ----------
    re : float or array
        Pipe Reynolds number (> 0); the equation is meant for turbulent flow, Re ≥ 4000.
    relative_roughness : float or array
        Absolute roughness over bore, ε/d (0 for a smooth bore, up to 0.05).

    Newton steps on x = 1/√f from the Swamee-Jain estimate; g(x) is concave and increasing,
    so after the first step the iterates climb monotonically to the root; five steps reach
    machine precision (checked against ``fluids.friction.Colebrook`` in the tests).

    >>> round(float(colebrook(1e5)), 6)           # smooth pipe
    0.01799
    >>> round(float(colebrook(1e5, 1e-3)), 6)
    0.022175

    Reference: C. F. Colebrook, J. Inst. Civil Eng. 11 (1939) 133-156; P. K. Swamee and
    A. K. Jain, J. Hydraulics Div. ASCE 102 (1976) for the starting value.
    """
    re = _array(re, "re", "", "a Reynolds number", "positive")
    e = _array(relative_roughness, "relative_roughness", "", "a relative roughness", "nonnegative")
    return _colebrook(*np.broadcast_arrays(re, e))


def _colebrook(re: np.ndarray, e: np.ndarray) -> np.ndarray:
    a = e / 3.7
    x = -2.0 * np.log10(a + 5.74 / re**0.9)
    x = np.maximum(x, 0.5)
    k = 2.51 / re
    # Newton converges quadratically from the Swamee-Jain start (within about 1 %):
    # 1e-2 -> 1e-4 -> 1e-8 -> 1e-16, so five steps leave only round-off
    for _ in range(5):
        s = a + k * x
        g = x + 2.0 * np.log10(s)
        dg = 1.0 + (2.0 / _LN10) * k / s
        x = np.maximum(x - g / dg, 0.25 * x)
    return 1.0 / x**2


def _f_re(re: np.ndarray, e: np.ndarray) -> np.ndarray:
    """f·Re of the throttle model (finite at Re = 0)."""
    re, e = np.broadcast_arrays(re, e)
    out = np.full(re.shape, 64.0)
    band = (re >= RE_LAMINAR_LIMIT) & (re < RE_TURBULENT_FROM)
    turb = re >= RE_TURBULENT_FROM
    if band.any():
        f_lo = 64.0 / RE_LAMINAR_LIMIT
        eb = e[band]
        if np.all(eb == eb[0]):  # one roughness (the usual case): one Colebrook evaluation
            f_hi = _colebrook(np.array([RE_TURBULENT_FROM]), eb[:1])[0]
        else:
            f_hi = _colebrook(np.full(eb.size, RE_TURBULENT_FROM), eb)
        w = (re[band] - RE_LAMINAR_LIMIT) / (RE_TURBULENT_FROM - RE_LAMINAR_LIMIT)
        out[band] = (f_lo + w * (f_hi - f_lo)) * re[band]
    if turb.any():
        out[turb] = _colebrook(re[turb], e[turb]) * re[turb]
    return out


def darcy_friction_factor(re, relative_roughness=0.0) -> np.ndarray:
    """Darcy friction factor of the long-throttle model, continuous in Re.

    * Re < 2300: laminar, f = 64/Re (Hagen-Poiseuille);
    * 2300 ≤ Re < 4000: transitional, f blends linearly in Re from 64/2300 to the Colebrook
      value at Re = 4000 (our choice: continuous, and f·Re² keeps rising with Re, so the
      drop rises with the flow and the inverse is unique);
    * Re ≥ 4000: turbulent, Colebrook (:func:`colebrook`).

    ``re`` > 0; ``relative_roughness`` ε/d from 0 to 0.05.

    >>> [round(float(f), 5) for f in darcy_friction_factor([1000.0, 2300.0, 3150.0, 4000.0])]
    [0.064, 0.02783, 0.03387, 0.03991]
    """
    re = _array(re, "re", "", "a Reynolds number", "positive")
    e = _array(relative_roughness, "relative_roughness", "", "a relative roughness", "nonnegative")
    re, e = np.broadcast_arrays(re, e)
    return _f_re(re, e) / re


# --------------------------------------------------------------------------- long throttle


def _throttle_drop(q, d, length, k, rough, rho, mu):
    """dp (signed) and Re of a long throttle; all arrays broadcast together."""
    area = math.pi * d**2 / 4.0
    v = q / area
    re = rho * np.abs(v) * d / mu
    f_re = _f_re(re, rough / d)
    dp = (f_re * mu * length / (2.0 * d**2) + k * rho * np.abs(v) / 2.0) * v
    return dp, re


def _throttle_regime(re):
    return _regime_of(re < RE_LAMINAR_LIMIT, (re >= RE_LAMINAR_LIMIT) & (re < RE_TURBULENT_FROM))


def _check_roughness(rough, d, field="roughness"):
    rough, d = np.broadcast_arrays(rough, d)
    e = rough / d
    if (e > MAX_RELATIVE_ROUGHNESS).any():
        bad = rough[e > MAX_RELATIVE_ROUGHNESS]
        raise ModelValidityError(field, _fmt(float(bad.flat[0]), "m"),
                                 f"a roughness of at most {MAX_RELATIVE_ROUGHNESS:g} x the bore "
                                 "(the range of the Colebrook equation)")


@dataclass(frozen=True, eq=False)
class LongThrottle:
    r"""Long throttle: a bore many diameters long, with entry and exit losses.

    .. math::

        \Delta p = \left(f(Re)\,\frac{L}{d} + K\right)\frac{\rho v^2}{2},\qquad
        v = \frac{4Q}{\pi d^2},\qquad K = K_{entry} + K_{exit}

    In laminar flow f = 64/Re and the friction term is Hagen-Poiseuille,
    :math:`\Delta p = 128\mu L Q/(\pi d^4)`; the drop is then a quadratic in Q and
    :meth:`flow` solves it in closed form. Above Re = 2300 the friction factor is
    :func:`darcy_friction_factor` (linear blend to Colebrook at Re = 4000, Colebrook above)
    and :meth:`flow` finds Q by a vectorised bracketed root find (Illinois in log-log
    coordinates, converged to about 1e-13 relative).

    Parameters
    ----------
    diameter : float or array
        Bore d, m (> 0).
    length : float or array
        Length L, m (> 0). The model assumes developed flow over most of L (L ≫ d).
    entry_loss : float
        Entry loss coefficient, 0.5 for a sharp-edged entry (common practice; the ``fluids``
        library's Rennels value is 0.57).
    exit_loss : float
        Exit loss coefficient, 1.0 for discharge into a large chamber (common practice).
    roughness : float
        Absolute wall roughness ε, m (0 for smooth); ε/d at most 0.05.

    Regimes: ``"laminar"`` Re < 2300, ``"transitional"`` 2300 ≤ Re < 4000 (blended
    friction factor), ``"turbulent"`` Re ≥ 4000 (Colebrook); Re = ρ|v|d/μ on the bore.

    Worked example (checked by hand): d = 1.5 mm, L = 30 mm, 1 L/min of VG 46 oil at 40 °C
    (mu 0.040 Pa·s, rho 870 kg/m³). v = 1.6667e-5/1.76715e-6 = 9.4314 m/s, Re = 307.7:
    laminar. Hagen-Poiseuille 128 × 0.040 × 0.030 × 1.6667e-5/(π × 1.5e-3⁴) = 160 963 Pa;
    kinetic 1.5 × 870 × 9.4314²/2 = 58 040 Pa; total 219 003 Pa = 2.19 bar.

    >>> t = LongThrottle(1.5e-3, 30e-3)
    >>> r = t.pressure_drop(1/60000, 870.0, 0.040)
    >>> round(float(r.pressure_drop)), round(float(r.reynolds), 1), str(r.regime)
    (219003, 307.7, 'laminar')
    >>> round(float(t.flow(219003.0, 870.0, 0.040).flow) * 60000, 5)   # back to L/min
    1.0

    References: Hagen-Poiseuille law; Colebrook 1939; loss coefficients common practice.
    """

    diameter: float | np.ndarray
    length: float | np.ndarray
    entry_loss: float = 0.5
    exit_loss: float = 1.0
    roughness: float = 0.0

    def __post_init__(self):
        d = _array(self.diameter, "diameter", "m", "a diameter", "positive")
        length = _array(self.length, "length", "m", "a length", "positive")
        ke = _array(self.entry_loss, "entry_loss", "", "a loss coefficient", "nonnegative")
        kx = _array(self.exit_loss, "exit_loss", "", "a loss coefficient", "nonnegative")
        rough = _array(self.roughness, "roughness", "m", "a roughness", "nonnegative")
        _check_roughness(rough, d)
        for name, val in (("diameter", d), ("length", length), ("entry_loss", ke),
                          ("exit_loss", kx), ("roughness", rough)):
            object.__setattr__(self, name, _stored(val))

    @property
    def area(self):
        """Bore area pi·d²/4, m² (a float for a scalar bore)."""
        return _out(math.pi * np.asarray(self.diameter) ** 2 / 4.0)

    @property
    def loss_coefficient(self):
        """K = entry_loss + exit_loss."""
        return _out(np.asarray(self.entry_loss) + np.asarray(self.exit_loss))

    def pressure_drop(self, q, rho, mu) -> RestrictorFlow:
        """Pressure drop at flow ``q`` (m³/s, either sign), density ``rho`` (kg/m³) and
        dynamic viscosity ``mu`` (Pa·s); direct evaluation."""
        q = _array(q, "q", "m^3/s", "flow", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        q, rho, mu, d, length, k, rough = np.broadcast_arrays(
            q, rho, mu, self.diameter, self.length, self.loss_coefficient, self.roughness)
        dp, re = _throttle_drop(q, d, length, k, rough, rho, mu)
        dp = _finite(dp, "q", q, "m^3/s")
        return RestrictorFlow(np.array(q, dtype=float), dp, re, _throttle_regime(re))

    def flow(self, dp, rho, mu) -> RestrictorFlow:
        """Flow at pressure drop ``dp`` (Pa, either sign); the inverse of
        :meth:`pressure_drop`: closed form while laminar, bracketed root find above."""
        dp = _array(dp, "dp", "Pa", "pressure drop", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        dp, rho, mu, d, length, k, rough = (np.array(a, dtype=float) for a in np.broadcast_arrays(
            dp, rho, mu, self.diameter, self.length, self.loss_coefficient, self.roughness))
        adp = np.abs(dp)
        area = math.pi * d**2 / 4.0
        a_lin = 128.0 * mu * length / (math.pi * d**4)
        b_sq = k * rho / (2.0 * area**2)
        # laminar law (a lower bound on the drop of every regime): dp = a q + b q^2
        q = 2.0 * adp / (a_lin + np.sqrt(a_lin**2 + 4.0 * b_sq * adp))
        re = rho * q * d / (mu * area)
        need = re >= RE_LAMINAR_LIMIT
        if need.any():
            sel = np.nonzero(need.ravel())[0]
            dd, ll, kk, rr, ro, mm, target = (x.ravel()[sel] for x in (d, length, k, rough, rho, mu, adp))
            q_lo = RE_LAMINAR_LIMIT * mm * math.pi * dd / (4.0 * ro)
            q_hi = np.maximum(q.ravel()[sel], q_lo)
            ln_t = np.log(target)

            def resid(u, i):
                dpi, _ = _throttle_drop(np.exp(u), dd[i], ll[i], kk[i], rr[i], ro[i], mm[i])
                return np.log(dpi) - ln_t[i]

            qs = _solve_log(resid, q_lo, q_hi)
            qf = q.ravel()
            qf[sel] = qs
            q = qf.reshape(d.shape)
        _, re = _throttle_drop(q, d, length, k, rough, rho, mu)
        q = _finite(np.sign(dp) * q, "dp", dp, "Pa")
        return RestrictorFlow(q, dp, re, _throttle_regime(re))


def throttle_diameter(q, dp, rho, mu, length, entry_loss=0.5, exit_loss=1.0,
                      roughness=0.0) -> DiameterSizing:
    r"""Bore of a long throttle of ``length`` that passes flow ``q`` at drop ``dp``.

    The drop falls with the bore at a fixed flow in every regime. The laminar law (which
    bounds every regime's drop from below) gives a closed-form lower bound

    .. math::

        d_l = \left(\frac{128\mu L q/\pi + 8 K\rho q^2/\pi^2}{\Delta p}\right)^{1/4}

    which is the answer when its Reynolds number is below 2300; otherwise the bore lies
    between :math:`d_l` and the bore at which Re = 2300, found by a vectorised bracketed
    root find on d.

    Parameters
    ----------
    q : float or array
        Flow, m³/s (> 0).
    dp : float or array
        Pressure drop, Pa (> 0).
    rho, mu : float or array
        Density, kg/m³; dynamic viscosity, Pa·s.
    length : float or array
        Throttle length, m (> 0).
    entry_loss, exit_loss, roughness
        As for :class:`LongThrottle` (roughness in m).

    >>> s = throttle_diameter(1/60000, 219003.0, 870.0, 0.040, 30e-3)
    >>> round(float(s.diameter) * 1e3, 6), str(s.state.regime)
    (1.5, 'laminar')

    References: Hagen-Poiseuille law; Colebrook 1939.
    """
    q, dp, rho, mu = _sizing_inputs(q, dp, rho, mu)
    length = _array(length, "length", "m", "a length", "positive")
    ke = _array(entry_loss, "entry_loss", "", "a loss coefficient", "nonnegative")
    kx = _array(exit_loss, "exit_loss", "", "a loss coefficient", "nonnegative")
    rough = _array(roughness, "roughness", "m", "a roughness", "nonnegative")
    q, dp, rho, mu, length, k, rough = (np.array(a, dtype=float) for a in np.broadcast_arrays(
        q, dp, rho, mu, length, ke + kx, rough))
    d = ((128.0 * mu * length * q / math.pi + 8.0 * k * rho * q**2 / math.pi**2) / dp) ** 0.25
    d = _finite(d, "q", q, "m^3/s")
    re = 4.0 * rho * q / (math.pi * mu * d)
    need = re >= RE_LAMINAR_LIMIT
    if need.any():
        sel = np.nonzero(need.ravel())[0]
        qq, ll, kk, rr, ro, mm, target = (x.ravel()[sel] for x in (q, length, k, rough, rho, mu, dp))
        d_lo = d.ravel()[sel]
        d_hi = np.maximum(4.0 * ro * qq / (math.pi * mm * RE_LAMINAR_LIMIT), d_lo)
        ln_t = np.log(target)

        def resid(u, i):
            dpi, _ = _throttle_drop(qq[i], np.exp(u), ll[i], kk[i], rr[i], ro[i], mm[i])
            return ln_t[i] - np.log(dpi)

        ds = _solve_log(resid, d_lo, d_hi)
        df = d.ravel()
        df[sel] = ds
        d = df.reshape(q.shape)
    _check_roughness(rough, d)
    state = LongThrottle(d, length, ke if ke.ndim else float(ke), kx if kx.ndim else float(kx),
                         rough).flow(dp, rho, mu)
    return DiameterSizing(d, state)


# --------------------------------------------------------------------------- needle throttle


@dataclass(frozen=True, eq=False)
class NeedleThrottle:
    r"""Needle (cone-seat) throttle: a cone of half-angle α lifted h off a sharp seat of
    diameter d.

    .. math::

        A(h) = \pi h \sin\alpha\,(d - h\sin\alpha\cos\alpha),\qquad
        D_h = 2 h \sin\alpha,\qquad Q = C_d(Re)\,A\sqrt{2\Delta p/\rho}

    Derivation (by hand): the narrowest gap runs from the seat edge normal to the cone
    surface; its width is h·sin α and its mid-point sits on a circle of diameter
    d − h·sin α·cos α, so A is the lateral area of that frustum band. A rises with h until
    it reaches the seat bore area π d²/4 at the *full-open lift*
    :math:`h_{open} = d\,(1-\sqrt{1-\cos\alpha})/(2\sin\alpha\cos\alpha)`; above it the
    area is capped at the seat area (the bore, not the gap, then limits the flow) and the
    hydraulic diameter is held at 2·h_open·sin α. The Reynolds number is
    Re = ρ v D_h/μ with v = Q/A and the discharge coefficient is that of
    :class:`SharpOrifice`: Cd = min(delta·√Re, cd), same regime labels.

    Parameters
    ----------
    seat_diameter : float or array
        Seat bore d, m (> 0).
    half_angle : float or array
        Cone half-angle α, rad, in (0, π/2).
    lift : float or array
        Lift h of the cone off the seat, m (0 = closed, which passes no flow).
    cd, delta : float
        As for :class:`SharpOrifice` (Merritt 1967, from memory).

    Worked example (checked by hand): d = 4 mm, α = 15°, one turn of a 0.5 mm thread,
    h = 0.5 mm: h sin α = 0.129410 mm, h sin α cos α = 0.125 mm, A = π × 0.129410 × 3.875
    = 1.57539 mm²; at 50 bar (rho 870): Q = 0.61 × 1.57539e-6 × 107.211 = 1.0303e-4 m³/s
    = 6.18 L/min; D_h = 0.25882 mm, v = 65.40 m/s, Re = 870 × 65.40 × 2.5882e-4/0.040
    = 368: turbulent.

    >>> n = NeedleThrottle.from_turns(4e-3, math.radians(15), 1.0, 0.5e-3)
    >>> round(n.lift * 1e3, 6), round(float(n.area) * 1e6, 5)
    (0.5, 1.57539)
    >>> r = n.flow(50e5, 870.0, 0.040)
    >>> round(float(r.flow) * 60000, 2), round(float(r.reynolds)), str(r.regime)
    (6.18, 368, 'turbulent')
    """

    seat_diameter: float | np.ndarray
    half_angle: float | np.ndarray
    lift: float | np.ndarray
    cd: float = 0.61
    delta: float = 0.2

    def __post_init__(self):
        d = _array(self.seat_diameter, "seat_diameter", "m", "a diameter", "positive")
        a = _half_angle(self.half_angle)
        h = _array(self.lift, "lift", "m", "a lift", "nonnegative")
        cd, delta = _cd_delta(self.cd, self.delta)
        for name, val in (("seat_diameter", d), ("half_angle", a), ("lift", h),
                          ("cd", cd), ("delta", delta)):
            object.__setattr__(self, name, _stored(val))

    @classmethod
    def from_turns(cls, seat_diameter, half_angle, turns, pitch, cd=0.61, delta=0.2):
        """Needle opened ``turns`` turns (>= 0) on a thread of ``pitch`` (m per turn, > 0):
        lift = turns·pitch.

        >>> round(NeedleThrottle.from_turns(4e-3, 0.26, 1.5, 0.5e-3).lift * 1e3, 6)
        0.75
        """
        turns = _array(turns, "turns", "turn", "an opening in turns", "nonnegative")
        pitch = _array(pitch, "pitch", "m", "a thread pitch", "positive")
        return cls(seat_diameter, half_angle, _stored(turns * pitch), cd, delta)

    @classmethod
    def from_angle(cls, seat_diameter, half_angle, angle, pitch, cd=0.61, delta=0.2):
        """Needle opened by ``angle`` (rad; one turn = 2π rad, >= 0) on a thread of ``pitch``
        (m per turn, > 0): lift = angle/(2π)·pitch (the SI form of :meth:`from_turns`).

        >>> round(NeedleThrottle.from_angle(4e-3, 0.26, 3 * math.pi, 0.5e-3).lift * 1e3, 6)
        0.75
        """
        angle = _array(angle, "turns", "rad", "an opening angle", "nonnegative")
        pitch = _array(pitch, "pitch", "m", "a thread pitch", "positive")
        return cls(seat_diameter, half_angle, _stored(angle / (2.0 * math.pi) * pitch), cd, delta)

    @property
    def seat_area(self):
        """Seat bore area pi·d²/4, m² (the cap on the flow area)."""
        return _out(math.pi * np.asarray(self.seat_diameter) ** 2 / 4.0)

    @property
    def full_open_lift(self):
        """Lift at which the gap area reaches the seat area, m."""
        return _out(_open_lift(np.asarray(self.seat_diameter), np.asarray(self.half_angle)))

    @property
    def area(self):
        """Flow area A(h), capped at the seat area, m²."""
        return _out(_needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                 np.asarray(self.lift))[0])

    @property
    def hydraulic_diameter(self):
        """Hydraulic diameter of the gap 2·min(h, h_open)·sin α, m."""
        return _out(_needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                 np.asarray(self.lift))[1])

    @property
    def transition_reynolds(self):
        """Reynolds number (cd/delta)² where the laminar Cd reaches the turbulent cd."""
        return (self.cd / self.delta) ** 2

    def discharge_coefficient(self, re) -> np.ndarray:
        """Cd = min(delta·√Re, cd) at Reynolds number ``re`` (>= 0)."""
        re = _array(re, "re", "", "a Reynolds number", "nonnegative")
        return _cd_of_re(re, self.cd, self.delta)

    def flow(self, dp, rho, mu) -> RestrictorFlow:
        """Flow at pressure drop ``dp`` (Pa, either sign), density ``rho`` (kg/m³) and
        dynamic viscosity ``mu`` (Pa·s); closed form as :meth:`SharpOrifice.flow`."""
        dp = _array(dp, "dp", "Pa", "pressure drop", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        area, dh = _needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                np.asarray(self.lift))
        return _orifice_flow(dp, rho, mu, area, dh, self.cd, self.delta)

    def pressure_drop(self, q, rho, mu) -> RestrictorFlow:
        """Pressure drop at flow ``q`` (m³/s, either sign); the exact inverse of
        :meth:`flow`. A closed needle (lift 0) accepts only q = 0."""
        q = _array(q, "q", "m^3/s", "flow", "finite")
        rho = _array(rho, "rho", "kg/m^3", "a density", "positive")
        mu = _array(mu, "mu", "Pa*s", "a dynamic viscosity", "positive")
        area, dh = _needle_area(np.asarray(self.seat_diameter), np.asarray(self.half_angle),
                                np.asarray(self.lift))
        return _orifice_drop(q, rho, mu, area, dh, self.cd, self.delta, "lift")


def _half_angle(value) -> np.ndarray:
    a = _array(value, "half_angle", "rad", "an angle", "positive")
    if (a >= math.pi / 2).any():
        raise InputError("half_angle", _fmt(float(a[a >= math.pi / 2].flat[0]), "rad"),
                         "an angle greater than 0 and less than pi/2 rad (90 deg)")
    return a


def _open_lift(d, a):
    s, c = np.sin(a), np.cos(a)
    # d (1 - sqrt(1 - c)) / (2 s c), written without cancellation
    return d / (2.0 * s * (1.0 + np.sqrt(1.0 - c)))


def _needle_area(d, a, h):
    s, c = np.sin(a), np.cos(a)
    h_open = _open_lift(d, a)
    he = np.minimum(h, h_open)
    area = np.where(h >= h_open, math.pi * d**2 / 4.0, math.pi * he * s * (d - he * s * c))
    return area, 2.0 * he * s


def needle_lift(q, dp, rho, mu, seat_diameter, half_angle, cd=0.61, delta=0.2) -> LiftSizing:
    r"""Lift of a needle throttle that passes flow ``q`` at drop ``dp``.

    The flow grows with the lift on both Cd branches, so the lift is the larger of

    * the turbulent lift, from the area :math:`A = q/(c_d\sqrt{2\Delta p/\rho})` and the
      quadratic :math:`\sin^2\!\alpha\cos\alpha\,h^2 - d\sin\alpha\,h + A/\pi = 0`, on its
      rising branch (the smaller root):
      :math:`h = 2A/(\pi\sin\alpha\,(d + \sqrt{d^2 - 4A\cos\alpha/\pi}))`;
    * the laminar lift, from :math:`Q = 4\pi\delta^2\sin^2\!\alpha\,\Delta p\,h^2
      (d - h\sin\alpha\cos\alpha)/\mu`, a cubic solved by a vectorised bracketed root find
      on (0, h_open].

    Parameters
    ----------
    q : float or array
        Flow, m³/s (> 0).
    dp : float or array
        Pressure drop, Pa (> 0).
    rho, mu : float or array
        Density, kg/m³; dynamic viscosity, Pa·s.
    seat_diameter : float or array
        Seat bore, m (> 0).
    half_angle : float or array
        Cone half-angle, rad, in (0, π/2).
    cd, delta : float
        As for :class:`SharpOrifice`.

    Raises :class:`~workbook.errors.InputError` (field ``q``) where the flow needs more
    than the fully open seat passes at that drop.

    >>> s = needle_lift(1.0303e-4, 50e5, 870.0, 0.040, 4e-3, math.radians(15))
    >>> round(float(s.lift) * 1e3, 3), round(float(s.area) * 1e6, 4)
    (0.5, 1.5754)
    """
    q, dp, rho, mu = _sizing_inputs(q, dp, rho, mu)
    d = _array(seat_diameter, "seat_diameter", "m", "a diameter", "positive")
    a = _half_angle(half_angle)
    cd, delta = _cd_delta(cd, delta)
    q, dp, rho, mu, d, a, cd_b, delta_b = (np.array(x, dtype=float) for x in np.broadcast_arrays(
        q, dp, rho, mu, d, a, cd, delta))
    s, c = np.sin(a), np.cos(a)
    k = s * c
    h_open = _open_lift(d, a)
    seat = math.pi * d**2 / 4.0
    full = _orifice_flow(dp, rho, mu, seat, 2.0 * h_open * s, cd_b, delta_b)
    too_much = q > full.flow * (1.0 + 1e-12)
    if too_much.any():
        i = np.argmax(too_much.ravel())
        raise InputError("q", _fmt(float(q.ravel()[i]), "m^3/s"),
                         f"at most {float(full.flow.ravel()[i]):.6g} m^3/s, what the fully open "
                         "seat passes at this drop (a larger seat or a larger drop)")
    a_t = np.minimum(q / (cd_b * np.sqrt(2.0 * dp / rho)), seat)
    h_t = 2.0 * a_t / (math.pi * s * (d + np.sqrt(np.maximum(d**2 - 4.0 * a_t * c / math.pi, 0.0))))
    # laminar: h^2 (d - k h) = R on (0, h_open]
    r_l = q * mu / (4.0 * math.pi * delta_b**2 * s**2 * dp)
    lo = np.sqrt(r_l / d)
    hi = np.minimum(np.sqrt(r_l / (d - k * h_open)), h_open)
    lo = np.minimum(lo, hi)
    dd, kk, ln_r = d.ravel(), k.ravel(), np.log(r_l.ravel())

    def resid(u, i):
        h = np.exp(u)
        return 2.0 * u + np.log(dd[i] - kk[i] * h) - ln_r[i]

    h_l = _solve_log(resid, lo.ravel(), hi.ravel()).reshape(q.shape)
    h = np.minimum(np.maximum(h_t, h_l), h_open)
    h = _finite(h, "q", q, "m^3/s")
    area, dh = _needle_area(d, a, h)
    state = _orifice_flow(dp, rho, mu, area, dh, cd_b, delta_b)
    return LiftSizing(h, area, state)


# --------------------------------------------------------------------------- drills


def _drill_series_mm() -> tuple[float, ...]:
    # integer hundredths of a millimetre, so the sizes are exact decimal values
    fine = range(30, 300, 5)          # 0.30 .. 2.95 mm in 0.05 mm steps
    mid = range(300, 1000, 10)        # 3.0 .. 9.9 mm in 0.1 mm steps
    coarse = range(1000, 2050, 50)    # 10.0 .. 20.0 mm in 0.5 mm steps
    return tuple(round(n / 100.0, 2) for r in (fine, mid, coarse) for n in r)


#: Standard metric twist drill diameters, mm, ascending: 0.30 to 2.95 mm in 0.05 mm steps,
#: 3.0 to 9.9 mm in 0.1 mm steps, 10.0 to 20.0 mm in 0.5 mm steps. A preferred subset of the
#: metric drill diameters that ISO 235 covers, chosen from memory (the standard's own table
#: was not at hand to check); the steps are those of commonly stocked drill sets (common
#: practice). Pass your own ``series`` where the workshop's drills differ.
DRILL_SERIES_MM: tuple[float, ...] = _drill_series_mm()

_ROUND_TOL = 1e-9  # relative: a diameter this close to a drill counts as that drill


def _series(series) -> np.ndarray:
    if series is None:
        return np.asarray(DRILL_SERIES_MM) / 1000.0
    s = _array(series, "series", "m", "drill diameters", "positive")
    if s.ndim != 1 or s.size == 0:
        raise InputError("series", repr(series), "a non-empty list of drill diameters in m")
    if (s > 1.0).any():
        raise InputError("series", _fmt(float(s[s > 1.0][0]), "m"),
                         "drill diameters in m (0.0005 for 0.5 mm), each at most 1 m")
    return np.unique(s)


def round_to_drill(diameter, series=None, mode="nearest") -> np.ndarray:
    """Round a bore to a standard drill.

    Parameters
    ----------
    diameter : float or array
        Bore, m (> 0).
    series : sequence of float, optional
        Drill diameters in **m**; default :data:`DRILL_SERIES_MM` / 1000.
    mode : {"nearest", "down", "up"}
        ``"nearest"`` (a tie goes to the larger drill), ``"down"`` (largest drill not above
        the bore: less flow), ``"up"`` (smallest drill not below: more flow). A bore within
        1e-9 relative of a drill is that drill.

    Raises InputError (field ``diameter``) where no drill of the series fits: below the
    smallest drill for ``"down"``, above the largest for ``"up"``, and for ``"nearest"``
    more than half an end step outside the series.

    >>> round_to_drill([1.23e-3, 1.27e-3, 1.225e-3]).tolist()
    [0.0012, 0.0013, 0.00125]
    >>> round_to_drill(1.23e-3, mode="up").tolist(), round_to_drill(1.23e-3, mode="down").tolist()
    (0.00125, 0.0012)
    """
    d = _array(diameter, "diameter", "m", "a diameter", "positive")
    s = _series(series)
    if mode not in ("nearest", "down", "up"):
        raise InputError("mode", repr(mode), 'one of "nearest", "down", "up"')
    lo_step = s[1] - s[0] if s.size > 1 else s[0]
    hi_step = s[-1] - s[-2] if s.size > 1 else s[-1]
    if mode == "down":
        bad = d < s[0] * (1 - _ROUND_TOL)
    elif mode == "up":
        bad = d > s[-1] * (1 + _ROUND_TOL)
    else:
        bad = (d < s[0] - lo_step / 2) | (d > s[-1] + hi_step / 2)
    if bad.any():
        raise InputError("diameter", _fmt(float(d[bad].flat[0]) * 1e3, "mm"),
                         f"a bore the drill series covers ({s[0] * 1e3:g} mm to {s[-1] * 1e3:g} mm "
                         f'rounding {mode}), or a series with the size needed')
    i_up = np.clip(np.searchsorted(s, d * (1 - _ROUND_TOL), side="left"), 0, s.size - 1)
    i_dn = np.clip(np.searchsorted(s, d * (1 + _ROUND_TOL), side="right") - 1, 0, s.size - 1)
    up, dn = s[i_up], s[i_dn]
    if mode == "up":
        return up
    if mode == "down":
        return dn
    return np.where(up - d <= d - dn, up, dn)


def drilled_orifice(q, dp, rho, mu, cd=0.61, delta=0.2, series=None,
                    mode="nearest") -> DrilledOrifice:
    """Size a sharp-edged orifice, round it to a drill, and report what the drill passes.

    Parameters
    ----------
    q : float or array
        Flow wanted, m³/s (> 0).
    dp : float or array
        Pressure drop, Pa (> 0).
    rho, mu : float or array
        Density, kg/m³; dynamic viscosity, Pa·s.
    cd, delta : float
        As for :class:`SharpOrifice`.
    series, mode
        As for :func:`round_to_drill`.

    Worked example: 3 L/min at 50 bar (rho 870, mu 0.040) needs d = 0.98664 mm (by hand
    from √(4q/(π·0.61·107.211))); the nearest drill is 1.00 mm, which passes
    3 × (1/0.98664)² = 3.082 L/min (2.7 % more).

    >>> r = drilled_orifice(3/60000, 50e5, 870.0, 0.040)
    >>> round(float(r.exact_diameter) * 1e3, 5), float(r.drill_diameter) * 1e3
    (0.98664, 1.0)
    >>> round(float(r.flow) * 60000, 3), round(float(r.flow_ratio), 4)
    (3.082, 1.0273)
    """
    exact = orifice_diameter(q, dp, rho, mu, cd, delta)
    drill = round_to_drill(exact.diameter, series, mode)
    qa, dpa, rhoa, mua = _sizing_inputs(q, dp, rho, mu)
    state = SharpOrifice(drill, cd, delta).flow(dpa, rhoa, mua)
    return DrilledOrifice(exact.diameter, drill, state, state.flow / qa)


__all__ = [
    "LAMINAR", "TRANSITIONAL", "TURBULENT", "REGIMES", "RE_LAMINAR_LIMIT", "RE_TURBULENT_FROM",
    "MAX_RELATIVE_ROUGHNESS", "DRILL_SERIES_MM",
    "RestrictorFlow", "DiameterSizing", "LiftSizing", "DrilledOrifice",
    "SharpOrifice", "LongThrottle", "NeedleThrottle",
    "orifice_diameter", "throttle_diameter", "needle_lift",
    "colebrook", "darcy_friction_factor", "round_to_drill", "drilled_orifice",
]
