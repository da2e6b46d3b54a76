"""Markdown and TeX math to Typst markup.

Markdown is parsed by mistune (the parser nbconvert itself uses) into its
syntax tree, which is written out as Typst: headings, paragraphs, emphasis,
lists, block quotes, code, links, tables and math. Raw HTML is dropped, as the
LaTeX report drops it.

Math comes in TeX notation (``$D_{\\mathrm{TM}}$``, as notebooks write it and
:mod:`isolation.output.tables.symbols` produces it) and is translated to Typst math
by :func:`tex_math`: the common commands (Greek letters, ``\\mathrm``,
``\\text``, ``\\frac``, ``\\sqrt``, relations, operators, spacing) map to their
Typst names; an unknown command is printed by name, never dropped.

Cross-references: a markdown link to ``#label`` whose label belongs to a
numbered figure or table becomes a Typst reference (``[](#fig-spectrum)`` ->
"Figure 2"; ``[the spectrum](#fig-spectrum)`` a link with that text). Inline
calls end with ``;`` so that text after them is never read as code.
"""

from __future__ import annotations

import re
from functools import lru_cache
from typing import Iterable, Sequence

from isolation.output.tables.symbols import escape_typst

__all__ = ["markdown_to_typst", "tex_math", "typst_string", "LABEL_PATTERN"]

LABEL_PATTERN = re.compile(r"^[A-Za-z][A-Za-z0-9_:.-]*$")
"""What a figure or table label may be (letters, digits, ``-_:.``; a letter first)."""

_ALIGN = {"left": "left", "right": "right", "center": "center", None: "left"}


def typst_string(text: object) -> str:
    """A Typst string literal (``"..."``) holding ``text``."""
    body = str(text).replace("\\", "\\\\").replace('"', '\\"')
    body = body.replace("\n", "\\n").replace("\r", "\\r").replace("\t", "\\t")
    return f'"{body}"'


# --------------------------------------------------------------------------
# TeX math -> Typst math
# --------------------------------------------------------------------------
_TEX_SYMBOLS = {
    # Greek
    **{name: name for name in (
        "alpha", "beta", "gamma", "delta", "epsilon", "zeta", "eta", "theta", "iota", "kappa", "lambda",
        "mu", "nu", "xi", "pi", "rho", "sigma", "tau", "upsilon", "phi", "chi", "psi", "omega",
        "Gamma", "Delta", "Theta", "Lambda", "Xi", "Pi", "Sigma", "Upsilon", "Phi", "Psi", "Omega")},
    "varepsilon": "epsilon.alt", "vartheta": "theta.alt", "varphi": "phi.alt", "varrho": "rho.alt",
    "varsigma": "sigma.alt",
    # relations and operators
    "le": "<=", "leq": "<=", "ge": ">=", "geq": ">=", "ne": "!=", "neq": "!=", "approx": "approx",
    "sim": "tilde.op", "equiv": "equiv", "propto": "prop", "lt": "<", "gt": ">", "ll": "<<", "gg": ">>",
    "times": "times", "cdot": "dot.op", "pm": "plus.minus", "mp": "minus.plus", "div": "div",
    "to": "->", "rightarrow": "->", "leftarrow": "<-", "Rightarrow": "=>", "leftrightarrow": "<->",
    "infty": "infinity", "partial": "diff", "nabla": "nabla", "degree": "degree", "circ": "compose",
    "sum": "sum", "prod": "product", "int": "integral", "ldots": "...", "cdots": "dots.c", "dots": "...",
    "checkmark": "checkmark", "prime": "prime", "deg": '"deg"', "%": "%", "$": "\\$", "#": "\\#",
    "&": "&", "_": "\\_", "{": "{", "}": "}", "|": "||", "backslash": "backslash",
    # spacing
    ",": "thin", ":": "med", ";": "thick", "!": "", " ": "space", "quad": "quad", "qquad": "wide",
    # operator names
    **{name: f'op("{name}")' for name in (
        "max", "min", "log", "ln", "exp", "sin", "cos", "tan", "sinh", "cosh", "tanh", "arctan", "sup",
        "inf", "lim", "det", "arg", "sgn")},
}
_TEX_FONTS = {"mathrm": "upright", "mathbf": "bold", "mathit": "italic", "mathsf": "sans",
              "mathcal": "cal", "boldsymbol": "bold", "operatorname": "op"}
_TEX_TEXT = {"text", "textrm", "mbox", "textup", "textnormal"}
_TEX_IGNORED = {"left", "right", "big", "Big", "bigg", "Bigg", "displaystyle", "textstyle", "limits",
                "nolimits"}
_TOKEN = re.compile(r"\\([A-Za-z]+|.)|([A-Za-z])|(\d+(?:\.\d+)?)|(\s+)|(.)", re.S)
# Characters Typst math reads specially; written as escaped text.
_MATH_ESCAPE = {"/": "slash", '"': '\\"', "#": "\\#", "$": "\\$", "@": "\\@", "\\": "backslash",
                "_": "\\_", "^": "\\^", "~": "tilde.op", "`": "\\`"}


