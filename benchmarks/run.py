"""Run every benchmark and print its figures (never fails on timing).

``make bench`` calls this; each benchmark module has a ``main()`` that prints and returns its rows.
"""

from __future__ import annotations

import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
sys.path.insert(0, str(HERE.parent))

import bench_motion  # noqa: E402
import bench_panels  # noqa: E402
import bench_solver  # noqa: E402


def main() -> int:
    bench_solver.main()
    print()
    bench_panels.main()
    print()
    bench_motion.main()
    return 0


if __name__ == "__main__":
    sys.exit(main())
