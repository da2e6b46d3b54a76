"""Batch validation: 10^4 variants of one study checked against the schema.

Run: ``python -m benchmarks validation`` (or ``python benchmarks/bench_validation.py [--variants N]``)

A 100 x 100 grid over the invented demo study (friction-pendulum radius and
friction of the first alternative) is loaded and validated as ``batch
--check --direct`` does (:func:`isolation.app.batch.load_batch`,
:func:`isolation.app.batch.validate_plan` without model checks). Target: 10^4
variants in <= 5 s. The reference, in the same process, is the per-variant
path every variant used to take (deep copy, full parse, full hash), timed
over a sample and scaled to the same count; the ratio is reference / batch.

Figures printed: wall and CPU time of the batch validation, per-variant
times, and the ratio. Timings depend on what else runs on the machine; the
CPU time and the ratio are the figures to compare.
"""

from __future__ import annotations

import argparse
import shutil
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
STUDY = ROOT / "examples" / "demo_study.toml"
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"
TARGET = 5.0  # [s] for 10^4 variants


def _batch(folder: Path, side: int) -> Path:
    shutil.copy(STUDY, folder / "study.toml")
    radii = [round(1.5 + 2.5 * i / max(side - 1, 1), 5) for i in range(side)]
    frictions = [round(0.03 + 0.05 * i / max(side - 1, 1), 6) for i in range(side)]
    path = folder / "validation_batch.toml"
    path.write_text("[batch]\nstudy = \"study.toml\"\n[grid]\n"
                    f"\"{RADIUS}\" = {radii!r}\n\"{FRICTION}\" = {frictions!r}\n", encoding="utf-8")
    return path


def _reference(plan, sample: int) -> float:
    """CPU seconds per variant of the old path: apply_overrides (deep copy), parse_study, hash of to_dict."""
    from isolation.app.batch.check import variant_hash
    from isolation.study import apply_overrides, parse_study, read_study_mapping

    base = read_study_mapping(plan.study_file)
    chosen = plan.variants[:sample]
    started = time.process_time()
    for variant in chosen:
        study = parse_study(apply_overrides(base, plan.overrides_for(variant)), source=plan.study_file.name,
                            base_dir=plan.study_file.parent)
        variant_hash(study.to_dict(), {"mode": "direct", "quick": False})
    return (time.process_time() - started) / len(chosen)


def bench(variants: int = 10_000) -> dict:
    from isolation import units
    from isolation.app.batch import load_batch, validate_plan

    units.parse_quantity("1 m", "length", field="warm-up")  # the unit registry is built once per process
    side = max(1, round(variants ** 0.5))
    with tempfile.TemporaryDirectory() as scratch:
        path = _batch(Path(scratch), side)
        wall, cpu = time.perf_counter(), time.process_time()
        plan = load_batch(path)
        hashes = validate_plan(plan, settings={"mode": "direct", "quick": False}, model_checks=False)
        wall, cpu = time.perf_counter() - wall, time.process_time() - cpu
        reference = _reference(plan, min(500, len(plan.variants)))
    count = len(hashes)
    per = cpu / count
    figures = {"variants": count, "wall_s": wall, "cpu_s": cpu, "per_variant_ms": 1e3 * per,
               "reference_per_variant_ms": 1e3 * reference, "ratio": reference / per,
               "target_s": TARGET * count / 10_000}
    print(f"validated {count} variants in {wall:.2f} s wall, {cpu:.2f} s CPU "
          f"({1e3 * per:.3f} ms CPU per variant; target <= {figures['target_s']:.2f} s)")
    print(f"reference (per-variant deep copy, full parse, full hash): {1e3 * reference:.3f} ms CPU per variant "
          f"-> {reference * count:.1f} s for {count}")
    print(f"ratio reference / batch validation (CPU): {figures['ratio']:.1f}x; CPU time "
          f"{'meets' if cpu <= figures['target_s'] else 'misses'} the target; wall time "
          f"{'meets' if wall <= figures['target_s'] else 'misses'} it with the machine's present load")
    return figures


def main(argv: list[str] | None = None) -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--variants", type=int, default=10_000)
    args = parser.parse_args([] if argv is None and __name__ != "__main__" else argv)
    bench(args.variants)


if __name__ == "__main__":
    sys.path.insert(0, str(ROOT))
    main()
