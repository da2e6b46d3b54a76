"""The explorer's calculation: settings in, the code's single-mode answer out.

:class:`ExplorerSettings` (every control's value, internal units),
:func:`explore` (settings to an :class:`ExplorerAnswer`) and :func:`update`
(answer, HTML summary and static figure).  The settings are written as a
study (:mod:`isolation.app.explorer.study_file`) and answered through
:func:`isolation.study.parse_study` and
:func:`isolation.study.assembly.design_alternative`, as ``python -m isolation
run`` does.  :mod:`isolation.app.explorer.answers` re-exports everything here
with the tables, figures and the live page; the live page
(:mod:`isolation.app.explorer.live`) calls these functions, never the reverse.

Scope: concept-stage screening, not design; a licensed engineer checks every
number against the local code.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass, field
from typing import Any, Mapping

import numpy as np
from matplotlib.figure import Figure

from isolation import validate
from isolation.app.explorer.controls import _CONTROL, BASES, BEARING_TYPES, CHOICES, unit_name
from isolation.app.explorer.figures import explorer_figure
from isolation.app.explorer.tables import summary_html
from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS

__all__ = ["CASES", "SCOPE", "ExplorerSettings", "ExplorerAnswer", "explore", "update"]

CASES = ("lower", "nominal", "upper")
"""Property sets, in the order shown."""

SCOPE = ("Screening for a feasibility study, not construction design. Single-mode equivalent-linear "
         "answer of the chosen code basis; all bearings alike and equally loaded; weight shared equally by "
         "the base floor and the storeys. Verify every number against the local code with a licensed "
         "structural engineer.")
"""Scope and cautions shown on the explorer page."""


@dataclass(frozen=True)
class ExplorerSettings:
    """Everything the explorer's controls set (internal units).

    Parameters
    ----------
    bearing_type : str
        One of :data:`BEARING_TYPES`.
    weight : float
        Seismic weight on the isolation plane, > 0. [kN]
    bearing_count : int
        Number of identical bearings, >= 1. [-]
    grid_along : int
        Bearings along the plan length, a divisor of ``bearing_count`` (the rest across the width),
        or 0 for the grid of nearly square bays (:func:`isolation.study.plan.default_grid`). [-]
    radius, friction : float
        Friction pendulum: radius of curvature [m] and coefficient of friction [-].
    radius_1, friction_1, radius_2, friction_2 : float
        Double concave: radius [m] and friction [-] of the lower and upper dish.
    outer_diameter : float
        Lead rubber and high-damping rubber: bonded rubber diameter, > 0. [m]
    lead_diameter : float
        Lead rubber: lead core diameter, in (0, outer_diameter). [m]
    layer_thickness : float
        Rubber bearings: one rubber layer, > 0. [m]
    layers : int
        Rubber bearings: number of rubber layers, >= 1. [-]
    shear_modulus : float
        Lead rubber: rubber shear modulus, > 0. [kPa]
    displacement_capacity : float
        Displacement the bearing allows (double concave: both dishes together), > 0. [m]
    basis : str
        Code basis, "asce7" (ASCE/SEI 7-16 Ch. 17) or "eurocode" (EN 1998-1 §10). [-]
    sms, sm1 : float
        ASCE 7: MCE_R spectral accelerations S_MS and S_M1, > 0. [g]
    long_period : float
        ASCE 7: long-period transition T_L. [s]
    s1 : float
        ASCE 7: mapped S_1, for the limits of the ELF procedure (§17.4.1), >= 0. [g]
    site_class : str
        ASCE 7: site class "A"-"F". [-]
    ag : float
        Eurocode: design ground acceleration on type A ground a_g, > 0. [g]
    ground_type : str
        Eurocode: ground type "A"-"E". [-]
    lower_factor : float
        Property modification factor for the lower bound, in (0, 1]. [-]
    upper_factor : float
        Property modification factor for the upper bound, >= 1. [-]
    fixed_base_period : float
        Period of the building on a fixed base, > 0. [s]
    storeys : int
        Storeys above the isolation plane, >= 1. [-]
    storey_height : float
        Height of every storey. [m]
    plan_length, plan_width : float
        Plan dimensions, length the longer. [m]
    eccentricity : float
        Actual eccentricity of mass and stiffness, >= 0 (5 % accidental is added). [m]
    response_modification : float
        R (ASCE 7) or q (Eurocode) of the fixed-base design, >= 1. [-]
    units : str
        "SI" or "US": what the controls, tables and plots show. [-]
    """

    bearing_type: str = "friction pendulum"
    weight: float = 40_000.0
    bearing_count: int = 20
    grid_along: int = 0
    radius: float = 3.0
    friction: float = 0.06
    radius_1: float = 2.0
    friction_1: float = 0.05
    radius_2: float = 2.0
    friction_2: float = 0.05
    outer_diameter: float = 0.8
    lead_diameter: float = 0.16
    layer_thickness: float = 0.01
    layers: int = 20
    shear_modulus: float = 400.0
    displacement_capacity: float = 0.8
    basis: str = DEFAULT_BASIS
    sms: float = 1.5
    sm1: float = 0.75
    long_period: float = 8.0
    s1: float = 0.5
    site_class: str = "D"
    ag: float = 0.3
    ground_type: str = "B"
    lower_factor: float = 0.85
    upper_factor: float = 1.3
    fixed_base_period: float = 0.5
    storeys: int = 4
    storey_height: float = 4.0
    plan_length: float = 40.0
    plan_width: float = 30.0
    eccentricity: float = 0.0
    response_modification: float = 6.0
    units: str = "SI"

    def __post_init__(self) -> None:
        validate.one_of("bearing_type", self.bearing_type, BEARING_TYPES)
        validate.one_of("basis", self.basis, BASES)
        validate.one_of("units", self.units, ("SI", "US"))
        validate.positive("weight", self.weight, "kN")
        for name in ("bearing_count", "layers", "storeys"):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, (int, np.integer, float)) \
                    or int(value) != value or value < 1:
                raise ValueError(f"{name} = {value!r} is not allowed: must be a whole number >= 1")
            object.__setattr__(self, name, int(value))
        along = self.grid_along
        if isinstance(along, bool) or not isinstance(along, (int, np.integer, float)) or int(along) != along \
                or along < 0 or (along and self.bearing_count % int(along)):
            divisors = [d for d in range(1, self.bearing_count + 1) if self.bearing_count % d == 0]
            raise ValueError(f"grid_along = {along!r} is not allowed: must be 0 (nearly square bays) or a divisor of "
                             f"the number of bearings {self.bearing_count} ({', '.join(map(str, divisors))})")
        object.__setattr__(self, "grid_along", int(along))
        for name in ("friction", "friction_1", "friction_2"):
            validate.in_range(name, getattr(self, name), 0.0, 0.3, "-", low_inclusive=False)
        for name in ("radius", "radius_1", "radius_2", "outer_diameter", "lead_diameter", "layer_thickness",
                     "shear_modulus", "displacement_capacity", "sms", "sm1", "s1", "long_period", "ag",
                     "storey_height", "plan_length", "plan_width"):
            validate.positive(name, getattr(self, name), _unit(name))
        validate.non_negative("eccentricity", self.eccentricity, "m")
        validate.in_range("response_modification", self.response_modification, 1.0, 8.0, "-")
        validate.in_range("lower_factor", self.lower_factor, 0.0, 1.0, "-", low_inclusive=False)
        validate.in_range("upper_factor", self.upper_factor, 1.0, 10.0, "-")
        validate.positive("fixed_base_period", self.fixed_base_period, "s")
        validate.one_of("site_class", self.site_class, CHOICES["site_class"][0])
        validate.one_of("ground_type", self.ground_type, CHOICES["ground_type"][0])
        if self.bearing_type == "lead rubber" and self.lead_diameter >= self.outer_diameter:
            raise ValueError(f"lead_diameter = {self.lead_diameter!r} is not allowed: must be less than "
                             f"outer_diameter = {self.outer_diameter!r} [m]")

    def study(self):
        """These settings as a validated :class:`isolation.study.Study`
        (see :mod:`isolation.app.explorer.study_file`)."""
        from isolation.app.explorer.study_file import STUDY_FIELDS, study_mapping
        from isolation.study import StudyError, parse_study

        try:
            return parse_study(study_mapping(self), "<explorer>")
        except StudyError as error:
            raise ValueError(_explorer_names(error.problems, STUDY_FIELDS)) from None

    def spectrum(self):
        """The site spectrum (ASCE/SEI 7-16 §11.4.6 MCE_R or EN 1998-1 §3.2.2.2 elastic)."""
        from types import SimpleNamespace

        site = SimpleNamespace(sms=self.sms, sm1=self.sm1, long_period=self.long_period, ag=self.ag,
                               ground_type=self.ground_type, spectrum_type=1, spectrum_periods=())
        return _codes.get(self.basis).site_spectrum(site, 1.0)

    def system(self):
        """The isolation plane: all bearings alike, equal shares of the weight."""
        from isolation.study.assembly import isolation_system
        return isolation_system(self.study().alternatives[0])


def _unit(name: str) -> str:
    control = _CONTROL.get(name)
    return unit_name(control.kind, "SI") if control else "-"


def _explorer_names(problems: list[str], names: Mapping[str, str]) -> str:
    """Study key paths in messages -> the explorer's field names."""
    out = []
    for problem in problems:
        for path, name in sorted(names.items(), key=lambda item: -len(item[0])):
            problem = problem.replace(path, name)
        for prefix in ("alternative[0].bearings[0].", "alternative[0].", "building.", "site."):
            problem = problem.replace(prefix, "")
        out.append(problem)
    return "; ".join(out)


