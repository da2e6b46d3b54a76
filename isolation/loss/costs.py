"""Costs of isolation, superstructure savings and the owner's economics (NPV, payback).

Money is in the study's currency (a label only; nothing is converted). Every
default below is an INVENTED DEMO VALUE chosen to give plausible orders of
magnitude for a mid-rise building; none comes from a cost database. A cost
consultant must confirm every cost before a decision rests on it.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field

__all__ = ["CostInputs", "DEMO_BEARING_COST", "SIZE_CLASS_LIMITS", "bearing_size_class", "isolation_cost",
           "superstructure_saving", "annuity_factor", "net_present_value", "payback_years"]

SIZE_CLASS_LIMITS = (0.4, 0.7)
"""Bearing size classes by displacement capacity [m]: small <= 0.4 < medium <= 0.7 < large
(invented demo class limits)."""

DEMO_BEARING_COST = {
    "friction_pendulum": (18000.0, 26000.0, 38000.0),
    "double_concave": (20000.0, 28000.0, 40000.0),
    "lead_rubber": (14000.0, 22000.0, 34000.0),
    "high_damping_rubber": (12000.0, 19000.0, 30000.0),
    "other": (20000.0, 30000.0, 42000.0),
}
"""Cost per bearing [currency] for the small, medium and large size classes: INVENTED DEMO VALUES.
``"other"`` prices any bearing type without an entry of its own."""


@dataclass(frozen=True)
class CostInputs:
    """Cost inputs of a loss study, internal units (m, m2, year); money in ``currency``.

    Parameters
    ----------
    currency : str
        Label printed with every amount. [-]
    storey_areas : tuple of float or None
        Floor area of each storey, level 1 first; None: plan length x width
        for every storey. [m2]
    replacement_cost_per_area : float
        Replacement cost of the building per floor area. [currency/m2]
    contents_value : float or None
        Value of the contents; None: ``contents_fraction`` of the replacement cost. [currency]
    contents_fraction : float
        Contents value over replacement cost when ``contents_value`` is None. [-]
    lost_use_per_day : float
        Cost of one day without the use of the building. [currency/day]
    bearing_cost : dict of str -> (small, medium, large)
        Cost per bearing by type and size class (:data:`SIZE_CLASS_LIMITS`); the
        entry ``"other"`` prices types without their own. [currency]
    isolation_plane_per_area : float
        Isolation-plane slab/diaphragm and pedestals per plan area. [currency/m2]
    moat_per_length : float
        Moat wall and cover per metre of building perimeter. [currency/m]
    utilities : float
        Flexible utility connections across the isolation plane, lump sum. [currency]
    design_and_testing : float
        Isolation design, peer review and prototype testing, lump sum. [currency]
    superstructure_saving : float
        Fraction of the structural cost saved per unit reduction of the design
        base shear (saving = factor x structural cost x (1 - V_s/V_fixed)). [-]
    design_life : float
        Years over which the benefit counts, > 0. [year]
    discount_rate : float
        Real discount rate per year, in [0, 0.3]. [1/year]
    defaults : tuple of str
        Names of the fields left at their invented demo defaults. [-]
    """

    currency: str = "USD"
    storey_areas: tuple | None = None
    replacement_cost_per_area: float = 3500.0
    contents_value: float | None = None
    contents_fraction: float = 0.5
    lost_use_per_day: float = 20000.0
    bearing_cost: dict = field(default_factory=lambda: dict(DEMO_BEARING_COST))
    isolation_plane_per_area: float = 350.0
    moat_per_length: float = 2500.0
    utilities: float = 150000.0
    design_and_testing: float = 300000.0
    superstructure_saving: float = 0.25
    design_life: float = 50.0
    discount_rate: float = 0.03
    defaults: tuple = ()

    def __post_init__(self):
        for name in ("replacement_cost_per_area", "lost_use_per_day", "isolation_plane_per_area",
                     "moat_per_length", "utilities", "design_and_testing", "contents_fraction"):
            _non_negative(name, getattr(self, name))
        if self.contents_value is not None:
            _non_negative("contents_value", self.contents_value)
        if not 0.0 <= float(self.superstructure_saving) <= 1.0:
            raise ValueError(f"superstructure_saving = {self.superstructure_saving!r} is not allowed: "
                             "must be in [0, 1] [-]")
        if not (float(self.design_life) > 0.0 and math.isfinite(float(self.design_life))):
            raise ValueError(f"design_life = {self.design_life!r} is not allowed: must be > 0 [year]")
        if not 0.0 <= float(self.discount_rate) <= 0.3:
            raise ValueError(f"discount_rate = {self.discount_rate!r} is not allowed: must be in [0, 0.3] "
                             "[1/year]")
        if self.storey_areas is not None:
            for i, area in enumerate(self.storey_areas):
                if not (float(area) > 0.0 and math.isfinite(float(area))):
                    raise ValueError(f"storey_areas[{i}] = {area!r} is not allowed: must be > 0 [m2]")
        for kind, costs in self.bearing_cost.items():
            if len(costs) != 3:
                raise ValueError(f"bearing_cost[{kind!r}] = {costs!r} is not allowed: must be 3 costs "
                                 "(small, medium, large) [currency]")
            for value in costs:
                _non_negative(f"bearing_cost[{kind!r}]", value)

    def areas(self, storeys: int, plan_area: float) -> tuple:
        """Storey floor areas [m2]: the given ones or the plan area [m2] for each of ``storeys``."""
        if self.storey_areas is None:
            return (float(plan_area),) * int(storeys)
        if len(self.storey_areas) != storeys:
            raise ValueError(f"cost.storey_areas has {len(self.storey_areas)} values, which is not allowed: "
                             f"must give one per storey ({storeys})")
        return tuple(float(a) for a in self.storey_areas)

    def replacement_cost(self, total_area: float) -> float:
        """Replacement cost for a floor area [m2]. [currency]"""
        return self.replacement_cost_per_area * float(total_area)

    def contents(self, replacement: float) -> float:
        """Contents value [currency] given the replacement cost [currency]."""
        return self.contents_fraction * replacement if self.contents_value is None else float(self.contents_value)

    def to_dict(self) -> dict:
        out = {k: getattr(self, k) for k in self.__dataclass_fields__}
        out["bearing_cost"] = {k: list(v) for k, v in self.bearing_cost.items()}
        out["storey_areas"] = None if self.storey_areas is None else list(self.storey_areas)
        out["defaults"] = list(self.defaults)
        return out


def _non_negative(name, value):
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) or value < 0:
        raise ValueError(f"{name} = {value!r} is not allowed: must be a finite number >= 0")


def bearing_size_class(displacement_capacity: float | None) -> int:
    """0 small, 1 medium, 2 large from the displacement capacity [m] (None: medium)."""
    if displacement_capacity is None:
        return 1
    d = float(displacement_capacity)
    return 0 if d <= SIZE_CLASS_LIMITS[0] else (1 if d <= SIZE_CLASS_LIMITS[1] else 2)


def isolation_cost(groups, costs: CostInputs, plan_area: float, perimeter: float) -> dict:
    """Itemised cost of an isolation system.

    Parameters
    ----------
    groups : iterable of (type, count, displacement capacity or None)
        Bearing groups: type name [-], number [-], capacity [m].
    costs : CostInputs
    plan_area : float
        Footprint of the isolation plane. [m2]
    perimeter : float
        Building perimeter along the moat. [m]

    Returns
    -------
    dict
        ``bearings``, ``isolation_plane``, ``moat``, ``utilities``,
        ``design_and_testing`` and ``total``. [currency]
    """
    bearings = 0.0
    for kind, count, capacity in groups:
        entry = costs.bearing_cost.get(kind, costs.bearing_cost.get("other"))
        if entry is None:
            known = ", ".join(repr(k) for k in costs.bearing_cost)
            raise ValueError(f"cost.bearing_cost has no entry for bearing type {kind!r} and no 'other' entry: "
                             f"give one (known: {known})")
        bearings += int(count) * entry[bearing_size_class(capacity)]
    items = {"bearings": bearings, "isolation_plane": costs.isolation_plane_per_area * plan_area,
             "moat": costs.moat_per_length * perimeter, "utilities": costs.utilities,
             "design_and_testing": costs.design_and_testing}
    items["total"] = sum(items.values())
    return items


def superstructure_saving(costs: CostInputs, structural_cost: float, shear_ratio: float) -> float:
    """Saving in the superstructure from a lower design shear. [currency]

    Parameters
    ----------
    costs : CostInputs
    structural_cost : float
        Cost of the structure of the fixed-base building. [currency]
    shear_ratio : float
        Isolated superstructure design shear over the fixed-base design shear, V_s/V_fixed. [-]
    """
    reduction = min(max(1.0 - float(shear_ratio), 0.0), 1.0)
    return costs.superstructure_saving * float(structural_cost) * reduction


def annuity_factor(rate: float, years: float) -> float:
    """Present value of 1 per year for ``years`` [year] at discount ``rate`` [1/year]. [year]"""
    r, n = float(rate), float(years)
    if r == 0.0:
        return n
    return (1.0 - (1.0 + r)**(-n)) / r


def net_present_value(annual_benefit: float, premium: float, rate: float, years: float) -> float:
    """NPV = annual_benefit x annuity factor - premium. [currency]

    Parameters
    ----------
    annual_benefit : float
        Expected yearly saving (loss and lost use avoided). [currency/year]
    premium : float
        Net cost of isolation paid at the start. [currency]
    rate : float
        Discount rate. [1/year]
    years : float
        Design life. [year]
    """
    return float(annual_benefit) * annuity_factor(rate, years) - float(premium)


def payback_years(annual_benefit: float, premium: float) -> float:
    """Simple (undiscounted) payback time premium / benefit [year]; inf when nothing is gained."""
    if premium <= 0.0:
        return 0.0
    if annual_benefit <= 0.0:
        return math.inf
    return float(premium) / float(annual_benefit)
