"""The column-vectorised numpy engine for elastic storeys (kept importable from :mod:`isolation.dynamics.newmark`).

:func:`integrate` advances every column (record x case) together with numpy;
the engine the history runs use is the compiled kernel
(:func:`isolation.dynamics.newmark.simulate`). The equation of motion,
relative to the ground, is

    M u'' + C u' + K u + e_b (F_iso(u_b, history) + c_d u_b') = -M 1 a_g(t)

where K and C are the linear superstructure (acting on storey motion
relative to the base), e_b selects the base degree of freedom, F_iso is the
isolation-plane law and c_d a linear damper. Every column of the state holds
one (record, case) pair; all columns advance together.

Newmark's average-acceleration rule (gamma = 1/2, beta = 1/4; Newmark 1959,
unconditionally stable) makes the step linear in u_{n+1} except for the
isolator force, so with A = K + (4/dt^2) M + (2/dt) C

    u_{n+1} = y - g f,   g = A^-1 e_b,

where y is the response with f = 0. The only nonlinear unknown per column is
the base displacement, found from the scalar equation u_b + g_b f(u_b) = y_b
by Newton's method: exactly (to round-off) for elastic-plastic elements,
whose return map is piecewise linear, and to a tight tolerance for the smooth
law, whose hysteretic variable is integrated in closed form. A column that
fails to converge raises :class:`isolation.errors.RunError` naming the time,
the case and the record.

References
----------
Newmark, N. M. (1959). A method of computation for structural dynamics. J. Eng.
Mech. Div. ASCE 85(3).
Chopra, A. K. Dynamics of Structures, section 5.7 (Newton iteration).
"""

from __future__ import annotations

import numpy as np

from isolation.dynamics.isolators import SmoothColumns
from isolation.errors import RunError

__all__ = ["integrate", "MAX_ITERATIONS", "CONVERGENCE_DISPLACEMENT", "NEWTON_STEP"]

MAX_ITERATIONS = 40
CONVERGENCE_DISPLACEMENT = 1e-11
"""Elastic-plastic Newton stops when the base-displacement residual is below this. [m]"""
NEWTON_STEP = 1e-4
"""Smooth-law Newton stops when its correction is below this fraction of D_y; the error left
after the final (first-order) correction is of order 1e-8 D_y or less. [-]"""


def _step_operators(m: np.ndarray, k: np.ndarray, c: np.ndarray, dt: float):
    n = m.shape[0]
    a0, a1, a2 = 4.0 / dt**2, 2.0 / dt, 4.0 / dt
    a_hat = k + a0 * m + a1 * c
    a_inv = np.linalg.inv(a_hat)
    gu = a_inv @ (a0 * m + a1 * c)
    gv = a_inv @ (a2 * m + c)
    ga = a_inv @ m
    gg = -a_inv @ np.diag(m)
    g = a_inv[:, 0]
    eye = np.eye(n)
    t = np.block([
        [gu, gv, ga],
        [a1 * (gu - eye), a1 * gv - eye, a1 * ga],
        [a0 * (gu - eye), a0 * gv - a2 * eye, a0 * ga - eye],
    ])
    b = np.concatenate([gg, a1 * gg, a0 * gg])
    e = -np.concatenate([g, a1 * g, a0 * g])
    return t, b, e, float(g[0])


