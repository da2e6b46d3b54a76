"""Yielding storeys, P-delta, sub-stepping and the compiled kernel (issues 10 and 14).

Sources
-------
- Elastoplastic system under a suddenly applied constant force F0 (rectangular
  pulse of long duration), undamped: the peak follows from the work-energy
  balance F0 u_m = area under the backbone up to u_m; without hardening
  mu = u_m/u_y = 1/(2 (1 - F0/f_y)) for 0.5 <= F0/f_y < 1 (Biggs, Introduction
  to Structural Dynamics, 1964, chart for elastoplastic systems under a
  rectangular load, from memory; the energy balance itself is derived).
- Energy dissipated per cycle by an elastic-perfectly-plastic system cycled
  between +-u_m: 4 f_y (u_m - u_y) (Chopra, Dynamics of Structures, chapter on
  earthquake response of inelastic systems: area of the hysteresis loop).
- P-delta: storey geometric stiffness k_g = -P/h (Chopra, Dynamics of
  Structures, P-delta effects); the static push of a storey with backbone
  f_y + alpha k (d - d_y) then needs V = f_y + alpha k (d - d_y) - (P/h) d.
- Clough & Johnston (1966): after yielding, unloading is elastic (stiffness k)
  to zero force, then reloading aims at the point of largest earlier
  excursion in that direction (the yield point if none) - the rule set of
  the degrading law, from memory.
- Equal-displacement trend (Veletsos & Newmark 1960, from memory): for
  periods well beyond the spectral plateau, the peak displacement of an
  elastoplastic system is close to that of the elastic one of the same
  period; for short periods it is larger. The band used is common practice.
"""

import math
import os
from pathlib import Path

import numpy as np
import pytest
import scipy.signal

from isolation import GRAVITY
from isolation.bearings import Bilinear, FrictionPendulum
from isolation.dynamics.history import run, run_cases
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding


def one_storey(period, mass=500.0, height=3.0, **kw):
    k = mass * (2 * math.pi / period) ** 2
    return ShearBuilding([mass], [k], [height], **kw)


def noise(records=4, seconds=12.0, dt=0.01, pga=0.4, seed=3, low=0.2):
    """Seeded band-limited noise (low-10 Hz) under a rise-decay envelope (synthetic, invented). [g]"""
    steps = int(seconds / dt) + 1
    t = np.arange(steps) * dt
    sos = scipy.signal.butter(4, [low, 10.0], "bandpass", fs=1 / dt, output="sos")
    x = scipy.signal.sosfiltfilt(sos, np.random.default_rng(seed).standard_normal((records, steps)), axis=-1)
    x *= np.clip(t / 2.0, 0, 1) * np.exp(-np.clip(t - 8.0, 0, None) / 2.0)
    return pga * x / np.abs(x).max(axis=1, keepdims=True)


# --- storey laws -------------------------------------------------------------------------------

@pytest.mark.parametrize("hysteresis", ["bilinear", "clough"])
@pytest.mark.parametrize("ratio", [0.6, 0.75, 0.9])
def test_suddenly_applied_force_gives_the_energy_balance_ductility(hysteresis, ratio):
    # Biggs 1964 / work-energy balance (module notes): mu = 1/(2 (1 - F0/f_y)); the first excursion
    # runs on the backbone, the same for both laws.
    period, fy = 0.5, 1000.0
    b = one_storey(period, damping=0.0, yield_shears=[fy], hysteresis=hysteresis)
    dt = period / 500
    a0 = ratio * fy / b.masses[0] / GRAVITY  # F0 = m a0 [kN]
    result = run(b, np.full(int(4 * period / dt), a0), dt)
    assert result.ductility[0, 0] == pytest.approx(1.0 / (2.0 * (1.0 - ratio)), rel=5e-3)


