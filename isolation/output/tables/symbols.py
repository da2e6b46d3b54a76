"""Engineering symbols written plainly in results text, typeset as symbols in reports.

The package writes symbols the way they read in code and JSON: ``D_TM``,
``T_fb``, ``S_M1``, ``beta_M``, ``V_s,min,wind``, ``T^2``. This module is the
one place that turns them into subscripts and superscripts:

* :func:`latex_text` - plain text to LaTeX: special characters escaped, each
  symbol as inline math, e.g. ``D_TM`` -> ``\\(D_{\\mathrm{TM}}\\)``;
* :func:`markdown_text` - markdown to markdown with each symbol as ``$...$``
  math (the notebook and the HTML report render it with MathJax, pandoc turns
  it into LaTeX math for the PDF); text already inside ``$...$`` or backticks
  is left alone;
* :func:`markdown_cell` - plain text to a markdown table cell (escaped, with
  math symbols);
* :func:`typst_text` - plain text to Typst markup: special characters escaped,
  each symbol as Typst math, e.g. ``D_TM`` -> ``$D_"TM"$``.

What counts as a symbol: one Latin or Greek letter (``beta``, ``mu``, ``xi``
... spelled out or as the glyph, or ``MCE``) followed by ``_`` and a subscript of
up to five letters or digits, optionally more comma-separated parts
(``V_s,min,fixed``); or one Latin letter with ``^`` and a one- or two-digit or
one-letter power (``T^2``, ``h^x``). Words with longer stems (``lead_rubber``)
are not symbols. Descriptive subscripts are set upright (``D_TM``: TM is a
label), single-letter index subscripts ``i``, ``j``, ``n``, ``x`` in italic
(ISO 80000-2 convention, from memory).
"""

from __future__ import annotations

import re
from typing import Callable

__all__ = ["escape_latex", "latex_symbol", "latex_text", "markdown_text", "markdown_cell", "typst_symbol", "typst_text",
           "escape_typst", "SYMBOL_PATTERN"]

_GREEK = {
    "alpha": r"\alpha", "beta": r"\beta", "gamma": r"\gamma", "delta": r"\delta", "eta": r"\eta",
    "theta": r"\theta", "mu": r"\mu", "xi": r"\xi", "zeta": r"\zeta", "rho": r"\rho",
    "α": r"\alpha", "β": r"\beta", "γ": r"\gamma", "δ": r"\delta", "η": r"\eta", "θ": r"\theta",
    "μ": r"\mu", "ξ": r"\xi", "ζ": r"\zeta", "ρ": r"\rho", "Δ": r"\Delta",
}
_WORD_BASES = {"MCE": r"\mathrm{MCE}"}
_TYPST_GREEK = {
    "alpha": "alpha", "beta": "beta", "gamma": "gamma", "delta": "delta", "eta": "eta", "theta": "theta",
    "mu": "mu", "xi": "xi", "zeta": "zeta", "rho": "rho", "α": "alpha", "β": "beta", "γ": "gamma",
    "δ": "delta", "η": "eta", "θ": "theta", "μ": "mu", "ξ": "xi", "ζ": "zeta", "ρ": "rho", "Δ": "Delta",
}
_TYPST_WORD_BASES = {"MCE": '"MCE"'}
# Characters with a meaning in Typst markup; a backslash before each sets it as text.
_TYPST_SPECIALS = set("\\#*_`$<>@[]~/=+-")
_TYPST_NUMBERED = re.compile(r"^(\s*\d+)\.(?=\s|$)")  # "1." at the start of a line would begin a numbered list
_INDEX_SUBSCRIPTS = {"i", "j", "n", "x"}

_BASES = "|".join(sorted(list(_WORD_BASES) + [k for k in _GREEK if len(k) > 1], key=len, reverse=True))
SYMBOL_PATTERN = re.compile(
    rf"(?<![\w\\$])(?P<base>{_BASES}|[A-Za-zαβγδηθμξζρΔ])_(?P<sub>[A-Za-z0-9]{{1,5}}(?:,[A-Za-z0-9]+)*)(?![\w])"
    r"|(?<![\w\\$])(?P<pbase>[A-Za-z])\^(?P<power>\d{1,2}|[a-z])(?![\w])"
)
"""Regular expression of a plainly written symbol (see the module notes)."""

