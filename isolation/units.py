"""Quantities with units at the input and display edge.

Inside the package every number is in kN, m, s, t (tonne), kPa and g. Study
files may give a quantity with its unit as a string (``"12 in"``,
``"350 kN"``, ``"0.4 m"``, ``"2.5 kip/in"``) or as a bare number; a bare
number is read in the study's unit system (:data:`BARE_UNITS`). This module
turns either form into the internal unit, refuses a quantity of the wrong
kind (a length given in kN) with a message that names the field, and formats
internal values for display in SI or US customary units.

Unit arithmetic and the unit names come from the ``pint`` library; its
registry is built on first use (about half a second).
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Any

from isolation import GRAVITY
from isolation.errors import InputError

__all__ = [
    "KINDS",
    "BARE_UNITS",
    "DISPLAY_UNITS",
    "SYSTEMS",
    "parse_quantity",
    "convert",
    "to_display",
    "format_quantity",
]

SYSTEMS = ("SI", "US")
"""Unit systems a study may use for bare numbers and display."""

KINDS: dict[str, tuple[str, str]] = {
    # kind: (internal unit, example for messages)
    "length": ("m", "'0.4 m' or '12 in'"),
    "force": ("kN", "'350 kN' or '80 kip'"),
    "weight": ("kN", "'6500 kN', '1460 kip' or '660 t' (mass times g)"),
    "stress": ("kPa", "'0.9 MPa' or '60 psi'"),
    "stiffness": ("kN/m", "'1200 kN/m' or '7 kip/in'"),
    "time": ("s", "'0.005 s' or '40 s'"),
    "mass": ("t", "'660 t' or '3.8 kip*s**2/in'"),
}
"""Quantity kinds: internal unit and an example of accepted input."""

BARE_UNITS: dict[str, dict[str, str]] = {
    "SI": {"length": "m", "force": "kN", "weight": "kN", "stress": "kPa",
           "stiffness": "kN/m", "time": "s", "mass": "t"},
    "US": {"length": "in", "force": "kip", "weight": "kip", "stress": "psi",
           "stiffness": "kip/in", "time": "s", "mass": "kip*s**2/in"},
}
"""Unit in which a bare number (no unit written) is read, per system."""

DISPLAY_UNITS: dict[str, dict[str, str]] = {
    "SI": {"length": "m", "force": "kN", "weight": "kN", "stress": "MPa",
           "stiffness": "kN/m", "time": "s", "mass": "t"},
    "US": {"length": "in", "force": "kip", "weight": "kip", "stress": "ksi",
           "stiffness": "kip/in", "time": "s", "mass": "kip*s**2/in"},
}
"""Unit used to show a value of each kind, per system."""


@lru_cache(maxsize=1)
def _registry():
    import pint

    registry = pint.UnitRegistry()
    return registry


def _allowed(kind: str, system: str) -> str:
    unit, example = KINDS[kind]
    bare = BARE_UNITS[system][kind]
    return (f"a {kind} such as {example}; a bare number is read as {bare} "
            f"(units = {system!r})")


def _fail(field: str, value: Any, allowed: str) -> InputError:
    return InputError(f"{field} = {value!r} is not allowed: must be {allowed}")


def parse_quantity(value: Any, kind: str, *, field: str, system: str = "SI") -> float:
    """Read a quantity given as a number or a string with a unit.

    Parameters
    ----------
    value : float, int or str
        The quantity: a bare number (read in the system's unit for this kind,
        see :data:`BARE_UNITS`) or a string with a unit, e.g. ``"12 in"``.
    kind : str
        One of :data:`KINDS` (``"length"``, ``"force"``, ``"weight"``,
        ``"stress"``, ``"stiffness"``, ``"time"``, ``"mass"``). A ``"weight"``
        also accepts a mass, multiplied by :data:`isolation.GRAVITY`.
    field : str
        Name of the input for error messages (a study key path).
    system : str
        ``"SI"`` or ``"US"``: how bare numbers are read.

    Returns
    -------
    float
        The value in the internal unit of its kind (m, kN, kPa, kN/m, s, t).

    Raises
    ------
    isolation.errors.InputError
        When the value is not a number or a quantity of this kind, or is NaN
        or infinite. The message names the field, the value and what is
        allowed.
    """
    if kind not in KINDS:
        raise ValueError(f"kind = {kind!r} is not allowed: must be one of "
                         + ", ".join(repr(k) for k in KINDS))
    if system not in SYSTEMS:
        raise InputError(f"units = {system!r} is not allowed: must be one of 'SI', 'US'")
    allowed = _allowed(kind, system)
    if isinstance(value, bool):
        raise _fail(field, value, allowed)
    if isinstance(value, (int, float)):
        number = float(value)
        if not math.isfinite(number):
            raise _fail(field, value, allowed)
        unit = BARE_UNITS[system][kind]
        if unit == KINDS[kind][0]:
            return number
        return convert(number, unit, KINDS[kind][0])
    if not isinstance(value, str) or not value.strip():
        raise _fail(field, value, allowed)
    registry = _registry()
    try:
        quantity = registry.Quantity(value.strip())
    except Exception:
        raise _fail(field, value, allowed + " (the unit was not recognised)") from None
    magnitude = quantity.magnitude
    if not isinstance(magnitude, (int, float)) or not math.isfinite(float(magnitude)):
        raise _fail(field, value, allowed)
    if quantity.dimensionless:
        # A number written as a string ("0.4"): read as a bare number.
        return parse_quantity(float(magnitude), kind, field=field, system=system)
    target = registry.Unit(KINDS[kind][0])
    if kind == "weight" and quantity.dimensionality == registry.Unit("t").dimensionality:
        return float(quantity.to("t").magnitude) * GRAVITY
    if quantity.dimensionality != target.dimensionality:
        found = _describe_dimension(quantity)
        raise _fail(field, value, f"{allowed}; a {found} was given")
    return float(quantity.to(target).magnitude)


def _describe_dimension(quantity) -> str:
    registry = _registry()
    for name, (unit, _) in KINDS.items():
        if name == "weight":
            continue
        if quantity.dimensionality == registry.Unit(unit).dimensionality:
            return name
    return f"quantity of dimension {quantity.dimensionality}"


def convert(value: float, from_unit: str, to_unit: str) -> float:
    """Convert a number between two units of the same dimension.

    Parameters
    ----------
    value : float
        Magnitude in ``from_unit``. [from_unit]
    from_unit, to_unit : str
        Unit names understood by pint, e.g. ``"in"``, ``"kip"``, ``"kPa"``.

    Returns
    -------
    float
        Magnitude in ``to_unit``. [to_unit]
    """
    registry = _registry()
    return float(registry.Quantity(float(value), from_unit).to(to_unit).magnitude)


def to_display(value: float, kind: str, system: str = "SI") -> tuple[float, str]:
    """Express an internal value in the display unit of a unit system.

    Parameters
    ----------
    value : float
        Value in the internal unit of ``kind`` (m, kN, kPa, kN/m, s, t).
    kind : str
        One of :data:`KINDS`.
    system : str
        ``"SI"`` or ``"US"``.

    Returns
    -------
    (float, str)
        Magnitude and unit name, e.g. ``(12.0, "in")``.
    """
    if system not in SYSTEMS:
        raise InputError(f"units = {system!r} is not allowed: must be one of 'SI', 'US'")
    unit = DISPLAY_UNITS[system][kind]
    internal = KINDS[kind][0]
    if unit == internal:
        return float(value), unit
    return convert(value, internal, unit), unit


def format_quantity(value: float, kind: str, system: str = "SI", digits: int = 3) -> str:
    """Format an internal value for display, e.g. ``"12.0 in"``.

    Parameters
    ----------
    value : float
        Value in the internal unit of ``kind``.
    kind : str
        One of :data:`KINDS`.
    system : str
        ``"SI"`` or ``"US"``.
    digits : int
        Significant digits shown.
    """
    magnitude, unit = to_display(value, kind, system)
    return f"{magnitude:.{digits}g} {unit}"
