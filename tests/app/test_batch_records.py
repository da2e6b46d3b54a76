"""Batches through the real feasibility workbook, kernel-start retry, Ctrl-C (issue 6).

The end-to-end tests run the workbook for real (papermill, quick suites) on
the invented fixture study and are marked slow; the retry and interruption
tests use stand-ins where the point is the machinery.
"""

import json
import os
import shutil
import signal
import subprocess
import sys
import textwrap
import time
import types
from pathlib import Path

import pytest

from isolation.app.batch.command import main
from isolation.app.batch.runners import VariantTask, is_kernel_start_error, record_runner
from isolation.app.batch.summary import read_summary
from isolation.app.batch.sweep import design_rows
from isolation.study import load_study

FIXTURES = Path(__file__).parents[1] / "fixtures" / "batch"
ROOT = Path(__file__).resolve().parents[2]
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"


# ---------------------------------------------------------------- kernel start race
class FlakyRecords:
    """Stand-in for isolation.app.calc_records: the first call fails as a kernel that died at start."""

    def __init__(self, folder: Path, failures: list[str]):
        self.folder, self.failures, self.calls = folder, list(failures), 0

    sanitise_name = staticmethod(lambda name, fallback="study": name)
    read_manifest = staticmethod(lambda folder: {})
    study_input_hash = staticmethod(lambda study_file, overrides: "")

    def run_record(self, study_file, out_dir, *, pdf, overrides, run_id, quick, **_options):
        self.calls += 1
        if self.failures:
            message = self.failures.pop(0)
            return types.SimpleNamespace(path=self.folder, status="failed", error=message)
        return types.SimpleNamespace(path=self.folder, status="done", error=None)


def _fake_rows(record_dir):
    return [{"alternative": "pendulum", "verdict": "feasible"}]


def test_kernel_start_race_is_retried_once(tmp_path, monkeypatch):
    # jupyter_client's own messages when a kernel dies or hangs at start (jupyter_client/client.py)
    assert is_kernel_start_error("RuntimeError: Kernel died before replying to kernel_info")
    assert is_kernel_start_error("RuntimeError: Kernel didn't respond in 60 seconds")
    assert not is_kernel_start_error("workbook cell 7 raised ValueError: radius = -1")
    monkeypatch.setattr("isolation.app.batch.rows.rows_from_record", _fake_rows)
    record = tmp_path / "study" / "v1"
    task = VariantTask("v1", str(FIXTURES / "study.toml"), {}, str(tmp_path))

    once = FlakyRecords(record, ["RuntimeError: Kernel died before replying to kernel_info"])
    monkeypatch.setitem(sys.modules, "isolation.app.calc_records", once)
    outcome = record_runner(task)
    assert outcome.status == "done" and outcome.attempts == 2 and once.calls == 2
    assert outcome.record == os.path.join("study", "v1")

    twice = FlakyRecords(record, ["RuntimeError: Kernel died before replying to kernel_info"] * 2)
    monkeypatch.setitem(sys.modules, "isolation.app.calc_records", twice)
    outcome = record_runner(task)
    # retried once only: the second failure is recorded
    assert outcome.status == "failed" and twice.calls == 2 and "kernel_info" in outcome.error

    other = FlakyRecords(record, ["workbook cell 7 raised ValueError: bad"])
    monkeypatch.setitem(sys.modules, "isolation.app.calc_records", other)
    outcome = record_runner(task)
    assert outcome.status == "failed" and other.calls == 1


def test_the_runner_passes_the_head_start_choice_to_the_record(tmp_path, monkeypatch):
    monkeypatch.setattr("isolation.app.batch.rows.rows_from_record", _fake_rows)
    asked = []

    class Records(FlakyRecords):
        def run_record(self, study_file, out_dir, **options):
            asked.append(options["head_start"])
            return super().run_record(study_file, out_dir, **options)

    monkeypatch.setitem(sys.modules, "isolation.app.calc_records", Records(tmp_path / "study" / "v1", []))
    for head_start in (True, False):
        task = VariantTask("v1", str(FIXTURES / "study.toml"), {}, str(tmp_path), head_start=head_start)
        assert record_runner(task).status == "done"
    assert asked == [True, False]


# ---------------------------------------------------------------- Ctrl-C, for real
STOPPABLE = textwrap.dedent(
    """
    import os, sys
    os.environ["BATCH_TEST_SLEEP"] = "1.0"
    sys.path.insert(0, {tests!r})
    from isolation.app.batch.execute import run_batch
    from isolation.app.batch.check import validate_plan
    from isolation.app.batch.plan import load_batch
    from test_batch_run import pendulum_runner

    plan = load_batch({batch!r})
    report = run_batch(plan, {out!r}, validate_plan(plan), workers=2, runner=pendulum_runner, progress=False)
    sys.exit(report.exit_code)
    """
)


def _state(out: Path) -> dict:
    path = out / "batch.json"
    try:
        return json.loads(path.read_text())["variants"]
    except (OSError, ValueError, KeyError):
        return {}


