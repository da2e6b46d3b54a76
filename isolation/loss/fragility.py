"""Lognormal fragility functions of storey components, with their published sources.

A fragility gives the probability that a component group reaches or exceeds
damage state ds at demand d: P(DS >= ds | d) = Phi(ln(d / median_ds) / beta_ds).
Groups follow the storey-based split of FEMA's earthquake loss estimation
technical manual (structural, drift-sensitive
non-structural, acceleration-sensitive non-structural; contents follow the
acceleration-sensitive group), with four damage states: slight, moderate,
extensive, complete.

Medians (demand at the threshold of each damage state) are those of
:mod:`isolation.performance.damage` (one table for the package):

* structural: inter-storey drift ratios at the threshold of damage, by model
  building type, height class and design level, FEMA Multi-hazard Loss
  Estimation Methodology, Earthquake Model, Technical Manual (MR5, 2010), Tables 5.9a/b (from memory, not re-read);
* drift-sensitive non-structural: 0.004, 0.008, 0.025, 0.050 drift ratio
  (same manual, Table 5.11, from memory);
* acceleration-sensitive non-structural: 0.30, 0.60, 1.20, 2.40 g (high
  code), 0.25, 0.50, 1.00, 2.00 g (moderate code) peak floor acceleration
  (same manual, Table 5.13, from memory).

Dispersions: the manual publishes its betas for spectral displacement and
acceleration of the whole building (they include the capacity-curve
variability), not for storey demands; the storey-demand dispersions used
here (0.4 drift, structural; 0.5 drift, non-structural; 0.6 acceleration)
are common practice, in the range of FEMA P-58-1 (2012) component fragilities.

Irreparability: FEMA P-58-1 (2012) §7.6 (from memory): probability that a
building is demolished rather than repaired, lognormal in the largest residual
storey drift ratio, median 0.01, dispersion 0.3 (after Ramirez & Miranda 2012,
Earthquake Eng. Struct. Dyn. 41(11)).

Collapse screen: ASCE/SEI 7-16 Commentary Table C.1.3.1b (from memory): target
collapse probability at the MCE_R 10 % (risk categories I and II), 5 % (III),
2.5 % (IV) for code-designed buildings; with the total dispersion 0.6 of FEMA
P-695 (2009) studies this gives a lognormal collapse fragility in MCE_R
fractions (:func:`collapse_fragility`).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.special import ndtr

from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS

__all__ = ["Fragility", "DAMAGE_STATES", "component_fragilities", "IRREPARABLE", "COLLAPSE_AT_MCE",
           "COLLAPSE_DISPERSION", "collapse_fragility", "collapse_probability_at_mce"]

DAMAGE_STATES = ("slight", "moderate", "extensive", "complete")
"""Damage states of the FEMA technical manual, in order."""


@dataclass(frozen=True)
class Fragility:
    """Lognormal fragility of one damage state.

    Parameters
    ----------
    median : float
        Demand with 50 % probability of reaching the state, > 0. [demand unit]
    dispersion : float
        Logarithmic standard deviation, > 0. [-]
    source : str
        Published table (and edition) the values come from.
    """

    median: float
    dispersion: float
    source: str = ""

    def __post_init__(self):
        for name, unit in (("median", "demand unit"), ("dispersion", "-")):
            value = getattr(self, name)
            if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value) \
                    or value <= 0.0:
                raise ValueError(f"{name} = {value!r} is not allowed: must be a finite number > 0 [{unit}]")

    def probability(self, demand):
        """P(reaching the state | demand) [-] for ``demand`` [demand unit] (0 for demand <= 0)."""
        d = np.asarray(demand, dtype=float)
        with np.errstate(divide="ignore"):
            return ndtr(np.log(np.maximum(d, 0.0) / self.median) / self.dispersion)


def _states(medians, dispersion, source):
    return tuple(Fragility(m, dispersion, source) for m in medians)


STRUCTURAL_DISPERSION = 0.4
"""Storey-drift dispersion of the structural fragilities [-] (common practice)."""

DRIFT_DISPERSION = 0.5
"""Dispersion of the drift-sensitive non-structural fragilities [-] (common practice)."""

ACCELERATION_DISPERSION = 0.6
"""Dispersion of the acceleration-sensitive non-structural fragilities [-] (common practice)."""


def component_fragilities(lateral_system: str, storeys: int, design_level: str = "high") -> dict:
    """Fragilities of the storey component groups of a building.

    Medians from :func:`isolation.performance.damage.damage_thresholds` (FEMA earthquake loss
    estimation technical manual MR5, Tables 5.9a/b, 5.11, 5.13; from memory), dispersions of
    this module (common practice).

    Parameters
    ----------
    lateral_system : str
        Study ``building.lateral_system``. [-]
    storeys : int
        Storeys above the base (height class). [-]
    design_level : {"high", "moderate"}
        Seismic design level of the manual. [-]

    Returns
    -------
    dict
        ``structural``, ``drift_nonstructural`` (drift ratio [-]) and
        ``acceleration_nonstructural`` (peak floor acceleration [g]): 4
        :class:`Fragility` each, slight..complete.
    """
    from isolation.performance.damage import damage_thresholds

    medians = damage_thresholds(lateral_system, storeys, design_level)
    note = f"{medians.source}; type {medians.building_type}, {design_level} code"
    return {
        "structural": _states(medians.structural_drift, STRUCTURAL_DISPERSION,
                              f"{note}; dispersion {STRUCTURAL_DISPERSION} common practice"),
        "drift_nonstructural": _states(medians.nonstructural_drift, DRIFT_DISPERSION,
                                       f"{note}; dispersion {DRIFT_DISPERSION} common practice"),
        "acceleration_nonstructural": _states(medians.floor_acceleration, ACCELERATION_DISPERSION,
                                              f"{note}; dispersion {ACCELERATION_DISPERSION} common practice"),
    }


IRREPARABLE = Fragility(0.01, 0.3, "FEMA P-58-1 (2012) §7.6, residual drift, from memory")
"""Irreparability: largest residual storey drift ratio [-]."""

COLLAPSE_AT_MCE = {"I": 0.10, "II": 0.10, "III": 0.05, "IV": 0.025}
"""Target P(collapse | MCE_R) by risk category, ASCE/SEI 7-16 Commentary Table C.1.3.1b (from memory)."""

COLLAPSE_DISPERSION = 0.6
"""Total dispersion of the collapse fragility [-] (FEMA P-695 (2009) studies, common practice)."""

def collapse_probability_at_mce(importance: float, basis: str = DEFAULT_BASIS) -> float:
    """Target P(collapse | MCE_R) [-] from the importance factor [-].

    ASCE 7: I_e 1.0 -> risk category II, 1.25 -> III, 1.5 -> IV (ASCE/SEI 7-16
    Table 1.5-2). Eurocode: gamma_I <= 1.0 -> as II, 1.2 -> as III, 1.4 -> as IV
    (an assumed correspondence).
    """
    return COLLAPSE_AT_MCE[_codes.get(basis, "basis").risk_category(importance)]


def collapse_fragility(probability_at_mce: float, dispersion: float = COLLAPSE_DISPERSION) -> Fragility:
    """Lognormal collapse fragility in MCE_R fractions with the given P(collapse | MCE_R).

    Parameters
    ----------
    probability_at_mce : float
        P(collapse | MCE_R), in (0, 0.5). [-]
    dispersion : float, optional
        Total dispersion, > 0. [-]
    """
    p = float(probability_at_mce)
    if not 0.0 < p < 0.5:
        raise ValueError(f"probability_at_mce = {probability_at_mce!r} is not allowed: must be in (0, 0.5) [-]")
    from scipy.special import ndtri

    median = math.exp(-float(ndtri(p)) * dispersion)
    return Fragility(median, dispersion, "ASCE/SEI 7-16 Commentary Table C.1.3.1b target with FEMA P-695 "
                                         "dispersion, from memory")
