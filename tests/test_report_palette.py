"""The palette reads in greyscale and its words carry the meaning.

Lightness is CIE 1976 L* of the sRGB colour (sRGB transfer function, IEC 61966-2-1; L* from CIE
15:2004); text contrast is the WCAG 2.1 contrast ratio (success criterion 1.4.3 asks 4.5:1).
"""

from __future__ import annotations

import itertools
import math

import pytest

from beamsched.model import BeamStatus, CheckStatus
from beamsched.report import palette as P


def _linear(c: float) -> float:  # IEC 61966-2-1 (sRGB)
    return c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4


def luminance(hex_colour: str) -> float:  # WCAG 2.1 relative luminance
    r, g, b = (int(hex_colour[i:i + 2], 16) / 255 for i in (1, 3, 5))
    return 0.2126 * _linear(r) + 0.7152 * _linear(g) + 0.0722 * _linear(b)


def lightness(hex_colour: str) -> float:  # CIE 1976 L*
    y = luminance(hex_colour)
    return 116 * y ** (1 / 3) - 16 if y > (6 / 29) ** 3 else y * (29 / 3) ** 3


def contrast(a: str, b: str) -> float:  # WCAG 2.1 contrast ratio
    la, lb = sorted((luminance(a), luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


def test_reference_values():
    assert lightness("#FFFFFF") == pytest.approx(100, abs=0.01)  # CIE: white L* = 100
    assert lightness("#000000") == pytest.approx(0, abs=0.01)
    assert contrast("#FFFFFF", "#000000") == pytest.approx(21)  # WCAG 2.1: black on white is 21:1


def test_span_statuses_step_apart_in_greyscale():
    fills = [P.SPAN_STATUS[s].swatch.fill for s in (BeamStatus.PASS, BeamStatus.INCOMPLETE, BeamStatus.FAIL,
                                                      BeamStatus.ERROR)]
    for a, b in itertools.combinations(fills, 2):
        assert abs(lightness(a) - lightness(b)) >= 10, (a, b)


def test_bands_step_apart_and_darken_with_utilisation():
    ls = [lightness(b.swatch.fill) for b in P.BANDS]
    assert ls == sorted(ls, reverse=True)
    assert all(x - y >= 10 for x, y in itertools.pairwise(ls))


@pytest.mark.parametrize("swatch", [s.swatch for s in P.SPAN_STATUS.values()] + [b.swatch for b in P.BANDS]
                         + [s.swatch for s in P.CHECK_STATUS.values()] + [P.ASSUMED, P.HEADER])
def test_text_is_readable_on_every_fill(swatch):
    assert contrast(swatch.fill, swatch.text) >= 4.5  # WCAG 2.1 SC 1.4.3


def test_every_status_has_a_distinct_word():
    words = [P.SPAN_STATUS[s].word for s in BeamStatus]
    assert len(set(words)) == len(BeamStatus)
    assert {P.CHECK_STATUS[s].word for s in CheckStatus} == {"pass", "FAIL", "not checked"}


@pytest.mark.parametrize("u, band", [
    (0.0, "within"), (0.9, "within"), (0.9001, "near limit"), (1.0, "near limit"), (1.0001, "over"),
    (math.inf, "over"), (math.nan, "over"), (-0.5, "within"),
])
def test_band_edges(u, band):  # common practice: over 1.00 is demand beyond capacity
    assert P.band_for(u).name == band


def test_histogram_bins_cover_every_value_once():
    bins = P.histogram_bins()
    for u in (0.0, 0.5, 0.50001, 0.9, 1.0, 1.05, 1.1, 3.0):
        assert sum(1 for _, lo, hi in bins if lo < u <= hi) == 1
