"""Suites of orthogonal horizontal component pairs matched to a target spectrum.

Method:

1. ``2 x count`` independent components are matched to a fraction of the
   target with :func:`isolation.motions.matched_suite` (record ``2 i`` and
   ``2 i + 1`` form pair ``i``; seeds as in that function, so the same seed
   gives the same pairs on any machine).  Independent random phases make the
   components weakly correlated; :attr:`MatchedPairs.correlation` reports it.
2. The pair spectrum (RotD100 on an ASCE/SEI 7 basis, SRSS on a Eurocode
   basis) is brought to ``goal x target`` by iterating on the Fourier
   amplitudes of both components with the same correction per frequency, so
   the pair keeps its shape; each iteration ends with the taper and the
   baseline correction of the single-record method; the best iterate is kept.
3. A pair whose spectrum sticks out of the per-pair band is scaled as a whole
   (one factor for both components) into it, and pairs with headroom are
   scaled up while the suite mean falls short of the rule; the factors are
   kept in :attr:`MatchedPairs.scale_factors`.

Rules for pairs (:data:`PAIR_RULES`):

* ``"asce7"``: the average of the maximum-direction (RotD100) spectra of the
  suite not below 110 % of the MCE_R spectrum over 0.75 T_M (upper bound) to
  1.25 T_M (lower bound) (ASCE/SEI 7-16 §17.3.3 with §16.2.3.3 for spectrally
  matched motions; 7-22 the same clauses; from memory).
* ``"eurocode"``: the average of the SRSS spectra of the pairs not below 1.3
  times the elastic spectrum over 0.2 T to 1.5 T (EN 1998-2:2005 §3.2.3(4);
  EN 1998-1:2004 §3.2.3.1.2 gives the single-component rule; from memory).
"""

from __future__ import annotations

from typing import Any

import numpy as np

from isolation.codes import registry as _codes
from isolation.motions.matching import (
    BestIterates,
    _band,
    _record_factors,
    _shaping,
    _whole,
    matched_suite,
    progress_bar,
)
from isolation.motions.pair_spectra import rotd100_spectrum, srss_spectrum
from isolation.motions.pair_suite import MatchedPairs
from isolation.validate import in_range, positive

__all__ = ["matched_pairs"]

_PATIENCE = 8
# Starting component level as a fraction of the pair goal: two independent
# components matched to S give RotD100 of about 1.2-1.3 S (common practice)
# and SRSS of sqrt(2) S (derived arithmetic).


class _Scaled:
    """A spectrum times a constant factor (keeps the period range of the original)."""

    def __init__(self, spectrum: Any, factor: float) -> None:
        self.spectrum, self.factor = spectrum, factor
        self.period_range = getattr(spectrum, "period_range", None)

    def sa(self, period, damping=0.05):
        return self.factor * np.asarray(self.spectrum.sa(period, damping), dtype=float)


def _pair_spectrum(rule: str, pairs: np.ndarray, dt: float, periods: np.ndarray, zeta: float) -> np.ndarray:
    if _codes.get(rule, "rule").suite.pair_spectrum == "RotD100":
        return rotd100_spectrum(pairs, dt, periods, zeta)
    return srss_spectrum(pairs, dt, periods, zeta)


def _pair_check_range(low: float, high: float, isolated_period: Any, rule: str) -> tuple:
    if isolated_period is None:
        return (low, high)
    values = np.atleast_1d(np.asarray(isolated_period, dtype=float))
    lower, upper = _codes.get(rule, "rule").suite.pair_period_range
    check = (lower * float(values.min()), upper * float(values.max()))
    if check[0] < low * (1 - 1e-9) or check[1] > high * (1 + 1e-9):
        raise ValueError(
            f"isolated_period = {isolated_period!r} is not allowed: its check range {check[0]:.3g}-{check[1]:.3g} s "
            f"must lie inside the matched band {low:.3g}-{high:.3g} s [s]"
        )
    return check


