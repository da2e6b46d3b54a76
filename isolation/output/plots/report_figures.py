"""The feasibility report's figures: which figure, drawn from which results, with which caption.

:func:`feasibility_figures` lists every figure of the feasibility workbook in the
order the workbook shows them, each as a :class:`FigureOrder` (a key, its caption
and the plot call that draws it), without drawing any. The workbook displays them
by key (``display(figures[name, "loops"])``); a figure is drawn when it is shown.

Because the list is made from the results alone, two processes holding the same
results hold the same list: the record command draws figures from the back of the
list while the workbook's kernel draws from the front (:mod:`isolation.output.figure_sharing`).
"""

from __future__ import annotations

from collections.abc import Callable, Iterator, Mapping
from dataclasses import dataclass
from functools import partial
from typing import Any

from matplotlib.figure import Figure

from isolation.output.plots.common import caption_metadata, figure_png
from isolation.output.plots.design import equivalent_linear_bounds, force_displacement, site_spectrum, suite_figure
from isolation.output.plots.history import (
    history_base_shear,
    history_displacements,
    history_energy,
    history_floor_spectra,
    history_loops,
    history_profiles,
)
from isolation.output.plots.loss import loss_curves
from isolation.output.plots.plan import bearing_orbits, pairs_figure, plan_demand
from isolation.output.plots.yielding import yielding_profiles
from isolation.output.tables.summary import code_symbols

__all__ = ["FigureOrder", "FigureList", "feasibility_figures"]

Key = tuple[str, ...]


@dataclass(frozen=True)
class FigureOrder:
    """One figure of a report, not yet drawn.

    Attributes
    ----------
    key : tuple of str
        Its name in the report, e.g. ``("site spectrum",)`` or ``("Lead-rubber", "loops")``. [-]
    caption : str
        Caption text (symbols written plainly, e.g. ``D_M``). [-]
    make : callable
        Draws the figure: no arguments, returns a matplotlib Figure. [-]
    dpi : int
        Resolution of its PNG. [dots per inch]
    computes : bool
        Drawing it computes response spectra (numba's compiled loop): a process that has the loop
        loaded draws such figures first (:func:`isolation.output.figure_sharing.draw_ahead`). [-]
    """

    key: Key
    caption: str
    make: Callable[[], Figure]
    dpi: int = 200
    computes: bool = False

    def png(self) -> bytes:
        """The figure drawn, as PNG bytes (:func:`isolation.output.plots.figure_png`)."""
        return figure_png(self.make(), self.dpi)

    def metadata(self) -> dict:
        """The PNG's metadata in a workbook: the caption, plain and for LaTeX (as ``captioned``)."""
        return caption_metadata(self.caption)


class ShownFigure:
    """A figure of a :class:`FigureList` for ``display()``: drawn (or fetched) when shown."""

    def __init__(self, order: FigureOrder, source: Callable[[FigureOrder], bytes]):
        self.order = order
        self._source = source

    def _repr_png_(self):
        return self._source(self.order), self.order.metadata()

    def __repr__(self) -> str:
        return f"<figure {' / '.join(self.order.key)}: {self.order.caption}>"


class FigureList(Mapping):
    """The figures of a report in the order it shows them, by key.

    ``figures[key]`` is a :class:`ShownFigure` for ``display()``; a one-part key may be
    given as a plain string. ``source`` gives a figure's PNG (default: draw it here).
    """

    def __init__(self, orders: list[FigureOrder], source: Callable[[FigureOrder], bytes] | None = None):
        self.orders = tuple(orders)
        self._by_key = {order.key: order for order in self.orders}
        if len(self._by_key) != len(self.orders):
            raise ValueError("figure keys must be unique within a report")
        self._source: Callable[[FigureOrder], bytes] = source or FigureOrder.png

    def with_source(self, source: Callable[[FigureOrder], bytes]) -> "FigureList":
        """The same figures, their PNGs given by ``source(order)``."""
        return FigureList(list(self.orders), source)

    def __getitem__(self, key: str | Key) -> ShownFigure:
        key = (key,) if isinstance(key, str) else tuple(key)
        if key not in self._by_key:
            raise KeyError(f"figure {key!r} is not in this report; its figures: "
                           + "; ".join(" / ".join(k) for k in self._by_key))
        return ShownFigure(self._by_key[key], self._source)

    def __iter__(self) -> Iterator[Key]:
        return iter(self._by_key)

    def __len__(self) -> int:
        return len(self.orders)


