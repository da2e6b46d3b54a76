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

import math
import sys
from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation.motions.matching import _band, _record_factors, _shaping, _whole, matched_suite
from isolation.motions.measures import displacement, velocity
from isolation.motions.pair_spectra import component_correlation, rotd100_spectrum, srss_spectrum
from isolation.motions.suite import BASELINE_TOLERANCE
from isolation.validate import in_range, one_of, positive

__all__ = ["matched_pairs", "MatchedPairs", "PairCheck", "PAIR_RULES", "RecordedPair", "read_pair"]

#: Per basis: pair spectrum, required suite-mean ratio, matching goal, check range factors on (T_low, T_high).
PAIR_RULES = {
    "asce7": {"spectrum": "RotD100", "required": 1.10, "goal": 1.15, "range": (0.75, 1.25)},
    "eurocode": {"spectrum": "SRSS", "required": 1.30, "goal": 1.40, "range": (0.2, 1.5)},
}

#: Per-pair band as a fraction of the goal (0.9-1.3 of the target at the ASCE 7 goal 1.15; common practice).
PAIR_BAND = (0.9 / 1.15, 1.3 / 1.15)

_TOLERANCE = 0.05
_PATIENCE = 8
# Starting component level as a fraction of the pair goal: two independent
# components matched to S give RotD100 of about 1.2-1.3 S (common practice)
# and SRSS of sqrt(2) S (derived arithmetic).
_START = {"asce7": 1.0 / 1.25, "eurocode": 1.0 / math.sqrt(2.0)}


class _Scaled:
    """A spectrum times a constant factor (keeps the period range of the original)."""

    def __init__(self, spectrum: Any, factor: float) -> None:
        self.spectrum, self.factor = spectrum, factor
        self.period_range = getattr(spectrum, "period_range", None)

    def sa(self, period, damping=0.05):
        return self.factor * np.asarray(self.spectrum.sa(period, damping), dtype=float)


def _pair_spectrum(rule: str, pairs: np.ndarray, dt: float, periods: np.ndarray, zeta: float) -> np.ndarray:
    if PAIR_RULES[rule]["spectrum"] == "RotD100":
        return rotd100_spectrum(pairs, dt, periods, zeta)
    return srss_spectrum(pairs, dt, periods, zeta)


@dataclass(frozen=True)
class PairCheck:
    """Tolerance report of a suite of pairs.

    Attributes
    ----------
    rule : str
        "asce7" (RotD100) or "eurocode" (SRSS).
    spectrum : str
        Name of the pair spectrum: "RotD100" or "SRSS".
    band : tuple of float
        Per-pair band of pair spectrum / target. [-]
    lowest_ratio, highest_ratio : tuple of float
        Extremes of each pair's spectrum / target over the control periods. [-]
    within_band : tuple of bool
        Whether each pair stays inside the band.
    correlation : tuple of float
        Correlation coefficient of each pair's components. [-]
    baseline_ok : tuple of bool
        Final velocity and displacement of both components within tolerance.
    check_range : tuple of float
        Period range of the suite-mean rule. [s]
    required_mean_ratio, lowest_mean_ratio : float
        Rule and achieved minimum of suite-mean pair spectrum / target. [-]
    period_of_lowest_mean : float
        Where the lowest mean ratio occurs. [s]
    """

    rule: str
    spectrum: str
    band: tuple
    lowest_ratio: tuple
    highest_ratio: tuple
    within_band: tuple
    correlation: tuple
    baseline_ok: tuple
    check_range: tuple
    required_mean_ratio: float
    lowest_mean_ratio: float
    period_of_lowest_mean: float

    @property
    def mean_ok(self) -> bool:
        """Whether the suite mean meets the rule over the check range."""
        return self.lowest_mean_ratio >= self.required_mean_ratio * (1 - 1e-9)

    @property
    def passed(self) -> bool:
        """Mean rule, every pair in its band, every baseline within tolerance."""
        return self.mean_ok and all(self.within_band) and all(self.baseline_ok)

    def table(self) -> list[dict]:
        """One row per pair: ratios, band, correlation, baseline. [-]"""
        return [
            {
                "pair": i + 1,
                "lowest_ratio": self.lowest_ratio[i],
                "highest_ratio": self.highest_ratio[i],
                "within_band": self.within_band[i],
                "correlation": self.correlation[i],
                "baseline_ok": self.baseline_ok[i],
            }
            for i in range(len(self.lowest_ratio))
        ]

    def to_dict(self) -> dict:
        """Plain JSON types."""
        return {
            "rule": self.rule,
            "spectrum": self.spectrum,
            "band": list(self.band),
            "pairs": self.table(),
            "check_range_s": list(self.check_range),
            "required_mean_ratio": self.required_mean_ratio,
            "lowest_mean_ratio": self.lowest_mean_ratio,
            "period_of_lowest_mean_s": self.period_of_lowest_mean,
            "mean_ok": self.mean_ok,
            "passed": self.passed,
        }


