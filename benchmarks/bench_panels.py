"""Benchmark: the update path of each study panel (not a pass/fail test).

One input change -> the study recomputed -> results, findings and new plot data pushed into
the bokeh data sources, with 400-point curves, on the demo design. Prints the median and
the 90th percentile over repeated changes; the target is well under 50 ms so that the
interface feels instant.

Run: ``.venv/bin/python benchmarks/bench_panels.py`` (or ``make bench``).
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

DESIGN = ROOT / "notebooks" / "designs" / "bin-tipper.toml"

#: study kind, axis, field to change, values to alternate between
CASES = (
    ("restrictor-sizing", "lift", "study.target_flow", ("10 L/min", "12 L/min", "14 L/min")),
    ("speed-vs-load", "lift", "operation.target_speed", ("70 mm/s", "80 mm/s", "90 mm/s")),
    ("rod-pressure", "tip", "cylinder.rod", ("32 mm", "36 mm", "40 mm")),
    ("counterbalance", "lift", "holding.setting", ("28 bar", "30 bar", "32 bar")),
)


def measure(kind: str, axis: str, field: str, entries, repeats: int = 30):
    """Median and 90th percentile (ms) of one entry -> recomputed panel."""
    import copy

    from workbook import studies
    from workbook.design import load_design
    from workbook.ui.panel import StudyPanel

    design = load_design(DESIGN)
    values = copy.deepcopy(design.axes[axis].values)
    values["study"]["points"] = 400.0
    panel = StudyPanel(studies.module(kind), values, identity=design.identity_for(axis))
    times = []
    for i in range(repeats):
        text = entries[i % len(entries)]
        t0 = time.perf_counter()
        ok = panel.set(field, text)
        times.append((time.perf_counter() - t0) * 1e3)
        if not ok:
            raise RuntimeError(f"{kind}: {field} = {text} was refused")
    n_points = max(len(next(iter(f["series"].values()))) for f in panel.outcome.figures.values())
    times.sort()
    return statistics.median(times), times[int(0.9 * (len(times) - 1))], n_points, panel.compute_count


def main() -> list[tuple]:
    rows = []
    print("Panel update path: one entry -> recomputed study -> new plot data (demo design)")
    print(f"{'study':<20} {'field':<24} {'points':>6} {'median ms':>10} {'p90 ms':>8}")
    for kind, axis, field, entries in CASES:
        med, p90, n, _ = measure(kind, axis, field, entries)
        rows.append((kind, field, n, med, p90))
        print(f"{kind:<20} {field:<24} {n:>6} {med:>10.1f} {p90:>8.1f}")
    return rows


if __name__ == "__main__":
    main()
