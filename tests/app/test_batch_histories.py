"""History sweeps (isolation.app.batch.histories): response histories for every variant of a batch.

Checks: the sweep gives, for the base variant, what the study run gives under the same suite
(isolation.study.runner.run_study, whose engine test_history*.py checks against closed forms and a
reference framework); a dask LocalCluster gives the local pool's summary; an interrupted sweep
keeps what finished and resumes with the rest; bad options exit 2 with one line.
"""

import json
import shutil
from pathlib import Path

import pytest

from isolation.app.batch.check import validate_plan
from isolation.app.batch.command import main
from isolation.app.batch.execute import STATE_FILE, run_batch
from isolation.app.batch.histories import MOTIONS_FOLDER, history_runner, prepare_motions, with_motions
from isolation.app.batch.plan import load_batch
from isolation.app.batch.summary import HISTORY_COLUMNS, read_summary

FIXTURES = Path(__file__).parents[1] / "fixtures" / "batch"
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"


def make_batch(folder: Path, radii=(2.5, 3.5), frictions=(0.05, 0.08)) -> Path:
    shutil.copy(FIXTURES / "study.toml", folder / "study.toml")
    path = folder / "batch.toml"
    path.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = {list(radii)!r}\n'
                    f'"{FRICTION}" = {list(frictions)!r}\n', encoding="utf-8")
    return path


def sweep(path: Path, out: Path, **options):
    plan = load_batch(path)
    motions = prepare_motions(plan, out, quick=True)
    hashes = with_motions(validate_plan(plan, settings={"mode": "direct"}, model_checks=False), motions)
    options.setdefault("executor", "local")
    options.setdefault("workers", 2)
    return run_batch(plan, out, hashes, runner=history_runner, progress=False, chunk=2, **options)


def test_base_variant_matches_the_study_run_under_the_same_suite(tmp_path):
    from isolation.study import load_study
    from isolation.study.runner import run_study

    out = tmp_path / "out"
    report = sweep(make_batch(tmp_path, radii=(2.5,), frictions=(0.05, 0.08)), out, workers=1)
    assert report.exit_code == 0
    rows = {r["variant"]: r for r in read_summary(out)}
    base = next(r for r in rows.values() if r[RADIUS] == 2.5 and r[FRICTION] == 0.05)
    # the study file itself (radius 2.5 m, friction 0.05): the study run's quick suite is the one
    # the sweep generated (same seed and settings), written to 8 significant digits
    results = run_study(load_study(tmp_path / "study.toml"), quick=True)
    summary = results.alternatives[0].history["summary"]
    assert base["verdict_basis"] == "response histories"
    assert base["verdict"] == results.alternatives[0].outcome
    for column, key in (("history_displacement_lower_m", "isolator_displacement_lower"),
                        ("history_displacement_upper_m", "isolator_displacement_upper"),
                        ("floor_acceleration_lower_g", "floor_acceleration_lower"),
                        ("floor_acceleration_fixed_g", "floor_acceleration_fixed"),
                        ("floor_acceleration_ratio", "floor_acceleration_ratio"),
                        ("drift_ratio_isolated", "drift_ratio_isolated")):
        assert base[column] == pytest.approx(summary[key], rel=1e-5), column
    # more friction, same radius: smaller peak isolator displacement under the same motions
    # (Naeim & Kelly 1999: higher characteristic strength, more hysteretic damping)
    other = next(r for r in rows.values() if r[FRICTION] == 0.08)
    assert other["history_displacement_lower_m"] < base["history_displacement_lower_m"]
    assert all(r[c] is not None for r in rows.values() for c in HISTORY_COLUMNS)


def test_dask_local_cluster_gives_the_local_pool_summary(tmp_path):
    path = make_batch(tmp_path)
    local = sweep(path, tmp_path / "local")
    dask = sweep(path, tmp_path / "dask", executor="local-cluster")
    assert local.exit_code == dask.exit_code == 0 and len(dask.done) == 4
    # requirement (issue 14): a history sweep on a dask LocalCluster equals the local pool
    assert (tmp_path / "local" / "summary.csv").read_text() == (tmp_path / "dask" / "summary.csv").read_text()


class StopAfter:
    """Raises KeyboardInterrupt in the batch process after ``count`` outcomes (a Ctrl-C)."""

    def __init__(self, count: int):
        self.count, self.seen = count, 0

    def __call__(self, outcome):
        self.seen += 1
        if self.seen >= self.count:
            raise KeyboardInterrupt


