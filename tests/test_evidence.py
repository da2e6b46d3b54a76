"""Evidence inside the repository: tests and package name their published sources directly.

A check's source is a document, table or equation with its edition, or "common practice" /
"from memory", written beside it; never a note or file outside the repository, which a reader
of the repository cannot open.
"""

import re
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
OUTSIDE = re.compile(r"\.\./shared|shared/reference|shared reference|isolation-formulas\.md|motions-and-dynamics\.md"
                     r"|models-for-the-next-step\.md|/work/")


def test_no_source_points_outside_the_repository():
    offenders = []
    for folder in ("isolation", "tests", "benchmarks", "workbooks", "examples"):
        for path in sorted((ROOT / folder).rglob("*")):
            if path.suffix not in (".py", ".ipynb", ".toml", ".md") or path == Path(__file__).resolve():
                continue
            for number, line in enumerate(path.read_text(encoding="utf-8").splitlines(), 1):
                if OUTSIDE.search(line):
                    offenders.append(f"{path.relative_to(ROOT)}:{number}: {line.strip()}")
    assert not offenders, "name the published source instead:\n" + "\n".join(offenders)
