"""Client report: both PDF engines (Typst, XeLaTeX), HTML fallback, title fields.

The notebooks here are built by hand with outputs already in place (no kernel),
so each test checks the render pipeline alone. Outside references: page sizes
of ISO 216 (A4 = 210 x 297 mm = 595.3 x 841.9 pt) and ANSI letter
(8.5 x 11 in = 612 x 792 pt), read back with poppler's pdfinfo; the text of
the PDF as poppler's pdftotext extracts it, NFKC-normalised (Unicode Standard
Annex #15) so math italic letters read as plain ones.
"""

from __future__ import annotations

import base64
import re
import subprocess
import unicodedata
import warnings

import nbformat
import pytest
from matplotlib.figure import Figure
from nbformat.v4 import new_code_cell, new_markdown_cell, new_notebook, new_output

from isolation.errors import RunError
from isolation.output import report
from isolation.output.plots import captioned
from isolation.output.tables import Table
from tools import PDF_READERS, require_pdf_tools, require_tools

CODE_MARKER = "import_secret_marker_xyz"
PRINTED = "PRINTED_CONSOLE_TEXT"
PLAIN = "PLAIN_RESULT_TEXT"




def _png_output(caption: str) -> dict:
    fig = Figure(figsize=(4, 2.5))
    fig.add_subplot().plot([0, 1, 2], [0, 1, 4])
    data, meta = captioned(fig, caption, dpi=60)._repr_png_()
    return new_output(
        "display_data",
        data={"image/png": base64.b64encode(data).decode(), "text/plain": "<Figure>"},
        metadata={"image/png": meta},
    )


def _table_output(table: Table) -> dict:
    # What IPython's display() stores: the mimebundle (Typst) plus the markdown and LaTeX forms.
    from IPython.core.formatters import DisplayFormatter

    data, metadata = DisplayFormatter().format(table)
    return new_output("display_data", data=data, metadata=metadata)


def _notebook(path, *, extra_latex: str | None = None, paper: str | None = None) -> str:
    table = Table(
        columns=("Bound", "D_M [m]", "T_M [s]"),
        rows=(("lower", 0.3127, 3.046), ("upper", 0.2514, 2.702)),
        caption="Equivalent-linear results for both bounds",
        notes="Invented for the test; D_M at T_M.",
    )
    outputs = [
        new_output("stream", name="stdout", text=PRINTED + "\n"),
        _png_output("Site spectrum & periods (5 % damping) with T_fb"),
        _table_output(table),
        new_output("display_data", data=report.title_block(project="Invented Hillside Depot",
                                                            client="Demo Client Board",
                                                            revision="C", paper=paper)._repr_mimebundle_()),
        new_output("execute_result", data={"text/plain": repr(PLAIN)}, execution_count=1),
    ]
    if extra_latex:
        outputs.append(new_output("display_data", data={"text/latex": extra_latex}))
    nb = new_notebook()
    nb.cells = [
        new_code_cell("quick: bool = True", metadata={"tags": ["parameters"]}),
        new_markdown_cell("# Scope\n\nA feasibility check where D ≤ capacity and β = 0.25.\n"),
        new_code_cell(CODE_MARKER, outputs=outputs),
    ]
    target = path / "small.ipynb"
    nbformat.write(nb, target)
    return str(target)


def _text(pdf) -> str:
    raw = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True,
                         check=True).stdout
    # One line (phrases may wrap in the PDF); NFKC turns math italic letters (U+1D400 block) into plain
    # ones; pdftotext puts a space after a subscript, before punctuation, which is dropped.
    text = " ".join(unicodedata.normalize("NFKC", raw).split())
    return re.sub(r" (?=[.,;:)])", "", text)


def _page_size(pdf) -> tuple[float, float]:
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    line = next(text for text in info.splitlines() if text.startswith("Page size:"))
    parts = line.split()
    return float(parts[2]), float(parts[4])


def _require(engine: str) -> None:
    if engine == "latex":
        require_pdf_tools()
    else:
        require_tools(*PDF_READERS)


@pytest.fixture(scope="module", params=["typst", "latex"])
def a4_report(request, tmp_path_factory):
    engine = request.param
    _require(engine)
    folder = tmp_path_factory.mktemp(f"a4-{engine}")
    source = _notebook(folder)
    pdf = report.render(source, folder / "out", title_fields={"prepared_by": "J. Doe (invented)"},
                        engine=engine)
    return pdf, _text(pdf)


