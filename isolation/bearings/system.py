"""The isolation plane: bearing groups, property modification factors and bound property sets.

An isolation system is a list of bearing groups (a bearing type, how many, the
gravity load on each). Its whole-plane behaviour is the sum of the groups'
backbones; lower-bound, nominal and upper-bound sets apply property
modification factors lambda to each property (ASCE/SEI 7-16 §17.2.8.4):

    lambda_max = (1 + 0.75 (lambda_ae,max - 1)) lambda_test,max lambda_spec,max
    lambda_min = (1 - 0.75 (1 - lambda_ae,min)) lambda_test,min lambda_spec,min

(form from memory of the standard; verify the clause before quoting it).

* Elastomeric bearings: ``stiffness`` scales K_d (and K_u with it), ``strength``
  scales Q_d.
* Sliding bearings: ``friction`` scales both coefficients of friction; the
  post-yield stiffness W/R is geometry and is not factored.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from isolation import validate
from isolation.bearings.backbone import Bilinear, MultiLinear
from isolation.bearings.checks import Check, restoring_force_check
from isolation.bearings.damping_rubber import HighDampingRubber
from isolation.bearings.double_concave import DoubleConcave
from isolation.bearings.friction import FrictionPendulum
from isolation.bearings.rubber import LeadRubber
from isolation.bearings.triple_pendulum import TripleFrictionPendulum

__all__ = ["PropertyBound", "PropertyFactors", "BearingGroup", "IsolationSystem", "CombinedBackbone",
           "UNQUALIFIED_LOWER", "UNQUALIFIED_UPPER"]

UNQUALIFIED_LOWER = 0.6
"""Default lambda_min for bearings without qualification data (from memory of ASCE/SEI 7-16 §17.2.8.4). [-]"""
UNQUALIFIED_UPPER = 1.8
"""Default lambda_max for bearings without qualification data (from memory of ASCE/SEI 7-16 §17.2.8.4). [-]"""

CASES = ("lower", "nominal", "upper")


@dataclass(frozen=True)
class PropertyBound:
    """Lower and upper property modification factors of one property.

    Parameters
    ----------
    lower : float
        lambda_min, in (0, 1]. Default 1. [-]
    upper : float
        lambda_max, >= 1 and finite. Default 1. [-]
    """

    lower: float = 1.0
    upper: float = 1.0

    def __post_init__(self) -> None:
        object.__setattr__(self, "lower", validate.in_range("lower", self.lower, 0.0, 1.0, "-",
                                                            low_inclusive=False))
        upper = validate.finite("upper", self.upper, "-")
        if upper < 1.0:
            raise ValueError(f"upper = {self.upper!r} is not allowed: must be a finite number >= 1 [-]")
        object.__setattr__(self, "upper", upper)

    @classmethod
    def from_factors(cls, *, aging_max=1.0, aging_min=1.0, test_max=1.0, test_min=1.0,
                     spec_max=1.0, spec_min=1.0, adjustment=0.75) -> "PropertyBound":
        """Combine component factors into lambda_min and lambda_max (ASCE/SEI 7-16 §17.2.8.4, from memory).

        Parameters
        ----------
        aging_max, aging_min : float
            Aging and environment factors lambda_ae (max >= 1, min in (0, 1]). [-]
        test_max, test_min : float
            Testing factors lambda_test (max >= 1, min in (0, 1]). [-]
        spec_max, spec_min : float
            Specification tolerance lambda_spec (max >= 1, min in (0, 1]);
            1.15/0.85 is common practice. [-]
        adjustment : float, optional
            Share of the aging factor counted, in [0, 1]; 0.75 for most
            buildings, 1.0 for essential facilities (from memory). [-]
        """
        a = validate.in_range("adjustment", adjustment, 0.0, 1.0, "-")
        maxima = {"aging_max": aging_max, "test_max": test_max, "spec_max": spec_max}
        minima = {"aging_min": aging_min, "test_min": test_min, "spec_min": spec_min}
        for name, value in maxima.items():
            number = validate.finite(name, value, "-")
            if number < 1.0:
                raise ValueError(f"{name} = {value!r} is not allowed: must be a finite number >= 1 [-]")
            maxima[name] = number
        for name, value in minima.items():
            minima[name] = validate.in_range(name, value, 0.0, 1.0, "-", low_inclusive=False)
        upper = (1.0 + a * (maxima["aging_max"] - 1.0)) * maxima["test_max"] * maxima["spec_max"]
        lower = (1.0 - a * (1.0 - minima["aging_min"])) * minima["test_min"] * minima["spec_min"]
        return cls(lower, upper)

    def factor(self, case: str) -> float:
        """The factor for "lower", "nominal" or "upper". [-]"""
        validate.one_of("case", case, CASES)
        return {"lower": self.lower, "nominal": 1.0, "upper": self.upper}[case]

    def to_dict(self) -> dict:
        return {"lower": self.lower, "upper": self.upper}


def _bound(name, value) -> PropertyBound:
    if isinstance(value, PropertyBound):
        return value
    if isinstance(value, (tuple, list)) and len(value) == 2:
        return PropertyBound(*value)
    raise ValueError(f"{name} = {value!r} is not allowed: must be a PropertyBound or a pair (lower, upper)")


@dataclass(frozen=True)
class PropertyFactors:
    """Property modification factors for each property of a bearing type.

    Parameters
    ----------
    stiffness : PropertyBound or (lower, upper)
        Factors on the post-yield stiffness K_d (elastomers). [-]
    strength : PropertyBound or (lower, upper)
        Factors on the characteristic strength Q_d (elastomers). [-]
    friction : PropertyBound or (lower, upper)
        Factors on the coefficient of friction (sliders). [-]
    """

    stiffness: PropertyBound = field(default_factory=PropertyBound)
    strength: PropertyBound = field(default_factory=PropertyBound)
    friction: PropertyBound = field(default_factory=PropertyBound)

    def __post_init__(self) -> None:
        for name in ("stiffness", "strength", "friction"):
            object.__setattr__(self, name, _bound(name, getattr(self, name)))

    @classmethod
    def unqualified(cls) -> "PropertyFactors":
        """Default bounds 0.6/1.8 on every property for unqualified bearings (from memory)."""
        bound = PropertyBound(UNQUALIFIED_LOWER, UNQUALIFIED_UPPER)
        return cls(bound, bound, bound)

    @classmethod
    def nominal_only(cls) -> "PropertyFactors":
        """All factors 1: the three property sets coincide."""
        return cls()

    def to_dict(self) -> dict:
        return {"stiffness": self.stiffness.to_dict(), "strength": self.strength.to_dict(),
                "friction": self.friction.to_dict()}


_SLIDERS = (FrictionPendulum, DoubleConcave, TripleFrictionPendulum)
_BEARINGS = (FrictionPendulum, DoubleConcave, TripleFrictionPendulum, LeadRubber, HighDampingRubber)
_Bearing = FrictionPendulum | DoubleConcave | TripleFrictionPendulum | LeadRubber | HighDampingRubber
"""Any one bearing type a :class:`BearingGroup` accepts."""


@dataclass(frozen=True)
class BearingGroup:
    """Identical bearings under the same gravity load.

    Parameters
    ----------
    bearing : FrictionPendulum, DoubleConcave, LeadRubber or HighDampingRubber
        The bearing type.
    count : int
        Number of bearings, >= 1. [-]
    axial_load : float
        Gravity load on each bearing (its share of the weight), > 0. [kN]
    name : str, optional
        Label used in checks (default "group i" by position).
    axial_load_max : float, optional
        Largest compression on one bearing during the earthquake (default axial_load). [kN]
    axial_load_min : float, optional
        Smallest axial load, negative in tension (default axial_load). [kN]
    rotation : float, optional
        Rotation of each bearing, >= 0 (default 0). [rad]
    factors : PropertyFactors, optional
        Factors for this group; default: the system's.
    """

    bearing: _Bearing
    count: int
    axial_load: float
    name: str | None = None
    axial_load_max: float | None = None
    axial_load_min: float | None = None
    rotation: float = 0.0
    factors: PropertyFactors | None = None

    def __post_init__(self) -> None:
        if not isinstance(self.bearing, _BEARINGS):
            allowed = ", ".join(c.__name__ for c in _BEARINGS)
            raise ValueError(f"bearing = {self.bearing!r} is not allowed: must be one of {allowed}")
        count = self.count
        if isinstance(count, bool) or not isinstance(count, (int, np.integer)) or count < 1:
            raise ValueError(f"count = {count!r} is not allowed: must be a whole number >= 1")
        object.__setattr__(self, "count", int(count))
        object.__setattr__(self, "axial_load", validate.positive("axial_load", self.axial_load, "kN"))
        object.__setattr__(self, "rotation", validate.non_negative("rotation", self.rotation, "rad"))
        if self.factors is not None and not isinstance(self.factors, PropertyFactors):
            raise ValueError(f"factors = {self.factors!r} is not allowed: must be PropertyFactors or None")

    @property
    def is_sliding(self) -> bool:
        """True for friction pendulum bearings."""
        return isinstance(self.bearing, _SLIDERS)

    def backbone(self, case="nominal", factors=None, load=None):
        """Backbone of the whole group for one property case.

        Parameters
        ----------
        case : str
            "lower", "nominal" or "upper".
        factors : PropertyFactors, optional
            Used when the group has none of its own (default: all 1).
        load : float, optional
            Vertical load per bearing for sliders (default axial_load). [kN]
        """
        f = self.factors or factors or PropertyFactors()
        w = self.axial_load if load is None else load
        if self.is_sliding:
            bearing = self.bearing.with_friction_factor(f.friction.factor(case))
            return bearing.backbone(w).times(self.count)
        return self.bearing.backbone(w).times(self.count).scaled(
            stiffness=f.stiffness.factor(case), strength=f.strength.factor(case))

    def to_dict(self) -> dict:
        return {"bearing": self.bearing.to_dict(), "count": self.count, "axial_load": self.axial_load,
                "name": self.name, "axial_load_max": self.axial_load_max,
                "axial_load_min": self.axial_load_min, "rotation": self.rotation,
                "factors": None if self.factors is None else self.factors.to_dict()}


@dataclass(frozen=True)
class CombinedBackbone:
    """Backbones side by side whose forces and loop energies add (any with force and loop_energy).

    Parameters
    ----------
    parts : tuple
        Backbones (Bilinear, MultiLinear, amplitude-dependent rubber, ...).
    """

    parts: tuple

    def force(self, displacement):
        """Sum of the parts' forces at a displacement [m]. [kN]"""
        out = sum(np.asarray(p.force(displacement), dtype=float) for p in self.parts)
        return float(out) if np.ndim(out) == 0 else out

    def effective_stiffness(self, displacement):
        """Sum of secant stiffnesses at amplitude D > 0 [m]. [kN/m]"""
        out = sum(np.asarray(p.effective_stiffness(displacement), dtype=float) for p in self.parts)
        return float(out) if np.ndim(out) == 0 else out

    def loop_energy(self, displacement):
        """Sum of energies per cycle at amplitude D > 0 [m]. [kN m]"""
        out = sum(np.asarray(p.loop_energy(displacement), dtype=float) for p in self.parts)
        return float(out) if np.ndim(out) == 0 else out

    def effective_damping(self, displacement):
        """EDC/(2 pi K_eff D^2) of the combination at amplitude D > 0 [m]. [-]"""
        d = np.asarray(displacement, dtype=float)
        out = np.asarray(self.loop_energy(d)) / (2.0 * math.pi * np.asarray(self.effective_stiffness(d)) * d**2)
        return float(out) if out.ndim == 0 else out

    def times(self, count) -> "CombinedBackbone":
        """``count`` copies in parallel; count > 0. [-]"""
        return CombinedBackbone(tuple(p.times(count) for p in self.parts))

    def scaled(self, *, stiffness=1.0, strength=1.0) -> "CombinedBackbone":
        """Factors on every part's stiffness and strength, each > 0. [-]"""
        return CombinedBackbone(tuple(p.scaled(stiffness=stiffness, strength=strength) for p in self.parts))

    def parallel(self, *others) -> "CombinedBackbone":
        """Add further backbones side by side."""
        return CombinedBackbone(self.parts + tuple(others))

    def to_dict(self) -> dict:
        return {"kind": "combined", "parts": [p.to_dict() for p in self.parts]}


