"""Figures of the bidirectional (plan) analysis: bearing orbits and the plan coloured by demand."""

from __future__ import annotations

from typing import Any, Mapping

import numpy as np
from matplotlib import cm, colors
from matplotlib.patches import Rectangle

from isolation.output.plots.common import _figure, axis_unit

__all__ = ["bearing_orbits", "plan_demand", "pairs_figure"]


def bearing_orbits(summary: Mapping[str, Any], *, units: str = "SI"):
    """Displacement orbits of the isolation plane's centre of mass and of its most displaced bearing.

    Parameters
    ----------
    summary : mapping
        The ``bidirectional`` results of an alternative (:func:`isolation.study.plan.bidirectional_summary`):
        ``orbit`` with ``centre`` and ``corner`` (2, steps) [m], ``total_displacement_governing`` [m],
        ``displacement_capacity`` [m] or None.
    units : str
        Display units, "SI" or "US".

    Returns
    -------
    matplotlib.figure.Figure
    """
    show = axis_unit("displacement", units)
    fig, ax = _figure(height=4.2, width=4.6)
    orbit = summary["orbit"]
    centre, corner = np.asarray(orbit["centre"]), np.asarray(orbit["corner"])
    ax.plot(show(centre[0]), show(centre[1]), color="#4a4a4a", lw=0.8, label="centre of mass")
    ax.plot(show(corner[0]), show(corner[1]), color="#b23a10", lw=0.8, label=f"bearing {orbit['bearing'] + 1}")
    angle = np.linspace(0.0, 2 * np.pi, 200)
    for radius, style, label in ((summary.get("displacement_capacity"), "-", "bearing capacity"),
                                 (summary["total_displacement_governing"], "--", "D_TM (governing)")):
        if radius:
            ax.plot(show(radius * np.cos(angle)), show(radius * np.sin(angle)), "k" + style, lw=1.0, label=label)
    ax.set_aspect("equal")
    ax.set_xlabel(f"displacement x [{show.label}]")
    ax.set_ylabel(f"displacement y [{show.label}]")
    ax.legend(fontsize=7, loc="upper right")
    ax.grid(True, lw=0.3)
    return fig


def plan_demand(summary: Mapping[str, Any], plan: tuple, *, units: str = "SI"):
    """Plan view: bearings coloured by peak displacement, sized by their axial load range.

    Parameters
    ----------
    summary : mapping
        The ``bidirectional`` results of an alternative: ``positions_m``, ``bearing_peak_displacement_m``,
        ``bearing_axial_min_kN``, ``bearing_axial_max_kN``. [m, kN]
    plan : tuple of float
        Plan length and width. [m]
    units : str
        Display units, "SI" or "US".

    Returns
    -------
    matplotlib.figure.Figure
    """
    show = axis_unit("displacement", units)
    length_unit = axis_unit("height", units)
    force = axis_unit("force", units)
    positions = np.asarray(summary["positions_m"])
    peaks = np.asarray(summary["bearing_peak_displacement_m"])
    low, high = np.asarray(summary["bearing_axial_min_kN"]), np.asarray(summary["bearing_axial_max_kN"])
    fig, ax = _figure(height=3.8)
    lx, ly = plan
    ax.add_patch(Rectangle((length_unit(-lx / 2), length_unit(-ly / 2)), length_unit(lx), length_unit(ly),
                           fill=False, lw=1.0))
    norm = colors.Normalize(vmin=float(show(peaks.min())), vmax=float(show(peaks.max())) + 1e-12)
    spread = high - low
    sizes = 30 + 170 * spread / max(float(spread.max()), 1e-12)
    ax.scatter(length_unit(positions[:, 0]), length_unit(positions[:, 1]), c=show(peaks), s=sizes,
                        cmap="viridis", norm=norm, edgecolors="k", linewidths=0.5)
    for (x, y), n_min, n_max in zip(positions, low, high, strict=True):
        ax.annotate(f"{force(n_min):.0f}/{force(n_max):.0f}", (length_unit(x), length_unit(y)),
                    textcoords="offset points", xytext=(0, 7), ha="center", fontsize=5)
    bar = fig.colorbar(cm.ScalarMappable(norm=norm, cmap="viridis"), ax=ax, shrink=0.85)
    bar.set_label(f"peak bearing displacement [{show.label}]")
    ax.set_aspect("equal")
    ax.set_xlabel(f"x along the length [{length_unit.label}]")
    ax.set_ylabel(f"y [{length_unit.label}]")
    ax.set_title(f"labels: min/max axial load [{force.label}]; marker size: axial load range", fontsize=7)
    pad = 0.08 * max(lx, ly)
    ax.set_xlim(length_unit(-lx / 2 - pad), length_unit(lx / 2 + pad))
    ax.set_ylim(length_unit(-ly / 2 - pad), length_unit(ly / 2 + pad))
    return fig


def pairs_figure(pairs: Any):
    """Pair spectra (RotD100 or SRSS) of a :class:`isolation.motions.MatchedPairs` against the target.

    The band and the shaded period range are the pairs' own (``pairs.check()``). [g, s]
    """
    from isolation.output.plots.design import suite_match

    check = pairs.check()
    low, high = check.band
    figure = suite_match(pairs.periods, pairs.target, pairs.spectra, lower_factor=low, upper_factor=high,
                         period_range=tuple(pairs.check_range))
    figure.axes[0].set_ylabel(f"{check.spectrum} spectral acceleration [g]")
    return figure
