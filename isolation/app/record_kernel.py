"""Executing the feasibility workbook of a record (papermill), the kernel's standard error kept aside.

Used by :func:`isolation.app.calc_records.run_record`: :func:`_execute` runs the
workbook in the record's folder with its parameters and sends what the kernel
writes to standard error into the record's hidden :data:`KERNEL_LOG`. The kernel
starts before the study is checked (:class:`_EarlyKernel`), so its start-up and
the first cell's imports (:data:`WARM_UP`) overlap the checks.
"""

from __future__ import annotations

import contextlib
import functools
import os
import subprocess
import sys
import tempfile
import threading
import time
from collections.abc import Callable
from pathlib import Path
from typing import Any

from isolation.errors import RunError

__all__ = ["KERNEL_LOG", "KERNEL_ARGUMENTS", "WARM_UP", "SAVE_INTERVAL", "run_workbook"]


KERNEL_LOG = ".kernel.log"
"""Hidden file in a record that keeps what the workbook's kernel wrote to standard error."""


@contextlib.contextmanager
def _stderr_to(path: Path):
    """Send this process's standard error (file descriptor 2, inherited by the kernel it
    starts) to ``path`` meanwhile: the kernel's own tracebacks when it is interrupted or
    shut down do not reach the terminal, whose messages stay one line."""
    try:
        sys.stderr.flush()
        saved = os.dup(2)
    except (OSError, ValueError, AttributeError):
        yield
        return
    try:
        with open(path, "ab") as log:
            os.dup2(log.fileno(), 2)
    except OSError:
        os.close(saved)
        yield
        return
    try:
        yield
    finally:
        try:
            sys.stderr.flush()
        except (OSError, ValueError):
            pass
        os.dup2(saved, 2)
        os.close(saved)


KERNEL_ARGUMENTS = (
    # Quiet the kernel's start-up warnings on stderr (loopback TCP on this machine); its errors still
    # show. No IPython history file (nbclient's own choice for the kernels it starts).
    "--IPKernelApp.log_level=ERROR", "--HistoryManager.hist_file=:memory:",
)

WARM_UP = ("import IPython.display, isolation.output.plots, isolation.output.report, isolation.output.tables, "
           "isolation.study, isolation.study.head_start", "isolation.study.head_start.prepare_reading()",
           "del IPython, isolation")
"""Lines the feasibility workbook's kernel runs as it starts (IPython ``exec_lines``): the modules its
first cell imports and those reading the results computed ahead needs
(:func:`isolation.study.head_start.prepare_reading`), loaded while this process still runs the study;
the names are deleted again, so the workbook's namespace is as if nothing ran. What only computing the
study needs (numba's compiled loops) is left out: this process computes it."""


_SKIPPED_IMPORTS = {
    # jsonschema (nbformat's validator) loads this IRI syntax checker when it is installed (jupyter-events
    # asks for it); it builds some forty grammars at import, about 1.5 s. Notebooks never use that check.
    "rfc3987_syntax": ("jsonschema",),
    # papermill reads notebooks from HDFS through pyarrow when it is installed (a dask extra brings it):
    # 0.1 s at import. Records read and write local files only.
    "pyarrow": ("papermill",),
}


def _lean_imports() -> None:
    """Import jsonschema and papermill without the optional modules a record never uses (:data:`_SKIPPED_IMPORTS`).

    Each skipped module is treated as missing for this one import (which both libraries expect of
    an optional module); a later ``import`` of it works as usual. Nothing is skipped for a module
    another part of the program has already imported.
    """
    for skipped, importers in _SKIPPED_IMPORTS.items():
        if skipped in sys.modules or all(name in sys.modules for name in importers):
            continue
        sys.modules[skipped] = None  # type: ignore[assignment]  # an import of it raises ImportError
        try:
            for name in importers:
                __import__(name)
        except ImportError:
            pass
        finally:
            if skipped in sys.modules and sys.modules[skipped] is None:
                del sys.modules[skipped]


