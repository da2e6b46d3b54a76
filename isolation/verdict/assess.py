"""The verdict on one isolation alternative, with a reason for every finding.

Each rule is a pure function over plain numbers that returns one
:class:`Reason`: the topic, a level (``"ok"``, ``"note"``, ``"condition"``,
``"against"``), one sentence quoting the number that decided it, the value,
the limit, its unit and the source of the limit. :func:`assess` runs every
rule over a :class:`Figures` record and combines them:

* any ``"against"``   -> ``"not recommended"``
* any ``"condition"`` -> ``"feasible with conditions"``
* otherwise           -> ``"feasible"``

The rules and :class:`Reason` live in :mod:`isolation.verdict.rules` and are
re-exported here. Each finding cites the clause of the study's code basis
(``Figures.basis``: ASCE/SEI 7-16 Chapter 17 or EN 1998-1:2004 Section 10,
see :mod:`isolation.verdict.sources`). Limits marked "common practice" have no
single source, whatever the basis; "from memory" means the clause was not
re-read when this was written. This is a screening aid for a feasibility
study; a licensed engineer decides.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass
from typing import Any, Mapping

from isolation.codes.registry import DEFAULT_BASIS
from isolation.verdict.rules import (
    Reason,
    base_shear_reduction,
    bearing_checks,
    design_shear,
    displacement_capacity,
    displacement_size,
    effective_damping,
    elf_applicability,
    floor_acceleration_reduction,
    isolated_period,
    moat_clearance,
    period_shift,
    storey_drift,
    uplift,
)
from isolation.verdict.site import near_fault, site_suitability, slenderness, spectral_benefit, wind
from isolation.verdict.yielding import superstructure_yielding

__all__ = [
    "FEASIBLE",
    "CONDITIONAL",
    "NOT_RECOMMENDED",
    "OUTCOMES",
    "LEVELS",
    "Reason",
    "Verdict",
    "Figures",
    "assess",
    "combine",
    "period_shift",
    "isolated_period",
    "displacement_capacity",
    "moat_clearance",
    "displacement_size",
    "base_shear_reduction",
    "design_shear",
    "floor_acceleration_reduction",
    "storey_drift",
    "uplift",
    "slenderness",
    "site_suitability",
    "spectral_benefit",
    "near_fault",
    "wind",
    "elf_applicability",
    "bearing_checks",
    "effective_damping",
    "superstructure_yielding",
]

FEASIBLE = "feasible"
CONDITIONAL = "feasible with conditions"
NOT_RECOMMENDED = "not recommended"
OUTCOMES = (FEASIBLE, CONDITIONAL, NOT_RECOMMENDED)
LEVELS = ("ok", "note", "condition", "against")


@dataclass(frozen=True)
class Verdict:
    """Outcome for one alternative and the reasons behind it."""

    alternative: str
    outcome: str
    reasons: tuple = ()

    def by_level(self, level: str) -> list[Reason]:
        """Reasons of one level (``"ok"``, ``"note"``, ``"condition"``, ``"against"``)."""
        return [r for r in self.reasons if r.level == level]

    @property
    def headline(self) -> str:
        """One line: alternative, outcome and the deciding reasons' topics."""
        deciding = self.by_level("against") or self.by_level("condition")
        topics = ", ".join(dict.fromkeys(r.topic for r in deciding))
        return f"{self.alternative}: {self.outcome}" + (f" ({topics})" if topics else "")

    def to_dict(self) -> dict:
        return {"alternative": self.alternative, "outcome": self.outcome,
                "reasons": [r.to_dict() for r in self.reasons]}

    @classmethod
    def from_dict(cls, mapping: Mapping[str, Any]) -> "Verdict":
        return cls(alternative=mapping["alternative"], outcome=mapping["outcome"],
                   reasons=tuple(Reason(**r) for r in mapping["reasons"]))