@dataclass(frozen=True)
class ExplorerAnswer:
    """The explorer's answer.

    Attributes
    ----------
    settings : ExplorerSettings
    results : dict
        :class:`isolation.design.EquivalentLinearResult` by property set.
    backbones : dict
        Whole-plane backbones by property set.
    quantities : dict
        ``displacement`` D_M [m], ``total_displacement`` D_TM [m], ``moat`` [m],
        ``isolation_shear`` V_b [kN], ``superstructure_shear`` V_s [kN],
        ``fixed_base_shear`` [kN], ``shear_ratio`` V_s/V_fb [-].
    checks : tuple of Check
        Bearing checks at D_TM (strain, buckling, capacity, tension, restoring force).
    applicability : tuple of Check
        Conditions of the code's simplified procedure.
    warnings : tuple of str
        Plausibility warnings (:func:`isolation.app.explorer.advice.plausibility`).
    spectrum : spectrum object
        The site spectrum. [g]
    layout : isolation.study.layout.LayoutDemands
        Per-bearing displacement and axial-load range of the bearing grid; its extremes are also
        in ``quantities``: ``bearing_displacement_max`` [m], ``bearing_axial_min``,
        ``bearing_axial_max`` [kN] and ``bearings_in_tension`` [-].
    """

    settings: ExplorerSettings
    results: dict
    backbones: dict
    quantities: dict = field(default_factory=dict)
    checks: tuple = ()
    applicability: tuple = ()
    warnings: tuple = ()
    spectrum: Any = None
    layout: Any = None

    @property
    def period_shift(self) -> float:
        """Nominal effective period over the fixed-base period. [-]"""
        return self.results["nominal"].period / self.settings.fixed_base_period

    @property
    def shear_reduction(self) -> float:
        """Upper-bound base shear coefficient over the fixed-base Sa(T_fb, 5 %). [-]"""
        spectrum = self.spectrum or self.settings.spectrum()
        fixed = float(spectrum.sa(self.settings.fixed_base_period, 0.05))
        return (self.results["upper"].base_shear / self.settings.weight) / fixed

    @property
    def failed(self) -> tuple:
        """Names of the bearing checks that fail."""
        return tuple(c.name for c in self.checks if not c.passed)

    def to_dict(self) -> dict:
        from isolation.plain import plain
        return {"settings": asdict(self.settings),
                "results": {k: v.to_dict() for k, v in self.results.items()},
                "quantities": plain(self.quantities), "checks": [c.to_dict() for c in self.checks],
                "applicability": [c.to_dict() for c in self.applicability], "warnings": list(self.warnings),
                "period_shift": self.period_shift, "shear_reduction": self.shear_reduction}


