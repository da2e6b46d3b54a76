"""Design-space maps from a batch summary: tables and matplotlib figures.

Used by ``workbooks/design_space.ipynb``; plain functions over the rows of
``summary.csv`` (see :func:`isolation.app.batch.summary.read_summary`).

* base-shear reduction ``1 - V_isolated / V_fixed`` and isolator displacement
  are read per bound: the lower-bound properties give the largest
  displacement, the upper-bound properties the largest forces;
* :func:`best_alternatives` keeps variants not dominated in (smaller lower-
  bound displacement, larger upper-bound base-shear reduction), best verdict
  first;
* from a history sweep (``batch --direct --histories``): :func:`plot_history_maps`
  contours the peak isolator displacement and the floor-acceleration
  reduction over two varied keys for both bounds, hatches the variants that
  are not feasible (:func:`feasible`) and stars :func:`best_history_alternatives`.

Scope: a screening view for a feasibility study; the listed alternatives are
candidates for a full study, checked by a licensed structural engineer
against the local code.
"""

from __future__ import annotations

from typing import Iterable

from isolation.app.batch.history_maps import (  # noqa: F401 - public here since the history maps came
    HISTORY_FIELDS,
    best_history_alternatives,
    best_history_table,
    feasible,
    grid_field,
    history_front,
    history_rows,
    plot_history_maps,
)
from isolation.app.batch.key_labels import key_label  # noqa: F401 - public here too
from isolation.app.batch.map_rows import (  # noqa: F401 - variant_text is public here too
    VERDICT_ORDER,
    _number,
    _sort_key,
    completed_rows,
    variant_text,
    verdict_rank,
)
from isolation.app.batch.summary import HISTORY_COLUMNS, RESULT_COLUMNS, TAIL_COLUMNS

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
    "key_label",
    "reduction_text",
    "variant_text",
    "missing_summary_text",
    "HISTORY_FIELDS",
    "history_rows",
    "grid_field",
    "feasible",
    "history_front",
    "best_history_alternatives",
    "plot_history_maps",
    "best_history_table",
]

VERDICT_COLOURS = {
    "feasible": "#2a9d5c",
    "feasible with conditions": "#e0a526",
    "not recommended": "#c8423b",
}
OTHER_COLOUR = "#8c8c8c"
MARKERS = ("o", "s", "^", "D", "v", "P")
VERDICT_MARKERS = {"feasible": "o", "feasible with conditions": "s", "not recommended": "X"}
"""Marker per verdict in the scatter (colour there is the property bound: isolation.output.plots.COLOURS)."""

RESULT_KEYS = {"variant", "status", *RESULT_COLUMNS, *HISTORY_COLUMNS, *TAIL_COLUMNS}


def reduction_text(share: float | None) -> str:
    """Base-shear reduction as words that leave no doubt about its sign: "24 % below fixed base"."""
    if share is None:
        return "-"
    if abs(share) < 0.005:
        return "same as fixed base"
    return f"{abs(share):.0%} {'below' if share > 0 else 'above'} fixed base"


def missing_summary_text(path) -> str:
    """What to run when the batch summary a workbook reads is not there (markdown)."""
    return (f"**No batch summary at `{path}`.** This workbook maps a batch that has run. Run one first, e.g.\n\n"
            "    python -m isolation batch examples/demo_batch.toml --direct --out records/batches\n\n"
            "(`--direct`: equivalent-linear sweep, seconds; without it every variant gets a full record), then set "
            "`summary_path` to the batch's `summary.csv` (printed at the end of the batch) and run this workbook "
            "again, e.g. with papermill: `-p summary_path records/batches/<batch>/summary.csv`.")


def reduction(row: dict, bound: str = "upper") -> float | None:
    """Base-shear reduction ``1 - V_isolated/V_fixed`` for one bound. [-]"""
    ratio = _number(row.get(f"base_shear_ratio_{bound}"))
    return None if ratio is None else 1.0 - ratio


def _completed_reduction(row: dict) -> float:
    """Upper-bound :func:`reduction` of a row from :func:`completed_rows` (which all have one). [-]"""
    share = reduction(row)
    assert share is not None
    return share


