"""Benchmark of a whole study: the invented demo study end to end, PDF included.

Run: ``python -m benchmarks study`` or ``python benchmarks/bench_study.py``.

Steps timed, in one process (the machine's state at the time is part of the figure):

1. Reference: :func:`isolation.runner.run_study` on the demo study in this
   process (design, full motion suite, response histories, verdict) - the
   numeric core alone.
2. End to end: :func:`isolation.records.run_record` with the PDF report, as
   ``python -m isolation demo`` does it (kernel start, workbook with its
   figures and tables, results JSON, XeLaTeX report, manifest).

Targets (issue 5): end to end <= 60 s on the development machine after set-up;
peak memory <= 1 GB. Printed: both times, their ratio (how much the workbook,
kernel and report add over the core), the run's own step timings, and the peak
resident memory of this process and of its largest child (kernel, xelatex).
"""

from __future__ import annotations

import json
import resource
import shutil
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

STUDY = ROOT / "examples" / "demo_study.toml"
TARGET_SECONDS = 60.0
TARGET_BYTES = 1 << 30


def _peak_bytes(who: int) -> int:
    # ru_maxrss is in kilobytes on Linux.
    return resource.getrusage(who).ru_maxrss * 1024


def main() -> None:
    from isolation.records import run_record
    from isolation.report import missing_tools
    from isolation.runner import run_study
    from isolation.study import load_study

    missing = missing_tools()
    if missing:
        print(f"note: {', '.join(missing)} missing: the report will be HTML, not PDF")

    started = time.perf_counter()
    results = run_study(load_study(STUDY))
    core = time.perf_counter() - started
    steps = ", ".join(f"{k} {v:.2f} s" for k, v in results.run["timings"].items())
    print(f"reference run_study (in process): {core:.2f} s  [{steps}]")

    folder = Path(tempfile.mkdtemp(prefix="bench_study_"))
    try:
        started = time.perf_counter()
        outcome = run_record(STUDY, folder, pdf=True)
        total = time.perf_counter() - started
        if outcome.status != "done":
            print(f"end-to-end run FAILED: {outcome.error}")
            return
        inner = json.loads((outcome.path / "results.json").read_text())["run"]["timings"]
        print(f"end to end with report ({outcome.report.name}): {total:.2f} s "
              f"(target <= {TARGET_SECONDS:.0f} s: {'met' if total <= TARGET_SECONDS else 'NOT met'}); "
              f"ratio to the reference run: {total / core:.2f}")
        print("  inside the workbook: " + ", ".join(f"{k} {v:.2f} s" for k, v in inner.items()))
        print("  verdicts: " + "; ".join(outcome.verdicts))
    finally:
        shutil.rmtree(folder, ignore_errors=True)

    own = _peak_bytes(resource.RUSAGE_SELF)
    child = _peak_bytes(resource.RUSAGE_CHILDREN)
    peak = max(own, child)
    print(f"peak memory: this process {own / 2**20:.0f} MiB, largest child {child / 2**20:.0f} MiB "
          f"(target <= 1024 MiB: {'met' if peak <= TARGET_BYTES else 'NOT met'})")


if __name__ == "__main__":
    main()