@dataclass(frozen=True)
class MatchedPairs:
    """A suite of matched pairs of orthogonal horizontal components.

    Attributes
    ----------
    acceleration : numpy.ndarray
        Ground acceleration, (count, 2, steps), read-only; component 0 along x,
        1 along y. [g]
    dt : float
        Time step. [s]
    seeds : tuple of tuple of int
        Phase seeds of the two components of every pair. [-]
    periods : numpy.ndarray
        Control periods. [s]
    target : numpy.ndarray
        Target spectrum at the control periods. [g]
    spectra : numpy.ndarray
        Pair spectrum (RotD100 or SRSS) of every pair, (count, periods). [g]
    damping : float
        Damping ratio of the spectra. [-]
    rule : str
        "asce7" or "eurocode".
    goal : float
        Pairs were matched to goal x target. [-]
    check_range : tuple of float
        Period range of the suite-mean rule. [s]
    scale_factors : tuple of float
        Factor applied to both components of each pair after matching. [-]
    base_seed : int
        The ``seed`` argument. [-]
    """

    acceleration: np.ndarray
    dt: float
    seeds: tuple
    periods: np.ndarray
    target: np.ndarray
    spectra: np.ndarray
    damping: float
    rule: str
    goal: float
    check_range: tuple
    scale_factors: tuple
    base_seed: int

    @property
    def count(self) -> int:
        """Number of pairs. [-]"""
        return int(self.acceleration.shape[0])

    @property
    def time(self) -> np.ndarray:
        """Sample times. [s]"""
        return np.arange(self.acceleration.shape[-1]) * self.dt

    @property
    def spectrum_name(self) -> str:
        """"RotD100" or "SRSS"."""
        return PAIR_RULES[self.rule]["spectrum"]

    @property
    def mean_spectrum(self) -> np.ndarray:
        """Suite mean of the pair spectra. [g]"""
        return self.spectra.mean(axis=0)

    @property
    def correlation(self) -> np.ndarray:
        """Correlation coefficient of the two components of each pair. [-]"""
        return np.atleast_1d(component_correlation(self.acceleration))

    def check(self, band: tuple | None = None) -> PairCheck:
        """Tolerance report: per-pair band, suite-mean rule, correlation and baseline.

        Parameters
        ----------
        band : tuple of float, optional
            Per-pair band (low, high) of pair spectrum / target; default
            ``goal x PAIR_BAND``. [-]
        """
        band = tuple(self.goal * b for b in PAIR_BAND) if band is None else tuple(float(b) for b in band)
        ratios = self.spectra / self.target
        flat = self.acceleration.reshape(-1, self.acceleration.shape[-1])
        final_v = np.abs(velocity(flat, self.dt)[:, -1]).reshape(self.count, 2).max(axis=1)
        final_d = np.abs(displacement(flat, self.dt)[:, -1]).reshape(self.count, 2).max(axis=1)
        inside = (self.periods >= self.check_range[0] * (1 - 1e-9)) & (self.periods <= self.check_range[1] * (1 + 1e-9))
        mean_ratio = (self.mean_spectrum / self.target)[inside]
        lowest = int(np.argmin(mean_ratio))
        return PairCheck(
            rule=self.rule,
            spectrum=self.spectrum_name,
            band=band,
            lowest_ratio=tuple(float(v) for v in ratios.min(axis=1)),
            highest_ratio=tuple(float(v) for v in ratios.max(axis=1)),
            within_band=tuple(bool(lo >= band[0] and hi <= band[1]) for lo, hi in zip(ratios.min(axis=1), ratios.max(axis=1))),
            correlation=tuple(float(c) for c in self.correlation),
            baseline_ok=tuple(
                bool(v <= BASELINE_TOLERANCE["velocity"] and d <= BASELINE_TOLERANCE["displacement"])
                for v, d in zip(final_v, final_d)
            ),
            check_range=tuple(float(v) for v in self.check_range),
            required_mean_ratio=PAIR_RULES[self.rule]["required"],
            lowest_mean_ratio=float(mean_ratio[lowest]),
            period_of_lowest_mean=float(self.periods[inside][lowest]),
        )

    def to_dict(self, include_acceleration: bool = False) -> dict:
        """Plain JSON types: settings, seeds, spectra and the tolerance report.

        Parameters
        ----------
        include_acceleration : bool
            Also include the accelerograms [g].
        """
        result = {
            "count": self.count,
            "dt_s": float(self.dt),
            "steps": int(self.acceleration.shape[-1]),
            "base_seed": int(self.base_seed),
            "seeds": [[int(s) for s in pair] for pair in self.seeds],
            "damping": float(self.damping),
            "rule": self.rule,
            "pair_spectrum": self.spectrum_name,
            "goal": float(self.goal),
            "check_range_s": [float(v) for v in self.check_range],
            "scale_factors": [float(f) for f in self.scale_factors],
            "periods_s": self.periods.tolist(),
            "target_g": self.target.tolist(),
            "spectra_g": self.spectra.tolist(),
            "check": self.check().to_dict(),
        }
        if include_acceleration:
            result["acceleration_g"] = self.acceleration.tolist()
        return result


