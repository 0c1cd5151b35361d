"""The sharp-edged orifice and its sizing (the orifice equation with the Cd(Re) law)."""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from .cd_law import CdLaw, _orifice_drop, _orifice_flow
from .results import DiameterSizing, RestrictorFlow
from .validate import _array, _cd_delta, _finite, _out, _stored


@dataclass(frozen=True, eq=False)
class SharpOrifice(CdLaw):
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
