"""Rows of the clause table as tuples (kept importable; the rows live in ``isolation/codes/clauses.toml``).

:data:`ROWS` is built from :data:`isolation.codes.clauses.CLAUSES`, one
(document, edition, clause, subject, status, used_in, note) tuple per clause; for a
re-read clause the note is the published texts read (:attr:`Clause.source`, joined by "; "). A module
that cites a new clause adds its row to the data file, not here.
"""

from __future__ import annotations

from isolation.codes.clauses import CLAUSES

__all__ = ["ROWS"]

ROWS: tuple[tuple[str, str, str, str, str, tuple[str, ...], str], ...] = tuple(
    (c.document, c.edition, c.clause, c.title, c.status, c.used_in,
     "; ".join(c.source) if c.status == "re-read" else c.note) for c in CLAUSES)
"""Every clause row as a tuple, in the data file's order."""