def _pair_check_range(low: float, high: float, isolated_period: Any, rule: str) -> tuple:
    if isolated_period is None:
        return (low, high)
    values = np.atleast_1d(np.asarray(isolated_period, dtype=float))
    lower, upper = PAIR_RULES[rule]["range"]
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
    rule: str = "asce7",
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
        Anything with ``.sa(period, damping)`` [g] (e.g. :class:`isolation.spectra.CodeSpectrum`).
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
    one_of("rule", rule, PAIR_RULES)
    zeta = in_range("damping", damping, 0.01, 0.5)
    length = in_range("duration", duration, 5.0, 600.0, "s")
    step = in_range("dt", dt, 0.001, 0.05, "s")
    limit = _whole("max_iterations", max_iterations, 1, 200)
    points = _whole("control_points", control_points, 10, 400)
    goal = PAIR_RULES[rule]["goal"]
    if period_range is None and isolated_period is not None:
        period_range = _default_band(spectrum, step, length, isolated_period)
    # Stage 1: independent components (the single-record method) at a fraction of the pair goal.
    components = matched_suite(
        _Scaled(spectrum, goal * _START[rule] / (1.15 if rule == "asce7" else 1.08)),
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
    best = pairs.copy()
    best_score = np.full(number, np.inf)
    best_iteration = np.zeros(number, dtype=int)
    goal_reached = math.log1p(_TOLERANCE)
    active = np.arange(number)
    show = sys.stderr.isatty() if progress is None else bool(progress)
    bar = None
    if show:
        from tqdm.auto import tqdm

        bar = tqdm(total=limit, desc="matching pairs", unit="iteration", leave=False)
    try:
        for iteration in range(limit + 1):
            ratio = _pair_spectrum(rule, pairs, step, periods, zeta) / aim
            score = np.abs(np.log(ratio)).max(axis=-1)
            better = score < best_score[active]
            best[active[better]] = pairs[better]
            best_score[active[better]] = score[better]
            best_iteration[active[better]] = iteration
            keep = (best_score[active] > goal_reached) & (iteration - best_iteration[active] < _PATIENCE)
            if iteration == limit or not keep.any():
                break
            pairs, ratio, active = pairs[keep], ratio[keep], active[keep]
            pairs = shaping.correct(pairs, ratio[:, None, :])
            if bar is not None:
                bar.update(1)
    finally:
        if bar is not None:
            bar.close()

    spectra = _pair_spectrum(rule, best, step, periods, zeta)
    inside = (periods >= check_range[0] * (1 - 1e-9)) & (periods <= check_range[1] * (1 + 1e-9))
    factors = _pair_factors(spectra / target, inside, PAIR_RULES[rule]["required"], goal)
    if np.any(factors != 1.0):
        best = best * factors[:, None, None]
        spectra = _pair_spectrum(rule, best, step, periods, zeta)
    for array in (best, periods, target, spectra):
        array.setflags(write=False)
    seeds = tuple((int(components.seeds[2 * i]), int(components.seeds[2 * i + 1])) for i in range(number))
    return MatchedPairs(
        acceleration=best, dt=step, seeds=seeds, periods=periods, target=target, spectra=spectra,
        damping=zeta, rule=rule, goal=goal, check_range=(float(check_range[0]), float(check_range[1])),
        scale_factors=tuple(float(f) for f in factors), base_seed=int(components.base_seed),
    )


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


@dataclass(frozen=True)
class RecordedPair:
    """Two orthogonal horizontal components read from files.

    Attributes
    ----------
    acceleration : numpy.ndarray
        (2, steps): component 0 along x, 1 along y; the shorter record is
        padded with zeros at its end. [g]
    dt : float
        Time step. [s]
    sources : tuple of str
        Where each component was read from.
    """

    acceleration: np.ndarray
    dt: float
    sources: tuple

    @property
    def correlation(self) -> float:
        """Correlation coefficient of the two components. [-]"""
        return float(component_correlation(self.acceleration))


def read_pair(path: Any, units: str | None = None, *, second: Any = None, columns: tuple = (1, 2), time_column: int = 0) -> RecordedPair:
    """Read a recorded pair: two files (one component each) or one CSV with two acceleration columns.

    Parameters
    ----------
    path : str or Path
        First component's file, or a CSV holding time and both components.
    units : str, optional
        Acceleration unit, "g", "m/s2" or "cm/s2" (required for CSV). [-]
    second : str or Path, optional
        Second component's file; when given, each file is read with
        :func:`isolation.motions.read_accelerogram`.
    columns : tuple of int
        0-based columns of the x and y components in a single CSV. [-]
    time_column : int
        0-based column of time in a single CSV (values in s). [-]

    Returns
    -------
    RecordedPair
    """
    from isolation.motions.records_io import read_accelerogram, read_csv_accelerogram

    if second is not None:
        first, other = read_accelerogram(path, units), read_accelerogram(second, units)
        sources = (str(path), str(second))
    else:
        if units is None:
            raise ValueError(f"units = None is not allowed for the two-column file {path}: give 'g', 'm/s2' or 'cm/s2'")
        if len(tuple(columns)) != 2 or columns[0] == columns[1]:
            raise ValueError(f"columns = {columns!r} is not allowed: must be two different column indices [-]")
        first = read_csv_accelerogram(path, units, time_column=time_column, acceleration_column=int(columns[0]))
        other = read_csv_accelerogram(path, units, time_column=time_column, acceleration_column=int(columns[1]))
        sources = (f"{path} column {columns[0]}", f"{path} column {columns[1]}")
    if not math.isclose(first.dt, other.dt, rel_tol=1e-6):
        raise ValueError(
            f"dt = {other.dt!r} of {sources[1]} is not allowed: both components must share one time step "
            f"({sources[0]} has dt = {first.dt!r}) [s]"
        )
    steps = max(first.acceleration.size, other.acceleration.size)
    pair = np.zeros((2, steps))
    pair[0, : first.acceleration.size] = first.acceleration
    pair[1, : other.acceleration.size] = other.acceleration
    pair.setflags(write=False)
    return RecordedPair(acceleration=pair, dt=float(first.dt), sources=sources)