def integrate(m, k, c, law_columns, damper, ground, dt, labels):
    """Integrate all columns through all steps.

    Parameters
    ----------
    m, k, c : arrays (dofs, dofs)
        Mass [t], stiffness [kN/m], damping [kN s/m] of the linear part;
        degree of freedom 0 is the base.
    law_columns : ElasticPlasticColumns, SmoothColumns or None
        Isolation-plane law, one parameter set per column; None for a
        linear model (fixed base), which then needs no base degree of freedom.
    damper : array (cols,)
        Linear damper coefficient per column. [kN s/m]
    ground : array (steps, cols)
        Ground acceleration. [m/s2]
    dt : float
        Time step. [s]
    labels : list of (case, record)
        For error messages.

    Returns
    -------
    dict
        "state": (steps, 3 dofs, cols) [u; v; a] relative to the ground
        [m, m/s, m/s2]; "force": (steps, cols) isolator force [kN] (None for
        a linear model); "hysteretic_state": z (steps, cols) [-] for a smooth
        law or element forces (steps, elements, cols) [kN].
    """
    steps, cols = ground.shape
    dofs = m.shape[0]
    t_op, b, e, h = _step_operators(m, k, c, dt)
    b = b[:, None]
    e = e[:, None]
    c2 = 2.0 / dt
    damper = np.asarray(damper, dtype=float)
    state = np.empty((steps, 3 * dofs, cols))
    force = np.zeros((steps, cols))
    x = state[0]
    x[: 2 * dofs] = 0.0
    x[2 * dofs:] = -ground[0]  # at rest: M a_0 = -M 1 a_g(0)
    if law_columns is None:
        for n in range(steps - 1):
            x_next = state[n + 1]
            np.matmul(t_op, x, out=x_next)
            x_next += b * ground[n + 1]
            x = x_next
        return {"state": state, "force": None, "hysteretic_state": None}
    smooth = isinstance(law_columns, SmoothColumns)
    if smooth:
        solve_smooth = _SmoothSolver(law_columns, h, h * damper, c2, cols)
        hyst = np.zeros((steps, cols))  # hysteretic variable z
    else:
        # step constants of the return map (stored on this run's own column object)
        law_columns.one_h_k0 = 1.0 + h * law_columns.k0
        law_columns.jac_plastic = 1.0 + h * law_columns.k0 + h * damper * c2
        law_columns.jac_elastic = law_columns.jac_plastic + h * law_columns.k.sum(axis=0)
        law_columns.minus_f = -law_columns.f[0] if law_columns.count else None
        hyst = np.zeros((steps, law_columns.count, cols))  # element forces
    z = hyst[0]
    lc = law_columns
    hd = h * damper
    for n in range(steps - 1):
        y = t_op @ x
        y += b * ground[n + 1]
        yb = y[0]
        un = x[0]
        vn = x[dofs]
        if smooth:
            f_iso, v_base, z_new = solve_smooth(un, vn, z, yb, n, dt, labels)
        else:
            f_iso, v_base, z_new = _solve_elastic_plastic(lc, un, vn, z, yb, h, hd, c2, n, dt, labels)
        x_next = state[n + 1]
        np.multiply(e, f_iso + damper * v_base, out=x_next)
        x_next += y
        x = x_next
        force[n + 1] = f_iso
        hyst[n + 1] = z_new
        z = hyst[n + 1]
    return {"state": state, "force": force, "hysteretic_state": hyst}


def _fail(residual, n, dt, labels, what):
    column = int(np.argmax(np.abs(residual)))
    case, record = labels[column]
    raise RunError(
        f"{what}: no convergence at t = {(n + 1) * dt:.4f} s in case {case!r}, record {record} "
        f"(residual {abs(residual[column]):.3g} m after {MAX_ITERATIONS} iterations); "
        "try a smaller dt or check the isolator parameters"
    )


def _solve_bilinear(lc, un, vn, q, yb, h, hd, c2):
    """One elastic-plastic element: exact in one elastic trial and one plastic correction.

    With the elastic trial du_e and the returned force q = clip(q_n + k du_e, -f, f),
    the residual is h (q - q_trial); if the element yields in the trial it
    yields in the solution (the residual is monotone), and du follows from
    the plastic tangent.
    """
    k = lc.k[0]
    f = lc.f[0]
    r0 = lc.one_h_k0 * un + h * q[0] - hd * vn - yb
    du = -r0 / lc.jac_elastic
    trial = q[0] + k * du
    q_new = np.minimum(np.maximum(trial, lc.minus_f), f)
    du -= h * (q_new - trial) / lc.jac_plastic
    f_iso = lc.k0 * (un + du) + q_new
    return f_iso, c2 * du - vn, q_new[None, :]


def _solve_elastic_plastic(lc, un, vn, q, yb, h, hd, c2, n, dt, labels):
    """Exact return map: solve u + h (F(u) + c_d v(u)) = y_b with piecewise-linear F."""
    if lc.count == 1:
        return _solve_bilinear(lc, un, vn, q, yb, h, hd, c2)
    k, f, k0 = lc.k, lc.f, lc.k0
    r0 = un * (1.0 + h * k0) + h * q.sum(axis=0) - hd * vn - yb
    direction = np.where(r0 > 0.0, -1.0, 1.0)
    active = ~((np.abs(q) >= f) & (q * direction > 0.0))
    kt = k0 + (k * active).sum(axis=0)
    du = -r0 / (1.0 + h * kt + hd * c2)
    tol = CONVERGENCE_DISPLACEMENT
    for _ in range(MAX_ITERATIONS):
        trial = q + k * du
        q_new = np.clip(trial, -f, f)
        v = c2 * du - vn
        f_iso = k0 * (un + du) + q_new.sum(axis=0)
        r = un + du + h * f_iso + hd * v - yb
        if np.abs(r).max() <= tol:
            return f_iso, v, q_new
        kt = k0 + (k * (np.abs(trial) < f)).sum(axis=0)
        du = du - r / (1.0 + h * kt + hd * c2)
    _fail(r, n, dt, labels, "elastic-plastic isolator")


