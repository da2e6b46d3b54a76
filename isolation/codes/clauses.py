"""One table of every code clause the package uses, with its status and where it is used.

Each :class:`Clause` names a document (ASCE/SEI 7, EN 1998-1, EN 1998-2, EN 1990, the
AASHTO Guide Specifications for Seismic Isolation Design, FEMA P-58-1, FEMA's earthquake
loss estimation technical manual), its edition, the clause, what it covers as the package
uses it, whether its text was re-read from a published source for this table ("re-read",
``source`` names the texts read) or not ("from memory"), and the files that cite it.
:data:`CLAUSES` holds them all: :func:`load_clauses` reads them from the data file
``isolation/codes/clauses.toml`` (shipped with the package) and checks every field;
:func:`find_clause` looks one up and :func:`isolation.output.tables.clause_table` prints them for the
report (the output layer sits above the codes).

Every citation in the package's strings, docstrings, comments and workbooks has a row
here (``tests/codes/test_clauses.py`` reads them with
:func:`isolation.codes.citations.package_citations`), so a clause cited in new code
without a row, or a row that no longer says where it is used, fails the tests.

Scope: the table records what the feasibility study relies on; it is no substitute for
the code texts. "From memory" clauses were not re-read: a licensed engineer checks every
one against the governing code and its national annex.
"""

from __future__ import annotations

import tomllib
from dataclasses import dataclass
from importlib import resources
from pathlib import Path

from isolation.codes.citations import DEFAULT_EDITIONS, Citation

__all__ = ["Clause", "CLAUSES", "STATUSES", "find_clause", "check_rows", "load_clauses", "DATA_FILE"]

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
        "re-read" (its text, or a publication quoting it unambiguously, was read;
        ``source`` names it) or "from memory".
    used_in : tuple of str
        Files that cite it, relative to the repository (``"isolation/codes/asce7.py"``).
    note : str
        Doubts, what was compared, or what to verify.
    source : str or tuple of str
        For "re-read": the published documents read (title, edition, section or page,
        address), one string each; empty for "from memory". Kept as a tuple.
    """

    document: str
    edition: str
    clause: str
    title: str
    status: str
    used_in: tuple[str, ...]
    note: str = ""
    source: tuple[str, ...] = ()

    def __post_init__(self) -> None:
        if self.status not in STATUSES:
            raise ValueError(f"status = {self.status!r} is not allowed: must be one of {STATUSES}")
        if not self.document or not self.edition or not self.clause:
            raise ValueError(f"document, edition and clause must not be empty: got {self.document!r}, "
                             f"{self.edition!r}, {self.clause!r}")
        source = (self.source,) if isinstance(self.source, str) else tuple(self.source)
        object.__setattr__(self, "source", tuple(s for s in source if s))
        if self.status == "re-read" and not self.source:
            raise ValueError(f"source = '' is not allowed for a re-read clause ({self.document} {self.edition} "
                             f"{self.clause}): name the published document read")
        if self.status == "from memory" and self.source:
            raise ValueError(f"source = {self.source[0]!r} is not allowed for a clause from memory ({self.document} "
                             f"{self.edition} {self.clause}): set status = 're-read' or move the text to note")
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


DATA_FILE = "clauses.toml"
"""Name of the clause rows' data file inside :mod:`isolation.codes` (package data)."""

_Kind = type | tuple[type, ...]
_REQUIRED: dict[str, _Kind] = {"document": str, "edition": str, "clause": str, "title": str, "status": str,
                              "used_in": list}
_OPTIONAL: dict[str, _Kind] = {"note": str, "source": (str, list)}
_ALLOWED: dict[_Kind, str] = {list: "a list of file paths (strings)", str: "a string",
                              (str, list): "a string or a list of strings"}


def _row_name(index: int, row: dict) -> str:
    """"row 3 (ASCE/SEI 7 7-16 §17.5.4.2)" for error messages."""
    parts = [str(row.get(k)) for k in ("document", "edition", "clause") if isinstance(row.get(k), str)]
    return f"row {index}" + (f" ({' '.join(parts)})" if parts else "")


