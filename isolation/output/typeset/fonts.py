"""Fonts of the Typst report: which are embedded, and which characters they cover.

Typst (the ``typst`` wheel) brings its own fonts (Libertinus Serif, New
Computer Modern and its math face, DejaVu Sans Mono). The report adds the Noto
families shipped as Python packages: ``manimgx-fonts`` (Noto Sans, Noto Sans
Symbols, Noto Emoji and Noto Sans for Arabic, Hebrew, Devanagari, Thai and the
other scripts Latin faces lack) and ``manimgx-fonts-cjk`` (Noto Sans CJK).
System fonts are never used, so a report is set the same on every machine,
with no network.

A character that no font covers would be printed as an empty box by the
typesetter with no word; :func:`replace_uncovered` finds such characters
before typesetting and writes them as their code point, ``(U+0F00)``, so the
report and a warning say what was replaced.
"""

from __future__ import annotations

import importlib
import unicodedata
from functools import lru_cache
from pathlib import Path

__all__ = ["FONT_PACKAGES", "font_dirs", "font_files", "fallback_families", "covers", "replace_uncovered"]

FONT_PACKAGES = ("manimgx_fonts", "manimgx_fonts_cjk")
"""Python packages whose folders hold the report's added fonts (in search order)."""

# Families tried after the body face, in this order; the rest of the added families follow.
_PREFERRED = ("Noto Sans", "Noto Sans Symbols", "Noto Sans Arabic", "Noto Sans Hebrew",
              "Noto Sans Devanagari", "Noto Sans Thai", "Noto Sans CJK SC", "Noto Sans CJK JP",
              "Noto Sans CJK KR", "Noto Emoji")
_FONT_SUFFIXES = (".ttf", ".otf", ".ttc", ".otc")


@lru_cache(maxsize=1)
def font_dirs() -> tuple[Path, ...]:
    """Folders of the installed font packages of :data:`FONT_PACKAGES` (missing ones left out)."""
    found = []
    for name in FONT_PACKAGES:
        try:
            module = importlib.import_module(name)
        except ImportError:
            continue
        if module.__file__ is None:  # a namespace package has no folder of its own
            continue
        folder = Path(module.__file__).resolve().parent
        if any(p.suffix.lower() in _FONT_SUFFIXES for p in folder.iterdir()):
            found.append(folder)
    return tuple(found)


@lru_cache(maxsize=1)
def font_files() -> tuple[Path, ...]:
    """Font files of :func:`font_dirs`, Noto Sans first, CJK (the largest) last."""
    files = [p for folder in font_dirs() for p in sorted(folder.iterdir()) if p.suffix.lower() in _FONT_SUFFIXES]

    def order(path: Path) -> tuple[int, str]:
        name = path.name
        rank = 0 if name.startswith("NotoSans[") or name.startswith("NotoSans-") else (
            1 if "Symbols" in name else (3 if "CJK" in name else 2))
        return rank, name

    return tuple(sorted(files, key=order))


@lru_cache(maxsize=1)
def fallback_families() -> tuple[str, ...]:
    """Font families tried after the body face, in order (those installed)."""
    import typst

    installed = set(typst.Fonts(include_system_fonts=False, include_embedded_fonts=False,
                                font_paths=[str(d) for d in font_dirs()]).families()) if font_dirs() else set()
    first = [name for name in _PREFERRED if name in installed]
    return tuple(first + sorted(installed - set(first)))


@lru_cache(maxsize=None)
def _cmap(path: Path) -> frozenset[int]:
    from fontTools.ttLib import TTFont

    options = {"fontNumber": 0} if path.suffix.lower() in (".ttc", ".otc") else {}
    font = TTFont(str(path), lazy=True, **options)
    try:
        return frozenset(font.getBestCmap() or ())
    finally:
        font.close()


# Covered by Typst's own fonts whatever else is installed: printable ASCII and Latin-1,
# Latin Extended-A, Greek (Libertinus Serif and New Computer Modern cover these blocks).
_EMBEDDED_RANGES = ((0x20, 0x7E), (0xA0, 0x17F), (0x370, 0x3FF))


def _embedded(code: int) -> bool:
    return any(low <= code <= high for low, high in _EMBEDDED_RANGES)


def covers(characters: set[str] | str) -> set[str]:
    """The characters of ``characters`` that some report font covers.

    Parameters
    ----------
    characters : str or set of str
        Characters to look up (whitespace and control characters are never covered).
    """
    wanted = {ch for ch in set(characters) if not ch.isspace() and unicodedata.category(ch)[0] != "C"}
    found = {ch for ch in wanted if _embedded(ord(ch))}
    left = {ord(ch) for ch in wanted - found}
    for path in font_files():
        if not left:
            break
        hit = left & _cmap(path)
        found |= {chr(code) for code in hit}
        left -= hit
    return found


def replace_uncovered(text: str) -> tuple[str, list[str]]:
    """``text`` with characters no report font covers written as ``(U+XXXX)``.

    Control characters (other than line breaks and tabs) are replaced the same
    way. Returns the new text and one description per replaced character, e.g.
    ``"U+0F00 TIBETAN SYLLABLE OM"``.
    """
    unusual = {ch for ch in text if ord(ch) > 0x7E or (ord(ch) < 0x20 and ch not in "\n\t\r")}
    if not unusual:
        return text, []
    keep = covers(unusual) | {ch for ch in unusual if ch.isspace() and ch not in "\x0b\x0c\x1c\x1d\x1e\x1f"}
    keep |= {ch for ch in unusual if unicodedata.category(ch) in ("Mn", "Me", "Cf") and ch != "\x00"}
    missing = sorted(unusual - keep)
    if not missing:
        return text, []
    table = {ord(ch): f"(U+{ord(ch):04X})" for ch in missing}
    notes = [f"U+{ord(ch):04X} "
             f"{unicodedata.name(ch, 'control character' if unicodedata.category(ch) == 'Cc' else 'unnamed character')}"
             for ch in missing]
    return text.translate(table), notes
