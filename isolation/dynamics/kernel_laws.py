"""Force laws of the time-stepping kernel: yielding storeys and the isolation plane, one step at a time.

Plain Python on scalars and small arrays, written so that numba compiles it
unchanged; :func:`isolation.dynamics.newmark.kernel_module` compiles a copy of
this module and of :mod:`isolation.dynamics.kernel`, which calls these
functions from its time loop (this copy stays interpreted: the fallback).

Storey laws: 1 = bilinear with kinematic hardening (a spring alpha k in
parallel with an elastic-perfectly-plastic element of stiffness (1 - alpha) k
and strength (1 - alpha) V_y); 2 = the stiffness-degrading peak-oriented law of
Clough & Johnston (1966): elastic unloading at k down to zero force, then
reloading on the straight line towards the point of largest earlier
displacement on the backbone in that direction (the yield point before any
yielding there), then the bilinear backbone. Unloading towards negative
drift is the mirror image of loading towards positive drift (the law is odd),
so one branch serves both directions.

Isolator laws: 1 = linear spring plus elastic-perfectly-plastic elements
(exact return map); 2 = Bouc-Wen exponent 2 with rate-dependent strength
(closed-form update, see :mod:`isolation.dynamics.isolators`); 3 = sharp friction: an
elastic-perfectly-plastic element of stiffness mu_fast N / D_y and strength
N mu(v), v the velocity at the end of the step.

References
----------
Clough, R. W. & Johnston, S. B. (1966). Effect of stiffness degradation on
earthquake ductility requirements. Proc. 2nd Japan Earthquake Engineering
Symposium, Tokyo (rule set as summarised from memory).
"""

import math

import numpy as np

JIT_FUNCTIONS = ("backbone", "storey_force", "theta", "shape", "isolator_force", "solve_base")
"""Functions :func:`isolation.dynamics.newmark.kernel_module` compiles, helpers first."""

STOREY_ELASTIC, STOREY_BILINEAR, STOREY_CLOUGH = 0, 1, 2
ISO_NONE, ISO_ELASTIC_PLASTIC, ISO_SMOOTH, ISO_SHARP = 0, 1, 2, 3
SMOOTH_ACCEPT = 1e-3
"""Smooth law: a Newton correction below this fraction of D_y is applied to first order and ends the
iteration, leaving an error of order 1e-6 D_y (about 1e-9 m for D_y = 0.5 mm); a correction that
crosses the step's reversal point (du = 0) is evaluated in full instead. [-]"""
STOREY_STATE = 5
"""Storey state slots: bilinear [q]; Clough [s, d_max+, d_max-, zero+, zero-]."""


def backbone(x, k, fy, alpha):
    """Bilinear backbone force at drift x (an odd function of x). [kN]"""
    dy = fy / k
    if x > dy:
        return fy + alpha * k * (x - dy)
    if x < -dy:
        return -fy + alpha * k * (x + dy)
    return k * x


