"""Damage indicators: peak storey drift and floor acceleration against published damage-state medians.

The medians are those of the earthquake model technical manual of FEMA's
multi-hazard loss estimation methodology (FEMA, Multi-hazard Loss Estimation
Methodology, Earthquake Model, Technical Manual, MR5 edition, 2010/2012,
Chapter 5), all from memory, not re-read:

* structural damage: average inter-storey drift ratio at the threshold of
  the slight, moderate, extensive and complete states, by model building
  type (S1 steel moment frame, C1 concrete moment frame, S2 steel braced
  frame, C2 concrete shear wall) and height class (low-rise 1-3 storeys,
  mid-rise 4-7, high-rise 8+), for high-code and moderate-code design
  (tables of structural fragility parameters, Tables 5.9a and 5.9b);
* drift-sensitive non-structural components: 0.004, 0.008, 0.025, 0.050 for
  every building type;
* acceleration-sensitive non-structural components: peak floor acceleration
  0.30, 0.60, 1.20, 2.40 g (high code), 0.25, 0.50, 1.00, 2.00 g (moderate code).

These medians belong to lognormal fragility curves with dispersions of about
0.4-0.7; a suite-mean peak at a median means about even odds of reaching that
state. An indicator, not a loss estimate.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

import numpy as np

from isolation import validate

__all__ = ["STATES", "DamageThresholds", "damage_thresholds", "damage_state", "building_type"]

STATES = ("none", "slight", "moderate", "extensive", "complete")
"""Damage states, from below the first threshold to complete."""

_MANUAL = ("FEMA multi-hazard loss estimation methodology, earthquake model technical manual (MR5), Ch. 5")

_TYPES = {"steel_moment_frame": "S1", "concrete_moment_frame": "C1", "braced_frame": "S2",
          "steel_eccentrically_braced_frame": "S2", "steel_buckling_restrained_braced_frame": "S2",
          "concentrically_braced_frame": "S2", "shear_wall": "C2", "other": "C2"}

# Average inter-storey drift ratio at the damage-state thresholds (slight, moderate, extensive, complete),
# by model building type, height class and design level (from memory of the manual's Tables 5.9a/b).
_STRUCTURAL = {
    "high": {
        "S1L": (0.006, 0.012, 0.030, 0.080),
        "S1M": (0.004, 0.008, 0.020, 0.0533),
        "S1H": (0.003, 0.006, 0.015, 0.040),
        "C1L": (0.005, 0.010, 0.030, 0.080),
        "C1M": (0.0033, 0.0067, 0.020, 0.0533),
        "C1H": (0.0025, 0.005, 0.015, 0.040),
        "S2L": (0.005, 0.010, 0.030, 0.080),
        "S2M": (0.0033, 0.0067, 0.020, 0.0533),
        "S2H": (0.0025, 0.005, 0.015, 0.040),
        "C2L": (0.004, 0.010, 0.030, 0.080),
        "C2M": (0.0027, 0.0067, 0.020, 0.0533),
        "C2H": (0.002, 0.005, 0.015, 0.040),
    },
    "moderate": {
        "S1L": (0.006, 0.0104, 0.0235, 0.060),
        "S1M": (0.004, 0.0069, 0.0157, 0.040),
        "S1H": (0.003, 0.0052, 0.0118, 0.030),
        "C1L": (0.005, 0.0087, 0.0233, 0.060),
        "C1M": (0.0033, 0.0058, 0.0156, 0.040),
        "C1H": (0.0025, 0.0043, 0.0117, 0.030),
        "S2L": (0.005, 0.0087, 0.0233, 0.060),
        "S2M": (0.0033, 0.0058, 0.0156, 0.040),
        "S2H": (0.0025, 0.0043, 0.0117, 0.030),
        "C2L": (0.004, 0.0076, 0.0197, 0.050),
        "C2M": (0.0027, 0.0051, 0.0132, 0.0333),
        "C2H": (0.002, 0.0038, 0.0099, 0.025),
    },
}
_NONSTRUCTURAL_DRIFT = (0.004, 0.008, 0.025, 0.050)
_NONSTRUCTURAL_ACCELERATION = {"high": (0.30, 0.60, 1.20, 2.40), "moderate": (0.25, 0.50, 1.00, 2.00)}


def building_type(lateral_system: str, storeys: int) -> str:
    """Model building type label of the manual, e.g. ``"C1M"`` (from memory).

    Parameters
    ----------
    lateral_system : str
        ``"steel_moment_frame"`` (S1), ``"concrete_moment_frame"`` (C1),
        ``"braced_frame"`` (S2) or ``"other"`` (C2, concrete shear walls). [-]
    storeys : int
        Storeys above the base: 1-3 low-rise (L), 4-7 mid-rise (M), 8+ high-rise (H). [-]
    """
    validate.one_of("lateral_system", lateral_system, tuple(_TYPES))
    if isinstance(storeys, bool) or not isinstance(storeys, (int, np.integer)) or storeys < 1:
        raise ValueError(f"storeys = {storeys!r} is not allowed: must be a whole number >= 1")
    height = "L" if storeys <= 3 else ("M" if storeys <= 7 else "H")
    return _TYPES[lateral_system] + height


@dataclass(frozen=True)
class DamageThresholds:
    """Damage-state medians for one building (slight, moderate, extensive, complete).

    Attributes: ``building_type`` (e.g. "C1M"), ``design_level`` ("high" or
    "moderate"), ``structural_drift`` [-], ``nonstructural_drift`` [-],
    ``floor_acceleration`` [g], ``source``.
    """

    building_type: str
    design_level: str
    structural_drift: tuple
    nonstructural_drift: tuple
    floor_acceleration: tuple
    source: str

    def to_dict(self) -> dict:
        return asdict(self)


def damage_thresholds(lateral_system: str, storeys: int, design_level: str = "high") -> DamageThresholds:
    """Published damage-state medians for a building (see the module notes; from memory).

    Parameters
    ----------
    lateral_system : str
        Lateral system of the fixed-base building (see :func:`building_type`). [-]
    storeys : int
        Storeys above the base. [-]
    design_level : {"high", "moderate"}
        Seismic design level of the manual: "high" code for a building designed
        to current high-seismicity provisions (default), "moderate" otherwise. [-]
    """
    validate.one_of("design_level", design_level, ("high", "moderate"))
    kind = building_type(lateral_system, storeys)
    return DamageThresholds(
        kind, design_level, _STRUCTURAL[design_level][kind], _NONSTRUCTURAL_DRIFT,
        _NONSTRUCTURAL_ACCELERATION[design_level],
        f"{_MANUAL}: structural drift at damage-state thresholds ({kind}, {design_level} code, Tables 5.9a/b), "
        "non-structural drift- and acceleration-sensitive medians (from memory)")


def damage_state(value: float, medians) -> str:
    """Highest damage state whose median ``value`` reaches (``"none"`` below the first).

    Parameters
    ----------
    value : float
        Demand (drift ratio [-] or floor acceleration [g]), >= 0.
    medians : sequence of 4 float
        Medians of slight, moderate, extensive, complete, rising. [same as value]
    """
    v = validate.non_negative("value", value, "-")
    m = np.asarray(medians, dtype=float)
    if m.shape != (4,) or np.any(np.diff(m) <= 0):
        raise ValueError(f"medians = {medians!r} is not allowed: must be 4 rising values")
    return STATES[int(np.searchsorted(m, v, side="right"))]
