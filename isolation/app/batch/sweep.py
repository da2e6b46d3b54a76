"""The direct sweep: many variants through the equivalent-linear design, no notebooks.

For large grids (thousands of variants) each variant is parsed, designed
with the code's single-mode procedure for the lower, nominal and upper
property sets (the same building blocks as :func:`isolation.study.runner.run_study`:
site spectrum, isolation system, code report, verdict) and reduced to the
summary columns. No motion suite, no response histories, no record: the
verdict rests on the equivalent-linear numbers only (``verdict_basis`` =
``equivalent linear``) and the floor-acceleration ratio stays empty. Run the
promising variants through the full workbook afterwards.

It uses the study run's own design step and typed stages
(:func:`isolation.study.stages.design_study`, ``alternative_design``,
``alternative_figures``) so that a sweep and a record judge a variant alike.

:func:`sweep_runner` is a batch runner (see :mod:`isolation.app.batch.runners`),
so a sweep has the same executors, progress, resume and summary as a record
batch: ``python -m isolation batch BATCH.toml --direct``. A worker given a
chunk of variants runs them together (:func:`sweep_many`): the lower /
nominal / upper iterations of every alternative of the chunk in one call of
the array kernel (:mod:`isolation.design.array_kernel`), alternatives that do not
change between variants designed once. Variants that change only bearing
properties, property factors or moats (:func:`variant_study`) are validated
key by key against the base study parsed once (the same key rules and
messages as the study reader), which is what makes 10^4-variant grids quick
to validate (:func:`validate_direct`).
"""

from __future__ import annotations

import dataclasses
import time

from isolation.app.batch.rows import fixed_base_elastic_shear, rows_from_results
from isolation.app.batch.runners import VariantOutcome, VariantTask, guarded_call
from isolation.app.batch.variants import _alternative_key, _context_key, variant_study  # noqa: F401 - re-exported

__all__ = ["sweep_runner", "design_rows", "design_rows_many", "sweep_many", "variant_study", "check_direct",
           "validate_direct"]

EQUIVALENT_LINEAR = "equivalent linear"


def design_rows(study) -> list[dict]:
    """Summary rows of one study from the equivalent-linear design of each alternative.

    Parameters
    ----------
    study : isolation.study.Study
        A validated study.

    Returns
    -------
    list of dict
        One row per alternative (columns of :mod:`isolation.app.batch.summary`).
    """
    from isolation.study.stages import design_study

    design = design_study(study)
    alternatives = [_judged(study, design.spectrum, alternative) for alternative in design.alternatives]
    shear = fixed_base_elastic_shear(design.spectrum, design.fixed_base_period, study.building.total_weight)
    return rows_from_results({"alternatives": alternatives}, shear, verdict_basis=EQUIVALENT_LINEAR)


def _judged(study, spectrum, design) -> dict:
    """One alternative's row input (an :class:`isolation.study.stages.AlternativeDesign`): bounds,
    quantities and the verdict on the equivalent-linear numbers."""
    from isolation import verdict
    from isolation.study.stages import alternative_figures

    judged = verdict.assess(alternative_figures(study, spectrum, design))
    return {
        "name": design.name,
        "bounds": design.bound_numbers(),
        "quantities": design.quantities.to_dict(),
        "figures": {"floor_acceleration_ratio": None},
        "verdict": {"outcome": judged.outcome},
    }


def sweep_runner(task: VariantTask) -> VariantOutcome:
    """Batch runner of the direct sweep: one variant, equivalent-linear only, no record."""
    started = time.perf_counter()
    study = variant_study(task.study_file, task.overrides)
    rows = design_rows(study)
    return VariantOutcome(task.variant_id, "done", rows=tuple(rows), elapsed=time.perf_counter() - started)


# --- many variants at once ---------------------------------------------------------------

def design_rows_many(studies: list) -> list:
    """:func:`design_rows` for many studies, the iterations of all alternatives in one kernel call.

    Alternatives equal in equal contexts (site, building, basis) are designed
    once. Results equal :func:`design_rows` to round-off.

    Parameters
    ----------
    studies : list of isolation.study.Study

    Returns
    -------
    list
        Per study its list of rows, or the exception its design raised
        (:func:`design_rows` raises the same one).
    """
    prepared, todo = _prepare_many(studies)
    judged = _design_many(todo)
    return gather_rows(prepared, judged.__getitem__, lambda found, context: rows_from_results(
        {"alternatives": found}, context["shear"], verdict_basis=EQUIVALENT_LINEAR))


