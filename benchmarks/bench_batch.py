"""Batch throughput: records on 1 vs 2 local workers, and the direct sweep.

Run: ``python benchmarks/bench_batch.py [--variants N] [--sweep N] [--full]``

1. Record batch (feasibility workbook per variant, quick suites unless
   ``--full``) of the invented demo study over a radius grid: variants per
   minute on 1 worker without the records' head start (the reference), on 2
   workers (the speed-up of the executor: expect >= 1.7 on a machine with 2
   free cores), and on 1 worker with its head start, which then runs on the
   second core (the batch's default wherever each worker has a spare core:
   ``executors.spare_core_each``).
2. Direct sweep (equivalent-linear design per variant, no notebook): variants
   per second on 1 and 2 workers, each as a ratio to a reference run in this
   process (the same design over already-parsed studies, serial).

Timings depend on what else runs on the machine; the ratios are the figures
to compare.
"""

from __future__ import annotations

import argparse
import contextlib
import io
import shutil
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
STUDY = ROOT / "examples" / "demo_study.toml"
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"


def _batch(folder: Path, radii, frictions) -> Path:
    shutil.copy(STUDY, folder / "study.toml")
    path = folder / "bench_batch.toml"
    path.write_text(
        "[batch]\nstudy = \"study.toml\"\n[grid]\n"
        f"\"{RADIUS}\" = {list(radii)!r}\n\"{FRICTION}\" = {list(frictions)!r}\n",
        encoding="utf-8",
    )
    return path


def _timed_batch(path: Path, out: Path, workers: int, runner, quick: bool,
                 head_start: bool | None = None) -> tuple[float, int]:
    from isolation.app.batch import load_batch, run_batch, validate_plan

    plan = load_batch(path)
    hashes = validate_plan(plan, settings={"quick": quick})
    started = time.perf_counter()
    report = run_batch(plan, out, hashes, workers=workers, runner=runner, quick=quick, progress=False,
                       head_start=head_start)
    elapsed = time.perf_counter() - started
    if report.failed or report.not_run:
        raise SystemExit(f"benchmark batch did not complete: failed {report.failed}, not run {report.not_run}")
    return elapsed, len(report.done)


def _timed_command(argv: list[str]) -> float:
    """Wall time of ``python -m isolation batch ARGV`` run in this process. [s]"""
    from isolation.app.batch import main as batch

    started = time.perf_counter()
    with contextlib.redirect_stdout(io.StringIO()):
        code = batch([*argv, "--no-progress"])
    if code != 0:
        raise SystemExit(f"benchmark batch exited with {code}")
    return time.perf_counter() - started


def bench_records(variants: int, quick: bool) -> None:
    import os

    from isolation.app.batch.executors import spare_core_each
    from isolation.app.batch.runners import record_runner

    radii = [round(2.0 + 0.25 * i, 2) for i in range(variants)]
    with tempfile.TemporaryDirectory() as scratch:
        folder = Path(scratch)
        path = _batch(folder, radii, [0.05])
        one, count = _timed_batch(path, folder / "one", 1, record_runner, quick, head_start=False)
        two, _ = _timed_batch(path, folder / "two", 2, record_runner, quick)
        ahead, _ = _timed_batch(path, folder / "ahead", 1, record_runner, quick, head_start=True)
    rate_one, rate_two, rate_ahead = 60.0 * count / one, 60.0 * count / two, 60.0 * count / ahead
    kind = "quick suites" if quick else "full suites"
    cores = os.cpu_count()
    print(f"record batch, {count} variants ({kind}), {cores} cores:")
    print(f"  1 worker, no head start   : {one:7.1f} s  {rate_one:6.2f} variants/min  (reference)")
    print(f"  {'2 workers, ' + ('with' if spare_core_each('local', 2) else 'no') + ' head start':<26}: {two:7.1f} s  "
          f"{rate_two:6.2f} variants/min  ratio {rate_two / rate_one:.2f} (expect >= 1.7)")
    print(f"  1 worker with head start  : {ahead:7.1f} s  {rate_ahead:6.2f} variants/min  ratio "
          f"{rate_ahead / rate_one:.2f} (the batch's default for 1 worker here: "
          f"{'with' if spare_core_each('local', 1) else 'without'} head start)")


def bench_sweep(count: int) -> None:
    from isolation.app.batch.sweep import design_rows
    from isolation.study import load_study

    side = max(2, int(round(count ** 0.5)))
    radii = [round(1.5 + 3.5 * i / (side - 1), 4) for i in range(side)]
    frictions = [round(0.03 + 0.07 * i / (side - 1), 4) for i in range(side)]
    total = side * side
    studies = [load_study(STUDY, overrides={RADIUS: r, FRICTION: f}) for r in radii for f in frictions]
    alternatives = len(studies[0].alternatives)
    started = time.perf_counter()
    for study in studies:
        design_rows(study)
    reference = total / (time.perf_counter() - started)
    with tempfile.TemporaryDirectory() as scratch:
        folder = Path(scratch)
        path = _batch(folder, radii, frictions)
        one = _timed_command([str(path), "--direct", "--workers", "1", "--out", str(folder / "one")])
        two = _timed_command([str(path), "--direct", "--workers", "2", "--out", str(folder / "two")])
    print(f"direct sweep, {total} variants x {alternatives} alternatives (equivalent linear, 3 property sets each):")
    print(f"  reference, parsed studies, this process: {reference:7.1f} variants/s")
    print(f"  batch --direct, 1 worker : {total / one:7.1f} variants/s  ratio {total / one / reference:.2f} to "
          "reference")
    print(f"  batch --direct, 2 workers: {total / two:7.1f} variants/s  ratio {total / two / reference:.2f} to "
          "reference, "
          f"{one / two:.2f} to 1 worker")
    print("  (the batch command's wall time: validating every variant, the runs, batch.json and summary.csv)")


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--variants", type=int, default=4, help="record-batch variants (default 4)")
    parser.add_argument("--sweep", type=int, default=400, help="direct-sweep variants, about (default 400)")
    parser.add_argument("--full", action="store_true", help="full motion suites in the record batch")
    parser.add_argument("--skip-records", action="store_true", help="direct sweep only")
    args = parser.parse_args([] if argv is None else argv)  # `python -m benchmarks batch`: defaults
    bench_sweep(args.sweep)
    if not args.skip_records:
        bench_records(args.variants, quick=not args.full)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
