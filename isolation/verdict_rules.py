"""The rules of the verdict: pure functions over plain numbers, one finding each.

Every rule returns one :class:`Reason` (or None when its input is not
available): the topic, a level (``"ok"``, ``"note"``, ``"condition"``,
``"against"``), one sentence quoting the number that decided it, the value,
the limit, its unit and the source of the limit. :func:`isolation.verdict.assess`
runs them all; every name here is re-exported from :mod:`isolation.verdict`.

Limits marked "common practice" have no single source; "from memory" means
the clause was not re-read when this was written. This is a screening aid for
a feasibility study; a licensed engineer decides.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

__all__ = [
    "Reason", "period_shift", "isolated_period", "displacement_capacity", "moat_clearance",
    "displacement_size", "base_shear_reduction", "design_shear", "floor_acceleration_reduction",
    "storey_drift", "uplift", "slenderness", "site_suitability", "spectral_benefit", "near_fault",
    "wind", "elf_applicability", "bearing_checks", "effective_damping",
]

_MEMORY_ELF = "ASCE/SEI 7-16 §17.4.1 (from memory)"
_PRACTICE = "common practice"

_INCH = 0.0254            # m, exact (NIST SP 811)
_KIP = 4.4482216152605    # kN, 1000 lbf exact (NIST SP 811)


def _length(value: float, system: str = "SI") -> str:
    """A length [m] as text in the study's unit system."""
    return f"{value / _INCH:.1f} in" if system == "US" else f"{value:.3f} m"


def _force(value: float, system: str = "SI") -> str:
    """A force [kN] as text in the study's unit system."""
    return f"{value / _KIP:.0f} kip" if system == "US" else f"{value:.0f} kN"


@dataclass(frozen=True)
class Reason:
    """One finding: ``value`` compared with ``limit`` (both in ``unit``)."""

    topic: str
    level: str
    message: str
    value: float | None = None
    limit: float | None = None
    unit: str = "-"
    source: str = ""

    def to_dict(self) -> dict:
        return asdict(self)


# --------------------------------------------------------------------------
# Rules: each returns one Reason (or None when its input is not available)
# --------------------------------------------------------------------------
def period_shift(isolated_period: float, fixed_base_period: float) -> Reason:
    """T_M / T_fb: >= 3 ok, 2-3 condition, < 2 against.

    Parameters
    ----------
    isolated_period : float
        Shortest effective isolated period (upper bound) T_M. [s]
    fixed_base_period : float
        Fixed-base period T_fb. [s]
    """
    ratio = isolated_period / fixed_base_period
    text = (f"isolated period T_M = {isolated_period:.2f} s is {ratio:.2f} times the fixed-base "
            f"period T_fb = {fixed_base_period:.2f} s")
    source = f"{_MEMORY_ELF}: T_M > 3 T_fb; 2 T_fb floor is {_PRACTICE}"
    if ratio >= 3.0:
        return Reason("period shift", "ok", text + " (at least 3)", ratio, 3.0, "-", source)
    if ratio >= 2.0:
        return Reason("period shift", "condition", text + ": below 3, so the separation of the "
                      "isolation mode is modest and the benefit smaller", ratio, 3.0, "-", source)
    return Reason("period shift", "against", text + ": below 2, too little period shift for "
                  "isolation to pay", ratio, 2.0, "-", source)


def isolated_period(period: float) -> Reason:
    """Isolated period in the usual 2-5 s band (common practice).

    Parameters
    ----------
    period : float
        Shortest effective isolated period (upper bound) T_M. [s]
    """
    if period < 2.0:
        return Reason("isolated period", "condition", f"T_M = {period:.2f} s is below the usual "
                      "2 s lower end: softer bearings would help", period, 2.0, "s", _PRACTICE)
    if period > 5.0:
        return Reason("isolated period", "note", f"T_M = {period:.2f} s exceeds 5 s: the ELF "
                      "procedure is not permitted and wind and restoring force need care",
                      period, 5.0, "s", _MEMORY_ELF)
    return Reason("isolated period", "ok", f"T_M = {period:.2f} s lies in the usual 2-5 s band",
                  period, 5.0, "s", _PRACTICE)


