"""Newmark average-acceleration engines on small models against closed forms (fast; the
mutation map of :mod:`isolation.dynamics.newmark` runs these).

Both engines are checked through their public entry points: :func:`newmark.integrate` (the
column-vectorised numpy engine) and :func:`newmark.simulate` with the interpreted kernel
(``compiled=False``; the compiled kernel is the same file, see
``test_history_yielding.py``). Models of one to three degrees of freedom, a few hundred steps.

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
- Elastic-perfectly-plastic SDOF under a suddenly applied force P with F_y/2 < P < F_y:
  work P u_m equals the area under the backbone, so u_m = F_y u_y / (2 (F_y - P))
  (Chopra, elastoplastic systems, energy balance, from memory; derived).
"""

from __future__ import annotations

import math
import re

import numpy as np
import pytest
import scipy.integrate
import scipy.signal

from isolation.bearings.laws import ElasticPlasticLaw, SmoothLaw
from isolation.dynamics import newmark
from isolation.dynamics.isolators import ElasticPlasticColumns, SmoothColumns
from isolation.errors import RunError

ENGINES = ("integrate", "simulate")


def chain(masses, stiffnesses, base=False):
    """Mass and stiffness of a shear chain; with ``base`` the first mass has no spring to the ground."""
    n = len(masses)
    k = np.zeros((n, n))
    for i, ki in enumerate(stiffnesses):
        lo, up = (i, i + 1) if base else (i - 1, i)
        k[up, up] += ki
        if lo >= 0:
            k[lo, lo] += ki
            k[lo, up] -= ki
            k[up, lo] -= ki
    return np.asarray(masses, dtype=float), k


def trapezoid(m, k, c, ground, dt):
    """Reference: Tustin discretisation of M u'' + C u' + K u = -M 1 a_g (scipy.signal).

    Returns u, v, a (relative), each (steps, dofs); ground (steps,) with ground[0] = 0 (rest).
    """
    n = m.size
    minv = np.diag(1.0 / m)
    eye, zero = np.eye(n), np.zeros((n, n))
    a = np.block([[zero, eye], [-minv @ k, -minv @ c]])
    b = np.concatenate([np.zeros(n), -np.ones(n)])[:, None]
    out = np.block([[eye, zero], [zero, eye], [-minv @ k, -minv @ c]])
    d = np.concatenate([np.zeros(2 * n), -np.ones(n)])[:, None]
    ad, bd, cd, dd, _ = scipy.signal.cont2discrete((a, b, out, d), dt, method="bilinear")
    _, y, _ = scipy.signal.dlsim((ad, bd, cd, dd, dt), np.asarray(ground, dtype=float))
    return y[:, :n], y[:, n:2 * n], y[:, 2 * n:]


def respond(engine, m, k, c, ground, dt, law=None, damper=0.0, nsub=1, storeys=None):
    """Run one engine; ground (cols, steps). Returns u, v, a_rel (cols, steps, dofs) and force (cols, steps).

    law: None (fixed base), ("ep", k0, (k, ...), (f, ...)), ("smooth", k0, q_fast, q_slow, rate, dy, beta)
    or ("sharp", k0, q_fast, q_slow, rate, dy), the same for every column."""
    ground = np.atleast_2d(np.asarray(ground, dtype=float))
    cols = ground.shape[0]
    labels = [("case", r) for r in range(cols)]
    if engine == "integrate":
        columns = None
        if law is not None and law[0] == "ep":
            columns = ElasticPlasticColumns([ElasticPlasticLaw(law[1], tuple(law[2]), tuple(law[3]))] * cols)
        elif law is not None:
            columns = SmoothColumns([SmoothLaw(*law[1:])] * cols)
        out = newmark.integrate(m if m.ndim == 2 else np.diag(m), k, c, columns, np.full(cols, damper),
                                ground.T.copy(), dt, labels)
        dofs = k.shape[0]
        state = np.moveaxis(out["state"], 2, 0)
        force = None if out["force"] is None else out["force"].T
        return state[:, :, :dofs], state[:, :, dofs:2 * dofs], state[:, :, 2 * dofs:], force
    mass = m if m.ndim == 1 else np.diag(m)
    offset = 0 if law is None else 1
    if storeys is None:
        count = mass.size - offset
        upper = np.arange(count) + offset
        storeys = {"lower": upper - 1, "upper": upper, "kind": 0, "k": np.ones(count),
                   "k_geo": np.zeros(count), "fy": np.full(count, np.inf), "alpha": 0.0}
    isolator = None
    if law is not None:
        p = np.zeros((cols, 6))
        if law[0] == "ep":
            kind, p[:, 0] = 1, law[1]
            ke = np.tile(np.asarray(law[2], dtype=float), (cols, 1))
            fe = np.tile(np.asarray(law[3], dtype=float), (cols, 1))
        else:
            kind = 2 if law[0] == "smooth" else 3
            p[:] = (law[1], law[2], law[2] - law[3], law[4], law[5], 1.0 - 2.0 * law[6] if kind == 2 else 0.0)
            ke = fe = np.zeros((cols, 1))
        isolator = {"kind": kind, "p": p, "k": ke, "f": fe, "damper": np.full(cols, damper)}
    out = newmark.simulate(mass, k, c, storeys, isolator, ground, dt, nsub, labels, compiled=False)
    return out["u"], out["v"], out["a"] - ground[:, :, None], out["isolator_force"]