@pytest.mark.slow
def test_pdf_is_written_with_title_fields(a4_report):
    pdf, text = a4_report
    assert pdf.name == "report.pdf" and pdf.stat().st_size > 10_000
    assert pdf.read_bytes().startswith(b"%PDF")
    for expected in ("Invented Hillside Depot", "Demo Client Board", "J. Doe (invented)", "Prepared by",
                     "Revision", "Checked by"):
        assert expected in text
    # Fields come from the workbook's title block; render() adds the date when none is given.
    assert report.TITLE_FIELDS and "Date" in text


@pytest.mark.slow
def test_pdf_shows_no_code_and_no_console_text(a4_report):
    _, text = a4_report
    for hidden in (CODE_MARKER, PRINTED, PLAIN, "quick: bool", "Report fields:"):
        assert hidden not in text


@pytest.mark.slow
def test_pdf_numbers_figures_and_tables_and_keeps_table_values(a4_report):
    _, text = a4_report
    assert "Figure 1: Site spectrum & periods (5 % damping)" in text
    assert "Table 1: Equivalent-linear results for both bounds" in text
    # Table values rounded to 3 significant figures by isolation.output.tables.
    for number in ("0.313", "3.05", "0.251", "2.70"):
        assert number in text


@pytest.mark.slow
def test_pdf_sets_symbols_as_subscripts(a4_report):
    _, text = a4_report
    # Subscripts come out of pdftotext as plain letters after the base letter, with no underscore.
    assert "Bound DM [m] TM [s]" in text
    assert "with Tfb" in text  # figure caption
    assert "Invented for the test; DM at TM." in text  # table notes
    for plain in ("D_M", "T_M", "T_fb", "D\\_M"):
        assert plain not in text


@pytest.mark.slow
def test_pdf_has_scope_box_header_footer_and_special_glyphs(a4_report):
    _, text = a4_report
    assert "Scope and cautions" in text
    assert "not a construction design" in text
    assert "licensed structural engineer" in text
    assert "Feasibility study" in text and "not for construction" in text  # running header
    assert "Page 1 of" in text  # footer with page total
    assert "≤" in text  # glyph missing from the LaTeX text font, mapped by the template


@pytest.mark.slow
def test_paper_sizes(a4_report, tmp_path):
    pdf, _ = a4_report
    engine = "latex" if (pdf.parent.parent.name.startswith("a4-latex")) else "typst"
    width, height = _page_size(pdf)
    assert width == pytest.approx(595.28, abs=1.0) and height == pytest.approx(841.89, abs=1.0)  # ISO 216 A4
    # paper=None: the workbook's title block chooses letter.
    letter = report.render(_notebook(tmp_path, paper="letter"), tmp_path / "out", paper=None, engine=engine)
    width, height = _page_size(letter)
    assert width == pytest.approx(612.0, abs=1.0) and height == pytest.approx(792.0, abs=1.0)  # ANSI letter


@pytest.mark.slow
def test_tex_error_raises_run_error_and_leaves_no_pdf(tmp_path):
    require_pdf_tools()
    source = _notebook(tmp_path, extra_latex=r"\thiscommanddoesnotexist")
    with pytest.raises(RunError, match="Undefined control sequence"):
        report.render(source, tmp_path / "out", engine="latex")
    assert not (tmp_path / "out" / "report.pdf").exists()
    assert not list((tmp_path / "out").glob(".*part"))


def test_latex_source_uses_our_template(tmp_path):
    nb = nbformat.read(_notebook(tmp_path), as_version=4)
    nb.metadata["isolation_report"] = {"project": "P", "paper": "letter"}
    body, resources = report.latex_source(nb)
    assert r"\documentclass[11pt,letterpaper]{article}" in body
    assert r"\usepackage{fancyhdr}" in body and r"\begin{scopebox}" in body
    assert CODE_MARKER not in body
    assert any(name.endswith(".png") for name in resources["outputs"])


def _no_typst(monkeypatch) -> None:
    """Make ``import typst`` fail, as on a machine without the wheel."""
    import sys

    monkeypatch.setitem(sys.modules, "typst", None)


