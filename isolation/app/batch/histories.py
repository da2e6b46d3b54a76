"""History sweeps: response histories for every variant of a batch, no notebook per variant.

``python -m isolation batch BATCH.toml --direct --histories`` designs every
variant like the direct sweep (:mod:`isolation.app.batch.sweep`, array kernel)
and then runs the isolated building for the lower and upper property sets of
each alternative under one chosen suite of motions, as the study run does
(:func:`isolation.study.runner.run_study`: same isolator laws, same suite-mean
summary, same verdict on the response-history numbers), but without a
notebook or record per variant.

* **Motions, chosen once**: ``--motions SUITE.json`` (a suite written by
  ``python -m isolation motions``), or else the base study's matched suite,
  generated once into ``<batch folder>/motions/`` (the check range around the
  base study's own periods; ``--quick`` gives the small trial suite).
* **Fixed base once**: the superstructure on a fixed base under that suite is
  run once in the main process (``motions/fixed_base.json``); a variant that
  changes the building gets its own, once per worker process.
* **Chunks of seconds**: a task is a few variants (:func:`history_chunk`),
  whose cases run together in the ensemble engine; alternatives that do not
  change between variants (the other bearing type of the study) are run once
  per worker process.
* **Where**: the local pool, a dask LocalCluster or a dask scheduler
  (``--scheduler``); workers read the motions from the batch folder, so on a
  remote cluster it must be on a file system the workers share.
* **Progress and resume** come from the batch runner
  (:func:`isolation.app.batch.execute.run_batch`): ``batch.json`` keeps every
  finished variant; the input hash includes the motions, so a changed suite
  runs the variants again. Interrupt with Ctrl-C, run the same command to go on.

Rows carry the summary columns (``verdict_basis`` = ``response histories``)
plus :data:`isolation.app.batch.summary.HISTORY_COLUMNS` for the design-space
maps (:mod:`isolation.app.batch.maps`).

Scope: screening of many alternatives for a feasibility study; the numbers
rest on simplified models. Run the promising variants as full studies and
have a licensed structural engineer check them against the local code.
"""

from __future__ import annotations

import time
from typing import Mapping

import numpy as np

from isolation.app.batch.history_motions import (  # noqa: F401 - FIXED_FILE, SOURCE_FILE, SUITE_NAME re-exported
    FIXED_FILE,
    MOTIONS_FOLDER,
    SOURCE_FILE,
    SUITE_NAME,
    _comparison,
    _fixed_runs,
    _load,
    _structure_fingerprint,
    _suite_hash,
    prepare_motions,
    with_motions,
)
from isolation.app.batch.rows import rows_from_results
from isolation.app.batch.runners import VariantOutcome, VariantTask, guarded_call
from isolation.app.batch.sweep import _bounds_each, fixed_base_elastic_shear, gather_rows
from isolation.app.batch.variants import _alternative_key, _context_key, variant_study

__all__ = ["MOTIONS_FOLDER", "prepare_motions", "with_motions", "history_runner", "history_many",
           "history_chunk", "history_rows", "warm_worker"]

RESPONSE_HISTORIES = "response histories"
CASES = ("lower", "upper")
TARGET_TASK = 4.0  # wall time a task should take on one worker [s]
ENSEMBLE_LIMIT = 4  # alternatives stepped together in one engine call [-]
# (8 cases x 7 records of 6000 steps: measured on the demo study, 4 gave the least CPU per
# variant and about 70 MB over the worker's base; 24 took 1.5x the CPU and 570 MB)


