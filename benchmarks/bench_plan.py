"""Benchmark of the bidirectional plan model (issue: bidirectional isolation with torsion).

Ensemble: an invented 5-storey plan building (600 t floors, 3.5 m storeys, 30 m x 20 m plan,
centre of rigidity 1.0 m / 0.5 m off the centre of mass, 5 % accidental mass offset) on 30 bearings
(6 x 5 grid): 11 component pairs x 3 property cases isolated plus the 11 fixed-base runs, 40 s at
dt = 0.005 s (8,001 steps). Storeys yield in x and in y (the strengths of the planar yielding
benchmark, ``bench_history.yielding_building``, in both directions, 5 % hardening, P-delta);
the elastic-storey run is printed beside it. Target: <= 5 s on one core; peak memory <= 1 GB.
Reference in the same process: the planar engine (``isolation.dynamics.history.run_cases``) on the x
components of the same motions, same yielding superstructure and whole-plane isolator.

Run: ``python -m benchmarks plan``. The motions are seeded synthetic noise (not recorded earthquakes).
"""

from __future__ import annotations

import os

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")
os.environ.setdefault("OMP_NUM_THREADS", "1")

import resource  # noqa: E402
import time  # noqa: E402

import numpy as np  # noqa: E402

from benchmarks.bench_history import BASE_MASS, DT, building, synthetic_motions, yielding_building  # noqa: E402
from isolation.bearings import FrictionPendulum, LeadRubber  # noqa: E402
from isolation.dynamics import plan_kernel  # noqa: E402
from isolation.dynamics.history import run_cases  # noqa: E402
from isolation.dynamics.plan_history import run_plan, run_plan_cases  # noqa: E402
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding, bearing_grid  # noqa: E402

PLAN = (30.0, 20.0)
COUNTS = (6, 5)


def plan_superstructure(yielding: bool = True) -> PlanShearBuilding:
    planar = yielding_building() if yielding else building()
    return PlanShearBuilding(planar.masses, planar.stiffnesses, planar.stiffnesses, planar.heights, plan=PLAN,
                             rigidity_offset=(1.0, 0.5), yield_shears_x=planar.yield_shears,
                             yield_shears_y=planar.yield_shears, hardening=planar.hardening, p_delta=planar.p_delta)


def _timed(superstructure, bearings, positions, pairs):
    cases = [PlanIsolatedBuilding(superstructure, BASE_MASS, b, positions, mass_offset=(0.0, 0.05 * PLAN[1]))
             for b in bearings]
    run_plan_cases(cases[:1], pairs[:1, :, :200], DT)  # compile / warm
    run_plan(superstructure, pairs[:1, :, :200], DT)
    start = time.process_time()
    results = run_plan_cases(cases, pairs, DT)
    fixed = run_plan(superstructure, pairs, DT)
    return time.process_time() - start, results, fixed


def main() -> None:
    x = synthetic_motions(seed=7)
    y = synthetic_motions(seed=8)
    pairs = np.stack([x, y], axis=1)
    superstructure = plan_superstructure()
    positions = bearing_grid(PLAN, COUNTS)
    count = positions.shape[0]
    print(f"compiled loop: {'numba' if plan_kernel.available else 'not available (array version)'}")
    for name, bearings in (
        ("friction pendulum", [FrictionPendulum(2.5, f, friction_slow=0.7 * f) for f in (0.045, 0.06, 0.08)],
        ),
        ("lead-rubber", [LeadRubber(0.9, 0.2, 0.01, 20, g) for g in (350.0, 400.0, 480.0)]),
    ):
        seconds, results, fixed = _timed(superstructure, bearings, positions, pairs)
        elastic_seconds = _timed(plan_superstructure(yielding=False), bearings, positions, pairs)[0]
        isolators = [b if isinstance(b, FrictionPendulum) else b.bilinear().times(count) for b in bearings]
        start = time.process_time()
        cases = dict(zip(("lower", "nominal", "upper"), isolators, strict=True))
        run_cases(yielding_building(), BASE_MASS, cases, x, DT)
        planar = time.process_time() - start
        print(f"{name}: {len(bearings)} cases x {pairs.shape[0]} pairs + {pairs.shape[0]} fixed, {count} bearings, "
              f"{pairs.shape[-1]} steps, 5 yielding storeys: {seconds:.2f} s CPU (target <= 5 s); elastic storeys "
              f"{elastic_seconds:.2f} s; planar engine on the x components {planar:.2f} s; ratio plan/planar "
              f"{seconds / planar:.1f}")
        summary = results[1].summary()
        base = fixed.summary()
        print(f"  nominal: D_TM from histories {summary['total_displacement_m']:.3f} m, centre "
              f"{summary['centre_displacement_m']:.3f} m, torsional amplification "
              f"{summary['torsional_amplification']:.3f}, storey ductility {summary.get('ductility', np.nan):.2f}, "
              f"energy error {summary['energy_error']:.1e}; fixed base: peak drift "
              f"{base['peak_drift_ratio']:.4f}, ductility {base.get('ductility', np.nan):.2f}")
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"peak memory (ru_maxrss): {peak:.0f} MiB (target <= 1024 MiB)")


if __name__ == "__main__":
    main()
