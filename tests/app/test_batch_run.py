"""Batch execution machinery: executors, failures, resume, interruption (issue 6).

The runner here is a stand-in that evaluates the friction-pendulum closed
forms (period T = 2 pi sqrt(R/g), Zayas, Low & Mahin 1990; effective damping
beta = (2/pi) mu/(mu + D/R), Naeim & Kelly 1999) so each variant takes
milliseconds: the point is the machinery (which variant runs where, what is
kept, what is re-run). The real workbook path is tested in test_batch_records.py.
"""

import json
import math
import os
import shutil
import time
from concurrent.futures import ThreadPoolExecutor
from pathlib import Path

import pytest

from isolation.app.batch.check import validate_plan
from isolation.app.batch.execute import STATE_FILE, run_batch
from isolation.app.batch.plan import load_batch
from isolation.app.batch.runners import VariantOutcome, VariantTask, guarded_call
from isolation.app.batch.summary import read_summary
from isolation.app.batch.sweep import sweep_runner

FIXTURES = Path(__file__).parents[1] / "fixtures" / "batch"
RADIUS = "alternative.0.bearings.0.radius"
FRICTION = "alternative.0.bearings.0.friction"
G = 9.80665  # standard gravity [m/s2] (CGPM 1901)
TRIAL_DISPLACEMENT = 0.3  # [m] fixed amplitude for the stand-in runner


def pendulum_runner(task: VariantTask) -> VariantOutcome:
    """Stand-in runner: closed-form pendulum values; friction 0.29 fails on purpose."""
    calls = Path(task.out_dir) / "calls"
    calls.mkdir(exist_ok=True)
    (calls / f"{task.variant_id}~{os.getpid()}~{len(list(calls.iterdir()))}").touch()
    time.sleep(float(os.environ.get("BATCH_TEST_SLEEP", "0.15")))  # interrupts find variants still queued
    radius = float(task.overrides.get(RADIUS, 2.5))
    friction = float(task.overrides.get(FRICTION, 0.05))
    if friction == 0.29:
        raise RuntimeError("deliberate failure for friction 0.29")
    if radius == 7.0:
        os._exit(3)  # the worker process dies (as when killed or out of memory)
    row = {
        "alternative": "pendulum",
        "verdict": "feasible",
        "T_M_lower_s": 2 * math.pi * math.sqrt(radius / G),
        "beta_M_lower": 2 / math.pi * friction / (friction + TRIAL_DISPLACEMENT / radius),
    }
    return VariantOutcome(task.variant_id, "done", rows=(row,))


def make_batch(folder: Path, frictions=(0.04, 0.06)) -> Path:
    shutil.copy(FIXTURES / "study.toml", folder / "study.toml")
    listed = ", ".join(repr(f) for f in frictions)
    path = folder / "grid_batch.toml"
    path.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = [2.0, 3.0]\n"{FRICTION}" = [{listed}]\n')
    return path


def calls(out: Path) -> list[str]:
    folder = out / "calls"
    return sorted(p.name.split("~")[0] for p in folder.iterdir()) if folder.exists() else []


def run(path: Path, out: Path, **options):
    plan = load_batch(path)
    hashes = validate_plan(plan)
    options.setdefault("executor", "local")
    options.setdefault("workers", 2)
    return run_batch(plan, out, hashes, runner=pendulum_runner, progress=False, **options)


def test_local_pool_runs_every_variant_and_rows_follow_their_overrides(tmp_path):
    out = tmp_path / "out"
    report = run(make_batch(tmp_path), out)
    assert report.exit_code == 0 and len(report.done) == 4 and not report.failed
    rows = read_summary(out)
    assert [r["status"] for r in rows] == ["done"] * 4
    for row in rows:
        # closed form for a pendulum of radius R: T = 2 pi sqrt(R/g) (Zayas, Low & Mahin 1990)
        assert row["T_M_lower_s"] == pytest.approx(2 * math.pi * math.sqrt(row[RADIUS] / G), rel=1e-12)
    # R = 2.0 m -> T = 2.8375 s (hand calculation: 2 pi sqrt(2/9.80665))
    assert rows[0][RADIUS] == 2.0 and rows[0]["T_M_lower_s"] == pytest.approx(2.8375, abs=1e-4)
    state = json.loads((out / STATE_FILE).read_text())
    assert set(state["variants"]) == {r["variant"] for r in rows}


