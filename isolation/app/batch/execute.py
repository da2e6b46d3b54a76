"""Run a batch's variants on a ``concurrent.futures`` executor and resume it.

Executors: see :mod:`isolation.app.batch.executors` (local processes, a dask
LocalCluster, or a dask cluster at a scheduler address; no scheduler of our own).

Each variant becomes one :class:`VariantTask`; a runner (by default
:func:`record_runner`, which writes a calculation record through
:func:`isolation.app.calc_records.run_record`) turns it into a :class:`VariantOutcome`.
Runners must be picklable top-level functions.

The batch folder keeps ``batch.json``, the state of every variant (input
hash, status, error, summary rows), rewritten atomically as variants finish
(at most every :data:`STATE_INTERVAL` seconds, longer when the file is big)
and at the end, and ``summary.csv``. Variants go to the workers a few at a
time (twice the workers in flight), singly for records and in chunks for the
direct sweep. A worker process that dies (killed, out of memory) fails only
the variant that killed it: the others it had in hand run again, alone.
Re-running a batch skips variants already done with the same input hash,
keeps failed ones unless asked to retry them, and runs the rest. Ctrl-C
cancels variants not yet started, lets running ones finish (a second Ctrl-C
stops them), and leaves every completed record and the state intact.
"""

from __future__ import annotations

import time
from concurrent.futures import FIRST_COMPLETED, CancelledError, Executor, Future, wait
from concurrent.futures.process import BrokenProcessPool
from contextlib import ExitStack
from dataclasses import dataclass
from pathlib import Path
from typing import Any, Callable

from isolation.app.batch.executors import executor_for, open_executor, spare_core_each, terminate
from isolation.app.batch.plan import BatchPlan
from isolation.app.batch.runners import VariantOutcome, VariantTask, guarded_chunk, one_line, record_runner
from isolation.app.batch.state import STATE_FILE, plan_tasks, remove_superseded, write_state
from isolation.app.batch.summary import preload_summary_writer, write_summary

__all__ = ["BatchReport", "run_batch", "open_executor", "STATE_FILE"]

CHUNK_LIMIT = 50  # largest automatic chunk [variants]
STATE_INTERVAL = 0.5  # shortest time between two state writes while running [s]


@dataclass(frozen=True)
class BatchReport:
    """Counts of one batch invocation.

    Parameters
    ----------
    out_dir : Path
        Batch folder.
    done, failed, not_run : tuple of str
        Variant ids by final status (``not_run``: cancelled by an interrupt).
    ran, reused : tuple of str
        Variants run in this invocation and those taken from an earlier one.
    interrupted : bool
        True when Ctrl-C stopped the batch.
    elapsed : float
        Wall time. [s]
    """

    out_dir: Path
    done: tuple = ()
    failed: tuple = ()
    not_run: tuple = ()
    ran: tuple = ()
    reused: tuple = ()
    interrupted: bool = False
    elapsed: float = 0.0

    @property
    def exit_code(self) -> int:
        """0 all done, 1 some failed, 130 interrupted (shell convention for Ctrl-C)."""
        if self.interrupted:
            return 130
        return 1 if (self.failed or self.not_run) else 0

    def to_dict(self) -> dict:
        lists = {name: list(getattr(self, name)) for name in ("done", "failed", "not_run", "ran", "reused")}
        return {"out_dir": str(self.out_dir), **lists, "interrupted": self.interrupted, "elapsed": self.elapsed}


def _summary_rows(plan: BatchPlan, entries: dict) -> list[dict]:
    rows: list[dict] = []
    for variant in plan.variants:
        entry = entries.get(variant.variant_id, {})
        status = entry.get("status", "not run")
        status = status if status in ("done", "failed") else "not run"
        base = {"variant": variant.variant_id, "status": status, **variant.overrides,
                "error": entry.get("error"), "record": entry.get("record")}
        results = entry.get("rows") or [{}]
        for result in results if status == "done" else [{}]:
            rows.append({**base, **result})
    return rows


