"""Design-space maps from a history sweep (``batch --direct --histories``): tables and figures.

:func:`plot_history_maps` contours the peak isolator displacement and the
floor-acceleration reduction over two varied keys for both bounds, hatches
the variants that are not feasible (:func:`feasible`) and stars
:func:`best_history_alternatives`. Re-exported by :mod:`isolation.app.batch.maps`.

Scope: a screening view for a feasibility study; the listed alternatives are
candidates for a full study, checked by a licensed structural engineer
against the local code.
"""

from __future__ import annotations

from typing import Iterable

from isolation.app.batch.map_rows import _number, _sort_key, completed_rows, variant_text, verdict_rank

__all__ = ["HISTORY_FIELDS", "history_rows", "grid_field", "feasible", "history_front", "best_history_alternatives",
           "plot_history_maps", "best_history_table"]


HISTORY_FIELDS = {
    "history_displacement_lower_m": "peak isolator displacement, lower bound [m]",
    "history_displacement_upper_m": "peak isolator displacement, upper bound [m]",
    "floor_acceleration_reduction_lower": "floor-acceleration reduction, lower bound [-]",
    "floor_acceleration_reduction_upper": "floor-acceleration reduction, upper bound [-]",
}
"""Columns mapped by :func:`plot_history_maps`, with their panel titles (suite means of peaks)."""


def history_rows(rows: Iterable[dict]) -> list[dict]:
    """Completed rows of a history sweep (with the history columns filled)."""
    return [r for r in completed_rows(rows)
            if all(_number(r.get(c)) is not None for c in ("history_displacement_lower_m",
                                                           "floor_acceleration_reduction_lower",
                                                           "floor_acceleration_reduction_upper"))]


def grid_field(rows: Iterable[dict], x_key: str, y_key: str, column: str, alternative=None):
    """Values of ``column`` on the grid of two varied keys.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows.
    x_key, y_key : str
        Override columns (dotted key paths) spanning the grid.
    column : str
        Summary column to lay out (e.g. ``history_displacement_lower_m``).
    alternative : str, optional
        Alternative to take (default: the first one found).

    Returns
    -------
    (xs, ys, values)
        Sorted distinct values of each key and an array (len(ys), len(xs)) of
        the column, NaN where no completed variant gives a number.
    """
    import numpy as np

    rows = [r for r in rows if r.get("status") == "done"]
    alternative = alternative if alternative is not None else (rows[0].get("alternative") if rows else None)
    rows = [r for r in rows if r.get("alternative") == alternative]
    xs = sorted({r[x_key] for r in rows}, key=_sort_key)
    ys = sorted({r[y_key] for r in rows}, key=_sort_key)
    values = np.full((len(ys), len(xs)), np.nan)
    for row in rows:
        number = _number(row.get(column))
        if number is not None:
            values[ys.index(row[y_key]), xs.index(row[x_key])] = number
    return xs, ys, values


def feasible(row: dict, *, torsion: bool = True) -> bool:
    """A variant is feasible on the history numbers when its verdict is not "not recommended"
    and its peak displacement (with torsion when ``torsion``) stays within the bearings' capacity."""
    if row.get("verdict") == "not recommended":
        return False
    demand = _number(row.get("history_displacement_torsion_m" if torsion else "history_displacement_lower_m"))
    capacity = _number(row.get("displacement_capacity_m"))
    return demand is None or capacity is None or demand <= capacity


def history_front(rows: Iterable[dict]) -> list[dict]:
    """History rows not dominated in (smaller peak displacement with torsion, larger smaller-of-
    the-two-bounds floor-acceleration reduction)."""
    rows = history_rows(rows)

    def point(r):
        return (r["history_displacement_torsion_m"] if _number(r.get("history_displacement_torsion_m")) is not None
                else r["history_displacement_lower_m"], _worst_reduction(r))

    front = []
    for row in rows:
        d, a = point(row)
        if not any(point(o)[0] <= d and point(o)[1] >= a and (point(o)[0] < d or point(o)[1] > a) for o in rows):
            front.append(row)
    return front


def _worst_reduction(row: dict) -> float:
    return min(row["floor_acceleration_reduction_lower"], row["floor_acceleration_reduction_upper"])


def best_history_alternatives(rows: Iterable[dict], top: int = 5) -> list[dict]:
    """The best variants of a history sweep.

    Feasible variants (:func:`feasible`), ordered by verdict (feasible
    first), whether they lie on :func:`history_front`, the floor-acceleration
    reduction of the less favourable bound (largest first) and the peak
    displacement with torsion (smallest first). An alternative the varied
    keys leave unchanged appears once, ``same_in`` counting its variants and
    ``variants`` naming them.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows of a history sweep.
    top : int
        How many to return. [-]

    Returns
    -------
    list of dict
    """
    rows = [r for r in history_rows(rows) if feasible(r)]
    kept: dict[tuple, dict] = {}
    for row in rows:
        key = (row.get("alternative"), row.get("verdict"),
               *(round(float(row[c]), 9) for c in ("history_displacement_lower_m", "floor_acceleration_reduction_lower",
                                                   "floor_acceleration_reduction_upper")))
        if key in kept:
            kept[key]["same_in"] += 1
            kept[key]["variants"].append(row.get("variant"))
        else:
            kept[key] = dict(row, same_in=1, variants=[row.get("variant")])
    rows = list(kept.values())
    front = {id(r) for r in history_front(rows)}
    ordered = sorted(rows, key=lambda r: (verdict_rank(r.get("verdict")), id(r) not in front, -_worst_reduction(r),
                                          r["history_displacement_lower_m"]))
    return ordered[: max(int(top), 0)]


