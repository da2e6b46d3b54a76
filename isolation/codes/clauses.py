"""One table of every code clause the package uses, with its status and where it is used.

Each :class:`Clause` names a document (ASCE/SEI 7, EN 1998-1, EN 1998-2, EN 1990, the
AASHTO Guide Specifications for Seismic Isolation Design, FEMA P-58-1, FEMA's earthquake
loss estimation technical manual), its edition, the clause, what it covers as the package
uses it, whether its text was re-read from a published source for this table ("re-read",
the note names the source) or not ("from memory"), and the files that cite it.
:data:`CLAUSES` holds them all (rows in :mod:`isolation.codes.clause_rows`);
:func:`find_clause` looks one up and :func:`isolation.output.tables.clause_table` prints them for the
report (the output layer sits above the codes; ``clause_table`` is still answered here).

Every citation in the package's strings, docstrings, comments and workbooks has a row
here (``tests/codes/test_clauses.py`` reads them with
:func:`isolation.codes.citations.package_citations`), so a clause cited in new code
without a row, or a row that no longer says where it is used, fails the tests.

Scope: the table records what the feasibility study relies on; it is no substitute for
the code texts. "From memory" clauses were not re-read: a licensed engineer checks every
one against the governing code and its national annex.
"""

from __future__ import annotations

from dataclasses import dataclass

from isolation.codes.citations import DEFAULT_EDITIONS, Citation
from isolation.codes.clause_rows import ROWS

__all__ = ["Clause", "CLAUSES", "STATUSES", "find_clause", "check_rows"]

STATUSES = ("re-read", "from memory")
"""Allowed :attr:`Clause.status` values."""


@dataclass(frozen=True)
class Clause:
    """One clause of a code or guideline that the package uses.

    Parameters
    ----------
    document : str
        "ASCE/SEI 7", "EN 1998-1", "EN 1998-2", "EN 1990", "AASHTO GSID", "FEMA P-58-1"
        or "FEMA loss estimation technical manual".
    edition : str
        "7-16", "7-22", "2004", ... (ASCE/SEI 7 by its edition number, others by year).
    clause : str
        "§17.5.4.2", "Eq. 17.5-1", "Table 12.8-2", "Section 10", "Annex A", ...
    title : str
        What the clause covers, as the package uses it.
    status : str
        "re-read" (its text, or a publication quoting it, was read; ``note`` names the
        source) or "from memory".
    used_in : tuple of str
        Files that cite it, relative to the repository (``"isolation/codes/asce7.py"``).
    note : str
        Source read, doubts, or what to verify.
    """

    document: str
    edition: str
    clause: str
    title: str
    status: str
    used_in: tuple[str, ...]
    note: str = ""

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ValueError(f"status = {self.status!r} is not allowed: must be one of {STATUSES}")
        if not self.document or not self.edition or not self.clause:
            raise ValueError(f"document, edition and clause must not be empty: got {self.document!r}, "
                             f"{self.edition!r}, {self.clause!r}")
        object.__setattr__(self, "used_in", tuple(self.used_in))

    @property
    def key(self) -> Citation:
        """(document, edition, clause), the form :func:`isolation.codes.citations.citations` returns."""
        return Citation(self.document, self.edition, self.clause)

    @property
    def reference(self) -> str:
        """The clause as a report cites it, e.g. "ASCE/SEI 7-16 §17.5.4.2"."""
        return f"{_document_name(self.document, self.edition)} {self.clause}"


def _document_name(document: str, edition: str) -> str:
    if document == "ASCE/SEI 7":
        return f"ASCE/SEI {edition}"
    if document.startswith("EN "):
        return f"{document}:{edition}"
    return f"{document} ({edition})"


