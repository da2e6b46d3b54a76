"""Per-bearing answers of a bearing layout from the code's single-mode procedure (explorer and batch).

A layout is the alternative's bearing grid over the plan (``grid`` of the
alternative, or the grid of nearly square bays,
:func:`isolation.study.plan.default_grid`). For each bearing:

* displacement: the displacement of the centre of rigidity times the code's
  torsion factor at the bearing's distance from it (:func:`torsion_factors`);
* axial-load range: gravity share (in proportion to the groups' axial loads)
  with the overturning moment of the uplift check distributed over the grid as
  on a rigid base (:func:`isolation.design.overturning.grid_axial_loads`).

The same grid, eccentricity and rigid-base distribution of axial loads are
those of the bidirectional response histories (:mod:`isolation.study.plan`).
Scope: concept-stage feasibility, not construction design.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from isolation import codes
from isolation.dynamics.plan_structure import bearing_grid
from isolation.study.plan import default_grid

__all__ = ["LayoutDemands", "layout_demands", "torsion_factors"]


def torsion_factors(positions, plan, eccentricity: float, total_eccentricity: float) -> np.ndarray:
    """Displacement of each bearing over that of the centre of rigidity, by the code's torsion formula.

    The distance of bearing i from the centre of rigidity along the plan length is taken as
    ``y_i = |x_i| + eccentricity`` (the worse side), so the corner bearing gets the code's corner
    value: ASCE/SEI 7-16 Eq. 17.5-3, ``1 + y_i 12 e / (b^2 + d^2)`` (P_T = 1, as the study's code
    report); EN 1998-1 §10.9.3, ``1 + e_tot y_i / r^2`` with ``r^2 = (L^2 + B^2)/12`` (both from
    memory; the two are the same formula).

    Parameters
    ----------
    positions : array_like
        (n, 2) bearing positions relative to the centre of mass (x along the length). [m]
    plan : tuple of float
        (length, width). [m]
    eccentricity : float
        Actual eccentricity of the centre of rigidity. [m]
    total_eccentricity : float
        Eccentricity with the 5 % accidental part (the report's e or e_tot). [m]
    """
    pos = np.asarray(positions, dtype=float)
    length, width = plan
    y = np.abs(pos[:, 0]) + eccentricity
    return 1.0 + y * 12.0 * total_eccentricity / (length**2 + width**2)


@dataclass(frozen=True)
class LayoutDemands:
    """Per-bearing answers of one alternative's layout from the code's single-mode procedure.

    Attributes
    ----------
    grid : tuple of int
        Bearings along the length and across the width. [-]
    positions : ndarray (n, 2)
        Bearing positions relative to the centre of mass. [m]
    displacement : ndarray (n,)
        Displacement of each bearing: the centre-of-rigidity displacement (D_M, or gamma_x d_dc)
        times :func:`torsion_factors`. [m]
    gravity : ndarray (n,)
        Gravity axial load of each bearing. [kN]
    axial_min, axial_max : ndarray (n,)
        Smallest and largest axial load under overturning (:func:`isolation.overturning.grid_axial_loads`). [kN]
    spacing : tuple of float
        Bay size along the length and across the width (the plan dimension where one line). [m]
    """

    grid: tuple
    positions: np.ndarray
    displacement: np.ndarray
    gravity: np.ndarray
    axial_min: np.ndarray
    axial_max: np.ndarray
    spacing: tuple

    @property
    def in_tension(self) -> int:
        """Bearings whose smallest axial load is below zero. [-]"""
        return int((self.axial_min < 0.0).sum())

    def to_dict(self) -> dict:
        return {"grid": list(self.grid), "positions_m": self.positions.tolist(),
                "displacement_m": self.displacement.tolist(), "gravity_kN": self.gravity.tolist(),
                "axial_min_kN": self.axial_min.tolist(), "axial_max_kN": self.axial_max.tolist(),
                "spacing_m": list(self.spacing), "in_tension": self.in_tension}


def layout_demands(study, alternative, report, spectrum) -> LayoutDemands:
    """Per-bearing displacement and axial-load range of an alternative's layout (single-mode answer).

    Parameters
    ----------
    study : isolation.study_inputs.Study
        The study (plan, eccentricity, basis). [-]
    alternative : isolation.study_inputs.Alternative
        Bearing groups (counts, axial loads) and optional ``grid``; default grid :func:`default_grid`. [-]
    report : code report
        The alternative's ASCE 7 ELF or EN 1998-1 report (:func:`isolation.study.assembly.design_alternative`). [-]
    spectrum : spectrum object
        The site spectrum (vertical earthquake of the load combination). [g]
    """
    from isolation.design.overturning import grid_axial_loads
    from isolation.study.assembly import overturning_inputs

    b = study.building
    plan = (b.plan_length, b.plan_width)
    count = sum(spec.count for spec in alternative.bearings)
    grid = tuple(alternative.grid or default_grid(count, *plan))
    positions = bearing_grid(plan, grid)
    loads = np.concatenate([np.full(spec.count, float(spec.axial_load)) for spec in alternative.bearings])
    gravity = loads * b.total_weight / loads.sum()
    centre, total = codes.get(study.basis).torsion_action(report)
    displacement = centre * torsion_factors(positions, plan, b.eccentricity, total)
    shear, height, factor, vertical, _ = overturning_inputs(study, spectrum, report)
    low, high = grid_axial_loads(shear * height, positions, gravity, gravity_factor=factor,
                                 vertical_fraction=vertical)
    spacing = tuple(float(d / (n - 1)) if n > 1 else float(d) for d, n in zip(plan, grid, strict=True))
    return LayoutDemands(grid, positions, displacement, gravity, low, high, spacing)
