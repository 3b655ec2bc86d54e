"""Fuzzing the schedule reader (hypothesis): header labels with units, and whole random rows.

Properties:
* a header label from the column table, in any case and spacing, with any unit in brackets,
  is matched to its column; a unit of the right kind gives the conversion factor of NIST SP 811
  (2008) App. B.8 (1 in = 25.4 mm, 1 ft = 0.3048 m exactly; 1 lbf = 4.448222 N;
  1 psi = 6.894757 kPa; from memory to 7 digits); any other unit makes the column unreadable,
  with a problem naming it;
* a row of random cells never raises: it becomes a BeamInput or a RowFailure; every problem
  names the row and a column; every cell holding a value that cannot be read (text in a number
  column, NaN, a date, TRUE, a formula with no saved result, a cached #DIV/0!, bad bar or
  stirrup notation, a word that is not one of the choices) gives a problem naming its column;
  a row with no such cell is read and checked, and the check gives no NaN;
* one value out of the range the standard allows (f'c outside 20 to 80 MPa, fy over 500 MPa,
  a size of zero or less, a negative Mf+ or cover) in an otherwise clean row fails the row, with a
  problem naming that column.

CI runs a bounded number of examples; BEAMSCHED_FUZZ_EXAMPLES=2000 runs more.
"""

from __future__ import annotations

import datetime as dt
import math
import os

import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

from beamsched import check_beam
from beamsched.codes import DEFAULT_CODE, get_code
from beamsched.model import BeamInput, RowFailure
from beamsched.schedule.cells import Cell
from beamsched.schedule.columns import COLUMNS, match_header
from beamsched.schedule.parameters import Defaults
from beamsched.schedule.rows import SpanPosition, convert_row, read_header

EXAMPLES = int(os.environ.get("BEAMSCHED_FUZZ_EXAMPLES", "150"))
FUZZ = settings(max_examples=EXAMPLES, deadline=None,
                suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])
CODE = get_code(DEFAULT_CODE)

# unit in the header -> engine units (mm, MPa, N, N·mm) per unit; NIST SP 811 App. B.8 (from memory)
UNITS = {
    "length": {"mm": 1.0, "cm": 10.0, "m": 1000.0, "in": 25.4, "ft": 304.8},
    "span": {"m": 1000.0, "mm": 1.0, "ft": 304.8, "in": 25.4},
    "stress": {"MPa": 1.0, "N/mm²": 1.0, "kPa": 1e-3, "psi": 6.894757e-3, "ksi": 6.894757},
    "force": {"kN": 1e3, "N": 1.0, "kip": 4.448222e3},
    "moment": {"kN·m": 1e6, "kNm": 1e6, "kN-m": 1e6, "kip-ft": 1.355818e6},
}
WRONG = {"length": ["kN", "MPa", "zorks"], "span": ["kN·m", "psi", "zorks"], "stress": ["mm", "kN", "blorps"],
         "force": ["kN·m", "mm", "MPa"], "moment": ["kN", "mm", "psi"]}


def spelled(draw, text: str) -> str:
    """The same label as a drafter might type it: case, and spaces around words."""
    case = draw(st.sampled_from([str, str.upper, str.lower, str.title]))
    return draw(st.sampled_from(["", " "])) + case(text) + draw(st.sampled_from(["", " "]))


@st.composite
def header_cell(draw):
    col = draw(st.sampled_from(COLUMNS))
    base = spelled(draw, draw(st.sampled_from((col.label, *col.aliases))))
    if col.dimension is None:
        return col, base, None, None
    if draw(st.booleans()):
        unit = draw(st.sampled_from(sorted(UNITS[col.dimension])))
        factor = UNITS[col.dimension][unit]
    else:
        unit, factor = draw(st.sampled_from(WRONG[col.dimension])), None
    bracket = draw(st.sampled_from(["({})", "[{}]", " ({})"]))
    return col, f"{base} {bracket.format(unit)}".strip(), unit, factor


