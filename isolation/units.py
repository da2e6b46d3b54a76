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
import re
import sys
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
    "split_quantity",
    "parse_ratio",
    "GRAMMAR",
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
    "area": ("m**2", "'1200 m**2' or '13000 ft**2'"),
    "per_area": ("1/m**2", "'3500 / m**2' or '325 / ft**2' (an amount per floor area)"),
    "per_length": ("1/m", "'2500 / m' or '760 / ft' (an amount per length)"),
}
"""Quantity kinds: internal unit and an example of accepted input."""

BARE_UNITS: dict[str, dict[str, str]] = {
    "SI": {"length": "m", "force": "kN", "weight": "kN", "stress": "kPa",
           "stiffness": "kN/m", "time": "s", "mass": "t",
           "area": "m**2", "per_area": "1/m**2", "per_length": "1/m"},
    "US": {"length": "in", "force": "kip", "weight": "kip", "stress": "psi",
           "stiffness": "kip/in", "time": "s", "mass": "kip*s**2/in",
           "area": "ft**2", "per_area": "1/ft**2", "per_length": "1/ft"},
}
"""Unit in which a bare number (no unit written) is read, per system."""

DISPLAY_UNITS: dict[str, dict[str, str]] = {
    "SI": {"length": "m", "force": "kN", "weight": "kN", "stress": "MPa",
           "stiffness": "kN/m", "time": "s", "mass": "t",
           "area": "m**2", "per_area": "1/m**2", "per_length": "1/m"},
    "US": {"length": "in", "force": "kip", "weight": "kip", "stress": "ksi",
           "stiffness": "kip/in", "time": "s", "mass": "kip*s**2/in",
           "area": "ft**2", "per_area": "1/ft**2", "per_length": "1/ft"},
}
"""Unit used to show a value of each kind, per system."""


def _import_pint():
    """pint, imported without its optional dask support.

    pint imports dask when it is installed (the batch runner's executors bring it), about a second,
    only to accept dask arrays, which this package never gives it. dask is hidden for this one
    import; a later ``import dask`` works as usual.
    """
    if "pint" in sys.modules or "dask" in sys.modules:
        import pint
        return pint
    # pint's find_spec("dask") then answers None: a None entry blocks an import (Python docs, "The module cache"),
    # which typeshed's dict[str, ModuleType] for sys.modules does not allow for
    sys.modules["dask"] = None  # type: ignore[assignment]
    try:
        import pint
    finally:
        if "dask" in sys.modules and sys.modules["dask"] is None:
            del sys.modules["dask"]
    return pint


@lru_cache(maxsize=1)
def _registry():
    pint = _import_pint()
    try:  # pint's own cache of its parsed unit definitions: 4x quicker to build
        return pint.UnitRegistry(cache_folder=_pint_cache(pint))
    except Exception:  # noqa: BLE001 - no usable cache folder: parse the definitions
        return pint.UnitRegistry()


def _pint_cache(pint) -> str:
    """Cache folder of pint's parsed definitions, one per pint installation (pint's shared folder,
    ``":auto:"``, fails once another environment's pint wrote it: its entries name that one's files)."""
    import hashlib
    import os
    from pathlib import Path

    home = os.environ.get("XDG_CACHE_HOME") or str(Path.home() / ".cache")
    where = f"{pint.__file__}|{getattr(pint, '__version__', '')}".encode()
    return str(Path(home) / "isolation" / f"pint-{hashlib.sha1(where).hexdigest()[:12]}")


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
    if isinstance(value, str):
        known = _known_text(value, kind, system)
        if known is not None:
            return known
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
        return number * _factor(unit, KINDS[kind][0])
    if not isinstance(value, str) or not value.strip():
        raise _fail(field, value, allowed)
    return _parse_text(value, kind, field=field, system=system, allowed=allowed)


@lru_cache(maxsize=4096)
def _known_text(value: str, kind: str, system: str) -> float | None:
    """The value of a quantity text read before (None when it is not valid): many variants
    of one study repeat the same texts."""
    try:
        return _parse_text(value, kind, field="", system=system, allowed="")
    except InputError:
        return None


# A quantity written as text: one number (optional sign, decimals, exponent) and at most one
# unit expression: unit names joined by '*', '/' or a space, each with an optional small
# whole-number power ('**2', '^2'). Nothing is evaluated: "9**9**9 m" or "2*3 m" are refused.
_NUMBER_TEXT = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_UNIT_NAME = r"[A-Za-z_\u00b5\u03bc]+(?:(?:\*\*|\^)-?[1-4])?"
_UNIT_TEXT = r"(?:/\s*)?" + _UNIT_NAME + r"(?:\s*(?:\*|/|\u00b7|\s)\s*" + _UNIT_NAME + r")*"
_QUANTITY = re.compile(r"^\s*(" + _NUMBER_TEXT + r")\s*(" + _UNIT_TEXT + r")?\s*$", re.ASCII)
_PERCENT = re.compile(r"^\s*(" + _NUMBER_TEXT + r")\s*%\s*$", re.ASCII)
_UNIT_ONLY = re.compile(r"^\s*(" + _UNIT_TEXT + r")\s*$", re.ASCII)