def combine(backbones):
    """Sum backbones: a Bilinear when all are bilinear with one yield displacement, else a
    MultiLinear when all have parallel elements, else a :class:`CombinedBackbone`."""
    backbones = list(backbones)
    if len(backbones) == 1:
        return backbones[0]
    if all(isinstance(b, Bilinear) for b in backbones):
        dy = [b.yield_displacement for b in backbones]
        if all(math.isclose(x, dy[0], rel_tol=1e-9) for x in dy):
            return Bilinear(sum(b.elastic_stiffness for b in backbones),
                            sum(b.post_yield_stiffness for b in backbones),
                            sum(b.characteristic_strength for b in backbones))
    if all(isinstance(b, (Bilinear, MultiLinear)) for b in backbones):
        return backbones[0].parallel(*backbones[1:])
    return CombinedBackbone(tuple(backbones))


@dataclass(frozen=True)
class IsolationSystem:
    """All bearings of an isolation plane.

    Parameters
    ----------
    groups : sequence of BearingGroup
        The bearing groups, at least one.
    factors : PropertyFactors, optional
        Property modification factors for groups without their own. Default:
        :meth:`PropertyFactors.unqualified` (0.6/1.8, from memory of
        ASCE/SEI 7-16 §17.2.8.4); pass ``PropertyFactors.nominal_only()`` to
        switch the bounds off.
    """

    groups: tuple
    factors: PropertyFactors | None = None

    def __post_init__(self) -> None:
        groups = tuple(self.groups) if isinstance(self.groups, (list, tuple)) else None
        if not groups:
            raise ValueError(f"groups = {self.groups!r} is not allowed: must be a non-empty list of BearingGroup")
        for i, g in enumerate(groups):
            if not isinstance(g, BearingGroup):
                raise ValueError(f"groups[{i}] = {g!r} is not allowed: must be a BearingGroup")
        factors = PropertyFactors.unqualified() if self.factors is None else self.factors
        if not isinstance(factors, PropertyFactors):
            raise ValueError(f"factors = {self.factors!r} is not allowed: must be PropertyFactors or None")
        object.__setattr__(self, "groups", groups)
        object.__setattr__(self, "factors", factors)

    @property
    def weight(self) -> float:
        """Sum of the gravity loads on all bearings. [kN]"""
        return sum(g.count * g.axial_load for g in self.groups)

    @property
    def is_sliding(self) -> bool:
        """True when any group is a sliding (friction pendulum) bearing."""
        return any(g.is_sliding for g in self.groups)

    @property
    def displacement_capacity(self) -> float | None:
        """Smallest displacement capacity over the groups that state one, or None. [m]"""
        stated = [getattr(g.bearing, "displacement_capacity", None) for g in self.groups]
        caps = [float(c) for c in stated if c is not None]
        return min(caps) if caps else None

    def label(self, index: int) -> str:
        """Name of group ``index`` for reports."""
        g = self.groups[index]
        return g.name or f"group {index + 1} ({type(g.bearing).__name__})"

    def property_sets(self, weight=None) -> dict:
        """Whole-plane backbones for the lower, nominal and upper property sets.

        Parameters
        ----------
        weight : float, optional
            Seismic weight W, > 0. Sliders carry their group's axial load; when
            W is given those loads are scaled by W/``self.weight`` (keeping each
            group's share). Elastomers do not depend on it. [kN]

        Returns
        -------
        dict
            {"lower": backbone, "nominal": backbone, "upper": backbone}.
        """
        scale = 1.0 if weight is None else validate.positive("weight", weight, "kN") / self.weight
        return {case: combine(g.backbone(case, self.factors, g.axial_load * scale) for g in self.groups)
                for case in CASES}

    def nominal(self):
        """Whole-plane backbone with nominal properties."""
        return self.property_sets()["nominal"]

    def force(self, displacement):
        """Nominal whole-plane force at a displacement [m]. [kN]"""
        return self.nominal().force(displacement)

    def effective_stiffness(self, displacement):
        """Nominal whole-plane secant stiffness at amplitude D > 0 [m]. [kN/m]"""
        return self.nominal().effective_stiffness(displacement)

    def effective_damping(self, displacement):
        """Nominal whole-plane effective damping at amplitude D > 0 [m]. [-]"""
        return self.nominal().effective_damping(displacement)

    def checks(self, displacement) -> list[Check]:
        """Checks of every group at a displacement, then the plane's restoring force.

        Parameters
        ----------
        displacement : float
            Design displacement of the bearings (use D_TM, with torsion, for
            the corner bearings), > 0. [m]

        Returns
        -------
        list of Check
            Bearing checks named "<group>: <check>", then "restoring force
            (isolation plane, <case> properties)" for the property set that
            gives the smallest value.
        """
        d = validate.positive("displacement", displacement, "m")
        out = []
        for i, g in enumerate(self.groups):
            for c in g.bearing.checks(g.axial_load, d, axial_load_max=g.axial_load_max,
                                      axial_load_min=g.axial_load_min, rotation=g.rotation):
                out.append(Check(f"{self.label(i)}: {c.name}", c.value, c.limit, c.passed, c.unit, c.source))
        plane = [(restoring_force_check(b, d, self.weight), case) for case, b in self.property_sets().items()]
        worst, case = min(plane, key=lambda item: item[0].value)
        out.append(Check(f"restoring force (isolation plane, {case} properties)", worst.value, worst.limit,
                         worst.passed, worst.unit, worst.source))
        return out

    def to_dict(self) -> dict:
        assert self.factors is not None  # None is replaced by PropertyFactors.unqualified() in __post_init__
        return {"groups": [g.to_dict() for g in self.groups], "factors": self.factors.to_dict(),
                "weight": self.weight, "is_sliding": self.is_sliding,
                "displacement_capacity": self.displacement_capacity}
