"""Row heights of the results workbook: the wrapped-line estimate (beamsched/report/fit.py)."""

from __future__ import annotations

import pytest
from hypothesis import given
from hypothesis import strategies as st

from beamsched.report.fit import LineCounter, column_points, text_width, wrapped_lines


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


@given(st.lists(st.text(alphabet="abc MW0.,;()\n—×", max_size=200), max_size=30),
       st.sampled_from([5.5, 8, 12.5, 17, 86, 110]), st.booleans(), st.integers(0, 2))
def test_a_line_counter_answers_as_wrapped_lines(texts, width, bold, indent):
    # the counter remembers what it has counted (and starts afresh when full): texts repeat here
    count = LineCounter(width, bold, indent, keep=8)
    for text in texts + texts[::-1] + [None, 12345.678]:
        assert count(text) == wrapped_lines(text, width, bold, indent)


@pytest.mark.parametrize("width, bold, indent", [(5.5, False, 0), (17, True, 0), (48, False, 1), (86, True, 0)])
def test_a_line_counter_takes_its_short_cut_only_where_it_holds(width, bold, indent):
    # the longest text counted without a look is one line even in the widest character of the table
    # ("@", 1.015 em, from memory), and one such character more runs onto a second line
    count = LineCounter(width, bold, indent)
    assert count("@" * count.fits) == 1 == wrapped_lines("@" * count.fits, width, bold, indent)
    assert count("@" * (count.fits + 1)) == 2 == wrapped_lines("@" * (count.fits + 1), width, bold, indent)
