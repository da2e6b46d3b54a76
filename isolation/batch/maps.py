"""Design-space maps from a batch summary: tables and matplotlib figures.

Used by ``workbooks/design_space.ipynb``; plain functions over the rows of
``summary.csv`` (see :func:`isolation.batch.summary.read_summary`).

* base-shear reduction ``1 - V_isolated / V_fixed`` and isolator displacement
  are read per bound: the lower-bound properties give the largest
  displacement, the upper-bound properties the largest forces;
* :func:`best_alternatives` keeps variants not dominated in (smaller lower-
  bound displacement, larger upper-bound base-shear reduction), best verdict
  first.

Scope: a screening view for a feasibility study; the listed alternatives are
candidates for a full study, checked by a licensed structural engineer
against the local code.
"""

from __future__ import annotations

import math
from typing import Iterable

from isolation.batch.summary import RESULT_COLUMNS, TAIL_COLUMNS

__all__ = [
    "VERDICT_ORDER",
    "VERDICT_COLOURS",
    "completed_rows",
    "reduction",
    "pareto_front",
    "best_alternatives",
    "grid_keys",
    "varies",
    "plot_displacement_vs_reduction",
    "plot_verdict_map",
]

VERDICT_ORDER = ("feasible", "feasible with conditions", "not recommended")
VERDICT_COLOURS = {
    "feasible": "#2a9d5c",
    "feasible with conditions": "#e0a526",
    "not recommended": "#c8423b",
}
OTHER_COLOUR = "#8c8c8c"
MARKERS = ("o", "s", "^", "D", "v", "P")
RESULT_KEYS = {"variant", "status", *RESULT_COLUMNS, *TAIL_COLUMNS}


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


def reduction(row: dict, bound: str = "upper") -> float | None:
    """Base-shear reduction ``1 - V_isolated/V_fixed`` for one bound. [-]"""
    ratio = _number(row.get(f"base_shear_ratio_{bound}"))
    return None if ratio is None else 1.0 - ratio


def verdict_rank(verdict) -> int:
    """0 feasible, 1 with conditions, 2 not recommended, 3 anything else."""
    return VERDICT_ORDER.index(verdict) if verdict in VERDICT_ORDER else len(VERDICT_ORDER)


def pareto_front(rows: Iterable[dict]) -> list[dict]:
    """Rows not dominated in (smaller ``D_M_lower_m``, larger upper-bound reduction).

    A row is dominated when another row has a displacement no larger and a
    reduction no smaller, one of them strictly.
    """
    rows = completed_rows(rows)
    front = []
    for row in rows:
        d, r = row["D_M_lower_m"], reduction(row)
        dominated = any(
            (o["D_M_lower_m"] <= d and reduction(o) >= r) and (o["D_M_lower_m"] < d or reduction(o) > r)
            for o in rows
        )
        if not dominated:
            front.append(row)
    return front


def best_alternatives(rows: Iterable[dict], top: int = 5) -> list[dict]:
    """The best variants: verdict first, then not dominated, then largest reduction.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows.
    top : int
        How many to return. [-]

    Returns
    -------
    list of dict
        Rows of variants not judged "not recommended", ordered by verdict
        (feasible first), whether they lie on the Pareto front, the upper-
        bound base-shear reduction (largest first) and the lower-bound
        displacement (smallest first). Rows with the same alternative and the
        same numbers appear once, ``same_in`` counting the variants.
    """
    rows = [r for r in completed_rows(rows) if r.get("verdict") != "not recommended"]
    rows = _distinct(rows)
    front = {id(r) for r in pareto_front(rows)}
    ordered = sorted(
        rows,
        key=lambda r: (verdict_rank(r.get("verdict")), id(r) not in front, -reduction(r), r["D_M_lower_m"]),
    )
    return ordered[: max(int(top), 0)]


def _distinct(rows: list[dict]) -> list[dict]:
    """One row per alternative and result: an alternative the varied keys do not touch
    gives the same numbers in every variant; keep its first row, with ``same_in`` the
    number of variants sharing it."""
    kept: dict[tuple, dict] = {}
    for row in rows:
        key = (row.get("alternative"), row.get("verdict"),
               *(round(float(row[c]), 9) if _number(row.get(c)) is not None else None
                 for c in ("D_M_lower_m", "D_M_upper_m", "base_shear_ratio_lower", "base_shear_ratio_upper")))
        if key in kept:
            kept[key]["same_in"] += 1
        else:
            kept[key] = dict(row, same_in=1)
    return list(kept.values())


def varies(rows: Iterable[dict], alternative) -> bool:
    """True when the completed rows of ``alternative`` do not all give the same numbers."""
    return len(_distinct([r for r in completed_rows(rows) if r.get("alternative") == alternative])) > 1


def grid_keys(rows: Iterable[dict]) -> list[str]:
    """Override columns (dotted key paths) that take more than one value."""
    rows = list(rows)
    if not rows:
        return []
    keys = [k for k in rows[0] if k not in RESULT_KEYS]
    return [k for k in keys if len({repr(r.get(k)) for r in rows}) > 1]


