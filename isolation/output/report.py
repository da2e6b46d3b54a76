"""Client report: an executed workbook to a PDF (Typst or XeLaTeX) or, failing both, HTML.

Two engines make the PDF:

* ``"typst"`` (the default): :mod:`isolation.output.typeset` typesets the report with
  the ``typst`` wheel from PyPI, in process, fonts embedded, no network;
* ``"latex"``: nbconvert's LaTeX exporter with the project's own template
  (``templates/isolation_report``) and XeLaTeX (Debian packages).

The report shows no code: input cells, console text and plain-text outputs are
left out; markdown, tables (see :mod:`isolation.output.tables`) and figures with
captions (see :func:`isolation.output.plots.captioned`) are kept.

Title-page fields (title, project, client, date, revision, prepared_by,
checked_by) come, in rising order of precedence, from the notebook metadata
``isolation_report``, from a :func:`title_block` output that the workbook
displays, and from the ``title_fields`` argument of :func:`render`.

The default engine falls back to LaTeX when Typst cannot run; when the chosen
engine cannot run (and, by default, neither can), :func:`render` writes
``report.html`` instead and warns with the exact reason and what to install.
"""

from __future__ import annotations

import copy
import datetime as _dt
import os
import shutil
import subprocess
import tempfile
import warnings
from pathlib import Path
from typing import Any, Mapping

from isolation.errors import RunError
from isolation.files import write_bytes_atomic
from isolation.output.report_html import (  # noqa: F401 - defined there
    _SCOPE_HTML,
    _caption_figures_as_text,
    _md_cell,
    _nbformat,
    _render_html,
)
from isolation.validate import one_of

__all__ = [
    "render",
    "preload",
    "latex_source",
    "title_block",
    "missing_tools",
    "install_hint",
    "TexMissingWarning",
    "PdfUnavailableWarning",
    "ENGINES",
    "engine_problem",
    "TEMPLATE_DIR",
    "TITLE_FIELDS",
    "REPORT_FIELDS_MIME",
    "TEX_PACKAGES",
]

TEMPLATE_DIR = Path(__file__).resolve().parents[2] / "templates"
"""Folder holding the report template ``isolation_report``."""

TEMPLATE_NAME = "isolation_report"

TITLE_FIELDS = ("title", "project", "client", "date", "revision", "prepared_by", "checked_by")
"""Title-page fields a report understands."""

REPORT_FIELDS_MIME = "application/vnd.isolation.report-fields+json"
"""Output type by which a workbook hands title-page fields to :func:`render`."""

TEX_PACKAGES = (
    "texlive-xetex", "texlive-fonts-recommended", "texlive-plain-generic", "texlive-latex-extra", "pandoc",
)
"""Debian packages the PDF report needs."""

PAPERS = ("a4", "letter")

ENGINES = ("typst", "latex")
"""PDF engines, the default first."""

_XELATEX_RUNS = 2  # table of contents and "page N of M" settle on the second run


class PdfUnavailableWarning(UserWarning):
    """No PDF engine could run: the report was written as HTML instead (the message says why)."""


class TexMissingWarning(PdfUnavailableWarning):
    """XeLaTeX or pandoc is missing (and Typst, when it was asked for, could not run): HTML instead."""


def preload(engine: str | None = None) -> None:
    """Import ahead what :func:`render` needs with ``engine`` (default Typst): the record command
    runs it while it waits for the workbook's kernel, so the report starts at once when the workbook ends."""
    _nbformat()
    if (engine or "typst") == "typst" and engine_problem("typst") is None:
        import isolation.output.typeset.document  # noqa: F401


def engine_problem(engine: str) -> str | None:
    """Why ``engine`` ("typst" or "latex") cannot make a PDF on this machine, or None when it can."""
    one_of("engine", engine, ENGINES)
    if engine == "latex":
        missing = missing_tools()
        return install_hint(missing) if missing else None
    try:
        import typst  # noqa: F401 - only whether it imports
    except ImportError as error:
        return (f"the Typst engine needs the typst package ({error}); install it with "
                "`pip install typst` (or reinstall isolation)")
    return None


def missing_tools() -> list[str]:
    """Names of the programs the PDF report needs but this machine lacks."""
    return [tool for tool in ("xelatex", "pandoc") if shutil.which(tool) is None]


