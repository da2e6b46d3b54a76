"""Compiled time loop of the plan model (numba), column by column, isolated or on a fixed base.

The same equations as the array version in :mod:`isolation.dynamics.plan_history`
(Newmark average acceleration, bearings as forces on the base degrees of
freedom, overturning axial loads from the previous step; yielding storeys as
departures from their elastic force, settled to 1e-10 of the largest storey
strength for every trial of the bearing forces) and the same closed-form
bearing and storey updates as :mod:`isolation.dynamics.plan_bearings` and
:mod:`isolation.dynamics.plan_storeys`, written as scalar loops so that numba
compiles them (cached on disk): the steps in
:mod:`isolation.dynamics.plan_kernel_steps`, the bearings with their tangent in
:mod:`isolation.dynamics.plan_kernel_bearings`.  Where the array version
iterates on the base motion by fixed point, the compiled loop takes Newton
steps with the bearings' consistent tangent (a fixed-point step where the
residual grows), from a predictor with the bearing forces linearised about
the last step, to the same tolerance, 1e-9 of the smallest yield
displacement.  Each column converges on its own, so histories agree with the
array version to the iteration tolerance, not bit for bit.  Without numba the
array version runs.
"""

from __future__ import annotations

from collections import namedtuple
from typing import Callable

import numpy as np

from isolation.dynamics.plan_kernel_bearings import available, bearing_commit, compile_kernel
from isolation.dynamics.plan_kernel_steps import (
    _target,
    advance,
    axial_loads,
    base_newton,
    commit_storeys,
    linear_step,
    predict_base,
    settle_storeys,
)

__all__ = ["available", "plan_loop", "isolated_loop", "Bearings", "Storeys", "Loads", "Outputs"]

Bearings = namedtuple("Bearings", "pos state p axial law strength inv_ey c2 trial p_t jac a r step")
"""Bearings of the compiled loop: positions (nb, 2) [m]; state and trial (nb, 6) (d_x, d_y, v_x, v_y, z_x,
z_y); element forces p and p_t (nb, elements, 2); axial (nb,) [kN]; law (cols, nb, 6) (slider, k0,
Q_fast, Q_fast - Q_slow, rate, 1/Y); strength, inv_ey (cols, nb, elements); c2 = 2/dt; work arrays
jac, a (3, 3), r, step (3,)."""

Storeys = namedtuple("Storeys", "yielding d_lin dkb dkd_t kp fp q_c d_c p_c p_it q_t p_t drift tolerance")
"""Storey springs of the compiled loop (:mod:`isolation.dynamics.plan_storeys`): dkb = D' K_hat^-1[:, :3],
dkd_t = (D' K_hat^-1 D)', plastic stiffness and strength, committed and trial states (springs,)."""

Loads = namedtuple("Loads", "floor_mass heights gravity vert has_vert sums")
"""Axial loads: level masses [t] and heights [m] (isolation plane first), gravity share (cols, nb) [kN],
vertical ground acceleration (cols, steps) [g], whether given, (sum x^2, sum y^2) of the positions."""

Outputs = namedtuple("Outputs", "u a force axial_min axial_max uplift energy storey_peak storey_q evaluations")
"""Histories (steps, cols, dofs), base force (steps, cols, 3), bearing extremes and uplift (cols, nb),
energy sums (cols, 6), peak storey-spring force and final element force (cols, springs) [kN],
bearing evaluations (cols,)."""


def _reset(col, g, m, mr, u, v, a, b, s, out):
    u[:] = 0.0
    v[:] = 0.0
    b.state[:] = 0.0
    b.p[:] = 0.0
    b.jac[:] = 0.0
    s.q_c[:] = 0.0
    s.d_c[:] = 0.0
    s.p_c[:] = 0.0
    for j in range(m.shape[0]):
        a[j] = -(mr[j, 0] * g[col, 0, 0] + mr[j, 1] * g[col, 1, 0]) / m[j] if m[j] > 0 else 0.0
        out.u[0, col, j] = 0.0
        out.a[0, col, j] = a[j]
    for b_ in range(b.pos.shape[0]):
        out.axial_min[col, b_] = np.inf
        out.axial_max[col, b_] = -np.inf


def _solve(n, col, u, u_lin, k_inv, kd_t, drift_map, force, ub, b, s, tolerance, max_iterations, isolated, rmax,
           out):
    """Bearing forces and storey departures of step n + 1: (converged, f_x, f_y, moment)."""
    if s.yielding:
        for sp in range(s.p_it.shape[0]):
            s.p_it[sp] = s.p_c[sp]
            d = 0.0
            for j in range(u_lin.shape[0]):
                d += u_lin[j] * drift_map[j, sp]
            s.d_lin[sp] = d
    if not isolated:
        ok = settle_storeys(0.0, 0.0, 0.0, s.d_lin, s.dkb, s.dkd_t, s.kp, s.fp, s.q_c, s.d_c, s.p_it, s.q_t,
                            s.p_t, s.drift, s.tolerance, max_iterations) if s.yielding else True
        return ok, 0.0, 0.0, 0.0
    for i in range(3):  # the previous step's forces and departures
        ub[i] = _target(u_lin, k_inv, kd_t, force[0], force[1], force[2], s.p_it, s.yielding, i)
    predict_base(ub, u, k_inv, b)
    return base_newton(col, ub, u_lin, k_inv, kd_t, b, s, tolerance, rmax, max_iterations, out.evaluations)


