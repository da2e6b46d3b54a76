"""The single-mode procedure for many isolation systems at once (numpy over the variant axis).

:func:`equivalent_linear_many` runs the iteration of
:func:`isolation.design.equivalent_linear` for N systems under one spectrum:
the same starting guess, the same damped successive substitution, the same
convergence rule (|D_next - D| <= tolerance * D_next) and the same final
evaluation, step for step as arrays, so each result equals the scalar one to
round-off. A system whose iteration leaves that path (its period leaves the
spectrum's range, the substitution does not settle, a stiffness or damping
out of bounds) is handed to the scalar function, which brackets the root or
raises the same :class:`isolation.errors.RunError`.

Backbones run as arrays when they are

* :class:`isolation.bearings.Bilinear` or :class:`~isolation.bearings.MultiLinear`
  (friction pendulum, double concave, lead-rubber, and any combination of
  them that stays piecewise linear): a linear spring plus elastic-perfectly-
  plastic elements, Masing loops;
* :class:`isolation.bearings.damping_rubber.AmplitudeBackbone` (one group of
  high-damping rubber bearings): the compound's G(gamma) and beta(gamma)
  table, the equivalent bilinear at each amplitude, property factors on it.

Anything else (e.g. rubber combined with sliders) goes to the scalar path.
:func:`design_bounds_many` gives :class:`isolation.design.BoundsResult` per
system for lower/nominal/upper property sets.

Scope: concept-stage feasibility, not construction design.

References
----------
ASCE/SEI 7-16 §17.5.3 (Eqs. 17.5-1, 17.5-2), generalised to any spectrum as
in :mod:`isolation.design`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any, Mapping, Sequence

import numpy as np

from isolation import GRAVITY, validate
from isolation.codes.registry import DEFAULT_BASIS
from isolation.design import BoundsResult, EquivalentLinearResult, equivalent_linear
from isolation.design.array_backbones import _classes, _Elements, _kind, _Rubber, supports  # noqa: F401 - re-exported
from isolation.site.spectra import damping_coefficient, rules

__all__ = ["EquivalentLinearArrays", "equivalent_linear_many", "design_bounds_many", "supports"]

_FOUR_PI2 = 4.0 * math.pi**2
_RESULT_FIELDS = ("displacement", "period", "damping", "damping_coefficient", "stiffness", "base_shear",
                  "spectral_acceleration", "weight")  # EquivalentLinearResult's leading fields, in order


# --- results ----------------------------------------------------------------------------


@dataclass(frozen=True)
class EquivalentLinearArrays:
    """Converged single-mode response of N systems (arrays over the variant axis).

    Attributes
    ----------
    displacement : D. [m]
    period : T_eff. [s]
    damping : beta_eff. [-]
    damping_coefficient : B. [-]
    stiffness : K_eff. [kN/m]
    base_shear : K_eff D. [kN]
    spectral_acceleration : Sa(T, 5 %). [g]
    weight : W. [kN]
    iterations : trial displacements evaluated. [-]
    method : "fixed point" or "bracketing" per system.
    rule : damping rule.
    scalar : indices that ran through :func:`isolation.design.equivalent_linear`.
    """

    displacement: np.ndarray
    period: np.ndarray
    damping: np.ndarray
    damping_coefficient: np.ndarray
    stiffness: np.ndarray
    base_shear: np.ndarray
    spectral_acceleration: np.ndarray
    weight: np.ndarray
    iterations: np.ndarray
    method: np.ndarray
    rule: str
    scalar: tuple = ()
    histories: tuple | None = field(default=None, repr=False)
    errors: dict = field(default_factory=dict, repr=False)

    def __len__(self) -> int:
        return int(self.displacement.size)

    def result(self, i: int) -> EquivalentLinearResult:
        """The :class:`isolation.design.EquivalentLinearResult` of system ``i``.

        Raises the scalar path's :class:`isolation.errors.RunError` when system
        ``i`` has no converged displacement.
        """
        return self.results([i])[0]

    def results(self, indices=None) -> list:
        """:meth:`result` of each system in ``indices`` (default: all), in order."""
        chosen = range(len(self)) if indices is None else list(indices)
        for i in chosen:
            if i in self.errors:
                raise self.errors[i]
        picked = np.asarray(chosen, dtype=int)
        columns = [getattr(self, name)[picked].tolist() for name in _RESULT_FIELDS]
        iterations = self.iterations[picked].tolist()
        methods = self.method[picked].tolist()
        out = []
        for j, i in enumerate(chosen):
            history = self.histories[i] if self.histories is not None else ()
            leading = {name: column[j] for name, column in zip(_RESULT_FIELDS, columns, strict=True)}
            out.append(EquivalentLinearResult(**leading, rule=self.rule,
                                              iterations=iterations[j], converged=True, method=methods[j],
                                              history=history))
        return out


def equivalent_linear_many(
    systems: Sequence,
    weight,
    spectrum,
    rule: str | None = DEFAULT_BASIS,
    *,
    tolerance: float = 1e-6,
    max_iterations: int = 200,
    initial_period: float = 2.5,
    history: bool = False,
) -> EquivalentLinearArrays:
    """:func:`isolation.design.equivalent_linear` for N systems at once.

    Parameters
    ----------
    systems : sequence
        Whole-plane backbones (see the module notes for those that run as arrays).
    weight : float or array
        Seismic weight W of each system (one value for all, or N values), > 0. [kN]
    spectrum : spectrum object
        Site spectrum with ``sa(period, damping)`` [g] and ``period_range`` [s].
    rule : str or None
        Damping rule ("asce7", "eurocode", "aashto"); None takes ``spectrum.rule``.
    tolerance : float
        Relative change in D that ends the iteration, in (0, 0.01]. [-]
    max_iterations : int
        Fixed-point steps before a system goes to the scalar bracketing, >= 1. [-]
    initial_period : float
        Period of the starting guess D_0 = Sd(T_0), > 0. [s]
    history : bool
        Keep each system's trial history (D [m], T [s], beta [-], B [-], D_next [m])
        as the scalar result does.

    Returns
    -------
    EquivalentLinearArrays
        A system without a converged displacement keeps NaN and its RunError
        (raised by ``result(i)``).
    """
    systems = list(systems)
    n = len(systems)
    w = _weights(weight, n)
    chosen = getattr(spectrum, "rule", DEFAULT_BASIS) if rule is None else rule
    validate.one_of("rule", chosen, rules())
    tol = validate.in_range("tolerance", tolerance, 0.0, 0.01, "-", low_inclusive=False)
    if isinstance(max_iterations, bool) or not isinstance(max_iterations, (int, np.integer)) or max_iterations < 1:
        raise ValueError(f"max_iterations = {max_iterations!r} is not allowed: must be an integer >= 1")
    t0 = validate.positive("initial_period", initial_period, "s")
    options: dict[str, Any] = dict(tolerance=tol, max_iterations=int(max_iterations), initial_period=t0)
    low, high = spectrum.period_range
    t0 = min(max(t0, low + 1e-3 * (high - low)), high)
    d0 = GRAVITY * float(spectrum.sa(t0, 0.05)) * t0**2 / (4.0 * math.pi**2)

    run = _Run(spectrum, w, chosen, tol, int(max_iterations), history)
    groups, fallback = _groups(systems)
    for key, members in groups.items():
        index = np.asarray(members)
        sample = [systems[i] for i in index]
        model = _Elements(sample) if key[0] == "elements" else _Rubber(sample)
        run.iterate_group(model, index, d0)
    scalar = sorted(set(fallback) | set(run.fallback))
    errors = run.scalar_fallback(systems, scalar, options)
    out, trials = run.out, run.trials
    return EquivalentLinearArrays(
        base_shear=out["stiffness"] * out["displacement"], weight=w, iterations=run.iterations, method=run.method,
        rule=chosen, scalar=tuple(scalar),
        histories=None if trials is None else tuple(tuple(t) for t in trials), errors=errors, **out)


def _weights(weight: Any, n: int) -> np.ndarray:
    """W of each of ``n`` systems (one value broadcast, or n values), each finite and > 0. [kN]"""
    w = np.broadcast_to(np.asarray(weight, dtype=float), (n,)).copy() if n else np.zeros(0)
    if n and not (np.all(np.isfinite(w)) and np.all(w > 0.0)):
        bad = w[~(np.isfinite(w) & (w > 0.0))][0]
        raise ValueError(f"weight = {float(bad)!r} is not allowed: must be finite and > 0 [kN]")
    return w


def _groups(systems: list) -> tuple[dict[tuple, list[int]], list[int]]:
    """Systems that run as arrays, grouped by backbone model (rubber: by compound), and the others."""
    groups: dict[tuple, list[int]] = {}
    fallback: list[int] = []
    for i, system in enumerate(systems):
        kind = _kind(system)
        if kind == "rubber":
            groups.setdefault(("rubber", id(system.bearing.compound)), []).append(i)
        elif kind == "elements":
            groups.setdefault(("elements",), []).append(i)
        else:
            fallback.append(i)
    return groups, fallback


class _Run:
    """One call of :func:`equivalent_linear_many`: the output arrays and the systems left to the scalar path."""

    def __init__(self, spectrum: Any, w: np.ndarray, rule: str, tol: float, max_iterations: int,
                 history: bool) -> None:
        n = w.size
        self.spectrum, self.w, self.rule, self.tol, self.max_iterations = spectrum, w, rule, tol, max_iterations
        self.low, self.high = spectrum.period_range
        self.out = {name: np.full(n, np.nan) for name in ("displacement", "period", "damping", "damping_coefficient",
                                                            "stiffness", "spectral_acceleration")}
        self.iterations = np.zeros(n, dtype=int)
        self.method = np.full(n, "fixed point", dtype=object)
        self.trials: list[list] | None = [[] for _ in range(n)] if history else None
        self.fallback: list[int] = []

    def trial(self, model: Any, rows: np.ndarray, index: np.ndarray, d: np.ndarray) -> tuple:
        """(ok, T, beta, B, K, Sa5, D_next) of ``rows`` of ``model``; ok False: leave the array path."""
        k, beta = model.effective(rows, d)
        ok = np.isfinite(k) & (k > 0.0) & np.isfinite(beta) & (beta >= 0.0) & (beta <= 1.0)
        period = np.full_like(d, np.nan)
        period[ok] = 2.0 * math.pi * np.sqrt(self.w[index[ok]] / (k[ok] * GRAVITY))
        ok &= (period >= self.low) & (period <= self.high)
        b = np.full_like(d, np.nan)
        sa5 = np.full_like(d, np.nan)
        if ok.any():
            b[ok] = damping_coefficient(beta[ok], self.rule)
            sa5[ok] = self.spectrum.sa(period[ok], 0.05)
        nxt = GRAVITY * sa5 * period**2 / (_FOUR_PI2 * b)
        return ok, period, beta, b, k, sa5, nxt

    def iterate_group(self, model: Any, index: np.ndarray, d0: float) -> None:
        """Damped successive substitution of one group (systems ``index``) from D_0 = ``d0`` [m]."""
        rows = np.arange(index.size)
        d = np.full(index.size, d0)
        relax = np.ones(index.size)
        previous = np.full(index.size, np.nan)
        final = np.full(index.size, np.nan)
        for _ in range(self.max_iterations):
            ok, period, beta, b, k, sa5, nxt = self.trial(model, rows, index[rows], d)
            # The scalar path raises on a bad stiffness or damping and brackets when the
            # period leaves the spectrum: both leave the array path here.
            self.fallback.extend(index[rows[~ok]].tolist())
            rows, d, relax, previous = rows[ok], d[ok], relax[ok], previous[ok]
            period, beta, b, nxt = period[ok], beta[ok], b[ok], nxt[ok]
            self.iterations[index[rows]] += 1
            if self.trials is not None:
                for r, x, t, z, c, y in zip(index[rows], d, period, beta, b, nxt, strict=True):
                    self.trials[r].append((float(x), float(t), float(z), float(c), float(y)))
            step = nxt - d
            done = np.abs(step) <= self.tol * np.maximum(d + step, 1e-12)
            final[rows[done]] = (d + step)[done]
            keep = ~done
            rows, d, relax, previous, step = rows[keep], d[keep], relax[keep], previous[keep], step[keep]
            if not rows.size:
                break
            flip = np.isfinite(previous) & (step * previous < 0) & (np.abs(step) > 0.5 * np.abs(previous))
            relax = np.where(flip, np.maximum(relax / 2.0, 1.0 / 64.0), relax)
            previous = step
            d = np.maximum(d + relax * step, d / 10.0)
        self.fallback.extend(index[rows].tolist())  # did not settle: bracketing in the scalar path
        self._settle(model, index, final)

    def _settle(self, model: Any, index: np.ndarray, final: np.ndarray) -> None:
        """The final evaluation at each converged D of one group, as the scalar result makes it."""
        settled = np.flatnonzero(np.isfinite(final))
        if not settled.size:
            return
        ok, period, beta, b, k, sa5, _ = self.trial(model, settled, index[settled], final[settled])
        self.fallback.extend(index[settled[~ok]].tolist())  # final period outside: the scalar message
        good = index[settled[ok]]
        self.out["displacement"][good] = final[settled[ok]]
        for name, values in (("period", period), ("damping", beta), ("damping_coefficient", b),
                             ("stiffness", k), ("spectral_acceleration", sa5)):
            self.out[name][good] = values[ok]

    def scalar_fallback(self, systems: list, scalar: list[int], options: dict) -> dict[int, Exception]:
        """Run ``scalar`` systems through :func:`isolation.design.equivalent_linear`; their RunErrors by index."""
        from isolation.errors import RunError

        errors: dict[int, Exception] = {}
        out = self.out
        for i in scalar:
            for name in out:
                out[name][i] = np.nan
            try:
                one = equivalent_linear(systems[i], float(self.w[i]), self.spectrum, self.rule, **options)
            except RunError as error:
                errors[i] = error
                self.iterations[i] = 0
                self.method[i] = ""
                continue
            for name in out:
                out[name][i] = getattr(one, name)
            self.iterations[i] = one.iterations
            self.method[i] = one.method
            if self.trials is not None:
                self.trials[i] = list(one.history)
        return errors


def design_bounds_many(property_sets: Sequence[Mapping[str, Any]], weight, spectrum, rule: str | None = DEFAULT_BASIS,
                       **options) -> list[BoundsResult]:
    """:func:`isolation.design.design_bounds` for N alternatives at once.

    Parameters
    ----------
    property_sets : sequence of mapping
        Per alternative, name -> whole-plane backbone (e.g. lower/nominal/upper).
    weight : float or array
        Seismic weight W per alternative (or one for all), > 0. [kN]
    spectrum : spectrum object
        Site spectrum. [g]
    rule : str or None
        Damping rule; None takes ``spectrum.rule``.
    **options
        ``tolerance``, ``max_iterations``, ``initial_period``, ``history`` of
        :func:`equivalent_linear_many`.

    Returns
    -------
    list of BoundsResult
        Raises the scalar RunError of the first alternative without a result.
    """
    sets = [dict(s) for s in property_sets]
    for s in sets:
        if not s:
            raise ValueError(f"property_sets = {s!r} is not allowed: must be a non-empty mapping name -> system")
    w = np.broadcast_to(np.asarray(weight, dtype=float), (len(sets),))
    flat, owner, names = [], [], []
    for i, s in enumerate(sets):
        for name, system in s.items():
            flat.append(system)
            owner.append(float(w[i]))
            names.append((i, str(name)))
    arrays = equivalent_linear_many(flat, np.asarray(owner), spectrum, rule, **options)
    results: list[dict] = [{} for _ in sets]
    for (i, name), result in zip(names, arrays.results(), strict=True):
        results[i][name] = result
    out = []
    for r in results:
        by_displacement = max(r, key=lambda n: r[n].displacement)
        by_force = max(r, key=lambda n: r[n].base_shear)
        out.append(BoundsResult(results=r, displacement_governs=by_displacement, force_governs=by_force))
    return out
