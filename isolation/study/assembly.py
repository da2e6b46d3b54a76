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

from isolation import GRAVITY
from isolation import verdict as _verdict
from isolation.study import Alternative, Study
from isolation.verdict.sources import drift_limit as _drift_limit

__all__ = ["site_spectrum", "isolation_system", "fixed_base_period", "superstructure", "check_study",
           "bearing_uplift_check", "overturning_inputs",
           "design_alternative", "verdict_figures", "history_isolator", "history_summary",
           "EUROCODE_MAX_PERIOD", "EUROCODE_SPECTRUM_NOTE"]

from isolation.codes.lateral_systems import FRAMES as _FRAMES
from isolation.codes.lateral_systems import LATERAL_SYSTEM_ROWS as _SYSTEM_ROWS

EUROCODE_MAX_PERIOD = 10.0
"""Longest period of a study's Eurocode site spectrum [s]: EN 1998-1 §3.2.2.2 ends at 4 s,
but the suite-mean check (up to 2 T_M) and the matched band (up to max(6 s, 1.5 T_M)) of
isolated buildings reach beyond it, so the T_C T_D/T^2 branch is continued to 10 s."""

EUROCODE_SPECTRUM_NOTE = ("EN 1998-1 elastic spectrum with a_g = gamma_I a_gR, gamma_I = building.importance "
                          "(§2.1(3), §4.2.5, from memory): beyond 4 s its T_C T_D/T^2 branch is extended to "
                          f"{EUROCODE_MAX_PERIOD:g} s (constant spectral displacement); the displacement "
                          "spectrum of EN 1998-1 Annex A is not implemented")
"""Assumption stated in the results of a study on a Eurocode (not tabulated) spectrum."""


def site_spectrum(study: Study):
    """The study's MCE_R (ASCE 7) or elastic (Eurocode) site spectrum object.

    A Eurocode spectrum answers up to :data:`EUROCODE_MAX_PERIOD` (its 1/T^2
    branch extended beyond 4 s, see :class:`isolation.site.spectra.EurocodeSpectrum`)
    so that motion matching reaches twice the isolated period.
    """
    from isolation.site.spectra import CodeSpectrum, EurocodeSpectrum, TabulatedSpectrum

    site = study.site
    rule = "asce7" if study.basis == "asce7" else "eurocode"
    if site.spectrum_periods:
        return TabulatedSpectrum(site.spectrum_periods, site.spectrum_values, rule=rule)
    if study.basis == "asce7":
        assert site.sms is not None and site.sm1 is not None and site.long_period is not None  # required by the parse
        return CodeSpectrum(site.sms, site.sm1, long_period=site.long_period)
    assert site.ag is not None and site.ground_type is not None and site.spectrum_type is not None  # as above
    return EurocodeSpectrum(site.ag, ground=site.ground_type, spectrum_type=site.spectrum_type,
                            importance=study.building.importance, max_period=EUROCODE_MAX_PERIOD)


def isolation_system(alternative: Alternative):
    """Bearing groups and property factors of one alternative."""
    from isolation.bearings import (
        BearingGroup,
        DoubleConcave,
        FrictionPendulum,
        HighDampingRubber,
        IsolationSystem,
        LeadRubber,
        PropertyBound,
        PropertyFactors,
        TripleFrictionPendulum,
    )

    kinds = {"friction_pendulum": FrictionPendulum, "double_concave": DoubleConcave,
             "triple_pendulum": TripleFrictionPendulum,
             "lead_rubber": LeadRubber, "high_damping_rubber": HighDampingRubber}
    groups = []
    for i, spec in enumerate(alternative.bearings):
        properties = {k: v for k, v in spec.properties.items()}
        bearing = kinds[spec.type](**properties)
        groups.append(BearingGroup(bearing, spec.count, spec.axial_load,
                                   name=f"group {i + 1} ({spec.type.replace('_', ' ')})"))
    bound = PropertyBound(alternative.lower_factor, alternative.upper_factor)
    return IsolationSystem(tuple(groups), PropertyFactors(stiffness=bound, strength=bound, friction=bound))


