"""How many lines a wrapped text takes in a column, for setting row heights.

A workbook written row by row cannot ask the spreadsheet application to fit its rows, and a
row whose height is set too small hides the end of its text in print. So the writer estimates
the lines itself, from the advance widths of 10-point Arial (the font of every cell), word by
word as the application wraps, and errs towards one line too many rather than one too few.

Widths are those of Helvetica in the Adobe Core 14 font metrics, which Arial and Liberation Sans
(LibreOffice's Arial) share (from memory, rounded to the 1/1000 em). Characters outside the table
(Greek letters, ×, −, ², ...) count as 0.6 em, wider than most of them.
"""

from __future__ import annotations

import math
from functools import lru_cache

FONT_SIZE = 10.0  # points: every cell of the results workbook
BOLD_FACTOR = 1.08  # Arial Bold runs about 5-10 % wider than the regular face (common practice)
DIGIT_PX = 7  # width in pixels of one digit of 10-point Arial at 96 dpi: the unit of column width
CELL_PADDING_PX = 5  # pixels a column adds to its digits (the application's cell margins)
TEXT_MARGIN_PX = 8  # pixels of a cell's width that text never uses (left and right margins, rounded up)
INDENT_PX = 10  # pixels of one indent level (about three spaces)
LINE_HEIGHT = 13.0  # points per wrapped line of 10-point Arial (12.75 pt single-spaced, common practice)
OTHER = 600

_WIDTHS: dict[str, int] = {
    " ": 278, "!": 278, '"': 355, "#": 556, "$": 556, "%": 889, "&": 667, "'": 191, "(": 333, ")": 333,
    "*": 389, "+": 584, ",": 278, "-": 333, ".": 278, "/": 278, ":": 278, ";": 278, "<": 584, "=": 584,
    ">": 584, "?": 556, "@": 1015, "[": 278, "\\": 278, "]": 278, "^": 469, "_": 556, "`": 333, "{": 334,
    "|": 260, "}": 334, "~": 584, "’": 222, "‘": 222, "“": 333, "”": 333, "—": 1000, "–": 556, "…": 1000,
    "·": 278, "°": 400, "²": 333, "³": 333, "±": 584, "×": 584, "÷": 584, "≤": 549, "≥": 549, "φ": 521,
}
_WIDTHS.update(dict.fromkeys("0123456789", 556))
_WIDTHS.update(zip("ABCDEFGHIJKLMNOPQRSTUVWXYZ",
                   (667, 667, 722, 722, 667, 611, 778, 722, 278, 500, 667, 556, 833, 722, 778, 667, 778, 722, 667,
                    611, 722, 667, 944, 667, 667, 611), strict=True))
_WIDTHS.update(zip("abcdefghijklmnopqrstuvwxyz",
                   (556, 556, 500, 556, 556, 278, 556, 556, 222, 222, 500, 222, 833, 556, 556, 556, 556, 333, 500,
                    278, 556, 500, 722, 500, 500, 500), strict=True))


def text_width(text: str, bold: bool = False, size: float = FONT_SIZE) -> float:
    """Advance width of ``text`` in points."""
    em = sum(_WIDTHS.get(ch, OTHER) for ch in text) / 1000
    return em * size * (BOLD_FACTOR if bold else 1.0)


def column_points(width: float, indent: int = 0) -> float:
    """Points of a column ``width`` (in digits, as set on the sheet) that its text can fill."""
    pixels = int(width * DIGIT_PX + 0.5) + CELL_PADDING_PX
    return max(pixels - TEXT_MARGIN_PX - INDENT_PX * indent, DIGIT_PX) * 0.75


_WIDEST = max(max(_WIDTHS.values()), OTHER) / 1000  # em


def wrapped_lines(text: object, width: float, bold: bool = False, indent: int = 0,
                  size: float = FONT_SIZE) -> int:
    """Lines ``text`` takes, wrapped at spaces, in a column ``width`` digits wide (1 for an empty text).

    Each paragraph (``\\n``) starts a new line; a word wider than the column is broken where
    it reaches the edge, as the applications do.
    """
    text = "" if text is None else str(text)
    room = column_points(width, indent)
    if "\n" not in text and len(text) * _WIDEST * size * (BOLD_FACTOR if bold else 1.0) <= room:
        return 1  # fits even if every character were the widest
    return _wrapped(text, room, bold, size)


@lru_cache(maxsize=1 << 16)  # the working repeats its wording span after span
def _wrapped(text: str, room: float, bold: bool, size: float) -> int:
    space = text_width(" ", bold, size)
    total = 0
    for para in text.split("\n"):
        lines, used = 1, 0.0
        for word in para.split(" "):
            w = text_width(word, bold, size)
            need = w if used == 0 else used + space + w
            if need <= room:
                used = need
                continue
            if used > 0:
                lines += 1
            if w <= room:
                used = w
            else:  # a word wider than the column runs on over as many lines as it needs
                extra = math.ceil(w / room)
                lines += extra - 1
                used = w - (extra - 1) * room
        total += lines
    return max(total, 1)


class LineCounter:
    """:func:`wrapped_lines` for one column, fast for the texts a sheet repeats.

    The Working sheet asks for the lines of some 8 texts on each of a million rows, and most
    of those texts recur span after span (the descriptions, symbols and clauses of the trace).
    A counter is made once per column: a text short enough to fit even if every character were
    the widest is one line without looking at it; any other is counted once and remembered
    (up to ``keep`` texts, then it starts afresh). The answers are those of ``wrapped_lines``.
    """

    __slots__ = ("width", "bold", "indent", "size", "fits", "keep", "_seen")

    def __init__(self, width: float, bold: bool = False, indent: int = 0, size: float = FONT_SIZE,
                 keep: int = 1 << 15):
        self.width, self.bold, self.indent, self.size, self.keep = width, bold, indent, size, keep
        room = column_points(width, indent)
        factor = BOLD_FACTOR if bold else 1.0
        # the longest text that the test in wrapped_lines calls one line, evaluated as it does
        n = max(int(room / (_WIDEST * size * factor)) - 1, 0)
        while n > 0 and not n * _WIDEST * size * factor <= room:
            n -= 1
        while (n + 1) * _WIDEST * size * factor <= room:
            n += 1
        self.fits = n
        self._seen: dict[str, int] = {}

    def __call__(self, text: object) -> int:
        """Lines ``text`` takes in this column (``None`` as an empty text, as ``wrapped_lines``)."""
        if text.__class__ is not str:
            text = "" if text is None else str(text)
        if len(text) <= self.fits and "\n" not in text:
            return 1
        seen = self._seen
        n = seen.get(text)
        if n is None:
            if len(seen) >= self.keep:
                seen.clear()
            n = seen[text] = wrapped_lines(text, self.width, self.bold, self.indent, self.size)
        return n


def row_height(lines: int, cap: int | None = None) -> float:
    """Row height in points for ``lines`` wrapped lines (at most ``cap`` lines)."""
    n = max(lines, 1) if cap is None else min(max(lines, 1), cap)
    return LINE_HEIGHT * n
