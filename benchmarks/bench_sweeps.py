"""Design-space sweeps: the array kernel, the direct sweep command, history sweeps.

Run: ``python -m benchmarks sweeps`` or ``python benchmarks/bench_sweeps.py [--grid 100]
[--histories 1000] [--ratio 60] [--skip-histories]``

1. Array kernel: lower/nominal/upper equivalent-linear iterations of
   ``grid^2`` friction-pendulum alternatives (radius x friction of the demo
   study) in one call, variants/s on this core, as a ratio to the scalar
   procedure (``isolation.design.design_bounds`` per variant) in this process.
   Aim: >= 20,000 variants/s.
2. ``python -m isolation batch FILE --direct`` on the same ``grid^2`` grid of
   the demo batch (2 alternatives each), a separate process: wall time
   including validation, the runs and the summary, and the peak memory of
   the process tree. Aim for 100 x 100: <= 10 s, <= 1 GB.
3. History sweep (``--direct --histories``, the demo study's 7-record suite,
   lower and upper bound, 30 s records at 0.005 s): ``--histories`` variants
   on 2 local workers (aim for 1000: <= 5 min) and on 1 (aim: 2 workers >=
   1.8x one), optionally a smaller ``--ratio`` sweep likewise. The CPU time of all the
   command's processes is printed too: on a loaded machine it tells what two
   free cores would give.

The machine's load average is printed beside each timing: other work on a
shared machine slows every figure, the ratios less so.
"""

from __future__ import annotations

import argparse
import os
import shutil
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
STUDY = ROOT / "examples" / "demo_study.toml"
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"


def _load() -> str:
    one, five, _ = os.getloadavg()
    return f"load average {one:.1f} (1 min), {five:.1f} (5 min) on {os.cpu_count()} cores"


def _grid(side: int) -> tuple[list[float], list[float]]:
    radii = [round(1.5 + 4.5 * i / max(side - 1, 1), 5) for i in range(side)]
    frictions = [round(0.02 + 0.10 * i / max(side - 1, 1), 6) for i in range(side)]
    return radii, frictions


def _batch(folder: Path, radii, frictions, name: str) -> Path:
    shutil.copy(STUDY, folder / "demo_study.toml")
    path = folder / f"{name}.toml"
    path.write_text(f'[batch]\nname = "{name}"\nstudy = "demo_study.toml"\n[grid]\n'
                    f'"{RADIUS}" = {radii!r}\n"{FRICTION}" = {frictions!r}\n', encoding="utf-8")
    return path


def bench_kernel(side: int) -> None:
    from isolation.design import design_bounds
    from isolation.design.array_kernel import design_bounds_many
    from isolation.study import assembly as model
    from isolation.study import load_study

    study = load_study(STUDY)
    spectrum = model.site_spectrum(study)
    weight = study.building.total_weight
    base = study.alternatives[0]
    radii, frictions = _grid(side)
    sets = []
    for r in radii:
        for m in frictions:
            bearing = base.bearings[0]
            spec = type(bearing)(bearing.type, bearing.count, bearing.axial_load,
                                 {**bearing.properties, "radius": r, "friction": m}, bearing.axial_load_given)
            alternative = type(base)(base.name, (spec,), base.lower_factor, base.upper_factor, base.moat)
            sets.append(model.isolation_system(alternative).property_sets(weight))
    count = len(sets)
    reference_count = min(count, 300)
    started = time.perf_counter()
    reference = [design_bounds(s, weight, spectrum) for s in sets[:reference_count]]
    scalar_rate = reference_count / (time.perf_counter() - started)
    design_bounds_many(sets[:50], weight, spectrum)  # warm
    started, cpu = time.perf_counter(), time.process_time()
    found = design_bounds_many(sets, weight, spectrum)
    elapsed, cpu = time.perf_counter() - started, time.process_time() - cpu
    worst = max(abs(found[i].results[c].displacement / reference[i].results[c].displacement - 1.0)
                for i in range(reference_count) for c in ("lower", "nominal", "upper"))
    print(f"array kernel, {count} variants x 3 property sets (friction pendulum, demo study), one core:")
    print(f"  scalar design_bounds (reference): {scalar_rate:10.0f} variants/s")
    print(f"  design_bounds_many             : {count / elapsed:10.0f} variants/s  ratio "
          f"{count / elapsed / scalar_rate:.0f} "
          f"(aim >= 20,000 variants/s); largest relative difference in D {worst:.1e}")
    print(f"  CPU time {cpu:.3f} s: {count / cpu:10.0f} variants per CPU second (what a free core gives)")
    print(f"  ({_load()})")


