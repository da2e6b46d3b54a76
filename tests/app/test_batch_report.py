"""The batch report (isolation.app.batch.batch_report): the design-space workbook run on a batch
folder's summary, kept as design_space.ipynb beside report.pdf.

Wiring and file-safety checks; the maps' numbers are checked in test_batch_history_maps.py and
test_batch_maps.py, the sweeps' numbers in test_batch_histories.py and test_batch_sweep.py.
"""

import json
import shutil
import subprocess
import sys
import unicodedata
from pathlib import Path

import pytest

from isolation.app.batch import batch_report
from isolation.app.batch.command import main
from isolation.app.batch.plan import load_batch
from isolation.errors import InputError, RunError

sys.path.insert(0, str(Path(__file__).parent))
from test_batch_histories import make_batch  # noqa: E402

sys.path.insert(0, str(Path(__file__).parents[1]))
from tools import require_tools  # noqa: E402

FIXTURE = Path(__file__).parents[1] / "fixtures" / "batch" / "design_space" / "summary.csv"
FIELDS = {"title": "Design space of the batch trial"}


def _pdf_text(pdf: Path) -> str:
    raw = subprocess.run(["pdftotext", str(pdf), "-"], capture_output=True, text=True, check=True).stdout
    return " ".join(unicodedata.normalize("NFKC", raw).replace("\u200b", "").split())


@pytest.mark.slow
def test_history_sweep_with_report_writes_the_maps_into_a_pdf(tmp_path, capsys):
    require_tools("pdftotext")
    out = tmp_path / "out"
    code = main([str(make_batch(tmp_path, radii=(2.0, 3.0), frictions=(0.04, 0.07))), "--out", str(out),
                 "--direct", "--histories", "--quick", "--report", "--no-progress", "--workers", "1"])
    printed = capsys.readouterr().out
    assert code == 0 and f"report: {out / 'report.pdf'}" in printed
    notebook = json.loads((out / batch_report.NOTEBOOK).read_text())
    cell = next(c for c in notebook["cells"] if c.get("id") == "history-maps")
    assert sum("image/png" in o.get("data", {}) for o in cell["outputs"]) == 1
    assert not [c for c in notebook["cells"] for o in c.get("outputs", []) if o.get("output_type") == "error"]
    text = _pdf_text(out / "report.pdf")
    for words in ("Design space of the batch batch", "Response-history maps", "Best alternatives",
                  "not construction design", "licensed structural engineer"):
        assert words in text, words
    assert sorted(p.name for p in out.iterdir() if p.name.startswith(".")) == []  # no partial, no empty log


def test_the_batch_file_can_ask_for_the_report(tmp_path):
    path = make_batch(tmp_path)
    assert load_batch(path).report is False
    path.write_text(path.read_text().replace("[batch]\n", "[batch]\nreport = true\n"))
    assert load_batch(path).report is True and load_batch(path).to_dict()["report"] is True
    path.write_text(path.read_text().replace("report = true", 'report = "yes"'))
    with pytest.raises(InputError, match=r"batch\.report = 'yes' is not allowed: must be true or false"):
        load_batch(path)


def test_a_folder_without_summary_or_a_bad_option_is_refused(tmp_path):
    with pytest.raises(InputError, match=r"out_dir = .* must be a batch folder holding summary\.csv"):
        batch_report.write_batch_report(tmp_path, fields=FIELDS)
    shutil.copy(FIXTURE, tmp_path / "summary.csv")
    for options, message in (({"units": "metric"}, r"units = 'metric' is not allowed"),
                             ({"paper": "a3"}, r"paper = 'a3' is not allowed"),
                             ({"engine": "word"}, r"engine = 'word' is not allowed"),
                             ({"top": 0}, r"top = 0 is not allowed: must be a whole number >= 1")):
        with pytest.raises(InputError, match=message):
            batch_report.write_batch_report(tmp_path, fields=FIELDS, **options)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["summary.csv"]


def test_a_failing_workbook_keeps_the_earlier_report_and_leaves_nothing_half_written(tmp_path, monkeypatch):
    import isolation.app.record_kernel as record_kernel

    shutil.copy(FIXTURE, tmp_path / "summary.csv")
    (tmp_path / "report.pdf").write_bytes(b"%PDF earlier")
    (tmp_path / batch_report.NOTEBOOK).write_text("earlier")

    def failing(notebook, target, parameters, *, cwd, log, timeout=None):
        from papermill.exceptions import PapermillExecutionError

        assert Path(target).parent == tmp_path and Path(target).name.startswith(".")
        Path(target).write_text("half")  # papermill writes as it goes
        raise PapermillExecutionError(5, 7, "best = ...", "KeyError", "'D_M_lower_m'", [])

    monkeypatch.setattr(record_kernel, "run_workbook", failing)
    with pytest.raises(RunError, match=r"design-space workbook failed: workbook cell 7 raised KeyError: 'D_M_lower_m'"):
        batch_report.write_batch_report(tmp_path, fields=FIELDS)
    assert (tmp_path / "report.pdf").read_bytes() == b"%PDF earlier"
    assert (tmp_path / batch_report.NOTEBOOK).read_text() == "earlier"
    assert sorted(p.name for p in tmp_path.iterdir()) == ["design_space.ipynb", "report.pdf", "summary.csv"]


def test_report_fields_come_from_the_base_study(tmp_path):
    path = make_batch(tmp_path)
    plan = load_batch(path)
    fields, units = batch_report.report_fields(plan.name, plan.study_file)
    assert fields["title"] == f"Design space of the batch {plan.name}"
    assert units in ("SI", "US") and set(fields) <= {"title", "project", "client", "revision", "prepared_by"}


def test_report_needs_a_run_and_bad_paper_exits_2(tmp_path, capsys):
    path = make_batch(tmp_path)
    assert main([str(path), "--report", "--paper", "a3"]) == 2
    err = capsys.readouterr().err
    assert "invalid choice: 'a3'" in err and len(err.strip().splitlines()) == 1  # one line, no usage block
    assert main([str(path), "--workers", "x"]) == 2
    assert capsys.readouterr().err.strip() == ("error: isolation batch: argument --workers: invalid int value: 'x' "
                                               "(see --help)")
    assert main([str(path), "--check", "--report"]) == 0  # validation only: no report
    assert not (tmp_path / "report.pdf").exists()