class _EarlyKernel:
    """The workbook's kernel, started before the study is checked.

    Its start-up (and, for the feasibility workbook, the imports of its first cell,
    :data:`WARM_UP`) run beside the checks in this process; papermill then executes the
    workbook on it. Its standard error goes to a temporary file, later copied into the
    record's :data:`KERNEL_LOG`.
    """

    def __init__(self, warm_up: bool):
        from jupyter_client.manager import AsyncKernelManager
        from jupyter_core.utils import run_sync

        self._sync = run_sync
        self.log = tempfile.TemporaryFile()
        # papermill's client of this kernel: ready without the stock 0.2 s wait (kernel_client.QuickReadyClient)
        self.km = AsyncKernelManager(kernel_name="python3", client_class="isolation.app.kernel_client.QuickReadyClient")
        arguments = list(KERNEL_ARGUMENTS)
        if warm_up:
            arguments += [f"--IPKernelApp.exec_lines={line}" for line in WARM_UP]
        try:
            run_sync(self.km.start_kernel)(stderr=self.log, extra_arguments=arguments)
        except BaseException:
            self.log.close()
            raise

    @classmethod
    def start(cls, warm_up: bool) -> "_EarlyKernel | None":
        """A started kernel, or None when it cannot start here (papermill then starts its own
        and reports why in the record)."""
        try:
            return cls(warm_up)
        except Exception:  # noqa: BLE001 - the run itself reports a kernel that cannot start
            return None

    def enter(self, folder: Path, timeout: float = 60.0) -> None:
        """Make ``folder`` the kernel's working folder (papermill's ``cwd`` for a kernel it starts).

        Only the shell channel is used: the request waits there until the kernel has started
        and its reply comes back there, so no IOPub subscription has to be made first.
        """
        from queue import Empty

        client = self.km.blocking_client()
        client.start_channels(iopub=False, stdin=False, hb=False, control=False)
        try:
            request = client.execute(f"__import__('os').chdir({str(folder)!r})", silent=True, store_history=False)
            deadline = time.monotonic() + timeout
            reply = None
            while reply is None:
                if time.monotonic() > deadline or not self._sync(self.km.is_alive)():
                    raise RunError("the workbook's kernel did not start: it did not answer within "
                                   f"{timeout:.0f} s or stopped")
                try:
                    message = client.get_shell_msg(timeout=0.5)
                except Empty:
                    continue
                if message["parent_header"].get("msg_id") == request:
                    reply = message
        finally:
            client.stop_channels()
        if reply["content"].get("status") != "ok":
            raise RunError(f"the workbook's kernel could not enter the record folder {str(folder)!r}")

    def close(self, log: Path | None = None) -> None:
        """Stop the kernel; append what it wrote to standard error to ``log`` (once; later calls do nothing)."""
        if self.log.closed:
            return
        try:
            if self.km.has_kernel:
                # Killed and waited for here: jupyter_client's own wait looks every 0.1 s; it then
                # finds the process gone and only cleans up.
                process = getattr(self.km.provisioner, "process", None)
                if process is not None:  # a local process (subprocess.Popen)
                    with contextlib.suppress(OSError, subprocess.TimeoutExpired):
                        process.kill()
                        process.wait(timeout=5)
                self._sync(self.km.shutdown_kernel)(now=True)
        except Exception:  # noqa: BLE001 - a kernel already gone
            pass
        try:
            self.log.seek(0)
            text = self.log.read()
            if log is not None and text:
                with open(log, "ab") as out:
                    out.write(text)
        except OSError:
            pass
        finally:
            self.log.close()


def _execute(notebook: Path, folder: Path, study_path: str, quick: bool, timeout: float | None,
             kernel: _EarlyKernel | None = None, ahead: str = "", meanwhile: Callable[[], Any] | None = None) -> None:
    """Run the workbook in ``folder`` on ``kernel`` (or one papermill starts); ``meanwhile`` runs in a thread
    beside papermill once the kernel is ready (with results computed ahead, the first cell then only
    waits for them)."""
    log = folder / KERNEL_LOG
    try:
        with _stderr_to(log):
            if kernel is not None:
                kernel.enter(folder)
            _execute_quietly(notebook, folder, study_path, quick, timeout, kernel, ahead, meanwhile)
    finally:
        if kernel is not None:
            kernel.close(log)
        try:
            if log.stat().st_size == 0:
                log.unlink()
        except OSError:
            pass


def _quietly(work: Callable[[], Any]) -> None:
    """Run ``work``, which only prepares what comes next: a failure shows when that comes."""
    with contextlib.suppress(Exception):
        work()


