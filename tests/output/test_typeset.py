"""Typst report engine: markdown and math to Typst, fonts, cross-references, the nbconvert exporters.

Outside references: CommonMark 0.31.2 (headings, emphasis, lists, links;
section numbers beside each check); the Unicode Standard 15 for code points
and character names (U+0F00 TIBETAN SYLLABLE OM, U+533B/U+9662 the CJK
ideographs of "hospital", U+1F600 GRINNING FACE); ISO 216 A4 (595.3 x 841.9
pt) and ANSI letter (612 x 792 pt) read back with poppler's pdfinfo; poppler's
pdftotext and pdffonts for what a reader of the PDF gets.
"""

from __future__ import annotations

import subprocess
import sys
import unicodedata
import warnings
from pathlib import Path

import nbformat
import pytest
from IPython.core.formatters import DisplayFormatter
from matplotlib.figure import Figure
from nbformat.v4 import new_code_cell, new_markdown_cell, new_notebook, new_output

from isolation.errors import RunError
from isolation.output import report
from isolation.output.plots import captioned
from isolation.output.tables import TYPST_MIME, Table
from isolation.output.typeset import FontCoverageWarning, build_document, compile_pdf, markdown_to_typst, tex_math
from isolation.output.typeset.fonts import replace_uncovered
from tools import PDF_READERS, require_tools


def _display(obj) -> dict:
    """An output as IPython's display() stores it."""
    data, metadata = DisplayFormatter().format(obj)
    if "image/png" in data and isinstance(data["image/png"], bytes):
        import base64

        data["image/png"] = base64.b64encode(data["image/png"]).decode()
    return new_output("display_data", data=data, metadata=metadata)


def _figure_output(caption: str, label: str = "") -> dict:
    fig = Figure(figsize=(4, 2.5))
    fig.add_subplot().plot([0, 1, 2], [0, 1, 4])
    return _display(captioned(fig, caption, dpi=60, label=label))


def _pdf_text(pdf: Path) -> str:
    raw = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True,
                         check=True).stdout
    return " ".join(unicodedata.normalize("NFKC", raw).split())


def _write(nb, folder: Path) -> Path:
    path = folder / "book.ipynb"
    nbformat.write(nb, path)
    return path


# --------------------------------------------------------------------------
# Markdown and math to Typst (no typesetting)
# --------------------------------------------------------------------------
def test_markdown_blocks_become_typst_markup():
    text, dropped = markdown_to_typst(
        "# Scope\n\nSome *light* and **strong** text.\n\n- one\n- two\n\n1. first\n2. second\n")
    # CommonMark 0.31.2 §4.2 ATX headings, §6.2 emphasis, §5.2-5.3 lists -> Typst's heading,
    # emph/strong and list/enum markup (Typst reference, "Syntax").
    assert text.startswith("= Scope\n\n")
    assert "#emph[light]" in text and "#strong[strong]" in text
    assert "- one\n- two" in text and "+ first\n+ second" in text
    assert dropped == []


def test_markdown_text_is_escaped_not_interpreted():
    # Characters with a meaning in Typst markup (#, $, *, _, <, @, =) are printed as they are.
    # (<tag> would be raw HTML, CommonMark 0.31.2 §6.6, which the report drops as the LaTeX one does.)
    text, _ = markdown_to_typst(r"Cost \#1 at 50 % if 5 < 6 > 4, user@host = x\_y")
    for escaped in ("\\#1", "5 \\< 6 \\> 4", "user\\@host", "\\=", "x\\_y"):
        assert escaped in text
    assert "<tag>" not in markdown_to_typst("a <tag> b")[0]


def test_table_cells_may_break_after_an_underscore_and_only_there():
    # Unicode UAX #14 (Line Breaking), class ZW: U+200B ZERO WIDTH SPACE is a break opportunity of
    # zero width; a long identifier in a narrow column wraps instead of running into the next one.
    text, _ = markdown_to_typst("| variant | note |\n|---|---|\n| radius-2.5_friction-0.04 | a_b |\n\nx_y outside")
    assert "2.5\\_\u200bfriction" in text and "[a\\_\u200bb]" in text
    assert "x\\_y outside" in text  # running text keeps its underscore as it is
    assert replace_uncovered("a\u200bb") == ("a\u200bb", [])  # no font needs a glyph for it