def test_suddenly_applied_force_with_hardening_matches_the_energy_balance():
    # Derived from the same balance with backbone f_y + alpha k (u - u_y):
    # F0 u_m = f_y u_y/2 + f_y (u_m - u_y) + alpha k (u_m - u_y)^2/2, solved for u_m.
    period, fy, alpha, ratio = 0.5, 1000.0, 0.1, 0.9
    b = one_storey(period, damping=0.0, yield_shears=[fy], hardening=alpha)
    k = b.stiffnesses[0]
    uy, f0 = fy / k, ratio * fy
    # alpha k x^2/2 + (f_y - F0) x + (f_y u_y/2 - F0 u_y) = 0 with x = u_m - u_y
    qa, qb, qc = alpha * k / 2, fy - f0, fy * uy / 2 - f0 * uy
    x = (-qb + math.sqrt(qb * qb - 4 * qa * qc)) / (2 * qa)
    dt = period / 500
    result = run(b, np.full(int(4 * period / dt), f0 / b.masses[0] / GRAVITY), dt)
    assert np.abs(result.drift[0, :, 0]).max() == pytest.approx(uy + x, rel=5e-3)


def test_elastoplastic_loop_area_is_four_fy_times_plastic_excursion():
    # Chopra, hysteresis loop of an elastic-perfectly-plastic system: 4 f_y (u_m - u_y) per cycle.
    b = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0])
    uy, um = 0.005, 0.02
    drift = um * np.sin(np.linspace(0, 2 * math.pi * 3, 6001))
    force = b.storey_loop(drift)
    last = slice(4000, 6001)  # the third cycle
    area = -np.trapezoid(force[last], drift[last]) if hasattr(np, "trapezoid") else -np.trapz(force[last], drift[last])
    assert abs(area) == pytest.approx(4 * 50.0 * (um - uy), rel=1e-3)


def test_clough_reloads_towards_the_opposite_yield_point_then_the_earlier_peak():
    # Clough & Johnston 1966 rules (module notes), checked at points derived by hand:
    # k = 1e4, f_y = 50 (u_y = 5 mm), no hardening. Push to 10 mm (force 50), unload: zero force at
    # 10 - 5 = 5 mm; reloading aims at (-5 mm, -50), so at 0 mm the force is -50 (5/10) = -25.
    b = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0], hysteresis="clough")
    path = np.concatenate([np.linspace(0, 0.010, 101), np.linspace(0.010, 0.0, 101)[1:],
                           np.linspace(0.0, -0.005, 51)[1:], np.linspace(-0.005, 0.010, 151)[1:]])
    force = b.storey_loop(path)
    at_zero = 200  # drift back at 0 after the push
    assert force[100] == pytest.approx(50.0)
    assert force[at_zero] == pytest.approx(-25.0, rel=1e-9)
    assert force[250] == pytest.approx(-50.0, rel=1e-9)  # reached the negative yield point
    # from (-5 mm, -50): elastic unloading to zero force at 0 mm, then the line to the earlier peak
    # (10 mm, 50) from (0, 0): at 5 mm the force is 25 (a bilinear law would be at 50 already).
    at_five = 250 + 100
    assert path[at_five] == pytest.approx(0.005)
    assert force[at_five] == pytest.approx(25.0, rel=1e-9)
    bilinear = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0]).storey_loop(path)
    assert bilinear[at_five] == pytest.approx(50.0)


# --- P-delta -----------------------------------------------------------------------------------

@pytest.mark.parametrize("p_delta", [False, True])
def test_quasi_static_push_matches_the_p_delta_closed_form(p_delta):
    # Chopra, P-delta: a slow, smooth push by a ground acceleration -A (inertia force m A held at
    # the end) must settle where f_y + alpha k (d - d_y) - (P/h) d = m A (derived static balance).
    mass, period, height, fy, alpha = 500.0, 1.5, 3.0, 400.0, 0.3
    b = one_storey(period, mass, height, damping=0.05, yield_shears=[fy], hardening=alpha, p_delta=p_delta)
    k = b.stiffnesses[0]
    p_over_h = mass * GRAVITY / height if p_delta else 0.0
    force = 1.5 * fy
    dt, ramp, hold = 0.01, 120.0, 40.0
    t = np.arange(0.0, ramp + hold, dt)
    x = np.clip(t / ramp, 0, 1)
    acc = -(force / mass / GRAVITY) * (3 * x**2 - 2 * x**3)
    result = run(b, acc, dt)
    expected = (force - fy * (1 - alpha)) / (alpha * k - p_over_h)
    assert result.drift[0, -1, 0] == pytest.approx(expected, rel=2e-3)
    # storey-spring shear on the backbone at that drift (P-delta is not in the spring force)
    assert result.base_shear[0, -1] == pytest.approx(fy + alpha * k * (expected - fy / k), rel=2e-3)


