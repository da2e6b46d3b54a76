"""Equivalent-linear (single-mode) design of an isolation plane, ASCE/SEI 7-16 Ch. 17.

* :func:`equivalent_linear` iterates D -> K_eff(D), beta_eff(D) -> T, B -> D
  with the general form D = g Sa(T) T^2/(4 pi^2 B), so any spectrum works.
* :func:`design_bounds` runs it for each property set (lower, nominal,
  upper): the lower bound usually governs displacement, the upper bound forces.
* :func:`asce7_elf` makes the equivalent lateral force report: D_M, D_TM with
  torsion, moat width, V_b, V_st, V_s with its limits, storey forces, a drift
  estimate, the restoring-force check and the ELF applicability checks (each
  failure says that response-history analysis is required).

Scope: concept-stage feasibility, not construction design. Clause numbers
marked "from memory" were not re-read; a licensed engineer checks every value
against the governing code.

References
----------
ASCE/SEI 7-16 §17.2.4.4, §17.4.1, §17.5 (Eqs. 17.5-1 to 17.5-3 and §17.5.4-17.5.5), Table 17.5-1.
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, fields
from typing import Any, Mapping

import numpy as np
from scipy.optimize import brentq

from isolation import GRAVITY, validate
from isolation.bearings.checks import Check
from isolation.errors import RunError
from isolation.fixed_base import FixedBaseShear, approximate_period, fixed_base_shear
from isolation.spectra import RULES, damping_coefficient

__all__ = [
    "Item",
    "EquivalentLinearResult",
    "equivalent_linear",
    "BoundsResult",
    "design_bounds",
    "ElfBuilding",
    "StoreyForce",
    "ElfReport",
    "asce7_elf",
]

ASCE = "ASCE/SEI 7-16"
_RHA = "ELF not permitted: response-history analysis is required"


def _plain(value: Any) -> Any:
    """Plain JSON types from dataclasses, tuples, numpy scalars."""
    if hasattr(value, "to_dict"):
        return value.to_dict()
    if isinstance(value, Mapping):
        return {str(k): _plain(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_plain(v) for v in value]
    if isinstance(value, np.generic):
        return value.item()
    return value


class _ToDict:
    def to_dict(self) -> dict:
        return {f.name: _plain(getattr(self, f.name)) for f in fields(self)}


@dataclass(frozen=True)
class Item(_ToDict):
    """A reported quantity with its symbol, unit and source."""

    name: str
    symbol: str
    value: float | None
    unit: str
    source: str
    note: str = ""


# --- the iteration -------------------------------------------------------------------


@dataclass(frozen=True)
class EquivalentLinearResult(_ToDict):
    """Converged single-mode response of an isolation plane.

    Attributes
    ----------
    displacement : D at the centre of rigidity. [m]
    period : effective period T = 2 pi sqrt(W/(K_eff g)). [s]
    damping : effective damping beta_eff at D. [-]
    damping_coefficient : B for ``damping`` under ``rule``. [-]
    stiffness : effective stiffness K_eff at D. [kN/m]
    base_shear : V_b = K_eff D. [kN]
    spectral_acceleration : Sa(T) at 5 % damping. [g]
    weight : seismic weight W. [kN]
    rule : damping rule used.
    iterations : trial displacements evaluated.
    converged : True (a failed run raises RunError).
    method : "fixed point" or "bracketing".
    history : (D [m], T [s], beta [-], B [-], D_next [m]) per iteration.
    """

    displacement: float
    period: float
    damping: float
    damping_coefficient: float
    stiffness: float
    base_shear: float
    spectral_acceleration: float
    weight: float
    rule: str
    iterations: int
    converged: bool
    method: str
    history: tuple = field(default=(), repr=False)


class _OutOfRange(Exception):
    pass


def _trial(system, weight, spectrum, rule, d):
    """Return (T, beta, B, K, Sa5, next D) for a trial displacement d."""
    k = float(system.effective_stiffness(d))
    beta = float(system.effective_damping(d))
    if not (math.isfinite(k) and k > 0.0):
        raise RunError(f"effective_stiffness({d:.6g} m) = {k!r} kN/m from the isolation system: must be finite and > 0")
    if not (math.isfinite(beta) and 0.0 <= beta <= 1.0):
        raise RunError(f"effective_damping({d:.6g} m) = {beta!r} from the isolation system: must lie in [0, 1]")
    period = 2.0 * math.pi * math.sqrt(weight / (k * GRAVITY))
    low, high = spectrum.period_range
    if not low <= period <= high:
        raise _OutOfRange(period)
    b = float(damping_coefficient(beta, rule))
    sa5 = float(spectrum.sa(period, 0.05))
    return period, beta, b, k, sa5, GRAVITY * sa5 * period**2 / (4.0 * math.pi**2 * b)


def equivalent_linear(
    system,
    weight: float,
    spectrum,
    rule: str | None = "asce7",
    *,
    tolerance: float = 1e-6,
    max_iterations: int = 200,
    initial_period: float = 2.5,
) -> EquivalentLinearResult:
    """Equivalent-linear displacement of an isolation plane under a spectrum.

    Parameters
    ----------
    system : object
        Whole-plane isolator model with ``effective_stiffness(d)`` [kN/m] and
        ``effective_damping(d)`` [-] (Bilinear, MultiLinear, strain-dependent rubber).
    weight : float
        Seismic weight W carried by the isolation plane, > 0. [kN]
    spectrum : spectrum object
        Site spectrum with ``sa(period, damping)`` [g] and ``period_range`` [s].
    rule : str or None
        Damping rule ("asce7", "eurocode", "aashto"); None takes ``spectrum.rule``.
    tolerance : float
        Relative change in D that ends the iteration, in (0, 0.01]. [-]
    max_iterations : int
        Fixed-point steps before switching to bracketing, >= 1. [-]
    initial_period : float
        Period of the starting guess D_0 = Sd(T_0), > 0. [s]

    Returns
    -------
    EquivalentLinearResult

    Notes
    -----
    D = g Sa(T, 5 %) T^2 / (4 pi^2 B(beta)) with T = 2 pi sqrt(W/(K_eff(D) g))
    (ASCE/SEI 7-16 Eqs. 17.5-1, 17.5-2 generalised to any spectrum). The
    fixed point is sought by (damped) successive substitution; if that does
    not settle, by Brent's method on D - f(D) over a scanned bracket.

    Raises
    ------
    ValueError
        Bad input, naming the field.
    RunError
        No converged displacement inside the spectrum's period range.
    """
    if not (callable(getattr(system, "effective_stiffness", None)) and callable(getattr(system, "effective_damping", None))):
        raise ValueError(
            f"system = {system!r} is not allowed: must provide effective_stiffness(d) [kN/m] and effective_damping(d) [-]"
        )
    w = validate.positive("weight", weight, "kN")
    chosen = getattr(spectrum, "rule", "asce7") if rule is None else rule
    validate.one_of("rule", chosen, RULES)
    tol = validate.in_range("tolerance", tolerance, 0.0, 0.01, "-", low_inclusive=False)
    if isinstance(max_iterations, bool) or not isinstance(max_iterations, (int, np.integer)) or max_iterations < 1:
        raise ValueError(f"max_iterations = {max_iterations!r} is not allowed: must be an integer >= 1")
    t0 = validate.positive("initial_period", initial_period, "s")
    low, high = spectrum.period_range
    t0 = min(max(t0, low + 1e-3 * (high - low)), high)
    d = GRAVITY * float(spectrum.sa(t0, 0.05)) * t0**2 / (4.0 * math.pi**2)

    history: list[tuple] = []
    outside: list[tuple[float, float]] = []  # (D, T) trials whose period left the spectrum

    def residual(x, record=True):
        try:
            out = _trial(system, w, spectrum, chosen, x)
        except _OutOfRange as exc:
            outside.append((x, exc.args[0]))
            return math.nan
        if record:
            history.append((x, out[0], out[1], out[2], out[5]))
        return out[5] - x

    relax, previous_step = 1.0, None
    for _ in range(int(max_iterations)):
        step = residual(d)
        if not math.isfinite(step):
            break
        if abs(step) <= tol * max(d + step, 1e-12):
            return _result(system, w, spectrum, chosen, d + step, history, "fixed point")
        if previous_step is not None and step * previous_step < 0 and abs(step) > 0.5 * abs(previous_step):
            relax = max(relax / 2.0, 1.0 / 64.0)
        previous_step = step
        d = max(d + relax * step, d / 10.0)

    # Fallback: bracket a root of f(D) - D on a log grid inside the period range.
    grid = np.geomspace(1e-6, 50.0, 240)
    values = [residual(x, record=False) for x in grid]
    pairs = [(a, b, fa, fb) for a, b, fa, fb in zip(grid[:-1], grid[1:], values[:-1], values[1:])
             if math.isfinite(fa) and math.isfinite(fb)]
    crossings = [p for p in pairs if p[2] > 0.0 >= p[3]] or [p for p in pairs if p[2] * p[3] <= 0.0]
    if crossings:  # the first stable root (f - D falling through zero), else the first root
        a, b = crossings[0][:2]
        root = brentq(residual, a, b, xtol=1e-12, rtol=max(tol * 1e-2, 1e-15))
        return _result(system, w, spectrum, chosen, root, history, "bracketing")
    last = ", ".join(f"{h[0]:.4g}" for h in history[-4:])
    last = f" (last trial displacements {last} m)" if last else ""
    reason = (f"; the effective period reached T = {outside[0][1]:.4g} s at D = {outside[0][0]:.4g} m, outside the "
              f"spectrum's period range [{low:g}, {high:g}] s (extend the spectrum or stiffen the system)") if outside else ""
    raise RunError(
        f"equivalent_linear did not converge: {len(history)} iterations{last} "
        f"and no bracketed root of D = g Sa T^2/(4 pi^2 B) between 1e-6 and 50 m{reason}"
    )


def _result(system, weight, spectrum, rule, d, history, method) -> EquivalentLinearResult:
    try:
        period, beta, b, k, sa5, _ = _trial(system, weight, spectrum, rule, d)
    except _OutOfRange as exc:
        low, high = spectrum.period_range
        raise RunError(
            f"equivalent_linear: effective period T = {exc.args[0]:.4g} s at D = {d:.4g} m lies outside the "
            f"spectrum's period range [{low:g}, {high:g}] s; extend the spectrum or stiffen the system"
        ) from None
    return EquivalentLinearResult(
        displacement=d, period=period, damping=beta, damping_coefficient=b, stiffness=k,
        base_shear=k * d, spectral_acceleration=sa5, weight=weight, rule=rule,
        iterations=len(history), converged=True, method=method, history=tuple(history),
    )


@dataclass(frozen=True)
class BoundsResult(_ToDict):
    """Equivalent-linear results for each property set (e.g. lower, nominal, upper).

    ``displacement_governs`` names the set with the largest D (usually lower),
    ``force_governs`` the set with the largest V_b (usually upper).
    """

    results: dict
    displacement_governs: str
    force_governs: str

    @property
    def displacement(self) -> EquivalentLinearResult:
        """Result of the set that governs displacement."""
        return self.results[self.displacement_governs]

    @property
    def force(self) -> EquivalentLinearResult:
        """Result of the set that governs forces."""
        return self.results[self.force_governs]


def design_bounds(property_sets: Mapping[str, Any], weight: float, spectrum, rule: str | None = "asce7", **options) -> BoundsResult:
    """Run :func:`equivalent_linear` for every property set in one call.

    Parameters
    ----------
    property_sets : mapping
        Name -> whole-plane system, e.g. ``{"lower": ..., "nominal": ..., "upper": ...}``.
    weight : float
        Seismic weight W, > 0. [kN]
    spectrum : spectrum object
        Site spectrum. [g]
    rule : str or None
        Damping rule; None takes ``spectrum.rule``.
    **options
        ``tolerance``, ``max_iterations``, ``initial_period`` of :func:`equivalent_linear`.
    """
    if not isinstance(property_sets, Mapping) or not property_sets:
        raise ValueError(f"property_sets = {property_sets!r} is not allowed: must be a non-empty mapping name -> system")
    results = {str(name): equivalent_linear(system, weight, spectrum, rule, **options) for name, system in property_sets.items()}
    by_displacement = max(results, key=lambda n: results[n].displacement)
    by_force = max(results, key=lambda n: results[n].base_shear)
    return BoundsResult(results=results, displacement_governs=by_displacement, force_governs=by_force)


# --- the ASCE 7 equivalent lateral force report ---------------------------------------


@dataclass(frozen=True)
class ElfBuilding(_ToDict):
    """Building data for the ASCE/SEI 7-16 Ch. 17 equivalent lateral force report.

    Parameters
    ----------
    base_weight : float
        Weight of the base level (the floor just above the isolators), >= 0. [kN]
    floor_weights : sequence of float
        Weights of the levels above the base level, bottom to top, > 0. [kN]
    floor_elevations : sequence of float
        Elevations of those levels above the isolation interface, increasing, > 0. [m]
    plan_length, plan_width : float
        Plan dimensions b (longer) and d, > 0. [m]
    response_modification : float
        R of the superstructure's lateral system on a fixed base, > 0. [-]
    eccentricity : float
        Actual eccentricity between centres of mass and rigidity, >= 0; 5 % of
        ``plan_length`` accidental eccentricity is added. [m]
    corner_distance : float, optional
        Distance y from the centre of rigidity to the corner bearing;
        default plan_length/2 + eccentricity. [m]
    torsion_period_ratio : float
        P_T, translational over torsional period, > 0 (taken <= 1.0). [-]
    isolator_kind : str
        "sliding" (abrupt bilinear transition, V_st exponent 1 - 3.5 beta_M) or "other". [-]
    fixed_base_period : float, optional
        T_fb of the superstructure on a fixed base; default T_a = C_t h^x. [s]
    frame : str
        Lateral system for T_a ("steel_moment", "concrete_moment", "braced", "other"). [-]
    importance : float
        Importance factor I_e, > 0. [-]
    wind_base_shear : float
        Base shear from factored design wind, >= 0. [kN]
    activation_force : float, optional
        Force that fully activates the isolation system (yield, breakaway,
        wind-restraint capacity); default the upper-bound yield force. [kN]
    s1 : float
        Mapped MCE_R spectral acceleration at 1 s, S_1, >= 0. [g]
    site_class : str
        Site class "A"-"F". [-]
    height : float, optional
        Structural height above the isolation interface; default top elevation. [m]
    irregular : bool
        True when the superstructure has a structural irregularity barred by §17.4.1. [-]
    moat_clearance : float
        Clearance added to D_TM for the moat, >= 0 (common practice). [m]
    """

    base_weight: float
    floor_weights: tuple
    floor_elevations: tuple
    plan_length: float
    plan_width: float
    response_modification: float
    eccentricity: float = 0.0
    corner_distance: float | None = None
    torsion_period_ratio: float = 1.0
    isolator_kind: str = "other"
    fixed_base_period: float | None = None
    frame: str = "other"
    importance: float = 1.0
    wind_base_shear: float = 0.0
    activation_force: float | None = None
    s1: float = 0.0
    site_class: str = "D"
    height: float | None = None
    irregular: bool = False
    moat_clearance: float = 0.05

    def __post_init__(self) -> None:
        set_ = lambda name, value: object.__setattr__(self, name, value)  # noqa: E731
        set_("base_weight", validate.non_negative("base_weight", self.base_weight, "kN"))
        w = validate.positive_array("floor_weights", self.floor_weights, "kN")
        h = validate.positive_array("floor_elevations", self.floor_elevations, "m")
        if w.ndim != 1 or h.shape != w.shape:
            raise ValueError(f"floor_elevations has {h.size} entries but floor_weights has {w.size}: must match")
        if np.any(np.diff(h) <= 0.0):
            raise ValueError(f"floor_elevations = {h.tolist()!r} is not allowed: must increase upwards [m]")
        set_("floor_weights", tuple(float(x) for x in w))
        set_("floor_elevations", tuple(float(x) for x in h))
        for name, unit in (("plan_length", "m"), ("plan_width", "m"), ("response_modification", "-"),
                           ("torsion_period_ratio", "-"), ("importance", "-")):
            set_(name, validate.positive(name, getattr(self, name), unit))
        for name, unit in (("eccentricity", "m"), ("wind_base_shear", "kN"), ("s1", "g"), ("moat_clearance", "m")):
            set_(name, validate.non_negative(name, getattr(self, name), unit))
        for name, unit, check in (("corner_distance", "m", validate.non_negative), ("fixed_base_period", "s", validate.positive),
                                  ("activation_force", "kN", validate.positive), ("height", "m", validate.positive)):
            if getattr(self, name) is not None:
                set_(name, check(name, getattr(self, name), unit))
        validate.one_of("isolator_kind", self.isolator_kind, ("sliding", "other"))
        validate.one_of("frame", self.frame, ("steel_moment", "concrete_moment", "braced", "other"))
        validate.one_of("site_class", self.site_class, tuple("ABCDEF"))
        validate.one_of("irregular", self.irregular, (True, False))

    @property
    def weight_above(self) -> float:
        """W_s, weight above the base level. [kN]"""
        return float(sum(self.floor_weights))

    @property
    def total_weight(self) -> float:
        """W = W_s + base level weight. [kN]"""
        return self.base_weight + self.weight_above

    @property
    def structural_height(self) -> float:
        """Height above the isolation interface. [m]"""
        return self.height if self.height is not None else self.floor_elevations[-1]


@dataclass(frozen=True)
class StoreyForce(_ToDict):
    """Lateral force F_x [kN], storey shear [kN] and drift estimate [m] at one level."""

    level: int
    elevation: float
    weight: float
    force: float
    storey_shear: float
    drift: float
    drift_ratio: float


@dataclass(frozen=True)
class ElfReport(_ToDict):
    """ASCE/SEI 7-16 Ch. 17 equivalent lateral force summary (see :func:`asce7_elf`)."""

    bounds: BoundsResult
    building: ElfBuilding
    quantities: tuple
    applicability: tuple
    checks: tuple
    storey_forces: tuple
    fixed_base: FixedBaseShear
    warnings: tuple
    elf_permitted: bool
    scope: str = ("Concept-stage feasibility, not construction design; verify against the local code "
                  "with a licensed structural engineer.")

    def value(self, symbol: str) -> float:
        """Value of the quantity with this symbol (e.g. "D_TM")."""
        for item in self.quantities:
            if item.symbol == symbol:
                return item.value
        raise KeyError(f"symbol = {symbol!r} is not in the report: known {[i.symbol for i in self.quantities]}")


def _unit(check: Check) -> str:
    return "" if check.unit == "-" else f" {check.unit}"


def _force(system, d: float) -> float:
    if callable(getattr(system, "force", None)):
        return float(system.force(d))
    return float(system.effective_stiffness(d)) * d


def _activation_force(system) -> float | None:
    if hasattr(system, "yield_force"):
        return float(system.yield_force)
    if callable(getattr(system, "elements", None)):
        _, ks, fs = system.elements()
        if ks:
            return _force(system, max(f / k for k, f in zip(ks, fs)))
    return None


def asce7_elf(property_sets: Mapping[str, Any], building: ElfBuilding, spectrum, *, rule: str | None = "asce7", **options) -> ElfReport:
    """Equivalent lateral force report of ASCE/SEI 7-16 Ch. 17 for all property sets.

    Parameters
    ----------
    property_sets : mapping
        Name -> whole-plane system (lower, nominal, upper).
    building : ElfBuilding
        Weights, geometry and superstructure data; W = ``building.total_weight``. [kN, m]
    spectrum : spectrum object
        MCE_R site spectrum. [g]
    rule : str or None
        Damping rule for the displacement. [-]
    **options
        Passed to :func:`equivalent_linear`.

    Returns
    -------
    ElfReport
    """
    if not isinstance(building, ElfBuilding):
        raise ValueError(f"building = {type(building).__name__} is not allowed: must be an ElfBuilding")
    bounds = design_bounds(property_sets, building.total_weight, spectrum, rule, **options)
    low, up = bounds.displacement, bounds.force
    b, dwidth = building.plan_length, building.plan_width
    d_m = low.displacement
    items: list[Item] = [
        Item("maximum displacement", "D_M", d_m, "m", f"{ASCE} Eq. 17.5-1 (general form g Sa T^2/(4 pi^2 B_M))",
             f"property set '{bounds.displacement_governs}'"),
        Item("effective period at D_M", "T_M", low.period, "s", f"{ASCE} Eq. 17.5-2"),
        Item("effective damping at D_M", "beta_M", low.damping, "-", "Naeim & Kelly (1999): EDC/(2 pi K_eff D^2)"),
        Item("damping coefficient", "B_M", low.damping_coefficient, "-", f"{ASCE} Table 17.5-1" if low.rule == "asce7" else low.rule),
        Item("effective stiffness at D_M", "k_M", low.stiffness, "kN/m", f"{ASCE} §17.5.3"),
    ]
    # Torsion (Eqs. 17.5-3/-4); P_T taken <= 1.0 (from memory, verify).
    e = building.eccentricity + 0.05 * b
    y = building.corner_distance if building.corner_distance is not None else b / 2.0 + building.eccentricity
    p_t = min(building.torsion_period_ratio, 1.0)
    raw = d_m * (1.0 + y / p_t**2 * 12.0 * e / (b**2 + dwidth**2))
    d_tm = max(raw, 1.15 * d_m)
    items += [
        Item("eccentricity incl. 5 % accidental", "e", e, "m", f"{ASCE} §17.5.3.3 (accidental 5 % of the longest plan dimension)"),
        Item("total maximum displacement", "D_TM", d_tm, "m", f"{ASCE} Eq. 17.5-3, >= 1.15 D_M",
             "1.15 D_M floor governs" if d_tm > raw else f"y = {y:.3g} m, P_T = {p_t:.3g} (taken <= 1.0, from memory)"),
        Item("moat width", "moat", d_tm + building.moat_clearance, "m", f"{ASCE} §17.2 (separation from fixed obstructions >= D_TM; clause from memory)",
             f"D_TM plus {building.moat_clearance:g} m clearance (common practice)"),
    ]
    # Forces from the force-governing set.
    w, w_s = building.total_weight, building.weight_above
    v_b = up.base_shear
    factor = 3.5 if building.isolator_kind == "sliding" else 2.5
    exponent = 1.0 - factor * up.damping
    v_st = v_b * (w_s / w) ** exponent
    r_i = min(max(3.0 / 8.0 * building.response_modification, 1.0), 2.0)
    items += [
        Item("isolation-system shear", "V_b", v_b, "kN", f"{ASCE} §17.5.4.1 (k_M D_M)", f"property set '{bounds.force_governs}'"),
        Item("unreduced superstructure shear", "V_st", v_st, "kN",
             f"{ASCE} §17.5.4.2, V_b (W_s/W)^(1 - {factor} beta_M), exponent {exponent:.3f}"
             + (" (1 - 3.5 beta_M for abrupt transition: from memory)" if factor == 3.5 else "")),
        Item("reduction factor", "R_I", r_i, "-", f"{ASCE} §17.5.4.2: 3/8 R within [1.0, 2.0]"),
    ]
    t_fb = building.fixed_base_period or approximate_period(building.structural_height, building.frame)
    at_tm = fixed_base_shear(spectrum, w_s, r_i, period=up.period, importance=building.importance, s1=building.s1)
    activation = building.activation_force or _activation_force(property_sets[bounds.force_governs])
    candidates = [
        ("V_st/R_I", "V_st/R_I", v_st / r_i, f"{ASCE} §17.5.4.2"),
        ("fixed-base shear at T_M", "V_s,min,fixed", at_tm.base_shear,
         f"{ASCE} §17.5.4.3 item 1 (§12.8 with R_I, from memory); {at_tm.governs}"),
        ("factored wind shear", "V_s,min,wind", building.wind_base_shear, f"{ASCE} §17.5.4.3 item 2"),
    ]
    if activation is not None:
        candidates.append(("1.5 x activation force", "V_s,min,activation", 1.5 * activation,
                           f"{ASCE} §17.5.4.3 item 3 (from memory)"))
    name, _, v_s, source = max(candidates, key=lambda c: c[2])
    items += [Item(f"lower limit on V_s: {n}", sym, v, "kN", s) for n, sym, v, s in candidates[1:]]
    items.append(Item("superstructure design shear", "V_s", v_s, "kN", source, f"governed by {name}"))
    # Vertical distribution (§17.5.5, from memory): F_x = C_vx V_s, C_vx = w_x h_x^k / sum w_i h_i^k.
    k_exp = 14.0 * up.damping * t_fb
    f_1 = (v_b - v_st) / r_i
    wx, hx = np.array(building.floor_weights), np.array(building.floor_elevations)
    share = wx * hx**k_exp / np.sum(wx * hx**k_exp)
    forces = share * v_s
    items += [
        Item("fixed-base period", "T_fb", t_fb, "s", "given" if building.fixed_base_period else f"{ASCE} Eq. 12.8-7 (T_a)"),
        Item("distribution exponent", "k", k_exp, "-", f"{ASCE} §17.5.5 (14 beta_M T_fb, from memory)"),
        Item("force at base level", "F_1", f_1, "kN", f"{ASCE} §17.5.5 ((V_b - V_st)/R_I, from memory)"),
    ]
    # Drift estimate: linear shape, generalised stiffness from T_fb; C_d = R_I (from memory).
    shape = hx / hx[-1]
    k_star = (2.0 * math.pi / t_fb) ** 2 * np.sum(wx / GRAVITY * shape**2)
    u_top = float(np.sum(forces * shape) / k_star)
    heights = np.diff(np.concatenate(([0.0], hx)))
    drifts = np.diff(np.concatenate(([0.0], shape))) * u_top * r_i / building.importance
    shears = np.cumsum(forces[::-1])[::-1]
    storeys = tuple(StoreyForce(i + 2, float(hx[i]), float(wx[i]), float(forces[i]), float(shears[i]),
                                float(drifts[i]), float(drifts[i] / heights[i])) for i in range(len(wx)))
    applicability = _elf_applicability(bounds, property_sets, building, t_fb)
    worst = max(storeys, key=lambda s: s.drift_ratio)
    checks = [Check(f"storey drift ratio estimate (level {worst.level})", worst.drift_ratio, 0.015,
                    worst.drift_ratio <= 0.015, "-",
                    f"{ASCE} §17.5.6: 0.015 h_sx with C_d = R_I (from memory); linear-mode-shape estimate")]
    warnings = [f"{c.name}: {c.value:.4g} against limit {c.limit:.4g}{_unit(c)} ({c.source}) - {_RHA}"
                for c in applicability if not c.passed]
    warnings += [f"{c.name}: {c.value:.4g} against limit {c.limit:.4g}{_unit(c)} ({c.source}) - stiffen the "
                 "superstructure or find the drift by analysis" for c in checks if not c.passed]
    permitted = all(c.passed for c in applicability)
    comparison = fixed_base_shear(spectrum, w_s, building.response_modification, period=t_fb,
                                  height=building.structural_height, frame=building.frame,
                                  importance=building.importance, s1=building.s1)
    items += [
        Item("fixed-base design shear", "V_fb", comparison.base_shear, "kN", comparison.governs, comparison.period_source),
        Item("ratio isolated/fixed-base design shear", "V_s/V_fb", v_s / comparison.base_shear, "-", "V_s over §12.8 V"),
    ]
    return ElfReport(bounds=bounds, building=building, quantities=tuple(items), applicability=tuple(applicability),
                     checks=tuple(checks), storey_forces=storeys, fixed_base=comparison, warnings=tuple(warnings),
                     elf_permitted=permitted)


def _elf_applicability(bounds, property_sets, building, t_fb) -> list[Check]:
    """Conditions under which ASCE/SEI 7-16 §17.4.1 permits the ELF procedure (from memory)."""
    results = bounds.results
    t_long = max(r.period for r in results.values())
    t_short = min(r.period for r in results.values())
    beta_max = max(r.damping for r in results.values())
    src = f"{ASCE} §17.4.1 (from memory)"
    site = "ABCDEF".index(building.site_class)
    storeys, height = len(building.floor_weights), building.structural_height
    checks = [
        Check(f"site class {building.site_class} within A-D (A=0 ... F=5)", float(site), 3.0, site <= 3, "-", src),
        Check("mapped S_1 below 0.6 g", building.s1, 0.6, building.s1 < 0.6, "g", src),
        Check("storeys above the isolation interface", float(storeys), 4.0, storeys <= 4, "-", src),
        Check("height above the isolation interface", height, 19.8, height <= 19.8, "m", src),
        Check("longest effective period T_M", t_long, 5.0, t_long <= 5.0, "s", src),
        Check("shortest T_M over 3 T_fb", t_short / t_fb, 3.0, t_short > 3.0 * t_fb, "-", src),
        Check("largest effective damping beta_M", beta_max, 0.30, beta_max <= 0.30, "-", src),
        Check("barred structural irregularity (1 = present)", float(building.irregular), 0.0, not building.irregular, "-", src),
    ]
    for name, r in results.items():
        system, d = property_sets[name], r.displacement
        ratio = float(system.effective_stiffness(d)) / float(system.effective_stiffness(0.2 * d))
        checks.append(Check(f"k_eff(D_M)/k_eff(0.2 D_M), {name}", ratio, 1.0 / 3.0, ratio > 1.0 / 3.0, "-", src))
        restoring = (_force(system, d) - _force(system, 0.5 * d)) / r.weight
        checks.append(Check(f"restoring force (F(D_M) - F(D_M/2))/W, {name}", restoring, 0.025, restoring >= 0.025,
                            "-", f"{ASCE} §17.2.4.4"))
    return checks
