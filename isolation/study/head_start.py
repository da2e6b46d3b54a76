"""Study results computed ahead of the workbook's kernel (the record command's head start).

The record command (:func:`isolation.app.calc_records.run_record`) starts the
workbook's kernel first; its start-up takes a second or two on another core.
Meanwhile a process the command forks (:mod:`isolation.app.record_ahead`) runs the
same :func:`isolation.study.runner.run_study` on the same study file and pickles
the results for the record folder (:func:`save_ahead`: in shared memory with a link
in the folder where the machine has it, else in the folder); a marker beside the pickle
(:data:`PENDING_FILE`) names that process while it computes. The workbook's first
cell then waits for them while that process runs and reads them (:func:`results_of`)
instead of computing them again, but only when the pickle was made for this very
study file (SHA-256 of its bytes), the same ``quick`` option and this version of the
package; otherwise, or when the file is missing (a workbook run again later, or run
by hand), it computes them itself. The pickle is removed once the workbook has run:
it is never part of a record.

A pickle runs code when it is read: only files this process family wrote a
moment before are read, through the record's own hidden partial folder.
"""

from __future__ import annotations

import hashlib
import importlib
import mmap
import os
import pickle
import tempfile
import time
from pathlib import Path

from isolation import __version__
from isolation.files import write_bytes_atomic
from isolation.processes import marked_process, process_alive

__all__ = ["AHEAD_FILE", "PENDING_FILE", "READING_MODULES", "MEMORY_FOLDER", "ahead_key", "save_ahead",
           "remove_ahead", "orphans", "remove_orphans", "results_of", "was_read", "prepare_reading"]

AHEAD_FILE = ".results-ahead.pickle"
"""Name of the pickle in the record folder."""

PENDING_FILE = ".results-ahead.pending"
"""Beside the pickle while another process still computes it: empty, then that process's id."""

MEMORY_FOLDER = Path("/dev/shm")
"""Folder kept in memory (Linux's tmpfs) for the pickle: tens of megabytes of response histories that
would otherwise go to the disk, where a write can wait a good part of a second behind the disk's
other work. Missing, not writable or full: the pickle goes to the record folder itself."""

_MEMORY_PREFIX = "isolation-ahead-"

UNNAMED_WAIT = 30.0
"""Longest wait for results whose process has not named itself in :data:`PENDING_FILE`. [s]"""


def ahead_key(study_path: str | Path, quick: bool) -> tuple:
    """What results computed ahead are valid for: package version, SHA-256 of the study file's bytes
    and ``quick``. [-]"""
    digest = hashlib.sha256(Path(study_path).read_bytes()).hexdigest()
    return ("isolation study results", __version__, digest, bool(quick))


def save_ahead(results, path: str | Path, study_path: str | Path, quick: bool) -> Path:
    """Pickle ``results`` (of ``run_study(load_study(study_path), quick=quick)``) to ``path``.

    Parameters
    ----------
    results : StudyResults
        The results computed ahead. [-]
    path : str or Path
        Pickle to make: a link to a whole file in :data:`MEMORY_FOLDER`, or (no room there) a file
        written atomically. Remove it with :func:`remove_ahead`. [-]
    study_path : str or Path
        The study file the results were computed from (its bytes key the pickle). [-]
    quick : bool
        The ``quick`` option they were computed with. [-]
    """
    payload = {"key": ahead_key(study_path, quick), "results": results}
    data = pickle.dumps(payload, protocol=pickle.HIGHEST_PROTOCOL)
    path = Path(path)
    if not _in_memory(data, path):
        write_bytes_atomic(path, data)
    return path


def _in_memory(data: bytes, path: Path) -> bool:
    """Write ``data`` to a new file of :data:`MEMORY_FOLDER` (private to this user, named after this
    process) and link ``path`` to it once it is whole; False, with nothing left, where that fails."""
    try:
        handle, name = tempfile.mkstemp(prefix=f"{_MEMORY_PREFIX}{os.getpid()}-", suffix=".pickle",
                                        dir=MEMORY_FOLDER)
    except OSError:
        return False
    try:
        with os.fdopen(handle, "wb") as stream:
            stream.write(data)
        os.symlink(name, path)
    except OSError:  # e.g. full: a tmpfs holds what memory allows
        Path(name).unlink(missing_ok=True)
        return False
    return True


