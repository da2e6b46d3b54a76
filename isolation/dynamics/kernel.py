"""Time-stepping kernel of the response-history engine: one column (record x case) at a time.

Plain Python on scalars and small arrays, written so that numba compiles it
unchanged (:mod:`isolation.dynamics.newmark` loads a second copy of this file and
compiles that; this copy stays interpreted and is the fallback, giving the
same results to round-off).

Model (relative to the ground, Newmark average acceleration, step h)

    M u'' + C u' + K_lin u + T' p(delta) + e_b (F_iso + c_d u_b') = -M 1 a_g

* K_lin: elastic storeys plus P-delta geometric stiffness, C the constant
  damping matrix, M diagonal; with A = K_lin + (4/h^2) M + (2/h) C the
  linear part of the step is u = y - A^-1 (e_b phi + T' p).
* p_i = s_i(delta_i) - k_i delta_i: the departure of storey i's hysteretic
  force s_i from its elastic value (zero for elastic storeys), found by
  fixed-point iteration. Each pass changes p by about (omega h)^2/8 of the
  previous change, omega the highest frequency, so below 0.05 when
  h <= T_min/10.
* phi = F_iso + c_d u_b': the isolation-plane law, solved exactly (to
  round-off) for the base displacement by a bracketed Newton iteration on
  the scalar equation u_b + A^-1_bb phi(u_b) = w_b.

Storey laws: 1 = bilinear with kinematic hardening (a spring alpha k in
parallel with an elastic-perfectly-plastic element of stiffness (1 - alpha) k
and strength (1 - alpha) V_y); 2 = the stiffness-degrading peak-oriented law of
Clough & Johnston (1966): elastic unloading at k down to zero force, then
reloading on the straight line towards the point of largest earlier
displacement on the backbone in that direction (the yield point before any
yielding there), then the bilinear backbone.

Isolator laws: 1 = linear spring plus elastic-perfectly-plastic elements
(exact return map); 2 = Bouc-Wen exponent 2 with rate-dependent strength
(closed-form update, see :mod:`isolation.dynamics.isolators`); 3 = sharp friction: an
elastic-perfectly-plastic element of stiffness mu_fast N / D_y and strength
N mu(v), v the velocity at the end of the step.

References
----------
Newmark, N. M. (1959). J. Eng. Mech. Div. ASCE 85(3).
Clough, R. W. & Johnston, S. B. (1966). Effect of stiffness degradation on
earthquake ductility requirements. Proc. 2nd Japan Earthquake Engineering
Symposium, Tokyo (rule set as summarised from memory).
"""

import math

import numpy as np

JIT_FUNCTIONS = ("backbone", "storey_force", "theta", "shape", "isolator_force", "solve_base", "run_columns")
"""Functions :mod:`isolation.dynamics.newmark` compiles (helpers first)."""

STOREY_ELASTIC, STOREY_BILINEAR, STOREY_CLOUGH = 0, 1, 2
ISO_NONE, ISO_ELASTIC_PLASTIC, ISO_SMOOTH, ISO_SHARP = 0, 1, 2, 3
SMOOTH_ACCEPT = 1e-3
"""Smooth law: a Newton correction below this fraction of D_y is applied to first order and ends the
iteration, leaving an error of order 1e-6 D_y (about 1e-9 m for D_y = 0.5 mm). [-]"""
STOREY_STATE = 5
"""Storey state slots: bilinear [q]; Clough [s, d_max+, d_max-, zero+, zero-]."""


def backbone(x, k, fy, alpha):
    """Bilinear backbone force at drift x. [kN]"""
    dy = fy / k
    if x > dy:
        return fy + alpha * k * (x - dy)
    if x < -dy:
        return -fy + alpha * k * (x + dy)
    return k * x


