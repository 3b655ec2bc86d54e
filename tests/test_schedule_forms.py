"""The two forms of the support-end columns, the Support shorthand, CSV input and formula cells.

Source: beamsched issue 3 (the schedule contract); the end conditions of CSA A23.3-19
Table 9.2 (simple, one end continuous, both ends continuous, cantilever) for the shorthand.
The cached value of a formula cell is the <v> element of a <c> cell in the sheet XML
(ECMA-376 Part 1, §18.3.1.4 "c (Cell)" and §18.3.1.96 "v (Cell Value)").
"""

from __future__ import annotations

import re
import shutil
import subprocess
import zipfile

import pytest

from beamsched.engine import check_schedule
from beamsched.model import RowFailure
from beamsched.schedule import read_schedule
from beamsched.schedule.writer import write_schedule

COMMON = ["Mark", "Span no.", "Type", "bw (mm)", "h (mm)", "hf (mm)", "Span (m)", "Bottom bars", "Stirrups",
          "f'c (MPa)", "fy (MPa)", "Mf+ (kN·m)", "Left end", "Right end"]
COMMON_ROW = ["C4", 2, "T", 350, 650, 130, 8.4, "5-25M", "10M@225", 30, 400, 310, "continuous", "continuous"]
SINGLE = ["Top bars", "Mf- (kN·m)", "Vf (kN)"]
PAIRS = ["Top bars L", "Top bars R", "Mf- L (kN·m)", "Mf- R (kN·m)", "Vf L (kN)", "Vf R (kN)"]


def _results(schedule):
    return [(r.status, [(c.key, c.status, c.demand, c.capacity) for c in r.checks]) for r in check_schedule(schedule)]


def test_pair_columns_and_single_columns_agree_when_the_ends_are_equal(tmp_path):
    single = read_schedule(write_schedule(tmp_path / "single.xlsx", COMMON + SINGLE,
                                          [COMMON_ROW + ["5-25M", 360, 290]]))
    pairs = read_schedule(write_schedule(tmp_path / "pairs.xlsx", COMMON + PAIRS,
                                         [COMMON_ROW + ["5-25M", "5-25M", 360, 360, 290, 290]]))
    assert single.spans == pairs.spans  # every BeamInput field
    assert _results(single) == _results(pairs)
    b = single.spans[0]
    assert b.top_bars_left == b.top_bars_right and b.Mf_neg_left == b.Mf_neg_right == 360e6
    assert b.Vf_left == b.Vf_right == 290e3


def test_pair_cell_wins_over_the_single_column(tmp_path):
    s = read_schedule(write_schedule(tmp_path / "both.xlsx", COMMON + SINGLE + ["Mf- R (kN·m)", "Top bars L"],
                                     [COMMON_ROW + ["4-25M", 300, 250, 420, "6-25M"]]))
    b = s.spans[0]
    assert (b.Mf_neg_left, b.Mf_neg_right) == (300e6, 420e6)
    assert (b.top_bars_left.count, b.top_bars_right.count) == (6, 4)


def test_mf_pos_at_supports_with_bottom_bars_at_support(tmp_path):
    header = COMMON + ["Mf+ L (kN·m)", "Mf+ R (kN·m)", "Bottom bars at support", "Top bars at midspan", "Skin bars",
                       "Ms+ (kN·m)", "Ms- (kN·m)"]
    s = read_schedule(write_schedule(tmp_path / "rev.xlsx", header,
                                     [COMMON_ROW + [40, None, "3-20M", "2-15M", "2-10M", 200, -150]]))
    b = s.spans[0]
    assert b.Mf_pos_left == 40e6 and b.Mf_pos_right is None
    assert b.bottom_bars_support.area == 900 and b.top_bars_mid.area == 400 and b.skin_bars.area == 200
    assert (b.Ms_pos, b.Ms_neg) == (200e6, 150e6)


