"""Calculation records (isolation.app.calc_records): complete, atomic, failed runs recorded.

Hashes are checked with hashlib (sha256, FIPS 180-4); TOML output is read back
with the standard library's tomllib (TOML 1.0). The end-to-end tests at the
bottom run the real workbook and report (marked slow).
"""

import hashlib
import json
import shutil
import signal
import subprocess
import sys
import time
import tomllib
from pathlib import Path

import pytest

from isolation.app.calc_records import (
    read_manifest,
    render_record,
    run_record,
    sanitise_name,
    study_input_hash,
    to_toml,
)
from isolation.errors import InputError
from isolation.study import apply_overrides
from tools import require_tools

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"
FIXTURES = Path(__file__).resolve().parents[1] / "fixtures"
WORKBOOK = FIXTURES / "record_workbook.ipynb"
STUDY_FOLDER = "venhollow-emergency-communications-centre"


def require_tex():
    require_tools("xelatex", "pandoc")


def visible(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if not p.name.startswith("."))


@pytest.fixture(scope="module")
def done_record(tmp_path_factory):
    out = tmp_path_factory.mktemp("records")
    outcome = run_record(DEMO, out, pdf=False, quick=True, notebook=WORKBOOK, run_id="first")
    return out, outcome


def test_record_is_complete(done_record):
    out, outcome = done_record
    assert outcome.status == "done" and outcome.error is None
    assert outcome.path == out / STUDY_FOLDER / "first"
    assert visible(outcome.path) == ["feasibility.ipynb", "manifest.json", "results.json", "study.toml"]
    assert (outcome.path / "study.toml").read_bytes() == DEMO.read_bytes()   # the input as given
    results = json.loads((outcome.path / "results.json").read_text())
    assert [a["name"] for a in results["alternatives"]] == ["Friction pendulum", "Lead-rubber"]
    assert len(outcome.verdicts) == 2 and outcome.verdicts[0].startswith("Friction pendulum: ")
    # No hidden build folder is left behind.
    assert [p.name for p in (out / STUDY_FOLDER).iterdir()] == ["first"]


def test_manifest_contents(done_record):
    _, outcome = done_record
    manifest = read_manifest(outcome.path)
    assert manifest == json.loads((outcome.path / "manifest.json").read_text())
    assert manifest["status"] == "done" and manifest["error"] is None
    expected = hashlib.sha256(DEMO.read_bytes() + b"\0overrides\0" + b"{}").hexdigest()
    assert manifest["input_hash"] == expected == study_input_hash(DEMO)
    assert manifest["package"]["version"]
    assert manifest["python"] == sys.version.split()[0]
    assert manifest["libraries"]["numpy"] and manifest["libraries"]["papermill"]
    assert manifest["started"] <= manifest["finished"]
    assert "not construction design" in manifest["scope"]
    for name, digest in manifest["files"].items():
        assert hashlib.sha256((outcome.path / name).read_bytes()).hexdigest() == digest
    # The executed notebook carries papermill's parameters (relative paths inside the record).
    notebook = json.loads((outcome.path / "feasibility.ipynb").read_text())
    assert notebook["metadata"]["papermill"]["parameters"] == {
        "study_path": "study.toml", "output_dir": ".", "results_path": "results.json", "quick": True}


def test_completed_run_id_is_not_overwritten(done_record):
    out, _ = done_record
    with pytest.raises(InputError, match="already exists and is complete"):
        run_record(DEMO, out, pdf=False, quick=True, notebook=WORKBOOK, run_id="first")


def test_default_run_ids_do_not_collide(tmp_path):
    fail = FIXTURES / "record_no_results.ipynb"
    first = run_record(DEMO, tmp_path, pdf=False, notebook=fail)
    second = run_record(DEMO, tmp_path, pdf=False, notebook=fail)
    assert first.path != second.path and first.path.parent == second.path.parent


