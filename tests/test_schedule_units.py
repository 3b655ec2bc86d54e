"""Units in schedule headers and the Parameters sheet.

Conversion factors: NIST Special Publication 811 (2008 edition), Appendix B.8 "Factors for units
listed alphabetically" (the 7-digit factors below are quoted from memory of that table; the
inch and foot are exact by definition: 1 in = 25.4 mm, 1 ft = 0.3048 m). pint is the library
under test here only through beamsched.schedule.units, and these factors are independent of it.
"""

from __future__ import annotations

import pytest

from beamsched.model import RowFailure
from beamsched.schedule import ScheduleError, read_schedule
from beamsched.schedule.units import UnitError, unit_factor
from beamsched.schedule.writer import write_schedule

LBF_N = 4.448222  # NIST SP 811 B.8: pound-force -> newton
PSI_KPA = 6.894757  # NIST SP 811 B.8: pound-force per square inch -> kilopascal
FTLBF_J = 1.355818  # NIST SP 811 B.8: foot pound-force -> joule (N·m)
INLBF_NM = 0.1129848  # NIST SP 811 B.8: inch pound-force -> newton metre
# Tolerance rel=5e-7: half a unit in the 7th significant digit of the published factors.

# (unit as typed, dimension, engine units per unit: mm, MPa, N, N·mm)
FACTORS = [
    ("mm", "length", 1.0), ("m", "span", 1000.0), ("in", "length", 25.4), ("inch", "length", 25.4),
    ("ft", "span", 304.8), ("feet", "span", 304.8),  # exact: 1 in = 25.4 mm (NIST SP 811 B.8)
    ("MPa", "stress", 1.0), ("N/mm²", "stress", 1.0), ("psi", "stress", PSI_KPA / 1000),
    ("ksi", "stress", PSI_KPA),
    ("kN", "force", 1000.0), ("N", "force", 1.0), ("kip", "force", LBF_N * 1000), ("kips", "force", LBF_N * 1000),
    ("kN·m", "moment", 1e6), ("kNm", "moment", 1e6), ("kN-m", "moment", 1e6), ("kN.m", "moment", 1e6),
    ("kN m", "moment", 1e6), ("kip-ft", "moment", FTLBF_J * 1e6), ("kip·ft", "moment", FTLBF_J * 1e6),
    ("k-ft", "moment", FTLBF_J * 1e6), ("ft-kip", "moment", FTLBF_J * 1e6),
    ("kip·in", "moment", INLBF_NM * 1e6), ("kip-in", "moment", INLBF_NM * 1e6), ("N·mm", "moment", 1.0),
]


@pytest.mark.parametrize("unit,dimension,expected", FACTORS, ids=[f[0] + "-" + f[1] for f in FACTORS])
def test_unit_factor_matches_nist_sp811(unit, dimension, expected):
    assert unit_factor(unit, dimension) == pytest.approx(expected, rel=5e-7)


@pytest.mark.parametrize("unit,dimension,words", [
    ("kNn", "moment", "unknown unit 'kNn'"),
    ("furlongs per fortnight", "force", "not a force"),
    ("bananas", "force", "unknown unit 'bananas'"),
    ("kN", "moment", "not a moment"),
    ("kN·m", "force", "not a force"),
    ("psi", "length", "not a length"),
    ("mm", "stress", "not a stress"),
])
def test_unknown_or_wrong_units_are_errors(unit, dimension, words):
    with pytest.raises(UnitError, match=words):
        unit_factor(unit, dimension)


SI = ["Mark", "Type", "bw (mm)", "h (mm)", "Span (m)", "Cover (mm)", "Bottom bars", "Top bars", "Stirrups",
      "f'c (MPa)", "fy (MPa)", "Mf+ (kN·m)", "Mf- (kN·m)", "Vf (kN)", "Tf (kN·m)"]
US = ["Mark", "Type", "bw (in)", "h (in)", "Span (ft)", "Cover (in)", "Bottom bars", "Top bars", "Stirrups",
      "f'c (psi)", "fy (ksi)", "Mf+ (kip-ft)", "Mf- (kip·in)", "Vf (kip)", "Tf (kip-ft)"]


def test_us_customary_headers_convert_to_the_same_span(tmp_path):
    # 12 in x 24 in, 20 ft, 1.5 in cover, 4000 psi, 60 ksi; 150 kip-ft, 1800 kip-in, 40 kip
    us = ["B1", "Rect", 12, 24, 20, 1.5, "3-25M", "3-25M", "10M@250", 4000, 60, 150, 1800, 40, 5]
    s = read_schedule(write_schedule(tmp_path / "us.xlsx", US, [us]))
    (b,) = s.spans
    assert b.bw == pytest.approx(304.8) and b.h == pytest.approx(609.6) and b.span == pytest.approx(6096.0)
    assert b.cover_top == b.cover_bottom == pytest.approx(38.1)
    assert b.fc == pytest.approx(4000 * PSI_KPA / 1000, rel=5e-7)  # 27.579 MPa
    assert b.fy == pytest.approx(60 * PSI_KPA, rel=5e-7)  # 413.69 MPa
    assert b.Mf_pos == pytest.approx(150 * FTLBF_J * 1e6, rel=5e-7)
    assert b.Mf_neg_left == b.Mf_neg_right == pytest.approx(1800 * INLBF_NM * 1e6, rel=5e-7)
    assert b.Vf_left == pytest.approx(40 * LBF_N * 1e3, rel=5e-7)
    assert b.Tf == pytest.approx(5 * FTLBF_J * 1e6, rel=5e-7)
    assert s.units_assumed == ()


