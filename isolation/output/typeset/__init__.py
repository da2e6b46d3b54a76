"""The client report typeset with Typst: pip-only PDF, fonts embedded, no network.

An executed workbook becomes one Typst document (:func:`build_document`) made
from its cells alone: markdown, Typst markup from outputs such as
:class:`isolation.output.tables.Table`, and captioned figures (numbered, with
cross-references by label). The ``typst`` wheel compiles it in process
(:func:`compile_pdf`) with Noto fonts from PyPI packages
(:mod:`isolation.output.typeset.fonts`); a character no font covers is printed as its
code point and a :class:`FontCoverageWarning` names it.

The same is available to nbconvert as the exporters ``isolation_pdf`` and
``isolation_typst`` (``jupyter nbconvert --to isolation_pdf feasibility.ipynb``).
:func:`isolation.output.report.render` uses it by default (``engine="typst"``).

Modules: :mod:`~isolation.output.typeset.markup` (markdown and TeX math to Typst),
:mod:`~isolation.output.typeset.document` (the document and its compilation),
:mod:`~isolation.output.typeset.fonts`, :mod:`~isolation.output.typeset.exporter`, and the
template ``report.typ``.
"""

from isolation.output.typeset.document import (
    PAPER_SIZES,
    TEMPLATE_FILE,
    FontCoverageWarning,
    TypstDocument,
    build_document,
    compile_pdf,
)
from isolation.output.typeset.markup import markdown_to_typst, tex_math

__all__ = [
    "TypstDocument",
    "build_document",
    "compile_pdf",
    "TypstPdfExporter",
    "TypstReportExporter",
    "FontCoverageWarning",
    "markdown_to_typst",
    "tex_math",
    "TEMPLATE_FILE",
    "PAPER_SIZES",
]


def __getattr__(name: str):
    # The exporters import nbconvert (about a second): only when asked for.
    if name in ("TypstPdfExporter", "TypstReportExporter"):
        from isolation.output.typeset import exporter

        return getattr(exporter, name)
    raise AttributeError(f"module 'isolation.output.typeset' has no attribute {name!r}")