def _ground(steps, dt, seed=3):
    t = np.arange(steps) * dt
    rng = np.random.default_rng(seed)
    g = sum(rng.uniform(0.5, 2.0) * np.sin(rng.uniform(2.0, 20.0) * t + rng.uniform(0, 6)) for _ in range(4))
    g[0] = 0.0
    return g


# --- linear: exact discrete solutions -----------------------------------------------------------

def test_tustin_reference_satisfies_newmarks_equations():
    # The reference itself: Newmark (1959) with gamma = 1/2, beta = 1/4 and equilibrium at every step.
    m, k = chain([3.0, 2.0], [900.0, 600.0])
    c = 0.003 * k + 0.2 * np.diag(m)
    dt = 0.01
    g = _ground(120, dt)
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
    g = _ground(200, dt)
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
    g = _ground(250, dt, seed=5)
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
    g = _ground(100, dt, seed=7)
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
    g = _ground(300, dt, seed=11)
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


# --- yielding storeys (simulate) -------------------------------------------------------------------

@pytest.mark.parametrize("kind", [1, 2])
@pytest.mark.parametrize("ratio", [0.6, 0.8])
def test_elastoplastic_storey_under_a_sudden_force_reaches_the_energy_balance_peak(kind, ratio):
    # SDOF (kind 1 bilinear, 2 Clough: same first excursion), plus a stiff elastic storey above
    # carrying a small mass, so that the storey coupling of the kernel is used.
    m1, m2, k1, k2, fy = 1.0, 0.01, 100.0, 1e4, 10.0
    m, k = chain([m1, m2], [k1, k2])
    dt, steps = 0.002, 1001
    p = ratio * fy
    ground = np.vstack([np.full(steps, p / (m1 + m2)), np.full(steps, -p / (m1 + m2))])  # both directions
    storeys = {"lower": np.array([-1, 0]), "upper": np.array([0, 1]), "kind": kind, "k": np.array([k1, k2]),
               "k_geo": np.zeros(2), "fy": np.array([fy, 1e6]), "alpha": 0.0}
    out = newmark.simulate(m, k, np.zeros((2, 2)), storeys, None, ground, dt, 1, [("frame", 0), ("frame", 1)],
                           compiled=False)
    uy = fy / k1
    expected = fy * uy / (2 * (fy - p))
    for col, sign in enumerate((-1.0, 1.0)):
        drift = out["drift"][col, :, 0]
        assert (sign * drift).max() == pytest.approx(expected, rel=5e-3)
        np.testing.assert_allclose(out["drift"][col, :, 1], out["u"][col, :, 1] - out["u"][col, :, 0], atol=1e-15)
        assert (sign * out["storey_force"][col, :, 0]).max() == pytest.approx(fy, rel=1e-9)
        # energies of the fixed base: strain s^2/(2 k) of each storey (alpha = 0: the whole force is
        # the elastic-plastic element's, or Clough's unloading at k), balance to round-off, no isolator
        e_in, kinetic, viscous, strain, hysteretic = out["energy"][:, col]
        s = out["storey_force"][col]
        np.testing.assert_allclose(strain, 0.5 * (s * s) @ (1.0 / np.array([k1, k2])), rtol=1e-9, atol=1e-12)
        # (the storey iteration stops at 1e-10 of the largest yield shear, here the stiff storey's 1e6 kN)
        np.testing.assert_allclose(kinetic + viscous + strain + hysteretic, e_in, rtol=0, atol=1e-6 * e_in.max())
        assert hysteretic[-1] > 0.1 * e_in[-1]
        assert not np.any(out["isolator_force"][col])


