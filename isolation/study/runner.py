"""Run a whole study: design, motion suite, response histories, verdict.

:func:`run_study` takes a validated :class:`isolation.study.Study` and, for
each isolation alternative:

1. builds the bearing groups and the lower / nominal / upper property sets;
2. runs the code's single-mode procedure for all three sets (ASCE/SEI 7-16
   Ch. 17 equivalent lateral force report, or the EN 1998-1 §10.9 simplified
   analysis) with the fixed-base comparison, and checks the bearings at the
   total design displacement;
3. runs response histories of the isolated building for the lower and upper
   bound over one spectrum-matched suite shared by all alternatives, with the
   same superstructure on a fixed base alongside;
4. collects the numbers of :class:`isolation.verdict.Figures` and the verdict.

The design step is :func:`isolation.study.stages.design_study` (shared with
the direct sweep); the stages travel as typed objects
(:mod:`isolation.study.stages`). The result, :class:`StudyResults`
(:mod:`isolation.study.results`, re-exported here), holds plain JSON-ready
mappings (``to_dict()`` / :func:`load_results`) and, for figures in the
workbook, the live objects of the run in ``StudyResults.live`` (not
serialised). The model
building blocks (:func:`site_spectrum`, :func:`isolation_system`,
:func:`fixed_base_period`, :func:`superstructure`, :func:`check_study`) live
in :mod:`isolation.study.assembly` and are re-exported here.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

import dataclasses
import functools
import time
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from isolation import GRAVITY, __version__
from isolation import codes as _codes
from isolation import verdict as _verdict
from isolation.errors import RunError
from isolation.plain import plain
from isolation.study import Study
from isolation.study.assembly import (  # noqa: F401 - importable here before
    EUROCODE_SPECTRUM_NOTE,
    check_study,
    design_alternative,
    fixed_base_period,
    history_isolator,
    history_summary,
    isolation_system,
    site_spectrum,
    superstructure,
    verdict_figures,
)
from isolation.study.plan import bidirectional_summary, fixed_base_summary, uplift_combination, with_bidirectional
from isolation.study.results import SCOPE, AlternativeResults, StudyResults, load_results
from isolation.study.stages import AlternativeDesign, HistorySummary, StudyDesign, alternative_figures, design_study
from isolation.study.suite_settings import QUICK, suite_options  # noqa: F401 - re-exported

__all__ = ["StudyResults", "AlternativeResults", "run_study", "load_results", "site_spectrum",
           "isolation_system", "superstructure", "export_suite", "check_study", "fixed_base_period", "SCOPE",
           "design_study", "suite_options"]

_history_isolator = history_isolator  # the earlier private name, kept importable


_history_summary = history_summary  # the earlier private name, kept importable


def _suite(study: Study, spectrum, periods: tuple, quick: bool, progress: bool):
    from isolation.motions import matched_suite

    options, note = suite_options(study, spectrum, periods, quick, progress)
    return matched_suite(spectrum, **options), note


def _pair_suite(study: Study, spectrum, periods: tuple, quick: bool, progress: bool):
    """Matched component pairs with the settings of the single-component suite (bidirectional runs)."""
    from isolation.motions import matched_pairs

    options, _ = suite_options(study, spectrum, periods, quick, progress)
    return matched_pairs(spectrum, **options)


@dataclass(frozen=True)
class _SharedRuns:
    """What every alternative of a run shares: the superstructure, the code-designed fixed base, the
    matched suite (and pairs), the fixed-base histories and their indicators."""

    structure: Any
    comparison: Any
    thresholds: Any
    suite: Any
    suite_note: str
    pairs: Any
    fixed: Any
    fixed_elastic: Any
    indicators: dict
    base_mass: float
    fixed_plan: Any = None

    @functools.cached_property
    def fixed_statistics(self) -> dict:
        """Suite statistics of the fixed-base histories (computed once)."""
        return self.fixed.statistics()


@dataclass(frozen=True)
class _Judged:
    """One alternative after its histories and verdict."""

    results: AlternativeResults
    histories: dict
    loss_case: tuple


def run_study(study: Study, *, quick: bool = False, progress: bool = False,
              loss: bool | None = None) -> StudyResults:
    """Run every alternative of a study and judge it.

    Parameters
    ----------
    study : Study
        A validated study (:func:`isolation.study.load_study`).
    quick : bool
        Small suite (3 records, at most 10 s, looser matching) for tests and
        trials; never for a report.
    progress : bool
        Show progress bars while the suite is generated.
    loss : bool, optional
        Run the loss study (expected loss, downtime, economics); default:
        the study's ``loss.enabled`` (true unless switched off).

    Returns
    -------
    StudyResults

    Raises
    ------
    isolation.errors.RunError
        When a step fails for a valid study (no convergence, a model the
        engine refuses, ...); the message names the alternative and the step.
    """
    started = time.perf_counter()
    timings: dict[str, float] = {}
    design = design_study(study)
    timings["design"] = time.perf_counter() - started
    mark = time.perf_counter()
    shared = _shared_runs(study, design, quick, progress)
    timings["suite"] = time.perf_counter() - mark
    mark = time.perf_counter()
    judged = [_judge_alternative(study, design, alternative, shared) for alternative in design.alternatives]
    timings["histories"] = time.perf_counter() - mark
    results = [j.results for j in judged]
    loss_results: dict = {}
    if _wants_loss(study, loss):
        mark = time.perf_counter()
        loss_results = _loss_step(study, design, shared, [j.loss_case for j in judged])
        results = [dataclasses.replace(r, loss=plain(loss_results["alternatives"][r.name])) for r in results]
        timings["loss"] = time.perf_counter() - mark
    timings["total"] = time.perf_counter() - started
    live_histories = {"fixed": shared.fixed, "fixed_elastic": shared.fixed_elastic}
    live_histories.update({j.results.name: j.histories for j in judged})
    return _collect(study, design, shared, results, live_histories, loss_results, timings, quick)


def _shared_runs(study: Study, design: StudyDesign, quick: bool, progress: bool) -> _SharedRuns:
    """Superstructure, code-designed fixed base, matched suite (and pairs) and fixed-base histories."""
    from isolation.dynamics.history import run as run_history
    from isolation.performance.comparison import fixed_base_comparison, response_indicators, thresholds_of

    structure = superstructure(study)
    check_study(study)
    try:
        comparison = fixed_base_comparison(study, design.spectrum, structure, design.fixed_base_period)
    except ValueError as error:
        raise RunError(f"fixed-base code design failed: {' '.join(str(error).split())}") from error
    thresholds = thresholds_of(study)
    periods = design.period_range
    try:
        suite, suite_note = _suite(study, design.spectrum, periods, quick, progress)
        fixed = run_history(comparison.building, suite.acceleration, suite.dt)
        fixed_elastic = run_history(structure, suite.acceleration, suite.dt) if comparison.yielding else fixed
        pairs = (_pair_suite(study, design.spectrum, periods, quick, progress)
                 if study.analysis.bidirectional else None)
        fixed_plan = fixed_base_summary(study, comparison.building, pairs) if pairs is not None else None
    except (ValueError, RuntimeError) as error:
        raise RunError(f"motion suite / fixed-base history failed: {' '.join(str(error).split())}") from error
    indicators = {
        "fixed": response_indicators(fixed, comparison.design.yield_shears if comparison.yielding else None,
                                     thresholds),
        "fixed_elastic": response_indicators(fixed_elastic, None, thresholds)}
    return _SharedRuns(structure=structure, comparison=comparison, thresholds=thresholds, suite=suite,
                       suite_note=suite_note, pairs=pairs, fixed=fixed, fixed_elastic=fixed_elastic,
                       indicators=indicators, base_mass=study.building.base_weight / GRAVITY, fixed_plan=fixed_plan)


def _isolated_histories(study: Study, design: AlternativeDesign, shared: _SharedRuns, isolators: dict):
    """Lower- and upper-bound histories of the isolated building, its storey design and its superstructure."""
    from isolation.dynamics.history import run_cases
    from isolation.performance.comparison import isolated_superstructure

    try:
        above, isolated_design = isolated_superstructure(study, design.report, shared.structure)
        histories = run_cases(above, shared.base_mass, isolators, shared.suite.acceleration, shared.suite.dt,
                              include_fixed=False)
    except (ValueError, RunError) as error:
        raise RunError(f"alternative {design.name!r}: response history failed: "
                       f"{' '.join(str(error).split())}") from error
    return histories, isolated_design, above


def _bidirectional(study: Study, design: AlternativeDesign, shared: _SharedRuns, above):
    """The plan model's summary under the matched pairs (None when the study does not ask for it).

    ``above`` is the superstructure with the isolated design's storey strengths (yielding unless the
    study asks for elastic), given to the plan model in x and y; the plan fixed base of the shared
    runs is copied in."""
    if shared.pairs is None:
        return None
    q = design.quantities
    if q.total_displacement is None or q.displacement is None:
        raise RunError(f"alternative {design.name!r}: bidirectional history needs the code report's maximum and "
                       "total displacement, which it does not give")
    try:
        return bidirectional_summary(study, design.alternative, design.system, above, shared.base_mass,
                                     shared.pairs, q.total_displacement, q.displacement,
                                     fixed_base=shared.fixed_plan)
    except (ValueError, RuntimeError) as error:
        raise RunError(f"alternative {design.name!r}: bidirectional history failed: "
                       f"{' '.join(str(error).split())}") from error


def _judge_alternative(study: Study, study_design: StudyDesign, design: AlternativeDesign,
                       shared: _SharedRuns) -> _Judged:
    """Histories, summary, verdict figures and verdict of one designed alternative."""
    from isolation.performance.comparison import comparison_summary, response_indicators

    isolators = design.history_isolators()
    histories, isolated_design, above = _isolated_histories(study, design, shared, isolators)
    stats = {case: h.statistics() for case, h in histories.items()}
    strengths = isolated_design.yield_shears if shared.comparison.yielding else None
    indicators = dict(shared.indicators)
    indicators.update({case: response_indicators(h, strengths, shared.thresholds) for case, h in histories.items()})
    summary = HistorySummary.from_statistics(
        stats, shared.fixed_statistics, design.quantities.torsion_factor,
        comparison_summary(indicators, shared.comparison.design, isolated_design))
    figures = alternative_figures(study, study_design.spectrum, design, summary)
    bidirectional = _bidirectional(study, design, shared, above)
    if bidirectional is not None:
        figures = with_bidirectional(figures, bidirectional,
                                     uplift_combination(study, study_design.spectrum, design.report))
    judged = _verdict.assess(figures)
    bilinear = all(isolators[c] is design.sets[c] for c in isolators)
    results = AlternativeResults(
        name=design.name, system=plain(design.system), bounds=plain(design.bounds), report=plain(design.report),
        quantities=design.quantities.to_dict(), checks=plain(design.checks),
        history={"statistics": plain(stats), "summary": summary.to_dict(), "indicators": plain(indicators),
                 "isolated_design": plain(isolated_design),
                 "model": "lower and upper property sets; " + (
                     "bilinear backbones" if bilinear else "equivalent bilinear at the design displacement"),
                 "bidirectional": plain(bidirectional)},
        figures=plain(figures), verdict=plain(judged))
    nominal = design.history_isolators(("nominal",))["nominal"]
    loss_case = (design.alternative, design.system, nominal, design.quantities.to_dict(), design.report)
    return _Judged(results=results, histories=histories, loss_case=loss_case)


def _wants_loss(study: Study, loss: bool | None) -> bool:
    """Whether the loss study runs: ``loss`` when given, else the study's ``loss.enabled``."""
    inputs = getattr(study, "loss", None)
    return loss if loss is not None else (inputs is None or inputs.options.enabled)


