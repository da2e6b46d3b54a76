"""Elastomeric isolators: laminated-bearing geometry and the lead-rubber bearing.

A laminated bearing has ``layers`` rubber layers of thickness t bonded to steel
shims; total rubber T_r = n t. Its horizontal stiffness is G A_r/T_r with A_r
the bonded rubber area (the lead core excluded). A lead core of area A_L yields
at sigma_yL and gives the characteristic strength Q_d = sigma_yL A_L (Naeim &
Kelly 1999; Kelly & Konstantinidis 2011). High-damping rubber bearings, whose
shear modulus and damping depend on the shear strain, are in
:mod:`isolation.bearings.damping_rubber`.

Vertical properties, buckling and strain checks use the formulas in
:mod:`isolation.bearings.checks`.

References
----------
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
Kelly, J. M. & Konstantinidis, D. A. (2011). Mechanics of Rubber Bearings for
Seismic and Vibration Isolation. Wiley.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from isolation import validate
from isolation.bearings import checks as _checks
from isolation.bearings.backbone import Bilinear

__all__ = ["LeadRubber", "LEAD_CORE_CONVENTIONS"]

LEAD_CORE_CONVENTIONS = ("hole", "filled")
"""Treatments of the lead core in the vertical mechanics of :class:`LeadRubber`."""


def _layers(value) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise ValueError(f"layers = {value!r} is not allowed: must be a whole number >= 1")
    return int(value)


def _optional_weight(weight) -> None:
    if weight is not None:
        validate.positive("weight", weight, "kN")


class _Elastomer:
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


@dataclass(frozen=True)
class LeadRubber(_Elastomer):
    """Lead-rubber bearing from its geometry.

    Parameters
    ----------
    outer_diameter : float
        Bonded rubber diameter (cover excluded), > 0. [m]
    lead_diameter : float
        Diameter of the lead core, in (0, outer_diameter). [m]
    layer_thickness : float
        Thickness of one rubber layer, > 0. [m]
    layers : int
        Number of rubber layers, >= 1. [-]
    shear_modulus : float
        Shear modulus of the rubber, > 0. [kPa]
    lead_yield_stress : float, optional
        Effective shear yield stress of the lead, > 0. Default 10 000 kPa
        (10 MPa, first cycle, from memory of Naeim & Kelly 1999). [kPa]
    stiffness_ratio : float, optional
        K_u/K_d, > 1. Default 10 (common practice). [-]
    bulk_modulus : float, optional
        Bulk modulus of the rubber, > 0. Default 2.0e6 kPa (2000 MPa,
        Kelly & Konstantinidis 2011). [kPa]
    shim_thickness : float, optional
        Thickness of one internal steel shim, >= 0. Default 3 mm. [m]
    end_plate_thickness : float, optional
        Thickness of each end plate, >= 0, for the total height. Default 0. [m]
    displacement_capacity : float or None, optional
        Displacement the bearing is rated for (from the maker's tests), > 0,
        or None when not given (the capacity check is then left out). [m]
    lead_core : {"hole", "filled"}, optional
        How the vertical mechanics treat the lead core. "hole" (default,
        conservative): the core is taken as an empty central hole, S =
        (D_o - D_L)/(4 t) and E_c with the hole factor F of Constantinou,
        Kartoum & Kelly (1992), as in Kumar, Whittaker & Constantinou (2014,
        Earthquake Eng. Struct. Dyn. 43(13)) and Constantinou et al. (2011,
        MCEER-11-0004), both from memory. "filled": the core keeps the inner
        face from bulging, S = (D_o^2 - D_L^2)/(4 D_o t) and F = 1 (bonded-
        annulus convention with only the outer face free, e.g. Naeim & Kelly
        1999, from memory); gives a larger S, E_c and buckling load. [-]
    """

    outer_diameter: float
    lead_diameter: float
    layer_thickness: float
    layers: int
    shear_modulus: float
    lead_yield_stress: float = 10000.0
    stiffness_ratio: float = 10.0
    bulk_modulus: float = 2.0e6
    shim_thickness: float = 0.003
    end_plate_thickness: float = 0.0
    displacement_capacity: float | None = None
    lead_core: str = "hole"

    def __post_init__(self) -> None:
        self._check_geometry("lead_diameter", self.lead_diameter, "positive")
        validate.one_of("lead_core", self.lead_core, LEAD_CORE_CONVENTIONS)
        for name, value in (("shear_modulus", validate.positive("shear_modulus", self.shear_modulus, "kPa")),
                            ("lead_yield_stress",
                             validate.positive("lead_yield_stress", self.lead_yield_stress, "kPa"))):
            object.__setattr__(self, name, value)
        ratio = validate.finite("stiffness_ratio", self.stiffness_ratio, "-")
        if ratio <= 1.0:
            raise ValueError(f"stiffness_ratio = {self.stiffness_ratio!r} is not allowed: must be a finite number > 1 "
                             "[-]")
        object.__setattr__(self, "stiffness_ratio", ratio)

    @property
    def _inner(self) -> float:
        return self.lead_diameter

    @property
    def _inner_face_free(self) -> bool:
        return self.lead_core == "hole"

    @property
    def lead_area(self) -> float:
        """Area of the lead core pi d_L^2/4. [m2]"""
        return math.pi * self.lead_diameter**2 / 4.0

    @property
    def post_yield_stiffness(self) -> float:
        """K_d = G A_r/T_r. [kN/m]"""
        return self.shear_modulus * self.rubber_area / self.rubber_thickness

    @property
    def characteristic_strength(self) -> float:
        """Q_d = sigma_yL A_L. [kN]"""
        return self.lead_yield_stress * self.lead_area

    @property
    def elastic_stiffness(self) -> float:
        """K_u = stiffness_ratio K_d. [kN/m]"""
        return self.stiffness_ratio * self.post_yield_stiffness

    def bilinear(self, weight=None) -> Bilinear:
        """Bilinear behaviour (K_u, K_d, Q_d); independent of the vertical load.

        Parameters
        ----------
        weight : float, optional
            Vertical load, > 0 if given; not used. [kN]
        """
        _optional_weight(weight)
        return Bilinear(self.elastic_stiffness, self.post_yield_stiffness, self.characteristic_strength)

    def backbone(self, weight=None) -> Bilinear:
        """Same as :meth:`bilinear`.

        Parameters
        ----------
        weight : float, optional
            Vertical load, > 0 if given; not used. [kN]
        """
        return self.bilinear(weight)

    def to_dict(self) -> dict:
        out = {"kind": "lead_rubber", "lead_diameter": self.lead_diameter,
               "shear_modulus": self.shear_modulus, "lead_yield_stress": self.lead_yield_stress,
               "stiffness_ratio": self.stiffness_ratio, "lead_core": self.lead_core}
        out.update(self._geometry_dict())
        out.update({"post_yield_stiffness": self.post_yield_stiffness,
                    "characteristic_strength": self.characteristic_strength,
                    "elastic_stiffness": self.elastic_stiffness})
        return out


_MOVED_TO_DAMPING_RUBBER = ("RubberCompound", "TYPICAL_COMPOUND", "HighDampingRubber", "AmplitudeBackbone",
                            "equivalent_bilinear", "max_bilinear_damping")


def __getattr__(name):
    """Names moved to :mod:`isolation.bearings.damping_rubber` stay importable from here."""
    if name in _MOVED_TO_DAMPING_RUBBER:
        from isolation.bearings import damping_rubber
        return getattr(damping_rubber, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