def test_storey_non_convergence_names_the_storeys_and_the_column(monkeypatch):
    monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
    m, k = chain([1.0, 1.0], [100.0, 100.0])
    storeys = {"lower": np.array([-1, 0]), "upper": np.array([0, 1]), "kind": 1, "k": np.array([100.0, 100.0]),
               "k_geo": np.zeros(2), "fy": np.array([1.0, 1.0]), "alpha": 0.0}
    ground = np.vstack([np.zeros(200), np.full(200, 5.0)])
    with pytest.raises(RunError, match=r"^yielding storeys: no convergence at t = 0\.\d{4} s in case 'frame', "
                                       r"record 1 \(residual [0-9.e+-]+ kN after 1 iterations\); try a smaller dt"):
        newmark.simulate(m, k, np.zeros((2, 2)), storeys, None, ground, 0.01, 1, [("frame", 0), ("frame", 1)],
                         compiled=False)


@pytest.mark.parametrize("engine", ENGINES)
def test_isolator_non_convergence_names_time_case_and_record(engine, monkeypatch):
    monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
    # two elements under white noise: some steps cross two segments, which needs two Newton steps
    law = ("ep", 1e4, (9e4, 2e4), (90.0, 200.0))
    ground = np.vstack([np.zeros(400), 30 * np.random.default_rng(1).standard_normal(400)])
    with pytest.raises(RunError) as info:
        respond(engine, np.array([1.0]), np.zeros((1, 1)), np.zeros((1, 1)), ground, 0.01, law=law)
    text = str(info.value)
    assert re.match(r"^(elastic-plastic |smooth )?isolator: no convergence at t = \d\.\d{4} s in case 'case', "
                    r"record 1 \(residual [0-9.e+-]+ m after 1 iterations\); try a smaller dt", text), text


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
    g = 10 * _ground(200, 0.01, seed=5)
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

# --- outputs and energies of the kernel (Uang & Bertero 1990 balance) ------------------------------------

def _isolated_model(storey_kind, iso_kind, cols=2):
    """Base + two floors, damped, P-delta, yielding storeys of kind 0/1/2 and one isolator law."""
    base, floors, ks, fy, alpha = 6.0, [4.0, 3.0], [6000.0, 4000.0], [15.0, 10.0], 0.1
    m, k = chain([base] + floors, ks, base=True)
    kgeo = np.array([-60.0, -30.0])  # -P/h per storey
    t = np.array([[-1.0, 1.0, 0.0], [0.0, -1.0, 1.0]])
    k_lin = k + t.T @ np.diag(kgeo) @ t
    c = 0.002 * k + 0.3 * np.diag(m)
    storeys = {"lower": np.array([0, 1]), "upper": np.array([1, 2]), "kind": storey_kind, "k": np.array(ks),
               "k_geo": kgeo, "fy": np.array(fy) if storey_kind else np.full(2, np.inf), "alpha": alpha}
    p = np.zeros((cols, 6))
    ke = fe = np.zeros((cols, 1))
    if iso_kind == 1:  # K_d = 60, two elements (multi-element path; the second column's second element
        # is padding of zero stiffness and strength) or one (exact single-element path)
        p[:, 0] = 60.0
        ke = np.array([[2000.0, 800.0], [2800.0, 0.0]]) if cols > 1 else np.array([[2800.0]])
        fe = np.array([[12.0, 6.0], [18.0, 0.0]]) if cols > 1 else np.array([[18.0]])
    elif iso_kind == 2:  # Bouc-Wen, D_y = 6.4 mm, beta 0.5 (Q = 18) and 0.25 (Q from 12 to 18 with speed)
        p[:] = (60.0, 18.0, 0.0, 0.0, 0.0064, 0.0)
        p[1:] = (60.0, 18.0, 6.0, 25.0, 0.0064, 0.5)
    elif iso_kind == 3:  # sharp friction with velocity-dependent strength
        p[:] = (60.0, 18.0, 9.0, 25.0, 0.0005, 0.0)
    damper = np.linspace(20.0, 40.0, cols)
    isolator = {"kind": iso_kind, "p": p, "k": ke, "f": fe, "damper": damper}
    return m, k_lin, c, storeys, isolator, kgeo, alpha


