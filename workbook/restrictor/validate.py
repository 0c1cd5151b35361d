"""Argument checks shared by the restrictor models: arrays in SI units, finite results.

Each check raises :class:`~workbook.errors.InputError` naming the argument and what is
allowed, so a model never returns a silent NaN for bad input.
"""

from __future__ import annotations

import numpy as np

from ..errors import InputError
from .results import LAMINAR, TRANSITIONAL, TURBULENT

_REGIME_DTYPE = "<U12"

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
