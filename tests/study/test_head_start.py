"""Results computed ahead of the workbook's kernel (isolation.study.head_start): read only when made
for the same study file, option and package version; otherwise computed again.

These are wiring checks of a cache (requirement: the record command's head start must never
change what a workbook shows); the numbers themselves are checked by the study tests.
"""

import os
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from isolation.processes import process_alive
from isolation.study import head_start

DEMO = Path(__file__).resolve().parents[2] / "examples" / "demo_study.toml"


@pytest.fixture(autouse=True)
def memory(tmp_path_factory, monkeypatch):
    """The folder kept in memory, here an ordinary folder of the test's own (the files it holds are seen)."""
    folder = tmp_path_factory.mktemp("memory")
    monkeypatch.setattr(head_start, "MEMORY_FOLDER", folder)
    return folder


@pytest.fixture
def computed_here(monkeypatch):
    """run_study replaced by a marker, so a test sees whether results_of computed."""
    calls = []

    def fake_run_study(study, *, quick=False):
        calls.append((study, quick))
        return "computed here"

    import isolation.study.runner as runner

    monkeypatch.setattr(runner, "run_study", fake_run_study)
    return calls


def test_pickle_of_the_same_study_and_option_is_read(tmp_path, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    head_start.save_ahead({"stands for": "results"}, tmp_path / head_start.AHEAD_FILE, study_file, quick=True)
    found = head_start.results_of("study", study_path=study_file, quick=True,
                                  precomputed=tmp_path / head_start.AHEAD_FILE)
    assert found == {"stands for": "results"} and computed_here == []


def test_the_pickle_goes_to_memory_linked_from_the_record_and_leaves_nothing(tmp_path, memory, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    ahead = tmp_path / head_start.AHEAD_FILE
    head_start.save_ahead({"stands for": "results"}, ahead, study_file, quick=False)
    [held] = memory.iterdir()
    assert ahead.is_symlink() and ahead.resolve() == held.resolve()
    assert held.name.startswith(f"isolation-ahead-{os.getpid()}-") and held.stat().st_mode & 0o077 == 0
    assert head_start.results_of("s", study_path=study_file, precomputed=ahead) == {"stands for": "results"}
    assert head_start.was_read(ahead) and computed_here == []
    head_start.remove_ahead(ahead)
    assert list(memory.iterdir()) == [] and not os.path.lexists(ahead)


@pytest.mark.parametrize("trouble", ["no memory folder", "the link fails"])
def test_without_room_in_memory_the_pickle_goes_to_the_record_folder(tmp_path, memory, monkeypatch, trouble,
                                                                       computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    ahead = tmp_path / head_start.AHEAD_FILE
    if trouble == "no memory folder":
        monkeypatch.setattr(head_start, "MEMORY_FOLDER", tmp_path / "absent")
    else:
        def no_link(*args):
            raise OSError(28, "No space left on device")

        monkeypatch.setattr(head_start.os, "symlink", no_link)
    head_start.save_ahead({"stands for": "results"}, ahead, study_file, quick=False)
    assert ahead.is_file() and not ahead.is_symlink() and list(memory.iterdir()) == []
    assert head_start.results_of("s", study_path=study_file, precomputed=ahead) == {"stands for": "results"}
    head_start.remove_ahead(ahead)
    assert sorted(p.name for p in tmp_path.iterdir()) == ["study.toml"]


def test_pickles_in_memory_of_ended_processes_are_removed(memory):
    ended = subprocess.Popen(["true"])
    ended.wait()
    orphan = memory / f"isolation-ahead-{ended.pid}-abc.pickle"
    alive = memory / f"isolation-ahead-{os.getpid()}-def.pickle"
    other = memory / "someone-else.pickle"
    for path in (orphan, alive, other):
        path.write_bytes(b"x")
    head_start.remove_orphans()
    assert sorted(p.name for p in memory.iterdir()) == sorted([alive.name, other.name])


def test_other_study_bytes_option_or_a_missing_file_compute_again(tmp_path, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    ahead = tmp_path / head_start.AHEAD_FILE
    head_start.save_ahead({"stands for": "results"}, ahead, study_file, quick=False)
    # another option
    assert head_start.results_of("s", study_path=study_file, quick=True, precomputed=ahead) == "computed here"
    # the study file changed by one byte after the pickle was made
    study_file.write_bytes(DEMO.read_bytes() + b"\n")
    assert head_start.results_of("s", study_path=study_file, quick=False, precomputed=ahead) == "computed here"
    # no pickle (a workbook run again later, or by hand), and no pickle asked for
    assert head_start.results_of("s", study_path=study_file, precomputed=tmp_path / "gone.pickle") == "computed here"
    assert head_start.results_of("s", study_path=study_file) == "computed here"
    assert len(computed_here) == 4


def test_results_still_being_computed_are_waited_for(tmp_path, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    ahead = tmp_path / head_start.AHEAD_FILE
    (tmp_path / head_start.PENDING_FILE).write_text(str(os.getpid()))  # this process computes them
    late = threading.Timer(0.3, head_start.save_ahead, args=({"stands for": "results"}, ahead, study_file, False))
    late.start()
    started = time.monotonic()
    found = head_start.results_of("s", study_path=study_file, precomputed=ahead)
    assert found == {"stands for": "results"} and computed_here == []
    assert time.monotonic() - started >= 0.25


def test_results_whose_process_ended_or_gave_up_are_computed_here(tmp_path, computed_here):
    study_file = tmp_path / "study.toml"
    study_file.write_bytes(DEMO.read_bytes())
    ahead = tmp_path / head_start.AHEAD_FILE
    ended = subprocess.Popen(["true"])
    ended.wait()
    (tmp_path / head_start.PENDING_FILE).write_text(str(ended.pid))
    started = time.monotonic()
    assert head_start.results_of("s", study_path=study_file, precomputed=ahead) == "computed here"
    (tmp_path / head_start.PENDING_FILE).unlink()  # it failed: the marker went, no pickle came
    assert head_start.results_of("s", study_path=study_file, precomputed=ahead) == "computed here"
    assert time.monotonic() - started < 5.0


def test_a_marker_file_names_its_process_or_not_yet(tmp_path):
    from isolation.processes import marked_process

    marker = tmp_path / "marker"
    assert marked_process(marker) == "absent"
    marker.write_text("")
    assert marked_process(marker) == "unnamed"
    marker.write_text(f"{os.getpid()}\n")
    assert marked_process(marker) == "running"
    ended = subprocess.Popen(["true"])
    ended.wait()
    marker.write_text(str(ended.pid))
    assert marked_process(marker) == "ended"


@pytest.mark.skipif(not hasattr(os, "fork"), reason="needs os.fork")
def test_a_process_that_ended_counts_as_ended_before_it_is_reaped():
    assert process_alive(os.getpid())
    pid = os.fork()
    if pid == 0:
        os._exit(0)
    deadline = time.monotonic() + 10.0
    while process_alive(pid) and time.monotonic() < deadline:  # a zombie until waited for
        time.sleep(0.01)
    assert not process_alive(pid)
    os.waitpid(pid, 0)
    assert not process_alive(pid)


@pytest.mark.skipif(not hasattr(os, "fork"), reason="the head start forks")
def test_a_head_start_that_fails_leaves_nothing_and_lets_the_workbook_run(tmp_path, monkeypatch):
    import isolation.study.runner as runner
    from isolation.app import record_ahead

    (tmp_path / "study.toml").write_bytes(DEMO.read_bytes())

    def failing(study, *, quick=False):
        raise RuntimeError("no memory left")

    monkeypatch.setattr(runner, "run_study", failing)  # the forked child inherits it
    # fork even if an earlier test left a thread at work in this process (the command line runs none)
    monkeypatch.setattr(record_ahead, "forking", lambda: hasattr(os, "fork"))
    ahead = record_ahead.start_ahead(tmp_path, "study.toml", quick=True)
    assert ahead.file == head_start.AHEAD_FILE and ahead.pid
    # the workbook waits for the child, sees it fail, and computes the results itself
    monkeypatch.setattr(runner, "run_study", lambda study, *, quick=False: "computed here")
    assert head_start.results_of("s", study_path=tmp_path / "study.toml", quick=True,
                                 precomputed=tmp_path / ahead.file) == "computed here"
    ahead.close()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["study.toml"]


@pytest.mark.skipif(not sys.platform.startswith("linux"), reason="the head start runs on Linux only")
def test_no_head_start_beside_a_thread_at_work():
    from isolation.app import record_ahead

    stop = threading.Event()
    worker = threading.Thread(target=stop.wait)  # not a daemon: work a fork would cut in half
    helper = threading.Thread(target=stop.wait, daemon=True)
    before = record_ahead.forking()  # True unless an earlier test left a thread at work here
    helper.start()
    try:
        assert record_ahead.forking() == before  # a daemon helper changes nothing
        worker.start()
        assert not record_ahead.forking()
    finally:
        stop.set()
        worker.join() if worker.is_alive() else None
        helper.join()
