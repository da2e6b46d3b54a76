"""The comparison buildings of a study: code-designed yielding fixed base, yielding isolated superstructure.

:func:`fixed_base_comparison` designs the building on a fixed base by the
code's equivalent lateral force method (:mod:`isolation.performance.strength`), gives
its shear-building model the storey yield shears of that design (times the
system overstrength) and checks the design drifts against the code.
:func:`isolated_superstructure` does the same for the superstructure above the
isolators from the alternative's V_s. :func:`response_indicators` and
:func:`comparison_summary` turn response histories into the numbers of the
report: storey ductility, residual drift, peak storey shear over strength and
damage states against published medians (:mod:`isolation.performance.damage`).

With ``building.fixed_base_model = "elastic"`` both buildings stay elastic.
Scope: feasibility, not construction design.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation.performance.damage import damage_state, damage_thresholds
from isolation.performance.strength import (
    DriftCheck,
    StoreyDesign,
    SystemFactors,
    code_drift_check,
    fixed_base_design,
    isolated_design,
    system_factors,
)
from isolation.plain import plain

__all__ = ["FixedBaseComparison", "fixed_base_comparison", "isolated_superstructure", "with_strengths",
           "response_indicators", "comparison_summary", "thresholds_of"]

def _frame(lateral_system: str) -> str:
    """Frame type of :data:`isolation.codes.asce7_fixed_base.FRAME_TYPES` for a study's lateral system."""
    from isolation.codes.lateral_systems import FRAMES

    return FRAMES.get(lateral_system, "other")


@dataclass(frozen=True)
class FixedBaseComparison:
    """The fixed-base comparison building of a study.

    Attributes: ``factors`` (overstrength, C_d), ``design`` (storey design
    shears and yield shears), ``drift`` (code drift check), ``building`` (the
    shear building analysed: yielding unless the study asks for elastic),
    ``elastic`` (the same building without yield), ``yielding`` (bool).
    """

    factors: SystemFactors
    design: StoreyDesign
    drift: DriftCheck
    building: Any
    elastic: Any
    yielding: bool

    def to_dict(self) -> dict:
        notes = getattr(self.building, "p_delta_notes", None)
        return {"factors": self.factors.to_dict(), "design": self.design.to_dict(), "drift_check": self.drift.to_dict(),
                "yielding": self.yielding, "model": plain(self.building),
                "p_delta_notes": list(notes()) if callable(notes) else []}


def with_strengths(building, yield_shears, *, hardening: float = 0.03, p_delta: bool = True,
                   hysteresis: str = "bilinear"):
    """The shear building ``building`` with storey yield shears [kN], post-yield ratio [-], P-delta
    and storey law ("bilinear" or "clough", see :class:`isolation.dynamics.structure.ShearBuilding`)."""
    return building.with_strengths(tuple(float(v) for v in yield_shears), hardening=float(hardening),
                                   p_delta=bool(p_delta), hysteresis=hysteresis)


def _factors(study) -> SystemFactors:
    b = study.building
    return system_factors(b.lateral_system, b.response_modification, study.basis,
                          overstrength=b.overstrength, deflection_amplification=b.deflection_amplification)


def fixed_base_comparison(study, spectrum, building, period: float) -> FixedBaseComparison:
    """Code design, storey strengths and drift check of the building on a fixed base.

    Parameters
    ----------
    study : Study
        The validated study. [-]
    spectrum : spectrum object
        The study's site spectrum (:func:`isolation.study.assembly.site_spectrum`). [g]
    building : ShearBuilding
        The elastic fixed-base model (:func:`isolation.study.assembly.superstructure`). [-]
    period : float
        Fixed-base period. [s]
    """
    b = study.building
    factors = _factors(study)
    s1 = study.site.s1 or 0.0
    design = fixed_base_design(spectrum, b.floor_weights, b.storey_heights, b.response_modification, factors,
                               basis=study.basis, period=period, importance=b.importance,
                               frame=_frame(b.lateral_system), s1=s1)
    if b.storey_strengths:
        design = design.with_yield_shears(b.storey_strengths)
    drift = code_drift_check(building, design, factors, basis=study.basis, importance=b.importance)
    yielding = b.fixed_base_model == "yielding"
    model = with_strengths(building, design.yield_shears, hardening=b.hardening, p_delta=b.p_delta,
                           hysteresis=b.storey_hysteresis) if yielding else building
    return FixedBaseComparison(factors, design, drift, model, building, yielding)