@dataclass(frozen=True)
class Figures:
    """The numbers a verdict is drawn from; None means "not available".

    Parameters
    ----------
    alternative : str
        Name of the alternative.
    fixed_base_period : float
        Fixed-base fundamental period T_fb. [s]
    isolated_period : float
        Effective isolated period at the upper bound (the shortest T_M). [s]
    total_displacement : float
        Total maximum displacement D_TM at the lower bound (the largest). [m]
    displacement_capacity : float or None
        Smallest displacement capacity of the bearings. [m]
    moat : float or None
        Clear gap provided around the building. [m]
    history_displacement : float or None
        Mean over the suite of the peak isolator displacement, lower bound. [m]
    base_shear_ratio : float or None
        Peak shear above the isolators in the response histories (upper
        bound, suite mean) over the fixed-base building's peak base shear;
        the fixed base is the code-designed yielding building unless the
        study asks for an elastic one. [-]
    design_shear_ratio : float or None
        Code design shear above the isolators V_s over the fixed-base design
        base shear (each with its own response reduction). [-]
    floor_acceleration_ratio : float or None
        Peak floor acceleration isolated (upper bound) over fixed base, suite
        means of the largest floor value. [-]
    drift_ratio : float or None
        Largest storey drift ratio of the isolated building (upper bound,
        suite mean). [-]
    drift_limit : float or None
        Allowed storey drift ratio; None for the basis' default (0.015 for
        ASCE 7, see :func:`isolation.verdict.rules.storey_drift`). [-]
    drift_source : str
        Where ``drift_limit`` comes from (default: the basis' clause for the
        default limit, see :func:`isolation.verdict.rules.storey_drift`).
    uplift_ratio : float or None
        Change of axial load at the edge bearings from overturning over their
        gravity load less vertical earthquake; >= 1 means net tension. [-]
    slenderness : float or None
        Height over plan width H/B. [-]
    site_class : str or None
        ASCE 7 site class (A-F) or Eurocode ground type (A-E).
    basis : str
        Code basis, ``"asce7"`` (ASCE/SEI 7-16) or ``"eurocode"`` (EN 1998-1):
        every rule cites the clauses of this basis.
    near_fault : bool
        Whether the study flags the site as near an active fault.
    spectral_ratio : float or None
        Sa(T_M, beta_M) / Sa(T_fb, 5 %) from the site spectrum. [-]
    wind_base_shear : float or None
        Design wind base shear at the isolation plane. [kN]
    characteristic_strength : float or None
        Characteristic strength Q_d of the whole isolation plane at the lower
        bound. [kN]
    elf_permitted : bool or None
        Whether the code's equivalent lateral force procedure is permitted.
    elf_reasons : tuple of str
        Why it is not permitted.
    failed_checks : tuple of str
        Names of failed bearing checks.
    effective_damping : float or None
        Largest effective damping ratio over the bounds. [-]
    units : str
        "SI" or "US": units of lengths and forces in the messages.
    ductility_isolated, residual_drift_isolated : float or None
        Largest storey ductility demand [-] and residual drift ratio [-] of
        the isolated superstructure (suite means, worse bound); None when elastic.
    ductility_fixed, residual_drift_fixed : float or None
        The same for the code-designed fixed-base building (quoted only). [-]
    fixed_base_period_source : str
        Where ``fixed_base_period`` comes from (stated by the period-ratio note).
    nominal_period : float or None
        Effective isolated period with nominal properties, the period practice quotes;
        the 2-5 s band is judged on it when given (else on ``isolated_period``). [s]
    fault_distance : float or None
        Distance to the nearest active fault; decides the near-fault rule when given. [km]
    wind_margin : float
        Factor on the wind shear in the wind rule (1.5 for sliders in a study run). [-]
    wind_strength_note : str
        What ``characteristic_strength`` stands for in the wind rule.
    storey_model : str
        What the storey drift, ductility and residual drift come from when not the planar histories
        (e.g. the plan model under component pairs); quoted in those findings.
    """

    alternative: str
    fixed_base_period: float
    isolated_period: float
    total_displacement: float
    displacement_capacity: float | None = None
    moat: float | None = None
    history_displacement: float | None = None
    base_shear_ratio: float | None = None
    design_shear_ratio: float | None = None
    floor_acceleration_ratio: float | None = None
    drift_ratio: float | None = None
    drift_limit: float | None = None
    drift_source: str = ""
    uplift_ratio: float | None = None
    slenderness: float | None = None
    site_class: str | None = None
    basis: str = DEFAULT_BASIS
    near_fault: bool = False
    spectral_ratio: float | None = None
    wind_base_shear: float | None = None
    characteristic_strength: float | None = None
    elf_permitted: bool | None = None
    elf_reasons: tuple = ()
    failed_checks: tuple = ()
    effective_damping: float | None = None
    units: str = "SI"
    ductility_isolated: float | None = None
    residual_drift_isolated: float | None = None
    ductility_fixed: float | None = None
    residual_drift_fixed: float | None = None
    fixed_base_period_source: str = ""
    nominal_period: float | None = None
    fault_distance: float | None = None
    wind_margin: float = 1.0
    wind_strength_note: str = "lower bound"
    storey_model: str = ""

    def to_dict(self) -> dict:
        data = asdict(self)
        data["elf_reasons"] = list(self.elf_reasons)
        data["failed_checks"] = list(self.failed_checks)
        return data