def install_hint(missing: list[str] | None = None) -> str:
    """One-line message saying what to install for PDF reports."""
    missing = missing_tools() if missing is None else missing
    return (
        f"PDF report needs {', '.join(missing) or 'xelatex and pandoc'}; install with "
        f"`apt-get install {' '.join(TEX_PACKAGES)}` (Debian/Ubuntu, about 0.7 GB)"
    )


class _TitleBlock:
    """Display object carrying title-page fields from a workbook to the report."""

    def __init__(self, fields: dict[str, str], paper: str | None):
        self.fields = fields
        self.paper = paper

    def _repr_mimebundle_(self, include=None, exclude=None):
        shown = ", ".join(f"{k}: {v}" for k, v in self.fields.items())
        data = dict(self.fields)
        if self.paper:
            data["paper"] = self.paper
        return {REPORT_FIELDS_MIME: data, "text/plain": f"Report fields: {shown}"}


def title_block(*, paper: str | None = None, **fields: Any) -> _TitleBlock:
    """Title-page fields for the report, to ``display()`` in a workbook.

    Parameters
    ----------
    paper : {"a4", "letter"}, optional
        Paper size the workbook asks for; :func:`render` uses it unless its
        own ``paper`` argument is given.
    **fields
        Any of ``title``, ``project``, ``client``, ``date``, ``revision``,
        ``prepared_by``, ``checked_by`` (text). Unknown names are refused.
    """
    if paper is not None:
        one_of("paper", paper, PAPERS)
    return _TitleBlock(_check_fields(fields, "title_block"), paper)


def _check_fields(fields: Mapping[str, Any] | None, where: str) -> dict[str, str]:
    checked: dict[str, str] = {}
    for key, value in (fields or {}).items():
        one_of(f"{where} key", key, TITLE_FIELDS)
        if value is None:
            continue
        if not isinstance(value, (str, int, float, _dt.date)):
            raise ValueError(
                f"{where}.{key} = {value!r} is not allowed: must be text, a number or a date"
            )
        checked[key] = str(value)
    return checked


def _collect_fields(nb, title_fields: Mapping[str, Any] | None) -> tuple[dict[str, str], str | None]:
    """Merge title fields: metadata < workbook title block < arguments; drop the blocks.

    Returns the fields and the paper size the notebook asks for (or None).
    """
    stored = dict(nb.metadata.get("isolation_report", {}))
    paper = stored.pop("paper", None)
    fields = _check_fields(stored, "metadata isolation_report")
    for cell in nb.cells:
        if cell.cell_type != "code":
            continue
        kept = []
        for output in cell.get("outputs", []):
            data = output.get("data", {})
            if REPORT_FIELDS_MIME in data:
                block = dict(data[REPORT_FIELDS_MIME])
                paper = block.pop("paper", None) or paper
                fields.update(_check_fields(block, "title_block"))
            else:
                kept.append(output)
        cell.outputs = kept
    fields.update(_check_fields(title_fields, "title_fields"))
    fields.setdefault("title", "Seismic isolation feasibility study")
    fields.setdefault("date", _dt.datetime.now(_dt.timezone.utc).date().isoformat())
    return fields, paper


def _drop_console_text(nb) -> None:
    """Remove console text (prints, warnings, plain-text results): a report shows none."""
    for cell in nb.cells:
        if cell.cell_type == "code":
            cell.outputs = [o for o in cell.get("outputs", []) if not _console_only(o)]


def _console_only(output) -> bool:
    kind = output.get("output_type")
    if kind == "stream":
        return True
    if kind in ("display_data", "execute_result"):
        return set(output.get("data", {})) <= {"text/plain"}
    return False