@pytest.mark.parametrize("storey_kind", [0, 1, 2])
@pytest.mark.parametrize("iso_kind, cols, nsub", [(1, 2, 1), (1, 1, 1), (2, 2, 1), (3, 2, 1), (2, 2, 3)])
def test_kernel_outputs_and_energy_terms_follow_their_definitions(storey_kind, iso_kind, cols, nsub):
    m, k_lin, c, storeys, isolator, kgeo, alpha = _isolated_model(storey_kind, iso_kind, cols)
    dt = 0.01
    g = 8.0 * _ground(300, dt, seed=13) / 4
    ground = np.vstack([g, -0.7 * g][:cols])
    out = newmark.simulate(m, k_lin, c, storeys, isolator, ground, dt, nsub, [("case", r) for r in range(cols)],
                           compiled=False)
    u, v, a_abs, drift = out["u"], out["v"], out["a"], out["drift"]
    s, force = out["storey_force"], out["isolator_force"]
    e_in, kinetic, viscous, strain, hysteretic = out["energy"]
    assert np.abs(u[:, :, 0]).max() > 0.02  # the isolator yields
    if storey_kind:
        assert np.abs(drift / (storeys["fy"] / storeys["k"])).max() > 1.5  # a storey yields
    for name in ("u", "v", "a", "drift", "storey_force", "isolator_force", "reaction"):
        assert not np.any(out[name][:, 0]), name
    assert not np.any(out["energy"][:, :, 0])
    # equilibrium of the whole: reaction = -sum m a_abs (Chopra, base shear from inertia forces)
    np.testing.assert_allclose(out["reaction"], -(a_abs @ m), rtol=1e-12, atol=1e-12)
    np.testing.assert_allclose(drift, u[:, :, 1:] - u[:, :, :-1], rtol=0, atol=1e-15)
    # Newmark (1959): u_{n+1} - u_n = dt/2 (v_n + v_{n+1}) (between samples when there are no sub-steps)
    if nsub == 1:
        np.testing.assert_allclose(np.diff(u, axis=1), dt / 2 * (v[:, 1:] + v[:, :-1]), rtol=0, atol=1e-12)
    np.testing.assert_allclose(kinetic, 0.5 * (v * v) @ m, rtol=1e-12, atol=1e-15)
    # viscous work: (v_n + v_{n+1})/2 = du/dt, so each step adds du' C du / dt (damper included)
    for col in range(cols if nsub == 1 else 0):
        cc = c.copy()
        cc[0, 0] += isolator["damper"][col]
        du = np.diff(u[col], axis=0)
        np.testing.assert_allclose(viscous[col, 1:], np.cumsum(np.einsum("si,ij,sj->s", du, cc, du)) / dt,
                                   rtol=1e-9, atol=1e-12)
    # recoverable strain energy of each element (common practice: q^2/(2 k) for an elastic-plastic
    # element, alpha k d^2/2 for the hardening spring, s^2/(2 k) for Clough's unloading at k)
    k_el = storeys["k"]
    stored = 0.5 * np.einsum("csi,i->cs", drift * drift, kgeo)
    if storey_kind == 0:
        stored += 0.5 * np.einsum("csi,i->cs", drift * drift, k_el)
        np.testing.assert_allclose(s, drift * k_el, rtol=1e-12, atol=1e-12)
    elif storey_kind == 1:
        q = s - alpha * k_el * drift
        stored += 0.5 * np.einsum("csi,i->cs", alpha * drift * drift, k_el)
        stored += 0.5 * np.sum(q * q / ((1 - alpha) * k_el), axis=2)
        assert np.all(np.abs(q) <= (1 - alpha) * storeys["fy"] * (1 + 1e-9))
    else:
        stored += 0.5 * np.sum(s * s / k_el, axis=2)
    ub = u[:, :, 0]
    p = isolator["p"]
    stored += 0.5 * p[:, :1] * ub * ub
    element = force - p[:, :1] * ub
    if iso_kind == 1:
        if cols == 1:
            stored += 0.5 * element**2 / isolator["k"][0, 0]
            assert np.abs(element).max() == pytest.approx(isolator["f"][0, 0], rel=1e-12)
    elif iso_kind == 2:
        strength = p[:, 1:2] - p[:, 2:3] * np.exp(-p[:, 3:4] * np.abs(v[:, :, 0]))
        stored += 0.5 * p[:, 4:5] * element**2 / strength  # Q D_y z^2 / 2 with z = element / Q
    else:
        strength = p[:, 1:2] - p[:, 2:3] * np.exp(-p[:, 3:4] * np.abs(v[:, :, 0]))
        assert np.all(np.abs(element) <= strength * (1 + 1e-9))
        stored += 0.5 * element**2 * p[:, 4:5] / p[:, 1:2]
    if not (iso_kind == 1 and cols > 1):
        # (smooth law: z read back from the force, which carries the kernel's first-order last correction)
        np.testing.assert_allclose(strain, stored, rtol=1e-7 if iso_kind != 2 else 1e-3, atol=1e-9 * strain.max())
    # storey forces follow the storey law under the computed drifts (ShearBuilding.storey_loop, checked
    # at hand-derived points below), from the unloaded state of each column (sampled path: no sub-steps)
    if storey_kind and nsub == 1:
        from isolation.dynamics.structure import ShearBuilding

        for i in range(2):
            law = ShearBuilding([1.0], [k_el[i]], [3.0], yield_shears=[storeys["fy"][i]], hardening=alpha,
                                hysteresis="bilinear" if storey_kind == 1 else "clough")
            for col in range(cols):
                np.testing.assert_allclose(s[col, :, i], law.storey_loop(drift[col, :, i]), rtol=0,
                                           atol=1e-9 * storeys["fy"][i])
    # balance (Uang & Bertero 1990): with the trapezoidal rule it closes to round-off for any law
    total = kinetic + viscous + strain + hysteretic
    np.testing.assert_allclose(total, e_in, rtol=0, atol=1e-7 * np.abs(e_in).max())
    assert np.all(hysteretic[:, -1] > 0.01 * e_in[:, -1])
    # the isolator force follows the law under the computed base displacement (imposed_force is
    # checked against the closed forms in test_isolator_laws.py)
    if iso_kind in (1, 2) and nsub == 1:
        from isolation.bearings import Bilinear
        from isolation.dynamics.isolators import BoucWen, imposed_force
        for col in range(cols if iso_kind == 1 else 1):  # (the second smooth column is rate-dependent)
            if iso_kind == 1:
                kk, ff = isolator["k"][col], isolator["f"][col]
                bearing = Bilinear(60.0 + kk[0], 60.0, ff[0])
                if kk.size > 1 and kk[1] > 0.0:
                    bearing = bearing.parallel(Bilinear(kk[1], 0.0, ff[1]))
            else:
                beta = 0.5 * (1.0 - p[col, 5])
                bearing = BoucWen(Bilinear(60.0 + 18.0 / 0.0064, 60.0, 18.0), beta=beta)
            # smooth law: the kernel ends its Newton iteration with a first-order correction once the
            # step is below SMOOTH_ACCEPT D_y; at a reversal inside that step the one-sided slope is
            # the other side's, leaving an error in z up to SMOOTH_ACCEPT (seen: 7e-4 Q at one reversal)
            tolerance = 1e-9 * np.abs(force[col]).max() if iso_kind == 1 else 1.5e-3 * 18.0
            np.testing.assert_allclose(force[col], imposed_force(bearing, ub[col]), rtol=0, atol=tolerance)


