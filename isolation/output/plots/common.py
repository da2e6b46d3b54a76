"""Shared pieces of the figures: Agg canvas, colours, captions for the report."""

from __future__ import annotations

import io
import re
from dataclasses import dataclass
from functools import lru_cache
from typing import Any

import numpy as np
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from isolation.output.tables.symbols import latex_text
from isolation.units import SYSTEMS, convert
from isolation.validate import one_of

__all__ = ["WIDTH", "COLOURS", "SERIES_COLOURS", "AxisUnit", "axis_unit", "captioned", "figure_png"]


WIDTH = 6.4  # figure width [in]; the report scales it to the text width


COLOURS = {"elastic": "#8e5ba8", "lower": "#1f5fa8", "nominal": "#4a4a4a", "upper": "#b23a10", "fixed": "#7a7a7a"}
"""The one colour code of every figure (and the live explorer): lower bound blue, nominal grey,
upper bound red, fixed base light grey; the elastic fixed base (second view) purple."""

SERIES_COLOURS = ("#2a9d8f", "#8e6cbf", "#d9930d", "#5c8a3a", "#c2569a", "#3f7f8f", "#a0522d", "#6b8e23",
                  "#7b68ee", "#b8860b")
"""Colours for series that are not property bounds (records, alternatives): none of them is
blue, grey or red, so they are never read as a bound."""


# Unit shown on a figure axis per quantity and display system: (unit name for
# isolation.units.convert, axis label, decimals in legend text). Only names are
# chosen here; every conversion factor comes from isolation.units (pint).
# Displacements are shown in mm rather than the tables' m so loops read easily.
_AXIS_UNITS = {
    "displacement": ("m", {"SI": ("mm", "mm", 0), "US": ("in", "in", 1)}),
    "force": ("kN", {"SI": ("kN", "kN", 0), "US": ("kip", "kip", 0)}),
    "height": ("m", {"SI": ("m", "m", 1), "US": ("ft", "ft", 0)}),
    "energy": ("kN*m", {"SI": ("kN*m", "kN m", 0), "US": ("kip*in", "kip in", 0)}),
}


@dataclass(frozen=True)
class AxisUnit:
    """How a figure shows one quantity: axis label and factor from the internal unit.

    Attributes
    ----------
    label : str
        Unit as written on the axis, e.g. ``"mm"``, ``"in"``, ``"kip"``.
    factor : float
        Display value per internal value (internal units m, kN, kN m). [label/internal]
    decimals : int
        Decimals of a value written in a legend. [-]
    """

    label: str
    factor: float
    decimals: int

    def __call__(self, values: Any) -> Any:
        """Values in the internal unit, converted for display (arrays keep their shape)."""
        return np.asarray(values, dtype=float) * self.factor

    def text(self, value: float) -> str:
        """One internal value as legend text, e.g. ``"300 mm"`` or ``"11.8 in"``."""
        return f"{float(value) * self.factor:.{self.decimals}f} {self.label}"


@lru_cache(maxsize=None)
def _axis_unit(quantity: str, units: str) -> AxisUnit:
    internal, systems = _AXIS_UNITS[quantity]
    unit, label, decimals = systems[units]
    return AxisUnit(label, 1.0 if unit == internal else convert(1.0, internal, unit), decimals)


def axis_unit(quantity: str, units: str = "SI") -> AxisUnit:
    """Display unit of a figure quantity in a unit system.

    Parameters
    ----------
    quantity : str
        ``"displacement"`` (internal m; shown in mm or in), ``"force"``
        (internal kN; kN or kip), ``"height"`` (internal m; m or ft) or
        ``"energy"`` (internal kN m; kN m or kip in).
    units : str
        Display unit system of the study, ``"SI"`` or ``"US"``.

    Raises
    ------
    ValueError
        When ``units`` or ``quantity`` is not one of the allowed names.
    """
    one_of("units", units, SYSTEMS)
    one_of("quantity", quantity, _AXIS_UNITS)
    return _axis_unit(quantity, units)


def _figure(height: float = 3.4, ncols: int = 1, width: float = WIDTH) -> tuple[Figure, Any]:
    fig = Figure(figsize=(width, height), layout="constrained")
    FigureCanvasAgg(fig)
    axes = fig.subplots(1, ncols)
    return fig, axes


def _colour(label: str, index: int) -> str:
    key = str(label).lower()
    for name, colour in COLOURS.items():
        if name in key:
            return colour
    return SERIES_COLOURS[index % len(SERIES_COLOURS)]