def displacement_capacity(total_displacement: float, capacity: float | None,
                          history_displacement: float | None = None, *, system: str = "SI") -> Reason:
    """Displacement demand against the bearings' displacement capacity.

    Parameters
    ----------
    total_displacement : float
        D_TM at the lower bound. [m]
    capacity : float or None
        Smallest bearing displacement capacity; None if not given. [m]
    history_displacement : float or None
        Suite mean of the peak isolator displacement, lower bound. [m]
    system : str
        "SI" or "US": units of the lengths in the message (values stay in m).
    """
    demand = max(total_displacement, history_displacement or 0.0)
    which = ("D_TM" if demand == total_displacement else "response-history mean peak")
    source = "ASCE/SEI 7-16 §17.2.4.5 and §17.6.3.4 (from memory): bearings stable at D_TM"
    if capacity is None:
        return Reason("displacement capacity", "condition", f"no bearing displacement capacity "
                      f"given: bearings must accommodate {_length(demand, system)} ({which})",
                      demand, None, "m", source)
    if demand > capacity:
        return Reason("displacement capacity", "against", f"displacement demand {_length(demand, system)} "
                      f"({which}) exceeds the bearing capacity {_length(capacity, system)}: the bearings as "
                      "sized do not work", demand, capacity, "m", source)
    return Reason("displacement capacity", "ok", f"displacement demand {_length(demand, system)} ({which}) "
                  f"is within the bearing capacity {_length(capacity, system)} "
                  f"({demand / capacity:.0%} used)", demand, capacity, "m", source)


def moat_clearance(total_displacement: float, moat: float | None, *, system: str = "SI") -> Reason:
    """Moat (clear gap) against D_TM.

    Parameters
    ----------
    total_displacement : float
        D_TM at the lower bound. [m]
    moat : float or None
        Clear gap provided; None if not yet fixed. [m]
    system : str
        "SI" or "US": units of the lengths in the message.
    """
    source = "ASCE/SEI 7-16 §17.2.6 (from memory): separation not less than D_TM"
    if moat is None:
        return Reason("moat", "condition", f"no moat given: provide a clear gap of at least "
                      f"D_TM = {_length(total_displacement, system)}", total_displacement, None, "m", source)
    if moat < total_displacement:
        return Reason("moat", "condition", f"moat {_length(moat, system)} is narrower than D_TM = "
                      f"{_length(total_displacement, system)}: widen it", moat, total_displacement, "m", source)
    return Reason("moat", "ok", f"moat {_length(moat, system)} covers D_TM = {_length(total_displacement, system)}",
                  moat, total_displacement, "m", source)


def displacement_size(total_displacement: float, *, system: str = "SI") -> Reason:
    """Size of the isolation-plane displacement: above 0.8 m a condition, above 1.2 m against.

    Moats, flexible utility joints and bearings for more than about a metre
    of movement are rarely practical (common practice).

    Parameters
    ----------
    total_displacement : float
        D_TM at the lower bound. [m]
    system : str
        "SI" or "US": units of the length in the message.
    """
    text = f"total design displacement D_TM = {_length(total_displacement, system)}"
    if total_displacement > 1.2:
        return Reason("displacement size", "against", text + " is beyond what bearings, moats and "
                      "utility joints practically provide", total_displacement, 1.2, "m", _PRACTICE)
    if total_displacement > 0.8:
        return Reason("displacement size", "condition", text + " is large: bearings, moat and "
                      "utility joints need special design", total_displacement, 0.8, "m", _PRACTICE)
    return Reason("displacement size", "ok", text, total_displacement, 0.8, "m", _PRACTICE)


