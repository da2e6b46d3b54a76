"""Loss-study inputs of a study file: the ``[cost]``, ``[hazard]`` and ``[loss]`` tables.

All three tables and all their keys are optional; a key left out takes a
default, and every cost default is an INVENTED DEMO VALUE (listed in
``CostInputs.defaults`` and flagged in the report). Money is a bare number in
the study's currency (``cost.currency``, a label); areas and lengths accept
units (``"1200 m**2"``, ``"13000 ft**2"``); costs per area or per length may
carry the area or length unit (``"3500 / m**2"``, ``"325 / ft**2"``,
``"2500 / m"``). Bare numbers follow the study's unit system (SI: m2, m; US:
ft2, ft).

``[hazard]``: ``mce_rate`` [1/year] (default 2 % in 50 years) and
optionally ``design_rate`` [1/year] at 2/3 MCE_R (without it the power law
has the slope k = 3; see :mod:`isolation.loss.hazard`), or ``points = [[Sa, rate],
...]``: the site's hazard curve as spectral acceleration [g] at ``period``
[s] (default 1 s) with annual rates of exceedance, ``fit = "interpolate"``
(log-log) or ``"power_law"``.

``[loss]``: ``enabled`` (true), ``occupancy`` ("office" or "residential"),
``levels`` (MCE_R fractions, default 0.25, 0.5, 2/3, 1.0, 1.5), ``samples``
(2000), ``seed`` (the analysis seed), ``modelling_dispersion`` (0.25).
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from isolation.codes import registry as _codes
from isolation.codes.registry import DEFAULT_BASIS
from isolation.loss.consequences import OCCUPANCIES
from isolation.loss.costs import DEMO_BEARING_COST, CostInputs
from isolation.loss.hazard import DESIGN_FRACTION

__all__ = ["HazardInputs", "LossOptions", "LossInputs", "read_loss_tables", "DEFAULT_LEVELS", "LOSS_ROOT_KEYS"]

DEFAULT_LEVELS = (0.25, 0.5, DESIGN_FRACTION, 1.0, 1.5)
"""Intensity levels as fractions of the MCE_R: four to six levels spanning frequent to beyond MCE_R."""

LOSS_ROOT_KEYS = ("cost", "hazard", "loss")


@dataclass(frozen=True)
class HazardInputs:
    """Hazard of a loss study: ``mce_rate``, ``design_rate`` [1/year] (None: defaults), or
    ``points`` ((Sa [g], rate [1/year]), ...) at ``period`` [s] with ``fit``."""

    mce_rate: float | None = None
    design_rate: float | None = None
    points: tuple = ()
    period: float = 1.0
    fit: str = "interpolate"


@dataclass(frozen=True)
class LossOptions:
    """``enabled``, ``occupancy``, ``levels`` [MCE_R fraction], ``samples``, ``seed`` (None: the
    analysis seed), ``modelling_dispersion`` [-]."""

    enabled: bool = True
    occupancy: str = "office"
    levels: tuple = DEFAULT_LEVELS
    samples: int = 2000
    seed: int | None = None
    modelling_dispersion: float = 0.25


@dataclass(frozen=True)
class LossInputs:
    """The three tables together."""

    cost: CostInputs = field(default_factory=lambda: CostInputs(defaults=_COST_FIELDS))
    hazard: HazardInputs = field(default_factory=HazardInputs)
    options: LossOptions = field(default_factory=LossOptions)

    def to_dict(self) -> dict:
        from dataclasses import asdict

        return {"cost": self.cost.to_dict(), "hazard": asdict(self.hazard), "options": asdict(self.options)}


MONEY_MAX = 1e13
"""Largest amount accepted for any cost input, in the study's currency (common practice: a plausibility
limit, far above any single building's cost in any currency unit in use)."""

_COST_FIELDS: tuple[str, ...] = (
    "currency", "replacement_cost_per_area", "contents_value", "lost_use_per_day", "bearing_cost",
    "isolation_plane_per_area", "moat_per_length", "utilities", "design_and_testing",
    "superstructure_saving", "design_life", "discount_rate")


