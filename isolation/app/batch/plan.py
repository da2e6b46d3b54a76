"""Batch files: read a batch, expand its variants, validate every one.

A batch file is TOML. Its ``[batch]`` table names the base study (a path
relative to the batch file); the variants come from any mix of

* ``[grid]``: dotted key paths into the study, each with a list of values;
  every combination is one variant (the first key varies slowest);
* ``[[variant]]``: explicit variants, each a table of dotted key paths and
  values, with an optional ``id``;
* ``table = "file.csv"`` in ``[batch]``: one variant per CSV row, the header
  naming dotted key paths (and optionally ``id``); empty cells leave the
  study value as it is;

and ``[common]`` holds overrides applied to every variant (for instance
quick analysis settings). Example::

    [batch]
    name = "radius-by-friction"
    study = "demo_study.toml"

    [grid]
    "alternative.0.bearings.0.radius" = [2.5, 3.5]
    "alternative.0.bearings.0.friction" = [0.04, 0.07]

Key paths follow :func:`isolation.study.apply_overrides` (whole numbers index
arrays of tables from 0); unquoted dotted keys mean the same.

Validation of the variants against the study (before anything runs) is
:func:`isolation.app.batch.check.validate_plan`.
"""

from __future__ import annotations

import itertools
import math
import re
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

from isolation.app.batch.table_file import _read_table
from isolation.errors import InputError
from isolation.files import read_input_text

__all__ = [
    "Variant",
    "BatchPlan",
    "load_batch",
    "safe_name",
    "RECORD_LIMIT",
    "DIRECT_LIMIT",
]

BATCH_KEYS = ("name", "study", "table", "pdf", "report", "description")
TOP_KEYS = ("batch", "grid", "variant", "common")
ID_LIMIT = 80


@dataclass(frozen=True)
class Variant:
    """One variant of a batch.

    Parameters
    ----------
    variant_id : str
        Name of the variant, safe to use as a folder name.
    overrides : dict
        Dotted key paths into the study and the value each takes (plain TOML
        values; quantities with units as strings, e.g. ``"12 in"``).
    origin : str
        Where the variant was defined, for messages (``grid``, ``variant 2``,
        ``variants.csv row 5``).
    """

    variant_id: str
    overrides: dict = field(default_factory=dict)
    origin: str = ""

    def to_dict(self) -> dict:
        return {"id": self.variant_id, "overrides": dict(self.overrides), "origin": self.origin}


@dataclass(frozen=True)
class BatchPlan:
    """A batch file read and expanded, not yet validated against the study.

    Parameters
    ----------
    name : str
        Batch name (from ``[batch] name`` or the file name), safe for paths.
    batch_file : Path
        The batch file, absolute.
    study_file : Path
        The base study file, absolute.
    variants : tuple of Variant
        Every variant, in file order (grid first, then the list, then the table).
    common : dict
        Overrides applied to every variant before its own.
    pdf : bool
        Whether each record gets a PDF report by default.
    report : bool
        Whether the batch ends with its own report, the design-space workbook and its PDF in the
        batch folder (:mod:`isolation.app.batch.batch_report`).
    """

    name: str
    batch_file: Path
    study_file: Path
    variants: tuple
    common: dict = field(default_factory=dict)
    pdf: bool = False
    report: bool = False

    def overrides_for(self, variant: Variant) -> dict:
        """All overrides of ``variant``: the common ones, then its own."""
        return {**self.common, **variant.overrides}

    def override_keys(self) -> list[str]:
        """Dotted key paths varied across the batch, in first-seen order."""
        keys: dict[str, None] = {}
        for variant in self.variants:
            for key in variant.overrides:
                keys.setdefault(key, None)
        return list(keys)

    def to_dict(self) -> dict:
        return {
            "name": self.name,
            "batch_file": str(self.batch_file),
            "study_file": str(self.study_file),
            "common": dict(self.common),
            "pdf": self.pdf,
            "report": self.report,
            "variants": [v.to_dict() for v in self.variants],
        }


def safe_name(text: str, limit: int = ID_LIMIT) -> str:
    """``text`` as a folder name: lower-case letters, digits, ``.``, ``_``, ``-``.

    The same rule as the record folders of :func:`isolation.app.calc_records.sanitise_name`,
    so a variant id is its record's folder name.
    """
    cleaned = re.sub(r"[^a-z0-9._-]+", "-", str(text).lower())
    cleaned = re.sub(r"-{2,}", "-", cleaned).strip("-._")[:limit].strip("-._")
    return cleaned or "variant"


def flatten(mapping: Mapping, prefix: str = "") -> dict:
    """Nested tables to dotted key paths; lists and scalars are leaves."""
    flat: dict[str, Any] = {}
    for key, value in mapping.items():
        path = f"{prefix}.{key}" if prefix else str(key)
        if isinstance(value, Mapping):
            flat.update(flatten(value, path))
        else:
            flat[path] = value
    return flat