def test_failing_workbook_leaves_a_failed_record(tmp_path):
    outcome = run_record(DEMO, tmp_path, pdf=True, notebook=FIXTURES / "record_failing.ipynb", run_id="bad")
    assert outcome.status == "failed"
    assert "RuntimeError" in outcome.error and "deliberate failure" in outcome.error
    manifest = read_manifest(outcome.path)
    assert manifest["status"] == "failed" and manifest["error"] == outcome.error
    assert manifest["report"] is None and outcome.report is None
    assert not (outcome.path / "results.json").exists()
    assert "feasibility.ipynb" in visible(outcome.path)     # kept for diagnosis
    # A failed record is never replaced silently: the same run id is an error ...
    with pytest.raises(InputError, match="already exists"):
        run_record(DEMO, tmp_path, pdf=False, quick=True, notebook=WORKBOOK, run_id="bad")
    assert read_manifest(outcome.path)["status"] == "failed"
    # ... unless asked for (a batch re-running a failed variant).
    again = run_record(DEMO, tmp_path, pdf=False, quick=True, notebook=WORKBOOK, run_id="bad",
                       replace_failed=True)
    assert again.status == "done" and read_manifest(again.path)["status"] == "done"


def test_workbook_without_results_fails(tmp_path):
    outcome = run_record(DEMO, tmp_path, pdf=False, notebook=FIXTURES / "record_no_results.ipynb")
    assert outcome.status == "failed" and "without writing results.json" in outcome.error


def test_bad_input_writes_nothing(tmp_path):
    with pytest.raises(InputError, match="alternative\\[0\\].bearings\\[0\\].radius = '12 kN'"):
        run_record(DEMO, tmp_path, overrides={"alternative.0.bearings.0.radius": "12 kN"}, notebook=WORKBOOK)
    with pytest.raises(InputError, match="does not exist"):
        run_record(tmp_path / "none.toml", tmp_path, notebook=WORKBOOK)
    with pytest.raises(InputError, match="paper = 'a3'"):
        run_record(DEMO, tmp_path, paper="a3", notebook=WORKBOOK)
    assert list(tmp_path.iterdir()) == []


def test_overrides_and_spectrum_file_are_recorded(tmp_path):
    source = tmp_path / "in"
    source.mkdir()
    (source / "spectra").mkdir()
    (source / "spectra" / "site.csv").write_text("period,sa\n0.0,0.6\n0.2,1.5\n0.53,1.5\n8.0,0.1\n")
    mapping = tomllib.loads(DEMO.read_text())
    for key in ("sms", "sm1", "long_period"):
        del mapping["site"][key]
    mapping["site"]["spectrum_file"] = "spectra/site.csv"
    study_file = source / "study.toml"
    study_file.write_text(to_toml(mapping))
    overrides = {"alternative.0.bearings.0.radius": "3.5 m", "project.revision": "B"}
    outcome = run_record(study_file, tmp_path / "out", pdf=False, quick=True, overrides=overrides,
                         notebook=FIXTURES / "record_no_results.ipynb")
    used = tomllib.loads((outcome.path / "study_used.toml").read_text())
    expected = apply_overrides(mapping, overrides)
    expected["site"]["spectrum_file"] = "site_spectrum.csv"
    assert used == expected
    assert (outcome.path / "site_spectrum.csv").read_bytes() == (source / "spectra" / "site.csv").read_bytes()
    manifest = read_manifest(outcome.path)
    assert manifest["overrides"] == overrides
    assert manifest["input_hash"] == study_input_hash(study_file, overrides) != study_input_hash(study_file)
    # The spectrum file is part of the input: changing it changes the hash.
    before = study_input_hash(study_file, overrides)
    (source / "spectra" / "site.csv").write_text("period,sa\n0.0,0.7\n0.2,1.5\n0.53,1.5\n8.0,0.1\n")
    assert study_input_hash(study_file, overrides) != before


