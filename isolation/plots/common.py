"""Shared pieces of the figures: Agg canvas, colours, captions for the report."""

from __future__ import annotations

import io
from typing import Any

from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.figure import Figure

from isolation.tables.symbols import latex_text

__all__ = ["WIDTH", "COLOURS", "captioned"]


WIDTH = 6.4  # figure width [in]; the report scales it to the text width


COLOURS = {"lower": "#1f5fa8", "nominal": "#4a4a4a", "upper": "#b23a10", "fixed": "#7a7a7a"}


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
    return f"C{index % 10}"


class _Captioned:
    """A figure as PNG with its caption in the output metadata."""

    def __init__(self, figure: Figure, caption: str, dpi: int):
        self.figure = figure
        self.caption = str(caption)
        self.dpi = int(dpi)

    def png(self) -> bytes:
        buffer = io.BytesIO()
        self.figure.savefig(buffer, format="png", dpi=self.dpi)
        return buffer.getvalue()

    def _repr_png_(self):
        # The report template prints caption_latex: escaped, symbols (D_M, T_fb) as subscripts.
        return self.png(), {"caption": self.caption, "caption_latex": latex_text(self.caption)}


def captioned(figure: Figure, caption: str, *, dpi: int = 150) -> _Captioned:
    """Wrap a figure for ``display()`` so the report numbers and captions it.

    Parameters
    ----------
    figure : matplotlib.figure.Figure
        The figure.
    caption : str
        Caption text (plain text; units in brackets; symbols written plainly,
        e.g. ``D_M``, come out as subscripts in the PDF).
    dpi : int
        Resolution of the embedded PNG. [dots per inch]
    """
    if not isinstance(figure, Figure):
        raise ValueError(f"figure = {figure!r} is not allowed: must be a matplotlib Figure")
    return _Captioned(figure, caption, dpi)
