"""Named steps of the compiled plan loop (:mod:`isolation.dynamics.plan_kernel`), one time step each.

Scalar loops that numba compiles (cached with the other plan-kernel modules, see
:func:`isolation.dynamics.plan_kernel_bearings.compile_kernel`): the linear Newmark predictor, the
bearings' axial loads, the storeys' departures settled for given bearing forces, Newton's method on
the base motion, the storeys' commit and the Newmark update with the energy sums.  Matrix-vector
products run row by row of the (symmetric, or given transposed) matrix so that the inner loop is
contiguous and free of a running sum.
"""

from __future__ import annotations

import math

from isolation.dynamics.plan_kernel_bearings import available, bearing_trial, compile_kernel

__all__ = ["linear_step", "axial_loads", "settle_storeys", "solve3", "predict_base", "base_newton",
           "commit_storeys", "advance"]


def linear_step(n, col, dt, m, c_t, k_inv, mr, g, u, v, a, work, u_lin):
    """Displacement of step n + 1 of the linear system (bearings and storey departures held at zero)."""
    nd = m.shape[0]
    c1 = 4.0 / dt
    c2 = 2.0 / dt
    c4 = 4.0 / dt**2
    g0 = g[col, 0, n + 1]
    g1 = g[col, 1, n + 1]
    for j in range(nd):
        work[0, j] = m[j] * (c4 * u[j] + c1 * v[j] + a[j]) - (mr[j, 0] * g0 + mr[j, 1] * g1)
        work[1, j] = c2 * u[j] + v[j]
        u_lin[j] = 0.0
    for q in range(nd):  # rhs += C (c2 u + v), row by row of C'
        w = work[1, q]
        for j in range(nd):
            work[0, j] += c_t[q, j] * w
    for q in range(nd):  # u_lin = rhs' K_hat^-1
        w = work[0, q]
        for j in range(nd):
            u_lin[j] += w * k_inv[q, j]


def axial_loads(n, col, g, a, floor_mass, heights, gravity, vert, has_vert, pos, sums, axial):
    """Bearing axial loads: gravity (times 1 + a_v) plus the previous step's overturning on a rigid base."""
    moment_x = 0.0
    moment_y = 0.0
    for lev in range(floor_mass.shape[0]):
        moment_y -= floor_mass[lev] * (a[3 * lev] + g[col, 0, n]) * heights[lev]
        moment_x -= floor_mass[lev] * (a[3 * lev + 1] + g[col, 1, n]) * heights[lev]
    for b in range(pos.shape[0]):
        share = gravity[col, b] * (1.0 + vert[col, n + 1]) if has_vert else gravity[col, b]
        if sums[0] > 0.0:
            share += moment_y * pos[b, 0] / sums[0]
        if sums[1] > 0.0:
            share += moment_x * pos[b, 1] / sums[1]
        axial[b] = share


def settle_storeys(f0, f1, f2, d_lin, dkb, dkd_t, kp, fp, q_c, d_c, p_it, q_t, p_t, drift, tol_storey,
                   max_iterations):
    """Storeys' departures ``p_it`` for bearing forces held (fixed point on the condensed drift equations
    d = D'u_lin - dkb f - dkd p, ``dkd_t`` = dkd'); True when they settle to ``tol_storey``."""
    ns = p_it.shape[0]
    for _ in range(max_iterations):
        for sp in range(ns):
            drift[sp] = d_lin[sp] - f0 * dkb[sp, 0] - f1 * dkb[sp, 1] - f2 * dkb[sp, 2]
        for m_ in range(ns):
            w = p_it[m_]
            for sp in range(ns):
                drift[sp] -= dkd_t[m_, sp] * w
        moved = 0.0
        for sp in range(ns):
            q = q_c[sp] + kp[sp] * (drift[sp] - d_c[sp])
            q = min(max(q, -fp[sp]), fp[sp])
            q_t[sp] = q
            p_t[sp] = q - kp[sp] * drift[sp]
            moved = max(moved, abs(p_t[sp] - p_it[sp]))
            p_it[sp] = p_t[sp]
        if moved <= tol_storey:
            return True
    return False