def render(
    notebook_path: str | os.PathLike,
    out_dir: str | os.PathLike,
    *,
    paper: str | None = "a4",
    title_fields: Mapping[str, Any] | None = None,
    engine: str | None = None,
) -> Path:
    """Turn an executed workbook into the client report.

    Parameters
    ----------
    notebook_path : path
        Executed notebook (``.ipynb``).
    out_dir : path
        Folder for ``report.pdf`` (or ``report.html``); created when missing.
    paper : {"a4", "letter"} or None
        Paper size of the PDF; None takes the workbook's choice (its
        :func:`title_block`), else A4.
    title_fields : mapping, optional
        Title-page fields (see :data:`TITLE_FIELDS`); these win over the
        notebook's own. A missing date becomes today's (UTC).
    engine : {"typst", "latex"} or None
        PDF engine; None: Typst, or LaTeX when Typst cannot run.

    Returns
    -------
    Path
        ``out_dir/report.pdf``, or ``out_dir/report.html`` when the engine
        cannot run (a :class:`TexMissingWarning` then gives the exact reason and
        what to install).

    Raises
    ------
    ValueError
        Bad ``paper``, ``engine`` or title field; notebook missing or unreadable.
    RunError
        The typesetter failed; the message quotes its first error.
    """
    if paper is not None:
        one_of("paper", paper, PAPERS)
    if engine is not None:
        one_of("engine", engine, ENGINES)
    source = Path(notebook_path)
    if not source.is_file():
        raise ValueError(f"notebook_path = {str(source)!r} is not allowed: must be an existing .ipynb file")
    try:
        nb = _nbformat().read(source, as_version=4)
    except Exception as exc:  # nbformat raises several types for a bad file
        raise ValueError(
            f"notebook_path = {str(source)!r} is not allowed: must be a readable notebook ({exc})"
        ) from None
    nb = copy.deepcopy(nb)
    fields, asked = _collect_fields(nb, title_fields)
    paper = paper or one_of("paper asked by the workbook", asked or "a4", PAPERS)
    _drop_console_text(nb)
    nb.metadata["isolation_report"] = {**fields, "paper": paper}
    target = Path(out_dir)
    target.mkdir(parents=True, exist_ok=True)

    chosen, reasons = None, []
    for candidate in ([engine] if engine else list(ENGINES)):
        problem = engine_problem(candidate)
        if problem is None:
            chosen = candidate
            break
        reasons.append(problem)
    if chosen is None:
        path = _render_html(nb, target, fields)
        warnings.warn(f"{'; '.join(reasons)}; wrote {path} instead", TexMissingWarning, stacklevel=2)
        return path
    if chosen == "typst":
        return _render_typst(nb, target, fields, paper)
    return _render_pdf(nb, target, source.stem)


def _render_typst(nb, target: Path, fields: dict[str, str], paper: str) -> Path:
    from isolation.output.typeset.document import build_document, compile_pdf, warn_replaced

    document = build_document(nb, fields=fields, paper=paper)
    warn_replaced(document, stacklevel=4)
    pdf = target / "report.pdf"
    write_bytes_atomic(pdf, compile_pdf(document))
    return pdf


def _latex_exporter():
    from nbconvert import LatexExporter

    return LatexExporter(
        template_name=TEMPLATE_NAME,
        extra_template_basedirs=[str(TEMPLATE_DIR)],
        exclude_input=True,
        exclude_input_prompt=True,
        exclude_output_prompt=True,
    )


def latex_source(nb, *, resources: dict | None = None) -> tuple[str, dict]:
    """LaTeX text and resources (figure files) of a prepared notebook node."""
    name = nb.metadata.get("isolation_report", {}).get("project") or "report"
    res = {"metadata": {"name": str(name)}, "output_files_dir": "figures"}
    res.update(resources or {})
    return _latex_exporter().from_notebook_node(nb, resources=res)


def _render_pdf(nb, target: Path, stem: str) -> Path:
    body, resources = latex_source(nb)
    with tempfile.TemporaryDirectory(prefix="isolation-report-") as build:
        build_dir = Path(build)
        for name, data in resources.get("outputs", {}).items():
            out = build_dir / name
            out.parent.mkdir(parents=True, exist_ok=True)
            out.write_bytes(data)
        (build_dir / "report.tex").write_text(body, encoding="utf-8")
        for _ in range(_XELATEX_RUNS):
            proc = subprocess.run(
                ["xelatex", "-interaction=nonstopmode", "-halt-on-error", "report.tex"],
                cwd=build_dir,
                stdin=subprocess.DEVNULL,
                capture_output=True,
                text=True,
                errors="replace",
            )
            if proc.returncode != 0:
                raise RunError(f"xelatex failed on the report of {stem}: {_first_tex_error(build_dir, proc.stdout)}")
        pdf = target / "report.pdf"
        write_bytes_atomic(pdf, (build_dir / "report.pdf").read_bytes())
    return pdf


def _first_tex_error(build_dir: Path, stdout: str) -> str:
    log = build_dir / "report.log"
    text = log.read_text(errors="replace") if log.exists() else stdout
    for line in text.splitlines():
        if line.startswith("!"):
            return line[1:].strip()
    tail = [line for line in text.splitlines() if line.strip()][-3:]
    return " / ".join(tail) or "no log"


