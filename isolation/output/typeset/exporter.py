"""nbconvert exporters of the Typst report, registered as ``isolation_pdf`` and ``isolation_typst``.

``jupyter nbconvert --to isolation_pdf RECORD/feasibility.ipynb`` writes
``feasibility.pdf`` beside the workbook; ``--to isolation_typst`` the Typst
source (``feasibility.typ``) with its figures in ``feasibility_files/``.
``--TypstReportExporter.paper=letter`` chooses the paper (default: the
workbook's own choice, else A4).
"""

from __future__ import annotations

import copy
from typing import Any

from nbconvert.exporters import Exporter
from traitlets import Unicode, default

from isolation.output.typeset.document import FontCoverageWarning, warn_replaced

__all__ = ["TypstReportExporter", "TypstPdfExporter", "FontCoverageWarning", "prepare"]


def prepare(nb, *, paper: str | None = None, title_fields=None):
    """A copy of ``nb`` ready for a report: title fields collected, console text dropped.

    Returns the notebook copy, the title fields and the paper size.
    """
    from isolation.output import report
    from isolation.validate import one_of

    nb = copy.deepcopy(nb)
    fields, asked = report._collect_fields(nb, title_fields)
    chosen = paper or asked or "a4"
    one_of("paper", chosen, report.PAPERS)
    report._drop_console_text(nb)
    return nb, fields, chosen


class TypstReportExporter(Exporter):
    """Executed workbook -> Typst source of the client report (figures in ``outputs``)."""

    export_from_notebook = "Isolation report (Typst source)"
    output_mimetype = "text/x-typst"

    paper = Unicode(None, allow_none=True, help="Paper size, 'a4' or 'letter' (default: the workbook's "
                    "choice, else 'a4').").tag(config=True)

    @default("file_extension")
    def _file_extension_default(self):
        return ".typ"

    def document(self, nb, resources: dict | None = None):
        """The :class:`~isolation.output.typeset.document.TypstDocument` of ``nb``; warns on replaced characters."""
        from isolation.output.typeset.document import build_document

        title_fields = (resources or {}).get("isolation_title_fields")
        prepared, fields, paper = prepare(nb, paper=self.paper or (resources or {}).get("isolation_paper"),
                                          title_fields=title_fields)
        document = build_document(prepared, fields=fields, paper=paper)
        warn_replaced(document, stacklevel=4)
        for note in document.notes:
            self.log.info("isolation report: %s", note)
        return document

    def from_notebook_node(self, nb, resources: dict | None = None, **kw: Any):
        nb_copy, resources = super().from_notebook_node(nb, resources, **kw)
        document = self.document(nb_copy, resources)
        files_dir = resources.get("output_files_dir") or "figures"
        outputs = resources.setdefault("outputs", {})
        source = document.source
        for name, data in document.files.items():
            target = f"{files_dir}/{name.split('/', 1)[1]}"
            outputs[target] = data
            source = source.replace(f'"{name}"', f'"{target}"')
        return source, resources


class TypstPdfExporter(TypstReportExporter):
    """Executed workbook -> client report as PDF, typeset by Typst (fonts embedded, no network)."""

    export_from_notebook = "Isolation report (PDF, Typst)"
    output_mimetype = "application/pdf"

    @default("file_extension")
    def _file_extension_default(self):
        return ".pdf"

    def from_notebook_node(self, nb, resources: dict | None = None, **kw: Any):
        from isolation.output.typeset.document import compile_pdf

        nb_copy, resources = Exporter.from_notebook_node(self, nb, resources, **kw)
        pdf = compile_pdf(self.document(nb_copy, resources))
        resources["output_extension"] = ".pdf"
        return pdf, resources
