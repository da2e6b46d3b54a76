"""Code-clause citations found in text and in the package's own sources.

:func:`citations` reads the clauses a piece of text cites ("ASCE/SEI 7-16 §17.5.4.2",
"EN 1998-1 Eq. 4.6", "Tables 3.2/3.3", "Eqs. 17.5-1 to 17.5-3") and names each by
document, edition and clause, the key of :data:`isolation.codes.clauses.CLAUSES`.
:func:`package_citations` runs it over every string, docstring and comment of the
package and over the feasibility workbook, so a test can ask that each cited clause
has a row in the clause table, and each row says truly where it is used.

Rules of attribution: a clause belongs to the code document named last before it in
the same string or comment ("EN 1998-1 §4.2.5 ... §2.1(3)" are both EN 1998-1). A
citation of a paper or book ("Cornell et al. 2002, Eq. 5") ends that context: its
equation numbers are not code clauses. A clause with no document named before it is
placed by its form: ASCE/SEI 7 numbers equations, tables and figures with a hyphen
(Eq. 12.8-7) and has chapters 11 to 23; EN 1998-1 numbers them with a dot (Eq. 4.6)
and has sections 1 to 10. "ASCE 7" without an edition means the edition the package
follows, 7-16.
"""

from __future__ import annotations

import ast
import io
import json
import re
import tokenize
from pathlib import Path
from typing import Iterable, NamedTuple

__all__ = ["Citation", "citations", "package_citations", "DEFAULT_EDITIONS", "WHOLE_DOCUMENTS"]


class Citation(NamedTuple):
    """One cited clause: document ("ASCE/SEI 7"), edition ("7-16") and clause ("§17.5.4.2")."""

    document: str
    edition: str
    clause: str


DEFAULT_EDITIONS = {
    "ASCE/SEI 7": "7-16",
    "EN 1998-1": "2004",
    "EN 1998-2": "2005",
    "EN 1990": "2002",
    "AASHTO GSID": "4th ed. 2014",
    "FEMA P-58-1": "2012",
    "FEMA P-695": "2009",
    "FEMA loss estimation technical manual": "MR5 2010",
    "NEHRP Provisions": "1997",
}
"""Edition a citation takes when its text names none."""

WHOLE_DOCUMENTS = {"AASHTO GSID": "(no article)"}
"""Documents the package cites for their provisions without article numbers: naming one is a citation."""

_OTHER = "other"  # context of a paper or book: its numbers are not code clauses

_DOCUMENTS = (
    (re.compile(r"ASCE/SEI 7-(\d\d)\b"), lambda m: ("ASCE/SEI 7", f"7-{m[1]}")),
    (re.compile(r"ASCE(?:/SEI)? 7\b(?!-\d)"), lambda m: ("ASCE/SEI 7", "")),
    (re.compile(r"EN ?1998-1\b(?::2004)?"), lambda m: ("EN 1998-1", "")),
    (re.compile(r"EN ?1998-2\b(?::2005)?"), lambda m: ("EN 1998-2", "")),
    (re.compile(r"EN 1990\b"), lambda m: ("EN 1990", "")),
    (re.compile(r"\bEurocode 8\b|\bEC8\b"), lambda m: ("EN 1998-1", "")),
    (re.compile(r"\bAASHTO\b"), lambda m: ("AASHTO GSID", "")),
    (re.compile(r"FEMA P-58\b(?:-1)?"), lambda m: ("FEMA P-58-1", "")),
    (re.compile(r"FEMA P-695\b"), lambda m: ("FEMA P-695", "")),
    (re.compile(r"loss estimation (?:methodology|technical manual)|\bmanual\b|\bMR5\b", re.I),
     lambda m: ("FEMA loss estimation technical manual", "")),
    (re.compile(r"\bNEHRP\b|\bFEMA 303\b"), lambda m: ("NEHRP Provisions", "")),
    # A paper or book: "Cornell et al. 2002", "Naeim & Kelly 1999", "Wen 1976".
    (re.compile(r"\b[A-Z][a-z]+(?: et al\.?| (?:&|and) [A-Z][a-z]+)?,? \(?(?:19|20)\d\d\b"),
     lambda m: (_OTHER, "")),
)

