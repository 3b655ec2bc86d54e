"""Properties of the unit conversion at the edge (hypothesis).

Factors: NIST SP 811 (2008) Appendix B.8, quoted from memory to 7 digits (1 in = 25.4 mm and
1 ft = 0.3048 m exactly; 1 lbf = 4.448222 N; 1 psi = 6.894757 kPa; 1 ft·lbf = 1.355818 N·m).
"""

from __future__ import annotations

import dataclasses

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from beamsched.schedule import read_schedule
from beamsched.schedule.writer import write_schedule

UNITS = {  # header unit -> engine units per unit
    "bw": {"mm": 1.0, "in": 25.4, "m": 1000.0},
    "Span": {"m": 1000.0, "ft": 304.8, "mm": 1.0},
    "Mf+": {"kN·m": 1e6, "kNm": 1e6, "kip-ft": 1.355818e6, "kip·in": 1.355818e6 / 12},
    "Vf": {"kN": 1e3, "kip": 4.448222e3},
    "f'c": {"MPa": 1.0, "psi": 6.894757e-3, "ksi": 6.894757},
}


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(bw=st.floats(200, 1000), span=st.floats(1, 12), mf=st.floats(0, 2000), vf=st.floats(0, 2000),
       fc=st.floats(21, 79), pick=st.integers(0, 11))
def test_any_header_unit_gives_the_same_engine_value(tmp_path_factory, bw, span, mf, vf, fc, pick):
    units = {k: list(v)[pick % len(v)] for k, v in UNITS.items()}
    values = {"bw": bw, "Span": span * 1000, "Mf+": mf * 1e6, "Vf": vf * 1e3, "f'c": fc}  # engine units
    header = ["Mark", "h (mm)", "fy (MPa)"] + [f"{k} ({units[k]})" for k in UNITS]
    cells = ["X1", 2000, 400] + [values[k] / UNITS[k][units[k]] for k in UNITS]
    path = write_schedule(tmp_path_factory.mktemp("u") / "u.xlsx", header, [cells])
    (b,) = read_schedule(path).spans
    got = {"bw": b.bw, "Span": b.span, "Mf+": b.Mf_pos, "Vf": b.Vf_left, "f'c": b.fc}
    for k, v in values.items():
        # pint's factors against the 7-digit published ones: agree to 5e-7
        assert abs(got[k] - v) <= 5e-7 * abs(v) + 1e-9, (k, units[k], got[k], v)


HEADER = ["Mark", "Span no.", "Type", "bw (mm)", "h (mm)", "hf (mm)", "Span (m)", "Bottom bars", "Top bars",
          "Stirrups", "f'c (MPa)", "fy (MPa)", "Mf+ (kN·m)", "Mf- (kN·m)", "Vf (kN)", "Left end", "Right end"]
ROWS = [["P1", 1, "T", 300, 600, 150, 7.2, "4-25M", "4-25M", "10M@200", 30, 400, 220, 260, 210, "simple",
         "continuous"],
        ["P1", 2, "T", 300, 600, 150, 7.2, "4-25M", "4-25M", "10M@200", 30, 400, 200, 260, 210, "continuous",
         "simple"],
        ["P2", None, "Rect", 250, 450, None, 4.2, "3-20M", "2-15M", "10M@200", 30, 400, 70, None, 65, "simple",
         "simple"]]


@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(title_rows=st.integers(0, 29), order=st.permutations(range(len(HEADER))),
       blank_after=st.sampled_from([None, 0, 1]))
def test_header_anywhere_in_the_first_30_rows_and_any_column_order(tmp_path_factory, title_rows, order, blank_after):
    # beamsched issue 3: the header is the first row within the first 30 holding a Mark cell
    title = [[f"title line {i}"] if i % 3 else [] for i in range(title_rows)]
    rows = [list(r) for r in ROWS]
    if blank_after is not None:
        rows.insert(blank_after + 1, [None] * len(HEADER))
    path = write_schedule(tmp_path_factory.mktemp("h") / "h.xlsx", [HEADER[i] for i in order],
                          [[r[i] for i in order] for r in rows], title=title)
    s = read_schedule(path)
    base = read_schedule(write_schedule(tmp_path_factory.mktemp("b") / "b.xlsx", HEADER, ROWS))
    assert s.header_row == title_rows + 1
    strip = [dataclasses.replace(b, row=None) for b in s.spans]
    assert strip == [dataclasses.replace(b, row=None) for b in base.spans]


FUZZ_HEADER = ["Mark", "Span no.", "Qty", "Type", "bw (mm)", "h (mm)", "hf (mm)", "bf (mm)", "Span (m)",
               "Clear span (m)", "Support", "Left end", "Bottom bars", "Top bars L", "Top bars", "Stirrups",
               "f'c (MPa)", "fy (MPa)", "Mf+ (kN·m)", "Mf- R (kN·m)", "Vf (kN)", "Exposure", "SFRS", "Density",
               "Cover (mm)", "d (mm)", "Skin bars", "Tf (kN·m)"]
_cell = st.one_of(
    st.none(), st.integers(-1000, 5000), st.floats(-1e4, 1e4, allow_nan=False), st.booleans(),
    st.sampled_from(["", " ", "4-25M", "2-25M + 2-20M / 2-20M", "10M@200", "T", "L", "Rect", "simple", "cantilever",
                     "exterior", "yes", "x", "300mm", "#DIV/0!", "=A1", "4-25", "0-25M", "10M@0", "-", "1,200",
                     "semi-low-density", "one end continuous", "free", "3.5e2"]),
    st.text(max_size=6),
)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(rows=st.lists(st.lists(_cell, min_size=len(FUZZ_HEADER), max_size=len(FUZZ_HEADER)), min_size=1, max_size=6))
def test_any_cell_contents_give_spans_or_explained_failures(tmp_path_factory, rows):
    # rule 7 of the project: bad input is explained and the rest is still checked; nothing crashes
    from beamsched.engine import check_schedule
    from beamsched.model import BeamInput, RowFailure

    clean = [list(r) for r in rows]  # text starting with '=' is written as a formula without a result
    for r in clean:
        for i, v in enumerate(r):
            if isinstance(v, str) and any(ord(ch) < 32 for ch in v):
                r[i] = None  # control characters cannot be stored in a workbook
    path = write_schedule(tmp_path_factory.mktemp("f") / "f.xlsx", FUZZ_HEADER, clean)
    s = read_schedule(path)
    for r in s.rows:
        assert isinstance(r, (BeamInput, RowFailure))
        if isinstance(r, RowFailure):
            assert r.problems and all(p.message and p.row == r.row for p in r.problems)
    results = check_schedule(s)
    assert len(results) == len(s.rows)
