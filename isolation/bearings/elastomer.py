"""Laminated elastomeric bearings: geometry and vertical mechanics shared by every rubber bearing.

A laminated bearing has ``layers`` rubber layers of thickness t bonded to steel
shims; total rubber T_r = n t, bonded area A_r (a lead core or a central hole
excluded). Shape factor, compression modulus, vertical stiffness, buckling load
and the elastomer checks use the formulas of :mod:`isolation.bearings.checks`.
The bearings are in :mod:`isolation.bearings.rubber` (lead-rubber) and
:mod:`isolation.bearings.damping_rubber` (high-damping rubber); this module
imports neither.

References
----------
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
Kelly, J. M. & Konstantinidis, D. A. (2011). Mechanics of Rubber Bearings for
Seismic and Vibration Isolation. Wiley.
"""

from __future__ import annotations

import math
from typing import TYPE_CHECKING

import numpy as np

from isolation import validate
from isolation.bearings import checks as _checks

__all__ = ["Elastomer"]


def _layers(value) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise ValueError(f"layers = {value!r} is not allowed: must be a whole number >= 1")
    return int(value)


def _optional_weight(weight) -> None:
    if weight is not None:
        validate.positive("weight", weight, "kN")


class Elastomer:
    """Geometry and vertical mechanics shared by the laminated bearings."""

    # Fields of the dataclasses built on this class.
    outer_diameter: float
    layer_thickness: float
    layers: int
    bulk_modulus: float
    shim_thickness: float
    end_plate_thickness: float
    displacement_capacity: float | None

    if TYPE_CHECKING:
        @property
        def shear_modulus(self) -> float:
            """Shear modulus of the rubber (a field or a strain-dependent property). [kPa]"""

    @property
    def _inner_face_free(self) -> bool:
        return False

    def _check_geometry(self, inner_name: str, inner, inner_minimum_allowed: str) -> None:
        do = validate.positive("outer_diameter", self.outer_diameter, "m")
        t = validate.positive("layer_thickness", self.layer_thickness, "m")
        n = _layers(self.layers)
        if inner_minimum_allowed == "positive":
            di = validate.positive(inner_name, inner, "m")
        else:
            di = validate.non_negative(inner_name, inner, "m")
        if di >= do:
            raise ValueError(f"{inner_name} = {inner!r} is not allowed: must be < outer_diameter = {do!r} [m]")
        values = {"outer_diameter": do, "layer_thickness": t, "layers": n, inner_name: di,
                  "bulk_modulus": validate.positive("bulk_modulus", self.bulk_modulus, "kPa"),
                  "shim_thickness": validate.non_negative("shim_thickness", self.shim_thickness, "m"),
                  "end_plate_thickness": validate.non_negative("end_plate_thickness",
                                                               self.end_plate_thickness, "m"),
                  "displacement_capacity": None if self.displacement_capacity is None else
                  validate.positive("displacement_capacity", self.displacement_capacity, "m")}
        for name, value in values.items():
            object.__setattr__(self, name, value)

    @property
    def _inner(self) -> float:
        raise NotImplementedError

    @property
    def rubber_thickness(self) -> float:
        """Total rubber thickness T_r = n t. [m]"""
        return self.layers * self.layer_thickness

    @property
    def rubber_area(self) -> float:
        """Bonded rubber area pi (Do^2 - Di^2)/4, core or hole excluded. [m2]"""
        return math.pi * (self.outer_diameter**2 - self._inner**2) / 4.0

    @property
    def inertia(self) -> float:
        """Second moment of the bonded rubber area pi (Do^4 - Di^4)/64. [m4]"""
        return math.pi * (self.outer_diameter**4 - self._inner**4) / 64.0

    @property
    def shape_factor(self) -> float:
        """Shape factor of one layer (see :func:`isolation.bearings.checks.shape_factor`). [-]"""
        return _checks.shape_factor(self.outer_diameter, self.layer_thickness, self._inner,
                                    inner_face_free=self._inner_face_free)

    @property
    def compression_modulus(self) -> float:
        """E_c with compressibility, 1/E_c = 1/(6 G S^2 F) + 4/(3 K); F is the hole factor of
        Constantinou, Kartoum & Kelly (1992, Eng. Struct. 14(2)) when the central hole's face
        bulges (empty hole, or a lead core treated as a hole), else 1. [kPa]"""
        return _checks.compression_modulus(self.shear_modulus, self.shape_factor, self.bulk_modulus,
                                           hole=self.hole_factor)

    @property
    def hole_factor(self) -> float:
        """Hole factor F on E_c (1 without a bulging inner face). [-]"""
        if not self._inner_face_free:
            return 1.0
        return _checks.hole_factor(self.outer_diameter, self._inner)

    @property
    def vertical_stiffness(self) -> float:
        """K_v = E_c A_r/T_r. [kN/m]"""
        return self.compression_modulus * self.rubber_area / self.rubber_thickness

    @property
    def height(self) -> float:
        """Rubber plus internal shims, h = T_r + (n - 1) t_s. [m]"""
        return self.rubber_thickness + (self.layers - 1) * self.shim_thickness

    @property
    def total_height(self) -> float:
        """Rubber, internal shims and the two end plates. [m]"""
        return self.height + 2.0 * self.end_plate_thickness

    def buckling_load(self, displacement=0.0) -> float:
        """Critical axial load, P_cr = sqrt(P_S P_E) times the overlap ratio A_r(Delta)/A.

        Parameters
        ----------
        displacement : float, optional
            Lateral displacement Delta, >= 0 (default 0). [m]

        Returns
        -------
        float
            Critical load. [kN]
        """
        zero = _checks.buckling_load(self.shear_modulus, self.rubber_area, self.inertia,
                                     self.compression_modulus, self.rubber_thickness, self.height)
        return zero * _checks.overlap_ratio(self.outer_diameter, displacement)

    def checks(self, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
               rotation=0.0, weight_share=None):
        """Checks at a design displacement (see :func:`isolation.bearings.checks.elastomer_checks`).

        Parameters
        ----------
        axial_load : float
            Gravity load on the bearing, > 0. [kN]
        displacement : float
            Design displacement of the bearing, > 0. [m]
        axial_load_max : float, optional
            Largest compression during the earthquake (default axial_load). [kN]
        axial_load_min : float, optional
            Smallest axial load, negative in tension (default axial_load). [kN]
        rotation : float, optional
            Rotation of the bearing, >= 0 (default 0). [rad]
        weight_share : float, optional
            Weight this bearing restores (default axial_load). [kN]

        Returns
        -------
        list of Check
        """
        return _checks.elastomer_checks(self, axial_load, displacement, axial_load_max=axial_load_max,
                                        axial_load_min=axial_load_min, rotation=rotation,
                                        weight_share=weight_share)

    def _geometry_dict(self) -> dict:
        return {"outer_diameter": self.outer_diameter, "layer_thickness": self.layer_thickness,
                "layers": self.layers, "bulk_modulus": self.bulk_modulus,
                "shim_thickness": self.shim_thickness, "end_plate_thickness": self.end_plate_thickness,
                "displacement_capacity": self.displacement_capacity,
                "rubber_thickness": self.rubber_thickness, "rubber_area": self.rubber_area,
                "shape_factor": self.shape_factor, "hole_factor": self.hole_factor,
                "compression_modulus": self.compression_modulus,
                "vertical_stiffness": self.vertical_stiffness, "total_height": self.total_height}
