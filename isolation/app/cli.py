"""Command line: ``python -m isolation <command> ...`` (also the ``isolation`` script).

Commands
--------
run STUDY.toml --out DIR     run a study into a calculation record with its report
check STUDY.toml             validate a study file only
motions STUDY.toml --out DIR generate and export the study's matched motion suite
render RECORD_DIR            write the report of an existing record
demo                         run the invented demo study into records/
explore [--port N]           serve the live explorer on 127.0.0.1 and print its URL
records [--out DIR] [--clean] list (and remove) stale partial records and leftovers
batch ...                    run many variants (see ``batch --help``)

Exit codes: 0 done, 1 the run failed, 2 bad input. Messages are one line on
standard error; user errors print no traceback.
"""

from __future__ import annotations

import argparse
import contextlib
import sys
from pathlib import Path
from typing import NoReturn

from isolation.app.arguments import OneLineParser
from isolation.errors import InputError, RunError

__all__ = ["main", "run"]

DONE, FAILED, BAD_INPUT = 0, 1, 2

SCOPE_NOTE = ("Feasibility study only, not construction design: verify against the local "
              "code with a licensed structural engineer.")


_Parser = OneLineParser  # the earlier private name

def _parser() -> argparse.ArgumentParser:
    parser = _Parser(
        prog="isolation",
        description="Seismic base-isolation feasibility studies: from a study file to a "
                    "client report. " + SCOPE_NOTE,
    )
    from isolation import __version__
    parser.add_argument("--version", action="version", version=f"isolation {__version__}")
    commands = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)

    _add_run(commands)
    _add_check(commands)
    _add_motions(commands)
    _add_render(commands)
    _add_demo(commands)
    _add_explore(commands)
    _add_records(commands)
    commands.add_parser("batch", help="run many study variants (see: batch --help)", add_help=False,
                        description="Run a batch of study variants.")
    return parser


def _add_run(commands) -> None:
    """``run``: a study into a calculation record with its report."""
    run = commands.add_parser("run", help="run a study into a calculation record with its report",
                              description="Run a study file end to end: design, motion suite, "
                              "response histories, verdict, executed workbook and report, written "
                              "atomically to DIR/<study name>/<run id>/.")
    run.add_argument("study", metavar="STUDY.toml", help="the study file")
    run.add_argument("--out", metavar="DIR", default="records",
                     help="folder that holds the records (default: records)")
    run.add_argument("--no-pdf", action="store_true",
                     help="skip the report (no PDF or HTML); the record is still complete")
    run.add_argument("--paper", choices=("a4", "letter"), default="a4", help="paper size of the PDF")
    _engine_option(run)
    run.add_argument("--quick", action="store_true",
                     help="small suite and short motions, for trying things out (not for reports)")
    run.add_argument("--run-id", metavar="NAME", default=None,
                     help="name of the record folder (default: UTC time stamp)")
    run.add_argument("--set", metavar="KEY=VALUE", action="append", default=[],
                     help="override one study key, e.g. --set site.sms=1.2 or "
                          "--set 'alternative.0.bearings.0.radius=\"3 m\"' (TOML value)")


def _add_check(commands) -> None:
    """``check``: validate a study file only."""
    check = commands.add_parser("check", help="validate a study file only",
                                description="Validate a study file and list every problem found.")
    check.add_argument("study", metavar="STUDY.toml", help="the study file")
    check.add_argument("--set", metavar="KEY=VALUE", action="append", default=[],
                       help="override one study key before checking (TOML value)")


def _add_motions(commands) -> None:
    """``motions``: generate and export the study's matched suite."""
    motions = commands.add_parser("motions", help="generate and export the study's matched motion suite",
                                  description="Generate the suite of spectrum-matched motions the "
                                  "study would use and export it to DIR.")
    motions.add_argument("study", metavar="STUDY.toml", help="the study file")
    motions.add_argument("--out", metavar="DIR", required=True, help="folder for the exported motions")
    motions.add_argument("--quick", action="store_true", help="small suite and short motions")


def _add_render(commands) -> None:
    """``render``: the report of an existing record."""
    render = commands.add_parser("render", help="write the report of an existing record",
                                 description="Render the report (PDF, or HTML without TeX) of a "
                                 "calculation record from its executed workbook.")
    render.add_argument("record", metavar="RECORD_DIR", help="a record folder")
    render.add_argument("--paper", choices=("a4", "letter"), default="a4", help="paper size of the PDF")
    _engine_option(render)