def _measured(argv: list[str]) -> tuple[float, float, str, float]:
    """(wall time [s], peak memory of the process tree [MB], first output line, CPU time [s]) of a command."""
    import resource

    import psutil

    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    started = time.perf_counter()
    process = subprocess.Popen(argv, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    watch = psutil.Process(process.pid)
    peak = 0.0
    while process.poll() is None:
        try:
            tree = [watch, *watch.children(recursive=True)]
            peak = max(peak, sum(p.memory_info().rss for p in tree if p.is_running()) / 1e6)
        except psutil.Error:
            pass
        time.sleep(0.05)
    out, err = process.communicate()
    elapsed = time.perf_counter() - started
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime + after.ru_stime) - (before.ru_utime + before.ru_stime)
    if process.returncode != 0:
        raise SystemExit(f"{' '.join(argv)} exited with {process.returncode}: {err.strip()[-400:]}")
    return elapsed, peak, out.strip().splitlines()[0] if out.strip() else "", cpu


def bench_direct(side: int) -> None:
    radii, frictions = _grid(side)
    with tempfile.TemporaryDirectory() as scratch:
        folder = Path(scratch)
        path = _batch(folder, radii, frictions, "direct-grid")
        load = _load()
        wall, peak, line, cpu = _measured([sys.executable, "-m", "isolation", "batch", str(path), "--direct",
                                      "--no-progress", "--out", str(folder / "out")])
        rows = sum(1 for _ in (folder / "out" / "summary.csv").open()) - 1
    count = side * side
    print(f"python -m isolation batch --direct, {count} variants x 2 alternatives ({rows} summary rows):")
    print(f"  wall {wall:6.1f} s (aim <= 10 s for 10,000), {count / wall:8.0f} variants/s; "
          f"peak memory of the process tree {peak:6.0f} MB (aim <= 1000 MB)")
    print(f"  CPU time of all its processes {cpu:.1f} s (on 2 free cores the wall time is about half of it "
          "plus start-up)")
    print(f"  {line}")
    print(f"  ({load} before the run)")


def _history_run(path: Path, out: Path, workers: int) -> tuple[float, str]:
    load = _load()
    wall, peak, line, cpu = _measured([sys.executable, "-m", "isolation", "batch", str(path), "--direct", "--histories",
                               "--no-progress", "--workers", str(workers), "--out", str(out)])
    return wall, f"[{line}; CPU {cpu:.0f} s; peak memory {peak:.0f} MB; {load} before]"


def bench_histories(count: int, ratio_count: int) -> None:
    from isolation.app.batch.histories import MOTIONS_FOLDER

    counts = [c for c in dict.fromkeys((count, ratio_count)) if c > 0]
    runs = {}
    with tempfile.TemporaryDirectory() as scratch:
        folder = Path(scratch)
        # the suite and the fixed base once, outside the timings (the same for every run)
        _history_run(_batch(folder, [3.0], [0.05], "histories-warm"), folder / "warm", 2)
        for wanted in counts:
            side = max(2, int(round(wanted ** 0.5)))
            path = _batch(folder, *_grid(side), f"histories-{side * side}")
            for workers in (2, 1):
                out = folder / f"{side * side}-{workers}"
                shutil.copytree(folder / "warm" / MOTIONS_FOLDER, out / MOTIONS_FOLDER)
                runs[side * side, workers] = _history_run(path, out, workers)
    print("history sweep (demo study, 7 records x 30 s at 0.005 s, lower + upper bound; the lead-rubber "
          "alternative is the same in every variant, run once per worker):")
    for variants in dict.fromkeys(n for n, _ in runs):
        (two, line_two), (one, line_one) = runs[variants, 2], runs[variants, 1]
        aim = " (aim <= 300 s for 1000)" if variants >= 1000 else ""
        print(f"  {variants} variants, 1 worker : {one:7.1f} s  {variants / one:6.2f} variants/s (reference)  "
              f"{line_one}")
        print(f"  {variants} variants, 2 workers: {two:7.1f} s{aim}  {variants / two:6.2f} variants/s  "
              f"ratio {one / two:.2f} (aim >= 1.8)  {line_two}")


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--grid", type=int, default=100, help="grid side for the kernel and --direct (default 100)")
    parser.add_argument("--histories", type=int, default=1000,
                        help="history-sweep variants on 1 and on 2 workers, about (default 1000; 0: skip)")
    parser.add_argument("--ratio", type=int, default=0,
                        help="another, smaller history sweep on 1 and 2 workers, about (e.g. 256, where start-up "
                        "weighs more; default 0: none)")
    parser.add_argument("--skip-histories", action="store_true", help="kernel and direct sweep only")
    parser.add_argument("--histories-only", action="store_true", help="history sweeps only")
    args = parser.parse_args([] if argv is None else argv)
    if not args.histories_only:
        bench_kernel(args.grid)
        bench_direct(args.grid)
    if not args.skip_histories:
        bench_histories(args.histories, args.ratio)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
