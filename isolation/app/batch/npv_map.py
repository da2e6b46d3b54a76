"""Design-space map shaded by the loss study's net present value of isolation.

A sibling of :func:`isolation.app.batch.maps.plot_verdict_map` over the same summary
rows: each cell of a two-key grid is one variant, shaded from red (isolation
costs more than it saves over the design life) through white (break-even) to
green, labelled with the net present value. An order-of-magnitude screening;
costs are to be confirmed by a cost consultant.
"""

from __future__ import annotations

import math
from typing import Iterable

__all__ = ["plot_npv_map"]

_NO_VALUE = "#bdbdbd"


def _number(value) -> float | None:
    if isinstance(value, (int, float)) and not isinstance(value, bool) and math.isfinite(value):
        return float(value)
    return None


def _sort_key(value):
    return (0, value, "") if isinstance(value, (int, float)) else (1, 0.0, str(value))


def plot_npv_map(rows: Iterable[dict], x_key: str, y_key: str, alternative: str | None = None, ax=None):
    """Grid map over two varied keys, cells shaded by the net present value of isolation.

    Parameters
    ----------
    rows : iterable of dict
        Summary rows (``net_present_value`` [currency], ``currency``).
    x_key, y_key : str
        Override columns for the axes (dotted key paths).
    alternative : str, optional
        Alternative to map (default: the first one found).
    ax : matplotlib Axes, optional

    Returns
    -------
    matplotlib Axes
        Cells without a value (no loss study) stay grey.
    """
    import matplotlib.pyplot as plt
    from matplotlib.cm import ScalarMappable
    from matplotlib.colors import Normalize
    from matplotlib.patches import Rectangle

    rows = [r for r in rows if r.get("status") == "done"]
    alternative = alternative or (rows[0].get("alternative") if rows else None)
    rows = [r for r in rows if r.get("alternative") == alternative]
    xs = sorted({r[x_key] for r in rows}, key=_sort_key)
    ys = sorted({r[y_key] for r in rows}, key=_sort_key)
    if ax is None:
        _, ax = plt.subplots(figsize=(7.0, 4.8))
    values = [_number(r.get("net_present_value")) for r in rows]
    scale = max([abs(v) for v in values if v is not None] or [1.0]) or 1.0
    cmap = plt.get_cmap("RdYlGn")
    for row, value in zip(rows, values, strict=True):
        i, j = xs.index(row[x_key]), ys.index(row[y_key])
        colour = _NO_VALUE if value is None else cmap(0.5 + 0.5 * value / scale)
        ax.add_patch(Rectangle((i - 0.5, j - 0.5), 1, 1, color=colour, alpha=0.55, lw=0))
        if value is not None:
            ax.text(i, j, f"{value / 1e6:.2f} M", ha="center", va="center", fontsize="small")
    ax.set_xlim(-0.5, len(xs) - 0.5)
    ax.set_ylim(-0.5, len(ys) - 0.5)
    ax.set_xticks(range(len(xs)), [f"{x:g}" if isinstance(x, float) else str(x) for x in xs])
    ax.set_yticks(range(len(ys)), [f"{y:g}" if isinstance(y, float) else str(y) for y in ys])
    ax.set_xlabel(x_key)
    ax.set_ylabel(y_key)
    currency = next((r.get("currency") for r in rows if r.get("currency")), "")
    ax.set_title(f"{alternative}: net present value of isolation by variant [million {currency}]",
                 fontsize="small")
    bar = ax.figure.colorbar(ScalarMappable(Normalize(-scale, scale), cmap), ax=ax, alpha=0.55)
    bar.set_label(f"net present value [{currency}]")
    return ax
