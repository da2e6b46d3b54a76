"""The two time loops of the plan model: set-up of the compiled loop, and the array loop.

:func:`integrate_compiled` packs the building into the arrays of
:mod:`isolation.dynamics.plan_kernel` and runs it; :func:`integrate_arrays` steps
every column at once with numpy (the fallback without numba, and the reference
the compiled loop is tested against): fixed-point iteration on the base motion
and the storeys' departures together (equations in
:mod:`isolation.dynamics.plan_history`).  Both return the same dictionary of
histories and sums, read by :func:`isolation.dynamics.plan_history._result`.
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np

from isolation.dynamics import plan_kernel
from isolation.dynamics.plan_bearings import BiaxialLaws
from isolation.dynamics.plan_storeys import bilinear_update, storey_springs

__all__ = ["integrate_compiled", "integrate_arrays", "MAX_ITERATIONS", "influence", "at_points"]

MAX_ITERATIONS = 60


def influence(levels: int) -> np.ndarray:
    """Influence matrix r (3 levels, 2) of the ground's x and y motion. [-]"""
    r = np.zeros((3 * levels, 2))
    r[0::3, 0] = 1.0
    r[1::3, 1] = 1.0
    return r


def at_points(motion: np.ndarray, points: np.ndarray) -> np.ndarray:
    """Motion (..., 3) at plan points -> (..., points, 2)."""
    x = motion[..., None, 0] - points[:, 1] * motion[..., None, 2]
    y = motion[..., None, 1] + points[:, 0] * motion[..., None, 2]
    return np.stack([x, y], axis=-1)


