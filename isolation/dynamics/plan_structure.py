"""Plan (three-dimensional) buildings: the superstructure on an isolation-plane diaphragm with bearings.

The superstructure, :class:`PlanShearBuilding`, and its model (rigid diaphragms
with x, y and rotation, storeys at a centre of rigidity, yielding, P-delta) are
in :mod:`isolation.dynamics.plan_superstructure` and re-exported here.

:class:`PlanIsolatedBuilding` adds the isolation-plane diaphragm (mass ``m_b``,
inertia of a uniform rectangular plate) and bearings at plan positions
(:func:`bearing_grid` or listed).  Accidental eccentricity is applied as a mass
offset (ASCE/SEI 7-16 §12.8.4.2 and EN 1998-1:2004 §4.3.2: 5 % of the plan
dimension perpendicular to the motion, both signs; from memory): moving the
centre of mass by ``(m_x, m_y)`` moves every stiffness centre and bearing by
``(-m_x, -m_y)`` relative to it.  The superstructure's damping acts on floor
motion relative to the isolation plane, so the isolation modes get no damping
from the superstructure.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

import numpy as np

from isolation import GRAVITY, validate
from isolation.dynamics.plan_superstructure import PlanShearBuilding, _pair

__all__ = ["PlanShearBuilding", "PlanIsolatedBuilding", "bearing_grid"]


def bearing_grid(plan, counts) -> np.ndarray:
    """Bearing positions on a regular grid covering the plan, relative to its centre.

    Parameters
    ----------
    plan : tuple of float
        Plan dimensions (L_x, L_y). [m]
    counts : tuple of int
        Bearings along x and along y, each >= 1 (2 or more puts bearings on the edges). [-]

    Returns
    -------
    numpy.ndarray
        (count_x * count_y, 2) positions. [m]
    """
    lx, ly = _pair("plan", plan, "m", positive=True)
    if len(tuple(counts)) != 2 or any(int(c) != c or c < 1 for c in counts):
        raise ValueError(f"counts = {counts!r} is not allowed: must be two whole numbers >= 1 [-]")
    xs = np.linspace(-lx / 2, lx / 2, int(counts[0])) if counts[0] > 1 else np.zeros(1)
    ys = np.linspace(-ly / 2, ly / 2, int(counts[1])) if counts[1] > 1 else np.zeros(1)
    gx, gy = np.meshgrid(xs, ys, indexing="ij")
    return np.column_stack([gx.ravel(), gy.ravel()])


@dataclass(frozen=True)
class PlanIsolatedBuilding:
    """A plan shear building on an isolation-plane diaphragm carried by bearings at plan positions.

    Parameters
    ----------
    superstructure : PlanShearBuilding
        The building above the isolation plane. [-]
    base_mass : float
        Mass of the isolation-plane diaphragm, > 0. [t]
    bearings : bearing or sequence of bearings
        One bearing object used at every position, or one per position
        (FrictionPendulum, DoubleConcave, LeadRubber, HighDampingRubber, a
        Bilinear or MultiLinear backbone of one bearing). [-]
    positions : array_like
        (n, 2) bearing positions relative to the centre of mass. [m]
    gravity_loads : sequence of float, optional
        Axial load of each bearing from gravity, > 0, summing to the weight;
        default the weight shared equally. [kN]
    mass_offset : tuple of float
        Accidental eccentricity applied as a shift of the centre of mass of
        every level (m_x, m_y). [m]
    """

    superstructure: PlanShearBuilding
    base_mass: float
    bearings: Any  # one bearing or a sequence of them; a tuple after __post_init__
    positions: np.ndarray
    gravity_loads: tuple | None = None
    mass_offset: tuple = field(default=(0.0, 0.0))

    def __post_init__(self) -> None:
        if not isinstance(self.superstructure, PlanShearBuilding):
            raise ValueError(f"superstructure = {self.superstructure!r} is not allowed: must be a PlanShearBuilding")
        object.__setattr__(self, "base_mass", validate.positive("base_mass", self.base_mass, "t"))
        positions = validate.finite_array("positions", self.positions, "m")
        if positions.ndim != 2 or positions.shape[1] != 2 or positions.shape[0] < 1:
            raise ValueError(f"positions has shape {positions.shape}: must be (n, 2) with n >= 1 [m]")
        n = positions.shape[0]
        bearings = list(self.bearings) if isinstance(self.bearings, (list, tuple)) else [self.bearings] * n
        if len(bearings) != n:
            raise ValueError(f"bearings has {len(bearings)} entries and positions {n}: must be one or one per position")
        offset = _pair("mass_offset", self.mass_offset, "m")
        if self.gravity_loads is None:
            loads = np.full(n, self.weight / n)
        else:
            loads = validate.positive_array("gravity_loads", self.gravity_loads, "kN")
            if loads.shape != (n,):
                raise ValueError(f"gravity_loads has {loads.size} entries: must be one per bearing [kN]")
            if not np.isclose(loads.sum(), self.weight, rtol=1e-6):
                raise ValueError(
                    f"gravity_loads sum to {loads.sum():.6g} kN: must equal the weight {self.weight:.6g} kN [kN]"
                )
        shifted = positions - np.asarray(offset)
        shifted.setflags(write=False)
        object.__setattr__(self, "positions", shifted)
        object.__setattr__(self, "bearings", tuple(bearings))
        object.__setattr__(self, "gravity_loads", tuple(loads.tolist()))
        object.__setattr__(self, "mass_offset", offset)
        if offset != (0.0, 0.0):
            object.__setattr__(self, "superstructure", self.superstructure.shifted(offset))

    @property
    def count(self) -> int:
        """Number of bearings. [-]"""
        return int(self.positions.shape[0])

    @property
    def total_mass(self) -> float:
        """Base diaphragm plus superstructure. [t]"""
        return self.base_mass + self.superstructure.total_mass

    @property
    def weight(self) -> float:
        """Weight on the isolation plane. [kN]"""
        return self.total_mass * GRAVITY

    def matrices(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """M, K, C of base + floors, 3 DOF per level, bearings excluded.

        K holds the elastic storeys plus the P-delta geometric stiffness
        (when the superstructure has ``p_delta``); yielding storeys enter the
        time loop as departures from their elastic force.
        The superstructure's fixed-base K and C act on floor motion relative
        to the base diaphragm (the rigid-body transfer of a base rotation to
        a floor is exact for diaphragms sharing one vertical axis).
        """
        s = self.superstructure
        n = s.storeys
        t = np.hstack([-np.tile(np.eye(3), (n, 1)), np.eye(3 * n)])
        base = np.diag([self.base_mass, self.base_mass, s.rotational_inertia(self.base_mass)])
        m = np.zeros((3 * n + 3, 3 * n + 3))
        m[:3, :3] = base
        m[3:, 3:] = s.mass_matrix()
        k = s.stiffness_matrix() + s.geometric_stiffness_matrix()
        return m, t.T @ k @ t, t.T @ s.damping_matrix() @ t

    def to_dict(self) -> dict:
        from isolation.dynamics.isolators import describe

        assert self.gravity_loads is not None  # a tuple after __post_init__
        return {
            "kind": "plan_isolated_building",
            "superstructure": self.superstructure.to_dict(),
            "base_mass": self.base_mass,
            "positions": self.positions.tolist(),
            "gravity_loads": list(self.gravity_loads),
            "mass_offset": list(self.mass_offset),
            "bearings": [describe(b) for b in self.bearings],
        }
