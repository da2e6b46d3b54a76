"""Figures of the yielding response: storey ductility, residual drift and shear over strength.

Drawn from :class:`isolation.dynamics.response.HistoryResult` objects by case
("fixed", "lower", "upper", ...), suite means per storey.
"""

from __future__ import annotations

from typing import Any, Mapping, Sequence

import numpy as np
from matplotlib.figure import Figure

from isolation.output.plots.common import _colour, _figure, axis_unit
from isolation.output.plots.history import _label, _levels

__all__ = ["yielding_profiles"]


def _per_storey(values) -> np.ndarray | None:
    if values is None:
        return None
    return np.mean(np.abs(np.asarray(values, dtype=float)), axis=0)


def yielding_profiles(results: Mapping[str, Any], strengths: Mapping[str, Sequence[float]] | None = None, *,
                      units: str = "SI") -> Figure:
    """Storey ductility demand, residual drift ratio and peak storey shear over yield shear, by case.

    Parameters
    ----------
    results : mapping of str -> HistoryResult
        Cases ("fixed", "lower", "upper", ...); a case without ``ductility`` or
        ``residual_drift`` (elastic model) is left out of that panel. [-]
    strengths : mapping of str -> sequence of float, optional
        Storey yield shears by case, first storey up. [kN]
    units : str
        Display unit system of the heights, "SI" or "US". [-]
    """
    height = axis_unit("height", units)
    fig, axes = _figure(3.4, ncols=3)
    strengths = strengths or {}
    for index, (case, result) in enumerate(results.items()):
        levels = height(_levels(result))
        bottoms, tops = levels[:-1], levels[1:]
        colour, label = _colour(_label(case), index), _label(case)
        panels = (_per_storey(getattr(result, "ductility", None)),
                  _per_storey(getattr(result, "residual_drift", None)),
                  None if case not in strengths else
                  np.mean(result.peaks()["storey_shear"] / np.asarray(strengths[case], dtype=float), axis=0))
        for ax, values, scale in zip(axes, panels, (1.0, 100.0, 1.0), strict=True):
            if values is None:
                continue
            ax.plot(np.repeat(scale * values, 2), np.column_stack([bottoms, tops]).ravel(), color=colour,
                    label=label)
    axes[0].axvline(1.0, color="k", lw=0.8, ls=":")
    axes[2].axvline(1.0, color="k", lw=0.8, ls=":")
    titles = ("Ductility demand [-]", "Residual drift ratio [%]", "Peak shear / yield shear [-]")
    for ax, text in zip(axes, titles, strict=True):
        ax.set_xlabel(text)
        ax.set_ylabel(f"Height [{height.label}]")
        ax.set_xlim(left=0)
        ax.grid(alpha=0.3)
        if ax.lines:
            ax.legend(fontsize=6)
    return fig
