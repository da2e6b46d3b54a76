"""Batch studies: many variants of one study on local processes or a dask cluster.

* :mod:`isolation.app.batch.plan`: batch files and their variants;
* :mod:`isolation.app.batch.check`: every variant validated before any run;
* :mod:`isolation.app.batch.runners`: one variant's task, outcome and runners;
* :mod:`isolation.app.batch.executors`: local processes, dask LocalCluster, dask scheduler;
* :mod:`isolation.app.batch.execute`: the run loop: progress, resume, failures, Ctrl-C;
* :mod:`isolation.app.batch.sweep`: the direct equivalent-linear sweep (no notebooks, array kernel);
* :mod:`isolation.app.batch.histories`: history sweeps (response histories per variant, one suite);
* :mod:`isolation.app.batch.summary`: ``summary.csv`` / ``summary.parquet``;
* :mod:`isolation.app.batch.rows`: summary rows from study results;
* :mod:`isolation.app.batch.maps`: design-space tables and figures;
* :mod:`isolation.app.batch.command`: ``python -m isolation batch`` (:func:`main`).

Scope: feasibility studies, not construction design; every result must be
checked against the local code by a licensed structural engineer.
"""

from isolation.app.batch.check import validate_plan
from isolation.app.batch.command import main
from isolation.app.batch.execute import BatchReport, run_batch
from isolation.app.batch.executors import open_executor
from isolation.app.batch.plan import BatchPlan, Variant, load_batch
from isolation.app.batch.runners import VariantOutcome, VariantTask, record_runner
from isolation.app.batch.summary import read_summary, write_summary

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
