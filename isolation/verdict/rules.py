"""The rules of the verdict: pure functions over plain numbers, one finding each.

Every rule returns one :class:`Reason` (or None when its input is not
available): the topic, a level (``"ok"``, ``"note"``, ``"condition"``,
``"against"``), one sentence quoting the number that decided it, the value,
the limit, its unit and the source of the limit. :func:`isolation.verdict.assess`
runs them all; every name here is re-exported from :mod:`isolation.verdict`.
Rules about the site and the building's shape are in :mod:`isolation.verdict.site`.

Every rule that cites a code takes ``basis`` (``"asce7"`` or ``"eurocode"``,
the study's code basis, carried by :class:`isolation.verdict.Figures`) and
cites ASCE/SEI 7-16 Chapter 17 or EN 1998-1:2004 Section 10 accordingly (see
:mod:`isolation.verdict.sources`). Limits marked "common practice" have no
single source, whatever the basis; "from memory" means the clause was not
re-read when this was written. This is a screening aid for a feasibility
study; a licensed engineer decides.
"""

from __future__ import annotations

from dataclasses import asdict, dataclass

from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS
from isolation.units import to_display as _to_display
from isolation.verdict.sources import PRACTICE as _PRACTICE
from isolation.verdict.sources import source as _source

_EQUIVALENT_LINEAR_LIMIT = "§10.9.1(5)"
"""Marker in the names of the EN 1998-1 checks whose failure excludes the equivalent-linear model."""

__all__ = [
    "Reason", "period_shift", "isolated_period", "displacement_capacity", "moat_clearance",
    "displacement_size", "base_shear_reduction", "design_shear", "floor_acceleration_reduction",
    "storey_drift", "uplift", "elf_applicability", "bearing_checks", "effective_damping",
]


def _length(value: float, system: str = "SI") -> str:
    """A length [m] as text in the study's unit system."""
    shown, unit = _to_display(value, "length", system)
    return f"{shown:.1f} {unit}" if system == "US" else f"{shown:.3f} {unit}"


def _force(value: float, system: str = "SI") -> str:
    """A force [kN] as text in the study's unit system."""
    shown, unit = _to_display(value, "force", system)
    return f"{shown:.0f} {unit}"


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
def period_shift(isolated_period: float, fixed_base_period: float, *, basis: str = DEFAULT_BASIS,
                 period_source: str = "") -> Reason:
    """T_M / T_fb against the single-mode procedure's limit (3): always a note.

    The ratio is an applicability limit of the code's single-mode procedure
    (ASCE/SEI 7-16 §17.4.1 ELF; EN 1998-1 §10.9.2 simplified analysis), not a
    measure of benefit (that is :func:`isolation.verdict.site.spectral_benefit`).

    Parameters
    ----------
    isolated_period : float
        Effective isolated period T_M of the set the limit uses. [s]
    fixed_base_period : float
        Fixed-base period T_fb. [s]
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``: which clause the source cites.
    period_source : str
        Where T_fb comes from (stated in the message).
    """
    ratio = isolated_period / fixed_base_period
    how = f" ({period_source})" if period_source else ""
    procedure = _codes.get(basis, "basis").procedure
    text = (f"isolated period T_M = {isolated_period:.2f} s is {ratio:.2f} times the fixed-base "
            f"period T_fb = {fixed_base_period:.2f} s{how}")
    source = _source("period shift", basis)
    if ratio >= 3.0:
        return Reason("period shift", "note", text + f": {procedure} needs at least 3, met",
                      ratio, 3.0, "-", source)
    return Reason("period shift", "note", text + f": below 3, so {procedure} is not permitted on this "
                  "count (the response histories govern)", ratio, 3.0, "-", source)


def isolated_period(period: float, *, basis: str = DEFAULT_BASIS, bound: str = "upper") -> Reason:
    """Isolated period in the usual 2-5 s band (common practice); above 5 s a note
    (ASCE 7: no ELF procedure; Eurocode: common practice, see :mod:`isolation.verdict.sources`).

    Parameters
    ----------
    period : float
        Effective isolated period T_M of the property set named by ``bound``. [s]
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``.
    bound : str
        Which property set ``period`` belongs to ("nominal", "lower", "upper"): stated
        in the message. The study runner passes the nominal set, the period practice quotes.
    """
    which = f"T_M ({bound} properties) = {period:.2f} s"
    if period < 2.0:
        return Reason("isolated period", "condition", f"{which} is below the usual "
                      "2 s lower end: softer bearings would help", period, 2.0, "s", _PRACTICE)
    if period > 5.0:
        code = _codes.get(basis, "basis")
        why = f"{code.procedure} is not permitted and wind" if code.long_period_bars_procedure else "wind"
        return Reason("isolated period", "note", f"{which} exceeds 5 s: {why} and "
                      "restoring force need care", period, 5.0, "s", _source("isolated period limit", basis))
    return Reason("isolated period", "ok", f"{which} lies in the usual 2-5 s band",
                  period, 5.0, "s", _PRACTICE)