@pytest.mark.parametrize("tex, typst", [
    (r"D_{\mathrm{TM}}", 'D_("TM")'),
    (r"\beta_{\mathrm{M}} \le 0.3", 'beta_("M") <= 0.3'),
    (r"T^{2}", "T^(2)"),
    (r"\frac{a}{b}", "frac(a, b)"),
    (r"\sqrt{x}", "sqrt(x)"),
    (r"x_{i}", "x_(i)"),
])
def test_tex_math_maps_to_typst_math(tex, typst):
    # Typst reference, "Math" (attach, frac, sqrt, symbols beta and <=), common practice.
    assert tex_math(tex) == typst


def test_unknown_tex_command_is_printed_by_name_not_dropped():
    assert "\\\\unknownmacro" in tex_math(r"\unknownmacro + 1")


def test_reference_links_become_references_only_to_known_labels():
    text, dropped = markdown_to_typst("See [](#fig-a), [the table](#tab-b) and [](#missing).",
                                      labels={"fig-a", "tab-b"})
    assert "#ref(<fig-a>);" in text and "#link(<tab-b>)[the table];" in text
    assert dropped == ["missing"] and "<missing>" not in text


def test_uncovered_characters_are_named_and_written_as_code_points():
    # U+0F00 TIBETAN SYLLABLE OM: no Tibetan face is embedded; NUL is a control character.
    text, replaced = replace_uncovered("A\u0f00B\x00C")
    assert text == "A(U+0F00)B(U+0000)C"
    assert replaced == ["U+0000 control character", "U+0F00 TIBETAN SYLLABLE OM"]
    assert replace_uncovered("Plain ASCII & Latin-1: é, β.") == ("Plain ASCII & Latin-1: é, β.", [])


def test_table_carries_typst_markup_with_its_label():
    table = Table(columns=("Bound", "D_M [m]"), rows=(("lower", 0.3127),), caption="Results", label="tab-res",
                  notes="Invented.")
    out = _display(table)
    markup = out["data"][TYPST_MIME]
    assert markup.startswith("#figure(kind: table, caption: [Results]")
    assert '$D_"M"$' in markup and "[0.313]" in markup and markup.rstrip().endswith("<tab-res>")
    assert out["metadata"][TYPST_MIME] == {"label": "tab-res"}
    # The markdown and LaTeX forms are still there for the notebook and the LaTeX engine.
    assert "text/markdown" in out["data"] and "text/latex" in out["data"]


@pytest.mark.parametrize("label", ["1abc", "with space", "a<b", "ä"])
def test_bad_labels_are_refused(label):
    with pytest.raises(ValueError, match="label = .* must be letters, digits"):
        Table(columns=("a",), rows=((1,),), label=label)
    with pytest.raises(ValueError, match="label = .* must be letters, digits"):
        captioned(Figure(), "x", label=label)


# --------------------------------------------------------------------------
# Typesetting (the typst wheel, in process)
# --------------------------------------------------------------------------
def _report_notebook() -> nbformat.NotebookNode:
    nb = new_notebook()
    table = Table(columns=("Bound", "T_M [s]"), rows=(("lower", 3.046), ("upper", 2.702)),
                  caption="Periods of both bounds", label="tab-periods")
    nb.cells = [
        new_markdown_cell("# Results\n\nThe periods are in [](#tab-periods); the spectrum is "
                          "[](#fig-spectrum). Math: $D_{\\mathrm{TM}} \\le 0.6$ m."),
        new_code_cell("x", outputs=[_figure_output("Site spectrum with T_fb", label="fig-spectrum"),
                                    _display(table),
                                    new_output("stream", name="stdout", text="CONSOLE\n")]),
        new_markdown_cell("# Closing\n\nNothing more."),
    ]
    return nb


@pytest.fixture(scope="module")
def typst_pdf(tmp_path_factory):
    require_tools(*PDF_READERS)
    folder = tmp_path_factory.mktemp("typst")
    pdf = report.render(_write(_report_notebook(), folder), folder / "out", engine="typst",
                        title_fields={"project": "Invented Ridge Clinic"})
    return pdf, _pdf_text(pdf)


