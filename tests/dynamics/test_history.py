"""Response-history engine against closed-form dynamics.

Sources
-------
- Linear SDOF under a_g = a0 sin(W t): steady-state amplitude
  (a0/w^2)/sqrt((1 - r^2)^2 + (2 zeta r)^2), r = W/w (Chopra, Dynamics of
  Structures, harmonic excitation).
- Step response of a damped SDOF to a_g = a0 for t >= 0 from rest:
  u = -(a0/w^2) (1 - e^(-zeta w t) (cos w_D t + zeta/sqrt(1 - zeta^2) sin w_D t))
  (Chopra, step force).
- Coulomb friction with a linear spring, free vibration: the amplitude falls
  by 2 mu g/w^2 every half cycle (4 mu g/w^2 per cycle) and the period is
  unchanged (Chopra, free vibration with Coulomb damping); a friction
  pendulum: 2 mu R per half cycle, period 2 pi sqrt(R/g)
  (the Coulomb result with the pendulum stiffness W/R, derived).
- Newmark average acceleration: period elongation ~ (pi^2/3)(dt/T)^2
  (Chopra, table of numerical errors) bounds the tolerances used.
"""

import math

import numpy as np
import pytest

from isolation import GRAVITY
from isolation.bearings import Bilinear, FrictionPendulum
from isolation.dynamics.history import run
from isolation.dynamics.structure import IsolatedBuilding, ShearBuilding


def linear_isolator(stiffness):
    """A Bilinear with zero strength is a linear spring of its elastic stiffness."""
    return Bilinear(stiffness, 0.5 * stiffness, 0.0)


def extrema(u):
    """Values of the local extrema of a sampled history (sign changes of the slope)."""
    d = np.diff(u)
    turn = np.nonzero(np.sign(d[1:]) * np.sign(d[:-1]) < 0)[0] + 1
    return turn, u[turn]


@pytest.mark.parametrize("ratio", [0.6, 1.0, 1.4])
def test_isolated_mass_harmonic_steady_state_amplitude(ratio):
    # Chopra, harmonic excitation: rigid mass on a linear isolator and a linear damper.
    mass, period, zeta = 1000.0, 2.0, 0.10
    w = 2 * math.pi / period
    k = mass * w * w
    building = IsolatedBuilding(ShearBuilding.rigid_block(900.0), 100.0, linear_isolator(k),
                                supplemental_damping=2 * zeta * w * mass)
    dt, a0 = 0.01, 0.1
    t = np.arange(0.0, 80.0, dt)
    big_w = ratio * w
    result = run(building, a0 * np.sin(big_w * t), dt)
    u = result.isolator_displacement[0]
    tail = u[t > 60.0]
    expected = (a0 * GRAVITY / w**2) / math.sqrt((1 - ratio**2) ** 2 + (2 * zeta * ratio) ** 2)
    # Newmark period error (pi^2/3)(dt/T)^2 ~ 1e-4 shifts the resonance by that much.
    assert np.max(np.abs(tail)) == pytest.approx(expected, rel=2e-3)


def test_fixed_base_one_storey_harmonic_steady_state_amplitude():
    # Chopra, harmonic excitation, through the fixed-base path with 5 % modal damping.
    m, period = 500.0, 0.4
    w = 2 * math.pi / period
    b = ShearBuilding([m], [m * w * w], [3.0], damping=0.05)
    dt, a0, ratio = 0.002, 0.2, 0.8
    t = np.arange(0.0, 20.0, dt)
    result = run(b, a0 * np.sin(ratio * w * t), dt)
    tail = result.floor_displacement[0, t > 14.0, 0]
    expected = (a0 * GRAVITY / w**2) / math.sqrt((1 - ratio**2) ** 2 + (2 * 0.05 * ratio) ** 2)
    assert np.max(np.abs(tail)) == pytest.approx(expected, rel=2e-3)
    assert result.isolator_displacement is None


def test_step_response_matches_closed_form():
    # Chopra, step excitation of a damped SDOF from rest.
    m, period, zeta = 300.0, 0.5, 0.05
    w = 2 * math.pi / period
    b = ShearBuilding([m], [m * w * w], [3.0], damping=zeta)
    dt, a0 = period / 400, 0.3
    t = np.arange(0.0, 3 * period, dt)
    result = run(b, np.full(t.size, a0), dt)
    wd = w * math.sqrt(1 - zeta**2)
    static = a0 * GRAVITY / w**2
    exact = -static * (1 - np.exp(-zeta * w * t) * (np.cos(wd * t) + zeta / math.sqrt(1 - zeta**2)
                                                     * np.sin(wd * t)))
    # phase error after 3 periods ~ 2 pi 3 (pi^2/3)(1/400)^2 ~ 4e-4 rad of the amplitude
    np.testing.assert_allclose(result.floor_displacement[0, :, 0], exact, atol=2e-3 * static)