def storey_force(kind, k, fy, alpha, d_old, d, st, tr, i):
    """Hysteretic force of storey i at drift d from committed state st[i]; trial state to tr[i]. [kN]

    One flat function (no calls but the backbone): called for every storey in every pass of the
    compiled loop, where a call costs more than the law. A Clough step towards smaller drift is the
    mirror image of one towards larger drift: drifts, force and state are multiplied by the step's
    sign (exact in floating point), so one branch serves both directions.
    """
    if kind == 1:
        kp = (1.0 - alpha) * k
        fp = (1.0 - alpha) * fy
        q = st[i, 0] + kp * (d - d_old)
        if q > fp:
            q = fp
        elif q < -fp:
            q = -fp
        tr[i, 0] = q
        return alpha * k * d + q
    if kind != 2:
        return k * d
    sign = 1.0 if d - d_old >= 0.0 else -1.0
    far = 1 if sign > 0.0 else 2  # slot of the largest earlier drift in the step's direction
    cross = 3 if sign > 0.0 else 4  # slot of the last zero-force crossing going that way
    x_old = sign * d_old
    x = sign * d
    s_n = sign * st[i, 0]
    reach = sign * st[i, far]
    zero = sign * st[i, cross]
    for m in range(1, STOREY_STATE):
        tr[i, m] = st[i, m]
    if s_n < 0.0 and x <= x_old - s_n / k:  # unloading on the elastic slope, force not yet zero
        s = s_n + k * (x - x_old)
    else:
        if s_n < 0.0:
            zero = x_old - s_n / k
            s_el = k * (x - zero)
        else:
            s_el = s_n + k * (x - x_old)
        if x > reach:
            lim = backbone(x, k, fy, alpha)
        else:
            f_reach = backbone(reach, k, fy, alpha)
            lim = f_reach * (x - zero) / (reach - zero) if reach > zero else f_reach
        s = s_el
        if s_el >= lim:
            s = lim
            reach = max(reach, x)
    tr[i, 0] = sign * s
    tr[i, far] = sign * reach
    tr[i, cross] = sign * zero
    return sign * s


def theta(w0, c):
    """Phase coordinate of w0 for the Bouc-Wen closed form (see isolation.dynamics.isolators)."""
    if w0 > 1.0 - 1e-15:
        w0 = 1.0 - 1e-15
    elif w0 < -1.0 + 1e-15:
        w0 = -1.0 + 1e-15
    if w0 < 0.0:
        if c > 0.0:
            rc = math.sqrt(c)
            return math.atanh(rc * w0) / rc
        if c < 0.0:
            rc = math.sqrt(-c)
            return math.atan(rc * w0) / rc
        return w0
    return math.atanh(w0)


def shape(xi, c):
    """w = g(xi) and dw/dx of the Bouc-Wen closed form; returns (w, slope)."""
    if xi >= 0.0:
        w = math.tanh(xi)
        return w, 1.0 - w * w
    if c > 0.0:
        rc = math.sqrt(c)
        w = math.tanh(rc * xi) / rc
    elif c < 0.0:
        rc = math.sqrt(-c)
        w = math.tan(rc * max(xi, -0.5 * math.pi / rc + 1e-12)) / rc
    else:
        w = xi
    return w, 1.0 - c * w * w


def isolator_force(kind, p, ke, fe, qs, qt, un, vn, du, negative, c2, th_up, th_down):
    """Isolator force and its derivative with respect to du at u = un + du; trial state to qt.

    ``negative`` picks the one-sided derivative at du = 0 (direction of motion); th_up and
    th_down are the smooth law's phase coordinates of z and -z at the start of the step.
    """
    back = du < 0.0 or (du == 0.0 and negative)
    if kind == 1:
        force = p[0] * (un + du)
        slope = p[0]
        for e in range(ke.size):
            t = qs[e] + ke[e] * du
            f = fe[e]
            if t > f or (t == f and not back):
                t = f
            elif t < -f or (t == -f and back):
                t = -f
            else:
                slope += ke[e]
            qt[e] = t
            force += t
        return force, slope
    v = c2 * du - vn
    decay = math.exp(-p[3] * abs(v))
    strength = p[1] - p[2] * decay
    dstrength = p[2] * p[3] * decay * c2
    if v < 0.0:
        dstrength = -dstrength
    elif v == 0.0:
        dstrength = 0.0
    if kind == 2:
        dy = p[4]
        xi = -du / dy + th_down if back else du / dy + th_up
        w, sl = shape(xi, p[5])
        z_new = -w if back else w
        qt[0] = z_new
        qt[1] = sl / dy  # dz/ddu, for the final first-order correction in solve_base
        return p[0] * (un + du) + strength * z_new, p[0] + strength * sl / dy + dstrength * z_new
    # kind 3: sharp friction
    k_el = p[1] / p[4]
    t = qs[0] + k_el * du
    if t > strength or (t == strength and not back):
        q = strength
        dq = dstrength
    elif t < -strength or (t == -strength and back):
        q = -strength
        dq = -dstrength
    else:
        q = t
        dq = k_el
    qt[0] = q
    return p[0] * (un + du) + q, p[0] + dq