GRAMMAR = ("one number (e.g. 12, 0.4, 2.5e3) followed by one unit (e.g. 'm', 'kip/in', '/ m**2', "
           "'kip*s**2/ft'); no arithmetic")
"""What a quantity written as text may look like (for messages)."""


def split_quantity(text: str) -> tuple[float, str]:
    """Split a quantity written as text into its number and unit, by a strict grammar.

    Parameters
    ----------
    text : str
        E.g. ``"12 in"``, ``"2.5e3 kN"``, ``"0.4"``. Allowed: one number
        (optional sign, decimal point and exponent) and at most one unit
        expression (unit names joined by ``*``, ``/`` or a space, each with an
        optional whole-number power 1-4; it may start with ``/`` for an amount
        per unit, ``"3500 / m**2"``). Nothing is evaluated.

    Returns
    -------
    (float, str)
        The number as written [the unit's] and the unit text ("" for none).

    Raises
    ------
    ValueError
        For anything else; the message says what is allowed (a percent sign,
        a unit without a number, arithmetic, a number that is not finite).
    """
    if not isinstance(text, str):
        raise ValueError(f"must be text, not {type(text).__name__}")
    found = _QUANTITY.match(text)
    if found is None:
        if _PERCENT.match(text):
            raise ValueError("a percent is allowed only for a ratio (such as a damping ratio); "
                             "this value needs a unit")
        if _UNIT_ONLY.match(text):
            raise ValueError("a unit needs a number in front of it, e.g. '350 kN'")
        raise ValueError(GRAMMAR)
    number = float(found.group(1))
    if not math.isfinite(number):
        raise ValueError("the number must be finite")
    unit = (found.group(2) or "").strip()
    return number, "1" + unit if unit.startswith("/") else unit


def parse_ratio(value: Any, *, field: str, allowed: str) -> float:
    """Read a ratio given as a number (0.05) or as a percent text ("5 %").

    Parameters
    ----------
    value : float, int or str
        The ratio: a bare number, or text of one number and ``%``. [-]
    field : str
        Name of the input for error messages.
    allowed : str
        What is allowed, for the error message.

    Returns
    -------
    float
        The ratio as a fraction (``"5 %"`` gives 0.05). [-]
    """
    if isinstance(value, str):
        found = _PERCENT.match(value)
        if found is None:
            raise _fail(field, value, allowed + " (a bare number such as 0.05, or a percent such as '5 %')")
        number = float(found.group(1)) / 100.0
    elif isinstance(value, (int, float)) and not isinstance(value, bool):
        number = float(value)
    else:
        raise _fail(field, value, allowed)
    if not math.isfinite(number):
        raise _fail(field, value, allowed)
    return number


@lru_cache(maxsize=512)
def _unit_factor(unit: str, kind: str) -> tuple[float, str | None]:
    """Factor from ``unit`` to the internal unit of ``kind`` and the kind found when it differs.

    Returns ``(factor, None)`` when the unit is of this kind, ``(nan, found)``
    when it is another (``found`` names the kind or dimension), and raises
    ``LookupError`` when the unit is not recognised.
    """
    registry = _registry()
    try:
        parsed = registry.parse_units(unit)
    except Exception:
        raise LookupError(unit) from None
    quantity = registry.Quantity(1.0, parsed)
    if kind == "weight" and quantity.dimensionality == registry.Unit("t").dimensionality:
        return float(quantity.to("t").magnitude) * GRAVITY, None
    target = registry.Unit(KINDS[kind][0])
    if quantity.dimensionality != target.dimensionality:
        return math.nan, _describe_dimension(quantity)
    return float(quantity.to(target).magnitude), None


def _parse_text(value: str, kind: str, *, field: str, system: str, allowed: str) -> float:
    try:
        number, unit = split_quantity(value)
    except ValueError as error:
        raise _fail(field, value, f"{allowed}; {error}") from None
    if not unit:
        # A number written as a string ("0.4"): read as a bare number.
        return parse_quantity(number, kind, field=field, system=system)
    try:
        factor, found = _unit_factor(unit, kind)
    except LookupError:
        raise _fail(field, value, allowed + " (the unit was not recognised)") from None
    if found is not None:
        raise _fail(field, value, f"{allowed}; a {found} was given")
    result = number * factor
    if not math.isfinite(result):
        raise _fail(field, value, allowed)
    return result


@lru_cache(maxsize=64)
def _factor(from_unit: str, to_unit: str) -> float:
    return convert(1.0, from_unit, to_unit)


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
