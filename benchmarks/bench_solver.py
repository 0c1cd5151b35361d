"""Benchmark of the vectorised axis solver (prints figures; never pass/fail).

For each arrangement: the time of one 10,000-point load sweep with ``circuit.solve``, and
two ratios measured in the same run:

* against a per-point loop of ``scipy.optimize.brentq`` solving the same equations
  (the same residual, scalar point by point): the solver should be >= 100x faster;
* against one bare numpy evaluation of the orifice equation on the same 10,000 points
  (the floor: what a single vectorised formula costs).

Run ``python benchmarks/bench_solver.py``; ``main()`` returns the figures for
``benchmarks/run.py``.
"""

from __future__ import annotations

import math
import os
import sys
import time

import numpy as np

try:  # run from a checkout without installing the package
    import workbook  # noqa: F401
except ImportError:  # pragma: no cover
    sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
from scipy.optimize import brentq

from workbook.circuit import Axis, solve
from workbook.cylinder import Cylinder
from workbook.fluid import Oil
from workbook.supply import Pump, ReliefValve, Supply
from workbook.valve import CheckValve, CompensatedFlowValve

N = 10_000
LPM = 1 / 60000
T = 313.15


def _axis(arrangement: str) -> Axis:
    oil = Oil.from_grade("VG46")
    qp = 21.6 * LPM
    valve = CompensatedFlowValve.from_setting(12 * LPM, float(oil.density(T)), check=CheckValve(0.5e5))
    return Axis(Cylinder(0.080, 0.045, 0.6, 210e5), oil, Supply(Pump(qp), ReliefValve(160e5, 172e5, qp)), valve,
                arrangement=arrangement, controlled="extend", friction=400.0, tank_pressure=2e5)


def _scalar_residual(ax: Axis, load: float, rho: float):
    """The same steady-state equations as the solver, for one point, as a scalar function of speed."""
    cyl, fv, rel, qp, pt = ax.cylinder, ax.flow_valve, ax.supply.relief, ax.supply.flow, ax.tank_pressure
    a1, a3, fr = cyl.a1, cyl.a3, ax.friction
    pcav = ax.cavitation_gauge
    if ax.arrangement == "meter-in":
        def f(v):
            p1 = max((load + fr + pt * a3) / a1, pcav)
            return a1 * v - float(fv.forward_flow(rel.pressure(qp - a1 * v) - p1, rho))
    elif ax.arrangement == "meter-out":
        def f(v):
            p1 = float(rel.pressure(qp - a1 * v))
            p3 = (p1 * a1 - load - fr) / a3
            return a3 * v - float(fv.forward_flow(p3 - pt, rho))
    else:
        def f(v):
            p1 = max((load + fr + pt * a3) / a1, pcav)
            return a1 * v + float(fv.forward_flow(p1 - pt, rho)) + float(rel.flow(p1)) - qp
    return f


def _time(fn, repeat: int = 3) -> float:
    best = math.inf
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def bench(arrangement: str, n: int = N, loop_points: int = 500) -> dict:
    ax = _axis(arrangement)
    loads = np.linspace(0.0, 70e3, n)
    rho = float(ax.oil.density(T))
    t_vec = _time(lambda: solve(ax, loads, T))
    sol = solve(ax, loads, T)
    # per-point brentq on a subset, scaled to n points (the loop is linear in points)
    sub = loads[:: max(1, n // loop_points)]
    v_max = ax.supply.flow / ax.cylinder.a1

    def loop():
        out = []
        for f_load in sub:
            f = _scalar_residual(ax, float(f_load), rho)
            if f(0.0) >= 0.0:
                out.append(0.0)
            elif f(v_max) <= 0.0:
                out.append(v_max)
            else:
                out.append(brentq(f, 0.0, v_max, xtol=1e-15, rtol=1e-13))
        return np.array(out)

    t_loop = _time(loop, repeat=1) * n / len(sub)
    v_loop = loop()
    idx = np.arange(0, n, max(1, n // loop_points))[: len(v_loop)]
    agree = float(np.max(np.abs(v_loop - sol.speed[idx])))
    dp = np.linspace(1e5, 150e5, n)
    area = 2e-6
    t_np = _time(lambda: 0.61 * area * np.sqrt(2.0 * dp / rho), repeat=20)
    return {"arrangement": arrangement, "points": n, "solve_s": t_vec, "brentq_loop_s": t_loop,
            "speedup_vs_brentq": t_loop / t_vec, "ratio_vs_bare_numpy": t_vec / t_np,
            "max_speed_difference_m_s": agree}


def main() -> list[dict]:
    rows = [bench(a) for a in ("meter-in", "meter-out", "bleed-off")]
    print(f"circuit.solve, {N} load points, compensated valve (best of 3)")
    print(f"{'arrangement':<11} {'solve ms':>9} {'brentq loop ms':>15} {'x faster':>9} {'x bare numpy':>13} "
          f"{'max |dv| m/s':>13}")
    for r in rows:
        print(f"{r['arrangement']:<11} {r['solve_s'] * 1e3:9.2f} {r['brentq_loop_s'] * 1e3:15.1f} "
              f"{r['speedup_vs_brentq']:9.0f} {r['ratio_vs_bare_numpy']:13.0f} {r['max_speed_difference_m_s']:13.2e}")
    return rows


if __name__ == "__main__":
    main()
