"""The isolation plane: bearing groups and the bound property sets of the whole plane.

An isolation system is a list of bearing groups (a bearing of any registered
type, how many, the gravity load on each). Its whole-plane behaviour is the sum
of the groups' backbones; lower-bound, nominal and upper-bound sets apply the
property modification factors of :mod:`isolation.bearings.factors` (on friction
for sliding types, on stiffness and strength for the others; the registry says
which a type is, :mod:`isolation.bearings.registry`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation import validate
from isolation.bearings.backbone import Bilinear, CombinedBackbone, MultiLinear, combine  # noqa: F401
from isolation.bearings.checks import Check, restoring_force_check
from isolation.bearings.factors import CASES, UNQUALIFIED_LOWER, UNQUALIFIED_UPPER, PropertyBound, PropertyFactors
from isolation.bearings.registry import entry_of, registered

__all__ = ["PropertyBound", "PropertyFactors", "BearingGroup", "IsolationSystem", "CombinedBackbone",
           "UNQUALIFIED_LOWER", "UNQUALIFIED_UPPER", "CASES", "combine"]


@dataclass(frozen=True)
class BearingGroup:
    """Identical bearings under the same gravity load.

    Parameters
    ----------
    bearing : object
        A bearing of a registered type (:mod:`isolation.bearings.registry`): FrictionPendulum,
        DoubleConcave, TripleFrictionPendulum, LeadRubber, HighDampingRubber, ...
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

    bearing: Any
    count: int
    axial_load: float
    name: str | None = None
    axial_load_max: float | None = None
    axial_load_min: float | None = None
    rotation: float = 0.0
    factors: PropertyFactors | None = None

    def __post_init__(self) -> None:
        entry_of(self.bearing)  # a ValueError naming the registered bearing classes when unknown
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
        """True for a bearing of a sliding type (friction pendulums)."""
        return entry_of(self.bearing).sliding

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


def __getattr__(name: str):
    """The bearing classes, once importable from here, answered from the registry (no import of them)."""
    for entry in registered():
        if entry.model.__name__ == name:
            return entry.model
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
