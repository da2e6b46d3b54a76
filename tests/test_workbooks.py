"""Every workbook executes headless with papermill, and the feasibility workbook
becomes a client PDF that shows the study's key numbers and no code.

Outside checks: the title-page fields are read from the demo study file with
the standard library's tomllib, not through the package; the key numbers
are read from the results JSON the run wrote and searched in the text that
poppler's pdftotext extracts from the PDF (NFKC-normalised, Unicode Standard
Annex #15, so a typeset subscript D_TM reads "DTM"); page size A4 per ISO 216.
"""

from __future__ import annotations

import json
import math
import os
import re
import subprocess
import tomllib
import unicodedata
import warnings
from pathlib import Path

import nbformat
import papermill as pm
import pytest

from isolation.output import report
from tools import PDF_READERS, require_pdf_tools, require_tools

ROOT = Path(__file__).resolve().parent.parent
WORKBOOKS = ROOT / "workbooks"
DEMO = ROOT / "examples" / "demo_study.toml"
PARAMETER_NAMES = {"study_path", "output_dir", "results_path", "quick", "paper", "precomputed"}


def _execute(name: str, out: Path, **parameters) -> nbformat.NotebookNode:
    executed = out / name
    pm.execute_notebook(str(WORKBOOKS / name), str(executed), parameters=parameters, kernel_name="python3",
                        progress_bar=False, cwd=str(out))
    return nbformat.read(executed, as_version=4)


def _outputs(nb, mime: str) -> list:
    return [o for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", [])
            if mime in o.get("data", {})]




def test_feasibility_parameters_cell_follows_the_house_form():
    found = pm.inspect_notebook(str(WORKBOOKS / "feasibility.ipynb"))
    assert set(found) == PARAMETER_NAMES
    for name, info in found.items():
        assert info["inferred_type_name"] in ("str", "bool"), name
        assert info["help"].rstrip().endswith("]"), f"{name}: help must end with a [unit]"


def test_explore_parameters_cell_follows_the_house_form():
    found = pm.inspect_notebook(str(WORKBOOKS / "explore.ipynb"))
    assert {"bearing_type", "friction", "radius", "sms", "sm1"} <= set(found)
    assert all(info["help"].rstrip().endswith("]") for info in found.values())


# Workbooks executed by other test files (the batch design-space map reads a batch summary).
EXECUTED_ELSEWHERE = {"design_space.ipynb"}


def test_every_workbook_is_covered():
    # A new workbook must get an execution test, here or in the test file of its module.
    found = {p.name for p in WORKBOOKS.glob("*.ipynb")}
    assert found - EXECUTED_ELSEWHERE == {"feasibility.ipynb", "explore.ipynb"}


def test_workbooks_state_scope_and_defer_to_an_engineer():
    for path in (WORKBOOKS / "feasibility.ipynb", WORKBOOKS / "explore.ipynb"):
        text = " ".join(c.source for c in nbformat.read(path, as_version=4).cells if c.cell_type == "markdown")
        assert "not construction design" in text or "not a construction design" in text, path.name
        assert "licensed structural engineer" in text, path.name
        assert "feasibility" in text.lower(), path.name


@pytest.mark.slow
def test_explore_workbook_executes(tmp_path):
    # Interactive: the live explorer alone, no static answer that could contradict it.
    nb = _execute("explore.ipynb", tmp_path, friction=0.05, interactive=True)
    assert not [o for c in nb.cells for o in c.get("outputs", []) if o.output_type == "error"]
    assert _outputs(nb, "application/vnd.jupyter.widget-view+json")
    assert not _outputs(nb, "text/latex") and not _outputs(nb, "image/png")
    # Static: the answer as a table and a figure, no widgets.
    nb = _execute("explore.ipynb", tmp_path, friction=0.05, interactive=False)
    assert _outputs(nb, "text/latex") and _outputs(nb, "image/png")
    assert not _outputs(nb, "application/vnd.jupyter.widget-view+json")
    table = _outputs(nb, "text/markdown")[0].data["text/markdown"]
    assert "| lower |" in table


@pytest.fixture(scope="module")
def feasibility_run(tmp_path_factory):
    out = tmp_path_factory.mktemp("feasibility")
    results = out / "results.json"
    nb = _execute("feasibility.ipynb", out, study_path=str(DEMO), output_dir=str(out),
                  results_path=str(results), quick=True, paper="a4")
    return out, nb, json.loads(results.read_text())