def matched_pairs(
    spectrum: Any,
    count: int = 7,
    damping: float = 0.05,
    duration: float = 40.0,
    dt: float = 0.005,
    seed: int = 0,
    period_range: Any = None,
    *,
    rule: str = _codes.DEFAULT_BASIS,
    isolated_period: Any = None,
    magnitude: float = 7.0,
    significant_duration: float | None = None,
    control_points: int = 50,
    max_iterations: int = 20,
    progress: bool | None = None,
) -> MatchedPairs:
    """Generate ``count`` pairs of orthogonal components matched to ``spectrum`` by the code's pair rule.

    Parameters
    ----------
    spectrum : object
        Anything with ``.sa(period, damping)`` [g] (e.g. :class:`isolation.site.spectra.CodeSpectrum`).
    count : int
        Number of pairs, 1 to 100. [-]
    damping : float
        Damping ratio of the spectra, 0.01 to 0.5. [-]
    duration : float
        Record length, 5 to 600. [s]
    dt : float
        Time step, 0.001 to 0.05. [s]
    seed : int
        Base seed (>= 0). [-]
    period_range : tuple of float, optional
        Matched band (Tmin, Tmax), as for :func:`isolation.motions.matched_suite`. [s]
    rule : str
        "asce7" (RotD100 mean >= 110 %) or "eurocode" (SRSS mean >= 1.3 x target).
    isolated_period : float or tuple of float, optional
        T_M, or (T_M upper bound, T_M lower bound), setting the check range. [s]
    magnitude : float
        Moment magnitude setting the significant duration. [-]
    significant_duration : float, optional
        D5-95 of the envelope. [s]
    control_points : int
        Log-spaced control periods, 10 to 400. [-]
    max_iterations : int
        Iterations of the pair stage, 1 to 200. [-]
    progress : bool, optional
        Progress bar; default only when stderr is a terminal.

    Returns
    -------
    MatchedPairs
        ``.acceleration`` of shape (count, 2, steps) [g], ``.dt`` [s], ``.seeds``, ``.check()``.
    """
    number = _whole("count", count, 1, 100)
    rules = _codes.get(rule, "rule").suite
    zeta = in_range("damping", damping, 0.01, 0.5)
    length = in_range("duration", duration, 5.0, 600.0, "s")
    step = in_range("dt", dt, 0.001, 0.05, "s")
    limit = _whole("max_iterations", max_iterations, 1, 200)
    points = _whole("control_points", control_points, 10, 400)
    goal = rules.pair_goal
    if period_range is None and isolated_period is not None:
        period_range = _default_band(spectrum, step, length, isolated_period)
    # Stage 1: independent components (the single-record method) at a fraction of the pair goal.
    components = matched_suite(
        _Scaled(spectrum, goal * rules.pair_start / rules.goal),
        count=2 * number, damping=zeta, duration=length, dt=step, seed=seed, period_range=period_range,
        magnitude=magnitude, significant_duration=significant_duration, rule=rule,
        isolated_period=isolated_period, control_points=points, progress=progress,
    )
    low, high, _ = _band(spectrum, step, length, period_range, isolated_period, rule)
    check_range = _pair_check_range(low, high, isolated_period, rule)
    periods = np.geomspace(low, high, points)
    target = np.asarray(spectrum.sa(periods, zeta), dtype=float)
    aim = goal * target
    strong = (
        positive("significant_duration", significant_duration, "s")
        if significant_duration is not None
        else components.significant_duration
    )
    shaping = _shaping(length, step, strong, periods, high, None)
    pairs = components.acceleration.reshape(number, 2, -1).copy()

    # Stage 2: one amplitude correction per pair and frequency, applied to both components.
    with progress_bar(progress, limit, "matching pairs") as bar:
        best = _pair_stage(pairs, shaping, rule, (periods, zeta), aim, limit, bar)

    best, spectra, factors = _pairs_into_band(best, step, rule, (periods, zeta), target, check_range)
    for array in (best, periods, target, spectra):
        array.setflags(write=False)
    seeds = tuple((int(components.seeds[2 * i]), int(components.seeds[2 * i + 1])) for i in range(number))
    return MatchedPairs(
        acceleration=best, dt=step, seeds=seeds, periods=periods, target=target, spectra=spectra,
        damping=zeta, rule=rule, goal=goal, check_range=(float(check_range[0]), float(check_range[1])),
        scale_factors=tuple(float(f) for f in factors), base_seed=int(components.base_seed),
    )


def _pair_stage(pairs: np.ndarray, shaping: Any, rule: str, control: tuple, aim: np.ndarray, limit: int,
                bar: Any) -> np.ndarray:
    """Best iterate of every pair after the Fourier corrections common to both components.

    ``control`` is (control periods [s], damping ratio [-]); ``aim`` the pair
    goal spectrum at them [g]; ``limit`` the iteration limit.
    """
    step, (periods, zeta) = shaping.step, control
    found = BestIterates(pairs)
    active = np.arange(pairs.shape[0])
    for iteration in range(limit + 1):
        ratio = _pair_spectrum(rule, pairs, step, periods, zeta) / aim
        found.remember(pairs, active, np.abs(np.log(ratio)).max(axis=-1), iteration)
        keep = found.keep(active, iteration, _PATIENCE)
        if iteration == limit or not keep.any():
            break
        pairs, ratio, active = pairs[keep], ratio[keep], active[keep]
        pairs = shaping.correct(pairs, ratio[:, None, :])
        bar.update(1)
    return found.best


def _pairs_into_band(best: np.ndarray, step: float, rule: str, control: tuple, target: np.ndarray,
                     check_range: tuple) -> tuple:
    """Pairs scaled as a whole into the band and up to the mean rule: (pairs, pair spectra, factors)."""
    periods, zeta = control
    rules = _codes.get(rule, "rule").suite
    spectra = _pair_spectrum(rule, best, step, periods, zeta)
    inside = (periods >= check_range[0] * (1 - 1e-9)) & (periods <= check_range[1] * (1 + 1e-9))
    factors = _pair_factors(spectra / target, inside, rules.pair_ratio, rules.pair_goal)
    if np.any(factors != 1.0):
        best = best * factors[:, None, None]
        spectra = _pair_spectrum(rule, best, step, periods, zeta)
    return best, spectra, factors


def _default_band(spectrum: Any, dt: float, duration: float, isolated_period: Any) -> tuple:
    """Matched band wide enough for the single-component check inside stage 1 (up to 2 T). [s]"""
    longest = float(np.max(np.atleast_1d(np.asarray(isolated_period, dtype=float))))
    low, high = max(0.05, 4.0 * dt), max(6.0, 2.0 * longest)
    limits = getattr(spectrum, "period_range", None)
    if limits is not None:
        low, high = max(low, float(limits[0])), min(high, float(limits[1]))
    return (low, min(high, duration / 3.0))


def _pair_factors(ratios: np.ndarray, inside: np.ndarray, required: float, goal: float) -> np.ndarray:
    """Per-pair factors into the band ``goal x PAIR_BAND`` and up to the mean rule (see the single-record method)."""
    scale = goal / 1.15  # _record_factors works on the band (0.9, 1.3), which is PAIR_BAND at goal 1.15
    return _record_factors(ratios / scale, inside, required / scale)
