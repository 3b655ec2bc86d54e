"""The results workbook, opened with openpyxl (an independent reader of the .xlsx format)."""

from __future__ import annotations

import math

import pytest
from openpyxl import load_workbook
from test_report_support import FAIL_MR, infinite, report, schedule, with_extra_check

import beamsched
from beamsched.engine import check_schedule
from beamsched.model import BeamStatus
from beamsched.report import palette as P
from beamsched.report.table import Report
from beamsched.report.workbook import SHEETS, WORKING_NOTE, sig_format, write_results


def argb(hex_colour: str) -> str:
    return "FF" + hex_colour.lstrip("#").upper()


@pytest.fixture(scope="module")
def book(tmp_path_factory):
    rep = report()
    path = tmp_path_factory.mktemp("wb") / "results.xlsx"
    write_results(rep, path)
    return rep, load_workbook(path)


def header_map(ws) -> dict[str, int]:
    return {str(c.value): c.column for c in ws[1] if c.value is not None}


def row_of(ws, mark: str) -> int:
    for cells in ws.iter_rows(min_row=2):
        if cells[1].value == mark:
            return cells[0].row
    raise AssertionError(f"{mark} not found")


def test_sheets_in_order(book):
    _, wb = book
    assert wb.sheetnames == list(SHEETS)


def test_values_only_no_formulas(book):
    _, wb = book
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for c in row:
                assert c.data_type != "f", f"{ws.title}!{c.coordinate} holds a formula"


def test_passing_and_failing_rows(book):
    rep, wb = book
    ws = wb["Spans"]
    h = header_map(ws)
    ok, bad, unread = row_of(ws, "B1"), row_of(ws, "B2"), row_of(ws, "B3")
    # schedule order and the schedule row numbers
    assert [ws.cell(r, 1).value for r in (ok, bad, unread)] == [5, 6, 7]
    assert ok < bad < unread
    # status words (the words carry the meaning) and their fills from the one palette
    st = h["Status"]
    assert ws.cell(ok, st).value == "PASS"
    assert ws.cell(bad, st).value == "FAIL"
    assert ws.cell(unread, st).value == "NOT READ"
    assert ws.cell(ok, st).fill.fgColor.rgb == argb(P.SPAN_STATUS[BeamStatus.PASS].swatch.fill)
    assert ws.cell(bad, st).fill.fgColor.rgb == argb(P.SPAN_STATUS[BeamStatus.FAIL].swatch.fill)
    assert ws.cell(bad, st).font.color.rgb == argb(P.SPAN_STATUS[BeamStatus.FAIL].swatch.text)
    # Mr+ of the failing rectangle against the closed form of CSA A23.3-19 cl. 10.1.7
    mr = ws.cell(bad, h["Mr+\n(kN·m)"])
    assert mr.value == pytest.approx(FAIL_MR, rel=1e-4)
    assert mr.number_format == "#,##0.0"
    # the flexure utilisation column: Mf / Mr, three decimals, in the "over" band
    u = ws.cell(bad, h["Flexure +\nutilisation"])
    assert u.value == pytest.approx(280 / FAIL_MR, rel=1e-4)
    assert u.number_format == "0.000"
    assert u.fill.fgColor.rgb == argb(P.band_for(u.value).swatch.fill) == argb(P.BANDS[-1].swatch.fill)
    # the passing span's largest utilisation is the governing check's, in its band
    top = ws.cell(ok, h["Max\nutilisation"])
    res_ok = rep.results[0]
    assert top.value == pytest.approx(res_ok.utilisation)
    assert top.fill.fgColor.rgb == argb(P.band_for(top.value).swatch.fill)
    assert ws.cell(ok, h["Governing check"]).value == res_ok.governing.label
    assert ws.cell(ok, h["Governs\nat"]).value == res_ok.governing.location
    # Mr− at each end, from the result values
    assert ws.cell(ok, h["Mr− L\n(kN·m)"]).value == pytest.approx(res_ok.values["Mr_neg_left_kNm"])
    assert ws.cell(ok, h["Mr− R\n(kN·m)"]).value == pytest.approx(res_ok.values["Mr_neg_right_kNm"])


