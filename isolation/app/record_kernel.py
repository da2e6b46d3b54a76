"""Executing the feasibility workbook of a record (papermill), the kernel's standard error kept aside.

Used by :func:`isolation.app.calc_records.run_record`: :func:`_execute` runs the
workbook in the record's folder with its parameters and sends what the kernel
writes to standard error into the record's hidden :data:`KERNEL_LOG`.
"""

from __future__ import annotations

import contextlib
import os
import sys
from pathlib import Path

__all__ = ["KERNEL_LOG"]


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


def _execute(notebook: Path, folder: Path, study_path: str, quick: bool, timeout: float | None) -> None:
    log = folder / KERNEL_LOG
    try:
        with _stderr_to(log):
            _execute_quietly(notebook, folder, study_path, quick, timeout)
    finally:
        try:
            if log.stat().st_size == 0:
                log.unlink()
        except OSError:
            pass


def _execute_quietly(notebook: Path, folder: Path, study_path: str, quick: bool, timeout: float | None) -> None:
    import papermill

    papermill.execute_notebook(
        str(notebook), str(folder / "feasibility.ipynb"),
        parameters={"study_path": study_path, "output_dir": ".", "results_path": "results.json",
                    "quick": bool(quick)},
        cwd=str(folder), kernel_name="python3", progress_bar=False, log_output=False,
        execution_timeout=timeout,
        # Quiet the kernel's start-up warnings on stderr (loopback TCP on this machine); its
        # errors still show. A trait of nbclient's NotebookClient, passed on by papermill.
        extra_arguments=["--IPKernelApp.log_level=ERROR"],
    )