def _column(col, dt, m, c_t, k_inv, kd_t, mr, g, drift_map, stiffness, b, s, loads, tolerance, max_iterations,
            isolated, rmax, vectors, work, out):
    """Every step of one column; 0, or the step at which an iteration failed."""
    u, v, a, u_lin, u_next, force, ub = vectors
    _reset(col, g, m, mr, u, v, a, b, s, out)
    force[:] = 0.0
    e_in = e_damp = e_bear = e_storey = peak_in = 0.0
    for n in range(g.shape[2] - 1):
        linear_step(n, col, dt, m, c_t, k_inv, mr, g, u, v, a, work, u_lin)
        if isolated:
            axial_loads(n, col, g, a, loads.floor_mass, loads.heights, loads.gravity, loads.vert, loads.has_vert,
                        b.pos, loads.sums, b.axial)
        ok, f0, f1, f2 = _solve(n, col, u, u_lin, k_inv, kd_t, drift_map, force, ub, b, s, tolerance,
                                max_iterations, isolated, rmax, out)
        if not ok:
            return n + 1
        if isolated:
            bearing_commit(col, b.law, b.state, b.p, b.trial, b.p_t, b.axial, out.uplift, out.axial_min,
                           out.axial_max)
        if s.yielding:
            e_storey += commit_storeys(f0, f1, f2, u_lin, k_inv, kd_t, drift_map, stiffness, s, u_next,
                                       out.storey_peak, col)
        else:
            for j in range(u_lin.shape[0]):
                u_next[j] = u_lin[j] - f0 * k_inv[0, j] - f1 * k_inv[1, j] - f2 * k_inv[2, j]
        if isolated:
            e_bear += 0.5 * ((force[0] + f0) * (u_next[0] - u[0]) + (force[1] + f1) * (u_next[1] - u[1])
                             + (force[2] + f2) * (u_next[2] - u[2]))
        force[0] = f0
        force[1] = f1
        force[2] = f2
        d_in, d_damp = advance(n, col, dt, m, c_t, mr, g, u, v, a, u_next, work, out.u, out.a)
        e_in += d_in
        e_damp += d_damp
        peak_in = max(peak_in, abs(e_in))
        out.force[n + 1, col, 0] = f0
        out.force[n + 1, col, 1] = f1
        out.force[n + 1, col, 2] = f2
    kinetic = 0.0
    for j in range(m.shape[0]):
        kinetic += 0.5 * m[j] * v[j] * v[j]
    out.energy[col, 0] = e_in
    out.energy[col, 1] = e_damp
    out.energy[col, 2] = e_bear
    out.energy[col, 3] = peak_in
    out.energy[col, 4] = kinetic
    out.energy[col, 5] = e_storey
    return 0


def _plan_loop(dt, m, c_t, k_inv, kd_t, mr, g, drift_map, stiffness, b, s, loads, tolerance, max_iterations,
               isolated, out):
    """Step every column of ``g`` (cols, 2, steps) [m/s2]; 0, or the first step at which an iteration failed.

    ``m`` is the diagonal of the (lumped) mass matrix, ``c_t`` the damping matrix transposed, ``k_inv``
    the inverse of K + 2C/dt + 4M/dt^2, ``kd_t`` = (K_hat^-1 D)', ``mr`` = M r; ``b``, ``s``, ``loads``
    and ``out`` are :data:`Bearings`, :data:`Storeys`, :data:`Loads` and :data:`Outputs`."""
    nd = m.shape[0]
    rmax = 1.0
    for i in range(b.pos.shape[0]):
        rmax = max(rmax, abs(b.pos[i, 0]), abs(b.pos[i, 1]))
    vectors = (np.zeros(nd), np.zeros(nd), np.zeros(nd), np.zeros(nd), np.zeros(nd), np.zeros(3), np.zeros(3))
    work = np.zeros((2, nd))
    for col in range(g.shape[0]):
        failed = _column(col, dt, m, c_t, k_inv, kd_t, mr, g, drift_map, stiffness, b, s, loads, tolerance,
                         max_iterations, isolated, rmax, vectors, work, out)
        if failed:
            return failed
        for sp in range(s.q_c.shape[0]):
            out.storey_q[col, sp] = s.q_c[sp]
    return 0


plan_loop: Callable[..., int] | None
isolated_loop: Callable[..., int] | None
if available:
    _reset = compile_kernel(_reset, inline=False)
    _solve = compile_kernel(_solve, inline=False)
    _column = compile_kernel(_column, inline=False)
    plan_loop = compile_kernel(_plan_loop, inline=False)
else:  # pragma: no cover
    plan_loop = None
isolated_loop = plan_loop
"""Earlier name of :data:`plan_loop` (isolated and fixed-base plan buildings alike)."""
