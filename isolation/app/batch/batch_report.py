"""The batch report: the design-space workbook run on a batch's summary, and its PDF.

``python -m isolation batch BATCH.toml --report`` (or ``report = true`` in the batch
file's ``[batch]`` table) ends with :func:`write_batch_report`: papermill runs
``workbooks/design_space.ipynb`` on the batch folder's ``summary.csv`` (maps of the
design space, with the response-history maps of a ``--direct --histories`` sweep, and
the best alternatives), the executed workbook is kept as ``design_space.ipynb`` in the
batch folder, and :func:`isolation.output.report.render` makes ``report.pdf`` of it
with the base study's title-page fields (Typst; LaTeX or HTML where Typst cannot run).

Nothing half-written is left: the workbook runs into a hidden file that replaces the
earlier ``design_space.ipynb`` only once it is complete; the PDF is written whole.
A workbook that fails leaves the earlier report as it was.
"""

from __future__ import annotations

import contextlib
import secrets
from pathlib import Path
from typing import Any, Mapping

from isolation.errors import InputError, RunError

__all__ = ["DESIGN_SPACE", "NOTEBOOK", "KERNEL_LOG", "write_batch_report", "report_fields"]

DESIGN_SPACE = Path(__file__).resolve().parents[3] / "workbooks" / "design_space.ipynb"
"""The design-space workbook the report executes."""

NOTEBOOK = "design_space.ipynb"
"""Name of the executed workbook in the batch folder."""

KERNEL_LOG = ".design_space.log"
"""Hidden file in the batch folder that keeps what the workbook's kernel wrote to standard error."""


def report_fields(batch_name: str, study_file: str | Path) -> tuple[dict[str, str], str]:
    """Title-page fields of a batch's report and the unit system of its base study.

    Parameters
    ----------
    batch_name : str
        The batch's name. [-]
    study_file : str or Path
        The batch's base study file. [-]

    Returns
    -------
    (dict, str)
        ``title``, ``project``, ``client``, ``revision`` and ``prepared_by`` (the date is the day
        the report is made), and "SI" or "US".
    """
    from isolation.study import load_study

    study = load_study(study_file)
    project = study.project
    fields = {"title": f"Design space of the batch {batch_name}"}
    if project is not None:
        fields.update(project=project.name, client=project.client, revision=project.revision,
                      prepared_by=project.prepared_by)
    return {key: value for key, value in fields.items() if value}, study.units


def write_batch_report(out_dir: str | Path, *, fields: Mapping[str, Any], units: str = "SI", paper: str = "a4",
                       engine: str | None = None, top: int = 5, timeout: float | None = None) -> Path:
    """Run the design-space workbook on a batch folder's summary and render its report.

    Parameters
    ----------
    out_dir : str or Path
        The batch folder, holding ``summary.csv``. [-]
    fields : mapping
        Title-page fields (see :data:`isolation.output.report.TITLE_FIELDS`); ``title`` required. [-]
    units : {"SI", "US"}
        Unit system of the batch's study, for the maps' axes. [-]
    paper : {"a4", "letter"}
        Paper size. [-]
    engine : {"typst", "latex"}, optional
        PDF engine (default Typst, or LaTeX when Typst cannot run). [-]
    top : int
        How many best alternatives the report lists. [-]
    timeout : float, optional
        Limit per workbook cell. [s]

    Returns
    -------
    Path
        ``out_dir/report.pdf`` (``report.html`` where no PDF engine runs).

    Raises
    ------
    InputError
        No ``summary.csv`` in ``out_dir``, or a bad ``units``, ``paper``, ``engine`` or ``top``.
    RunError
        The workbook or the typesetter failed; the message names the cause. The earlier
        report, if any, is kept.
    """
    from isolation.output.report import ENGINES, PAPERS
    from isolation.units import SYSTEMS
    from isolation.validate import one_of

    folder = Path(out_dir)
    summary = folder / "summary.csv"
    if not summary.is_file():
        raise InputError(f"out_dir = {str(folder)!r} is not allowed: must be a batch folder holding summary.csv "
                         "(run the batch first)")
    try:
        one_of("units", units, SYSTEMS)
        one_of("paper", paper, PAPERS)
        if engine is not None:
            one_of("engine", engine, ENGINES)
    except ValueError as error:
        raise InputError(str(error)) from None
    if isinstance(top, bool) or not isinstance(top, int) or top < 1:
        raise InputError(f"top = {top!r} is not allowed: must be a whole number >= 1")
    notebook = _run_workbook(folder, units, top, timeout)
    return _render(notebook, folder, fields, paper, engine)


def _run_workbook(folder: Path, units: str, top: int, timeout: float | None) -> Path:
    """The executed design-space workbook, in place only once complete."""
    import os

    from isolation.app.record_folder import _one_line
    from isolation.app.record_kernel import run_workbook

    partial = folder / f".{Path(NOTEBOOK).stem}.{secrets.token_hex(4)}.part.ipynb"  # papermill wants .ipynb
    log = folder / KERNEL_LOG
    parameters = {"summary_path": "summary.csv", "output_path": "", "units": units, "top": top}
    try:
        run_workbook(DESIGN_SPACE, partial, parameters, cwd=folder, log=log, timeout=timeout)
        os.replace(partial, folder / NOTEBOOK)
    except Exception as error:  # noqa: BLE001 - papermill and the kernel raise many kinds; one line says which
        raise RunError(f"the design-space workbook failed: {_one_line(error)} (kernel messages: {log})") from None
    finally:
        partial.unlink(missing_ok=True)
    with contextlib.suppress(OSError):
        if log.stat().st_size == 0:
            log.unlink()
    return folder / NOTEBOOK


def _render(notebook: Path, folder: Path, fields: Mapping[str, Any], paper: str, engine: str | None) -> Path:
    import warnings

    from isolation.output.report import render

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # an HTML fallback is named by the returned path
        try:
            return render(notebook, folder, paper=paper, title_fields=dict(fields), engine=engine)
        except ValueError as error:
            raise InputError(str(error)) from None
