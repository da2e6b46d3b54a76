"""Planar lumped-mass shear buildings, fixed-base and on an isolation layer.

Coordinates are displacements relative to the ground. A fixed-base building
of N storeys has N degrees of freedom (floors 1..N); an isolated building has
N + 1 (the base mass above the isolators first, then floors 1..N), or one
when the superstructure is rigid.

Damping of the superstructure is built from its fixed-base modes (classical
modal damping or Rayleigh damping) and acts on the storeys' motion relative
to the base only, so the isolation mode receives no spurious mass-proportional
damping (Ryan & Polanco 2008). The isolation layer's damping comes from its
hysteresis and from an optional linear viscous damper.

References
----------
Chopra, A. K. Dynamics of Structures (modal analysis, classical damping).
Kelly, J. M. (1997). Earthquake-Resistant Design with Rubber. Springer
(two-degree-of-freedom isolated building).
Ryan, K. L. & Polanco, J. (2008). Problems with Rayleigh damping in base-isolated
buildings. J. Struct. Eng. 134(11).
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from isolation import GRAVITY, validate
from isolation.dynamics.isolators import describe, isolator_law
from isolation.dynamics.modes import ModalProperties, _chain_stiffness, _modes  # noqa: F401 - re-exported
from isolation.dynamics.shear_building import HYSTERESES, ShearBuilding

__all__ = ["ShearBuilding", "IsolatedBuilding", "ModalProperties", "HYSTERESES", "PlanShearBuilding",
           "PlanIsolatedBuilding"]

@dataclass(frozen=True)
class IsolatedBuilding:
    """A shear building on a base mass and an isolation layer.

    Parameters
    ----------
    superstructure : ShearBuilding
        The building above the isolation layer. [-]
    base_mass : float
        Mass of the base slab above the isolators, > 0. [t]
    isolator : Bilinear, MultiLinear, BoucWen, FrictionPendulum, DoubleConcave or LeadRubber
        The whole isolation plane. A FrictionPendulum carries the whole
        weight (total mass x g) as its axial load N (no tension, no vertical
        excitation). [-]
    supplemental_damping : float, optional
        Linear viscous damper across the isolation layer, >= 0. [kN s/m]
    """

    superstructure: ShearBuilding
    base_mass: float
    isolator: object
    supplemental_damping: float = field(default=0.0, kw_only=True)

    def __post_init__(self) -> None:
        if not isinstance(self.superstructure, ShearBuilding):
            raise ValueError(
                f"superstructure = {self.superstructure!r} is not allowed: must be a ShearBuilding"
            )
        object.__setattr__(self, "base_mass", validate.positive("base_mass", self.base_mass, "t"))
        object.__setattr__(self, "supplemental_damping",
                           validate.non_negative("supplemental_damping", self.supplemental_damping, "kN s/m"))
        isolator_law(self.isolator, self.weight)  # refuses unknown isolators now, not mid-run

    @property
    def total_mass(self) -> float:
        """Base mass plus superstructure mass. [t]"""
        return self.base_mass + self.superstructure.total_mass

    @property
    def weight(self) -> float:
        """Weight on the isolation plane, total mass x g. [kN]"""
        return self.total_mass * GRAVITY

    def law(self):
        """The isolation-plane law the engine integrates (see :mod:`isolation.dynamics.isolators`)."""
        return isolator_law(self.isolator, self.weight)

    def matrices(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """Mass [t], stiffness [kN/m] and damping [kN s/m] of the linear part (isolator excluded).

        Degrees of freedom: base, then floors 1..N, relative to the ground
        (only the base when the superstructure is rigid).
        """
        return linear_isolated_matrices(self.superstructure, self.base_mass)

    def modal(self, isolator_stiffness=None) -> ModalProperties:
        """Undamped modes with the isolation layer as a linear spring.

        Parameters
        ----------
        isolator_stiffness : float, optional
            Linear stiffness of the isolation layer, >= 0; default the
            isolator's final (post-yield) stiffness. [kN/m]

        Returns
        -------
        ModalProperties
            Shapes scaled to a base displacement of 1 (Kelly's convention).
        """
        if isolator_stiffness is None:
            isolator_stiffness = self.law().final_stiffness
        kb = validate.non_negative("isolator_stiffness", isolator_stiffness, "kN/m")
        m, k, _ = self.matrices()
        k = k.copy()
        k[0, 0] += kb
        return _modes(np.diag(m), k, 0)

    def to_dict(self) -> dict:
        return {
            "kind": "isolated_building",
            "superstructure": self.superstructure.to_dict(),
            "base_mass": self.base_mass,
            "isolator": describe(self.isolator),
            "supplemental_damping": self.supplemental_damping,
        }


def linear_isolated_matrices(superstructure: ShearBuilding, base_mass: float):
    """Mass, stiffness and damping matrices of base + superstructure (isolator excluded).

    The superstructure's fixed-base K and C act on storey motion relative to
    the base: with T mapping [u_b, u_1..u_N] to [u_1 - u_b, ..., u_N - u_b],
    K = T' K_s T and C = T' C_s T.
    """
    if superstructure.rigid:
        total = base_mass + superstructure.total_mass
        return np.array([[total]]), np.zeros((1, 1)), np.zeros((1, 1))
    n = superstructure.storeys
    t = np.hstack([-np.ones((n, 1)), np.eye(n)])
    m = np.diag(np.concatenate([[base_mass], superstructure.masses]))
    k = t.T @ superstructure.stiffness_matrix() @ t
    c = t.T @ superstructure.damping_matrix() @ t
    return m, k, c


# Plan (x, y, rotation) buildings live in their own module; re-exported here with the planar ones.
from isolation.dynamics.plan_structure import PlanIsolatedBuilding, PlanShearBuilding  # noqa: E402
