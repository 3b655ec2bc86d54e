"""The annotated copy: the user's workbook, results beside each span, nothing of theirs changed."""

from __future__ import annotations

import hashlib
import struct
import zlib

import pytest
from openpyxl import Workbook, load_workbook
from openpyxl.styles import Font, PatternFill
from test_report_support import failing_input, passing_input, schedule, unreadable_row

from beamsched.engine import check_schedule
from beamsched.model import BeamStatus
from beamsched.report import OutputError, Report
from beamsched.report import palette as P
from beamsched.report.annotate import NOTICE_SHEET, count_parts, write_annotated


def argb(hex_colour: str) -> str:
    return "FF" + hex_colour.lstrip("#").upper()


def user_workbook(path):
    """A drafter's workbook: title rows, the table at row 4, styling, a second sheet."""
    wb = Workbook()
    ws = wb.active
    ws.title = "Beams"
    ws["A1"] = "Harbour & Vine Offices: level 3 beam schedule"
    ws["A1"].font = Font(bold=True, size=14, color="FF1F4E79")
    ws.merge_cells("A1:F1")
    heads = ["Mark", "Span no.", "bw (mm)", "h (mm)", "Bottom bars", "Mf+ (kN·m)"]
    for j, h in enumerate(heads, start=1):
        c = ws.cell(4, j, h)
        c.fill = PatternFill("solid", fgColor="FFDDEBF7")
    ws.cell(5, 1, "B1"), ws.cell(6, 1, "B2"), ws.cell(7, 1, "B3")
    ws.cell(5, 6, 200), ws.cell(6, 6, 280)
    ws.cell(6, 6).number_format = "0.0"
    ws.cell(7, 3, "abc")
    ws.cell(6, 7, "=F6*1.1")  # a formula the user keeps
    ws.column_dimensions["E"].width = 21
    notes = wb.create_sheet("Revisions")
    notes["A1"] = "Rev C: bottom bars of B2 revised"
    notes["A1"].font = Font(italic=True)
    wb.save(path)


def tiny_png() -> bytes:
    """A 1 × 1 white PNG (PNG specification, W3C: signature, IHDR, IDAT, IEND)."""
    def chunk(kind: bytes, data: bytes) -> bytes:
        return struct.pack(">I", len(data)) + kind + data + struct.pack(">I", zlib.crc32(kind + data))
    return (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", struct.pack(">IIBBBBB", 1, 1, 8, 2, 0, 0, 0))
            + chunk(b"IDAT", zlib.compress(b"\x00\xff\xff\xff")) + chunk(b"IEND", b""))


def results_for(path):
    s = schedule((passing_input(5), failing_input(6), unreadable_row(7)), path=str(path))
    return Report(check_schedule(s), s)


def digest(path):
    return hashlib.sha256(path.read_bytes()).hexdigest()


@pytest.fixture()
def copy(tmp_path):
    src = tmp_path / "level3.xlsx"
    user_workbook(src)
    before = digest(src)
    out = tmp_path / "level3_beamsched_checked.xlsx"
    outcome = write_annotated(results_for(src), src, out)
    assert digest(src) == before  # the input is only read
    return outcome, load_workbook(out)


def test_first_sheet_says_it_is_a_checked_copy(copy):
    outcome, wb = copy
    assert wb.sheetnames == [NOTICE_SHEET, "Beams", "Revisions"]
    first = wb[NOTICE_SHEET]
    assert first["A1"].value == "CHECKED COPY" and "level3.xlsx" in first["B1"].value
    text = " ".join(str(c.value) for row in first.iter_rows() for c in row if c.value)
    assert "engineer of record" in text
    assert "NOT CARRIED OVER" not in text and outcome.lost == []


def test_users_sheets_and_formatting_are_kept(copy):
    _, wb = copy
    ws = wb["Beams"]
    assert ws["A1"].value == "Harbour & Vine Offices: level 3 beam schedule"
    assert ws["A1"].font.bold and ws["A1"].font.size == 14 and ws["A1"].font.color.rgb == "FF1F4E79"
    assert "A1:F1" in [str(r) for r in ws.merged_cells.ranges]
    assert ws.cell(4, 1).fill.fgColor.rgb == "FFDDEBF7"
    assert ws.cell(6, 6).value == 280 and ws.cell(6, 6).number_format == "0.0"
    assert ws.cell(6, 7).value == "=F6*1.1"
    assert ws.column_dimensions["E"].width == 21
    rev = wb["Revisions"]
    assert rev["A1"].value == "Rev C: bottom bars of B2 revised" and rev["A1"].font.italic