def feasibility_figures(results: Any, study: Any) -> FigureList:
    """The feasibility workbook's figures, in the order it shows them.

    Parameters
    ----------
    results : StudyResults
        Results of :func:`isolation.study.runner.run_study` with their live objects. [-]
    study : Study
        The study they were computed from (display units, code basis, plan size). [-]
    """
    units, live = study.units, results.live
    symbols = code_symbols(study.basis)
    d, d_total = symbols["displacement"], symbols["total_displacement"]
    orders: list[FigureOrder] = []

    def add(key: Key, caption: str, plot: Callable[..., Figure], *args: Any, **kwargs: Any) -> None:
        orders.append(FigureOrder(key, caption, partial(plot, *args, **kwargs),
                                  computes=plot is history_floor_spectra))

    if results.loss:
        add(("loss",), "Expected repair cost against shaking intensity: mean and 10 % to 90 % band, "
            "fixed base (dashed) and isolated alternatives", loss_curves, results)
    _site_figure(results, live, add)
    for alternative in results.alternatives:
        _, sets, _ = live["designs"][alternative.name]
        amplitudes = {case: alternative.bounds[case]["displacement"] for case in ("lower", "upper")}
        add((alternative.name, "backbones"),
            f"{alternative.name}: isolation-plane backbones (dashed) and loops at the design displacement",
            force_displacement, {case: sets[case] for case in ("lower", "upper")}, amplitudes=amplitudes, units=units)
    for alternative in results.alternatives:
        add((alternative.name, "bounds"),
            f"{alternative.name}: demand at each bound's effective damping, secant stiffness and the converged point",
            equivalent_linear_bounds, live["spectrum"], {c: alternative.bounds[c] for c in ("lower", "upper")},
            units=units)
    add(("suite",), "Matched suite: target spectrum, record spectra, suite mean and tolerance band "
        "(shaded period range: mean check)", suite_figure, live["suite"])
    if live.get("pairs") is not None:
        add(("pairs",), "Matched pairs: pair spectra (RotD100 or SRSS, see the table), their mean, the target "
            "and the tolerance band", pairs_figure, live["pairs"])
    for alternative in results.alternatives:
        _history_figures(alternative, live, units, d, add)
    for alternative in results.alternatives:
        if (alternative.history or {}).get("bidirectional"):
            _plan_figures(alternative, study, units, d_total, add)
    for alternative in results.alternatives:
        _yielding_figures(alternative, live, units, add)
    return FigureList(orders)


def _site_figure(results: Any, live: Mapping, add: Callable) -> None:
    marks = {}
    for alternative in results.alternatives:
        for case in ("upper", "lower"):
            bound = alternative.bounds[case]
            marks[f"{alternative.name}, {case}"] = (bound["period"], bound["damping"])
    add(("site spectrum",), "Site spectrum (5 % damping) with the fixed-base period and the isolated effective "
        "periods; isolated markers sit on the spectrum reduced for their effective damping",
        site_spectrum, live["spectrum"], fixed_base_period=results.fixed_base["period"], isolated_periods=marks)


def _history_figures(alternative: Any, live: Mapping, units: str, d: str, add: Callable) -> None:
    name, q = alternative.name, alternative.quantities
    cases = {"fixed": live["histories"]["fixed"], **live["histories"][name]}
    add((name, "displacements"), f"{name}: isolator displacement histories, lower bound, with {d} and the "
        "bearing capacity", history_displacements, cases["lower"], design_displacement=q["displacement"],
        capacity=q["displacement_capacity"], units=units)
    add((name, "base shear"), f"{name}: peak base shear (suite mean), fixed base against isolated",
        history_base_shear, cases, units=units)
    add((name, "profiles"), f"{name}: storey drift ratio and peak floor acceleration over the height (suite means)",
        history_profiles, cases, units=units)
    add((name, "floor spectra"), f"{name}: roof response spectra at 5 % damping (suite means)",
        history_floor_spectra, cases)
    add((name, "loops"), f"{name}: isolator hysteresis loops, record 1", history_loops, cases, units=units)
    add((name, "energy"), f"{name}: energy stack, lower bound, record 1", history_energy, cases["lower"], units=units)


def _plan_figures(alternative: Any, study: Any, units: str, d_total: str, add: Callable) -> None:
    name, b = alternative.name, alternative.history["bidirectional"]
    plan = (study.building.plan_length, study.building.plan_width)
    add((name, "orbits"), f"{name}: displacement orbits of the centre of mass and of the most displaced bearing "
        f"(worst record) against the bearing capacity and {d_total}", bearing_orbits, b, units=units)
    add((name, "plan"), f"{name}: plan of the bearings coloured by peak displacement (suite mean), labelled with "
        "their axial load range", plan_demand, b, plan, units=units)


def _yielding_figures(alternative: Any, live: Mapping, units: str, add: Callable) -> None:
    name, comparison = alternative.name, live["comparison"]
    cases = {"fixed": live["histories"]["fixed"], **live["histories"][name]}
    strengths: dict = {}
    if comparison.yielding:
        isolated = alternative.history["isolated_design"]["yield_shears"]
        strengths = {"fixed": comparison.design.yield_shears, "lower": isolated, "upper": isolated}
    add((name, "yielding"), f"{name}: storey ductility demand, residual drift and peak shear over yield shear "
        "(suite means)", yielding_profiles, cases, strengths, units=units)
    if comparison.yielding:
        second = {"fixed_elastic": live["histories"]["fixed_elastic"], **cases}
        add((name, "second view", "profiles"), f"{name}: second view with the elastic, unreduced fixed base: storey "
            "drift and peak floor acceleration (suite means)", history_profiles, second, units=units)
        add((name, "second view", "floor spectra"), f"{name}: second view with the elastic, unreduced fixed base: "
            "roof response spectra at 5 % damping (suite means)", history_floor_spectra, second)