def plot_displacement_vs_reduction(rows: Iterable[dict], ax=None):
    """Isolator displacement vs base-shear reduction, both bounds, coloured by verdict.

    Each variant is a segment from its upper-bound point (open marker: the
    force-governing case) to its lower-bound point (filled marker: the
    displacement-governing case); the marker shape tells the alternatives
    apart. Returns the matplotlib Axes.
    """
    import matplotlib.pyplot as plt
    from matplotlib.lines import Line2D

    rows = completed_rows(rows)
    if ax is None:
        _, ax = plt.subplots(figsize=(7.0, 4.8))
    names = list(dict.fromkeys(r.get("alternative") for r in rows))
    shapes = {name: MARKERS[i % len(MARKERS)] for i, name in enumerate(names)}
    for row in rows:
        colour = VERDICT_COLOURS.get(row.get("verdict"), OTHER_COLOUR)
        marker = shapes[row.get("alternative")]
        lower = (row["D_M_lower_m"], reduction(row, "lower"))
        upper = (_number(row.get("D_M_upper_m")), reduction(row, "upper"))
        if None not in upper and None not in lower:
            ax.plot([upper[0], lower[0]], [upper[1], lower[1]], color=colour, lw=1.0, alpha=0.7)
        if None not in upper:
            ax.plot(*upper, marker=marker, mfc="white", mec=colour, ls="none")
        if None not in lower:
            ax.plot(*lower, marker=marker, color=colour, ls="none")
    ax.set_xlabel("isolator displacement D_M [m]")
    ax.set_ylabel("base-shear reduction 1 - V_iso/V_fixed [-]")
    ax.set_title("Design space: filled = lower bound, open = upper bound")
    ax.grid(True, alpha=0.3)
    handles = [Line2D([], [], color=VERDICT_COLOURS[v], marker="o", ls="none", label=v)
               for v in VERDICT_ORDER if any(r.get("verdict") == v for r in rows)]
    if len(names) > 1:
        handles += [Line2D([], [], color="black", marker=shapes[n], ls="none", label=str(n)) for n in names]
    if handles:
        ax.legend(handles=handles, loc="best", fontsize="small")
    return ax


def plot_verdict_map(rows: Iterable[dict], x_key: str, y_key: str, alternative: str | None = None, ax=None):
    """Grid map over two varied keys: cells shaded by verdict, labelled with D_M and reduction.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows.
    x_key, y_key : str
        Override columns for the axes (dotted key paths).
    alternative : str, optional
        Alternative to map (default: the first one found).
    ax : matplotlib Axes, optional

    Returns
    -------
    matplotlib Axes
    """
    import matplotlib.pyplot as plt
    from matplotlib.patches import Patch, Rectangle

    rows = [r for r in rows if r.get("status") == "done"]
    alternative = alternative or (rows[0].get("alternative") if rows else None)
    rows = [r for r in rows if r.get("alternative") == alternative]
    xs = sorted({r[x_key] for r in rows}, key=_sort_key)
    ys = sorted({r[y_key] for r in rows}, key=_sort_key)
    if ax is None:
        _, ax = plt.subplots(figsize=(7.0, 4.8))
    for row in rows:
        i, j = xs.index(row[x_key]), ys.index(row[y_key])
        colour = VERDICT_COLOURS.get(row.get("verdict"), OTHER_COLOUR)
        ax.add_patch(Rectangle((i - 0.5, j - 0.5), 1, 1, color=colour, alpha=0.55, lw=0))
        share = reduction(row)
        text = f"D {row['D_M_lower_m']:.2f} m" if _number(row.get("D_M_lower_m")) is not None else ""
        if share is not None:
            text += f"\nV -{share:.0%}"
        ax.text(i, j, text, ha="center", va="center", fontsize="small")
    ax.set_xlim(-0.5, len(xs) - 0.5)
    ax.set_ylim(-0.5, len(ys) - 0.5)
    ax.set_xticks(range(len(xs)), [f"{x:g}" if isinstance(x, float) else str(x) for x in xs])
    ax.set_yticks(range(len(ys)), [f"{y:g}" if isinstance(y, float) else str(y) for y in ys])
    ax.set_xlabel(x_key)
    ax.set_ylabel(y_key)
    ax.set_title(f"{alternative}: verdict by variant (D = D_M lower bound, V = base-shear reduction)")
    present = [v for v in VERDICT_ORDER if any(r.get("verdict") == v for r in rows)]
    ax.legend(handles=[Patch(color=VERDICT_COLOURS[v], alpha=0.55, label=v) for v in present],
              loc="upper left", bbox_to_anchor=(1.01, 1.0), fontsize="small")
    return ax


def _sort_key(value):
    return (0, value, "") if isinstance(value, (int, float)) else (1, 0.0, str(value))
