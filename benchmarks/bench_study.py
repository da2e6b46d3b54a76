"""Benchmark of a whole study: the invented demo study end to end, PDF included.

Run: ``python -m benchmarks study`` or ``python benchmarks/bench_study.py``.

Steps timed, in one process (the machine's state at the time is part of the figure):

1. Reference: :func:`isolation.study.runner.run_study` on the demo study in this
   process (design, full motion suite, response histories, verdict) - the
   numeric core alone.
2. End to end: :func:`isolation.app.calc_records.run_record` with the PDF report, as
   ``python -m isolation demo`` does it (kernel start, workbook with its
   figures and tables, results JSON, report with the default engine, manifest),
   with its breakdown in the order things happen: the checks and the record's
   set-up before the command forks its helper (which computes the study and then
   draws figures from the last one up, :mod:`isolation.app.record_ahead`), the wait
   for the kernel, papermill's start, the workbook's first cell (it waits for the
   helper's results: the numeric core), the other cells (figures, drawn by the
   kernel and the helper, and tables), report rendering, and the rest (kernel
   stop, record files).
3. The README command itself, ``python -m isolation demo``, in a fresh
   process (adds Python start and every process's imports), five times: the median.

Targets: end to end <= 60 s and peak memory <= 1 GB (issue 5); the demo with
the pip-only PDF route <= 8 s after set-up (issue 13), <= 5 s aimed at (issue
14). Printed: the times, their ratio to the reference run, the breakdown, and
the peak resident memory of this process and of its largest child (kernel), and the CPU time
of all the processes of a run (on a machine others share, wall times follow the load; CPU time much less).
"""

from __future__ import annotations

import json
import os
import resource
import shutil
import sys
import tempfile
import time
from pathlib import Path
from unittest import mock

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

STUDY = ROOT / "examples" / "demo_study.toml"
TARGET_SECONDS = 60.0
TARGET_DEMO_SECONDS = 8.0
AIM_DEMO_SECONDS = 5.0
TARGET_BYTES = 1 << 30


def _cpu_seconds() -> float:
    """CPU time of this process and of its finished children (user + system). [s]"""
    own, children = resource.getrusage(resource.RUSAGE_SELF), resource.getrusage(resource.RUSAGE_CHILDREN)
    return own.ru_utime + own.ru_stime + children.ru_utime + children.ru_stime


def _peak_bytes(who: int) -> int:
    # ru_maxrss is in kilobytes on Linux.
    return resource.getrusage(who).ru_maxrss * 1024


def main() -> None:
    from isolation.app.calc_records import run_record
    from isolation.output.report import missing_tools
    from isolation.study import load_study
    from isolation.study.runner import run_study

    missing = missing_tools()
    if missing:
        print(f"note: {', '.join(missing)} missing: the report will be HTML, not PDF")

    started = time.perf_counter()
    results = run_study(load_study(STUDY))
    core = time.perf_counter() - started
    steps = ", ".join(f"{k} {v:.2f} s" for k, v in results.run["timings"].items())
    print(f"reference run_study (in process): {core:.2f} s  [{steps}]")

    import isolation.output.report as report_module
    from isolation.app import calc_records

    # Timed steps of the run: the start of the helper process, the wait for the kernel, the report.
    steps: dict[str, float] = {}
    folder = Path(tempfile.mkdtemp(prefix="bench_study_"))
    try:
        with mock.patch.object(report_module, "render", _timed(report_module.render, "render", steps)), \
                mock.patch.object(calc_records._EarlyKernel, "enter",
                                  _timed(calc_records._EarlyKernel.enter, "kernel wait", steps)), \
                mock.patch.object(calc_records, "start_ahead",
                                  _timed(calc_records.start_ahead, "fork", steps)):
            started, cpu = time.perf_counter(), _cpu_seconds()
            steps["start"] = time.time()
            outcome = run_record(STUDY, folder, pdf=True)
            total, cpu = time.perf_counter() - started, _cpu_seconds() - cpu
        if outcome.status != "done":
            print(f"end-to-end run FAILED: {outcome.error}")
            return
        inner = json.loads((outcome.path / "results.json").read_text())["run"]["timings"]
        print(f"end to end with report ({outcome.report.name}): {total:.2f} s "
              f"(target <= {TARGET_SECONDS:.0f} s: {'met' if total <= TARGET_SECONDS else 'NOT met'}); "
              f"ratio to the reference run: {total / core:.2f}; CPU of all its processes {cpu:.2f} s")
        print("  numeric core by stage (helper process): " + ", ".join(f"{k} {v:.2f} s" for k, v in inner.items()))
        _breakdown(outcome.path / "feasibility.ipynb", total, steps)
        print("  verdicts: " + "; ".join(outcome.verdicts))
    finally:
        shutil.rmtree(folder, ignore_errors=True)

    _readme_command()

    own = _peak_bytes(resource.RUSAGE_SELF)
    child = _peak_bytes(resource.RUSAGE_CHILDREN)
    peak = max(own, child)
    print(f"peak memory: this process {own / 2**20:.0f} MiB, largest child {child / 2**20:.0f} MiB "
          f"(target <= 1024 MiB: {'met' if peak <= TARGET_BYTES else 'NOT met'})")


