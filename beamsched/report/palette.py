"""The one place where results get their words and colours.

Every writer (results workbook, annotated copy, console) takes the status words, the
utilisation bands and the fills from here. The palette is our own. It is chosen so that it
still reads when printed in greyscale: the fills step down in lightness (CIE L*) from a pass to
an unreadable row, and dark fills carry white text. Colour never carries the meaning alone:
every coloured cell also holds a status word or a number.
"""

from __future__ import annotations

import itertools
import math
from dataclasses import dataclass

from ..model import BeamStatus, CheckStatus


@dataclass(frozen=True)
class Swatch:
    """How one kind of cell looks: fill, text colour, and weight or slant."""

    fill: str  # "#RRGGBB"
    text: str = "#000000"
    bold: bool = False
    italic: bool = False


@dataclass(frozen=True)
class StatusStyle:
    word: str  # the word printed in the workbook and on the console
    meaning: str  # one line for the legend
    swatch: Swatch


# Lightness (CIE L*, approximately): pass 93, near the limit 80, incomplete 64, fail 36,
# unreadable 19. Tests check the steps and the text contrast.
_PASS = Swatch("#E2F0E4", "#17331E")
_NEAR = Swatch("#F0C24A", "#000000")
_INCOMPLETE = Swatch("#8A9CC2", "#000000", italic=True)
_FAIL = Swatch("#A3242B", "#FFFFFF", bold=True)
_ERROR = Swatch("#2E2E38", "#FFFFFF", bold=True)

ASSUMED = Swatch("#ECE6F3", "#000000", italic=True)  # a default the tool applied
HEADER = Swatch("#1F3A5F", "#FFFFFF", bold=True)  # table headers
NEUTRAL = Swatch("#FFFFFF", "#000000")

SPAN_STATUS: dict[BeamStatus, StatusStyle] = {
    BeamStatus.PASS: StatusStyle(
        "PASS", "every check the tool requires of this span was made and passed", _PASS),
    BeamStatus.FAIL: StatusStyle("FAIL", "at least one check fails: see the note", _FAIL),
    BeamStatus.INCOMPLETE: StatusStyle(
        "INCOMPLETE", "a required check could not be made (or the member is outside the scope of "
        "sectional design): not a pass", _INCOMPLETE),
    BeamStatus.ERROR: StatusStyle(
        "NOT READ", "the row could not be read, so nothing was checked: see Input problems", _ERROR),
}

CHECK_STATUS: dict[CheckStatus, StatusStyle] = {
    CheckStatus.PASS: StatusStyle("pass", "demand within capacity", _PASS),
    CheckStatus.FAIL: StatusStyle("FAIL", "demand exceeds capacity, or a limit is breached", _FAIL),
    CheckStatus.NOT_CHECKED: StatusStyle(
        "not checked", "the check could not be made; the note says why", _INCOMPLETE),
}


@dataclass(frozen=True)
class Band:
    """A range of utilisation (demand over capacity): lower < u <= upper."""

    name: str
    lower: float
    upper: float
    meaning: str
    swatch: Swatch

    def contains(self, u: float) -> bool:
        return self.lower < u <= self.upper


BANDS: tuple[Band, ...] = (
    Band("within", -math.inf, 0.90, "utilisation up to 0.90", _PASS),
    Band("near limit", 0.90, 1.00, "over 0.90 and up to 1.00: passes, little reserve", _NEAR),
    Band("over", 1.00, math.inf, "over 1.00: demand exceeds capacity", _FAIL),
)

# Bin edges for the overview chart (spans counted by their largest utilisation).
HISTOGRAM_EDGES: tuple[float, ...] = (0.5, 0.7, 0.9, 1.0, 1.1)

NOT_CHECKED_CELL = StatusStyle("not checked", "no utilisation: the check was not made", _INCOMPLETE)


def band_for(u: float) -> Band:
    """The band a utilisation falls in (NaN counts as over: it is never a pass)."""
    if math.isnan(u):
        return BANDS[-1]
    for band in BANDS:
        if band.contains(u):
            return band
    return BANDS[-1]


def histogram_bins() -> list[tuple[str, float, float]]:
    """(label, lower, upper) for each chart bin, lower < u <= upper."""
    edges = (-math.inf, *HISTOGRAM_EDGES, math.inf)
    out = []
    for lo, hi in itertools.pairwise(edges):
        if lo == -math.inf:
            label = f"≤ {hi:.2f}"
        elif hi == math.inf:
            label = f"> {lo:.2f}"
        else:
            label = f"{lo:.2f}–{hi:.2f}"
        out.append((label, lo, hi))
    return out


def format_utilisation(u: float | None) -> str:
    """Utilisation in words and digits, three decimals, for text outputs."""
    if u is None:
        return "—"
    if math.isinf(u) or math.isnan(u):
        return "∞ (no capacity)"
    return f"{u:.3f}"
