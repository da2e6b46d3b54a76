"""The study and the report's figures, computed ahead in a process of their own (the record command's head start).

:func:`start_ahead` forks the record command once the study is checked and copied into
the record. The child runs the study on that copy (:func:`isolation.study.runner.run_study`),
pickles the results for the workbook (:func:`isolation.study.head_start.save_ahead`) and
then draws the report's figures from the last one up (:func:`isolation.output.figure_sharing.draw_ahead`).
Meanwhile the command starts papermill on the workbook's kernel, which started even earlier
(:class:`isolation.app.record_kernel._EarlyKernel`): the workbook's first cell waits for the
pickle (:func:`isolation.study.head_start.results_of`), and its figures come from whichever
process drew them first. What the child does not finish, the workbook does itself: a child
that fails or is stopped leaves no pickle and no claim unanswered.

Only where a process forks cheaply and safely (:func:`forking`: Linux, no other thread at work, as
in the command line and the batch's local worker processes): elsewhere there is no head start,
and the workbook computes and draws everything.
"""

from __future__ import annotations

import contextlib
import gc
import os
import shutil
import signal
import sys
import threading
import time
from pathlib import Path

__all__ = ["Ahead", "start_ahead", "forking"]

STOP_WAIT = 5.0
"""Longest wait for the child to end once the workbook has run, before it is killed. [s]"""


def forking() -> bool:
    """True where the head start runs: on Linux, in a process whose other threads, if any, are daemon
    helpers (a progress bar's monitor, a kernel client's heartbeat, the reaper of an earlier head
    start). A fork copies only the calling thread, so a lock another thread held at that moment
    would stay held in the child: a process doing work in other threads (a dask worker) gets no
    head start."""
    if not (sys.platform.startswith("linux") and hasattr(os, "fork")):
        return False
    current = threading.current_thread()
    return all(thread is current or thread.daemon for thread in threading.enumerate())


class Ahead:
    """The head start of one record: the child process and the files it shares with the workbook.

    ``file`` is the results pickle's name in the record folder ("" without a head start).
    """

    def __init__(self, folder: Path, file: str = "", pid: int | None = None):
        self.folder, self.file, self.pid = Path(folder), file, pid

    def close(self) -> None:
        """End the head start: remove the pickle and the shared folders; stop the child unless it has
        finished. The child is reaped in a thread, so its exit (returning some hundred megabytes
        to the system) does not hold up the report."""
        from isolation.output.figure_sharing import FOLDER, SharedFigures
        from isolation.study.head_start import PENDING_FILE, remove_ahead, remove_orphans

        pid, self.pid = self.pid, None
        if pid is not None:
            finished = not (self.folder / PENDING_FILE).exists() and not SharedFigures(self.folder / FOLDER).drawing()
            if not finished:
                with contextlib.suppress(ProcessLookupError):
                    os.kill(pid, signal.SIGTERM)
            # the thread imports nothing: a fork of this process meanwhile (the next record of a batch
            # worker) would inherit a module lock an import held
            threading.Thread(target=_reap, args=(pid, remove_orphans), name="isolation-ahead-reaper",
                             daemon=True).start()
        shutil.rmtree(self.folder / FOLDER, ignore_errors=True)
        (self.folder / PENDING_FILE).unlink(missing_ok=True)
        if self.file:
            remove_ahead(self.folder / self.file)


def _reap(pid: int, remove_orphans) -> None:
    """Wait for the child; kill it when it has not ended within :data:`STOP_WAIT`. Then remove what a
    child stopped in the middle of writing its results left in memory (``remove_orphans``,
    :func:`isolation.study.head_start.remove_orphans`)."""
    deadline = time.monotonic() + STOP_WAIT
    try:
        while not os.waitpid(pid, os.WNOHANG)[0]:
            if time.monotonic() > deadline:
                os.kill(pid, signal.SIGKILL)
                os.waitpid(pid, 0)
                break
            time.sleep(0.05)
    except (ChildProcessError, ProcessLookupError):  # reaped or gone already
        pass
    remove_orphans()


def start_ahead(folder: Path, study_path: str, quick: bool) -> Ahead:
    """Fork the process that computes the study and draws the report's figures ahead of the workbook.

    Parameters
    ----------
    folder : Path
        The record's (partial) folder, holding the study copy. [-]
    study_path : str
        The study copy's name in ``folder``. [-]
    quick : bool
        The workbook's ``quick`` option. [-]

    Returns
    -------
    Ahead
        Pass ``Ahead.file`` to the workbook as ``precomputed``; call ``close()`` once it has run.
        Without :func:`forking`, an :class:`Ahead` with no process and no file.
    """
    if not forking():
        return Ahead(folder)
    from isolation.study.head_start import AHEAD_FILE, PENDING_FILE

    # The marker exists before the child does: the workbook's first cell waits for the results it announces.
    # The child makes the figures' shared folder before the results appear (matplotlib is the child's import).
    (folder / PENDING_FILE).write_text("")
    for stream in (sys.stdout, sys.stderr):  # nothing buffered here is written twice
        with contextlib.suppress(OSError, ValueError):
            stream.flush()
    gc.freeze()  # objects made so far stay out of the child's collections: fewer pages copied after the fork
    try:
        pid = os.fork()
    except OSError:
        gc.unfreeze()
        Ahead(folder).close()
        return Ahead(folder)
    if pid == 0:  # the child: it never returns into the caller's code
        try:
            _work(folder, study_path, quick)
        finally:
            os._exit(0)
    gc.unfreeze()
    return Ahead(folder, AHEAD_FILE, pid)


def _work(folder: Path, study_path: str, quick: bool) -> None:
    """The child: results, then figures. Quiet whatever happens: the workbook reports failures itself."""
    from isolation.study.head_start import AHEAD_FILE, PENDING_FILE

    pending, shared = folder / PENDING_FILE, None
    try:
        pending.write_text(str(os.getpid()))
        try:
            from isolation.output.figure_sharing import FOLDER, draw_ahead, open_shared

            shared = open_shared(folder / FOLDER, folder / study_path, quick)  # before the results appear
            from isolation.study import load_study
            from isolation.study.head_start import save_ahead
            from isolation.study.runner import run_study

            study = load_study(folder / study_path)
            results = run_study(study, quick=quick)
            save_ahead(results, folder / AHEAD_FILE, folder / study_path, quick)
        finally:
            pending.unlink(missing_ok=True)
        from isolation.output.plots.report_figures import feasibility_figures

        draw_ahead(shared, feasibility_figures(results, study))
    except BaseException:  # noqa: BLE001 - stopped or failed: the workbook computes and draws what is missing
        pass
    finally:
        if shared is not None:
            shared.drawing_done()
