"""Study results computed ahead of the workbook's kernel (the record command's head start).

The record command (:func:`isolation.app.calc_records.run_record`) starts the
workbook's kernel first; its start-up takes a couple of seconds on another
core. Meanwhile the command runs the same :func:`isolation.study.runner.run_study`
on the same study file and pickles the results into the record folder
(:func:`save_ahead`). The workbook's first cell then reads them
(:func:`results_of`) instead of computing them again, but only when the pickle
was made for this very study file (SHA-256 of its bytes), the same ``quick``
option and this version of the package; otherwise, or when the file is missing
(a workbook run again later, or run by hand), it computes them itself. The
pickle is removed once the workbook has run: it is never part of a record.

A pickle runs code when it is read: only files this process family wrote a
moment before are read, from the record's own hidden partial folder.
"""

from __future__ import annotations

import hashlib
import pickle
from pathlib import Path

from isolation import __version__
from isolation.files import write_bytes_atomic

__all__ = ["AHEAD_FILE", "save_ahead", "results_of"]

AHEAD_FILE = ".results-ahead.pickle"
"""Name of the pickle in the record folder."""


def _key(study_path: str | Path, quick: bool) -> tuple:
    digest = hashlib.sha256(Path(study_path).read_bytes()).hexdigest()
    return ("isolation study results", __version__, digest, bool(quick))


def save_ahead(results, path: str | Path, study_path: str | Path, quick: bool) -> Path:
    """Pickle ``results`` (of ``run_study(load_study(study_path), quick=quick)``) to ``path``.

    Parameters
    ----------
    results : StudyResults
        The results computed ahead. [-]
    path : str or Path
        Pickle to write (atomically). [-]
    study_path : str or Path
        The study file the results were computed from (its bytes key the pickle). [-]
    quick : bool
        The ``quick`` option they were computed with. [-]
    """
    payload = {"key": _key(study_path, quick), "results": results}
    return write_bytes_atomic(path, pickle.dumps(payload, protocol=pickle.HIGHEST_PROTOCOL))


def results_of(study, *, study_path: str | Path, quick: bool = False, precomputed: str | Path = ""):
    """``run_study(study, quick=quick)``, or the same results computed ahead for this study file.

    Parameters
    ----------
    study : Study
        The study, loaded from ``study_path``. [-]
    study_path : str or Path
        Its file. [-]
    quick : bool
        Small motion suite (as :func:`isolation.study.runner.run_study`). [-]
    precomputed : str or Path
        Pickle written by :func:`save_ahead`; empty, missing, or made for another study file,
        option or package version: the results are computed here. [-]
    """
    if precomputed and Path(precomputed).is_file():
        payload = pickle.loads(Path(precomputed).read_bytes())
        if isinstance(payload, dict) and payload.get("key") == _key(study_path, quick):
            return payload["results"]
    from isolation.study.runner import run_study

    return run_study(study, quick=quick)