def _money(t, key, default, *, kind=None):
    """A non-negative amount; with ``kind`` ("per_area", "per_length") a unit may follow."""
    if kind is None:
        value = t.number(key, low=0.0, high=MONEY_MAX, unit="currency", required=False, default=None)
    else:
        value = t.quantity(key, kind, low=0.0, high=MONEY_MAX, required=False, default=None)
    return (default, True) if value is None and key not in t.mapping else (value, False)


def _cost(t, bearing_kinds: tuple = ()) -> CostInputs | None:
    base = CostInputs()
    if t is None:
        return CostInputs(defaults=_COST_FIELDS)
    values: dict[str, Any] = {}
    defaults: list[str] = []
    currency = t.text("currency", required=False, default=None)
    values["currency"] = currency or base.currency
    if currency is None:
        defaults.append("currency")
    if "storey_areas" in t.mapping:
        values["storey_areas"] = t.quantity_list("storey_areas", "area", low=0.0, high=1e6, low_inclusive=False)
    else:
        t.known.add("storey_areas")
    for key, kind in (("replacement_cost_per_area", "per_area"), ("contents_value", None),
                      ("lost_use_per_day", None), ("isolation_plane_per_area", "per_area"),
                      ("moat_per_length", "per_length"), ("utilities", None), ("design_and_testing", None)):
        value, default = _money(t, key, getattr(base, key), kind=kind)
        values[key] = value
        if default:
            defaults.append(key)
    values["contents_fraction"] = t.number("contents_fraction", low=0.0, high=5.0, required=False,
                                           default=base.contents_fraction)
    for key, low, high, unit in (("superstructure_saving", 0.0, 1.0, "-"), ("design_life", 1.0, 200.0, "year"),
                                 ("discount_rate", 0.0, 0.3, "1/year")):
        if key not in t.mapping:
            defaults.append(key)
        values[key] = t.number(key, low=low, high=high, unit=unit, required=False, default=getattr(base, key))
    bearing: dict[str, tuple[float, ...]] = dict(DEMO_BEARING_COST)
    table = t.table("bearing_cost", required=False)
    if table is None:
        defaults.append("bearing_cost")
    else:
        for kind in (*bearing_kinds, "other"):
            if kind not in table.mapping:
                table.known.add(kind)
                continue
            value = table.mapping[kind]
            table.known.add(kind)
            ok = isinstance(value, list) and len(value) == 3 and all(
                isinstance(v, (int, float)) and not isinstance(v, bool) and 0 <= v <= MONEY_MAX for v in value)
            if not ok:
                table.problems.add(f"{table.path_of(kind)} = {value!r} is not allowed: must be 3 numbers from 0 to "
                                   f"{MONEY_MAX:g}, the "
                                   "cost per bearing [currency] for the small (capacity <= 0.4 m), medium "
                                   "(<= 0.7 m) and large size class")
            else:
                bearing[kind] = tuple(float(v) for v in value)
        table.done()
    values["bearing_cost"] = bearing
    t.done()
    if t.failed():
        return None
    return CostInputs(defaults=tuple(defaults), **values)


def _hazard(t) -> HazardInputs | None:
    if t is None:
        return HazardInputs()
    values = dict(
        mce_rate=t.number("mce_rate", low=1e-6, high=0.1, unit="1/year", required=False),
        design_rate=t.number("design_rate", low=1e-6, high=0.5, unit="1/year", required=False),
        period=t.quantity("period", "time", low=0.0, high=10.0, required=False, default=1.0),
        fit=t.choice("fit", ("interpolate", "power_law"), required=False, default="interpolate"),
    )
    t.known.add("points")
    points = t.mapping.get("points")
    if points is not None:
        values["points"] = _points(t, points)
        for key in ("mce_rate", "design_rate"):
            if key in t.mapping:
                t.problems.add(f"{t.path_of(key)} = {t.mapping[key]!r} is not allowed together with "
                               f"{t.path_of('points')}: give either the rates or the hazard curve")
    if values["mce_rate"] is not None and values["design_rate"] is not None \
            and not values["design_rate"] > values["mce_rate"]:
        t.problems.add(f"{t.path_of('design_rate')} = {values['design_rate']!r} is not allowed: must exceed "
                       f"{t.path_of('mce_rate')} = {values['mce_rate']!r} [1/year] (the design level, 2/3 MCE_R, "
                       "is exceeded more often)")
    t.done()
    if t.failed():
        return None
    return HazardInputs(**{k: v for k, v in values.items() if v is not None})