@pytest.mark.parametrize("name, expected", [
    ("Venhollow Emergency Communications Centre", "venhollow-emergency-communications-centre"),
    ("../../etc/passwd", "etc-passwd"),
    ("Block A / Phase 2: east", "block-a-phase-2-east"),
    (".hidden", "hidden"),
    ("   ", "study"),
    ("Ünïcödé", "n-c-d"),
    ("x" * 200, "x" * 80),
])
def test_study_names_are_sanitised_for_paths(name, expected):
    assert sanitise_name(name) == expected


def test_to_toml_round_trips_the_demo():
    mapping = tomllib.loads(DEMO.read_text())
    assert tomllib.loads(to_toml(mapping)) == mapping
    odd = {"a key": "quote \" and \\ backslash", "n": [1, 2.5, True], "t": {"x": 1}, "z": float("inf")}
    assert tomllib.loads(to_toml(odd)) == odd


def _run_in_child(out: Path, notebook: Path) -> subprocess.Popen:
    code = (f"from isolation.app.calc_records import run_record\n"
            f"run_record({str(DEMO)!r}, {str(out)!r}, pdf=False, notebook={str(notebook)!r}, run_id='cut')\n")
    return subprocess.Popen([sys.executable, "-c", code], stdout=subprocess.PIPE, stderr=subprocess.PIPE)


def _wait_for_flag(out: Path, child: subprocess.Popen) -> None:
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        if list(out.glob(f"{STUDY_FOLDER}/.cut.*.partial/started.flag")):
            return
        if child.poll() is not None:
            pytest.fail(f"child ended early: {child.stderr.read().decode()[-2000:]}")
        time.sleep(0.2)
    child.kill()
    pytest.fail("the slow workbook never started")


def test_sigterm_half_way_leaves_a_failed_record(tmp_path):
    child = _run_in_child(tmp_path, FIXTURES / "record_slow.ipynb")
    _wait_for_flag(tmp_path, child)
    child.send_signal(signal.SIGTERM)
    assert child.wait(timeout=60) != 0
    record = tmp_path / STUDY_FOLDER / "cut"
    manifest = read_manifest(record)
    assert manifest["status"] == "failed"
    assert "interrupted" in manifest["error"]
    assert not (record / "results.json").exists()
    assert visible(tmp_path / STUDY_FOLDER) == ["cut"]


def test_kill_half_way_leaves_nothing_that_looks_complete(tmp_path):
    child = _run_in_child(tmp_path, FIXTURES / "record_slow.ipynb")
    _wait_for_flag(tmp_path, child)
    child.kill()   # SIGKILL: no chance to write anything more
    child.wait(timeout=30)
    assert visible(tmp_path / STUDY_FOLDER) == []           # only the hidden .partial folder remains
    partial = list((tmp_path / STUDY_FOLDER).glob(".cut.*.partial"))
    assert len(partial) == 1 and read_manifest(partial[0])["status"] == "running"
    for leftover in partial:   # the kernel the child started may still hold files open
        shutil.rmtree(leftover, ignore_errors=True)