def test_p_delta_notes_name_storeys_with_negative_post_yield_stiffness():
    # theta = P/(k h) against alpha (Chopra, P-delta): theta > alpha makes the post-yield tangent negative.
    b = one_storey(2.0, 500.0, 3.0, yield_shears=[300.0], hardening=0.02, p_delta=True)
    theta = b.stability_coefficients()[0]
    assert theta == pytest.approx(500.0 * GRAVITY / (b.stiffnesses[0] * 3.0))
    assert theta > 0.02
    notes = b.p_delta_notes()
    assert len(notes) == 1 and "storey 1" in notes[0] and "negative post-yield" in notes[0]
    assert one_storey(2.0, 500.0, 3.0, yield_shears=[300.0], hardening=0.02).p_delta_notes() == []
    result = run(b, noise(records=1, pga=0.5), 0.01)
    assert any("storey 1" in note for note in result.notes)


# --- dynamic behaviour, energy, outputs --------------------------------------------------------

def test_equal_displacement_trend_at_long_periods_and_larger_at_short_periods():
    # Veletsos & Newmark 1960 (module notes): strength R = 4 times below the elastic demand.
    acc = noise(records=6, seconds=20.0, pga=0.3, seed=11)
    dt = 0.01
    ratios = {}
    for period in (0.2, 3.0):
        elastic = run(one_storey(period), acc, dt)
        peak_force = np.max(np.abs(elastic.base_shear), axis=1)
        values = []
        for r in range(acc.shape[0]):
            inelastic = run(one_storey(period, yield_shears=[peak_force[r] / 4.0]), acc[r], dt)
            values.append(np.abs(inelastic.drift).max() / np.abs(elastic.drift[r]).max())
        ratios[period] = float(np.mean(values))
    # long period: mean ratio near 1 (band 0.7-1.4, common practice for a small suite)
    assert 0.7 <= ratios[3.0] <= 1.4
    # short period: clearly larger (equal energy would give mu/R = (R^2 + 1)/(2R) = 2.1)
    assert ratios[0.2] > 1.3 * ratios[3.0]


@pytest.mark.parametrize("hysteresis", ["bilinear", "clough"])
def test_energy_balance_closes_with_yielding_storeys_and_p_delta(hysteresis):
    # Uang & Bertero 1990 balance, every component from the kernel: residual < 1 % (issue 10).
    b = ShearBuilding.from_period(0.6, [500.0] * 4, [3.5] * 4, profile="linear",
                                  yield_shears=[1800.0, 1500.0, 1100.0, 600.0], hardening=0.05,
                                  p_delta=True, hysteresis=hysteresis)
    acc = noise(records=3, pga=0.6)
    isolators = {"lrb": Bilinear(3e4, 3e3, 250.0), "fp": FrictionPendulum(2.5, 0.05)}
    results = run_cases(b, 600.0, isolators, acc, 0.01)
    fixed = results["fixed"]
    assert fixed.ductility.max() > 2.0  # the fixed base yields well
    assert fixed.energy["hysteretic"][:, -1].min() > 0.0
    for result in results.values():
        assert result.balance_error.max() < 0.01
        assert result.ductility.shape == (3, 4) and result.residual_drift.shape == (3, 4)
        assert result.shear_strength_ratio.shape == (3, 4)
    # yielding caps the storey-spring shear near strength (hardening 5 %: ratio <= 1 + alpha (mu - 1))
    ratio = fixed.shear_strength_ratio
    assert np.all(ratio <= 1.0 + 0.05 * (fixed.ductility - 1.0).clip(0) + 1e-9)