def fixed_base_period(study: Study) -> tuple[float, str]:
    """Fixed-base period [s] and where it came from (given or the code's estimate)."""
    building = study.building
    if building.fixed_base_period is not None:
        return building.fixed_base_period, "given in the study"
    frame = _FRAMES[building.lateral_system]
    if study.basis == "eurocode":
        from isolation.codes.eurocode import eurocode_approximate_period
        return (eurocode_approximate_period(building.height, frame),
                f"EN 1998-1:2004 Eq. 4.6 estimate T_1 = C_t H^(3/4), {_SYSTEM_ROWS[building.lateral_system][2]}")
    from isolation.codes.asce7_fixed_base import approximate_period
    return (approximate_period(building.height, frame),
            f"ASCE/SEI 7-16 Eq. 12.8-7 (T_a = C_t h^x), {_SYSTEM_ROWS[building.lateral_system][1]}")


def superstructure(study: Study):
    """Shear building above the isolators: floor masses [t], storey heights [m],
    storey stiffnesses falling linearly with height, scaled to the fixed-base period."""
    from isolation.dynamics.structure import ShearBuilding

    building = study.building
    masses = [w / GRAVITY for w in building.floor_weights]
    period, _ = fixed_base_period(study)
    return ShearBuilding.from_period(period, masses, building.storey_heights, profile="linear",
                                     damping=building.damping)


def design_alternative(study: Study, sets: dict, system, spectrum, t_fb: float, bounds=None):
    """Code report for all property sets; returns (report, quantities, elf_permitted, elf_reasons).

    ``bounds`` (a :class:`isolation.design.BoundsResult` of ``sets`` under ``spectrum`` with the
    basis's damping rule) skips the equivalent-linear iteration (array sweeps compute it for many
    alternatives at once)."""
    b = study.building
    if study.basis == "asce7":
        from isolation.codes.asce7 import ElfBuilding, asce7_elf

        elevations = tuple(np.cumsum(b.storey_heights).tolist())
        # Without a mapped S_1, S_M1 stands in (conservative for the ELF limit S_1 < 0.6 g where
        # F_v >= 1); for a tabulated spectrum, its S_M1 equivalent max(T Sa) over 1-5 s.
        s1 = study.site.s1
        if s1 is None:
            from isolation.codes.asce7_fixed_base import design_values
            s1 = study.site.sm1 if study.site.sm1 is not None else 1.5 * design_values(spectrum)[1]
        assert study.site.site_class is not None  # required for ASCE 7 by the parse
        elf = ElfBuilding(base_weight=b.base_weight, floor_weights=b.floor_weights, floor_elevations=elevations,
                          plan_length=b.plan_length, plan_width=b.plan_width,
                          response_modification=b.response_modification, eccentricity=b.eccentricity,
                          isolator_kind="sliding" if system.is_sliding else "other", fixed_base_period=t_fb,
                          frame=_FRAMES[b.lateral_system], importance=b.importance,
                          wind_base_shear=study.wind_base_shear or 0.0, s1=s1, site_class=study.site.site_class)
        report = asce7_elf(sets, elf, spectrum, bounds=bounds)
        names = {"displacement": "D_M", "total_displacement": "D_TM", "isolation_shear": "V_b",
                 "superstructure_shear": "V_s", "fixed_base_shear": "V_fb", "shear_ratio": "V_s/V_fb"}
        applicability = getattr(report, "applicability", None)
        if applicability is None:  # older report layout: ELF limits among the checks
            applicability = [c for c in report.checks if "response-history" in getattr(c, "consequence", "")]
        reasons = tuple(c.name for c in applicability if not c.passed)
        return report, {k: report.value(v) for k, v in names.items()}, report.elf_permitted, reasons
    from isolation.codes.eurocode import EurocodeBuilding, eurocode_simplified

    ec = EurocodeBuilding(weight=b.total_weight, superstructure_weight=sum(b.floor_weights),
                          superstructure_period=t_fb, plan_length=b.plan_length,
                          plan_width=b.plan_width, eccentricity=b.eccentricity, storeys=b.storeys,
                          behaviour_factor=b.response_modification)
    ec_report = eurocode_simplified(sets, ec, spectrum, bounds=bounds)
    names = {"displacement": "d_dc", "total_displacement": "d_d", "isolation_shear": "V",
             "superstructure_shear": "V_s", "fixed_base_shear": "F_b", "shear_ratio": "V_s/F_b"}
    quantities: dict[str, float | None] = {}
    for key, symbol in names.items():
        try:
            quantities[key] = ec_report.value(symbol)
        except KeyError:
            quantities[key] = None
    reasons = tuple(c.name for c in ec_report.applicability if not c.passed)
    return ec_report, quantities, ec_report.simplified_permitted, reasons


