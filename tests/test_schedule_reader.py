"""The schedule reader: header detection, column matching, row validation, duplicates.

Sources: the issue's contract for schedule input (beamsched issue 3); CSA A23.3-19 cl. 8.6.1.1
(f'c 20 to 80 MPa) and cl. 8.5.1 (fy at most 500 MPa) for the material limits, reached through
``beamsched.engine.validate``; cl. 8.6.5 for λ. Bar sizes: CSA G30.18 (from memory, as in
beamsched.bars).
"""

from __future__ import annotations

import datetime
import random

import pytest

from beamsched.engine import check_schedule
from beamsched.model import BeamInput, BeamStatus, RowFailure
from beamsched.schedule import ScheduleError, read_schedule
from beamsched.schedule.writer import write_schedule

HEADER = ["Mark", "Span no.", "Type", "bw (mm)", "h (mm)", "hf (mm)", "bf (mm)", "Span (m)", "Clear span (m)",
          "Left end", "Right end", "Bottom bars", "Top bars L", "Top bars R", "Stirrups", "f'c (MPa)", "fy (MPa)",
          "Mf+ (kN·m)", "Mf- L (kN·m)", "Mf- R (kN·m)", "Vf L (kN)", "Vf R (kN)", "d (mm)", "Cover (mm)"]
GOOD = ["B1", 1, "T", 300, 600, 125, 1500, 7.2, 6.8, "simple", "continuous", "4-25M", "3-20M", "4-25M", "10M@200",
        30, 400, 250, 60, 300, 210, 240, None, 40]


def row(changes: dict | None = None) -> list:
    r = dict(zip(HEADER, GOOD, strict=True))
    r.update(changes or {})
    assert set(r) == set(HEADER)
    return [r[h] for h in HEADER]


def write(tmp_path, rows, header=HEADER, name="s.xlsx", **kw):
    return read_schedule(write_schedule(tmp_path / name, header, rows, **kw))


def problems_of(schedule, number):
    (r,) = [x for x in schedule.rows if x.row == number]
    assert isinstance(r, RowFailure), f"row {number} read without problems: {r}"
    return [p.message for p in r.problems]


# Each bad value, the column it sits in, and words its message must contain.
# Source: beamsched issue 3, "Validation" (each category listed there).
CASES = [
    ("text in a number column", {"bw (mm)": "300mm"}, "bw (mm)", ["text, not a number", "header"]),
    ("decimal comma", {"Span (m)": "7,2"}, "Span (m)", ["text, not a number", "'.'"]),
    ("blank required h", {"h (mm)": None}, "h (mm)", ["blank", "positive number"]),
    ("blank required bw", {"bw (mm)": None}, "bw (mm)", ["blank"]),
    ("blank mark", {"Mark": None}, "Mark", ["Mark is blank"]),
    ("zero bw", {"bw (mm)": 0}, "bw (mm)", ["positive number"]),
    ("negative h", {"h (mm)": -600}, "h (mm)", ["positive number"]),
    ("hf >= h", {"hf (mm)": 600}, "hf (mm)", ["less than h = 600 mm"]),
    ("bf < bw", {"bf (mm)": 250}, "bf (mm)", ["at least bw = 300 mm"]),
    ("d >= h", {"d (mm)": 600}, "d (mm)", ["less than h = 600 mm"]),
    ("negative cover", {"Cover (mm)": -5}, "Cover (mm)", ["zero or more"]),
    ("unknown bar size", {"Bottom bars": "4-28M"}, "Bottom bars", ["unknown bar size '28M'", "25M"]),
    ("unreadable bars", {"Top bars L": "4-25"}, "Top bars L", ["unreadable bar notation", "4-25M"]),
    ("bars as a number", {"Top bars R": 4}, "Top bars R", ["a number, not bar notation"]),
    ("unreadable stirrups", {"Stirrups": "10M-200"}, "Stirrups", ["unreadable stirrup notation", "10M@200"]),
    ("zero stirrup spacing", {"Stirrups": "10M@0"}, "Stirrups", ["spacing must be greater than zero"]),
    # CSA A23.3-19 cl. 8.6.1.1: f'c from 20 to 80 MPa
    ("f'c below range", {"f'c (MPa)": 15}, "f'c (MPa)", ["20 to 80 MPa", "8.6.1.1"]),
    ("f'c above range", {"f'c (MPa)": 90}, "f'c (MPa)", ["20 to 80 MPa"]),
    # CSA A23.3-19 cl. 8.5.1: fy at most 500 MPa
    ("fy above range", {"fy (MPa)": 550}, "fy (MPa)", ["at most 500 MPa", "8.5.1"]),
    ("T with no flange", {"hf (mm)": None}, "hf (mm)", ["flange thickness"]),
    ("negative Mf+", {"Mf+ (kN·m)": -40}, "Mf+ (kN·m)", ["zero or more"]),
    ("unknown Type", {"Type": "I"}, "Type", ["Rect, T or L"]),
    ("unknown end", {"Left end": "roller"}, "Left end", ["simple, continuous or free"]),
    ("clear span over span", {"Clear span (m)": 7.5}, "Clear span (m)", ["no more than the span"]),
    ("span no. not whole", {"Span no.": 1.5}, "Span no.", ["whole"]),
    ("span no. infinite", {"Span no.": "INF"}, "Span no.", ["whole"]),  # float('INF') reads; int() cannot
    ("excel error value", {"Vf L (kN)": "#DIV/0!"}, "Vf L (kN)", ["error #DIV/0!"]),
    # a spreadsheet turns '4-25' typed into a cell into the 4th of a month
    ("date in a bar column", {"Top bars R": datetime.datetime(2026, 4, 25)}, "Top bars R", ["a date", "as Text"]),
    ("date in a number column", {"Span (m)": datetime.datetime(2026, 7, 2)}, "Span (m)", ["a date"]),
]