def test_html_fallback_when_no_engine_can_run(tmp_path, monkeypatch):
    monkeypatch.setattr(report, "missing_tools", lambda: ["xelatex"])
    _no_typst(monkeypatch)
    source = _notebook(tmp_path)
    with pytest.warns(report.TexMissingWarning) as caught:
        path = report.render(source, tmp_path / "out", title_fields={"prepared_by": "J. Doe"})
    message = str(caught[0].message)
    # The exact reason for each engine: the missing wheel and the missing Debian packages.
    assert "typst package" in message and "pip install typst" in message
    for package in ("texlive-xetex", "texlive-fonts-recommended", "texlive-plain-generic", "texlive-latex-extra",
                    "pandoc"):
        assert package in message
    assert path == tmp_path / "out" / "report.html"
    html = path.read_text()
    for expected in ("Invented Hillside Depot", "J. Doe", "not a construction design",
                     "Figure 1: Site spectrum", "Equivalent-linear results for both bounds"):
        assert expected in html
    for hidden in (CODE_MARKER, PRINTED, PLAIN):
        assert hidden not in html
    assert not (tmp_path / "out" / "report.pdf").exists()


def test_latex_engine_asked_for_but_missing_gives_html_with_the_reason(tmp_path, monkeypatch):
    monkeypatch.setattr(report, "missing_tools", lambda: ["xelatex"])
    with pytest.warns(report.TexMissingWarning, match="PDF report needs xelatex") as caught:
        path = report.render(_notebook(tmp_path), tmp_path / "out", engine="latex")
    assert path.suffix == ".html" and "typst" not in str(caught[0].message)


def test_default_engine_falls_back_to_latex_without_typst(tmp_path, monkeypatch):
    _no_typst(monkeypatch)
    calls = []
    monkeypatch.setattr(report, "missing_tools", lambda: [])
    monkeypatch.setattr(report, "_render_pdf", lambda nb, target, stem: calls.append(stem) or target / "x.pdf")
    path = report.render(_notebook(tmp_path), tmp_path / "out")
    assert calls == ["small"] and path.name == "x.pdf"


@pytest.mark.parametrize("engine", ["tex", "html", "", "Typst"])
def test_bad_engine_is_refused(tmp_path, engine):
    with pytest.raises(ValueError, match=r"engine = .* must be one of 'typst', 'latex'"):
        report.render(_notebook(tmp_path), tmp_path / "out", engine=engine)


def test_title_fields_argument_wins_over_workbook(tmp_path, monkeypatch):
    monkeypatch.setattr(report, "missing_tools", lambda: ["pandoc"])
    _no_typst(monkeypatch)
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", report.TexMissingWarning)
        path = report.render(_notebook(tmp_path), tmp_path / "out", title_fields={"client": "Other Board"})
    html = path.read_text()
    assert "Other Board" in html and "Demo Client Board" not in html


@pytest.mark.parametrize("paper", ["A5", "a3", "", 4])
def test_bad_paper_is_refused(tmp_path, paper):
    with pytest.raises(ValueError, match=r"paper = .* must be one of 'a4', 'letter'"):
        report.render(_notebook(tmp_path), tmp_path / "out", paper=paper)
    with pytest.raises(ValueError, match=r"paper = .* must be one of 'a4', 'letter'"):
        report.title_block(project="x", paper=paper)


def test_unknown_title_field_is_refused(tmp_path):
    with pytest.raises(ValueError, match=r"title_fields key = 'author'.*'prepared_by'"):
        report.render(_notebook(tmp_path), tmp_path / "out", title_fields={"author": "x"})
    with pytest.raises(ValueError, match="title_block key = 'colour'"):
        report.title_block(colour="red")


def test_missing_or_broken_notebook_is_refused(tmp_path):
    with pytest.raises(ValueError, match="notebook_path = .*existing"):
        report.render(tmp_path / "nope.ipynb", tmp_path / "out")
    broken = tmp_path / "broken.ipynb"
    broken.write_text("{not json")
    with pytest.raises(ValueError, match="notebook_path = .*readable notebook"):
        report.render(broken, tmp_path / "out")


def test_install_hint_names_the_debian_packages():
    hint = report.install_hint(["xelatex"])
    assert "xelatex" in hint
    assert ("apt-get install texlive-xetex texlive-fonts-recommended texlive-plain-generic texlive-latex-extra "
            "pandoc") in hint
