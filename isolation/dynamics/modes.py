"""Undamped modes of lumped-mass chains: the modal properties and the eigen-solution behind them.

Used by :mod:`isolation.dynamics.structure` (and re-exported there).

References
----------
Chopra, A. K. Dynamics of Structures (modal analysis, participation factors,
effective modal masses).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
import scipy.linalg

__all__ = ["ModalProperties"]


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
