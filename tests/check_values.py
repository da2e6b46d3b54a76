"""Read the check values of tests/data: published tables with their source and status."""

from __future__ import annotations

import csv
from dataclasses import dataclass
from pathlib import Path

DATA = Path(__file__).resolve().parent / "data"
STATUSES = ("re-read", "from memory", "derived", "common practice")


@dataclass(frozen=True)
class CheckTable:
    """One file of tests/data: ``source`` and ``status`` from its comment lines, ``rows`` as dicts of text."""

    source: str
    status: str
    note: str
    rows: tuple[dict[str, str], ...]

    def column(self, name: str) -> list[float]:
        return [float(row[name]) for row in self.rows]


def read(name: str) -> CheckTable:
    """The check values in ``tests/data/<name>``; a file without a source or a known status is refused."""
    meta: dict[str, str] = {}
    lines = []
    for line in (DATA / name).read_text(encoding="utf-8").splitlines():
        if line.startswith("#"):
            key, _, value = line[1:].partition(":")
            meta[key.strip()] = value.strip()
        elif line.strip():
            lines.append(line)
    if not meta.get("source") or meta.get("status") not in STATUSES:
        raise ValueError(f"{name}: needs '# source:' and '# status:' one of {STATUSES}, got {meta}")
    return CheckTable(meta["source"], meta["status"], meta.get("note", ""), tuple(csv.DictReader(lines)))