@pytest.mark.parametrize("name,change,column,words", CASES, ids=[c[0] for c in CASES])
def test_each_problem_names_row_column_value_and_the_rest_is_checked(tmp_path, name, change, column, words):
    bad = dict(zip(HEADER, GOOD, strict=True))
    bad.update(change)
    bad["Mark"] = change.get("Mark", "B9")
    rows = [GOOD, [bad[h] for h in HEADER], ["B3"] + GOOD[1:]]
    s = write(tmp_path, rows)
    (failure,) = s.failures
    assert failure.row == 3  # header on row 1, the bad row is the second data row
    p = next(p for p in failure.problems if p.column == column)
    assert p.row == 3 and p.severity == "error"
    assert f"row 3, '{column}'" in p.message
    for w in words:
        assert w in p.message, p.message
    # the rows either side are still read and checked
    results = check_schedule(s)
    assert [r.row for r in results] == [2, 3, 4]
    assert results[1].status is BeamStatus.ERROR and results[1].problems
    assert results[0].status is not BeamStatus.ERROR and results[2].status is not BeamStatus.ERROR


def test_mf_neg_is_a_magnitude_either_sign(tmp_path):
    # beamsched issue 3: Mf- values are magnitudes; either sign reads as hogging
    s = write(tmp_path, [row(), ["B2"] + row()[1:]])
    s2 = write(tmp_path, [row({"Mf- L (kN·m)": -60, "Mf- R (kN·m)": -300})], name="neg.xlsx")
    a, b = s.spans[0], s2.spans[0]
    assert a.Mf_neg_left == b.Mf_neg_left == 60e6 and a.Mf_neg_right == b.Mf_neg_right == 300e6


def test_blank_demand_stays_none_and_is_not_checked(tmp_path):
    # beamsched issue 3: a blank demand is never read as zero
    s = write(tmp_path, [row({"Mf+ (kN·m)": None, "Vf L (kN)": None})])
    (span,) = s.spans
    assert span.Mf_pos is None and span.Vf_left is None and span.Vf_right == 240e3
    (result,) = check_schedule(s)
    pos = [c for c in result.checks if c.id == "flexure_pos" and c.location == "mid"]
    assert pos and pos[0].status.value == "not_checked" and pos[0].message


def test_header_found_under_title_block_with_merged_cells(tmp_path):
    import openpyxl

    title = [["NORTHGATE ANNEX - LEVEL 2 BEAM SCHEDULE"], ["Prepared by: J.K."], [], ["Issued for review"]]
    path = write_schedule(tmp_path / "t.xlsx", HEADER, [GOOD], title=title)
    wb = openpyxl.load_workbook(path)
    wb.active.merge_cells("A1:H1")
    wb.save(path)
    s = read_schedule(path)
    assert s.header_row == 5 and len(s.spans) == 1 and s.spans[0].row == 6