def test_local_and_dask_local_cluster_give_identical_summaries(tmp_path):
    # The real direct-sweep runner (equivalent-linear design of the fixture study)
    # on a 2 x 2 grid: local processes and a dask LocalCluster (processes, no
    # dashboard, 2 workers) must write the same summary, byte for byte.
    path = make_batch(tmp_path)
    plan = load_batch(path)
    hashes = validate_plan(plan, settings={"mode": "direct"})
    local = run_batch(plan, tmp_path / "local", hashes, executor="local", workers=2, runner=sweep_runner,
                      progress=False)
    dask = run_batch(plan, tmp_path / "dask", hashes, executor="local-cluster", workers=2, runner=sweep_runner,
                     progress=False)
    assert local.exit_code == dask.exit_code == 0 and len(dask.done) == 4
    text = (tmp_path / "local" / "summary.csv").read_text()
    # requirement (issue 6): same summary on local processes and on a dask LocalCluster
    assert text == (tmp_path / "dask" / "summary.csv").read_text()
    rows = read_summary(tmp_path / "dask")
    assert len(rows) == 4 and all(r["status"] == "done" and r["D_M_lower_m"] > 0 for r in rows)
    # friction 0.04 -> 0.06 on the same radius: more damping and strength, smaller
    # lower-bound displacement (Naeim & Kelly 1999: beta_eff grows with mu at fixed D/R)
    by_id = {r["variant"]: r for r in rows}
    assert by_id["radius-2_friction-0.06"]["D_M_lower_m"] < by_id["radius-2_friction-0.04"]["D_M_lower_m"]


def test_no_worker_is_forked_while_the_summary_writer_imports(tmp_path, monkeypatch):
    # A fork copies only the calling thread: a module lock another thread holds at that moment stays held
    # in the child (Python docs, os.fork), whose next import of that module then waits forever. The
    # summary writer's import thread (here one that stays busy for a while) must start after the pool
    # has forked its workers.
    import threading
    from concurrent.futures import process

    import isolation.app.batch.execute as execute

    busy = threading.Event()

    def slow_preload():
        busy.set()
        threading.Thread(target=time.sleep, args=(1.0,), name="summary-writer-import", daemon=True).start()

    forked_beside_it = []
    spawn = process.ProcessPoolExecutor._spawn_process

    def watched_spawn(pool):
        forked_beside_it.append(any(t.name == "summary-writer-import" for t in threading.enumerate()))
        return spawn(pool)

    monkeypatch.setattr(execute, "preload_summary_writer", slow_preload)
    monkeypatch.setattr(process.ProcessPoolExecutor, "_spawn_process", watched_spawn)
    report = run(make_batch(tmp_path), tmp_path / "out", executor="local", workers=2)
    assert report.exit_code == 0 and busy.is_set()
    assert forked_beside_it == [False, False]


def test_a_record_forks_its_head_start_only_where_each_worker_has_a_spare_core(monkeypatch):
    # The head start takes a second core beside the workbook's kernel (isolation.app.record_ahead): with
    # fewer than two cores per worker it only competes with the other workers (measured: 4 records on
    # 2 cores, 2 workers with it 23.8 records/min, without it 25.7).
    from concurrent.futures import ProcessPoolExecutor

    from isolation.app.batch.executors import spare_core_each

    monkeypatch.setattr(os, "cpu_count", lambda: 8)
    assert spare_core_each("local", 4) and spare_core_each("local", 1)
    assert not spare_core_each("local", 5) and not spare_core_each("local", None)  # default: a worker per core
    assert not spare_core_each("local-cluster", 1) and not spare_core_each("tcp://10.0.0.5:8786", 1)
    with ProcessPoolExecutor(max_workers=1) as pool:
        assert spare_core_each(pool, 2) and not spare_core_each(pool, 6)
    monkeypatch.setattr(os, "cpu_count", lambda: 2)
    assert spare_core_each("local", 1) and not spare_core_each("local", 2)


def _head_start_runner(task: VariantTask) -> VariantOutcome:
    (Path(task.out_dir) / f"head-start-{task.variant_id}").write_text(str(task.head_start))
    return VariantOutcome(task.variant_id, "done", rows=({"alternative": "pendulum", "verdict": "feasible"},))