def test_notes_name_the_clause_and_defaults_are_highlighted(book):
    _, wb = book
    ws = wb["Spans"]
    h = header_map(ws)
    bad, ok = row_of(ws, "B2"), row_of(ws, "B1")
    note = ws.cell(bad, h["Notes (clause named)"]).value
    assert "cl. 10.1" in note and "exceeds" in note
    # every note of a checked span names its clause, including the reminders on a passing span
    for r in (ok, bad):
        for line in (ws.cell(r, h["Notes (clause named)"]).value or "").split("\n"):
            assert "cl. " in line or "Clause " in line, line
    assert "exceeds" not in (ws.cell(ok, h["Notes (clause named)"]).value or "")
    assumed = ws.cell(bad, h["Defaults applied"])
    assert "Cover 40 mm" in assumed.value
    assert assumed.fill.fgColor.rgb == argb(P.ASSUMED.fill)
    assert ws.cell(ok, h["Defaults applied"]).value == "none"
    understood = ws.cell(bad, h["Understood from the schedule (mm, MPa)"]).value
    assert "bottom bars: 3-20M" in understood and "As = 900 mm²" in understood  # 3 × 300 mm², CSA G30.18
    assert understood.startswith("section: Rect 300 × 500; f'c 30, fy 400, ends simple/simple")
    # the unread row says why
    assert "bw" in ws.cell(row_of(ws, "B3"), h["Notes (clause named)"]).value


def test_not_checked_and_not_applicable_cells(book):
    _, wb = book
    ws = wb["Spans"]
    h = header_map(ws)
    # B2 has simple ends and no Mf−: hogging does not apply ("—"), it is not "not checked"
    assert ws.cell(row_of(ws, "B2"), h["Flexure −\nutilisation"]).value == "—"


def test_frozen_header_filter_and_print_setup(book):
    _, wb = book
    ws = wb["Spans"]
    assert ws.freeze_panes == "C2"
    assert ws.auto_filter.ref is not None and ws.auto_filter.ref.startswith("A1:")
    assert ws.auto_filter.ref.endswith("4")  # header + three spans
    assert ws.page_setup.orientation == "landscape"
    assert ws.sheet_properties.pageSetUpPr.fitToPage
    # fitToWidth defaults to 1 when absent (ECMA-376 Part 1, 18.3.1.63 pageSetup); 0 = as many pages tall
    assert ws.page_setup.fitToWidth in (None, 1) and ws.page_setup.fitToHeight == 0
    assert ws.print_title_rows.replace("$", "") == "1:1"
    head = ws.oddHeader
    assert "Harbour && Vine Offices 2417" in head.left.text  # "&" is escaped as "&&" in headers
    assert "Rev C" in head.right.text
    foot = ws.oddFooter
    assert "&P" in foot.center.text and "&N" in foot.center.text
    assert "beamsched " + beamsched.__version__ in foot.left.text
    assert "level3_beams.xlsx" in foot.right.text
    for name in ("Working", "Input problems"):
        assert wb[name].print_title_rows.replace("$", "") == "1:1"
        assert wb[name].freeze_panes == "A2"


def test_column_widths_are_set(book):
    _, wb = book
    ws = wb["Spans"]
    widths = {ws.cell(1, c).value: ws.column_dimensions[ws.cell(1, c).column_letter].width
              for c in range(1, ws.max_column + 1)}
    assert widths["Notes (clause named)"] >= 60
    assert all(w and w >= 5 for w in widths.values())


def test_overview_title_block_counts_chart_and_caution(book):
    rep, wb = book
    ws = wb["Overview"]
    cells = {c.value: c for row in ws.iter_rows() for c in row if c.value is not None}
    text = " ".join(str(v) for v in cells)
    assert "CAUTION" in text and "engineer of record" in text
    pairs: dict = {}
    for row in ws.iter_rows():
        if row[0].value is not None:
            pairs.setdefault(row[0].value, row[1].value)  # the first (the counts), not the legend
    assert pairs["Project"] == "Harbour & Vine Offices"
    assert pairs["Revision"] == "C"
    assert pairs["Checked by"] == "B. Checker"
    assert pairs["Standard and edition"] == "CSA A23.3-19"
    assert pairs["Input file"] == "level3_beams.xlsx"
    assert pairs["Input file SHA-256"] == rep.schedule.file_sha256
    assert pairs["PASS"] == 1 and pairs["FAIL"] == 1 and pairs["INCOMPLETE"] == 0 and pairs["NOT READ"] == 1
    assert len(ws._charts) == 1  # the native chart of utilisation
    # worst spans: the failing span first
    rows = [r for r in ws.iter_rows(values_only=True)]
    i = next(i for i, r in enumerate(rows) if r[0] and str(r[0]).startswith("Worst spans"))
    assert rows[i + 2][0] == "B2 span 1" and rows[i + 2][3] == "FAIL"
    assert rows[i + 3][0] == "B1 span 1"
    # the legend names every status word
    for st in P.SPAN_STATUS.values():
        assert st.word in cells


