"""The long (capillary) throttle and its sizing: entry and exit losses plus pipe friction."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import ModelValidityError
from ..numerics import solve_log as _solve_log
from .friction import (
    MAX_RELATIVE_ROUGHNESS,
    RE_LAMINAR_LIMIT,
    RE_TURBULENT_FROM,
    _f_re,
)
from .orifice import _sizing_inputs
from .results import DiameterSizing, RestrictorFlow
from .validate import _array, _finite, _fmt, _out, _regime_of, _stored


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