class _TexReader:
    def __init__(self, tex: str):
        self.tokens = [(m.group(1), m.group(2), m.group(3), m.group(4), m.group(5))
                       for m in _TOKEN.finditer(tex)]
        self.position = 0
        self.unknown: list[str] = []

    def peek(self):
        return self.tokens[self.position] if self.position < len(self.tokens) else None

    def take(self):
        token = self.peek()
        self.position += 1
        return token

    def skip_space(self) -> None:
        while (token := self.peek()) is not None and token[3] is not None:
            self.position += 1

    def group_text(self) -> str:
        """Raw text of the next {...} group (or single token), for \\text and \\mathrm."""
        self.skip_space()
        token = self.take()
        if token is None:
            return ""
        if token[4] != "{":
            return _raw(token)
        depth, parts = 1, []
        while (token := self.take()) is not None:
            if token[4] == "{":
                depth += 1
            elif token[4] == "}":
                depth -= 1
                if depth == 0:
                    break
            parts.append(_raw(token))
        return "".join(parts)

    def atom(self) -> str | None:
        """One atom as Typst math: a group, a command with its arguments, or a character."""
        self.skip_space()
        token = self.take()
        if token is None:
            return None
        command, letter, number, _space, other = token
        if letter:
            return letter
        if number:
            return number
        if other is not None:
            if other == "{":
                return self.sequence(until="}")
            if other == "}":
                return ""
            return _MATH_ESCAPE.get(other, other)
        return self.command(command)

    def command(self, name: str) -> str:
        if name in _TEX_IGNORED:
            return ""
        if name in _TEX_TEXT:
            return typst_string(self.group_text())
        if name in _TEX_FONTS:
            text = self.group_text()
            if name in ("mathrm", "operatorname") and re.fullmatch(r"[A-Za-z0-9 ,.\-]+", text):
                return typst_string(text) if name == "mathrm" else f"op({typst_string(text)})"
            inner = tex_math(text)
            return f"{_TEX_FONTS[name]}({inner})"
        if name in ("frac", "dfrac", "tfrac"):
            top, bottom = self.argument(), self.argument()
            return f"frac({top}, {bottom})"
        if name == "sqrt":
            return f"sqrt({self.argument()})"
        if name in ("hat", "bar", "tilde", "dot", "vec", "overline"):
            accent = {"overline": "overline"}.get(name)
            inner = self.argument()
            return f"overline({inner})" if accent else f"{name}({inner})"
        if name in _TEX_SYMBOLS:
            return _TEX_SYMBOLS[name]
        self.unknown.append(name)
        return typst_string("\\" + name)

    def argument(self) -> str:
        """The next atom or {...} group, as the inside of a Typst argument."""
        self.skip_space()
        token = self.peek()
        if token is not None and token[4] == "{":
            self.position += 1
            return self.sequence(until="}")
        return self.atom() or ""

    def sequence(self, until: str | None = None) -> str:
        parts: list[str] = []
        while True:
            self.skip_space()
            token = self.peek()
            if token is None:
                break
            if until is not None and token[4] == until:
                self.position += 1
                break
            if token[4] in ("_", "^"):
                self.position += 1
                argument = self.argument()
                base = parts.pop() if parts else '""'
                parts.append(f"{base}{token[4]}({argument})")
                continue
            atom = self.atom()
            if atom:
                parts.append(atom)
        return " ".join(parts)


def _raw(token) -> str:
    command, letter, number, space, other = token
    if command is not None:
        return command if not command.isalpha() else "\\" + command
    return letter or number or space or other or ""


@lru_cache(maxsize=4096)
def tex_math(tex: str) -> str:
    """TeX math (without delimiters) as Typst math (without ``$``).

    Parameters
    ----------
    tex : str
        E.g. ``D_{\\mathrm{TM}} \\le 0.5``.

    Returns
    -------
    str
        E.g. ``D_("TM") <= 0.5``. Unknown commands are printed by name as text.
    """
    return _TexReader(tex).sequence()


# --------------------------------------------------------------------------
# Markdown -> Typst markup
# --------------------------------------------------------------------------
@lru_cache(maxsize=1)
def _parser():
    import mistune

    return mistune.create_markdown(renderer=None, plugins=["table", "math", "strikethrough"])


