"""One variant of a base study, validated quickly: :func:`variant_study`.

Overrides of bearing properties, property factors and moats are checked key by
key on the base study parsed once per process (the same rules and messages as
the study reader); any other override goes through the full parse. Used by the
direct sweep (:mod:`isolation.app.batch.sweep`, which re-exports
:func:`variant_study`), its validation (:mod:`isolation.app.batch.sweep_check`)
and the history batch.
"""

from __future__ import annotations

import dataclasses
import functools
import re
from pathlib import Path
from typing import Any, Mapping

__all__ = ["variant_study"]


@functools.lru_cache(maxsize=8)
def _base_mapping(study_file: str, modified: float) -> dict:  # noqa: ARG001 - file time keys the cache
    from isolation.study import read_study_mapping

    return read_study_mapping(study_file)


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
