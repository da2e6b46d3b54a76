"""Command line (isolation.app.cli): exit codes 0 done / 1 failed / 2 bad input, one-line
messages without tracebacks, --help everywhere, and the record layout that outside
checks rely on (issue 5: `python -m isolation check|run`)."""

import json
import subprocess
import sys
from pathlib import Path

import pytest

from isolation.app import cli
from tools import require_tools

ROOT = Path(__file__).resolve().parents[2]
DEMO = ROOT / "examples" / "demo_study.toml"
FIXTURES = Path(__file__).resolve().parents[1] / "fixtures"


def call(argv, capsys):
    code = cli.main(argv)
    out, err = capsys.readouterr()
    return code, out, err


def test_check_valid_study(capsys):
    code, out, err = call(["check", str(DEMO)], capsys)
    assert code == 0 and err == ""
    assert out.strip().endswith("2 alternative(s): Friction pendulum, Lead-rubber)")


@pytest.mark.parametrize("example", ["soft_site_study.toml", "pendulum_vs_rubber_study.toml"])
def test_examples_are_valid(example, capsys):
    assert call(["check", str(ROOT / "examples" / example)], capsys)[0] == 0


def test_check_bad_units_is_one_line_with_the_key_path(capsys):
    code, out, err = call(["check", str(DEMO), "--set", 'alternative.0.bearings.0.radius="12 kN"'], capsys)
    assert code == 2 and out == ""
    assert err.count("\n") == 1 and "Traceback" not in err
    assert "alternative[0].bearings[0].radius = '12 kN' is not allowed" in err


def test_check_lists_every_problem_on_one_line(capsys):
    code, _, err = call(["check", str(DEMO), "--set", "site.sms=-1", "--set", "analysis.suite_size=9",
                         "--set", "colour=1"], capsys)
    assert code == 2 and err.count("\n") == 1
    assert "3 problems" in err and "site.sms = -1" in err and "analysis.suite_size = 9" in err
    assert "colour is not a known key" in err


def test_check_accepts_a_coarse_time_step_that_the_engine_sub_steps(capsys):
    # The history engine splits each sample into ceil(10 dt / T_min) sub-steps (issue: no refusal for
    # stiff models), so a step coarser than T_min/10 is no longer bad input.
    code, _, err = call(["check", str(DEMO), "--set", 'analysis.time_step="0.02 s"'], capsys)
    assert code == 0, err


@pytest.mark.parametrize("argv, words", [
    (["check", "nowhere.toml"], ["does not exist"]),
    (["check"], ["required", "STUDY.toml"]),
    (["frobnicate"], ["invalid choice"]),
    (["run", str(DEMO), "--paper", "a3"], ["invalid choice", "a3"]),
    (["demo", "--engine", "tex"], ["invalid choice", "tex"]),
    (["check", str(DEMO), "--set", "nokey"], ["--set 'nokey' is not allowed"]),
    (["render", "/nonexistent/record"], ["must be a record folder"]),
    ([], ["usage"]),
])
def test_bad_input_exits_2_without_traceback(argv, words, capsys):
    code, _, err = call(argv, capsys)
    assert code == 2 and "Traceback" not in err
    for word in words:
        assert word in err


def test_malformed_toml_is_bad_input(tmp_path, capsys):
    bad = tmp_path / "bad.toml"
    bad.write_text("[site\n")
    code, _, err = call(["check", str(bad)], capsys)
    assert code == 2 and "not valid TOML" in err


@pytest.mark.parametrize("command", ["run", "check", "motions", "render", "demo"])
def test_help_on_each_command(command, capsys):
    code, out, _ = call([command, "--help"], capsys)
    assert code == 0 and out.startswith(f"usage: isolation {command}")


def test_module_entry_point_help():
    done = subprocess.run([sys.executable, "-m", "isolation", "--help"], capture_output=True, text=True,
                          cwd=ROOT, timeout=60)
    assert done.returncode == 0 and "run" in done.stdout and "batch" in done.stdout
    assert "licensed structural engineer" in done.stdout


