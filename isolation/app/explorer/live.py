"""The live explorer: ipywidgets controls and bqplot figures wired to :mod:`isolation.app.explorer.answers`.

Only wiring lives here: every number comes from the callbacks of
:mod:`isolation.app.explorer.answers`. The plots are bqplot marks whose data are replaced
in place on each change (drawn by the browser; no image is rendered on the
server). Each numeric setting has a slider and, beside it, an entry that
holds the exact value used; the entry is the setting, the slider moves it in
steps. Only the controls of the chosen bearing type and code basis are shown.
"""

from __future__ import annotations

import base64
import html
import time
from dataclasses import replace
from typing import Any

import numpy as np

from isolation.app.explorer import answers as ex
from isolation.app.explorer.controls import (
    BASES,
    BEARING_TYPES,
    CHOICES,
    CONTROLS,
    GROUPS,
    from_display,
    to_display,
    unit_factor,
    unit_name,
)
from isolation.app.explorer.page_parts import _CAPTIONS, _CSS, _figure, _lines, _points, _slug
from isolation.codes import registry as _codes
from isolation.output.plots import COLOURS

__all__ = ["build"]


class _Explorer:
    """Holds the widgets and the current state; every handler calls :mod:`isolation.app.explorer.answers`."""

    def __init__(self, settings: ex.ExplorerSettings) -> None:
        import bqplot as bq
        import ipywidgets as w

        self.w, self.bq = w, bq
        self.settings = settings
        self.answer: ex.ExplorerAnswer | None = None
        self.pinned: ex.ExplorerAnswer | None = None
        self.suspend = False
        self.timings: list[float] = []

        self.bearing = w.ToggleButtons(options=list(BEARING_TYPES), value=settings.bearing_type,
                                       description="Bearing", style={"button_width": "150px"})
        self.basis = w.ToggleButtons(options=[(_codes.get(b).title, b) for b in BASES],
                                     value=settings.basis, description="Code basis", style={"button_width": "120px"})
        self.units = w.ToggleButtons(options=["SI", "US"], value=settings.units, description="Units",
                                     style={"button_width": "60px"})
        self.busy = w.HTML("", layout=w.Layout(width="140px"))
        self.busy.add_class("iso-busy-cue")

        self._build_controls(settings)
        self.message = w.HTML()
        self.warnings = w.HTML()
        self.quantities = w.HTML()
        self.bearing_layout = w.HTML()
        self.summary = w.HTML()
        self.checks = w.HTML()
        self.comparison = w.HTML()
        self.export_link = w.HTML()

        self._build_figures()
        self._build_buttons()
        self._build_layout()
        self._show_controls()
        self._sweep_options()
        self._refresh()

    def _build_controls(self, settings: ex.ExplorerSettings) -> None:
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
        colours = [COLOURS[case] for case in ex.CASES]
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
            f"<p style='margin:0 0 6px 0'><b>Scope and cautions.</b> {html.escape(ex.SCOPE)}</p>")
        bar = w.VBox([self.bearing, w.HBox([self.basis, self.units, self.busy])])
        self.root = w.VBox([header, bar, w.HBox([self.controls_box, results],
                                                 layout=w.Layout(flex_flow="row wrap", align_items="flex-start"))])
        self.root.add_class("isolation-explorer")
        self.root.add_class("iso-bearing-none")
    # --- handlers -------------------------------------------------------------------------------
    @staticmethod
    def _range(control, system: str) -> tuple[float, float, float]:
        if control.integer:
            return control.low, control.high, control.step
        factor = unit_factor(control.kind, system)
        step = float(f"{control.step * factor:.2g}")
        return control.low * factor, control.high * factor, step

    def _slid(self, control, value) -> None:
        if self.suspend:
            return
        self.entries[control.field].value = value  # the entry is the setting; it triggers the answer

    def _typed(self, control, value) -> None:
        if self.suspend:
            return
        slider = self.sliders[control.field]
        self.suspend = True
        try:
            slider.value = min(max(value, slider.min), slider.max)
        finally:
            self.suspend = False
        si = int(value) if control.integer else from_display(float(value), control.kind, self.settings.units)
        self._set(**{control.field: si})

    def _set(self, **values) -> None:
        if self.suspend:
            return
        try:
            self.settings = replace(self.settings, **values)
        except (ValueError, TypeError) as error:
            self.message.value = f"<b style='color:#b00020'>Not computed:</b> {html.escape(str(error))}"
            return
        if "bearing_type" in values or "basis" in values:
            self._show_controls()
            if "bearing_type" in values:
                self._sweep_options()
        self._refresh()

    def _switch_units(self, system: str) -> None:
        """Show every control in the other unit system; values rounded to 6 digits become the settings."""
        self.suspend = True
        try:
            values: dict[str, Any] = {"units": system}
            for c in CONTROLS:
                entry, slider = self.entries[c.field], self.sliders[c.field]
                shown = to_display(getattr(self.settings, c.field), c.kind, system)
                if not c.integer:
                    shown = float(f"{shown:.6g}")
                    values[c.field] = from_display(shown, c.kind, system)
                low, high, step = self._range(c, system)
                # One message with range and value, so that the browser never clamps a stale value.
                with slider.hold_sync(), slider.hold_trait_notifications():
                    slider.min, slider.max = (min(low, slider.min), max(high, slider.max))
                    slider.value = min(max(shown, low), high)
                    slider.min, slider.max, slider.step = low, high, step
                entry.value = shown
                self.unit_labels[c.field].value = unit_name(c.kind, system)
            self.settings = replace(self.settings, **values)
        finally:
            self.suspend = False
        self._refresh()

    def _show_controls(self) -> None:
        """Only the chosen bearing type's and code basis's rows show: one class on the root, CSS does the rest."""
        s = self.settings
        for name in list(self.root._dom_classes):
            if name.startswith(("iso-bearing-", "iso-basis-")):
                self.root.remove_class(name)
        self.root.add_class(f"iso-bearing-{_slug(s.bearing_type)}")
        self.root.add_class(f"iso-basis-{s.basis}")

    def _sweep_options(self) -> None:
        options = ex.TRADE_OFF_PARAMETERS[self.settings.bearing_type]
        labels = {"friction": "friction μ", "radius": "radius R", "lead_diameter": "lead core D_L",
                  "layers": "rubber layers N", "outer_diameter": "rubber diameter D_o"}
        self.suspend = True
        try:
            self.sweep.options = [(labels[o], o) for o in options]
            self.sweep.value = options[0]
        finally:
            self.suspend = False

    def _refresh(self) -> None:
        started = time.perf_counter()
        self.root.add_class("iso-busy")
        self.busy.value = "<span style='color:#a05000'>&#9203; computing&hellip;</span>"
        try:
            answer = ex.explore(self.settings)
        except Exception as error:  # noqa: BLE001 - a bad combination is shown, the last answer stays
            self.message.value = (f"<b style='color:#b00020'>Not computed:</b> "
                                  f"{html.escape(' '.join(str(error).split()))}")
            self.root.remove_class("iso-busy")
            self.busy.value = ""
            return
        self.answer = answer
        self.message.value = ""
        self._draw(answer)
        self.warnings.value = ex.warnings_html(answer)
        self.quantities.value = ex.quantities_html(answer)
        self.bearing_layout.value = ex.layout_html(answer)
        self.summary.value = ex.summary_html(answer)
        self.checks.value = ex.checks_html(answer)
        self.comparison.value = ex.comparison_html(self.pinned, answer)
        self.timings.append(time.perf_counter() - started)
        self._trade()
        self.root.remove_class("iso-busy")
        self.busy.value = ""

    def _draw(self, answer) -> None:
        series = ex.plot_series(answer)
        m = self.spectrum_marks
        with m["sa5"].hold_sync():
            m["sa5"].x, m["sa5"].y = series["periods"], series["sa_5"]
        with m["damped"].hold_sync():
            m["damped"].x = series["periods"]
            m["damped"].y = np.vstack([series["damped"][case] for case in ex.CASES])
        with m["points"].hold_sync():
            m["points"].x = [series["point"][case][0] for case in ex.CASES] + [series["fixed"][0]]
            m["points"].y = [series["point"][case][1] for case in ex.CASES] + [series["fixed"][1]]
        loops = [series["loop"][case] for case in ex.CASES]
        size = max(len(x) for x, _ in loops)
        pad = lambda a: np.concatenate([a, np.full(size - len(a), a[-1])])  # noqa: E731 - equal lengths
        top = float(max(np.max(np.abs(f)) for _, f in loops)) * 1.05 or 1.0
        with self.loop_marks["loops"].hold_sync():
            self.loop_marks["loops"].x = np.vstack([pad(np.asarray(x)) for x, _ in loops])
            self.loop_marks["loops"].y = np.vstack([pad(np.asarray(f)) for _, f in loops])
        d_tm, capacity = series["total_displacement"], series["capacity"]
        with self.loop_marks["limits"].hold_sync():
            self.loop_marks["limits"].x = [[d_tm, d_tm], [capacity, capacity]]
            self.loop_marks["limits"].y = [[-top, top], [-top, top]]
        self.loop_axes[0].label = f"Displacement [{series['length']}]"
        self.loop_axes[1].label = f"Force [{series['force']}]"
        self.trade_axes[0].label = f"D_TM [{series['length']}]"
        d, shear = answer.quantities["total_displacement"], answer.results["upper"].base_shear / answer.settings.weight
        scale = to_display(1.0, "length", answer.settings.units) * (1000.0 if series["length"] == "mm" else 1.0)
        with self.trade_marks["current"].hold_sync():
            self.trade_marks["current"].x, self.trade_marks["current"].y = [d * scale], [shear]
        pinned = self.pinned
        visible_pin = pinned is not None
        self.spectrum_marks["pinned"].visible = visible_pin
        self.trade_marks["pinned"].visible = visible_pin
        if pinned is not None:
            pin = ex.plot_series(pinned)
            with self.spectrum_marks["pinned"].hold_sync():
                self.spectrum_marks["pinned"].x = [pin["point"][c][0] for c in ex.CASES]
                self.spectrum_marks["pinned"].y = [pin["point"][c][1] for c in ex.CASES]
            with self.trade_marks["pinned"].hold_sync():
                self.trade_marks["pinned"].x = [pinned.quantities["total_displacement"] * scale]
                self.trade_marks["pinned"].y = [pinned.results["upper"].base_shear / pinned.settings.weight]

    def _trade(self) -> None:
        if self.suspend or self.answer is None or self.sweep.value is None:
            return
        curve = ex.trade_off(self.settings, self.sweep.value, count=9)
        keep = np.isfinite(curve.total_displacement)
        unit = ex._length(1.0, self.settings.units)
        x = curve.total_displacement[keep] * unit[0]
        y = curve.base_shear_coefficient[keep]
        control = next(c for c in CONTROLS if c.field in (curve.parameter, f"{curve.parameter}_1"))
        shown = [to_display(v, control.kind, self.settings.units) for v in curve.values[keep]]
        text = [f"{v:.0f}" if control.integer else f"{v:.3g}" for v in shown]
        marks = self.trade_marks
        if x.size:
            with marks["curve"].hold_sync():
                marks["curve"].x, marks["curve"].y = x, y
            with marks["labels"].hold_sync():
                marks["labels"].x, marks["labels"].y, marks["labels"].text = x, y, text

    def _pin(self) -> None:
        if self.answer is None:
            return
        self.pinned = self.answer
        self._draw(self.answer)
        self.comparison.value = ex.comparison_html(self.pinned, self.answer)

    def _export(self) -> None:
        from isolation.app.explorer.study_file import study_toml

        text = study_toml(self.settings)
        data = base64.b64encode(text.encode("utf-8")).decode("ascii")
        name = f"explorer-{self.settings.bearing_type.replace(' ', '-')}.toml"
        self.export_link.value = (
            f'<p><a class="iso-download" download="{name}" href="data:application/toml;base64,{data}">'
            f"Download {html.escape(name)}</a> - check it with <code>python -m isolation check {name}</code>, "
            f"then run it with <code>python -m isolation run {name}</code>.</p>"
            f"<details><summary>Show the study file</summary><pre>{html.escape(text)}</pre></details>")


def build(settings: ex.ExplorerSettings):
    """Build the live explorer for ``settings``; returns its root ``ipywidgets.VBox``.

    The box carries ``controls`` (numeric entries and choices by field name),
    ``sliders``, ``summary``, ``quantities``, ``bearing_layout``, ``checks``, ``warnings``,
    ``message``, ``comparison``, ``figures``, ``bearing``, ``basis``, ``units``,
    ``pin``, ``export`` and ``explorer`` (the object holding the state).
    """
    state = _Explorer(settings)
    box = state.root
    box.explorer = state
    box.controls, box.sliders = state.entries, state.sliders
    for name in ("summary", "quantities", "bearing_layout", "checks", "warnings", "message", "comparison", "figures",
                 "bearing", "basis", "units", "pin", "export", "export_link", "spectrum_marks", "loop_marks",
                 "trade_marks"):
        setattr(box, name, getattr(state, name))
    return box
