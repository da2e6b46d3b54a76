"""``python -m isolation explore``: the live explorer as a stand-alone page.

:func:`app_notebook` writes a one-cell notebook (:func:`isolation.app.explorer.answers.build_explorer`,
which shows the scope and cautions itself) into a temporary folder, and
:func:`serve` runs Voila on it, listening on 127.0.0.1 only. Nothing is
written into the repository or the working folder; the temporary folder goes
when the server stops.
"""

from __future__ import annotations

import socket
import subprocess
import sys
import tempfile
from pathlib import Path

import nbformat

__all__ = ["APP_NAME", "app_notebook", "voila_command", "serve"]

APP_NAME = "explorer.ipynb"
"""File name of the page's notebook (the page is ``http://127.0.0.1:PORT/``)."""

_CODE = """\
from isolation.app.explorer.answers import build_explorer
build_explorer()"""


def app_notebook(folder: str | Path) -> Path:
    """Write the explorer page's notebook into ``folder``; returns its path."""
    notebook = nbformat.v4.new_notebook()
    notebook.cells = [nbformat.v4.new_code_cell(_CODE)]
    notebook.metadata["title"] = "Base isolation explorer"
    notebook.metadata["kernelspec"] = {"name": "python3", "display_name": "Python 3", "language": "python"}
    path = Path(folder) / APP_NAME
    nbformat.write(notebook, path)
    return path


def free_port() -> int:
    """A TCP port on 127.0.0.1 that nothing listens on now. [-]"""
    with socket.socket(socket.AF_INET, socket.SOCK_STREAM) as probe:
        probe.bind(("127.0.0.1", 0))
        return int(probe.getsockname()[1])


def voila_command(notebook: Path, port: int) -> list[str]:
    """The Voila command line serving ``notebook`` on 127.0.0.1:``port``."""
    return [sys.executable, "-m", "voila", str(notebook), f"--port={port}", "--no-browser",
            "--Voila.ip=127.0.0.1", "--Voila.port_retries=0", "--show_tracebacks=True"]


def serve(port: int | None = None, *, out=None) -> int:
    """Serve the explorer with Voila until interrupted; prints the page's URL first.

    Parameters
    ----------
    port : int, optional
        TCP port on 127.0.0.1, 1024-65535; default a free one. [-]
    out : file, optional
        Where the URL is printed (default standard output).

    Returns
    -------
    int
        Voila's exit code (0 after Ctrl-C).
    """
    if port is None:
        port = free_port()
    if isinstance(port, bool) or not isinstance(port, int) or not 1024 <= port <= 65535:
        raise ValueError(f"port = {port!r} is not allowed: must be a whole number in [1024, 65535]")
    with socket.socket(socket.AF_INET, socket.SOCK_STREAM) as probe:
        try:
            probe.bind(("127.0.0.1", port))
        except OSError:
            raise ValueError(f"port = {port} is not allowed: something already listens on 127.0.0.1:{port}; "
                             "choose another or leave --port out") from None
    out = out or sys.stdout
    with tempfile.TemporaryDirectory(prefix="isolation-explorer-") as folder:
        notebook = app_notebook(folder)
        print(f"Explorer: http://127.0.0.1:{port}/  (Ctrl-C stops it; screening only, not design)",
              file=out, flush=True)
        process = subprocess.Popen(voila_command(notebook, port), cwd=folder)
        try:
            return process.wait()
        except KeyboardInterrupt:
            process.terminate()
            try:
                process.wait(timeout=10)
            except subprocess.TimeoutExpired:
                process.kill()
            return 0
