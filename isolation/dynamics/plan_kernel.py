"""Compiled time loop of the plan model (numba), column by column, isolated or on a fixed base.

The same equations as the array version in :mod:`isolation.dynamics.plan_history`
(Newmark average acceleration, bearings as forces on the base degrees of
freedom, fixed-point iteration to 1e-9 of the smallest yield displacement,
overturning axial loads from the previous step; yielding storeys as
departures from their elastic force, iterated together with the base motion
to 1e-10 of the largest storey strength) and the same closed-form
bearing and storey updates as :mod:`isolation.dynamics.plan_bearings` and
:mod:`isolation.dynamics.plan_storeys`, written as scalar loops
so that numba compiles them (cached on disk).  Each column converges on its
own, so histories agree with the array version to the iteration tolerance,
not bit for bit.  Without numba the array version runs.
"""

from __future__ import annotations

import math
from typing import Callable

import numpy as np

try:  # numba is optional: the array version is the fallback
    from numba import njit
except ImportError:  # pragma: no cover - exercised where numba is missing
    njit = None  # type: ignore[assignment]  # the optional import's stand-in

__all__ = ["available", "plan_loop", "isolated_loop"]

available = njit is not None

_EDGE = 1.0 - 1e-15


def _bearings_python(col, ub, pos, d_prev, vb_prev, z, p, axial, slider, k0, q_fast, q_drop, rate, inv_y, strength,
                     inv_ey, c2, commit, uplift, axial_min, axial_max):
    """Resultant bearing forces (x, y, moment) for base motion ``ub``; with ``commit`` the states advance."""
    nb = pos.shape[0]
    ne = strength.shape[2]
    f0 = 0.0
    f1 = 0.0
    f2 = 0.0
    for b in range(nb):
        dx = ub[0] - pos[b, 1] * ub[2]
        dy = ub[1] + pos[b, 0] * ub[2]
        sx = dx - d_prev[b, 0]
        sy = dy - d_prev[b, 1]
        vx = c2 * sx - vb_prev[b, 0]
        vy = c2 * sy - vb_prev[b, 1]
        fx = k0[col, b] * dx
        fy = k0[col, b] * dy
        length = math.sqrt(sx * sx + sy * sy)
        if q_fast[col, b] > 0.0:
            zx = z[b, 0]
            zy = z[b, 1]
            if length > 0.0:
                ex = sx / length
                ey = sy / length
                a0 = zx * ex + zy * ey
                bx = zx - a0 * ex
                by = zy - a0 * ey
                x = length * inv_y[col, b]
                el = min(x, max(-a0, 0.0))
                a1 = min(a0 + el, _EDGE)
                t = math.tanh(x - el)
                den = 1.0 + a1 * t
                aa = (a1 + t) / den
                sh = math.sqrt(1.0 - t * t) / den
                zx = aa * ex + sh * bx
                zy = aa * ey + sh * by
            q = q_fast[col, b]
            if q_drop[col, b] > 0.0 and rate[col, b] > 0.0:
                q -= q_drop[col, b] * math.exp(-rate[col, b] * math.sqrt(vx * vx + vy * vy))
            fx += q * zx
            fy += q * zy
            if commit:
                z[b, 0] = zx
                z[b, 1] = zy
        for e in range(ne):
            if inv_ey[col, b, e] > 0.0:
                px = p[b, e, 0] + sx * inv_ey[col, b, e]
                py = p[b, e, 1] + sy * inv_ey[col, b, e]
                size = math.sqrt(px * px + py * py)
                if size > 1.0:
                    px /= size
                    py /= size
                fx += strength[col, b, e] * px
                fy += strength[col, b, e] * py
                if commit:
                    p[b, e, 0] = px
                    p[b, e, 1] = py
        if slider[col, b]:
            scale = axial[b] if axial[b] > 0.0 else 0.0
            fx *= scale
            fy *= scale
        f0 += fx
        f1 += fy
        f2 += pos[b, 0] * fy - pos[b, 1] * fx
        if commit:
            if slider[col, b] and axial[b] <= 0.0:
                uplift[col, b] += 1
            d_prev[b, 0] = dx
            d_prev[b, 1] = dy
            vb_prev[b, 0] = vx
            vb_prev[b, 1] = vy
            axial_min[col, b] = min(axial_min[col, b], axial[b])
            axial_max[col, b] = max(axial_max[col, b], axial[b])
    return f0, f1, f2


