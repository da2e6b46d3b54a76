"""Checks of input values at the public edge.

Every failure raises ``ValueError`` whose message names the field, the value
given and what is allowed, e.g.
``radius = -2.0 is not allowed: must be a finite number > 0 [m]``.
"""

from __future__ import annotations

import math
from typing import Any, Iterable

import numpy as np

__all__ = [
    "positive",
    "non_negative",
    "in_range",
    "finite",
    "one_of",
    "positive_array",
    "finite_array",
]


def _fail(field: str, value: Any, allowed: str, unit: str = "") -> ValueError:
    suffix = f" [{unit}]" if unit else ""
    return ValueError(f"{field} = {value!r} is not allowed: must be {allowed}{suffix}")


def _as_float(field: str, value: Any, allowed: str, unit: str) -> float:
    if isinstance(value, bool):
        raise _fail(field, value, allowed, unit)
    try:
        number = float(value)
    except (TypeError, ValueError):
        raise _fail(field, value, allowed, unit) from None
    if not math.isfinite(number):
        raise _fail(field, value, allowed, unit)
    return number


def finite(field: str, value: Any, unit: str = "") -> float:
    """Return ``value`` as a float, refusing NaN, infinity and non-numbers."""
    return _as_float(field, value, "a finite number", unit)


def positive(field: str, value: Any, unit: str = "") -> float:
    """Return ``value`` as a float when it is finite and > 0."""
    allowed = "a finite number > 0"
    number = _as_float(field, value, allowed, unit)
    if number <= 0.0:
        raise _fail(field, value, allowed, unit)
    return number


def non_negative(field: str, value: Any, unit: str = "") -> float:
    """Return ``value`` as a float when it is finite and >= 0."""
    allowed = "a finite number >= 0"
    number = _as_float(field, value, allowed, unit)
    if number < 0.0:
        raise _fail(field, value, allowed, unit)
    return number


def in_range(
    field: str,
    value: Any,
    low: float,
    high: float,
    unit: str = "",
    *,
    low_inclusive: bool = True,
    high_inclusive: bool = True,
) -> float:
    """Return ``value`` as a float when it lies between ``low`` and ``high``."""
    left = "[" if low_inclusive else "("
    right = "]" if high_inclusive else ")"
    allowed = f"a finite number in {left}{low:g}, {high:g}{right}"
    number = _as_float(field, value, allowed, unit)
    below = number < low if low_inclusive else number <= low
    above = number > high if high_inclusive else number >= high
    if below or above:
        raise _fail(field, value, allowed, unit)
    return number


def one_of(field: str, value: Any, choices: Iterable[Any]) -> Any:
    """Return ``value`` when it is one of ``choices``."""
    options = list(choices)
    if value not in options:
        listed = ", ".join(repr(c) for c in options)
        raise ValueError(f"{field} = {value!r} is not allowed: must be one of {listed}")
    return value


def finite_array(field: str, values: Any, unit: str = "") -> np.ndarray:
    """Return ``values`` as a float array, refusing NaN and infinity."""
    try:
        array = np.asarray(values, dtype=float)
    except (TypeError, ValueError):
        raise _fail(field, values, "an array of finite numbers", unit) from None
    if array.size == 0:
        raise _fail(field, values, "a non-empty array of finite numbers", unit)
    bad = ~np.isfinite(array)
    if bad.any():
        index = tuple(int(i) for i in np.argwhere(bad)[0])
        where = index[0] if len(index) == 1 else index
        raise ValueError(
            f"{field}[{where}] = {float(array[index])!r} is not allowed: must be a finite number"
            + (f" [{unit}]" if unit else "")
        )
    return array


def positive_array(field: str, values: Any, unit: str = "") -> np.ndarray:
    """Return ``values`` as a float array whose entries are all finite and > 0."""
    array = finite_array(field, values, unit)
    bad = array <= 0.0
    if bad.any():
        index = tuple(int(i) for i in np.argwhere(bad)[0])
        where = index[0] if len(index) == 1 else index
        raise ValueError(
            f"{field}[{where}] = {float(array[index])!r} is not allowed: must be a finite number > 0"
            + (f" [{unit}]" if unit else "")
        )
    return array
