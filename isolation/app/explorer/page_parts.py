"""Pieces of the live explorer's page: style sheet, figure captions, bqplot figure and mark helpers.

Used by :mod:`isolation.app.explorer.live` (wiring only).
"""

from __future__ import annotations

from isolation.app.explorer.controls import BASES, BEARING_TYPES

__all__: list[str] = []


def _slug(text: str) -> str:
    return text.replace(" ", "-")


_CSS = """
<style>
.isolation-explorer { max-width: 1260px; font-size: 13px; }
.isolation-explorer .iso-label { line-height: 15px; white-space: normal; overflow-wrap: anywhere; }
.isolation-explorer .iso-group { font-weight: bold; margin: 8px 0 2px 0; border-bottom: 1px solid #ccc; }
.isolation-explorer table.iso-table { border-collapse: collapse; margin: 4px 0; }
.isolation-explorer table.iso-table td, .isolation-explorer table.iso-table th {
  padding: 2px 6px; border-bottom: 1px solid #e4e4e4; text-align: right; }
.isolation-explorer table.iso-table th { text-align: left; font-weight: normal; }
.isolation-explorer table.iso-table td:first-child { text-align: left; }
.isolation-explorer .iso-source { font-size: 11px; color: #555; text-align: left !important; }
.isolation-explorer .iso-warnings { background: #fff4e0; border-left: 4px solid #d08000; padding: 4px 8px; }
.isolation-explorer .iso-caption { font-size: 12px; color: #333; margin: 0 0 8px 0; }
.isolation-explorer.iso-busy .iso-results { opacity: 0.55; }
.isolation-explorer.iso-busy { cursor: progress; }
.isolation-explorer .iso-typed, .isolation-explorer .iso-based { display: none !important; }
""" + "".join(
    f".isolation-explorer.iso-bearing-{_slug(t)} .iso-for-{_slug(t)} {{ display: flex !important; }}\n"
    for t in BEARING_TYPES) + "".join(
    f".isolation-explorer.iso-basis-{b} .iso-on-{b} {{ display: flex !important; }}\n" for b in BASES) + """
</style>
"""


_CAPTIONS = {
    "spectrum": ("Figure 1. Site spectrum at 5 % damping (black) and at each property set's effective damping "
                 "(dashed, lower blue, nominal grey, upper red); squares mark the isolated periods on their own "
                 "damped curve, the circle the fixed-base building; hollow grey marks a pinned alternative."),
    "loops": ("Figure 2. Force-displacement loops of the whole isolation plane at D for each property set "
              "(lower bound blue, nominal grey, upper bound red); the black vertical line is D_TM (with "
              "torsion), the red one the bearing's displacement capacity."),
    "trade": ("Figure 3. Trade-off: D_TM against the upper-bound base-shear coefficient V_b/W while the chosen "
              "parameter runs over its slider range (labels give its value); the black dot is the current "
              "alternative, the grey one the pinned alternative."),
}


def _figure(x_label: str, y_label: str, title: str):
    import bqplot as bq
    import ipywidgets as w

    sx, sy = bq.LinearScale(), bq.LinearScale()
    axes = [bq.Axis(scale=sx, label=x_label, grid_lines="dashed"),
            bq.Axis(scale=sy, label=y_label, orientation="vertical", grid_lines="dashed", label_offset="45px")]
    figure = bq.Figure(axes=axes, marks=[], title=title, animation_duration=0,
                       fig_margin={"top": 30, "bottom": 45, "left": 60, "right": 15},
                       layout=w.Layout(flex="1 1 360px", min_width="320px", height="300px"),
                       legend_location="top-right", legend_style={"font-size": "10px"})
    return figure, sx, sy


def _lines(bq, sx, sy, colour, label="", style="solid", width=1.5):
    return bq.Lines(x=[0.0, 1.0], y=[0.0, 0.0], scales={"x": sx, "y": sy}, colors=[colour], line_style=style,
                    stroke_width=width, labels=[label] if label else [], display_legend=bool(label))


def _points(bq, sx, sy, colour, marker="square", label="", fill=True):
    return bq.Scatter(x=[0.0], y=[0.0], scales={"x": sx, "y": sy}, colors=[colour], marker=marker,
                      default_size=70, fill=fill, stroke=colour, labels=[label] if label else [],
                      display_legend=bool(label))
