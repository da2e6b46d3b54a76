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
from isolation.dynamics.plan_integration import integrate_arrays, integrate_compiled
from isolation.dynamics.plan_storeys import storey_springs
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding

__all__ = ["run_plan", "run_plan_cases", "PlanHistoryResult"]

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
    storey_shear_peak : ndarray (records, storeys, 2)
        Peak |storey shear| in x and y: the force of the storey's spring at its centre of rigidity
        (elastic or hysteretic, without damping and without the P-delta term, as the planar engine's
        ``storey_shear``). [kN]
    yield_strengths : ndarray (storeys, 2)
        Storey yield shears in x and y; inf where a direction is elastic. [kN]
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
    storey_shear_peak: np.ndarray | None = None
    yield_strengths: np.ndarray | None = None

    @property
    def shear_strength_ratio(self) -> np.ndarray:
        """Peak storey shear over the storey yield shear (records, storeys, 2); NaN where elastic. [-]"""
        assert self.storey_shear_peak is not None and self.yield_strengths is not None, "no storey shears"
        with np.errstate(invalid="ignore", divide="ignore"):
            return np.where(np.isfinite(self.yield_strengths), self.storey_shear_peak / self.yield_strengths,
                            np.nan)

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


def _corners(plan) -> np.ndarray:
    lx, ly = plan
    return np.array([[lx / 2, ly / 2], [-lx / 2, ly / 2], [-lx / 2, -ly / 2], [lx / 2, -ly / 2]])


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
        return integrate_compiled(buildings, structure, m, k, c, ground, dt, vertical)
    return integrate_arrays(buildings, structure, m, k, c, ground, dt, vertical)


def _peak_at_points(motion: np.ndarray, points: np.ndarray) -> np.ndarray:
    """Peak over the first axis of the resultant of motion (steps, ..., 3) at plan points -> (..., points)."""
    x, y, theta = (np.ascontiguousarray(motion[..., i]) for i in range(3))
    out = np.empty(x.shape[1:] + (len(points),))
    rx, ry = np.empty_like(x), np.empty_like(x)
    for i, (px, py) in enumerate(points):
        np.multiply(theta, -py, out=rx)
        rx += x
        np.multiply(theta, px, out=ry)
        ry += y
        rx *= rx
        ry *= ry
        rx += ry
        out[..., i] = np.sqrt(rx.max(axis=0))
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
    drift_ratio = _peak_at_points(floors - below, corners).max(axis=-1) / np.asarray(structure.heights)
    absolute = a.reshape(a.shape[0], records, -1, 3).copy()
    absolute[..., 0] += np.moveaxis(g[:, 0], -1, 0)[..., None]
    absolute[..., 1] += np.moveaxis(g[:, 1], -1, 0)[..., None]
    corner_acc = _peak_at_points(absolute, corners).max(axis=-1) / GRAVITY
    if not isolated:
        ground_acc = np.sqrt((g**2).sum(axis=1)).max(axis=-1) / GRAVITY
        corner_acc = np.concatenate([ground_acc[:, None], corner_acc], axis=1)
    floor_disp = np.moveaxis(floors, 0, -1)
    storey = _storey_results(state, cols, u, structure, isolated)
    if isolated:
        base = np.moveaxis(u[:, :, :3], 0, -1)  # (records, 3, steps)
        pos = building.positions
        peaks = _peak_at_points(u[:, :, :3], pos)  # (records, bearings)
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
    if state.get("storey_peak") is None:  # elastic springs: k |d|
        shear = (springs.stiffness.reshape(structure.storeys, 2) * peak)
    else:
        shear = state["storey_peak"][cols].reshape(records, structure.storeys, 2)
    return {"storey_drift_peak": peak, "residual_drift": residual, "ductility": ductility,
            "hysteretic_energy": hysteretic, "storey_shear_peak": shear,
            "yield_strengths": np.array(structure.yield_strengths)}
