"""Yielding storeys of the plan model: drift map, bilinear update and hysteretic energy.

A storey of :class:`isolation.dynamics.plan_structure.PlanShearBuilding` carries an
x and a y spring at its centre of rigidity ``(e_x, e_y)``.  Its drift there,
``d_x = du_x - e_y dtheta`` and ``d_y = du_y + e_x dtheta`` (``du`` the
motion of the level above relative to the level below), is linear in the
degrees of freedom: ``d = u @ D`` with the drift map ``D`` (dofs, 2 storeys),
columns ordered x0, y0, x1, y1, ...  The force of a spring is
``s = alpha k d + q``, ``q`` the force of the elastic-perfectly-plastic
element (stiffness ``k_p = (1 - alpha) k``, strength ``f_p = (1 - alpha)
V_y``); the time loops carry the departure from the elastic force,
``p = s - k d = q - k_p d``, as forces ``D p`` on the degrees of freedom
(the transpose of the drift map: the work of ``p`` is ``p . dd``).  The two
directions are uncoupled and the torsional spring is elastic (assumptions
stated in :mod:`isolation.dynamics.plan_structure`).

Return map of the element (exact for a piecewise-linear law):
``q = clip(q_n + k_p (d - d_n), -f_p, f_p)``.  Energy it dissipates up to
a state: the work of the spring ``W = int s dd`` less the energy it stores,
``alpha k d^2 / 2 + q^2 / (2 k_p)`` (Chopra, Dynamics of Structures, 4th ed.,
section 7.9, energy dissipated by yielding; from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = ["StoreySprings", "storey_springs", "bilinear_update", "storey_loop"]


@dataclass(frozen=True)
class StoreySprings:
    """Arrays of a plan building's storey springs for the time loops.

    Attributes
    ----------
    drift_map : ndarray (dofs, 2 storeys)
        Drift at the centre of rigidity = u @ drift_map, columns x0, y0, x1, ... [-, m]
    stiffness : ndarray (2 storeys,)
        Elastic spring stiffness k. [kN/m]
    plastic_stiffness : ndarray (2 storeys,)
        (1 - alpha) k of the elastic-plastic element; 0 where the direction is elastic. [kN/m]
    plastic_strength : ndarray (2 storeys,)
        (1 - alpha) V_y; inf where the direction is elastic. [kN]
    hardening : float
        alpha. [-]
    yielding : bool
        Whether any spring can yield. [-]
    """

    drift_map: np.ndarray
    stiffness: np.ndarray
    plastic_stiffness: np.ndarray
    plastic_strength: np.ndarray
    hardening: float
    yielding: bool

    @property
    def tolerance(self) -> float:
        """Fixed-point tolerance on the departure forces, 1e-10 of the largest strength (as the planar engine). [kN]"""
        finite = self.plastic_strength[np.isfinite(self.plastic_strength)]
        return 1e-10 * float(finite.max()) / (1.0 - self.hardening) if finite.size else 0.0

    def stored_energy(self, drift: np.ndarray, q: np.ndarray) -> np.ndarray:
        """Energy stored in the springs at drift ``d`` and element force ``q`` (..., 2 storeys). [kN m]"""
        kp = np.where(self.plastic_stiffness > 0.0, self.plastic_stiffness, 1.0)
        elastic = self.stiffness - self.plastic_stiffness  # alpha k, or k where the direction is elastic
        return 0.5 * elastic * drift**2 + np.where(self.plastic_stiffness > 0.0, 0.5 * q**2 / kp, 0.0)


def storey_springs(structure, levels_below: int) -> StoreySprings:
    """Storey springs of a plan superstructure whose first floor is degree-of-freedom block ``levels_below``.

    Parameters
    ----------
    structure : PlanShearBuilding
        The superstructure. [-]
    levels_below : int
        1 on an isolation-plane diaphragm (block 0 is the base), 0 on a fixed base. [-]
    """
    n = structure.storeys
    nd = 3 * (n + levels_below)
    ex, ey = structure.rigidity_offset
    rows = np.array([[1.0, 0.0, -ey], [0.0, 1.0, ex]])  # drift at the centre of rigidity from (dx, dy, dtheta)
    drift_map = np.zeros((nd, 2 * n))
    for i in range(n):
        top = 3 * (i + levels_below)
        drift_map[top:top + 3, 2 * i:2 * i + 2] += rows.T
        if i + levels_below > 0:
            drift_map[top - 3:top, 2 * i:2 * i + 2] -= rows.T
    k = np.column_stack([structure.stiffnesses_x, structure.stiffnesses_y]).ravel()
    strength = structure.yield_strengths.ravel()
    alpha = float(structure.hardening)
    finite = np.isfinite(strength)
    kp = np.where(finite, (1.0 - alpha) * k, 0.0)
    fp = np.where(finite, (1.0 - alpha) * strength, np.inf)
    return StoreySprings(drift_map, k, kp, fp, alpha, bool(finite.any()))


def bilinear_update(q_committed, drift_committed, drift, plastic_stiffness, plastic_strength):
    """Trial element force and departure of bilinear springs with kinematic hardening.

    Parameters
    ----------
    q_committed, drift_committed : ndarray (..., springs)
        Element force [kN] and drift [m] at the last committed state.
    drift : ndarray (..., springs)
        Trial drift. [m]
    plastic_stiffness, plastic_strength : ndarray (springs,)
        (1 - alpha) k [kN/m] and (1 - alpha) V_y [kN].

    Returns
    -------
    (q, p) : element force and departure from the elastic force ``q - k_p d``. [kN]
    """
    q = np.clip(q_committed + plastic_stiffness * (drift - drift_committed), -plastic_strength, plastic_strength)
    return q, q - plastic_stiffness * drift


def storey_loop(structure, drift, storey: int = 0, direction: int = 0) -> np.ndarray:
    """Force of one storey spring under an imposed drift history at the centre of rigidity (loops and checks).

    Parameters
    ----------
    structure : PlanShearBuilding
        The superstructure. [-]
    drift : array (steps,)
        Imposed drift from the unloaded state. [m]
    storey : int
        Storey index from 0 at the bottom. [-]
    direction : int
        0 for x, 1 for y. [-]

    Returns
    -------
    ndarray (steps,)
        Spring force ``alpha k d + q``. [kN]
    """
    springs = storey_springs(structure, 0)
    j = 2 * storey + direction
    k, kp, fp = springs.stiffness[j], springs.plastic_stiffness[j], springs.plastic_strength[j]
    drift = np.asarray(drift, dtype=float)
    out = np.empty_like(drift)
    q, d_prev = 0.0, 0.0
    for n, d in enumerate(drift):
        q, p = bilinear_update(q, d_prev, d, kp, fp)
        d_prev = d
        out[n] = k * d + p
    return out
