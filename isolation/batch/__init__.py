"""Batch studies: many variants of one study on local processes or a dask cluster.

* :mod:`isolation.batch.plan`: batch files and their variants;
* :mod:`isolation.batch.check`: every variant validated before any run;
* :mod:`isolation.batch.runners`: one variant's task, outcome and runners;
* :mod:`isolation.batch.executors`: local processes, dask LocalCluster, dask scheduler;
* :mod:`isolation.batch.execute`: the run loop: progress, resume, failures, Ctrl-C;
* :mod:`isolation.batch.sweep`: the direct equivalent-linear sweep (no notebooks, array kernel);
* :mod:`isolation.batch.histories`: history sweeps (response histories per variant, one suite);
* :mod:`isolation.batch.summary`: ``summary.csv`` / ``summary.parquet``;
* :mod:`isolation.batch.rows`: summary rows from study results;
* :mod:`isolation.batch.maps`: design-space tables and figures;
* :mod:`isolation.batch.command`: ``python -m isolation batch`` (:func:`main`).

Scope: feasibility studies, not construction design; every result must be
checked against the local code by a licensed structural engineer.
"""

from isolation.batch.command import main
from isolation.batch.execute import BatchReport, run_batch
from isolation.batch.executors import open_executor
from isolation.batch.check import validate_plan
from isolation.batch.plan import BatchPlan, Variant, load_batch
from isolation.batch.runners import VariantOutcome, VariantTask, record_runner
from isolation.batch.summary import read_summary, write_summary

__all__ = [
    "main",
    "BatchPlan",
    "BatchReport",
    "Variant",
    "VariantOutcome",
    "VariantTask",
    "load_batch",
    "validate_plan",
    "run_batch",
    "open_executor",
    "record_runner",
    "read_summary",
    "write_summary",
]
