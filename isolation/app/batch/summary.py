"""The batch summary table: one row per variant and isolation alternative.

Columns (units in the name where there is one):

=========================  ====================================================
``variant``                variant id (its record folder name)
``status``                 ``done``, ``failed`` or ``not run``
*dotted key paths*         the value each override took in this variant
``alternative``            isolation alternative name from the study
``verdict``                the study's verdict for the alternative
``verdict_basis``          ``response histories`` (a record) or
                           ``equivalent linear`` (direct sweep)
``D_M_lower_m``            isolator displacement, lower-bound properties [m]
``D_M_upper_m``            isolator displacement, upper-bound properties [m]
``D_TM_m``                 total displacement with torsion, governing bound [m]
``T_M_lower_s``            effective period, lower bound [s]
``T_M_upper_s``            effective period, upper bound [s]
``beta_M_lower``           effective damping, lower bound [fraction of critical]
``beta_M_upper``           effective damping, upper bound [fraction of critical]
``base_shear_ratio_lower`` isolated / fixed-base elastic base shear, lower
                           bound (see :mod:`isolation.app.batch.rows`) [-]
``base_shear_ratio_upper`` the same, upper bound [-]
``design_shear_ratio``     the study's code design shears V_s / V_fb [-]
``floor_acceleration_ratio`` isolated / fixed-base peak floor acceleration
                           (response histories; empty in a direct sweep) [-]
*loss study*               ``currency``, ``expected_annual_loss`` and
                           ``expected_annual_loss_fixed`` [currency/year],
                           ``expected_loss_mce`` and ``expected_loss_mce_fixed``
                           [currency], ``expected_annual_downtime_days``
                           [day/year], ``net_premium`` [currency],
                           ``payback_years`` [year], ``net_present_value``
                           [currency] (records that ran it; empty otherwise)
``displacement_capacity_m`` smallest bearing displacement capacity [m]
``moat_m``                 clear gap around the building [m]
``error``                  one-line error of a failed variant
``record``                 record folder relative to the batch folder
=========================  ====================================================

A history sweep (``--direct --histories``) adds :data:`HISTORY_COLUMNS`
before ``error``: suite means of the peak isolator displacement per bound
and with torsion [m], of the peak floor acceleration (largest floor) on a
fixed base and per bound [g], the floor-acceleration reduction
``1 - a_isolated / a_fixed`` per bound [-] and the largest isolated storey
drift ratio [-].

Written as ``summary.csv`` (and ``summary.parquet`` when pyarrow can be
imported), atomically: a reader never sees half a table.
"""

from __future__ import annotations

import csv
import io
import math
import sys
from pathlib import Path
from typing import Any, Iterable, Mapping, Sequence

from isolation.files import write_bytes_atomic, write_text_atomic

__all__ = [
    "RESULT_COLUMNS",
    "HISTORY_COLUMNS",
    "COLUMN_UNITS",
    "summary_columns",
    "write_summary",
    "read_summary",
]

RESULT_COLUMNS = (
    "alternative",
    "verdict",
    "verdict_basis",
    "D_M_lower_m",
    "D_M_upper_m",
    "D_TM_m",
    "T_M_lower_s",
    "T_M_upper_s",
    "beta_M_lower",
    "beta_M_upper",
    "base_shear_ratio_lower",
    "base_shear_ratio_upper",
    "design_shear_ratio",
    "floor_acceleration_ratio",
    # loss study (empty when the records did not run it)
    "currency",
    "expected_annual_loss",
    "expected_annual_loss_fixed",
    "expected_loss_mce",
    "expected_loss_mce_fixed",
    "expected_annual_downtime_days",
    "net_premium",
    "payback_years",
    "net_present_value",
    "displacement_capacity_m",
    "moat_m",
)
TAIL_COLUMNS = ("error", "record")
HISTORY_COLUMNS = (
    "history_displacement_lower_m",
    "history_displacement_upper_m",
    "history_displacement_torsion_m",
    "floor_acceleration_fixed_g",
    "floor_acceleration_lower_g",
    "floor_acceleration_upper_g",
    "floor_acceleration_reduction_lower",
    "floor_acceleration_reduction_upper",
    "drift_ratio_isolated",
)

