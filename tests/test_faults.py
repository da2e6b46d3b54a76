"""Faults: nothing lost, nothing misread, nothing hangs (issue 15).

Records: unique run ids, a final rename that never replaces a record, stale
partial folders, a full disk; batch resume against damaged records; input
files that are not plain UTF-8 files; signals and ``--out``. Hashes are
checked with hashlib (sha256, FIPS 180-4). What a correct outcome is comes
from the project's rules on errors (one line naming field, value and what is
allowed; exit 2 for bad input) and from POSIX rename and mount semantics.
"""

import hashlib
import json
import os
import shutil
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

from isolation.app.batch.check import validate_plan
from isolation.app.batch.execute import run_batch
from isolation.app.batch.plan import load_batch
from isolation.app.batch.runners import VariantOutcome, VariantTask
from isolation.app.calc_records import (
    ABANDONED,
    RecordClash,
    clean_records,
    mark_stale_partials,
    new_run_id,
    read_manifest,
    run_record,
    stale_items,
    verify_record,
)
from isolation.app.cli import main as cli
from isolation.errors import InputError, RunError
from isolation.files import read_input_text

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "examples" / "demo_study.toml"
FIXTURES = Path(__file__).resolve().parent / "fixtures"
STUDY_FOLDER = "venhollow-emergency-communications-centre"
RADIUS = "alternative.0.bearings.0.radius"


def visible(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir() if not p.name.startswith("."))


# ---------------------------------------------------------------- run ids and the final rename
def test_run_ids_of_one_second_differ():
    ids = {new_run_id() for _ in range(200)}
    assert len(ids) == 200
    stamp = ids.pop().split("-")[0]
    assert len(stamp) == 16 and stamp.endswith("Z") and stamp[8] == "T"   # ISO 8601 basic format, UTC


RUN_IN_CHILD = textwrap.dedent("""
    import json, sys
    from isolation.errors import InputError
    from isolation.app.calc_records import run_record
    run_id = sys.argv[3] or None
    try:
        outcome = run_record({demo!r}, sys.argv[1], pdf=False, notebook=sys.argv[2], run_id=run_id)
        print(json.dumps({{"path": str(outcome.path), "status": outcome.status}}))
    except InputError as error:
        print(json.dumps({{"error": type(error).__name__, "message": str(error)}}))
""")


def _two_runs(tmp_path: Path, notebook: Path, run_id: str = "") -> list[dict]:
    script = tmp_path / "child.py"
    script.write_text(RUN_IN_CHILD.format(demo=str(DEMO)))
    out = tmp_path / "records"
    children = [subprocess.Popen([sys.executable, str(script), str(out), str(notebook), run_id],
                                 stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True) for _ in range(2)]
    results = []
    for child in children:
        stdout, stderr = child.communicate(timeout=180)
        assert child.returncode == 0, stderr[-2000:]
        results.append(json.loads(stdout.strip().splitlines()[-1]))
    return results


def test_two_runs_started_together_keep_two_records(tmp_path):
    # Both children start within the same second (time stamps alone would clash).
    results = _two_runs(tmp_path, FIXTURES / "record_pause.ipynb")
    paths = {r["path"] for r in results}
    assert len(paths) == 2
    folder = tmp_path / "records" / STUDY_FOLDER
    assert sorted(visible(folder)) == sorted(Path(p).name for p in paths)
    for path in paths:
        manifest = read_manifest(path)
        assert manifest["run_id"] == Path(path).name   # each record holds its own run


def test_one_run_id_given_twice_is_an_error_not_a_deletion(tmp_path):
    results = _two_runs(tmp_path, FIXTURES / "record_pause.ipynb", run_id="same")
    errors = [r for r in results if "error" in r]
    made = [r for r in results if "path" in r]
    assert len(made) == 1 and len(errors) == 1
    assert "run_id = 'same'" in errors[0]["message"]
    folder = tmp_path / "records" / STUDY_FOLDER
    names = visible(folder)
    assert "same" in names
    if errors[0]["error"] == "RecordClash":   # both started before either finished
        clashed = [n for n in names if n.startswith("same.clash-")]
        assert len(clashed) == 1
        assert read_manifest(folder / clashed[0])["status"] == "failed"
        assert "clash" in read_manifest(folder / clashed[0])["error"]
    # the first record is intact: its manifest's hashes match its files
    manifest = read_manifest(folder / "same")
    for name, digest in manifest["files"].items():
        assert hashlib.sha256((folder / "same" / name).read_bytes()).hexdigest() == digest


