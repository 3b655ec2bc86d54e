"""Fuzzing the bar and stirrup notation (hypothesis).

Properties: notation built from the CSA G30.18 catalogue in any of the spellings drafters use
reads back to the same bars (areas from the catalogue: CSA G30.18, from memory, as in
beamsched/bars.py); any other text either reads as bars that exist or raises NotationError
with a message, never another exception.

CI runs a bounded number of examples; BEAMSCHED_FUZZ_EXAMPLES=5000 runs more.
"""

from __future__ import annotations

import os

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from beamsched.bars import CATALOGUE, BarArrangement, NotationError, Stirrups, parse_bars, parse_stirrups

EXAMPLES = int(os.environ.get("BEAMSCHED_FUZZ_EXAMPLES", "150"))
FUZZ = settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=[HealthCheck.too_slow])

SIZES = st.sampled_from(sorted(CATALOGUE))
DASHES = st.sampled_from(["-", " - ", "\u2013", "\u2212", "-"])  # hyphen, en dash, minus sign
SPACE = st.sampled_from(["", " ", "  "])
M = st.sampled_from(["M", "m"])


@st.composite
def bar_notation(draw):
    """(text, layers as [(count, size)]) in drafters' spellings: '2-25M + 2-20M / 3 – 20m'."""
    layers = draw(st.lists(st.lists(st.tuples(st.integers(1, 12), SIZES), min_size=1, max_size=3),
                           min_size=1, max_size=3))
    parts = []
    for layer in layers:
        groups = [f"{n}{draw(DASHES)}{size[:-1]}{draw(M)}" for n, size in layer]
        parts.append(f"{draw(SPACE)}+{draw(SPACE)}".join(groups))
    return f"{draw(SPACE)}/{draw(SPACE)}".join(parts), layers


@FUZZ
@given(bar_notation())
def test_bar_notation_reads_back_to_the_bars_written(case):
    text, layers = case
    bars = parse_bars(text)
    assert [[(g.count, g.bar.size) for g in layer.groups] for layer in bars.layers] == layers
    # As: the sum of count x nominal area, CSA G30.18 (from memory; the catalogue of bars.py)
    assert bars.area == sum(n * CATALOGUE[s].area for layer in layers for n, s in layer)
    assert parse_bars(str(bars)) == bars  # what the results print reads back the same


@st.composite
def stirrup_notation(draw):
    size = draw(SIZES)
    spacing = draw(st.integers(25, 600) | st.decimals(25, 600, places=1).map(float))
    legs = draw(st.integers(1, 8))
    shown = f"{spacing:g}"
    mm = draw(st.sampled_from(["", "mm", " mm"]))
    forms = [f"{legs}L{draw(DASHES)}{size}{draw(SPACE)}@{draw(SPACE)}{shown}{mm}",
             f"{size}@{shown}{mm} ({legs} legs)" if legs != 1 else f"{size}@{shown} (1 leg)"]
    if legs == 2:
        forms.append(f"{size[:-1]}{draw(M)}{draw(SPACE)}@{draw(SPACE)}{shown}{mm}")
    return draw(st.sampled_from(forms)), size, float(shown), legs


@FUZZ
@given(stirrup_notation())
def test_stirrup_notation_reads_back(case):
    text, size, spacing, legs = case
    s = parse_stirrups(text)
    assert (s.bar.size, s.spacing, s.legs) == (size, spacing, legs)
    assert s.area == legs * CATALOGUE[size].area  # Av = legs x bar area (CSA A23.3-19 cl. 11.3.5.1 notation)
    assert parse_stirrups(str(s)) == s


# Text near the notation (its own alphabet) finds the parser's edges faster than random text.
NEAR = st.text(alphabet="0123456789-–−M m@/+L()legsx#.,;:\t*", max_size=30)
ANY = st.text(max_size=40)


@FUZZ
@given(st.one_of(NEAR, ANY))
def test_any_text_reads_as_real_bars_or_says_why_not(text):
    try:
        bars = parse_bars(text)
    except NotationError as exc:
        msg = str(exc)
        assert msg.strip() and "'" in msg  # it quotes the text read or an example of what is expected
        return
    assert isinstance(bars, BarArrangement) and bars.count >= 1 and bars.area > 0
    assert all(g.bar.size in CATALOGUE and g.count >= 1 for layer in bars.layers for g in layer.groups)


@FUZZ
@given(st.one_of(NEAR, ANY))
def test_any_text_reads_as_real_stirrups_or_says_why_not(text):
    try:
        s = parse_stirrups(text)
    except NotationError as exc:
        assert str(exc).strip()
        return
    assert isinstance(s, Stirrups) and s.legs >= 1 and s.spacing > 0 and s.bar.size in CATALOGUE
    assert s.spacing < float("inf")


@pytest.mark.parametrize("text", ["4-25", "4-28M", "0-25M", "4-25M /", "4-25M + ", "#4", "4 #5", "4x25M",
                                  "9" * 400 + "-25M" + "/" * 50])
def test_near_misses_are_notation_errors(text):
    # 28M is not a CSA G30.18 size; a count of 0 is not a bar (common practice)
    with pytest.raises(NotationError):
        parse_bars(text)