def history_chunk(count: int, workers: int, records: int, steps: int) -> int:
    """Variants per task so that a task takes a few seconds.

    Parameters
    ----------
    count : int
        Variants to run. [-]
    workers : int
        Worker processes. [-]
    records : int
        Motions in the suite. [-]
    steps : int
        Time steps per motion. [-]

    Returns
    -------
    int
        Variants per task: about :data:`TARGET_TASK` seconds at 2 us per
        record-step-case (the ensemble engine on one core, measured on this
        project's demo study; cases of a task are stepped together, so more
        per task is cheaper per case), and at most count/(2 max(workers, 2))
        so every worker gets work (one worker gets the chunks two would, so
        their timings compare). The tasks are then made equal and their
        number a multiple of max(workers, 2): no worker runs the last chunk
        alone while the others wait (with 11 chunks of 23 and one of 3, two
        workers would share 256 variants 138 to 118).
    """
    per_variant = 2 * records * steps * 2e-6  # two bounds [s]
    lanes = max(int(workers), 2)
    size = max(1, min(max(1, int(TARGET_TASK / max(per_variant, 1e-9))), -(-count // (2 * lanes))))
    tasks = -(-count // size)
    tasks = -(-tasks // lanes) * lanes
    return max(1, -(-count // tasks))


# --- the runs ---------------------------------------------------------------------------------

_DONE: dict = {}  # (context, alternative, motions) -> judged alternative; this worker process
_FIXED: dict = {}  # superstructure fingerprint -> fixed-base statistics; this worker process
_CACHE_LIMIT = 256


def history_rows(alternatives: list, shear: float) -> list[dict]:
    """Summary rows (with :data:`isolation.app.batch.summary.HISTORY_COLUMNS`) of judged alternatives."""
    rows = rows_from_results({"alternatives": alternatives}, shear, verdict_basis=RESPONSE_HISTORIES)
    for row, alternative in zip(rows, alternatives, strict=True):
        summary = alternative["history"]
        fixed = summary["floor_acceleration_fixed"]
        row.update({
            "history_displacement_lower_m": summary["isolator_displacement_lower"],
            "history_displacement_upper_m": summary["isolator_displacement_upper"],
            "history_displacement_torsion_m": summary["isolator_displacement_with_torsion"],
            "floor_acceleration_fixed_g": fixed,
            "floor_acceleration_lower_g": summary["floor_acceleration_lower"],
            "floor_acceleration_upper_g": summary["floor_acceleration_upper"],
            "floor_acceleration_reduction_lower": 1.0 - summary["floor_acceleration_lower"] / fixed,
            "floor_acceleration_reduction_upper": 1.0 - summary["floor_acceleration_upper"] / fixed,
            "drift_ratio_isolated": summary["drift_ratio_isolated"],
        })
    return rows


def history_runner(task: VariantTask) -> VariantOutcome:
    """Batch runner of a history sweep: one variant (see :func:`history_many`)."""
    started = time.perf_counter()
    found = _run([task])[0]
    if isinstance(found, Exception):
        raise found
    return VariantOutcome(task.variant_id, "done", rows=tuple(found), elapsed=time.perf_counter() - started)


def history_many(tasks: list) -> list:
    """A history sweep of several variants in one worker call, their cases in one ensemble.

    A variant whose study, design or history fails runs again alone through
    :func:`isolation.app.batch.runners.guarded_call`, so its outcome names its own error.
    """
    started = time.perf_counter()
    found = _run(tasks)
    share = (time.perf_counter() - started) / max(len(tasks), 1)
    return [guarded_call(history_runner, task) if isinstance(rows, Exception)
            else VariantOutcome(task.variant_id, "done", rows=tuple(rows), elapsed=share)
            for task, rows in zip(tasks, found, strict=True)]


history_runner.many = history_many  # type: ignore[attr-defined]  # chunks run together (runners.guarded_chunk)


def warm_worker() -> bool:
    """Load in this worker what a history task needs (modules, the compiled engine); True when compiled.

    Submitted to the workers while one of them prepares the motions, so the others do not load it
    when their first task arrives.
    """
    from isolation.dynamics.newmark import kernel_module
    from isolation.study import stages  # noqa: F401

    return hasattr(kernel_module().run_columns, "py_func")


def _run(tasks: list) -> list:
    """Rows per task, or the exception that stopped it."""
    acc, dt, fixed_file = _load(tasks[0])
    prepared, todo = _prepare(tasks, acc, dt, fixed_file)
    judged = _run_todo(todo, acc, dt)
    for key, value in judged.items():
        if not isinstance(value, Exception):
            if len(_DONE) >= _CACHE_LIMIT:
                _DONE.pop(next(iter(_DONE)))
            _DONE[key] = value
    return gather_rows(prepared, lambda k: judged[k] if k in judged else _DONE[k],
                       lambda found, context: history_rows(found, context["shear"]))


def _context(study, ckey, acc: np.ndarray, dt: float, fixed_file: Mapping) -> dict:
    """What the variants of one study context share: spectrum, T_fb, superstructure, comparison building,
    fixed-base statistics and indicators, base mass, elastic fixed-base shear."""
    from isolation import GRAVITY
    from isolation.study import assembly as model

    spectrum = model.site_spectrum(study)
    period, _ = model.fixed_base_period(study)
    structure = model.superstructure(study)
    comparison = _comparison(study, spectrum, structure, period)
    fingerprint = _structure_fingerprint(comparison.building)
    fixed_runs = _fixed(study, comparison, structure, fingerprint, fixed_file, acc, dt)
    return {"spectrum": spectrum, "period": period, "study": study, "structure": structure,
            "rule": spectrum.rule,
            "comparison": comparison, "fixed": fixed_runs["statistics"],
            "fixed_indicators": fixed_runs["indicators"],
            "key": (fingerprint, repr(ckey) if ckey is not None else id(study)),
            "base_mass": study.building.base_weight / GRAVITY,
            "shear": fixed_base_elastic_shear(spectrum, period, study.building.total_weight)}


def _prepare(tasks: list, acc: np.ndarray, dt: float, fixed_file: Mapping) -> tuple[list, dict]:
    """Per task (context, alternative keys) or its exception, and the alternatives not yet run in this
    process: key -> [alternative, system, property sets, context]."""
    from isolation.study import assembly as model

    motion_key = _suite_hash(acc, dt)
    contexts: dict = {}
    prepared: list = []
    todo: dict = {}
    for task in tasks:
        try:
            study = variant_study(task.study_file, task.overrides)
            ckey = _context_key(study)
            context = contexts.get(ckey) if ckey is not None else None
            if context is None:
                context = _context(study, ckey, acc, dt, fixed_file)
                if ckey is not None:
                    contexts[ckey] = context
            keys = []
            for alternative in study.alternatives:
                key = (context["key"], _alternative_key(alternative), motion_key)
                if key not in _DONE and key not in todo:
                    system = model.isolation_system(alternative)
                    todo[key] = [alternative, system, system.property_sets(study.building.total_weight), context]
                keys.append(key)
            prepared.append((context, keys))
        except Exception as error:  # noqa: BLE001 - reported per variant
            prepared.append(error)
    return prepared, todo


def _run_todo(todo: dict, acc: np.ndarray, dt: float) -> dict:
    """Key -> judged alternative (or its exception): per context the bounds in one array-kernel call,
    the code designs, then the histories of up to :data:`ENSEMBLE_LIMIT` alternatives per engine call."""
    from isolation.design.array_kernel import design_bounds_many
    from isolation.study.stages import alternative_design

    judged: dict = {}
    by_context: dict = {}
    for key, entry in todo.items():
        by_context.setdefault(id(entry[3]), []).append(key)
    for keys in by_context.values():
        context = todo[keys[0]][3]
        bounds = _bounds_each([todo[k][2] for k in keys], context["study"].building.total_weight, context,
                              design_bounds_many)
        designed = []
        for key, found in zip(keys, bounds, strict=True):
            alternative, system, sets, _ = todo[key]
            try:
                if isinstance(found, Exception):
                    raise found
                design = alternative_design(context["study"], alternative, context["spectrum"], context["period"],
                                            system=system, sets=sets, bounds=found)
                designed.append((key, found, design, design.history_isolators(CASES)))
            except Exception as error:  # noqa: BLE001
                judged[key] = error
        for start in range(0, len(designed), ENSEMBLE_LIMIT):
            part = designed[start:start + ENSEMBLE_LIMIT]
            for (key, _, design, _), stats in zip(part, _histories(context, part, acc, dt), strict=True):
                if isinstance(stats, Exception):
                    judged[key] = stats
                    continue
                try:
                    judged[key] = _judge(context, design, stats)
                except Exception as error:  # noqa: BLE001
                    judged[key] = error
    return judged


def _fixed(study, comparison, structure, fingerprint: str, fixed_file: Mapping, acc: np.ndarray,
           dt: float) -> Mapping:
    """Fixed-base runs: the batch's when the building is the base study's, else run once here."""
    if fingerprint == fixed_file.get("structure") and "indicators" in fixed_file:
        return fixed_file
    if fingerprint not in _FIXED:
        _FIXED[fingerprint] = _fixed_runs(study, comparison, structure, acc, dt)
    return _FIXED[fingerprint]


def _histories(context: dict, part: list, acc: np.ndarray, dt: float) -> list:
    """(statistics per case, indicators per case, isolated storey design) per designed alternative of ``part``.

    Alternatives whose superstructure above the isolators is the same (elastic, or yielding at the same
    strengths) run in one engine call.
    """
    from isolation.dynamics.history import run_cases
    from isolation.performance.comparison import isolated_superstructure, response_indicators, thresholds_of

    study, structure = context["study"], context["structure"]
    thresholds = thresholds_of(study)
    above = []
    for _, _, design, _ in part:
        try:
            above.append(isolated_superstructure(study, design.report, structure))
        except Exception as error:  # noqa: BLE001 - reported per variant
            above.append(error)
    out: list = [None] * len(part)
    groups: dict = {}
    for i, item in enumerate(above):
        if isinstance(item, Exception):
            out[i] = item
        else:
            groups.setdefault(_structure_fingerprint(item[0]), []).append(i)
    for members in groups.values():
        building = above[members[0]][0]
        isolators = {f"{i}:{case}": law for i in members for case, law in part[i][3].items()}
        try:
            results = run_cases(building, context["base_mass"], isolators, acc, dt, include_fixed=False)
        except Exception as error:  # noqa: BLE001 - one case may be at fault: each alone
            if len(members) == 1:
                out[members[0]] = error
                continue
            for i in members:
                out[i] = _histories(context, [part[i]], acc, dt)[0]
            continue
        comparison = context["comparison"]
        for i in members:
            design = above[i][1]
            strengths = design.yield_shears if comparison.yielding else None
            out[i] = ({case: results[f"{i}:{case}"].statistics() for case in CASES},
                      {case: response_indicators(results[f"{i}:{case}"], strengths, thresholds) for case in CASES},
                      design)
    return out


def _judge(context: dict, design, histories) -> dict:
    """The study run's verdict for one alternative (an :class:`isolation.study.stages.AlternativeDesign`)
    from its history statistics."""
    from isolation import verdict
    from isolation.performance.comparison import comparison_summary
    from isolation.plain import plain
    from isolation.study.stages import HistorySummary, alternative_figures

    stats, case_indicators, isolated_design = histories
    indicators = {**context["fixed_indicators"], **plain(case_indicators)}
    summary = HistorySummary.from_statistics(
        stats, context["fixed"], design.quantities.torsion_factor,
        comparison_summary(indicators, context["comparison"].design, isolated_design))
    judged = verdict.assess(alternative_figures(context["study"], context["spectrum"], design, summary))
    return {
        "name": design.name,
        "bounds": design.bound_numbers(),
        "quantities": design.quantities.to_dict(),
        "figures": {"floor_acceleration_ratio": summary.floor_acceleration_ratio},
        "verdict": {"outcome": judged.outcome},
        "history": summary.to_dict(),
    }