def solve3(a, r, out):
    """Solution of the 3 x 3 system a x = r (Cramer's rule) into ``out``; False when singular."""
    c00 = a[1, 1] * a[2, 2] - a[1, 2] * a[2, 1]
    c01 = a[1, 2] * a[2, 0] - a[1, 0] * a[2, 2]
    c02 = a[1, 0] * a[2, 1] - a[1, 1] * a[2, 0]
    det = a[0, 0] * c00 + a[0, 1] * c01 + a[0, 2] * c02
    if det == 0.0 or not math.isfinite(det):
        return False
    out[0] = (r[0] * c00 + r[1] * (a[0, 2] * a[2, 1] - a[0, 1] * a[2, 2])
              + r[2] * (a[0, 1] * a[1, 2] - a[0, 2] * a[1, 1])) / det
    out[1] = (r[0] * c01 + r[1] * (a[0, 0] * a[2, 2] - a[0, 2] * a[2, 0])
              + r[2] * (a[0, 2] * a[1, 0] - a[0, 0] * a[1, 2])) / det
    out[2] = (r[0] * c02 + r[1] * (a[0, 1] * a[2, 0] - a[0, 0] * a[2, 1])
              + r[2] * (a[0, 0] * a[1, 1] - a[0, 1] * a[1, 0])) / det
    return True


def _target(u_lin, k_inv, kd_t, f0, f1, f2, p_it, yielding, i):
    """Base motion i of u = u_lin - K_hat^-1 (P_b + D p) for the forces given."""
    s = u_lin[i] - f0 * k_inv[0, i] - f1 * k_inv[1, i] - f2 * k_inv[2, i]
    if yielding:
        for sp in range(p_it.shape[0]):
            s -= p_it[sp] * kd_t[sp, i]
    return s


def predict_base(ub, u, k_inv, b):
    """Predictor of the base motion: the step equations with the bearing forces linearised about the last
    step, f = f_n + J_n (ub - u_n), J_n the tangent of the last evaluation; ``ub`` holds
    u_lin - G f_n (- K3 p) on entry, G the base block of K_hat^-1; unchanged where the system is singular."""
    for i in range(3):
        b.r[i] = ub[i] - u[i]
        for j in range(3):
            b.a[i, j] = (1.0 if i == j else 0.0) + (k_inv[0, i] * b.jac[0, j] + k_inv[1, i] * b.jac[1, j]
                                                    + k_inv[2, i] * b.jac[2, j])
    if solve3(b.a, b.r, b.step):
        for i in range(3):
            ub[i] = u[i] + b.step[i]


def base_newton(col, ub, u_lin, k_inv, kd_t, b, s, tolerance, rmax, max_iterations, evaluations):
    """Newton's method on the base motion ``ub`` (with the storeys' departures settled for every trial of
    the bearing forces when ``s.yielding``): the converged bearing forces, or a flag of failure.

    ``b`` holds the bearings' arrays and work arrays, ``s`` the storeys' (see :mod:`plan_kernel`).
    Each iteration evaluates the bearings once; the step solves (I + G J) du = r, G the base block
    of K_hat^-1 and J the bearings' tangent; where the residual grows, a plain fixed-point step.
    """
    previous = math.inf
    for _ in range(max_iterations):
        evaluations[col] += 1
        f0, f1, f2 = bearing_trial(col, ub, b.pos, b.state, b.p, b.axial, b.law, b.strength, b.inv_ey, b.c2,
                                   b.trial, b.p_t, b.jac)
        if s.yielding and not settle_storeys(f0, f1, f2, s.d_lin, s.dkb, s.dkd_t, s.kp, s.fp, s.q_c, s.d_c,
                                             s.p_it, s.q_t, s.p_t, s.drift, s.tolerance, max_iterations):
            return False, f0, f1, f2
        size = 0.0
        for i in range(3):
            b.r[i] = ub[i] - _target(u_lin, k_inv, kd_t, f0, f1, f2, s.p_it, s.yielding, i)
            size = max(size, abs(b.r[i]) * (rmax if i == 2 else 1.0))
        for i in range(3):
            for j in range(3):
                b.a[i, j] = (1.0 if i == j else 0.0) + (k_inv[0, i] * b.jac[0, j] + k_inv[1, i] * b.jac[1, j]
                                                        + k_inv[2, i] * b.jac[2, j])
        if size > previous or not solve3(b.a, b.r, b.step):
            for i in range(3):
                b.step[i] = b.r[i]
        previous = size
        change = max(abs(b.step[0]), abs(b.step[1]), abs(b.step[2]) * rmax)
        if change <= tolerance:
            return True, f0, f1, f2
        for i in range(3):
            ub[i] -= b.step[i]
    return False, 0.0, 0.0, 0.0


