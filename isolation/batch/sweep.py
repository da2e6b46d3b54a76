"""The direct sweep: many variants through the equivalent-linear design, no notebooks.

For large grids (thousands of variants) each variant is parsed, designed
with the code's single-mode procedure for the lower, nominal and upper
property sets (the same building blocks as :func:`isolation.runner.run_study`:
site spectrum, isolation system, code report, verdict) and reduced to the
summary columns. No motion suite, no response histories, no record: the
verdict rests on the equivalent-linear numbers only (``verdict_basis`` =
``equivalent linear``) and the floor-acceleration ratio stays empty. Run the
promising variants through the full workbook afterwards.

It uses the study run's own code-report, verdict-figure and equivalent-
bilinear steps (``isolation.study_model.design_alternative`` / ``verdict_figures``,
``isolation.runner._history_isolator``) so that a sweep and a record judge a
variant alike.

:func:`sweep_runner` is a batch runner (see :mod:`isolation.batch.runners`),
so a sweep has the same executors, progress, resume and summary as a record
batch: ``python -m isolation batch BATCH.toml --direct``.
"""

from __future__ import annotations

import functools
import time
from pathlib import Path
from typing import Any

from isolation.batch.rows import fixed_base_elastic_shear, rows_from_results
from isolation.batch.runners import VariantOutcome, VariantTask

__all__ = ["sweep_runner", "design_rows"]

EQUIVALENT_LINEAR = "equivalent linear"
_NO_HISTORY = {
    "isolator_displacement_with_torsion": None,
    "superstructure_shear_ratio": None,
    "floor_acceleration_ratio": None,
    "drift_ratio_isolated": None,
}


@functools.lru_cache(maxsize=8)
def _base_mapping(study_file: str, modified: float) -> dict:  # noqa: ARG001 - file time keys the cache
    from isolation.study import read_study_mapping

    return read_study_mapping(study_file)


def design_rows(study) -> list[dict]:
    """Summary rows of one study from the equivalent-linear design of each alternative.

    Parameters
    ----------
    study : isolation.study.Study
        A validated study.

    Returns
    -------
    list of dict
        One row per alternative (columns of :mod:`isolation.batch.summary`).
    """
    from isolation import study_model as model
    from isolation import verdict

    spectrum = model.site_spectrum(study)
    period, _ = model.fixed_base_period(study)
    weight = study.building.total_weight
    alternatives = []
    for alternative in study.alternatives:
        system = model.isolation_system(alternative)
        sets = system.property_sets(weight)
        report, quantities, permitted, reasons = model.design_alternative(study, sets, system, spectrum, period)
        checks = system.checks(quantities["total_displacement"])
        bounds = report.bounds.results
        strength = getattr(sets["lower"], "characteristic_strength", None)
        if strength is None:  # strain-dependent rubber: Q_d of its equivalent bilinear, as the study run does
            from isolation.runner import _history_isolator

            strength = _history_isolator(sets["lower"], bounds["lower"]).characteristic_strength
        quantities = dict(quantities, displacement_capacity=system.displacement_capacity, moat=alternative.moat,
                          characteristic_strength=strength)
        figures = model.verdict_figures(study, spectrum, alternative, quantities, _NO_HISTORY, report, permitted,
                                  reasons, checks, bounds, period)
        judged = verdict.assess(figures)
        alternatives.append({
            "name": alternative.name,
            "bounds": {name: result.to_dict() for name, result in bounds.items()},
            "quantities": quantities,
            "figures": {"floor_acceleration_ratio": None},
            "verdict": {"outcome": judged.outcome},
        })
    shear = fixed_base_elastic_shear(spectrum, period, weight)
    return rows_from_results({"alternatives": alternatives}, shear, verdict_basis=EQUIVALENT_LINEAR)


def sweep_runner(task: VariantTask) -> VariantOutcome:
    """Batch runner of the direct sweep: one variant, equivalent-linear only, no record."""
    from isolation.study import apply_overrides, parse_study

    started = time.perf_counter()
    path = Path(task.study_file)
    base = _base_mapping(str(path), path.stat().st_mtime)
    study = parse_study(apply_overrides(base, task.overrides), source=path.name, base_dir=path.parent)
    rows = design_rows(study)
    return VariantOutcome(task.variant_id, "done", rows=tuple(rows), elapsed=time.perf_counter() - started)
