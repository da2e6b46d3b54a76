"""Synthetic accelerograms matched to a target spectrum (frequency-domain iteration).

Method (Gasparini & Vanmarcke 1976; review Preumont 1984):

1. Record ``i`` draws uniform random phases from
   ``numpy.random.default_rng(seeds[i])``; ``seeds`` come from
   ``numpy.random.SeedSequence(seed).generate_state(count)``, so the same
   ``seed`` gives the same suite on any machine.
2. Starting Fourier amplitudes follow the target: ``|X(f)| ~ S(f) / sqrt(f)``
   (the shape of the power spectral density ``G(w) ~ 4 zeta S^2 / (pi w r^2)``).
3. The stationary signal is multiplied by an intensity envelope: quadratic
   rise, plateau and exponential decay (after Jennings, Housner & Tsai 1968),
   its plateau sized so that the envelope's own D5-95 equals the significant
   duration, set from the magnitude or given explicitly.
4. Iteration: response spectrum at the control periods (exact, see
   :mod:`isolation.motions.spectrum`), Fourier amplitudes scaled by
   ``(goal x target / computed)`` interpolated in log frequency, zero-phase
   high-pass below ``1 / (2 T_max)``, short cosine tapers at both ends,
   baseline correction; the best iterate of every record is kept.  A record
   stops after 12 iterations without improvement or when it is within +/-5 %
   of the goal; this stage typically ends at +/-5-12 %.
   Optional second stage (``refinements > 0``): time-domain wavelet
   adjustment after Al Atik & Abrahamson (2010),
   :mod:`isolation.motions.wavelets`.
5. Baseline correction inside the loop: ``a <- a - c0 e(t) - c1 e(t) t / T``
   with ``e`` the envelope, ``c0, c1`` solving final velocity = final
   displacement = 0 exactly for piecewise-linear acceleration.  Tolerance
   stated in :data:`isolation.motions.suite.BASELINE_TOLERANCE`
   (1e-4 m/s and 1e-4 m); the correction follows the envelope, so the quiet
   tail shows no drift.

Goal: records are matched to ``goal x target`` with goal 1.15 for the ASCE 7
rule (suite mean must reach 110 %) and 1.08 (the middle of the 0.9-1.3
band) for the Eurocode rule (mean >= 90 %).  After matching, a record whose
ratios stick out of the per-record band but whose spread fits in it is scaled
into the band, and records with headroom are scaled up while the suite mean
falls short of the rule; these amplitude factors are kept in
``MatchedSuite.scale_factors`` (1.0 when none was needed).

References
----------
Gasparini, D. A. & Vanmarcke, E. H. (1976). SIMQKE: simulated earthquake
motions compatible with prescribed response spectra. MIT R76-4.
Preumont, A. (1984). The generation of spectrum compatible accelerograms for
the design of nuclear power plants. Earthq. Eng. Struct. Dyn. 12, 481-497.
Jennings, P. C., Housner, G. W. & Tsai, N. C. (1968). Simulated earthquake
motions. EERL, Caltech.
"""

from __future__ import annotations

import math
import sys
from typing import Any

import numpy as np

from isolation.codes import registry as _codes
from isolation.motions.envelope import typical_significant_duration
from isolation.motions.shaping import _KAPPA, _TAIL_FLOOR, _baseline, _Shaping, _shaping, _starting_records  # noqa: F401
from isolation.motions.spectrum import response_spectrum
from isolation.motions.suite import RECORD_BAND, MatchedSuite
from isolation.motions.wavelets import wavelet_step
from isolation.validate import finite_array, in_range, positive

__all__ = ["matched_suite", "GOALS"]

#: Records are matched to goal x target, per suite-mean rule.
GOALS = _codes.PerBasis(lambda basis: basis.suite.goal)
"""Matching goal per rule (:attr:`isolation.codes.basis.SuiteRules.goal`)."""

_TOLERANCE = 0.05  # stop when every record is within +/-5 % of goal x target
_PATIENCE = 12  # a record stops after this many iterations without improvement


def _whole(field: str, value: Any, low: int, high: int) -> int:
    """Return ``value`` as an int when it is a whole number in [low, high]."""
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or not low <= int(value) <= high:
        raise ValueError(f"{field} = {value!r} is not allowed: must be a whole number in [{low}, {high}]")
    return int(value)


def _derive_seeds(seed: int, count: int) -> tuple:
    state = np.random.SeedSequence(seed).generate_state(count, dtype=np.uint32)
    return tuple(int(s) for s in state)


