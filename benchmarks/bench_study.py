"""Benchmark of a whole study: the invented demo study end to end, PDF included.

Run: ``python -m benchmarks study`` or ``python benchmarks/bench_study.py``.

Steps timed, in one process (the machine's state at the time is part of the figure):

1. Reference: :func:`isolation.study.runner.run_study` on the demo study in this
   process (design, full motion suite, response histories, verdict) - the
   numeric core alone.
2. End to end: :func:`isolation.app.calc_records.run_record` with the PDF report, as
   ``python -m isolation demo`` does it (kernel start, workbook with its
   figures and tables, results JSON, report with the default engine, manifest),
   with its breakdown: the numeric core (run in the command's process while the
   kernel starts), what of the kernel start that does not cover and papermill's
   own work, the workbook's first cell (it reads those results), the other
   workbook cells (figures, tables), report rendering, and the rest (checks,
   record files).
3. The README command itself, ``python -m isolation demo``, in a fresh
   process (adds Python start and the command line's imports).

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

    # Timed steps of the run: the study run in the command's process while the kernel starts
    # ("ahead"), the wait for the kernel after that ("kernel wait": start-up and warm-up longer than
    # the checks and the core), and the report rendering ("seconds").
    from isolation.app import calc_records

    rendering: dict[str, float] = {}
    folder = Path(tempfile.mkdtemp(prefix="bench_study_"))
    try:
        with mock.patch.object(report_module, "render", _timed(report_module.render, "seconds", rendering)), \
                mock.patch.object(calc_records._EarlyKernel, "enter",
                                  _timed(calc_records._EarlyKernel.enter, "kernel wait", rendering)), \
                mock.patch.object(calc_records, "compute_ahead",
                                  _timed(calc_records.compute_ahead, "ahead", rendering)):
            started, cpu = time.perf_counter(), _cpu_seconds()
            outcome = run_record(STUDY, folder, pdf=True)
            total, cpu = time.perf_counter() - started, _cpu_seconds() - cpu
        if outcome.status != "done":
            print(f"end-to-end run FAILED: {outcome.error}")
            return
        inner = json.loads((outcome.path / "results.json").read_text())["run"]["timings"]
        print(f"end to end with report ({outcome.report.name}): {total:.2f} s "
              f"(target <= {TARGET_SECONDS:.0f} s: {'met' if total <= TARGET_SECONDS else 'NOT met'}); "
              f"ratio to the reference run: {total / core:.2f}; CPU of all its processes {cpu:.2f} s")
        print("  numeric core by stage: " + ", ".join(f"{k} {v:.2f} s" for k, v in inner.items()))
        _breakdown(outcome.path / "feasibility.ipynb", total, rendering.get("ahead", 0.0),
                   rendering.get("seconds", 0.0), rendering.get("kernel wait", 0.0))
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
    """``function`` that also stores its duration in ``times[key]``. [s]"""
    def timed(*args, **kwargs):
        begun = time.perf_counter()
        try:
            return function(*args, **kwargs)
        finally:
            times[key] = time.perf_counter() - begun

    return timed


def _breakdown(notebook: Path, total: float, ahead: float, rendering: float, waiting: float = 0.0) -> None:
    """Where the end-to-end time goes, from papermill's timings in the executed workbook.

    ``ahead`` is the study run in the command's process while the kernel starts
    (``calc_records.compute_ahead``); ``waiting`` the time the run then still waited for its
    kernel. [s]
    """
    import nbformat

    nb = nbformat.read(notebook, as_version=4)
    papermill_total = float(nb.metadata.papermill.duration)
    cells = [(c.source, float(c.metadata.get("papermill", {}).get("duration") or 0.0))
             for c in nb.cells if c.cell_type == "code"]
    cell_time = sum(d for _, d in cells)
    study_cell = next((d for source, d in cells if "results_of(" in source or "run_study(" in source), 0.0)
    parts = {
        "numeric core (command's process, while the kernel starts)": ahead,
        "kernel start beyond that, and papermill": waiting + papermill_total - cell_time,
        "first cell (results read, title)": study_cell,
        "figures and tables (other cells)": cell_time - study_cell,
        "report rendering": rendering,
        "rest (checks, record files)": total - papermill_total - rendering - waiting - ahead,
    }
    print("  breakdown: " + ", ".join(f"{k} {v:.2f} s" for k, v in parts.items()))


def _readme_command() -> None:
    """``python -m isolation demo`` in a fresh process: what a user waits for."""
    import subprocess

    folder = Path(tempfile.mkdtemp(prefix="bench_demo_"))
    try:
        started, cpu = time.perf_counter(), _cpu_seconds()
        done = subprocess.run([sys.executable, "-m", "isolation", "demo", "--out", str(folder)],
                              capture_output=True, text=True, cwd=ROOT)
        wall, cpu = time.perf_counter() - started, _cpu_seconds() - cpu
        report = next((line.removeprefix("Report: ") for line in done.stdout.splitlines()
                       if line.startswith("Report: ")), "?")
        verdict = "met" if wall <= TARGET_DEMO_SECONDS else "NOT met"
        aim = "met" if wall <= AIM_DEMO_SECONDS else "not met"
        print(f"python -m isolation demo (fresh process): {wall:.2f} s, exit {done.returncode}, "
              f"report {Path(report).name} (target <= {TARGET_DEMO_SECONDS:.0f} s: {verdict}; "
              f"aim <= {AIM_DEMO_SECONDS:.0f} s: {aim}); CPU of all its processes {cpu:.2f} s, "
              f"load average {os.getloadavg()[0]:.1f} on {os.cpu_count()} cores")
    finally:
        shutil.rmtree(folder, ignore_errors=True)


if __name__ == "__main__":
    main()