def figure_png(figure: Figure, dpi: int = 200) -> bytes:
    """The figure as PNG bytes, drawn once on an Agg canvas at ``dpi``.

    The same pixels as ``figure.savefig(format="png", dpi=dpi)``, with less work:
    one draw (the layout engine runs inside it) where ``savefig`` draws twice; a
    renderer shared by figures of one size, so text measured for one figure (tick
    labels, axis labels) is not measured again for the next; and an opaque figure
    stored as RGB at a light compression level (as large as ``savefig``'s RGBA file,
    and quicker to write and to read back).

    Parameters
    ----------
    figure : matplotlib.figure.Figure
        The figure; its own canvas and resolution are restored afterwards.
    dpi : int
        Resolution. [dots per inch]
    """
    from PIL import Image

    own_canvas, own_dpi = figure.canvas, figure.dpi
    canvas = _SharedRendererCanvas(figure)
    figure.dpi = dpi
    try:
        canvas.draw()
        # the buffer's own shape: Agg truncates a size such as 4.6 in x 200 dpi = 919.99... to 919 pixels,
        # where get_width_height rounds to 920
        image = Image.fromarray(np.asarray(canvas.buffer_rgba()), "RGBA")
        opaque = image.getchannel("A").getextrema()[0] == 255
        image = image.convert("RGB") if opaque else image.copy()
    finally:
        figure.dpi = own_dpi
        figure.set_canvas(own_canvas)
    buffer = io.BytesIO()
    image.save(buffer, format="png", compress_level=_PNG_LEVEL, dpi=(dpi, dpi))
    return buffer.getvalue()


class _SharedRendererCanvas(FigureCanvasAgg):
    """An Agg canvas whose renderer is shared by every figure of the same size and resolution.

    matplotlib keeps the sizes of measured text per renderer; one renderer per figure size
    lets the next figure reuse them. Used for one draw at a time (Agg draws under a lock).
    """

    _renderers: dict = {}

    def get_renderer(self):
        width, height = self.get_width_height(physical=True)  # whole pixels, as FigureCanvasAgg's own
        key = (width, height, self.figure.dpi)
        renderer = self._renderers.get(key)
        if renderer is None:
            if len(self._renderers) >= 8:
                self._renderers.clear()
            from matplotlib.backends.backend_agg import RendererAgg

            renderer = self._renderers[key] = RendererAgg(width, height, self.figure.dpi)
        self.renderer = renderer
        return renderer


_PNG_LEVEL = 1  # zlib level of the figures' PNG files: as small as savefig's RGBA at level 6, quicker


class _Captioned:
    """A figure as PNG with its caption in the output metadata."""

    def __init__(self, figure: Figure, caption: str, dpi: int, label: str = ""):
        self.figure = figure
        self.caption = str(caption)
        self.dpi = int(dpi)
        self.label = str(label)

    def png(self) -> bytes:
        return figure_png(self.figure, self.dpi)

    def _repr_png_(self):
        return self.png(), caption_metadata(self.caption, self.label)


def caption_metadata(caption: str, label: str = "") -> dict:
    """A figure's output metadata in a workbook: its caption for the reports (and its label, if any).

    The LaTeX template prints ``caption_latex``: escaped, symbols (D_M, T_fb) as subscripts; the
    Typst report typesets the plain caption itself.
    """
    meta = {"caption": str(caption), "caption_latex": latex_text(str(caption))}
    if label:
        meta["label"] = str(label)
    return meta


def captioned(figure: Figure, caption: str, *, dpi: int = 200, label: str = "") -> _Captioned:
    """Wrap a figure for ``display()`` so the report numbers and captions it.

    Parameters
    ----------
    figure : matplotlib.figure.Figure
        The figure.
    caption : str
        Caption text (plain text; units in brackets; symbols written plainly,
        e.g. ``D_M``, come out as subscripts in the PDF).
    dpi : int
        Resolution of the embedded PNG (200 prints sharply at the report's
        figure width). [dots per inch]
    label : str
        Name by which report text refers to the figure (letters, digits, ``-``
        and ``_``; a letter first): a markdown link ``[](#label)`` becomes
        "Figure N" in the Typst report. Empty: no label.
    """
    if not isinstance(figure, Figure):
        raise ValueError(f"figure = {figure!r} is not allowed: must be a matplotlib Figure")
    if label and not re.match(r"^[A-Za-z][A-Za-z0-9_-]*$", str(label)):
        raise ValueError(f"label = {label!r} is not allowed: must be letters, digits, '-' or '_', "
                         "beginning with a letter")
    return _Captioned(figure, caption, dpi, label)