def storey_force(kind, k, fy, alpha, d_old, d, st, tr, i):
    """Hysteretic force of storey i at drift d from committed state st[i]; trial state to tr[i]."""
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
    if kind == 2:
        s = 0.0
        s_el = 0.0
        s_n = st[i, 0]
        dp = st[i, 1]
        dn = st[i, 2]
        zp = st[i, 3]
        zn = st[i, 4]
        dd = d - d_old
        if dd >= 0.0:
            done = False
            if s_n < 0.0:
                dz = d_old - s_n / k
                if d <= dz:
                    s = s_n + k * dd
                    done = True
                else:
                    zp = dz
                    s_el = k * (d - dz)
            else:
                s_el = s_n + k * dd
            if not done:
                if d > dp:
                    lim = backbone(d, k, fy, alpha)
                else:
                    fp = backbone(dp, k, fy, alpha)
                    lim = fp * (d - zp) / (dp - zp) if dp > zp else fp
                if s_el >= lim:
                    s = lim
                    if d > dp:
                        dp = d
                else:
                    s = s_el
        else:
            done = False
            if s_n > 0.0:
                dz = d_old - s_n / k
                if d >= dz:
                    s = s_n + k * dd
                    done = True
                else:
                    zn = dz
                    s_el = k * (d - dz)
            else:
                s_el = s_n + k * dd
            if not done:
                if d < dn:
                    lim = backbone(d, k, fy, alpha)
                else:
                    fn = backbone(dn, k, fy, alpha)
                    lim = fn * (d - zn) / (dn - zn) if dn < zn else fn
                if s_el <= lim:
                    s = lim
                    if d < dn:
                        dn = d
                else:
                    s = s_el
        tr[i, 0] = s
        tr[i, 1] = dp
        tr[i, 2] = dn
        tr[i, 3] = zp
        tr[i, 4] = zn
        return s
    return k * d


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
        c = p[5]
        if back:
            xi = -du / dy + th_down
        else:
            xi = du / dy + th_up
        w, sl = shape(xi, c)
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
        if kind == 2 and abs(step) <= accept:
            # converged: apply the last correction to force and z to first order (error ~ step^2/D_y)
            qt[0] += qt[1] * step
            return new, force + slope * step, it + 1, r
        du = new
        force, slope = isolator_force(kind, p, ke, fe, qs, qt, un, vn, du, step < 0.0, c2, th_up, th_down)
        r = un + du + hb * force + hcd * (c2 * du - vn) - wb
        if abs(r) <= tol or abs(step) <= tol:
            return du, force, it + 1, r
    return du, force, -1, r