def plot_history_maps(rows: Iterable[dict], x_key: str, y_key: str, alternative=None, *, levels: int = 8,
                      units: str | None = None):
    """Design-space maps of a history sweep over two varied keys, both bounds.

    Four panels: peak isolator displacement (lower and upper bound, suite
    means) and floor-acceleration reduction ``1 - a_isolated / a_fixed``
    (lower and upper bound), each as filled contours with labelled contour
    lines; variants that are not feasible (:func:`feasible`: verdict "not
    recommended" or displacement with torsion beyond the bearings' capacity)
    are hatched and their region outlined; the best variants
    (:func:`best_history_alternatives`, up to 3) are starred.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows of a history sweep.
    x_key, y_key : str
        Override columns on the axes (dotted key paths), each with 2 or more values.
    alternative : str, optional
        Alternative to map (default: the first one found).
    levels : int
        Contour levels per panel. [-]
    units : {"SI", "US"}, optional
        The study's unit system: the axes then name the keys as an engineer reads them, with their
        units (:func:`isolation.app.batch.key_labels.key_label`); default: the key paths themselves.

    Returns
    -------
    matplotlib.figure.Figure
    """
    import numpy as np
    from matplotlib.figure import Figure

    rows = list(rows)
    done = history_rows(rows)
    alternative = alternative if alternative is not None else (done[0].get("alternative") if done else None)
    mine = [r for r in done if r.get("alternative") == alternative]
    xs, ys, _ = grid_field(mine, x_key, y_key, "history_displacement_lower_m", alternative)
    if len(xs) < 2 or len(ys) < 2 or not all(isinstance(v, (int, float)) for v in (*xs, *ys)):
        raise ValueError(f"x_key = {x_key!r}, y_key = {y_key!r} are not allowed: each must take 2 or more "
                         f"numeric values among the completed history rows of {alternative!r}")
    ok = np.zeros((len(ys), len(xs)))
    for row in mine:
        ok[ys.index(row[y_key]), xs.index(row[x_key])] = 1.0 if feasible(row) else 0.0
    best = [r for r in best_history_alternatives(mine, top=3)]
    fig = Figure(figsize=(10.0, 7.5), layout="constrained")
    axes = fig.subplots(2, 2, sharex=True, sharey=True)
    gx, gy = np.meshgrid(np.asarray(xs, dtype=float), np.asarray(ys, dtype=float))
    for ax, (column, title) in zip(axes.ravel(), HISTORY_FIELDS.items(), strict=True):
        _, _, values = grid_field(mine, x_key, y_key, column, alternative)
        cmap = "viridis_r" if column.startswith("history_displacement") else "viridis"
        if np.isfinite(values).sum() >= 4 and np.nanmax(values) > np.nanmin(values):
            filled = ax.contourf(gx, gy, np.ma.masked_invalid(values), levels=levels, cmap=cmap)
            lines = ax.contour(gx, gy, np.ma.masked_invalid(values), levels=filled.levels, colors="k",
                               linewidths=0.5)
            ax.clabel(lines, fontsize="x-small", fmt="%.2f")
            fig.colorbar(filled, ax=ax, shrink=0.9)
        else:
            ax.scatter(gx, gy, c=np.nan_to_num(values), cmap=cmap)
        if (ok < 0.5).any():
            ax.contourf(gx, gy, ok, levels=[-0.5, 0.5], colors="none", hatches=["////"])
            if (ok > 0.5).any():
                ax.contour(gx, gy, ok, levels=[0.5], colors="#c8423b", linewidths=1.5)
        for row in best:
            ax.plot(row[x_key], row[y_key], marker="*", color="white", mec="black", ms=12, ls="none")
        ax.set_title(title, fontsize="medium")
    if units is None:
        x_label, y_label = x_key, y_key
    else:
        from isolation.app.batch.key_labels import key_label

        x_label, y_label = key_label(x_key, units), key_label(y_key, units)
    fig.supxlabel(x_label, fontsize="medium")  # one label per axis for the four panels, which share them
    fig.supylabel(y_label, fontsize="medium")
    fig.suptitle(f"{alternative}: response-history design space (hatched: not feasible; stars: best variants)")
    return fig


def best_history_table(rows: Iterable[dict], top: int = 5) -> str:
    """:func:`best_history_alternatives` as a Markdown table (for the design-space workbook)."""
    rows = list(rows)
    best = best_history_alternatives(rows, top=top)
    total = len({r.get("variant") for r in history_rows(rows)})
    if not best:
        return "No variant qualifies on the response-history numbers: every completed variant is not feasible."
    lines = ["| rank | variant | alternative | verdict | peak displacement lower / upper [m] "
             "| with torsion [m] | capacity [m] | floor-acceleration reduction lower / upper [-] | same in variants |",
             "|" + "---|" * 9]
    for rank, row in enumerate(best, 1):
        capacity = _number(row.get("displacement_capacity_m"))
        torsion = _number(row.get("history_displacement_torsion_m"))
        upper = _number(row.get("history_displacement_upper_m"))
        lines.append(
            f"| {rank} | {variant_text(row, total)} | {row['alternative']} | {row['verdict']} | "
            f"{row['history_displacement_lower_m']:.3f} / {'-' if upper is None else f'{upper:.3f}'} | "
            f"{'-' if torsion is None else f'{torsion:.3f}'} | {'-' if capacity is None else f'{capacity:.2f}'} | "
            f"{row['floor_acceleration_reduction_lower']:.2f} / {row['floor_acceleration_reduction_upper']:.2f} | "
            f"{row['same_in']} |")
    return "\n".join(lines)
