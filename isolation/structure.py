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

import math
from dataclasses import dataclass, field

import numpy as np
import scipy.linalg

from isolation import GRAVITY, validate
from isolation.isolators import describe, isolator_law

__all__ = ["ShearBuilding", "IsolatedBuilding", "ModalProperties", "PlanShearBuilding", "PlanIsolatedBuilding"]


@dataclass(frozen=True)
class ModalProperties:
    """Undamped modes of a linear model.

    Attributes
    ----------
    periods : ndarray (modes,)
        Natural periods, longest first. [s]
    mode_shapes : ndarray (dofs, modes)
        Mode shapes, each scaled so that its first-listed reference
        component (roof for a fixed-base building, base for an isolated one)
        is 1. [-]
    participation_factors : ndarray (modes,)
        Gamma_j = phi_j' M 1 / phi_j' M phi_j, for the scaling above. [-]
    effective_masses : ndarray (modes,)
        (phi_j' M 1)^2 / phi_j' M phi_j; they sum to the total mass. [t]
    """

    periods: np.ndarray
    mode_shapes: np.ndarray
    participation_factors: np.ndarray
    effective_masses: np.ndarray

    @property
    def frequencies(self) -> np.ndarray:
        """Circular frequencies 2 pi/T. [rad/s]"""
        return 2.0 * math.pi / self.periods

    def to_dict(self) -> dict:
        return {
            "periods": self.periods.tolist(),
            "mode_shapes": self.mode_shapes.tolist(),
            "participation_factors": self.participation_factors.tolist(),
            "effective_masses": self.effective_masses.tolist(),
        }


def _modes(mass: np.ndarray, stiffness: np.ndarray, reference: int) -> ModalProperties:
    """Generalised eigenproblem K phi = w^2 M phi for a diagonal mass."""
    if mass.size == 0:
        empty = np.zeros(0)
        return ModalProperties(empty, np.zeros((0, 0)), empty, empty)
    w2, phi = scipy.linalg.eigh(stiffness, np.diag(mass))
    w2 = np.maximum(w2, 0.0)
    phi = phi / phi[reference]
    generalised = np.einsum("im,i,im->m", phi, mass, phi)
    excitation = phi.T @ mass
    with np.errstate(divide="ignore"):
        periods = np.where(w2 > 0.0, 2.0 * math.pi / np.sqrt(w2), np.inf)
    return ModalProperties(periods, phi, excitation / generalised, excitation**2 / generalised)


def _chain_stiffness(stiffnesses: np.ndarray) -> np.ndarray:
    """Stiffness matrix of a fixed-base shear chain (floors 1..N)."""
    n = stiffnesses.size
    k = np.zeros((n, n))
    for i, ki in enumerate(stiffnesses):
        k[i, i] += ki
        if i > 0:
            k[i - 1, i - 1] += ki
            k[i - 1, i] -= ki
            k[i, i - 1] -= ki
    return k


