"""``python -m isolation batch BATCH.toml``: the batch command line.

Exit codes: 0 every variant done, 1 some variant failed (or was not run),
2 bad input (one-line message, no traceback), 130 interrupted by Ctrl-C
(re-run the same command to resume).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from isolation.app.arguments import OneLineParser
from isolation.errors import InputError, RunError

__all__ = ["main", "build_parser"]

DEFAULT_ROOT = Path("records") / "batches"


def build_parser(prog: str = "isolation batch") -> argparse.ArgumentParser:
    """The argument parser of the batch command."""
    parser = OneLineParser(
        prog=prog,
        formatter_class=argparse.RawDescriptionHelpFormatter,
        description=(
            "Run every variant of a batch file (a base study plus overrides) into its own\n"
            "calculation record and write summary.csv in the batch folder.\n\n"
            "Batch file (TOML): [batch] study = \"study.toml\" (relative to the batch file),\n"
            "optional name, pdf, report, table = \"variants.csv\"; [grid] dotted key paths with value\n"
            "lists (every combination); [[variant]] tables of dotted key paths (optional id);\n"
            "[common] overrides for every variant. Example key: alternative.0.bearings.0.radius\n\n"
            "Every variant is validated before any runs. Re-running skips completed variants\n"
            "(same input hash); Ctrl-C keeps completed records. Render a record's report later\n"
            "with: python -m isolation render RECORD_DIR\n\n"
            "--report (or report = true) ends with the batch's own report in the batch folder:\n"
            "the design-space workbook run on summary.csv (design_space.ipynb) and report.pdf.\n\n"
            "Exit codes: 0 all done, 1 some failed, 2 bad input, 130 interrupted.\n"
            "Feasibility studies only: verify results against the local code with a licensed\n"
            "structural engineer."
        ),
    )
    parser.add_argument("batch_file", metavar="BATCH.toml", help="batch file naming the base study and its variants")
    parser.add_argument("--out", metavar="DIR", help=f"batch folder (default: {DEFAULT_ROOT}/<batch name>)")
    parser.add_argument("--workers", type=int, metavar="N",
                        help="worker processes on this machine (default: cores; a --scheduler cluster has its own)")
    where = parser.add_mutually_exclusive_group()
    where.add_argument("--scheduler", metavar="ADDRESS", help="run on the dask cluster at this scheduler address")
    where.add_argument("--local-cluster", action="store_true", help="run on a dask LocalCluster on this machine")
    parser.add_argument("--pdf", action="store_true", help="render each record's PDF report (off by default)")
    _report_options(parser)
    parser.add_argument("--retry-failed", action="store_true", help="run again variants that failed before")
    parser.add_argument(
        "--quick", action="store_true", help="small motion suites per variant (trials and tests only, not for reports)"
    )
    parser.add_argument(
        "--direct",
        action="store_true",
        help="equivalent-linear sweep without notebooks or records (thousands of variants); same summary columns",
    )
    parser.add_argument(
        "--histories",
        action="store_true",
        help="with --direct: response histories of every variant (lower and upper bound, one suite of motions, "
        "fixed base once), no notebooks; summary gains history columns for the design-space maps",
    )
    parser.add_argument("--motions", metavar="SUITE.json",
                        help="with --histories: the suite to use (metadata file written by 'python -m isolation "
                        "motions'); default: the base study's matched suite")
    parser.add_argument(
        "--max-variants",
        type=int,
        metavar="N",
        help="most variants allowed (default: 1000 for records, 100000 with --direct); counted before any is validated",
    )
    parser.add_argument("--check", action="store_true", help="validate the batch and every variant, run nothing")
    parser.add_argument("--no-progress", action="store_true", help="no progress bar")
    return parser


def _report_options(parser: argparse.ArgumentParser) -> None:
    """``--report`` and the report's paper and engine."""
    parser.add_argument("--report", action="store_true",
                        help="end with the batch report: design_space.ipynb run on summary.csv and its report.pdf "
                        "in the batch folder (also: report = true in [batch])")
    parser.add_argument("--paper", choices=("a4", "letter"), default="a4",
                        help="paper of the batch report (default a4)")
    parser.add_argument("--engine", choices=("typst", "latex"),
                        help="PDF engine of the batch report (default typst, or latex when typst cannot run)")