def _loss_step(study: Study, design: StudyDesign, shared: _SharedRuns, cases: list) -> dict:
    """The loss study over the run's suite (:func:`isolation.loss.run_loss`)."""
    from isolation.loss import run_loss

    try:
        return run_loss(study, design.spectrum, shared.suite, shared.base_mass, cases, getattr(study, "loss", None),
                        fixed_building=shared.comparison.building, superstructure=shared.structure)
    except (ValueError, RunError) as error:
        raise RunError(f"loss study failed: {' '.join(str(error).split())}") from error


def _spectrum_part(study: Study, spectrum) -> dict:
    """``results.json`` ``spectrum``: definition, a sampled curve (5 % damping) [s, g], rule and note."""
    curve_low, curve_high = spectrum.period_range
    curve = np.geomspace(max(curve_low, 0.02), min(curve_high, 10.0), 120)
    return {"definition": plain(spectrum), "periods": curve.tolist(),
            "sa_5pct": np.asarray(spectrum.sa(curve)).tolist(), "rule": spectrum.rule,
            "note": _codes.get(study.basis).spectrum_note(study.site)}


def _suite_part(shared: _SharedRuns, quick: bool) -> dict:
    """``results.json`` ``suite``: the suite's settings, tolerance report, note and pairs."""
    suite_data = shared.suite.to_dict()
    suite_data["check"] = plain(shared.suite.check())
    suite_data["quick"] = quick
    suite_data["note"] = shared.suite_note
    if shared.pairs is not None:
        suite_data["pairs"] = plain(shared.pairs.to_dict())
    return plain(suite_data)


