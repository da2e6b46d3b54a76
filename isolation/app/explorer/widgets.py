"""The live explorer's widgets: control rows, bqplot figures and marks, buttons and the page layout.

:class:`ExplorerWidgets` builds them on the object of
:class:`isolation.app.explorer.live._Explorer`, which adds the handlers
(``_slid``, ``_typed``, ``_set``, ``_trade``, ``_pin``, ``_export``,
``_switch_units``, ``_range``).  No calculation here.
"""

from __future__ import annotations

import html
from typing import Any

from isolation.app.explorer.calculation import CASES, SCOPE, ExplorerSettings
from isolation.app.explorer.controls import (
    BASES,
    BEARING_TYPES,
    CHOICES,
    CONTROLS,
    GROUPS,
    to_display,
    unit_factor,
    unit_name,
)
from isolation.app.explorer.page_parts import _CAPTIONS, _CSS, _figure, _lines, _points, _slug
from isolation.codes import registry as _codes
from isolation.output.plots import COLOURS

__all__ = ["ExplorerWidgets"]


class ExplorerWidgets:
    """Widget construction of the live explorer (``self.w`` is ipywidgets, ``self.bq`` bqplot)."""

    w: Any
    bq: Any
    settings: ExplorerSettings

    # The handlers, given by the live explorer (isolation.app.explorer.live._Explorer).
    def _slid(self, control: Any, value: Any) -> None:
        raise NotImplementedError

    def _typed(self, control: Any, value: Any) -> None:
        raise NotImplementedError

    def _set(self, **values: Any) -> None:
        raise NotImplementedError

    def _switch_units(self, system: str) -> None:
        raise NotImplementedError

    def _trade(self) -> None:
        raise NotImplementedError

    def _pin(self) -> None:
        raise NotImplementedError

    def _export(self) -> None:
        raise NotImplementedError

    @staticmethod
    def _range(control, system: str) -> tuple[float, float, float]:
        if control.integer:
            return control.low, control.high, control.step
        factor = unit_factor(control.kind, system)
        step = float(f"{control.step * factor:.2g}")
        return control.low * factor, control.high * factor, step

    def _build_bar(self, settings: ExplorerSettings) -> None:
        """Bearing type, code basis and unit toggles and the busy cue."""
        w = self.w
        self.bearing = w.ToggleButtons(options=list(BEARING_TYPES), value=settings.bearing_type,
                                       description="Bearing", style={"button_width": "150px"})
        self.basis = w.ToggleButtons(options=[(_codes.get(b).title, b) for b in BASES],
                                     value=settings.basis, description="Code basis", style={"button_width": "120px"})
        self.units = w.ToggleButtons(options=["SI", "US"], value=settings.units, description="Units",
                                     style={"button_width": "60px"})
        self.busy = w.HTML("", layout=w.Layout(width="140px"))
        self.busy.add_class("iso-busy-cue")

    def _build_outputs(self) -> None:
        """The HTML widgets the answer fills."""
        w = self.w
        self.message = w.HTML()
        self.warnings = w.HTML()
        self.quantities = w.HTML()
        self.bearing_layout = w.HTML()
        self.summary = w.HTML()
        self.checks = w.HTML()
        self.comparison = w.HTML()
        self.export_link = w.HTML()

    def _build_controls(self, settings: ExplorerSettings) -> None:
        """One row per control (label, slider, entry, unit) and per choice, grouped."""
        w = self.w
        self.entries: dict[str, Any] = {}
        self.sliders: dict[str, Any] = {}
        self.unit_labels: dict[str, Any] = {}
        self.rows: dict[str, Any] = {}
        groups: dict[str, list] = {g: [] for g in GROUPS}
        for c in CONTROLS:
            label = w.HTML(f'<span class="iso-label" title="{html.escape(c.label)}">{html.escape(c.label)}</span>',
                           layout=w.Layout(width="170px"))
            value = to_display(getattr(settings, c.field), c.kind, settings.units)
            low, high, step = self._range(c, settings.units)
            if c.integer:
                slider = w.IntSlider(value=int(value), min=int(low), max=int(high), step=int(step), readout=False,
                                     continuous_update=False, layout=w.Layout(width="150px"))
                entry = w.IntText(value=int(value), layout=w.Layout(width="95px"))
            else:
                slider = w.FloatSlider(value=min(max(value, low), high), min=low, max=high, step=step,
                                       readout=False, continuous_update=False, layout=w.Layout(width="150px"))
                entry = w.FloatText(value=value, layout=w.Layout(width="95px"))
            entry.add_class(f"iso-entry-{c.field}")
            slider.add_class(f"iso-slider-{c.field}")
            unit = w.HTML(unit_name(c.kind, settings.units), layout=w.Layout(width="40px"))
            row = w.HBox([label, slider, entry, unit], layout=w.Layout(align_items="center"))
            row.add_class(f"iso-row-{c.field}")
            for kind in c.types:
                row.add_class("iso-typed")
                row.add_class(f"iso-for-{_slug(kind)}")
            if c.basis:
                row.add_class("iso-based")
                row.add_class(f"iso-on-{c.basis}")
            self.entries[c.field], self.sliders[c.field], self.unit_labels[c.field] = entry, slider, unit
            self.rows[c.field] = row
            slider.observe(lambda change, c=c: self._slid(c, change["new"]), names="value")
            entry.observe(lambda change, c=c: self._typed(c, change["new"]), names="value")
            groups[c.group].append(row)
        for name, (options, text, basis) in CHOICES.items():
            choice = w.Dropdown(options=list(options), value=getattr(settings, name), layout=w.Layout(width="95px"))
            label = w.HTML(f'<span class="iso-label">{html.escape(text)}</span>', layout=w.Layout(width="170px"))
            row = w.HBox([label, w.HTML("", layout=w.Layout(width="150px")), choice])
            row.add_class(f"iso-row-{name}")
            row.add_class("iso-based")
            row.add_class(f"iso-on-{basis}")
            self.entries[name], self.rows[name] = choice, row
            choice.observe(lambda change, name=name: self._set(**{name: change["new"]}), names="value")
            groups["Site"].append(row)
        column = []
        for group in GROUPS:
            column.append(w.HTML(f'<div class="iso-group">{group}</div>'))
            column += groups[group]
        self.controls_box = w.VBox(column, layout=w.Layout(flex="0 0 480px", width="480px"))

    def _build_figures(self) -> None:
        """The three bqplot figures (spectrum, loops, trade-off) and their marks."""
        bq = self.bq
        f1, sx1, sy1 = _figure("Period T [s]", "Sa [g]", "Spectrum and isolated periods")
        # Few marks, each holding several lines or points: one message per mark and change.
        colours = [COLOURS[case] for case in CASES]
        self.spectrum_marks = {
            "sa5": _lines(bq, sx1, sy1, "black", width=2.0),
            "damped": bq.Lines(x=[0.0, 1.0], y=[[0.0, 0.0]] * 3, scales={"x": sx1, "y": sy1}, colors=colours,
                               line_style="dashed", stroke_width=1.0),
            "points": bq.Scatter(x=[0.0] * 4, y=[0.0] * 4, scales={"x": sx1, "y": sy1},
                                 colors=colours + [COLOURS["fixed"]], marker="square", default_size=70),
            "pinned": _points(bq, sx1, sy1, "#9a9a9a", fill=False),
        }
        self.spectrum_marks["pinned"].visible = False
        f1.marks = list(self.spectrum_marks.values())

        f2, sx2, sy2 = _figure("Displacement", "Force", "Isolation plane at D")
        self.loop_marks = {
            "loops": bq.Lines(x=[[0.0, 1.0]] * 3, y=[[0.0, 0.0]] * 3, scales={"x": sx2, "y": sy2}, colors=colours,
                              stroke_width=1.5),
            "limits": bq.Lines(x=[[0.0, 0.0]] * 2, y=[[0.0, 1.0]] * 2, scales={"x": sx2, "y": sy2},
                               colors=["black", "#d00000"], stroke_width=1.0),
        }
        f2.marks = list(self.loop_marks.values())
        self.loop_axes = f2.axes

        f3, sx3, sy3 = _figure("D_TM", "V_b/W upper [-]", "Trade-off")
        self.trade_marks = {
            "curve": bq.Lines(x=[0.0, 1.0], y=[0.0, 0.0], scales={"x": sx3, "y": sy3}, colors=["#444444"],
                              marker="circle", marker_size=20),
            "labels": bq.Label(x=[0.0], y=[0.0], scales={"x": sx3, "y": sy3}, text=[""], font_weight="normal",
                               default_size=10, x_offset=4, y_offset=-4, colors=["#444444"]),
            "current": _points(bq, sx3, sy3, "black", marker="circle"),
            "pinned": _points(bq, sx3, sy3, "#9a9a9a", marker="circle"),
        }
        self.trade_marks["pinned"].visible = False
        f3.marks = list(self.trade_marks.values())
        self.trade_axes = f3.axes
        self.figures = {"spectrum": f1, "loops": f2, "trade": f3}
        for name, fig in self.figures.items():
            fig.add_class(f"iso-figure-{name}")

    def _build_buttons(self) -> None:
        """Sweep choice, pin and export buttons; the bar's handlers."""
        w = self.w
        self.sweep = w.Dropdown(description="Sweep", layout=w.Layout(width="220px"))
        self.sweep.observe(lambda change: self._trade(), names="value")
        self.pin = w.Button(description="Pin this alternative", icon="thumb-tack", layout=w.Layout(width="180px"))
        self.pin.on_click(lambda _: self._pin())
        self.export = w.Button(description="Export study file", icon="download", layout=w.Layout(width="180px"))
        self.export.on_click(lambda _: self._export())
        self.bearing.observe(lambda change: self._set(bearing_type=change["new"]), names="value")
        self.basis.observe(lambda change: self._set(basis=change["new"]), names="value")
        self.units.observe(lambda change: self._switch_units(change["new"]), names="value")

    def _build_layout(self) -> None:
        """Header, bar, controls beside the results."""
        w = self.w
        caption = lambda key: w.HTML(f'<p class="iso-caption">{html.escape(_CAPTIONS[key])}</p>')  # noqa: E731
        results = w.VBox([
            self.message, self.warnings,
            w.HTML("<b>Answer</b>"), self.quantities, self.summary,
            w.HTML("<b>Bearing layout</b>"), self.bearing_layout,
            w.HBox([self.figures["spectrum"], self.figures["loops"]],
                   layout=w.Layout(flex_flow="row wrap", width="100%")),
            caption("spectrum"), caption("loops"),
            w.HTML("<b>Checks</b>"), self.checks,
            w.HTML("<b>Trade-off</b>"), self.sweep, self.figures["trade"], caption("trade"),
            w.HTML("<b>Compare and export</b>"), w.HBox([self.pin, self.export]), self.comparison, self.export_link,
        ], layout=w.Layout(flex="1 1 560px", min_width="520px"))
        results.add_class("iso-results")
        header = w.HTML(
            f"{_CSS}<h2 style='margin:4px 0'>Base isolation explorer</h2>"
            f"<p style='margin:0 0 6px 0'><b>Scope and cautions.</b> {html.escape(SCOPE)}</p>")
        bar = w.VBox([self.bearing, w.HBox([self.basis, self.units, self.busy])])
        self.root = w.VBox([header, bar, w.HBox([self.controls_box, results],
                                                 layout=w.Layout(flex_flow="row wrap", align_items="flex-start"))])
        self.root.add_class("isolation-explorer")
        self.root.add_class("iso-bearing-none")