def _points(t, points):
    where = t.path_of("points")
    allowed = ("at least 2 pairs [Sa, rate] of numbers > 0 [g, 1/year], Sa strictly increasing and rate "
               "strictly decreasing")
    if not isinstance(points, list) or len(points) < 2:
        t.problems.add(f"{where} = {points!r} is not allowed: must be {allowed}")
        return ()
    pairs = []
    for i, pair in enumerate(points):
        ok = isinstance(pair, list) and len(pair) == 2 and all(
            isinstance(v, (int, float)) and not isinstance(v, bool) and v > 0 and v == v and v != float("inf")
            for v in pair)
        if not ok:
            t.problems.add(f"{where}[{i}] = {pair!r} is not allowed: must be [Sa, rate], two numbers > 0 "
                           "[g, 1/year]")
            return ()
        pairs.append((float(pair[0]), float(pair[1])))
    if any(b[0] <= a[0] or b[1] >= a[1] for a, b in zip(pairs, pairs[1:], strict=False)):
        t.problems.add(f"{where} = {points!r} is not allowed: must be {allowed}")
        return ()
    return tuple(pairs)


def _options(t, basis: str = DEFAULT_BASIS) -> LossOptions | None:
    if t is None:
        return LossOptions()
    values: dict = dict(
        enabled=t.boolean("enabled", required=False, default=True),
        occupancy=t.choice("occupancy", tuple(OCCUPANCIES), required=False, default="office"),
        samples=t.integer("samples", low=100, high=200000, required=False, default=2000),
        seed=t.integer("seed", low=0, high=2**32 - 1, required=False, default=None),
        modelling_dispersion=t.number("modelling_dispersion", low=0.0, high=1.0, required=False, default=0.25),
    )
    t.known.add("levels")
    if "levels" in t.mapping:
        levels = t.mapping["levels"]
        ok = isinstance(levels, list) and 4 <= len(levels) <= 6 and all(
            isinstance(v, (int, float)) and not isinstance(v, bool) and 0.05 <= v <= 3.0 for v in levels) \
            and all(b > a for a, b in zip(levels, levels[1:], strict=False))
        code = _codes.get(basis if basis in _codes.names() else DEFAULT_BASIS)
        design, top = code.reference_levels
        if not ok:
            t.problems.add(f"{t.path_of('levels')} = {levels!r} is not allowed: must be 4 to 6 increasing numbers "
                           "in [0.05, 3] [MCE_R fraction]")
        elif levels[0] > design + 1e-3 or levels[-1] < top - 1e-3:
            t.problems.add(f"{t.path_of('levels')} = {levels!r} is not allowed: must reach from at most the design "
                           f"level ({design:.4g}) to at least {top:g} x the site spectrum (code.basis = {basis!r})")
        else:
            values["levels"] = tuple(float(v) for v in levels)
    t.done()
    if t.failed():
        return None
    return LossOptions(**values)


def read_loss_tables(reader, basis: str = DEFAULT_BASIS, bearing_kinds=None) -> LossInputs | None:
    """Read ``[cost]``, ``[hazard]`` and ``[loss]`` from a study's root reader.

    ``bearing_kinds`` names the bearing types ``cost.bearing_cost`` may price (besides
    ``"other"``); default: those of :data:`isolation.loss.costs.DEMO_BEARING_COST`.

    ``basis`` ("asce7" or "eurocode") fixes the design and top levels the
    intensity levels must span (2/3 and 1 x MCE_R, or 1 and 1.5 x the design action).

    Problems go to the reader's shared problem list; returns None when any
    table failed.
    """
    kinds = tuple(bearing_kinds) if bearing_kinds is not None else tuple(k for k in DEMO_BEARING_COST if k != "other")
    cost = _cost(reader.table("cost", required=False), kinds)
    hazard = _hazard(reader.table("hazard", required=False))
    options = _options(reader.table("loss", required=False), basis)
    if cost is None or hazard is None or options is None:
        return None
    return LossInputs(cost=cost, hazard=hazard, options=options)