_MARKDOWN_KEEP = re.compile(r"(\$[^$\n]+\$|`[^`\n]*`)")


def latex_symbol(match: re.Match) -> str:
    """Math-mode LaTeX (without delimiters) of one :data:`SYMBOL_PATTERN` match."""
    if match.group("pbase"):
        return f"{match.group('pbase')}^{{{match.group('power')}}}"
    base = match.group("base")
    base = _GREEK.get(base) or _WORD_BASES.get(base) or base
    sub = match.group("sub")
    sub = sub if sub in _INDEX_SUBSCRIPTS else rf"\mathrm{{{sub}}}"
    return f"{base}_{{{sub}}}"


def _convert(text: str, plain: Callable[[str], str], symbol: Callable[[str], str]) -> str:
    parts, position = [], 0
    for match in SYMBOL_PATTERN.finditer(text):
        parts += [plain(text[position:match.start()]), symbol(latex_symbol(match))]
        position = match.end()
    parts.append(plain(text[position:]))
    return "".join(parts)


_LATEX_SPECIALS = {
    "\\": r"\textbackslash{}",
    "&": r"\&",
    "%": r"\%",
    "$": r"\$",
    "#": r"\#",
    "_": r"\_",
    "{": r"\{",
    "}": r"\}",
    "~": r"\textasciitilde{}",
    "^": r"\textasciicircum{}",
    "\u00a0": "~",  # no-break space: LaTeX's tie
}


def escape_latex(text: str) -> str:
    """Text with LaTeX's special characters escaped (a no-break space becomes a tie ``~``)."""
    return "".join(_LATEX_SPECIALS.get(ch, ch) for ch in str(text))


def latex_text(text: object) -> str:
    """Plain text as LaTeX: special characters escaped, symbols as inline math.

    Parameters
    ----------
    text : object
        Text (anything else is converted with ``str``).
    """
    return _convert(str(text), escape_latex, lambda math: rf"\({math}\)")


def markdown_text(text: object) -> str:
    """Markdown with every plainly written symbol as ``$...$`` math; the rest unchanged.

    Parameters
    ----------
    text : object
        Markdown text. Spans already in ``$...$`` or in backticks are kept as they are.
    """
    pieces = _MARKDOWN_KEEP.split(str(text))
    return "".join(piece if index % 2 else _convert(piece, str, lambda math: f"${math}$")
                   for index, piece in enumerate(pieces))


def markdown_cell(text: object, escape: Callable[[str], str]) -> str:
    """Plain text as markdown: ``escape`` applied to the text around the symbols, symbols as math."""
    return _convert(str(text), escape, lambda math: f"${math}$")


def escape_typst(text: object) -> str:
    """Text as Typst markup that prints it as it is (markup characters escaped).

    Line breaks become spaces; a no-break space stays one.

    Parameters
    ----------
    text : object
        Text (anything else is converted with ``str``).
    """
    out = []
    for ch in str(text):
        if ch in _TYPST_SPECIALS:
            out.append("\\" + ch)
        elif ch in "\r\n":
            out.append(" ")
        else:
            out.append(ch)
    return _TYPST_NUMBERED.sub(r"\1\\.", "".join(out))


def typst_symbol(match: re.Match) -> str:
    """Typst math (without ``$``) of one :data:`SYMBOL_PATTERN` match, e.g. ``D_"TM"``."""
    if match.group("pbase"):
        return f"{match.group('pbase')}^{match.group('power')}"
    base = match.group("base")
    base = _TYPST_GREEK.get(base) or _TYPST_WORD_BASES.get(base) or base
    sub = match.group("sub")
    sub = sub if sub in _INDEX_SUBSCRIPTS else f'"{sub}"'
    return f"{base}_{sub}"


def typst_text(text: object) -> str:
    """Plain text as Typst markup: markup characters escaped, symbols as Typst math.

    Parameters
    ----------
    text : object
        Text (anything else is converted with ``str``).
    """
    parts, position, text = [], 0, str(text)
    for match in SYMBOL_PATTERN.finditer(text):
        parts += [escape_typst(text[position:match.start()]), f"${typst_symbol(match)}$"]
        position = match.end()
    parts.append(escape_typst(text[position:]))
    return "".join(parts)
