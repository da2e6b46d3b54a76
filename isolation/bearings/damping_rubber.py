"""High-damping rubber bearings: strain-dependent compound, bearing and amplitude backbone.

A high-damping compound has a shear modulus and a damping ratio that depend on
the shear strain; they come from the compound's test curves, given here as a
table. At one amplitude the bearing is replaced by the bilinear with the same
effective stiffness and damping (:func:`equivalent_bilinear`).

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

import numpy as np

from isolation import validate
from isolation.bearings import checks as _checks
from isolation.bearings.backbone import Bilinear, CombinedBackbone
from isolation.bearings.elastomer import Elastomer, _optional_weight
from isolation.bearings.registry import BearingType, register
from isolation.schema import Key, Ordering

__all__ = ["HighDampingRubber", "RubberCompound", "TYPICAL_COMPOUND", "AmplitudeBackbone", "HIGH_DAMPING_RUBBER"]


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
    n = validate.finite("ratio", ratio, "-")
    if n <= 1.0:
        raise ValueError(f"ratio = {ratio!r} is not allowed: must be a finite number > 1 [-]")
    root = math.sqrt(n)
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
class HighDampingRubber(Elastomer):
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
            raise ValueError(f"stiffness_ratio = {self.stiffness_ratio!r} is not allowed: must be a finite number > 1 "
                             "[-]")
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
    def _curves(self) -> RubberCompound:
        assert self.compound is not None  # None is replaced by TYPICAL_COMPOUND in __post_init__
        return self.compound

    @property
    def shear_modulus(self) -> float:
        """G at the reference strain, used for the vertical checks. [kPa]"""
        return self._curves.shear_modulus_at(self.reference_strain)

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
        return self._curves.shear_modulus_at(self._strain(displacement)) * self.rubber_area / self.rubber_thickness

    def effective_damping(self, displacement):
        """Damping ratio of the compound at shear strain D/T_r. [-]

        Parameters
        ----------
        displacement : float or array
            Amplitude D > 0. [m]
        """
        return self._curves.damping_at(self._strain(displacement))

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
        top = self._curves.strains[-1]
        out.append(_checks.Check("shear strain within compound table", strain, top, bool(strain <= top), "-",
                                 "compound test curves: beyond the last strain the end values are held"))
        return out

    def to_dict(self) -> dict:
        out = {"kind": "high_damping_rubber", "inner_diameter": self.inner_diameter,
               "compound": self._curves.to_dict(), "reference_strain": self.reference_strain,
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
        return CombinedBackbone((self,) + tuple(others))

    def to_dict(self) -> dict:
        return {"kind": "amplitude_dependent", "bearing": self.bearing.to_dict(),
                "stiffness": self.stiffness, "strength": self.strength}


HIGH_DAMPING_RUBBER = register(BearingType(
    kind="high_damping_rubber",
    model=HighDampingRubber,
    keys={
        "outer_diameter": Key("length", low=0.2, high=2.5),
        "layer_thickness": Key("length", low=0.002, high=0.05),
        "layers": Key("integer", low=1, high=200),
        "inner_diameter": Key("length", required=False, low=0.0, high=1.0),
        "stiffness_ratio": Key("number", required=False, low=1.0, high=50.0, low_inclusive=False),
        "displacement_capacity": Key("length", required=False, low=0.0, high=3.0, low_inclusive=False),
    },
    cross_checks=(Ordering("inner_diameter", "outer_diameter", "m"),),
))
"""The high-damping rubber bearing in the bearing registry (study ``type = "high_damping_rubber"``).
Its backbone depends on the amplitude, so it registers no history law: a study runs the
equivalent bilinear at the design displacement (:func:`isolation.study.assembly.history_isolator`)."""
