"""Calculation records: one folder per study run, written atomically.

:func:`run_record` writes ``out_dir/<study name>/<run id>/`` holding

* ``study.toml`` - the study file exactly as given;
* ``study_used.toml`` - the study actually run, when overrides were given or
  the study names a spectrum file (copied beside it as ``site_spectrum.csv``);
* ``feasibility.ipynb`` - the executed workbook (papermill);
* ``results.json`` - the workbook's results (:class:`isolation.study.runner.StudyResults`);
* ``report.pdf`` (or ``report.html`` without TeX) - unless ``pdf=False``;
* ``manifest.json`` - status ``"done"`` or ``"failed"`` with the error, input
  hash, start and end time (UTC), package, git commit, Python and library
  versions, and a sha256 of every other file.

The record is built in a hidden folder beside its final place
(``.<run id>.<random>.partial``) and renamed into place with ``os.replace``
only when complete - or when it failed, with the manifest saying so. A run
that is interrupted (Ctrl-C, SIGTERM) is recorded as failed. A run killed
outright leaves only the hidden ``.partial`` folder, never a record that
looks complete.
"""

from __future__ import annotations

import contextlib
import datetime as _dt
import errno
import hashlib
import json
import os
import platform
import re
import secrets
import shutil
import signal
import subprocess
import sys
import tempfile
import threading
import time
import tomllib
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

from isolation import __version__
from isolation.errors import InputError, RunError
from isolation.files import write_text_atomic

__all__ = ["RecordOutcome", "run_record", "render_record", "read_manifest", "study_input_hash",
           "sanitise_name", "to_toml", "WORKBOOK", "LIBRARIES", "new_run_id", "mark_stale_partials",
           "stale_items", "clean_records", "RecordClash", "verify_record", "REQUIRED_FILES"]

ROOT = Path(__file__).resolve().parents[2]
WORKBOOK = ROOT / "workbooks" / "feasibility.ipynb"
"""The workbook a record executes by default."""

LIBRARIES = ("numpy", "scipy", "matplotlib", "pint", "papermill", "nbconvert", "nbformat", "nbclient",
             "ipykernel", "jupyter_client", "tqdm")
"""Libraries whose versions go into the manifest."""

SCOPE = ("Feasibility study, not construction design; verify against the local code with a "
         "licensed structural engineer.")


@dataclass(frozen=True)
class RecordOutcome:
    """What :func:`run_record` produced.

    ``path`` is the record folder, ``status`` "done" or "failed", ``error``
    the one-line error of a failed run, ``report`` the report file (None
    without one), ``verdicts`` one headline per alternative, ``manifest`` the
    manifest's content.
    """

    path: Path
    status: str
    error: str | None = None
    report: Path | None = None
    verdicts: tuple = ()
    manifest: dict = field(default_factory=dict, repr=False)


def sanitise_name(name: str, fallback: str = "study") -> str:
    """A folder name from free text: lower case letters, digits, ``.``, ``_`` and ``-``.

    Path separators, spaces and anything else become ``-``; leading dots are
    removed (no hidden folders); at most 80 characters.
    """
    text = re.sub(r"[^a-z0-9._-]+", "-", str(name).lower())
    text = re.sub(r"-{2,}", "-", text).strip("-._")[:80].strip("-._")
    return text or fallback


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


# --------------------------------------------------------------------------
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


class _Terminated(KeyboardInterrupt):
    """SIGTERM, raised in the main thread so the record is closed as failed."""


def _on_sigterm(signum, frame):  # noqa: ARG001 - signal handler signature
    raise _Terminated()


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


# --------------------------------------------------------------------------
# Stale partial records
# --------------------------------------------------------------------------
ABANDONED = ("abandoned: the run stopped before its record was complete (killed, machine stopped "
             "or disk full); found on a later start")


def _pid_alive(pid: Any) -> bool:
    if not isinstance(pid, int) or pid <= 0:
        return False
    try:
        os.kill(pid, 0)
    except ProcessLookupError:
        return False
    except PermissionError:
        return True
    return True


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
    report build folders (``isolation-report-*``) older than an hour.

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


def _prepare_inputs(study_file: Path, overrides: Mapping[str, Any], folder: Path) -> tuple[str, Any]:
    """Copy the study into ``folder``; return the study file the workbook reads and the Study."""
    from isolation.study import apply_overrides, parse_study, read_study_mapping

    mapping = read_study_mapping(study_file)
    effective = apply_overrides(mapping, overrides) if overrides else mapping
    study = parse_study(effective, source=str(study_file), base_dir=study_file.parent)
    shutil.copyfile(study_file, folder / "study.toml")
    if not overrides and not study.site.spectrum_file:
        return "study.toml", study
    effective = apply_overrides(effective, {})  # a copy
    if study.site.spectrum_file:
        shutil.copyfile(study.site.spectrum_file, folder / "site_spectrum.csv")
        effective["site"]["spectrum_file"] = "site_spectrum.csv"
    text = ("# The study as run: study.toml with the overrides listed in manifest.json\n"
            "# (and a spectrum file copied beside it). Written by isolation.app.calc_records.\n" + to_toml(effective))
    (folder / "study_used.toml").write_text(text, encoding="utf-8")
    return "study_used.toml", study


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


