"""Overrides of a study mapping by dotted key paths (``alternative.0.bearings.0.radius``).

:func:`apply_overrides` (command line ``--set``, batch variants) and
:func:`overlay`; re-exported from :mod:`isolation.study.parse` and :mod:`isolation.study`.
"""

from __future__ import annotations

import copy
import re
from typing import Any, Mapping

from isolation.errors import InputError

__all__ = ["apply_overrides", "overlay"]


def _own(node: Any, copied: bool) -> Any:
    """A table or list on an override's path: copied once (shallow) unless already a deep copy."""
    if copied:
        return node
    if isinstance(node, dict):
        return dict(node)
    if isinstance(node, list):
        return list(node)
    return node


def overlay(mapping: Mapping[str, Any], overrides: Mapping[str, Any]) -> dict:
    """Like :func:`apply_overrides`, but tables and lists off the overridden paths are shared
    with ``mapping``, not copied: quick for many variants; treat the result as read-only."""
    return apply_overrides(mapping, overrides, _copy=False)


def apply_overrides(mapping: Mapping[str, Any], overrides: Mapping[str, Any], *, _copy: bool = True) -> dict:
    """Return a copy of a study mapping with dotted-key overrides applied.

    Parameters
    ----------
    mapping : mapping
        Parsed study TOML (not changed).
    overrides : mapping
        ``{"site.sms": 1.2, "alternative.0.bearings.0.radius": "3 m"}``: dots
        separate keys, whole numbers index arrays of tables (from 0). A
        missing last key is added (validation then judges it); a missing
        table on the way is created.

    Raises
    ------
    InputError
        When a path is malformed, indexes past an array's end or runs through
        a value that is not a table.
    """
    result = copy.deepcopy(dict(mapping)) if _copy else dict(mapping)
    for given, value in overrides.items():
        path = re.sub(r"\[(\d+)\]", r".\1", given) if isinstance(given, str) else given
        if not isinstance(path, str) or not path or any(not part for part in path.split(".")):
            raise InputError(f"override key {path!r} is not allowed: must be a dotted key path "
                             "such as 'site.sms' or 'alternative.0.bearings.0.radius'")
        parts = path.split(".")
        node: Any = result
        for depth, part in enumerate(parts):
            last = depth == len(parts) - 1
            where = ".".join(parts[:depth + 1])
            if isinstance(node, list):
                if not part.isdigit() or int(part) >= len(node):
                    raise InputError(f"override {path!r}: {where!r} is not allowed: must index the array "
                                     f"with a whole number from 0 to {len(node) - 1}")
                if last:
                    node[int(part)] = value
                else:
                    child = node[int(part)] = _own(node[int(part)], _copy)
                    node = child
            elif isinstance(node, dict):
                if last:
                    node[part] = value
                elif part not in node:
                    node[part] = {}
                    node = node[part]
                else:
                    child = node[part] = _own(node[part], _copy)
                    node = child
            else:
                raise InputError(f"override {path!r} is not allowed: "
                                 f"{'.'.join(parts[:depth])!r} is a value, not a table")
    return result