class _Writer:
    def __init__(self, labels: Iterable[str], heading_offset: int):
        self.labels = set(labels)
        self.heading_offset = heading_offset
        self.dropped_references: list[str] = []

    # blocks -----------------------------------------------------------------
    def blocks(self, tokens: list[dict]) -> str:
        parts = [self.block(token) for token in tokens]
        return "\n\n".join(part for part in parts if part.strip())

    def block(self, token: dict) -> str:
        kind = token["type"]
        if kind in ("paragraph", "block_text"):
            return self.inlines(token.get("children", []))
        if kind == "heading":
            level = min(max(token["attrs"]["level"] + self.heading_offset, 1), 6)
            return "=" * level + " " + self.inlines(token.get("children", []))
        if kind == "list":
            return self.list(token)
        if kind == "block_quote":
            return "#quote(block: true)[\n" + self.blocks(token.get("children", [])) + "\n]"
        if kind == "block_code":
            return f"#raw(block: true, {typst_string(token.get('raw', '').rstrip())})"
        if kind == "block_math":
            return "$ " + tex_math(token.get("raw", "")) + " $"
        if kind == "thematic_break":
            return "#line(length: 100%, stroke: 0.4pt)"
        if kind == "table":
            return self.table(token)
        return ""  # blank lines, raw HTML

    def list(self, token: dict) -> str:
        ordered = token.get("attrs", {}).get("ordered", False)
        start = token.get("attrs", {}).get("start", 1) or 1
        items = []
        for item in token.get("children", []):
            body = self.blocks(item.get("children", []))
            body = body.replace("\n", "\n  ")
            items.append(("+ " if ordered else "- ") + body)
        joined = "\n".join(items) if token.get("tight", True) else "\n\n".join(items)
        if ordered and start != 1:
            return f"#set enum(start: {int(start)})\n" + joined
        return joined

    def table(self, token: dict) -> str:
        head: list[str] = []
        rows: list[list[str]] = []
        aligns: list[str] = []
        for part in token.get("children", []):
            if part["type"] == "table_head":
                head = [self.cell(cell) for cell in part.get("children", [])]
                aligns = [_ALIGN.get(cell.get("attrs", {}).get("align"), "left") for cell in part.get("children", [])]
            elif part["type"] == "table_body":
                for row in part.get("children", []):
                    rows.append([self.cell(cell) for cell in row.get("children", [])])
        count = max([len(head)] + [len(r) for r in rows]) if (head or rows) else 0
        if count == 0:
            return ""
        aligns = (aligns + ["left"] * count)[:count]
        lines = [f"#table(columns: {count}, align: ({', '.join(aligns)},),"]
        if head:
            lines.append("  table.header(" + ", ".join(f"[*{c}*]" for c in _pad(head, count)) + "),")
            lines.append("  table.hline(stroke: 0.5pt),")
        for row in rows:
            lines.append("  " + ", ".join(f"[{c}]" for c in _pad(row, count)) + ",")
        lines.append(")")
        return "\n".join(lines)

    def cell(self, cell: dict) -> str:
        # A line may break after an underscore (U+200B, a break opportunity of zero width: Unicode UAX #14,
        # class ZW), so identifiers such as "radius=2.5_friction=0.04" wrap in a narrow column instead of
        # running into the next one.
        return self.inlines(cell.get("children", [])).replace("\\_", "\\_\u200b")

    # inlines ----------------------------------------------------------------
    def inlines(self, tokens: Sequence[dict]) -> str:
        return "".join(self.inline(token) for token in tokens)

    def inline(self, token: dict) -> str:
        kind = token["type"]
        if kind == "text":
            return escape_typst(token.get("raw", ""))
        if kind == "strong":
            return "#strong[" + self.inlines(token.get("children", [])) + "];"
        if kind == "emphasis":
            return "#emph[" + self.inlines(token.get("children", [])) + "];"
        if kind == "strikethrough":
            return "#strike[" + self.inlines(token.get("children", [])) + "];"
        if kind == "codespan":
            return f"#raw({typst_string(token.get('raw', ''))});"
        if kind == "inline_math":
            return "$" + tex_math(token.get("raw", "")) + "$"
        if kind == "block_math":
            return "$ " + tex_math(token.get("raw", "")) + " $"
        if kind == "softbreak":
            return "\n"
        if kind == "linebreak":
            return " \\\n"
        if kind == "link":
            return self.link(token)
        if kind == "image":
            return self.inlines(token.get("children", []))  # alt text; no remote images
        return ""  # inline HTML

    def link(self, token: dict) -> str:
        url = str(token.get("attrs", {}).get("url", ""))
        text = self.inlines(token.get("children", []))
        if url.startswith("#"):
            label = url[1:]
            if label in self.labels:
                return f"#ref(<{label}>);" if not text.strip() else f"#link(<{label}>)[{text}];"
            self.dropped_references.append(label)
            return text
        if not url:
            return text
        return f"#link({typst_string(url)})[{text or escape_typst(url)}];"


def _pad(cells: list[str], count: int) -> list[str]:
    return (cells + [""] * count)[:count]


def markdown_to_typst(text: str, *, labels: Iterable[str] = (), heading_offset: int = 0) -> tuple[str, list[str]]:
    """Markdown (with TeX math) as Typst markup.

    Parameters
    ----------
    text : str
        Markdown, as in notebook cells and ``text/markdown`` outputs.
    labels : iterable of str
        Labels of the numbered figures and tables; links to ``#label`` become
        references to them.
    heading_offset : int
        Added to every heading level. [-]

    Returns
    -------
    (str, list of str)
        The Typst markup and the labels of references that point nowhere (their
        text is kept, the reference dropped).
    """
    writer = _Writer(labels, heading_offset)
    return writer.blocks(_parser()(str(text))), writer.dropped_references