def test_module_entry_point_bad_input_is_one_line_and_exit_2(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text("[project\n")
    done = subprocess.run([sys.executable, "-m", "isolation", "check", str(bad)], capture_output=True, text=True,
                          cwd=ROOT, timeout=60)
    assert done.returncode == 2
    assert len(done.stderr.strip().splitlines()) == 1 and "Traceback" not in done.stderr


def test_leaving_waits_for_threads_runs_exit_handlers_and_flushes():
    # What a normal interpreter exit does and the fast exit must still do (Python docs: atexit,
    # threading: "the entire Python program exits when only daemon threads are left").
    script = ("import atexit, threading, time, sys\n"
              "from isolation.app.cli import leave\n"
              "atexit.register(lambda: print('handler ran'))\n"
              "threading.Thread(target=lambda: (time.sleep(0.3), print('thread done'))).start()\n"
              "print('unflushed', end='')\n"
              "leave(3)\n")
    done = subprocess.run([sys.executable, "-c", script], capture_output=True, text=True, cwd=ROOT, timeout=60)
    assert done.returncode == 3
    assert done.stdout == "unflushedthread done\nhandler ran\n"


def test_batch_forwards_its_arguments(monkeypatch):
    import isolation.app.batch

    seen = []
    monkeypatch.setattr(isolation.app.batch, "main", lambda argv: seen.append(argv) or 7)
    assert cli.main(["batch", "plan.toml", "--workers", "2"]) == 7
    assert seen == [["plan.toml", "--workers", "2"]]


def test_failed_run_exits_1_and_leaves_a_failed_record(tmp_path, monkeypatch, capsys):
    import isolation.app.calc_records

    monkeypatch.setattr(isolation.app.calc_records, "WORKBOOK", FIXTURES / "record_failing.ipynb")
    code, out, err = call(["run", str(DEMO), "--out", str(tmp_path), "--no-pdf", "--run-id", "x"], capsys)
    assert code == 1 and err.count("\n") == 1 and "run failed" in err and "Traceback" not in err
    manifest = json.loads((tmp_path / "venhollow-emergency-communications-centre" / "x" / "manifest.json").read_text())
    assert manifest["status"] == "failed"


def test_run_writes_the_record(tmp_path, monkeypatch, capsys):
    import isolation.app.calc_records

    monkeypatch.setattr(isolation.app.calc_records, "WORKBOOK", FIXTURES / "record_workbook.ipynb")
    code, out, err = call(["run", str(DEMO), "--out", str(tmp_path), "--no-pdf", "--quick",
                           "--set", "project.revision=\"C\""], capsys)
    assert code == 0, err
    lines = out.splitlines()
    assert lines[0].startswith(f"record: {tmp_path}")
    assert [line for line in lines if line.startswith("verdict: ")][0].startswith("verdict: Friction pendulum: ")
    record = Path(lines[0].split(": ", 1)[1])
    assert json.loads((record / "manifest.json").read_text())["overrides"] == {"project.revision": "C"}


def test_default_engine_makes_a_pdf_without_tex(tmp_path, monkeypatch, capsys):
    import isolation.app.calc_records
    import isolation.output.report

    monkeypatch.setattr(isolation.app.calc_records, "WORKBOOK", FIXTURES / "record_workbook.ipynb")
    monkeypatch.setattr(isolation.output.report, "missing_tools", lambda: ["xelatex", "pandoc"])
    code, out, err = call(["run", str(DEMO), "--out", str(tmp_path), "--quick"], capsys)
    assert code == 0, err
    report = Path([line for line in out.splitlines() if line.startswith("report: ")][0].split(": ", 1)[1])
    assert report.name == "report.pdf" and report.read_bytes().startswith(b"%PDF")
    assert not [line for line in err.splitlines() if line.startswith("note: ")]


def test_missing_tex_gives_html_and_says_what_to_install(tmp_path, monkeypatch, capsys):
    import isolation.app.calc_records
    import isolation.output.report

    monkeypatch.setattr(isolation.app.calc_records, "WORKBOOK", FIXTURES / "record_workbook.ipynb")
    monkeypatch.setattr(isolation.output.report, "missing_tools", lambda: ["xelatex"])
    code, out, err = call(["run", str(DEMO), "--out", str(tmp_path), "--quick", "--engine", "latex"], capsys)
    assert code == 0, err
    report = Path([line for line in out.splitlines() if line.startswith("report: ")][0].split(": ", 1)[1])
    assert report.name == "report.html" and report.is_file()
    notes = [line for line in err.splitlines() if line.startswith("note: ")]
    assert len(notes) == 1 and "xelatex" in notes[0] and "texlive-xetex" in notes[0]
    assert json.loads((report.parent / "manifest.json").read_text())["report"] == "report.html"


def test_motions_exports_the_suite(tmp_path, capsys):
    code, out, err = call(["motions", str(DEMO), "--out", str(tmp_path), "--quick"], capsys)
    assert code == 0, err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["suite.json", "suite_01.txt", "suite_02.txt",
                                                          "suite_03.txt"]
    meta = json.loads((tmp_path / "suite.json").read_text())
    assert meta["count"] == 3


def _require_pdf_readers():
    # The default engine (Typst) comes with the package: the report is always a PDF.
    require_tools("pdftotext", skip=False)
    return False


@pytest.mark.slow
def test_outside_check_commands_end_to_end(tmp_path):
    """`python -m isolation run STUDY.toml --out DIR` as an outside check calls it."""
    missing = _require_pdf_readers()
    done = subprocess.run([sys.executable, "-m", "isolation", "run", str(DEMO), "--out", str(tmp_path),
                           "--quick"], capture_output=True, text=True, cwd=ROOT, timeout=600)
    assert done.returncode == 0, done.stderr
    (study_dir,) = tmp_path.iterdir()
    (record,) = study_dir.iterdir()
    names = {p.name for p in record.iterdir()}
    assert {"results.json", "manifest.json", "study.toml", "feasibility.ipynb"} <= names
    assert ("report.html" if missing else "report.pdf") in names
    assert json.loads((record / "manifest.json").read_text())["status"] == "done"


@pytest.mark.slow
def test_demo_prints_two_lines(tmp_path):
    missing = _require_pdf_readers()
    done = subprocess.run([sys.executable, "-m", "isolation", "demo", "--out", str(tmp_path)],
                          capture_output=True, text=True, cwd=ROOT, timeout=900)
    assert done.returncode == 0, done.stderr
    lines = done.stdout.splitlines()
    assert len(lines) == 2
    report = Path(lines[0].removeprefix("Report: "))
    assert lines[0].startswith("Report: ") and report.is_file()
    assert report.suffix == (".html" if missing else ".pdf")
    assert lines[1].startswith("Verdict: Friction pendulum: ") and "Lead-rubber: " in lines[1]