def _pulse(duration, dt, amplitude=0.4, width=0.6):
    t = np.arange(0.0, duration, dt)
    return t, np.where(t < width, amplitude * np.sin(math.pi * t / width), 0.0)


def test_coulomb_friction_with_spring_decays_linearly():
    # Chopra, Coulomb damping: 2 mu g / w^2 per half cycle, period 2 pi / w.
    mass, period, mu = 1000.0, 2.0, 0.04
    w = 2 * math.pi / period
    k = mass * w * w
    q = mu * mass * GRAVITY
    plane = Bilinear(k + q / 1e-6, k, q)  # rigid-plastic friction: D_y = 1 micron
    building = IsolatedBuilding(ShearBuilding.rigid_block(900.0), 100.0, plane)
    dt = 0.002
    t, acc = _pulse(12.0, dt)
    u = run(building, acc, dt).isolator_displacement[0]
    turn, values = extrema(np.where(t > 0.6, u, 0.0))
    turn, values = turn[t[turn] > 0.7], values[t[turn] > 0.7]
    amplitudes = np.abs(values)
    moving = amplitudes > 3 * mu * GRAVITY / w**2
    steps = -np.diff(amplitudes[moving])
    assert steps.size >= 3
    np.testing.assert_allclose(steps, 2 * mu * GRAVITY / w**2, rtol=2e-3)
    half_periods = np.diff(t[turn][moving])
    np.testing.assert_allclose(half_periods, period / 2, atol=2 * dt)


def test_friction_pendulum_free_vibration_decay_and_period():
    # Friction pendulum: 4 mu R per cycle, T = 2 pi sqrt(R/g) (Chopra, Dynamics of Structures, ch. 2,
    # Coulomb friction, with k = W/R, derived).
    radius, mu = 2.0, 0.03
    slider = FrictionPendulum(radius, mu, yield_displacement=1e-4)
    building = IsolatedBuilding(ShearBuilding.rigid_block(900.0), 100.0, slider)
    dt = 0.002
    t, acc = _pulse(14.0, dt)
    u = run(building, acc, dt).isolator_displacement[0]
    turn, values = extrema(np.where(t > 0.6, u, 0.0))
    keep = t[turn] > 0.7
    turn, amplitudes = turn[keep], np.abs(values[keep])
    moving = amplitudes > 3 * mu * radius
    steps = -np.diff(amplitudes[moving])
    assert steps.size >= 3
    # smooth Bouc-Wen sliding with D_y = 0.1 mm: decrement 2 mu R to within a few D_y
    np.testing.assert_allclose(steps, 2 * mu * radius, atol=4e-4)
    period = 2 * math.pi * math.sqrt(radius / GRAVITY)
    np.testing.assert_allclose(np.diff(t[turn][moving]), period / 2, atol=3 * dt)


def test_friction_pendulum_stops_within_static_band():
    # Coulomb motion stops once |u| <= mu R (the restoring force W u/R cannot beat mu W).
    radius, mu = 1.5, 0.08
    building = IsolatedBuilding(ShearBuilding.rigid_block(900.0), 100.0,
                                FrictionPendulum(radius, mu, yield_displacement=1e-4))
    dt = 0.002
    _, acc = _pulse(20.0, dt)
    u = run(building, acc, dt).isolator_displacement[0]
    assert abs(u[-1]) <= mu * radius * 1.01
    assert np.ptp(u[-500:]) < 1e-3


# --- bad input, failures and serialisation (issue 4 rules; no outside values needed) ---------

def small_building():
    return ShearBuilding([400.0, 400.0], [2.0e5, 2.0e5], [3.0, 3.0])


def test_nan_record_is_refused_with_its_index():
    acc = np.zeros((2, 50))
    acc[1, 7] = np.nan
    with pytest.raises(ValueError, match=r"acceleration\[\(1, 7\)\] = .*nan.* is not allowed"):
        run(small_building(), acc, 0.005)


