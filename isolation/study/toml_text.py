"""Reading a study file's TOML: size and nesting limits, strict syntax errors (:func:`parse_toml`).

Re-exported from :mod:`isolation.study.parse` and :mod:`isolation.study`.
"""

from __future__ import annotations

import tomllib
from pathlib import Path
from typing import Any, Mapping

from isolation.errors import InputError
from isolation.files import read_input_text
from isolation.study.inputs import StudyError

__all__ = ["read_study_mapping", "parse_toml", "STUDY_LIMIT", "NESTING_LIMIT"]


def read_study_mapping(path: str | Path) -> dict:
    """Read a study file's TOML into a plain mapping (no validation).

    Raises :class:`StudyError` for a missing file or malformed TOML.
    """
    path = Path(path)
    if not path.exists():
        raise StudyError([f"study file {str(path)!r} does not exist"])
    try:
        text = read_input_text(path, what="study file", limit=STUDY_LIMIT)
    except InputError as error:
        raise StudyError([str(error)]) from None
    return parse_toml(text, str(path), StudyError)


STUDY_LIMIT = 1_000_000
"""Largest study file read [bytes]; a study is a few kilobytes."""


NESTING_LIMIT = 12
"""Deepest nesting of tables and lists accepted in a study or batch file [levels]; a study
needs 4 (alternative, bearings, a table, a list)."""


def parse_toml(text: str, source: str, error_class=InputError) -> dict:
    """Parse TOML text, refusing malformed TOML and absurd nesting with one clear error.

    Parameters
    ----------
    text : str
        The file's text.
    source : str
        The file's name for messages.
    error_class : type
        :class:`StudyError` (problems list) or :class:`InputError` (a message).
    """
    def fail(message: str):
        return error_class([message], source=source) if error_class is StudyError else \
            error_class(f"{source}: {message}")

    depth = _bracket_depth(text)
    if depth > 200:  # a quick bound before parsing: the parser recurses once per level
        raise fail(f"nesting {depth} levels deep is not allowed: tables and lists may nest at most "
                   f"{NESTING_LIMIT} levels")
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise fail(f"not valid TOML: {error}") from None
    except RecursionError:
        raise fail(f"nesting too deep is not allowed: tables and lists may nest at most "
                   f"{NESTING_LIMIT} levels") from None
    depth = _nesting(data)
    if depth > NESTING_LIMIT:
        raise fail(f"nesting {depth} levels deep is not allowed: tables and lists may nest at most "
                   f"{NESTING_LIMIT} levels")
    return data


def _bracket_depth(text: str) -> int:
    """Deepest run of open brackets and braces outside strings (a quick bound, before parsing)."""
    deepest = level = 0
    quote = None
    for char in text:
        if quote:
            if char == quote or char == "\n":
                quote = None
            continue
        if char == "#":
            quote = "\n"  # a comment, to the end of the line
        elif char in "\"'":
            quote = char
        elif char == "\n":
            quote = None
        elif char in "[{":
            level += 1
            deepest = max(deepest, level)
        elif char in "]}":
            level = max(0, level - 1)
    return deepest


def _nesting(value: Any) -> int:
    deepest, stack = 0, [(value, 0)]
    while stack:
        item, level = stack.pop()
        deepest = max(deepest, level)
        if isinstance(item, Mapping):
            stack.extend((v, level + 1) for v in item.values())
        elif isinstance(item, list):
            stack.extend((v, level + 1) for v in item)
    return deepest
