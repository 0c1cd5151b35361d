"""Vectorised bracketing root finders shared by the physics models.

Both solve many independent scalar problems at once (numpy arrays, no per-point call) for an
increasing function bracketed by ``lo`` and ``hi``, with regula falsi in its Illinois form
(the stale end's residual halved when the same end moves twice running) and a bisection
fallback, so every point stays bracketed:

* :func:`solve_log` works in ``ln x`` (for sizes and flows that span decades), with the
  residual called only for the points still open;
* :func:`solve_increasing` works in ``x`` itself and forces a bisection every third step.

Reference: M. Dowell and P. Jarratt, "A modified regula falsi method for computing the root
of an equation", BIT 11 (1971) 168-174 (the Illinois algorithm).
"""

from __future__ import annotations

from typing import Callable

import numpy as np


def solve_log(resid: Callable[[np.ndarray, np.ndarray], np.ndarray], lo: np.ndarray,
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


def solve_increasing(fun: Callable[[np.ndarray], np.ndarray], lo, hi, xtol, ftol, maxiter: int = 200):
    """Vectorised root of an increasing function with ``fun(lo) <= 0 <= fun(hi)``.

    Regula falsi with the Illinois modification and a forced bisection every third
    iteration (so the bracket at least halves every three steps); stops when every point
    has ``|f| <= ftol`` or a bracket narrower than ``xtol``. All points are evaluated at
    once; no per-point call.

    >>> r = solve_increasing(lambda x: x**3 - np.array([8.0, 27.0]), np.zeros(2), np.full(2, 10.0), 1e-14, 1e-12)
    >>> np.round(r, 12).tolist()
    [2.0, 3.0]
    """
    a = np.array(lo, dtype=float, copy=True)
    b = np.array(hi, dtype=float, copy=True)
    fa = fun(a)
    fb = fun(b)
    x = np.where(fa >= 0.0, a, b)
    done = (fa >= 0.0) | (fb <= 0.0) | (b - a <= xtol)
    x = np.where(fa >= 0.0, a, np.where(fb <= 0.0, b, 0.5 * (a + b)))
    last = np.zeros(a.shape, dtype=np.int8)
    for it in range(maxiter):
        if done.all():
            break
        if it % 3 == 2:
            xn = 0.5 * (a + b)
        else:
            denom = fb - fa
            with np.errstate(divide="ignore", invalid="ignore"):
                xn = np.where(denom > 0.0, a - fa * (b - a) / np.where(denom > 0.0, denom, 1.0), 0.5 * (a + b))
            bad = ~np.isfinite(xn) | (xn <= a) | (xn >= b)
            xn = np.where(bad, 0.5 * (a + b), xn)
        fx = fun(xn)
        x = np.where(done, x, xn)
        right = fx < 0.0                     # root lies right of xn
        upd_a = ~done & right
        upd_b = ~done & ~right
        # Illinois: halve the stale end's value when the same end moves twice running
        fb = np.where(upd_a & (last == 1), 0.5 * fb, fb)
        fa = np.where(upd_b & (last == -1), 0.5 * fa, fa)
        a = np.where(upd_a, xn, a)
        fa = np.where(upd_a, fx, fa)
        b = np.where(upd_b, xn, b)
        fb = np.where(upd_b, fx, fb)
        last = np.where(upd_a, 1, np.where(upd_b, -1, last)).astype(np.int8)
        done = done | (np.abs(fx) <= ftol) | (b - a <= xtol)
    return x
