"""The clause table for the report: every code clause the package cites (:data:`isolation.codes.clauses.CLAUSES`).

:func:`clause_table` lives in the output layer, above the codes (the numeric core imports nothing
from output); ``isolation.codes.clauses.clause_table`` still answers it.
"""

from __future__ import annotations

from typing import Iterable

from isolation.codes.clauses import _LONG, CLAUSES, Clause, _module_name, _short_name
from isolation.output.tables.table import Table

__all__ = ["clause_table"]


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
        Columns: code, clause, subject, status, used in; the notes list the texts re-read.
    """
    rows = list(CLAUSES if clauses is None else clauses)
    sources = sorted({c.note for c in rows if c.status == "re-read" and c.note})
    memory = sum(c.status == "from memory" for c in rows)
    notes = (f"{len(rows)} clauses; {len(rows) - memory} re-read from a published text for this table, {memory} "
             "from memory (not re-read: check each against the governing code, its edition and national annex). "
             "Texts read: " + " | ".join(sources) + ". Used in: package modules (folder/module) and workbooks. "
             + _LONG
             if sources else f"{len(rows)} clauses, all from memory (not re-read: check each against the "
             "governing code, its edition and national annex). " + _LONG)
    return Table(
        columns=("Code", "Clause", "Subject", "Status", "Used in"),
        rows=tuple((_short_name(c.document, c.edition), c.clause, c.title, c.status,
                    ", ".join(_module_name(p) for p in c.used_in)) for c in rows),
        caption="Code clauses the tool uses, whether each was re-read for this table, and where it uses them",
        align="llplp",
        notes=notes,
        label=label,
    )
