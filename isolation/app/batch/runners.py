"""Variant tasks, their outcomes, and the runners that turn one into the other.

A runner is a picklable top-level function ``runner(task) -> VariantOutcome``
run in a worker process. :func:`record_runner` (the default) runs the
feasibility workbook into a calculation record; :func:`guarded_call` wraps
any runner so that an exception becomes a failed outcome instead of breaking
the batch.
"""

from __future__ import annotations

import importlib
import os
import shutil
import time
import traceback
from dataclasses import dataclass
from pathlib import Path
from typing import Callable

__all__ = [
    "VariantTask",
    "VariantOutcome",
    "record_runner",
    "guarded_call",
    "guarded_chunk",
    "is_kernel_start_error",
    "one_line",
]

KERNEL_START_MARKERS = (
    "Kernel died before replying to kernel_info",
    "Kernel didn't respond",
    "Address already in use",
    "ZMQError",
    "kernel_info_reply",
)


@dataclass(frozen=True)
class VariantTask:
    """Everything a worker needs to run one variant (plain, picklable values).

    Parameters
    ----------
    variant_id : str
        Variant name; also the record's run id.
    study_file : str
        Base study file, absolute path.
    overrides : dict
        Dotted key paths and values applied to the study.
    out_dir : str
        Batch folder; the record is written under it.
    pdf : bool
        Render the PDF report in the record.
    input_hash : str
        Hash of the variant's full input.
    quick : bool
        Small motion suite (tests and trials only, never for a report).
    invocation : str
        Identifies one batch invocation (see :func:`guarded_call`).
    head_start : bool
        Let the record fork its head start (``run_record(head_start=...)``), which takes a second
        core: on only where the batch leaves each worker one spare.
    """

    variant_id: str
    study_file: str
    overrides: dict
    out_dir: str
    pdf: bool = False
    input_hash: str = ""
    quick: bool = False
    invocation: str = ""
    head_start: bool = True


@dataclass(frozen=True)
class VariantOutcome:
    """What running one variant gave.

    Parameters
    ----------
    variant_id : str
    status : str
        ``"done"``, ``"failed"`` or ``"interrupted"``.
    rows : tuple of dict
        Summary rows (one per isolation alternative), see
        :mod:`isolation.app.batch.summary`.
    record : str or None
        Record folder, relative to the batch folder.
    error : str or None
        One-line error of a failed variant.
    attempts : int
        Runs made (2 when a kernel start race was retried; 0 when a complete
        record of the same input was found and taken as it is).
    elapsed : float
        Wall time of the variant. [s]
    """

    variant_id: str
    status: str
    rows: tuple = ()
    record: str | None = None
    error: str | None = None
    attempts: int = 1
    elapsed: float = 0.0

    def to_dict(self) -> dict:
        return {
            "variant": self.variant_id,
            "status": self.status,
            "rows": [dict(r) for r in self.rows],
            "record": self.record,
            "error": self.error,
            "attempts": self.attempts,
            "elapsed": self.elapsed,
        }


def one_line(error: BaseException) -> str:
    text = " ".join(str(error).split())
    return f"{type(error).__name__}: {text}" if text else type(error).__name__


def is_kernel_start_error(text: str | None) -> bool:
    """True when ``text`` is a Jupyter kernel failing to start (a race worth one retry)."""
    return text is not None and any(marker in text for marker in KERNEL_START_MARKERS)


