"""Benchmark: one full stroke out and back of each demo axis simulated in time (not a test).

The axis model of :mod:`workbook.transient` on the demo design (notebooks/designs/
bin-tipper.toml), its default command profile (extend to the end, 0.5 s dwell, retract to
the end, 0.5 s dwell), at the motion study's tolerances. Prints per axis the simulated time,
the integrator's steps and right-hand-side calls, the wall time, the ratio against the
figure of the first transient model (scalar right-hand side, finite-difference sparse
Jacobian: lift 106.7 s, tip 7.5 s on this machine), and the ratio against ``solve_ivp``'s
default explicit method (RK45) on the same model at the same tolerance, measured over the
first ``EXPLICIT_SPAN`` s of the stroke and scaled to the whole (the explicit method is
held to the stiff valve-body nodes' time constant, so a full run takes minutes).

Run: ``.venv/bin/python benchmarks/bench_motion.py`` (or ``make bench``).
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

DESIGN = ROOT / "notebooks" / "designs" / "bin-tipper.toml"
#: wall time of one stroke out and back with the first transient model (s, recorded before the rewrite)
OLD_FIGURE = {"lift": 106.7, "tip": 7.5}
#: simulated span over which the explicit method is timed (s)
EXPLICIT_SPAN = 1.0


def measure(axis_key: str):
    from workbook.design import load_design
    from workbook.studies.motion import ATOL_P, RTOL
    from workbook.transient import Move, model_from_values, simulate, start_position

    values = load_design(DESIGN).axes[axis_key].values
    model, profile = model_from_values(values)
    x0 = start_position(profile, model.cyl.stroke)
    t0 = time.perf_counter()
    tr = simulate(model, profile, x0=x0, rtol=RTOL, atol_p=ATOL_P)
    wall = time.perf_counter() - t0
    first = profile[0]
    short = [Move(first.kind, duration=EXPLICIT_SPAN, ramp=first.ramp)]
    t0 = time.perf_counter()
    stiff_short = simulate(model, short, x0=x0, rtol=RTOL, atol_p=ATOL_P)
    wall_stiff_short = time.perf_counter() - t0
    t0 = time.perf_counter()
    rk = simulate(model, short, x0=x0, rtol=RTOL, atol_p=ATOL_P, method="RK45")
    wall_rk = time.perf_counter() - t0
    return dict(axis=axis_key, simulated=float(tr.t[-1]), steps=tr.steps, nfev=tr.nfev, wall=wall,
                old=OLD_FIGURE.get(axis_key), rk_ratio=wall_rk / max(wall_stiff_short, 1e-9),
                rk_steps=rk.steps, stiff_steps=stiff_short.steps)


def main() -> list[dict]:
    rows = []
    print("Axis in motion: one stroke out and back of the demo axes (default profile, motion study tolerances)")
    print(f"{'axis':<6} {'simulated s':>11} {'steps':>7} {'f calls':>8} {'wall s':>8} {'old s':>7} {'speed-up':>8} "
          f"{'RK45/BDF':>9}")
    for key in ("lift", "tip"):
        r = measure(key)
        rows.append(r)
        speedup = f"{r['old'] / r['wall']:.1f}x" if r["old"] else "-"
        print(f"{key:<6} {r['simulated']:>11.2f} {r['steps']:>7d} {r['nfev']:>8d} {r['wall']:>8.2f} "
              f"{r['old'] or 0:>7.1f} {speedup:>8} {r['rk_ratio']:>8.1f}x")
        print(f"       first {EXPLICIT_SPAN:g} s: BDF {r['stiff_steps']} steps, RK45 {r['rk_steps']} steps")
    return rows


if __name__ == "__main__":
    main()
