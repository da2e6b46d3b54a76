"""Client report: template, PDF through XeLaTeX, HTML fallback, title fields.

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

from isolation import report
from tools import require_pdf_tools
from isolation.errors import RunError
from isolation.plots import captioned
from isolation.tables import Table

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
    return new_output(
        "display_data",
        data={"text/markdown": table._repr_markdown_(), "text/latex": table._repr_latex_(),
              "text/plain": "table"},
    )


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
    line = next(l for l in info.splitlines() if l.startswith("Page size:"))
    parts = line.split()
    return float(parts[2]), float(parts[4])


@pytest.fixture(scope="module")
def a4_report(tmp_path_factory):
    require_pdf_tools()
    folder = tmp_path_factory.mktemp("a4")
    source = _notebook(folder)
    pdf = report.render(source, folder / "out", title_fields={"prepared_by": "J. Doe (invented)"})
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
    # Table values rounded to 3 significant figures by isolation.tables.
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
    assert "≤" in text  # glyph missing from the text font, mapped by the template


@pytest.mark.slow
def test_paper_sizes(a4_report, tmp_path):
    pdf, _ = a4_report
    width, height = _page_size(pdf)
    assert width == pytest.approx(595.28, abs=1.0) and height == pytest.approx(841.89, abs=1.0)  # ISO 216 A4
    # paper=None: the workbook's title block chooses letter.
    letter = report.render(_notebook(tmp_path, paper="letter"), tmp_path / "out", paper=None)
    width, height = _page_size(letter)
    assert width == pytest.approx(612.0, abs=1.0) and height == pytest.approx(792.0, abs=1.0)  # ANSI letter


@pytest.mark.slow
def test_tex_error_raises_run_error_and_leaves_no_pdf(tmp_path):
    require_pdf_tools()
    source = _notebook(tmp_path, extra_latex=r"\thiscommanddoesnotexist")
    with pytest.raises(RunError, match="Undefined control sequence"):
        report.render(source, tmp_path / "out")
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


def test_html_fallback_when_tex_missing(tmp_path, monkeypatch):
    monkeypatch.setattr(report, "missing_tools", lambda: ["xelatex"])
    source = _notebook(tmp_path)
    with pytest.warns(report.TexMissingWarning) as caught:
        path = report.render(source, tmp_path / "out", title_fields={"prepared_by": "J. Doe"})
    message = str(caught[0].message)
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


def test_title_fields_argument_wins_over_workbook(tmp_path, monkeypatch):
    monkeypatch.setattr(report, "missing_tools", lambda: ["pandoc"])
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
    assert "apt-get install texlive-xetex texlive-fonts-recommended texlive-plain-generic texlive-latex-extra pandoc" in hint