# --- storey laws under imposed drift (the kernel's storey_force through ShearBuilding.storey_loop) ------

def _path(*points, per_mm=10):
    """Piecewise-linear drift path through the given drifts [mm], in steps of 0.1 mm; returns m."""
    out = [points[0]]
    for a, b in zip(points[:-1], points[1:], strict=False):
        n = max(1, int(round(abs(b - a) * per_mm)))
        out.extend(np.linspace(a, b, n + 1)[1:])
    return np.asarray(out) * 1e-3


def _force_at(path, force, target_mm, occurrence):
    hits = np.nonzero(np.isclose(path, target_mm * 1e-3, atol=1e-12))[0]
    return force[hits[occurrence]]


@pytest.mark.parametrize("hysteresis", ["bilinear", "clough"])
def test_storey_laws_with_hardening_at_hand_derived_points(hysteresis):
    # k = 1e4 kN/m, F_y = 50 kN (d_y = 5 mm), alpha = 0.1: backbone F_y + alpha k (d - d_y) beyond d_y.
    # Bilinear (kinematic hardening): elastic range 2 (1 - alpha) F_y = 90 kN after each reversal.
    # Clough & Johnston (1966), rules of the kernel's notes, derived by hand:
    #   0 -> -10 mm: -55 kN; unload at k to zero force at -4.5 mm; back to -7 mm: -25 kN (elastic);
    #   reload from -4.5 mm towards the positive yield point (5 mm, 50): 0 mm -> 50 x 4.5/9.5;
    #   8 mm on the backbone: 53; unload to zero at 2.7 mm, reload towards (-10 mm, -55):
    #   -3.65 mm (half way) -> -27.5; -12 mm on the backbone: -57.
    from isolation.dynamics.structure import ShearBuilding

    b = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0], hardening=0.1, hysteresis=hysteresis)
    path = _path(0.0, -10.0, -7.0, -10.0, 0.0, 8.0, -2.0, -3.65, -12.0)
    force = b.storey_loop(path)
    assert _force_at(path, force, -10.0, 0) == pytest.approx(-55.0, rel=1e-12)
    assert _force_at(path, force, -7.0, 1) == pytest.approx(-25.0, rel=1e-9)
    assert _force_at(path, force, -10.0, 1) == pytest.approx(-55.0, rel=1e-9)
    assert _force_at(path, force, 8.0, 0) == pytest.approx(53.0, rel=1e-9)
    assert _force_at(path, force, -12.0, 0) == pytest.approx(-57.0, rel=1e-9)
    if hysteresis == "clough":
        assert _force_at(path, force, 0.0, 1) == pytest.approx(50.0 * 4.5 / 9.5, rel=1e-9)
        assert _force_at(path, force, -3.65, 0) == pytest.approx(-27.5, rel=1e-9)
        assert _force_at(path, force, -4.5, 1) == pytest.approx(0.0, abs=1e-9)
    else:
        # s = alpha k d + q, |q| <= (1 - alpha) F_y = 45 with q changing at (1 - alpha) k: from -55 at
        # -10 mm elastic (at k) for 10 mm, to 45 at 0 mm, then 45 + 1 kN/mm d: 2 mm -> 47, 8 mm -> 53;
        # from 53 elastic to -47 at -2 mm, then -45 + 1 kN/mm d: -3.65 mm -> -48.65
        assert _force_at(path, force, 0.0, 1) == pytest.approx(45.0, rel=1e-9)
        assert _force_at(path, force, 2.0, 0) == pytest.approx(47.0, rel=1e-9)
        assert _force_at(path, force, -2.0, 2) == pytest.approx(-47.0, rel=1e-9)
        assert _force_at(path, force, -3.65, 0) == pytest.approx(-48.65, rel=1e-9)
    # the reloading line of Clough never lies above the backbone; both laws stay inside it
    backbone = np.where(np.abs(path) > 0.005, np.sign(path) * (50.0 + 1000.0 * (np.abs(path) - 0.005)),
                        1e4 * path)
    assert np.all(np.abs(force) <= np.abs(backbone) + 50.0 * (1 + 1e-12))


