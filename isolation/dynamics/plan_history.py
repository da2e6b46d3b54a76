"""Bidirectional response histories of plan buildings (fixed base or on bearings at plan positions).

Integration: Newmark average acceleration on all degrees of freedom (x, y,
theta of the isolation-plane diaphragm and of every floor), every record x
property case a column stepped at once.  The bearings' forces enter as
forces on the three base degrees of freedom; each step solves the implicit
equations by fixed-point iteration on the base motion with the linear
superstructure condensed (``u = u_lin - K_hat^-1 P_b(u_base)``).  The
iteration contracts by roughly (bearing tangent stiffness) / (4 M / dt^2),
a few thousandths for isolation planes, and runs to 1e-9 of the smallest
bearing yield displacement, so the converged step is the implicit Newmark
step (unconditionally stable) and unidirectional input reproduces the
planar engine (:mod:`isolation.dynamics.history`) to the same tolerance.

Yielding storeys (:mod:`isolation.dynamics.plan_storeys`): the x and y
springs at each storey's centre of rigidity carry their departure from the
elastic force, ``p = s - k d``, as forces ``D p`` on the degrees of freedom
(``u = u_lin - K_hat^-1 (P_b + D p)``), found by fixed-point iteration
together with the bearing forces to 1e-10 of the largest storey strength
(each pass changes ``p`` by about ``(omega dt)^2 / 4`` of the previous
change, as in the planar engine); P-delta is part of the linear stiffness.
The compiled loop iterates the storeys on the condensed drift equations
inside the bearing iteration; the array loop iterates both at once; they
agree to the tolerances.

Axial loads: gravity (tributary share given with the building) plus the
overturning moment of the superstructure's inertial forces at the isolation
plane, distributed over the bearings as on a rigid base
(``dN_i = M_y x_i / sum x^2 + M_x y_i / sum y^2``), taken from the previous
step; optional vertical ground acceleration scales the gravity share by
``1 + a_v``.  Sliders carry no tension: while ``N <= 0`` a slider's force is
zero (uplift is counted and reported).

Energy: input, kinetic, damping, superstructure strain, bearing work and the
work of the storeys' departures, summed with the trapezoidal rule (exact for the average-acceleration
scheme on the linear part); :attr:`PlanHistoryResult.energy_error`.
"""

from __future__ import annotations

import os
from dataclasses import dataclass

import numpy as np

from isolation import GRAVITY, validate
from isolation.dynamics import plan_kernel
from isolation.dynamics.plan_bearings import BiaxialLaws
from isolation.dynamics.plan_storeys import bilinear_update, storey_springs
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding

__all__ = ["run_plan", "run_plan_cases", "PlanHistoryResult"]

_MAX_ITERATIONS = 60


def _pairs(acceleration) -> np.ndarray:
    acc = validate.finite_array("acceleration", acceleration, "g")
    if acc.ndim == 2:
        acc = acc[None]
    if acc.ndim != 3 or acc.shape[1] != 2 or acc.shape[2] < 2:
        raise ValueError(f"acceleration has shape {acc.shape}: must be (2, steps) or (records, 2, steps) [g]")
    return acc