def _value_text(value: Any) -> str:
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        return str(value)
    text = f"{value:g}"
    return "m" + text[1:] if text.startswith("-") else text  # minus as 'm': ids stay distinct


def _grid_ids(keys: list[str], combination: tuple) -> str:
    # Shortest key suffixes that tell the keys apart, e.g. "radius", "friction".
    labels = []
    for depth in range(1, max(len(k.split(".")) for k in keys) + 1):
        labels = [".".join(k.split(".")[-depth:]) for k in keys]
        if len(set(labels)) == len(labels):
            break
    parts = [f"{label}={_value_text(v)}" for label, v in zip(labels, combination, strict=True)]
    return safe_name("_".join(parts))


def _read_toml(path: Path, what: str) -> dict:
    from isolation.study import parse_toml

    return parse_toml(read_input_text(path, what=what), path.name)


RECORD_LIMIT = 1_000
"""Most variants a batch of records may have unless the user raises it (each is a workbook
run of a minute or more and a record folder) [variants]."""

DIRECT_LIMIT = 100_000
"""Most variants of a direct sweep (``--direct``) unless the user raises it [variants]."""


def load_batch(path: str | Path, *, max_variants: int | None = DIRECT_LIMIT) -> BatchPlan:
    """Read a batch file and expand its variants.

    Parameters
    ----------
    path : str or Path
        The batch TOML file.
    max_variants : int, optional
        Most variants allowed; counted before any is built or validated
        (default :data:`DIRECT_LIMIT`; None: no limit). [variants]

    Returns
    -------
    BatchPlan

    Raises
    ------
    InputError
        Listing every problem of the batch file itself (unknown keys, a grid
        entry that is not a list, duplicate variant ids, a missing study or
        table file ...). Problems of the variants against the study are found
        by :func:`validate_plan`.
    """
    batch_file = Path(path).resolve()
    data = _read_toml(batch_file, "batch file")
    problems: list[str] = []
    head, name, (pdf, report), study_file = _batch_head(data, batch_file, problems)
    common = _dotted_table(data, "common", "a table of dotted key paths", problems)
    grid = _dotted_table(data, "grid", "a table of dotted key paths and value lists", problems)
    for key, values in grid.items():
        if not isinstance(values, list) or not values:
            problems.append(f"grid.{key} = {values!r} is not allowed: must be a non-empty list of values")
    listed = data.get("variant", [])
    table = head.get("table")
    table_rows = _read_table(batch_file.parent / table, problems) if isinstance(table, str) else None
    variants = _grid_variants(grid, listed, table_rows, batch_file, max_variants)
    variants += _listed_variants(listed, problems)
    variants += _table_variants(table, table_rows, problems)
    if max_variants is not None and len(variants) > max_variants:
        raise InputError(f"{batch_file.name}: {len(variants)} variants is not allowed: must be at most {max_variants}; "
                         "raise the limit with --max-variants N if you mean it")
    if not variants and not problems:
        problems.append("the batch has no variants; allowed: a [grid] table, [[variant]] tables or batch.table")
    checked = _checked_ids(variants, problems)
    if problems:
        raise InputError(_problem_line(batch_file.name, problems))
    return BatchPlan(
        name=safe_name(name),
        batch_file=batch_file,
        study_file=study_file,
        variants=tuple(checked),
        common=dict(common),
        pdf=pdf,
        report=report,
    )


def _batch_head(data: Mapping, batch_file: Path, problems: list[str]) -> tuple:
    """The ``[batch]`` table (and unknown top-level tables): (table, name, (pdf, report), study file)."""
    for key in data:
        if key not in TOP_KEYS:
            problems.append(f"{key} = {data[key]!r} is an unknown table; allowed: {', '.join(TOP_KEYS)}")
    head = data.get("batch", {})
    if not isinstance(head, Mapping):
        problems.append(f"batch = {head!r} is not allowed: must be a table")
        head = {}
    for key in head:
        if key not in BATCH_KEYS:
            problems.append(f"batch.{key} is an unknown key; allowed: {', '.join(BATCH_KEYS)}")
    name = head.get("name", batch_file.stem)
    if not isinstance(name, str) or not name.strip():
        problems.append(f"batch.name = {name!r} is not allowed: must be a non-empty string")
        name = batch_file.stem
    switches = []
    for key in ("pdf", "report"):
        value = head.get(key, False)
        if not isinstance(value, bool):
            problems.append(f"batch.{key} = {value!r} is not allowed: must be true or false")
            value = False
        switches.append(value)
    return head, name, tuple(switches), _study_file(head.get("study"), batch_file, problems)


