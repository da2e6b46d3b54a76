"""Values of the result tables in a study's unit system (:func:`in_study_units`).

Re-exported from :mod:`isolation.output.tables.table` and :mod:`isolation.output.tables`.
"""

from __future__ import annotations

import math
from typing import Any, Mapping

import numpy as np

__all__ = ["in_study_units"]


def in_study_units(value: Any, unit: str, system: str = "SI") -> tuple[Any, str]:
    """A value written in an internal unit, in a unit system's units for its kind.

    The internal units of :data:`isolation.units.KINDS` (m, kN, kPa, kN/m, t)
    become the units a study of that system is written in
    (:data:`isolation.units.BARE_UNITS`: SI m, kN, kPa, kN/m; US in, kip,
    psi, kip/in); lengths, forces and stiffnesses thus match the display units
    of the other tables. Any other unit ("-", "s", "g", "") and a value that is
    not a number (None, text) pass through unchanged.

    Parameters
    ----------
    value : float, None or any
        Value in ``unit``. [unit]
    unit : str
        Internal unit the value is written in, e.g. "m", "kN", "kPa", "-".
    system : str
        "SI" or "US".

    Returns
    -------
    (value, str)
        The converted value and its unit name.
    """
    from isolation import units, validate

    validate.one_of("system", system, units.SYSTEMS)
    kinds = {internal: kind for kind, (internal, _) in units.KINDS.items() if kind != "weight"}
    kind = kinds.get(unit)
    if kind is None:
        return value, unit
    target = units.BARE_UNITS[system][kind]
    if target == unit or isinstance(value, bool) or not isinstance(value, (int, float, np.integer, np.floating)):
        return value, target
    number = float(value)
    if not math.isfinite(number):
        return value, target
    return units.convert(number, unit, target), target


def _as_mapping(obj: Any) -> Mapping[str, Any]:
    if hasattr(obj, "to_dict"):
        return obj.to_dict()
    return {k: getattr(obj, k) for k in ("name", "value", "limit", "passed", "unit", "source") if hasattr(obj, k)}