@dataclass(frozen=True)
class PlanHistoryResult:
    """Bidirectional response of one plan building to a suite of component pairs.

    Attributes
    ----------
    dt : float
        Time step. [s]
    isolator_displacement : ndarray (records, 2, steps)
        Isolation-plane displacement at the centre of mass relative to the ground (x, y). [m]
    base_rotation : ndarray (records, steps)
        Rotation of the isolation-plane diaphragm. [rad]
    bearing_displacement_peak : ndarray (records, bearings)
        Peak resultant displacement of each bearing. [m]
    bearing_axial_force : ndarray (records, bearings, 2)
        Minimum and maximum axial load of each bearing, compression positive. [kN]
    uplift_steps : ndarray (records, bearings)
        Steps during which a slider was lifted (axial load <= 0). [-]
    base_shear : ndarray (records, 2, steps)
        Sum of the bearing forces (x, y). [kN]
    floor_displacement : ndarray (records, storeys, 3, steps)
        Floor motion at the centre of mass relative to the ground (x [m], y [m], theta [rad]).
    peak_drift_ratio : ndarray (records, storeys)
        Peak resultant storey drift over height at the plan corners. [-]
    peak_floor_acceleration : ndarray (records, levels)
        Peak resultant absolute acceleration at the plan corners, isolation plane first. [g]
    positions : ndarray (bearings, 2)
        Bearing positions relative to the centre of mass. [m]
    energy_error : ndarray (records,)
        |input - (kinetic + damping + strain + bearing work + storey yielding work)| / peak input energy. [-]
    storey_drift_peak : ndarray (records, storeys, 2)
        Peak |storey drift| at the centre of rigidity in x and y. [m]
    residual_drift : ndarray (records, storeys, 2)
        |Storey drift| at the centre of rigidity at the last sample over the storey height, x and y
        (pad records with zeros when free vibration should decay first). [-, ratio]
    ductility : ndarray (records, storeys, 2)
        Peak |drift| over the yield drift V_y/k in x and y; NaN where a direction is elastic. [-]
    hysteretic_energy : ndarray (records,)
        Energy dissipated by yielding storeys (their work less the energy they store at the end). [kN m]
    """

    dt: float
    isolator_displacement: np.ndarray | None
    base_rotation: np.ndarray | None
    bearing_displacement_peak: np.ndarray | None
    bearing_axial_force: np.ndarray | None
    uplift_steps: np.ndarray | None
    base_shear: np.ndarray
    floor_displacement: np.ndarray
    peak_drift_ratio: np.ndarray
    peak_floor_acceleration: np.ndarray
    positions: np.ndarray | None
    energy_error: np.ndarray
    storey_drift_peak: np.ndarray | None = None
    residual_drift: np.ndarray | None = None
    ductility: np.ndarray | None = None
    hysteretic_energy: np.ndarray | None = None

    @property
    def total_displacement(self) -> np.ndarray:
        """Peak displacement of the most displaced bearing per record (D_TM from histories). [m]"""
        assert self.bearing_displacement_peak is not None, "a fixed-base case has no bearings"
        return self.bearing_displacement_peak.max(axis=1)

    @property
    def torsional_amplification(self) -> np.ndarray:
        """Peak displacement of the most displaced bearing over the peak at the centre of mass, per record. [-]"""
        assert self.isolator_displacement is not None, "a fixed-base case has no bearings"
        centre = np.sqrt((self.isolator_displacement**2).sum(axis=1)).max(axis=-1)
        return self.total_displacement / centre

    def bearing_orbit(self, index: int) -> np.ndarray:
        """Displacement orbit of bearing ``index``: (records, 2, steps) [m]."""
        u, rotation = self.isolator_displacement, self.base_rotation
        assert self.positions is not None and u is not None and rotation is not None, "fixed base: no bearings"
        px, py = self.positions[index]
        return np.stack([u[:, 0] - py * rotation, u[:, 1] + px * rotation], axis=1)

    def summary(self) -> dict:
        """Suite means of the headline quantities (plain JSON types)."""
        out = {
            "peak_drift_ratio": self.peak_drift_ratio.max(axis=1).mean().item(),
            "peak_floor_acceleration_g": self.peak_floor_acceleration.max(axis=1).mean().item(),
            "base_shear_kN": np.sqrt((self.base_shear**2).sum(axis=1)).max(axis=-1).mean().item(),
            "energy_error": self.energy_error.max().item(),
        }
        if self.ductility is not None and np.isfinite(self.ductility).any():
            out["ductility"] = np.nanmax(self.ductility, axis=(1, 2)).mean().item()
        if self.residual_drift is not None:
            out["residual_drift_ratio"] = self.residual_drift.max(axis=(1, 2)).mean().item()
        if self.bearing_displacement_peak is not None:
            assert (self.isolator_displacement is not None and self.bearing_axial_force is not None
                    and self.uplift_steps is not None)  # written with the bearing peaks
            out.update({
                "total_displacement_m": self.total_displacement.mean().item(),
                "centre_displacement_m":
                    np.sqrt((self.isolator_displacement**2).sum(axis=1)).max(axis=-1).mean().item(),
                "torsional_amplification": self.torsional_amplification.mean().item(),
                "axial_min_kN": self.bearing_axial_force[..., 0].min().item(),
                "axial_max_kN": self.bearing_axial_force[..., 1].max().item(),
                "uplifted_bearings": int((self.uplift_steps > 0).any(axis=0).sum()),
            })
        return out


def _influence(levels: int) -> np.ndarray:
    r = np.zeros((3 * levels, 2))
    r[0::3, 0] = 1.0
    r[1::3, 1] = 1.0
    return r