def gather_rows(prepared: list, result_of, rows_of) -> list:
    """Per prepared study, its rows from the shared results of its alternatives.

    ``prepared`` holds per study its exception or ``(context, keys)``; ``result_of(key)`` is the
    result of one alternative, or the exception it raised; ``rows_of(results, context)`` makes the
    rows. Returns per study the exception of its preparation, else the first of its alternatives',
    else its rows.
    """
    out: list[Exception | list[dict]] = []
    for entry in prepared:
        if isinstance(entry, Exception):
            out.append(entry)
            continue
        context, keys = entry
        found = [result_of(k) for k in keys]
        failed = next((f for f in found if isinstance(f, Exception)), None)
        out.append(failed if failed is not None else rows_of(found, context))
    return out


def _prepare_many(studies: list) -> tuple[list, dict]:
    """Per study (context, alternative keys) or its exception, and the distinct alternatives to design:
    (context id, alternative key) -> [alternative, system, property sets, context]."""
    from isolation.study import assembly as model

    contexts: dict = {}
    prepared: list = []
    todo: dict = {}
    for study in studies:
        try:
            ckey = _context_key(study)
            context = contexts.get(ckey) if ckey is not None else None
            if context is None:
                spectrum = model.site_spectrum(study)
                period, _ = model.fixed_base_period(study)
                context = {"spectrum": spectrum, "period": period, "study": study,
                           "rule": spectrum.rule,
                           "shear": fixed_base_elastic_shear(spectrum, period, study.building.total_weight)}
                if ckey is not None:
                    contexts[ckey] = context
            keys = []
            for alternative in study.alternatives:
                key = (id(context), _alternative_key(alternative))
                if key not in todo:
                    system = model.isolation_system(alternative)
                    todo[key] = [alternative, system, system.property_sets(study.building.total_weight), context]
                keys.append(key)
            prepared.append((context, keys))
        except Exception as error:  # noqa: BLE001 - reported per study, as design_rows raises it
            prepared.append(error)
    return prepared, todo


def _design_many(todo: dict) -> dict:
    """Key -> judged alternative (or its exception): the bounds of each context's alternatives in one
    array-kernel call, then the code design and verdict of each."""
    from isolation.design.array_kernel import design_bounds_many
    from isolation.study.stages import alternative_design

    by_spectrum: dict = {}
    for key, entry in todo.items():
        by_spectrum.setdefault(id(entry[3]), []).append(key)
    judged: dict = {}
    for keys in by_spectrum.values():
        context = todo[keys[0]][3]
        study = context["study"]
        bounds = _bounds_each([todo[k][2] for k in keys], study.building.total_weight, context, design_bounds_many)
        for key, found in zip(keys, bounds, strict=True):
            alternative, system, sets, _ = todo[key]
            try:
                if isinstance(found, Exception):
                    raise found
                design = alternative_design(study, alternative, context["spectrum"], context["period"],
                                            system=system, sets=sets, bounds=found)
                judged[key] = _judged(study, context["spectrum"], design)
            except Exception as error:  # noqa: BLE001
                judged[key] = error
    return judged


def _bounds_each(property_sets: list, weight: float, context: dict, many) -> list:
    """Bounds of every alternative; one without a result gets its exception (the others still run)."""
    try:
        return many(property_sets, weight, context["spectrum"], context["rule"])
    except Exception:  # noqa: BLE001 - find which one: each alone
        found = []
        for sets in property_sets:
            try:
                found.append(many([sets], weight, context["spectrum"], context["rule"])[0])
            except Exception as error:  # noqa: BLE001
                found.append(error)
        return found


def sweep_many(tasks: list) -> list:
    """The direct sweep of several variants in one worker call (see :func:`sweep_runner`).

    Variants whose study or design fails are run again alone through
    :func:`isolation.app.batch.runners.guarded_call`, so their outcome (and message)
    is the one :func:`sweep_runner` gives.
    """
    started = time.perf_counter()
    studies, index = [], []
    outcomes: list = [None] * len(tasks)
    for i, task in enumerate(tasks):
        try:
            studies.append(variant_study(task.study_file, task.overrides))
            index.append(i)
        except Exception:  # noqa: BLE001 - alone below, for its own message
            pass
    for i, rows in zip(index, design_rows_many(studies), strict=True):
        if not isinstance(rows, Exception):
            outcomes[i] = VariantOutcome(tasks[i].variant_id, "done", rows=tuple(rows))
    share = (time.perf_counter() - started) / max(len(tasks), 1)
    for i, task in enumerate(tasks):
        if outcomes[i] is None:
            outcomes[i] = guarded_call(sweep_runner, task)
        else:
            outcomes[i] = dataclasses.replace(outcomes[i], elapsed=share)
    return outcomes


sweep_runner.many = sweep_many  # type: ignore[attr-defined]  # chunks run together (runners.guarded_chunk)


from isolation.app.batch.sweep_check import check_direct, validate_direct  # noqa: E402, F401 - re-exported