def test_header_beyond_row_30_is_not_found(tmp_path):
    title = [[f"note {i}"] for i in range(30)]
    path = write_schedule(tmp_path / "deep.xlsx", HEADER, [GOOD], title=title)
    with pytest.raises(ScheduleError, match="no sheet has a header row with a 'Mark' cell"):
        read_schedule(path)


def test_shuffled_columns_and_label_spellings_read_the_same(tmp_path):
    base = write(tmp_path, [GOOD]).spans[0]
    order = list(range(len(HEADER)))
    random.Random(3).shuffle(order)
    spelled = {"Mark": "BEAM MARK", "Span no.": "span_no", "bw (mm)": "BW [mm]", "Top bars L": "top bars (left)",
               "Mf- L (kN·m)": "Mf− L (kNm)", "f'c (MPa)": "f’c (N/mm²)", "Vf R (kN)": "vf  r (kN)"}
    header = [spelled.get(HEADER[i], HEADER[i]) for i in order]
    shuffled = write(tmp_path, [[GOOD[i] for i in order]], header=header, name="shuffled.xlsx").spans[0]
    assert shuffled == base


def test_blank_rows_are_skipped_and_rows_keep_their_numbers(tmp_path):
    s = write(tmp_path, [GOOD, [None] * len(HEADER), ["B2"] + GOOD[1:]])
    assert [r.row for r in s.rows] == [2, 4]


def test_multi_span_beam_is_one_row_per_span(tmp_path):
    rows = [row(), row({"Span no.": 2, "Left end": "continuous"}), row({"Span no.": 3, "Right end": "simple"})]
    s = write(tmp_path, rows)
    assert [(r.mark, r.span_no) for r in s.spans] == [("B1", 1), ("B1", 2), ("B1", 3)]
    assert [r.label for r in check_schedule(s)] == ["B1 span 1", "B1 span 2", "B1 span 3"]


def test_duplicate_identical_is_a_warning_on_each(tmp_path):
    s = write(tmp_path, [GOOD, GOOD])
    assert len(s.spans) == 2
    for span in s.spans:
        (w,) = span.warnings
        assert w.severity == "warning" and "identically" in w.message


def test_duplicate_with_different_contents_fails_both(tmp_path):
    s = write(tmp_path, [GOOD, row({"Bottom bars": "3-25M"}), ["B2"] + GOOD[1:]])
    assert [type(r) for r in s.rows] == [RowFailure, RowFailure, BeamInput]
    for f in s.failures:
        assert any("different contents (Bottom bars)" in p.message for p in f.problems)


def test_unknown_unit_names_the_column(tmp_path):
    header = [h.replace("Mf+ (kN·m)", "Mf+ (kNn)") for h in HEADER]
    s = write(tmp_path, [GOOD], header=header)
    assert any(p.column == "Mf+ (kNn)" and "unknown unit 'kNn'" in p.message for p in s.problems)
    (f,) = s.failures
    assert "Mf+ (kNn)" in f.problems[0].message


def test_wrong_kind_of_unit_is_an_error(tmp_path):
    header = [h.replace("Vf L (kN)", "Vf L (kN·m)") for h in HEADER]
    s = write(tmp_path, [GOOD], header=header)
    assert any("not a force" in p.message for p in s.problems)
    assert s.failures


def test_missing_unit_without_unit_system_is_an_error(tmp_path):
    header = [h.replace("Mf+ (kN·m)", "Mf+") for h in HEADER]
    s = write(tmp_path, [GOOD], header=header)
    assert any("no unit" in p.message and p.column == "Mf+" for p in s.problems)
    assert s.failures and not s.spans


def test_unrecognised_column_is_a_warning(tmp_path):
    s = write(tmp_path, [GOOD + ["x"]], header=HEADER + ["Vu (kN)"])
    assert any(p.severity == "warning" and "'Vu (kN)' is not a column" in p.message for p in s.problems)
    assert s.spans