def test_clough_reloads_towards_the_first_yield_point_when_that_side_never_yielded():
    # No hardening, push only one way: reloading in the other direction aims at (-d_y, -F_y);
    # after a further push beyond 10 mm, the line aims at the new peak (hand-derived).
    from isolation.dynamics.structure import ShearBuilding

    b = ShearBuilding([100.0], [1e4], [3.0], yield_shears=[50.0], hysteresis="clough")
    path = _path(0.0, 10.0, 0.0, -5.0, 14.0, 0.0, 7.0)
    force = b.storey_loop(path)
    assert _force_at(path, force, 0.0, 1) == pytest.approx(-25.0, rel=1e-9)   # line (5, 0) -> (-5, -50)
    assert _force_at(path, force, -5.0, 0) == pytest.approx(-50.0, rel=1e-9)
    assert _force_at(path, force, 5.0, 1) == pytest.approx(0.0, abs=1e-9)     # unloading from (10, 50)
    assert _force_at(path, force, 5.0, 2) == pytest.approx(25.0, rel=1e-9)    # line (0, 0) -> (10, 50)
    assert _force_at(path, force, 14.0, 0) == pytest.approx(50.0, rel=1e-9)
    # from (14, 50): zero force at 9 mm; reloading towards (-5, -50); then back up: elastic from the
    # reversal at 0 mm (force -50 x 9/14 = -32.14) to zero at 3.214 mm, then the line towards (14, 50)
    f0 = -50.0 * 9.0 / 14.0
    assert _force_at(path, force, 0.0, 3) == pytest.approx(f0, rel=1e-9)
    zero = -f0 / 1e4 * 1e3  # mm
    assert _force_at(path, force, 7.0, -1) == pytest.approx(50.0 * (7.0 - zero) / (14.0 - zero), rel=1e-9)