def _storeys_python(drift, kp, fp, q_c, d_c, q_t, p_t):
    """Trial element forces q_t and departures p_t of the storey springs at ``drift``."""
    for sp in range(drift.shape[0]):
        d = drift[sp]
        q = q_c[sp] + kp[sp] * (d - d_c[sp])
        if q > fp[sp]:
            q = fp[sp]
        elif q < -fp[sp]:
            q = -fp[sp]
        q_t[sp] = q
        p_t[sp] = q - kp[sp] * d


def _plan_loop(dt, m, c, k_inv, mr, g, pos, heights, floor_mass, gravity, vert, has_vert, slider, k0, q_fast,
               q_drop, rate, inv_y, strength, inv_ey, tolerance, max_iterations, isolated, yielding, drift_map, kd,
               dkb, dkd,
               kp, fp, tol_storey, u_out, a_out, force_out, axial_min, axial_max, uplift, energy, storey_q):
    cols, _, steps = g.shape
    nd = m.shape[0]
    nb = pos.shape[0]
    ne = strength.shape[2]
    ns = drift_map.shape[1]
    levels = nd // 3
    c2 = 2.0 / dt
    c4 = 4.0 / dt**2
    c1 = 4.0 / dt
    xx = 0.0
    yy = 0.0
    for b in range(nb):
        xx += pos[b, 0] ** 2
        yy += pos[b, 1] ** 2
    rmax = 1.0
    for b in range(nb):
        rmax = max(rmax, abs(pos[b, 0]), abs(pos[b, 1]))
    u = np.zeros(nd)
    v = np.zeros(nd)
    a = np.zeros(nd)
    rhs = np.zeros(nd)
    u_lin = np.zeros(nd)
    u_next = np.zeros(nd)
    a_next = np.zeros(nd)
    v_next = np.zeros(nd)
    tmp = np.zeros(nd)
    tmp2 = np.zeros(nd)
    z = np.zeros((nb, 2))
    p = np.zeros((nb, ne, 2))
    d_prev = np.zeros((nb, 2))
    vb_prev = np.zeros((nb, 2))
    axial = np.zeros(nb)
    force = np.zeros(3)
    force_old = np.zeros(3)
    ub = np.zeros(3)
    q_c = np.zeros(ns)
    d_c = np.zeros(ns)
    p_c = np.zeros(ns)
    q_t = np.zeros(ns)
    p_t = np.zeros(ns)
    p_it = np.zeros(ns)
    d_lin = np.zeros(ns)
    drift = np.zeros(ns)
    for col in range(cols):
        u[:] = 0.0
        v[:] = 0.0
        z[:] = 0.0
        p[:] = 0.0
        d_prev[:] = 0.0
        vb_prev[:] = 0.0
        force[:] = 0.0
        q_c[:] = 0.0
        d_c[:] = 0.0
        p_c[:] = 0.0
        for j in range(nd):
            a[j] = -(mr[j, 0] * g[col, 0, 0] + mr[j, 1] * g[col, 1, 0]) / m[j, j] if m[j, j] > 0 else 0.0
        for j in range(nd):
            u_out[0, col, j] = 0.0
            a_out[0, col, j] = a[j]
        for b in range(nb):
            axial_min[col, b] = np.inf
            axial_max[col, b] = -np.inf
        e_in = 0.0
        e_damp = 0.0
        e_bear = 0.0
        e_storey = 0.0
        peak_in = 0.0
        for n in range(steps - 1):
            g0 = g[col, 0, n + 1]
            g1 = g[col, 1, n + 1]
            for j in range(nd):
                tmp[j] = c4 * u[j] + c1 * v[j] + a[j]
                tmp2[j] = c2 * u[j] + v[j]
            for j in range(nd):
                s = -(mr[j, 0] * g0 + mr[j, 1] * g1)
                s += m[j, j] * tmp[j]  # M is diagonal (lumped masses and inertias; checked by the caller)
                for q in range(nd):
                    s += c[j, q] * tmp2[q]
                rhs[j] = s
            for j in range(nd):
                s = 0.0
                for q in range(nd):
                    s += rhs[q] * k_inv[q, j]
                u_lin[j] = s
            if isolated:
                # overturning moment of the previous step's inertial forces
                moment_x = 0.0
                moment_y = 0.0
                for lev in range(levels):
                    ax = a[3 * lev] + g[col, 0, n]
                    ay = a[3 * lev + 1] + g[col, 1, n]
                    moment_y += -floor_mass[lev] * ax * heights[lev]
                    moment_x += -floor_mass[lev] * ay * heights[lev]
                for b in range(nb):
                    share = gravity[col, b] * (1.0 + vert[col, n + 1]) if has_vert else gravity[col, b]
                    if xx > 0.0:
                        share += moment_y * pos[b, 0] / xx
                    if yy > 0.0:
                        share += moment_x * pos[b, 1] / yy
                    axial[b] = share
            f0 = 0.0
            f1 = 0.0
            f2 = 0.0
            if yielding:
                # outer fixed point on the bearing forces; inside it, the storeys' departures with the
                # bearing forces held, on the condensed drift equations d = D'u_lin - dkb f - dkd p
                # (no bearing law evaluated, ns x ns work), each to its own tolerance
                for sp in range(ns):
                    p_it[sp] = p_c[sp]
                    s = 0.0
                    for j in range(nd):
                        s += u_lin[j] * drift_map[j, sp]
                    d_lin[sp] = s
                f0 = force[0]
                f1 = force[1]
                f2 = force[2]
                converged = False
                for _ in range(max_iterations):
                    settled = False
                    for _inner in range(max_iterations):
                        for sp in range(ns):
                            s = d_lin[sp] - f0 * dkb[sp, 0] - f1 * dkb[sp, 1] - f2 * dkb[sp, 2]
                            for m_ in range(ns):
                                s -= dkd[sp, m_] * p_it[m_]
                            drift[sp] = s
                        _storeys(drift, kp, fp, q_c, d_c, q_t, p_t)
                        moved = 0.0
                        for sp in range(ns):
                            moved = max(moved, abs(p_t[sp] - p_it[sp]))
                            p_it[sp] = p_t[sp]
                        if moved <= tol_storey:
                            settled = True
                            break
                    if not settled:
                        break
                    if not isolated:
                        converged = True
                        break
                    for i in range(3):
                        s = u_lin[i] - f0 * k_inv[0, i] - f1 * k_inv[1, i] - f2 * k_inv[2, i]
                        for sp in range(ns):
                            s -= p_it[sp] * kd[i, sp]
                        ub[i] = s
                    f0, f1, f2 = _bearings(col, ub, pos, d_prev, vb_prev, z, p, axial, slider, k0, q_fast,
                                           q_drop, rate, inv_y, strength, inv_ey, c2, False, uplift, axial_min,
                                           axial_max)
                    change = 0.0
                    for i in range(3):
                        s = u_lin[i] - f0 * k_inv[0, i] - f1 * k_inv[1, i] - f2 * k_inv[2, i]
                        for sp in range(ns):
                            s -= p_it[sp] * kd[i, sp]
                        change = max(change, abs(s - ub[i]) * (rmax if i == 2 else 1.0))
                        ub[i] = s
                    if change <= tolerance:
                        converged = True
                        break
                if not converged:
                    return n + 1
                if isolated:
                    f0, f1, f2 = _bearings(col, ub, pos, d_prev, vb_prev, z, p, axial, slider, k0, q_fast, q_drop,
                                           rate, inv_y, strength, inv_ey, c2, True, uplift, axial_min, axial_max)
                for sp in range(ns):
                    s = d_lin[sp] - f0 * dkb[sp, 0] - f1 * dkb[sp, 1] - f2 * dkb[sp, 2]
                    for m_ in range(ns):
                        s -= dkd[sp, m_] * p_it[m_]
                    drift[sp] = s
                _storeys(drift, kp, fp, q_c, d_c, q_t, p_t)
                for j in range(nd):
                    s = u_lin[j] - f0 * k_inv[0, j] - f1 * k_inv[1, j] - f2 * k_inv[2, j]
                    for sp in range(ns):
                        s -= p_t[sp] * kd[j, sp]
                    u_next[j] = s
                for sp in range(ns):
                    d = 0.0
                    for j in range(nd):
                        d += u_next[j] * drift_map[j, sp]
                    e_storey += 0.5 * (p_c[sp] + p_t[sp]) * (d - d_c[sp])
                    q_c[sp] = q_t[sp]
                    p_c[sp] = p_t[sp]
                    d_c[sp] = d
            elif isolated:
                for i in range(3):
                    s = u_lin[i]
                    for sp in range(3):
                        s -= force[sp] * k_inv[sp, i]
                    ub[i] = s
                converged = False
                for _ in range(max_iterations):
                    f0, f1, f2 = _bearings(col, ub, pos, d_prev, vb_prev, z, p, axial, slider, k0, q_fast, q_drop,
                                           rate, inv_y, strength, inv_ey, c2, False, uplift, axial_min, axial_max)
                    change = 0.0
                    for i in range(3):
                        s = u_lin[i] - f0 * k_inv[0, i] - f1 * k_inv[1, i] - f2 * k_inv[2, i]
                        delta = abs(s - ub[i]) * (rmax if i == 2 else 1.0)
                        change = max(change, delta)
                        ub[i] = s
                    if change <= tolerance:
                        converged = True
                        break
                if not converged:
                    return n + 1
                f0, f1, f2 = _bearings(col, ub, pos, d_prev, vb_prev, z, p, axial, slider, k0, q_fast, q_drop, rate,
                                       inv_y, strength, inv_ey, c2, True, uplift, axial_min, axial_max)
                for j in range(nd):
                    u_next[j] = u_lin[j] - f0 * k_inv[0, j] - f1 * k_inv[1, j] - f2 * k_inv[2, j]
            else:
                for j in range(nd):
                    u_next[j] = u_lin[j]
            force_old[0] = force[0]
            force_old[1] = force[1]
            force_old[2] = force[2]
            force[0] = f0
            force[1] = f1
            force[2] = f2
            if isolated:
                e_bear += 0.5 * ((force_old[0] + f0) * (u_next[0] - u[0]) + (force_old[1] + f1) * (u_next[1] - u[1])
                                 + (force_old[2] + f2) * (u_next[2] - u[2]))
            for j in range(nd):
                a_next[j] = c4 * (u_next[j] - u[j]) - c1 * v[j] - a[j]
                v_next[j] = v[j] + 0.5 * dt * (a[j] + a_next[j])
            s_in = 0.0
            s_damp = 0.0
            for j in range(nd):
                w = v[j] + v_next[j]
                s_in += w * (mr[j, 0] * (g[col, 0, n] + g0) + mr[j, 1] * (g[col, 1, n] + g1))
                t2 = 0.0
                for q in range(nd):
                    t2 += c[j, q] * (v[q] + v_next[q])
                s_damp += w * t2
            e_in -= 0.25 * dt * s_in
            e_damp += 0.25 * dt * s_damp
            peak_in = max(peak_in, abs(e_in))
            for j in range(nd):
                u[j] = u_next[j]
                v[j] = v_next[j]
                a[j] = a_next[j]
                u_out[n + 1, col, j] = u[j]
                a_out[n + 1, col, j] = a[j]
            force_out[n + 1, col, 0] = f0
            force_out[n + 1, col, 1] = f1
            force_out[n + 1, col, 2] = f2
        energy[col, 0] = e_in
        energy[col, 1] = e_damp
        energy[col, 2] = e_bear
        energy[col, 3] = peak_in
        kinetic = 0.0
        for j in range(nd):
            for q in range(nd):
                kinetic += 0.5 * v[j] * m[j, q] * v[q]
        energy[col, 4] = kinetic
        energy[col, 5] = e_storey
        for sp in range(ns):
            storey_q[col, sp] = q_c[sp]
    return 0


_bearings: Callable[..., tuple[float, float, float]]
_storeys: Callable[..., None]
plan_loop: Callable[..., int] | None
isolated_loop: Callable[..., int] | None
if available:
    _bearings = njit(cache=True)(_bearings_python)
    _storeys = njit(cache=True)(_storeys_python)
    plan_loop = njit(cache=True)(_plan_loop)
else:  # pragma: no cover
    _bearings = _bearings_python
    _storeys = _storeys_python
    plan_loop = None
isolated_loop = plan_loop
"""Earlier name of :data:`plan_loop` (isolated and fixed-base plan buildings alike)."""
