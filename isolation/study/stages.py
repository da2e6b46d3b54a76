"""Typed stages of a study run: an alternative's design, its history summary, a study's design.

What travels between the steps of :func:`isolation.study.runner.run_study`,
the direct sweep (:mod:`isolation.app.batch.sweep`) and the history sweep
(:mod:`isolation.app.batch.histories`):

* :class:`DesignQuantities` - the key numbers of one alternative's code design;
* :class:`AlternativeDesign` - one alternative designed: bearings, property
  sets, code report, quantities, the code's permission of the single-mode
  procedure and the bearing checks at the total displacement;
* :class:`StudyDesign` - every alternative of a study on one site spectrum,
  from :func:`design_study`;
* :class:`HistorySummary` - suite means of the response histories of one
  alternative against the fixed base.

Each is a frozen dataclass with ``to_dict()`` in plain JSON types; the
plain-number ones read back with ``from_dict()``. ``results.json`` carries
them in :class:`isolation.study.runner.StudyResults` under the keys it always
had (``quantities``, ``history.summary``), with :data:`SCHEMA_VERSION`.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Mapping

from isolation.errors import RunError
from isolation.plain import plain
from isolation.study.quantities import NO_HISTORY, DesignQuantities, HistorySummary

__all__ = ["SCHEMA_VERSION", "DesignQuantities", "HistorySummary", "AlternativeDesign", "StudyDesign",
           "design_study", "alternative_design", "alternative_figures", "NO_HISTORY"]

SCHEMA_VERSION = 2
"""Layout of ``results.json`` (``isolation/study/results.schema.json``); results without the key
are layout 1, which differs only by lacking it. [-]"""


_NO_HISTORY_VALUES = NO_HISTORY.to_dict()  # read only: verdict_figures looks values up


_BOUND_KEYS = ("displacement", "period", "damping", "base_shear")


@dataclass(frozen=True)
class AlternativeDesign:
    """One alternative through the code's single-mode procedure, for all property sets.

    Attributes
    ----------
    alternative : isolation.study.Alternative
        The study's input for it.
    system : isolation.bearings.IsolationSystem
        Bearing groups and property factors.
    sets : mapping
        ``"lower"``, ``"nominal"``, ``"upper"`` -> whole-plane backbone (forces [kN], displacements [m]).
    report : ElfReport or EurocodeReport
        The code report (:func:`isolation.study.assembly.design_alternative`).
    quantities : DesignQuantities
        Its key numbers.
    permitted : bool
        Whether the code permits the single-mode procedure (ASCE 7 §17.4.1 ELF, EN 1998-1 §10.9.2).
    reasons : tuple of str
        Names of the applicability limits that are not met.
    checks : tuple of Check
        Bearing checks at the total displacement.
    """

    alternative: Any
    system: Any
    sets: Mapping[str, Any]
    report: Any
    quantities: DesignQuantities
    permitted: bool
    reasons: tuple[str, ...]
    checks: tuple

    @property
    def name(self) -> str:
        """The alternative's name."""
        return self.alternative.name

    @property
    def bounds(self) -> dict:
        """``"lower"``, ``"nominal"``, ``"upper"`` -> equivalent-linear result (D [m], T [s], beta [-], ...)."""
        return self.report.bounds.results

    def bound_numbers(self) -> dict:
        """Per bound: displacement [m], period [s], damping [-], base_shear [kN] (the rows of a sweep)."""
        return {name: {k: getattr(result, k) for k in _BOUND_KEYS} for name, result in self.bounds.items()}

    def history_isolators(self, cases=("lower", "upper")) -> dict:
        """Case -> isolator law of the history engine (:func:`isolation.study.assembly.history_isolator`)."""
        from isolation.study.assembly import history_isolator

        return {case: history_isolator(self.sets[case], self.bounds[case], self.system, case) for case in cases}

    def to_dict(self) -> dict:
        """Plain mapping: name, system, bounds, report, quantities, permitted, reasons, checks."""
        return plain({"name": self.name, "system": self.system, "bounds": self.bounds, "report": self.report,
                      "quantities": self.quantities, "permitted": self.permitted, "reasons": self.reasons,
                      "checks": self.checks})


@dataclass(frozen=True)
class StudyDesign:
    """The code design of every alternative of a study on one site spectrum.

    Attributes
    ----------
    spectrum : site spectrum
        :func:`isolation.study.assembly.site_spectrum` of the study. [g]
    fixed_base_period : float
        T_fb. [s]
    fixed_base_period_source : str
        Where T_fb came from (given, or the code's estimate).
    alternatives : tuple of AlternativeDesign
        In the study's order.
    """

    spectrum: Any
    fixed_base_period: float
    fixed_base_period_source: str
    alternatives: tuple[AlternativeDesign, ...]

    @property
    def period_range(self) -> tuple[float, float]:
        """(shortest upper-bound, longest lower-bound) effective period over the alternatives. [s]"""
        upper = min(d.bounds["upper"].period for d in self.alternatives)
        lower = max(d.bounds["lower"].period for d in self.alternatives)
        return (upper, lower)

    def to_dict(self) -> dict:
        """Plain mapping of the design (spectrum definition, T_fb and its source, alternatives)."""
        return plain({"spectrum": self.spectrum, "fixed_base_period": self.fixed_base_period,
                      "fixed_base_period_source": self.fixed_base_period_source,
                      "alternatives": [d.to_dict() for d in self.alternatives]})