def solve_base(kind, p, ke, fe, qs, qt, un, vn, wb, hb, hcd, c2, du, max_iter, tol):
    """Bracketed Newton for R(du) = un + du + hb F(du) + hcd (c2 du - vn) - wb = 0, from the guess du.

    Returns (du, F, iterations, residual); iterations = -1 when not converged.
    """
    th_up = 0.0
    th_down = 0.0
    accept = 0.0
    if kind == 2:
        accept = SMOOTH_ACCEPT * p[4]
        th_up = theta(qs[0], p[5])
        th_down = theta(-qs[0], p[5])
    elif kind == 1 and ke.size == 1 and hb > 0.0:
        # one elastic-plastic element: exact in one elastic trial and one plastic correction
        k0 = p[0]
        k = ke[0]
        f = fe[0]
        r0 = un + hb * (k0 * un + qs[0]) - hcd * vn - wb
        jac_plastic = 1.0 + hb * k0 + hcd * c2
        du = -r0 / (jac_plastic + hb * k)
        trial = qs[0] + k * du
        q = min(max(trial, -f), f)
        du -= hb * (q - trial) / jac_plastic
        qt[0] = q
        return du, k0 * (un + du) + q, 1, 0.0
    force, slope = isolator_force(kind, p, ke, fe, qs, qt, un, vn, du, False, c2, th_up, th_down)
    r = un + du + hb * force + hcd * (c2 * du - vn) - wb
    if r > 0.0 and du == 0.0:
        force, slope = isolator_force(kind, p, ke, fe, qs, qt, un, vn, du, True, c2, th_up, th_down)
    lo = -math.inf
    hi = math.inf
    for it in range(max_iter):
        if r == 0.0:
            return du, force, it, r
        if r > 0.0:
            hi = du
        else:
            lo = du
        jac = 1.0 + hb * slope + hcd * c2
        if jac > 0.0:
            new = du - r / jac
        else:
            new = du - r
        if not (lo < new < hi):
            if lo > -math.inf and hi < math.inf:
                new = 0.5 * (lo + hi)
            elif lo > -math.inf:
                new = lo + abs(r)
            else:
                new = hi - abs(r)
        step = new - du
        if kind == 2 and abs(step) <= accept and (new < 0.0) == (du < 0.0):
            # converged: apply the last correction to force and z to first order (error ~ step^2/D_y);
            # not across du = 0, where the motion reverses and the one-sided slope is the other side's
            qt[0] += qt[1] * step
            return new, force + slope * step, it + 1, r
        du = new
        force, slope = isolator_force(kind, p, ke, fe, qs, qt, un, vn, du, step < 0.0, c2, th_up, th_down)
        r = un + du + hb * force + hcd * (c2 * du - vn) - wb
        if abs(r) <= tol or abs(step) <= tol:
            return du, force, it + 1, r
    return du, force, -1, r


def storey_history(kind, k, fy, alpha, drift):
    """Storey force [kN] along an imposed drift history ``drift`` (steps,) [m] from the unloaded state
    (interpreted; for loops and checks). k [kN/m], fy [kN], alpha [-] as in :func:`storey_force`."""
    state = np.zeros((1, STOREY_STATE))
    state[0, 1], state[0, 2] = fy / k, -fy / k
    trial = state.copy()
    out = np.empty_like(drift)
    previous = 0.0
    for n, value in enumerate(drift):
        out[n] = storey_force(kind, k, fy, alpha, previous, float(value), state, trial, 0)
        state[:] = trial
        previous = float(value)
    return out