_NUMBER = r"(?:[A-Z]\.)?\d+(?:\.\d+)*(?:-\d+(?![.\d]))?[a-z]?"
_CLAUSE = r"\d+(?:\.\d+)*(?:\(\d+\)[a-z]?)*"
_JOIN = r"\s*(?:,|/|\bto\b|\band\b|-)\s*"
_KINDS = (
    ("§", re.compile(rf"§\s?(?P<items>{_CLAUSE}(?:-\d+\.\d+(?:\.\d+)*)?)")),
    ("Eq.", re.compile(rf"\b(?:Eqs?\.|Equations?)\s*\(?(?P<items>{_NUMBER}\)?"
                       rf"(?:{_JOIN}\(?-?(?:{_NUMBER}|[a-z]\b)\)?)*)")),
    ("Table", re.compile(rf"\bTables?\s+(?P<items>{_NUMBER}(?:{_JOIN}(?:{_NUMBER}|[a-z])\b)*)")),
    ("Fig.", re.compile(rf"\b(?:Figs?\.|Figures?)\s+(?P<items>\d+-\d+(?:{_JOIN}\d+-\d+)*)")),
    ("Chapter", re.compile(r"\b(?:Chapter|Ch\.|Section)\s+(?P<items>\d+)\b(?!\.\d)")),
    ("Annex", re.compile(r"\bAnnex\s+(?P<items>[A-Z])\b")),
    ("Appendix", re.compile(r"\bAppendix\s+(?P<items>[A-Z])\b")),
)


def _items(kind: str, text: str) -> list[str]:
    """The numbers of one citation: "17.5-1, 17.5-2" -> both; "5.9a/b" -> 5.9a, 5.9b; "17.5-3/-4" -> 17.5-3, 17.5-4."""
    if kind == "§":
        first, _, last = text.partition("-")
        # "§17.5.4-17.5.5" is a range of two clauses; "§4.3.3.2.2(3)" is one.
        return [first, last] if last and "." in last else [text]
    out: list[str] = []
    tokens = re.split(r"\s*(,|/|\bto\b|\band\b)\s*|(?<=\d)(-)(?=\d+\.)", text)
    joins = [None] + tokens[1::3]  # separator before each part ("to" or "-" make a range)
    hyphens = [None] + tokens[2::3]
    for part, join, hyphen in zip(tokens[0::3], joins, hyphens, strict=True):
        part = (part or "").strip("() ")
        if not part:
            continue
        if out and re.fullmatch(r"[a-z]", part):  # "5.9a/b"
            part = out[-1][:-1] + part
        elif out and re.fullmatch(r"-\d+", part):  # "17.5-3/-4"
            part = out[-1].rsplit("-", 1)[0] + part
        elif out and (join == "to" or hyphen == "-") and (start := re.fullmatch(r"(.*?)(\d+)", out[-1])):
            head, low = start.groups()  # "12.8-2 to 12.8-6", "3.13-3.16": every number between
            end = re.fullmatch(rf"{re.escape(head)}(\d+)", part)
            if end and int(low) < int(end[1]) <= int(low) + 20:
                out.extend(f"{head}{n}" for n in range(int(low) + 1, int(end[1])))
        out.append(part)
    return out


def _by_form(kind: str, number: str) -> tuple[str, str] | None:
    """Document of a clause cited with no document before it (see the module notes)."""
    head = re.match(r"(?:[A-Z]\.)?(\d+)", number)
    if kind in ("Annex",):
        return ("EN 1998-1", "")
    if head is None:
        return None
    chapter = int(head[1])
    if kind in ("Eq.", "Table", "Fig.") and "-" in number:
        return ("ASCE/SEI 7", "")
    if chapter >= 11:
        return ("ASCE/SEI 7", "")
    return ("EN 1998-1", "")


def _normal(kind: str, number: str, document: str) -> str:
    if kind == "§" and number.isdigit():  # "EN 1998-1 §10" is the whole section
        kind = "Chapter"
    if kind == "§":
        return f"§{number}"
    if kind == "Chapter":
        return f"Section {number}" if document.startswith("EN ") else f"Chapter {number}"
    if kind in ("Annex", "Appendix"):
        return f"{kind} {number}"
    return f"{kind} {number}"


class _Mark(NamedTuple):
    start: int
    end: int
    kind: str  # "doc" or a clause kind of _KINDS
    document: tuple[str, str] | None  # (document, edition or "") of a document name
    items: str  # the numbers of a clause citation


def _source(kind: str, number: str, context: tuple[str, str] | None) -> tuple[str, str] | None:
    """(document, edition or "") a clause number belongs to, or None when it is no code clause."""
    if kind in ("Eq.", "Table") and not re.search(r"[.\-]", number):
        return None  # "Table 3: ..." in a caption, "Eq. 5" of a paper: code numbers have a dot or hyphen
    if kind in ("Eq.", "Table", "Fig.") and re.fullmatch(r"\d+\.\d+-\d+[a-z]?|\d+-\d+", number):
        # Only ASCE/SEI 7 numbers equations, tables and figures with a hyphen.
        return context if context is not None and context[0] == "ASCE/SEI 7" else ("ASCE/SEI 7", "")
    source = context if context is not None else _by_form(kind, number)
    return None if source is None or source[0] == _OTHER else source


