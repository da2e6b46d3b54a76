"""Key schema of study files and the reader that collects every problem.

:class:`Reader` reads the keys of one table (numbers, whole numbers, choices,
quantities with units, lists, nested tables), adding one message per bad or
missing value to a shared :class:`Problems` list and remembering the known
keys so that unknown ones are reported too. :data:`BEARING_KEYS` lists each
registered bearing type's keys as :class:`Key` entries (kind, required, allowed
range); each bearing module declares them (:mod:`isolation.bearings.registry`).
``BEARING_KEYS`` is re-exported from :mod:`isolation.study`.
"""

from __future__ import annotations

import math
import unicodedata
from collections.abc import Iterator, Mapping
from datetime import date as _date
from functools import lru_cache
from typing import Any

from isolation import units as _units
from isolation.bearings import registry as _bearing_registry
from isolation.errors import InputError
from isolation.schema import Key

__all__ = ["Key", "BEARING_KEYS", "ROOT_KEYS", "Problems", "Reader"]


class _BearingKeys(Mapping[str, Mapping[str, Key]]):
    """Bearing type -> its keys, read from the bearing registry on every access (a live view)."""

    def __getitem__(self, kind: str) -> Mapping[str, Key]:
        try:
            return _bearing_registry.bearing_type(kind).keys
        except _bearing_registry.UnknownBearingType:
            raise KeyError(kind) from None

    def __iter__(self) -> Iterator[str]:
        return iter(_bearing_registry.kinds())

    def __len__(self) -> int:
        return len(_bearing_registry.kinds())

    def __repr__(self) -> str:
        return f"BEARING_KEYS({dict(self)!r})"


BEARING_KEYS: Mapping[str, Mapping[str, Key]] = _BearingKeys()
"""Keys of each registered bearing type (beside ``type``, ``count``, ``axial_load``),
with kind, whether required, and allowed range in internal units (m, kPa): a live
view of :mod:`isolation.bearings.registry`, where each bearing module declares them."""

_INVISIBLE = frozenset("\ufeff\u202a\u202b\u202c\u202d\u202e\u2066\u2067\u2068\u2069")

TEXT_LIMIT = 200
"""Longest text value (project name, client, ...) accepted [characters]."""

ROOT_KEYS = ("units", "project", "code", "site", "building", "analysis", "wind", "alternative", "cost", "hazard",
             "loss")

_MISSING = object()


class Problems:
    """An ordered list of problem messages."""

    def __init__(self) -> None:
        self.items: list[str] = []

    def add(self, message: str) -> None:
        self.items.append(message)

    def __bool__(self) -> bool:
        return bool(self.items)

    def __len__(self) -> int:
        return len(self.items)


@lru_cache(maxsize=256)
def _range_text(low, high, low_inclusive=True, high_inclusive=True) -> str:
    if low is not None and high is not None:
        left, right = ("[" if low_inclusive else "("), ("]" if high_inclusive else ")")
        return f"in {left}{low:g}, {high:g}{right}"
    if low is not None:
        return f"{'>=' if low_inclusive else '>'} {low:g}"
    if high is not None:
        return f"<= {high:g}"
    return "finite"


