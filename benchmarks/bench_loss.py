"""Benchmark of the loss study: the demo study with and without it.

Run: ``python -m benchmarks loss`` or ``python benchmarks/bench_loss.py``.

Both runs in this process, on the invented demo study, full suite (not quick):

1. Reference: :func:`isolation.study.runner.run_study` with ``loss=False``.
2. With the loss study (5 intensity levels x the suite, fixed base and every
   alternative, Monte Carlo): ``loss=True``.

Target (issue 12): with the loss study <= 2 x the reference. Printed: both
times, the ratio and the run's step timings.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

STUDY = ROOT / "examples" / "demo_study.toml"
TARGET_RATIO = 2.0


def main() -> None:
    from isolation.study import load_study
    from isolation.study.runner import run_study

    study = load_study(STUDY)
    run_study(study, quick=True, loss=True)  # warm-up: imports, caches
    started = time.perf_counter()
    reference = run_study(study, loss=False)
    without = time.perf_counter() - started
    started = time.perf_counter()
    results = run_study(study, loss=True)
    with_loss = time.perf_counter() - started
    levels = len(results.loss["levels"])
    ratio = with_loss / without
    print(f"reference run_study without loss: {without:.2f} s  "
          f"[{', '.join(f'{k} {v:.2f} s' for k, v in reference.run['timings'].items())}]")
    print(f"run_study with the loss study ({levels} levels): {with_loss:.2f} s  "
          f"[{', '.join(f'{k} {v:.2f} s' for k, v in results.run['timings'].items())}]")
    print(f"ratio: {ratio:.2f} (target <= {TARGET_RATIO:g}: {'met' if ratio <= TARGET_RATIO else 'NOT met'})")


if __name__ == "__main__":
    main()