def _bearing_arrays(buildings, structure, records, cols, nd, vertical, cases):
    """Bearings, axial-load data and tolerance of the compiled loop (empty ones on a fixed base)."""
    steps = 1 if vertical is None else vertical.shape[-1]
    vert = np.zeros((cols, steps)) if vertical is None else np.ascontiguousarray(np.tile(vertical, (cases, 1)))
    if buildings is None:
        law, strength = np.zeros((cols, 0, 6)), np.zeros((cols, 0, 1))
        pos = np.zeros((0, 2))
        loads = plan_kernel.Loads(np.zeros(nd // 3), np.zeros(nd // 3), np.zeros((cols, 0)), vert, False,
                                  np.zeros(2))
        return pos, law, strength, strength.copy(), loads, 0.0
    pos = np.array(buildings[0].positions, dtype=float)  # a writable copy: one compiled signature
    laws = BiaxialLaws([(b.bearings, b.gravity_loads) for b in buildings], records)
    law = np.ascontiguousarray(np.stack([laws.slider.astype(float), laws.k0, laws.q_fast, laws.q_drop, laws.rate,
                                         laws.inv_y], axis=-1))
    gravity = np.repeat(np.array([b.gravity_loads for b in buildings]), records, axis=0)
    loads = plan_kernel.Loads(np.concatenate([[buildings[0].base_mass], structure.masses]),
                              np.concatenate([[0.0], structure.floor_elevations]), gravity, vert,
                              vertical is not None, (pos**2).sum(axis=0))
    return (pos, law, np.ascontiguousarray(laws.strength), np.ascontiguousarray(laws.inv_element_yield), loads,
            1e-9 * laws.smallest_yield)


def integrate_compiled(buildings, structure, m, k, c, ground, dt, vertical) -> dict:
    """Every column through :func:`isolation.dynamics.plan_kernel.plan_loop` (numba)."""
    records, _, steps = ground.shape
    isolated = buildings is not None
    cases = len(buildings) if isolated else 1
    cols, nd = cases * records, m.shape[0]
    g = np.ascontiguousarray(np.tile(ground, (cases, 1, 1)))
    if np.count_nonzero(m - np.diag(np.diag(m))):
        raise ValueError("the compiled plan loop needs a diagonal mass matrix (lumped masses and inertias)")
    k_inv = np.linalg.inv(k + (2.0 / dt) * c + (4.0 / dt**2) * m)
    springs = storey_springs(structure, 1 if isolated else 0)
    ns = springs.drift_map.shape[1]
    pos, law, strength, inv_ey, loads, tolerance = _bearing_arrays(buildings, structure, records, cols, nd,
                                                                   vertical, cases)
    nb, ne = strength.shape[1], strength.shape[2]
    bearings = plan_kernel.Bearings(pos, np.zeros((nb, 6)), np.zeros((nb, ne, 2)), np.zeros(nb), law, strength,
                                    inv_ey, 2.0 / dt, np.zeros((nb, 6)), np.zeros((nb, ne, 2)), np.zeros((3, 3)),
                                    np.zeros((3, 3)), np.zeros(3), np.zeros(3))
    drift_map = np.ascontiguousarray(springs.drift_map)
    kd = k_inv @ drift_map
    states = [np.zeros(ns) for _ in range(7)]  # q_c d_c p_c p_it q_t p_t drift
    dkb, dkd_t = np.ascontiguousarray(drift_map.T @ k_inv[:, :3]), np.ascontiguousarray((drift_map.T @ kd).T)
    storeys = plan_kernel.Storeys._make([springs.yielding, np.zeros(ns), dkb, dkd_t,
                                         springs.plastic_stiffness, springs.plastic_strength, *states,
                                         springs.tolerance])
    out = plan_kernel.Outputs(np.zeros((steps, cols, nd)), np.zeros((steps, cols, nd)), np.zeros((steps, cols, 3)),
                              np.zeros((cols, nb)), np.zeros((cols, nb)), np.zeros((cols, nb), dtype=np.int64),
                              np.zeros((cols, 6)), np.zeros((cols, ns)), np.zeros((cols, ns)),
                              np.zeros(cols, dtype=np.int64))
    assert plan_kernel.plan_loop is not None, "numba is not installed"
    failed = plan_kernel.plan_loop(dt, np.ascontiguousarray(np.diag(m)), np.ascontiguousarray(c.T), k_inv,
                                   np.ascontiguousarray(kd.T), m @ influence(nd // 3), g, drift_map,
                                   springs.stiffness, bearings, storeys, loads, tolerance, MAX_ITERATIONS, isolated,
                                   out)
    if failed:
        what = "storey" if springs.yielding else "isolator"
        raise RuntimeError(f"plan {what} iteration did not converge at step {failed} (t = {failed * dt:.4g} s)")
    strain = 0.5 * ((out.u[-1] @ k) * out.u[-1]).sum(axis=1)
    e = out.energy
    balance = np.abs(e[:, 0] - (e[:, 4] + e[:, 1] + strain + e[:, 2] + e[:, 5]))
    state = {"u": out.u, "a": out.a, "ground": g, "energy_error": balance / np.maximum(e[:, 3], 1e-300),
             "base_force": out.force, "storey_work": e[:, 5],
             "storey_q": out.storey_q if springs.yielding else None,
             "storey_peak": out.storey_peak if springs.yielding else None,
             "evaluations": out.evaluations / max(steps - 1, 1)}
    if isolated:
        state.update({"axial_min": out.axial_min, "axial_max": out.axial_max, "uplift": out.uplift})
    return state


def _forces_of(f, pos):
    """Resultant (x, y, moment) of bearing forces f (cols, bearings, 2) at positions pos. [kN, kN m]"""
    return np.stack([f[..., 0].sum(axis=1), f[..., 1].sum(axis=1),
                     (pos[:, 0] * f[..., 1] - pos[:, 1] * f[..., 0]).sum(axis=1)], axis=1)


def _array_setup(buildings, structure, m, k, c, ground, dt, vertical) -> SimpleNamespace:
    """Operators and the state at rest of every column (``buildings`` None for a fixed base)."""
    records, _, steps = ground.shape
    cases = len(buildings) if buildings else 1
    cols, nd = cases * records, m.shape[0]
    r = influence(nd // 3)
    g = np.tile(ground, (cases, 1, 1))  # (cols, 2, steps)
    k_inv = np.linalg.inv(k + (2.0 / dt) * c + (4.0 / dt**2) * m)
    st = SimpleNamespace(g=g, r=r, mr=m @ r, m=m, k=k, c=c, dt=dt, k_inv=k_inv, cols=cols,
                         isolated=buildings is not None,
                         u=np.zeros((steps, cols, nd)), v=np.zeros((cols, nd)), a=-(r @ g[:, :, 0].T).T,
                         acc=np.empty((steps, cols, nd)), base_force=np.zeros((steps, cols, 3)),
                         energy={name: np.zeros(cols) for name in ("input", "damping", "bearing", "storey")},
                         peak_input=np.zeros(cols), force_b=np.zeros((cols, 3)), tolerance=0.0)
    st.acc[0] = st.a  # at rest: M a0 = -M r a_g(0)
    springs = storey_springs(structure, 1 if st.isolated else 0)
    st.springs, st.yielding = springs, springs.yielding
    if st.yielding:
        st.kd = k_inv @ springs.drift_map  # (nd, springs): displacement per unit departure force
        st.q_c, st.d_c, st.p_c = (np.zeros((cols, springs.drift_map.shape[1])) for _ in range(3))
        st.storey_peak = np.zeros_like(st.q_c)
    if st.isolated:
        _array_bearings(st, buildings, structure, records, cases, vertical)
    return st


def _array_bearings(st, buildings, structure, records, cases, vertical) -> None:
    pos = st.pos = buildings[0].positions
    nb = pos.shape[0]
    st.laws = BiaxialLaws([(b.bearings, b.gravity_loads) for b in buildings], records)
    st.gravity = np.repeat(np.array([b.gravity_loads for b in buildings]), records, axis=0)
    st.z = np.zeros((st.cols, nb, 2))
    st.p = np.zeros((st.cols, nb, st.laws.elements, 2))
    st.d_prev = np.zeros((st.cols, nb, 2))
    st.vb_prev = np.zeros((st.cols, nb, 2))
    st.axial_min = np.full((st.cols, nb), np.inf)
    st.axial_max = np.full((st.cols, nb), -np.inf)
    st.uplift = np.zeros((st.cols, nb), dtype=int)
    st.sums = (pos**2).sum(axis=0)
    st.heights = np.concatenate([[0.0], structure.floor_elevations])
    st.floor_mass = np.concatenate([[buildings[0].base_mass], structure.masses])
    st.tolerance = 1e-9 * st.laws.smallest_yield
    st.vert = None if vertical is None else np.tile(vertical, (cases, 1))
    st.axial = st.gravity.copy()
    st.twist = max(1.0, float(np.abs(pos).max()))


def _bearing_forces(st, ub):
    """Resultant bearing forces at base motion ``ub`` (cols, 3) and the trial states."""
    d = at_points(ub, st.pos)
    step = d - st.d_prev
    vb = (2.0 / st.dt) * step - st.vb_prev
    f, z_new, p_new = st.laws.forces(d, step, np.sqrt((vb * vb).sum(axis=-1)), st.axial, st.z, st.p)
    return _forces_of(f, st.pos), z_new, p_new, d, vb


def _array_axial(st, n) -> None:
    """Axial loads from the previous step's overturning moment."""
    absolute = st.a + st.g[:, :, n] @ st.r.T
    moment_y = (-(absolute[:, 0::3] * st.floor_mass) * st.heights).sum(axis=1)
    moment_x = (-(absolute[:, 1::3] * st.floor_mass) * st.heights).sum(axis=1)
    st.axial = (st.gravity if st.vert is None else st.gravity * (1.0 + st.vert[:, n + 1][:, None])).copy()
    if st.sums[0] > 0:
        st.axial += moment_y[:, None] * st.pos[:, 0] / st.sums[0]
    if st.sums[1] > 0:
        st.axial += moment_x[:, None] * st.pos[:, 1] / st.sums[1]


def _converged(st, change) -> bool:
    return bool(change[:, :2].max() <= st.tolerance and change[:, 2].max() * st.twist <= st.tolerance)


def _array_yielding(st, n, u_lin):
    """Fixed point on the base motion and the storeys' departures together; u_next."""
    sp = st.springs
    k_base = st.k_inv[:3, :]
    forces = st.force_b
    trial = u_lin - st.p_c @ st.kd.T - (forces @ k_base if st.isolated else 0.0)
    p_prev = st.p_c
    for _ in range(MAX_ITERATIONS):
        if st.isolated:
            forces = _bearing_forces(st, trial[:, :3])[0]
        departure = bilinear_update(st.q_c, st.d_c, trial @ sp.drift_map, sp.plastic_stiffness,
                                    sp.plastic_strength)[1]
        new = u_lin - departure @ st.kd.T - (forces @ k_base if st.isolated else 0.0)
        moved = np.abs(departure - p_prev).max()
        change = np.abs(new[:, :3] - trial[:, :3])
        p_prev, trial = departure, new
        if (not st.isolated or _converged(st, change)) and moved <= sp.tolerance:
            break
    else:
        raise RuntimeError(f"plan storey iteration did not converge at step {n + 1} (t = {(n + 1) * st.dt:.4g} s)")
    if st.isolated:
        st.force_b, st.z, st.p, st.d_prev, st.vb_prev = _bearing_forces(st, trial[:, :3])
    st.q_c, departure = bilinear_update(st.q_c, st.d_c, trial @ sp.drift_map, sp.plastic_stiffness,
                                        sp.plastic_strength)
    u_next = u_lin - departure @ st.kd.T - (st.force_b @ k_base if st.isolated else 0.0)
    drift_next = u_next @ sp.drift_map
    st.energy["storey"] += 0.5 * ((st.p_c + departure) * (drift_next - st.d_c)).sum(axis=1)
    st.storey_peak = np.maximum(st.storey_peak, np.abs(sp.stiffness * drift_next + departure))
    st.p_c, st.d_c = departure, drift_next
    return u_next


def _array_isolated(st, n, u_lin):
    """Fixed point on the base motion with elastic storeys; u_next."""
    ub = u_lin[:, :3] - st.force_b @ st.k_inv[:3, :3]
    for _ in range(MAX_ITERATIONS):
        ub_new = u_lin[:, :3] - _bearing_forces(st, ub)[0] @ st.k_inv[:3, :3]
        change = np.abs(ub_new - ub)
        ub = ub_new
        if _converged(st, change):
            break
    else:
        raise RuntimeError(f"plan isolator iteration did not converge at step {n + 1} (t = {(n + 1) * st.dt:.4g} s)")
    st.force_b, st.z, st.p, st.d_prev, st.vb_prev = _bearing_forces(st, ub)
    return u_lin - st.force_b @ st.k_inv[:3, :]


def _array_advance(st, n, u_next, force_old) -> None:
    """Bearing records, Newmark update and energy sums (trapezoidal: input -int v' M r a_g, damping int v' C v)."""
    dt, un, v, a = st.dt, st.u[n], st.v, st.a
    if st.isolated:
        st.axial_min = np.minimum(st.axial_min, st.axial)
        st.axial_max = np.maximum(st.axial_max, st.axial)
        st.uplift += (st.laws.slider & (st.axial <= 0.0))
        st.base_force[n + 1] = st.force_b
        st.energy["bearing"] += 0.5 * ((force_old + st.force_b) * (u_next[:, :3] - un[:, :3])).sum(axis=1)
    a_next = (4.0 / dt**2) * (u_next - un) - (4.0 / dt) * v - a
    v_next = v + 0.5 * dt * (a + a_next)
    st.energy["input"] -= 0.25 * dt * (((v + v_next) @ st.mr) * (st.g[:, :, n] + st.g[:, :, n + 1])).sum(axis=1)
    st.energy["damping"] += 0.25 * (((v + v_next) @ st.c) * (v + v_next)).sum(axis=1) * dt
    st.peak_input = np.maximum(st.peak_input, np.abs(st.energy["input"]))
    st.u[n + 1], st.v, st.a = u_next, v_next, a_next
    st.acc[n + 1] = a_next


def integrate_arrays(buildings, structure, m, k, c, ground, dt, vertical) -> dict:
    """Every column at once with numpy (fixed-point iterations; see the module notes)."""
    st = _array_setup(buildings, structure, m, k, c, ground, dt, vertical)
    c2, c4 = 2.0 / dt, 4.0 / dt**2
    for n in range(ground.shape[-1] - 1):
        un = st.u[n]
        rhs = -(st.g[:, :, n + 1] @ st.mr.T) + (c4 * un + (4.0 / dt) * st.v + st.a) @ m + (c2 * un + st.v) @ c
        u_lin = rhs @ st.k_inv
        if st.isolated:
            _array_axial(st, n)
        force_old = st.force_b
        if st.yielding:
            u_next = _array_yielding(st, n, u_lin)
        elif st.isolated:
            u_next = _array_isolated(st, n, u_lin)
        else:
            u_next = u_lin
        _array_advance(st, n, u_next, force_old)
    final, e = st.u[-1], st.energy
    kinetic = 0.5 * ((st.v @ m) * st.v).sum(axis=1)
    strain = 0.5 * ((final @ k) * final).sum(axis=1)
    dissipated = kinetic + e["damping"] + strain + e["bearing"] + e["storey"]
    out = {"u": st.u, "a": st.acc, "ground": st.g, "base_force": st.base_force, "storey_work": e["storey"],
           "energy_error": np.abs(e["input"] - dissipated) / np.maximum(st.peak_input, 1e-300),
           "storey_q": st.q_c if st.yielding else None, "storey_peak": st.storey_peak if st.yielding else None}
    if st.isolated:
        out.update({"axial_min": st.axial_min, "axial_max": st.axial_max, "uplift": st.uplift})
    return out