@FUZZ
@given(st.lists(header_cell(), min_size=1, max_size=12, unique_by=lambda c: c[0].key))
def test_header_labels_with_units(cells):
    hdr = read_header([Cell(label) for _, label, _, _ in cells], 1, Defaults())
    for col, label, unit, factor in cells:
        matched, _ = match_header(label)
        assert matched is not None and matched.key == col.key, (label, matched)
        if col.dimension is None:
            continue
        if factor is not None:
            assert hdr.factors[col.key] == pytest.approx(factor, rel=1e-6), (label, unit)
        else:
            assert col.key in hdr.broken
            assert any(p.column == label.strip() and p.severity == "error" for p in hdr.problems), (label, hdr.problems)


# -- whole rows ---------------------------------------------------------------------------------------
HEADER = ["Mark", "Span no.", "Type", "bw (mm)", "h (mm)", "hf (mm)", "bf (mm)", "Span (m)", "Left end",
          "Right end", "Cover (mm)", "Bottom bars", "Top bars", "Stirrups", "f'c (MPa)", "fy (MPa)", "fyt (MPa)",
          "Agg (mm)", "Exposure", "Mf+ (kN·m)", "Mf- (kN·m)", "Vf (kN)", "Tf (kN·m)", "SFRS", "Notes"]
FORMULA = Cell(None, "=B3*2")  # a formula saved without its result
DATE = dt.datetime(2025, 4, 25)  # '4-25' as a spreadsheet may turn it
JUNK = {
    "number": ["abc", "12 mm", "1,5", "nan", math.nan, math.inf, -math.inf, True, DATE, FORMULA, "#DIV/0!", "#N/A"],
    "bars": ["4-25", "4-28M", "abc", 12.0, DATE, "#N/A", FORMULA, "0-25M", "4 #8"],
    "stirrups": ["10M@0", "10M", "@200", 200.0, "0L-10M@200", DATE, "10M@200 (0 legs)"],
    "choice": ["sideways", 7.0, DATE, FORMULA],
    "bool": ["maybe", 7.0, DATE],
    "int": [1.5, "two", DATE],
}
KIND = {"Span no.": "int", "Type": "choice", "Left end": "choice", "Right end": "choice", "Exposure": "choice",
        "SFRS": "bool", "Bottom bars": "bars", "Top bars": "bars", "Stirrups": "stirrups"}


def num(lo, hi, as_text=True):
    f = st.floats(lo, hi, allow_nan=False, allow_infinity=False).map(lambda x: round(x, 2))
    return f | f.map(lambda x: f"{x:g}") if as_text else f


BARS_OK = st.builds(lambda n, s: f"{n}-{s}", st.integers(2, 6), st.sampled_from(["15M", "20M", "25M"]))
VALID = {
    "Mark": st.integers(1, 999).map(lambda n: f"B{n}"),
    "Span no.": st.none() | st.integers(1, 5),
    "Type": st.sampled_from([None, "Rect", "rect", "R"]),
    "bw (mm)": num(250, 900), "h (mm)": num(400, 1500),
    "hf (mm)": st.none(), "bf (mm)": st.none(),
    "Span (m)": st.none() | num(2, 12),
    "Left end": st.sampled_from([None, "simple", "continuous", "Cont", "fixed", "pinned"]),
    "Right end": st.sampled_from([None, "simple", "continuous", "free"]),
    "Cover (mm)": st.none() | num(25, 60),
    "Bottom bars": st.none() | BARS_OK, "Top bars": st.none() | BARS_OK,
    "Stirrups": st.none() | st.builds(lambda s, sp: f"{s}@{sp}", st.sampled_from(["10M", "15M"]),
                                      st.integers(100, 400)),
    "f'c (MPa)": num(20, 80), "fy (MPa)": num(300, 500), "fyt (MPa)": st.none() | num(300, 500),
    "Agg (mm)": st.none() | num(10, 40),
    "Exposure": st.sampled_from([None, "interior", "exterior", "Interior"]),
    "Mf+ (kN·m)": st.none() | num(0, 2000), "Mf- (kN·m)": st.none() | num(-2000, 2000),
    "Vf (kN)": st.none() | num(-2000, 2000), "Tf (kN·m)": st.none() | num(-100, 100),
    "SFRS": st.sampled_from([None, "yes", "no", "n"]),
    "Notes": st.none() | st.text(max_size=20).filter(lambda t: t.strip().upper() not in ("#N/A", "#DIV/0!")),
}