@pytest.mark.slow
def test_feasibility_workbook_writes_results_json(feasibility_run):
    out, nb, data = feasibility_run
    assert data["run"]["quick"] is True
    names = [a["name"] for a in data["alternatives"]]
    expected = [a["name"] for a in tomllib.loads(DEMO.read_text())["alternative"]]
    assert names == expected
    assert nb.metadata.papermill.parameters["quick"] is True
    assert not [o for c in nb.cells for o in c.get("outputs", []) if o.output_type == "error"]
    # Every section of the report is there, in order.
    headings = [line for c in nb.cells if c.cell_type == "markdown" for line in c.source.splitlines()
                if line.startswith("# ")]
    assert headings == ["# Summary", "# Scope and cautions", "# Basis and assumptions",
                        "# Site spectrum and period shift",
                        "# Isolation system and bearing checks", "# Equivalent-linear results for both bounds",
                        "# Motion suite", "# Response-history comparison",
                        "# Against the code-designed fixed-base building", "# Verdict", "# Cautions",
                        "# Appendix: code clauses used"]
    captions = [o.metadata["image/png"].get("caption", "") for o in _outputs(nb, "image/png")]
    assert all(captions) and len(captions) >= 6 + 6 * len(names)


@pytest.fixture(scope="module", params=["typst", "latex"])
def feasibility_pdf(request, feasibility_run):
    engine = request.param
    require_pdf_tools() if engine == "latex" else require_tools(*PDF_READERS)
    out, _, data = feasibility_run
    pdf = report.render(out / "feasibility.ipynb", out / f"report-{engine}", paper=None, engine=engine)
    raw = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True,
                         check=True).stdout
    return pdf, _pdf_words(raw), data


def _pdf_words(raw: str) -> str:
    """pdftotext output as one line: NFKC turns math italic letters (U+1D400 block) into plain ones,
    the space pdftotext leaves after a subscript before punctuation goes, straight quotes (pandoc
    typesets curly ones)."""
    text = " ".join(unicodedata.normalize("NFKC", raw).split()).replace("\u2019", "'").replace("\u2018", "'")
    return re.sub(r" (?=[.,;:)])", "", text)


def _typeset(symbol: str) -> str:
    """How a symbol set with a subscript reads in the extracted text: D_TM -> DTM."""
    return symbol.replace("_", "")


@pytest.mark.slow
def test_pdf_shows_title_page_fields_from_the_study(feasibility_pdf):
    pdf, text, _ = feasibility_pdf
    project = tomllib.loads(DEMO.read_text())["project"]
    for key in ("name", "client", "prepared_by", "revision"):
        assert str(project[key]) in text, key
    assert project["date"].isoformat() in text
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    size = next(line for line in info.splitlines() if line.startswith("Page size:")).split()
    # A4, ISO 216: 210 x 297 mm = 595.28 x 841.89 pt (pdfinfo prints 595.28 or 595.276 by engine).
    assert float(size[2]) == pytest.approx(595.28, abs=0.05) and float(size[4]) == pytest.approx(841.89, abs=0.05)


def _three_figures(value: float) -> str:
    """Three significant figures, decimals kept (0.4623 -> 0.462, 1.2 -> 1.20); values below 1000."""
    return f"{value:.{max(2 - math.floor(math.log10(abs(value))), 0)}f}"


@pytest.mark.slow
def test_pdf_shows_the_key_numbers_of_the_results_json(feasibility_pdf):
    _, text, data = feasibility_pdf
    for alternative in data["alternatives"]:
        q = alternative["quantities"]
        assert f"{_typeset('D_M')} = {_three_figures(q['displacement'])} m" in text
        assert f"{_typeset('D_TM')} = {_three_figures(q['total_displacement'])} m" in text
        assert f"{_typeset('T_M')} = {q['period_lower']:.2f} s" in text
        assert f"{alternative['name']}: {alternative['verdict']['outcome']}" in text
        for reason in alternative["verdict"]["reasons"]:
            if reason["level"] in ("against", "condition"):
                assert _typeset(" ".join(reason["message"].split()[:6])) in text
    assert f"{_typeset('T_fb')} = {data['fixed_base']['period']:.2f} s" in text
    for plain in ("D_TM", "T_fb", "D\\_TM"):  # every symbol typeset, none left as plain text
        assert plain not in text


