"""Intensity measures of accelerograms.

Input acceleration is in g (the package unit for spectral and ground
acceleration), sampled every ``dt`` seconds, one record (steps,) or a stack
(records, steps).  Outputs are in SI:

=====================================  ===========  ==========================
measure                                unit         definition
=====================================  ===========  ==========================
peak ground acceleration (PGA)         g            max |a|
peak ground velocity (PGV)             m/s          max |v|, v = int a dt
peak ground displacement (PGD)         m            max |d|, d = int v dt
Arias intensity                        m/s          pi / (2 g) int a^2 dt
Husid curve                            -            cumulative int a^2 / total
significant duration D5-95             s            time from 5 % to 95 % Arias
cumulative absolute velocity (CAV)     m/s          int |a| dt
=====================================  ===========  ==========================

Velocity and displacement start from rest and are integrated exactly for
acceleration varying linearly between samples (trapezoid for velocity,
``d[n+1] = d[n] + v[n] dt + (2 a[n] + a[n+1]) dt^2 / 6`` for displacement).
No baseline correction is applied here.

References
----------
Arias, A. (1970). A measure of earthquake intensity. In: Seismic Design for
Nuclear Power Plants, MIT Press, 438-483.
Husid, R. (1969). Analisis de terremotos: analisis general. Revista del IDIEM 8.
Trifunac, M. D. & Brady, A. G. (1975). A study on the duration of strong
earthquake ground motion. Bull. Seismol. Soc. Am. 65(3), 581-626.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation import GRAVITY
from isolation.validate import finite_array, in_range, positive

__all__ = [
    "velocity",
    "displacement",
    "peak_ground_acceleration",
    "peak_ground_velocity",
    "peak_ground_displacement",
    "arias_intensity",
    "husid",
    "significant_duration",
    "cumulative_absolute_velocity",
    "IntensityMeasures",
    "intensity_measures",
]


def _record(acceleration: Any, dt: Any) -> tuple[np.ndarray, float]:
    record = finite_array("acceleration", acceleration, "g")
    if record.ndim not in (1, 2) or record.shape[-1] < 2:
        raise ValueError(
            f"acceleration with shape {record.shape} is not allowed: "
            "must be (steps,) or (records, steps) with at least 2 steps [g]"
        )
    return record, positive("dt", dt, "s")


def velocity(acceleration: Any, dt: float) -> np.ndarray:
    """Ground velocity from rest, exact for piecewise-linear acceleration.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration, (steps,) or (records, steps). [g]
    dt : float
        Time step. [s]

    Returns
    -------
    numpy.ndarray
        Velocity at every sample, same shape. [m/s]
    """
    record, step = _record(acceleration, dt)
    metres = record * GRAVITY
    result = np.zeros_like(metres)
    np.cumsum(0.5 * step * (metres[..., 1:] + metres[..., :-1]), axis=-1, out=result[..., 1:])
    return result


def displacement(acceleration: Any, dt: float) -> np.ndarray:
    """Ground displacement from rest, exact for piecewise-linear acceleration.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration, (steps,) or (records, steps). [g]
    dt : float
        Time step. [s]

    Returns
    -------
    numpy.ndarray
        Displacement at every sample, same shape. [m]
    """
    record, step = _record(acceleration, dt)
    speed = velocity(record, step)
    metres = record * GRAVITY
    increments = speed[..., :-1] * step + (2.0 * metres[..., :-1] + metres[..., 1:]) * step**2 / 6.0
    result = np.zeros_like(metres)
    np.cumsum(increments, axis=-1, out=result[..., 1:])
    return result


def peak_ground_acceleration(acceleration: Any) -> np.ndarray | float:
    """PGA = max |a|.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration, (steps,) or (records, steps). [g]

    Returns
    -------
    float or numpy.ndarray
        Peak ground acceleration per record. [g]
    """
    record = finite_array("acceleration", acceleration, "g")
    return _scalar(np.abs(record).max(axis=-1))


def peak_ground_velocity(acceleration: Any, dt: float) -> np.ndarray | float:
    """PGV = max |v| of the velocity integrated from rest.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration. [g]
    dt : float
        Time step. [s]

    Returns
    -------
    float or numpy.ndarray
        Peak ground velocity per record. [m/s]
    """
    return _scalar(np.abs(velocity(acceleration, dt)).max(axis=-1))


def peak_ground_displacement(acceleration: Any, dt: float) -> np.ndarray | float:
    """PGD = max |d| of the displacement integrated from rest.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration. [g]
    dt : float
        Time step. [s]

    Returns
    -------
    float or numpy.ndarray
        Peak ground displacement per record. [m]
    """
    return _scalar(np.abs(displacement(acceleration, dt)).max(axis=-1))


def _cumulative_energy(record: np.ndarray, step: float) -> np.ndarray:
    """Running integral of a^2 dt (trapezoid), in (m/s2)^2 s."""
    squared = (record * GRAVITY) ** 2
    result = np.zeros_like(squared)
    np.cumsum(0.5 * step * (squared[..., 1:] + squared[..., :-1]), axis=-1, out=result[..., 1:])
    return result


def arias_intensity(acceleration: Any, dt: float) -> np.ndarray | float:
    """Arias intensity I_a = pi / (2 g) int a^2 dt.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration. [g]
    dt : float
        Time step. [s]

    Returns
    -------
    float or numpy.ndarray
        Arias intensity per record. [m/s]
    """
    record, step = _record(acceleration, dt)
    return _scalar(np.pi / (2.0 * GRAVITY) * _cumulative_energy(record, step)[..., -1])


def husid(acceleration: Any, dt: float) -> np.ndarray:
    """Husid curve: running Arias intensity divided by its final value.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration. [g]
    dt : float
        Time step. [s]

    Returns
    -------
    numpy.ndarray
        Normalised cumulative energy from 0 to 1 at every sample; all zeros
        for a record of zeros. [-]
    """
    record, step = _record(acceleration, dt)
    energy = _cumulative_energy(record, step)
    total = energy[..., -1:]
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(total > 0.0, energy / np.where(total > 0.0, total, 1.0), 0.0)


def significant_duration(
    acceleration: Any, dt: float, low: float = 0.05, high: float = 0.95
) -> np.ndarray | float:
    """Significant duration: time between ``low`` and ``high`` fractions of the Arias intensity.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration. [g]
    dt : float
        Time step. [s]
    low : float
        Lower fraction of the Arias intensity, 0 <= low < high. [-]
    high : float
        Upper fraction, low < high <= 1. [-]

    Returns
    -------
    float or numpy.ndarray
        D5-95 (by default) per record, by linear interpolation of the Husid
        curve; 0 for a record of zeros. [s]
    """
    lower = in_range("low", low, 0.0, 1.0, high_inclusive=False)
    upper = in_range("high", high, 0.0, 1.0, low_inclusive=False)
    if upper <= lower:
        raise ValueError(f"high = {high!r} is not allowed: must be > low = {lower:g}")
    curve = np.atleast_2d(husid(acceleration, dt))
    step = float(dt)
    time = np.arange(curve.shape[-1]) * step
    durations = np.empty(curve.shape[0])
    for index, row in enumerate(curve):
        if row[-1] <= 0.0:
            durations[index] = 0.0
            continue
        durations[index] = _crossing(row, time, upper) - _crossing(row, time, lower)
    return _scalar(durations if np.ndim(acceleration) == 2 else durations[0])


def _crossing(curve: np.ndarray, time: np.ndarray, level: float) -> float:
    """First time a non-decreasing curve reaches ``level`` (linear interpolation)."""
    index = int(np.searchsorted(curve, level, side="left"))
    if index == 0:
        return float(time[0])
    before, after = curve[index - 1], curve[index]
    share = 0.0 if after == before else (level - before) / (after - before)
    return float(time[index - 1] + share * (time[index] - time[index - 1]))


def cumulative_absolute_velocity(acceleration: Any, dt: float) -> np.ndarray | float:
    """CAV = int |a| dt (trapezoid on |a|).

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration. [g]
    dt : float
        Time step. [s]

    Returns
    -------
    float or numpy.ndarray
        Cumulative absolute velocity per record. [m/s]
    """
    record, step = _record(acceleration, dt)
    magnitude = np.abs(record) * GRAVITY
    return _scalar(0.5 * step * (magnitude[..., 1:] + magnitude[..., :-1]).sum(axis=-1))


def _scalar(values: np.ndarray) -> np.ndarray | float:
    return float(values) if np.ndim(values) == 0 else values


@dataclass(frozen=True)
class IntensityMeasures:
    """Intensity measures of one record.

    Attributes
    ----------
    pga : float
        Peak ground acceleration. [g]
    pgv : float
        Peak ground velocity. [m/s]
    pgd : float
        Peak ground displacement. [m]
    arias : float
        Arias intensity. [m/s]
    significant_duration : float
        D5-95. [s]
    cav : float
        Cumulative absolute velocity. [m/s]
    """

    pga: float
    pgv: float
    pgd: float
    arias: float
    significant_duration: float
    cav: float

    def to_dict(self) -> dict:
        """Plain JSON types with units in the keys."""
        return {
            "pga_g": self.pga,
            "pgv_m_per_s": self.pgv,
            "pgd_m": self.pgd,
            "arias_m_per_s": self.arias,
            "significant_duration_5_95_s": self.significant_duration,
            "cav_m_per_s": self.cav,
        }


def intensity_measures(acceleration: Any, dt: float) -> IntensityMeasures | list[IntensityMeasures]:
    """All intensity measures of one record, or a list for a stack.

    Parameters
    ----------
    acceleration : array_like
        Ground acceleration, (steps,) or (records, steps). [g]
    dt : float
        Time step. [s]

    Returns
    -------
    IntensityMeasures or list of IntensityMeasures
        PGA [g], PGV [m/s], PGD [m], Arias [m/s], D5-95 [s], CAV [m/s].
    """
    record, step = _record(acceleration, dt)
    stack = np.atleast_2d(record)
    columns = [
        np.atleast_1d(peak_ground_acceleration(stack)),
        np.atleast_1d(peak_ground_velocity(stack, step)),
        np.atleast_1d(peak_ground_displacement(stack, step)),
        np.atleast_1d(arias_intensity(stack, step)),
        np.atleast_1d(significant_duration(stack, step)),
        np.atleast_1d(cumulative_absolute_velocity(stack, step)),
    ]
    measures = [IntensityMeasures(*(float(column[i]) for column in columns)) for i in range(stack.shape[0])]
    return measures[0] if record.ndim == 1 else measures