class _SmoothSolver:
    """Newton on u + h (k u + Q(v) z(u) + c_d v) = y_b with the closed-form Bouc-Wen update.

    The first step uses the one-sided tangent at du = 0 in the direction the
    residual points to; the residual is concave along that direction (the
    hysteretic variable saturates), so the iterates approach the root
    monotonically. Iteration stops when the Newton correction is below
    NEWTON_STEP x D_y; that last correction is applied to z and Q through
    their derivatives, leaving an error of the order of the squared
    correction over D_y.

    Constants are held as arrays of the column count: numpy multiplies two
    small arrays faster than an array and a Python float.
    """

    def __init__(self, lc, h, hd, c2, cols):
        full = lambda value: np.full(cols, value, dtype=float)  # noqa: E731
        self.lc = lc
        self.h = full(h)
        self.c2 = full(c2)
        self.hd = hd
        self.k0 = lc.k0
        self.inv_dy = lc.inv_dy
        self.h_inv_dy = h * lc.inv_dy
        self.one_h_k0 = 1.0 + h * lc.k0
        self.jac_const = 1.0 + h * lc.k0 + hd * c2
        self.zero = full(0.0)
        self.one = full(1.0)
        self.low = full(-1.0 + 1e-15)
        self.high = full(1.0 - 1e-15)
        self.unload = full(lc.unload)
        self.q_fast = lc.q_fast
        self.q_drop = lc.q_drop
        self.minus_rate = lc.minus_rate
        self.q_drop_rate_c2 = lc.q_drop * lc.rate * c2
        self.rate = lc.rate_dependent
        self.tol = NEWTON_STEP * lc.dy_min
        self.simple = lc.unload == 0.0

    def __call__(self, un, vn, z, yb, n, dt, labels):
        lc = self.lc
        h, zero, one = self.h, self.zero, self.one
        inv_dy, h_inv_dy, jac_const = self.inv_dy, self.h_inv_dy, self.jac_const
        negative = z < zero
        positive = z > zero
        if self.simple:
            at = np.arctanh(np.minimum(np.maximum(z, self.low), self.high))
            theta_up = np.where(negative, z, at)
            theta_down = np.negative(np.where(positive, z, at))
        else:
            theta_up = lc.theta(z)
            theta_down = lc.theta(-z)
        base = un * self.one_h_k0 - yb - self.hd * vn
        if self.rate:
            decay = np.exp(self.minus_rate * np.abs(vn))
            q = self.q_fast - self.q_drop * decay
            dq = self.q_drop_rate_c2 * decay * np.sign(np.negative(vn))
        else:
            q = self.q_fast
        r = base + h * q * z
        z2 = z * z
        # one-sided slope of z at du = 0: loading (z du > 0) 1 - z^2, unloading 1 - c z^2
        unloading = np.where(r > zero, positive, negative)
        slope = one - np.where(unloading, self.unload * z2, z2)
        jac = jac_const + q * slope * h_inv_dy
        if self.rate:
            jac += h * z * dq
        du = np.negative(r / jac)
        for _ in range(MAX_ITERATIONS):
            back = np.signbit(du)
            xi = np.abs(du)
            xi *= inv_dy
            xi += np.where(back, theta_down, theta_up)
            if self.simple:
                ahead = np.tanh(xi)
                behind = xi < zero
                w = np.where(behind, xi, ahead)
                slope = np.where(behind, one, one - ahead * ahead)
            else:
                w, slope = lc.shape(xi)
            z_new = np.where(back, np.negative(w), w)
            if self.rate:
                v = self.c2 * du - vn
                decay = np.exp(self.minus_rate * np.abs(v))
                q = self.q_fast - self.q_drop * decay
                dq = self.q_drop_rate_c2 * decay * np.sign(v)
                jac = jac_const + q * slope * h_inv_dy + h * z_new * dq
            else:
                jac = jac_const + q * slope * h_inv_dy
            step = (base + jac_const * du + h * q * z_new) / jac
            du -= step
            if np.abs(step).max() <= self.tol:
                z_new -= slope * inv_dy * step
                if self.rate:
                    q = q - dq * step
                f_iso = self.k0 * (un + du) + q * z_new
                return f_iso, self.c2 * du - vn, z_new
        _fail(step, n, dt, labels, "smooth isolator")