# --- Newton iterations of the isolator solvers -------------------------------------------------------

CONVERGENCE_LAWS = {
    # linear (elements never yield): the first Newton step from the elastic tangent is exact
    "linear": (("ep", 10.0, (900.0, 300.0), (1e9, 1e9)), 1),
    "no elements": (("ep", 10.0, (), ()), 1),
    # one elastic-plastic element: one elastic trial and one plastic correction, both exact
    "one element": (("ep", 10.0, (900.0,), (3.0,)), 1),
    # piecewise-linear Newton with the tangent of the segment it lands on: at most one more pass
    # per element that changes state within the step (two elements: 3)
    "two elements": (("ep", 10.0, (900.0, 300.0), (3.0, 2.0)), 3),
    # smooth law: Newton from the one-sided tangent on a concave residual, quadratic convergence
    # from about D_y to the stopping tolerance (1e-4 D_y) in a few corrections (common practice: 4)
    "smooth": (("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, 0.5), 4),
    "smooth beta 0.8": (("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, 0.8), 4),
    "smooth beta 0.3": (("smooth", 10.0, 3.0, 3.0, 0.0, 0.003, 0.3), 4),
    "smooth rate": (("smooth", 10.0, 3.0, 1.5, 20.0, 0.003, 0.5), 4),
    "sharp rate": (("sharp", 10.0, 3.0, 1.5, 20.0, 0.003), 4),
}


@pytest.mark.parametrize("engine, name", [(e, n) for n in CONVERGENCE_LAWS for e in ENGINES
                                          if not (e == "integrate" and CONVERGENCE_LAWS[n][0][0] == "sharp")])
def test_isolator_newton_converges_within_the_iterations_its_method_needs(engine, name, monkeypatch):
    # (the numpy engine has no sharp friction law)
    law, iterations = CONVERGENCE_LAWS[name]
    dt = 0.01
    g = 6.0 * _ground(400, dt, seed=2)
    ground = np.vstack([g, -0.6 * g])
    model = (np.array([2.0, 1.0]), chain([2.0, 1.0], [800.0], base=True)[1], np.diag([0.0, 0.5]))
    reference = respond(engine, *model, ground, dt, law=law, damper=4.0)
    monkeypatch.setattr(newmark, "MAX_ITERATIONS", iterations)
    fast = respond(engine, *model, ground, dt, law=law, damper=4.0)
    assert np.abs(reference[0][:, :, 0]).max() > 0.05
    for a, b in zip(reference, fast, strict=True):
        np.testing.assert_allclose(b, a, rtol=0, atol=1e-9 * np.abs(a).max())
    if iterations > 1:
        monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
        with pytest.raises(RunError):
            respond(engine, *model, ground, dt, law=law, damper=4.0)


@pytest.mark.parametrize("engine, law", [
    ("integrate", ("ep", 10.0, (3e4, 1e4), (0.3, 0.1))),
    ("integrate", ("smooth", 10.0, 0.4, 0.4, 0.0, 1e-4, 0.5)),
    ("integrate", ("smooth", 10.0, 0.4, 0.2, 10.0, 1e-4, 0.7)),
    ("simulate", ("ep", 10.0, (3e4, 1e4), (0.3, 0.1))),
    ("simulate", ("smooth", 10.0, 0.4, 0.2, 10.0, 1e-4, 0.5)),
])
def test_failure_in_the_first_step_reports_its_end_time_and_the_column(engine, law, monkeypatch):
    # A jump of the ground acceleration at the first step makes the isolator yield at once: one
    # iteration cannot settle it, so the first step (ending at t = dt) fails, in the second column.
    monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
    ground = np.vstack([np.zeros(20), np.r_[0.0, np.full(19, 20.0)]])
    with pytest.raises(RunError) as info:
        respond(engine, np.array([1.0]), np.zeros((1, 1)), np.zeros((1, 1)), ground, 0.01, law=law)
    what = "isolator" if engine == "simulate" else ("elastic-plastic isolator" if law[0] == "ep" else "smooth isolator")
    pattern = (rf"^{what}: no convergence at t = 0\.0100 s in case 'case', record 1 \(residual "
               r"[0-9.e+-]+ m after 1 iterations\); try a smaller dt or check the "
               + ("model" if engine == "simulate" else "isolator") + r" parameters$")
    assert re.match(pattern, str(info.value)), str(info.value)
    residual = float(re.search(r"residual ([0-9.e+-]+) m", str(info.value)).group(1))
    assert 0.0 < residual < 1.0


def test_yielding_storey_failure_in_the_first_step_reports_its_end_time(monkeypatch):
    monkeypatch.setattr(newmark, "MAX_ITERATIONS", 1)
    m, k = chain([1.0, 1.0], [100.0, 100.0])
    storeys = {"lower": np.array([-1, 0]), "upper": np.array([0, 1]), "kind": 2, "k": np.array([100.0, 100.0]),
               "k_geo": np.zeros(2), "fy": np.array([1.0, 1.0]), "alpha": 0.0}
    ground = np.vstack([np.zeros(20), np.r_[0.0, np.full(19, 500.0)], np.zeros(20)])
    with pytest.raises(RunError, match=r"^yielding storeys: no convergence at t = 0\.0200 s in case 'f', record 1 "
                                       r"\(residual [0-9.]+(e[+-]\d+)? kN after 1 iterations\)") as info:
        newmark.simulate(m, k, np.zeros((2, 2)), storeys, None, ground, 0.02, 1, [("f", 0), ("f", 1), ("f", 2)],
                         compiled=False)
    # the residual is the change of the storey forces' departure in the last pass: the first pass
    # starts from zero and the storeys yield, so it is a good part of F_y
    residual = float(re.search(r"residual ([0-9.e+-]+) kN", str(info.value)).group(1))
    assert 0.01 < residual


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
    g = 6.0 * _ground(400, dt, seed=2)
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
