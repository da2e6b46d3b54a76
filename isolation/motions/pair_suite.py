"""Result objects of pair matching: :class:`MatchedPairs` and its tolerance report :class:`PairCheck`.

Rules per basis are in :data:`PAIR_RULES` (sources in :mod:`isolation.motions.pairs`).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TypedDict

import numpy as np

from isolation.codes import registry as _codes
from isolation.motions.measures import displacement, velocity
from isolation.motions.pair_spectra import component_correlation
from isolation.motions.suite import BASELINE_TOLERANCE

__all__ = ["MatchedPairs", "PairCheck", "PAIR_RULES", "PAIR_BAND"]


class PairRule(TypedDict):
    """Suite rules for pairs under one basis."""

    spectrum: str  # "RotD100" or "SRSS"
    required: float  # required suite-mean ratio to the target [-]
    goal: float  # matching goal [-]
    range: tuple[float, float]  # check range factors on (T_low, T_high) [-]


#: Per basis: pair spectrum, required suite-mean ratio, matching goal, check range factors on
#: (T_low, T_high) (:attr:`isolation.codes.basis.SuiteRules.pair_rule`).
PAIR_RULES = _codes.PerBasis(lambda basis: basis.suite.pair_rule)

#: Per-pair band as a fraction of the goal (0.9-1.3 of the target at the ASCE 7 goal 1.15; common practice).
PAIR_BAND = (0.9 / 1.15, 1.3 / 1.15)


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
        return _codes.get(self.rule, "rule").suite.pair_spectrum

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
            within_band=tuple(bool(lo >= band[0] and hi <= band[1])
                              for lo, hi in zip(ratios.min(axis=1), ratios.max(axis=1), strict=True)),
            correlation=tuple(float(c) for c in self.correlation),
            baseline_ok=tuple(
                bool(v <= BASELINE_TOLERANCE["velocity"] and d <= BASELINE_TOLERANCE["displacement"])
                for v, d in zip(final_v, final_d, strict=True)
            ),
            check_range=tuple(float(v) for v in self.check_range),
            required_mean_ratio=_codes.get(self.rule, "rule").suite.pair_ratio,
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
