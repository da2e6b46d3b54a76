"""A small TOML writer for the study as run (``tomllib`` reads only): :func:`to_toml`.

Used by :mod:`isolation.app.calc_records` for ``study_used.toml``; re-exported there.
"""

from __future__ import annotations

import datetime as _dt
import json
import re
from typing import Any, Mapping

__all__ = ["to_toml"]

_BARE = re.compile(r"^[A-Za-z0-9_-]+$")


def _key(key: str) -> str:
    return key if _BARE.match(key) else json.dumps(key)


def _value(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        text = repr(value)
        return {"nan": "nan", "inf": "inf", "-inf": "-inf"}.get(text, text)
    if isinstance(value, str):
        return json.dumps(value, ensure_ascii=False)
    if isinstance(value, (_dt.date, _dt.time)):
        return value.isoformat()
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_value(v) for v in value) + "]"
    if isinstance(value, Mapping):
        return "{" + ", ".join(f"{_key(k)} = {_value(v)}" for k, v in value.items()) + "}"
    raise ValueError(f"value = {value!r} is not allowed in TOML: must be text, a number, a date, "
                     "a boolean, a list or a table")


def _is_table_array(value: Any) -> bool:
    return isinstance(value, list) and bool(value) and all(isinstance(v, Mapping) for v in value)


def to_toml(mapping: Mapping[str, Any], prefix: str = "") -> str:
    """TOML text for a mapping of plain values (tables, arrays of tables, lists, scalars, dates)."""
    lines = []
    for key, value in mapping.items():
        if not isinstance(value, Mapping) and not _is_table_array(value):
            lines.append(f"{_key(key)} = {_value(value)}")
    text = "\n".join(lines) + ("\n" if lines else "")
    for key, value in mapping.items():
        name = f"{prefix}.{_key(key)}" if prefix else _key(key)
        if isinstance(value, Mapping):
            text += f"\n[{name}]\n" + to_toml(value, name)
        elif _is_table_array(value):
            for item in value:
                text += f"\n[[{name}]]\n" + to_toml(item, name)
    return text
