"""Row heights of the results workbook: the wrapped-line estimate (beamsched/report/fit.py)."""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from beamsched.report.fit import column_points, text_width, wrapped_lines


@pytest.mark.parametrize("text, points", [
    ("0123456789", 55.6),  # digits 0.556 em (Helvetica / Arial metrics, from memory), 10 pt
    ("iiii", 8.88),  # i 0.222 em (from memory)
    ("MW", 17.77),  # M 0.833 em, W 0.944 em (from memory)
    ("a b", 13.9),  # a 0.556, space 0.278 (from memory)
])
def test_text_width_in_points(text, points):
    assert text_width(text) == pytest.approx(points, abs=0.01)


def test_bold_is_wider():
    assert text_width("Result: demand", bold=True) > text_width("Result: demand")


@pytest.mark.parametrize("width, points", [
    (10, (70 + 5 - 8) * 0.75),  # 10 digits of 7 px, the cell's 5 px, less 8 px of margins; 0.75 pt/px
    (90, (630 + 5 - 8) * 0.75),
])
def test_column_points(width, points):
    assert column_points(width) == pytest.approx(points)


def test_wrapping_word_by_word():
    room = column_points(10)  # 50.25 pt
    word = "0000"  # 22.24 pt: two fit on a line with the space (47.26 pt), three do not
    assert wrapped_lines(" ".join([word] * 2), 10) == 1
    assert wrapped_lines(" ".join([word] * 3), 10) == 2
    assert wrapped_lines(" ".join([word] * 4), 10) == 2
    assert wrapped_lines(" ".join([word] * 5), 10) == 3
    # a word wider than the column runs over as many lines as it needs
    long = "0" * 20  # 111.2 pt
    assert wrapped_lines(long, 10) == -(-111.2 // room)
    # every paragraph starts a line; an empty text still takes one
    assert wrapped_lines("a\nb\nc", 10) == 3
    assert wrapped_lines("", 10) == 1 and wrapped_lines(None, 10) == 1


@given(st.text(alphabet="abc MW0.,;()", max_size=300), st.integers(3, 100), st.integers(1, 40))
def test_a_narrower_column_never_takes_fewer_lines(text, width, less):
    narrow = max(width - less, 2)
    assert wrapped_lines(text, narrow) >= wrapped_lines(text, width) >= 1


@given(st.text(alphabet="abc MW0.,;()", max_size=300), st.integers(3, 100))
def test_the_lines_hold_the_text(text, width):
    # the lines given, each as wide as the column, hold at least the text's width without its spaces
    lines = wrapped_lines(text, width)
    assert lines * column_points(width) >= text_width(text.replace(" ", "").replace("\n", "")) - 1e-6