def _add_demo(commands) -> None:
    """``demo``: the invented demo study into records/."""
    demo = commands.add_parser("demo", help="run the invented demo study into records/",
                               description="Run examples/demo_study.toml into records/ and print "
                               "where the report is and the verdict.")
    demo.add_argument("--out", metavar="DIR", default="records", help="records folder (default: records)")
    demo.add_argument("--paper", choices=("a4", "letter"), default="a4", help="paper size of the PDF")
    _engine_option(demo)


def _add_explore(commands) -> None:
    """``explore``: serve the live explorer."""
    explore = commands.add_parser("explore", help="serve the live explorer on 127.0.0.1 and print its URL",
                                  description="Serve the live explorer (bearing, site and building settings "
                                  "in, the code's answer out) as a stand-alone page with Voila on 127.0.0.1, "
                                  "print its URL and run until Ctrl-C. Screening only, not design.")
    explore.add_argument("--port", type=int, default=None, metavar="N",
                         help="TCP port on 127.0.0.1 (default: a free one)")


def _add_records(commands) -> None:
    """``records``: list or remove stale partial records."""
    records = commands.add_parser(
        "records", help="list or remove stale partial records and leftover temporary folders",
        description="List what runs that ended without a record left behind under DIR: hidden "
                    ".partial folders of runs killed or stopped by a full disk, temporary files of "
                    "interrupted writes and report build folders older than an hour. Stale partial "
                    "folders are marked failed. With --clean they are removed; records are never touched.")
    records.add_argument("--out", metavar="DIR", default="records", help="records folder (default: records)")
    records.add_argument("--clean", action="store_true", help="remove what is listed")


def _engine_option(parser: argparse.ArgumentParser) -> None:
    parser.add_argument("--engine", choices=("typst", "latex"), default=None,
                        help="PDF engine: typst (default; pip only) or latex (XeLaTeX and pandoc from "
                             "Debian); HTML only when the engine cannot run")


def _overrides(pairs: list[str]) -> dict:
    """``KEY=VALUE`` pairs to an override mapping; VALUE is read as TOML, else as text."""
    import tomllib

    result = {}
    for pair in pairs:
        key, sep, text = pair.partition("=")
        if not sep or not key.strip():
            raise InputError(f"--set {pair!r} is not allowed: must be KEY=VALUE, e.g. site.sms=1.2")
        try:
            value = tomllib.loads(f"value = {text.strip()}")["value"]
        except tomllib.TOMLDecodeError:
            value = text.strip()
        result[key.strip()] = value
    return result


def _say(message: str) -> None:
    print(message, file=sys.stderr)


def _check(args) -> int:
    from isolation.study import load_study
    from isolation.study.runner import check_study

    study = load_study(args.study, overrides=_overrides(args.set))
    check_study(study)
    names = ", ".join(a.name for a in study.alternatives)
    print(f"{args.study}: valid ({study.basis}, {study.building.storeys} storeys, "
          f"{len(study.alternatives)} alternative(s): {names})")
    return DONE


def _notes(caught) -> None:
    """The package's own warnings (e.g. what to install for PDF reports) as one-line notes."""
    for warning in caught:
        if warning.category.__module__.split(".")[0] == "isolation":
            _say("note: " + " ".join(str(warning.message).split()))


def _record(*args, **kwargs):
    """run_record with its warnings (e.g. TeX missing: what to install) as one-line notes."""
    import warnings

    from isolation.app.calc_records import run_record

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        outcome = run_record(*args, **kwargs)
    _notes(caught)
    return outcome


def _out_folder(out: str) -> None:
    """``--out`` must name a folder (or nothing yet), not a file."""
    path = Path(out)
    if path.exists() and not path.is_dir():
        raise InputError(f"--out = {out!r} is not allowed: must be a folder, not a file")


def _records(args) -> int:
    from isolation.app.calc_records import clean_records, mark_stale_partials

    root = Path(args.out)
    if root.exists() and not root.is_dir():
        raise InputError(f"--out = {args.out!r} is not allowed: must be a records folder, not a file")
    marked = [p for study in (root.iterdir() if root.is_dir() else ()) if study.is_dir()
              for p in mark_stale_partials(study)]
    items = clean_records(root, remove=args.clean)
    for item in items:
        print(("removed: " if args.clean else "stale: ") + str(item))
    if marked:
        _say(f"note: {len(marked)} stale partial record(s) marked failed")
    verb = "removed" if args.clean else "found (remove with --clean)"
    print(f"records {root}: {len(items)} stale item(s) {verb}")
    return DONE


def _run(args) -> int:
    _out_folder(args.out)
    outcome = _record(args.study, args.out, pdf=not args.no_pdf, overrides=_overrides(args.set),
                      run_id=args.run_id, paper=args.paper, quick=args.quick, engine=args.engine)
    if outcome.status != "done":
        _say(f"run failed: {outcome.error} (record: {outcome.path})")
        return FAILED
    print(f"record: {outcome.path}")
    if outcome.report is not None:
        print(f"report: {outcome.report}")
    for line in outcome.verdicts:
        print(f"verdict: {line}")
    return DONE