def test_a_moment_in_kip_ft_read_right_is_about_a_third_more_than_the_number(tmp_path):
    # the warning: kip-ft read as kN·m understates demand (1 kip·ft = 1.355818 kN·m, NIST SP 811)
    row = ["B1", "Rect", 300, 600, 6, 40, "3-25M", "3-25M", "10M@250", 30, 400, 100, 100, 100, 0]
    si = read_schedule(write_schedule(tmp_path / "si.xlsx", SI, [row])).spans[0]
    kipft = read_schedule(write_schedule(tmp_path / "k.xlsx", [h.replace("Mf+ (kN·m)", "Mf+ (kip-ft)") for h in SI],
                                         [row])).spans[0]
    assert kipft.Mf_pos / si.Mf_pos == pytest.approx(FTLBF_J, rel=5e-7)


BARE = ["Mark", "Type", "bw", "h", "Span", "Bottom bars", "Top bars", "Stirrups", "Mf+", "Mf-", "Vf"]


def test_unit_system_fills_bare_headers_and_lists_them(tmp_path):
    params = [["Unit system", "US customary"], ["f'c", 4000, "psi"], ["fy", "60 ksi"], ["Cover", 1.5]]
    row = ["B1", "Rect", 12, 24, 20, "3-25M", "3-25M", "10M@250", 150, 120, 40]
    s = read_schedule(write_schedule(tmp_path / "bare.xlsx", BARE, [row], parameters=params))
    (b,) = s.spans
    assert b.bw == pytest.approx(304.8) and b.span == pytest.approx(6096.0)  # in and ft, exact
    assert b.Mf_pos == pytest.approx(150 * FTLBF_J * 1e6, rel=5e-7) and b.Vf_left == pytest.approx(40 * LBF_N * 1e3)
    assert b.fc == pytest.approx(4000 * PSI_KPA / 1000, rel=5e-7) and b.fy == pytest.approx(60 * PSI_KPA, rel=5e-7)
    assert b.cover_top == pytest.approx(38.1)  # 1.5 in, the unit from the declared system
    listed = " | ".join(s.units_assumed)
    for words in ("bw: in", "Span: ft", "Mf+: kip-ft", "Vf: kip"):
        assert words in listed
    assert "US customary" in s.defaults["Unit system"]


def test_bare_headers_without_unit_system_are_errors_naming_each_column(tmp_path):
    row = ["B1", "Rect", 300, 600, 6, "3-25M", "3-25M", "10M@250", 150, 120, 40]
    s = read_schedule(write_schedule(tmp_path / "bare.xlsx", BARE, [row], parameters=[["f'c", 30, "MPa"],
                                                                                      ["fy", 400, "MPa"]]))
    named = {p.column for p in s.problems if "no unit" in p.message}
    assert named == {"bw", "h", "Span", "Mf+", "Mf-", "Vf"}
    (f,) = s.failures
    assert isinstance(f, RowFailure) and len(f.problems) == 6


def test_parameters_defaults_and_row_values(tmp_path):
    # beamsched issue 3: a row's own value wins over a default; density -> λ as CSA A23.3-19 cl. 8.6.5
    params = [["Project", "Northgate Annex"], ["Project no.", "NA-2291"], ["Level", "2"], ["Revision", "B"],
              ["Prepared by", "JK"], ["Checked by", "MT"], ["Date", "2026-11-30"], ["Design code", "CSA A23.3-19"],
              ["f'c", 35, "MPa"], ["fy", 400, "MPa"], ["fyt", 400, "MPa"], ["Cover", 30, "mm"],
              ["Max aggregate", 14, "mm"], ["Exposure", "interior"], ["Concrete density", "semi-low-density"],
              ["Precast (certified plant)", "yes"], ["Clear distance between layers", 25, "mm"]]
    header = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "Agg (mm)", "Exposure", "Bottom bars"]
    rows = [["B1", 300, 600, None, None, None, "3-25M"], ["B2", 300, 600, 40, 28, "exterior", "3-25M"]]
    s = read_schedule(write_schedule(tmp_path / "p.xlsx", header, rows, parameters=params))
    b1, b2 = s.spans
    assert s.project == {"project": "Northgate Annex", "project_no": "NA-2291", "level": "2", "revision": "B",
                         "prepared_by": "JK", "checked_by": "MT", "date": "2026-11-30"}
    assert (b1.fc, b1.agg, b1.exposure, b1.cover_top, b1.layer_clear) == (35, 14, "interior", 30, 25)
    assert (b2.fc, b2.agg, b2.exposure) == (40, 28, "exterior")
    assert b1.lam == b2.lam == 0.85 and b1.density == "semi-low-density"  # cl. 8.6.5
    assert b1.precast and b1.fyt == 400
    assert any("f'c = 35 MPa from the Parameters sheet" in a for a in b1.assumed)
    assert not any(a.startswith("f'c") for a in b2.assumed)


