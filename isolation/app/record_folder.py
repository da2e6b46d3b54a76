"""The folder of a calculation record: manifest and file hashes, run ids, atomic no-replace rename.

Helpers of :func:`isolation.app.calc_records.run_record`: times (UTC), versions
and git commit for the manifest, sha256 of every file, fresh run ids
(:func:`new_run_id`), the rename that never replaces (``renameat2`` with
``RENAME_NOREPLACE``), and the messages of a full disk. Re-exported from
:mod:`isolation.app.calc_records`.
"""

from __future__ import annotations

import datetime as _dt
import errno
import hashlib
import json
import os
import re
import secrets
import shutil
import subprocess
import sys
from pathlib import Path
from typing import Mapping

from isolation.errors import InputError, RunError
from isolation.files import write_text_atomic

__all__ = ["new_run_id", "sanitise_name", "LIBRARIES", "RECORD_SPACE_MB", "read_manifest", "verify_record",
           "REQUIRED_FILES"]

ROOT = Path(__file__).resolve().parents[2]

LIBRARIES = ("numpy", "scipy", "matplotlib", "pint", "papermill", "nbconvert", "nbformat", "nbclient",
             "ipykernel", "jupyter_client", "tqdm")
"""Libraries whose versions go into the manifest."""


def sanitise_name(name: str, fallback: str = "study") -> str:
    """A folder name from free text: lower case letters, digits, ``.``, ``_`` and ``-``.

    Path separators, spaces and anything else become ``-``; leading dots are
    removed (no hidden folders); at most 80 characters.
    """
    text = re.sub(r"[^a-z0-9._-]+", "-", str(name).lower())
    text = re.sub(r"-{2,}", "-", text).strip("-._")[:80].strip("-._")
    return text or fallback


def _now() -> str:
    return _dt.datetime.now(_dt.timezone.utc).isoformat(timespec="seconds")


def _one_line(error: BaseException) -> str:
    text = " ".join(str(error).split())
    name = type(error).__name__
    if name == "PapermillExecutionError":
        ename, evalue = getattr(error, "ename", ""), " ".join(str(getattr(error, "evalue", "")).split())
        cell = getattr(error, "exec_count", None)
        return f"workbook cell {cell} raised {ename}: {evalue}"
    if isinstance(error, KeyboardInterrupt):
        return "interrupted (KeyboardInterrupt or SIGTERM) before the record was complete"
    return f"{name}: {text}" if text else name


def _git_commit() -> tuple[str | None, bool | None]:
    try:
        head = subprocess.run(["git", "-C", str(ROOT), "rev-parse", "HEAD"], capture_output=True,
                              text=True, timeout=5)
        if head.returncode != 0:
            return None, None
        dirty = subprocess.run(["git", "-C", str(ROOT), "status", "--porcelain", "--untracked-files=no"],
                               capture_output=True, text=True, timeout=10)
        return head.stdout.strip(), bool(dirty.stdout.strip()) if dirty.returncode == 0 else None
    except (OSError, subprocess.SubprocessError):
        return None, None