# (Support, span no., spans of the mark, expected left end, expected right end)
SHORTHAND = [
    ("simple", None, [None], "simple", "simple"),
    ("both ends continuous", 2, [1, 2, 3], "continuous", "continuous"),
    ("one end continuous", None, [None], "simple", "continuous"),  # a single span: continuity to the right
    ("one end continuous", 1, [1, 2], "simple", "continuous"),  # first span of a run
    ("one end continuous", 2, [1, 2], "continuous", "simple"),  # last span of a run
    ("one end continuous (left)", None, [None], "continuous", "simple"),
    ("cantilever", None, [None], "continuous", "free"),  # fixed at the left, tip at the right
    ("cantilever", 2, [1, 2], "continuous", "free"),  # the overhang beyond a back-span
    ("cantilever", 1, [1, 2], "free", "continuous"),  # an overhang at the start of a run
    ("cantilever (free right)", 1, [1, 2], "continuous", "free"),
]


@pytest.mark.parametrize("support,span_no,spans,left,right", SHORTHAND)
def test_support_shorthand(tmp_path, support, span_no, spans, left, right):
    header = ["Mark", "Span no.", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Support"]
    rows = [["K1", n, 300, 600, 30, 400, support if n == span_no else "simple"] for n in spans]
    s = read_schedule(write_schedule(tmp_path / "s.xlsx", header, rows))
    (b,) = [r for r in s.spans if r.span_no == span_no]
    assert (b.left_end, b.right_end) == (left, right)
    assert any(a.startswith(f"Support '{support}' read as") for a in b.assumed)


def test_left_right_end_columns_win_over_support_with_a_warning(tmp_path):
    header = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Support", "Left end", "Right end"]
    s = read_schedule(write_schedule(tmp_path / "e.xlsx", header,
                                     [["K1", 300, 600, 30, 400, "simple", "continuous", "free"]]))
    (b,) = s.spans
    assert (b.left_end, b.right_end) == ("continuous", "free")
    assert "disagrees" in b.warnings[0].message


def test_csv_reads_like_the_workbook(tmp_path):
    header = COMMON + PAIRS + ["Notes"]
    rows = [COMMON_ROW + ["5-25M", "4-25M", 360, "-300", 290, 270, "level 3, grid C"],
            ["C5", None, "Rect", "400", "700", None, "6.0", "4-30M", "10M@200", "35", "400", "410", "simple", "simple",
             "4-20M", "4-20M", None, None, "300", "300", ""]]
    xlsx = read_schedule(write_schedule(tmp_path / "s.xlsx", header, rows))
    csv = read_schedule(write_schedule(tmp_path / "s.csv", header, rows))
    assert csv.header_row is None and csv.spans == xlsx.spans and len(csv.spans) == 2
    assert csv.spans[0].notes == "level 3, grid C"


def test_csv_with_a_title_line_and_semicolons(tmp_path):
    p = tmp_path / "semi.csv"
    p.write_text("Beam schedule, level 1;;;;\nMark;bw (mm);h (mm);f'c (MPa);fy (MPa)\nB1;300;600;30;400\n"
                 "B2;300;abc;30;400\n", encoding="utf-8")
    s = read_schedule(p)
    assert [type(r).__name__ for r in s.rows] == ["BeamInput", "RowFailure"]
    assert "row 4, 'h (mm)' = 'abc'" in s.failures[0].problems[0].message


HEADER_F = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Span (m)", "Mf+ (kN·m)", "Bottom bars"]


def _formula_book(tmp_path):
    # Mf+ = 1.25 * 22 kN/m * 6^2 / 8 + 1.5 * 10 * 6^2 / 8 (invented loads, wl^2/8)
    rows = [["F1", 300, 600, 30, 400, 6, "=1.25*22*F2^2/8+1.5*10*F2^2/8", "4-25M"],
            ["F2", 300, 600, 30, 400, 6, 150, "4-25M"]]
    return write_schedule(tmp_path / "formula.xlsx", HEADER_F, rows)


EXPECTED_MF = (1.25 * 22 * 36 / 8 + 1.5 * 10 * 36 / 8) * 1e6  # 191.25 kN·m


def test_formula_without_cached_value_is_an_error_on_that_row(tmp_path):
    s = read_schedule(_formula_book(tmp_path))  # openpyxl stores no cached values
    f, b = s.rows
    assert isinstance(f, RowFailure) and b.Mf_pos == 150e6
    (p,) = f.problems
    assert p.column == "Mf+ (kN·m)" and "= '=1.25*22*F2^2/8+1.5*10*F2^2/8': a formula with no saved value" in p.message
    assert "open and save the workbook" in p.message


def test_formula_with_a_cached_value_written_into_the_xml(tmp_path):
    src = _formula_book(tmp_path)
    out = tmp_path / "cached.xlsx"
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
        for item in zin.infolist():
            data = zin.read(item.filename)
            if item.filename == "xl/worksheets/sheet1.xml":
                text, n = re.subn(r'(<c r="G2"[^>]*><f>[^<]*</f>)<v\s*/>', rf"\g<1><v>{EXPECTED_MF / 1e6}</v>",
                                  data.decode())
                assert n == 1
                data = text.encode()
            zout.writestr(item, data)
    s = read_schedule(out)
    assert s.spans[0].Mf_pos == pytest.approx(EXPECTED_MF) and not s.failures


@pytest.mark.skipif(shutil.which("soffice") is None, reason="LibreOffice (soffice) is not installed: it is the "
                                                            "spreadsheet program used to store formula results")
def test_formula_with_a_cached_value_from_libreoffice(tmp_path):
    src = _formula_book(tmp_path)
    outdir = tmp_path / "lo"
    outdir.mkdir()
    profile = tmp_path / "lo-profile"
    subprocess.run(["soffice", f"-env:UserInstallation=file://{profile}", "--headless", "--convert-to", "xlsx",
                    "--outdir", str(outdir), str(src)], check=True, capture_output=True, timeout=180)
    s = read_schedule(outdir / "formula.xlsx")
    assert s.spans[0].Mf_pos == pytest.approx(EXPECTED_MF) and len(s.spans) == 2
    assert s.spans[1].Mf_pos == 150e6


def test_text_starting_with_equals_is_not_a_formula(tmp_path):
    import openpyxl

    p = write_schedule(tmp_path / "eq.xlsx", HEADER_F + ["Notes"], [["F1", 300, 600, 30, 400, 6, 150, "4-25M", "x"]])
    wb = openpyxl.load_workbook(p)
    cell = wb.active["I2"]
    cell.value = "= see sketch SK-4"
    cell.data_type = "s"  # stored as text, as a spreadsheet does for a cell formatted as Text
    wb.save(p)
    (b,) = read_schedule(p).spans
    assert b.notes == "= see sketch SK-4"


def test_cover_top_and_bottom_split(tmp_path):
    header = ["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Cover (mm)", "Cover top (mm)", "Cover bottom (in)"]
    s = read_schedule(write_schedule(tmp_path / "c.xlsx", header, [["C1", 300, 600, 30, 400, 40, 30, None],
                                                                   ["C2", 300, 600, 30, 400, 40, None, 2]]))
    c1, c2 = s.spans
    assert (c1.cover_top, c1.cover_bottom) == (30, 40)
    assert (c2.cover_top, c2.cover_bottom) == (40, pytest.approx(50.8))  # 2 in = 50.8 mm exactly (NIST SP 811)


@pytest.mark.skipif(shutil.which("soffice") is None, reason="LibreOffice (soffice) is not installed: it is the "
                                                            "spreadsheet program used to save a macro-enabled workbook")
def test_xlsm_saved_by_libreoffice_with_formula_results(tmp_path):
    src = _formula_book(tmp_path)
    outdir = tmp_path / "lo"
    outdir.mkdir()
    subprocess.run(["soffice", f"-env:UserInstallation=file://{tmp_path / 'lo-profile'}", "--headless",
                    "--convert-to", "xlsm:Calc MS Excel 2007 VBA XML", "--outdir", str(outdir), str(src)],
                   check=True, capture_output=True, timeout=180)
    xlsm = outdir / "formula.xlsm"
    with zipfile.ZipFile(xlsm) as z:  # a macro-enabled package (ECMA-376 content type)
        assert b"macroEnabled" in z.read("[Content_Types].xml")
    s = read_schedule(xlsm)
    assert [b.mark for b in s.spans] == ["F1", "F2"] and s.spans[0].Mf_pos == pytest.approx(EXPECTED_MF)


def test_spans_of_one_beam_that_disagree_at_a_support_are_flagged(tmp_path):
    # common practice: the top bars over a support run across it, into both spans
    header = ["Mark", "Span no.", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Left end", "Right end",
              "Top bars L", "Top bars R"]
    rows = [["K7", 1, 300, 600, 30, 400, "simple", "continuous", "2-15M", "4-25M"],
            ["K7", 2, 300, 600, 30, 400, "simple", "continuous", "3-25M", "4-25M"],
            ["K7", 4, 300, 600, 30, 400, "continuous", "simple", "4-25M", "2-15M"]]
    s = read_schedule(write_schedule(tmp_path / "k.xlsx", header, rows))
    k1, k2, k4 = s.spans
    assert any("no span 3" in w.message for w in k1.warnings)
    messages = " | ".join(w.message for w in k2.warnings)
    assert "continuous at the right of span 1 but simple at the left of span 2" in messages
    assert "top bars R of span 1 (4-25M) and top bars L of span 2 (3-25M) differ" in messages
    assert not k4.warnings  # span 3 is missing: nothing to compare across
    assert all(w.severity == "warning" for w in k2.warnings)


def test_two_row_header_with_merged_headings_over_l_and_r(tmp_path):
    import openpyxl

    wb = openpyxl.Workbook()
    ws = wb.active
    ws.append(["Level 5 beams"])
    ws.append(["Mark", "bw (mm)", "h (mm)", "f'c (MPa)", "fy (MPa)", "Top bars", None, "Mf- (kN·m)", None, "Vf (kN)",
               None])
    ws.append([None, None, None, None, None, "L", "R", "L", "R", "L", "R"])
    ws.append(["D1", 300, 600, 30, 400, "3-20M", "4-25M", 80, 300, 150, 220])
    for cols in ("F2:G2", "H2:I2", "J2:K2"):
        ws.merge_cells(cols)
    p = tmp_path / "two_rows.xlsx"
    wb.save(p)
    s = read_schedule(p)
    assert s.columns["mf_neg_l"] == "Mf- L (kN·m)" and s.columns["top_bars_r"] == "Top bars R"
    (b,) = s.spans
    assert b.row == 4 and (b.Mf_neg_left, b.Mf_neg_right, b.Vf_left, b.Vf_right) == (80e6, 300e6, 150e3, 220e3)
    assert (str(b.top_bars_left), str(b.top_bars_right)) == ("3-20M", "4-25M")


def test_hidden_rows_are_checked_and_listed_and_other_schedule_sheets_named(tmp_path):
    import openpyxl

    p = write_schedule(tmp_path / "hid.xlsx", HEADER_F, [["H1", 300, 600, 30, 400, 6, 150, "4-25M"],
                                                         ["H2", 300, 600, 30, 400, 6, 150, "4-25M"]])
    wb = openpyxl.load_workbook(p)
    wb.active.row_dimensions[3].hidden = True
    other = wb.create_sheet("Level 6")
    other.append(HEADER_F)
    wb.save(p)
    s = read_schedule(p)
    assert [b.mark for b in s.spans] == ["H1", "H2"]  # the hidden row is still checked
    words = " | ".join(x.message for x in s.problems)
    assert "row 3 is hidden in the workbook; it is read and checked" in words
    assert "'Level 6' also holds a schedule" in words
    assert all(x.severity == "warning" for x in s.problems)


def test_sheet_asked_of_a_csv_file_is_a_warning(tmp_path):
    p = write_schedule(tmp_path / "one.csv", HEADER_F, [["F2", 300, 600, 30, 400, 6, 150, "4-25M"]])
    s = read_schedule(p, sheet="Level 2")
    assert len(s.spans) == 1 and "does not apply" in s.problems[0].message