def test_working_sheet_lets_a_checker_redo_mr(book):
    rep, wb = book
    ws = wb["Working"]
    assert [c.value for c in ws[1]][:7] == ["Span", "Check", "At", "Symbol", "Value", "Unit", "Clause"]
    rows = [r[1:] for r in ws.iter_rows(min_row=2, values_only=True) if r[0] == "B2 span 1"]
    # every row names its span, so a page printed from the middle of the sheet says whose working it is
    assert rows[0][0] == "FAIL" and len(rows) > 20
    block = rows[1:]
    sym = {(r[0], r[2]): r for r in block if r[2]}
    # every number needed for the closed form is there with its unit and clause
    assert sym[("Flexure +", "As")][3] == pytest.approx(900) and sym[("Flexure +", "As")][4] == "mm²"
    assert sym[("Flexure +", "f'c")][3] == 30 and sym[("Flexure +", "f'c")][4] == "MPa"
    assert sym[("Flexure +", "φc")][3] == 0.65 and sym[("Flexure +", "φc")][5] == "8.4.2"
    assert sym[("Flexure +", "Mr")][3] == pytest.approx(FAIL_MR, rel=1e-4)
    result = sym[("Flexure +", "utilisation")]
    assert result[3] == pytest.approx(280 / FAIL_MR, rel=1e-4) and result[4] == "FAIL"
    assert result[5] == "10.1"


def test_problems_sheet(book):
    _, wb = book
    ws = wb["Input problems"]
    assert [c.value for c in ws[1]] == ["Row", "Span", "Column", "Value", "Reason and what was expected", "Severity"]
    rows = list(ws.iter_rows(min_row=2, values_only=True))
    assert (7, "B3 span 1", "bw (mm)", "abc") == rows[0][:4]
    assert "expected a number" in rows[0][4] and rows[0][5] == "error"


def test_about_sheet(book):
    rep, wb = book
    ws = wb["About"]
    pairs = [(r[0], r[1]) for r in ws.iter_rows(values_only=True)]
    text = " ".join(str(b) for _, b in pairs if b)
    assert beamsched.CAUTION in text
    assert beamsched.__version__ in text
    assert "700 / (700 + fy)" in text  # the c/d policy appears because a c/d check was made
    assert "Shear (cl. 11.3)" not in text or any(c.id == "shear" for r in rep.results for c in r.checks)
    assert "Cover 40 mm to the stirrups (project default) (1 span)" in text


def test_a_new_check_id_gets_its_own_column(tmp_path):
    """Adding a check never touches a writer: a check id no writer names gets a column."""
    rep = report()
    results = [with_extra_check(rep.results[0], u=1.2), *rep.results[1:]]
    path = tmp_path / "r.xlsx"
    write_results(Report(results, rep.schedule), path)
    ws = load_workbook(path)["Spans"]
    h = header_map(ws)
    assert "Crack control\nutilisation" in h
    assert "z\n(N/mm)" not in h  # not a resistance (Mr, Vr, ...): its value is listed in the working
    working = load_workbook(path)["Working"]
    listed = [r for r in working.iter_rows(values_only=True) if r[1] == "Result values" and r[3] == "z"]
    assert listed and listed[0][0] == "B1 span 1"
    assert listed[0][4] == pytest.approx(36000) and listed[0][5] == "N/mm"
    cell = ws.cell(row_of(ws, "B1"), h["Crack control\nutilisation"])
    assert cell.value == pytest.approx(1.2) and cell.fill.fgColor.rgb == argb(P.BANDS[-1].swatch.fill)


def test_infinite_utilisation_is_written_as_a_word(tmp_path):
    rep = report()
    results = [infinite(rep.results[1])]
    path = tmp_path / "inf.xlsx"
    write_results(Report(results, rep.schedule), path)
    ws = load_workbook(path)["Spans"]
    h = header_map(ws)
    assert ws.cell(2, h["Max\nutilisation"]).value == "∞"


def test_empty_problem_sheet_says_so(tmp_path):
    rep = report(rows=None)
    rep2 = Report([r for r in rep.results if r.status is not BeamStatus.ERROR], schedule())
    path = tmp_path / "ok.xlsx"
    write_results(rep2, path)
    ws = load_workbook(path)["Input problems"]
    assert ws.cell(2, 5).value == "No problems: every row was read."


@pytest.mark.parametrize("v, fmt", [
    (2000.0, "#,##0"), (536.1, "#,##0.0"), (30.0, "#,##0.00"), (0.65, "#,##0.0000"), (0.0035, "#,##0.000000"),
    (1e-7, "0.000E+00"), (0.0, "0"), (-0.04302, "#,##0.00000"),
])
def test_trace_number_formats_show_four_significant_figures(v, fmt):  # common practice for hand checks
    assert sig_format(v) == fmt
    if v and math.isfinite(v):
        dec = fmt.split(".")[1].count("0") if "." in fmt and "E" not in fmt else 0
        if "E" not in fmt:
            shown = float(f"{v:.{dec}f}")
            assert shown == pytest.approx(v, rel=5e-4)


