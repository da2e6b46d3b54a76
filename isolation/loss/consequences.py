"""Consequences of damage: repair-cost ratios, repair and recovery times by occupancy.

Repair cost ratios are percentages of the building's replacement cost for each
component group and damage state (slight, moderate, extensive, complete),
from FEMA's Multi-hazard Loss Estimation Methodology, Earthquake Model,
Technical Manual (MR5, 2010), hereafter the FEMA technical manual: Table 15.2 (structural),
Table 15.3 (acceleration-sensitive non-structural), Table 15.4
(drift-sensitive non-structural); contents damage ratios (percent of the
contents value) from Table 15.5; building repair times (construction only)
and recovery times (loss of function, including delays) in days from the
Chapter 15 repair-time tables (Tables 15.9 and 15.10 in MR5 numbering). All
from memory, not re-read. For each occupancy the complete-state ratios of the
three groups add up to 100 %.

Occupancies (the manual's occupancy class): "office" (COM4, professional/technical services),
"residential" (RES3, multi-family dwelling).
"""

from __future__ import annotations

from dataclasses import dataclass

__all__ = ["Occupancy", "OCCUPANCIES", "CONTENTS_RATIOS", "occupancy"]


@dataclass(frozen=True)
class Occupancy:
    """Consequence data of one occupancy; tuples per damage state slight..complete.

    Attributes
    ----------
    name, occupancy_class : str
    structural, acceleration_sensitive, drift_sensitive : tuple of float
        Repair cost ratio, percent of the building replacement cost. [%]
    repair_days : tuple of float
        Building repair (construction) time. [day]
    recovery_days : tuple of float
        Loss of function including delays. [day]
    source : str
    """

    name: str
    occupancy_class: str
    structural: tuple
    acceleration_sensitive: tuple
    drift_sensitive: tuple
    repair_days: tuple
    recovery_days: tuple
    source: str

    @property
    def structural_share(self) -> float:
        """Structural share of the replacement cost: the complete-state structural ratio. [-]"""
        return self.structural[-1] / 100.0

    def to_dict(self) -> dict:
        return {k: getattr(self, k) for k in self.__dataclass_fields__}


_SOURCE = ("FEMA Multi-hazard Loss Estimation Methodology, Earthquake Model, Technical Manual (MR5, 2010) Tables 15.2, "
           "15.3, 15.4 (repair cost ratios), "
           "Chapter 15 repair and recovery time tables; from memory, not re-read")

OCCUPANCIES = {
    "office": Occupancy("office", "COM4", structural=(0.4, 1.9, 9.6, 19.2),
                        acceleration_sensitive=(0.9, 4.8, 14.4, 47.9), drift_sensitive=(0.7, 3.3, 16.4, 32.9),
                        repair_days=(5.0, 30.0, 120.0, 240.0), recovery_days=(20.0, 90.0, 360.0, 480.0),
                        source=_SOURCE),
    "residential": Occupancy("residential", "RES3", structural=(0.3, 1.4, 6.9, 13.8),
                             acceleration_sensitive=(0.8, 4.3, 13.1, 43.7), drift_sensitive=(0.9, 4.3, 21.3, 42.5),
                             repair_days=(5.0, 30.0, 120.0, 240.0), recovery_days=(10.0, 120.0, 480.0, 960.0),
                             source=_SOURCE),
}
"""Consequence data by occupancy name."""

CONTENTS_RATIOS = (1.0, 5.0, 25.0, 50.0)
"""Contents damage, percent of the contents value, per acceleration-sensitive damage state
(FEMA technical manual MR5, Table 15.5, from memory)."""


def occupancy(name: str) -> Occupancy:
    """Consequence data of occupancy ``name`` ("office" or "residential")."""
    if name not in OCCUPANCIES:
        raise ValueError(f"occupancy = {name!r} is not allowed: must be one of "
                         + ", ".join(repr(k) for k in OCCUPANCIES))
    return OCCUPANCIES[name]
