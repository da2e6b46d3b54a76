"""The live explorer: ipywidgets controls and bqplot figures wired to the explorer's calculation.

Only wiring lives here: every number comes from
:func:`isolation.app.explorer.calculation.explore` and the tables, figures and
trade-off of :mod:`isolation.app.explorer` (the widgets themselves are built in
:mod:`isolation.app.explorer.widgets`). The plots are bqplot marks whose data are replaced
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

from isolation.app.explorer.calculation import CASES, ExplorerAnswer, ExplorerSettings, explore
from isolation.app.explorer.controls import (
    CONTROLS,
    TRADE_OFF_PARAMETERS,
    from_display,
    to_display,
    unit_name,
)
from isolation.app.explorer.figures import plot_series
from isolation.app.explorer.page_parts import _slug
from isolation.app.explorer.tables import (
    _length,
    checks_html,
    comparison_html,
    layout_html,
    quantities_html,
    summary_html,
    warnings_html,
)
from isolation.app.explorer.trade import trade_off
from isolation.app.explorer.widgets import ExplorerWidgets

__all__ = ["build"]


class _Explorer(ExplorerWidgets):
    """Holds the widgets and the current state; every handler calls the explorer's calculation."""

    def __init__(self, settings: ExplorerSettings) -> None:
        import bqplot as bq
        import ipywidgets as w

        self.w, self.bq = w, bq
        self.settings = settings
        self.answer: ExplorerAnswer | None = None
        self.pinned: ExplorerAnswer | None = None
        self.suspend = False
        self.timings: list[float] = []

        self._build_bar(settings)
        self._build_controls(settings)
        self._build_outputs()
        self._build_figures()
        self._build_buttons()
        self._build_layout()
        self._show_controls()
        self._sweep_options()
        self._refresh()

    # --- handlers -------------------------------------------------------------------------------
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
        options = TRADE_OFF_PARAMETERS[self.settings.bearing_type]
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
            answer = explore(self.settings)
        except Exception as error:  # noqa: BLE001 - a bad combination is shown, the last answer stays
            self.message.value = (f"<b style='color:#b00020'>Not computed:</b> "
                                  f"{html.escape(' '.join(str(error).split()))}")
            self.root.remove_class("iso-busy")
            self.busy.value = ""
            return
        self.answer = answer
        self.message.value = ""
        self._draw(answer)
        self.warnings.value = warnings_html(answer)
        self.quantities.value = quantities_html(answer)
        self.bearing_layout.value = layout_html(answer)
        self.summary.value = summary_html(answer)
        self.checks.value = checks_html(answer)
        self.comparison.value = comparison_html(self.pinned, answer)
        self.timings.append(time.perf_counter() - started)
        self._trade()
        self.root.remove_class("iso-busy")
        self.busy.value = ""

    def _draw(self, answer) -> None:
        series = plot_series(answer)
        m = self.spectrum_marks
        with m["sa5"].hold_sync():
            m["sa5"].x, m["sa5"].y = series["periods"], series["sa_5"]
        with m["damped"].hold_sync():
            m["damped"].x = series["periods"]
            m["damped"].y = np.vstack([series["damped"][case] for case in CASES])
        with m["points"].hold_sync():
            m["points"].x = [series["point"][case][0] for case in CASES] + [series["fixed"][0]]
            m["points"].y = [series["point"][case][1] for case in CASES] + [series["fixed"][1]]
        loops = [series["loop"][case] for case in CASES]
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
            pin = plot_series(pinned)
            with self.spectrum_marks["pinned"].hold_sync():
                self.spectrum_marks["pinned"].x = [pin["point"][c][0] for c in CASES]
                self.spectrum_marks["pinned"].y = [pin["point"][c][1] for c in CASES]
            with self.trade_marks["pinned"].hold_sync():
                self.trade_marks["pinned"].x = [pinned.quantities["total_displacement"] * scale]
                self.trade_marks["pinned"].y = [pinned.results["upper"].base_shear / pinned.settings.weight]

    def _trade(self) -> None:
        if self.suspend or self.answer is None or self.sweep.value is None:
            return
        curve = trade_off(self.settings, self.sweep.value, count=9)
        keep = np.isfinite(curve.total_displacement)
        unit = _length(1.0, self.settings.units)
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
        self.comparison.value = comparison_html(self.pinned, self.answer)

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


def build(settings: ExplorerSettings):
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