def test_stiff_superstructure_is_sub_stepped_and_matches_the_rigid_body_closed_form():
    # Issue 10: no refusal for stiff models. A one-storey superstructure of 3e8 kN/m on a linear
    # isolator and damper, dt = 0.005 s (T_min ~ 0.01 s, so about 5 sub-steps). As a rigid body
    # the system is one damped oscillator of the total mass; its response to a step a_g = a0 from
    # rest is u = -(a0/w^2)(1 - e^(-zeta w t)(cos w_D t + zeta/sqrt(1 - zeta^2) sin w_D t))
    # (Chopra, Dynamics of Structures, step force).
    top, base, period, zeta = 900.0, 100.0, 2.0, 0.10
    mass = top + base
    w = 2 * math.pi / period
    stiff = ShearBuilding([top], [3e8], [3.0])
    building = IsolatedBuilding(stiff, base, linear_isolator(mass * w * w), supplemental_damping=2 * zeta * w * mass)
    dt, a0 = 0.005, 0.2
    t = np.arange(0.0, 6.0, dt)
    result = run(building, np.full(t.size, a0), dt)
    assert result.model["substeps"] >= 5
    wd = w * math.sqrt(1 - zeta**2)
    exact = -(a0 * GRAVITY / w**2) * (1 - np.exp(-zeta * w * t) * (np.cos(wd * t) + zeta / math.sqrt(1 - zeta**2)
                                                                 * np.sin(wd * t)))
    # Newmark period error (pi^2/3)(dt/T)^2 ~ 2e-5 over three cycles; storey deformation m a/k ~ 1e-5 m.
    np.testing.assert_allclose(result.isolator_displacement[0], exact, atol=2e-4 * np.abs(exact).max())
    np.testing.assert_allclose(result.floor_displacement[0, :, 0], exact, atol=2e-4 * np.abs(exact).max())


@pytest.mark.parametrize("acc, match", [
    (np.zeros((2, 3, 4)), "acceleration has shape"),
    (np.zeros(1), "acceleration has shape"),
    ("abc", "acceleration"),
])
def test_malformed_records_are_refused(acc, match):
    with pytest.raises(ValueError, match=match):
        run(small_building(), acc, 0.005)


def test_run_cases_refuses_reserved_and_unknown_inputs():
    from isolation.dynamics.history import run_cases

    b = small_building()
    acc = np.zeros(100)
    with pytest.raises(ValueError, match="'fixed' is not allowed"):
        run_cases(b, 300.0, {"fixed": Bilinear(1e4, 1e3, 50.0)}, acc, 0.005)
    with pytest.raises(ValueError, match="base_mass = 0.0 is not allowed"):
        run_cases(b, 0.0, {"a": Bilinear(1e4, 1e3, 50.0)}, acc, 0.005)
    with pytest.raises(ValueError, match=r"supplemental_damping\['a'\] = -1.0 is not allowed"):
        run_cases(b, 300.0, {"a": Bilinear(1e4, 1e3, 50.0)}, acc, 0.005, supplemental_damping=-1.0)
    with pytest.raises(ValueError, match="dt = -0.005 is not allowed"):
        run_cases(b, 300.0, {"a": Bilinear(1e4, 1e3, 50.0)}, acc, -0.005)
    with pytest.raises(ValueError, match="building = 3 is not allowed"):
        run(3, acc, 0.005)


def test_convergence_failure_names_time_case_and_record(monkeypatch):
    # A Newton iteration allowed too few iterations must fail loudly, never silently.
    import isolation.dynamics.newmark as newmark
    from isolation.dynamics.history import run_cases
    from isolation.errors import RunError

    monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
    t = np.arange(0.0, 2.0, 0.005)
    acc = 0.5 * np.sin(2 * math.pi * t)
    with pytest.raises(RunError, match=r"no convergence at t = \d+\.\d+ s in case 'slider', record 0"):
        run_cases(small_building(), 300.0, {"slider": FrictionPendulum(2.0, 0.05)}, acc, 0.005,
                  include_fixed=False)
    # Two elements under white noise: some steps cross two segments, which needs two Newton steps.
    two_elements = Bilinear(1e5, 1e4, 100.0).parallel(Bilinear(3e4, 1e4, 300.0))
    noise = np.random.default_rng(1).standard_normal(400)
    with pytest.raises(RunError, match="case 'multi'"):
        run_cases(small_building(), 300.0, {"multi": two_elements}, noise, 0.005, include_fixed=False)