@pytest.mark.slow
def test_pdf_opens_with_a_summary_matching_the_results_json(feasibility_pdf):
    _, text, data = feasibility_pdf
    assert "1 Summary" in text and "2 Scope and cautions" in text  # first section, after the contents
    start = text.index("Table 1: Summary of the isolation alternatives")
    summary = text[start:text.index("Scope and cautions", start)]
    alternatives = data["alternatives"]
    outcomes = [a["verdict"]["outcome"] for a in alternatives]
    assert "Verdict " + " ".join(outcomes) in summary
    totals = " ".join(_three_figures(a["quantities"]["total_displacement"]) for a in alternatives)
    assert f"Total design displacement {_typeset('D_TM')} [m] {totals}" in summary
    floors = " ".join(f"{100 * a['history']['summary']['floor_acceleration_ratio']:.0f}" for a in alternatives)
    assert f"Peak floor acceleration [% of fixed base] {floors}" in summary
    # The demo's verdicts differ, so the better one is the preferred alternative.
    order = ["feasible", "feasible with conditions", "not recommended"]
    ranked = sorted(alternatives, key=lambda a: order.index(a["verdict"]["outcome"]))
    assert order.index(ranked[0]["verdict"]["outcome"]) < order.index(ranked[1]["verdict"]["outcome"])
    best = ranked[0]
    assert f"{best['name']} is the preferred alternative: {best['verdict']['outcome']}" in summary
    assert f"{_typeset('D_TM')} = {_three_figures(best['quantities']['total_displacement'])} m" in summary
    for other in ranked[1:]:  # the others' deciding findings are named
        for reason in other["verdict"]["reasons"]:
            if reason["level"] in ("against", "condition"):
                assert reason["topic"] in summary


@pytest.mark.slow
def test_pdf_appendix_prints_the_clause_table(feasibility_pdf):
    from isolation.codes.clauses import CLAUSES

    _, text, _ = feasibility_pdf
    start = text.index("Appendix: code clauses used", text.index("Cautions"))
    appendix = text[start:]
    assert "Code clauses the tool uses" in appendix  # the captioned table
    # Its first and last rows (the table is long and runs over pages: code, clause, subject's first words).
    assert (CLAUSES[0].clause, CLAUSES[-1].clause) == ("§17.4.1", "(no article)")
    assert "ASCE 7-10 §17.4.1 Selection of analysis" in appendix
    assert "AASHTO (no article) Elastomeric isolators:" in appendix
    assert "re-read" in appendix and "from memory" in appendix


def test_pdf_shows_no_code_and_keeps_the_cautions(feasibility_pdf):
    _, text, _ = feasibility_pdf
    for code in ("import ", "display(", "results.alternatives", "plots.", "tables.", "study_path",
                 "Report fields", "<Figure", "Traceback"):
        assert code not in text, code
    assert "not a construction design" in text
    assert "licensed structural engineer" in text
    assert "Quick run." in text  # a quick run says so in the report
    assert "Figure 1:" in text and "Table 1:" in text
    # issue 10: the report states how friction is regularised in the response histories
    assert re.search(r"Friction law, Friction pendulum: (Friction regularised|No friction regularisation|Sharp "
                     r"friction)", text)


