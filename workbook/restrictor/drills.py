"""Standard drill sizes and an orifice rounded to a drill (with the flow it really passes)."""

from __future__ import annotations

import numpy as np

from ..errors import InputError
from .orifice import SharpOrifice, _sizing_inputs, orifice_diameter
from .results import DrilledOrifice
from .validate import _array, _fmt


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