@pytest.mark.parametrize("workers, expected", [(1, "True"), (4, "False")])
def test_run_batch_tells_each_task_whether_it_may_fork(tmp_path, monkeypatch, workers, expected):
    monkeypatch.setattr(os, "cpu_count", lambda: 4)
    plan = load_batch(make_batch(tmp_path))
    run_batch(plan, tmp_path / "out", validate_plan(plan), runner=_head_start_runner, progress=False,
              executor="local", workers=workers)
    told = {p.read_text() for p in (tmp_path / "out").glob("head-start-*")}
    assert told == {expected}
    plan = load_batch(make_batch(tmp_path))
    run_batch(plan, tmp_path / "forced", validate_plan(plan), runner=_head_start_runner, progress=False,
              workers=1, head_start=False)
    assert {p.read_text() for p in (tmp_path / "forced").glob("head-start-*")} == {"False"}


def test_bad_variant_fails_alone_then_rerun_skips_and_retries_on_request(tmp_path):
    path = make_batch(tmp_path, frictions=(0.04, 0.29))
    out = tmp_path / "out"
    first = run(path, out)
    # requirement (issue 6): a failing variant is recorded failed, the batch goes on
    assert first.exit_code == 1
    assert sorted(first.failed) == ["radius-2_friction-0.29", "radius-3_friction-0.29"]
    assert sorted(first.done) == ["radius-2_friction-0.04", "radius-3_friction-0.04"]
    rows = {r["variant"]: r for r in read_summary(out)}
    assert "deliberate failure" in rows["radius-2_friction-0.29"]["error"]
    assert rows["radius-2_friction-0.29"]["status"] == "failed"
    assert len(calls(out)) == 4

    second = run(path, out)
    # re-run: done and failed variants are both kept, nothing runs again
    assert second.ran == () and len(second.reused) == 4 and second.exit_code == 1
    assert len(calls(out)) == 4

    third = run(path, out, retry_failed=True)
    assert sorted(third.ran) == sorted(first.failed)
    assert len(calls(out)) == 6


def test_variant_that_kills_its_worker_fails_alone(tmp_path):
    shutil.copy(FIXTURES / "study.toml", tmp_path / "study.toml")
    path = tmp_path / "deadly_batch.toml"
    path.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = [2.0, 7.0, 3.0]\n"{FRICTION}" = [0.04, '
                    '0.06]\n')
    report = run(path, tmp_path / "out")
    # the two radius-7 variants kill their worker; those in hand at the time run again,
    # alone, on a fresh pool: only the culprits fail
    assert sorted(report.failed) == ["radius-7_friction-0.04", "radius-7_friction-0.06"]
    assert len(report.done) == 4
    rows = {r["variant"]: r for r in read_summary(tmp_path / "out")}
    assert "worker process died" in rows["radius-7_friction-0.04"]["error"]


def test_changed_variant_input_runs_again(tmp_path):
    path = make_batch(tmp_path)
    out = tmp_path / "out"
    run(path, out, workers=1)
    # the study itself changes for every variant (building weight): every hash changes
    study = tmp_path / "study.toml"
    study.write_text(study.read_text().replace("base_weight = 4000.0", "base_weight = 4200.0"))
    again = run(path, out, workers=1)
    assert sorted(again.ran) == sorted(again.done) and len(again.ran) == 4
    assert len(calls(out)) == 8


class StopAfter:
    """Raises KeyboardInterrupt in the batch process after ``count`` outcomes (a Ctrl-C)."""

    def __init__(self, count: int):
        self.count, self.seen = count, 0

    def __call__(self, outcome):
        self.seen += 1
        if self.seen >= self.count:
            raise KeyboardInterrupt


def test_interrupted_batch_keeps_completed_and_resumes(tmp_path):
    path = make_batch(tmp_path)
    out = tmp_path / "out"
    stopped = run(path, out, workers=1, on_outcome=StopAfter(1))
    # requirement (issue 6): Ctrl-C stops cleanly, completed records stay, exit code 130
    assert stopped.interrupted and stopped.exit_code == 130
    assert 1 <= len(stopped.done) < 4 and len(stopped.not_run) == 4 - len(stopped.done)
    rows = read_summary(out)
    assert sorted(r["status"] for r in rows).count("not run") == len(stopped.not_run)
    resumed = run(path, out, workers=2)
    assert resumed.exit_code == 0 and sorted(resumed.ran) == sorted(stopped.not_run)
    assert sorted(resumed.reused) == sorted(stopped.done)
    assert sorted(calls(out)) == sorted(set(calls(out)))  # each variant ran exactly once


