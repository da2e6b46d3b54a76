"""A report's figures shared by two processes: each drawn once, taken by the other, never awaited in vain.

No outside source: these check the package's own hand-over protocol (claims made with
``O_CREAT | O_EXCL`` as POSIX specifies for ``open``, files renamed into place). The PNGs compared
are the package's own drawing of the same figure in the same process, byte for byte.
"""

from __future__ import annotations

import json
import os
import subprocess
import threading
import time

import pytest
from matplotlib.figure import Figure

from isolation.output import figure_sharing
from isolation.output.figure_sharing import SharedFigures, draw_ahead, figures_of, open_shared
from isolation.output.plots.report_figures import FigureList, FigureOrder
from isolation.study import head_start


def _tiny(label: str, log: list | None = None):
    def make() -> Figure:
        if log is not None:
            log.append(label)
        figure = Figure(figsize=(1.0, 0.8))
        figure.subplots().plot([0, 1], [0, 1 if label else 0])
        figure.suptitle(label)
        return figure

    return make


def _order(label: str, log: list | None = None, computes: bool = False) -> FigureOrder:
    return FigureOrder((label,), f"caption {label}", _tiny(label, log), dpi=40, computes=computes)


def _never() -> Figure:
    raise AssertionError("drawn here although the other process drew it")


def _dead_pid() -> int:
    process = subprocess.Popen(["true"])
    process.wait()  # ended and reaped: no process has this id now
    return process.pid


def test_a_figure_is_claimed_once_and_handed_over_whole(tmp_path):
    shared = SharedFigures(tmp_path)
    assert shared.claim(("a",)) is True
    assert shared.claim(("a",)) is False  # the second claimant (the other process) loses
    assert shared.take(("a",)) is None
    shared.put(("a",), b"\x89PNG figure")
    assert shared.take(("a",)) == b"\x89PNG figure"
    assert not [p for p in tmp_path.iterdir() if p.name.endswith(".part")]


@pytest.fixture
def study(tmp_path):
    path = tmp_path / "study.toml"
    path.write_text("a = 1\n")
    return path


def test_the_workbook_takes_a_figure_the_other_process_is_still_drawing(tmp_path, study):
    shared = open_shared(tmp_path / "shared", study, False, drawer=os.getpid())
    order = FigureOrder(("late",), "c", _never)
    assert shared.claim(order.key)  # claimed by "the other process"
    threading.Timer(0.2, shared.put, args=(order.key, b"drawn elsewhere")).start()
    started = time.monotonic()
    assert shared.source()(order) == b"drawn elsewhere"
    assert time.monotonic() - started >= 0.15  # it waited for the figure rather than drawing it


def test_a_figure_whose_drawer_ended_is_drawn_here(tmp_path, study):
    shared = open_shared(tmp_path / "shared", study, False, drawer=_dead_pid())
    order = _order("orphan")
    assert shared.claim(order.key)  # claimed, then its process ended without storing it
    assert shared.source(wait_limit=30.0)(order) == order.png()


def test_a_figure_claimed_after_the_drawer_finished_is_drawn_here(tmp_path, study):
    shared = open_shared(tmp_path / "shared", study, False, drawer=os.getpid())
    order = _order("unclaimed")
    shared.drawing_done()
    assert shared.source()(order) == order.png()  # claimed here: drawn here
    assert not shared.claim(order.key)


def test_draw_ahead_draws_from_the_last_figure_up_and_leaves_the_kernels_figures(tmp_path, study):
    drawn: list = []
    figures = FigureList([_order(name, drawn, computes=name == "third")
                          for name in ("first", "second", "third", "fourth", "fifth")])
    shared = open_shared(tmp_path / "shared", study, False)
    assert shared.claim(("first",))  # the kernel began at the top
    assert draw_ahead(shared, figures) == 4
    assert drawn == ["third", "fifth", "fourth", "second"]  # the computing figure first
    assert not shared.drawing()  # its marker is gone: nobody waits for it any more
    for order in figures.orders[1:]:
        assert shared.take(order.key) == order.png()
    assert shared.take(("first",)) is None


def test_draw_ahead_that_fails_still_releases_the_workbook(tmp_path, study):
    def broken() -> Figure:
        raise RuntimeError("no memory left")

    shared = open_shared(tmp_path / "shared", study, False)
    with pytest.raises(RuntimeError):
        draw_ahead(shared, FigureList([FigureOrder(("x",), "c", broken)]))
    assert not shared.drawing()


def test_figure_keys_are_unique_and_named_in_errors():
    with pytest.raises(ValueError, match="unique"):
        FigureList([_order("a"), _order("a")])
    with pytest.raises(KeyError, match="'missing'.*a"):
        FigureList([_order("a")])["missing"]


def test_figures_of_shares_the_folder_only_for_the_results_read_ahead(tmp_path, study, monkeypatch):
    monkeypatch.setattr(head_start, "MEMORY_FOLDER", tmp_path / "memory")  # no such folder: pickled in tmp_path
    pickle = tmp_path / head_start.AHEAD_FILE
    folder = tmp_path / figure_sharing.FOLDER
    monkeypatch.setattr("isolation.output.plots.report_figures.feasibility_figures",
                        lambda results, study: FigureList([FigureOrder(("only",), "c", _never)]))
    drawer = open_shared(folder, study, False)
    assert drawer.claim(("only",))
    drawer.put(("only",), b"drawn ahead")
    head_start.save_ahead({"stands for": "results"}, pickle, study, False)

    # results computed here although the pickle is there (say it could not be read): figures drawn here
    with pytest.raises(AssertionError, match="drawn here"):
        figures_of(None, None, study_path=study, quick=False, precomputed=pickle)["only"]._repr_png_()
    # the workbook read its results from the pickle: the folder's figures fit them
    assert head_start.results_of("s", study_path=study, precomputed=pickle) == {"stands for": "results"}
    shared = figures_of(None, None, study_path=study, quick=False, precomputed=pickle)
    assert shared["only"]._repr_png_()[0] == b"drawn ahead"
    # no results computed ahead: every figure is drawn here
    with pytest.raises(AssertionError, match="drawn here"):
        figures_of(None, None, study_path=study, quick=False)["only"]._repr_png_()
    # a folder drawn for another study file (its key differs): drawn here
    assert json.loads((folder / "key.json").read_text()) == list(head_start.ahead_key(study, False))
    (folder / "key.json").write_text(json.dumps(list(head_start.ahead_key(study, True))))
    with pytest.raises(AssertionError, match="drawn here"):
        figures_of(None, None, study_path=study, quick=False, precomputed=pickle)["only"]._repr_png_()