def remove_ahead(path: str | Path) -> None:
    """Remove the pickle ``path`` written by :func:`save_ahead` and the file in memory it links to;
    then :func:`remove_orphans`."""
    path = Path(path)
    if path.is_symlink():
        target = Path(os.readlink(path))
        if target.parent == MEMORY_FOLDER and target.name.startswith(_MEMORY_PREFIX):
            target.unlink(missing_ok=True)
    path.unlink(missing_ok=True)
    remove_orphans()


def orphans() -> list[Path]:
    """This user's pickles in :data:`MEMORY_FOLDER` whose process has ended without removing them (one
    killed while it wrote, or whose command was killed before it could remove them). [-]"""
    with_pid = len(_MEMORY_PREFIX)
    found: list[Path] = []
    try:
        mine = [p for p in MEMORY_FOLDER.glob(f"{_MEMORY_PREFIX}*.pickle") if p.stat().st_uid == os.getuid()]
    except OSError:
        return found
    for pickled in sorted(mine):
        pid = pickled.name[with_pid:].split("-", 1)[0]
        if pid.isdigit() and not process_alive(int(pid)):
            found.append(pickled)
    return found


def remove_orphans() -> None:
    """Remove the :func:`orphans`."""
    for orphan in orphans():
        orphan.unlink(missing_ok=True)


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
        Pickle written by :func:`save_ahead`, waited for while another process still computes it
        (:data:`PENDING_FILE` beside it, that process running); empty, missing, or made for another
        study file, option or package version: the results are computed here. [-]
    """
    if precomputed:
        _await_ahead(Path(precomputed))
    if precomputed and Path(precomputed).is_file():
        payload = _read_pickle(Path(precomputed))
        if isinstance(payload, dict) and payload.get("key") == ahead_key(study_path, quick):
            _READ.add(Path(precomputed).resolve())
            return payload["results"]
    from isolation.study.runner import run_study

    return run_study(study, quick=quick)


def _read_pickle(path: Path):
    """The object pickled in ``path``, unpickled straight from the file's pages (no copy of the whole file
    in between: tens of megabytes of response histories)."""
    with open(path, "rb") as stream:
        if os.fstat(stream.fileno()).st_size == 0:
            return None
        with mmap.mmap(stream.fileno(), 0, access=mmap.ACCESS_READ) as pages:
            return pickle.loads(pages)


READING_MODULES = ("isolation.study.results", "isolation.verdict", "isolation.performance.comparison",
                   "isolation.motions.suite", "isolation.motions.pair_suite", "isolation.dynamics.response",
                   "isolation.dynamics.shear_building", "isolation.dynamics.oscillator", "isolation.design",
                   "isolation.site", "isolation.codes.asce7", "isolation.codes.eurocode")
"""Modules whose classes results computed ahead hold (what unpickling them imports)."""


def prepare_reading() -> None:
    """Import what reading results computed ahead needs (:data:`READING_MODULES`), not what computing
    them needs (numba's compiled loops): the workbook's kernel runs it as it starts, beside the
    command's run of the study (:data:`isolation.app.record_kernel.WARM_UP`); results never depend on it.
    The figures that compute response spectra are drawn first by the process that ran the study
    (:func:`isolation.output.figure_sharing.draw_ahead`), which has those loops loaded."""
    for name in READING_MODULES:
        importlib.import_module(name)


_READ: set = set()  # pickles results_of has returned results from, in this process


def was_read(precomputed: str | Path) -> bool:
    """True when :func:`results_of` returned the results of the pickle ``precomputed`` in this process
    (so whatever else was made from those results, such as figures drawn ahead, fits them). [-]"""
    return bool(precomputed) and Path(precomputed).resolve() in _READ


def _await_ahead(path: Path) -> None:
    """Return once ``path`` exists, or once no process computes it any more (:data:`PENDING_FILE`)."""
    pending = path.with_name(PENDING_FILE)
    deadline = time.monotonic() + UNNAMED_WAIT
    while not path.exists():
        state = marked_process(pending)
        if state in ("absent", "ended") or (state == "unnamed" and time.monotonic() > deadline):
            return
        time.sleep(0.005)