def base_shear_reduction(ratio: float) -> Reason:
    """Elastic shear above the isolators over the fixed-base base shear:
    < 0.7 ok, 0.7-1 condition, >= 1 against.

    Parameters
    ----------
    ratio : float
        Peak superstructure shear, isolated (upper bound) / fixed base, from
        the response histories. [-]
    """
    text = (f"peak shear above the isolators is {ratio:.0%} of the fixed-base building's "
            "base shear (response histories)")
    if ratio >= 1.0:
        return Reason("base shear", "against", text + ": no reduction", ratio, 1.0, "-", _PRACTICE)
    if ratio >= 0.7:
        return Reason("base shear", "condition", text + ": a modest reduction", ratio, 0.7, "-",
                      _PRACTICE)
    return Reason("base shear", "ok", text, ratio, 0.7, "-", _PRACTICE)


def design_shear(ratio: float) -> Reason:
    """Code design shear V_s over the fixed-base design shear: above 1 a condition.

    The isolated superstructure is designed with R_I <= 2 against R for the
    fixed base, so its design shear may exceed the fixed-base value while it
    stays nearly elastic; that costs, and is a condition, not a refusal.

    Parameters
    ----------
    ratio : float
        V_s / V_fixed (ASCE/SEI 7-16 §17.5.4 and §12.8, or EN 1998-1 §10.10 and §4.3.3.2). [-]
    """
    text = f"code design shear above the isolators is {ratio:.0%} of the fixed-base design shear"
    source = "ASCE/SEI 7-16 §17.5.4.2 (R_I = 3/8 R within 1-2) and §12.8.1 (from memory)"
    if ratio > 1.0:
        return Reason("design shear", "condition", text + ": the superstructure is designed for more "
                      "force than on a fixed base (but stays nearly elastic)", ratio, 1.0, "-", source)
    return Reason("design shear", "ok", text, ratio, 1.0, "-", source)


def floor_acceleration_reduction(ratio: float) -> Reason:
    """Peak floor acceleration isolated over fixed base: < 0.6 ok, 0.6-1 condition, >= 1 against.

    Parameters
    ----------
    ratio : float
        Largest peak floor acceleration, isolated (upper bound) / fixed base. [-]
    """
    text = f"peak floor acceleration is {ratio:.0%} of the fixed-base value"
    if ratio >= 1.0:
        return Reason("floor acceleration", "against", text + ": no protection of contents",
                      ratio, 1.0, "-", _PRACTICE)
    if ratio >= 0.6:
        return Reason("floor acceleration", "condition", text + ": limited protection of contents",
                      ratio, 0.6, "-", _PRACTICE)
    return Reason("floor acceleration", "ok", text, ratio, 0.6, "-", _PRACTICE)


def storey_drift(drift_ratio: float, limit: float = 0.015, source: str = "") -> Reason:
    """Largest storey drift ratio of the isolated building against the limit.

    Parameters
    ----------
    drift_ratio : float
        Largest storey drift / storey height. [-]
    limit : float
        Allowed ratio (0.015 for the ELF procedure, ASCE/SEI 7-16 §17.5.6, from memory). [-]
    source : str
        Where the limit comes from; default the ELF clause.
    """
    source = source or "ASCE/SEI 7-16 §17.5.6 (from memory)"
    text = f"largest storey drift ratio {drift_ratio:.2%} against the limit {limit:.2%}"
    if drift_ratio > limit:
        return Reason("drift", "condition", text + ": stiffen the superstructure", drift_ratio,
                      limit, "-", source)
    return Reason("drift", "ok", text, drift_ratio, limit, "-", source)


def uplift(uplift_ratio: float) -> Reason:
    """Net tension at edge bearings when overturning exceeds gravity (ratio >= 1).

    Parameters
    ----------
    uplift_ratio : float
        Axial change from overturning / (gravity load less vertical earthquake). [-]
    """
    text = (f"overturning changes the edge bearings' axial load by {uplift_ratio:.0%} of their "
            "net gravity load")
    source = "rigid-body overturning on a uniform bearing field (derived); vertical 0.2 S_MS per ASCE/SEI 7-16 §12.4.2.2 (from memory)"
    if uplift_ratio >= 1.0:
        return Reason("uplift", "condition", text + ": net tension, so tension-capable bearings "
                      "or uplift restraint are needed", uplift_ratio, 1.0, "-", source)
    return Reason("uplift", "ok", text + ": no net tension", uplift_ratio, 1.0, "-", source)


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


