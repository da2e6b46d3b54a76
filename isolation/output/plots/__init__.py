"""Figures of a feasibility study (matplotlib, Agg canvas, no pyplot state).

Every function builds a new :class:`matplotlib.figure.Figure` on an Agg canvas
and returns it; nothing is shown or saved. Inputs are the package's result
objects where one fits (spectra, backbones, equivalent-linear results) and
plain arrays otherwise, so figures can also be drawn from results read back
from JSON. :func:`captioned` wraps a figure for display in a workbook: the PNG
carries its caption, which the report template turns into a numbered figure.

Inputs are in the package's units: periods [s], spectral acceleration [g],
displacement [m], force [kN], heights [m], energy [kN m]. Functions that draw
lengths, forces or energy take a keyword ``units="SI"`` or ``"US"`` (the
study's display system) and convert only on the axes, through
:mod:`isolation.units`: displacement mm or in, force kN or kip, heights m or
ft, energy kN m or kip in. Periods, drift ratios and accelerations (g) are the
same in both systems. The owner's page figure (expected repair cost against
intensity) is :mod:`~isolation.output.plots.loss`.

Modules: :mod:`~isolation.output.plots.common` (canvas, colours, captions),
:mod:`~isolation.output.plots.design` (site, bearings, equivalent-linear answer,
motion suite), :mod:`~isolation.output.plots.history` (response histories),
:mod:`~isolation.output.plots.yielding` (ductility, residual drift, shear over strength),
:mod:`~isolation.output.plots.plan` (bidirectional analysis: orbits, plan demand),
:mod:`~isolation.output.plots.report_figures` (the feasibility report's figures by key, in order;
:mod:`isolation.output.figure_sharing` has them drawn by two processes at once).
"""

from isolation.output.figure_sharing import figures_of
from isolation.output.plots.common import COLOURS, SERIES_COLOURS, WIDTH, AxisUnit, axis_unit, captioned, figure_png
from isolation.output.plots.design import (
                                    equivalent_linear_bounds,
                                    force_displacement,
                                    masing_loop,
                                    site_spectrum,
                                    suite_figure,
                                    suite_match,
)
from isolation.output.plots.history import (
                                    base_shear_comparison,
                                    displacement_histories,
                                    energy_stack,
                                    floor_spectra,
                                    history_base_shear,
                                    history_displacements,
                                    history_energy,
                                    history_floor_spectra,
                                    history_loops,
                                    history_profiles,
                                    hysteresis_loops,
                                    storey_profiles,
)
from isolation.output.plots.loss import loss_curves
from isolation.output.plots.plan import bearing_orbits, pairs_figure, plan_demand
from isolation.output.plots.report_figures import FigureList, FigureOrder, feasibility_figures
from isolation.output.plots.yielding import yielding_profiles

__all__ = [
    "FigureList",
    "FigureOrder",
    "feasibility_figures",
    "figures_of",
    "bearing_orbits",
    "plan_demand",
    "pairs_figure",
    "COLOURS",
    "SERIES_COLOURS",
    "WIDTH",
    "AxisUnit",
    "axis_unit",
    "captioned",
    "figure_png",
    "loss_curves",
    "site_spectrum",
    "force_displacement",
    "equivalent_linear_bounds",
    "suite_match",
    "displacement_histories",
    "base_shear_comparison",
    "storey_profiles",
    "floor_spectra",
    "hysteresis_loops",
    "energy_stack",
    "masing_loop",
    "suite_figure",
    "history_profiles",
    "history_base_shear",
    "history_displacements",
    "history_loops",
    "history_energy",
    "history_floor_spectra",
    "yielding_profiles",
]
