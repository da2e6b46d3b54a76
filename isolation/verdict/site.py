"""Verdict rules about the site and the building's shape: soft soil, long-period
site, near-fault motion, wind against the isolators' strength, slenderness.

Pure functions over plain numbers, one :class:`~isolation.verdict.rules.Reason`
each, like :mod:`isolation.verdict.rules`; every name here is re-exported from
:mod:`isolation.verdict`. Rules that cite a code take ``basis`` (``"asce7"``
or ``"eurocode"``) and cite the clause of that basis (see
:mod:`isolation.verdict.sources`); limits with no single source are "common
practice". A screening aid for a feasibility study; a licensed engineer decides.
"""

from __future__ import annotations

from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS
from isolation.verdict.rules import Reason, _force
from isolation.verdict.sources import PRACTICE as _PRACTICE
from isolation.verdict.sources import source as _source

__all__ = ["slenderness", "site_suitability", "spectral_benefit", "near_fault", "wind"]


def slenderness(ratio: float) -> Reason:
    """Height over plan width: above 3 isolation is a poor fit (common practice).

    Parameters
    ----------
    ratio : float
        H / B. [-]
    """
    if ratio > 3.0:
        return Reason("slenderness", "condition", f"height/width = {ratio:.2f} exceeds 3: a "
                      "slender building rocks on its bearings", ratio, 3.0, "-", _PRACTICE)
    return Reason("slenderness", "ok", f"height/width = {ratio:.2f}", ratio, 3.0, "-", _PRACTICE)


def site_suitability(site_class: str | None, basis: str = DEFAULT_BASIS) -> Reason | None:
    """Soft sites: ASCE 7 class F against, E condition; Eurocode ground D or E condition.

    Parameters
    ----------
    site_class : str or None
        ASCE 7 site class A-F or Eurocode ground type A-E.
    basis : str
        ``"asce7"`` or ``"eurocode"``.
    """
    if site_class is None:
        return None
    level, text = _codes.get(basis, "basis").site_suitability(site_class)
    if level == "against":
        return Reason("soft soil", "against", text, None, None, "-", _source("soft soil class F", basis))
    if level == "condition":
        return Reason("soft soil", "condition", f"{text}: long-period "
                      "motion is amplified, check the isolated period range with a site-specific "
                      "spectrum", None, None, "-", _PRACTICE)
    return Reason("soft soil", "ok", text, None, None, "-", _PRACTICE)


def spectral_benefit(ratio: float) -> Reason:
    """Sa(T_M, beta_M)/Sa(T_fb, 5 %): < 0.5 ok, 0.5-0.8 condition, >= 0.8 against.

    Parameters
    ----------
    ratio : float
        Spectral acceleration at the isolated period and damping over that at
        the fixed-base period and 5 %. [-]
    """
    text = (f"the site spectrum at the isolated period and damping is {ratio:.0%} of its value "
            "at the fixed-base period")
    source = f"site spectrum (derived); thresholds {_PRACTICE}"
    if ratio >= 0.8:
        return Reason("long-period site", "against", text + ": the period shift buys little",
                      ratio, 0.8, "-", source)
    if ratio >= 0.5:
        return Reason("long-period site", "condition", text + ": a long-period site limits the "
                      "benefit", ratio, 0.5, "-", source)
    return Reason("long-period site", "ok", text, ratio, 0.5, "-", source)


NEAR_FAULT_DISTANCE = _codes.PerBasis(lambda basis: basis.near_fault_distance)
"""Distance [km] within which a site counts as near-fault: ASCE/SEI 7-16 §11.2 'near-fault site'
(15 km from a fault able to produce M_w >= 7; 10 km for M_w >= 6: the larger distance is taken
since the magnitude is not a study input), EN 1998-1 §10.9.2 (15 km from a fault of Ms >= 6.5);
both from memory."""


def near_fault(flag: bool, *, basis: str = DEFAULT_BASIS, distance: float | None = None) -> Reason | None:
    """Near-fault sites need pulse-like motions in the suite (condition).

    Parameters
    ----------
    flag : bool
        True when the study flags the site as near an active fault (used when
        ``distance`` is not given).
    basis : str
        ``"asce7"`` or ``"eurocode"``: the clause cited.
    distance : float or None
        Distance to the nearest active fault; decides when given. [km]
    """
    source = _source("near fault", basis)
    limit = _codes.get(basis if basis in _codes.names() else DEFAULT_BASIS).near_fault_distance
    if distance is not None:
        if distance <= limit:
            return Reason("near fault", "condition", f"the site is {distance:g} km from an active fault, "
                          f"within {limit:g} km: include pulse-like records and check displacement with them",
                          distance, limit, "km", source)
        return Reason("near fault", "ok", f"the site is {distance:g} km from an active fault, beyond "
                      f"{limit:g} km", distance, limit, "km", source)
    if not flag:
        return None
    return Reason("near fault", "condition", "the site is flagged as near an active fault (no distance "
                  "given): include pulse-like records and check displacement with them", None, None, "-",
                  source)


def wind(wind_base_shear: float | None, characteristic_strength: float | None, *,
         system: str = "SI", basis: str = DEFAULT_BASIS, margin: float = 1.0,
         strength_note: str = "lower bound") -> Reason:
    """Wind base shear, times a margin, against the isolation plane's resistance before it moves.

    Parameters
    ----------
    wind_base_shear : float or None
        Design wind base shear. [kN]
    characteristic_strength : float or None
        Resistance of the whole isolation plane before it yields or slides: Q_d at the
        lower bound, or for sliders the slow (breakaway-rate) friction force. [kN]
    system : str
        "SI" or "US": units of the forces in the message.
    basis : str
        ``"asce7"`` or ``"eurocode"``: the clause cited.
    margin : float
        Factor on the wind shear, >= 1 (the study runner uses 1.5 for sliders,
        :data:`SLIDER_WIND_MARGIN`). [-]
    strength_note : str
        What ``characteristic_strength`` is (stated in the message).
    """
    source = _source("wind", basis)
    if wind_base_shear is None or characteristic_strength is None:
        return Reason("wind", "note", "wind was not checked (no wind base shear given)",
                      None, None, "kN", source)
    demand = wind_base_shear * margin
    shown = (f"wind base shear {_force(wind_base_shear, system)}"
             + (f" x {margin:g} margin" if margin != 1.0 else ""))
    text = f"{shown} against the resistance {_force(characteristic_strength, system)} ({strength_note})"
    if demand >= characteristic_strength:
        return Reason("wind", "condition", text + ": the isolators would slide or yield in wind, "
                      "so a wind restraint is needed", demand, characteristic_strength,
                      "kN", source)
    return Reason("wind", "ok", text, demand, characteristic_strength, "kN", source)


SLIDER_WIND_MARGIN = 1.5
"""Margin on the wind shear against a sliding isolation plane's slow friction (common practice:
quasi-static wind meets the low-velocity friction, which scatters; no code value)."""