def _study_file(study: Any, batch_file: Path, problems: list[str]) -> Path:
    """``batch.study``: the base study's path, relative to the batch file."""
    if not isinstance(study, str) or not study.strip():
        problems.append(f"batch.study = {study!r} is not allowed: must be the path of a study file relative to "
                        "the batch file")
        return batch_file
    study_file = (batch_file.parent / study).resolve()
    if not study_file.exists():
        problems.append(f"batch.study = {study!r} is not allowed: {study_file} does not exist")
    elif not study_file.is_file():
        problems.append(f"batch.study = {study!r} is not allowed: {study_file} is not a plain file "
                        "(a folder, named pipe or device)")
    return study_file


def _dotted_table(data: Mapping, name: str, allowed: str, problems: list[str]) -> dict:
    """``[common]`` or ``[grid]`` flattened to dotted key paths (empty when missing or not a table)."""
    table = data.get(name, {})
    if not isinstance(table, Mapping):
        problems.append(f"{name} = {table!r} is not allowed: must be {allowed}")
        table = {}
    return flatten(table)


def _grid_variants(grid: dict, listed: Any, table_rows, batch_file: Path, max_variants: int | None) -> list:
    """Every combination of the ``[grid]`` values (none when an entry is not a non-empty list), counted
    with the listed and table variants against ``max_variants`` before any is built."""
    if not grid or not all(isinstance(v, list) and v for v in grid.values()):
        return []
    count = math.prod(len(v) for v in grid.values())
    count += len(listed) if isinstance(listed, list) else 0
    count += len(table_rows or ())
    if max_variants is not None and count > max_variants:
        sizes = " x ".join(str(len(v)) for v in grid.values())
        raise InputError(f"{batch_file.name}: {count} variants (grid {sizes}) is not allowed: must be at most "
                         f"{max_variants}; raise the limit with --max-variants N if you mean it")
    keys = list(grid)
    combinations = list(itertools.product(*(grid[k] for k in keys)))
    ids = [_grid_ids(keys, combination) for combination in combinations]
    if len(set(ids)) < len(ids):  # values that read alike as folder names: number the variants
        ids = [f"grid-{number:04d}" for number in range(1, len(ids) + 1)]
    return [Variant(variant_id, dict(zip(keys, combination, strict=True)), "grid")
            for variant_id, combination in zip(ids, combinations, strict=True)]


def _listed_variants(listed: Any, problems: list[str]) -> list:
    """The ``[[variant]]`` tables."""
    if not isinstance(listed, list):
        problems.append("variant is not allowed as a table: write [[variant]] (a list of tables)")
        return []
    variants = []
    for number, entry in enumerate(listed, start=1):
        if not isinstance(entry, Mapping):
            problems.append(f"variant {number} = {entry!r} is not allowed: must be a table")
            continue
        entry = dict(entry)
        given = entry.pop("id", None)
        overrides = flatten(entry)
        if not overrides:
            problems.append(f"variant {number} has no overrides; allowed: dotted key paths into the study")
        variants.append(Variant(given if given is not None else f"variant-{number:02d}", overrides,
                                f"variant {number}"))
    return variants


def _table_variants(table: Any, table_rows, problems: list[str]) -> list:
    """The rows of ``batch.table`` (a CSV file)."""
    if table is None:
        return []
    if not isinstance(table, str):
        problems.append(f"batch.table = {table!r} is not allowed: must be a CSV file path relative to the batch file")
        return []
    variants = []
    for number, (given, overrides, origin) in enumerate(table_rows or (), start=1):
        if not overrides:
            problems.append(f"{origin} has no overrides; allowed: values under dotted key path columns")
        variants.append(Variant(given if given is not None else f"row-{number:03d}", overrides, origin))
    return variants


def _checked_ids(variants: list, problems: list[str]) -> list:
    """The variants, each id checked: a safe folder name, used once."""
    seen: dict[str, str] = {}
    for variant in variants:
        if not isinstance(variant.variant_id, str) or safe_name(variant.variant_id) != variant.variant_id:
            problems.append(
                f"{variant.origin}: id = {variant.variant_id!r} is not allowed: must be a folder name of "
                f"lower-case letters, digits, '.', '_', '-' (at most {ID_LIMIT}), "
                f"e.g. {safe_name(str(variant.variant_id))!r}"
            )
        elif variant.variant_id in seen:
            problems.append(f"{variant.origin}: id = {variant.variant_id!r} is not allowed: already used by "
                            f"{seen[variant.variant_id]}")
        else:
            seen[variant.variant_id] = variant.origin
    return list(variants)


def _problem_line(where: str, problems: list[str]) -> str:
    count = f"{len(problems)} problem{'s' if len(problems) != 1 else ''}"
    return f"{where}: {count}: " + "; ".join(problems)