def _band(spectrum, dt, duration, period_range, isolated_period, rule):
    """Control band (low, high) and suite-mean check range, both [s]."""
    lows, highs = None, None
    if isolated_period is not None:
        values = np.atleast_1d(finite_array("isolated_period", isolated_period, "s"))
        if values.size not in (1, 2) or (values <= 0).any():
            raise ValueError(
                f"isolated_period = {isolated_period!r} is not allowed: must be T_M > 0 or a pair "
                "(T_M upper-bound, T_M lower-bound) [s]"
            )
        lows, highs = float(values.min()), float(values.max())
    if period_range is None:
        low = max(0.05, 4.0 * dt)
        high = max(6.0, 1.5 * highs) if highs else 6.0
        limits = getattr(spectrum, "period_range", None)
        if limits is not None:
            low = max(low, float(limits[0]))
            high = min(high, float(limits[1]))
        high = min(high, duration / 3.0)
    else:
        pair = finite_array("period_range", period_range, "s")
        if pair.shape != (2,) or not 0 < pair[0] < pair[1]:
            raise ValueError(f"period_range = {period_range!r} is not allowed: must be (Tmin, Tmax) with 0 < Tmin < "
                             "Tmax [s]")
        low, high = float(pair[0]), float(pair[1])
        if low < 4.0 * dt:
            raise ValueError(f"period_range = {period_range!r} is not allowed: Tmin must be >= 4 dt = {4 * dt:g} [s]")
        if high > duration / 3.0:
            raise ValueError(f"period_range = {period_range!r} is not allowed: Tmax must be <= duration / 3 = "
                             f"{duration / 3:g} [s]")
    if lows is None:
        check = (low, high)
    else:  # the code's range (ASCE/SEI 7 Ch. 17 0.75-1.25, EN 1998-1 §3.2.3.1.2(4) 0.2-2.0)
        lower, upper = _codes.get(rule, "rule").suite.period_range
        check = (lower * lows, upper * highs)
    if check[0] < low * (1 - 1e-9) or check[1] > high * (1 + 1e-9):
        raise ValueError(
            f"isolated_period = {isolated_period!r} is not allowed: its check range "
            f"{check[0]:.3g}-{check[1]:.3g} s must lie inside the matched band {low:.3g}-{high:.3g} s [s]"
        )
    return low, high, check


def _record_factors(ratios: np.ndarray, inside: np.ndarray, required: float) -> np.ndarray:
    """Amplitude factor per record: into the band first, then up for the mean rule.

    A record whose spread of ratios fits inside :data:`RECORD_BAND` is
    scaled (as little as possible) into it; then, while the suite mean falls
    short of ``required`` inside the check range, records with headroom
    below the upper band limit are scaled up.  Factors stay 1 when nothing is
    needed; the caller recomputes the spectra of the scaled records.
    """
    low, high = RECORD_BAND
    up_limit = high * 0.999 / ratios.max(axis=1)
    down_limit = low * 1.001 / ratios.min(axis=1)
    movable = down_limit <= up_limit
    factors = np.where(movable, np.clip(1.0, down_limit, up_limit), 1.0)
    for _ in range(50):
        lowest = float((factors[:, None] * ratios).mean(axis=0)[inside].min())
        if lowest >= required:
            break
        raised = np.where(movable, np.minimum(factors * required * 1.002 / lowest, up_limit), factors)
        if np.allclose(raised, factors, rtol=1e-12, atol=0.0):
            break
        factors = raised
    return factors


def progress_bar(progress: bool | None, total: int, description: str):
    """A tqdm bar of ``total`` iterations, disabled (a no-op) unless ``progress`` is true or, when
    ``progress`` is None, standard error is a terminal."""
    from tqdm.auto import tqdm

    show = sys.stderr.isatty() if progress is None else bool(progress)
    return tqdm(total=total, desc=description, unit="iteration", leave=False, disable=not show)


