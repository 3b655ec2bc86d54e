"""Bar catalogue and drafters' notation."""

import math

import pytest

from beamsched.bars import CATALOGUE, NotationError, parse_bars, parse_stirrups

# CSA G30.18 metric bars, nominal diameter (mm) and area (mm²): from memory (the table is
# reproduced in CSA A23.1 and the CAC Concrete Design Handbook).
G30_18 = [("10M", 11.3, 100), ("15M", 16.0, 200), ("20M", 19.5, 300), ("25M", 25.2, 500),
          ("30M", 29.9, 700), ("35M", 35.7, 1000), ("45M", 43.7, 1500), ("55M", 56.4, 2500)]


@pytest.mark.parametrize("size, db, area", G30_18)
def test_catalogue_matches_g30_18(size, db, area):
    bar = CATALOGUE[size]
    assert bar.db == db and bar.area == area


@pytest.mark.parametrize("size, db, area", G30_18)
def test_nominal_area_is_the_circle_of_the_nominal_diameter(size, db, area):
    # geometry: nominal area = pi db²/4, rounded in the standard to a round figure (within 1 %)
    assert math.pi * db**2 / 4 == pytest.approx(area, rel=1e-2)


@pytest.mark.parametrize(
    "text, layers, area",
    [
        ("4-25M", [[(4, "25M")]], 2000),
        ("2-25M + 2-20M", [[(2, "25M"), (2, "20M")]], 1600),
        ("4-25M / 2-25M", [[(4, "25M")], [(2, "25M")]], 3000),
        (" 3 - 30m ", [[(3, "30M")]], 2100),
        ("2-25M+1-20M/2-15M", [[(2, "25M"), (1, "20M")], [(2, "15M")]], 1700),
        ("4\u201325M", [[(4, "25M")]], 2000),  # an en dash typed by a word processor
    ],
)
def test_parse_bars(text, layers, area):
    arr = parse_bars(text)
    got = [[(g.count, g.bar.size) for g in layer.groups] for layer in arr.layers]
    assert got == layers
    assert arr.area == area


def test_unknown_size_names_the_sizes_known():
    with pytest.raises(NotationError, match=r"unknown bar size '26M': sizes known are 10M, 15M, .*55M"):
        parse_bars("4-26M")


@pytest.mark.parametrize("text, fragment", [
    ("4x25M", "expected a bar group such as '4-25M'"),
    ("", "blank"),
    ("4-25M /", "empty layer"),
    ("0-25M", "count must be 1 or more"),
    ("25M", "expected a bar group"),
    # a plausibility ceiling, not a clause: no beam layer holds over 1000 bars (common practice)
    ("1001-10M", "a bar count of at most 1000"),
    ("9" * 400 + "-25M", "a bar count of at most 1000"),
])
def test_unreadable_bars_say_what_was_expected(text, fragment):
    with pytest.raises(NotationError, match=fragment):
        parse_bars(text)


@pytest.mark.parametrize("text, size, spacing, legs", [
    ("10M@200", "10M", 200, 2),
    ("10M @ 150 mm", "10M", 150, 2),
    ("4L-10M@200", "10M", 200, 4),
    ("3L10M@250", "10M", 250, 3),
    ("15M@300 (4 legs)", "15M", 300, 4),
])
def test_parse_stirrups(text, size, spacing, legs):
    s = parse_stirrups(text)
    assert (s.bar.size, s.spacing, s.legs) == (size, spacing, legs)
    assert s.area == legs * CATALOGUE[size].area


@pytest.mark.parametrize("text, fragment", [
    ("10M@0", "greater than zero"),
    ("10M-200", "expected stirrups as '10M@200'"),
    ("12M@200", "unknown bar size '12M'"),
    ("4L-10M@200 (2 legs)", "two different leg counts"),
])
def test_bad_stirrups(text, fragment):
    with pytest.raises(NotationError, match=fragment):
        parse_stirrups(text)


def test_arrangement_totals_worked_out_when_made():
    # areas from the CSA G30.18 catalogue (from memory, see test_catalogue_matches_g30_18)
    bars = parse_bars("2-25M + 2-20M / 2-20M")
    assert (bars.area, bars.count, bars.max_db, bars.largest_bar.size) == (2 * 500 + 2 * 300 + 2 * 300, 6, 25.2, "25M")
    assert [(layer.area, layer.count, layer.max_db) for layer in bars.layers] == [(1600.0, 4, 25.2), (600.0, 2, 19.5)]
    assert parse_bars("1000-10M").area == 100_000.0  # the ceiling itself still reads
    # equal notation, equal and equally hashed arrangements, also after a pickle round trip
    import pickle
    again = pickle.loads(pickle.dumps(bars))
    assert again == bars and hash(again) == hash(bars) and str(again) == str(bars)
    assert len({bars, parse_bars("2-25M+2-20M/2-20M"), again}) == 1


def test_notation_round_trips():
    for text in ("4-25M", "2-25M + 2-20M / 2-20M"):
        assert str(parse_bars(text)) == text
    assert str(parse_stirrups("10M@200")) == "10M@200"
    assert str(parse_stirrups("10M@200 (4 legs)")) == "4L-10M@200"
