"""Equivalent-linear (single-mode) design of an isolation plane, ASCE/SEI 7-16 Ch. 17.

* :func:`equivalent_linear` iterates D -> K_eff(D), beta_eff(D) -> T, B -> D
  with the general form D = g Sa(T) T^2/(4 pi^2 B), so any spectrum works.
* :func:`design_bounds` runs it for each property set (lower, nominal,
  upper): the lower bound usually governs displacement, the upper bound forces.
* :class:`Item` (a reported quantity) and the small helpers shared by the
  code reports live here. The ASCE 7 equivalent lateral force report
  (``asce7_elf``, ``ElfBuilding``, ``ElfReport``, ``StoreyForce``) is in
  :mod:`isolation.codes.asce7`, the Eurocode 8 simplified procedure in
  :mod:`isolation.codes.eurocode`; both import from this module, never the
  other way round.

Scope: concept-stage feasibility, not construction design. Clause numbers
marked "from memory" were not re-read; a licensed engineer checks every value
against the governing code.

References
----------
ASCE/SEI 7-16 §17.5 (Eqs. 17.5-1, 17.5-2), Table 17.5-1.
Naeim, F. & Kelly, J. M. (1999). Design of Seismic Isolated Structures. Wiley.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, fields
from typing import Any, ClassVar, Mapping

import numpy as np
from scipy.optimize import brentq

from isolation import GRAVITY, validate
from isolation.codes.registry import DEFAULT_BASIS
from isolation.errors import RunError
from isolation.plain import plain
from isolation.site.spectra import damping_coefficient, rules

__all__ = [
    "Item",
    "EquivalentLinearResult",
    "equivalent_linear",
    "BoundsResult",
    "design_bounds",
]


class _ToDict:
    __dataclass_fields__: ClassVar[dict[str, Any]]  # the subclasses are dataclasses

    def to_dict(self) -> dict:
        # NaN and infinity stay floats here; the study results turn them into None.
        return {f.name: plain(getattr(self, f.name), keep_nonfinite=True) for f in fields(self)}


@dataclass(frozen=True)
class Item(_ToDict):
    """A reported quantity with its symbol, unit and source."""

    name: str
    symbol: str
    value: float | None
    unit: str
    source: str
    note: str = ""


def _unit(check) -> str:
    """Unit suffix of a bearing/design Check for messages ("" for "-")."""
    return "" if check.unit == "-" else f" {check.unit}"


def _force(system, d: float) -> float:
    """Force of a whole-plane system at displacement d [m], in kN."""
    if callable(getattr(system, "force", None)):
        return float(system.force(d))
    return float(system.effective_stiffness(d)) * d


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
    rule: str | None = DEFAULT_BASIS,
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
    if not (callable(getattr(system, "effective_stiffness", None))
            and callable(getattr(system, "effective_damping", None))):
        raise ValueError(
            f"system = {system!r} is not allowed: must provide effective_stiffness(d) [kN/m] and effective_damping(d) "
            "[-]"
        )
    w = validate.positive("weight", weight, "kN")
    chosen = getattr(spectrum, "rule", DEFAULT_BASIS) if rule is None else rule
    validate.one_of("rule", chosen, rules())
    tol = validate.in_range("tolerance", tolerance, 0.0, 0.01, "-", low_inclusive=False)
    if isinstance(max_iterations, bool) or not isinstance(max_iterations, (int, np.integer)) or max_iterations < 1:
        raise ValueError(f"max_iterations = {max_iterations!r} is not allowed: must be an integer >= 1")
    t0 = validate.positive("initial_period", initial_period, "s")
    low, high = spectrum.period_range
    t0 = min(max(t0, low + 1e-3 * (high - low)), high)
    d = GRAVITY * float(spectrum.sa(t0, 0.05)) * t0**2 / (4.0 * math.pi**2)

    trials = _Trials(system, w, spectrum, chosen)
    found = _fixed_point(trials, d, tol, int(max_iterations))
    if found is not None:
        return _result(system, w, spectrum, chosen, found, trials.history, "fixed point")
    root = _bracketed_root(trials, tol)
    if root is not None:
        return _result(system, w, spectrum, chosen, root, trials.history, "bracketing")
    raise RunError(trials.failure())


class _Trials:
    """Trials of D -> f(D) = g Sa(T(D)) T(D)^2 / (4 pi^2 B(beta(D))) for one plane, weight and spectrum.

    ``history`` keeps (D [m], T [s], beta [-], B [-], f(D) [m]) of recorded
    trials; ``outside`` the (D [m], T [s]) trials whose period left the spectrum.
    """

    def __init__(self, system: Any, weight: float, spectrum: Any, rule: str) -> None:
        self.system, self.weight, self.spectrum, self.rule = system, weight, spectrum, rule
        self.history: list[tuple] = []
        self.outside: list[tuple[float, float]] = []

    def residual(self, x: float, record: bool = True) -> float:
        """f(x) - x [m], NaN when the effective period leaves the spectrum's range."""
        try:
            out = _trial(self.system, self.weight, self.spectrum, self.rule, x)
        except _OutOfRange as exc:
            self.outside.append((x, exc.args[0]))
            return math.nan
        if record:
            self.history.append((x, out[0], out[1], out[2], out[5]))
        return out[5] - x

    def failure(self) -> str:
        """Why neither the fixed point nor the bracketing found D."""
        low, high = self.spectrum.period_range
        last = ", ".join(f"{h[0]:.4g}" for h in self.history[-4:])
        last = f" (last trial displacements {last} m)" if last else ""
        outside = self.outside
        reason = (f"; the effective period reached T = {outside[0][1]:.4g} s at D = {outside[0][0]:.4g} m, outside "
                  f"the spectrum's period range [{low:g}, {high:g}] s (extend the spectrum or stiffen the system)"
                  ) if outside else ""
        return (f"equivalent_linear did not converge: {len(self.history)} iterations{last} "
                f"and no bracketed root of D = g Sa T^2/(4 pi^2 B) between 1e-6 and 50 m{reason}")