def site_suitability(site_class: str | None, basis: str = "asce7") -> Reason | None:
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
    name = "site class" if basis == "asce7" else "ground type"
    if basis == "asce7" and site_class == "F":
        return Reason("soft soil", "against", f"{name} F needs a site-specific response analysis; "
                      "soft or liquefiable soil amplifies long periods", None, None, "-",
                      "ASCE/SEI 7-16 §11.4.8, §17.4.1 (from memory)")
    soft = ("E",) if basis == "asce7" else ("D", "E")
    if site_class in soft:
        return Reason("soft soil", "condition", f"{name} {site_class} is soft: long-period "
                      "motion is amplified, check the isolated period range with a site-specific "
                      "spectrum", None, None, "-", _PRACTICE)
    return Reason("soft soil", "ok", f"{name} {site_class}", None, None, "-", _PRACTICE)


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


def near_fault(flag: bool) -> Reason | None:
    """Near-fault sites need pulse-like motions in the suite (condition)."""
    if not flag:
        return None
    return Reason("near fault", "condition", "the site is near an active fault: include "
                  "pulse-like records and check displacement with them", None, None, "-",
                  "ASCE/SEI 7-16 §17.3.2 (from memory)")


def wind(wind_base_shear: float | None, characteristic_strength: float | None, *,
         system: str = "SI") -> Reason:
    """Wind base shear against the isolation plane's characteristic strength Q_d.

    Parameters
    ----------
    wind_base_shear : float or None
        Design wind base shear. [kN]
    characteristic_strength : float or None
        Q_d of the whole isolation plane, lower bound. [kN]
    system : str
        "SI" or "US": units of the forces in the message.
    """
    source = "ASCE/SEI 7-16 §17.2.4.3 (from memory): wind without yielding the isolation system"
    if wind_base_shear is None or characteristic_strength is None:
        return Reason("wind", "note", "wind was not checked (no wind base shear given)",
                      None, None, "kN", source)
    text = (f"wind base shear {_force(wind_base_shear, system)} against the characteristic strength "
            f"Q_d = {_force(characteristic_strength, system)} (lower bound)")
    if wind_base_shear >= characteristic_strength:
        return Reason("wind", "condition", text + ": the isolators would slide or yield in wind, "
                      "so a wind restraint is needed", wind_base_shear, characteristic_strength,
                      "kN", source)
    return Reason("wind", "ok", text, wind_base_shear, characteristic_strength, "kN", source)


def elf_applicability(permitted: bool | None, reasons: tuple = ()) -> Reason | None:
    """Whether the equivalent lateral force procedure is permitted (a note either way)."""
    if permitted is None:
        return None
    if permitted:
        return Reason("analysis procedure", "ok", "the equivalent lateral force procedure is "
                      "permitted", None, None, "-", _MEMORY_ELF)
    listed = "; ".join(reasons) if reasons else "limits exceeded"
    return Reason("analysis procedure", "note", "response-history analysis is required "
                  f"({listed}); this study includes it", None, None, "-", _MEMORY_ELF)


def bearing_checks(failed: tuple) -> Reason:
    """Failed bearing checks call for resizing (condition)."""
    if failed:
        return Reason("bearing checks", "condition", "bearing checks failed: "
                      + ", ".join(failed) + "; resize the bearings", float(len(failed)), 0.0,
                      "-", "see the bearing checks table")
    return Reason("bearing checks", "ok", "all bearing checks pass", 0.0, 0.0, "-",
                  "see the bearing checks table")


def effective_damping(damping: float | None) -> Reason | None:
    """Above 30 % effective damping the equivalent-linear answer is doubtful (note)."""
    if damping is None:
        return None
    if damping > 0.30:
        return Reason("effective damping", "note", f"effective damping {damping:.0%} exceeds 30 %: "
                      "rely on the response histories", damping, 0.30, "-", _MEMORY_ELF)
    return Reason("effective damping", "ok", f"effective damping {damping:.0%}", damping, 0.30,
                  "-", _MEMORY_ELF)