def test_isolated_superstructure_may_yield_and_stays_below_the_fixed_base_demand():
    # Trend only (no outside value): an isolator of T_d ~ 3 s and Q ~ 4 % W keeps a weak frame
    # (strength ~ 0.15 W) far less ductile than the same frame on a fixed base.
    b = ShearBuilding.from_period(0.5, [500.0] * 3, [3.5] * 3, yield_shears=[2200.0, 1600.0, 900.0],
                                  hardening=0.1, p_delta=True)
    acc = noise(records=3, pga=0.6, low=0.5)  # no strong content near the isolated period
    results = run_cases(b, 600.0, {"weak": Bilinear(1.5e5, 8e3, 800.0)}, acc, 0.01)
    assert np.all(np.isfinite(results["weak"].ductility))
    assert np.all(results["weak"].ductility.max(axis=1) < results["fixed"].ductility.max(axis=1))


def test_elastic_results_report_nan_ductility_and_residual_from_the_last_sample():
    b = ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0])
    result = run(b, noise(records=2), 0.01)
    assert np.all(np.isnan(result.ductility)) and result.ductility.shape == (2, 2)
    np.testing.assert_allclose(result.residual_drift, np.abs(result.drift[:, -1, :]) / 3.0)
    assert "ductility" not in result.peaks()
    assert result.roof_acceleration.shape == result.ground_acceleration.shape
    assert result.floor_velocity.shape == result.floor_displacement.shape


def test_velocities_are_consistent_with_displacements():
    # Newmark average acceleration: u_{n+1} - u_n = dt (v_n + v_{n+1})/2 (Newmark 1959), at each sample.
    b = ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0], yield_shears=[500.0, 300.0])
    dt = 0.005
    iso = run(IsolatedBuilding(b, 300.0, Bilinear(2e4, 2e3, 60.0)), noise(records=1, dt=dt), dt)
    u, v = iso.isolator_displacement[0], iso.isolator_velocity[0]
    np.testing.assert_allclose(np.diff(u), dt * 0.5 * (v[1:] + v[:-1]), atol=1e-12)


def test_sub_stepping_is_used_for_a_stiff_fixed_base_and_converges():
    # A 0.05 s storey at dt = 0.01 s (T_min/5): sub-stepped; halving dt changes peaks by < 1 %.
    b = one_storey(0.05, yield_shears=[2000.0])
    acc = noise(records=1, dt=0.01)
    coarse = run(b, acc, 0.01)
    assert coarse.model["substeps"] == 2
    fine_acc = np.interp(np.arange(0, acc.shape[1] * 2 - 1) * 0.005, np.arange(acc.shape[1]) * 0.01, acc[0])
    fine = run(b, fine_acc, 0.005)
    assert fine.model["substeps"] == 1
    assert np.abs(coarse.drift).max() == pytest.approx(np.abs(fine.drift).max(), rel=0.01)


# --- friction laws ------------------------------------------------------------------------------

def test_sharp_friction_pendulum_decays_by_two_mu_r_per_half_cycle():
    # Coulomb friction on a pendulum: 2 mu R per half cycle, T = 2 pi sqrt(R/g) (Chopra, free
    # vibration with Coulomb damping); the sharp law has no rounding, so a tighter tolerance holds.
    radius, mu = 2.0, 0.03
    slider = FrictionPendulum(radius, mu, yield_displacement=1e-4)
    dt = 0.002
    t = np.arange(0.0, 14.0, dt)
    acc = np.where(t < 0.6, 0.4 * np.sin(math.pi * t / 0.6), 0.0)  # the half-sine pulse of test_history
    u = run(IsolatedBuilding(ShearBuilding.rigid_block(900.0), 100.0, slider), acc, dt,
            friction_law="sharp").isolator_displacement[0]
    d = np.diff(np.where(t > 0.6, u, 0.0))
    turn = np.nonzero(np.sign(d[1:]) * np.sign(d[:-1]) < 0)[0] + 1
    turn = turn[t[turn] > 0.7]
    amplitudes = np.abs(u[turn])
    moving = amplitudes > 3 * mu * radius
    steps = -np.diff(amplitudes[moving])
    assert steps.size >= 3
    np.testing.assert_allclose(steps, 2 * mu * radius, atol=2e-4)