def _fixed_point(trials: _Trials, d: float, tol: float, max_iterations: int) -> float | None:
    """Damped successive substitution from ``d`` [m]; the converged D [m] or None."""
    relax, previous_step = 1.0, None
    for _ in range(max_iterations):
        step = trials.residual(d)
        if not math.isfinite(step):
            return None
        if abs(step) <= tol * max(d + step, 1e-12):
            return d + step
        if previous_step is not None and step * previous_step < 0 and abs(step) > 0.5 * abs(previous_step):
            relax = max(relax / 2.0, 1.0 / 64.0)
        previous_step = step
        d = max(d + relax * step, d / 10.0)
    return None


def _bracketed_root(trials: _Trials, tol: float) -> float | None:
    """Fallback: Brent's method on a bracket of f(D) - D from a log grid (1e-6 to 50 m); the root [m] or None."""
    grid = np.geomspace(1e-6, 50.0, 240)
    values = [trials.residual(x, record=False) for x in grid]
    pairs = [(a, b, fa, fb) for a, b, fa, fb in zip(grid[:-1], grid[1:], values[:-1], values[1:], strict=True)
             if math.isfinite(fa) and math.isfinite(fb)]
    crossings = [p for p in pairs if p[2] > 0.0 >= p[3]] or [p for p in pairs if p[2] * p[3] <= 0.0]
    if not crossings:
        return None
    a, b = crossings[0][:2]  # the first stable root (f - D falling through zero), else the first root
    return float(brentq(trials.residual, a, b, xtol=1e-12, rtol=max(tol * 1e-2, 1e-15)))


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


def design_bounds(property_sets: Mapping[str, Any], weight: float, spectrum, rule: str | None = DEFAULT_BASIS,
                  **options) -> BoundsResult:
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
        raise ValueError(f"property_sets = {property_sets!r} is not allowed: "
                         "must be a non-empty mapping name -> system")
    results = {str(name): equivalent_linear(system, weight, spectrum, rule, **options)
               for name, system in property_sets.items()}
    by_displacement = max(results, key=lambda n: results[n].displacement)
    by_force = max(results, key=lambda n: results[n].base_shear)
    return BoundsResult(results=results, displacement_governs=by_displacement, force_governs=by_force)
