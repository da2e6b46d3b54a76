"""Reading accelerograms from plain text and writing matched suites.

Reading
-------
:func:`read_text_accelerogram`: header lines, then acceleration values, one
or several per line (separated by spaces, tabs or commas).  The header is
every line before the first line made only of numbers.  It must state the
time step, as ``dt``, ``time step``, ``delta t`` or ``sampling interval``
followed by an optional ``=`` or ``:`` and the value in seconds (e.g.
``DT= .0050 SEC`` or ``# dt = 0.01``), and may state the number of values as
``count``, ``npts``, ``points``, ``samples`` or ``steps`` (checked when
present).  A time step or count given as argument is used when the header has
none and must agree with it when it has one.

:func:`read_csv_accelerogram`: two columns ``time, acceleration`` (more
columns allowed; choose them by index), optional non-numeric header rows and
``#`` comment lines; time must be uniform (to 1e-6 of the step).

Acceleration units are declared: "g", "m/s2" or "cm/s2" (a ``units = ...``
header line is used when the caller passes ``units=None``).  Values are
converted to g.  Malformed files raise ``ValueError`` naming the file, the
line and the field.

Export format ("isolation accelerogram v1")
------------------------------------------
:func:`write_suite` writes, in ``folder`` (default ``records/motions``):

* ``<name>_01.txt``, ``<name>_02.txt``, ...: one record per file::

      # isolation accelerogram v1
      # units = g
      # dt = 0.005
      # count = 8000
      # record = 1 of 7
      # seed = 2968811710
      0.00000000e+00 1.23456789e-04 ... (5 values per line, in g)

* ``<name>.json``: metadata, :meth:`MatchedSuite.to_dict` (settings, seeds,
  control periods, target and record spectra, tolerance report, intensity
  measures) plus the list of record files and this format's name.

Every file is first written to a temporary file in the same folder and moved
into place with ``os.replace`` after all files were written, so a failure
leaves no half-written file.
"""

from __future__ import annotations

import json
import re
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from isolation.motions.measures import intensity_measures
from isolation.motions.record_lines import (  # noqa: F401 - LIMIT_G, DT_RANGE re-exported
    _SPLIT,
    DT_RANGE,
    LIMIT_G,
    _chosen_step,
    _counted,
    _data_values,
    _decimal_comma,
    _declared_units,
    _header_step_and_count,
    _lines,
    _number,
    _numbers,
    _plausible,
    _refuse_data_like,
    _step_checked,
)
from isolation.motions.spectrum import ACCELERATION_UNITS
from isolation.motions.suite_io import FORMAT_NAME, write_suite  # noqa: F401 - re-exported
from isolation.validate import one_of

__all__ = [
    "Accelerogram",
    "read_accelerogram",
    "read_text_accelerogram",
    "read_csv_accelerogram",
    "read_suite_records",
    "write_suite",
    "FORMAT_NAME",
]



@dataclass(frozen=True)
class Accelerogram:
    """One ground-acceleration record.

    Attributes
    ----------
    acceleration : numpy.ndarray
        Ground acceleration, read-only. [g]
    dt : float
        Time step. [s]
    source : str
        File it came from.
    units : str
        Unit declared for the file ("g", "m/s2" or "cm/s2").
    start_time : float
        Time of the first sample in the file. [s]
    """

    acceleration: np.ndarray
    dt: float
    source: str
    units: str
    start_time: float = 0.0

    @property
    def time(self) -> np.ndarray:
        """Sample times from ``start_time``. [s]"""
        return self.start_time + np.arange(self.acceleration.size) * self.dt

    def measures(self):
        """Intensity measures: PGA [g], PGV [m/s], PGD [m], Arias [m/s], D5-95 [s], CAV [m/s]."""
        return intensity_measures(self.acceleration, self.dt)

    def to_dict(self, include_acceleration: bool = False) -> dict:
        """Plain JSON types; acceleration in g when included."""
        result = {
            "source": self.source,
            "units_declared": self.units,
            "dt_s": self.dt,
            "count": int(self.acceleration.size),
            "start_time_s": self.start_time,
            "measures": self.measures().to_dict(),
        }
        if include_acceleration:
            result["acceleration_g"] = self.acceleration.tolist()
        return result


def _make(values: list, dt: float, path: Path, units: str, start: float = 0.0) -> Accelerogram:
    array = np.asarray(values, dtype=float) * (ACCELERATION_UNITS[units] / ACCELERATION_UNITS["g"])
    array.setflags(write=False)
    return Accelerogram(array, dt, str(path), units, start)


def read_text_accelerogram(path: Any, units: str | None = None, *, dt: float | None = None,
                           count: int | None = None) -> Accelerogram:
    """Read header lines stating the time step (and count), then values.

    Parameters
    ----------
    path : str or Path
        Text file.
    units : str, optional
        Unit of the values: "g", "m/s2" or "cm/s2"; None reads a
        ``units = ...`` header line. [-]
    dt : float, optional
        Time step when the header has none. [s]
    count : int, optional
        Expected number of values when the header has none. [-]

    Returns
    -------
    Accelerogram
        Acceleration converted to g.
    """
    file, lines = _lines(path)
    first_data = next((i for i, line in enumerate(lines) if _numbers(line) is not None), None)
    for number, line in enumerate(lines[:first_data], start=1):
        _refuse_data_like(file, number, line)
    if first_data is None:
        raise ValueError(f"{file}: no line of numeric acceleration values found")
    header = lines[:first_data]
    declared = _declared_units(units, header, file)
    header_step, header_count = _header_step_and_count(file, header)
    step = _chosen_step(file, header, header_step, dt)
    values = _data_values(file, lines, first_data, ACCELERATION_UNITS[declared] / ACCELERATION_UNITS["g"])
    _counted(file, values, header_count, count)
    return _make(values, step, file, declared)


