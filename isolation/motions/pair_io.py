"""Recorded pairs of horizontal components from plain-text or CSV files."""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

import numpy as np

from isolation.motions.pair_spectra import component_correlation
from isolation.motions.records_io import read_accelerogram, read_csv_accelerogram

__all__ = ["RecordedPair", "read_pair"]


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


def read_pair(path: Any, units: str | None = None, *, second: Any = None, columns: tuple = (1, 2),
              time_column: int = 0) -> RecordedPair:
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
