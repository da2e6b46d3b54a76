"""Model objects and code reports built from a validated study.

The building blocks of :func:`isolation.study.runner.run_study` (re-exported from
:mod:`isolation.study.runner`):

* :func:`site_spectrum` - the site spectrum of the code basis (ASCE/SEI 7-16
  MCE_R, EN 1998-1 elastic with its 1/T^2 branch extended to
  :data:`EUROCODE_MAX_PERIOD`, or a tabulated spectrum);
* :func:`isolation_system` - bearing groups and property factors;
* :func:`fixed_base_period` and :func:`superstructure` - the fixed-base
  period and the shear building above the isolators;
* :func:`check_study` - checks of a valid study against its own models;
* :func:`history_isolator` - the isolator law the history engine runs for one property set;
* ``design_alternative`` - the code's single-mode report for all property sets, and
  ``verdict_figures`` - the numbers of :class:`isolation.verdict.Figures`.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

import numpy as np

from isolation import codes as _codes
from isolation import verdict as _verdict
from isolation.codes.eurocode_basis import EUROCODE_MAX_PERIOD, EUROCODE_SPECTRUM_NOTE
from isolation.study.blocks import (  # noqa: F401 - re-exported
    design_alternative,
    fixed_base_period,
    isolation_system,
    site_spectrum,
    superstructure,
)
from isolation.study.checks import MAX_SUBSTEPS, check_study  # noqa: F401 - re-exported

__all__ = ["site_spectrum", "isolation_system", "fixed_base_period", "superstructure", "check_study",
           "bearing_uplift_check", "overturning_inputs",
           "design_alternative", "verdict_figures", "history_isolator", "history_summary",
           "EUROCODE_MAX_PERIOD", "EUROCODE_SPECTRUM_NOTE"]


def history_isolator(backbone, result, system=None, case: str = "nominal"):
    """Isolator law the history engine integrates for one property case.

    A single group of a sliding type whose own law carries more than its
    backbone (the registry's ``own_history_law``: friction pendulums whose
    friction depends on velocity, ``friction_slow`` given) runs as the bearing
    itself, friction scaled by the case's factor, so the engine applies mu(v)
    (Constantinou, Mokha & Reinhorn 1990). Otherwise the backbone itself when bilinear / multi-linear, else the
    bilinear with the same K_eff and damping at the design displacement.

    Parameters
    ----------
    backbone : backbone
        Whole-plane backbone of the case (from ``IsolationSystem.property_sets``).
    result : isolation.design.EquivalentLinearResult or None
        The case's equivalent-linear result (D [m], K_eff [kN/m], beta_eff [-]); used
        only for backbones that are neither bilinear nor multi-linear.
    system : IsolationSystem, optional
        The plane, to run a velocity-dependent friction pendulum as itself.
    case : str
        ``"lower"``, ``"nominal"`` or ``"upper"``.

    """
    from isolation.bearings import Bilinear, MultiLinear
    from isolation.bearings.damping_rubber import equivalent_bilinear
    from isolation.bearings.registry import type_of

    groups: tuple = getattr(system, "groups", ())
    if len(groups) == 1:
        bearing = groups[0].bearing
        entry = type_of(bearing)
        if entry is not None and entry.sliding and entry.own_history_law(bearing):
            return bearing.with_friction_factor(system.factors.friction.factor(case))
    if isinstance(backbone, (Bilinear, MultiLinear)):
        return backbone
    return equivalent_bilinear(result.stiffness, result.damping, result.displacement, 10.0)


def history_summary(stats: dict, fixed: dict, torsion: float) -> dict:
    """Key response-history numbers: suite means of peaks (ASCE/SEI 7-16 §17.6.3.4 allows the
    mean of 7 or more records, from memory).

    Parameters
    ----------
    stats : dict
        ``{"lower": HistoryResult.statistics(), "upper": ...}`` of the isolated building.
    fixed : dict
        ``HistoryResult.statistics()`` of the same superstructure on a fixed base.
    torsion : float
        D_TM / D_M of the code report, applied to the lower-bound displacement. [-]

    Returns
    -------
    dict
        Displacements [m], floor accelerations [g], shears [kN], drift ratios [-] and the ratios
        isolated / fixed base [-].
    """
    def largest(case: str, name: str) -> float:
        return float(np.max(stats[case][name]["mean"]))

    fixed_acc = float(np.max(fixed["floor_acceleration"]["mean"]))
    fixed_shear = float(np.max(fixed["base_shear"]["mean"]))
    summary = {
        "isolator_displacement_lower": largest("lower", "isolator_displacement"),
        "isolator_displacement_upper": largest("upper", "isolator_displacement"),
        "isolator_displacement_max_record": float(np.max(stats["lower"]["isolator_displacement"]["max"])),
        "torsion_factor": torsion,
        "floor_acceleration_fixed": fixed_acc,
        "floor_acceleration_lower": largest("lower", "floor_acceleration"),
        "floor_acceleration_upper": largest("upper", "floor_acceleration"),
        "superstructure_shear_fixed": fixed_shear,
        "superstructure_shear_upper": float(stats["upper"]["storey_shear"]["mean"][0]),
        "isolation_shear_upper": largest("upper", "reaction"),  # isolator + damper force
        "drift_ratio_fixed": float(np.max(fixed["drift_ratio"]["mean"])),
        "drift_ratio_isolated": max(largest("lower", "drift_ratio"), largest("upper", "drift_ratio")),
        "residual_displacement_lower": largest("lower", "residual_displacement"),
    }
    summary["floor_acceleration_ratio"] = max(summary["floor_acceleration_lower"],
                                              summary["floor_acceleration_upper"]) / fixed_acc
    summary["superstructure_shear_ratio"] = summary["superstructure_shear_upper"] / fixed_shear
    summary["isolator_displacement_with_torsion"] = summary["isolator_displacement_lower"] * torsion
    return summary


_PLATEAUS: dict = {}  # spectrum -> plateau: sweeps judge thousands of alternatives on one site


def _plateau(spectrum) -> float:
    try:
        return _PLATEAUS[spectrum]
    except TypeError:  # an unhashable spectrum object: compute it each time
        return _plateau_of(spectrum)
    except KeyError:
        if len(_PLATEAUS) > 64:
            _PLATEAUS.clear()
        value = _PLATEAUS[spectrum] = _plateau_of(spectrum)
        return value


def _plateau_of(spectrum) -> float:
    periods = np.linspace(0.1, 0.6, 26)
    low, high = spectrum.period_range
    periods = periods[(periods >= low) & (periods <= high)]
    return float(np.max(spectrum.sa(periods))) if periods.size else float(spectrum.sa(max(low, 0.2)))


def bearing_uplift_check(study, spectrum, alternative, report):
    """Per-bearing uplift of one alternative (:func:`isolation.design.overturning.bearing_uplift`).

    ASCE 7: V_st of the force-governing set at the height of the resultant of the code's
    storey forces (§17.5.5); Eurocode: the superstructure's share V W_s/W at the height of
    its mass centre (rigid-body translation above the isolators, derived).
    """
    from isolation.design.overturning import bearing_uplift

    b = study.building
    shear, height, factor, vertical, source = _codes.get(study.basis).uplift_action(study, report, spectrum, _plateau)
    groups = [(spec.count, spec.axial_load) for spec in alternative.bearings]
    return bearing_uplift(shear, height, groups, b.plan_length, b.plan_width, gravity_factor=factor,
                          vertical_fraction=vertical, source=source)


def overturning_inputs(study, spectrum, report) -> tuple:
    """(shear [kN], height [m], gravity factor [-], vertical fraction [-], source) of the uplift check.

    The lateral force on the superstructure and the height of its resultant, and the load
    combination's factor on gravity and vertical earthquake, from the code basis
    (see :func:`bearing_uplift_check`).
    """
    return _codes.get(study.basis).uplift_action(study, report, spectrum, _plateau)


def verdict_figures(study, spectrum, alternative, q, summary, report, permitted, reasons, checks, bounds, t_fb):
    """The verdict's numbers for one alternative (see :class:`isolation.verdict.Figures`)."""
    b = study.building
    upper = bounds["upper"]
    uplift = bearing_uplift_check(study, spectrum, alternative, report)
    ratio = float(spectrum.sa(upper.period, upper.damping)) / float(spectrum.sa(t_fb, 0.05))
    # Drift of the response histories: 2 % at MCE_R (ASCE/SEI 7-16 §17.6.4.4) or under the design
    # action (EN 1998-1 §4.4.3.2 by non-structural type and nu), both from memory.
    drift_limit, drift_source = _codes.get(study.basis).history_drift_limit(b.nonstructural, b.importance)
    period_source = _period_note(study, spectrum, t_fb, upper.period)
    wind_margin, wind_note, strength = 1.0, "Q_d, lower bound", q["characteristic_strength"]
    slow = _slow_friction_ratio(alternative)
    if slow is not None and strength is not None:
        from isolation.verdict.site import SLIDER_WIND_MARGIN
        wind_margin, strength = SLIDER_WIND_MARGIN, strength * slow
        wind_note = (f"slow-velocity friction, lower bound: {slow:.2f} x the fast-friction Q_d; margin "
                     f"{SLIDER_WIND_MARGIN:g} is common practice")
    return _verdict.Figures(
        alternative=alternative.name, fixed_base_period=t_fb, isolated_period=upper.period,
        total_displacement=q["total_displacement"], displacement_capacity=q["displacement_capacity"],
        moat=alternative.moat, history_displacement=summary["isolator_displacement_with_torsion"],
        base_shear_ratio=summary["superstructure_shear_ratio"], design_shear_ratio=q["shear_ratio"],
        floor_acceleration_ratio=summary["floor_acceleration_ratio"],
        drift_ratio=summary["drift_ratio_isolated"], drift_limit=drift_limit, drift_source=drift_source,
        uplift_ratio=uplift.ratio, slenderness=b.height / b.plan_width,
        site_class=study.site.site_class or study.site.ground_type, basis=study.basis,
        near_fault=study.site.near_fault, spectral_ratio=ratio, wind_base_shear=study.wind_base_shear,
        characteristic_strength=strength, elf_permitted=permitted,
        elf_reasons=tuple(reasons), failed_checks=tuple(c.name for c in checks if not c.passed),
        effective_damping=max(r.damping for r in bounds.values()), units=study.units,
        ductility_isolated=summary.get("ductility_isolated"),
        residual_drift_isolated=summary.get("residual_drift_isolated"),
        ductility_fixed=summary.get("ductility_fixed"), residual_drift_fixed=summary.get("residual_drift_fixed"),
        fixed_base_period_source=period_source,
        nominal_period=bounds["nominal"].period if "nominal" in bounds else None,
        fault_distance=study.site.fault_distance, wind_margin=wind_margin, wind_strength_note=wind_note)


def _slow_friction_ratio(alternative) -> float | None:
    """Smallest friction at rest over design friction among the sliding bearing groups (the registry's
    ``slow_friction_ratio`` of each); None without sliders."""
    from isolation.bearings.registry import bearing_type

    ratios = []
    for spec in alternative.bearings:
        entry = bearing_type(spec.type)
        if entry.sliding:
            ratios.append(float(entry.slow_friction_ratio(entry.create(spec.properties))))
    return min(ratios) if ratios else None


def _period_note(study, spectrum, t_fb: float, t_m: float) -> str:
    """Where T_fb comes from, and for the ASCE 7 estimate the ratio with C_u T_a as well."""
    b = study.building
    if b.fixed_base_period is not None:
        return "T_fb given in the study"
    return _codes.get(study.basis).period_note(spectrum, t_fb, t_m)

