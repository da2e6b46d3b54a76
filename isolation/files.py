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
import stat
from pathlib import Path

__all__ = ["write_bytes_atomic", "write_text_atomic", "read_input_text", "INPUT_LIMIT"]

INPUT_LIMIT = 16_000_000
"""Largest input text file read (study, batch, table, spectrum) [bytes]."""


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


def read_input_text(path, *, what: str, limit: int = INPUT_LIMIT) -> str:
    """Read a user's input file as UTF-8 text, refusing what is not a plain file.

    A named pipe, device or folder is refused without waiting on it (the
    file is opened non-blocking and checked before any read); so is a file
    larger than ``limit`` or one that is not UTF-8. A byte-order mark at the
    start is accepted and dropped.

    Parameters
    ----------
    path : str or Path
        The file. [-]
    what : str
        Its name in messages, e.g. ``"study file"`` or ``"batch.table"``. [-]
    limit : int
        Largest size accepted. [bytes]

    Returns
    -------
    str
        The text.

    Raises
    ------
    isolation.errors.InputError
        Naming the file and what is allowed.
    """
    from isolation.errors import InputError

    path = Path(path)
    shown = str(path)
    try:
        descriptor = os.open(path, os.O_RDONLY | getattr(os, "O_NONBLOCK", 0))
    except FileNotFoundError:
        raise InputError(f"{what} = {shown!r} does not exist; allowed: an existing text file") from None
    except IsADirectoryError:
        raise InputError(f"{what} = {shown!r} is a folder; allowed: a plain text file") from None
    except OSError as error:
        raise InputError(f"{what} = {shown!r} cannot be read ({error.strerror})") from None
    try:
        info = os.fstat(descriptor)
        if not stat.S_ISREG(info.st_mode):
            kind = ("a named pipe" if stat.S_ISFIFO(info.st_mode) else "a folder" if stat.S_ISDIR(info.st_mode)
                    else "a device or socket")
            raise InputError(f"{what} = {shown!r} is {kind}; allowed: a plain text file")
        if info.st_size > limit:
            raise InputError(f"{what} = {shown!r} holds {info.st_size} bytes; allowed: at most {limit} bytes")
        with os.fdopen(descriptor, "rb", closefd=False) as handle:
            data = handle.read(limit + 1)
    except OSError as error:
        raise InputError(f"{what} = {shown!r} cannot be read ({error.strerror})") from None
    finally:
        os.close(descriptor)
    if len(data) > limit:
        raise InputError(f"{what} = {shown!r} is larger than {limit} bytes; allowed: at most {limit} bytes")
    try:
        return data.decode("utf-8-sig")
    except UnicodeDecodeError as error:
        line = data[:error.start].count(b"\n") + 1
        raise InputError(f"{what} = {shown!r} is not UTF-8 text (byte {error.start}, line {line}: "
                         f"{error.reason}); allowed: a UTF-8 text file (save it as UTF-8)") from None
