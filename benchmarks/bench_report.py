"""Benchmark of the report typesetting: the executed demo workbook to a PDF.

Run: ``python -m benchmarks report`` or ``python benchmarks/bench_report.py``.

Set-up (not timed): the demo study is run through the feasibility workbook
into a record without a report (full motion suite, as ``make demo``).

Timed, in one process, on that record's executed workbook:

1. Typst engine (:func:`isolation.output.report.render`, ``engine="typst"``): the
   first render (fonts loaded, cold) and the median of three more; each split
   into preparing the notebook and writing the Typst source
   (:func:`isolation.output.typeset.build_document`) and typesetting it
   (:func:`isolation.output.typeset.compile_pdf`).
2. Reference: the LaTeX engine (``engine="latex"``: nbconvert's LaTeX exporter
   and two XeLaTeX runs) on the same workbook, when XeLaTeX and pandoc are
   installed; else the HTML fallback.

Target (issue 13): typesetting <= 1 s (the warm Typst render). Printed: the
times, the page counts and the ratio of the reference to the Typst render.
"""

from __future__ import annotations

import shutil
import statistics
import subprocess
import sys
import tempfile
import time
import warnings
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

STUDY = ROOT / "examples" / "demo_study.toml"
TARGET_SECONDS = 1.0


def _pages(pdf: Path) -> str:
    if shutil.which("pdfinfo") is None:
        return "?"
    info = subprocess.run(["pdfinfo", str(pdf)], capture_output=True, text=True).stdout
    return next((line.split()[-1] for line in info.splitlines() if line.startswith("Pages:")), "?")


def _typst_split(notebook: Path) -> tuple[float, float]:
    import nbformat

    from isolation.output.typeset import build_document, compile_pdf
    from isolation.output.typeset.exporter import prepare

    started = time.perf_counter()
    nb, fields, paper = prepare(nbformat.read(notebook, as_version=4))
    document = build_document(nb, fields=fields, paper=paper)
    built = time.perf_counter()
    compile_pdf(document)
    return built - started, time.perf_counter() - built


def main() -> None:
    from isolation.app.calc_records import run_record
    from isolation.output import report

    folder = Path(tempfile.mkdtemp(prefix="bench_report_"))
    try:
        outcome = run_record(STUDY, folder, pdf=False)
        if outcome.status != "done":
            print(f"set-up FAILED: {outcome.error}")
            return
        notebook = outcome.path / "feasibility.ipynb"
        print(f"set-up: demo record without report in {outcome.manifest['elapsed_s']:.1f} s")

        started = time.perf_counter()
        pdf = report.render(notebook, folder / "typst", engine="typst")
        cold = time.perf_counter() - started
        warm = []
        for index in range(3):
            started = time.perf_counter()
            report.render(notebook, folder / f"typst{index}", engine="typst")
            warm.append(time.perf_counter() - started)
        typst_time = statistics.median(warm)
        build, compile_ = _typst_split(notebook)
        print(f"typst render: cold {cold:.2f} s, warm median {typst_time:.2f} s of 3 "
              f"(target <= {TARGET_SECONDS:.1f} s: {'met' if typst_time <= TARGET_SECONDS else 'NOT met'}); "
              f"{_pages(pdf)} pages")
        print(f"  of which: notebook to Typst source {build:.2f} s, typesetting {compile_:.2f} s")

        problem = report.engine_problem("latex")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            started = time.perf_counter()
            reference = report.render(notebook, folder / "latex", engine="latex")
            reference_time = time.perf_counter() - started
        name = "LaTeX (XeLaTeX x2)" if problem is None else f"HTML fallback ({problem})"
        pages = _pages(reference) if reference.suffix == ".pdf" else "-"
        print(f"reference {name}: {reference_time:.2f} s, {pages} pages; "
              f"ratio reference / typst: {reference_time / typst_time:.1f}")
    finally:
        shutil.rmtree(folder, ignore_errors=True)


if __name__ == "__main__":
    main()
