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

import os
import shutil
import signal
import tempfile
import threading
import time
from dataclasses import dataclass, field
from functools import partial
from pathlib import Path
from typing import Any, Mapping

from isolation.app.record_ahead import Ahead, start_ahead
from isolation.app.record_folder import (  # noqa: F401 - re-exported
    LIBRARIES,
    RECORD_SPACE_MB,
    REQUIRED_FILES,
    _close_manifest,
    _disk_full,
    _file_hashes,
    _free_run_id,
    _git_commit,
    _keep_clashed,
    _make_parent,
    _now,
    _one_line,
    _rename_noreplace,
    _sha256,
    _space_error,
    _versions,
    _write_json,
    new_run_id,
    read_manifest,
    sanitise_name,
    verify_record,
)
from isolation.app.record_kernel import (  # noqa: F401 - re-exported
    KERNEL_ARGUMENTS,
    KERNEL_LOG,
    WARM_UP,
    _EarlyKernel,
    _execute,
    _execute_quietly,
    _lean_imports,
    _stderr_to,
)
from isolation.app.record_steps import (  # noqa: F401 - re-exported
    SCOPE,
    RecordClash,
    _claim_run_id,
    _first_manifest,
    _new_manifest,
    _partial_folder,
    _place_record,
    study_input_hash,
)
from isolation.errors import InputError, RunError

__all__ = ["RecordOutcome", "run_record", "render_record", "read_manifest", "study_input_hash",
           "sanitise_name", "to_toml", "WORKBOOK", "LIBRARIES", "new_run_id", "mark_stale_partials",
           "stale_items", "clean_records", "RecordClash", "verify_record", "REQUIRED_FILES"]

ROOT = Path(__file__).resolve().parents[2]
WORKBOOK = ROOT / "workbooks" / "feasibility.ipynb"
"""The workbook a record executes by default."""


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


# --------------------------------------------------------------------------


class _Terminated(KeyboardInterrupt):
    """SIGTERM, raised in the main thread so the record is closed as failed."""


def _on_sigterm(signum, frame):  # noqa: ARG001 - signal handler signature
    raise _Terminated()


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


def run_record(study_file: str | Path, out_dir: str | Path, *, pdf: bool = True,
               overrides: Mapping[str, Any] | None = None, run_id: str | None = None,
               paper: str = "a4", quick: bool = False, notebook: str | Path | None = None,
               timeout: float | None = None, engine: str | None = None,
               replace_failed: bool = False, head_start: bool = True) -> RecordOutcome:
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
    head_start : bool
        Let a forked process compute the study and draw figures while the kernel starts
        (:mod:`isolation.app.record_ahead`; Linux only): it takes a second core. A batch whose
        workers leave no core spare turns it off.

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
    # The workbook's kernel starts first: its start-up and imports overlap the checks below.
    default = notebook is None or Path(notebook).resolve() == WORKBOOK.resolve()
    kernel = _EarlyKernel.start(warm_up=default)
    try:
        return _run_record(study_file, out_dir, pdf=pdf, overrides=overrides, run_id=run_id, paper=paper,
                           quick=quick, notebook=notebook, timeout=timeout, engine=engine,
                           replace_failed=replace_failed, kernel=kernel, head_start=head_start)
    finally:
        if kernel is not None:
            kernel.close()  # a no-op once the run has closed it


def _run_record(study_file, out_dir, *, pdf, overrides, run_id, paper, quick, notebook, timeout, engine,
                replace_failed, kernel, head_start=True) -> RecordOutcome:
    path, workbook, changes, study = _checked_inputs(study_file, overrides, paper, engine, notebook)
    parent = Path(out_dir) / sanitise_name(study.project.name)
    run_id, final = _claim_run_id(parent, run_id, replace_failed)
    folder = _partial_folder(parent, run_id, final)
    started = time.time()
    manifest = _new_manifest(study, path, parent, run_id, changes,
                             {"pdf": pdf, "paper": paper, "quick": quick, "workbook": workbook.name, "engine": engine})
    previous = None
    if threading.current_thread() is threading.main_thread():
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    _first_manifest(folder, manifest, final, previous)
    report, verdicts, failure = None, (), None
    try:
        report, verdicts = _fill_record(folder, path, changes, workbook, quick, timeout, pdf, paper, engine,
                                        kernel, head_start)
        manifest.update(status="done")
    except BaseException as error:  # noqa: BLE001 - every failure must leave a failed record
        failure = error
        message = _space_error(error, final) if _disk_full(error) else _one_line(error)
        manifest.update(status="failed", error=message, report=None)
    finally:
        try:
            final, failure = _place_record(folder, parent, final, run_id, manifest, report, started, failure)
        finally:
            if previous is not None:
                signal.signal(signal.SIGTERM, previous)
    if isinstance(failure, (KeyboardInterrupt, RecordClash)):
        raise failure
    return RecordOutcome(path=final, status=manifest["status"], error=manifest["error"],
                         report=final / report if report else None, verdicts=verdicts, manifest=manifest)


