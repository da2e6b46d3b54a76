"""Benchmark of the response-history engine (issue 4 speed targets).

1. Ensemble: a 5-storey shear building (invented) on lead-rubber bearings and,
   separately, on friction pendulums; 11 synthetic motions x 3 property bounds
   isolated plus the 11 fixed-base runs, 40 s at dt = 0.005 s, in one
   ``run_cases`` call. Target: <= 1 s warm on one core.
2. Per-case speed against scipy.integrate.solve_ivp (LSODA, rtol 1e-9,
   atol 1e-12) on the same smooth Bouc-Wen single-degree-of-freedom problem,
   at equal accuracy (peak isolator displacement within 1 %). Target: >= 200x.
3. Peak memory of the process (ru_maxrss) and the traced peak of one ensemble
   call (tracemalloc). Target: <= 1 GB.

Run: ``python -m benchmarks history`` or ``python benchmarks/bench_history.py``.
The motions are seeded band-limited noise under a smooth envelope, made
here: synthetic, not recorded earthquakes.
"""

from __future__ import annotations

import os

os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")
os.environ.setdefault("OMP_NUM_THREADS", "1")

import resource  # noqa: E402
import time  # noqa: E402
import tracemalloc  # noqa: E402

import numpy as np  # noqa: E402
import scipy.integrate  # noqa: E402
import scipy.signal  # noqa: E402

from isolation import GRAVITY  # noqa: E402
from isolation.bearings import FrictionPendulum, LeadRubber  # noqa: E402
from isolation.history import BoucWen, run_cases  # noqa: E402
from isolation.structure import ShearBuilding  # noqa: E402

DT = 0.005
DURATION = 40.0
RECORDS = 11


def synthetic_motions(records=RECORDS, duration=DURATION, dt=DT, pga=0.4, seed=7):
    """Seeded band-limited noise (0.1-12 Hz) under a rise-plateau-decay envelope. [g]"""
    steps = int(round(duration / dt)) + 1
    t = np.arange(steps) * dt
    rng = np.random.default_rng(seed)
    sos = scipy.signal.butter(4, [0.1, 12.0], "bandpass", fs=1.0 / dt, output="sos")
    noise = scipy.signal.sosfiltfilt(sos, rng.standard_normal((records, steps)), axis=-1)
    envelope = np.clip(t / 3.0, 0.0, 1.0) ** 2 * np.where(t > 18.0, np.exp(-0.25 * (t - 18.0)), 1.0)
    motion = noise * envelope
    return pga * motion / np.abs(motion).max(axis=1, keepdims=True)


def building():
    """Invented 5-storey frame: 600 t floors, 3.5 m storeys, T_fb = 0.5 s, 5 % modal damping."""
    return ShearBuilding.from_period(0.5, [600.0] * 5, [3.5] * 5)


BASE_MASS = 700.0


def lead_rubber_bounds():
    bearing = LeadRubber(outer_diameter=0.8, lead_diameter=0.16, layer_thickness=0.01, layers=20,
                         shear_modulus=400.0)
    plane = bearing.bilinear().times(16)
    return {"lower": plane.scaled(stiffness=0.9, strength=0.85), "nominal": plane,
            "upper": plane.scaled(stiffness=1.2, strength=1.3)}


def friction_bounds():
    nominal = FrictionPendulum(radius=3.0, friction=0.06, friction_slow=0.03)
    return {"lower": nominal.with_friction_factor(0.8), "nominal": nominal,
            "upper": nominal.with_friction_factor(1.3)}


def _best_of(count, call):
    walls, cpus, out = [], [], None
    for _ in range(count):
        w, c = time.perf_counter(), time.process_time()
        out = call()
        walls.append(time.perf_counter() - w)
        cpus.append(time.process_time() - c)
    return min(walls), min(cpus), out


def bouc_wen_reference(law: BoucWen, mass, acceleration, dt, rtol=1e-9, atol=1e-12):
    """solve_ivp (LSODA) on the same rigid-mass Bouc-Wen model; returns peak |u|. [m]"""
    b = law.bilinear
    kd, qd, dy = b.post_yield_stiffness, b.characteristic_strength, b.yield_displacement
    beta, gamma = law.beta, law.gamma
    times = np.arange(acceleration.size) * dt
    ground = acceleration * GRAVITY

    def rhs(t, y):
        u, v, z = y
        a_g = np.interp(t, times, ground)
        dz = (v - beta * abs(v) * abs(z) * z - gamma * v * z * z) / dy
        return [v, -a_g - (kd * u + qd * z) / mass, dz]

    sol = scipy.integrate.solve_ivp(rhs, (0.0, times[-1]), [0.0, 0.0, 0.0], method="LSODA",
                                    t_eval=times, rtol=rtol, atol=atol)
    if not sol.success:
        raise RuntimeError(sol.message)
    return float(np.max(np.abs(sol.y[0])))


def main() -> None:
    motions = synthetic_motions()
    structure = building()
    print(f"model: 5 storeys, T_fb = {structure.modal().periods[0]:.3f} s; {RECORDS} motions x "
          f"{DURATION:.0f} s at dt = {DT} s ({motions.shape[1]} steps)")
    for label, bounds in (("lead-rubber", lead_rubber_bounds()), ("friction pendulum", friction_bounds())):
        run_cases(structure, BASE_MASS, bounds, motions, DT)  # warm-up
        wall, cpu, results = _best_of(3, lambda: run_cases(structure, BASE_MASS, bounds, motions, DT))
        peaks = {case: float(r.peaks()["isolator_displacement"].mean()) for case, r in results.items()
                 if r.isolated}
        balance = max(float(r.balance_error.max()) for r in results.values())
        print(f"ensemble {label}: 11 x 3 isolated + 11 fixed: wall {wall:.3f} s, cpu {cpu:.3f} s "
              f"(target <= 1 s); mean peak isolator displacement {peaks}; worst balance error {balance:.1e}")

    # per-case speed against solve_ivp on the smooth Bouc-Wen rigid mass
    mass = BASE_MASS + structure.total_mass
    rigid = ShearBuilding.rigid_block(structure.total_mass)
    plane = lead_rubber_bounds()
    smooth = {case: BoucWen(b) for case, b in plane.items()}
    run_cases(rigid, BASE_MASS, smooth, motions, DT, include_fixed=False)
    wall, cpu, results = _best_of(3, lambda: run_cases(rigid, BASE_MASS, smooth, motions, DT,
                                                       include_fixed=False))
    per_case = wall / (RECORDS * len(smooth))
    compared = 2
    started = time.perf_counter()
    reference = [bouc_wen_reference(smooth["nominal"], mass, motions[r], DT) for r in range(compared)]
    reference_time = (time.perf_counter() - started) / compared
    ours = results["nominal"].peaks()["isolator_displacement"][:compared]
    difference = np.max(np.abs(ours / np.array(reference) - 1.0))
    print(f"Bouc-Wen SDOF: engine {wall:.3f} s for {RECORDS * len(smooth)} cases -> {per_case * 1e3:.2f} ms "
          f"per case; solve_ivp LSODA {reference_time:.3f} s per case; ratio {reference_time / per_case:.0f}x "
          f"(target >= 200x); peak displacement difference {difference * 100:.3f} % (must be < 1 %)")

    tracemalloc.start()
    run_cases(structure, BASE_MASS, friction_bounds(), motions, DT)
    _, traced = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    print(f"memory: traced peak of one ensemble call {traced / 2**20:.0f} MiB; process peak RSS "
          f"{rss:.0f} MiB (target <= 1024 MiB)")


if __name__ == "__main__":
    main()
