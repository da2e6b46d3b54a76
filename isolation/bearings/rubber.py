"""Elastomeric isolators: laminated-bearing geometry and the lead-rubber bearing.

A laminated bearing has ``layers`` rubber layers of thickness t bonded to steel
shims; total rubber T_r = n t. Its horizontal stiffness is G A_r/T_r with A_r
the bonded rubber area (the lead core excluded). A lead core of area A_L yields
at sigma_yL and gives the characteristic strength Q_d = sigma_yL A_L (Naeim &
Kelly 1999; Kelly & Konstantinidis 2011). High-damping rubber bearings, whose
shear modulus and damping depend on the shear strain, are in
:mod:`isolation.bearings.damping_rubber`.

Geometry, vertical properties, buckling and strain checks are those of every
laminated bearing (:mod:`isolation.bearings.elastomer`, :mod:`isolation.bearings.checks`).

References
----------
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
Kelly, J. M. & Konstantinidis, D. A. (2011). Mechanics of Rubber Bearings for
Seismic and Vibration Isolation. Wiley.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from isolation import validate
from isolation.bearings.backbone import Bilinear
from isolation.bearings.elastomer import Elastomer, _optional_weight
from isolation.bearings.registry import BearingType, register
from isolation.schema import Key, Ordering

__all__ = ["LeadRubber", "LEAD_CORE_CONVENTIONS", "LEAD_RUBBER"]

_Elastomer = Elastomer  # earlier private name of the laminated-bearing base class

LEAD_CORE_CONVENTIONS = ("hole", "filled")
"""Treatments of the lead core in the vertical mechanics of :class:`LeadRubber`."""


@dataclass(frozen=True)
class LeadRubber(Elastomer):
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


LEAD_RUBBER = register(BearingType(
    kind="lead_rubber",
    model=LeadRubber,
    keys={
        "outer_diameter": Key("length", low=0.2, high=2.5),
        "lead_diameter": Key("length", low=0.0, high=1.0, low_inclusive=False),
        "layer_thickness": Key("length", low=0.002, high=0.05),
        "layers": Key("integer", low=1, high=200),
        "shear_modulus": Key("stress", low=200.0, high=2000.0),
        "lead_yield_stress": Key("stress", required=False, low=1000.0, high=30000.0),
        "stiffness_ratio": Key("number", required=False, low=1.0, high=50.0, low_inclusive=False),
        "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
        "lead_core": Key("choice", required=False, options=LEAD_CORE_CONVENTIONS),
    },
    cross_checks=(Ordering("lead_diameter", "outer_diameter", "m"),),
))
"""The lead-rubber bearing in the bearing registry (study ``type = "lead_rubber"``); its history
law is that of its bilinear backbone."""


_MOVED_TO_DAMPING_RUBBER = ("RubberCompound", "TYPICAL_COMPOUND", "HighDampingRubber", "AmplitudeBackbone",
                            "equivalent_bilinear", "max_bilinear_damping")


def __getattr__(name):
    """Names moved to :mod:`isolation.bearings.damping_rubber` stay importable from here."""
    if name in _MOVED_TO_DAMPING_RUBBER:  # looked up on use; damping_rubber does not import this module
        from isolation.bearings import damping_rubber
        return getattr(damping_rubber, name)
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
