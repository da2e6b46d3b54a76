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
import functools
import re
import time
from pathlib import Path
from typing import Any, Mapping

from isolation.app.batch.rows import fixed_base_elastic_shear, rows_from_results
from isolation.app.batch.runners import VariantOutcome, VariantTask, guarded_call

__all__ = ["sweep_runner", "design_rows", "design_rows_many", "sweep_many", "variant_study", "check_direct",
           "validate_direct"]

EQUIVALENT_LINEAR = "equivalent linear"


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

_FAST_KEY = re.compile(r"^alternative\.(\d+)\."
                       r"(?:bearings\.(\d+)\.([a-z_0-9]+)|property_factors\.(lower|upper)|(moat))$")
_FIXED_BEARING_KEYS = ("type", "count", "axial_load")  # change shares or the model: the full parse


def _normal_key(key: Any) -> str | None:
    return re.sub(r"\[(\d+)\]", r".\1", key) if isinstance(key, str) else None


def _split(overrides: Mapping) -> tuple[dict, tuple] | None:
    """(fast overrides by key match, the rest as a hashable key) or None when the rest is unhashable."""
    fast, rest = {}, []
    for key, value in overrides.items():
        match = _FAST_KEY.match(_normal_key(key) or "")
        if match and match.group(3) not in _FIXED_BEARING_KEYS:
            fast[key] = (match, value)
        else:
            rest.append((key, value))
    try:
        rest_key = tuple(sorted(rest, key=lambda item: str(item[0])))
        hash(rest_key)
    except TypeError:
        return None
    return fast, rest_key


@functools.lru_cache(maxsize=256)
def _base_study(study_file: str, modified: float, rest: tuple):
    """The study with the non-fast overrides applied, parsed once (or the error it gives)."""
    from isolation.study import apply_overrides, parse_study

    path = Path(study_file)
    try:
        return parse_study(apply_overrides(_base_mapping(study_file, modified), dict(rest)), source=path.name,
                           base_dir=path.parent)
    except ValueError as error:
        return error


def _apply_fast(base, fast: dict, source: str):
    """``base`` with bearing properties, property factors and moats replaced; None: use the full parse."""
    from isolation.study import BEARING_KEYS, StudyError
    from isolation.study.keys import Problems, Reader
    from isolation.study.sections import _cross_check_bearing

    problems = Problems()
    alternatives = list(base.alternatives)
    bearing_changes: dict[tuple[int, int], dict] = {}
    other: dict[int, dict] = {}
    for match, value in fast.values():
        i = int(match.group(1))
        if i >= len(alternatives):
            return None
        if match.group(2) is not None:
            j = int(match.group(2))
            if j >= len(alternatives[i].bearings):
                return None
            if match.group(3) not in BEARING_KEYS[alternatives[i].bearings[j].type]:
                return None  # an unknown key: the full parse names it
            bearing_changes.setdefault((i, j), {})[match.group(3)] = value
        else:
            other.setdefault(i, {})[match.group(4) or "moat"] = value
    for (i, j), values in bearing_changes.items():
        spec = alternatives[i].bearings[j]
        reader = Reader(values, f"alternative[{i}].bearings[{j}]", problems, base.units)
        properties = dict(spec.properties)
        for name in values:
            number = reader.by_spec(name, BEARING_KEYS[spec.type][name])
            if number is not None:
                properties[name] = number
        _cross_check_bearing(reader, spec.type, properties)
        bearings = list(alternatives[i].bearings)
        bearings[j] = dataclasses.replace(spec, properties=properties)
        alternatives[i] = dataclasses.replace(alternatives[i], bearings=tuple(bearings))
    for i, values in other.items():
        changes = {}
        if "moat" in values:
            reader = Reader(values, f"alternative[{i}]", problems, base.units)
            changes["moat"] = reader.quantity("moat", "length", low=0.0, high=5.0, low_inclusive=False)
        factors = {k: v for k, v in values.items() if k in ("lower", "upper")}
        if factors:
            reader = Reader(factors, f"alternative[{i}].property_factors", problems, base.units)
            if "lower" in factors:
                changes["lower_factor"] = reader.number("lower", low=0.3, high=1.0)
            if "upper" in factors:
                changes["upper_factor"] = reader.number("upper", low=1.0, high=3.0)
        alternatives[i] = dataclasses.replace(alternatives[i], **changes)
    if problems:
        raise StudyError(problems.items, source)
    return dataclasses.replace(base, alternatives=tuple(alternatives))


def variant_study(study_file: str | Path, overrides: Mapping[str, Any]):
    """The validated study of one variant: ``parse_study(apply_overrides(base, overrides))``.

    Overrides of bearing properties (``alternative.I.bearings.J.<property>``),
    property factors and moats are checked key by key (same rules and
    messages as the study reader) on the base study parsed once per process;
    any other override goes through the full parse, as does a variant whose
    quick check finds nothing to judge by.

    Parameters
    ----------
    study_file : str or Path
        Base study file.
    overrides : mapping
        Dotted key paths and values.

    Returns
    -------
    isolation.study.Study

    Raises
    ------
    isolation.study.StudyError
        The variant's problems, naming the key, the value and what is allowed.
    """
    from isolation.study import apply_overrides, parse_study

    path = Path(study_file)
    modified = path.stat().st_mtime
    split = _split(overrides)
    if split is not None:
        fast, rest = split
        base = _base_study(str(path), modified, rest)
        if not isinstance(base, Exception):
            study = _apply_fast(base, fast, path.name)
            if study is not None:
                return study
    return parse_study(apply_overrides(_base_mapping(str(path), modified), overrides), source=path.name,
                       base_dir=path.parent)


def _alternative_key(alternative) -> tuple:
    return (alternative.name, alternative.lower_factor, alternative.upper_factor, alternative.moat,
            tuple((b.type, b.count, b.axial_load, b.axial_load_given, tuple(sorted(b.properties.items())))
                  for b in alternative.bearings))


def _context_key(study):
    try:
        key = (study.basis, study.units, study.site, study.building, study.wind_base_shear)
        hash(key)
        return key
    except TypeError:
        return None


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
    out: list[Exception | list[dict]] = []
    for entry in prepared:
        if isinstance(entry, Exception):
            out.append(entry)
            continue
        context, keys = entry
        found = [judged[k] for k in keys]
        failed = next((f for f in found if isinstance(f, Exception)), None)
        out.append(failed if failed is not None else
                   rows_from_results({"alternatives": found}, context["shear"], verdict_basis=EQUIVALENT_LINEAR))
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
        for key, found in zip(keys, bounds):
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
    for i, rows in zip(index, design_rows_many(studies)):
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