COLUMN_UNITS = {
    "D_M_lower_m": "m",
    "D_M_upper_m": "m",
    "D_TM_m": "m",
    "T_M_lower_s": "s",
    "T_M_upper_s": "s",
    "beta_M_lower": "fraction of critical",
    "beta_M_upper": "fraction of critical",
    "base_shear_ratio_lower": "-",
    "base_shear_ratio_upper": "-",
    "design_shear_ratio": "-",
    "floor_acceleration_ratio": "-",
    "expected_annual_loss": "currency/year",
    "expected_annual_loss_fixed": "currency/year",
    "expected_loss_mce": "currency",
    "expected_loss_mce_fixed": "currency",
    "expected_annual_downtime_days": "day/year",
    "net_premium": "currency",
    "payback_years": "year",
    "net_present_value": "currency",
    "displacement_capacity_m": "m",
    "moat_m": "m",
    "history_displacement_lower_m": "m",
    "history_displacement_upper_m": "m",
    "history_displacement_torsion_m": "m",
    "floor_acceleration_fixed_g": "g",
    "floor_acceleration_lower_g": "g",
    "floor_acceleration_upper_g": "g",
    "floor_acceleration_reduction_lower": "-",
    "floor_acceleration_reduction_upper": "-",
    "drift_ratio_isolated": "-",
}
TEXT_COLUMNS = ("variant", "status", "alternative", "verdict", "verdict_basis", "currency", "error", "record")


def summary_columns(override_keys: Iterable[str], histories: bool = False) -> list[str]:
    """All summary columns in order for a batch varying ``override_keys`` (``histories``: a history sweep's)."""
    return ["variant", "status", *override_keys, *RESULT_COLUMNS, *(HISTORY_COLUMNS if histories else ()),
            *TAIL_COLUMNS]


def _cell(value: Any) -> Any:
    if value is None:
        return ""
    if isinstance(value, float):
        return "" if not math.isfinite(value) else repr(value)
    if isinstance(value, bool):
        return "true" if value else "false"
    return value


def preload_summary_writer() -> None:
    """Import pyarrow's parquet writer in a background thread (when pyarrow is installed).

    :func:`write_summary` needs it once every variant has run; importing it takes about a second,
    which the batch runner spends while it waits for its workers instead of after them. Call it only
    once no process will fork any more (the pool has started its workers): a child forked while
    this thread imports would inherit the import's module lock, held for ever there.
    """
    import importlib.util
    import threading

    if "pyarrow.parquet" in sys.modules or importlib.util.find_spec("pyarrow") is None:
        return

    def load() -> None:
        try:
            import pyarrow.parquet  # noqa: F401
        except Exception:  # noqa: BLE001 - write_summary then reports or skips it itself
            pass

    threading.Thread(target=load, name="summary-writer-import", daemon=True).start()


def write_summary(rows: Sequence[Mapping], out_dir: Path, override_keys: Iterable[str]) -> list[Path]:
    """Write ``summary.csv`` (and ``summary.parquet`` with pyarrow) in ``out_dir``.

    Parameters
    ----------
    rows : list of mapping
        One mapping per variant and alternative, keyed by column name;
        missing columns are left empty; :data:`HISTORY_COLUMNS` are written
        when any row has them.
    out_dir : Path
        The batch folder.
    override_keys : iterable of str
        Dotted key paths varied in the batch (one column each).

    Returns
    -------
    list of Path
        The files written.
    """
    out_dir = Path(out_dir)
    rows = list(rows)
    histories = any(row.get(HISTORY_COLUMNS[0]) is not None for row in rows)
    columns = summary_columns(override_keys, histories)
    buffer = io.StringIO()
    writer = csv.DictWriter(buffer, fieldnames=columns, extrasaction="ignore", lineterminator="\n")
    writer.writeheader()
    for row in rows:
        writer.writerow({name: _cell(row.get(name)) for name in columns})
    written = [out_dir / "summary.csv"]
    write_text_atomic(written[0], buffer.getvalue())
    try:
        import pyarrow
        import pyarrow.parquet as parquet
    except ImportError:
        return written
    target = out_dir / "summary.parquet"
    table = pyarrow.table({name: _parquet_column([row.get(name) for row in rows]) for name in columns})
    sink = pyarrow.BufferOutputStream()
    parquet.write_table(table, sink)
    write_bytes_atomic(target, sink.getvalue().to_pybytes())
    written.append(target)
    return written


def _parquet_column(values: list) -> list:
    """Numbers as floats (NaN and infinity as missing) when every given value is a number, else text."""
    given = [v for v in values if v is not None]
    if given and all(isinstance(v, (int, float)) and not isinstance(v, bool) for v in given):
        return [None if v is None or not math.isfinite(float(v)) else float(v) for v in values]
    if given and all(isinstance(v, bool) for v in given):
        return values
    return [None if v is None else str(v) for v in values]


def _number(text: str) -> Any:
    if text == "":
        return None
    try:
        return float(text)
    except ValueError:
        return text


def read_summary(path: str | Path) -> list[dict]:
    """Read a ``summary.csv``: numbers as floats, empty cells as ``None``.

    Parameters
    ----------
    path : str or Path
        The summary file, or the batch folder holding it.

    Returns
    -------
    list of dict
        One dict per row, keyed by column name.
    """
    path = Path(path)
    if path.is_dir():
        path = path / "summary.csv"
    with path.open(newline="", encoding="utf-8") as handle:
        reader = csv.DictReader(handle)
        return [
            {name: (text if name in TEXT_COLUMNS else _number(text)) for name, text in row.items()}
            for row in reader
        ]
