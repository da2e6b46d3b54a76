"""Executors for batches: ``concurrent.futures`` interfaces, no scheduler of our own.

* ``"local"``: :class:`concurrent.futures.ProcessPoolExecutor`, one worker
  per core by default;
* ``"local-cluster"``: a dask.distributed ``LocalCluster`` (worker processes,
  one thread each, no dashboard) and its client's executor, for one big
  machine;
* a scheduler address (``"tcp://host:8786"``): the executor of a
  dask.distributed ``Client`` connected to that cluster (``client.get_executor()``).
  The study file and the batch folder must be on a file system the
  workers share.
"""

from __future__ import annotations

import os
from concurrent.futures import Executor, ProcessPoolExecutor
from contextlib import contextmanager
from typing import Iterator

from isolation.errors import InputError

__all__ = ["open_executor", "executor_for", "slots_for", "terminate", "share_cores", "spare_core_each"]

CONNECT_TIMEOUT = 20.0  # waiting for a dask scheduler to answer [s]


@contextmanager
def open_executor(kind: str = "local", workers: int | None = None) -> Iterator[Executor]:
    """A ``concurrent.futures.Executor`` for a batch.

    Parameters
    ----------
    kind : str
        ``"local"`` (process pool), ``"local-cluster"`` (dask LocalCluster on
        this machine) or a dask scheduler address such as ``"tcp://10.0.0.5:8786"``.
    workers : int, optional
        Worker processes for ``"local"`` and ``"local-cluster"`` (default:
        the number of cores). Ignored for a scheduler address (the cluster
        has its own).
    """
    count = workers or os.cpu_count() or 1
    if kind == "local":
        threads = max(1, (os.cpu_count() or 1) // count)
        pool = ProcessPoolExecutor(max_workers=count, initializer=share_cores, initargs=(threads,))
        try:
            yield pool
        finally:
            pool.shutdown(wait=True, cancel_futures=True)
        return
    from dask.distributed import Client, LocalCluster

    if kind == "local-cluster":
        cluster = LocalCluster(n_workers=count, threads_per_worker=1, processes=True, dashboard_address=None)
        client = Client(cluster)
    else:
        cluster = None
        try:
            client = Client(kind, timeout=f"{CONNECT_TIMEOUT}s")
        except (OSError, ValueError, TypeError) as error:
            raise InputError(
                f"--scheduler = {kind!r} is not allowed: no dask scheduler answered there within "
                f"{CONNECT_TIMEOUT:g} s ({' '.join(str(error).split())}); give a running scheduler's address "
                "such as tcp://10.0.0.5:8786"
            ) from None
    try:
        yield client.get_executor(pure=False)
    finally:
        client.close()
        if cluster is not None:
            cluster.close()


THREAD_VARIABLES = ("OMP_NUM_THREADS", "OPENBLAS_NUM_THREADS", "MKL_NUM_THREADS")


def share_cores(threads: int) -> None:
    """Worker initializer: numeric libraries in this worker and the kernels it starts use ``threads`` threads.

    With several workers on one machine each kernel's BLAS would otherwise
    start a thread per core and the workers would fight over the cores
    (dask's worker nannies set the same variables to 1 by default).
    """
    for name in THREAD_VARIABLES:
        os.environ[name] = str(int(threads))


def terminate(pool: Executor) -> None:
    """Stop the workers of ``pool`` now (a second Ctrl-C); records they leave are marked failed or partial."""
    stop_all = getattr(pool, "terminate_workers", None)
    if callable(stop_all):
        stop_all()
        return
    processes = getattr(pool, "_processes", None) or {}
    for process in list(processes.values()):
        process.terminate()
    pool.shutdown(wait=False)


def slots_for(pool: Executor | None, workers: int | None) -> int:
    """Variants in flight: twice the workers (a dask cluster: twice its threads)."""
    client = getattr(pool, "_client", None)  # dask's ClientExecutor keeps its client here
    if client is not None:
        return 2 * max(sum(client.nthreads().values()), 1)
    return 2 * (workers or os.cpu_count() or 1)


@contextmanager
def executor_for(executor: str | Executor | None, workers: int | None) -> Iterator[tuple]:
    """(executor, slots) for a kind of executor or an open one (left open)."""
    if executor is None or isinstance(executor, Executor):
        yield executor, slots_for(executor, workers)
        return
    with open_executor(executor, workers) as pool:
        yield pool, slots_for(pool, workers)


def spare_core_each(executor: str | Executor, workers: int | None) -> bool:
    """True when a batch on ``executor`` with ``workers`` leaves each worker a spare core of this machine:
    a local pool (or one opened here) of at most half the cores. A record's head start then runs on that
    core and halves the record's time; without a spare one it only competes with the other workers.
    Clusters: False (their workers run in threads, where no head start forks anyway). [-]"""
    if not (executor == "local" or isinstance(executor, ProcessPoolExecutor)):
        return False
    cores = os.cpu_count() or 1  # as the pool's default number of workers (open_executor)
    return 2 * (workers or cores) <= cores