@pytest.mark.slow
def test_feasibility_workbook_fails_loudly_on_a_bad_study(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text(DEMO.read_text().replace("sms = 1.50", "sms = -1.50"))
    with pytest.raises(pm.PapermillExecutionError, match="sms"):
        _execute("feasibility.ipynb", tmp_path, study_path=str(bad), output_dir=str(tmp_path), quick=True)
    assert not (tmp_path / "results.json").exists()


@pytest.fixture(scope="module")
def eurocode_report(tmp_path_factory):
    """The demo on an EN 1998-1 Type 1 spectrum (ground B, a_g = 0.3 g), first alternative, quick run."""
    from isolation.app.calc_records import to_toml
    from isolation.study import apply_overrides, read_study_mapping

    out = tmp_path_factory.mktemp("eurocode")
    # gamma_I = 1.4, importance class IV (EN 1998-1 §4.2.5, from memory); the demo's 1.5 is an ASCE 7 I_e.
    mapping = apply_overrides(read_study_mapping(DEMO), {"code.basis": "eurocode", "building.importance": 1.4})
    for key in ("sms", "sm1", "long_period", "s1", "site_class"):
        del mapping["site"][key]
    mapping["site"].update(ag=0.3, ground_type="B", spectrum_type=1)
    mapping["alternative"] = mapping["alternative"][:1]
    study_file = out / "eurocode.toml"
    study_file.write_text(to_toml(mapping), encoding="utf-8")
    results = out / "results.json"
    _execute("feasibility.ipynb", out, study_path=str(study_file), output_dir=str(out),
             results_path=str(results), quick=True)
    if os.environ.get("ISOLATION_REQUIRE_TEX") == "1":
        require_tools(*PDF_READERS)  # fails (not skips) when a PDF tool is missing
    with warnings.catch_warnings():  # without a PDF engine the report is HTML, which must show the note too
        warnings.simplefilter("ignore", report.TexMissingWarning)
        path = report.render(out / "feasibility.ipynb", out / "report")
    if os.environ.get("ISOLATION_REQUIRE_TEX") == "1" and path.suffix != ".pdf":
        pytest.fail(f"ISOLATION_REQUIRE_TEX=1 but the report came out as {path.name}")
    if path.suffix == ".pdf":
        require_tools(*PDF_READERS)  # pdftotext reads the PDF back
        raw = subprocess.run(["pdftotext", "-layout", str(path), "-"], capture_output=True, text=True,
                             check=True).stdout
        text = _pdf_words(raw)
    else:
        text = " ".join(path.read_text(encoding="utf-8").split())
    return path, text, json.loads(results.read_text())


@pytest.mark.slow
def test_feasibility_workbook_runs_bidirectional_histories(tmp_path):
    """The demo's first alternative with [analysis] bidirectional = true, quick run: the plan-model cell
    shows its table, the storey-strength table and both plan figures, and the results carry them."""
    from isolation.app.calc_records import to_toml
    from isolation.study import apply_overrides, read_study_mapping

    mapping = apply_overrides(read_study_mapping(DEMO), {"analysis.bidirectional": True})
    mapping["alternative"] = mapping["alternative"][:1]
    study_file = tmp_path / "bidirectional.toml"
    study_file.write_text(to_toml(mapping), encoding="utf-8")
    results = tmp_path / "results.json"
    nb = _execute("feasibility.ipynb", tmp_path, study_path=str(study_file), output_dir=str(tmp_path),
                  results_path=str(results), quick=True)
    assert not [o for c in nb.cells for o in c.get("outputs", []) if o.output_type == "error"]
    alternative = json.loads(results.read_text())["alternatives"][0]
    b = alternative["history"]["bidirectional"]
    # ASCE/SEI 7-16 §17.6.3 (from memory): the history total displacement is taken as at least 80 % of
    # the single-mode D_TM; the verdict uses the larger.
    assert b["total_displacement_code"] == pytest.approx(alternative["quantities"]["total_displacement"])
    assert b["total_displacement_governing"] == pytest.approx(
        max(b["total_displacement_history"], 0.8 * b["total_displacement_code"]))
    strength = b["storeys"]["storey_strength"]
    assert strength and b["fixed_base"]["storey_strength"]
    shown = " ".join(str(o.get("data", {}).get(m, "")) for c in nb.cells if c.cell_type == "code"
                     for o in c.get("outputs", []) for m in ("text/markdown", "text/latex", "text/plain"))
    assert "Storey shear against storey strength, plan model" in shown
    captions = " ".join(str(o.get("metadata", {})) for c in nb.cells if c.cell_type == "code"
                        for o in c.get("outputs", []))
    assert "displacement orbits of the centre of mass" in captions
    assert "plan of the bearings coloured by peak displacement" in captions


@pytest.mark.slow
def test_eurocode_report_states_the_spectrum_assumption(eurocode_report):
    path, text, data = eurocode_report
    # EN 1998-1 §3.2.2.2 defines the elastic spectrum up to 4 s; beyond it Annex A gives the
    # displacement spectrum (from memory). The run states that it extends the 1/T^2 branch instead.
    note = data["spectrum"]["note"]
    assert "Annex A" in note
    assert "Site spectrum:" in text
    assert note.split(";")[-1].strip() in text  # "the displacement spectrum of EN 1998-1 Annex A ..."
    if path.suffix == ".pdf":
        # Eurocode symbols in the summary: d_d total design displacement, T_eff isolated period.
        q = data["alternatives"][0]["quantities"]
        assert (f"Total design displacement {_typeset('d_d')} [m] "
                f"{_three_figures(q['total_displacement'])}") in text
        assert f"Isolated period {_typeset('T_eff')}, upper to lower bound [s]" in text


@pytest.mark.slow
def test_pdf_has_the_owner_page_on_what_isolation_buys(feasibility_pdf):
    _, text, data = feasibility_pdf
    start = text.index("What isolation buys")
    page = text[start:text.index("Scope and cautions", start)]
    for caution in ("order-of-magnitude screening", "cost consultant", "not an insurance estimate"):
        assert caution in page.lower(), caution
    # Expected annual loss of the fixed base from results.json, written as thousands or millions
    # to 3 significant figures (the table's stated convention: k = thousand, M = million).
    value = data["fixed_base"]["loss"]["expected_annual_loss"]
    shown = f"{value / 1e6:.3g} M" if value >= 1e6 else f"{value / 1e3:.3g} k"
    # pdftotext may wrap the row label around the values: look for the value right after the label.
    assert re.search(rf"Expected annual loss .{{0,30}}?{re.escape(shown)}", page), shown
    assert f"[{data['loss']['currency']}/year]" in page
    assert "Expected repair cost against shaking intensity" in page
