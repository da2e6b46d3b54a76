"""Validate every variant of a batch before anything runs.

Each variant's overrides are applied to the base study and the result is
parsed like any study file (:func:`isolation.study.parse_study`) and checked
against its own models (:func:`isolation.study.runner.check_study`); all
problems of the batch are reported together in one
:class:`~isolation.errors.InputError`. Large batches are checked in chunks on
the batch's executor, so validation uses the same workers as the runs.
"""

from __future__ import annotations

import hashlib
import json
import math
from concurrent.futures import Executor
from pathlib import Path
from typing import Any, Mapping

from isolation.app.batch.plan import BatchPlan
from isolation.errors import InputError

__all__ = ["validate_plan", "variant_hash", "check_variants"]

CHUNK_FROM = 64  # batches this large are checked in parallel on an executor [variants]


def _hashable(value: Any) -> Any:
    """Values made JSON-stable for hashing (NaN and infinity as text, others as str)."""
    if isinstance(value, Mapping):
        return {str(k): _hashable(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_hashable(v) for v in value]
    if isinstance(value, float) and not math.isfinite(value):
        return repr(value)
    if isinstance(value, (str, int, float, bool)) or value is None:
        return value
    return str(value)


def variant_hash(study_mapping: Mapping, settings: Mapping | None = None) -> str:
    """SHA-256 of a variant's full input: the validated study and the run settings.

    Parameters
    ----------
    study_mapping : mapping
        The validated study (``Study.to_dict()``, internal units) with the
        variant's overrides applied; tabulated spectrum values are part of
        it, so ``2.5`` and ``"2500 mm"`` give the same hash.
    settings : mapping, optional
        Run settings that change results (mode, quick suites).

    Returns
    -------
    str
        Hex digest.
    """
    payload = json.dumps({"study": _hashable(study_mapping), "settings": _hashable(settings or {})}, sort_keys=True)
    return hashlib.sha256(payload.encode("utf-8")).hexdigest()


def check_variants(study_file: str, items: list, settings: Mapping | None = None, model_checks: bool = True) -> list:
    """Check ``items`` [(variant id, overrides)] against the study; picklable for workers.

    ``model_checks`` adds :func:`isolation.study.runner.check_study` (time step
    against the superstructure, bearings buildable): needed before response
    histories, not for an equivalent-linear sweep.

    Returns
    -------
    list of (str, str or None, str or None)
        Variant id, input hash (None when invalid), one-line problem (None when valid).
    """
    from isolation import study as study_module
    from isolation.study.runner import check_study

    path = Path(study_file)
    base = study_module.read_study_mapping(path)
    found: list[tuple[str, str | None, str | None]] = []
    pieces: dict = {}
    studies = study_module.parse_variants(base, (overrides for _, overrides in items), source=path.name,
                                          base_dir=path.parent)
    for (variant_id, _), study in zip(items, studies, strict=True):
        try:
            if isinstance(study, Exception):
                raise study
            if model_checks:
                check_study(study)  # the study against its own models (time step, bearings)
        except ValueError as error:
            found.append((variant_id, None, " ".join(str(error).split())))
            continue
        found.append((variant_id, _study_hash(study, settings, pieces), None))
    return found


def _study_hash(study, settings: Mapping | None, pieces: dict) -> str:
    """:func:`variant_hash` of ``study.to_dict()``, the same digest, with the JSON text of each
    part of the study made once (``pieces``: a cache over the variants of one batch)."""
    from dataclasses import asdict, fields

    from isolation.plain import plain

    def text_of(value) -> str:
        # Parts taken from the validation cache are the same objects from variant to variant.
        known = pieces.get(id(value))
        if known is not None and known[0] is value:
            return known[1]
        converted = asdict(value) if hasattr(value, "__dataclass_fields__") else value
        text = json.dumps(_hashable(plain(converted, keep_nonfinite=True)), sort_keys=True)
        if hasattr(value, "__dataclass_fields__"):
            pieces[id(value)] = (value, text)  # the value is kept: its id is not reused
        return text

    parts = []
    for item in fields(study):
        value = getattr(study, item.name)
        if isinstance(value, tuple):  # the alternatives: one piece each
            parts.append((item.name, "[" + ", ".join(text_of(v) for v in value) + "]"))
        else:
            parts.append((item.name, text_of(value)))
    body = ", ".join(f"{json.dumps(name)}: {text}" for name, text in sorted(parts))
    payload = "{" + f'"settings": {json.dumps(_hashable(settings or {}), sort_keys=True)}, "study": {{{body}}}' + "}"
    return hashlib.sha256(payload.encode("utf-8")).hexdigest()


def validate_plan(plan: BatchPlan, settings: Mapping | None = None, *, executor: Executor | None = None,
                  chunks: int = 8, model_checks: bool = True) -> dict[str, str]:
    """Check every variant of ``plan`` against the study before anything runs.

    Parameters
    ----------
    plan : BatchPlan
    settings : mapping, optional
        Run settings folded into each variant's input hash.
    executor : concurrent.futures.Executor, optional
        Check batches of :data:`CHUNK_FROM` variants or more in parallel.
    chunks : int
        Pieces the variants are split into on the executor. [-]
    model_checks : bool
        Also check each study against its own models (see :func:`check_variants`).

    Returns
    -------
    dict
        Variant id -> input hash (see :func:`variant_hash`).

    Raises
    ------
    InputError
        One message listing every invalid variant with the key path, the
        value and what is allowed.
    """
    from isolation.study import read_study_mapping

    read_study_mapping(plan.study_file)  # a missing or malformed base study: one clear error
    items = [(v.variant_id, plan.overrides_for(v)) for v in plan.variants]
    settings = dict(settings or {})
    if executor is None or len(items) < CHUNK_FROM:
        found = check_variants(str(plan.study_file), items, settings, model_checks)
    else:
        size = -(-len(items) // max(int(chunks), 1))
        parts = [items[i:i + size] for i in range(0, len(items), size)]
        futures = [executor.submit(check_variants, str(plan.study_file), part, settings, model_checks)
                   for part in parts]
        found = [entry for future in futures for entry in future.result()]
    problems = [f"[{variant_id}] {problem}" for variant_id, _, problem in found if problem]
    if problems:
        raise InputError(
            f"{plan.batch_file.name}: {len(problems)} of {len(items)} variants are invalid: " + "; ".join(problems)
        )
    return {variant_id: digest for variant_id, digest, _ in found}
