"""What a stack of floors gives from its masses and storey heights alone.

Shared by the planar :class:`~isolation.dynamics.shear_building.ShearBuilding` and the
:class:`~isolation.dynamics.plan_superstructure.PlanShearBuilding`: floors 1..N from the
base of the stack up (the isolation plane, for a superstructure).
"""

from __future__ import annotations

from collections.abc import Sequence

import numpy as np

from isolation import GRAVITY

__all__ = ["FloorStack"]


class FloorStack:
    """Storey count, mass, floor elevations and gravity loads of ``masses`` [t] and ``heights`` [m]."""

    masses: Sequence[float]
    heights: Sequence[float]

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
        """Elevation of each floor above the base of the stack. [m]"""
        return np.cumsum(self.heights)

    @property
    def gravity_loads(self) -> np.ndarray:
        """Weight carried by each storey, P_i = g (m_i + ... + m_N). [kN]"""
        return GRAVITY * np.cumsum(np.asarray(self.masses)[::-1])[::-1]
