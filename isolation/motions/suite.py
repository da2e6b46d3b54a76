"""Result objects of spectral matching: the suite and its tolerance report.

Tolerances checked (and reported, never assumed):

* per record: the spectrum of every record stays inside a band around the
  target at every control period, by default 0.9 to 1.3 times the target
  (common practice);
* suite mean against the chosen rule over its check range:
  ``"asce7"``: mean of the matched spectra not below 110 % of the target
  (ASCE/SEI 7-22 Ch. 16 matched-suite rule; check range 0.75 T_M at
  upper-bound properties to 1.25 T_M at lower-bound properties,
  ASCE/SEI 7-16/7-22 Ch. 17, from memory);
  ``"eurocode"``: mean not below 90 % of the target (EN 1998-1 §3.2.3.1.2;
  range 0.2 T1 to 2 T1);
* baseline: final ground velocity and displacement (integrated from rest,
  exact for piecewise-linear acceleration) within :data:`BASELINE_TOLERANCE`.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from isolation.codes import registry as _codes
from isolation.motions.measures import displacement, intensity_measures, velocity

__all__ = ["MatchedSuite", "SuiteCheck", "RecordCheck", "BASELINE_TOLERANCE", "RECORD_BAND", "MEAN_RULES"]

#: Allowed |final velocity| [m/s] and |final displacement| [m] of every record.
BASELINE_TOLERANCE = {"velocity": 1.0e-4, "displacement": 1.0e-4}

#: Per-record band, ratio of record spectrum to target (common practice).
RECORD_BAND = (0.9, 1.3)

#: Required minimum ratio of the suite-mean spectrum to the target, per rule (the code basis's
#: :attr:`isolation.codes.basis.SuiteRules.mean_ratio`).
MEAN_RULES = _codes.PerBasis(lambda basis: basis.suite.mean_ratio)


@dataclass(frozen=True)
class RecordCheck:
    """Tolerance check of one record.

    Attributes
    ----------
    index : int
        Position of the record in the suite (0-based). [-]
    seed : int
        Seed of the record's random phases. [-]
    lowest_ratio, highest_ratio : float
        Extreme ratios of record spectrum to target over the control periods. [-]
    worst_misfit : float
        Largest |record / (goal x target) - 1| over the control periods. [-]
    final_velocity : float
        Ground velocity at the last sample. [m/s]
    final_displacement : float
        Ground displacement at the last sample. [m]
    within_band, baseline_ok : bool
        Whether the band and the baseline tolerance hold.
    """

    index: int
    seed: int
    lowest_ratio: float
    highest_ratio: float
    worst_misfit: float
    final_velocity: float
    final_displacement: float
    within_band: bool
    baseline_ok: bool

    @property
    def passed(self) -> bool:
        return self.within_band and self.baseline_ok

    def to_dict(self) -> dict:
        return {
            "index": self.index,
            "seed": self.seed,
            "lowest_ratio": self.lowest_ratio,
            "highest_ratio": self.highest_ratio,
            "worst_misfit": self.worst_misfit,
            "final_velocity_m_per_s": self.final_velocity,
            "final_displacement_m": self.final_displacement,
            "within_band": self.within_band,
            "baseline_ok": self.baseline_ok,
            "passed": self.passed,
        }


@dataclass(frozen=True)
class SuiteCheck:
    """Tolerance report of a matched suite.

    Attributes
    ----------
    records : tuple of RecordCheck
        One check per record.
    band : tuple of float
        Per-record band (low, high) as ratios to the target. [-]
    rule : str
        Suite-mean rule, "asce7" or "eurocode".
    check_range : tuple of float
        Period range of the suite-mean check. [s]
    required_mean_ratio : float
        Minimum ratio of suite mean to target the rule asks for. [-]
    lowest_mean_ratio : float
        Lowest ratio of suite mean to target inside the check range. [-]
    period_of_lowest_mean : float
        Control period where that lowest ratio occurs. [s]
    """

    records: tuple
    band: tuple
    rule: str
    check_range: tuple
    required_mean_ratio: float
    lowest_mean_ratio: float
    period_of_lowest_mean: float

    @property
    def mean_ok(self) -> bool:
        return self.lowest_mean_ratio >= self.required_mean_ratio

    @property
    def passed(self) -> bool:
        return self.mean_ok and all(record.passed for record in self.records)

    def table(self) -> list[dict]:
        """One plain row per record, for notebook tables and CSV."""
        return [record.to_dict() for record in self.records]

    def text(self) -> str:
        """Short plain-text report: one line per record and one for the suite mean."""
        lines = [
            f"record  seed        min ratio  max ratio  band {self.band[0]:.2f}-{self.band[1]:.2f}  baseline"
        ]
        for record in self.records:
            lines.append(
                f"{record.index + 1:>6}  {record.seed:<10}  {record.lowest_ratio:9.3f}  "
                f"{record.highest_ratio:9.3f}  {'ok' if record.within_band else 'OUT':<14}  "
                f"{'ok' if record.baseline_ok else 'DRIFT'}"
            )
        lines.append(
            f"suite mean ({self.rule}) over {self.check_range[0]:.3g}-{self.check_range[1]:.3g} s: "
            f"lowest {self.lowest_mean_ratio:.3f} at {self.period_of_lowest_mean:.3g} s, "
            f"required >= {self.required_mean_ratio:.2f}: {'ok' if self.mean_ok else 'NOT MET'}"
        )
        return "\n".join(lines)

    def to_dict(self) -> dict:
        return {
            "records": self.table(),
            "band": list(self.band),
            "rule": self.rule,
            "check_range_s": list(self.check_range),
            "required_mean_ratio": self.required_mean_ratio,
            "lowest_mean_ratio": self.lowest_mean_ratio,
            "period_of_lowest_mean_s": self.period_of_lowest_mean,
            "mean_ok": self.mean_ok,
            "passed": self.passed,
        }


@dataclass(frozen=True)
class MatchedSuite:
    """A suite of synthetic accelerograms matched to a target spectrum.

    Attributes
    ----------
    acceleration : numpy.ndarray
        Ground acceleration, shape (count, steps), read-only. [g]
    dt : float
        Time step. [s]
    seeds : tuple of int
        Seed of each record's random phases (``numpy.random.default_rng``). [-]
    periods : numpy.ndarray
        Control periods of the matching. [s]
    target : numpy.ndarray
        Target spectral acceleration at the control periods and ``damping``. [g]
    spectra : numpy.ndarray
        Pseudo-spectral acceleration of every record, (count, periods). [g]
    damping : float
        Damping ratio of the matching. [-]
    rule : str
        Suite-mean rule: "asce7" or "eurocode".
    goal : float
        Records were matched to ``goal x target``. [-]
    check_range : tuple of float
        Period range of the suite-mean check. [s]
    significant_duration : float
        Intended D5-95 of the intensity envelope. [s]
    magnitude : float or None
        Magnitude used to set the significant duration, if any. [-]
    iterations : tuple of int
        Iteration at which each record's kept (best) iterate was reached. [-]
    scale_factors : tuple of float
        Amplitude factor applied to each record after matching, to bring it
        into the per-record band or to meet the mean rule (1.0 when none was
        needed). [-]
    base_seed : int
        The ``seed`` argument the record seeds were derived from. [-]
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
    significant_duration: float
    magnitude: float | None
    iterations: tuple
    scale_factors: tuple
    base_seed: int

    @property
    def count(self) -> int:
        """Number of records. [-]"""
        return int(self.acceleration.shape[0])

    @property
    def time(self) -> np.ndarray:
        """Sample times, starting at 0. [s]"""
        return np.arange(self.acceleration.shape[1]) * self.dt

    @property
    def duration(self) -> float:
        """Record length, steps x dt. [s]"""
        return float(self.acceleration.shape[1] * self.dt)

    @property
    def mean_spectrum(self) -> np.ndarray:
        """Suite-mean pseudo-spectral acceleration at the control periods. [g]"""
        return self.spectra.mean(axis=0)

    @property
    def ratios(self) -> np.ndarray:
        """Record spectra divided by the target, (count, periods). [-]"""
        return self.spectra / self.target

    @property
    def worst_misfit(self) -> float:
        """Largest |record / (goal x target) - 1| over records and control periods. [-]"""
        return float(np.abs(self.ratios / self.goal - 1.0).max())

    def velocity(self) -> np.ndarray:
        """Ground velocity of every record from rest. [m/s]"""
        return velocity(self.acceleration, self.dt)

    def displacement(self) -> np.ndarray:
        """Ground displacement of every record from rest. [m]"""
        return displacement(self.acceleration, self.dt)

    def check(self, band: tuple = RECORD_BAND) -> SuiteCheck:
        """Tolerance report: per-record band, suite-mean rule and baseline.

        Parameters
        ----------
        band : tuple of float
            Per-record band (low, high) as ratios to the target. [-]
        """
        ratios = self.ratios
        final_velocity = self.velocity()[:, -1]
        final_displacement = self.displacement()[:, -1]
        records = []
        for index in range(self.count):
            row = ratios[index]
            records.append(
                RecordCheck(
                    index=index,
                    seed=int(self.seeds[index]),
                    lowest_ratio=float(row.min()),
                    highest_ratio=float(row.max()),
                    worst_misfit=float(np.abs(row / self.goal - 1.0).max()),
                    final_velocity=float(final_velocity[index]),
                    final_displacement=float(final_displacement[index]),
                    within_band=bool(row.min() >= band[0] and row.max() <= band[1]),
                    baseline_ok=bool(
                        abs(final_velocity[index]) <= BASELINE_TOLERANCE["velocity"]
                        and abs(final_displacement[index]) <= BASELINE_TOLERANCE["displacement"]
                    ),
                )
            )
        inside = (self.periods >= self.check_range[0] * (1 - 1e-9)) & (
            self.periods <= self.check_range[1] * (1 + 1e-9)
        )
        mean_ratio = (self.mean_spectrum / self.target)[inside]
        lowest = int(np.argmin(mean_ratio))
        return SuiteCheck(
            records=tuple(records),
            band=(float(band[0]), float(band[1])),
            rule=self.rule,
            check_range=tuple(float(v) for v in self.check_range),
            required_mean_ratio=_codes.get(self.rule, "rule").suite.mean_ratio,
            lowest_mean_ratio=float(mean_ratio[lowest]),
            period_of_lowest_mean=float(self.periods[inside][lowest]),
        )

    def measures(self) -> list:
        """Intensity measures of every record (PGA [g], PGV [m/s], PGD [m], Arias [m/s], D5-95 [s], CAV [m/s])."""
        out = intensity_measures(self.acceleration, self.dt)
        return out if isinstance(out, list) else [out]

    def to_dict(self, include_acceleration: bool = False) -> dict:
        """Plain JSON types: settings, seeds, spectra, tolerance report and measures.

        Parameters
        ----------
        include_acceleration : bool
            Also include the accelerograms (count x steps numbers) [g].
        """
        result = {
            "count": self.count,
            "dt_s": float(self.dt),
            "steps": int(self.acceleration.shape[1]),
            "duration_s": self.duration,
            "base_seed": int(self.base_seed),
            "seeds": [int(s) for s in self.seeds],
            "damping": float(self.damping),
            "rule": self.rule,
            "goal": float(self.goal),
            "check_range_s": [float(v) for v in self.check_range],
            "significant_duration_s": float(self.significant_duration),
            "magnitude": None if self.magnitude is None else float(self.magnitude),
            "iterations": [int(i) for i in self.iterations],
            "scale_factors": [float(f) for f in self.scale_factors],
            "periods_s": self.periods.tolist(),
            "target_g": self.target.tolist(),
            "spectra_g": self.spectra.tolist(),
            "mean_spectrum_g": self.mean_spectrum.tolist(),
            "check": self.check().to_dict(),
            "measures": [m.to_dict() for m in self.measures()],
        }
        if include_acceleration:
            result["acceleration_g"] = self.acceleration.tolist()
        return result