def test_an_existing_record_is_never_replaced(tmp_path):
    first = run_record(DEMO, tmp_path, pdf=False, notebook=FIXTURES / "record_no_results.ipynb", run_id="keep")
    before = (first.path / "manifest.json").read_bytes()
    with pytest.raises(InputError, match="already exists"):
        run_record(DEMO, tmp_path, pdf=False, notebook=FIXTURES / "record_no_results.ipynb", run_id="keep")
    assert (first.path / "manifest.json").read_bytes() == before
    assert issubclass(RecordClash, InputError)


# ---------------------------------------------------------------- stale partial folders
def _fake_partial(parent: Path, pid: int, host: str | None = None) -> Path:
    import platform

    folder = parent / f".run.{pid}.partial"
    folder.mkdir(parents=True)
    manifest = {"status": "running", "owner": {"pid": pid, "host": host or platform.node()}}
    (folder / "manifest.json").write_text(json.dumps(manifest))
    return folder


def test_stale_partials_are_marked_failed_and_cleaned(tmp_path, monkeypatch):
    from isolation.study import head_start

    parent = tmp_path / "records" / "study"
    dead = subprocess.Popen([sys.executable, "-c", "pass"])
    dead.wait()
    stale = _fake_partial(parent, dead.pid)              # its process is gone
    live = _fake_partial(parent, os.getpid())            # this process: still running
    memory = tmp_path / "memory"                         # the head start's results of a killed command
    memory.mkdir()
    monkeypatch.setattr(head_start, "MEMORY_FOLDER", memory)
    orphan = memory / f"isolation-ahead-{dead.pid}-x1y2z3.pickle"
    orphan.write_bytes(b"results")
    assert mark_stale_partials(parent) == [stale]
    assert read_manifest(stale)["status"] == "failed" and read_manifest(stale)["error"] == ABANDONED
    assert read_manifest(live)["status"] == "running"
    leftover = parent / "record" / ".results.json.ab12cd34.part"
    leftover.parent.mkdir()
    leftover.write_text("half")
    old = time.time() - 7200
    os.utime(leftover, (old, old))
    found = stale_items(tmp_path / "records")
    assert stale in found and leftover in found and orphan in found and live not in found
    # the command: lists, then removes; records themselves are never touched
    assert cli(["records", "--out", str(tmp_path / "records")]) == 0
    assert stale.exists()
    assert cli(["records", "--out", str(tmp_path / "records"), "--clean"]) == 0
    assert not stale.exists() and not leftover.exists() and not orphan.exists() and live.exists()
    assert (parent / "record").is_dir()
    assert clean_records(tmp_path / "records") == []


# ---------------------------------------------------------------- batch resume with a damaged record
def record_writing_runner(task: VariantTask) -> VariantOutcome:
    """Stand-in runner: writes a small record with a manifest of sha256 hashes, as run_record does."""
    calls = Path(task.out_dir) / "calls"
    calls.mkdir(exist_ok=True)
    (calls / f"{task.variant_id}-{len(list(calls.iterdir()))}").touch()
    folder = Path(task.out_dir) / "study" / task.variant_id
    if folder.exists():
        shutil.rmtree(folder)
    folder.mkdir(parents=True)
    files = {"study.toml": b"# invented\n", "feasibility.ipynb": b'{"cells": []}',
             "results.json": json.dumps({"radius": task.overrides.get(RADIUS)}).encode()}
    for name, data in files.items():
        (folder / name).write_bytes(data)
    manifest = {"status": "done", "report": None,
                "files": {name: hashlib.sha256(data).hexdigest() for name, data in files.items()}}
    (folder / "manifest.json").write_text(json.dumps(manifest))
    return VariantOutcome(task.variant_id, "done", rows=({"alternative": "a", "verdict": "feasible"},),
                          record=os.path.join("study", task.variant_id))


def _calls(out: Path) -> list[str]:
    return sorted(p.name.rsplit("-", 1)[0] for p in (out / "calls").iterdir())


@pytest.mark.parametrize("damage", ["delete results", "empty notebook", "edit results", "drop manifest entry"])
def test_resume_runs_a_damaged_record_again(tmp_path, damage):
    shutil.copy(FIXTURES / "batch" / "study.toml", tmp_path / "study.toml")
    batch = tmp_path / "b.toml"
    batch.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = [2.0, 3.0]\n')
    plan = load_batch(batch)
    hashes = validate_plan(plan)
    out = tmp_path / "out"
    first = run_batch(plan, out, hashes, workers=1, runner=record_writing_runner, progress=False)
    assert len(first.done) == 2 and len(_calls(out)) == 2
    damaged = out / "study" / plan.variants[0].variant_id
    assert verify_record(damaged) is None
    if damage == "delete results":
        (damaged / "results.json").unlink()
    elif damage == "empty notebook":
        (damaged / "feasibility.ipynb").write_bytes(b"")
    elif damage == "edit results":
        (damaged / "results.json").write_text('{"radius": 99}')
    else:
        manifest = json.loads((damaged / "manifest.json").read_text())
        del manifest["files"]["results.json"]
        (damaged / "manifest.json").write_text(json.dumps(manifest))
    assert verify_record(damaged) is not None
    again = run_batch(plan, out, hashes, workers=1, runner=record_writing_runner, progress=False)
    assert again.ran == (plan.variants[0].variant_id,)           # only the damaged one ran again
    assert again.reused == (plan.variants[1].variant_id,)
    assert verify_record(damaged) is None