@st.composite
def rows(draw, junk_allowed: bool = True):
    cells, junk = [], []
    for label in HEADER:
        kind = KIND.get(label, "number")
        if junk_allowed and label not in ("Mark", "Notes") and draw(st.integers(0, 7)) == 0:
            v = draw(st.sampled_from(JUNK[kind]))
            junk.append(label)
        else:
            v = draw(VALID[label])
        cells.append(v if isinstance(v, Cell) else Cell(v))
    return cells, junk


HDR = read_header([Cell(h) for h in HEADER], 1, Defaults())


@FUZZ
@given(rows(), st.integers(2, 10_000))
def test_any_row_becomes_a_span_or_named_problems(case, number):
    cells, junk = case
    assert not HDR.problems
    r = convert_row(number, cells, HDR, Defaults(), CODE, SpanPosition(True, True, False))
    assert isinstance(r, (BeamInput, RowFailure))
    problems = r.problems if isinstance(r, RowFailure) else r.warnings
    for p in problems:
        assert p.row == number and p.column, p
        assert p.message.startswith(f"row {number}"), p.message
    named = {p.column for p in problems if p.severity == "error"}
    if junk:
        assert isinstance(r, RowFailure), (junk, r)
        for label in junk:
            assert label in named, (label, [p.message for p in problems])
        return
    assume(isinstance(r, BeamInput) or named)
    assert isinstance(r, BeamInput), [p.message for p in problems]
    result = check_beam(r)
    for c in result.checks:
        assert not any(isinstance(x, float) and math.isnan(x) for x in (c.demand, c.capacity, c.utilisation)), c


# One value the standard or the schedule contract does not allow, in a row that is otherwise clean:
# the row fails, and a problem names that column.
OUT_OF_RANGE = {
    "bw (mm)": st.floats(-1000, 0), "h (mm)": st.floats(-1000, 0),
    "f'c (MPa)": st.floats(81, 150) | st.floats(0.1, 19.9),  # CSA A23.3-19 cl. 8.6.1.1: 20 to 80 MPa (from memory)
    "fy (MPa)": st.floats(501, 2000),  # cl. 8.5.1: fy not over 500 MPa (from memory)
    "Mf+ (kN·m)": st.floats(-1000, -0.01),  # the contract: hogging belongs in Mf- (issue 3)
    "Cover (mm)": st.floats(-100, -0.01), "Agg (mm)": st.floats(-50, 0), "Span (m)": st.floats(-20, 0),
}


@FUZZ
@given(rows(junk_allowed=False), st.sampled_from(sorted(OUT_OF_RANGE)), st.data())
def test_a_value_out_of_range_is_named(case, label, data):
    cells, _ = case
    value = data.draw(OUT_OF_RANGE[label].map(lambda x: round(x, 2)))
    assume(value != 0 or label in ("bw (mm)", "h (mm)", "Agg (mm)", "Span (m)"))
    cells = list(cells)
    cells[HEADER.index(label)] = Cell(value)
    r = convert_row(7, cells, HDR, Defaults(), CODE, SpanPosition(True, True, False))
    assert isinstance(r, RowFailure), (label, value)
    assert any(p.column == label and p.severity == "error" for p in r.problems), (label, [p.message for p in r.problems])