def run_columns(ground, dt, nsub, mass, cmat, ainv, gmat, lower, upper, skind, kel, kgeo, fy, alpha,
                iso_kind, iso_p, iso_k, iso_f, damper, max_iter, tol_base, tol_storey,
                out_u, out_v, out_a, out_d, out_s, out_f, out_r, out_e, status):
    """Integrate every column; outputs at the record's samples.

    ground (cols, steps) [m/s2]; mass (nd,); cmat, ainv (nd, nd) for step dt/nsub; gmat (nd, ns) =
    ainv T'; lower/upper (ns,) degrees of freedom below/above each storey (-1 = ground); kel, kgeo,
    fy (ns,); iso_p (cols, 6), iso_k/iso_f (cols, elements); damper (cols,). Outputs (cols, steps, .):
    u, v relative and a absolute (nd), drift d and storey hysteretic force s (ns); (cols, steps):
    isolator force f, reaction r = -sum m a_abs; energies (5, cols, steps: input, kinetic, viscous,
    elastic strain, hysteretic). status[0:4] = column, step, residual and what failed (1 isolator
    [m], 2 storeys [kN]) at the first failure; column -1 when all converged.
    """
    cols, steps = ground.shape
    nd = mass.size
    ns = kel.size
    h = dt / nsub
    a0 = 4.0 / (h * h)
    a1 = 2.0 / h
    a2 = 4.0 / h
    isolated = iso_kind != 0
    u = np.zeros(nd)
    v = np.zeros(nd)
    a = np.zeros(nd)
    un = np.zeros(nd)
    vn = np.zeros(nd)
    an = np.zeros(nd)
    r = np.zeros(nd)
    w = np.zeros(nd)
    y = np.zeros(nd)
    cu = np.zeros(nd)
    cv = np.zeros(nd)
    cdu = np.zeros(nd)
    st = np.zeros((ns, 5))
    tr = np.zeros((ns, 5))
    s_n = np.zeros(ns)
    s_t = np.zeros(ns)
    d_n = np.zeros(ns)
    d_t = np.zeros(ns)
    p_it = np.zeros(ns)
    ne = iso_k.shape[1]
    qs = np.zeros(max(ne, 2))
    qt = np.zeros(max(ne, 2))
    hb = ainv[0, 0]
    for col in range(cols):
        u[:] = 0.0
        v[:] = 0.0
        cu[:] = 0.0
        cv[:] = 0.0
        s_n[:] = 0.0
        d_n[:] = 0.0
        st[:, :] = 0.0
        if skind == 2:
            for i in range(ns):
                st[i, 1] = fy[i] / kel[i]
                st[i, 2] = -fy[i] / kel[i]
        qs[:] = 0.0
        qt[:] = 0.0
        pc = iso_p[col]
        kc = iso_k[col]
        fc = iso_f[col]
        cd = damper[col]
        hcd = hb * cd
        f_n = 0.0
        f_iso = 0.0
        du_b = 0.0
        e_in = 0.0
        e_visc = 0.0
        w_storey = 0.0
        w_iso = 0.0
        for i in range(nd):
            a[i] = -ground[col, 0]
            out_u[col, 0, i] = 0.0
            out_v[col, 0, i] = 0.0
            out_a[col, 0, i] = 0.0
        for i in range(ns):
            out_s[col, 0, i] = 0.0
            out_d[col, 0, i] = 0.0
        out_f[col, 0] = 0.0
        out_r[col, 0] = 0.0
        for m in range(5):
            out_e[m, col, 0] = 0.0
        for n in range(steps - 1):
            g0 = ground[col, n]
            g1 = ground[col, n + 1]
            for j in range(1, nsub + 1):
                ag_before = g0 + (g1 - g0) * ((j - 1) / nsub)
                ag = g0 + (g1 - g0) * (j / nsub)
                # right-hand side M (a0 u + a2 v + a - 1 a_g) + C (a1 u + v), with C u and C v carried
                for i in range(nd):
                    un[i] = u[i]
                    vn[i] = v[i]
                    an[i] = a[i]
                    r[i] = mass[i] * (a0 * u[i] + a2 * v[i] + a[i] - ag) + a1 * cu[i] + cv[i]
                for i in range(nd):
                    acc = 0.0
                    for k in range(nd):
                        acc += ainv[i, k] * r[k]
                    y[i] = acc
                for i in range(ns):
                    p_it[i] = s_n[i] - kel[i] * d_n[i]
                converged = False
                for it in range(max_iter):
                    for i in range(nd):
                        acc = y[i]
                        if skind != 0:
                            for k in range(ns):
                                acc -= gmat[i, k] * p_it[k]
                        w[i] = acc
                    if isolated:
                        guess = h * vn[0] + 0.5 * h * h * an[0] if it == 0 else du_b
                        du_b, f_iso, count, res = solve_base(iso_kind, pc, kc, fc, qs, qt, un[0], vn[0], w[0],
                                                             hb, hcd, a1, guess, max_iter, tol_base)
                        if count < 0:
                            status[0] = col
                            status[1] = n + 1
                            status[2] = res
                            status[3] = 1.0
                            return
                        phi = f_iso + cd * (a1 * du_b - vn[0])
                        for i in range(nd):
                            u[i] = w[i] - ainv[i, 0] * phi
                        u[0] = un[0] + du_b
                    else:
                        for i in range(nd):
                            u[i] = w[i]
                    change = 0.0
                    for i in range(ns):
                        below = u[lower[i]] if lower[i] >= 0 else 0.0
                        d = u[upper[i]] - below
                        d_t[i] = d
                        if skind == 0:
                            s_t[i] = kel[i] * d
                        else:
                            s = storey_force(skind, kel[i], fy[i], alpha, d_n[i], d, st, tr, i)
                            s_t[i] = s
                            p_new = s - kel[i] * d
                            change = max(change, abs(p_new - p_it[i]))
                            p_it[i] = p_new
                    if change <= tol_storey:
                        converged = True
                        break
                if not converged:
                    status[0] = col
                    status[1] = n + 1
                    status[2] = change
                    status[3] = 2.0
                    return
                # Newmark update, energy increments (trapezoid rule), commit
                # (v + v_n)/2 = du/h exactly, so the viscous work is du' C du / h
                de_in = 0.0
                de_visc = 0.0
                for i in range(nd):
                    dui = u[i] - un[i]
                    v[i] = a1 * dui - vn[i]
                    a[i] = a0 * dui - a2 * vn[i] - an[i]
                    de_in -= mass[i] * dui * 0.5 * (ag_before + ag)
                    r[i] = dui
                for i in range(nd):
                    acc = 0.0
                    for k in range(nd):
                        acc += cmat[i, k] * r[k]
                    cdu[i] = acc
                    de_visc += r[i] * acc
                for i in range(nd):
                    cu[i] += cdu[i]
                    cv[i] = a1 * cdu[i] - cv[i]
                e_in += de_in
                e_visc += de_visc / h
                if isolated:
                    dub = u[0] - un[0]
                    e_visc += cd * dub * 0.5 * (v[0] + vn[0])
                    w_iso += 0.5 * (f_n + f_iso) * dub
                    f_n = f_iso
                    for e in range(qs.size):
                        qs[e] = qt[e]
                for i in range(ns):
                    if skind != 0:
                        w_storey += 0.5 * (s_n[i] + s_t[i]) * (d_t[i] - d_n[i])
                        for m in range(5):
                            st[i, m] = tr[i, m]
                    s_n[i] = s_t[i]
                    d_n[i] = d_t[i]
            # outputs at sample n + 1
            kinetic = 0.0
            reaction = 0.0
            for i in range(nd):
                out_u[col, n + 1, i] = u[i]
                out_v[col, n + 1, i] = v[i]
                absolute = a[i] + g1
                out_a[col, n + 1, i] = absolute
                reaction -= mass[i] * absolute
                kinetic += 0.5 * mass[i] * v[i] * v[i]
            out_r[col, n + 1] = reaction
            stored_st = 0.0
            stored_lin = 0.0
            for i in range(ns):
                out_s[col, n + 1, i] = s_n[i]
                out_d[col, n + 1, i] = d_n[i]
                stored_lin += 0.5 * kgeo[i] * d_n[i] * d_n[i]
                if skind == 0:
                    stored_lin += 0.5 * kel[i] * d_n[i] * d_n[i]
                elif skind == 1:
                    kp = (1.0 - alpha) * kel[i]
                    stored_st += 0.5 * alpha * kel[i] * d_n[i] * d_n[i] + 0.5 * st[i, 0] * st[i, 0] / kp
                else:
                    stored_st += 0.5 * s_n[i] * s_n[i] / kel[i]
            stored_iso = 0.0
            if isolated:
                out_f[col, n + 1] = f_n
                stored_iso = 0.5 * pc[0] * u[0] * u[0]
                if iso_kind == 1:
                    for e in range(ne):
                        if kc[e] > 0.0:
                            stored_iso += 0.5 * qs[e] * qs[e] / kc[e]
                elif iso_kind == 2:
                    vb = v[0]
                    strength = pc[1] - pc[2] * math.exp(-pc[3] * abs(vb))
                    stored_iso += 0.5 * strength * pc[4] * qs[0] * qs[0]
                else:
                    stored_iso += 0.5 * qs[0] * qs[0] * pc[4] / pc[1]
            out_e[0, col, n + 1] = e_in
            out_e[1, col, n + 1] = kinetic
            out_e[2, col, n + 1] = e_visc
            out_e[3, col, n + 1] = stored_lin + stored_st + stored_iso
            out_e[4, col, n + 1] = (w_storey - stored_st) + (w_iso - stored_iso)
    status[0] = -1.0