def test_sharp_and_smooth_friction_agree_on_peak_displacement():
    # Same bearing, two regularisations: peaks within 2 % (D_y = 0.5 mm against 0.1-0.3 m; common practice).
    b = ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0])
    acc = noise(records=3, pga=0.5)
    slider = {"fp": FrictionPendulum(2.5, 0.06, friction_slow=0.03)}
    smooth = run_cases(b, 300.0, slider, acc, 0.01, include_fixed=False)["fp"]
    sharp = run_cases(b, 300.0, slider, acc, 0.01, include_fixed=False, friction_law="sharp")["fp"]
    np.testing.assert_allclose(sharp.peaks()["isolator_displacement"], smooth.peaks()["isolator_displacement"],
                               rtol=0.02)
    assert "sharp" in sharp.model["regularisation"] and "Bouc-Wen" in smooth.model["regularisation"]
    assert sharp.balance_error.max() < 0.01


# --- the compiled kernel and its fallback (issue 14) ---------------------------------------------

def test_compiled_and_interpreted_kernels_give_the_same_histories():
    pytest.importorskip("numba")
    b = ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0], yield_shears=[900.0, 600.0], hardening=0.05,
                      p_delta=True, hysteresis="clough")
    acc = noise(records=2, seconds=4.0)
    isolators = {"lrb": Bilinear(2e4, 2e3, 60.0), "fp": FrictionPendulum(2.0, 0.05, friction_slow=0.03),
                 "multi": Bilinear(1e5, 1e4, 100.0).parallel(Bilinear(3e4, 1e4, 300.0))}
    compiled = run_cases(b, 300.0, isolators, acc, 0.01, compiled=True)
    interpreted = run_cases(b, 300.0, isolators, acc, 0.01, compiled=False)
    for case in compiled:
        for name in ("floor_displacement", "floor_acceleration", "storey_shear", "reaction", "drift"):
            x, y = getattr(compiled[case], name), getattr(interpreted[case], name)
            # same arithmetic in the same order (no fast-math): identical up to libm round-off
            np.testing.assert_allclose(x, y, rtol=1e-12, atol=1e-12 * np.abs(y).max())
        for key in compiled[case].energy:
            np.testing.assert_allclose(compiled[case].energy[key], interpreted[case].energy[key],
                                       rtol=1e-12, atol=1e-12 * np.abs(interpreted[case].energy["input"]).max())


def test_compiled_loop_calls_the_compiled_laws_and_stamps_them():
    # numba's on-disk cache checks only the source file of each cached function (numba documentation,
    # "Cache invalidation", from memory); the compiled loop has the laws of kernel_laws.py compiled into it,
    # so a stamp of that file beside the cache tells whether a cached loop was built with the current laws.
    pytest.importorskip("numba")
    import hashlib

    from isolation.dynamics import kernel_laws, newmark

    module = newmark.kernel_module(True)
    assert module.storey_force is module.kernel_laws.storey_force and hasattr(module.storey_force, "py_func")
    assert module.solve_base is module.kernel_laws.solve_base and hasattr(module.solve_base, "py_func")
    marker = Path(module.run_columns._cache._cache_path) / "kernel_laws.sha256"
    if marker.parent.is_dir() and os.access(marker.parent, os.W_OK):
        expected = hashlib.sha256(Path(kernel_laws.__file__).read_bytes()).hexdigest()
        assert marker.read_text(encoding="ascii").strip() == expected


# --- bad input ------------------------------------------------------------------------------------

@pytest.mark.parametrize("kwargs, field", [
    (dict(yield_shears=[100.0]), "yield_shears"),
    (dict(yield_shears=[100.0, -1.0]), r"yield_shears\[1\]"),
    (dict(yield_shears=[100.0, 100.0], hardening=1.0), "hardening"),
    (dict(yield_shears=[100.0, 100.0], hysteresis="takeda"), "hysteresis"),
    (dict(p_delta="yes"), "p_delta"),
])
def test_bad_yielding_input_names_the_field(kwargs, field):
    with pytest.raises(ValueError, match=field):
        ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0], **kwargs)
    with pytest.raises(ValueError, match="rigid"):
        ShearBuilding([400.0], None, [3.0], yield_shears=[10.0], rigid=True)
    with pytest.raises(ValueError, match="friction_law"):
        run_cases(ShearBuilding([400.0], [1e5], [3.0]), 100.0, {}, np.zeros(10), 0.01, friction_law="soft")


