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

The result, :class:`StudyResults`, holds plain JSON-ready mappings
(``to_dict()`` / :func:`load_results`) and, for figures in the workbook, the
live objects of the run in ``StudyResults.live`` (not serialised). The model
building blocks (:func:`site_spectrum`, :func:`isolation_system`,
:func:`fixed_base_period`, :func:`superstructure`, :func:`check_study`) live
in :mod:`isolation.study.assembly` and are re-exported here.

Scope: a feasibility study, not construction design; a licensed engineer
checks every value against the governing local code.
"""

from __future__ import annotations

import dataclasses
import json
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

import numpy as np

from isolation import GRAVITY, __version__
from isolation import verdict as _verdict
from isolation.errors import RunError
from isolation.files import write_text_atomic
from isolation.plain import plain
from isolation.study import Study
from isolation.study.assembly import (
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
from isolation.study.plan import bidirectional_summary, fixed_base_summary, with_bidirectional

__all__ = ["StudyResults", "AlternativeResults", "run_study", "load_results", "site_spectrum",
           "isolation_system", "superstructure", "export_suite", "check_study", "fixed_base_period", "SCOPE"]

SCOPE = ("Feasibility study of seismic base isolation, not construction design. Results rest on "
         "simplified models and code procedures quoted partly from memory; verify against the "
         "governing local code with a licensed structural engineer.")

QUICK = {"count": 3, "duration": 10.0, "control_points": 30, "max_iterations": 8}
"""Suite settings of a quick run (tests and trials only, not for reports)."""


@dataclass(frozen=True)
class AlternativeResults:
    """Results of one alternative, as plain mappings.

    ``quantities`` holds the key numbers by name (SI: m, s, kN, -): displacement
    (D_M or d_dc), total_displacement (D_TM or d_d), period_lower,
    period_upper, damping_lower, damping_upper, isolation_shear (V_b),
    superstructure_shear (V_s), fixed_base_shear, shear_ratio,
    characteristic_strength, displacement_capacity, moat. ``bounds`` maps
    lower/nominal/upper to the equivalent-linear results; ``report`` is the
    code report; ``checks`` the bearing checks at the total displacement;
    ``history`` the suite statistics per case and a summary; ``figures`` and
    ``verdict`` the verdict's inputs and outcome; ``loss`` the loss study
    (:func:`isolation.loss.run_loss`: ``expected_annual_loss``,
    ``expected_loss_mce``, ... in the study's currency, and ``economics``),
    empty when the loss study did not run.
    """

    name: str
    system: dict
    bounds: dict
    report: dict
    quantities: dict
    checks: list
    history: dict
    figures: dict
    verdict: dict
    loss: dict = field(default_factory=dict)

    @property
    def outcome(self) -> str:
        """"feasible", "feasible with conditions" or "not recommended"."""
        return self.verdict["outcome"]

    def to_dict(self) -> dict:
        return plain({k: getattr(self, k) for k in self.__dataclass_fields__})


@dataclass(frozen=True)
class StudyResults:
    """Everything a study run found; ``to_dict()`` is plain JSON.

    ``study`` is the validated study (:meth:`Study.to_dict`), ``spectrum`` the
    site spectrum with a sampled curve and a ``note`` stating any assumption on
    it (empty when none), ``fixed_base`` the fixed-base model
    and shear, ``suite`` the matched suite's settings and tolerance report,
    ``alternatives`` one :class:`AlternativeResults` each, ``run`` version,
    quick flag and timings [s]. ``loss`` holds the loss study's levels,
    hazard, currency, inputs, settings and cautions (the per-case figures are
    in ``fixed_base["loss"]`` and each alternative's ``loss``; empty when the
    loss study did not run). ``live`` keeps the run's objects (spectrum,
    suite, history results, systems, reports) for figures; it is None after
    :func:`load_results`.
    """

    study: dict
    spectrum: dict
    fixed_base: dict
    suite: dict
    alternatives: tuple
    run: dict
    scope: str = SCOPE
    loss: dict = field(default_factory=dict)
    live: Any = field(default=None, compare=False, repr=False)

    @property
    def verdicts(self) -> list:
        """One :class:`isolation.verdict.Verdict` per alternative."""
        return [_verdict.Verdict.from_dict(a.verdict) for a in self.alternatives]

    def alternative(self, name: str) -> AlternativeResults:
        """Results of the alternative called ``name``."""
        for result in self.alternatives:
            if result.name == name:
                return result
        raise KeyError(f"alternative = {name!r} is not in the results")

    def to_dict(self) -> dict:
        data = {k: getattr(self, k) for k in ("study", "spectrum", "fixed_base", "suite", "run", "scope", "loss")}
        data["alternatives"] = [a.to_dict() for a in self.alternatives]
        return plain(data)

    @classmethod
    def from_dict(cls, mapping: Mapping[str, Any]) -> "StudyResults":
        alternatives = tuple(AlternativeResults(**a) for a in mapping["alternatives"])
        return cls(study=mapping["study"], spectrum=mapping["spectrum"], fixed_base=mapping["fixed_base"],
                   suite=mapping["suite"], alternatives=alternatives, run=mapping["run"],
                   scope=mapping.get("scope", SCOPE), loss=mapping.get("loss", {}))

    def save(self, path: str | Path) -> Path:
        """Write ``to_dict()`` as JSON (via a temporary file and a rename)."""
        path = Path(path)
        return write_text_atomic(path, json.dumps(self.to_dict(), indent=1, allow_nan=False))


def load_results(path: str | Path) -> StudyResults:
    """Read results written by :meth:`StudyResults.save`."""
    return StudyResults.from_dict(json.loads(Path(path).read_text(encoding="utf-8")))


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


def suite_options(study: Study, spectrum, periods: tuple, quick: bool, progress: bool = False):
    """Options of :func:`isolation.motions.matched_suite` for a study's suite, and a note.

    ``periods`` is (T_M upper bound, T_M lower bound) [s] over all alternatives.
    """
    a = study.analysis
    rule = "eurocode" if study.basis == "eurocode" else "asce7"
    options: dict[str, Any] = dict(count=a.suite_size, damping=a.damping, duration=a.duration, dt=a.time_step,
                   seed=a.seed, rule=rule, isolated_period=periods, progress=progress)
    # D5-95 of a magnitude 7 event (the suite generator's default), shortened to 40 % of the
    # record for short records so the envelope keeps its rise and decay (common practice).
    from isolation.motions import typical_significant_duration
    options["significant_duration"] = min(typical_significant_duration(7.0), 0.4 * a.duration)
    # Suite-mean check range around T_M: ASCE 7 up to 1.25 T_M (lower bound), Eurocode up to 2 T_M.
    reach = 1.25 if rule == "asce7" else 2.0
    if quick:
        # The matched band reaches duration/3 and must cover the check range: 5 T_M (ASCE 7),
        # 6.5 T_M (Eurocode).
        shortest = max(QUICK["duration"], max(5.0, 3.0 * reach + 0.5) * max(periods))
        options.update(count=QUICK["count"], duration=min(a.duration, shortest),
                       control_points=QUICK["control_points"], max_iterations=QUICK["max_iterations"])
        options["significant_duration"] = min(options["significant_duration"], 0.4 * options["duration"])
    # The check range must lie inside the matched band, which ends at the spectrum's longest period
    # and at a third of the record length. When it cannot, the suite is matched over its whole band
    # and checked there (noted in the results). The suite's default band ends at max(6 s, 1.5 T_M);
    # when the check range reaches further (Eurocode, T_M > 3 s) the band is widened to it.
    band_end = min(spectrum.period_range[1], options["duration"] / 3.0)
    longest = reach * max(periods)
    note = ""
    if longest > band_end * (1.0 + 1e-9):
        options["isolated_period"] = None
        note = (f"check range around T_M ({reach:g} x {max(periods):.2f} s) exceeds the matched band "
                f"(up to {band_end:.2f} s): the suite is checked over its whole band")
    elif longest > max(6.0, 1.5 * max(periods)):
        options["period_range"] = (max(0.05, 4.0 * a.time_step, spectrum.period_range[0]), min(longest, band_end))
    return options, note


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
    from isolation.dynamics.history import run as run_history
    from isolation.dynamics.history import run_cases

    started = time.perf_counter()
    timings: dict[str, float] = {}
    b = study.building
    spectrum = site_spectrum(study)
    t_fb, t_fb_source = fixed_base_period(study)
    weight = b.total_weight
    designs = []
    for alternative in study.alternatives:
        step = f"alternative {alternative.name!r}: design"
        try:
            system = isolation_system(alternative)
            sets = system.property_sets(weight)
            report, quantities, permitted, reasons = design_alternative(study, sets, system, spectrum, t_fb)
            checks = system.checks(quantities["total_displacement"])
        except (ValueError, RunError) as error:
            raise RunError(f"{step} failed: {' '.join(str(error).split())}") from error
        designs.append((alternative, system, sets, report, quantities, permitted, reasons, checks))
    timings["design"] = time.perf_counter() - started

    upper_periods = [d[3].bounds.results["upper"].period for d in designs]
    lower_periods = [d[3].bounds.results["lower"].period for d in designs]
    structure = superstructure(study)
    check_study(study)
    from isolation.performance.comparison import (
        comparison_summary,
        fixed_base_comparison,
        isolated_superstructure,
        response_indicators,
        thresholds_of,
    )
    try:
        comparison = fixed_base_comparison(study, spectrum, structure, t_fb)
    except ValueError as error:
        raise RunError(f"fixed-base code design failed: {' '.join(str(error).split())}") from error
    thresholds = thresholds_of(study)
    mark = time.perf_counter()
    try:
        suite, suite_note = _suite(study, spectrum, (min(upper_periods), max(lower_periods)), quick, progress)
        fixed = run_history(comparison.building, suite.acceleration, suite.dt)
        fixed_elastic = run_history(structure, suite.acceleration, suite.dt) if comparison.yielding else fixed
        pairs = (_pair_suite(study, spectrum, (min(upper_periods), max(lower_periods)), quick, progress)
                 if study.analysis.bidirectional else None)
        fixed_plan = fixed_base_summary(study, comparison.building, pairs) if pairs is not None else None
    except (ValueError, RuntimeError) as error:
        raise RunError(f"motion suite / fixed-base history failed: {' '.join(str(error).split())}") from error
    timings["suite"] = time.perf_counter() - mark
    fixed_stats = fixed.statistics()
    fixed_indicators = {
        "fixed": response_indicators(fixed, comparison.design.yield_shears if comparison.yielding else None,
                                     thresholds),
        "fixed_elastic": response_indicators(fixed_elastic, None, thresholds)}
    base_mass = b.base_weight / GRAVITY

    mark = time.perf_counter()
    results, live_histories, live_reports = [], {"fixed": fixed, "fixed_elastic": fixed_elastic}, {}
    loss_cases = []
    for alternative, system, sets, report, quantities, permitted, reasons, checks in designs:
        bounds = report.bounds.results
        isolators = {case: _history_isolator(sets[case], bounds[case], system, case)
                     for case in ("lower", "upper")}
        try:
            above, isolated_design = isolated_superstructure(study, report, structure)
            histories = run_cases(above, base_mass, isolators, suite.acceleration, suite.dt,
                                  include_fixed=False)
        except (ValueError, RunError) as error:
            raise RunError(f"alternative {alternative.name!r}: response history failed: "
                           f"{' '.join(str(error).split())}") from error
        stats = {case: h.statistics() for case, h in histories.items()}
        torsion = quantities["total_displacement"] / quantities["displacement"]
        summary = _history_summary(stats, fixed_stats, torsion)
        strengths = isolated_design.yield_shears if comparison.yielding else None
        indicators = dict(fixed_indicators)
        indicators.update({case: response_indicators(h, strengths, thresholds) for case, h in histories.items()})
        summary.update(comparison_summary(indicators, comparison.design, isolated_design))
        lower_set = sets["lower"]
        strength = getattr(lower_set, "characteristic_strength", None)
        if strength is None:
            strength = _history_isolator(lower_set, bounds["lower"]).characteristic_strength
        quantities = dict(quantities)
        quantities.update(
            period_lower=bounds["lower"].period, period_upper=bounds["upper"].period,
            damping_lower=bounds["lower"].damping, damping_upper=bounds["upper"].damping,
            characteristic_strength=float(strength), displacement_capacity=system.displacement_capacity,
            moat=alternative.moat, fixed_base_period=t_fb)
        figures = verdict_figures(study, spectrum, alternative, quantities, summary, report, permitted, reasons,
                           checks, bounds, t_fb)
        bidirectional = None
        if pairs is not None:
            try:
                bidirectional = bidirectional_summary(study, alternative, system, above, base_mass, pairs,
                                                      quantities["total_displacement"], quantities["displacement"],
                                                      fixed_base=fixed_plan)
            except (ValueError, RuntimeError) as error:
                raise RunError(f"alternative {alternative.name!r}: bidirectional history failed: "
                               f"{' '.join(str(error).split())}") from error
            figures = with_bidirectional(figures, bidirectional)
        judged = _verdict.assess(figures)
        results.append(AlternativeResults(
            name=alternative.name, system=plain(system), bounds=plain(bounds), report=plain(report),
            quantities=plain(quantities), checks=plain(checks),
            history={"statistics": plain(stats), "summary": plain(summary), "indicators": plain(indicators),
                     "isolated_design": plain(isolated_design),
                     "model": "lower and upper property sets; " + (
                         "bilinear backbones" if all(isolators[c] is sets[c] for c in isolators)
                         else "equivalent bilinear at the design displacement"),
                     "bidirectional": plain(bidirectional)},
            figures=plain(figures), verdict=plain(judged)))
        live_histories[alternative.name] = histories
        live_reports[alternative.name] = (system, sets, report)
        loss_cases.append((alternative, system, _history_isolator(sets["nominal"], bounds["nominal"], system,
                                                                   "nominal"), quantities, report))
    timings["histories"] = time.perf_counter() - mark
    loss_results = {}
    inputs = getattr(study, "loss", None)
    if loss if loss is not None else (inputs is None or inputs.options.enabled):
        from isolation.loss import run_loss

        mark = time.perf_counter()
        try:
            loss_results = run_loss(study, spectrum, suite, base_mass, loss_cases, inputs,
                                    fixed_building=comparison.building)
        except (ValueError, RunError) as error:
            raise RunError(f"loss study failed: {' '.join(str(error).split())}") from error
        results = [dataclasses.replace(r, loss=plain(loss_results["alternatives"][r.name])) for r in results]
        timings["loss"] = time.perf_counter() - mark
    timings["total"] = time.perf_counter() - started

    curve_low, curve_high = spectrum.period_range
    curve = np.geomspace(max(curve_low, 0.02), min(curve_high, 10.0), 120)
    suite_data = suite.to_dict()
    suite_data["check"] = plain(suite.check())
    suite_data["quick"] = quick
    suite_data["note"] = suite_note
    if pairs is not None:
        suite_data["pairs"] = plain(pairs.to_dict())
    extended = study.basis == "eurocode" and not study.site.spectrum_periods
    spectrum_note = EUROCODE_SPECTRUM_NOTE if extended else ""
    return StudyResults(
        study=study.to_dict(),
        spectrum={"definition": plain(spectrum), "periods": curve.tolist(),
                  "sa_5pct": np.asarray(spectrum.sa(curve)).tolist(), "rule": spectrum.rule,
                  "note": spectrum_note},
        fixed_base={"period": t_fb, "period_source": t_fb_source, "model": plain(comparison.building),
                    "statistics": plain(fixed_stats), "elastic_statistics": plain(fixed_elastic.statistics()),
                    "comparison": plain(comparison), "damage_thresholds": plain(thresholds),
                    "loss": plain(loss_results.get("fixed", {}))},
        suite=plain(suite_data),
        alternatives=tuple(results),
        run={"version": __version__, "quick": quick, "timings": timings},
        live={"spectrum": spectrum, "suite": suite, "pairs": pairs, "superstructure": structure,
              "comparison": comparison,
              "histories": live_histories, "designs": live_reports},

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
    spectrum = site_spectrum(study)
    t_fb, _ = fixed_base_period(study)
    periods = []
    for alternative in study.alternatives:
        system = isolation_system(alternative)
        report = design_alternative(study, system.property_sets(study.building.total_weight), system, spectrum, t_fb)[0]
        periods += [report.bounds.results["upper"].period, report.bounds.results["lower"].period]
    suite, _ = _suite(study, spectrum, (min(periods), max(periods)), quick, progress=False)
    out = Path(out_dir)
    motions.write_suite(suite, out, name="suite")
    return out
