"""Benchmark of the response-history engine (issue 4, 10 and 14 speed targets).

1. Ensemble: a 5-storey shear building (invented) on lead-rubber bearings and,
   separately, on friction pendulums; 11 synthetic motions x 3 property bounds
   isolated plus the 11 fixed-base runs, 40 s at dt = 0.005 s (8001 steps), in
   one ``run_cases`` call. Targets (CPU time, one core, warm): <= 0.2 s with
   elastic storeys, friction pendulum <= 1.5 x lead-rubber; <= 1 s with 5
   yielding storeys (bilinear and Clough, P-delta on).
2. Compiled kernel against the interpreted fallback (the same code without
   numba) on the same columns: identical peaks, speed ratio printed.
3. Per-case speed against scipy.integrate.solve_ivp (LSODA, rtol 1e-9,
   atol 1e-12) on the same smooth Bouc-Wen single-degree-of-freedom problem,
   at equal accuracy (peak isolator displacement within 1 %). Target: >= 200x.
4. When openseespy imports (``pip install openseespy``; on Debian it needs
   ``libblas3``): the yielding fixed-base building (Steel01 storeys = bilinear
   kinematic hardening, modal damping) in OpenSees on the same records; prints
   the per-analysis time ratio (aim >= 50x) and the largest roof-displacement
   difference. OpenSees is driven step by step from Python; one
   ``analyze(steps)`` call with a recorder measured the same time here.
5. Peak memory of the process (ru_maxrss) and the traced peak of one ensemble
   call (tracemalloc). Target: <= 1 GB.

Run: ``python -m benchmarks history`` or ``python benchmarks/bench_history.py``.
The motions are seeded band-limited noise under a smooth envelope, made
here: synthetic, not recorded earthquakes. Times are CPU seconds of this
process (``time.process_time``, BLAS limited to one thread), best of 3.
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
from isolation.dynamics.history import BoucWen, run, run_cases  # noqa: E402
from isolation.dynamics.structure import ShearBuilding  # noqa: E402

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


def yielding_building(hysteresis="bilinear"):
    """The same frame with storey strengths ~ 0.1-0.2 of the weight above (invented), 5 % hardening, P-delta."""
    return building().with_strengths([6000.0, 5200.0, 4300.0, 3200.0, 1800.0], hardening=0.05, p_delta=True,
                                     hysteresis=hysteresis)


def opensees_roof(structure, acceleration, dt):
    """Roof displacement history of the yielding fixed-base frame in OpenSees (openseespy). [m]"""
    import openseespy.opensees as ops

    ops.wipe()
    ops.model("basic", "-ndm", 1, "-ndf", 1)
    ops.node(0, 0.0)
    ops.fix(0, 1)
    for i, mass in enumerate(structure.masses, start=1):
        ops.node(i, 0.0)
        ops.mass(i, mass)
        ops.uniaxialMaterial("Steel01", i, structure.yield_shears[i - 1], structure.stiffnesses[i - 1],
                             structure.hardening)
        ops.element("zeroLength", i, i - 1, i, "-mat", i, "-dir", 1)
    ops.eigen("-fullGenLapack", structure.storeys)
    ops.modalDamping(structure.damping)
    ops.timeSeries("Path", 1, "-dt", dt, "-values", *(acceleration * GRAVITY).tolist())
    ops.pattern("UniformExcitation", 1, 1, "-accel", 1)
    ops.constraints("Plain")
    ops.numberer("Plain")
    ops.system("FullGeneral")
    ops.test("NormDispIncr", 1e-10, 50)
    ops.algorithm("Newton")
    ops.integrator("Newmark", 0.5, 0.25)
    ops.analysis("Transient")
    roof = np.zeros(acceleration.size)
    for n in range(1, acceleration.size):
        if ops.analyze(1, dt) != 0:
            raise RuntimeError(f"OpenSees failed at step {n}")
        roof[n] = ops.nodeDisp(structure.storeys, 1)
    ops.wipe()
    return roof


def main() -> None:
    from isolation.dynamics.newmark import compiled_available

    motions = synthetic_motions()
    structure = building()
    print(f"model: 5 storeys, T_fb = {structure.modal().periods[0]:.3f} s; {RECORDS} motions x "
          f"{DURATION:.0f} s at dt = {DT} s ({motions.shape[1]} steps); numba compiled kernel: "
          f"{compiled_available()}")
    cpu_by_label = {}
    for label, frame, bounds in (("lead-rubber, elastic storeys", structure, lead_rubber_bounds()),
                                 ("friction pendulum, elastic storeys", structure, friction_bounds()),
                                 ("lead-rubber, 5 yielding storeys (bilinear, P-delta)", yielding_building(),
                                  lead_rubber_bounds()),
                                 ("friction pendulum, 5 yielding storeys (Clough, P-delta)",
                                  yielding_building("clough"), friction_bounds())):
        run_cases(frame, BASE_MASS, bounds, motions, DT)  # warm-up (and compilation on first use)
        wall, cpu, results = _best_of(3, lambda frame=frame,
                                      bounds=bounds: run_cases(frame, BASE_MASS, bounds, motions, DT))
        cpu_by_label[label] = cpu
        peaks = {case: round(float(r.peaks()["isolator_displacement"].mean()), 4) for case, r in results.items()
                 if r.isolated}
        balance = max(float(r.balance_error.max()) for r in results.values())
        target = 0.2 if "elastic" in label else 1.0
        extra = ""
        if results["fixed"].yielding:
            extra = (f"; fixed-base mean peak ductility {float(results['fixed'].ductility.max(axis=1).mean()):.2f}, "
                     f"isolated (upper) {float(results['upper'].ductility.max(axis=1).mean()):.2f}")
        print(f"ensemble {label}: 11 x 3 isolated + 11 fixed: cpu {cpu:.3f} s (target <= {target:g} s), wall "
              f"{wall:.3f} s; mean peak isolator displacement {peaks}; worst balance error {balance:.1e}{extra}")
    ratio = cpu_by_label["friction pendulum, elastic storeys"] / cpu_by_label["lead-rubber, elastic storeys"]
    print(f"friction pendulum / lead-rubber cost: {ratio:.2f} (target <= 1.5)")

    # compiled against interpreted kernel, same columns
    few = motions[:1]
    frame = yielding_building()
    interpreted_cpu, interpreted = _best_of(1, lambda: run_cases(frame, BASE_MASS, {"nominal": lead_rubber_bounds()[
        "nominal"]}, few, DT, compiled=False))[1:]
    compiled_cpu, compiled = _best_of(3, lambda: run_cases(frame, BASE_MASS, {"nominal": lead_rubber_bounds()[
        "nominal"]}, few, DT, compiled=None))[1:]
    same = all(np.array_equal(compiled[c].floor_displacement, interpreted[c].floor_displacement) for c in compiled)
    print(f"kernel: interpreted {interpreted_cpu:.2f} s, compiled {compiled_cpu:.4f} s for 1 record x (fixed + "
          f"isolated); ratio {interpreted_cpu / compiled_cpu:.0f}x; identical histories: {same}")

    # per-case speed against solve_ivp on the smooth Bouc-Wen rigid mass
    mass = BASE_MASS + structure.total_mass
    rigid = ShearBuilding.rigid_block(structure.total_mass)
    plane = lead_rubber_bounds()
    smooth = {case: BoucWen(b) for case, b in plane.items()}
    run_cases(rigid, BASE_MASS, smooth, motions, DT, include_fixed=False)
    wall, cpu, results = _best_of(3, lambda: run_cases(rigid, BASE_MASS, smooth, motions, DT,
                                                       include_fixed=False))
    per_case = cpu / (RECORDS * len(smooth))
    compared = 2
    started = time.process_time()
    reference = [bouc_wen_reference(smooth["nominal"], mass, motions[r], DT) for r in range(compared)]
    reference_time = (time.process_time() - started) / compared
    ours = results["nominal"].peaks()["isolator_displacement"][:compared]
    difference = np.max(np.abs(ours / np.array(reference) - 1.0))
    print(f"Bouc-Wen SDOF: engine {cpu:.3f} s for {RECORDS * len(smooth)} cases -> {per_case * 1e3:.2f} ms "
          f"per case; solve_ivp LSODA {reference_time:.3f} s per case; ratio {reference_time / per_case:.0f}x "
          f"(target >= 200x); peak displacement difference {difference * 100:.3f} % (must be < 1 %)")

    # general-purpose finite-element framework on the same yielding model, same records
    try:
        import openseespy.opensees  # noqa: F401
    except (ImportError, RuntimeError) as error:
        print(f"OpenSees comparison skipped: openseespy does not import here ({' '.join(str(error).split())})")
    else:
        plain = building().with_strengths(yielding_building().yield_shears, hardening=0.05)  # no P-delta
        count = 2
        started = time.process_time()
        roofs = [opensees_roof(plain, motions[r], DT) for r in range(count)]
        per_ops = (time.process_time() - started) / count
        run(plain, motions[:count], DT)
        _, ours_cpu, ours = _best_of(3, lambda: run(plain, motions[:count], DT))
        per_ours = ours_cpu / count
        difference = max(float(np.abs(ours.floor_displacement[r, :, -1] - roofs[r]).max()) for r in range(count))
        print(f"OpenSees (openseespy, Steel01 storeys, modal damping, Newmark + Newton): {per_ops:.3f} s per "
              f"analysis; engine {per_ours * 1e3:.2f} ms per analysis; ratio {per_ops / per_ours:.0f}x "
              f"(aim >= 50x); largest roof-displacement difference {difference:.2e} m")

    tracemalloc.start()
    run_cases(yielding_building(), BASE_MASS, friction_bounds(), motions, DT)
    _, traced = tracemalloc.get_traced_memory()
    tracemalloc.stop()
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    print(f"memory: traced peak of one ensemble call {traced / 2**20:.0f} MiB; process peak RSS "
          f"{rss:.0f} MiB (target <= 1024 MiB)")


if __name__ == "__main__":
    main()