def record_runner(task: VariantTask) -> VariantOutcome:
    """Run one variant through the feasibility workbook into its own record.

    Calls :func:`isolation.app.calc_records.run_record` with the variant's overrides
    and reads the summary rows from the record's ``results.json``. A failure
    while the Jupyter kernel starts is retried once.

    A complete record of this variant already in the batch folder (the batch
    state was lost, or another batch wrote it) is taken as it is when its
    input hash and motion-suite setting match; otherwise it is replaced.
    """
    records = importlib.import_module("isolation.app.calc_records")
    from isolation.app.batch.rows import rows_from_record

    out_dir = Path(task.out_dir)
    existing = _existing_record(records, task)
    if existing is not None:
        return VariantOutcome(task.variant_id, "done", tuple(rows_from_record(existing)),
                              os.path.relpath(existing, out_dir), None, 0, 0.0)
    attempts = 0
    while True:
        attempts += 1
        started = time.perf_counter()
        try:
            outcome = records.run_record(
                task.study_file, out_dir, pdf=task.pdf, overrides=dict(task.overrides), run_id=task.variant_id,
                quick=task.quick, replace_failed=True, head_start=task.head_start,
            )
        except Exception as error:  # run_record reports failures itself; this is the fallback
            message = one_line(error)
            if attempts == 1 and is_kernel_start_error(message):
                continue
            return VariantOutcome(task.variant_id, "failed", error=message, attempts=attempts,
                                  elapsed=time.perf_counter() - started)
        record_dir = Path(outcome.path)
        status = getattr(outcome, "status", "done")
        problem = getattr(outcome, "error", None)
        if status != "done" and attempts == 1 and is_kernel_start_error(problem):
            continue
        relative = os.path.relpath(record_dir, out_dir)
        rows = rows_from_record(record_dir) if status == "done" else ()
        return VariantOutcome(task.variant_id, "done" if status == "done" else "failed", tuple(rows), relative,
                              None if status == "done" else (" ".join(str(problem).split()) or "failed"),
                              attempts, time.perf_counter() - started)


def _existing_record(records, task: VariantTask) -> Path | None:
    """A complete record of ``task`` with the same input, or None (a stale one is removed)."""
    from isolation.study import apply_overrides, parse_study, read_study_mapping

    study_file = Path(task.study_file)
    try:
        study = parse_study(apply_overrides(read_study_mapping(study_file), task.overrides),
                            source=str(study_file), base_dir=study_file.parent)
    except ValueError:
        return None  # run_record reports it
    folder = Path(task.out_dir) / records.sanitise_name(study.project.name) / records.sanitise_name(
        task.variant_id, fallback="run")
    manifest = records.read_manifest(folder)
    if manifest.get("status") != "done":
        return None  # none, or failed: run_record replaces a failed record itself
    same = (manifest.get("input_hash") == records.study_input_hash(study_file, task.overrides)
            and bool(manifest.get("options", {}).get("quick")) == task.quick)
    if same and records.verify_record(folder) is None:
        return folder
    shutil.rmtree(folder)  # a damaged record, or a complete one of other input under this variant's name
    return None


_INTERRUPTED: set[str] = set()  # batch invocations interrupted in this process


def guarded_call(runner: Callable[[VariantTask], VariantOutcome], task: VariantTask) -> VariantOutcome:
    """Run ``runner(task)`` in a worker; any exception becomes a failed outcome.

    A KeyboardInterrupt reaching the worker (Ctrl-C in a terminal reaches the
    whole process group) gives an ``interrupted`` outcome, so the variant runs
    again when the batch is resumed; variants already queued to the same
    worker for the same batch invocation are then not started.
    """
    started = time.perf_counter()
    if task.invocation and task.invocation in _INTERRUPTED:
        return VariantOutcome(task.variant_id, "interrupted", error="not started: the batch was interrupted")
    try:
        return runner(task)
    except KeyboardInterrupt:
        if task.invocation:
            _INTERRUPTED.add(task.invocation)
        return VariantOutcome(task.variant_id, "interrupted", error="interrupted by the user",
                              elapsed=time.perf_counter() - started)
    except Exception as error:
        detail = traceback.format_exception_only(type(error), error)[-1].strip()
        return VariantOutcome(task.variant_id, "failed", error=" ".join(detail.split()),
                              elapsed=time.perf_counter() - started)


def guarded_chunk(runner: Callable[[VariantTask], VariantOutcome], tasks: list) -> list:
    """:func:`guarded_call` over several variants in one worker call (short variants).

    A runner with a ``many`` attribute (``many(tasks) -> outcomes``, e.g. the
    direct sweep's array path) runs the chunk at once; if that raises, each
    variant runs alone.
    """
    many = getattr(runner, "many", None)
    if many is not None and len(tasks) > 1 and not any(t.invocation in _INTERRUPTED for t in tasks if t.invocation):
        try:
            return list(many(tasks))
        except KeyboardInterrupt:
            invocation = next((t.invocation for t in tasks if t.invocation), "")
            if invocation:
                _INTERRUPTED.add(invocation)
            return [VariantOutcome(t.variant_id, "interrupted", error="interrupted by the user") for t in tasks]
        except Exception:  # noqa: BLE001 - each alone names its own failure
            pass
    return [guarded_call(runner, task) for task in tasks]