def test_result_columns_right_of_the_table(copy):
    outcome, wb = copy
    ws = wb["Beams"]
    assert outcome.first_result_column == "H"  # the table (with the user's formula column) ends at G
    heads = [ws.cell(4, c).value for c in range(8, 14)]
    assert heads[0].endswith("Mr+ (kN·m)") and "Mr−" in heads[1] and "Vr" in heads[2]
    assert "utilisation" in heads[3] and heads[4].endswith("status") and "note" in heads[5]
    ok, bad, unread = (ws.cell(r, 12) for r in (5, 6, 7))
    assert (ok.value, bad.value, unread.value) == ("PASS", "FAIL", "NOT READ")
    assert ok.fill.fgColor.rgb == argb(P.SPAN_STATUS[BeamStatus.PASS].swatch.fill)
    assert bad.fill.fgColor.rgb == argb(P.SPAN_STATUS[BeamStatus.FAIL].swatch.fill)
    util = ws.cell(6, 11)
    assert util.value > 1 and util.number_format == "0.000"
    assert util.fill.fgColor.rgb == argb(P.BANDS[-1].swatch.fill)
    assert bad.comment is not None and "cl. 10.1" in bad.comment.text
    assert ok.comment is None
    assert "cl. 10.1" in ws.cell(6, 13).value
    # each one-line header has room in a bold face a third wider than Calibri (DejaVu Sans, which
    # LibreOffice uses where Calibri is missing; seen in its PDF export): 1.25 units a character
    for c in range(8, 13):
        head = ws.cell(4, c).value
        assert ws.column_dimensions[ws.cell(4, c).column_letter].width >= 1.25 * len(head), head


def test_lost_images_charts_and_shapes_are_reported(tmp_path):
    import xlsxwriter

    png = tmp_path / "logo.png"
    png.write_bytes(tiny_png())
    src = tmp_path / "drawn.xlsx"
    wb = xlsxwriter.Workbook(str(src))
    ws = wb.add_worksheet("Beams")
    for j, h in enumerate(["Mark", "Span no.", "bw (mm)"]):
        ws.write(3, j, h)
    for i, m in enumerate(["B1", "B2", "B3"]):
        ws.write(4 + i, 0, m)
    ws.insert_image("F2", str(png))
    ws.insert_textbox("F8", "Typical section: see S-301")
    chart = wb.add_chart({"type": "column"})
    chart.add_series({"values": ["Beams", 4, 2, 6, 2]})
    ws.insert_chart("H2", chart)
    wb.close()
    before = count_parts(src)
    assert before["images"] == 1 and before["charts"] == 1 and before["shapes and text boxes"] == 1
    out = tmp_path / "drawn_beamsched_checked.xlsx"
    outcome = write_annotated(results_for(src), src, out)
    assert any("shapes and text boxes" in x for x in outcome.lost)
    first = load_workbook(out)[NOTICE_SHEET]
    rows = {r[0]: r[1] for r in first.iter_rows(values_only=True)}
    assert "shapes and text boxes" in rows["NOT CARRIED OVER"]


def test_refusals(tmp_path):
    src = tmp_path / "level3.xlsx"
    user_workbook(src)
    before = digest(src)
    rep = results_for(src)
    with pytest.raises(OutputError, match="input"):
        write_annotated(rep, src, src)
    with pytest.raises(OutputError, match="extension"):
        write_annotated(rep, src, tmp_path / "copy.xlsm")
    csv_src = tmp_path / "level3.csv"
    csv_src.write_text("Mark\nB1\n")
    with pytest.raises(OutputError, match="xlsx"):
        write_annotated(rep, csv_src, tmp_path / "copy.csv")
    assert digest(src) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["level3.csv", "level3.xlsx"]