def _clause_from_row(index: int, row: object) -> Clause:
    """One checked :class:`Clause` from a ``[[clause]]`` table of the data file."""
    if not isinstance(row, dict):
        raise ValueError(f"row {index}: must be a table of fields, got {type(row).__name__}")
    name = _row_name(index, row)
    unknown = sorted(set(row) - set(_REQUIRED) - set(_OPTIONAL))
    if unknown:
        raise ValueError(f"{name}: field {unknown[0]!r} is not allowed: fields are "
                         f"{sorted(_REQUIRED) + sorted(_OPTIONAL)}")
    for field, kind in {**_REQUIRED, **_OPTIONAL}.items():
        if field not in row:
            if field in _REQUIRED:
                raise ValueError(f"{name}: field {field!r} is missing (required: {sorted(_REQUIRED)})")
            continue
        value = row[field]
        if not isinstance(value, kind) or (isinstance(value, list) and not all(isinstance(v, str) for v in value)):
            raise ValueError(f"{name}: field {field!r} = {value!r} is not allowed: must be {_ALLOWED[kind]}")
        if field in _REQUIRED and not value:
            raise ValueError(f"{name}: field {field!r} = {value!r} is not allowed: must not be empty")
    if row["document"] not in DEFAULT_EDITIONS:
        raise ValueError(f"{name}: field 'document' = {row['document']!r} is not allowed: must be one of "
                         f"{sorted(DEFAULT_EDITIONS)}")
    try:
        return Clause(row["document"], row["edition"], row["clause"], row["title"], row["status"],
                      tuple(row["used_in"]), row.get("note", ""), row.get("source", ()))
    except ValueError as error:
        raise ValueError(f"{name}: {error}") from None


def load_clauses(path: str | Path | None = None) -> tuple[Clause, ...]:
    """The clause rows of a data file, each checked field by field.

    Parameters
    ----------
    path : str or Path, optional
        TOML file with one ``[[clause]]`` table per clause (fields: document, edition,
        clause, title, status, used_in, and optionally source (a string or a list of
        strings, one per text read) and note); default: the
        package's own ``isolation/codes/clauses.toml``.

    Returns
    -------
    tuple of Clause
        In the file's order.

    Raises
    ------
    ValueError
        The file is not TOML, has no ``[[clause]]`` tables or other top-level keys, or a
        row has a missing, unknown, empty or mistyped field, an unknown document or
        status, a re-read row without its source, or repeats another row's clause; the
        message names the row (its number and clause) and the field.
    """
    if path is None:
        text = resources.files("isolation.codes").joinpath(DATA_FILE).read_text(encoding="utf-8")
        label = f"isolation/codes/{DATA_FILE}"
    else:
        text, label = Path(path).read_text(encoding="utf-8"), str(path)
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as error:
        raise ValueError(f"{label}: not valid TOML ({error})") from None
    extra = sorted(set(data) - {"clause"})
    if extra or not isinstance(data.get("clause"), list) or not data["clause"]:
        raise ValueError(f"{label}: must hold [[clause]] tables only, got top-level keys {sorted(data)}")
    clauses: list[Clause] = []
    seen: dict[Citation, int] = {}
    for index, row in enumerate(data["clause"], 1):
        try:
            clause = _clause_from_row(index, row)
        except ValueError as error:
            raise ValueError(f"{label} {error}") from None
        if clause.key in seen:
            raise ValueError(f"{label} row {index} ({clause.reference}): repeats row {seen[clause.key]}; "
                             "each (document, edition, clause) has one row")
        seen[clause.key] = index
        clauses.append(clause)
    return tuple(clauses)


CLAUSES: tuple[Clause, ...] = load_clauses()
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
        A ``[[clause]]`` skeleton for each cited clause without a row, and the ``used_in`` each
        row should have where it differs; empty when the table is complete and true.
    """
    from isolation.codes.citations import package_citations

    cited = package_citations(root)
    out = []
    for key in sorted(k for k in cited if k not in _BY_KEY):
        paths = ", ".join(f'"{p}"' for p in sorted(cited[key]))
        out.append(f'missing row (add to isolation/codes/{DATA_FILE}):\n[[clause]]\ndocument = "{key.document}"\n'
                   f'edition = "{key.edition}"\nclause = "{key.clause}"\ntitle = "<subject>"\n'
                   f'status = "from memory"\nused_in = [{paths}]\n')
    for clause in CLAUSES:
        used = tuple(sorted(cited.get(clause.key, ())))
        if used != tuple(sorted(clause.used_in)):
            gone = "" if used else " (no longer cited: remove the row)"
            out.append(f"used_in of {clause.reference}: {used!r}{gone}")
    return out


if __name__ == "__main__":  # python -m isolation.codes.clauses: what to change in clauses.toml
    problems = check_rows()
    print("\n".join(problems) if problems else f"clause table complete: {len(CLAUSES)} rows")
    raise SystemExit(1 if problems else 0)