def _timed(function, key: str, times: dict):
    """``function`` that also stores when it began and ended in ``times[key]``. [s since the epoch]"""
    def timed(*args, **kwargs):
        begun = time.time()
        try:
            return function(*args, **kwargs)
        finally:
            times[key] = (begun, time.time())

    return timed


def _breakdown(notebook: Path, total: float, steps: dict) -> None:
    """Where the end-to-end time goes, phase by phase (they add up to the total), from the timed steps
    and papermill's start and end times of the executed workbook's cells. [s]"""
    import datetime

    import nbformat

    def moment(text: str) -> float:
        return datetime.datetime.fromisoformat(text.replace("Z", "+00:00")).timestamp()

    nb = nbformat.read(notebook, as_version=4)
    cells = [c for c in nb.cells if c.cell_type == "code" and c.metadata.get("papermill", {}).get("start_time")]
    first = next(c for c in cells if "results_of(" in c.source)
    start = steps["start"]
    marks = [("checks and set-up (before the fork)", steps["fork"][1]),
             ("wait for the kernel", steps["kernel wait"][1]),
             ("papermill start", moment(first.metadata.papermill.start_time)),
             ("first cell (waits for the helper's study run)", moment(first.metadata.papermill.end_time)),
             ("figures and tables (other cells)", moment(cells[-1].metadata.papermill.end_time)),
             ("kernel stop and results", steps["render"][0]),
             ("report rendering", steps["render"][1]),
             ("rest (record files)", start + total)]
    parts, before = [], start
    for name, until in marks:
        parts.append(f"{name} {until - before:.2f} s")
        before = until
    print("  breakdown: " + ", ".join(parts))


README_RUNS = 5
"""Runs of the README command: its wall time varies by a few tenths of a second between runs."""


def _readme_command() -> None:
    """``python -m isolation demo`` in a fresh process, :data:`README_RUNS` times: what a user waits for."""
    import statistics
    import subprocess

    walls, cpus, codes, report = [], [], set(), "?"
    for _ in range(README_RUNS):
        folder = Path(tempfile.mkdtemp(prefix="bench_demo_"))
        try:
            started, cpu = time.perf_counter(), _cpu_seconds()
            done = subprocess.run([sys.executable, "-m", "isolation", "demo", "--out", str(folder)],
                                  capture_output=True, text=True, cwd=ROOT)
            walls.append(time.perf_counter() - started)
            cpus.append(_cpu_seconds() - cpu)
            codes.add(done.returncode)
            report = next((Path(line.removeprefix("Report: ")).name for line in done.stdout.splitlines()
                           if line.startswith("Report: ")), report)
        finally:
            shutil.rmtree(folder, ignore_errors=True)
    wall = statistics.median(walls)
    verdict = "met" if wall <= TARGET_DEMO_SECONDS else "NOT met"
    aim = "met" if wall <= AIM_DEMO_SECONDS else "not met"
    print(f"python -m isolation demo (fresh process, median of {README_RUNS}): {wall:.2f} s "
          f"(runs {', '.join(f'{w:.2f}' for w in sorted(walls))}), exit {sorted(codes)}, report {report} "
          f"(target <= {TARGET_DEMO_SECONDS:.0f} s: {verdict}; aim <= {AIM_DEMO_SECONDS:.0f} s: {aim}); "
          f"CPU of all its processes {statistics.median(cpus):.2f} s, load average {os.getloadavg()[0]:.1f} "
          f"on {os.cpu_count()} cores")


if __name__ == "__main__":
    main()
