"""Every workbook executes headless with papermill, and the feasibility workbook
becomes a client PDF that shows the study's key numbers and no code.

Outside checks: the title-page fields are read from the demo study file with
the standard library's tomllib, not through the package; the key numbers
are read from the results JSON the run wrote and searched in the text that
poppler's pdftotext extracts from the PDF; page size A4 per ISO 216.
"""

from __future__ import annotations

import json
import math
import os
import shutil
import subprocess
import tomllib
from pathlib import Path

import nbformat
import papermill as pm
import pytest

from isolation import report

ROOT = Path(__file__).resolve().parent.parent
WORKBOOKS = ROOT / "workbooks"
DEMO = ROOT / "examples" / "demo_study.toml"
PARAMETER_NAMES = {"study_path", "output_dir", "results_path", "quick", "paper"}


def _execute(name: str, out: Path, **parameters) -> nbformat.NotebookNode:
    executed = out / name
    pm.execute_notebook(str(WORKBOOKS / name), str(executed), parameters=parameters, kernel_name="python3",
                        progress_bar=False, cwd=str(out))
    return nbformat.read(executed, as_version=4)


def _outputs(nb, mime: str) -> list:
    return [o for c in nb.cells if c.cell_type == "code" for o in c.get("outputs", [])
            if mime in o.get("data", {})]


def _require_pdf_tools() -> None:
    missing = report.missing_tools() + [t for t in ("pdftotext", "pdfinfo") if shutil.which(t) is None]
    if missing:
        message = f"PDF tools missing: {', '.join(missing)}"
        if os.environ.get("ISOLATION_REQUIRE_TEX") == "1":
            pytest.fail(message + " (ISOLATION_REQUIRE_TEX=1)")
        pytest.skip(message)


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
    nb = _execute("explore.ipynb", tmp_path, friction=0.05, interactive=True)
    assert not [o for c in nb.cells for o in c.get("outputs", []) if o.output_type == "error"]
    assert _outputs(nb, "text/latex") and _outputs(nb, "image/png")
    assert _outputs(nb, "application/vnd.jupyter.widget-view+json")
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
    assert headings == ["# Scope and cautions", "# Basis and assumptions", "# Site spectrum and period shift",
                        "# Isolation system and bearing checks", "# Equivalent-linear results for both bounds",
                        "# Motion suite", "# Response-history comparison", "# Verdict", "# Cautions"]
    captions = [o.metadata["image/png"].get("caption", "") for o in _outputs(nb, "image/png")]
    assert all(captions) and len(captions) >= 6 + 6 * len(names)


@pytest.fixture(scope="module")
def feasibility_pdf(feasibility_run):
    _require_pdf_tools()
    out, _, data = feasibility_run
    pdf = report.render(out / "feasibility.ipynb", out / "report", paper=None)
    raw = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True, text=True,
                         check=True).stdout
    # pandoc typesets straight quotes as curly ones; compare on straight quotes.
    text = " ".join(raw.split()).replace("\u2019", "'").replace("\u2018", "'")
    return pdf, text, data


@pytest.mark.slow
def test_pdf_shows_title_page_fields_from_the_study(feasibility_pdf):
    pdf, text, _ = feasibility_pdf
    project = tomllib.loads(DEMO.read_text())["project"]
    for key in ("name", "client", "prepared_by", "revision"):
        assert str(project[key]) in text, key
    assert project["date"].isoformat() in text
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True, check=True).stdout
    assert "595.28 x 841.89" in info  # A4, ISO 216


def _three_figures(value: float) -> str:
    """Three significant figures, decimals kept (0.4623 -> 0.462, 1.2 -> 1.20); values below 1000."""
    return f"{value:.{max(2 - math.floor(math.log10(abs(value))), 0)}f}"


@pytest.mark.slow
def test_pdf_shows_the_key_numbers_of_the_results_json(feasibility_pdf):
    _, text, data = feasibility_pdf
    for alternative in data["alternatives"]:
        q = alternative["quantities"]
        assert f"D_M = {_three_figures(q['displacement'])} m" in text
        assert f"D_TM = {_three_figures(q['total_displacement'])} m" in text
        assert f"T_M = {q['period_lower']:.2f} s" in text
        assert f"{alternative['name']}: {alternative['verdict']['outcome']}" in text
        for reason in alternative["verdict"]["reasons"]:
            if reason["level"] in ("against", "condition"):
                assert " ".join(reason["message"].split()[:6]) in text
    assert f"T_fb = {data['fixed_base']['period']:.2f} s" in text


@pytest.mark.slow
def test_pdf_shows_no_code_and_keeps_the_cautions(feasibility_pdf):
    _, text, _ = feasibility_pdf
    for code in ("import ", "display(", "results.alternatives", "plots.", "tables.", "study_path",
                 "Report fields", "<Figure", "Traceback"):
        assert code not in text, code
    assert "not a construction design" in text
    assert "licensed structural engineer" in text
    assert "Quick run." in text  # a quick run says so in the report
    assert "Figure 1:" in text and "Table 1:" in text


@pytest.mark.slow
def test_feasibility_workbook_fails_loudly_on_a_bad_study(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text(DEMO.read_text().replace("sms = 1.50", "sms = -1.50"))
    with pytest.raises(pm.PapermillExecutionError, match="sms"):
        _execute("feasibility.ipynb", tmp_path, study_path=str(bad), output_dir=str(tmp_path), quick=True)
    assert not (tmp_path / "results.json").exists()
