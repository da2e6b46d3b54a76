"""The captioned table object, number formatting and the generic builders.

Results as tables that reach every output: notebook, HTML and the PDF report.

nbconvert's LaTeX exporter drops HTML output, so a :class:`Table` offers
``_repr_markdown_`` (notebook, HTML report), ``_repr_latex_`` (LaTeX PDF report: a
numbered, captioned booktabs table, shrunk to the text width when wide, split
over pages when long or holding wrapped text) and, through ``_repr_mimebundle_``,
Typst markup under :data:`TYPST_MIME` (the default PDF report, see
:mod:`isolation.output.typeset`). :mod:`isolation.output.tables.results` turns a study's results
into such tables.

Numbers are formatted for reading (:func:`format_number`); the JSON results
keep full precision.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, field
from typing import Any, Iterable, Mapping, Sequence

import numpy as np

from isolation.output.tables.study_units import _as_mapping, in_study_units
from isolation.output.tables.symbols import escape_latex, latex_text, markdown_cell, typst_text

__all__ = [
    "Table",
    "TYPST_MIME",
    "format_number",
    "escape_latex",
    "key_value_table",
    "checks_table",
    "in_study_units",
]


TYPST_MIME = "text/x-typst"
"""Output type of Typst markup (a table or figure as a complete ``#figure``), read by
:mod:`isolation.output.typeset`."""

_LABEL = re.compile(r"^[A-Za-z][A-Za-z0-9_-]*$")
_TYPST_ALIGN = {"l": "left", "r": "right", "c": "center", "p": "left"}

_LONG_TABLE_ROWS = 28  # beyond this a table may run over a page break
_LONG_WRAPPED_ROWS = 12  # the same for tables whose text wraps (rows of several lines)


def _escape_markdown(text: str) -> str:
    return str(text).replace("\\", "\\\\").replace("|", "\\|").replace("\n", " ")


def _markdown(text: str) -> str:
    """A table's text as markdown: escaped, with symbols (D_TM, T_fb, ...) as math."""
    return markdown_cell(text, _escape_markdown)


def format_number(value: Any, digits: int = 3) -> str:
    """A value as text for a table: numbers to ``digits`` significant figures.

    Parameters
    ----------
    value : any
        Number, bool, text or None. Booleans read "yes"/"no", None and NaN "--".
    digits : int
        Significant figures for floats; numbers of ``digits`` or more whole
        figures are shown whole, rounded to that many (12345 -> "12300"). [-]
    """
    if value is None:
        return "--"
    if isinstance(value, (bool, np.bool_)):
        return "yes" if value else "no"
    if isinstance(value, (int, np.integer)):
        return f"{int(value):d}"
    if isinstance(value, (float, np.floating)):
        number = float(value)
        if math.isnan(number):
            return "--"
        if math.isinf(number):
            return "inf" if number > 0 else "-inf"
        if number == 0.0:
            return "0"
        magnitude = abs(number)
        if magnitude >= 1e9 or magnitude < 10 ** -(digits + 1):
            return f"{number:.{max(digits - 1, 0)}e}"
        # Order of magnitude after rounding to the significant figures, so that 0.99999 reads
        # "1.00" and 99.996 reads "100", not "1.000" and "100.0".
        exponent = int(f"{magnitude:.{max(digits - 1, 0)}e}".split("e")[1])
        if exponent >= digits:  # whole number, rounded to the significant figures
            return f"{int(round(number, digits - 1 - exponent)):d}"
        decimals = max(digits - 1 - exponent, 0)
        return f"{number:.{decimals}f}"
    return str(value)


@dataclass(frozen=True)
class Table:
    """A captioned table of already-chosen values.

    Parameters
    ----------
    columns : sequence of str
        Column headings, units in brackets, e.g. ``"D_M [m]"``.
    rows : sequence of sequences
        Cell values; numbers are formatted with ``digits`` significant figures.
    caption : str
        Caption; the PDF numbers it ("Table 3: ...").
    align : str, optional
        One alignment letter per column: "l", "r", "c", or "p" for a text
        column that wraps (the "p" columns share the width left over);
        default (empty): first column left, the rest right.
    digits : int
        Significant figures of numeric cells. [-]
    notes : str
        Text printed under the table (sources, assumptions).
    label : str
        Name by which report text refers to the table (letters, digits, ``-``
        and ``_``; a letter first): a markdown link ``[](#label)`` becomes
        "Table N" in the Typst report. Empty: no label.

    Notes
    -----
    The LaTeX form needs the packages booktabs, adjustbox, tabularx, longtable,
    xltabular, threeparttable, array and float (the report template loads them all). Tables
    of more than 28 rows, or more than 12 with a "p" column, break across pages.
    Symbols written plainly in any text (``D_TM``, ``T_fb``, ``beta_M``) come out
    as subscripts in both forms (:mod:`isolation.output.tables.symbols`); ``cells`` and
    ``to_dict()`` keep the plain text.
    """

    columns: tuple[str, ...]
    rows: tuple[tuple[Any, ...], ...]
    caption: str = ""
    align: str = ""
    digits: int = 3
    notes: str = ""
    label: str = ""
    _text: tuple[tuple[str, ...], ...] = field(init=False, repr=False, compare=False)

    def __post_init__(self) -> None:
        columns = tuple(str(c) for c in self.columns)
        if not columns:
            raise ValueError("columns = () is not allowed: must name at least one column")
        rows = tuple(tuple(row) for row in self.rows)
        for index, row in enumerate(rows):
            if len(row) != len(columns):
                raise ValueError(
                    f"rows[{index}] has {len(row)} cells, which is not allowed: must have "
                    f"{len(columns)} (one per column)"
                )
        align = self.align or ("l" + "r" * (len(columns) - 1))
        if len(align) != len(columns) or set(align) - set("lrcp"):
            raise ValueError(
                f"align = {self.align!r} is not allowed: must be one of l, r, c, p per column "
                f"({len(columns)} letters)"
            )
        if self.label and not _LABEL.match(str(self.label)):
            raise ValueError(
                f"label = {self.label!r} is not allowed: must be letters, digits, '-' or '_', "
                "beginning with a letter"
            )
        object.__setattr__(self, "columns", columns)
        object.__setattr__(self, "rows", rows)
        object.__setattr__(self, "align", align)
        object.__setattr__(
            self, "_text", tuple(tuple(format_number(v, self.digits) for v in row) for row in rows)
        )

    @property
    def cells(self) -> tuple[tuple[str, ...], ...]:
        """Formatted cell text, row by row."""
        return self._text

    def to_dict(self) -> dict[str, Any]:
        """Plain-JSON form: caption, columns, formatted rows, notes."""
        return {
            "caption": self.caption,
            "columns": list(self.columns),
            "rows": [list(r) for r in self._text],
            "notes": self.notes,
        }

    def _repr_markdown_(self) -> str:
        marks = {"l": ":--", "r": "--:", "c": ":-:", "p": ":--"}
        lines = []
        if self.caption:
            lines += [f"**{_markdown(self.caption)}**", ""]
        lines.append("| " + " | ".join(_markdown(c) for c in self.columns) + " |")
        lines.append("|" + "|".join(marks[a] for a in self.align) + "|")
        lines += ["| " + " | ".join(_markdown(c) for c in row) + " |" for row in self._text]
        if self.notes:
            lines += ["", f"*{_markdown(self.notes)}*"]
        return "\n".join(lines) + "\n"

    def _repr_mimebundle_(self, include=None, exclude=None):
        # IPython adds the markdown and LaTeX forms from the _repr_*_ methods.
        metadata = {TYPST_MIME: {"label": self.label}} if self.label else {}
        return {TYPST_MIME: self._repr_typst_()}, metadata

    def _repr_typst_(self) -> str:
        """Typst markup: a numbered figure of kind table, caption on top, notes under it."""
        widths = ", ".join("1fr" if a == "p" else "auto" for a in self.align)
        aligns = ", ".join(_TYPST_ALIGN[a] for a in self.align)
        head = ", ".join(f"[#strong[{typst_text(c)}]]" for c in self.columns)
        body = "\n".join("    " + ", ".join(f"[{typst_text(c)}]" for c in row) + "," for row in self._text)
        table = "\n".join([
            f"table(columns: ({widths},), align: ({aligns},),",
            "    table.hline(stroke: 0.8pt),",
            f"    table.header({head}, table.hline(stroke: 0.5pt)),",
            body,
            "    table.hline(stroke: 0.8pt),",
            "  )",
        ])
        notes = f"text(size: 8pt)[{typst_text(self.notes)}]" if self.notes else ""
        short = "p" not in self.align and len(self._text) <= _LONG_TABLE_ROWS
        if notes and short:
            # A narrow table: its notes take the table's own width.
            content = ("context {\n  let t = " + table + "\n  let w = measure(t).width\n"
                       "  stack(spacing: 0.5em, t, block(width: calc.max(w, 8cm), align(left, " + notes + ")))\n}")
        elif notes:
            content = "{\n  " + table + "\n  v(0.3em)\n  align(left, " + notes + ")\n}"
        else:
            content = table
        caption = f"[{typst_text(self.caption)}]" if self.caption else "none"
        label = f" <{self.label}>" if self.label else ""
        figure = f"#figure(kind: table, caption: {caption},\n  {content}\n){label}\n"
        if short or len(self._text) <= _LONG_WRAPPED_ROWS:
            return figure  # kept on one page with its caption
        # Many rows: may break across pages (the head repeats on each).
        return "#[\n#show figure: set block(breakable: true)\n" + figure + "]\n"

    def _repr_latex_(self) -> str:
        head = " & ".join(rf"\textbf{{{latex_text(c)}}}" for c in self.columns) + r" \\"
        body = "\n".join(" & ".join(latex_text(c) for c in row) + r" \\" for row in self._text)
        caption = rf"\caption{{{latex_text(self.caption)}}}" if self.caption else ""
        notes = (
            rf"\par\smallskip{{\footnotesize\raggedright {latex_text(self.notes)}\par}}" if self.notes else ""
        )
        wraps = "p" in self.align
        if wraps and len(self._text) <= _LONG_WRAPPED_ROWS:
            # Wrapping text, few rows: kept on one page; X columns take the width left over.
            spec = self.align.replace("p", r">{\raggedright\arraybackslash}X")
            return "\n".join([
                r"\begin{table}[H]",
                r"\centering\small",
                caption,
                rf"\begin{{tabularx}}{{\linewidth}}{{@{{}}{spec}@{{}}}}",
                r"\toprule", head, r"\midrule", body, r"\bottomrule",
                r"\end{tabularx}",
                notes,
                r"\end{table}",
            ])
        if wraps or len(self._text) > _LONG_TABLE_ROWS:
            # Many rows: a table that breaks across pages (xltabular: longtable with tabularx's
            # X columns for wrapping text).
            spec = self.align.replace("p", r">{\raggedright\arraybackslash}X")
            environment = "xltabular" if wraps else "longtable"
            width = r"{\linewidth}" if wraps else ""
            return "\n".join([
                r"{\small",
                rf"\begin{{{environment}}}{width}{{@{{}}{spec}@{{}}}}",
                caption + r"\\" if caption else "",
                r"\toprule", head, r"\midrule", r"\endfirsthead",
                r"\toprule", head, r"\midrule", r"\endhead",
                r"\bottomrule", r"\endlastfoot",
                body,
                rf"\end{{{environment}}}}}",
                notes,
            ])
        # Narrow table: the notes take the table's own width (threeparttable), not the page's.
        opening, closing = ([r"\begin{threeparttable}"],
                            [r"\begin{tablenotes}[flushleft]\footnotesize",
                             rf"\item[] {latex_text(self.notes)}", r"\end{tablenotes}",
                             r"\end{threeparttable}"]) if self.notes else ([], [])
        return "\n".join([
            r"\begin{table}[H]",
            r"\centering\small",
            caption,
            r"\begin{adjustbox}{max width=\linewidth}",
            *opening,
            rf"\begin{{tabular}}{{@{{}}{self.align}@{{}}}}",
            r"\toprule", head, r"\midrule", body, r"\bottomrule",
            r"\end{tabular}",
            *closing,
            r"\end{adjustbox}",
            r"\end{table}",
        ])


def key_value_table(
    values: Mapping[str, Any] | Iterable[tuple[str, Any]],
    caption: str,
    *,
    headings: Sequence[str] = ("Quantity", "Value"),
    digits: int = 3,
    notes: str = "",
) -> Table:
    """A two-column table (name, value) from a mapping or pairs.

    Parameters
    ----------
    values : mapping or iterable of pairs
        Names (units in brackets) and values.
    caption : str
        Table caption.
    """
    pairs = values.items() if isinstance(values, Mapping) else values
    return Table(
        columns=tuple(headings),
        rows=tuple((str(k), v) for k, v in pairs),
        caption=caption,
        align="lr",
        digits=digits,
        notes=notes,
    )


def checks_table(checks: Iterable[Any], caption: str, *, digits: int = 3, system: str = "SI") -> Table:
    """Pass/fail checks (objects or dicts with name, value, limit, passed, unit, source).

    Parameters
    ----------
    checks : iterable
        :class:`isolation.bearings.Check` objects or their ``to_dict()`` forms,
        values and limits in internal units (m, kN, kPa, kN/m).
    caption : str
        Table caption.
    digits : int
        Significant figures of the values and limits. [-]
    system : str
        "SI" or "US": lengths, forces, stiffnesses and stresses are shown in
        this system's units (:func:`in_study_units`); dimensionless checks,
        periods and spectral values as they are.
    """
    rows = []
    for check in checks:
        item = check if isinstance(check, Mapping) else _as_mapping(check)
        unit = item.get("unit") or ""
        value, shown = in_study_units(item.get("value"), unit, system)
        limit, _ = in_study_units(item.get("limit"), unit, system)
        rows.append((
            item.get("name", ""),
            value,
            limit,
            shown if shown else "--",
            "pass" if item.get("passed") else "FAIL",
            item.get("source", "") or "--",
        ))
    return Table(
        columns=("Check", "Value", "Limit", "Unit", "Result", "Source"),
        rows=tuple(rows),
        caption=caption,
        align="prrccp",
        digits=digits,
    )