@dataclass(frozen=True)
class ShearBuilding:
    """Planar shear building with lumped floor masses.

    Parameters
    ----------
    masses : sequence of float
        Floor masses from the first floor up, each > 0. [t]
    stiffnesses : sequence of float
        Storey (shear) stiffnesses from the first storey up, each > 0;
        ignored (may be None) when ``rigid``. [kN/m]
    heights : sequence of float
        Storey heights from the first storey up, each > 0. [m]
    damping : float, optional
        Damping ratio of the fixed-base modes, in [0, 1). Default 0.05. [-]
    damping_model : {"modal", "rayleigh"}, optional
        "modal": every fixed-base mode gets ``damping`` (classical damping);
        "rayleigh": a0 M + a1 K matched at the first and the last mode. [-]
    rigid : bool, optional
        Floors move with the base (no storey deformation); with one storey
        this is the single-degree-of-freedom isolated mass. [-]
    """

    masses: tuple
    stiffnesses: tuple | None
    heights: tuple
    damping: float = 0.05
    damping_model: str = "modal"
    rigid: bool = False

    def __post_init__(self) -> None:
        masses = validate.positive_array("masses", self.masses, "t")
        heights = validate.positive_array("heights", self.heights, "m")
        if masses.ndim != 1 or heights.shape != masses.shape:
            raise ValueError(
                f"heights has {heights.size} entries and masses {masses.size}: "
                "must be two 1-D sequences of equal length (one per storey)"
            )
        if self.rigid:
            stiffnesses = np.zeros(0)
        else:
            if self.stiffnesses is None:
                raise ValueError("stiffnesses = None is not allowed: must be given unless rigid=True [kN/m]")
            stiffnesses = validate.positive_array("stiffnesses", self.stiffnesses, "kN/m")
            if stiffnesses.shape != masses.shape:
                raise ValueError(
                    f"stiffnesses has {stiffnesses.size} entries and masses {masses.size}: "
                    "must be equal (one per storey)"
                )
        damping = validate.in_range("damping", self.damping, 0.0, 1.0, "-", high_inclusive=False)
        validate.one_of("damping_model", self.damping_model, ("modal", "rayleigh"))
        object.__setattr__(self, "masses", tuple(masses.tolist()))
        object.__setattr__(self, "stiffnesses", tuple(stiffnesses.tolist()))
        object.__setattr__(self, "heights", tuple(heights.tolist()))
        object.__setattr__(self, "damping", damping)
        object.__setattr__(self, "rigid", bool(self.rigid))

    # --- constructors --------------------------------------------------------
    @classmethod
    def from_period(cls, period, masses, heights, profile="uniform", damping=0.05,
                    damping_model="modal") -> "ShearBuilding":
        """Shear building whose storey stiffnesses follow a profile scaled to a fixed-base period.

        Parameters
        ----------
        period : float
            Target first-mode fixed-base period, > 0. [s]
        masses : sequence of float
            Floor masses from the first floor up. [t]
        heights : sequence of float
            Storey heights from the first storey up. [m]
        profile : "uniform", "linear" or sequence of float, optional
            Relative storey stiffnesses: all equal, falling linearly from
            N at the first storey to 1 at the top, or given values (> 0). [-]
        damping : float, optional
            Modal damping ratio. [-]
        damping_model : {"modal", "rayleigh"}, optional
            See the class. [-]
        """
        period = validate.positive("period", period, "s")
        masses = validate.positive_array("masses", masses, "t")
        n = masses.size
        if isinstance(profile, str):
            validate.one_of("profile", profile, ("uniform", "linear"))
            shape = np.ones(n) if profile == "uniform" else np.arange(n, 0, -1, dtype=float)
        else:
            shape = validate.positive_array("profile", profile, "-")
            if shape.shape != masses.shape:
                raise ValueError(f"profile has {shape.size} entries: must have one per storey ({n})")
        trial = cls(masses, shape, heights, damping, damping_model)
        scale = (trial.modal().periods[0] / period) ** 2
        return cls(masses, shape * scale, heights, damping, damping_model)

    @classmethod
    def rigid_block(cls, mass, height=3.0) -> "ShearBuilding":
        """One rigid storey: with an isolator below, a single-degree-of-freedom isolated mass.

        Parameters
        ----------
        mass : float
            Mass of the block, > 0. [t]
        height : float, optional
            Storey height (only for drift ratios). [m]
        """
        return cls((mass,), None, (height,), rigid=True)

    # --- properties ----------------------------------------------------------
    @property
    def storeys(self) -> int:
        """Number of storeys. [-]"""
        return len(self.masses)

    @property
    def total_mass(self) -> float:
        """Sum of floor masses. [t]"""
        return float(sum(self.masses))

    @property
    def floor_elevations(self) -> np.ndarray:
        """Elevation of each floor above the base. [m]"""
        return np.cumsum(self.heights)

    def mass_matrix(self) -> np.ndarray:
        """Diagonal mass matrix of the fixed-base floors. [t]"""
        return np.diag(np.asarray(self.masses))

    def stiffness_matrix(self) -> np.ndarray:
        """Fixed-base stiffness matrix (empty for a rigid building). [kN/m]"""
        return _chain_stiffness(np.asarray(self.stiffnesses))

    def modal(self) -> ModalProperties:
        """Fixed-base undamped modes, roof component of each shape = 1 (none when rigid)."""
        if self.rigid:
            return _modes(np.zeros(0), np.zeros((0, 0)), -1)
        return _modes(np.asarray(self.masses), self.stiffness_matrix(), -1)

    def modal_damping_ratios(self) -> np.ndarray:
        """Damping ratio of each fixed-base mode under the chosen damping model. [-]"""
        modes = self.modal()
        w = modes.frequencies
        if self.damping_model == "modal" or w.size == 0:
            return np.full(w.size, self.damping)
        a0, a1 = self.rayleigh_coefficients()
        return a0 / (2.0 * w) + a1 * w / 2.0

    def rayleigh_coefficients(self) -> tuple[float, float]:
        """(a0 [1/s], a1 [s]) giving ``damping`` at the first and last fixed-base modes."""
        w = self.modal().frequencies
        if w.size == 0:
            return 0.0, 0.0
        if w.size == 1:
            return 0.0, 2.0 * self.damping / w[0]
        wi, wj = w[0], w[-1]
        a0 = 2.0 * self.damping * wi * wj / (wi + wj)
        a1 = 2.0 * self.damping / (wi + wj)
        return float(a0), float(a1)

    def damping_matrix(self) -> np.ndarray:
        """Fixed-base damping matrix from the chosen damping model. [kN s/m]"""
        if self.rigid:
            return np.zeros((0, 0))
        m = self.mass_matrix()
        if self.damping_model == "rayleigh":
            a0, a1 = self.rayleigh_coefficients()
            return a0 * m + a1 * self.stiffness_matrix()
        modes = self.modal()
        phi = modes.mode_shapes
        generalised = np.einsum("im,ij,jm->m", phi, m, phi)
        coefficient = 2.0 * self.damping * modes.frequencies / generalised
        mp = m @ phi
        return (mp * coefficient) @ mp.T

    def to_dict(self) -> dict:
        out = {
            "kind": "shear_building",
            "masses": list(self.masses),
            "stiffnesses": list(self.stiffnesses),
            "heights": list(self.heights),
            "damping": self.damping,
            "damping_model": self.damping_model,
            "rigid": self.rigid,
        }
        if not self.rigid:
            out["periods"] = self.modal().periods.tolist()
        return out


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
        """The isolation-plane law the engine integrates (see :mod:`isolation.isolators`)."""
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
from isolation.plan_structure import PlanIsolatedBuilding, PlanShearBuilding  # noqa: E402