def isolated_superstructure(study, report, building):
    """(ShearBuilding above the isolators, StoreyDesign) for one alternative's code report.

    The storey yield shears are the code's V_s over the storeys times the
    fixed-base system's overstrength, or ``building.isolated_storey_strengths``
    when given; the building stays elastic with ``fixed_base_model = "elastic"``.
    """
    b = study.building
    design = isolated_design(report, b.floor_weights, _factors(study), basis=study.basis,
                             total_weight=b.total_weight)
    if b.isolated_storey_strengths:
        design = design.with_yield_shears(b.isolated_storey_strengths)
    if b.fixed_base_model != "yielding":
        return building, design
    return with_strengths(building, design.yield_shears, hardening=b.hardening, p_delta=b.p_delta,
                          hysteresis=b.storey_hysteresis), design


def _mean_peak(values) -> list | None:
    if values is None:
        return None
    values = np.abs(np.asarray(values, dtype=float))
    if not np.any(np.isfinite(values)):
        return None  # elastic storeys: no ductility
    return np.mean(values, axis=0).tolist()


def response_indicators(result, strengths, thresholds) -> dict:
    """Suite means per storey of one history case, with damage states against published medians.

    Parameters
    ----------
    result : HistoryResult
        One case (fixed base or an isolated bound). [-]
    strengths : sequence of float or None
        Storey yield shears [kN] (None for an elastic building: no ratio).
    thresholds : DamageThresholds
        Damage-state medians (:func:`isolation.performance.damage.damage_thresholds`). [-]

    Returns
    -------
    dict
        ``drift_ratio``, ``residual_drift``, ``ductility``, ``floor_acceleration``
        [g], ``storey_shear`` [kN], ``shear_over_strength`` (per storey, suite means;
        None where not available), the largest of each, and ``damage``:
        structural, non-structural drift and acceleration states of the largest values.
    """
    peaks = result.peaks()
    out = {
        "drift_ratio": np.mean(peaks["drift_ratio"], axis=0).tolist(),
        "floor_acceleration": np.mean(peaks["floor_acceleration"], axis=0).tolist(),
        "storey_shear": np.mean(peaks["storey_shear"], axis=0).tolist(),
        "residual_drift": _mean_peak(getattr(result, "residual_drift", None)),
        "ductility": _mean_peak(getattr(result, "ductility", None)),
    }
    out["shear_over_strength"] = None if strengths is None else (
        np.mean(peaks["storey_shear"] / np.asarray(strengths, dtype=float), axis=0).tolist())
    for name in ("drift_ratio", "floor_acceleration", "storey_shear", "residual_drift", "ductility",
                 "shear_over_strength"):
        out[f"{name}_max"] = None if out[name] is None else float(np.max(out[name]))
    out["damage"] = {
        "structural": damage_state(out["drift_ratio_max"], thresholds.structural_drift),
        "nonstructural_drift": damage_state(out["drift_ratio_max"], thresholds.nonstructural_drift),
        "nonstructural_acceleration": damage_state(out["floor_acceleration_max"], thresholds.floor_acceleration),
    }
    return out


def thresholds_of(study):
    """Damage-state medians for the study's building type and design level."""
    b = study.building
    return damage_thresholds(b.lateral_system, b.storeys, b.design_level)


def comparison_summary(indicators: dict, fixed_design: StoreyDesign, isolated: StoreyDesign) -> dict:
    """Headline numbers of the comparison: isolated (worse bound) against the fixed base.

    Parameters
    ----------
    indicators : dict
        Case -> :func:`response_indicators` for "fixed", "fixed_elastic", "lower", "upper". [-]
    fixed_design, isolated : StoreyDesign
        Design storey shears of the fixed-base building and of the isolated superstructure. [kN]
    """
    def worst(name):
        values = [indicators[c][name] for c in ("lower", "upper") if indicators[c][name] is not None]
        return max(values) if values else None

    fixed, elastic = indicators["fixed"], indicators["fixed_elastic"]
    out = {
        "ductility_fixed": fixed["ductility_max"], "ductility_isolated": worst("ductility_max"),
        "residual_drift_fixed": fixed["residual_drift_max"], "residual_drift_isolated": worst("residual_drift_max"),
        "shear_over_strength_fixed": fixed["shear_over_strength_max"],
        "shear_over_strength_isolated": worst("shear_over_strength_max"),
        "design_shear_fixed": fixed_design.base_shear, "design_shear_isolated": isolated.base_shear,
        "strength_fixed": fixed_design.yield_shears[0], "strength_isolated": isolated.yield_shears[0],
        "floor_acceleration_fixed_elastic": elastic["floor_acceleration_max"],
        "drift_ratio_fixed_elastic": elastic["drift_ratio_max"],
        "superstructure_shear_fixed_elastic": elastic["storey_shear"][0],
    }
    iso_acc = worst("floor_acceleration_max")
    out["floor_acceleration_ratio_elastic"] = iso_acc / elastic["floor_acceleration_max"]
    out["superstructure_shear_ratio_elastic"] = indicators["upper"]["storey_shear"][0] / elastic["storey_shear"][0]
    return out