def _versions() -> dict:
    from importlib import metadata

    found: dict[str, str | None] = {}
    for name in LIBRARIES:
        try:
            found[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            found[name] = None
    return found


def _write_json(path: Path, data: Mapping) -> None:
    write_text_atomic(path, json.dumps(data, indent=1, default=str))


def _sha256(path: Path) -> str:
    digest = hashlib.sha256()
    with path.open("rb") as handle:
        for block in iter(lambda: handle.read(1 << 20), b""):
            digest.update(block)
    return digest.hexdigest()


def _file_hashes(folder: Path) -> dict:
    return {p.name: _sha256(p) for p in sorted(folder.iterdir())
            if p.is_file() and p.name != "manifest.json" and not p.name.startswith(".")}


def new_run_id() -> str:
    """A fresh run id: the UTC time to the second and a random suffix, e.g. ``20261202T031500Z-3f9a1c``.

    Two runs started in the same second get different ids (24 random bits).
    """
    stamp = _dt.datetime.now(_dt.timezone.utc).strftime("%Y%m%dT%H%M%SZ")
    return f"{stamp}-{secrets.token_hex(3)}"


def _free_run_id(parent: Path, run_id: str | None) -> str:
    if run_id is not None:
        return sanitise_name(run_id, fallback="run")
    candidate = new_run_id()
    while (parent / candidate).exists():
        candidate = new_run_id()
    return candidate


_RENAME_NOREPLACE = 1  # linux/fs.h


def _rename_noreplace(source: Path, target: Path) -> None:
    """Rename ``source`` to ``target``; never replace anything at ``target``.

    Uses Linux ``renameat2(RENAME_NOREPLACE)`` (atomic); elsewhere, or on a
    file system without it, a check and ``os.rename`` (which never replaces
    a folder that holds files, and a record always holds its manifest).

    Raises
    ------
    FileExistsError
        When ``target`` exists.
    """
    if sys.platform.startswith("linux"):
        try:
            import ctypes

            libc = ctypes.CDLL(None, use_errno=True)
            rename2 = libc.renameat2
        except (OSError, AttributeError):
            rename2 = None
        if rename2 is not None:
            at_cwd = -100
            result = rename2(at_cwd, os.fsencode(source), at_cwd, os.fsencode(target), _RENAME_NOREPLACE)
            if result == 0:
                return
            number = ctypes.get_errno()
            if number == errno.EEXIST:
                raise FileExistsError(number, os.strerror(number), str(target))
            if number not in (errno.EINVAL, errno.ENOSYS, errno.ENOTSUP):
                raise OSError(number, os.strerror(number), str(source))
    if os.path.lexists(target):
        raise FileExistsError(errno.EEXIST, os.strerror(errno.EEXIST), str(target))
    os.rename(source, target)


RECORD_SPACE_MB = 30.0
"""Free space a record needs, a generous estimate (executed workbook with figures, report) [MB]."""


def _space_error(error: BaseException, folder: Path) -> str:
    """A one-line message for a full disk naming the path, the space needed and the space free."""
    try:
        free = shutil.disk_usage(folder if folder.exists() else folder.parent).free / 1e6
    except OSError:
        free = float("nan")
    where = getattr(error, "filename", None) or str(folder)
    return (f"no space left on the device while writing {where!s}: a record needs about "
            f"{RECORD_SPACE_MB:g} MB, {free:.1f} MB free in {str(folder.parent)!r}; free some space "
            "and run again (python -m isolation records --clean removes stale partial records)")


def _disk_full(error: BaseException) -> bool:
    if isinstance(error, OSError):
        return error.errno in (errno.ENOSPC, errno.EDQUOT)
    # A workbook cell that hit a full disk (papermill reports the kernel's error as text).
    text = f"{getattr(error, 'ename', '')} {getattr(error, 'evalue', '')}"
    return "[Errno 28]" in text or "No space left on device" in text


def _make_parent(parent: Path) -> None:
    try:
        parent.mkdir(parents=True, exist_ok=True)
    except FileExistsError:
        raise InputError(f"--out = {str(parent.parent)!r} is not allowed: must be a folder "
                         f"({str(parent)!r} or a folder above it is a file)") from None
    except NotADirectoryError:
        raise InputError(f"--out = {str(parent.parent)!r} is not allowed: must be a folder, "
                         "not a file (or a path through a file)") from None
    except OSError as error:
        if _disk_full(error):
            raise RunError(_space_error(error, parent)) from None
        raise InputError(f"--out = {str(parent.parent)!r} cannot be written: {error.strerror}") from None


def _close_manifest(folder: Path, manifest: dict, final: Path) -> None:
    """Write the final manifest; on a full disk, overwrite the first one in place (no new space)."""
    try:
        _write_json(folder / "manifest.json", manifest)
        return
    except OSError as error:
        if not _disk_full(error):
            raise
        if manifest["status"] == "done":
            manifest.update(status="failed", error=_space_error(error, final), report=None)
    brief = {key: manifest.get(key) for key in ("status", "error", "scope", "run_id", "study", "input_hash",
                                                 "started", "finished")}
    text = json.dumps(brief, default=str).encode("utf-8")
    path = folder / "manifest.json"
    try:
        size = path.stat().st_size
        with open(path, "r+b") as handle:  # the blocks the first manifest holds are reused
            handle.write(text + b" " * max(0, size - len(text)))
    except OSError:
        pass  # the folder stays "running"; the next start marks it failed (mark_stale_partials)


def _keep_clashed(folder: Path, final: Path, manifest: dict) -> Path:
    """Keep a finished run whose folder name was taken meanwhile, as a failed record beside it."""
    kept = final.with_name(f"{final.name}.clash-{secrets.token_hex(3)}")
    manifest.update(status="failed", error=f"clash: the record {str(final)!r} appeared while this run was "
                    "running (two runs with one run id); this run is kept here, nothing was replaced",
                    report=None)
    try:
        _write_json(folder / "manifest.json", manifest)
        _rename_noreplace(folder, kept)
    except OSError:
        return folder
    return kept


def read_manifest(record_dir: str | Path) -> dict:
    """The manifest of a record (``{}`` when it has none or it is unreadable)."""
    try:
        return json.loads((Path(record_dir) / "manifest.json").read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return {}


REQUIRED_FILES = ("study.toml", "feasibility.ipynb", "results.json")
"""Files every complete record holds (listed with their sha256 in its manifest)."""


def verify_record(record_dir: str | Path) -> str | None:
    """Check that a record is complete and unchanged since it was written.

    A record is complete when its manifest says "done", lists
    :data:`REQUIRED_FILES` (and its report, when it has one) and every file
    the manifest lists is present with the sha256 written there.

    Parameters
    ----------
    record_dir : str or Path
        The record folder.

    Returns
    -------
    str or None
        None when complete; otherwise why not (one line).
    """
    record = Path(record_dir)
    manifest = read_manifest(record)
    if not manifest:
        return f"{str(record)!r} has no readable manifest.json"
    if manifest.get("status") != "done":
        return f"{str(record)!r} has status {manifest.get('status')!r}, not 'done'"
    files = manifest.get("files")
    if not isinstance(files, dict):
        return f"{str(record)!r}: its manifest lists no file hashes"
    needed = list(REQUIRED_FILES) + ([manifest["report"]] if manifest.get("report") else [])
    for name in needed:
        if name not in files:
            return f"{str(record)!r}: its manifest does not list {name}"
    for name, digest in files.items():
        path = record / str(name)
        if Path(str(name)).name != str(name) or not path.is_file():
            return f"{str(record)!r}: {name} is missing"
        if _sha256(path) != digest:
            return f"{str(record)!r}: {name} was changed or damaged (its sha256 differs from the manifest)"
    return None
