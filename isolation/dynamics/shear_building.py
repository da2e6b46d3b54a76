"""Planar lumped-mass shear buildings on a fixed base: masses, storey springs (elastic or yielding),
P-delta, modes and damping (re-exported from :mod:`isolation.dynamics.structure`).

Coordinates are displacements relative to the ground: floors 1..N. Damping is
built from the fixed-base modes (classical modal damping or Rayleigh damping);
on an isolation layer (:class:`isolation.dynamics.structure.IsolatedBuilding`)
it acts on the storeys' motion relative to the base only (Ryan & Polanco 2008).

References
----------
Chopra, A. K. Dynamics of Structures (modal analysis, classical damping, P-delta effects).
Clough & Johnston (1966), see :mod:`isolation.dynamics.kernel_laws`.
Ryan, K. L. & Polanco, J. (2008). J. Struct. Eng. 134(11).
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import Any

import numpy as np

from isolation import validate
from isolation.dynamics.floor_stack import FloorStack
from isolation.dynamics.modes import ModalProperties, _chain_stiffness, _modes

__all__ = ["ShearBuilding", "HYSTERESES"]

HYSTERESES = ("bilinear", "clough")
"""Storey laws of a yielding ShearBuilding (see its ``hysteresis`` parameter)."""


@dataclass(frozen=True)
class ShearBuilding(FloorStack):
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
        Damping ratio of the fixed-base modes, in [0, 1). Default 0.05. The
        damping matrix is built once from the elastic stiffness (without
        P-delta) and stays constant when storeys yield. [-]
    yield_shears : sequence of float or None, optional
        Yield (strength) shear of each storey from the first up, each > 0;
        None (default) keeps every storey elastic. [kN]
    hardening : float, optional
        Post-yield over elastic storey stiffness, alpha, in [0, 1); applies
        to the backbone of either hysteresis. Default 0. [-]
    p_delta : bool, optional
        Add each storey's geometric stiffness k_g = -P/h, P the weight of
        the floors above the storey (floors i..N), h its height (Chopra,
        Dynamics of Structures, P-delta effects). Default False. [-]
    damping_model : {"modal", "rayleigh"}, optional
        "modal": every fixed-base mode gets ``damping`` (classical damping);
        "rayleigh": a0 M + a1 K matched at the first and the last mode. [-]
    rigid : bool, optional
        Floors move with the base (no storey deformation); with one storey
        this is the single-degree-of-freedom isolated mass. [-]
    hysteresis : {"bilinear", "clough"}, optional
        Storey law when ``yield_shears`` is given. "bilinear": kinematic
        hardening (a linear spring alpha k in parallel with an
        elastic-perfectly-plastic element). "clough": stiffness-degrading
        peak-oriented law for reinforced-concrete frames (Clough & Johnston
        1966): elastic unloading at k, reloading aimed at the largest earlier
        excursion on the backbone in that direction (at first the yield
        point). Default "bilinear". [-]
    """

    masses: tuple
    stiffnesses: tuple | None
    heights: tuple
    damping: float = 0.05
    yield_shears: tuple | None = None
    hardening: float = 0.0
    p_delta: bool = False
    damping_model: str = "modal"
    rigid: bool = False
    hysteresis: str = "bilinear"

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
        if self.yield_shears is not None:
            if self.rigid:
                raise ValueError("yield_shears is not allowed with rigid=True: a rigid building has no storey "
                                 "deformation (give stiffnesses instead) [kN]")
            shears = validate.positive_array("yield_shears", self.yield_shears, "kN")
            if shears.shape != masses.shape:
                raise ValueError(f"yield_shears has {shears.size} entries and masses {masses.size}: "
                                 "must be equal (one per storey) [kN]")
            object.__setattr__(self, "yield_shears", tuple(shears.tolist()))
        hardening = validate.in_range("hardening", self.hardening, 0.0, 1.0, "-", high_inclusive=False)
        object.__setattr__(self, "hardening", hardening)
        if not isinstance(self.p_delta, (bool, np.bool_)):
            raise ValueError(f"p_delta = {self.p_delta!r} is not allowed: must be True or False")
        object.__setattr__(self, "p_delta", bool(self.p_delta))
        validate.one_of("hysteresis", self.hysteresis, HYSTERESES)

    # --- constructors --------------------------------------------------------
    @classmethod
    def from_period(cls, period, masses, heights, profile="uniform", damping=0.05,
                    damping_model="modal", *, yield_shears=None, hardening=0.0, p_delta=False,
                    hysteresis="bilinear") -> "ShearBuilding":
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
        yield_shears, hardening, p_delta, hysteresis : optional
            Storey strengths [kN], post-yield stiffness ratio [-], P-delta
            switch [-] and storey law [-]; see the class. The period is that
            of the elastic model without P-delta.
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
        trial = cls(masses, tuple(shape), heights, damping, damping_model=damping_model)
        scale = (trial.modal().periods[0] / period) ** 2
        return cls(masses, shape * scale, heights, damping, yield_shears, hardening, p_delta,
                   damping_model=damping_model, hysteresis=hysteresis)

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
    def yielding(self) -> bool:
        """True when the storeys carry a hysteretic law (``yield_shears`` given)."""
        return self.yield_shears is not None

    @property
    def yield_drifts(self) -> np.ndarray:
        """Storey drift at first yield, V_y/k per storey (inf when elastic). [m]"""
        if not self.yielding:
            return np.full(self.storeys, np.inf)
        return np.asarray(self.yield_shears) / np.asarray(self.stiffnesses)

    @property
    def geometric_stiffnesses(self) -> np.ndarray:
        """P-delta storey stiffness k_g = -P_i/h_i when ``p_delta``, else zeros. [kN/m]"""
        if not self.p_delta or self.rigid:
            return np.zeros(self.storeys)
        return -self.gravity_loads / np.asarray(self.heights)

    def stability_coefficients(self) -> np.ndarray:
        """theta_i = P_i/(k_i h_i): P-delta over elastic storey stiffness (zeros when rigid). [-]

        A yielding storey's tangent including P-delta, alpha k_i - P_i/h_i,
        is zero or negative when theta_i >= alpha (Chopra, Dynamics of
        Structures, P-delta effects).
        """
        if self.rigid:
            return np.zeros(self.storeys)
        return self.gravity_loads / (np.asarray(self.stiffnesses) * np.asarray(self.heights))

    def p_delta_notes(self) -> list[str]:
        """Plain sentences for storeys whose tangent stiffness with P-delta approaches zero.

        Elastic storeys: noted when theta >= 0.5 (the elastic tangent is
        halved). Yielding storeys: noted when P-delta takes half or more of
        the post-yield tangent alpha k (theta >= alpha/2), and said to be
        negative when theta > alpha. Thresholds are common practice for a
        feasibility screen.
        """
        if not self.p_delta or self.rigid:
            return []
        theta = self.stability_coefficients()
        notes = []
        for i, t in enumerate(theta, start=1):
            if t >= 0.5:
                notes.append(f"storey {i}: P-delta halves the elastic stiffness or more (theta = {t:.3f}); "
                             "the storey is near elastic instability")
            elif self.yielding and t > self.hardening:
                notes.append(f"storey {i}: negative post-yield stiffness with P-delta (alpha = {self.hardening:.3f} "
                             f"< theta = {t:.3f}); drift can ratchet towards collapse once it yields")
            elif self.yielding and t >= 0.5 * self.hardening:
                notes.append(f"storey {i}: P-delta takes half or more of the post-yield stiffness "
                             f"(theta = {t:.3f} against alpha = {self.hardening:.3f}); the tangent is near zero")
        return notes

    def with_strengths(self, yield_shears, hardening=None, p_delta=None, hysteresis=None) -> "ShearBuilding":
        """The same building with storey strengths (and optionally the other yielding options) replaced.

        Parameters
        ----------
        yield_shears : sequence of float or None
            Storey yield shears, or None for elastic storeys. [kN]
        hardening : float, optional
            Post-yield stiffness ratio; default unchanged. [-]
        p_delta : bool, optional
            P-delta switch; default unchanged. [-]
        hysteresis : {"bilinear", "clough"}, optional
            Storey law; default unchanged. [-]
        """
        import dataclasses

        changes: dict[str, Any] = {
            "yield_shears": None if yield_shears is None else tuple(np.atleast_1d(yield_shears).tolist())}
        if hardening is not None:
            changes["hardening"] = hardening
        if p_delta is not None:
            changes["p_delta"] = p_delta
        if hysteresis is not None:
            changes["hysteresis"] = hysteresis
        return dataclasses.replace(self, **changes)

    def storey_loop(self, drift, storey: int = 0) -> np.ndarray:
        """Spring force of one storey under an imposed drift history (loops and checks).

        Parameters
        ----------
        drift : array (steps,)
            Imposed storey drift, starting from the unloaded state. [m]
        storey : int, optional
            Storey index from 0 (the first storey). [-]

        Returns
        -------
        ndarray (steps,)
            Storey spring force, without P-delta. [kN]
        """
        from isolation.dynamics import kernel_laws

        d = validate.finite_array("drift", drift, "m")
        if d.ndim != 1:
            raise ValueError(f"drift has shape {d.shape}: must be 1-D (steps,) [m]")
        if self.rigid:
            raise ValueError("storey_loop is not available for a rigid building (no storey springs)")
        if not isinstance(storey, (int, np.integer)) or not 0 <= storey < self.storeys:
            raise ValueError(f"storey = {storey!r} is not allowed: must be an integer in [0, {self.storeys - 1}]")
        assert self.stiffnesses is not None  # a tuple after __post_init__
        k = self.stiffnesses[storey]
        if self.yield_shears is None:  # elastic storeys
            return k * d
        kind = {"bilinear": kernel_laws.STOREY_BILINEAR, "clough": kernel_laws.STOREY_CLOUGH}[self.hysteresis]
        return kernel_laws.storey_history(kind, k, self.yield_shears[storey], self.hardening, d)

    def mass_matrix(self) -> np.ndarray:
        """Diagonal mass matrix of the fixed-base floors. [t]"""
        return np.diag(np.asarray(self.masses))

    def stiffness_matrix(self) -> np.ndarray:
        """Fixed-base stiffness matrix (empty for a rigid building). [kN/m]"""
        return _chain_stiffness(np.asarray(self.stiffnesses))

    def geometric_stiffness_matrix(self) -> np.ndarray:
        """Fixed-base P-delta stiffness matrix from :attr:`geometric_stiffnesses` (zeros without P-delta). [kN/m]"""
        if self.rigid:
            return np.zeros((0, 0))
        return _chain_stiffness(self.geometric_stiffnesses)

    def modal(self) -> ModalProperties:
        """Fixed-base undamped modes, roof component of each shape = 1 (none when rigid)."""
        return self._modal

    @cached_property
    def _modal(self) -> ModalProperties:
        # Solved once per building (a frozen dataclass); the arrays are read-only, so no caller
        # can change what the next one gets.
        if self.rigid:
            modes = _modes(np.zeros(0), np.zeros((0, 0)), -1)
        else:
            modes = _modes(np.asarray(self.masses), self.stiffness_matrix(), -1)
        for values in (modes.periods, modes.mode_shapes, modes.participation_factors, modes.effective_masses):
            values.setflags(write=False)
        return modes

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
            "stiffnesses": list(self.stiffnesses or ()),
            "heights": list(self.heights),
            "damping": self.damping,
            "damping_model": self.damping_model,
            "rigid": self.rigid,
            "yield_shears": None if self.yield_shears is None else list(self.yield_shears),
            "hardening": self.hardening,
            "p_delta": self.p_delta,
            "hysteresis": self.hysteresis,
        }
        if not self.rigid:
            out["periods"] = self.modal().periods.tolist()
        return out
