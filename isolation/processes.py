"""Processes of this machine: whether one still runs, and the state of one a marker file names.

Used where one process waits on another that announced itself by writing its process id into a
file (a record's owner, the record command's head start).
"""

from __future__ import annotations

import os
from pathlib import Path

__all__ = ["process_alive", "marked_process"]


def process_alive(pid: int) -> bool:
    """True while process ``pid`` runs; one that has ended but was not yet reaped (a zombie) has ended.

    Parameters
    ----------
    pid : int
        Process id. [-]
    """
    try:
        state = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()[0]
    except (OSError, IndexError):
        try:
            os.kill(pid, 0)
        except ProcessLookupError:
            return False
        except PermissionError:
            return True
        return not Path("/proc").is_dir()  # /proc without this process: it has ended
    return state not in ("Z", "X")


def marked_process(marker: str | Path) -> str:
    """The state of the process a marker file names by its id.

    Returns
    -------
    str
        "absent" (no marker), "unnamed" (a marker that names no process yet), "running" or "ended"
        (:func:`process_alive` of the process it names).
    """
    try:
        named = Path(marker).read_text().strip()
    except OSError:
        return "absent"
    if not named.isdigit():
        return "unnamed"
    return "running" if process_alive(int(named)) else "ended"
