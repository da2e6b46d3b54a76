"""A report's figures drawn by two processes at once: the record command's helper and the workbook's kernel.

This module imports no plotting library: the helper makes the shared folder before it has
imported matplotlib, which it needs only once the results are out.

The record command (:func:`isolation.app.calc_records.run_record`) computes the study
results in a process of its own while the workbook's kernel starts
(:mod:`isolation.app.record_ahead`). That process then has nothing left to do but
wait, while the kernel works down the workbook drawing each figure as it shows it. So
it draws the same report's figures from the last one up (:func:`draw_ahead`) into a
hidden folder of the record. Each figure is drawn once, by whichever process claims
it first (a file created exclusively); the kernel takes a figure the other process
claimed from the folder, waiting while it is being drawn. Both make the figure list
(:func:`isolation.output.plots.report_figures.feasibility_figures`) from the same
results, so a figure's PNG is the same whoever drew it.

The folder holds the key of the results it was drawn from (study file bytes,
``quick``, package version); the workbook uses it only when that is the key of its
own results (:func:`figures_of`), and draws everything itself otherwise. The folder
is removed with the results pickle once the workbook has run.
"""

from __future__ import annotations

import hashlib
import json
import os
import time
from collections.abc import Callable
from pathlib import Path
from typing import TYPE_CHECKING, Any

from isolation.files import write_bytes_atomic
from isolation.processes import marked_process
from isolation.study.head_start import ahead_key, was_read

if TYPE_CHECKING:
    from isolation.output.plots.report_figures import FigureList, FigureOrder

__all__ = ["FOLDER", "SharedFigures", "open_shared", "draw_ahead", "figures_of"]

FOLDER = ".figures-ahead"
"""Name of the shared folder in the record folder, beside the results pickle."""

WAIT_LIMIT = 120.0
"""Longest wait for a figure the other process claimed before drawing it here. [s]"""

_DRAWING = "drawing"  # present while the other process draws (or is about to); names it once it runs
_KEY = "key.json"


class SharedFigures:
    """The shared folder of one report's figures: claims, finished PNGs and the drawer's marker.

    Parameters
    ----------
    folder : str or Path
        The folder (:data:`FOLDER` in the record folder). [-]
    """

    def __init__(self, folder: str | Path):
        self.folder = Path(folder)

    @staticmethod
    def _name(key: tuple) -> str:
        return hashlib.sha256(repr(tuple(key)).encode()).hexdigest()[:24]

    def claim(self, key: tuple) -> bool:
        """Claim a figure for this process: True when no one had claimed it."""
        try:
            os.close(os.open(self.folder / f"{self._name(key)}.claim", os.O_CREAT | os.O_EXCL | os.O_WRONLY))
        except FileExistsError:
            return False
        return True

    def put(self, key: tuple, png: bytes) -> None:
        """Store a drawn figure (written whole, then renamed)."""
        write_bytes_atomic(self.folder / f"{self._name(key)}.png", png)

    def take(self, key: tuple) -> bytes | None:
        """A stored figure's PNG, or None while it is not there."""
        try:
            return (self.folder / f"{self._name(key)}.png").read_bytes()
        except FileNotFoundError:
            return None

    def drawing(self) -> bool:
        """True while the other process's drawer runs (its marker names it once that process has started)."""
        return marked_process(self.folder / _DRAWING) in ("unnamed", "running")

    def drawing_done(self) -> None:
        """Remove the drawing marker: the kernel then draws every figure not yet stored."""
        (self.folder / _DRAWING).unlink(missing_ok=True)

    def name_drawer(self, pid: int) -> None:
        """Name the drawing process in its marker (it then counts as drawing only while it runs)."""
        (self.folder / _DRAWING).write_text(str(int(pid)))

    def key(self) -> Any:
        """The key of the results the figures are drawn from (None when unreadable)."""
        try:
            return json.loads((self.folder / _KEY).read_text())
        except (OSError, ValueError):
            return None

    def source(self, wait_limit: float = WAIT_LIMIT) -> Callable[[FigureOrder], bytes]:
        """A PNG source for a :class:`FigureList` in the workbook: claim and draw a figure,
        or take it from the folder once the other process has drawn it."""
        def png(order: FigureOrder) -> bytes:
            if self.claim(order.key):
                return order.png()
            deadline = time.monotonic() + wait_limit
            while time.monotonic() < deadline:
                drawing = self.drawing()  # read before the PNG: a drawer that stops has stored its last one
                data = self.take(order.key)
                if data is not None:
                    return data
                if not drawing:
                    break
                time.sleep(0.005)
            return self.take(order.key) or order.png()

        return png


def open_shared(folder: str | Path, study_path: str | Path, quick: bool, drawer: int | None = None) -> SharedFigures:
    """Make the shared folder for results computed ahead, marked as being drawn (the drawing process's side).

    Parameters
    ----------
    folder : str or Path
        The folder to make (:data:`FOLDER` in the record folder). [-]
    study_path : str or Path
        The study file, whose bytes key the results. [-]
    quick : bool
        The results' ``quick`` option. [-]
    drawer : int, optional
        Process id of the process that will draw (default: this one). [-]
    """
    shared = SharedFigures(folder)
    shared.folder.mkdir()
    (shared.folder / _KEY).write_text(json.dumps(list(ahead_key(study_path, quick))))
    shared.name_drawer(os.getpid() if drawer is None else drawer)
    return shared


def draw_ahead(shared: SharedFigures, figures: FigureList) -> int:
    """Draw a report's figures from the last one up into ``shared`` (the drawing process's side).

    Figures whose drawing computes (``FigureOrder.computes``: response spectra, whose compiled
    loop this process has loaded and the kernel has not) come first, then the others, each group
    from the last one up. Each figure is claimed first; one the kernel claimed is left to it. The
    folder's drawing marker is removed whatever happens, so the kernel never waits for a figure
    that will not come. Returns the number of figures drawn here.

    Parameters
    ----------
    shared : SharedFigures
        From :func:`open_shared`. [-]
    figures : FigureList
        The report's figures (:func:`isolation.output.plots.report_figures.feasibility_figures`). [-]
    """
    drawn = 0
    try:
        last_first = figures.orders[::-1]
        for order in [o for o in last_first if o.computes] + [o for o in last_first if not o.computes]:
            if shared.claim(order.key):
                shared.put(order.key, order.png())
                drawn += 1
    finally:
        shared.drawing_done()
    return drawn


def figures_of(results: Any, study: Any, *, study_path: str | Path, quick: bool = False,
               precomputed: str | Path = "") -> FigureList:
    """The feasibility workbook's figures, shared with the record command when it draws them too.

    Parameters
    ----------
    results, study : StudyResults, Study
        As :func:`isolation.output.plots.report_figures.feasibility_figures`. [-]
    study_path : str or Path
        The study file. [-]
    quick : bool
        The results' ``quick`` option. [-]
    precomputed : str or Path
        The results pickle of the record command (see
        :func:`isolation.study.head_start.results_of`); its folder holds :data:`FOLDER`.
        Empty, a pickle ``results`` did not come from, or a folder drawn for other results:
        every figure is drawn here. [-]
    """
    from isolation.output.plots.report_figures import feasibility_figures

    figures = feasibility_figures(results, study)
    if not was_read(precomputed):  # results computed here: figures drawn elsewhere might not fit them
        return figures
    shared = SharedFigures(Path(precomputed).parent / FOLDER)
    if shared.key() != list(ahead_key(study_path, quick)):
        return figures
    return figures.with_source(shared.source())
