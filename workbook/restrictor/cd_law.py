"""The Cd(Re) law of a short opening, written once for the orifice and the needle throttle.

Cd = min(delta·√Re, cd): laminar below the transition Reynolds number (cd/delta)², where the
flow is proportional to the drop, and the constant turbulent cd above it, where the flow
goes with the square root of the drop. Both directions have closed forms.

Reference: H. E. Merritt, *Hydraulic Control Systems*, Wiley 1967 (orifice equation and the
laminar discharge coefficient Cd = delta·√Re, delta about 0.2 for a sharp circular orifice,
from memory).
"""

from __future__ import annotations

import numpy as np

from ..errors import InputError
from .results import RestrictorFlow
from .validate import _array, _finite, _fmt, _regime_of


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


class CdLaw:
    """The two questions every Cd(Re) opening answers; mixed into a dataclass with ``cd`` and ``delta``."""

    @property
    def transition_reynolds(self):
        """Reynolds number (cd/delta)² where the laminar Cd reaches the turbulent cd."""
        return (self.cd / self.delta) ** 2

    def discharge_coefficient(self, re) -> np.ndarray:
        """Cd = min(delta·√Re, cd) at Reynolds number ``re`` (>= 0).

        >>> from workbook.restrictor import SharpOrifice
        >>> SharpOrifice(1e-3).discharge_coefficient([0.0, 4.0, 100.0]).tolist()
        [0.0, 0.4, 0.61]
        """
        re = _array(re, "re", "", "a Reynolds number", "nonnegative")
        return _cd_of_re(re, self.cd, self.delta)