def test_interrupt_raised_inside_a_worker_stops_the_batch(tmp_path):
    # Ctrl-C in a terminal reaches the workers too: a KeyboardInterrupt inside a
    # variant marks it 'interrupted' (run again on resume) and stops the batch.
    task = VariantTask("x", "study.toml", {}, str(tmp_path))
    outcome = guarded_call(_interrupting_runner, task)
    assert outcome.status == "interrupted"
    path = make_batch(tmp_path)
    plan = load_batch(path)
    with ThreadPoolExecutor(1) as pool:
        report = run_batch(plan, tmp_path / "out", validate_plan(plan), executor=pool,
                           runner=_interrupting_runner, progress=False)
    assert report.interrupted and report.done == () and len(report.not_run) == 4


def _interrupting_runner(task):
    raise KeyboardInterrupt


def test_runner_exception_becomes_failed_outcome(tmp_path):
    outcome = guarded_call(pendulum_runner, VariantTask("bad", "s.toml", {FRICTION: 0.29}, str(tmp_path)))
    assert outcome.status == "failed"
    assert outcome.error == "RuntimeError: deliberate failure for friction 0.29"


def test_command_direct_sweep_on_a_dask_scheduler(tmp_path, capsys):
    from dask.distributed import LocalCluster

    from isolation.app.batch.command import main

    shutil.copy(FIXTURES / "study.toml", tmp_path / "study.toml")
    radii = [1.5 + 0.25 * i for i in range(8)]
    frictions = [0.03 + 0.01 * i for i in range(8)]
    batch = tmp_path / "wide_batch.toml"
    batch.write_text(f'[batch]\nstudy = "study.toml"\n[grid]\n"{RADIUS}" = {radii!r}\n"{FRICTION}" = {frictions!r}\n')
    out = tmp_path / "out"
    with LocalCluster(n_workers=2, threads_per_worker=1, processes=True, dashboard_address=None) as cluster:
        code = main([str(batch), "--direct", "--scheduler", cluster.scheduler_address, "--out", str(out),
                     "--no-progress"])
        assert code == 0, capsys.readouterr().err
        rows = read_summary(out)
        # 8 x 8 grid, one alternative in the fixture study: 64 rows, all done
        assert len(rows) == 64 and {r["status"] for r in rows} == {"done"}
        assert {r["verdict_basis"] for r in rows} == {"equivalent linear"}
        state = json.loads((out / STATE_FILE).read_text())
        assert state["settings"]["executor"] == cluster.scheduler_address
        # 64 variants are validated in chunks on the cluster: two bad ones reported together
        batch.write_text(batch.read_text().replace("0.03, ", "-0.03, ").replace("1.5, ", "25.0, "))
        capsys.readouterr()
        assert main([str(batch), "--direct", "--scheduler", cluster.scheduler_address, "--out", str(out),
                     "--no-progress"]) == 2
        err = capsys.readouterr().err
        # friction -0.03 (8 variants) and radius 25 m (8 variants, one shared): 15 invalid
        assert "15 of 64 variants are invalid" in err and len(err.strip().splitlines()) == 1


def test_chunks_are_balanced_in_file_order():
    # Common practice (static balanced partition): ceil(n/size) parts, none longer than size, lengths
    # differing by at most one, concatenating back to the input.
    from isolation.app.batch.execute import _chunks

    for count, size in ((256, 22), (10, 3), (7, 7), (1, 5), (0, 4), (23, 1)):
        items = list(range(count))
        parts = _chunks(items, size)
        assert [x for part in parts for x in part] == items
        assert len(parts) == -(-count // size)
        lengths = [len(part) for part in parts]
        assert all(0 < n <= size for n in lengths)
        assert not lengths or max(lengths) - min(lengths) <= 1
    assert [len(p) for p in _chunks(list(range(256)), 22)].count(22) == 4  # 4 x 22 + 8 x 21