def _motions(args) -> int:
    from isolation.study import load_study
    from isolation.study.runner import export_suite

    _out_folder(args.out)
    study = load_study(args.study)
    folder = export_suite(study, args.out, quick=args.quick)
    count = len(list(folder.glob("suite_*.txt")))
    print(f"motions: {count} records and suite.json written to {folder}")
    return DONE


def _render(args) -> int:
    import warnings

    from isolation.app.calc_records import render_record

    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        path = render_record(args.record, paper=args.paper, engine=args.engine)
    _notes(caught)
    print(f"report: {path}")
    return DONE


def _demo(args) -> int:
    study = Path(__file__).resolve().parents[2] / "examples" / "demo_study.toml"
    if not study.is_file():
        raise InputError(f"demo study {str(study)!r} is not allowed: must exist (examples/ missing?)")
    _out_folder(args.out)
    outcome = _record(study, args.out, pdf=True, paper=args.paper, engine=args.engine)
    if outcome.status != "done":
        _say(f"demo failed: {outcome.error} (record: {outcome.path})")
        return FAILED
    report = outcome.report if outcome.report is not None else outcome.path
    print(f"Report: {report}")
    print("Verdict: " + "; ".join(outcome.verdicts))
    return DONE


def _explore(args) -> int:
    from isolation.app.explorer.app import serve

    return DONE if serve(args.port) in (0, None) else FAILED


def main(argv: list[str] | None = None) -> int:
    """Run the command line; returns the exit code (0 done, 1 failed, 2 bad input)."""
    argv = list(sys.argv[1:] if argv is None else argv)
    with _sigterm_as_interrupt():
        return _main(argv)


def run() -> NoReturn:
    """The ``isolation`` and ``python -m isolation`` commands: :func:`main`, then :func:`leave`."""
    leave(main())


def leave(code: int) -> NoReturn:
    """End the process with exit code ``code`` without the interpreter's final teardown.

    After a study run, freeing every loaded module one by one (numba's compiler, scipy,
    matplotlib) takes 0.3-0.4 s, with nothing left to do: the command has closed its files.
    What a normal exit does that matters still happens, in the same order: other non-daemon
    threads are waited for, the exit handlers run (temporary folders, dask clusters), and the
    standard streams are flushed.
    """
    import atexit
    import os
    import threading

    for thread in threading.enumerate():
        if thread is not threading.current_thread() and not thread.daemon:
            thread.join()
    atexit._run_exitfuncs()
    for stream in (sys.stdout, sys.stderr):
        try:
            stream.flush()
        except (OSError, ValueError):
            pass
    os._exit(code)


@contextlib.contextmanager
def _sigterm_as_interrupt():
    """SIGTERM stops a command like Ctrl-C: one line, records closed as failed."""
    import signal
    import threading

    if threading.current_thread() is not threading.main_thread():
        yield
        return
    previous = signal.signal(signal.SIGTERM, _on_sigterm)
    try:
        yield
    finally:
        signal.signal(signal.SIGTERM, previous)


def _on_sigterm(signum, frame):  # noqa: ARG001 - signal handler signature
    raise KeyboardInterrupt("SIGTERM")


def _main(argv: list[str]) -> int:
    if argv and argv[0] == "batch":
        try:
            from isolation.app.batch import main as batch_main
        except ImportError as error:
            _say(f"isolation batch: not available ({error})")
            return FAILED
        return batch_main(argv[1:])
    handlers = {"run": _run, "check": _check, "motions": _motions, "render": _render, "demo": _demo,
                "explore": _explore, "records": _records}
    try:
        args = _parser().parse_args(argv)
        if args.command is None:
            _parser().print_help(sys.stderr)
            return BAD_INPUT
        return handlers[args.command](args)
    except (InputError, ValueError) as error:   # ValueError: bad input caught by the core
        _say(_one_line(error))
        return BAD_INPUT
    except RunError as error:
        _say(_one_line(error))
        return FAILED
    except Exception as error:  # noqa: BLE001 - a bug: one line, exit 1, no traceback
        _say(f"failed: {type(error).__name__}: {_one_line(error)}")
        return FAILED
    except KeyboardInterrupt:
        _say("interrupted")
        return FAILED
    except SystemExit as stop:  # --help and --version end here
        return stop.code if isinstance(stop.code, int) else (0 if stop.code is None else BAD_INPUT)


def _one_line(error: BaseException) -> str:
    return " ".join(str(error).split())