@pytest.mark.parametrize("path_name,content,words", [
    ("missing.xlsx", None, "no such file"),
    ("text.xlsx", b"not a zip", "not an .xlsx/.xlsm workbook"),
    ("old.xls", b"\xd0\xcf\x11\xe0", ".xls format is not read"),
])
def test_unreadable_files_raise_schedule_error(tmp_path, path_name, content, words):
    p = tmp_path / path_name
    if content is not None:
        p.write_bytes(content)
    with pytest.raises(ScheduleError, match=words.replace(".", r"\.")):
        read_schedule(p)


def test_no_mark_header_lists_sheets_and_what_was_seen(tmp_path):
    p = write_schedule(tmp_path / "nomark.xlsx", ["Beam ref no", "Width"], [["B1", 300]])
    import openpyxl

    wb = openpyxl.load_workbook(p)
    wb.active["A1"] = "Ident"
    wb.save(p)
    with pytest.raises(ScheduleError) as exc:
        read_schedule(p)
    assert "'Schedule'" in str(exc.value) and "Ident" in str(exc.value)


def test_sheet_by_name_and_first_with_mark(tmp_path):
    import openpyxl

    p = write_schedule(tmp_path / "two.xlsx", HEADER, [GOOD])
    wb = openpyxl.load_workbook(p)
    cover = wb.create_sheet("Cover sheet", 0)
    cover["A1"] = "Drawing list"
    other = wb.create_sheet("Level 4")
    other.append(HEADER)
    other.append(["L4-B1"] + GOOD[1:])
    wb.save(p)
    assert read_schedule(p).sheet == "Schedule"
    s = read_schedule(p, sheet="level 4")
    assert s.sheet == "Level 4" and s.spans[0].mark == "L4-B1"
    with pytest.raises(ScheduleError, match="no sheet named 'Level 9'"):
        read_schedule(p, sheet="Level 9")


def test_file_facts_are_recorded(tmp_path):
    import hashlib

    p = write_schedule(tmp_path / "f.xlsx", HEADER, [GOOD])
    s = read_schedule(p)
    assert s.file_sha256 == hashlib.sha256(p.read_bytes()).hexdigest()
    assert s.file_modified.endswith("+00:00") and s.sheet == "Schedule" and s.code == "CSA A23.3-19"
    assert s.columns["mf_neg_l"] == "Mf- L (kN·m)"


def test_input_file_is_not_modified(tmp_path):
    p = write_schedule(tmp_path / "ro.xlsx", HEADER, [GOOD])
    before = (p.read_bytes(), p.stat().st_mtime_ns)
    read_schedule(p)
    assert (p.read_bytes(), p.stat().st_mtime_ns) == before


def test_every_problem_of_a_row_is_reported_at_once(tmp_path):
    # beamsched issue 3: each row becomes a span or the list of its problems
    bad = row({"Stirrups": "10M@0", "f'c (MPa)": 15, "hf (mm)": 650, "Mf+ (kN·m)": -20})
    s = write(tmp_path, [bad])
    (f,) = s.failures
    assert {p.column for p in f.problems} == {"Stirrups", "f'c (MPa)", "hf (mm)", "Mf+ (kN·m)"}
    bad = row({"bw (mm)": "wide", "fy (MPa)": 520})
    (f,) = write(tmp_path, [bad], name="two.xlsx").failures
    assert {p.column for p in f.problems} == {"bw (mm)", "fy (MPa)"}


def test_qty_rect_flanges_and_type_blank(tmp_path):
    s = write(tmp_path, [row({"Type": "Rect"}), row({"Mark": "B2", "Type": None}), row({"Mark": "B3", "Type": None,
                                                                                      "hf (mm)": None,
                                                                                      "bf (mm)": None})])
    rect, blank_with_flange, blank = s.rows
    assert rect.shape == "rect" and rect.hf is None and "flange sizes given (hf, bf) are ignored" in \
        rect.warnings[0].message
    assert isinstance(blank_with_flange, RowFailure)
    assert "Type is blank but flange sizes are given" in blank_with_flange.problems[0].message
    assert blank.shape == "rect" and "Type blank: rectangular section assumed" in blank.assumed


def test_a_row_with_only_its_mark_gets_one_clear_problem(tmp_path):
    s = write(tmp_path, [GOOD, ["LEVEL 3 BEAMS"] + [None] * (len(HEADER) - 1), ["B2"] + GOOD[1:]])
    (f,) = s.failures
    (p,) = f.problems
    assert f.row == 3 and "only the Mark is filled" in p.message and "sub-heading" in p.message
    assert len(s.spans) == 2