def run_record(study_file: str | Path, out_dir: str | Path, *, pdf: bool = True,
               overrides: Mapping[str, Any] | None = None, run_id: str | None = None,
               paper: str = "a4", quick: bool = False, notebook: str | Path | None = None,
               timeout: float | None = None, engine: str | None = None,
               replace_failed: bool = False) -> RecordOutcome:
    """Run a study through the feasibility workbook into a calculation record.

    Parameters
    ----------
    study_file : str or Path
        The TOML study file.
    out_dir : str or Path
        Folder holding the records; the record goes to
        ``out_dir/<sanitised project name>/<run id>/``.
    pdf : bool
        Render the report (PDF, or HTML when TeX is missing).
    overrides : mapping, optional
        ``{"dotted.key": value}`` applied to the study (see
        :func:`isolation.study.apply_overrides`).
    run_id : str, optional
        Name of the record folder (sanitised); default a fresh id, the UTC
        time and a random suffix (:func:`new_run_id`). An existing record of
        that name is an error (nothing is replaced), unless it failed and
        ``replace_failed`` is true.
    paper : {"a4", "letter"}
        Paper size of the PDF report.
    quick : bool
        Small motion suite, for tests and trials (the workbook's ``quick``).
    notebook : str or Path, optional
        Workbook to execute (default :data:`WORKBOOK`).
    timeout : float, optional
        Limit per workbook cell. [s]
    engine : {"typst", "latex"}, optional
        PDF engine of the report (see :func:`isolation.output.report.render`);
        default Typst, or LaTeX when Typst cannot run.
    replace_failed : bool
        Remove an earlier failed record of ``run_id`` before running (a
        batch re-running a failed variant); a complete one is never replaced.

    Returns
    -------
    RecordOutcome
        ``status`` "done", or "failed" with ``error`` when the run failed.

    Raises
    ------
    isolation.errors.InputError
        Bad study, overrides or arguments (nothing is written), or a
        record with this run id already exists (:class:`RecordClash` when
        it appeared while this run was running: this run is then kept as a
        failed record beside it, nothing is replaced).
    KeyboardInterrupt
        Re-raised after an interrupted run was recorded as failed.
    """
    from isolation.validate import one_of

    try:
        one_of("paper", paper, ("a4", "letter"))
        if engine is not None:
            one_of("engine", engine, ("typst", "latex"))
    except ValueError as error:
        raise InputError(str(error)) from None
    study_file = Path(study_file)
    if not study_file.is_file():
        raise InputError(f"study file {str(study_file)!r} does not exist")
    notebook = Path(notebook) if notebook is not None else WORKBOOK
    if not notebook.is_file():
        raise RunError(f"workbook {str(notebook)!r} is missing")
    overrides = dict(overrides or {})
    from isolation.study import apply_overrides, parse_study, read_study_mapping

    mapping = read_study_mapping(study_file)
    study = parse_study(apply_overrides(mapping, overrides) if overrides else mapping,
                        source=str(study_file), base_dir=study_file.parent)   # InputError: nothing written
    from isolation.study.runner import check_study

    check_study(study)
    parent = Path(out_dir) / sanitise_name(study.project.name)
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
    try:
        folder = Path(tempfile.mkdtemp(prefix=f".{run_id}.", suffix=".partial", dir=parent))
        folder.chmod(0o755)  # mkdtemp makes it private; a record is an ordinary folder
    except OSError as error:
        if _disk_full(error):
            raise RunError(_space_error(error, final)) from None
        raise
    started = time.time()
    commit, dirty = _git_commit()
    manifest: dict[str, Any] = {
        "status": "running", "error": None, "scope": SCOPE,
        "study": {"project": study.project.name, "file": str(study_file), "folder": parent.name},
        "run_id": run_id, "input_hash": study_input_hash(study_file, overrides), "overrides": overrides,
        "options": {"pdf": pdf, "paper": paper, "quick": quick, "workbook": notebook.name,
                    "engine": engine},
        "report": None, "started": _now(), "finished": None, "elapsed_s": None,
        "package": {"name": "isolation", "version": __version__}, "git_commit": commit, "git_dirty": dirty,
        "python": sys.version.split()[0], "platform": platform.platform(), "libraries": _versions(),
        "files": {}, "owner": {"pid": os.getpid(), "host": platform.node()},
    }
    previous = None
    if threading.current_thread() is threading.main_thread():
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    report, verdicts, failure = None, (), None
    try:
        _write_json(folder / "manifest.json", manifest)
    except OSError as error:  # nothing of the run exists yet: no record
        shutil.rmtree(folder, ignore_errors=True)
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)
        if _disk_full(error):
            raise RunError(_space_error(error, final)) from None
        raise
    try:
        study_path, study = _prepare_inputs(study_file, overrides, folder)
        _execute(notebook, folder, study_path, quick, timeout)
        results = folder / "results.json"
        if not results.is_file():
            raise RunError("the workbook finished without writing results.json")
        verdicts = _headlines(results)
        if pdf:
            from isolation.output import report as report_module

            fields = {"project": study.project.name, "client": study.project.client,
                      "date": study.project.date, "revision": study.project.revision,
                      "prepared_by": study.project.prepared_by}
            report = Path(report_module.render(folder / "feasibility.ipynb", folder, paper=paper,
                                               title_fields=fields, engine=engine)).name
        manifest.update(status="done")
    except BaseException as error:  # noqa: BLE001 - every failure must leave a failed record
        failure = error
        message = _space_error(error, final) if _disk_full(error) else _one_line(error)
        manifest.update(status="failed", error=message, report=None)
    finally:
        try:
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
        finally:
            if previous is not None:
                signal.signal(signal.SIGTERM, previous)
    if isinstance(failure, (KeyboardInterrupt, RecordClash)):
        raise failure
    return RecordOutcome(path=final, status=manifest["status"], error=manifest["error"],
                         report=final / report if report else None, verdicts=verdicts, manifest=manifest)


