"""Lines and values of plain-text accelerogram files: the checks every reader shares.

Value tokens (decimal numbers, also with a Fortran ``D`` exponent; no
``nan``, ``inf``, hex or decimal commas), header lines (time step with its
unit, count, units), and the plausibility limits :data:`LIMIT_G` and
:data:`DT_RANGE`.  The readers are in :mod:`isolation.motions.records_io`.
"""

from __future__ import annotations

import math
import re
from pathlib import Path
from typing import Any

from isolation.motions.spectrum import ACCELERATION_UNITS
from isolation.validate import one_of, positive

__all__ = ["LIMIT_G", "DT_RANGE"]

_NUMBER = r"([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)"
_STEP_PATTERN = re.compile(r"\b(?:dt|time[ _-]?step|delta[ _-]?t|sampling[ _-]?interval)\b\s*[=:]?\s*" + _NUMBER
                           + r"(?:[dD]([-+]?\d+))?\s*([A-Za-z\u00b5]+)?", re.I)
_STEP_UNITS = {"s": 1.0, "sec": 1.0, "secs": 1.0, "second": 1.0, "seconds": 1.0,
               "ms": 1e-3, "msec": 1e-3, "millisecond": 1e-3, "milliseconds": 1e-3,
               "us": 1e-6, "\u00b5s": 1e-6, "microsecond": 1e-6, "microseconds": 1e-6}
_OTHER_TIME_UNITS = {"min", "mins", "minute", "minutes", "h", "hr", "hrs", "hour", "hours", "hz", "khz", "ns",
                     "cs", "ds", "ks"}
_FORTRAN = re.compile(r"^([-+]?(?:\d+\.?\d*|\.\d+))[dD]([-+]?\d+)$", re.ASCII)
_DECIMAL_COMMA = re.compile(r"^[-+]?\d+,\d+$", re.ASCII)

LIMIT_G = 10.0
"""Largest |acceleration| accepted on import [g]: recorded ground motions stay well below
(common practice: a plausibility bound, not a physical law)."""

DT_RANGE = (1e-4, 0.1)
"""Time steps accepted on import [s] (common practice: digitised and instrument records
use 0.001-0.05 s)."""
_COUNT_PATTERN = re.compile(r"\b(?:npts|count|points|samples|steps)\b\s*[=:]?\s*(\d+)", re.I)
_UNITS_PATTERN = re.compile(r"\bunits?\b\s*[=:]\s*(\S+)", re.I)
_SPLIT = re.compile(r"[\s,;]+")


def _lines(path: Any) -> tuple[Path, list[str]]:
    file = Path(path)
    if not file.is_file():
        raise ValueError(f"path = {str(file)!r} is not allowed: must be an existing file")
    try:
        return file, file.read_text(encoding="utf-8", errors="strict").splitlines()
    except UnicodeDecodeError as error:
        raise ValueError(f"{file}: not a UTF-8 text file ({error.reason} at byte {error.start})") from None


_DECIMAL = re.compile(r"[-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?", re.ASCII)


def _number(token: str) -> float:
    """A value token: a decimal number, also with a Fortran exponent (``1.0D-02``)."""
    fortran = _FORTRAN.match(token)
    if fortran:
        token = f"{fortran.group(1)}e{fortran.group(2)}"
    elif not _DECIMAL.fullmatch(token):
        raise ValueError(token)  # no 'nan', 'inf', '1_000' or hex
    return float(token)


def _numbers(line: str) -> list[float] | None:
    tokens = [t for t in _SPLIT.split(line.strip()) if t]
    if not tokens:
        return None
    try:
        return [_number(t) for t in tokens]
    except ValueError:
        return None


def _refuse_data_like(file: Path, number: int, line: str) -> None:
    """A header line that is mostly numbers is a data line with a bad value: say which."""
    tokens = [t for t in _SPLIT.split(line.strip()) if t]
    if not tokens or line.lstrip().startswith("#"):
        return
    readable = []
    for token in tokens:
        try:
            _number(token)
            readable.append(True)
        except ValueError:
            readable.append(False)
    looks = (2 * sum(readable) > len(tokens) if len(tokens) > 1
             else re.match(r"^[-+]?\.?\d", tokens[0], re.ASCII) is not None)
    if looks:
        _decimal_comma(file, number, line)
        position = readable.index(False)
        raise ValueError(f"{file}: line {number}, value {position + 1} = {tokens[position]!r} is not allowed: "
                         "must be a number (a data line before the first line of numbers?)")


def _decimal_comma(file: Path, number: int, line: str) -> None:
    """Refuse a line whose values look like decimal commas ("0,0123"): read as separators they
    would become extra values."""
    for token in re.split(r"[\s;]+", line.strip()):
        if _DECIMAL_COMMA.match(token):
            raise ValueError(f"{file}: line {number}, value {token!r} is not allowed: a decimal comma is "
                             "ambiguous; must use a decimal point (0.0123) and separate values by spaces, "
                             "tabs, commas or semicolons")