class Reader:
    """Reads the keys of one table, adding a message to ``problems`` for each
    bad or missing value and remembering which keys are known."""

    def __init__(self, mapping: Mapping, path: str, problems: Problems, system: str = "SI") -> None:
        self.mapping, self.path, self.problems, self.system = mapping, path, problems, system
        self.known: set[str] = set()
        self.used = self.known
        self._start = len(problems)

    def path_of(self, key: str) -> str:
        return f"{self.path}.{key}" if self.path else key

    def failed(self) -> bool:
        """Whether any problem was found in this table (and its children) so far."""
        return len(self.problems) > self._start

    def _get(self, key: str, required: bool, allowed: str):
        self.known.add(key)
        if key in self.mapping:
            return self.mapping[key]
        if required:
            self.problems.add(f"{self.path_of(key)} is missing: must be {allowed}")
        return _MISSING

    def raw(self, key: str) -> Any:
        """The value of an optional key as written (None when absent), for readers of composite values."""
        value = self._get(key, False, "")
        return None if value is _MISSING else value

    def _bad(self, key: str, value: Any, allowed: str) -> None:
        self.problems.add(f"{self.path_of(key)} = {value!r} is not allowed: must be {allowed}")

    def text(self, key: str, *, required: bool = True, default=None, allow_int: bool = False):
        allowed = "text in quotes" + (" or a whole number" if allow_int else "")
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if allow_int and isinstance(value, int) and not isinstance(value, bool):
            return str(value)
        if not isinstance(value, str) or not value.strip():
            self._bad(key, value, "non-empty " + allowed)
            return None
        if len(value) > TEXT_LIMIT:
            self._bad(key, value[:40] + "...", f"{allowed} of at most {TEXT_LIMIT} characters")
            return None
        if any(unicodedata.category(c) in ("Cc", "Cs", "Co", "Cn") or c in _INVISIBLE for c in value):
            self._bad(key, value, allowed + " without control, private-use or unassigned characters (no NUL, "
                      "tab, line break, byte-order mark or direction override)")
            return None
        return value.strip()

    def date(self, key: str):
        allowed = "a date such as 2026-12-01"
        value = self._get(key, True, allowed)
        if value is _MISSING:
            return None
        try:
            if isinstance(value, _date) and not hasattr(value, "hour"):
                return value.isoformat()
            return _date.fromisoformat(str(value)).isoformat() if isinstance(value, str) else _raise()
        except (ValueError, TypeError):
            self._bad(key, value, allowed)
            return None

    def boolean(self, key: str, *, required: bool = True, default=None):
        value = self._get(key, required, "true or false")
        if value is _MISSING:
            return default
        if not isinstance(value, bool):
            self._bad(key, value, "true or false")
            return None
        return value

    def choice(self, key: str, options: tuple, *, required: bool = True, default=None):
        allowed = "one of " + ", ".join(repr(o) for o in options)
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if isinstance(value, bool) or value not in options:
            self._bad(key, value, allowed)
            return None
        return value

    def number(self, key: str, *, low=None, high=None, low_inclusive=True, high_inclusive=True,
               unit: str = "-", required: bool = True, default=None, ratio: bool = False):
        allowed = f"a number {_range_text(low, high, low_inclusive, high_inclusive)} [{unit}]"
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if ratio and isinstance(value, str):
            try:
                value = _units.parse_ratio(value, field=self.path_of(key), allowed=allowed)
            except InputError as error:
                self.problems.add(str(error))
                return None
            if not _inside(value, low, high, low_inclusive, high_inclusive):
                self._bad(key, self.mapping[key], f"{allowed} (a percent is divided by 100)")
                return None
            return value
        if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
            self._bad(key, value, allowed + " (without a unit)")
            return None
        if not _inside(float(value), low, high, low_inclusive, high_inclusive):
            self._bad(key, value, allowed)
            return None
        return float(value)

    def integer(self, key: str, *, low=None, high=None, required: bool = True, default=None):
        allowed = f"a whole number {_range_text(low, high)}"
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        if isinstance(value, bool) or not isinstance(value, int) or not _inside(value, low, high):
            self._bad(key, value, allowed)
            return None
        return int(value)

    def quantity(self, key: str, kind: str, *, low=None, high=None, low_inclusive=True,
                 high_inclusive=True, required: bool = True, default=None):
        unit = _units.KINDS[kind][0]
        bounds = _range_text(low, high, low_inclusive, high_inclusive)
        allowed = f"a {kind} {bounds} [{unit}], e.g. {_units.KINDS[kind][1]}"
        value = self._get(key, required, allowed)
        if value is _MISSING:
            return default
        return self._quantity_value(self.path_of(key), value, kind, low, high, low_inclusive, high_inclusive)

    def _quantity_value(self, where, value, kind, low, high, low_inclusive=True, high_inclusive=True):
        try:
            number = _units.parse_quantity(value, kind, field=where, system=self.system)
        except InputError as error:
            self.problems.add(str(error))
            return None
        if not _inside(number, low, high, low_inclusive, high_inclusive):
            unit = _units.KINDS[kind][0]
            shown = f"{value!r}" if isinstance(value, str) else f"{value!r} ({self.system} bare number)"
            self.problems.add(f"{where} = {shown} = {number:.4g} {unit} is not allowed: must be "
                              f"{_range_text(low, high, low_inclusive, high_inclusive)} [{unit}]")
            return None
        return number

    def quantity_list(self, key: str, kind: str, *, length=None, low=None, high=None,
                      low_inclusive=True):
        unit = _units.KINDS[kind][0]
        allowed = (f"a list of {length or 'n'} values of {kind} [{unit}] (one per storey, "
                   f"level 1 first) or one value for every storey")
        value = self._get(key, True, allowed)
        if value is _MISSING:
            return None
        if not isinstance(value, list):
            number = self._quantity_value(self.path_of(key), value, kind, low, high,
                                          low_inclusive=low_inclusive)
            return None if number is None else (number,) * (length or 1)
        if length is not None and len(value) != length:
            self._bad(key, value, allowed + f"; {len(value)} values were given")
            return None
        numbers = [self._quantity_value(f"{self.path_of(key)}[{i}]", v, kind, low, high,
                                        low_inclusive=low_inclusive)
                   for i, v in enumerate(value)]
        if any(n is None for n in numbers):
            return None
        return tuple(numbers)

    def by_spec(self, key: str, spec: Key):
        if spec.kind == "choice":
            return self.choice(key, spec.options, required=spec.required)
        if spec.kind == "number":
            return self.number(key, low=spec.low, high=spec.high, low_inclusive=spec.low_inclusive,
                               unit=spec.unit, required=spec.required, ratio=spec.ratio)
        if spec.kind == "integer":
            return self.integer(key, low=spec.low, high=spec.high, required=spec.required)
        return self.quantity(key, spec.kind, low=spec.low, high=spec.high,
                             low_inclusive=spec.low_inclusive, required=spec.required)

    def table(self, key: str, *, required: bool = True) -> "Reader | None":
        value = self._get(key, required, "a table of keys")
        if value is _MISSING:
            return None
        if not isinstance(value, dict):
            self._bad(key, value, f"a table [{self.path_of(key)}] of keys")
            return None
        return Reader(value, self.path_of(key), self.problems, self.system)

    def array_of_tables(self, key: str, *, required: bool = True) -> "list[Reader] | None":
        value = self._get(key, required, f"one or more tables [[{self.path_of(key)}]]")
        if value is _MISSING:
            return None
        if not isinstance(value, list) or not value or not all(isinstance(v, dict) for v in value):
            self._bad(key, value, f"one or more tables [[{self.path_of(key)}]]")
            return None
        return [Reader(v, f"{self.path_of(key)}[{i}]", self.problems, self.system)
                for i, v in enumerate(value)]

    def done(self) -> None:
        """Report keys of this table that nobody asked for."""
        unknown = [k for k in self.mapping if k not in self.known]
        for key in unknown:
            known = ", ".join(sorted(self.known))
            self.problems.add(f"{self.path_of(key)} is not a known key: known keys here are {known}")


def _raise():
    raise ValueError


def _inside(value, low, high, low_inclusive=True, high_inclusive=True) -> bool:
    if low is not None and (value < low if low_inclusive else value <= low):
        return False
    if high is not None and (value > high if high_inclusive else value >= high):
        return False
    return True