def test_interrupted_history_sweep_resumes_with_the_rest(tmp_path):
    path = make_batch(tmp_path, radii=(2.0, 2.5, 3.0), frictions=(0.04, 0.06))
    out = tmp_path / "out"
    stopped = sweep(path, out, workers=1, on_outcome=StopAfter(1))
    assert stopped.interrupted and stopped.exit_code == 130
    assert 1 <= len(stopped.done) < 6 and len(stopped.not_run) == 6 - len(stopped.done)
    first = {r["variant"]: r for r in read_summary(out) if r["status"] == "done"}
    resumed = sweep(path, out, workers=2)
    assert resumed.exit_code == 0
    assert sorted(resumed.ran) == sorted(stopped.not_run) and sorted(resumed.reused) == sorted(stopped.done)
    rows = {r["variant"]: r for r in read_summary(out)}
    assert all(r["status"] == "done" for r in rows.values()) and len(rows) == 6
    for key, row in first.items():  # kept as they were
        assert rows[key]["history_displacement_lower_m"] == row["history_displacement_lower_m"]
    # the input hashes include the motions: other motions, other hashes (the variants run again)
    state = json.loads((out / STATE_FILE).read_text())
    hashes = {key: entry["input_hash"] for key, entry in state["variants"].items()}
    assert len(set(hashes.values())) == 6
    plan = load_batch(path)
    plain = validate_plan(plan, settings={"mode": "direct"}, model_checks=False)
    assert with_motions(plain, {"motions_hash": "other"}).keys() == hashes.keys()
    assert not set(with_motions(plain, {"motions_hash": "other"}).values()) & set(hashes.values())


def test_command_runs_a_history_sweep_on_chosen_motions(tmp_path, capsys):
    path = make_batch(tmp_path, radii=(2.5,), frictions=(0.05,))
    first = tmp_path / "first"
    assert main([str(path), "--direct", "--histories", "--quick", "--out", str(first), "--no-progress"]) == 0
    suite = first / MOTIONS_FOLDER / "suite.json"
    again = tmp_path / "again"
    assert main([str(path), "--direct", "--histories", "--motions", str(suite), "--out", str(again),
                 "--no-progress"]) == 0
    a, b = read_summary(first)[0], read_summary(again)[0]
    assert b["history_displacement_lower_m"] == pytest.approx(a["history_displacement_lower_m"], rel=1e-9)
    capsys.readouterr()
    assert main([str(path), "--histories", "--out", str(tmp_path / "x")]) == 2
    assert "--direct" in capsys.readouterr().err
    assert main([str(path), "--direct", "--histories", "--motions", str(tmp_path / "none.json"),
                 "--out", str(tmp_path / "y")]) == 2
    err = capsys.readouterr().err
    assert "--motions" in err and len(err.strip().splitlines()) == 1
    assert not (tmp_path / "x").exists() and not (tmp_path / "y").exists()


def test_command_prepares_the_motions_on_the_workers_while_it_validates(tmp_path, monkeypatch, capsys):
    # Large batches are validated on the workers; a history sweep's suite and fixed base are prepared
    # there too, at the same time (isolation.app.batch.command._motions_on). Same arithmetic as the
    # serial path, so the same summary to the last digit; a batch that fails validation leaves no batch
    # folder behind (the project's bad-input rule).
    from isolation.app.batch import check

    path = make_batch(tmp_path, radii=(2.5,), frictions=(0.05, 0.08))
    options = ["--direct", "--histories", "--quick", "--no-progress", "--workers", "1"]
    assert main([str(path), *options, "--out", str(tmp_path / "serial")]) == 0
    monkeypatch.setattr(check, "CHUNK_FROM", 1)  # the pool path from one variant on
    assert main([str(path), *options, "--out", str(tmp_path / "pooled")]) == 0
    serial = {r["variant"]: r for r in read_summary(tmp_path / "serial")}
    pooled = {r["variant"]: r for r in read_summary(tmp_path / "pooled")}
    assert serial.keys() == pooled.keys() and len(serial) == 2
    for key, row in serial.items():
        for column in ("history_displacement_lower_m", "history_displacement_upper_m", "floor_acceleration_fixed_g"):
            assert pooled[key][column] == row[column]
    bad_folder = tmp_path / "bad"
    bad_folder.mkdir()
    bad = make_batch(bad_folder, radii=(-1.0,), frictions=(0.05,))
    capsys.readouterr()
    assert main([str(bad), *options, "--out", str(tmp_path / "never")]) == 2
    assert "radius" in capsys.readouterr().err
    assert not (tmp_path / "never").exists()


def test_a_warmed_worker_has_the_compiled_engine():
    # Derived: warm_worker loads the engine a history task uses; with numba installed it is the compiled one.
    pytest.importorskip("numba")
    from isolation.app.batch.histories import warm_worker

    assert warm_worker() is True


def test_chunks_are_seconds_long_and_the_same_for_one_and_two_workers():
    from isolation.app.batch.histories import history_chunk

    # 7 records x 6000 steps x 2 bounds at 2 us per record-step-case: 0.168 s a variant (derived
    # arithmetic), so about 4 s is 23 variants; never fewer than 4 tasks
    assert history_chunk(1000, 2, 7, 6000) == history_chunk(1000, 1, 7, 6000) == 23
    assert history_chunk(64, 1, 7, 6000) == history_chunk(64, 2, 7, 6000) == 16
    assert history_chunk(3, 2, 7, 6000) == 1
    # 256 variants: 23 a task would make 12 tasks, the last of 3 (derived arithmetic); equal tasks in a
    # number divisible by the workers instead: 12 tasks of 22 (the last 14), 6 for each of two workers
    assert history_chunk(256, 1, 7, 6000) == history_chunk(256, 2, 7, 6000) == 22
    # three workers: a number of tasks divisible by three (64 variants: 6 tasks of 11, the last 9)
    assert history_chunk(64, 3, 7, 6000) == 11