def citations(text: str) -> list[Citation]:
    """Every code clause cited in ``text``, in order, each once.

    Parameters
    ----------
    text : str
        Any text: a source string, a docstring, a comment, a report paragraph.

    Returns
    -------
    list of Citation
        (document, edition, clause), e.g. ``("ASCE/SEI 7", "7-16", "§17.5.4.2")``.
    """
    marks: list[_Mark] = []
    for pattern, name in _DOCUMENTS:
        marks += [_Mark(m.start(), m.end(), "doc", name(m), "") for m in pattern.finditer(text)]
    for kind, pattern in _KINDS:
        marks += [_Mark(m.start(), m.end(), kind, None, m["items"]) for m in pattern.finditer(text)]
    marks.sort(key=lambda mark: (mark.start, mark.kind != "doc"))
    found: list[Citation] = []
    context: tuple[str, str] | None = None
    taken = -1  # end of the last document name read; a clause pattern inside it is part of the name
    for mark in marks:
        if mark.start < taken:
            continue
        if mark.document is not None:
            context, taken = mark.document, mark.end
            if context[0] in WHOLE_DOCUMENTS:
                found.append(Citation(context[0], DEFAULT_EDITIONS[context[0]], WHOLE_DOCUMENTS[context[0]]))
            continue
        for number in _items(mark.kind, mark.items):
            source = _source(mark.kind, number, context)
            if source is not None:
                document, edition = source
                found.append(Citation(document, edition or DEFAULT_EDITIONS[document],
                                      _normal(mark.kind, number, document)))
    return list(dict.fromkeys(found))


# --- the package's own sources ---------------------------------------------------------------


def _module_constants(tree: ast.Module) -> dict[str, str]:
    """Module-level ``NAME = "text"`` assignments (to resolve ``f"{ASCE} §17.5"``)."""
    out: dict[str, str] = {}
    for node in tree.body:
        if isinstance(node, ast.Assign) and isinstance(node.value, ast.Constant) and isinstance(node.value.value, str):
            for target in node.targets:
                if isinstance(target, ast.Name):
                    out[target.id] = node.value.value
    return out


def _strings(tree: ast.Module, names: dict[str, str]) -> Iterable[str]:
    parts_of_fstrings = {id(value) for node in ast.walk(tree) if isinstance(node, ast.JoinedStr)
                         for value in node.values}
    for node in ast.walk(tree):
        if isinstance(node, ast.Constant) and isinstance(node.value, str) and id(node) not in parts_of_fstrings:
            yield node.value
        elif isinstance(node, ast.JoinedStr):
            parts = []
            for value in node.values:
                if isinstance(value, ast.Constant):
                    parts.append(str(value.value))
                elif isinstance(value, ast.FormattedValue) and isinstance(value.value, ast.Name):
                    parts.append(names.get(value.value.id, "{}"))
                else:
                    parts.append("{}")
            yield "".join(parts)


def _python_texts(path: Path, names: dict[str, str]) -> Iterable[str]:
    source = path.read_text(encoding="utf-8")
    tree = ast.parse(source)
    local = {**names, **_module_constants(tree)}
    yield from _strings(tree, local)
    for token in tokenize.generate_tokens(io.StringIO(source).readline):
        if token.type == tokenize.COMMENT:
            yield token.string


def _notebook_texts(path: Path) -> Iterable[str]:
    notebook = json.loads(path.read_text(encoding="utf-8"))
    for cell in notebook.get("cells", []):
        yield "".join(cell.get("source", []))


_SKIP = {"isolation/codes/clauses.py", "isolation/codes/clause_rows.py", "isolation/codes/citations.py"}
"""The clause table and this module cite clauses about themselves; they are not users."""


def package_citations(root: str | Path | None = None) -> dict[Citation, set[str]]:
    """Every clause the package cites and the files that cite it.

    Parameters
    ----------
    root : str or Path, optional
        Repository folder holding ``isolation/`` and ``workbooks/``; default: the one
        this package was imported from.

    Returns
    -------
    dict
        Citation -> set of paths relative to ``root`` (``"isolation/codes/asce7.py"``,
        ``"workbooks/feasibility.ipynb"``). Python modules contribute their strings,
        docstrings and comments; workbooks their cells.
    """
    base = Path(root) if root is not None else Path(__file__).resolve().parents[2]
    files = sorted((base / "isolation").rglob("*.py"))
    names: dict[str, str] = {}
    for path in files:  # constants shared between modules (``from ... import ASCE``)
        names.update(_module_constants(ast.parse(path.read_text(encoding="utf-8"))))
    found: dict[Citation, set[str]] = {}
    sources: list[tuple[str, Iterable[str]]] = []
    for path in files:
        rel = path.relative_to(base).as_posix()
        if rel not in _SKIP:
            sources.append((rel, _python_texts(path, names)))
    for path in sorted((base / "workbooks").glob("*.ipynb")):
        sources.append((path.relative_to(base).as_posix(), _notebook_texts(path)))
    for rel, texts in sources:
        for text in texts:
            for cite in citations(text):
                found.setdefault(cite, set()).add(rel)
    return found
