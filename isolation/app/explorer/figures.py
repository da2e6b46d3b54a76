"""The explorer's figures: the numbers its live plots draw and a static matplotlib figure.

Re-exported from :mod:`isolation.app.explorer.answers`.
"""

from __future__ import annotations

from typing import TYPE_CHECKING, Any

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from isolation.app.explorer.tables import _force, _length
from isolation.output.plots import COLOURS, masing_loop

if TYPE_CHECKING:
    from isolation.app.explorer.calculation import ExplorerAnswer

__all__ = ["plot_series", "explorer_figure"]


def plot_series(answer: ExplorerAnswer, points: int = 160) -> dict:
    """The numbers the live plots draw, in the display units of ``answer.settings.units``.

    Returns a mapping with ``periods`` [s] and ``sa_5`` [g] (the 5 %-damped
    spectrum), and per property set ``damped[case]`` (Sa at that set's
    effective damping [g], the curve its isolated point sits on),
    ``point[case]`` ((T_eff [s], Sa [g])), ``loop[case]`` ((displacement,
    force) of the loop at D), plus ``fixed`` ((T_fb, Sa(T_fb, 5 %))),
    ``total_displacement`` (D_TM), ``capacity`` and the units ``length`` and
    ``force`` used.
    """
    s = answer.settings
    spectrum = answer.spectrum or s.spectrum()
    longest = max(r.period for r in answer.results.values())
    periods = np.linspace(0.0, max(4.0, 1.25 * longest), points)
    scale_d = _length(1.0, s.units)[0]
    scale_f = _force(1.0, s.units)[0]
    series: dict[str, Any] = {"periods": periods, "sa_5": np.asarray(spectrum.sa(periods, 0.05), dtype=float),
                              "damped": {}, "point": {}, "loop": {},
                              "length": _length(1.0, s.units)[1], "force": _force(1.0, s.units)[1]}
    for case, r in answer.results.items():
        series["damped"][case] = np.asarray(spectrum.sa(periods, r.damping), dtype=float)
        series["point"][case] = (float(r.period), float(spectrum.sa(r.period, r.damping)))
        x, f = masing_loop(answer.backbones[case], r.displacement)
        series["loop"][case] = (np.asarray(x) * scale_d, np.asarray(f) * scale_f)
    t_fb = s.fixed_base_period
    series["fixed"] = (t_fb, float(spectrum.sa(t_fb, 0.05)))
    series["total_displacement"] = answer.quantities["total_displacement"] * scale_d
    series["capacity"] = s.displacement_capacity * scale_d
    return series


def explorer_figure(answer: ExplorerAnswer) -> Figure:
    """Spectra with the fixed-base and isolated points beside the loops at D (static matplotlib)."""
    series = plot_series(answer)
    fig = Figure(figsize=(9.0, 3.4), layout="constrained")
    FigureCanvasAgg(fig)
    left, right = fig.subplots(1, 2)
    left.plot(series["periods"], series["sa_5"], color="k", lw=1.5, label="5 % damping")
    t_fb, sa_fb = series["fixed"]
    left.plot([t_fb], [sa_fb], "o", color=COLOURS["fixed"], label=f"fixed base {t_fb:.2f} s")
    for case, r in answer.results.items():
        colour = COLOURS[case]
        left.plot(series["periods"], series["damped"][case], color=colour, lw=0.8, ls="--")
        left.plot(*series["point"][case], "s", color=colour,
                  label=f"{case} {r.period:.2f} s, β = {100 * r.damping:.0f} %")
        x, f = series["loop"][case]
        d, unit = _length(r.displacement, answer.settings.units)
        right.plot(x, f, color=colour, lw=1.3, label=f"{case}: D = {d:.0f} {unit}")
    left.set_xlabel("Period T [s]")
    left.set_ylabel("Sa [g]")
    right.set_xlabel(f"Displacement [{series['length']}]")
    right.set_ylabel(f"Force, isolation plane [{series['force']}]")
    for ax in (left, right):
        ax.grid(alpha=0.3)
        ax.legend(fontsize=7)
    return fig
