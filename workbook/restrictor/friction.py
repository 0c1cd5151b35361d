"""Pipe friction for the long throttle: Hagen-Poiseuille, Colebrook and the blend between.

References: Hagen-Poiseuille law for laminar pipe flow; C. F. Colebrook, J. Inst. Civil Eng.
11 (1939) for the turbulent friction factor.
"""

from __future__ import annotations

import math

import numpy as np

from .validate import _array

#: long throttle: Hagen-Poiseuille below this pipe Reynolds number (common practice)
RE_LAMINAR_LIMIT = 2300.0
#: long throttle: Colebrook from this pipe Reynolds number on (common practice)
RE_TURBULENT_FROM = 4000.0
#: largest relative roughness accepted; the Colebrook equation and the Moody chart it
#: underlies stop at about 0.05 (from memory)
MAX_RELATIVE_ROUGHNESS = 0.05

_LN10 = math.log(10.0)

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