def _characteristic_strength(sets: Mapping, bounds: Mapping) -> float:
    """Q_d of the lower bound; for a strain-dependent rubber that of its equivalent bilinear. [kN]"""
    from isolation.study.assembly import history_isolator

    strength = getattr(sets["lower"], "characteristic_strength", None)
    if strength is None:
        strength = history_isolator(sets["lower"], bounds["lower"]).characteristic_strength
    return float(strength)


def alternative_design(study, alternative, spectrum, fixed_base_period: float, *, system=None, sets=None,
                       bounds=None) -> AlternativeDesign:
    """One alternative through the code's single-mode procedure.

    Parameters
    ----------
    study : isolation.study.Study
        The validated study.
    alternative : isolation.study.Alternative
        One of its alternatives.
    spectrum : site spectrum
        :func:`isolation.study.assembly.site_spectrum` of the study. [g]
    fixed_base_period : float
        T_fb. [s]
    system, sets : optional
        The alternative's :class:`isolation.bearings.IsolationSystem` and property sets, when
        already built.
    bounds : isolation.design.BoundsResult, optional
        The equivalent-linear results of ``sets`` (from the array kernel), to skip the iteration.

    Returns
    -------
    AlternativeDesign
    """
    from isolation.study.assembly import design_alternative, isolation_system

    system = system if system is not None else isolation_system(alternative)
    sets = sets if sets is not None else system.property_sets(study.building.total_weight)
    report, values, permitted, reasons = design_alternative(study, sets, system, spectrum, fixed_base_period,
                                                            bounds=bounds)
    checks = tuple(system.checks(values["total_displacement"]))
    results = report.bounds.results
    quantities = DesignQuantities(
        **values, period_lower=results["lower"].period, period_upper=results["upper"].period,
        damping_lower=results["lower"].damping, damping_upper=results["upper"].damping,
        characteristic_strength=_characteristic_strength(sets, results),
        displacement_capacity=system.displacement_capacity, moat=alternative.moat,
        fixed_base_period=fixed_base_period)
    return AlternativeDesign(alternative=alternative, system=system, sets=sets, report=report,
                             quantities=quantities, permitted=bool(permitted), reasons=tuple(reasons),
                             checks=checks)


def design_study(study, *, spectrum=None, fixed_base_period: tuple[float, str] | None = None) -> StudyDesign:
    """Every alternative of a study through the code's single-mode procedure.

    The one design step of :func:`isolation.study.runner.run_study`, the direct sweep
    (:func:`isolation.app.batch.sweep.design_rows`) and :func:`isolation.study.runner.export_suite`.

    Parameters
    ----------
    study : isolation.study.Study
        A validated study.
    spectrum : site spectrum, optional
        Default: :func:`isolation.study.assembly.site_spectrum` of the study. [g]
    fixed_base_period : (float, str), optional
        T_fb [s] and its source; default :func:`isolation.study.assembly.fixed_base_period`.

    Returns
    -------
    StudyDesign

    Raises
    ------
    isolation.errors.RunError
        An alternative whose design fails for a valid study, naming it.
    """
    from isolation.study import assembly

    spectrum = spectrum if spectrum is not None else assembly.site_spectrum(study)
    t_fb, source = fixed_base_period if fixed_base_period is not None else assembly.fixed_base_period(study)
    designs = []
    for alternative in study.alternatives:
        try:
            designs.append(alternative_design(study, alternative, spectrum, t_fb))
        except (ValueError, RunError) as error:
            raise RunError(f"alternative {alternative.name!r}: design failed: "
                           f"{' '.join(str(error).split())}") from error
    return StudyDesign(spectrum=spectrum, fixed_base_period=t_fb, fixed_base_period_source=source,
                       alternatives=tuple(designs))


def alternative_figures(study, spectrum, design: AlternativeDesign, summary: HistorySummary = NO_HISTORY):
    """The verdict's numbers (:class:`isolation.verdict.Figures`) of one designed alternative.

    Parameters
    ----------
    study : isolation.study.Study
    spectrum : site spectrum [g]
    design : AlternativeDesign
    summary : HistorySummary
        Its response-history summary; :data:`NO_HISTORY` judges on the equivalent-linear numbers.
    """
    from isolation.study.assembly import verdict_figures

    values = _NO_HISTORY_VALUES if summary is NO_HISTORY else summary.to_dict()
    return verdict_figures(study, spectrum, design.alternative, design.quantities.to_dict(),
                           values, design.report, design.permitted, design.reasons, design.checks,
                           design.bounds, design.quantities.fixed_base_period)