def run_batch(
    plan: BatchPlan,
    out_dir: str | Path,
    hashes: dict[str, str],
    *,
    executor: str | Executor = "local",
    workers: int | None = None,
    runner: Callable[[VariantTask], VariantOutcome] = record_runner,
    retry_failed: bool = False,
    pdf: bool | None = None,
    quick: bool = False,
    chunk: int | None = 1,
    progress: bool = True,
    settings: dict | None = None,
    on_outcome: Callable[[VariantOutcome], None] | None = None,
    head_start: bool | None = None,
) -> BatchReport:
    """Run every variant of a validated batch that is not already done.

    Parameters
    ----------
    plan : BatchPlan
        From :func:`isolation.app.batch.plan.load_batch`.
    out_dir : str or Path
        Batch folder (created when missing).
    hashes : dict
        Variant id -> input hash, from :func:`isolation.app.batch.plan.validate_plan`.
    executor : str or Executor
        ``"local"``, ``"local-cluster"``, a dask scheduler address, or an
        open ``concurrent.futures.Executor`` (left open).
    workers : int, optional
        Worker processes for the local kinds (default: cores).
    runner : callable
        Picklable top-level function ``runner(task) -> VariantOutcome``.
    retry_failed : bool
        Run again variants that failed in an earlier invocation.
    pdf : bool, optional
        PDF report in each record (default: the batch file's ``pdf``, off).
    quick : bool
        Small motion suites (tests and trials only, never for a report);
        fold it into ``hashes`` through the validation settings.
    chunk : int or None
        Variants handed to a worker at a time; None picks a size for many
        short variants (the direct sweep: fewer round trips), at most
        :data:`CHUNK_LIMIT`. [-]
    progress : bool
        Show a tqdm progress bar (done/failed/remaining, elapsed) on stderr.
    settings : dict, optional
        Run settings stored in the state file.
    on_outcome : callable, optional
        Called in this process with each outcome as it arrives.
    head_start : bool, optional
        Whether each record may fork its head start (:class:`VariantTask`); default: where the
        workers leave each one a spare core (:func:`spare_core_each`).

    Returns
    -------
    BatchReport
    """
    started = time.perf_counter()
    out_dir = Path(out_dir).resolve()
    settings = dict(settings or {})
    use_pdf = plan.pdf if pdf is None else bool(pdf)
    head_start = spare_core_each(executor, workers) if head_start is None else bool(head_start)
    entries, tasks, reused = plan_tasks(plan, out_dir, hashes, use_pdf, quick, retry_failed, head_start)
    run = _BatchRun(plan, out_dir, settings, entries, tasks, reused, runner=runner, executor=executor,
                    workers=workers, on_outcome=on_outcome)
    run.execute(chunk, progress)
    write_state(out_dir, plan, entries, settings)
    write_summary(_summary_rows(plan, entries), out_dir, plan.override_keys())
    by_status = {s: tuple(k for k, e in entries.items() if e.get("status") == s) for s in ("done", "failed")}
    not_run = tuple(k for k, e in entries.items() if e.get("status") not in ("done", "failed"))
    return BatchReport(out_dir, by_status["done"], by_status["failed"], not_run, tuple(run.ran), tuple(reused),
                       run.interrupted, time.perf_counter() - started)