def displacement_capacity(total_displacement: float, capacity: float | None,
                          history_displacement: float | None = None, *, system: str = "SI",
                          basis: str = DEFAULT_BASIS) -> Reason:
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
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``: which clause the source cites.
    """
    demand = max(total_displacement, history_displacement or 0.0)
    which = ("D_TM" if demand == total_displacement else "response-history mean peak")
    source = _source("displacement capacity", basis)
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


def moat_clearance(total_displacement: float, moat: float | None, *, system: str = "SI",
                   basis: str = DEFAULT_BASIS) -> Reason:
    """Moat (clear gap) against D_TM.

    Parameters
    ----------
    total_displacement : float
        D_TM at the lower bound. [m]
    moat : float or None
        Clear gap provided; None if not yet fixed. [m]
    system : str
        "SI" or "US": units of the lengths in the message.
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``: which clause the source cites.
    """
    source = _source("moat", basis)
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


def design_shear(ratio: float, *, basis: str = DEFAULT_BASIS) -> Reason:
    """Code design shear V_s over the fixed-base design shear: above 1 a condition.

    The isolated superstructure is designed with R_I <= 2 against R for the
    fixed base, so its design shear may exceed the fixed-base value while it
    stays nearly elastic; that costs, and is a condition, not a refusal.

    Parameters
    ----------
    ratio : float
        V_s / V_fixed (ASCE/SEI 7-16 §17.5.4 and §12.8, or EN 1998-1 §10.10 and §4.3.3.2). [-]
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``: which clause the source cites.
    """
    text = f"code design shear above the isolators is {ratio:.0%} of the fixed-base design shear"
    source = _source("design shear", basis)
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


def storey_drift(drift_ratio: float, limit: float | None = None, source: str = "", *,
                 basis: str = DEFAULT_BASIS, model: str = "") -> Reason:
    """Largest storey drift ratio of the isolated building against the limit.

    Parameters
    ----------
    drift_ratio : float
        Largest storey drift / storey height. [-]
    limit : float or None
        Allowed ratio; default 0.015 for ASCE 7 (ELF procedure, §17.5.6, from
        memory) or the Eurocode damage limitation value of
        :func:`isolation.verdict.sources.drift_limit`. [-]
    source : str
        Where ``limit`` comes from; default the clause of the default limit.
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``: the default limit and source.
    model : str
        What the drift comes from, quoted in the message when given (e.g. the plan model). [-]
    """
    default_limit, default_source = _codes.get(basis, "basis").report_drift_limit()
    limit = default_limit if limit is None else limit
    source = source or default_source
    text = f"largest storey drift ratio {drift_ratio:.2%}" + (f" ({model})" if model else "") + \
        f" against the limit {limit:.2%}"
    if drift_ratio > limit:
        return Reason("drift", "condition", text + ": stiffen the superstructure", drift_ratio,
                      limit, "-", source)
    return Reason("drift", "ok", text, drift_ratio, limit, "-", source)


def uplift(uplift_ratio: float, *, basis: str = DEFAULT_BASIS) -> Reason:
    """Net tension in the outermost bearing when overturning exceeds its gravity load (ratio > 1);
    a condition only then (see :func:`isolation.design.overturning.bearing_uplift`).

    Parameters
    ----------
    uplift_ratio : float
        Axial change of the outermost bearing from overturning / its tributary gravity
        load as factored and reduced by the vertical earthquake. [-]
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``: which clause the source cites.
    """
    text = (f"overturning changes the outermost bearing's axial load by {uplift_ratio:.0%} of its "
            "tributary net gravity load")
    source = _source("uplift", basis)
    if uplift_ratio > 1.0:
        return Reason("uplift", "condition", text + ": net tension, so tension-capable bearings "
                      "or uplift restraint are needed", uplift_ratio, 1.0, "-", source)
    return Reason("uplift", "ok", text + ": no net tension", uplift_ratio, 1.0, "-", source)


def elf_applicability(permitted: bool | None, reasons: tuple = (), *, basis: str = DEFAULT_BASIS) -> Reason | None:
    """Whether the code's single-mode procedure is permitted (a note either way): the
    equivalent lateral force procedure (ASCE 7) or the simplified analysis (Eurocode).

    Parameters
    ----------
    permitted : bool or None
        Whether the procedure is permitted; None if not known.
    reasons : tuple of str
        The applicability limits it fails.
    basis : str
        Code basis, ``"asce7"`` or ``"eurocode"``.
    """
    if permitted is None:
        return None
    source = _source("analysis procedure", basis)
    procedure = _codes.get(basis, "basis").procedure_full
    if permitted:
        return Reason("analysis procedure", "ok", f"{procedure} is permitted", None, None, "-", source)
    listed = "; ".join(reasons) if reasons else "limits exceeded"
    if any(_EQUIVALENT_LINEAR_LIMIT in r for r in reasons):  # EN 1998-1 §10.9.1(5) reasons only
        return Reason("analysis procedure", "note", "the equivalent-linear methods (simplified and "
                      f"modal) are excluded altogether ({listed}): response-history analysis is "
                      "required; this study includes it", None, None, "-", source)
    return Reason("analysis procedure", "note", "response-history analysis is required "
                  f"({listed}); this study includes it", None, None, "-", source)


def bearing_checks(failed: tuple) -> Reason:
    """Failed bearing checks call for resizing (condition)."""
    if failed:
        return Reason("bearing checks", "condition", "bearing checks failed: "
                      + ", ".join(failed) + "; resize the bearings", float(len(failed)), 0.0,
                      "-", "see the bearing checks table")
    return Reason("bearing checks", "ok", "all bearing checks pass", 0.0, 0.0, "-",
                  "see the bearing checks table")


def effective_damping(damping: float | None, *, basis: str = DEFAULT_BASIS) -> Reason | None:
    """Above 30 % effective damping the equivalent-linear answer is doubtful (note).

    Parameters
    ----------
    damping : float or None
        Largest effective damping ratio over the bounds. [-]
    basis : str
        Code basis, ``"asce7"`` (§17.4.1) or ``"eurocode"`` (§10.9.1).
    """
    if damping is None:
        return None
    source = _source("effective damping", basis)
    if damping > 0.30:
        return Reason("effective damping", "note", f"effective damping {damping:.0%} exceeds 30 %: "
                      "rely on the response histories", damping, 0.30, "-", source)
    return Reason("effective damping", "ok", f"effective damping {damping:.0%}", damping, 0.30,
                  "-", source)
