"""Plan (three-dimensional) shear buildings: rigid diaphragms with x, y and rotation per level.

:class:`PlanShearBuilding`, re-exported by :mod:`isolation.dynamics.plan_structure` (where the
isolated plan building lives).

Model
-----
Every level (the isolation-plane diaphragm and each floor) is a rigid
diaphragm with three degrees of freedom at its centre of mass: x, y and the
rotation theta about the vertical axis.  Storey ``i`` joins level ``i - 1``
to level ``i`` with shear stiffnesses ``k_x`` and ``k_y`` acting at the
storey's centre of rigidity, offset ``(e_x, e_y)`` from the centre of mass,
and a torsional stiffness about that centre.  Unless given, the torsional
stiffness is that of lateral-load frames on the plan perimeter, half of each
direction's stiffness on each face: ``k_theta = (k_x L_y^2 + k_y L_x^2) / 4``
(derived: a frame of stiffness k/2 at distance L/2 contributes k/2 (L/2)^2,
two faces per direction).  Floor mass moment of inertia of a uniformly
distributed rectangular plate: ``J = m (L_x^2 + L_y^2) / 12`` (textbook,
e.g. Chopra, Dynamics of Structures, Table of rigid-body inertia; from memory).

For a storey with centre of rigidity at ``(e_x, e_y)`` the drift at that
point is ``d_x = du_x - e_y dtheta``, ``d_y = du_y + e_x dtheta`` (small
rotations), which gives the storey's 6 x 6 stiffness through
``T = [[1, 0, -e_y], [0, 1, e_x], [0, 0, 1]]``: ``k_storey = T' diag(k_x, k_y,
k_theta) T`` on the relative motion of the two levels.

Accidental eccentricity is applied as a mass offset (the clauses are cited in
:mod:`isolation.dynamics.plan_structure`): moving the centre of mass by
``(m_x, m_y)`` moves every stiffness centre and bearing by ``(-m_x, -m_y)``
relative to it (:meth:`PlanShearBuilding.shifted`).

Damping: classical (modal) damping of ``damping`` in every fixed-base mode of
the plan superstructure, acting on floor motion relative to the isolation
plane, as in :class:`isolation.dynamics.structure.ShearBuilding`, so the isolation
modes get no damping from the superstructure.

Yielding storeys (``yield_shears_x``, ``yield_shears_y``): the storey's x and
y springs at the centre of rigidity are each bilinear with kinematic
hardening, a spring ``alpha k`` in parallel with an elastic-perfectly-plastic
element of stiffness ``(1 - alpha) k`` and strength ``(1 - alpha) V_y``, the
planar storey law of :class:`isolation.structure.ShearBuilding` in each
direction.  Assumption: the two directions are uncoupled (each spring yields
on its own drift, no interaction surface), as for lateral-load frames along
the two plan axes whose members each resist one direction; a storey whose
members resist both directions (e.g. columns of a space frame) would yield
earlier under a diagonal drift.  The torsional spring stays elastic: with
frames on the perimeter a storey's twist is carried by the same x and y
frames, and in a feasibility model the twist is small beside the
translation; torsional yielding is not modelled.

P-delta (``p_delta``): geometric stiffness of each storey at the centre of
mass, ``-P/h`` in x and y and ``-P r^2/h`` in rotation, P the weight of the
floors above and ``r^2 = (L_x^2 + L_y^2)/12`` the polar radius of gyration
of gravity load spread uniformly over the plan (derived: a column carrying
``p_j`` at radius ``r_j`` adds ``p_j r_j^2 / h`` of negative torsional
stiffness).  The damping matrix comes from the elastic stiffness without it.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation import validate
from isolation.dynamics.floor_stack import FloorStack

__all__ = ["PlanShearBuilding"]


def _pair(field_name: str, value, unit: str, positive: bool = False) -> tuple:
    values = validate.finite_array(field_name, value, unit)
    if values.shape != (2,) or (positive and np.any(values <= 0.0)):
        raise ValueError(
            f"{field_name} = {value!r} is not allowed: must be two numbers (x, y){' > 0' if positive else ''} [{unit}]"
        )
    return (float(values[0]), float(values[1]))


def _storey_transform(offset) -> np.ndarray:
    ex, ey = offset
    return np.array([[1.0, 0.0, -ey], [0.0, 1.0, ex], [0.0, 0.0, 1.0]])


@dataclass(frozen=True)
class PlanShearBuilding(FloorStack):
    """Plan shear building: rigid floor diaphragms (x, y, theta) joined by storeys.

    Parameters
    ----------
    masses : sequence of float
        Floor masses from the first floor up, each > 0. [t]
    stiffnesses_x, stiffnesses_y : sequence of float
        Storey shear stiffnesses in x and y from the first storey up, each > 0. [kN/m]
    heights : sequence of float
        Storey heights, each > 0. [m]
    plan : tuple of float
        Plan dimensions (L_x, L_y), each > 0. [m]
    rigidity_offset : tuple of float
        Centre of rigidity of every storey relative to the centre of mass (e_x, e_y). [m]
    damping : float
        Damping ratio of every fixed-base mode, in [0, 1). [-]
    torsional_stiffnesses : sequence of float, optional
        Storey torsional stiffness about the centre of rigidity, each > 0;
        default: perimeter frames (module notes). [kN m/rad]
    yield_shears_x, yield_shears_y : sequence of float or None, optional
        Storey yield (strength) shear in x and in y from the first storey
        up, each > 0; None (default) keeps that direction elastic. [kN]
    hardening : float, optional
        Post-yield over elastic storey stiffness, alpha, in [0, 1), both
        directions. Default 0. [-]
    p_delta : bool, optional
        Add the storeys' geometric stiffness (module notes). Default False. [-]
    """

    masses: tuple
    stiffnesses_x: tuple
    stiffnesses_y: tuple
    heights: tuple
    plan: tuple = (20.0, 20.0)
    rigidity_offset: tuple = (0.0, 0.0)
    damping: float = 0.05
    torsional_stiffnesses: tuple | None = None
    yield_shears_x: tuple | None = None
    yield_shears_y: tuple | None = None
    hardening: float = 0.0
    p_delta: bool = False

    def __post_init__(self) -> None:
        masses = validate.positive_array("masses", self.masses, "t")
        n = masses.size
        arrays = {"masses": masses}
        for name, unit in (("stiffnesses_x", "kN/m"), ("stiffnesses_y", "kN/m"), ("heights", "m")):
            values = validate.positive_array(name, getattr(self, name), unit)
            if values.shape != (n,):
                raise ValueError(f"{name} has {values.size} entries and masses {n}: must be one per storey [{unit}]")
            arrays[name] = values
        plan = _pair("plan", self.plan, "m", positive=True)
        offset = _pair("rigidity_offset", self.rigidity_offset, "m")
        damping = validate.in_range("damping", self.damping, 0.0, 1.0, "-", high_inclusive=False)
        if self.torsional_stiffnesses is None:
            torsion = (arrays["stiffnesses_x"] * plan[1] ** 2 + arrays["stiffnesses_y"] * plan[0] ** 2) / 4.0
        else:
            torsion = validate.positive_array("torsional_stiffnesses", self.torsional_stiffnesses, "kN m/rad")
            if torsion.shape != (n,):
                raise ValueError(f"torsional_stiffnesses has {torsion.size} entries: must be one per storey [kN m/rad]")
        for name, values in arrays.items():
            object.__setattr__(self, name, tuple(values.tolist()))
        object.__setattr__(self, "plan", plan)
        object.__setattr__(self, "rigidity_offset", offset)
        object.__setattr__(self, "damping", damping)
        object.__setattr__(self, "torsional_stiffnesses", tuple(torsion.tolist()))
        for name in ("yield_shears_x", "yield_shears_y"):
            if getattr(self, name) is not None:
                shears = validate.positive_array(name, getattr(self, name), "kN")
                if shears.shape != (n,):
                    raise ValueError(f"{name} has {shears.size} entries and masses {n}: must be one per storey [kN]")
                object.__setattr__(self, name, tuple(shears.tolist()))
        object.__setattr__(self, "hardening",
                           validate.in_range("hardening", self.hardening, 0.0, 1.0, "-", high_inclusive=False))
        if not isinstance(self.p_delta, (bool, np.bool_)):
            raise ValueError(f"p_delta = {self.p_delta!r} is not allowed: must be True or False")
        object.__setattr__(self, "p_delta", bool(self.p_delta))

    @property
    def yielding(self) -> bool:
        """True when a storey strength is given in x or in y. [-]"""
        return self.yield_shears_x is not None or self.yield_shears_y is not None

    @property
    def yield_strengths(self) -> np.ndarray:
        """Storey yield shears (storeys, 2) in x and y; inf where a direction is elastic. [kN]"""
        out = np.full((self.storeys, 2), np.inf)
        for j, values in enumerate((self.yield_shears_x, self.yield_shears_y)):
            if values is not None:
                out[:, j] = values
        return out

    @property
    def yield_drifts(self) -> np.ndarray:
        """Storey yield drift V_y/k (storeys, 2) at the centre of rigidity; inf where elastic. [m]"""
        return self.yield_strengths / np.column_stack([self.stiffnesses_x, self.stiffnesses_y])

    def geometric_stiffness_matrix(self) -> np.ndarray:
        """Fixed-base P-delta stiffness (3 DOF per floor; zeros without ``p_delta``; module notes). [kN/m, kN m]"""
        n = self.storeys
        k = np.zeros((3 * n, 3 * n))
        if not self.p_delta:
            return k
        lx, ly = self.plan
        radius2 = (lx**2 + ly**2) / 12.0
        return _chain_blocks([-load / height * np.diag([1.0, 1.0, radius2])
                              for load, height in zip(self.gravity_loads, self.heights, strict=True)])

    def with_strengths(self, yield_shears_x, yield_shears_y=None, *, hardening=None, p_delta=None):
        """The same building with storey strengths (and optionally hardening and P-delta) replaced.

        Parameters
        ----------
        yield_shears_x : sequence of float or None
            Storey yield shears in x, None for elastic. [kN]
        yield_shears_y : sequence of float or None, optional
            Storey yield shears in y; default those in x. [kN]
        hardening : float, optional
            Post-yield stiffness ratio; default unchanged. [-]
        p_delta : bool, optional
            P-delta switch; default unchanged. [-]
        """
        from dataclasses import replace

        y = yield_shears_x if yield_shears_y is None else yield_shears_y
        changes: dict[str, Any] = {
            "yield_shears_x": None if yield_shears_x is None else tuple(np.atleast_1d(yield_shears_x).tolist()),
            "yield_shears_y": None if y is None else tuple(np.atleast_1d(y).tolist())}
        if hardening is not None:
            changes["hardening"] = hardening
        if p_delta is not None:
            changes["p_delta"] = p_delta
        return replace(self, **changes)

    def rotational_inertia(self, mass: float) -> float:
        """Mass moment of inertia of a uniform rectangular diaphragm of ``mass`` [t]. [t m^2]"""
        lx, ly = self.plan
        return mass * (lx**2 + ly**2) / 12.0

    def mass_matrix(self) -> np.ndarray:
        """Fixed-base mass matrix, 3 DOF per floor (x, y, theta). [t, t m^2]"""
        diagonal = []
        for m in self.masses:
            diagonal += [m, m, self.rotational_inertia(m)]
        return np.diag(diagonal)

    def storey_stiffness(self, i: int) -> np.ndarray:
        """3 x 3 stiffness of storey ``i`` on the relative motion of its two levels. [kN/m, kN, kN m]"""
        t = _storey_transform(self.rigidity_offset)
        assert self.torsional_stiffnesses is not None  # a tuple after __post_init__
        return t.T @ np.diag([self.stiffnesses_x[i], self.stiffnesses_y[i], self.torsional_stiffnesses[i]]) @ t

    def stiffness_matrix(self) -> np.ndarray:
        """Fixed-base stiffness matrix (3 DOF per floor). [kN/m, kN, kN m]"""
        return _chain_blocks([self.storey_stiffness(i) for i in range(self.storeys)])

    def modes(self) -> tuple[np.ndarray, np.ndarray]:
        """Fixed-base circular frequencies [rad/s] (ascending) and mass-normalised mode shapes (columns)."""
        from scipy.linalg import eigh

        w2, phi = eigh(self.stiffness_matrix(), self.mass_matrix())
        return np.sqrt(np.maximum(w2, 0.0)), phi

    def periods(self) -> np.ndarray:
        """Fixed-base periods, longest first. [s]"""
        w, _ = self.modes()
        return (2.0 * np.pi / w)

    def damping_matrix(self) -> np.ndarray:
        """Classical damping with ``damping`` in every fixed-base mode. [kN s/m, ...]"""
        w, phi = self.modes()
        mp = self.mass_matrix() @ phi
        return (mp * (2.0 * self.damping * w)) @ mp.T

    def shifted(self, mass_offset) -> "PlanShearBuilding":
        """The same building with its centre of mass moved by ``mass_offset`` (m_x, m_y) [m]."""
        from dataclasses import replace

        mx, my = _pair("mass_offset", mass_offset, "m")
        ex, ey = self.rigidity_offset
        return replace(self, rigidity_offset=(ex - mx, ey - my))

    def to_dict(self) -> dict:
        assert self.torsional_stiffnesses is not None  # a tuple after __post_init__
        return {
            "kind": "plan_shear_building",
            "masses": list(self.masses),
            "stiffnesses_x": list(self.stiffnesses_x),
            "stiffnesses_y": list(self.stiffnesses_y),
            "torsional_stiffnesses": list(self.torsional_stiffnesses),
            "heights": list(self.heights),
            "plan": list(self.plan),
            "rigidity_offset": list(self.rigidity_offset),
            "damping": self.damping,
            "yield_shears_x": None if self.yield_shears_x is None else list(self.yield_shears_x),
            "yield_shears_y": None if self.yield_shears_y is None else list(self.yield_shears_y),
            "hardening": self.hardening,
            "p_delta": self.p_delta,
            "periods": self.periods().tolist(),
        }


def _chain_blocks(blocks: list) -> np.ndarray:
    """Stiffness of a chain of storeys from their 3 x 3 blocks on the relative motion of the two levels
    (storey i joins level i - 1, the ground for i = 0, to level i). [units of the blocks]"""
    n = len(blocks)
    k = np.zeros((3 * n, 3 * n))
    for i, ks in enumerate(blocks):
        top = slice(3 * i, 3 * i + 3)
        k[top, top] += ks
        if i > 0:
            below = slice(3 * i - 3, 3 * i)
            k[below, below] += ks
            k[below, top] -= ks
            k[top, below] -= ks
    return k