def commit_storeys(f0, f1, f2, u_lin, k_inv, kd_t, drift_map, stiffness, s, u_next, storey_peak, col):
    """The storeys' state at the converged step: u_next, the committed drift and force, the work of the
    departures over the step and the running peak of the storey shears; returns that work."""
    ns = s.p_it.shape[0]
    nd = u_lin.shape[0]
    settle_storeys(f0, f1, f2, s.d_lin, s.dkb, s.dkd_t, s.kp, s.fp, s.q_c, s.d_c, s.p_it, s.q_t, s.p_t,
                   s.drift, math.inf, 1)
    for j in range(nd):
        u_next[j] = u_lin[j] - f0 * k_inv[0, j] - f1 * k_inv[1, j] - f2 * k_inv[2, j]
    for sp in range(ns):
        w = s.p_t[sp]
        for j in range(nd):
            u_next[j] -= w * kd_t[sp, j]
    work = 0.0
    for sp in range(ns):
        d = 0.0
        for j in range(nd):
            d += u_next[j] * drift_map[j, sp]
        work += 0.5 * (s.p_c[sp] + s.p_t[sp]) * (d - s.d_c[sp])
        s.q_c[sp] = s.q_t[sp]
        s.p_c[sp] = s.p_t[sp]
        s.d_c[sp] = d
        storey_peak[col, sp] = max(storey_peak[col, sp], abs(stiffness[sp] * d + s.p_t[sp]))
    return work


def advance(n, col, dt, m, c_t, mr, g, u, v, a, u_next, work, u_out, a_out):
    """Newmark update to step n + 1 (accelerations, velocities, outputs); the increments of input and
    damping energy over the step (trapezoidal rule)."""
    nd = m.shape[0]
    c1 = 4.0 / dt
    c4 = 4.0 / dt**2
    g0 = g[col, 0, n] + g[col, 0, n + 1]
    g1 = g[col, 1, n] + g[col, 1, n + 1]
    for j in range(nd):
        a_next = c4 * (u_next[j] - u[j]) - c1 * v[j] - a[j]
        v_next = v[j] + 0.5 * dt * (a[j] + a_next)
        work[0, j] = v[j] + v_next  # v_n + v_n+1
        work[1, j] = 0.0
        u[j] = u_next[j]
        v[j] = v_next
        a[j] = a_next
        u_out[n + 1, col, j] = u_next[j]
        a_out[n + 1, col, j] = a_next
    for q in range(nd):  # C (v_n + v_n+1), row by row of C'
        w = work[0, q]
        for j in range(nd):
            work[1, j] += c_t[q, j] * w
    s_in = 0.0
    s_damp = 0.0
    for j in range(nd):
        s_in += work[0, j] * (mr[j, 0] * g0 + mr[j, 1] * g1)
        s_damp += work[0, j] * work[1, j]
    return -0.25 * dt * s_in, 0.25 * dt * s_damp


if available:
    linear_step = compile_kernel(linear_step, inline=False)
    axial_loads = compile_kernel(axial_loads, inline=False)
    settle_storeys = compile_kernel(settle_storeys, inline=False)
    solve3 = compile_kernel(solve3)
    _target = compile_kernel(_target)
    predict_base = compile_kernel(predict_base)
    base_newton = compile_kernel(base_newton, inline=False)
    commit_storeys = compile_kernel(commit_storeys, inline=False)
    advance = compile_kernel(advance, inline=False)