def read_csv_accelerogram(path: Any, units: str, *, time_column: int = 0, acceleration_column: int = 1) -> Accelerogram:
    """Read a CSV of time and acceleration with a uniform time step.

    Parameters
    ----------
    path : str or Path
        CSV file (comma, semicolon, tab or space separated).
    units : str
        Unit of the acceleration column: "g", "m/s2" or "cm/s2". [-]
    time_column : int
        0-based index of the time column (values in s). [-]
    acceleration_column : int
        0-based index of the acceleration column. [-]

    Returns
    -------
    Accelerogram
        Acceleration converted to g, ``dt`` from the time column.
    """
    declared = one_of("units", units, ACCELERATION_UNITS)
    file, lines = _lines(path)
    times: list[float] = []
    values: list[float] = []
    rows: list[int] = []
    needed = max(time_column, acceleration_column) + 1
    factor = ACCELERATION_UNITS[declared] / ACCELERATION_UNITS["g"]
    for number, raw in enumerate(lines, start=1):
        line = raw.strip()
        if not line or line.startswith("#"):
            continue
        fields = [f for f in _SPLIT.split(line) if f]
        if not values and _numbers(line) is None:
            if rows or any(_looks_numeric(f) for f in fields):
                raise ValueError(f"{file}: line {number} = {line[:60]!r} is not allowed: must be numbers "
                                 "(time, acceleration); only header rows of names may come before the data")
            continue  # header row before the data
        _decimal_comma(file, number, line)
        if len(fields) < needed:
            raise ValueError(f"{file}: line {number} has {len(fields)} field(s): must have at least {needed}")
        for column, name in ((time_column, "time"), (acceleration_column, "acceleration")):
            try:
                value = _number(fields[column])
            except ValueError:
                raise ValueError(f"{file}: line {number}, {name} = {fields[column]!r} is not allowed: "
                                 "must be a number") from None
            if not np.isfinite(value):
                raise ValueError(f"{file}: line {number}, {name} = {fields[column]!r} is not allowed: must be finite")
            if name == "acceleration":
                _plausible(file, number, name, value, factor)
            (times if name == "time" else values).append(value)
        rows.append(number)
    if len(values) < 2:
        raise ValueError(f"{file}: {len(values)} data row(s) is not allowed: a record needs at least 2")
    time = np.asarray(times)
    step = time[1] - time[0]
    if step <= 0:
        raise ValueError(f"{file}: line {rows[1]}, time = {times[1]!r} is not allowed: time must increase")
    gaps = np.diff(time)
    bad = np.flatnonzero(np.abs(gaps - step) > 1e-6 * step)
    if bad.size:
        row = bad[0] + 1
        raise ValueError(
            f"{file}: line {rows[row]}, time = {times[row]!r} is not allowed: time step must be uniform "
            f"({gaps[bad[0]]:g} s here, {step:g} s at the start)"
        )
    mean_step = _step_checked(file, f"lines {rows[0]}-{rows[-1]}", float(gaps.mean()))
    return _make(values, mean_step, file, declared, float(time[0]))


def _looks_numeric(field: str) -> bool:
    """A field that starts like a number: a data row the reader could not read, not a header."""
    return bool(re.match(r"^[-+]?\.?\d", field))


def read_accelerogram(path: Any, units: str | None = None, *, layout: str = "auto", **options: Any) -> Accelerogram:
    """Read an accelerogram, choosing the reader by ``layout``.

    Parameters
    ----------
    path : str or Path
        The file.
    units : str, optional
        "g", "m/s2" or "cm/s2" (required for CSV). [-]
    layout : str
        "text", "csv" or "auto" (".csv" files as CSV, others as text).
    **options
        Passed to :func:`read_text_accelerogram` or :func:`read_csv_accelerogram`.
    """
    one_of("layout", layout, ("auto", "text", "csv"))
    if layout == "csv" or (layout == "auto" and Path(path).suffix.lower() == ".csv"):
        if units is None:
            raise ValueError("units = None is not allowed for CSV: must be one of 'g', 'm/s2', 'cm/s2'")
        return read_csv_accelerogram(path, units, **options)
    return read_text_accelerogram(path, units, **options)



def read_suite_records(metadata_path: Any) -> list[Accelerogram]:
    """Read back the records listed in a suite's JSON metadata file.

    Parameters
    ----------
    metadata_path : str or Path
        The ``<name>.json`` written by :func:`write_suite`.
    """
    file = Path(metadata_path)
    if not file.is_file():
        raise ValueError(f"metadata_path = {str(file)!r} is not allowed: must be an existing file")
    try:
        metadata = json.loads(file.read_text(encoding="utf-8"))
    except json.JSONDecodeError as error:
        raise ValueError(f"{file}: line {error.lineno}: not valid JSON ({error.msg})") from None
    if metadata.get("format") != FORMAT_NAME or not isinstance(metadata.get("files"), list):
        raise ValueError(f"{file}: format = {metadata.get('format')!r} is not allowed: must be {FORMAT_NAME!r} with a "
                         "'files' list")
    return [read_text_accelerogram(file.parent / name) for name in metadata["files"]]