def test_typst_pdf_numbers_and_cross_references(typst_pdf):
    pdf, text = typst_pdf
    assert pdf.read_bytes().startswith(b"%PDF")
    assert "Figure 1: Site spectrum with Tfb" in text
    assert "Table 1: Periods of both bounds" in text
    assert "The periods are in Table 1; the spectrum is Figure 1." in text
    assert "1 Results" in text and "2 Closing" in text  # numbered headings, also in the contents
    assert "DTM ≤ 0.6 m" in text
    assert "CONSOLE" not in text and "Invented Ridge Clinic" in text


def test_typst_pdf_embeds_every_font(typst_pdf):
    pdf, _ = typst_pdf
    listing = subprocess.run(["pdffonts", str(pdf)], capture_output=True, text=True, check=True).stdout
    rows = [line.split() for line in listing.splitlines()[2:] if line.strip()]
    assert rows and all(row[-5] == "yes" for row in rows)  # the "emb" column


def test_project_names_in_other_scripts_are_kept(tmp_path):
    require_tools(*PDF_READERS)
    name = "Clinic 医院 مستشفى 😀"
    with warnings.catch_warnings():
        warnings.simplefilter("error", FontCoverageWarning)  # nothing may be replaced here
        pdf = report.render(_write(_report_notebook(), tmp_path), tmp_path / "out", engine="typst",
                            title_fields={"project": name})
    text = _pdf_text(pdf)
    assert "医院" in text and "😀" in text  # U+533B U+9662, U+1F600
    fonts = subprocess.run(["pdffonts", str(pdf)], capture_output=True, text=True, check=True).stdout
    assert "NotoSansArabic" in fonts and "NotoSansCJK" in fonts and "NotoEmoji" in fonts


def test_uncovered_character_in_project_name_is_said_not_dropped(tmp_path):
    require_tools(*PDF_READERS)
    with pytest.warns(FontCoverageWarning, match="U\\+0F00 TIBETAN SYLLABLE OM"):
        pdf = report.render(_write(_report_notebook(), tmp_path), tmp_path / "out", engine="typst",
                            title_fields={"project": "Site \u0f00 North"})
    assert "Site (U+0F00) North" in _pdf_text(pdf)


def test_letter_paper(tmp_path):
    require_tools(*PDF_READERS)
    pdf = report.render(_write(_report_notebook(), tmp_path), tmp_path / "out", engine="typst", paper="letter")
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    size = next(line for line in info.splitlines() if line.startswith("Page size:")).split()
    assert float(size[2]) == pytest.approx(612.0, abs=1.0) and float(size[4]) == pytest.approx(792.0, abs=1.0)


def test_typst_error_raises_run_error_and_leaves_no_pdf(tmp_path):
    nb = _report_notebook()
    nb.cells[1].outputs.append(new_output("display_data", data={TYPST_MIME: "#nosuchfunction()"}))
    with pytest.raises(RunError, match="typst failed on the report: unknown variable: nosuchfunction"):
        report.render(_write(nb, tmp_path), tmp_path / "out", engine="typst")
    assert not (tmp_path / "out" / "report.pdf").exists()


def test_outputs_without_typst_markup_still_render():
    # A record executed before tables carried Typst markup: the markdown form is used.
    table = Table(columns=("a", "b"), rows=((1, 2),), caption="Old")
    nb = new_notebook()
    nb.cells = [new_code_cell("x", outputs=[new_output("display_data", data={
        "text/markdown": table._repr_markdown_(), "text/latex": table._repr_latex_()})])]
    document = build_document(nb, fields={"title": "T"})
    assert "#table(columns: 2" in document.source
    assert compile_pdf(document).startswith(b"%PDF")


# --------------------------------------------------------------------------
# nbconvert exporters (entry points)
# --------------------------------------------------------------------------
@pytest.mark.slow
def test_nbconvert_to_isolation_pdf_and_typst(tmp_path):
    book = _write(_report_notebook(), tmp_path)
    for target, made in (("isolation_pdf", "book.pdf"), ("isolation_typst", "book.typ")):
        proc = subprocess.run([sys.executable, "-m", "jupyter", "nbconvert", "--to", target, str(book)],
                              capture_output=True, text=True, cwd=tmp_path)
        assert proc.returncode == 0, proc.stderr
        assert (tmp_path / made).is_file()
    assert (tmp_path / "book.pdf").read_bytes().startswith(b"%PDF")
    source = (tmp_path / "book.typ").read_text()
    assert "#show: isolation-report.with(" in source
    assert '"book_files/figure-1.png"' in source and (tmp_path / "book_files" / "figure-1.png").is_file()