def _corners(plan) -> np.ndarray:
    lx, ly = plan
    return np.array([[lx / 2, ly / 2], [-lx / 2, ly / 2], [-lx / 2, -ly / 2], [lx / 2, -ly / 2]])


def _at_points(motion: np.ndarray, points: np.ndarray) -> np.ndarray:
    """Motion (..., 3) at plan points -> (..., points, 2)."""
    x = motion[..., None, 0] - points[:, 1] * motion[..., None, 2]
    y = motion[..., None, 1] + points[:, 0] * motion[..., None, 2]
    return np.stack([x, y], axis=-1)


def run_plan(building, acceleration, dt, *, vertical=None) -> PlanHistoryResult:
    """Response history of one plan building under component pairs.

    Parameters
    ----------
    building : PlanIsolatedBuilding or PlanShearBuilding
        Isolated plan building, or the superstructure on a fixed base. [-]
    acceleration : array_like
        Ground acceleration pairs (x, y), (2, steps) or (records, 2, steps). [g]
    dt : float
        Time step. [s]
    vertical : array_like, optional
        Vertical ground acceleration, upward positive, (steps,) or (records, steps);
        scales the bearings' gravity loads by 1 + a_v. [g]

    Returns
    -------
    PlanHistoryResult
    """
    return run_plan_cases([building], acceleration, dt, vertical=vertical)[0]


def run_plan_cases(buildings, acceleration, dt, *, vertical=None) -> list:
    """Several property cases of one plan building integrated together (columns = cases x records).

    Parameters
    ----------
    buildings : sequence of PlanIsolatedBuilding, or one PlanShearBuilding in a list
        Cases sharing superstructure, base mass and positions (bearings may differ). [-]
    acceleration : array_like
        (2, steps) or (records, 2, steps). [g]
    dt : float
        Time step. [s]
    vertical : array_like, optional
        Vertical ground acceleration, (steps,) or (records, steps). [g]

    Returns
    -------
    list of PlanHistoryResult, one per case.
    """
    acc = _pairs(acceleration)
    dt = validate.positive("dt", dt, "s")
    records, _, steps = acc.shape
    buildings = list(buildings)
    if not buildings:
        raise ValueError("buildings = [] is not allowed: give at least one building")
    isolated = isinstance(buildings[0], PlanIsolatedBuilding)
    for b in buildings:
        if (isolated and not isinstance(b, PlanIsolatedBuilding)
                or not isolated and not isinstance(b, PlanShearBuilding)):
            raise ValueError(f"building = {b!r} is not allowed: cases must all be PlanIsolatedBuilding or one "
                             "PlanShearBuilding")
    if not isolated and len(buildings) != 1:
        raise ValueError("a fixed-base plan building runs as one case")
    first = buildings[0]
    if isolated:
        for b in buildings[1:]:
            if (b.superstructure != first.superstructure or b.base_mass != first.base_mass
                    or not np.array_equal(b.positions, first.positions)):
                raise ValueError("cases integrated together must share superstructure, base mass and bearing positions")
        m, k, c = first.matrices()
        structure = first.superstructure
    else:
        structure = first
        m, c = first.mass_matrix(), first.damping_matrix()
        k = first.stiffness_matrix() + first.geometric_stiffness_matrix()
    vertical_g = None
    if vertical is not None:
        vertical_g = validate.finite_array("vertical", vertical, "g")
        vertical_g = np.broadcast_to(vertical_g if vertical_g.ndim == 2 else vertical_g[None], (records, steps))
    state = _integrate(buildings if isolated else None, structure, m, k, c, acc * GRAVITY, dt, vertical_g)
    return [_result(state, case, records, isolated, structure, buildings[case] if isolated else None, dt)
            for case in range(len(buildings))]


def _integrate(buildings, structure, m, k, c, ground, dt, vertical, compiled=None):
    """Step every column; the compiled loop (:mod:`isolation.dynamics.plan_kernel`) when numba is there and
    ``ISOLATION_ENGINE`` is not ``"python"`` (as for the planar engine), else the array loop."""
    if compiled is None:
        compiled = plan_kernel.available and os.environ.get("ISOLATION_ENGINE", "") != "python"
    if bool(compiled) and plan_kernel.available:
        return _integrate_compiled(buildings, structure, m, k, c, ground, dt, vertical)
    return _integrate_arrays(buildings, structure, m, k, c, ground, dt, vertical)