def test_ctrl_c_stops_cleanly_and_the_batch_resumes(tmp_path):
    shutil.copy(FIXTURES / "study.toml", tmp_path / "study.toml")
    batch = tmp_path / "six_batch.toml"
    batch.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = [2.0, 3.0]\n"{FRICTION}" = [0.04, 0.05, '
                     '0.06]\n')
    out = tmp_path / "out"
    script = tmp_path / "stoppable.py"
    script.write_text(STOPPABLE.format(tests=str(Path(__file__).parent), batch=str(batch), out=str(out)))
    process = subprocess.Popen([sys.executable, str(script)], start_new_session=True, cwd=ROOT,
                               stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    deadline = time.monotonic() + 60
    while time.monotonic() < deadline:
        if any(e.get("status") == "done" for e in _state(out).values()) or process.poll() is not None:
            break
        time.sleep(0.1)
    assert process.poll() is None, process.communicate()[1].decode()[-2000:]
    # Ctrl-C in a terminal: SIGINT to the whole process group (batch and workers)
    os.killpg(process.pid, signal.SIGINT)
    _, err = process.communicate(timeout=60)
    assert process.returncode == 130, err.decode()[-2000:]
    state = _state(out)
    done = sorted(k for k, e in state.items() if e["status"] == "done")
    assert 1 <= len(done) < 6
    assert all(e["status"] in ("done", "pending") for e in state.values())  # none marked failed
    rows = read_summary(out)
    assert sorted(r["variant"] for r in rows if r["status"] == "done") == done

    resumed = subprocess.run([sys.executable, str(script)], cwd=ROOT, capture_output=True, timeout=120)
    assert resumed.returncode == 0, resumed.stderr.decode()[-2000:]
    calls = sorted(p.name.split("~")[0] for p in (out / "calls").iterdir())
    # each variant completed once; those cut off by Ctrl-C started again
    assert set(calls) == set(_state(out)) and all(_state(out)[k]["status"] == "done" for k in calls)
    assert all(calls.count(k) == 1 for k in done)


# ---------------------------------------------------------------- the real workbook
@pytest.mark.slow
def test_batch_of_records_through_the_workbook(tmp_path, capsys):
    shutil.copy(FIXTURES / "study.toml", tmp_path / "study.toml")
    batch = tmp_path / "pair_batch.toml"
    batch.write_text(
        f'[batch]\nstudy = "study.toml"\n[[variant]]\nid = "wide"\n"{RADIUS}" = 3.0\n'
        f'[[variant]]\nid = "broken"\n"{RADIUS}" = 2.0\n"site.spectrum_file" = "absent.csv"\n'
    )
    out = tmp_path / "out"
    # The 'broken' variant names a spectrum file that does not exist: validation stops the batch.
    assert main([str(batch), "--out", str(out), "--quick", "--no-progress"]) == 2
    assert not out.exists()

    batch.write_text(
        f'[batch]\nstudy = "study.toml"\n[[variant]]\nid = "wide"\n"{RADIUS}" = 3.0\n'
        f'[[variant]]\nid = "narrow"\n"{RADIUS}" = 2.0\n'
    )
    assert main([str(batch), "--out", str(out), "--quick", "--workers", "2", "--no-progress"]) == 0
    rows = {r["variant"]: r for r in read_summary(out)}
    assert set(rows) == {"wide", "narrow"}
    for variant, row in rows.items():
        record = out / row["record"]
        manifest = json.loads((record / "manifest.json").read_text())
        assert manifest["status"] == "done" and manifest["run_id"] == variant
        assert (record / "results.json").is_file() and (record / "feasibility.ipynb").is_file()
        assert not list(record.glob("report.*"))  # PDF off by default in batches
        assert row["verdict_basis"] == "response histories" and row["floor_acceleration_ratio"] > 0
    # The design columns of a record equal those of the direct sweep of the same variant:
    # both come from the same study and the same equivalent-linear design.
    for variant, radius in (("wide", 3.0), ("narrow", 2.0)):
        direct = design_rows(load_study(tmp_path / "study.toml", overrides={RADIUS: radius}))[0]
        for column in ("D_M_lower_m", "D_M_upper_m", "D_TM_m", "T_M_upper_s", "base_shear_ratio_upper"):
            assert rows[variant][column] == pytest.approx(direct[column], rel=1e-12)
        assert rows[variant]["verdict"] in ("feasible", "feasible with conditions", "not recommended")
    # a friction pendulum of larger radius is more flexible: longer period (T = 2 pi sqrt(R/g) for the
    # pendulum alone, Zayas, Low & Mahin 1990)
    assert rows["wide"]["T_M_upper_s"] > rows["narrow"]["T_M_upper_s"]

    stamps = {v: (out / r["record"] / "manifest.json").stat().st_mtime_ns for v, r in rows.items()}
    capsys.readouterr()
    assert main([str(batch), "--out", str(out), "--quick", "--no-progress"]) == 0
    assert "0 ran, 2 from an earlier run" in capsys.readouterr().out
    assert stamps == {v: (out / r["record"] / "manifest.json").stat().st_mtime_ns for v, r in rows.items()}
    # without the batch state the records themselves are recognised by their input hash
    (out / "batch.json").unlink()
    assert main([str(batch), "--out", str(out), "--quick", "--no-progress"]) == 0
    assert "0 ran, 2 from an earlier run" in capsys.readouterr().out
    assert stamps == {v: (out / r["record"] / "manifest.json").stat().st_mtime_ns for v, r in rows.items()}
    assert read_summary(out) == list(rows.values())
