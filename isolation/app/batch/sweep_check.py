"""Validation of a direct sweep: every variant checked before anything runs, quickly.

:func:`validate_direct` is :func:`isolation.app.batch.check.validate_plan` for
``python -m isolation batch --direct`` (no model checks): the same hashes and
the same one-message error, with variants of bearing properties, property
factors and moats checked key by key on the base study parsed once
(:func:`isolation.app.batch.variants.variant_study`). Re-exported from
:mod:`isolation.app.batch.sweep`.
"""

from __future__ import annotations

from concurrent.futures import Executor
from typing import Mapping

from isolation.app.batch.variants import _alternative_key, variant_study

__all__ = ["check_direct", "validate_direct"]


def check_direct(study_file: str, items: list, settings: Mapping | None = None) -> list:
    """:func:`isolation.app.batch.check.check_variants` for a direct sweep (no model checks), quick for
    variants of bearing properties, property factors and moats (see :func:`variant_study`).

    Returns
    -------
    list of (str, str or None, str or None)
        Variant id, input hash (None when invalid), one-line problem (None when valid).
    """
    found: list[tuple[str, str | None, str | None]] = []
    parts: dict = {}
    for variant_id, overrides in items:
        try:
            study = variant_study(study_file, overrides)
        except ValueError as error:
            found.append((variant_id, None, " ".join(str(error).split())))
            continue
        found.append((variant_id, _variant_hash(study, parts, settings), None))
    return found


def _variant_hash(study, parts: dict, settings) -> str:
    """:func:`isolation.app.batch.check.variant_hash` of ``study.to_dict()``, the parts that variants of
    one base study share made hashable once."""
    import hashlib
    import json

    from isolation.app.batch.check import _hashable

    mapping = _study_dict(study, parts)
    cache = parts.setdefault("hashable", {})
    shared = cache.get(id(mapping["_shared"]))
    if shared is None or shared[0] is not mapping["_shared"]:
        shared = (mapping["_shared"], _hashable(mapping["_shared"]))
        cache[id(mapping["_shared"])] = shared
    alternatives = []
    for key, value in zip(mapping["_keys"], mapping["alternatives"], strict=True):
        if key not in cache:
            cache[key] = _hashable(value)
        alternatives.append(cache[key])
    payload = {"study": {**shared[1], "alternatives": alternatives}, "settings": _hashable(settings or {})}
    return hashlib.sha256(json.dumps(payload, sort_keys=True).encode("utf-8")).hexdigest()


_SHARED_FIELDS = ("project", "basis", "units", "site", "building", "analysis", "wind_base_shear", "source")


def _study_dict(study, parts: dict) -> dict:
    """``study.to_dict()`` in parts: ``_shared`` (all but the alternatives, shared by the variants of
    one base study: same objects), ``alternatives`` and their ``_keys``."""
    from dataclasses import asdict

    from isolation.plain import plain

    shared = tuple(getattr(study, name) for name in _SHARED_FIELDS)
    key = tuple(map(id, shared))
    entry: tuple | None = parts.get(key)
    if entry is None or any(a is not b for a, b in zip(entry[0], shared, strict=True)):
        whole = study.to_dict()
        entry = (shared, {k: v for k, v in whole.items() if k != "alternatives"}, {})
        parts[key] = entry
    alternatives, keys = [], []
    for alternative in study.alternatives:
        akey = _alternative_key(alternative)
        if akey not in entry[2]:
            entry[2][akey] = plain(asdict(alternative), keep_nonfinite=True)
        alternatives.append(entry[2][akey])
        keys.append(("alternative", akey))
    return {"_shared": entry[1], "_keys": keys, "alternatives": alternatives}


def validate_direct(plan, settings: Mapping | None = None, *, executor: Executor | None = None,
                    chunks: int = 8) -> dict[str, str]:
    """:func:`isolation.app.batch.check.validate_plan` for a direct sweep: every variant checked before
    anything runs, the same hashes and the same one-message error, much quicker on large grids.

    Parameters
    ----------
    plan : isolation.app.batch.plan.BatchPlan
    settings : mapping, optional
        Run settings folded into each variant's input hash.
    executor : concurrent.futures.Executor, optional
        Check large batches in ``chunks`` pieces in parallel.
    chunks : int
        Pieces the variants are split into on the executor. [-]

    Returns
    -------
    dict
        Variant id -> input hash.

    Raises
    ------
    isolation.errors.InputError
        Every invalid variant with the key path, the value and what is allowed.
    """
    from isolation.app.batch.check import CHUNK_FROM
    from isolation.errors import InputError
    from isolation.study import read_study_mapping

    read_study_mapping(plan.study_file)  # a missing or malformed base study: one clear error
    items = [(v.variant_id, plan.overrides_for(v)) for v in plan.variants]
    settings = dict(settings or {})
    if executor is None or len(items) < 4 * CHUNK_FROM:
        found = check_direct(str(plan.study_file), items, settings)
    else:
        size = -(-len(items) // max(int(chunks), 1))
        futures = [executor.submit(check_direct, str(plan.study_file), items[i:i + size], settings)
                   for i in range(0, len(items), size)]
        found = [entry for future in futures for entry in future.result()]
    problems = [f"[{variant_id}] {problem}" for variant_id, _, problem in found if problem]
    if problems:
        raise InputError(
            f"{plan.batch_file.name}: {len(problems)} of {len(items)} variants are invalid: " + "; ".join(problems))
    return {variant_id: digest for variant_id, digest, _ in found}
