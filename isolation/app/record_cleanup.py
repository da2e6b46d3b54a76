"""Stale partial records: found, marked failed, cleaned (``python -m isolation records --clean``).

A run killed outright leaves its hidden ``.<run id>.<random>.partial`` folder;
:func:`mark_stale_partials` marks those whose process is gone as failed
(:data:`ABANDONED`) on the next run, :func:`stale_items` lists them and other
leftovers, :func:`clean_records` removes them. Re-exported from
:mod:`isolation.app.calc_records`.
"""

from __future__ import annotations

import platform
import shutil
import tempfile
import time
from pathlib import Path
from typing import Any

from isolation.app.record_folder import _now, _write_json, read_manifest
from isolation.processes import process_alive

__all__ = ["ABANDONED", "mark_stale_partials", "stale_items", "clean_records"]

ABANDONED = ("abandoned: the run stopped before its record was complete (killed, machine stopped "
             "or disk full); found on a later start")


def _pid_alive(pid: Any) -> bool:
    return isinstance(pid, int) and pid > 0 and process_alive(pid)


def _is_stale(partial: Path) -> bool:
    """A hidden ``.partial`` folder whose run is over (its process is gone or it says so)."""
    manifest = read_manifest(partial)
    if manifest.get("status") != "running":
        return True
    owner = manifest.get("owner") or {}
    if owner.get("host") == platform.node():
        return not _pid_alive(owner.get("pid"))
    # Another machine, or a manifest without an owner: stale when untouched for a day.
    try:
        return time.time() - partial.stat().st_mtime > 86400
    except OSError:
        return False


def mark_stale_partials(parent: str | Path) -> list[Path]:
    """Mark the stale ``.partial`` folders in a study's records folder as failed.

    A run killed outright (or stopped by a full disk before it could write its
    manifest) leaves its hidden ``.partial`` folder with status "running".
    This rewrites such manifests to status "failed" with the reason, so that
    nothing reads as still running. The folders stay hidden (they are not
    records); ``python -m isolation records --clean`` removes them.

    Parameters
    ----------
    parent : str or Path
        A folder holding records (``out_dir/<study name>``).

    Returns
    -------
    list of Path
        The folders marked.
    """
    marked: list[Path] = []
    folder = Path(parent)
    if not folder.is_dir():
        return marked
    for partial in sorted(folder.glob(".*.partial")):
        manifest = read_manifest(partial)
        if not partial.is_dir() or manifest.get("status") != "running" or not _is_stale(partial):
            continue
        manifest.update(status="failed", error=ABANDONED, finished=manifest.get("finished") or _now())
        try:
            _write_json(partial / "manifest.json", manifest)
        except OSError:
            continue  # a full disk or a read-only folder: --clean can still remove it
        marked.append(partial)
    return marked


def stale_items(out_dir: str | Path) -> list[Path]:
    """Leftovers under a records folder that no running process owns.

    Stale hidden ``.partial`` folders of runs that ended without a record,
    hidden temporary files of interrupted atomic writes (``.*.part``,
    ``.*.tmp``), scratch folders of interrupted report renders
    (``.render.*`` inside records) and, in the system's temporary folder,
    report build folders (``isolation-report-*``) older than an hour; in
    the folder kept in memory, results pickles of the record command's head
    start whose process was killed (:func:`isolation.study.head_start.orphans`).

    Parameters
    ----------
    out_dir : str or Path
        The records folder (as given to ``run --out``).

    Returns
    -------
    list of Path
    """
    root = Path(out_dir)
    found: list[Path] = []
    if root.is_dir():
        for partial in sorted(root.rglob(".*.partial")):
            if partial.is_dir() and _is_stale(partial):
                found.append(partial)
        for pattern in (".*.part", ".*.tmp"):
            for leftover in sorted(root.rglob(pattern)):
                if leftover.is_file() and _older_than(leftover, 3600):
                    found.append(leftover)
        for scratch in sorted(root.rglob(".render.*")):
            if scratch.is_dir() and _older_than(scratch, 3600):
                found.append(scratch)
    for build in sorted(Path(tempfile.gettempdir()).glob("isolation-report-*")):
        if build.is_dir() and _older_than(build, 3600):
            found.append(build)
    from isolation.study.head_start import orphans

    found.extend(orphans())
    return [p for p in found if not any(q in p.parents for q in found)]


def _older_than(path: Path, seconds: float) -> bool:
    try:
        return time.time() - path.stat().st_mtime > seconds
    except OSError:
        return False


def clean_records(out_dir: str | Path, *, remove: bool = True) -> list[Path]:
    """Remove (or, with ``remove=False``, only list) what :func:`stale_items` finds.

    Parameters
    ----------
    out_dir : str or Path
        The records folder.
    remove : bool
        Delete the items; False lists them only.

    Returns
    -------
    list of Path
        The items found (and removed).
    """
    items = stale_items(out_dir)
    if remove:
        for item in items:
            if item.is_dir():
                shutil.rmtree(item, ignore_errors=True)
            else:
                item.unlink(missing_ok=True)
    return items