def test_default_font_and_printed_gridlines(book):
    _, wb = book
    # Column widths are counted in digits of the workbook's default font (ECMA-376 Part 1,
    # 18.3.1.13 col): Arial 10, the font of every cell, so the layout does not hang on Calibri.
    normal = wb._fonts[0]
    assert (normal.name, normal.sz) == ("Arial", 10)
    for name in ("Spans", "Working", "Input problems"):
        assert wb[name].print_options.gridLines, name
    assert wb["Working"].page_setup.paperSize == wb["Spans"].page_setup.paperSize == 3  # Tabloid
    assert wb["Working"].page_setup.orientation == "portrait"
    # a filter on the Working sheet picks one span's rows, to print its working alone
    assert wb["Working"].auto_filter.ref.startswith("A1:H")


def test_row_heights_hold_their_text(book):
    from beamsched.report.fit import LINE_HEIGHT, wrapped_lines

    _, wb = book
    for name in ("Spans", "Working", "About", "Input problems"):
        ws = wb[name]
        widths = {c: ws.column_dimensions[c].width for c in ws.column_dimensions}
        for row in ws.iter_rows(min_row=2):
            height = ws.row_dimensions[row[0].row].height or 12.75
            for c in row:
                if isinstance(c.value, str) and c.alignment.wrap_text and c.column_letter in widths:
                    lines = wrapped_lines(c.value, widths[c.column_letter], bold=bool(c.font.b),
                                          indent=int(c.alignment.indent or 0))
                    assert height >= LINE_HEIGHT * min(lines, 31) - 0.75, (name, c.coordinate, c.value)  # 1 px rounding


def test_the_collector_spares_the_results_and_is_left_as_it_was(tmp_path, monkeypatch):
    import gc

    import beamsched.report.workbook as wbmod

    if gc.get_freeze_count() or not gc.isenabled():
        pytest.skip("the test process has set objects aside itself")
    rep = report()
    seen = []
    working = wbmod._Writer.working
    monkeypatch.setattr(wbmod._Writer, "working", lambda self: (seen.append(gc.get_freeze_count()), working(self)))
    write_results(rep, tmp_path / "a.xlsx")
    assert seen[0] > 0  # the objects alive before the write were set aside while it ran
    assert gc.isenabled() and gc.get_freeze_count() == 0
    gc.freeze()
    try:
        kept = gc.get_freeze_count()
        write_results(rep, tmp_path / "b.xlsx")
        assert seen[1] == kept == gc.get_freeze_count()  # a caller's own set-aside objects are left alone
    finally:
        gc.unfreeze()


def working_spans(path) -> list[str]:
    """The spans whose calculation the Working sheet holds, in order (each span's block starts
    with its label and its status word)."""
    ws = load_workbook(path)["Working"]
    words = {st.word for st in P.SPAN_STATUS.values()}
    return [r[0] for r in ws.iter_rows(min_row=2, values_only=True) if r[0] and r[1] in words]


def test_working_can_hold_only_the_flagged_spans_or_none(tmp_path):
    s = schedule()
    results = check_schedule(s)
    statuses = {r.label: r.status for r in results}
    assert BeamStatus.PASS in statuses.values() and BeamStatus.FAIL in statuses.values()
    spans = {}
    for mode in ("all", "flagged", "none"):
        path = tmp_path / f"{mode}.xlsx"
        write_results(Report(results, s, working=mode), path)
        spans[mode] = working_spans(path)
        overview = [c for row in load_workbook(path)["Overview"].iter_rows(values_only=True) for c in row if c]
        assert WORKING_NOTE[mode] in overview  # the Overview says what the Working sheet holds
    assert spans["all"] == [r.label for r in results]
    assert spans["flagged"] == [r.label for r in results if r.status is not BeamStatus.PASS]
    assert spans["none"] == []
    ws = load_workbook(tmp_path / "flagged.xlsx")["Working"]
    passing = sum(1 for v in statuses.values() if v is BeamStatus.PASS)
    assert ws.cell(2, 1).value == WORKING_NOTE["flagged"]
    assert ws.cell(3, 1).value == f"{passing} of {len(results)} spans left out; their results are on the Spans sheet."


def test_working_choice_is_checked():
    with pytest.raises(ValueError, match="expected one of all, flagged, none"):
        Report([], schedule(rows=()), working="some")


def test_command_line_offers_the_same_working_choices():
    from beamsched import cli
    from beamsched.report.table import WORKING_CHOICES

    assert cli.WORKING_CHOICES == WORKING_CHOICES
