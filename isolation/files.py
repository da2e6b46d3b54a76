"""Whole-file writes that leave no half-written file behind.

The content goes to a new hidden file in the target's folder
(``.<name>.<random>.part``, created exclusively, usual permissions), which
is then renamed over the target with :func:`os.replace` (atomic within one
file system). On any failure the temporary file is removed and the target
keeps its old content, or stays absent. No fsync: a crash of the machine
itself may still lose the latest write.

Folder-level swaps (a calculation record's ``.partial`` folder, a set of
motion files written together) are a different mechanism and live with
their owners.
"""

from __future__ import annotations

import os
import secrets
from pathlib import Path

__all__ = ["write_bytes_atomic", "write_text_atomic"]


def write_bytes_atomic(path, data: bytes) -> Path:
    """Write ``data`` to ``path`` through a temporary file and a rename.

    Parameters
    ----------
    path : str or Path
        File to write; its folder must exist. [-]
    data : bytes
        The whole new content. [-]

    Returns
    -------
    Path
        ``path``.
    """
    path = Path(path)
    temporary = path.with_name(f".{path.name}.{secrets.token_hex(4)}.part")
    stream = open(temporary, "xb")  # nothing to clean up if this fails
    try:
        with stream:
            stream.write(data)
        os.replace(temporary, path)
    except BaseException:
        temporary.unlink(missing_ok=True)
        raise
    return path


def write_text_atomic(path, text: str, encoding: str = "utf-8") -> Path:
    """Write ``text`` to ``path`` through a temporary file and a rename.

    Line ends are written as they are in ``text`` (no translation).

    Parameters
    ----------
    path : str or Path
        File to write; its folder must exist. [-]
    text : str
        The whole new content. [-]
    encoding : str
        Text encoding. [-]

    Returns
    -------
    Path
        ``path``.
    """
    return write_bytes_atomic(path, text.encode(encoding))