def _collect(study: Study, design: StudyDesign, shared: _SharedRuns, results: list, live_histories: dict,
             loss_results: dict, timings: dict, quick: bool) -> StudyResults:
    """The run's :class:`StudyResults` from its steps."""
    comparison = shared.comparison
    return StudyResults(
        study=study.to_dict(),
        spectrum=_spectrum_part(study, design.spectrum),
        fixed_base={"period": design.fixed_base_period, "period_source": design.fixed_base_period_source,
                    "model": plain(comparison.building), "statistics": plain(shared.fixed_statistics),
                    "elastic_statistics": plain(shared.fixed_elastic.statistics()),
                    "comparison": plain(comparison), "damage_thresholds": plain(shared.thresholds),
                    "loss": plain(loss_results.get("fixed", {}))},
        suite=_suite_part(shared, quick),
        alternatives=tuple(results),
        run={"version": __version__, "quick": quick, "timings": timings},
        live={"spectrum": design.spectrum, "suite": shared.suite, "pairs": shared.pairs,
              "superstructure": shared.structure, "comparison": comparison, "histories": live_histories,
              "designs": {d.name: (d.system, d.sets, d.report) for d in design.alternatives}, "design": design},
        loss=plain({k: v for k, v in loss_results.items() if k not in ("fixed", "alternatives")}),
    )


def export_suite(study: Study, out_dir: str | Path, *, quick: bool = False) -> Path:
    """Generate the study's matched suite and write it to ``out_dir``.

    The isolated-period check range comes from each alternative's
    equivalent-linear periods (upper bound shortest, lower bound longest).

    Returns
    -------
    Path
        The folder written.
    """
    from isolation import motions

    check_study(study)
    design = design_study(study)
    periods = [d.bounds[case].period for d in design.alternatives for case in ("upper", "lower")]
    suite, _ = _suite(study, design.spectrum, (min(periods), max(periods)), quick, progress=False)
    out = Path(out_dir)
    motions.write_suite(suite, out, name="suite")
    return out