# ---------------------------------------------------------------- a full disk
@pytest.fixture
def small_disk(tmp_path):
    """A 1 MiB tmpfs (needs root; CI runs as root)."""
    mount = tmp_path / "small"
    mount.mkdir()
    try:
        done = subprocess.run(["mount", "-t", "tmpfs", "-o", "size=1m", "tmpfs", str(mount)],
                              capture_output=True, text=True, timeout=30)
    except (OSError, subprocess.SubprocessError) as error:
        pytest.skip(f"cannot mount a small tmpfs here ({error}); CI runs as root and can")
    if done.returncode != 0:
        pytest.skip(f"cannot mount a small tmpfs here ({done.stderr.strip()}); CI runs as root and can")
    try:
        yield mount
    finally:
        subprocess.run(["umount", "-l", str(mount)], capture_output=True, timeout=30)


def test_full_disk_leaves_a_failed_record_naming_the_path(small_disk):
    outcome = run_record(DEMO, small_disk, pdf=False, notebook=FIXTURES / "record_fills_disk.ipynb",
                         run_id="full")
    assert outcome.status == "failed"
    assert "no space left" in outcome.error and str(small_disk) in outcome.error and "MB" in outcome.error
    manifest = read_manifest(outcome.path)
    assert manifest["status"] == "failed" and "no space left" in manifest["error"]
    assert visible(small_disk / STUDY_FOLDER) == ["full"]
    assert verify_record(outcome.path) is not None               # nothing looks complete
    assert not list((small_disk / STUDY_FOLDER).glob(".*.partial"))


def test_full_disk_before_the_run_is_one_clear_error(small_disk):
    with open(small_disk / "filler", "wb", buffering=0) as handle:   # fill the file system to the last byte
        try:
            while True:
                handle.write(b"0" * 4096)
                handle.flush()
        except OSError:
            pass
    with pytest.raises((RunError, InputError), match="no space left"):
        run_record(DEMO, small_disk, pdf=False, notebook=FIXTURES / "record_no_results.ipynb", run_id="x")
    assert not (small_disk / STUDY_FOLDER / "x").exists()        # nothing of the run was written
    assert not list(small_disk.glob(f"{STUDY_FOLDER}/.*.partial"))


# ---------------------------------------------------------------- files that are not plain text files
def test_named_pipes_and_folders_are_refused_without_waiting(tmp_path):
    pipe = tmp_path / "study.toml"
    os.mkfifo(pipe)
    started = time.monotonic()
    with pytest.raises(InputError, match="named pipe"):
        read_input_text(pipe, what="study file")
    with pytest.raises(InputError, match="folder"):
        read_input_text(tmp_path, what="study file")
    assert time.monotonic() - started < 5
    assert cli(["check", str(pipe)]) == 2