def _say(message: str) -> None:
    print(message, file=sys.stderr)


def main(argv: list[str] | None = None) -> int:
    """Run the batch command; returns the exit code (0, 1, 2 or 130)."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as stop:  # --help
        return int(stop.code or 0)
    except InputError as error:  # a usage error: one line
        _say(f"error: {' '.join(str(error).split())}")
        return 2
    if args.out and Path(args.out).exists() and not Path(args.out).is_dir():
        _say(f"error: --out = {args.out!r} is not allowed: must be a folder, not a file")
        return 2
    if args.max_variants is not None and args.max_variants < 1:
        _say(f"error: --max-variants = {args.max_variants} is not allowed: must be a whole number >= 1")
        return 2
    if args.workers is not None and args.workers < 1:
        _say(f"error: --workers = {args.workers} is not allowed: must be a whole number >= 1")
        return 2
    try:
        return _run(args)
    except InputError as error:
        _say(f"error: {' '.join(str(error).split())}")
        return 2
    except KeyboardInterrupt:
        _say("interrupted: completed records are kept; run the same command again to resume")
        return 130
    except OSError as error:  # e.g. a batch folder that cannot be written
        _say(f"error: {' '.join(str(error).split())}")
        return 2
    except RunError as error:  # a valid batch whose shared step failed (e.g. the history sweep's motions)
        _say(f"failed: {' '.join(str(error).split())}")
        return 1


def _run(args: argparse.Namespace) -> int:
    from isolation.app.batch.check import CHUNK_FROM, validate_plan
    from isolation.app.batch.executors import open_executor
    from isolation.app.batch.plan import DIRECT_LIMIT, RECORD_LIMIT, load_batch

    limit = args.max_variants or (DIRECT_LIMIT if args.direct else RECORD_LIMIT)
    plan = load_batch(args.batch_file, max_variants=limit)
    if (args.histories or args.motions) and not args.direct:
        raise InputError("--histories and --motions are not allowed without --direct: "
                         "history sweeps run as a direct sweep (no notebooks)")
    if args.motions and not args.histories:
        raise InputError(f"--motions = {args.motions!r} is not allowed without --histories")
    if args.motions and not Path(args.motions).is_file():
        raise InputError(f"--motions = {args.motions!r} is not allowed: must be an existing suite metadata file")
    mode = "direct" if args.direct else "record"
    settings = {"mode": mode, "quick": bool(args.quick) and not args.direct}
    executor = args.scheduler or ("local-cluster" if args.local_cluster else "local")
    if args.direct:  # key-by-key validation of bearing-property grids (same rules, same hashes)
        from isolation.app.batch.sweep import validate_direct

        validate = validate_direct
    else:
        validate = validate_plan  # with the model checks (its default)
    if args.check or len(plan.variants) < CHUNK_FROM:
        hashes = validate(plan, settings)
        if args.check:
            print(f"{plan.batch_file.name}: {len(plan.variants)} variants valid")
            return 0
        return _execute(args, plan, hashes, settings, executor, executor)
    with open_executor(executor, args.workers) as pool:  # large batches: validate on the workers too
        out_dir = _out_dir(args, plan)
        existed = out_dir.exists()
        motions = _motions_on(pool, args, plan, out_dir)  # a history sweep's suite, while the checks run
        try:
            hashes = validate(plan, settings, executor=pool)
        except InputError:
            _discard(motions, out_dir, existed)
            raise
        return _execute(args, plan, hashes, settings, executor, pool, motions)


def _out_dir(args: argparse.Namespace, plan) -> Path:
    return Path(args.out) if args.out else DEFAULT_ROOT / plan.name


def _motions_on(pool, args: argparse.Namespace, plan, out_dir: Path):
    """A history sweep's :func:`isolation.app.batch.histories.prepare_motions` as a task on ``pool`` (its
    imports, the suite and the fixed-base run then overlap the validation instead of following it); None
    for other batches."""
    if not args.histories:
        return None
    from isolation.app.batch.histories import prepare_motions, warm_worker

    prepared = pool.submit(prepare_motions, plan, out_dir, motions=args.motions, quick=bool(args.quick))
    for _ in range(max((args.workers or _cores()) - 1, 0)):  # the other workers load the engine meanwhile
        pool.submit(warm_worker)
    return prepared


def _discard(motions, out_dir: Path, existed: bool) -> None:
    """After a validation error: wait for the motions task and remove the batch folder it created."""
    if motions is None:
        return
    import shutil

    motions.cancel()
    try:
        motions.result()
    except BaseException:  # noqa: BLE001 - the validation error is the one reported
        pass
    if not existed and out_dir.is_dir():
        shutil.rmtree(out_dir, ignore_errors=True)


def _cores() -> int:
    import os

    return len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else (os.cpu_count() or 1)


DIRECT_CHUNK = 500  # largest chunk of a direct sweep: the array kernel runs a chunk at once [variants]


def _direct_chunk(count: int) -> int:
    """Variants per task of a direct sweep: about 16 tasks, at most :data:`DIRECT_CHUNK`."""
    return max(1, min(DIRECT_CHUNK, -(-count // 16)))


def _execute(args, plan, hashes, settings, executor_name, executor, prepared=None) -> int:
    from isolation.app.batch.execute import run_batch

    out_dir = _out_dir(args, plan)
    chunk = _direct_chunk(len(plan.variants)) if args.direct else 1
    if args.histories:
        from isolation.app.batch.histories import history_chunk, history_runner, prepare_motions, with_motions

        if prepared is not None:  # started on the workers (see _motions_on)
            motions = prepared.result()
        else:
            motions = prepare_motions(plan, out_dir, motions=args.motions, quick=bool(args.quick))
        hashes = with_motions(hashes, motions)
        settings = {**settings, "mode": "histories", "quick": bool(args.quick), "motions": motions["motions"],
                    "motions_hash": motions["motions_hash"]}
        workers = args.workers or _cores()
        chunk = history_chunk(len(plan.variants), workers, motions["records"], motions["steps"])
        runner = history_runner
    elif args.direct:
        from isolation.app.batch.sweep import sweep_runner

        runner = sweep_runner
    else:
        from isolation.app.batch.runners import record_runner

        runner = record_runner
    report = run_batch(
        plan,
        out_dir,
        hashes,
        executor=executor,
        workers=args.workers,
        runner=runner,
        retry_failed=args.retry_failed,
        pdf=True if args.pdf else None,
        quick=settings["quick"],
        chunk=chunk,
        progress=not args.no_progress,
        settings={**settings, "executor": executor_name},
    )
    counts = (
        f"{len(report.done)} done, {len(report.failed)} failed, {len(report.not_run)} not run "
        f"({len(report.ran)} ran, {len(report.reused)} from an earlier run) in {report.elapsed:.1f} s"
    )
    if report.interrupted:
        _say(f"interrupted: {counts}; run the same command again to resume")
    else:
        print(f"batch {plan.name}: {counts}")
    print(f"summary: {report.out_dir / 'summary.csv'}")
    if report.failed and not report.interrupted:
        _say(f"failed variants: {', '.join(report.failed)} (errors in summary.csv; --retry-failed runs them again)")
    if (args.report or plan.report) and not report.interrupted:
        _batch_report(args, plan, report.out_dir)
    return report.exit_code


def _batch_report(args, plan, out_dir: Path) -> None:
    """The batch's own report (:mod:`isolation.app.batch.batch_report`); its path printed."""
    from isolation.app.batch.batch_report import report_fields, write_batch_report

    fields, units = report_fields(plan.name, plan.study_file)
    path = write_batch_report(out_dir, fields=fields, units=units, paper=args.paper, engine=args.engine)
    print(f"report: {path}")
    if path.suffix != ".pdf":
        from isolation.output.report import engine_problem

        reasons = [engine_problem(name) for name in ([args.engine] if args.engine else ["typst", "latex"])]
        _say(f"note: no PDF engine could run ({'; '.join(r for r in reasons if r)}); the report is HTML")


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