def history_isolator(backbone, result, system=None, case: str = "nominal"):
    """Isolator law the history engine integrates for one property case.

    A single group of friction pendulums whose friction depends on velocity
    (``friction_slow`` given) runs as the bearing itself, friction scaled by the
    case's factor, so the engine applies mu(v) (Constantinou, Mokha & Reinhorn
    1990). Otherwise the backbone itself when bilinear / multi-linear, else the
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
    from isolation.bearings import Bilinear, FrictionPendulum, MultiLinear
    from isolation.bearings.damping_rubber import equivalent_bilinear

    groups: tuple = getattr(system, "groups", ())
    if len(groups) == 1 and isinstance(groups[0].bearing, FrictionPendulum):
        bearing = groups[0].bearing
        if bearing.friction_slow != bearing.friction:
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

    shear, height, factor, vertical, source = overturning_inputs(study, spectrum, report)
    groups = [(spec.count, spec.axial_load) for spec in alternative.bearings]
    return bearing_uplift(shear, height, groups, study.building.plan_length, study.building.plan_width,
                          gravity_factor=factor, vertical_fraction=vertical, source=source)


def overturning_inputs(study, spectrum, report) -> tuple:
    """(shear [kN], height [m], gravity factor [-], vertical fraction [-], source) of the uplift check.

    The lateral force on the superstructure and the height of its resultant, and the load
    combination's factor on gravity and vertical earthquake (see :func:`bearing_uplift_check`).
    """
    from isolation.design.overturning import asce7_vertical_fraction, eurocode_vertical_fraction

    b = study.building
    heights = np.cumsum(b.storey_heights)
    weights = np.asarray(b.floor_weights, dtype=float)
    if study.basis == "asce7":
        forces = np.array([s.force for s in report.storey_forces])
        shear = report.value("V_st")
        height = float(np.dot(forces, heights) / forces.sum()) if forces.sum() > 0 else 2.0 / 3.0 * b.height
        sms = study.site.sms if study.site.sms is not None else _plateau(spectrum)
        factor, vertical, source = asce7_vertical_fraction(sms)
    else:
        shear = report.value("V") * weights.sum() / b.total_weight
        height = float(np.dot(weights, heights) / weights.sum())
        if study.site.ag is not None:
            ag, kind = study.site.ag * b.importance, study.site.spectrum_type or 1
        else:
            ag, kind = _plateau(spectrum) / 2.5, 1
        factor, vertical, source = eurocode_vertical_fraction(ag, kind)
    return shear, height, factor, vertical, source


def verdict_figures(study, spectrum, alternative, q, summary, report, permitted, reasons, checks, bounds, t_fb):
    """The verdict's numbers for one alternative (see :class:`isolation.verdict.Figures`)."""
    b = study.building
    upper = bounds["upper"]
    uplift = bearing_uplift_check(study, spectrum, alternative, report)
    ratio = float(spectrum.sa(upper.period, upper.damping)) / float(spectrum.sa(t_fb, 0.05))
    # Drift of the response histories: 2 % at MCE_R (ASCE/SEI 7-16 §17.6.4.4) or under the design
    # action (EN 1998-1 §4.4.3.2 by non-structural type and nu), both from memory.
    drift_limit, drift_source = _drift_limit(study.basis, b.nonstructural, b.importance)
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
    """Smallest friction_slow/friction over the sliding bearing groups; None without sliders."""
    ratios = []
    for spec in alternative.bearings:
        props = spec.properties
        if "friction" in props:
            slow = props.get("friction_slow")
            ratios.append(1.0 if slow is None else float(slow) / float(props["friction"]))
        elif "friction_1" in props:
            ratios.append(1.0)
    return min(ratios) if ratios else None


def _period_note(study, spectrum, t_fb: float, t_m: float) -> str:
    """Where T_fb comes from, and for the ASCE 7 estimate the ratio with C_u T_a as well."""
    b = study.building
    if b.fixed_base_period is not None:
        return "T_fb given in the study"
    if study.basis != "asce7":
        return "T_fb = C_t H^(3/4), EN 1998-1 Eq. 4.6"
    from isolation.codes.asce7_fixed_base import design_values, period_upper_limit_factor
    cu = period_upper_limit_factor(design_values(spectrum)[1])
    return (f"T_fb = T_a = C_t h^x, ASCE/SEI 7-16 Eq. 12.8-7; with the upper limit C_u T_a = {cu * t_fb:.2f} s "
            f"(C_u = {cu:.2f}, Table 12.8-1) the ratio is {t_m / (cu * t_fb):.2f}")


from isolation.study.checks import MAX_SUBSTEPS, check_study  # noqa: E402, F401 - re-exported; checks uses this module