def _plausible(file: Path, number: int, position: str, value: float, factor: float) -> None:
    if abs(value * factor) > LIMIT_G:
        raise ValueError(f"{file}: line {number}, {position} = {value!r} is not allowed: must be at most "
                         f"{LIMIT_G:g} g in size (a header, date or unit mistake?)")


def _step_checked(file: Path, where: str, step: float) -> float:
    low, high = DT_RANGE
    if not low <= step <= high:
        raise ValueError(f"{file}: {where}: time step = {step:g} s is not allowed: must lie in "
                         f"[{low:g}, {high:g}] s")
    return step


def _declared_units(units: Any, header: list[str], file: Path) -> str:
    if units is None:
        for line in header:
            found = _UNITS_PATTERN.search(line)
            if found:
                return one_of(f"{file}: header units", found.group(1).strip(",;"), ACCELERATION_UNITS)
        raise ValueError(
            f"{file}: units = None is not allowed: declare units as one of 'g', 'm/s2', 'cm/s2' "
            "(argument or a 'units = ...' header line)"
        )
    return one_of("units", units, ACCELERATION_UNITS)


def _header_step_and_count(file: Path, header: list[str]) -> tuple:
    """(line, time step [s]) and (line, count) stated by the header, each None when absent."""
    header_step = header_count = None
    for number, line in enumerate(header, start=1):
        step_match = _STEP_PATTERN.search(line)
        if step_match and header_step is None:
            value = float(step_match.group(1) + (f"e{step_match.group(2)}" if step_match.group(2) else ""))
            unit = (step_match.group(3) or "").lower()
            if unit and unit in _STEP_UNITS:
                value *= _STEP_UNITS[unit]
            elif unit in _OTHER_TIME_UNITS:
                raise ValueError(f"{file}: line {number}: time step unit {step_match.group(3)!r} is not "
                                 "allowed: must be s or ms (or none, read as s)")
            header_step = (number, value)
        count_match = _COUNT_PATTERN.search(line)
        if count_match and header_count is None:
            header_count = (number, int(count_match.group(1)))
    return header_step, header_count


def _chosen_step(file: Path, header: list[str], header_step: tuple | None, dt: float | None) -> float:
    """The time step of the header, or of the argument when the header has none (both must agree). [s]"""
    if header_step is None and dt is None:
        raise ValueError(
            f"{file}: time step missing: none of header lines 1-{len(header)} states it "
            "(allowed: a header line like 'dt = 0.01' [s], or pass dt=)"
        )
    if header_step is None:
        return _step_checked(file, "argument dt", positive("dt", dt, "s"))
    step = positive(f"{file}: line {header_step[0]}: time step", header_step[1], "s")
    step = _step_checked(file, f"line {header_step[0]}", step)
    if dt is not None and abs(positive("dt", dt, "s") - step) > 1e-9 * step:
        raise ValueError(f"dt = {dt!r} is not allowed: header line {header_step[0]} of {file} states dt = {step:g} "
                         "[s]")
    return step


def _data_values(file: Path, lines: list[str], first_data: int, factor: float) -> list[float]:
    """Every value from line ``first_data`` (0-based) on, each checked; ``factor`` converts to g."""
    values: list[float] = []
    for number in range(first_data, len(lines)):
        line = lines[number].strip()
        if not line or line.startswith("#"):
            continue
        _decimal_comma(file, number + 1, line)
        for position, token in enumerate(t for t in _SPLIT.split(line) if t):
            try:
                value = _number(token)
            except ValueError:
                raise ValueError(
                    f"{file}: line {number + 1}, value {position + 1} = {token!r} is not allowed: "
                    "must be a number"
                ) from None
            if not math.isfinite(value):
                raise ValueError(f"{file}: line {number + 1}, value {position + 1} = {token!r} is not allowed: must be "
                                 "finite")
            _plausible(file, number + 1, f"value {position + 1}", value, factor)
            values.append(value)
    return values


def _counted(file: Path, values: list[float], header_count: tuple | None, count: int | None) -> None:
    """Refuse a file whose number of values differs from the header's or the argument's count."""
    expected = header_count[1] if header_count is not None else count
    if expected is not None and len(values) != int(expected):
        where = f"header line {header_count[0]}" if header_count is not None else "argument count"
        raise ValueError(
            f"{file}: count = {int(expected)} ({where}) does not match the file: it holds {len(values)} values"
        )
    if len(values) < 2:
        raise ValueError(f"{file}: {len(values)} value(s) is not allowed: a record needs at least 2")