def matched_suite(
    spectrum: Any,
    count: int = 7,
    damping: float = 0.05,
    duration: float = 40.0,
    dt: float = 0.005,
    seed: int = 0,
    period_range: Any = None,
    *,
    magnitude: float = 7.0,
    significant_duration: float | None = None,
    rule: str = _codes.DEFAULT_BASIS,
    isolated_period: Any = None,
    control_points: int = 80,
    max_iterations: int = 30,
    refinements: int = 0,
    progress: bool | None = None,
) -> MatchedSuite:
    """Generate a suite of synthetic accelerograms matched to ``spectrum``.

    Parameters
    ----------
    spectrum : object
        Anything with ``.sa(period, damping)`` returning spectral acceleration
        (e.g. :class:`isolation.site.spectra.CodeSpectrum`). [g]
    count : int
        Number of records, 1 to 200. [-]
    damping : float
        Damping ratio of the matched spectrum, 0.01 to 0.5. [-]
    duration : float
        Record length, 5 to 600. [s]
    dt : float
        Time step, 0.001 to 0.05. [s]
    seed : int
        Base seed (>= 0); record seeds derive from it. [-]
    period_range : tuple of float, optional
        Matched band (Tmin, Tmax). Default: max(0.05 s, 4 dt) to
        max(6 s, 1.5 T_M) limited by the spectrum's own period range and
        duration / 3. [s]
    magnitude : float
        Moment magnitude setting the significant duration when
        ``significant_duration`` is not given. [-]
    significant_duration : float, optional
        Intended D5-95 of the envelope. [s]
    rule : str
        Suite-mean rule: "asce7" (>= 110 %) or "eurocode" (>= 90 %).
    isolated_period : float or tuple of float, optional
        T_M, or (T_M at upper-bound, T_M at lower-bound properties); sets the
        suite-mean check range (ASCE 7: 0.75 T_M,upper to 1.25 T_M,lower;
        Eurocode: 0.2 T to 2 T) and extends the default band. [s]
    control_points : int
        Number of log-spaced control periods, 10 to 400. [-]
    max_iterations : int
        Iteration limit of the frequency-domain stage, 1 to 200. [-]
    refinements : int
        Optional wavelet refinement steps (:mod:`isolation.motions.wavelets`)
        for records still outside +/-5 % of the goal, 0 to 200; 0 (default)
        switches the stage off.  It typically trims the worst misfit of some
        records by a few per cent at roughly twice the run time. [-]
    progress : bool, optional
        Show a tqdm progress bar; default: only when stderr is a terminal.

    Returns
    -------
    MatchedSuite
        Records [g], seeds, control periods [s], target and record spectra
        [g]; ``.check()`` gives the tolerance report.

    References
    ----------
    Gasparini, D. A. & Vanmarcke, E. H. (1976). SIMQKE: simulated earthquake motions compatible with
    prescribed response spectra. MIT Report R76-4 (a report, no DOI).
    Preumont, A. (1984). The generation of spectrum compatible accelerograms for the design of nuclear power
    plants. Earthquake Eng. Struct. Dyn. 12(4), 481-497. doi:10.1002/eqe.4290120405
    Jennings, P. C., Housner, G. W. & Tsai, N. C. (1968). Simulated earthquake motions. Earthquake Engineering
    Research Laboratory, California Institute of Technology (a report, no DOI).
    Al Atik, L. & Abrahamson, N. (2010). An improved method for nonstationary spectral matching. Earthquake
    Spectra 26(3), 601-617. doi:10.1193/1.3459159
    """
    if not callable(getattr(spectrum, "sa", None)):
        raise ValueError(f"spectrum = {spectrum!r} is not allowed: must have a method sa(period, damping) [g]")
    number = _whole("count", count, 1, 200)
    zeta = in_range("damping", damping, 0.01, 0.5)
    length = in_range("duration", duration, 5.0, 600.0, "s")
    step = in_range("dt", dt, 0.001, 0.05, "s")
    base_seed = _whole("seed", seed, 0, 2**63 - 1)
    rules = _codes.get(rule, "rule").suite
    points = _whole("control_points", control_points, 10, 400)
    limit = _whole("max_iterations", max_iterations, 1, 200)
    refinements = _whole("refinements", refinements, 0, 200)
    strong, chosen_magnitude = _strong_motion(magnitude, significant_duration)
    low, high, check_range = _band(spectrum, step, length, period_range, isolated_period, rule)

    periods = np.geomspace(low, high, points)
    target = _target(spectrum, periods, zeta)
    aim = rules.goal * target
    shaping = _shaping(length, step, strong, periods, high, magnitude if chosen_magnitude is not None else None)
    seeds = _derive_seeds(base_seed, number)
    records = _starting_records(shaping, aim, seeds)
    records *= np.median(aim / response_spectrum(records, step, periods, zeta), axis=-1)[:, None]

    found = BestIterates(records)
    with progress_bar(progress, limit + refinements, "matching suite") as bar:
        _frequency_stage(found, records, shaping, (periods, zeta), aim, limit, bar)
        _wavelet_stage(found, shaping, (periods, zeta), aim, (limit, refinements), bar)

    best, spectra, factors = _scaled_into_band(found.best, step, (periods, zeta), target, check_range,
                                               rules.mean_ratio)
    for array in (best, periods, target, spectra):
        array.setflags(write=False)
    return MatchedSuite(
        acceleration=best, dt=step, seeds=seeds, periods=periods, target=target, spectra=spectra, damping=zeta,
        rule=rule, goal=rules.goal, check_range=(float(check_range[0]), float(check_range[1])),
        significant_duration=strong, magnitude=chosen_magnitude, iterations=tuple(int(i) for i in found.iteration),
        scale_factors=tuple(float(f) for f in factors), base_seed=base_seed,
    )