def pareto_front(rows: Iterable[dict]) -> list[dict]:
    """Rows not dominated in (smaller ``D_M_lower_m``, larger upper-bound reduction).

    A row is dominated when another row has a displacement no larger and a
    reduction no smaller, one of them strictly.
    """
    rows = completed_rows(rows)
    front = []
    for row in rows:
        d, r = row["D_M_lower_m"], _completed_reduction(row)
        dominated = any(
            (o["D_M_lower_m"] <= d and _completed_reduction(o) >= r)
            and (o["D_M_lower_m"] < d or _completed_reduction(o) > r)
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
        same numbers appear once, ``same_in`` counting the variants and
        ``variants`` naming them (see :func:`variant_text`).
    """
    rows = [r for r in completed_rows(rows) if r.get("verdict") != "not recommended"]
    rows = _distinct(rows)
    front = {id(r) for r in pareto_front(rows)}
    ordered = sorted(
        rows,
        key=lambda r: (verdict_rank(r.get("verdict")), id(r) not in front, -_completed_reduction(r), r["D_M_lower_m"]),
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
            kept[key]["variants"].append(row.get("variant"))
        else:
            kept[key] = dict(row, same_in=1, variants=[row.get("variant")])
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


def plot_displacement_vs_reduction(rows: Iterable[dict], ax=None, label_variants: bool = True):
    """Isolator displacement vs base-shear reduction, both bounds, each variant labelled.

    Each variant is a grey segment from its upper-bound point (red: the
    force-governing case) to its lower-bound point (blue: the displacement-
    governing case), in the colours of :data:`isolation.output.plots.COLOURS`; the
    marker is the verdict (circle feasible, square with conditions, cross not
    recommended) and the label at the lower-bound point names the variant (and
    the alternative when there are several). The vertical axis is the
    reduction in per cent: above 0 the isolated shear is smaller than the
    fixed-base one. Returns the matplotlib Axes.
    """
    import matplotlib.pyplot as plt
    from matplotlib.lines import Line2D

    from isolation.output.plots import COLOURS

    rows = completed_rows(rows)
    if ax is None:
        _, ax = plt.subplots(figsize=(7.0, 4.8))
    names = list(dict.fromkeys(r.get("alternative") for r in rows))
    for row in rows:
        marker = VERDICT_MARKERS.get(row.get("verdict", ""), "D")
        d_lower, r_lower = row["D_M_lower_m"], reduction(row, "lower")
        d_upper, r_upper = _number(row.get("D_M_upper_m")), reduction(row, "upper")
        if d_upper is not None and r_upper is not None and r_lower is not None:
            ax.plot([d_upper, d_lower], [100 * r_upper, 100 * r_lower], color="0.6", lw=1.0)
        if d_upper is not None and r_upper is not None:
            ax.plot(d_upper, 100 * r_upper, marker=marker, color=COLOURS["upper"], ls="none")
        if r_lower is not None:
            ax.plot(d_lower, 100 * r_lower, marker=marker, color=COLOURS["lower"], ls="none")
            if label_variants and len(rows) <= 40:
                text = str(row.get("variant")) + (f" ({row.get('alternative')})" if len(names) > 1 else "")
                ax.annotate(text, (d_lower, 100 * r_lower), xytext=(4, 3), textcoords="offset points",
                            fontsize=6, color="0.25")
    shares = [100 * share for r in rows for b in ("lower", "upper") if (share := reduction(r, b)) is not None]
    if shares and min(shares) < 10.0:  # near or below zero: show where isolation stops reducing the shear
        ax.axhline(0.0, color="0.3", lw=0.8, ls=":")
    ax.set_xlabel("isolator displacement D_M [m]")
    ax.set_ylabel("base-shear reduction 1 - V_iso/V_fixed [%]\n(above 0: isolated shear smaller)")
    ax.set_title("Design space: blue = lower bound, red = upper bound")
    ax.grid(True, alpha=0.3)
    handles = [Line2D([], [], color=COLOURS["lower"], marker="o", ls="none", label="lower bound"),
               Line2D([], [], color=COLOURS["upper"], marker="o", ls="none", label="upper bound")]
    handles += [Line2D([], [], color="black", marker=VERDICT_MARKERS[v], ls="none", label=v)
                for v in VERDICT_ORDER if any(r.get("verdict") == v for r in rows)]
    ax.legend(handles=handles, loc="best", fontsize="small")
    return ax


def plot_verdict_map(rows: Iterable[dict], x_key: str, y_key: str, alternative: str | None = None, ax=None, *,
                     ranking: Iterable[dict] = (), units: str = "SI"):
    """Grid map over two varied keys: cells shaded by verdict, labelled with D_M and reduction.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows.
    x_key, y_key : str
        Override columns for the axes (dotted key paths; shown through :func:`key_label`).
    alternative : str, optional
        Alternative to map (default: the first one found).
    ax : matplotlib Axes, optional
    ranking : iterable of dict, optional
        Rows of :func:`best_alternatives`: each ranked row of this alternative
        puts "rank k" into the cell of its own variant(s).
    units : str
        "SI" or "US", the study's system (for the axis units).

    Notes
    -----
    Grids larger than 2 x 2 with numeric axes also get contour lines of the
    lower-bound displacement D_M (solid, in m) and of the base-shear reduction
    (dashed, in %).

    Returns
    -------
    matplotlib Axes
    """
    import matplotlib.pyplot as plt
    import numpy as np
    from matplotlib.patches import Patch, Rectangle

    rows = [r for r in rows if r.get("status") == "done"]
    alternative = alternative or (rows[0].get("alternative") if rows else None)
    rows = [r for r in rows if r.get("alternative") == alternative]
    xs = sorted({r[x_key] for r in rows}, key=_sort_key)
    ys = sorted({r[y_key] for r in rows}, key=_sort_key)
    ranks = _ranks(ranking, alternative)
    if ax is None:
        _, ax = plt.subplots(figsize=(7.0, 4.8))
    displacement = np.full((len(ys), len(xs)), np.nan)
    share_grid = np.full((len(ys), len(xs)), np.nan)
    for row in rows:
        i, j = xs.index(row[x_key]), ys.index(row[y_key])
        colour = VERDICT_COLOURS.get(row.get("verdict", ""), OTHER_COLOUR)
        ax.add_patch(Rectangle((i - 0.5, j - 0.5), 1, 1, color=colour, alpha=0.55, lw=0))
        share = reduction(row)
        d = _number(row.get("D_M_lower_m"))
        text = f"D {d:.2f} m" if d is not None else ""
        if d is not None:
            displacement[j, i] = d
        if share is not None:
            share_grid[j, i] = 100 * share
            text += f"\nV {reduction_text(share)}"
        if row.get("variant") in ranks:
            text += f"\nrank {ranks[row.get('variant')]}"
        ax.text(i, j, text, ha="center", va="center", fontsize="x-small")
    _contours(ax, xs, ys, displacement, share_grid)
    ax.set_xlim(-0.5, len(xs) - 0.5)
    ax.set_ylim(-0.5, len(ys) - 0.5)
    ax.set_xticks(range(len(xs)), [f"{x:g}" if isinstance(x, float) else str(x) for x in xs])
    ax.set_yticks(range(len(ys)), [f"{y:g}" if isinstance(y, float) else str(y) for y in ys])
    ax.set_xlabel(key_label(x_key, units))
    ax.set_ylabel(key_label(y_key, units))
    ax.set_title(f"{alternative}: verdict by variant (D = D_M lower bound, V = upper-bound base shear "
                 "against fixed base)", fontsize="small")
    present = [v for v in VERDICT_ORDER if any(r.get("verdict") == v for r in rows)]
    ax.legend(handles=[Patch(color=VERDICT_COLOURS[v], alpha=0.55, label=v) for v in present],
              loc="upper left", bbox_to_anchor=(1.01, 1.0), fontsize="small")
    return ax


def _ranks(ranking: Iterable[dict], alternative) -> dict:
    """Variant -> its rank among ``ranking`` (rows of :func:`best_alternatives`) for one alternative."""
    ranks: dict = {}
    for k, ranked in enumerate(ranking, 1):
        if ranked.get("alternative") == alternative:
            for name in ranked.get("variants") or [ranked.get("variant")]:
                ranks.setdefault(name, k)
    return ranks


def _contours(ax, xs: list, ys: list, displacement, share_grid) -> None:
    """Contour lines of D_M (solid, m) and of the reduction (dashed, %) on numeric grids beyond 2 x 2."""
    import numpy as np

    numeric = all(isinstance(v, (int, float)) for v in xs + ys)
    if numeric and len(xs) > 2 and len(ys) > 2:
        gx, gy = np.meshgrid(range(len(xs)), range(len(ys)))
        for grid, style, fmt in ((displacement, "-", "%.2f m"), (share_grid, "--", "%.0f %%")):
            if np.isfinite(grid).sum() >= 4 and np.nanmax(grid) > np.nanmin(grid):
                lines = ax.contour(gx, gy, np.ma.masked_invalid(grid), levels=5, colors="0.25",
                                   linewidths=0.7, linestyles=style, alpha=0.7)
                ax.clabel(lines, fmt=fmt, fontsize=6)
