"""Processes of this machine: whether one still runs.

Used where one process waits on another that announced itself by writing its process id into a
file (a record's owner, the record command's head start).
"""

from __future__ import annotations

import os
from pathlib import Path

__all__ = ["process_alive"]


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
