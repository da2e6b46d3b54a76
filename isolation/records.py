"""Calculation records: one folder per study run, written atomically.

:func:`run_record` writes ``out_dir/<study name>/<run id>/`` holding

* ``study.toml`` - the study file exactly as given;
* ``study_used.toml`` - the study actually run, when overrides were given or
  the study names a spectrum file (copied beside it as ``site_spectrum.csv``);
* ``feasibility.ipynb`` - the executed workbook (papermill);
* ``results.json`` - the workbook's results (:class:`isolation.runner.StudyResults`);
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

import datetime as _dt
import hashlib
import json
import os
import platform
import re
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
           "sanitise_name", "to_toml", "WORKBOOK", "LIBRARIES"]

ROOT = Path(__file__).resolve().parent.parent
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

    found = {}
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


def _free_run_id(parent: Path, run_id: str | None) -> str:
    if run_id is not None:
        return sanitise_name(run_id, fallback="run")
    stamp = _dt.datetime.now(_dt.timezone.utc).strftime("%Y%m%dT%H%M%SZ")
    candidate, number = stamp, 2
    while (parent / candidate).exists():
        candidate, number = f"{stamp}-{number}", number + 1
    return candidate


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
            "# (and a spectrum file copied beside it). Written by isolation.records.\n" + to_toml(effective))
    (folder / "study_used.toml").write_text(text, encoding="utf-8")
    return "study_used.toml", study


def _execute(notebook: Path, folder: Path, study_path: str, quick: bool, timeout: float | None) -> None:
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
               timeout: float | None = None, engine: str | None = None) -> RecordOutcome:
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
        Name of the record folder (sanitised); default the UTC time stamp.
        An existing record of that name is replaced only when it failed.
    paper : {"a4", "letter"}
        Paper size of the PDF report.
    quick : bool
        Small motion suite, for tests and trials (the workbook's ``quick``).
    notebook : str or Path, optional
        Workbook to execute (default :data:`WORKBOOK`).
    timeout : float, optional
        Limit per workbook cell. [s]
    engine : {"typst", "latex"}, optional
        PDF engine of the report (see :func:`isolation.report.render`);
        default Typst, or LaTeX when Typst cannot run.

    Returns
    -------
    RecordOutcome
        ``status`` "done", or "failed" with ``error`` when the run failed.

    Raises
    ------
    isolation.errors.InputError
        Bad study, overrides or arguments (nothing is written), or a
        completed record with this run id already exists.
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
    from isolation.runner import check_study

    check_study(study)
    parent = Path(out_dir) / sanitise_name(study.project.name)
    parent.mkdir(parents=True, exist_ok=True)
    run_id = _free_run_id(parent, run_id)
    final = parent / run_id
    if final.exists():
        if read_manifest(final).get("status") == "done":
            raise InputError(f"run_id = {run_id!r} is not allowed: the record {str(final)!r} already exists "
                             "and is complete (choose another run id)")
    folder = Path(tempfile.mkdtemp(prefix=f".{run_id}.", suffix=".partial", dir=parent))
    folder.chmod(0o755)  # mkdtemp makes it private; a record is an ordinary folder
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
        "files": {},
    }
    previous = None
    if threading.current_thread() is threading.main_thread():
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    report, verdicts, failure = None, (), None
    try:
        _write_json(folder / "manifest.json", manifest)
        study_path, study = _prepare_inputs(study_file, overrides, folder)
        _execute(notebook, folder, study_path, quick, timeout)
        results = folder / "results.json"
        if not results.is_file():
            raise RunError("the workbook finished without writing results.json")
        verdicts = _headlines(results)
        if pdf:
            from isolation import report as report_module

            fields = {"project": study.project.name, "client": study.project.client,
                      "date": study.project.date, "revision": study.project.revision,
                      "prepared_by": study.project.prepared_by}
            report = Path(report_module.render(folder / "feasibility.ipynb", folder, paper=paper,
                                               title_fields=fields, engine=engine)).name
        manifest.update(status="done")
    except BaseException as error:  # noqa: BLE001 - every failure must leave a failed record
        failure = error
        manifest.update(status="failed", error=_one_line(error))
    finally:
        try:
            manifest.update(report=report, finished=_now(), elapsed_s=round(time.time() - started, 3),
                            files=_file_hashes(folder))
            _write_json(folder / "manifest.json", manifest)
            if final.exists():
                shutil.rmtree(final)   # an earlier failed record of the same run id
            os.replace(folder, final)
        finally:
            if previous is not None:
                signal.signal(signal.SIGTERM, previous)
    if isinstance(failure, KeyboardInterrupt):
        raise failure
    return RecordOutcome(path=final, status=manifest["status"], error=manifest["error"],
                         report=final / report if report else None, verdicts=verdicts, manifest=manifest)


def _headlines(results_path: Path) -> tuple:
    from isolation.runner import load_results

    try:
        return tuple(v.headline for v in load_results(results_path).verdicts)
    except (KeyError, TypeError, ValueError) as error:
        raise RunError(f"results.json does not hold study results: {_one_line(error)}") from None


def render_record(record_dir: str | Path, *, paper: str = "a4", engine: str | None = None) -> Path:
    """Render the report of an existing, completed record into the record.

    ``engine`` is the PDF engine ("typst", "latex"; default Typst, see
    :func:`isolation.report.render`). Returns the report's path; the
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
    from isolation import report as report_module

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