def _settings(settings, values: Mapping[str, Any]) -> ExplorerSettings:
    base = settings if isinstance(settings, ExplorerSettings) else ExplorerSettings(**dict(settings or {}))
    unknown = sorted(set(values) - set(ExplorerSettings.__dataclass_fields__))
    if unknown:
        allowed = ", ".join(ExplorerSettings.__dataclass_fields__)
        raise ValueError(f"setting = {unknown[0]!r} is not allowed: must be one of {allowed}")
    return ExplorerSettings(**{**asdict(base), **values})


def explore(settings: ExplorerSettings | Mapping[str, Any] | None = None, **values: Any) -> ExplorerAnswer:
    """The code's single-mode answer for the lower, nominal and upper property sets.

    Parameters
    ----------
    settings : ExplorerSettings or mapping, optional
        Starting settings (default :class:`ExplorerSettings`).
    **values
        Settings to change, by field name (see :class:`ExplorerSettings`).

    Raises
    ------
    ValueError
        Naming the setting, its value and what is allowed.
    isolation.errors.RunError
        When the equivalent-linear iteration finds no answer.
    """
    from isolation.app.explorer.advice import plausibility
    from isolation.study.assembly import design_alternative, isolation_system, site_spectrum
    from isolation.study.layout import layout_demands

    chosen = _settings(settings, values)
    study = chosen.study()
    spectrum = site_spectrum(study)
    try:
        system = isolation_system(study.alternatives[0])
    except ValueError as error:
        raise ValueError(_explorer_names([str(error)], {})) from None
    backbones = system.property_sets(study.building.total_weight)
    report, q, _, _ = design_alternative(study, backbones, system, spectrum, chosen.fixed_base_period)
    quantities = dict(q)
    try:
        quantities["moat"] = report.value("moat")
    except KeyError:  # EN 1998-1 gives no moat rule here: D plus the same 50 mm clearance (common practice)
        quantities["moat"] = q["total_displacement"] + 0.05
    checks = tuple(system.checks(q["total_displacement"]))
    layout = layout_demands(study, study.alternatives[0], report, spectrum)
    quantities.update(bearing_displacement_max=float(layout.displacement.max()),
                      bearing_axial_min=float(layout.axial_min.min()),
                      bearing_axial_max=float(layout.axial_max.max()), bearings_in_tension=layout.in_tension)
    answer = ExplorerAnswer(chosen, dict(report.bounds.results), backbones, quantities, checks,
                            tuple(report.applicability), (), spectrum, layout)
    return ExplorerAnswer(chosen, answer.results, backbones, quantities, checks, answer.applicability,
                          tuple(plausibility(answer)), spectrum, layout)


def update(values: Mapping[str, Any]) -> tuple[ExplorerAnswer, str, Figure]:
    """Settings to (answer, HTML summary, static figure).

    Parameters
    ----------
    values : mapping
        Settings by field name of :class:`ExplorerSettings`.
    """
    answer = explore(**dict(values))
    return answer, summary_html(answer), explorer_figure(answer)