# --------------------------------------------------------------------------
def combine(reasons) -> str:
    """Outcome from reasons: any "against" -> not recommended; any "condition" ->
    feasible with conditions; else feasible."""
    levels = {r.level for r in reasons}
    if "against" in levels:
        return NOT_RECOMMENDED
    if "condition" in levels:
        return CONDITIONAL
    return FEASIBLE


def assess(figures: Figures) -> Verdict:
    """Run every rule over ``figures`` and return the :class:`Verdict`."""
    f = figures
    basis = f.basis
    found = [
        period_shift(f.isolated_period, f.fixed_base_period, basis=basis,
                     period_source=f.fixed_base_period_source),
        (isolated_period(f.nominal_period, basis=basis, bound="nominal") if f.nominal_period is not None
         else isolated_period(f.isolated_period, basis=basis, bound="upper")),
        displacement_capacity(f.total_displacement, f.displacement_capacity, f.history_displacement,
                              system=f.units, basis=basis),
        moat_clearance(f.total_displacement, f.moat, system=f.units, basis=basis),
        displacement_size(f.total_displacement, system=f.units),
        base_shear_reduction(f.base_shear_ratio) if f.base_shear_ratio is not None else None,
        design_shear(f.design_shear_ratio, basis=basis) if f.design_shear_ratio is not None else None,
        (floor_acceleration_reduction(f.floor_acceleration_ratio)
         if f.floor_acceleration_ratio is not None else None),
        (storey_drift(f.drift_ratio, f.drift_limit, f.drift_source, basis=basis, model=f.storey_model)
         if f.drift_ratio is not None else None),
        uplift(f.uplift_ratio, basis=basis) if f.uplift_ratio is not None else None,
        slenderness(f.slenderness) if f.slenderness is not None else None,
        site_suitability(f.site_class, basis),
        spectral_benefit(f.spectral_ratio) if f.spectral_ratio is not None else None,
        near_fault(f.near_fault, basis=basis, distance=f.fault_distance),
        wind(f.wind_base_shear, f.characteristic_strength, system=f.units, basis=basis,
             margin=f.wind_margin, strength_note=f.wind_strength_note),
        elf_applicability(f.elf_permitted, tuple(f.elf_reasons), basis=basis),
        bearing_checks(tuple(f.failed_checks)),
        effective_damping(f.effective_damping, basis=basis),
        superstructure_yielding(f.ductility_isolated, f.residual_drift_isolated, f.ductility_fixed,
                                f.residual_drift_fixed, basis=basis, model=f.storey_model),
    ]
    reasons = tuple(r for r in found if r is not None)
    return Verdict(alternative=f.alternative, outcome=combine(reasons), reasons=reasons)