# --------------------------------------------------------------------------
# End to end: the real workbook and report (slow)
# --------------------------------------------------------------------------
@pytest.mark.slow
def test_demo_record_with_pdf_shows_the_results(tmp_path):
    require_tools("pdftotext")  # the default engine (Typst) needs nothing outside the Python packages
    outcome = run_record(DEMO, tmp_path, pdf=True, quick=True, paper="letter")
    assert outcome.status == "done", outcome.error
    assert outcome.report == outcome.path / "report.pdf"
    assert visible(outcome.path) == ["feasibility.ipynb", "manifest.json", "report.pdf", "results.json",
                                     "study.toml"]
    assert read_manifest(outcome.path)["report"] == "report.pdf"
    text = subprocess.run(["pdftotext", "-layout", str(outcome.report), "-"], capture_output=True,
                          text=True, check=True).stdout
    results = json.loads((outcome.path / "results.json").read_text())
    from isolation.output.tables import format_number

    assert "Venhollow Emergency Communications Centre" in text
    assert "not for construction" in text.lower() or "not a construction design" in text.lower()
    for alternative in results["alternatives"]:
        assert alternative["name"] in text
        assert alternative["verdict"]["outcome"] in text
        assert format_number(alternative["quantities"]["total_displacement"]) in text
    for code in ("import ", "load_study(", "run_study(", "display("):
        assert code not in text
    # The results were computed while the kernel started (isolation.study.head_start), the pickle is
    # gone, and they equal a fresh run in this process.
    notebook = json.loads((outcome.path / "feasibility.ipynb").read_text())
    assert notebook["metadata"]["papermill"]["parameters"]["precomputed"] == ".results-ahead.pickle"
    assert not (outcome.path / ".results-ahead.pickle").exists()
    from isolation.study import load_study
    from isolation.study.runner import run_study

    fresh = run_study(load_study(DEMO), quick=True)
    for ours, theirs in zip(fresh.alternatives, results["alternatives"], strict=True):
        assert {k: v for k, v in ours.quantities.items() if v is not None} == pytest.approx(
            {k: v for k, v in theirs["quantities"].items() if v is not None}, rel=1e-12)


@pytest.mark.slow
def test_render_an_existing_record(done_record):
    require_tex()
    _, outcome = done_record
    path = render_record(outcome.path, paper="a4", engine="latex")
    assert path == outcome.path / "report.pdf" and path.stat().st_size > 1000
    manifest = read_manifest(outcome.path)
    assert manifest["report"] == "report.pdf" and "report.pdf" in manifest["files"]
    assert manifest["rendered"]["engine"] == "latex"
    again = render_record(outcome.path, paper="letter")  # the default engine, Typst, replaces it
    assert again == path and read_manifest(outcome.path)["rendered"]["engine"] is None
    assert not [p for p in outcome.path.iterdir() if p.name.startswith(".")]


def test_render_refuses_failed_or_foreign_folders(tmp_path):
    with pytest.raises(InputError, match="must be a record folder"):
        render_record(tmp_path)
    (tmp_path / "manifest.json").write_text(json.dumps({"status": "failed"}))
    with pytest.raises(InputError, match="status is 'failed'"):
        render_record(tmp_path)


def test_the_kernel_started_early_runs_in_the_record_folder_with_a_clean_namespace(tmp_path, monkeypatch):
    # The record's kernel starts before the study is checked and loads the first cell's modules
    # (isolation.app.record_kernel.WARM_UP: those reading results computed ahead need,
    # isolation.study.head_start.READING_MODULES): the workbook must still run in the record folder
    # (papermill's cwd) and see none of the warm-up's names, only its loaded modules.
    from isolation.app import calc_records as records

    notebook = json.loads(WORKBOOK.read_text())
    probe = ("import json, os, sys\n"
             "from isolation.study.head_start import READING_MODULES\n"
             "json.dump({'names': sorted(k for k in globals() if not k.startswith('_') and k != 'READING_MODULES'),\n"
             "           'loaded': all(m in sys.modules for m in READING_MODULES), 'cwd': os.getcwd()},\n"
             "          open('probe.json', 'w'))")
    notebook["cells"].insert(2, {"cell_type": "code", "execution_count": None, "id": "probe", "metadata": {},
                                 "outputs": [], "source": probe})
    default = tmp_path / "feasibility.ipynb"
    default.write_text(json.dumps(notebook))
    monkeypatch.setattr(records, "WORKBOOK", default)
    outcome = run_record(DEMO, tmp_path / "out", pdf=False, quick=True, run_id="early")
    assert outcome.status == "done", outcome.error
    seen = json.loads((outcome.path / "probe.json").read_text())
    assert seen["loaded"]
    assert not {"isolation", "IPython"} & set(seen["names"])
    assert Path(seen["cwd"]).parent == outcome.path.parent and Path(seen["cwd"]).name.startswith(".early.")
