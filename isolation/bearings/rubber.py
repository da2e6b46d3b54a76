"""Elastomeric isolators: lead-rubber and high-damping rubber bearings from geometry.

A laminated bearing has ``layers`` rubber layers of thickness t bonded to steel
shims; total rubber T_r = n t. Its horizontal stiffness is G A_r/T_r with A_r
the bonded rubber area (the lead core excluded). A lead core of area A_L yields
at sigma_yL and gives the characteristic strength Q_d = sigma_yL A_L (Naeim &
Kelly 1999; Kelly & Konstantinidis 2011). A high-damping compound has a shear
modulus and a damping ratio that depend on the shear strain; they come from the
compound's test curves, given here as a table.

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

import numpy as np

from isolation import validate
from isolation.bearings import checks as _checks
from isolation.bearings.backbone import Bilinear

__all__ = ["LeadRubber", "HighDampingRubber", "RubberCompound", "TYPICAL_COMPOUND", "AmplitudeBackbone"]


def _layers(value) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise ValueError(f"layers = {value!r} is not allowed: must be a whole number >= 1")
    return int(value)


def _optional_weight(weight) -> None:
    if weight is not None:
        validate.positive("weight", weight, "kN")


class _Elastomer:
    """Geometry and vertical mechanics shared by the laminated bearings."""

    _inner_face_free = False

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
        """E_c with compressibility, 1/E_c = 1/(6 G S^2) + 4/(3 K). [kPa]"""
        return _checks.compression_modulus(self.shear_modulus, self.shape_factor, self.bulk_modulus)

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
                "shape_factor": self.shape_factor, "compression_modulus": self.compression_modulus,
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

    def __post_init__(self) -> None:
        self._check_geometry("lead_diameter", self.lead_diameter, "positive")
        for name, value in (("shear_modulus", validate.positive("shear_modulus", self.shear_modulus, "kPa")),
                            ("lead_yield_stress",
                             validate.positive("lead_yield_stress", self.lead_yield_stress, "kPa"))):
            object.__setattr__(self, name, value)
        ratio = validate.finite("stiffness_ratio", self.stiffness_ratio, "-")
        if ratio <= 1.0:
            raise ValueError(f"stiffness_ratio = {self.stiffness_ratio!r} is not allowed: must be a finite number > 1 [-]")
        object.__setattr__(self, "stiffness_ratio", ratio)

    @property
    def _inner(self) -> float:
        return self.lead_diameter

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
               "stiffness_ratio": self.stiffness_ratio}
        out.update(self._geometry_dict())
        out.update({"post_yield_stiffness": self.post_yield_stiffness,
                    "characteristic_strength": self.characteristic_strength,
                    "elastic_stiffness": self.elastic_stiffness})
        return out


@dataclass(frozen=True)
class RubberCompound:
    """Strain-dependent properties of a high-damping rubber compound (from its test curves).

    Values between table points are interpolated linearly; outside the table
    the end values are held (the shear-strain check flags strains beyond it).

    Parameters
    ----------
    strains : sequence of float
        Shear strains, > 0 and strictly increasing. [-]
    shear_moduli : sequence of float
        Effective shear modulus at each strain, > 0. [kPa]
    dampings : sequence of float
        Effective damping ratio at each strain, in (0, 0.5). [-]
    source : str, optional
        Where the table comes from.
    """

    strains: tuple
    shear_moduli: tuple
    dampings: tuple
    source: str = "user table"

    def __post_init__(self) -> None:
        strains = validate.positive_array("strains", self.strains, "-")
        moduli = validate.positive_array("shear_moduli", self.shear_moduli, "kPa")
        damping = validate.positive_array("dampings", self.dampings, "-")
        if strains.ndim != 1 or moduli.shape != strains.shape or damping.shape != strains.shape:
            raise ValueError(f"shear_moduli and dampings have {moduli.size} and {damping.size} entries: "
                             f"each must match strains ({strains.size} entries, one-dimensional)")
        if np.any(np.diff(strains) <= 0.0):
            raise ValueError(f"strains = {list(strains)!r} is not allowed: must be strictly increasing [-]")
        for i, b in enumerate(damping):
            validate.in_range(f"dampings[{i}]", b, 0.0, 0.5, "-", low_inclusive=False, high_inclusive=False)
        object.__setattr__(self, "strains", tuple(float(x) for x in strains))
        object.__setattr__(self, "shear_moduli", tuple(float(x) for x in moduli))
        object.__setattr__(self, "dampings", tuple(float(x) for x in damping))

    def shear_modulus_at(self, strain):
        """Effective shear modulus at a shear strain [-]. [kPa]"""
        out = np.interp(np.asarray(strain, dtype=float), self.strains, self.shear_moduli)
        return float(out) if np.ndim(out) == 0 else out

    def damping_at(self, strain):
        """Effective damping ratio at a shear strain [-]. [-]"""
        out = np.interp(np.asarray(strain, dtype=float), self.strains, self.dampings)
        return float(out) if np.ndim(out) == 0 else out

    def to_dict(self) -> dict:
        return {"strains": list(self.strains), "shear_moduli": list(self.shear_moduli),
                "dampings": list(self.dampings), "source": self.source}


TYPICAL_COMPOUND = RubberCompound(
    strains=(0.10, 0.25, 0.50, 1.00, 1.50, 2.00, 2.50, 3.00),
    shear_moduli=(1200.0, 850.0, 620.0, 480.0, 420.0, 400.0, 410.0, 450.0),
    dampings=(0.19, 0.18, 0.16, 0.14, 0.13, 0.125, 0.12, 0.12),
    source="typical high-damping compound, G 0.4-1.2 MPa and damping 12-19 % (common practice)",
)
"""A typical high-damping compound (common practice, not a product's data). Replace with test curves."""


def max_bilinear_damping(ratio) -> float:
    """Largest effective damping of a bilinear loop with K_u/K_d = n: (2/pi)(sqrt(n) - 1)/(sqrt(n) + 1). [-]

    Parameters
    ----------
    ratio : float
        K_u/K_d, > 1. [-]
    """
    root = math.sqrt(ratio)
    return 2.0 / math.pi * (root - 1.0) / (root + 1.0)


def equivalent_bilinear(stiffness, damping, displacement, ratio) -> Bilinear:
    """Bilinear with the given secant stiffness and damping at one amplitude, for K_u/K_d = ratio.

    With q = Q_d/(K_eff D), K_d = K_eff (1 - q) and D_y = D q/((n - 1)(1 - q));
    EDC = 4 Q_d (D - D_y) = 2 pi beta K_eff D^2 gives
    n q^2 - (n - 1)(1 + c) q + c (n - 1) = 0 with c = pi beta/2 (smaller root).

    Parameters
    ----------
    stiffness : float
        Effective stiffness K_eff, > 0. [kN/m]
    damping : float
        Effective damping ratio, > 0. [-]
    displacement : float
        Amplitude D, > 0. [m]
    ratio : float
        K_u/K_d, > 1. [-]
    """
    k = validate.positive("effective stiffness", stiffness, "kN/m")
    beta = validate.positive("damping", damping, "-")
    d = validate.positive("displacement", displacement, "m")
    n = validate.finite("stiffness_ratio", ratio, "-")
    c = math.pi * beta / 2.0
    disc = ((n - 1.0) * (1.0 + c)) ** 2 - 4.0 * n * c * (n - 1.0)
    if n <= 1.0 or disc < 0.0:  # disc = 0 at c = (sqrt(n) - 1)/(sqrt(n) + 1)
        limit = max_bilinear_damping(n) if n > 1.0 else 0.0
        raise ValueError(f"damping = {damping!r} is not allowed with stiffness_ratio = {ratio!r}: "
                         f"must be <= {limit:.4f}, the most a bilinear loop reaches [-]")
    q = ((n - 1.0) * (1.0 + c) - math.sqrt(disc)) / (2.0 * n)
    kd = k * (1.0 - q)
    return Bilinear(n * kd, kd, q * k * d)


@dataclass(frozen=True)
class HighDampingRubber(_Elastomer):
    """High-damping rubber bearing with strain-dependent stiffness and damping.

    Parameters
    ----------
    outer_diameter : float
        Bonded rubber diameter, > 0. [m]
    layer_thickness : float
        Thickness of one rubber layer, > 0. [m]
    layers : int
        Number of rubber layers, >= 1. [-]
    compound : RubberCompound, optional
        Shear modulus and damping against shear strain; default
        :data:`TYPICAL_COMPOUND` (common practice).
    inner_diameter : float, optional
        Diameter of an empty central hole, in [0, outer_diameter). Default 0. [m]
    reference_strain : float, optional
        Shear strain at which G is read for the vertical checks, > 0.
        Default 1.0 (100 %, common practice). [-]
    stiffness_ratio : float, optional
        K_u/K_d of the equivalent bilinear, > 1. Default 10 (common practice). [-]
    bulk_modulus : float, optional
        Bulk modulus, > 0. Default 2.0e6 kPa. [kPa]
    shim_thickness : float, optional
        Internal shim thickness, >= 0. Default 3 mm. [m]
    end_plate_thickness : float, optional
        End plate thickness, >= 0. Default 0. [m]
    displacement_capacity : float or None, optional
        Rated displacement, > 0, or None when not given. [m]
    """

    outer_diameter: float
    layer_thickness: float
    layers: int
    compound: RubberCompound | None = None
    inner_diameter: float = 0.0
    reference_strain: float = 1.0
    stiffness_ratio: float = 10.0
    bulk_modulus: float = 2.0e6
    shim_thickness: float = 0.003
    end_plate_thickness: float = 0.0
    displacement_capacity: float | None = None

    _inner_face_free = True

    def __post_init__(self) -> None:
        self._check_geometry("inner_diameter", self.inner_diameter, "non_negative")
        compound = TYPICAL_COMPOUND if self.compound is None else self.compound
        if not isinstance(compound, RubberCompound):
            raise ValueError(f"compound = {self.compound!r} is not allowed: must be a RubberCompound or None")
        object.__setattr__(self, "compound", compound)
        object.__setattr__(self, "reference_strain",
                           validate.positive("reference_strain", self.reference_strain, "-"))
        ratio = validate.finite("stiffness_ratio", self.stiffness_ratio, "-")
        if ratio <= 1.0:
            raise ValueError(f"stiffness_ratio = {self.stiffness_ratio!r} is not allowed: must be a finite number > 1 [-]")
        object.__setattr__(self, "stiffness_ratio", ratio)
        most = max_bilinear_damping(ratio)
        top = max(compound.dampings)
        if top > most:
            raise ValueError(f"compound.dampings = {list(compound.dampings)!r} is not allowed with stiffness_ratio = "
                             f"{ratio!r}: each must be <= {most:.4f}, the most a bilinear loop reaches [-]")

    @property
    def _inner(self) -> float:
        return self.inner_diameter

    @property
    def shear_modulus(self) -> float:
        """G at the reference strain, used for the vertical checks. [kPa]"""
        return self.compound.shear_modulus_at(self.reference_strain)

    def _strain(self, displacement):
        d = np.asarray(displacement, dtype=float)
        if not np.all(np.isfinite(d)) or np.any(d <= 0.0):
            raise ValueError(f"displacement = {displacement!r} is not allowed: must be a finite amplitude > 0 [m]")
        return d / self.rubber_thickness

    def effective_stiffness(self, displacement):
        """K_eff = G(gamma) A_r/T_r at shear strain gamma = D/T_r. [kN/m]

        Parameters
        ----------
        displacement : float or array
            Amplitude D > 0. [m]
        """
        g = self.compound.shear_modulus_at(self._strain(displacement))
        return g * self.rubber_area / self.rubber_thickness

    def effective_damping(self, displacement):
        """Damping ratio of the compound at shear strain D/T_r. [-]

        Parameters
        ----------
        displacement : float or array
            Amplitude D > 0. [m]
        """
        return self.compound.damping_at(self._strain(displacement))

    def bilinear(self, weight=None, displacement=None) -> Bilinear:
        """Equivalent bilinear with the same K_eff and beta_eff at one amplitude.

        Assumption: K_u/K_d = ``stiffness_ratio``; Q_d and K_d then follow
        from K_eff and beta_eff (see :func:`equivalent_bilinear`).

        Parameters
        ----------
        weight : float, optional
            Vertical load, > 0 if given; not used. [kN]
        displacement : float
            Amplitude at which stiffness and damping match, > 0. [m]
        """
        _optional_weight(weight)
        if displacement is None:
            raise ValueError("displacement = None is not allowed: must be the amplitude > 0 at which "
                             "the equivalent bilinear matches [m]")
        d = validate.positive("displacement", displacement, "m")
        return equivalent_bilinear(self.effective_stiffness(d), self.effective_damping(d), d,
                                   self.stiffness_ratio)

    def backbone(self, weight=None) -> "AmplitudeBackbone":
        """Amplitude-dependent backbone (effective stiffness and damping at any amplitude).

        Parameters
        ----------
        weight : float, optional
            Vertical load, > 0 if given; not used. [kN]
        """
        _optional_weight(weight)
        return AmplitudeBackbone(self)

    def checks(self, axial_load, displacement, *, axial_load_max=None, axial_load_min=None,
               rotation=0.0, weight_share=None):
        """Elastomer checks plus one on the compound table's strain range.

        Parameters as :meth:`LeadRubber.checks`: axial_load [kN], displacement
        [m], axial_load_max [kN], axial_load_min [kN], rotation [rad],
        weight_share [kN].
        """
        out = super().checks(axial_load, displacement, axial_load_max=axial_load_max,
                             axial_load_min=axial_load_min, rotation=rotation, weight_share=weight_share)
        strain = float(self._strain(displacement))
        top = self.compound.strains[-1]
        out.append(_checks.Check("shear strain within compound table", strain, top, bool(strain <= top), "-",
                                 "compound test curves: beyond the last strain the end values are held"))
        return out

    def to_dict(self) -> dict:
        out = {"kind": "high_damping_rubber", "inner_diameter": self.inner_diameter,
               "compound": self.compound.to_dict(), "reference_strain": self.reference_strain,
               "stiffness_ratio": self.stiffness_ratio}
        out.update(self._geometry_dict())
        return out


@dataclass(frozen=True)
class AmplitudeBackbone:
    """Amplitude-dependent behaviour of high-damping rubber bearings, with property factors.

    At each amplitude D the bearing is replaced by its equivalent bilinear
    (same K_eff and beta_eff, K_u/K_d fixed); property factors then scale
    K_u and K_d by ``stiffness`` and Q_d by ``strength`` as for any bilinear.

    Parameters
    ----------
    bearing : HighDampingRubber
        The bearing described.
    stiffness : float, optional
        Factor on K_u and K_d, > 0 (includes the bearing count). [-]
    strength : float, optional
        Factor on Q_d, > 0 (includes the bearing count). [-]
    """

    bearing: HighDampingRubber
    stiffness: float = 1.0
    strength: float = 1.0

    def equivalent(self, displacement) -> Bilinear:
        """Scaled equivalent bilinear at one amplitude D > 0 [m]."""
        return self.bearing.bilinear(None, displacement).scaled(stiffness=self.stiffness,
                                                                strength=self.strength)

    def _each(self, method, displacement):
        d = np.asarray(displacement, dtype=float)
        out = np.array([getattr(self.equivalent(abs(x)), method)(abs(x)) if x != 0.0 else 0.0
                        for x in d.ravel()]).reshape(d.shape)
        return float(out) if out.ndim == 0 else out

    def force(self, displacement):
        """Force at the loop tip, K_eff(D) D, same sign as D. [kN]

        Parameters
        ----------
        displacement : float or array
            Displacement amplitude, either sign. [m]
        """
        out = np.sign(np.asarray(displacement, dtype=float)) * self._each("force", displacement)
        return float(out) if np.ndim(out) == 0 else out

    def effective_stiffness(self, displacement):
        """Secant stiffness at amplitude D > 0 [m]. [kN/m]"""
        self.bearing._strain(displacement)
        return self._each("effective_stiffness", displacement)

    def effective_damping(self, displacement):
        """Equivalent viscous damping at amplitude D > 0 [m]. [-]"""
        self.bearing._strain(displacement)
        return self._each("effective_damping", displacement)

    def loop_energy(self, displacement):
        """Energy per cycle at amplitude D > 0 [m]. [kN m]"""
        self.bearing._strain(displacement)
        return self._each("loop_energy", displacement)

    def times(self, count) -> "AmplitudeBackbone":
        """``count`` identical bearings in parallel; count > 0. [-]"""
        return self.scaled(stiffness=count, strength=count)

    def scaled(self, *, stiffness=1.0, strength=1.0) -> "AmplitudeBackbone":
        """Factors on stiffness (K_u, K_d) and strength (Q_d), each > 0. [-]"""
        s = validate.positive("stiffness factor", stiffness)
        q = validate.positive("strength factor", strength)
        return AmplitudeBackbone(self.bearing, self.stiffness * s, self.strength * q)

    def parallel(self, *others):
        """Combine with other backbones (each with force and loop_energy) acting side by side."""
        from isolation.bearings.system import CombinedBackbone
        return CombinedBackbone((self,) + tuple(others))

    def to_dict(self) -> dict:
        return {"kind": "amplitude_dependent", "bearing": self.bearing.to_dict(),
                "stiffness": self.stiffness, "strength": self.strength}