def _checked_inputs(study_file: str | Path, overrides: Mapping[str, Any] | None, paper: str, engine: str | None,
                    notebook: str | Path | None) -> tuple[Path, Path, dict, Any]:
    """(study file, workbook, overrides, study) of a run, checked before anything is written."""
    from isolation.validate import one_of

    try:
        one_of("paper", paper, ("a4", "letter"))
        if engine is not None:
            one_of("engine", engine, ("typst", "latex"))
    except ValueError as error:
        raise InputError(str(error)) from None
    path = Path(study_file)
    if not path.is_file():
        raise InputError(f"study file {str(path)!r} does not exist")
    workbook = Path(notebook) if notebook is not None else WORKBOOK
    if not workbook.is_file():
        raise RunError(f"workbook {str(workbook)!r} is missing")
    changes = dict(overrides or {})
    from isolation.study import apply_overrides, parse_study, read_study_mapping

    mapping = read_study_mapping(path)
    study = parse_study(apply_overrides(mapping, changes) if changes else mapping,
                        source=str(path), base_dir=path.parent)   # InputError: nothing written
    from isolation.study.checks import check_study  # not through the runner: no numba in this process

    check_study(study)
    return path, workbook, changes, study


def _fill_record(folder: Path, study_file: Path, overrides: dict, notebook: Path, quick: bool,
                 timeout: float | None, pdf: bool, paper: str, engine: str | None, kernel=None,
                 head_start: bool = True) -> tuple:
    """Inputs, executed workbook, results and (``pdf``) the report into ``folder``: (report name, verdicts).

    ``kernel``: the workbook's kernel when it was started early (:class:`_EarlyKernel`)."""
    study_path, study = _prepare_inputs(study_file, overrides, folder)
    # the feasibility workbook's results computed, and its figures drawn from the last one up, in a process of
    # their own while the kernel starts and runs (isolation.app.record_ahead)
    ahead = (start_ahead(folder, study_path, quick) if head_start and notebook.resolve() == WORKBOOK.resolve()
             else Ahead(folder))
    # Once the kernel is ready, and while the workbook's first cell would only wait for the results, this
    # process loads what it needs after the workbook: the report's typesetter.
    meanwhile = None
    if pdf:
        from isolation.output.report import preload

        meanwhile = partial(preload, engine)
    try:
        _execute(notebook, folder, study_path, quick, timeout, kernel, ahead.file, meanwhile)
    finally:
        ahead.close()
    results = folder / "results.json"
    if not results.is_file():
        raise RunError("the workbook finished without writing results.json")
    verdicts = _headlines(results)
    report = None
    if pdf:
        from isolation.output import report as report_module

        fields = {"project": study.project.name, "client": study.project.client,
                  "date": study.project.date, "revision": study.project.revision,
                  "prepared_by": study.project.prepared_by}
        report = Path(report_module.render(folder / "feasibility.ipynb", folder, paper=paper,
                                           title_fields=fields, engine=engine)).name
    return report, verdicts


def _headlines(results_path: Path) -> tuple:
    from isolation.study.results import load_results

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


# Re-exported: stale partial records and the TOML writer live in their own modules.
from isolation.app.record_cleanup import (  # noqa: E402, F401
    ABANDONED,
    _is_stale,
    _pid_alive,
    clean_records,
    mark_stale_partials,
    stale_items,
)
from isolation.app.study_toml import to_toml  # noqa: E402, F401
