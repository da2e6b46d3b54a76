"""A prepared notebook as one Typst document, and its compilation to PDF.

The document is made from the notebook's cells alone, with no special case for
any cell: markdown cells and ``text/markdown`` outputs through
:func:`~isolation.output.typeset.markup.markdown_to_typst`; outputs carrying
:data:`~isolation.output.tables.table.TYPST_MIME` (e.g. :class:`isolation.output.tables.Table`)
as they are; images (SVG, PNG, JPEG) as figures, numbered when their output
metadata holds a ``caption`` (see :func:`isolation.output.plots.captioned`); a
``text/latex`` output only when it is math. Input code, console text,
plain-text results and HTML are left out, as in the LaTeX report.

Compilation uses the ``typst`` wheel in process with the fonts of
:mod:`isolation.output.typeset.fonts` and no system fonts and no network.
"""

from __future__ import annotations

import base64
import re
import struct
import tempfile
from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any, Mapping

from isolation.output.tables.symbols import typst_text
from isolation.output.tables.table import TYPST_MIME
from isolation.output.typeset import fonts
from isolation.output.typeset.markup import markdown_to_typst, tex_math, typst_string

__all__ = ["TypstDocument", "build_document", "compile_pdf", "warn_replaced", "FontCoverageWarning",
           "TEMPLATE_FILE", "PAPER_SIZES"]

TEMPLATE_FILE = Path(__file__).resolve().parent / "report.typ"
"""The report's Typst template (page, title page, header and footer, figure and table style)."""

PAPER_SIZES = {"a4": (210.0, 297.0), "letter": (215.9, 279.4)}
"""Paper width and height per paper name. [mm]"""

_MARGIN_X = 22.0  # side margins of the template [mm]
_FIGURE_WIDTH = 0.92  # figures take this share of the text width at most [-]
_FIGURE_HEIGHT = 0.42  # and this share of the paper height at most [-]
_IMAGE_TYPES = (("image/svg+xml", "svg"), ("image/png", "png"), ("image/jpeg", "jpg"))
_LATEX_MATH = re.compile(r"^\s*(?:\$\$(.+)\$\$|\$(.+)\$|\\\[(.+)\\\]|\\\((.+)\\\))\s*$", re.S)
_LABEL = re.compile(r"^[A-Za-z][A-Za-z0-9_-]*$")


class FontCoverageWarning(UserWarning):
    """Characters no embedded font covers were printed as their code points instead."""


def warn_replaced(document: "TypstDocument", stacklevel: int = 3) -> None:
    """Warn (:class:`FontCoverageWarning`) naming the characters the document had to replace."""
    if document.replaced:
        import warnings

        warnings.warn("the report's fonts lack " + ", ".join(document.replaced)
                      + "; printed as code points (U+XXXX) instead", FontCoverageWarning, stacklevel=stacklevel)


@dataclass
class TypstDocument:
    """Typst source of a report with the files it reads.

    Attributes
    ----------
    source : str
        The whole document (template included).
    files : dict
        Relative path -> bytes of each figure the source reads.
    replaced : list of str
        Characters no font covers, written as their code point instead.
    notes : list of str
        What was left out (outputs of no printable kind, references to
        unknown labels), one line each.
    """

    source: str
    files: dict[str, bytes] = field(default_factory=dict)
    replaced: list[str] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)


@lru_cache(maxsize=1)
def _template() -> str:
    return TEMPLATE_FILE.read_text(encoding="utf-8")


def _fields_literal(fields: Mapping[str, Any]) -> str:
    pairs = [f"{key}: {typst_string(value)}" for key, value in fields.items() if value not in (None, "")]
    return "(" + ", ".join(pairs) + (",)" if len(pairs) == 1 else ")") if pairs else "(:)"


def _list_literal(values) -> str:
    return "(" + ", ".join(typst_string(v) for v in values) + ",)"


def _labels(nb) -> set[str]:
    found = set()
    for cell in nb.cells:
        for output in cell.get("outputs", []) if cell.cell_type == "code" else []:
            for meta in output.get("metadata", {}).values():
                if isinstance(meta, Mapping) and _LABEL.match(str(meta.get("label", ""))):
                    found.add(str(meta["label"]))
    return found


def _image_size(data: bytes, kind: str) -> tuple[float, float] | None:
    """Pixel width and height of a PNG (from its header), else None."""
    if kind == "png" and data[:8] == b"\x89PNG\r\n\x1a\n" and len(data) >= 24:
        width, height = struct.unpack(">II", data[16:24])
        return float(width), float(height)
    return None


