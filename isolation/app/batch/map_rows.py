"""The rows of a sweep summary as the maps read them: completed rows, verdict order, numbers.

Shared by :mod:`isolation.app.batch.maps` (which re-exports :data:`VERDICT_ORDER`,
:func:`completed_rows`, :func:`verdict_rank` and :func:`variant_text`) and
:mod:`isolation.app.batch.history_maps`.
"""

from __future__ import annotations

import math
from typing import Iterable

__all__ = ["VERDICT_ORDER", "completed_rows", "verdict_rank", "variant_text"]

VERDICT_ORDER = ("feasible", "feasible with conditions", "not recommended")


def _number(value) -> float | None:
    if isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value):
        return float(value)
    return None


def completed_rows(rows: Iterable[dict]) -> list[dict]:
    """Rows of variants that ran to the end, with a displacement and a shear ratio."""
    keep = []
    for row in rows:
        if row.get("status") != "done":
            continue
        if _number(row.get("D_M_lower_m")) is None or _number(row.get("base_shear_ratio_upper")) is None:
            continue
        keep.append(row)
    return keep


def verdict_rank(verdict) -> int:
    """0 feasible, 1 with conditions, 2 not recommended, 3 anything else."""
    return VERDICT_ORDER.index(verdict) if verdict in VERDICT_ORDER else len(VERDICT_ORDER)


def variant_text(row: dict, total: int) -> str:
    """Which variants a ranked row stands for: its ``variants`` (a row that stands for every variant with
    the same numbers), "all N variants (not varied)" when they are all ``total`` of them."""
    names = row.get("variants") or [row.get("variant")]
    if len(names) <= 1:
        return str(names[0])
    if len(names) >= total:
        return f"all {total} variants (not varied)"
    return ", ".join(str(n) for n in names)


def _sort_key(value):
    return (0, value, "") if isinstance(value, (int, float)) else (1, 0.0, str(value))