def test_text_files_must_be_utf8_and_may_start_with_a_bom(tmp_path, capsys):
    latin = tmp_path / "latin.toml"
    latin.write_bytes("[batch]\nname = \"Caf\xe9\"\n".encode("latin-1"))
    with pytest.raises(InputError, match=r"latin.toml.*not UTF-8.*line 2"):
        read_input_text(latin, what="batch file")
    bom = tmp_path / "bom.csv"
    bom.write_bytes(b"\xef\xbb\xbfid,site.sms\nv1,1.0\n")
    assert read_input_text(bom, what="batch.table").startswith("id,")
    # the batch command: exit 2, one line naming the file
    assert cli(["batch", str(latin), "--check"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "latin.toml" in err[0]


def test_absurd_nesting_is_refused(tmp_path, capsys):
    deep = tmp_path / "deep.toml"
    deep.write_text("a = " + "[" * 3000 + "]" * 3000 + "\n")
    assert cli(["check", str(deep)]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and "nest" in err[0] and "Traceback" not in err[0]


# ---------------------------------------------------------------- --out and signals
def test_out_naming_a_file_exits_2_for_run_and_batch(tmp_path, capsys):
    target = tmp_path / "a-file"
    target.write_text("x")
    assert cli(["run", str(DEMO), "--out", str(target), "--no-pdf", "--quick"]) == 2
    batch = tmp_path / "b.toml"
    shutil.copy(DEMO, tmp_path / "study.toml")
    batch.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = [2.0]\n')
    assert cli(["batch", str(batch), "--out", str(target)]) == 2
    lines = capsys.readouterr().err.strip().splitlines()
    assert len(lines) == 2 and all("--out" in line and "a-file" in line for line in lines)
    assert target.read_text() == "x"


@pytest.mark.parametrize("which", [signal.SIGINT, signal.SIGTERM])
def test_interrupting_a_run_prints_one_line(tmp_path, which):
    code = textwrap.dedent(f"""
        import sys
        from isolation.app import calc_records as records
        records.WORKBOOK = records.Path({str(FIXTURES / "record_slow.ipynb")!r})
        from isolation.app.cli import main
        sys.exit(main(["run", {str(DEMO)!r}, "--out", {str(tmp_path)!r}, "--no-pdf", "--run-id", "cut"]))
    """)
    child = subprocess.Popen([sys.executable, "-c", code], stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                             text=True, start_new_session=True)
    deadline = time.monotonic() + 90
    while not list(tmp_path.glob(f"{STUDY_FOLDER}/.cut.*.partial/started.flag")):
        if child.poll() is not None or time.monotonic() > deadline:
            child.kill()
            pytest.fail(f"the slow workbook never started: {child.communicate()[1][-2000:]}")
        time.sleep(0.2)
    time.sleep(0.5)
    if which == signal.SIGINT:
        os.killpg(child.pid, signal.SIGINT)      # Ctrl-C in a terminal reaches the whole group
    else:
        child.send_signal(signal.SIGTERM)
    _, stderr = child.communicate(timeout=90)
    assert child.returncode == 1
    lines = [line for line in stderr.splitlines() if line.strip()]
    assert lines == ["interrupted"], stderr[-3000:]
    assert read_manifest(tmp_path / STUDY_FOLDER / "cut")["status"] == "failed"


# ---------------------------------------------------------------- check finds what run would fail on
@pytest.mark.parametrize("overrides, words", [
    # bearings far too stiff for the weight: T_M of hundredths of a second, no suite can cover it
    ({"building.floor_weights": 1.0, "building.base_weight": 1.0}, ["alternative[1]", "isolated period",
                                                                    "building.floor_weights"]),
    # far too heavy: the equivalent-linear period runs past the spectrum
    ({"building.floor_weights": 2e6, "building.base_weight": 2e6}, ["alternative[1]", "code design fails"]),
    # a building so stiff that its shortest period needs more sub-steps than allowed
    ({"building.fixed_base_period": 0.02, "building.storeys": 40, "building.storey_heights": 3.0,
      "building.floor_weights": 5000.0}, ["building.fixed_base_period", "sub-steps"]),
    ({"project.name": "Venhollow\x00"}, ["project.name", "control"]),
    # 40 storeys of 20 m: the code's period estimate (ASCE/SEI 7-16 Eq. 12.8-7) passes the spectrum's end
    ({"building.storeys": 40, "building.storey_heights": 20.0, "building.floor_weights": 5000.0,
      "building.lateral_system": "concrete_moment_frame"},
     ["building.fixed_base_period", "building.storey_heights", "[0, 10] s"]),
])
def test_check_finds_what_run_would_fail_on(tmp_path, overrides, words, capsys):
    args = ["check", str(DEMO)]
    for key, value in overrides.items():
        args += ["--set", f"{key}={json.dumps(value)}"]
    assert cli(args) == 2
    lines = [line for line in capsys.readouterr().err.splitlines() if line.strip()]
    assert len(lines) == 1
    for word in words:
        assert word in lines[0]


def test_a_spectrum_file_that_is_a_pipe_is_refused(tmp_path, capsys):
    study = tmp_path / "study.toml"
    text = DEMO.read_text(encoding="utf-8")
    mapping = __import__("tomllib").loads(text)
    for key in ("sms", "sm1", "long_period"):
        mapping["site"].pop(key, None)
    mapping["site"]["spectrum_file"] = "spectrum.csv"
    from isolation.app.calc_records import to_toml

    study.write_text(to_toml(mapping), encoding="utf-8")
    os.mkfifo(tmp_path / "spectrum.csv")
    started = time.monotonic()
    assert cli(["check", str(study)]) == 2
    assert time.monotonic() - started < 30
    line = capsys.readouterr().err.strip()
    assert "site.spectrum_file" in line and "named pipe" in line