class _Builder:
    def __init__(self, nb, paper: str):
        self.paper = paper
        self.labels = _labels(nb)
        self.files: dict[str, bytes] = {}
        self.notes: list[str] = []
        self.parts: list[str] = []

    def markdown(self, text: str) -> str:
        typst, dropped = markdown_to_typst(text, labels=self.labels)
        for label in dropped:
            self.notes.append(f"a reference to '#{label}' names no figure or table; its text was kept")
        return typst

    def cell(self, index: int, cell) -> None:
        if cell.cell_type == "markdown":
            self.parts.append(self.markdown(cell.source))
        elif cell.cell_type == "raw":
            mime = cell.get("metadata", {}).get("raw_mimetype", "")
            if mime == TYPST_MIME:
                self.parts.append(cell.source)
        elif cell.cell_type == "code":
            for output in cell.get("outputs", []):
                made = self.output(index, output)
                if made:
                    self.parts.append(made)

    def output(self, index: int, output) -> str:
        if output.get("output_type") not in ("display_data", "execute_result"):
            return ""  # console text and errors are not part of a client report
        data = output.get("data", {})
        metadata = output.get("metadata", {})
        if TYPST_MIME in data:
            return _text(data[TYPST_MIME])
        for mime, extension in _IMAGE_TYPES:
            if mime in data:
                return self.figure(data[mime], mime, extension, metadata.get(mime, {}) or {})
        if "text/markdown" in data:
            return self.markdown(_text(data["text/markdown"]))
        if "text/latex" in data:
            match = _LATEX_MATH.match(_text(data["text/latex"]))
            if match:
                return "$ " + tex_math(next(g for g in match.groups() if g)) + " $"
            self.notes.append(f"cell {index}: an output with LaTeX only (no math) was left out")
            return ""
        printable = set(data) - {"text/plain", "text/html", "application/javascript"}
        if printable:
            self.notes.append(f"cell {index}: an output of type {', '.join(sorted(printable))} was left out")
        return ""

    def figure(self, payload: Any, mime: str, extension: str, meta: Mapping[str, Any]) -> str:
        if extension == "svg":
            data = _text(payload).encode("utf-8")
        else:
            data = base64.b64decode(_text(payload))
        name = f"figures/figure-{len(self.files) + 1}.{extension}"
        self.files[name] = data
        width = self._width(data, extension)
        image = f"image({typst_string(name)}, width: {width})"
        caption = str(meta.get("caption", "") or "")
        if not caption:
            return f"#align(center, {image})"
        label = str(meta.get("label", ""))
        label = f" <{label}>" if _LABEL.match(label) else ""
        return f"#figure({image},\n  caption: [{typst_text(caption)}],\n){label}"

    def _width(self, data: bytes, extension: str) -> str:
        paper_width, paper_height = PAPER_SIZES[self.paper]
        text_width = paper_width - 2 * _MARGIN_X
        width = _FIGURE_WIDTH * text_width
        size = _image_size(data, extension)
        if size and size[1] > 0:
            width = min(width, _FIGURE_HEIGHT * paper_height * size[0] / size[1])
        return f"{width:.1f}mm"


def _text(value: Any) -> str:
    return "".join(value) if isinstance(value, list) else str(value)


def build_document(nb, *, fields: Mapping[str, Any], paper: str = "a4") -> TypstDocument:
    """The Typst document of a prepared notebook.

    Parameters
    ----------
    nb : nbformat.NotebookNode
        The notebook (its code inputs are never shown).
    fields : mapping
        Title-page fields (see :data:`isolation.output.report.TITLE_FIELDS`); ``title`` required.
    paper : {"a4", "letter"}
        Paper size.

    Returns
    -------
    TypstDocument
    """
    if paper not in PAPER_SIZES:
        raise ValueError(f"paper = {paper!r} is not allowed: must be one of 'a4', 'letter'")
    builder = _Builder(nb, paper)
    for index, cell in enumerate(nb.cells):
        builder.cell(index, cell)
    fallback = fonts.fallback_families()
    body_fonts = ("Libertinus Serif",) + fallback + ("New Computer Modern",)
    sans_fonts = ("Noto Sans",) + tuple(f for f in fallback if f != "Noto Sans") + ("Libertinus Serif",)
    head = (
        f"#let body-fonts = {_list_literal(body_fonts)}\n"
        f"#let sans-fonts = {_list_literal(sans_fonts)}\n"
        + _template()
        + "\n#show: isolation-report.with(\n"
        + f"  fields: {_fields_literal(fields)},\n"
        + f"  paper: {typst_string(paper)},\n)\n\n"
    )
    body = "\n\n".join(part.strip("\n") for part in builder.parts if part.strip())
    source, replaced = fonts.replace_uncovered(head + body + "\n")
    return TypstDocument(source=source, files=builder.files, replaced=replaced, notes=builder.notes)


def compile_pdf(document: TypstDocument) -> bytes:
    """Typeset a :class:`TypstDocument` into PDF bytes.

    Raises
    ------
    isolation.errors.RunError
        Typst reported an error; the message quotes it.
    """
    import typst

    from isolation.errors import RunError

    with tempfile.TemporaryDirectory(prefix="isolation-typst-") as build:
        root = Path(build)
        for name, data in document.files.items():
            target = root / name
            target.parent.mkdir(parents=True, exist_ok=True)
            target.write_bytes(data)
        (root / "report.typ").write_text(document.source, encoding="utf-8")
        try:
            return typst.compile(str(root / "report.typ"), root=str(root), font_paths=_fonts(),
                                 ignore_system_fonts=True, format="pdf")
        except typst.TypstError as error:
            detail = " ".join(str(getattr(error, "message", error)).split())
            hints = "; ".join(getattr(error, "hints", []) or [])
            raise RunError(f"typst failed on the report: {detail}" + (f" (hint: {hints})" if hints else "")) from None


@lru_cache(maxsize=1)
def _fonts():
    import typst

    return typst.Fonts(include_system_fonts=False, include_embedded_fonts=True,
                       font_paths=[str(d) for d in fonts.font_dirs()])