# --- a general-purpose finite-element framework on the same yielding model ------------------------

def _opensees():
    try:
        import openseespy.opensees as ops
    except (ImportError, RuntimeError) as error:  # RuntimeError: the binary misses a system library
        pytest.skip(f"openseespy unavailable: {error}")
    return ops


def test_yielding_fixed_base_frame_matches_opensees():
    # OpenSees (openseespy): zeroLength storeys with Steel01 (bilinear kinematic hardening, the same
    # backbone and Masing unloading as our "bilinear" law), modal damping of 5 % in every mode from
    # the initial stiffness, Newmark average acceleration with full Newton. Same model, same record.
    ops = _opensees()
    b = ShearBuilding.from_period(0.5, [600.0] * 5, [3.5] * 5, yield_shears=[4000.0, 3500.0, 2900.0, 2100.0, 1200.0],
                                  hardening=0.05)
    dt = 0.005  # T_min = 0.074 s: no sub-steps, so both integrate the same steps
    acc = noise(records=1, seconds=10.0, dt=dt, pga=0.5)[0]
    ops.wipe()
    ops.model("basic", "-ndm", 1, "-ndf", 1)
    ops.node(0, 0.0)
    ops.fix(0, 1)
    for i, mass in enumerate(b.masses, start=1):
        ops.node(i, 0.0)
        ops.mass(i, mass)
        ops.uniaxialMaterial("Steel01", i, b.yield_shears[i - 1], b.stiffnesses[i - 1], b.hardening)
        ops.element("zeroLength", i, i - 1, i, "-mat", i, "-dir", 1)
    ops.eigen("-fullGenLapack", b.storeys)
    ops.modalDamping(b.damping)
    ops.timeSeries("Path", 1, "-dt", dt, "-values", *(acc * GRAVITY).tolist())
    ops.pattern("UniformExcitation", 1, 1, "-accel", 1)
    ops.constraints("Plain")
    ops.numberer("Plain")
    ops.system("FullGeneral")
    ops.test("NormDispIncr", 1e-12, 100)
    ops.algorithm("Newton")
    ops.integrator("Newmark", 0.5, 0.25)
    ops.analysis("Transient")
    reference = np.zeros((acc.size, b.storeys))
    for n in range(1, acc.size):
        assert ops.analyze(1, dt) == 0
        reference[n] = [ops.nodeDisp(i, 1) for i in range(1, b.storeys + 1)]
    ops.wipe()
    ours = run(b, acc, dt)
    assert ours.model["substeps"] == 1
    assert ours.ductility.max() > 2.0  # the comparison covers yielding
    # agreement to 1e-5 of the peak (observed a few 1e-6: Newton and eigen-solver round-off)
    np.testing.assert_allclose(ours.floor_displacement[0], reference, atol=1e-5 * np.abs(reference).max())


def test_yielding_result_round_trips_through_npz_and_json(tmp_path):
    import json

    from isolation.dynamics.history import HistoryResult

    b = ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0], yield_shears=[500.0, 300.0], p_delta=True)
    result = run(b, noise(records=2), 0.01)
    back = HistoryResult.load_npz(result.save_npz(tmp_path / "fixed.npz"))
    np.testing.assert_array_equal(back.ductility, result.ductility)
    np.testing.assert_array_equal(back.reaction, result.reaction)
    assert back.notes == result.notes
    summary = json.loads(json.dumps(result.to_dict()))
    assert summary["statistics"]["ductility"]["max"] == pytest.approx(result.ductility.max(axis=0).tolist())


def test_storey_non_convergence_names_the_storeys(monkeypatch):
    # One fixed-point pass cannot confirm convergence once a storey yields: must fail loudly.
    import isolation.dynamics.newmark as newmark
    from isolation.errors import RunError

    monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
    b = ShearBuilding([400.0, 400.0], [2e5, 2e5], [3.0, 3.0], yield_shears=[200.0, 100.0])
    with pytest.raises(RunError, match=r"yielding storeys: no convergence at t = .* case 'fixed', record 0"):
        run(b, noise(records=1), 0.01)
