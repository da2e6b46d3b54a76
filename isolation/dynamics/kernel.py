"""Time-stepping kernel of the response-history engine: one column (record x case) at a time.

Plain Python on scalars and small arrays, written so that numba compiles it
unchanged (:func:`isolation.dynamics.newmark.kernel_module` compiles a copy of
this module and of :mod:`isolation.dynamics.kernel_laws`, the force laws it
calls; these copies stay interpreted and are the fallback, giving the same
results to round-off); the law names stay importable from here. The laws
are compiled for LLVM to inline (numba ``forceinline``). The time loop
stays one function: measured on this project's history benchmark, the same
loop split into called steps ran 3-5 times slower, and about twice as slow
with the steps force-inlined; the bilinear storey law is written out in the
loop for the same reason.

Model (relative to the ground, Newmark average acceleration, step h)

    M u'' + C u' + K_lin u + T' p(delta) + e_b (F_iso + c_d u_b') = -M 1 a_g

* K_lin: elastic storeys plus P-delta geometric stiffness, C the constant
  damping matrix, M diagonal; with A = K_lin + (4/h^2) M + (2/h) C the
  linear part of the step is u = y - A^-1 (e_b phi + T' p), A^-1 inverted
  once per analysis (:func:`isolation.dynamics.newmark.simulate`).
* p_i = s_i(delta_i) - k_i delta_i: the departure of storey i's hysteretic
  force s_i from its elastic value (zero for elastic storeys), found by
  fixed-point iteration. Each pass changes p by about (omega h)^2/8 of the
  previous change, omega the highest frequency, so below 0.05 when
  h <= T_min/10.
* phi = F_iso + c_d u_b': the isolation-plane law, solved exactly (to
  round-off) for the base displacement by a bracketed Newton iteration on
  the scalar equation u_b + A^-1_bb phi(u_b) = w_b
  (:func:`isolation.dynamics.kernel_laws.solve_base`).

Arrays per degree of freedom: u, v, a and their values at the step's start
(un, vn, an), the right-hand side r, y, w and the carried C u, C v (cu, cv);
per storey: committed and trial forces and drifts (s_n, s_t, d_n, d_t) and p.

References
----------
Newmark, N. M. (1959). A method of computation for structural dynamics. J. Eng.
Mech. Div. ASCE 85(3).
"""

import math

import numpy as np

from isolation.dynamics import kernel_laws
from isolation.dynamics.kernel_laws import (  # noqa: F401 - the laws' names stay importable from this module
    ISO_ELASTIC_PLASTIC,
    ISO_NONE,
    ISO_SHARP,
    ISO_SMOOTH,
    SMOOTH_ACCEPT,
    STOREY_BILINEAR,
    STOREY_CLOUGH,
    STOREY_ELASTIC,
    STOREY_STATE,
    backbone,
    isolator_force,
    shape,
    solve_base,
    storey_force,
    theta,
)

LAW_FUNCTIONS = kernel_laws.JIT_FUNCTIONS
"""Force laws the loop calls (compiled first, from :mod:`isolation.dynamics.kernel_laws`)."""
LOOP_FUNCTIONS = ("run_columns",)
"""The time loop."""
JIT_FUNCTIONS = LAW_FUNCTIONS + LOOP_FUNCTIONS
"""Every function :func:`isolation.dynamics.newmark.kernel_module` compiles (helpers first)."""


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
    k_plastic = (1.0 - alpha) * kel  # the bilinear law's elastic-plastic element
    f_plastic = (1.0 - alpha) * fy
    inv_kp = 1.0 / k_plastic
    inv_k = 1.0 / kel
    slots = 1 if skind == 1 else STOREY_STATE  # state slots a storey law uses
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
                            if skind == 1:  # the bilinear law written out here: a call costs more than it
                                q = st[i, 0] + k_plastic[i] * (d - d_n[i])
                                if q > f_plastic[i]:
                                    q = f_plastic[i]
                                elif q < -f_plastic[i]:
                                    q = -f_plastic[i]
                                tr[i, 0] = q
                                s = alpha * kel[i] * d + q
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
                        for m in range(slots):
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
                    stored_st += 0.5 * alpha * kel[i] * d_n[i] * d_n[i] + 0.5 * st[i, 0] * st[i, 0] * inv_kp[i]
                else:
                    stored_st += 0.5 * s_n[i] * s_n[i] * inv_k[i]
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