def _integrate_compiled(buildings, structure, m, k, c, ground, dt, vertical):
    records, _, steps = ground.shape
    isolated = buildings is not None
    cases = len(buildings) if isolated else 1
    cols = cases * records
    nd = m.shape[0]
    r = _influence(nd // 3)
    g = np.ascontiguousarray(np.tile(ground, (cases, 1, 1)))
    if np.count_nonzero(m - np.diag(np.diag(m))):
        raise ValueError("the compiled plan loop needs a diagonal mass matrix (lumped masses and inertias)")
    k_inv = np.linalg.inv(k + (2.0 / dt) * c + (4.0 / dt**2) * m)
    springs = storey_springs(structure, 1 if isolated else 0)
    ns = springs.drift_map.shape[1]
    if isolated:
        pos = np.ascontiguousarray(buildings[0].positions, dtype=float)
        laws = BiaxialLaws([(b.bearings, b.gravity_loads) for b in buildings], records)
        slider, k0, q_fast, q_drop, rate, inv_y, strength, inv_ey = (
            laws.slider, laws.k0, laws.q_fast, laws.q_drop, laws.rate, laws.inv_y, laws.strength,
            laws.inv_element_yield)
        gravity = np.repeat(np.array([b.gravity_loads for b in buildings]), records, axis=0)
        heights = np.concatenate([[0.0], structure.floor_elevations])
        floor_mass = np.concatenate([[buildings[0].base_mass], structure.masses])
        tolerance = 1e-9 * laws.smallest_yield
    else:
        pos = np.zeros((0, 2))
        slider = np.zeros((cols, 0), dtype=bool)
        k0 = q_fast = q_drop = rate = inv_y = np.zeros((cols, 0))
        strength = inv_ey = np.zeros((cols, 0, 1))
        gravity = np.zeros((cols, 0))
        heights = floor_mass = np.zeros(nd // 3)
        tolerance = 0.0
    nb = pos.shape[0]
    vert = np.zeros((cols, steps)) if vertical is None else np.ascontiguousarray(np.tile(vertical, (cases, 1)))
    u = np.zeros((steps, cols, nd))
    acc = np.zeros((steps, cols, nd))
    force = np.zeros((steps, cols, 3))
    axial_min = np.zeros((cols, nb))
    axial_max = np.zeros((cols, nb))
    uplift = np.zeros((cols, nb), dtype=np.int64)
    energy = np.zeros((cols, 6))
    storey_q = np.zeros((cols, ns))
    drift_map = np.ascontiguousarray(springs.drift_map)
    kd = np.ascontiguousarray(k_inv @ drift_map)
    failed = plan_kernel.plan_loop(  # type: ignore[misc]  # not None: _integrate calls this only when available
        dt, m, c, k_inv, m @ r, g, pos, heights, floor_mass, gravity, vert, vertical is not None, slider,
        k0, q_fast, q_drop, rate, inv_y, strength, inv_ey, tolerance, _MAX_ITERATIONS, isolated, springs.yielding,
        drift_map, kd, np.ascontiguousarray(drift_map.T @ k_inv[:, :3]), np.ascontiguousarray(drift_map.T @ kd),
        springs.plastic_stiffness, springs.plastic_strength,
        springs.tolerance, u, acc, force, axial_min, axial_max, uplift, energy, storey_q)
    if failed:
        what = "storey" if springs.yielding else "isolator"
        raise RuntimeError(f"plan {what} iteration did not converge at step {failed} (t = {failed * dt:.4g} s)")
    final = u[-1]
    strain = 0.5 * ((final @ k) * final).sum(axis=1)
    balance = np.abs(energy[:, 0] - (energy[:, 4] + energy[:, 1] + strain + energy[:, 2] + energy[:, 5]))
    out = {"u": u, "a": acc, "ground": g, "energy_error": balance / np.maximum(energy[:, 3], 1e-300),
           "base_force": force, "storey_work": energy[:, 5], "storey_q": storey_q if springs.yielding else None}
    if isolated:
        out.update({"axial_min": axial_min, "axial_max": axial_max, "uplift": uplift})
    return out


def _forces_of(f, pos):
    """Resultant (x, y, moment) of bearing forces f (cols, bearings, 2) at positions pos. [kN, kN m]"""
    return np.stack([f[..., 0].sum(axis=1), f[..., 1].sum(axis=1),
                     (pos[:, 0] * f[..., 1] - pos[:, 1] * f[..., 0]).sum(axis=1)], axis=1)


def _integrate_arrays(buildings, structure, m, k, c, ground, dt, vertical):
    records, _, steps = ground.shape
    cases = len(buildings) if buildings else 1
    cols = cases * records
    levels = m.shape[0] // 3
    nd = m.shape[0]
    r = _influence(levels)
    g = np.tile(ground, (cases, 1, 1))  # (cols, 2, steps)
    k_hat = k + (2.0 / dt) * c + (4.0 / dt**2) * m
    k_inv = np.linalg.inv(k_hat)
    u = np.zeros((steps, cols, nd))
    v = np.zeros((cols, nd))
    a = np.zeros((cols, nd))
    a[:] = -(r @ g[:, :, 0].T).T  # at rest: M a0 = -M r a_g(0)
    mr = m @ r
    acc_hist = np.empty((steps, cols, nd))
    acc_hist[0] = a
    energy = {"input": np.zeros(cols), "kinetic": np.zeros(cols), "damping": np.zeros(cols), "strain": np.zeros(cols),
              "bearing": np.zeros(cols), "storey": np.zeros(cols)}
    peak_input = np.zeros(cols)
    base_force_hist = np.zeros((steps, cols, 3))
    isolated = buildings is not None
    springs = storey_springs(structure, 1 if isolated else 0)
    yielding = springs.yielding
    force_b = np.zeros((cols, 3))
    if yielding:
        drift_map = springs.drift_map
        kd = k_inv @ drift_map  # (nd, springs): displacement per unit departure force
        kp, fp = springs.plastic_stiffness, springs.plastic_strength
        q_c = np.zeros((cols, drift_map.shape[1]))
        d_c = np.zeros_like(q_c)
        p_c = np.zeros_like(q_c)
        tol_storey = springs.tolerance
    tolerance = 0.0
    if isolated:
        pos = buildings[0].positions
        nb = pos.shape[0]
        laws = BiaxialLaws([(b.bearings, b.gravity_loads) for b in buildings], records)
        gravity = np.repeat(np.array([b.gravity_loads for b in buildings]), records, axis=0)
        z = np.zeros((cols, nb, 2))
        p = np.zeros((cols, nb, laws.elements, 2))
        d_prev = np.zeros((cols, nb, 2))
        vb_prev = np.zeros((cols, nb, 2))
        axial_min = np.full((cols, nb), np.inf)
        axial_max = np.full((cols, nb), -np.inf)
        uplift = np.zeros((cols, nb), dtype=int)
        xx = float((pos[:, 0] ** 2).sum())
        yy = float((pos[:, 1] ** 2).sum())
        heights = np.concatenate([[0.0], structure.floor_elevations])
        floor_mass = np.concatenate([[buildings[0].base_mass], structure.masses])
        tolerance = 1e-9 * laws.smallest_yield
        g_base = k_inv[:3, :3]
        k_inv_base = k_inv[:3, :]
        vert = None if vertical is None else np.tile(vertical, (cases, 1))
        axial = gravity.copy()
        twist = max(1.0, float(np.abs(pos).max()))

        def bearing_forces(ub, z, p):
            d = _at_points(ub, pos)
            step = d - d_prev
            vb = c2 * step - vb_prev
            speed = np.sqrt((vb * vb).sum(axis=-1))
            f, z_new, p_new = laws.forces(d, step, speed, axial, z, p)
            return _forces_of(f, pos), z_new, p_new, d, vb
    c2, c4 = 2.0 / dt, 4.0 / dt**2
    for n in range(steps - 1):
        un = u[n]
        load = -(g[:, :, n + 1] @ mr.T)
        rhs = load + (c4 * un + (4.0 / dt) * v + a) @ m + (c2 * un + v) @ c
        u_lin = rhs @ k_inv
        if isolated:
            # axial loads from the previous step's overturning moment
            absolute = a + g[:, :, n] @ r.T
            fx = -(absolute[:, 0::3] * floor_mass)
            fy = -(absolute[:, 1::3] * floor_mass)
            moment_y = (fx * heights).sum(axis=1)
            moment_x = (fy * heights).sum(axis=1)
            base_share = gravity if vert is None else gravity * (1.0 + vert[:, n + 1][:, None])
            axial = base_share.copy()
            if xx > 0:
                axial += moment_y[:, None] * pos[:, 0] / xx
            if yy > 0:
                axial += moment_x[:, None] * pos[:, 1] / yy
        force_old = force_b
        if yielding:
            # fixed point on the base motion and the storeys' departures together
            forces = force_b
            departure = p_c
            trial = u_lin - departure @ kd.T - (forces @ k_inv_base if isolated else 0.0)
            p_prev = departure
            for _ in range(_MAX_ITERATIONS):
                if isolated:
                    forces = bearing_forces(trial[:, :3], z, p)[0]
                departure = bilinear_update(q_c, d_c, trial @ drift_map, kp, fp)[1]
                new = u_lin - departure @ kd.T - (forces @ k_inv_base if isolated else 0.0)
                change = np.abs(new[:, :3] - trial[:, :3])
                moved = np.abs(departure - p_prev).max()
                p_prev = departure
                trial = new
                if (not isolated or (change[:, :2].max() <= tolerance and change[:, 2].max() * twist <= tolerance)) \
                        and moved <= tol_storey:
                    break
            else:
                raise RuntimeError(f"plan storey iteration did not converge at step {n + 1} (t = {(n + 1) * dt:.4g} s)")
            if isolated:
                force_b, z, p, d_prev, vb_prev = bearing_forces(trial[:, :3], z, p)
            drift = trial @ drift_map
            q_c, departure = bilinear_update(q_c, d_c, drift, kp, fp)
            u_next = u_lin - departure @ kd.T - (force_b @ k_inv_base if isolated else 0.0)
            drift_next = u_next @ drift_map
            energy["storey"] += 0.5 * ((p_c + departure) * (drift_next - d_c)).sum(axis=1)
            p_c, d_c = departure, drift_next
        elif isolated:
            ub = u_lin[:, :3] - force_b @ g_base
            for _ in range(_MAX_ITERATIONS):
                force_new = bearing_forces(ub, z, p)[0]
                ub_new = u_lin[:, :3] - force_new @ g_base
                change = np.abs(ub_new - ub)
                ub = ub_new
                if change[:, :2].max() <= tolerance and change[:, 2].max() * twist <= tolerance:
                    break
            else:
                raise RuntimeError(f"plan isolator iteration did not converge at step {n + 1} "
                                   f"(t = {(n + 1) * dt:.4g} s)")
            force_b, z, p, d_prev, vb_prev = bearing_forces(ub, z, p)
            u_next = u_lin - force_b @ k_inv_base
        else:
            u_next = u_lin
        if isolated:
            axial_min = np.minimum(axial_min, axial)
            axial_max = np.maximum(axial_max, axial)
            uplift += (laws.slider & (axial <= 0.0))
            base_force_hist[n + 1] = force_b
            du_base = u_next[:, :3] - un[:, :3]
            energy["bearing"] += 0.5 * ((force_old + force_b) * du_base).sum(axis=1)
        a_next = c4 * (u_next - un) - (4.0 / dt) * v - a
        v_next = v + 0.5 * dt * (a + a_next)
        # energy (trapezoidal): input -int v' M r a_g, damping int v' C v
        energy["input"] -= 0.25 * dt * (((v + v_next) @ mr) * (g[:, :, n] + g[:, :, n + 1])).sum(axis=1)
        energy["damping"] += 0.25 * (((v + v_next) @ c) * (v + v_next)).sum(axis=1) * dt
        peak_input = np.maximum(peak_input, np.abs(energy["input"]))
        u[n + 1], v, a = u_next, v_next, a_next
        acc_hist[n + 1] = a_next
    final = u[-1]
    energy["kinetic"] = 0.5 * ((v @ m) * v).sum(axis=1)
    energy["strain"] = 0.5 * ((final @ k) * final).sum(axis=1)
    dissipated = energy["kinetic"] + energy["damping"] + energy["strain"] + energy["bearing"] + energy["storey"]
    error = np.abs(energy["input"] - dissipated) / np.maximum(peak_input, 1e-300)
    out = {"u": u, "a": acc_hist, "ground": g, "energy_error": error, "base_force": base_force_hist,
           "storey_work": energy["storey"], "storey_q": q_c if yielding else None}
    if isolated:
        out.update({"axial_min": axial_min, "axial_max": axial_max, "uplift": uplift})
    return out


def _result(state, case, records, isolated, structure, building, dt) -> PlanHistoryResult:
    cols = slice(case * records, (case + 1) * records)
    u = state["u"][:, cols]  # (steps, records, nd)
    a = state["a"][:, cols]
    g = state["ground"][cols]  # (records, 2, steps)
    corners = _corners(structure.plan)
    offset = 3 if isolated else 0
    storeys = structure.storeys
    floors = u[:, :, offset:].reshape(u.shape[0], records, storeys, 3)
    below = np.concatenate([u[:, :, None, :3], floors[:, :, :-1]], axis=2) if isolated else np.concatenate(
        [np.zeros_like(floors[:, :, :1]), floors[:, :, :-1]], axis=2)
    drift = _at_points(floors - below, corners)  # (steps, records, storeys, 4, 2)
    drift_ratio = np.sqrt((drift**2).sum(axis=-1)).max(axis=(0, 3)) / np.asarray(structure.heights)
    absolute = a.reshape(a.shape[0], records, -1, 3).copy()
    absolute[..., 0] += np.moveaxis(g[:, 0], -1, 0)[..., None]
    absolute[..., 1] += np.moveaxis(g[:, 1], -1, 0)[..., None]
    corner_acc = np.sqrt((_at_points(absolute, corners) ** 2).sum(axis=-1)).max(axis=(0, 3)) / GRAVITY
    if not isolated:
        ground_acc = np.sqrt((g**2).sum(axis=1)).max(axis=-1) / GRAVITY
        corner_acc = np.concatenate([ground_acc[:, None], corner_acc], axis=1)
    floor_disp = np.moveaxis(floors, 0, -1)
    storey = _storey_results(state, cols, u, structure, isolated)
    if isolated:
        base = np.moveaxis(u[:, :, :3], 0, -1)  # (records, 3, steps)
        pos = building.positions
        orbit = _at_points(np.moveaxis(base, 1, -1), pos)  # (records, steps, bearings, 2)
        peaks = np.sqrt((orbit**2).sum(axis=-1)).max(axis=1)
        shear = np.moveaxis(state["base_force"][:, cols, :2], 0, -1)
        axial = np.stack([state["axial_min"][cols], state["axial_max"][cols]], axis=-1)
        return PlanHistoryResult(
            dt=dt, isolator_displacement=base[:, :2], base_rotation=base[:, 2], bearing_displacement_peak=peaks,
            bearing_axial_force=axial, uplift_steps=state["uplift"][cols], base_shear=shear,
            floor_displacement=floor_disp, peak_drift_ratio=drift_ratio, peak_floor_acceleration=corner_acc,
            positions=np.asarray(pos), energy_error=state["energy_error"][cols], **storey,
        )
    shear = np.moveaxis((floors[:, :, 0, :] @ structure.storey_stiffness(0).T)[..., :2], 0, -1)
    return PlanHistoryResult(
        dt=dt, isolator_displacement=None, base_rotation=None, bearing_displacement_peak=None,
        bearing_axial_force=None, uplift_steps=None, base_shear=shear, floor_displacement=floor_disp,
        peak_drift_ratio=drift_ratio, peak_floor_acceleration=corner_acc, positions=None,
        energy_error=state["energy_error"][cols], **storey,
    )


def _storey_results(state, cols, u, structure, isolated) -> dict:
    """Storey drifts at the centre of rigidity, ductility, residual drift and hysteretic energy of one case."""
    springs = storey_springs(structure, 1 if isolated else 0)
    records = u.shape[1]
    drift = (u @ springs.drift_map).reshape(u.shape[0], records, structure.storeys, 2)
    peak = np.abs(drift).max(axis=0)
    final = drift[-1]
    residual = np.abs(final) / np.asarray(structure.heights)[:, None]
    with np.errstate(invalid="ignore"):
        ductility = np.where(np.isfinite(structure.yield_drifts), peak / structure.yield_drifts, np.nan)
    if state.get("storey_q") is None:
        hysteretic = np.zeros(records)
    else:
        q = state["storey_q"][cols]
        stored = springs.stored_energy(final.reshape(records, -1), q).sum(axis=1)
        elastic = 0.5 * (springs.stiffness * final.reshape(records, -1) ** 2).sum(axis=1)
        hysteretic = elastic + state["storey_work"][cols] - stored
    return {"storey_drift_peak": peak, "residual_drift": residual, "ductility": ductility,
            "hysteretic_energy": hysteretic}