def test_conservative_builtin_defaults_are_flagged_per_span(tmp_path):
    header = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Span (m)"]
    s = read_schedule(write_schedule(tmp_path / "d.xlsx", header, [["B1", 300, 600, 30, 400, 6]]))
    (b,) = s.spans
    assert b.exposure == "exterior" and b.agg == 20 and b.lam == 1.0 and b.clear_span == 6000
    text = " | ".join(b.assumed)
    for words in ("exterior assumed", "Max aggregate = 20 mm assumed", "Cover top = 40 mm assumed",
                  "normal density assumed", "c/c span 6 m stands in", "both ends taken as simple"):
        assert words in text
    assert s.defaults["Max aggregate"].startswith("20 mm (assumed")


@pytest.mark.parametrize("density,lam", [("normal", 1.0), ("semi-low-density", 0.85), ("low-density", 0.75),
                                         ("Low density", 0.75), ("semi-lightweight", 0.85)])
def test_density_maps_to_lambda(tmp_path, density, lam):
    # CSA A23.3-19 cl. 8.6.5: λ = 1.0 normal, 0.85 semi-low-density, 0.75 low-density
    header = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Density"]
    s = read_schedule(write_schedule(tmp_path / "l.xlsx", header, [["B1", 300, 600, 30, 400, density]]))
    assert s.spans[0].lam == lam


def test_parameter_problems(tmp_path):
    params = [["f'c", 30], ["Unit system", "cubits"], ["Exposure", "sometimes"], ["Colour", "blue"]]
    header = ["Mark", "bw (mm)", "h (mm)", "fy (MPa)"]
    s = read_schedule(write_schedule(tmp_path / "pp.xlsx", header, [["B1", 300, 600, 400]], parameters=params))
    msgs = [p.message for p in s.problems]
    assert any("'f'c' = 30: no unit" in m for m in msgs)
    assert any("unit system not understood" in m for m in msgs)
    assert any("'Exposure' = 'sometimes'" in m and "interior or exterior" in m for m in msgs)
    assert any("'Colour' is not a parameter" in m for m in msgs)
    # a Parameters row is not a schedule row: its number is in the words, Problem.row stays None
    param_problems = [p for p in s.problems if (p.column or "").startswith("Parameters:")]
    assert len(param_problems) == 4 and all(p.row is None for p in param_problems)
    assert any(p.message.startswith("Parameters row 5") for p in param_problems)
    (f,) = s.failures  # no f'c anywhere
    assert "f'c" in f.problems[0].message and "Parameters sheet gives none" in f.problems[0].message


def test_unknown_design_code_stops_the_file(tmp_path):
    header = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)"]
    p = write_schedule(tmp_path / "c.xlsx", header, [["B1", 300, 600, 30, 400]],
                       parameters=[["Design code", "Some other standard"]])
    with pytest.raises(ScheduleError, match="design code 'Some other standard'"):
        read_schedule(p)


def test_parameter_values_typed_as_text(tmp_path):
    # a decimal typed as text is a number, not a number and a unit; 1 in = 25.4 mm exactly (NIST SP 811)
    params = [["Unit system", "US customary"], ["Cover", "1.5"], ["f'c", "5000", "psi"], ["fy", "60 ksi"],
              ["Max aggregate", "0.75 in"]]
    s = read_schedule(write_schedule(tmp_path / "t.xlsx", ["Mark", "bw (mm)", "h (mm)"], [["T1", 300, 600]],
                                     parameters=params))
    (b,) = s.spans
    assert b.cover_top == pytest.approx(38.1) and b.agg == pytest.approx(19.05)
    assert b.fc == pytest.approx(5000 * PSI_KPA / 1000, rel=5e-7) and b.fy == pytest.approx(60 * PSI_KPA, rel=5e-7)
    assert not [p for p in s.problems if p.severity == "error"]


def test_number_messages_name_the_unit_in_words(tmp_path):
    s = read_schedule(write_schedule(tmp_path / "w.xlsx", ["Mark", "bw (in)", "h (in)", "f'c (psi)", "fy (ksi)"],
                                     [["W1", 12, '24"', 4000, 60]]))
    assert "expected a number in inches" in s.failures[0].problems[0].message