class _BatchRun:
    """One invocation's variants on an executor: chunks in flight, outcomes into the state, progress."""

    def __init__(self, plan: BatchPlan, out_dir: Path, settings: dict, entries: dict[str, dict],
                 tasks: list[VariantTask], reused: list[str], *, runner: Callable[[VariantTask], VariantOutcome],
                 executor: str | Executor, workers: int | None,
                 on_outcome: Callable[[VariantOutcome], None] | None) -> None:
        self.plan, self.out_dir, self.settings, self.entries = plan, out_dir, settings, entries
        self.tasks, self.reused, self.runner = tasks, reused, runner
        self.executor, self.workers, self.on_outcome = executor, workers, on_outcome
        self.ran: list[str] = []
        self.interrupted = False
        self.counts = {"done": 0, "failed": 0}
        self.last_write = [0.0, STATE_INTERVAL]  # time of the last state write, interval to the next [s]
        self.bar: Any = None
        self.pending: dict[Future, list[VariantTask]] = {}
        self.queue: list[list[VariantTask]] = []  # chunks; pop() from the end: file order
        self.lost: dict[str, int] = {}
        self.pool: Any = None
        self.slots = 1
        self.stack: ExitStack | None = None

    def accept(self, outcome: VariantOutcome) -> None:
        """Record a finished variant in the state (written at most every few tenths of a second)."""
        entry = self.entries[outcome.variant_id]
        entry.update(status=outcome.status, rows=[dict(r) for r in outcome.rows], record=outcome.record,
                     error=outcome.error, attempts=outcome.attempts, elapsed=round(outcome.elapsed, 3))
        if outcome.status in self.counts:
            self.counts[outcome.status] += 1
            # 0 attempts: record found complete
            (self.ran if outcome.attempts else self.reused).append(outcome.variant_id)
        if time.perf_counter() - self.last_write[0] > self.last_write[1]:  # large sweeps: not after every variant
            mark = time.perf_counter()
            write_state(self.out_dir, self.plan, self.entries, self.settings)
            self.last_write[:] = [time.perf_counter(), max(STATE_INTERVAL, 20 * (time.perf_counter() - mark))]
        self.bar.set_postfix(done=self.counts["done"], failed=self.counts["failed"],
                             remaining=len(self.tasks) - self.bar.n - 1, refresh=False)
        self.bar.update(1)

    def outcomes_of(self, future: Future, chunk: list[VariantTask]) -> list[VariantOutcome]:
        """Outcomes of a chunk; variants lost with a dead worker go back in the queue."""
        try:
            return list(future.result())
        except KeyboardInterrupt:
            raise
        except BrokenProcessPool as error:
            # A worker process died (killed, out of memory, crashed): every variant it had
            # in hand fails with this. Each gets one more try, alone, on a fresh pool.
            found = []
            for task in chunk:
                self.lost[task.variant_id] = self.lost.get(task.variant_id, 0) + 1
                if self.lost[task.variant_id] == 1:
                    self.queue.insert(0, [task])  # last in line
                else:
                    found.append(VariantOutcome(task.variant_id, "failed", attempts=2,
                                                error=one_line(error) + " (its worker process died twice)"))
            return found
        except CancelledError as error:
            return [VariantOutcome(t.variant_id, "failed", error=one_line(error)) for t in chunk]
        except Exception as error:
            return [VariantOutcome(t.variant_id, "failed", error=one_line(error)) for t in chunk]

    def submit(self, part: list[VariantTask]) -> None:
        """Hand a chunk to the executor (a fresh local pool when the last one broke)."""
        try:
            future = self.pool.submit(guarded_chunk, self.runner, part)
        except BrokenProcessPool:
            if not isinstance(self.executor, str):
                raise  # an executor we were given: its owner decides
            assert self.stack is not None
            self.pool = self.stack.enter_context(executor_for(self.executor, self.workers))[0]
            future = self.pool.submit(guarded_chunk, self.runner, part)
        self.pending[future] = part

    def top_up(self) -> None:
        """At most ``slots`` chunks handed to the executor at a time, so that Ctrl-C finds the rest not
        yet started. A variant that was in hand when a worker died runs again alone, so a second death
        is surely its own."""
        while len(self.pending) < self.slots and self.queue:
            if self.queue[-1][0].variant_id in self.lost:
                if not self.pending:
                    self.submit(self.queue.pop())
                return
            self.submit(self.queue.pop())

    def execute(self, chunk: int | None, progress: bool) -> None:
        """Run every task; Ctrl-C cancels what has not started and keeps what finishes."""
        from tqdm.auto import tqdm

        tasks = self.tasks
        with ExitStack() as stack:
            self.stack = stack
            self.pool, self.slots = stack.enter_context(executor_for(self.executor if tasks else None,
                                                                     self.workers))
            size = chunk if chunk is not None else max(1, min(CHUNK_LIMIT, -(-len(tasks) // (4 * self.slots))))
            self.queue = _chunks(tasks, size)[::-1]
            # the executor is up: now the batch folder is written
            self.out_dir.mkdir(parents=True, exist_ok=True)
            for entry in self.entries.values():
                remove_superseded(self.out_dir, {"record": entry.pop("superseded", None)})
            write_state(self.out_dir, self.plan, self.entries, self.settings)
            self.bar = tqdm(total=len(tasks), unit="variant", desc=self.plan.name, disable=not progress or not tasks,
                            dynamic_ncols=True)
            try:
                self.top_up()
                if self.pending:
                    # While this process only waits for the workers; started only now that the pool has forked
                    # every worker (a fork-context pool starts them all at its first submit): a worker forked
                    # while this thread imports would inherit a module lock that nothing releases there.
                    preload_summary_writer()
                while self.pending:
                    self._collect_finished()
                    self.top_up()
            except KeyboardInterrupt:
                self.interrupted = True
                _stop(self.pool, self.pending, self.accept)
            finally:
                self.bar.close()

    def _collect_finished(self) -> None:
        """Wait for the next chunk(s) to finish and accept their outcomes."""
        finished, _ = wait(list(self.pending), return_when=FIRST_COMPLETED)
        for future in finished:
            found = self.outcomes_of(future, self.pending.pop(future))
            for outcome in found:
                if outcome.status in ("done", "failed"):
                    self.accept(outcome)
                    if self.on_outcome is not None:
                        self.on_outcome(outcome)
            if any(outcome.status == "interrupted" for outcome in found):
                raise KeyboardInterrupt


def _chunks(tasks: list, size: int) -> list[list]:
    """``tasks`` in file order as ceil(n/size) chunks of at most ``size``, their lengths differing by at most
    one, so that no worker is left with a short last chunk while the others wait."""
    parts = -(-len(tasks) // max(int(size), 1))
    bounds = [len(tasks) * i // parts for i in range(parts + 1)] if parts else [0]
    return [tasks[start:end] for start, end in zip(bounds[:-1], bounds[1:], strict=True)]


def _stop(pool: Executor, pending: dict[Future, list], accept: Callable[[VariantOutcome], None]) -> None:
    """After Ctrl-C: cancel queued variants, let running ones finish and keep their outcomes."""
    for future in list(pending):
        if future.cancel():
            pending.pop(future)
    try:
        while pending:
            finished, _ = wait(list(pending), return_when=FIRST_COMPLETED)
            for future in finished:
                pending.pop(future)
                try:
                    found = future.result()
                except BaseException:
                    continue
                for outcome in found:
                    if outcome.status in ("done", "failed"):
                        accept(outcome)
    except KeyboardInterrupt:  # a second Ctrl-C: stop the running variants now
        terminate(pool)