SAVE_INTERVAL = 5.0
"""Seconds between saves of the executed workbook while it runs (:func:`_papermill_engine`). [s]"""


@functools.lru_cache(maxsize=1)
def _papermill_engine() -> str:
    """Name of papermill's engine with fewer saves, registered once.

    papermill writes the whole executed notebook before and after every cell: some fifty writes of
    up to a few megabytes of figures for the feasibility workbook, while the kernel waits. This engine
    saves at most every :data:`SAVE_INTERVAL` seconds in between (a run cut short still leaves a
    recent notebook for diagnosis); papermill itself writes the complete notebook at the end and
    the notebook with its error when a cell fails.
    """
    from papermill.engines import NBClientEngine, NotebookExecutionManager, papermill_engines

    class Manager(NotebookExecutionManager):
        def save(self, **kwargs):
            if (self.now() - self.last_save_time).total_seconds() >= SAVE_INTERVAL:
                super().save(**kwargs)

    class Engine(NBClientEngine):
        @classmethod
        def execute_notebook(cls, nb, kernel_name, output_path=None, progress_bar=True, log_output=False,
                             autosave_cell_every=30, **kwargs):
            manager = Manager(nb, output_path=output_path, progress_bar=progress_bar, log_output=log_output,
                              autosave_cell_every=autosave_cell_every)
            manager.notebook_start()
            try:
                cls.execute_managed_notebook(manager, kernel_name, log_output=log_output, **kwargs)
            finally:
                manager.cleanup_pbar()
                manager.notebook_complete()
            return manager.nb

    papermill_engines.register("isolation-records", Engine)
    return "isolation-records"


def _execute_quietly(notebook: Path, folder: Path, study_path: str, quick: bool, timeout: float | None,
                     kernel: _EarlyKernel | None = None, ahead: str = "",
                     meanwhile: Callable[[], Any] | None = None) -> None:
    _lean_imports()  # before the thread below: its imports must not see the modules skipped meanwhile
    if meanwhile is not None:  # beside papermill, which mostly waits for the kernel
        threading.Thread(target=_quietly, args=(meanwhile,), name="isolation-meanwhile", daemon=True).start()

    parameters = {"study_path": study_path, "output_dir": ".", "results_path": "results.json", "quick": bool(quick)}
    if ahead:  # results computed while the kernel started (isolation.study.head_start)
        parameters["precomputed"] = ahead
    _papermill(notebook, folder / "feasibility.ipynb", parameters, folder, timeout,
               km=None if kernel is None else kernel.km)


def _papermill(notebook: Path, target: Path, parameters: dict[str, Any], cwd: Path, timeout: float | None,
               km=None) -> None:
    """papermill on ``notebook`` into ``target``, on the kernel of ``km`` or one it starts itself."""
    _lean_imports()
    import papermill

    papermill.execute_notebook(
        str(notebook), str(target), engine_name=_papermill_engine(), parameters=parameters, cwd=str(cwd),
        kernel_name="python3", progress_bar=False, log_output=False, execution_timeout=timeout,
        # A kernel papermill starts itself: the same arguments as the early one (a trait of nbclient's
        # NotebookClient, passed on by papermill).
        extra_arguments=list(KERNEL_ARGUMENTS), km=km,
    )


def run_workbook(notebook: Path, target: Path, parameters: dict[str, Any], *, cwd: Path, log: Path,
                 timeout: float | None = None) -> None:
    """Execute ``notebook`` with papermill into ``target`` on a kernel papermill starts, in ``cwd``.

    Any workbook other than a record's (which :func:`_execute` runs on its early kernel). The kernel's
    standard error goes to ``log`` (the terminal keeps one-line messages); papermill's
    ``PapermillExecutionError`` names the failing cell.

    Parameters
    ----------
    notebook, target : Path
        Workbook to run, executed notebook to write. [-]
    parameters : dict
        papermill parameters. [-]
    cwd : Path
        The kernel's working folder. [-]
    log : Path
        File that receives the kernel's standard error (appended). [-]
    timeout : float, optional
        Limit per cell. [s]
    """
    with _stderr_to(log):
        _papermill(notebook, target, parameters, cwd, timeout)
