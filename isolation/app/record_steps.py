"""The steps around a record's workbook: claiming its name, its hidden folder, its manifest, placing it.

Used by :func:`isolation.app.calc_records.run_record` (and re-exported there):
:func:`study_input_hash`, the run id claimed in the parent folder (:func:`_claim_run_id`),
the hidden ``.<run id>.<random>.partial`` folder (:func:`_partial_folder`), the manifest of
a running record (:func:`_new_manifest`, :func:`_first_manifest`) and the final rename that
never replaces anything (:func:`_place_record`, :class:`RecordClash`).
"""

from __future__ import annotations

import hashlib
import json
import os
import platform
import shutil
import signal
import sys
import tempfile
import time
import tomllib
from pathlib import Path
from typing import Any, Mapping

from isolation import __version__
from isolation.app.record_cleanup import mark_stale_partials
from isolation.app.record_folder import (
    _close_manifest,
    _disk_full,
    _file_hashes,
    _free_run_id,
    _git_commit,
    _keep_clashed,
    _make_parent,
    _now,
    _rename_noreplace,
    _space_error,
    _versions,
    _write_json,
    read_manifest,
)
from isolation.errors import InputError, RunError

__all__ = ["SCOPE", "study_input_hash", "RecordClash"]


SCOPE = ("Feasibility study, not construction design; verify against the local code with a "
         "licensed structural engineer.")



def study_input_hash(study_file: str | Path, overrides: Mapping[str, Any] | None = None) -> str:
    """sha256 of the study file's bytes, the overrides (canonical JSON) and the
    bytes of a spectrum file the study names, as hex text."""
    path = Path(study_file)
    digest = hashlib.sha256(path.read_bytes())
    digest.update(b"\0overrides\0")
    digest.update(json.dumps(dict(overrides or {}), sort_keys=True, default=str).encode("utf-8"))
    try:
        from isolation.study import apply_overrides

        mapping = apply_overrides(tomllib.loads(path.read_text(encoding="utf-8")), overrides or {})
        spectrum = mapping.get("site", {}).get("spectrum_file")
        if isinstance(spectrum, str) and (path.parent / spectrum).is_file():
            digest.update(b"\0spectrum\0")
            digest.update((path.parent / spectrum).read_bytes())
    except (ValueError, OSError, AttributeError):
        pass  # malformed input: validation reports it; the hash still covers the text
    return digest.hexdigest()


def _claim_run_id(parent: Path, run_id: str | None, replace_failed: bool) -> tuple[str, Path]:
    """(run id, final record folder): stale partials marked, an existing record refused (or a failed one
    removed when ``replace_failed``)."""
    _make_parent(parent)
    mark_stale_partials(parent)
    run_id = _free_run_id(parent, run_id)
    final = parent / run_id
    if os.path.lexists(final):
        status = read_manifest(final).get("status")
        if status == "done":
            raise InputError(f"run_id = {run_id!r} is not allowed: the record {str(final)!r} already exists "
                             "and is complete (choose another run id)")
        if not (replace_failed and status == "failed"):
            raise InputError(f"run_id = {run_id!r} is not allowed: {str(final)!r} already exists (status "
                             f"{status!r}); choose another run id or remove that folder")
        shutil.rmtree(final)  # asked for: an earlier failed record of this run id
    return run_id, final


def _partial_folder(parent: Path, run_id: str, final: Path) -> Path:
    """The hidden ``.<run id>.<random>.partial`` folder the record is built in."""
    try:
        folder = Path(tempfile.mkdtemp(prefix=f".{run_id}.", suffix=".partial", dir=parent))
        folder.chmod(0o755)  # mkdtemp makes it private; a record is an ordinary folder
    except OSError as error:
        if _disk_full(error):
            raise RunError(_space_error(error, final)) from None
        raise
    return folder


def _new_manifest(study, study_file: Path, parent: Path, run_id: str, overrides: dict, options: dict) -> dict:
    """The manifest of a running record (status "running", the process that owns it)."""
    commit, dirty = _git_commit()
    return {
        "status": "running", "error": None, "scope": SCOPE,
        "study": {"project": study.project.name, "file": str(study_file), "folder": parent.name},
        "run_id": run_id, "input_hash": study_input_hash(study_file, overrides), "overrides": overrides,
        "options": options,
        "report": None, "started": _now(), "finished": None, "elapsed_s": None,
        "package": {"name": "isolation", "version": __version__}, "git_commit": commit, "git_dirty": dirty,
        "python": sys.version.split()[0], "platform": platform.platform(), "libraries": _versions(),
        "files": {}, "owner": {"pid": os.getpid(), "host": platform.node()},
    }


def _first_manifest(folder: Path, manifest: dict, final: Path, previous) -> None:
    """Write the running manifest; when even that fails, nothing of the run is left (no record)."""
    try:
        _write_json(folder / "manifest.json", manifest)
    except OSError as error:  # nothing of the run exists yet: no record
        shutil.rmtree(folder, ignore_errors=True)
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)
        if _disk_full(error):
            raise RunError(_space_error(error, final)) from None
        raise


def _place_record(folder: Path, parent: Path, final: Path, run_id: str, manifest: dict, report, started: float,
                  failure):
    """Close the manifest and rename the record into place, never replacing anything: (final folder,
    the failure to raise, a :class:`RecordClash` when another record took the name meanwhile)."""
    manifest.update(report=report if manifest["status"] == "done" else None, finished=_now(),
                    elapsed_s=round(time.time() - started, 3), files=_file_hashes(folder))
    manifest.pop("owner", None)
    _close_manifest(folder, manifest, final)
    try:
        _rename_noreplace(folder, final)
    except FileExistsError:
        final = _keep_clashed(folder, final, manifest)
        clash = RecordClash(
            f"run_id = {run_id!r} is not allowed: the record {str(parent / run_id)!r} appeared while "
            f"this run was running (two runs with one run id); nothing was replaced, this run is "
            f"kept as the failed record {str(final)!r}")
        failure = failure if isinstance(failure, KeyboardInterrupt) else clash
    return final, failure


class RecordClash(InputError):
    """Another record took this run's folder name while it ran; nothing was replaced."""
