"""Newmark average-acceleration engines on small models against closed forms (fast; with
test_newmark_kernel.py, the mutation map of :mod:`isolation.dynamics.newmark` and
:mod:`isolation.dynamics.kernel`).

Both engines are checked through their public entry points: :func:`newmark.integrate` (the
column-vectorised numpy engine) and :func:`newmark.simulate` with the interpreted kernel
(``compiled=False``; the compiled kernel is the same file, checked against it below).
Models of one to three degrees of freedom, a few hundred steps (helpers: newmark_models.py).

Sources
-------
- Newmark (1959), J. Eng. Mech. Div. ASCE 85(3), with gamma = 1/2, beta = 1/4:
  u_{n+1} = u_n + dt v_n + dt^2/4 (a_n + a_{n+1}), v_{n+1} = v_n + dt/2 (a_n + a_{n+1}),
  equilibrium at every step. Subtracting gives u_{n+1} - u_n = dt/2 (v_n + v_{n+1}): the
  method is the trapezoidal rule on the first-order system x' = A x + B a_g (derived).
- Trapezoidal rule = the bilinear (Tustin) discretisation, computed by the general-purpose
  reference scipy.signal.cont2discrete(method="bilinear") and scipy.signal.dlsim.
- Undamped linear SDOF: the trapezoidal rule's amplification matrix in (omega u, v) is a
  rotation by theta = 2 arctan(omega dt / 2) per step, so the amplitude is kept exactly
  (no numerical damping; unconditionally stable, Newmark 1959) and the period lengthens to
  T' = pi dt / arctan(omega dt / 2), (T' - T)/T ~ (pi^2/3)(dt/T)^2 for small dt (Chopra,
  Dynamics of Structures, section 5.5 and its figure of period elongation, from memory;
  Hughes, The Finite Element Method, 1987, section 9.1, from memory). Under a step a_g = a0
  from rest: u_n = u_s (1 - cos n theta), u_s = -a0/omega^2 (derived from the rotation).
- Energy: the trapezoidal rule conserves the quadratic energy of an undamped linear system;
  kinetic + strain energy at every step equals the input work of the step-averaged ground
  force (derived: du . M (v_{n+1} - v_n)/dt + du . K (u_n + u_{n+1})/2 = -du . M 1 a_avg).
- Coulomb friction with a linear spring under a suddenly applied force P (P = m a0): the
  mass oscillates about (P - F)/k on the way out and (P + F)/k on the way back, with period
  2 pi/omega; the amplitude falls by 2F/k every half cycle and the mass stops at the first
  turning point inside the band |k u - P| <= F (Chopra, Dynamics of Structures, free
  vibration with Coulomb friction, from memory; shifted by the static P, derived).
- Rigid block on velocity-dependent friction Q(v) = Q_fast - (Q_fast - Q_slow) exp(-a |v|)
  (Mokha, Constantinou & Reinhorn 1990, J. Struct. Eng. 116(2)) and a linear damper c, sliding
  one way under a constant ground acceleration: m v' = -m a0 + Q(|v|) - c v; reference
  scipy.integrate.solve_ivp.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.integrate
from newmark_models import ENGINES, chain, ground_record, respond, trapezoid

from isolation.bearings.laws import ElasticPlasticLaw
from isolation.dynamics import newmark
from isolation.dynamics.isolators import ElasticPlasticColumns

# --- linear: exact discrete solutions -----------------------------------------------------------

def test_tustin_reference_satisfies_newmarks_equations():
    # The reference itself: Newmark (1959) with gamma = 1/2, beta = 1/4 and equilibrium at every step.
    m, k = chain([3.0, 2.0], [900.0, 600.0])
    c = 0.003 * k + 0.2 * np.diag(m)
    dt = 0.01
    g = ground_record(120, dt)
    u, v, a = trapezoid(m, k, c, g, dt)
    assert np.abs(u).max() > 1e-3
    np.testing.assert_allclose(u[1:] - u[:-1], dt * v[:-1] + dt**2 / 4 * (a[:-1] + a[1:]), rtol=0, atol=1e-13)
    np.testing.assert_allclose(v[1:] - v[:-1], dt / 2 * (a[:-1] + a[1:]), rtol=0, atol=1e-12)
    np.testing.assert_allclose(m * a + v @ c.T + u @ k.T, -m * g[:, None], rtol=0, atol=1e-9)


@pytest.mark.parametrize("engine", ENGINES)
def test_undamped_step_response_is_a_rotation_by_two_arctan_of_half_omega_dt(engine):
    # Constant a_g from the first sample (at rest: a_0 = -a_g, equilibrium): exact discrete solution.
    period, dt = 1.0, 0.05
    w = 2 * math.pi / period
    m, k = chain([2.0], [2.0 * w * w])
    a0 = np.array([[1.5], [-0.4]])
    ground = np.repeat(a0, 81, axis=1)
    u, v, a, _ = respond(engine, m, k, np.zeros((1, 1)), ground, dt)
    theta = 2 * math.atan(w * dt / 2)
    n = np.arange(81)
    us = -a0 / w**2
    np.testing.assert_allclose(u[:, :, 0], us * (1 - np.cos(n * theta)), rtol=0, atol=1e-12)
    np.testing.assert_allclose(v[:, :, 0], us * w * np.sin(n * theta), rtol=0, atol=1e-11)
    np.testing.assert_allclose(a[:, :, 0], -w * w * u[:, :, 0] - ground, rtol=0, atol=1e-10)
    # period elongation T'/T = pi dt / (T arctan(omega dt/2)) ~ 1 + (pi^2/3)(dt/T)^2
    assert math.pi * dt / math.atan(w * dt / 2) / period == pytest.approx(1 + math.pi**2 / 3 * 0.05**2, rel=1e-3)


@pytest.mark.parametrize("engine", ENGINES)
def test_damped_two_storey_fixed_base_matches_the_trapezoidal_rule(engine):
    m, k = chain([3.0, 2.0], [900.0, 600.0])
    c = 0.02 * m[:, None] * np.eye(2) * 10 + 0.003 * k  # Rayleigh-type, non-diagonal
    dt = 0.01
    g = ground_record(200, dt)
    ground = np.vstack([g, -0.5 * g])
    u, v, a, force = respond(engine, m, k, c, ground, dt)
    assert force is None or not np.any(force)
    for col, scale in enumerate((1.0, -0.5)):
        ur, vr, ar = trapezoid(m, k, c, scale * g, dt)
        np.testing.assert_allclose(u[col], ur, rtol=0, atol=1e-9 * np.abs(ur).max())
        np.testing.assert_allclose(v[col], vr, rtol=0, atol=1e-9 * np.abs(vr).max())
        np.testing.assert_allclose(a[col], ar, rtol=0, atol=1e-9 * np.abs(ar).max())


@pytest.mark.parametrize("engine", ENGINES)
@pytest.mark.parametrize("elements", [1, 2])
def test_linear_isolated_building_with_damper_matches_the_trapezoidal_rule(engine, elements):
    # Elements that never yield (strength far above any force) are springs: the model is linear.
    base, floors = 4.0, [3.0, 2.0]
    m, k = chain([base] + floors, [1500.0, 1000.0], base=True)
    c = 0.004 * k
    k0, springs = 80.0, (120.0,) if elements == 1 else (70.0, 50.0)
    law = ("ep", k0, springs, (1e9,) * elements)
    damper = 15.0
    dt = 0.01
    g = ground_record(250, dt, seed=5)
    u, v, a, force = respond(engine, m, k, c, np.vstack([g, 2 * g]), dt, law=law, damper=damper)
    kr, cr = k.copy(), c.copy()
    kr[0, 0] += k0 + sum(springs)
    cr[0, 0] += damper
    for col, scale in enumerate((1.0, 2.0)):
        ur, vr, ar = trapezoid(m, kr, cr, scale * g, dt)
        np.testing.assert_allclose(u[col], ur, rtol=0, atol=1e-9 * np.abs(ur).max())
        np.testing.assert_allclose(v[col], vr, rtol=0, atol=1e-9 * np.abs(vr).max())
        np.testing.assert_allclose(a[col], ar, rtol=0, atol=1e-9 * np.abs(ar).max())
        # isolator force: the springs only (the damper force is not part of it)
        np.testing.assert_allclose(force[col], (k0 + sum(springs)) * ur[:, 0], rtol=0,
                                   atol=1e-9 * np.abs(force[col]).max())


def test_sub_steps_integrate_the_linearly_interpolated_record():
    # nsub sub-steps of dt/nsub with a_g interpolated linearly between samples (simulate only).
    m, k = chain([1.0, 1.0], [4000.0, 4000.0])
    c = 0.001 * k
    dt, nsub = 0.02, 4
    g = ground_record(100, dt, seed=7)
    u, v, a, _ = respond("simulate", m, k, c, g, dt, nsub=nsub)
    fine = np.interp(np.arange(99 * nsub + 1) * dt / nsub, np.arange(100) * dt, g)
    ur, vr, ar = trapezoid(m, k, c, fine, dt / nsub)
    np.testing.assert_allclose(u[0], ur[::nsub], rtol=0, atol=1e-9 * np.abs(ur).max())
    np.testing.assert_allclose(v[0], vr[::nsub], rtol=0, atol=1e-9 * np.abs(vr).max())
    np.testing.assert_allclose(a[0], ar[::nsub], rtol=0, atol=1e-9 * np.abs(ar).max())


def test_energy_of_an_undamped_linear_building_balances_at_every_step():
    # Trapezoidal rule: kinetic + strain energy = input work, to round-off (derived, see above).
    m, k = chain([5.0, 3.0, 1.0], [2500.0, 1200.0], base=True)
    dt = 0.01
    g = ground_record(300, dt, seed=11)
    out = newmark.simulate(m, k, np.zeros((3, 3)), {
        "lower": np.array([0, 1]), "upper": np.array([1, 2]), "kind": 0, "k": np.array([2500.0, 1200.0]),
        "k_geo": np.zeros(2), "fy": np.full(2, np.inf), "alpha": 0.0}, {
        "kind": 1, "p": np.array([[200.0, 0, 0, 0, 0, 0]]), "k": np.array([[300.0]]), "f": np.array([[1e9]]),
        "damper": np.zeros(1)}, g[None, :], dt, 1, [("case", 0)], compiled=False)
    e_in, kinetic, viscous, strain, hysteretic = out["energy"][:, 0]
    u, v = out["u"][0], out["v"][0]
    assert np.abs(u).max() > 1e-3
    np.testing.assert_allclose(kinetic, 0.5 * (v * v) @ m, rtol=1e-12, atol=1e-12)
    kr = k.copy()
    kr[0, 0] += 500.0
    np.testing.assert_allclose(strain, 0.5 * np.einsum("si,ij,sj->s", u, kr, u), rtol=1e-9, atol=1e-12)
    np.testing.assert_allclose(e_in, kinetic + strain, rtol=0, atol=1e-9 * e_in.max())
    assert np.abs(viscous).max() == 0.0
    assert np.abs(hysteretic).max() < 1e-9 * e_in.max()


# --- isolator laws: Coulomb friction with a spring ------------------------------------------------

def _coulomb_turning_points(p, f, k, count=6):
    """Turning points of a spring-friction mass under a sudden force P from rest (closed form above)."""
    points, x, sign = [], 0.0, 1.0
    for _ in range(count):
        centre = (p - sign * f) / k
        if abs(k * x - p) <= f and points:
            break
        x = 2 * centre - x
        points.append(x)
        sign = -sign
    return points


COULOMB = {"m": 1.0, "k": 4 * math.pi**2, "f": 0.7, "a0": 3.0}


@pytest.mark.parametrize("engine, law", [
    ("integrate", ("ep", COULOMB["k"], (4e4,), (COULOMB["f"],))),
    ("simulate", ("ep", COULOMB["k"], (4e4,), (COULOMB["f"],))),
    ("integrate", ("ep", COULOMB["k"], (3e4, 1e4), (0.75 * COULOMB["f"], 0.25 * COULOMB["f"]))),
    ("simulate", ("ep", COULOMB["k"], (3e4, 1e4), (0.75 * COULOMB["f"], 0.25 * COULOMB["f"]))),
    ("integrate", ("smooth", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5, 0.5)),
    ("simulate", ("smooth", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5, 0.5)),
    ("integrate", ("smooth", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5, 0.8)),
    ("simulate", ("smooth", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5, 0.8)),
    ("integrate", ("smooth", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5, 0.3)),
    ("simulate", ("smooth", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5, 0.3)),
    ("simulate", ("sharp", COULOMB["k"], COULOMB["f"], COULOMB["f"], 0.0, 2e-5)),
])
def test_spring_and_friction_under_a_sudden_force_follow_the_coulomb_closed_form(engine, law):
    m, k, f, a0 = COULOMB["m"], COULOMB["k"], COULOMB["f"], COULOMB["a0"]
    dt = 0.002
    steps = 2001  # 4 s: four natural periods; the mass stops after two half cycles, away from P/k
    ground = np.array([np.full(steps, a0), np.full(steps, -a0)])
    u, v, a, force = respond(engine, np.array([m]), np.zeros((1, 1)), np.zeros((1, 1)), ground, dt, law=law)
    expected = _coulomb_turning_points(m * a0, f, k)
    assert len(expected) == 2 and abs(COULOMB["k"] * expected[-1] - m * a0) > 0.1 * f
    t = np.arange(steps) * dt
    half = math.pi / math.sqrt(k / m)
    for col, sign in enumerate((-1.0, 1.0)):
        ub = sign * u[col, :, 0]
        for i, x in enumerate(expected):
            window = (t > (i + 0.5) * half) & (t < (i + 1.5) * half)
            turn = ub[window].max() if i % 2 == 0 else ub[window].min()
            assert turn == pytest.approx(x, abs=2e-4), (i, turn, x)
        # at rest at the last turning point, the spring force inside the friction band
        assert np.abs(ub[t > 3.2] - expected[-1]).max() < 2e-4
        assert np.abs(v[col, t > 3.2, 0]).max() < 0.01
        # isolator force = spring + friction, never above k u + F
        assert np.all(np.abs(sign * force[col] - k * ub) <= f * (1 + 1e-9))
        # equilibrium of the mass: m (a + a_g) = -F
        np.testing.assert_allclose(m * (a[col, :, 0] + ground[col]), -force[col], rtol=0, atol=1e-6)


@pytest.mark.parametrize("engine, law", [
    ("integrate", ("smooth", 0.0, 0.8, 0.3, 20.0, 1e-6, 0.5)),
    ("simulate", ("smooth", 0.0, 0.8, 0.3, 20.0, 1e-6, 0.5)),
    ("integrate", ("smooth", 0.0, 0.8, 0.3, 20.0, 1e-6, 0.7)),
    ("simulate", ("sharp", 0.0, 0.8, 0.3, 20.0, 1e-6)),
])
def test_block_on_velocity_dependent_friction_slides_as_the_ode(engine, law):
    # The engines start from a_0 = -a_g (no friction yet) and build the friction force over a few D_y;
    # both leave a velocity offset below dt Q_fast/m: the tolerances are that and 1e-3 of the peak displacement.
    m, a0, dt, steps = 1.0, 2.0, 0.002, 501
    q_fast, q_slow, rate = law[2], law[3], law[4]
    ground = np.array([np.full(steps, a0), np.full(steps, -0.5 * a0)])
    damper = 0.4  # linear damper beside the bearing [kN s/m]
    u, v, a, force = respond(engine, np.array([m]), np.zeros((1, 1)), np.zeros((1, 1)), ground, dt, law=law,
                             damper=damper)
    t = np.arange(steps) * dt
    for col, acc in enumerate((a0, -0.5 * a0)):
        def rhs(_, y, acc=acc):
            speed = abs(y[1])
            q = q_fast - (q_fast - q_slow) * math.exp(-rate * speed)
            return [y[1], -acc + math.copysign(q, acc) / m - damper * y[1] / m]
        ref = scipy.integrate.solve_ivp(rhs, (0.0, t[-1]), [0.0, 0.0], t_eval=t, rtol=1e-10, atol=1e-12)
        np.testing.assert_allclose(u[col, :, 0], ref.y[0], rtol=0, atol=1e-3 * np.abs(ref.y[0]).max())
        np.testing.assert_allclose(v[col, :, 0], ref.y[1], rtol=0, atol=dt * q_fast / m)
        # the friction force approaches Q(v) at the final speed
        q_end = q_fast - (q_fast - q_slow) * math.exp(-rate * abs(ref.y[1][-1]))
        assert abs(force[col, -1]) == pytest.approx(q_end, rel=2e-3)


def test_elastic_plastic_columns_of_one_run_are_independent():
    # Two strengths in one call give the columns of two separate calls (integrate).
    m, k0, dt = np.array([1.0]), 10.0, 0.005
    g = np.r_[0.0, 3 * np.sin(np.arange(1, 400) * dt * 7)]
    columns = ElasticPlasticColumns([ElasticPlasticLaw(k0, (500.0,), (0.6,)), ElasticPlasticLaw(k0, (500.0,), (1.5,))])
    both = newmark.integrate(np.diag(m), np.zeros((1, 1)), np.zeros((1, 1)), columns, np.array([0.0, 2.0]),
                             np.vstack([g, g]).T.copy(), dt, [("a", 0), ("b", 0)])
    for col, (strength, damper) in enumerate(((0.6, 0.0), (1.5, 2.0))):
        one = newmark.integrate(np.diag(m), np.zeros((1, 1)), np.zeros((1, 1)),
                                ElasticPlasticColumns([ElasticPlasticLaw(k0, (500.0,), (strength,))]),
                                np.array([damper]), g[:, None].copy(), dt, [("a", 0)])
        np.testing.assert_allclose(both["state"][:, :, col], one["state"][:, :, 0], rtol=1e-12, atol=1e-15)
        np.testing.assert_allclose(both["hysteretic_state"][:, :, col], one["hysteretic_state"][:, :, 0],
                                   rtol=1e-12, atol=1e-15)
        # element force within its strength, reached while sliding
        q = one["hysteretic_state"][:, 0, 0]
        assert np.abs(q).max() == pytest.approx(strength, rel=1e-12)


# --- the dispatch around the kernel -------------------------------------------------------------------

@pytest.mark.parametrize("dt, shortest, fraction, expected", [
    (0.01, 0.5, 10.0, 1),      # dt already <= T/10
    (0.01, 0.1, 10.0, 1),      # exactly T/10: no sub-step (the 1e-12 allowance)
    (0.01, 0.05, 10.0, 2),
    (0.02, 0.05, 10.0, 4),
    (0.02, 0.05, 20.0, 8),
    (0.01, 0.03, 10.0, 4),     # ceil(3.33)
    (0.01, float("nan"), 10.0, 1),
    (0.01, 0.0, 10.0, 1),
    (0.01, -1.0, 10.0, 1),
    (0.01, float("inf"), 10.0, 1),
])
def test_substeps_keep_the_sub_step_at_most_the_shortest_period_over_the_fraction(dt, shortest, fraction, expected):
    # common practice: dt <= T_min / 10 for Newmark's average acceleration (Chopra, section 5.5, from memory)
    assert newmark.substeps(dt, shortest, fraction) == expected


def test_substeps_default_fraction_is_ten():
    assert newmark.substeps(0.01, 0.05) == 2
    assert newmark.substeps(0.01, 0.1) == 1


def test_kernel_module_chooses_the_interpreted_or_compiled_kernel(monkeypatch):
    from isolation.dynamics import kernel

    assert newmark.kernel_module(False) is kernel
    monkeypatch.setenv(newmark.ENGINE_VARIABLE, "Python")
    assert newmark.kernel_module() is kernel
    assert newmark.kernel_module(None) is kernel
    monkeypatch.delenv(newmark.ENGINE_VARIABLE)
    if not newmark.compiled_available():
        assert newmark.kernel_module() is kernel
        return
    # a fresh compiled copy (numba's on-disk cache makes this quick after the first time)
    monkeypatch.setattr(newmark, "_COMPILED_MODULE", None)
    compiled = newmark.kernel_module()
    assert compiled is not kernel
    assert compiled is newmark.kernel_module(True)
    monkeypatch.setenv(newmark.ENGINE_VARIABLE, "")
    assert newmark.kernel_module() is compiled
    # the compiled copy gives the interpreted kernel's histories (Tustin reference for the numbers)
    m, k = chain([4.0, 3.0, 2.0], [1500.0, 1000.0], base=True)
    c = 0.004 * k
    law = ("ep", 80.0, (70.0, 50.0), (1.0, 0.5))
    g = 10 * ground_record(200, 0.01, seed=5)
    storeys = {"lower": np.array([0, 1]), "upper": np.array([1, 2]), "kind": 2, "k": np.array([1500.0, 1000.0]),
               "k_geo": np.zeros(2), "fy": np.array([8.0, 6.0]), "alpha": 0.05}
    isolator = {"kind": 1, "p": np.array([[80.0, 0, 0, 0, 0, 0]]), "k": np.array([[70.0, 50.0]]),
                "f": np.array([[1.0, 0.5]]), "damper": np.array([5.0])}
    runs = [newmark.simulate(m, k, c, storeys, isolator, g[None, :], 0.01, 2, [("c", 0)], compiled=flag)
            for flag in (True, False)]
    assert np.abs(runs[1]["drift"]).max() > 8.0 / 1500.0
    for name in runs[1]:
        np.testing.assert_allclose(runs[0][name], runs[1][name], rtol=1e-9, atol=1e-9 * np.abs(runs[1][name]).max())
    assert law[0] == "ep"


def test_compiled_available_reports_whether_numba_imports(monkeypatch):
    try:
        import numba  # noqa: F401
        present = True
    except ImportError:
        present = False
    assert newmark.compiled_available() is present
    import sys

    monkeypatch.setitem(sys.modules, "numba", None)  # import numba now raises ImportError
    assert newmark.compiled_available() is False
    from isolation.dynamics import kernel

    monkeypatch.delenv(newmark.ENGINE_VARIABLE, raising=False)
    monkeypatch.setattr(newmark, "_COMPILED_MODULE", None)
    assert newmark.kernel_module() is kernel

@pytest.mark.parametrize("engine", ENGINES)
@pytest.mark.parametrize("beta", [0.5, 0.8, 0.3])
def test_smooth_isolator_force_follows_the_bouc_wen_law_of_its_displacement(engine, beta):
    # The force of the smooth law along the computed base displacement equals the law under that
    # displacement imposed (imposed_force, checked against Wen's closed forms in
    # test_isolator_laws.py), to the accuracy each engine states: the numpy engine stops Newton at
    # 1e-4 D_y and corrects to first order (error ~1e-8 in z), the kernel at 1e-3 D_y (~1e-6 in z).
    from isolation.bearings import Bilinear
    from isolation.dynamics.isolators import BoucWen, imposed_force

    dt = 0.01
    g = 6.0 * ground_record(400, dt, seed=2)
    ground = np.vstack([g, -0.6 * g])
    model = (np.array([2.0, 1.0]), chain([2.0, 1.0], [800.0], base=True)[1], np.diag([0.0, 0.5]))
    law = ("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, beta)
    u, v, a, force = respond(engine, *model, ground, dt, law=law, damper=4.0)
    tolerance = (1e-7 if engine == "integrate" else 1e-5) * 3.0
    for col in range(2):
        assert np.abs(u[col, :, 0]).max() > 20 * 0.003
        expected = imposed_force(BoucWen(Bilinear(10.0 + 3.0 / 0.003, 10.0, 3.0), beta=beta), u[col, :, 0])
        np.testing.assert_allclose(force[col], expected, rtol=0, atol=tolerance)


def test_integrate_of_a_fixed_base_model_has_no_isolator_outputs():
    m, k = chain([1.0], [100.0])
    out = newmark.integrate(np.diag(m), k, np.zeros((1, 1)), None, np.zeros(1), np.ones((5, 1)), 0.01, [("a", 0)])
    assert set(out) == {"state", "force", "hysteretic_state"}
    assert out["force"] is None and out["hysteretic_state"] is None
    assert out["state"].shape == (5, 3, 1)


def test_single_element_shortcut_agrees_with_the_general_newton_iteration():
    # One elastic-plastic element takes a shortcut (one elastic trial, one plastic correction) in both
    # engines; the same element split into two equal halves (same law: k/2 + k/2, F/2 + F/2) takes the
    # general Newton iteration. All four runs must give the same history (to the iteration tolerance).
    dt = 0.005
    g = 6.0 * ground_record(600, dt, seed=4)
    ground = np.vstack([g, -0.6 * g])
    model = (np.array([2.0, 1.0]), chain([2.0, 1.0], [800.0], base=True)[1], np.diag([0.0, 0.5]))
    one = ("ep", 10.0, (900.0,), (3.0,))
    halves = ("ep", 10.0, (450.0, 450.0), (1.5, 1.5))
    runs = [respond(engine, *model, ground, dt, law=law, damper=4.0) for engine in ENGINES for law in (one, halves)]
    assert np.abs(runs[0][0][:, :, 0]).max() > 20 * 3.0 / 900.0  # well past yield
    for other in runs[1:]:
        for a, b in zip(runs[0], other, strict=True):
            np.testing.assert_allclose(b, a, rtol=0, atol=1e-8 * np.abs(a).max())