def test_a_psi_value_in_an_mpa_column_gets_a_hint(tmp_path):
    # CSA A23.3-19 cl. 8.5.1: fy at most 500 MPa; 60000 is fy in psi
    (f,) = write(tmp_path, [row({"fy (MPa)": 60000})]).failures
    assert "at most 500 MPa" in f.problems[0].message and "'fy (psi)'" in f.problems[0].message


def test_one_message_per_cell(tmp_path):
    # 'Cover' feeds both the top and the bottom cover: one bad cell, one message
    (f,) = write(tmp_path, [row({"Cover (mm)": -5})]).failures
    assert [p.column for p in f.problems] == ["Cover (mm)"]


def test_inch_pound_bar_sizes_get_a_hint(tmp_path):
    # bar sizes: CSA G30.18 metric only (beamsched.bars)
    (f,) = write(tmp_path, [row({"Stirrups": "#3@12", "Bottom bars": "4-#8"})]).failures
    for p in f.problems:
        assert "write the CSA G30.18 size" in p.message


@pytest.mark.parametrize("label,key,unit", [
    ("Mf+ kN·m", "mf_pos", "kN·m"), ("Span, m", "span", "m"), ("fy ksi", "fy", "ksi"), ("Vf L kip", "vf_l", "kip"),
    ("Clear\nspan (m)", "clear_span", "m"), ("Mf- L\n(kN·m)", "mf_neg_l", "kN·m"), ("Mf+ foo", None, None),
    ("Bottom bars mm", None, None),
])
def test_units_without_brackets_and_line_breaks_in_headers(label, key, unit):
    from beamsched.schedule.columns import match_header

    col, u = match_header(label)
    assert (col.key if col else None, u) == (key, unit)


def test_the_psi_hint_names_the_column_it_is_about(tmp_path):
    (f,) = write(tmp_path, [row({"f'c (MPa)": 4000})]).failures
    assert "e.g. 'f'c (psi)'" in f.problems[0].message


def test_a_beam_marked_l_right_under_the_header_is_a_row_not_sub_labels(tmp_path):
    # a second header row holds L / R under headings; under the Mark it can only be data (found by
    # the property test: a beam marked 'L' on the first row lost the Mark column)
    s = write(tmp_path, [["L"] + [None] * (len(HEADER) - 1), row({"Mark": "R"})])
    assert s.header_row == 1 and s.columns["mark"] == "Mark" and [b.mark for b in s.spans] == ["R"]
    (f,) = s.failures
    assert (f.mark, f.row) == ("L", 2) and "only the Mark is filled" in f.problems[0].message


def test_equal_notation_is_one_object_and_bad_notation_fails_every_row_that_holds_it(tmp_path):
    s = write(tmp_path, [row({"Mark": "A1"}), row({"Mark": "A2"}), row({"Mark": "A3", "Bottom bars": "4-25"}),
                         row({"Mark": "A4", "Bottom bars": "4-25"})])
    a1, a2 = s.spans
    assert a1.bottom_bars is a2.bottom_bars and str(a1.bottom_bars) == "4-25M"
    assert a1.stirrups is a2.stirrups and a1.top_bars_right is a2.top_bars_right
    assert [(f.mark, [p.column for p in f.problems]) for f in s.failures] == [("A3", ["Bottom bars"]),
                                                                              ("A4", ["Bottom bars"])]
    assert [f.problems[0].message.split(":")[0] for f in s.failures] == ["row 4, 'Bottom bars' = '4-25'",
                                                                        "row 5, 'Bottom bars' = '4-25'"]


def test_the_fast_and_the_openpyxl_paths_give_the_same_schedule(tmp_path, monkeypatch):
    from beamsched.schedule import cells
    from beamsched.schedule.samples import generate_schedule

    p = generate_schedule(tmp_path / "gen.xlsx", 150, seed=3)
    fast = read_schedule(p)

    def refuse(path):
        raise RuntimeError("fast path off")

    monkeypatch.setattr(cells, "read_workbook_calamine", refuse)  # read_workbook falls back to openpyxl
    slow = read_schedule(p)
    assert fast == slow and len(fast.rows) == 150
    assert [getattr(r, "source", None) for r in fast.rows] == [getattr(r, "source", None) for r in slow.rows]