class RecordClash(InputError):
    """Another record took this run's folder name while it ran; nothing was replaced."""


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


def _headlines(results_path: Path) -> tuple:
    from isolation.study.runner import load_results

    try:
        return tuple(v.headline for v in load_results(results_path).verdicts)
    except (KeyError, TypeError, ValueError) as error:
        raise RunError(f"results.json does not hold study results: {_one_line(error)}") from None


def render_record(record_dir: str | Path, *, paper: str = "a4", engine: str | None = None) -> Path:
    """Render the report of an existing, completed record into the record.

    ``engine`` is the PDF engine ("typst", "latex"; default Typst, see
    :func:`isolation.output.report.render`). Returns the report's path; the
    manifest's ``report`` entry and file hashes are updated.
    """
    record = Path(record_dir)
    manifest = read_manifest(record)
    if not manifest:
        raise InputError(f"RECORD_DIR = {str(record)!r} is not allowed: must be a record folder with a manifest.json")
    if manifest.get("status") != "done":
        raise InputError(f"RECORD_DIR = {str(record)!r} is not allowed: the record's status is "
                         f"{manifest.get('status')!r}, must be 'done'")
    notebook = record / "feasibility.ipynb"
    if not notebook.is_file():
        raise InputError(f"RECORD_DIR = {str(record)!r} is not allowed: it holds no feasibility.ipynb")
    from isolation.output import report as report_module

    project = manifest.get("study", {}).get("project")
    with tempfile.TemporaryDirectory(prefix=".render.", dir=record) as scratch:
        made = Path(report_module.render(notebook, scratch, paper=paper, engine=engine,
                                         title_fields={"project": project} if project else None))
        target = record / made.name
        os.replace(made, target)
    manifest.update(report=target.name, files=_file_hashes(record),
                    rendered={"at": _now(), "paper": paper, "engine": engine})
    _write_json(record / "manifest.json", manifest)
    return target


# --------------------------------------------------------------------------
# A small TOML writer for the study as run (tomllib reads only)
# --------------------------------------------------------------------------
_BARE = re.compile(r"^[A-Za-z0-9_-]+$")


def _key(key: str) -> str:
    return key if _BARE.match(key) else json.dumps(key)


def _value(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, (int, float)):
        text = repr(value)
        return {"nan": "nan", "inf": "inf", "-inf": "-inf"}.get(text, text)
    if isinstance(value, str):
        return json.dumps(value, ensure_ascii=False)
    if isinstance(value, (_dt.date, _dt.time)):
        return value.isoformat()
    if isinstance(value, (list, tuple)):
        return "[" + ", ".join(_value(v) for v in value) + "]"
    if isinstance(value, Mapping):
        return "{" + ", ".join(f"{_key(k)} = {_value(v)}" for k, v in value.items()) + "}"
    raise ValueError(f"value = {value!r} is not allowed in TOML: must be text, a number, a date, "
                     "a boolean, a list or a table")


def _is_table_array(value: Any) -> bool:
    return isinstance(value, list) and bool(value) and all(isinstance(v, Mapping) for v in value)


def to_toml(mapping: Mapping[str, Any], prefix: str = "") -> str:
    """TOML text for a mapping of plain values (tables, arrays of tables, lists, scalars, dates)."""
    lines = []
    for key, value in mapping.items():
        if not isinstance(value, Mapping) and not _is_table_array(value):
            lines.append(f"{_key(key)} = {_value(value)}")
    text = "\n".join(lines) + ("\n" if lines else "")
    for key, value in mapping.items():
        name = f"{prefix}.{_key(key)}" if prefix else _key(key)
        if isinstance(value, Mapping):
            text += f"\n[{name}]\n" + to_toml(value, name)
        elif _is_table_array(value):
            for item in value:
                text += f"\n[[{name}]]\n" + to_toml(item, name)
    return text
