"""Quick explorer: bearing, site and building settings in, the code's answer out.

The callbacks of the live explorer (``python -m isolation explore``,
``workbooks/explore.ipynb``) are plain functions here, so they are tested
without a browser:

* :func:`explore` - settings to an :class:`ExplorerAnswer`: lower, nominal
  and upper property sets, D_M, D_TM, moat, base shears, bearing checks, code
  applicability checks and plausibility warnings;
* :func:`summary_table`, :func:`summary_html`, :func:`quantities_html`,
  :func:`layout_html`, :func:`checks_html`, :func:`warnings_html` - the answer as tables
  (the layout table: bearing grid, the code's torsion displacement at each bearing and the
  axial-load range under overturning, from :func:`isolation.study.layout.layout_demands`);
* :func:`comparison_table` / :func:`comparison_html` - a pinned alternative
  beside the current one;
* :func:`trade_off` - displacement against base shear while one bearing
  parameter is swept;
* :func:`plot_series` - the numbers the live plots draw; :func:`explorer_figure`
  the same as a static matplotlib figure;
* :func:`update` - answer, HTML and figure in one call;
* :func:`isolation.app.explorer.study_file.study_toml` - the alternative as a study file.

:func:`build_explorer` wires ipywidgets and bqplot to these
(:mod:`isolation.app.explorer.live`); it holds no logic.

This module gathers the explorer's public names; they live in
:mod:`~isolation.app.explorer.calculation` (settings, answer, :func:`explore`,
:func:`update`), :mod:`~isolation.app.explorer.tables`,
:mod:`~isolation.app.explorer.figures`, :mod:`~isolation.app.explorer.trade` and
:mod:`~isolation.app.explorer.live`.  Data flows one way: those modules never
import this one.

The explorer writes its settings as a study (:mod:`isolation.app.explorer.study_file`)
and answers through the same functions as ``python -m isolation run``
(:func:`isolation.study.parse_study`, :func:`isolation.study.assembly.design_alternative`,
ASCE/SEI 7-16 Ch. 17 ELF or EN 1998-1 §10.9 simplified analysis). Scope:
concept-stage screening, not design; a licensed engineer checks every number
against the local code.
"""


from __future__ import annotations

from isolation.app.explorer.calculation import (  # noqa: F401 - re-exported
    CASES,
    SCOPE,
    ExplorerAnswer,
    ExplorerSettings,
    _explorer_names,
    _settings,
    _unit,
    explore,
    update,
)
from isolation.app.explorer.controls import (  # noqa: F401 - re-exported
    _CONTROL,
    BASES,
    BEARING_TYPES,
    CHOICES,
    CONTROLS,
    TRADE_OFF_PARAMETERS,
    unit_name,
)
from isolation.app.explorer.figures import explorer_figure, plot_series  # noqa: F401 - re-exported
from isolation.app.explorer.live import build
from isolation.app.explorer.tables import (  # noqa: F401 - re-exported
    _force,
    _length,
    checks_html,
    comparison_html,
    comparison_table,
    layout_html,
    quantities_html,
    summary_html,
    summary_table,
    warnings_html,
)
from isolation.app.explorer.trade import TradeOff, _swept, trade_off  # noqa: F401 - re-exported

__all__ = [
    "BEARING_TYPES",
    "CASES",
    "SCOPE",
    "TRADE_OFF_PARAMETERS",
    "ExplorerSettings",
    "ExplorerAnswer",
    "TradeOff",
    "explore",
    "summary_table",
    "summary_html",
    "quantities_html",
    "layout_html",
    "checks_html",
    "warnings_html",
    "comparison_table",
    "comparison_html",
    "trade_off",
    "plot_series",
    "explorer_figure",
    "update",
    "build_explorer",
]


def build_explorer(settings: ExplorerSettings | None = None):
    """The live explorer (ipywidgets and bqplot); see :func:`isolation.app.explorer.live.build`.

    Returns
    -------
    ipywidgets.VBox
        The explorer; ``controls`` maps field names to their numeric entries
        (or choice widgets), ``sliders`` to the sliders, ``summary``,
        ``quantities``, ``bearing_layout``, ``checks``, ``warnings`` and ``message`` are HTML
        widgets, ``figures`` the bqplot figures, ``state`` the current
        settings, answer and pinned answer.
    """
    return build(settings or ExplorerSettings())