_SHORT = {"ASCE/SEI 7": "ASCE {}", "AASHTO GSID": "AASHTO", "FEMA loss estimation technical manual": "FEMA MR5"}
_LONG = ("ASCE = ASCE/SEI 7, Minimum Design Loads and Associated Criteria for Buildings and Other Structures; "
         "EN 1998-1:2004 and EN 1998-2:2005, Eurocode 8 parts 1 (buildings) and 2 (bridges); EN 1990:2002, basis "
         "of structural design; AASHTO = Guide Specifications for Seismic Isolation Design, 4th ed. 2014; FEMA "
         "P-58-1 (2012), seismic performance assessment of buildings; FEMA MR5 = FEMA multi-hazard loss "
         "estimation methodology, earthquake model technical manual, MR5 (2010).")


def _short_name(document: str, edition: str) -> str:
    """Short code name for the table's first column ("ASCE 7-16", "EN 1998-1", "FEMA MR5")."""
    return _SHORT[document].format(edition) if document in _SHORT else document


CLAUSES: tuple[Clause, ...] = tuple(Clause(*row) for row in ROWS)
"""Every clause the package cites (see the module notes)."""

_BY_KEY = {c.key: c for c in CLAUSES}


def find_clause(document: str, clause: str, edition: str | None = None) -> Clause:
    """The row of one clause.

    Parameters
    ----------
    document : str
        Document as in :attr:`Clause.document`, e.g. "ASCE/SEI 7" or "EN 1998-1".
    clause : str
        Clause as in :attr:`Clause.clause`, e.g. "§17.5.4.2" or "Table 12.8-2".
    edition : str, optional
        Edition; default: the edition the package follows ("7-16" for ASCE/SEI 7,
        2004 for EN 1998-1, ...).

    Returns
    -------
    Clause

    Raises
    ------
    KeyError
        No such row; the message lists the clauses known for that document.
    """
    if document not in DEFAULT_EDITIONS:
        raise KeyError(f"document = {document!r} is not in the clause table: known {sorted(DEFAULT_EDITIONS)}")
    key = Citation(document, edition or DEFAULT_EDITIONS[document], clause)
    try:
        return _BY_KEY[key]
    except KeyError:
        known = sorted(f"{c.edition} {c.clause}" for c in CLAUSES if c.document == document)
        raise KeyError(f"clause = {clause!r} of {document} {key.edition} is not in the clause table: "
                       f"known {known}") from None


def _module_name(path: str) -> str:
    """"isolation/codes/asce7.py" -> "codes/asce7"; workbooks keep their file name."""
    if path.startswith("isolation/"):
        path = path[len("isolation/"):]
    return path[:-3] if path.endswith(".py") else path


def check_rows(root=None) -> list[str]:
    """What the clause rows miss against the package's citations, as lines to act on.

    Parameters
    ----------
    root : str or Path, optional
        Repository folder (default: the one this package was imported from).

    Returns
    -------
    list of str
        A row skeleton for each cited clause without a row, and the ``used_in`` each
        row should have where it differs; empty when the table is complete and true.
    """
    from isolation.codes.citations import package_citations

    cited = package_citations(root)
    out = []
    for key in sorted(k for k in cited if k not in _BY_KEY):
        out.append(f"missing row: ({key.document!r}, {key.edition!r}, {key.clause!r}, '<subject>', 'from memory', "
                   f"{tuple(sorted(cited[key]))!r}, ''),")
    for clause in CLAUSES:
        used = tuple(sorted(cited.get(clause.key, ())))
        if used != tuple(sorted(clause.used_in)):
            gone = "" if used else " (no longer cited: remove the row)"
            out.append(f"used_in of {clause.reference}: {used!r}{gone}")
    return out


def __getattr__(name: str):
    """``clause_table`` moved to :mod:`isolation.output.tables.clauses` (the table layer sits above the
    codes); the name is still answered here, loaded only when asked for."""
    if name == "clause_table":
        from isolation.output.tables.clauses import clause_table

        return clause_table
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")


if __name__ == "__main__":  # python -m isolation.codes.clauses: what to change in clause_rows.py
    problems = check_rows()
    print("\n".join(problems) if problems else f"clause table complete: {len(CLAUSES)} rows")
    raise SystemExit(1 if problems else 0)

