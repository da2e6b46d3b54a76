"""The clause table for the report: every code clause the package cites (:data:`isolation.codes.clauses.CLAUSES`).

:func:`clause_table` lives in the output layer, above the codes (the numeric core imports nothing
from output).
"""

from __future__ import annotations

from typing import Iterable

from isolation.codes.clauses import _LONG, CLAUSES, Clause, _module_name, _short_name
from isolation.output.tables.table import Table

__all__ = ["clause_table"]


def _status(clause: Clause, number: dict[str, int]) -> str:
    """Status cell: "re-read [2]" (the second text read), "re-read [2, 4]" or "from memory"."""
    if clause.status != "re-read":
        return "from memory"
    return f"re-read [{', '.join(str(number[s]) for s in clause.source)}]"


def clause_table(clauses: Iterable[Clause] | None = None, *, label: str = "tab-clauses"):
    """The clause table as an :class:`isolation.tables.Table` for the report's appendix.

    Parameters
    ----------
    clauses : iterable of Clause, optional
        Rows to show; default: all of :data:`CLAUSES`.
    label : str
        Table label for cross-references. [-]

    Returns
    -------
    isolation.output.tables.Table
        Columns: code, clause, subject, status, used in. The status reads "re-read [n]"
        (n numbers the text read, listed in the notes) or "from memory", so the two stand
        apart down the column; the caption and the notes give how many are each.
    """
    rows = list(CLAUSES if clauses is None else clauses)
    sources = list(dict.fromkeys(s for c in rows if c.status == "re-read" for s in c.source))  # in table order
    number = {source: n for n, source in enumerate(sources, 1)}
    memory = sum(c.status == "from memory" for c in rows)
    counts = f"{len(rows) - memory} re-read, {memory} from memory"
    notes = (f"{len(rows)} clauses: {len(rows) - memory} re-read from a published text for this table (status "
             f"\"re-read [n]\", n the text read, listed below), {memory} from memory (not re-read: check each "
             "against the governing code, its edition and national annex). ")
    if sources:
        notes += "Texts read: " + " | ".join(f"[{number[s]}] {s}" for s in sources) + ". "
    notes += "Used in: package modules (folder/module) and workbooks. " + _LONG
    return Table(
        columns=("Code", "Clause", "Subject", "Status", "Used in"),
        rows=tuple((_short_name(c.document, c.edition), c.clause, c.title, _status(c, number),
                    ", ".join(_module_name(p) for p in c.used_in)) for c in rows),
        caption=f"Code clauses the tool uses ({counts}), whether each was re-read for this table, and where it "
                "uses them",
        align="llplp",
        notes=notes,
        label=label,
    )