def test_result_serialises_to_json_and_npz(tmp_path):
    import json

    from isolation.dynamics.history import HistoryResult, run_cases, suite_statistics

    t = np.arange(0.0, 3.0, 0.005)
    acc = np.vstack([0.3 * np.sin(2 * math.pi * t), 0.2 * np.sin(3 * t)])
    results = run_cases(small_building(), 300.0, {"nominal": FrictionPendulum(2.0, 0.05)}, acc, 0.005)
    iso = results["nominal"]
    summary = json.loads(json.dumps(iso.to_dict()))
    assert summary["statistics"]["isolator_displacement"]["max"] == pytest.approx(
        float(np.max(np.abs(iso.isolator_displacement))))
    full = json.loads(json.dumps(iso.to_dict(histories=True)))
    assert len(full["histories"]["isolator_displacement"][1]) == t.size
    json.dumps(suite_statistics(results))
    back = HistoryResult.load_npz(iso.save_npz(tmp_path / "nominal.npz"))
    np.testing.assert_array_equal(back.isolator_displacement, iso.isolator_displacement)
    np.testing.assert_array_equal(back.energy["hysteretic"], iso.energy["hysteretic"])
    assert back.case == "nominal" and back.isolated
    fixed = HistoryResult.load_npz(results["fixed"].save_npz(tmp_path / "fixed.npz"))
    assert fixed.isolator_displacement is None and not fixed.isolated
    assert not list(tmp_path.glob("*.part"))


def test_shapes_of_a_suite_result():
    t = np.arange(0.0, 2.0, 0.005)
    acc = np.vstack([0.3 * np.sin(2 * math.pi * t)] * 3)
    iso = run(IsolatedBuilding(small_building(), 300.0, Bilinear(2e4, 2e3, 60.0)), acc, 0.005)
    steps = t.size
    assert iso.isolator_displacement.shape == (3, steps)
    assert iso.floor_acceleration.shape == (3, steps, 2)
    assert iso.drift.shape == (3, steps, 2)
    assert iso.storey_shear.shape == (3, steps, 2)
    assert set(iso.energy) == {"input", "kinetic", "viscous", "elastic_strain", "hysteretic"}
    assert iso.balance_error.shape == (3,)
    assert iso.peaks()["residual_displacement"].shape == (3,)
    # Three identical records give three identical rows (records are independent columns).
    np.testing.assert_array_equal(iso.isolator_displacement[0], iso.isolator_displacement[2])
    np.testing.assert_array_equal(iso.storey_shear[1], iso.storey_shear[2])
    # Storey shear = -sum of the inertia forces m a_abs of the floors above it (Newton's second law;
    # floor masses 400 t, accelerations in g -> kN with g = 9.80665 m/s2). storey_shear is the storey
    # springs' force (history.run's convention), so the check runs on an undamped superstructure.
    undamped = ShearBuilding([400.0, 400.0], [2.0e5, 2.0e5], [3.0, 3.0], damping=0.0)
    iso = run(IsolatedBuilding(undamped, 300.0, Bilinear(2e4, 2e3, 60.0)), acc, 0.005)
    inertia = 400.0 * 9.80665 * iso.floor_acceleration
    np.testing.assert_allclose(iso.storey_shear[..., 1], -inertia[..., 1], rtol=1e-9, atol=1e-9)
    np.testing.assert_allclose(iso.storey_shear[..., 0], -inertia.sum(axis=-1), rtol=1e-9, atol=1e-9)
    # Drift: floor minus the level below, the base level (isolator displacement) for storey 1.
    np.testing.assert_allclose(iso.drift[..., 1], iso.floor_displacement[..., 1] - iso.floor_displacement[..., 0],
                               rtol=1e-9, atol=1e-12)
    np.testing.assert_allclose(iso.drift[..., 0], iso.floor_displacement[..., 0] - iso.isolator_displacement,
                               rtol=1e-9, atol=1e-12)
    assert np.max(np.abs(iso.isolator_displacement)) > 0.0


def test_exact_oscillator_step_response_including_a_nonzero_first_sample():
    # Chopra, step excitation: the exact piecewise-linear recurrence (Nigam & Jennings 1969)
    # is exact at the samples, also when the record starts at a non-zero value.
    from isolation.dynamics.oscillator import oscillator_response

    period, zeta, a0, dt = 0.7, 0.05, 2.0, 0.02
    w = 2 * math.pi / period
    t = np.arange(0.0, 5.0, dt)
    u, v = oscillator_response(np.full(t.size, a0), dt, w, zeta)
    wd = w * math.sqrt(1 - zeta**2)
    decay = np.exp(-zeta * w * t)
    exact = -(a0 / w**2) * (1 - decay * (np.cos(wd * t) + zeta / math.sqrt(1 - zeta**2) * np.sin(wd * t)))
    exact_v = -(a0 / w**2) * decay * (w**2 / wd) * np.sin(wd * t)
    np.testing.assert_allclose(u, exact, atol=1e-12)
    np.testing.assert_allclose(v, exact_v, atol=1e-11)