def _strong_motion(magnitude: float, significant_duration: float | None) -> tuple:
    """(D5-95 of the envelope [s], the magnitude that set it or None when it was given)."""
    if significant_duration is None:
        return typical_significant_duration(magnitude), float(magnitude)
    return positive("significant_duration", significant_duration, "s"), None


def _target(spectrum: Any, periods: np.ndarray, zeta: float) -> np.ndarray:
    """The target spectrum at the control periods, checked finite and positive. [g]"""
    target = np.asarray(spectrum.sa(periods, zeta), dtype=float)
    if target.shape != periods.shape or not np.all(np.isfinite(target)) or (target <= 0).any():
        raise ValueError(f"spectrum = {spectrum!r} is not allowed: sa() must give finite values > 0 [g]")
    return target


class BestIterates:
    """The best iterate of every record (or pair) so far: its signal, misfit score and iteration.

    ``remember(candidates, rows, score, iteration)`` keeps each candidate whose
    score (largest |log(spectrum / aim)| over the control periods [-]) beats
    the one held for its row.
    """

    def __init__(self, signals: np.ndarray) -> None:
        count = signals.shape[0]
        self.best = signals.copy()
        self.score = np.full(count, np.inf)
        self.iteration = np.zeros(count, dtype=int)

    def remember(self, candidates: np.ndarray, rows: np.ndarray, score: np.ndarray, iteration: int) -> None:
        better = score < self.score[rows]
        self.best[rows[better]] = candidates[better]
        self.score[rows[better]] = score[better]
        self.iteration[rows[better]] = iteration

    def keep(self, rows: np.ndarray, iteration: int, patience: int) -> np.ndarray:
        """Rows still outside +/-5 % of the goal that improved within ``patience`` iterations."""
        goal_reached = math.log1p(_TOLERANCE)
        return (self.score[rows] > goal_reached) & (iteration - self.iteration[rows] < patience)


def _frequency_stage(found: BestIterates, records: np.ndarray, shaping: _Shaping, control: tuple,
                     aim: np.ndarray, limit: int, bar: Any) -> None:
    """Stage 1: frequency-domain iteration (Gasparini & Vanmarcke) of every record.

    ``control`` is (control periods [s], damping ratio [-]); ``aim`` the goal
    spectrum at them [g]; ``limit`` the iteration limit.
    """
    step, (periods, zeta) = shaping.step, control
    active = np.arange(records.shape[0])
    for iteration in range(limit + 1):
        ratio = response_spectrum(records, step, periods, zeta) / aim
        found.remember(records, active, np.abs(np.log(ratio)).max(axis=-1), iteration)
        keep = found.keep(active, iteration, _PATIENCE)
        if iteration == limit or not keep.any():
            return
        records, ratio, active = records[keep], ratio[keep], active[keep]
        records = shaping.correct(records, ratio)
        bar.update(1)


def _wavelet_stage(found: BestIterates, shaping: _Shaping, control: tuple, aim: np.ndarray, counts: tuple,
                   bar: Any) -> None:
    """Stage 2: wavelet refinement of the records still outside the tolerance.

    ``counts`` is (iterations of stage 1, refinement steps); the rest as for
    :func:`_frequency_stage`.
    """
    step, (periods, zeta), (limit, refinements) = shaping.step, control, counts
    active = np.flatnonzero(found.score > math.log1p(_TOLERANCE))
    records = found.best[active].copy()
    for refinement in range(refinements + 1):
        if active.size == 0:
            return
        if refinement == refinements:
            ratio = response_spectrum(records, step, periods, zeta) / aim
            found.remember(records, active, np.abs(np.log(ratio)).max(axis=-1), limit + refinement)
            return
        adjusted, score = wavelet_step(records, step, periods, zeta, aim)
        found.remember(records, active, score, limit + refinement)
        keep = found.keep(active, limit + refinement, _PATIENCE // 2)
        active = active[keep]
        if active.size == 0:
            return
        records = shaping.baseline(adjusted[keep] * shaping.taper)
        bar.update(1)


def _scaled_into_band(best: np.ndarray, step: float, control: tuple, target: np.ndarray, check_range: tuple,
                      required: float) -> tuple:
    """Best records scaled per record into the band and up to the mean rule: (records, spectra, factors)."""
    periods, zeta = control
    spectra = response_spectrum(best, step, periods, zeta)
    inside = (periods >= check_range[0] * (1 - 1e-9)) & (periods <= check_range[1] * (1 + 1e-9))
    factors = _record_factors(spectra / target, inside, required)
    if np.any(factors != 1.0):
        best = best * factors[:, None]
        spectra = response_spectrum(best, step, periods, zeta)
    return best, spectra, factors
