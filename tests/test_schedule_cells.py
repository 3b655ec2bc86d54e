"""The two ways a workbook's cells are read give the same cells.

python-calamine reads a sheet that holds no formula and no error cell; openpyxl (read-only, the
reader's previous path, kept for the other sheets) is the reference: every sheet read both ways
must give equal Grids: the same rows and row numbers, the same value in each cell and of the
same Python type, the same hidden rows and sheet states. A property test writes random values
(numbers, text, dates, booleans, hidden rows) with openpyxl and compares both readings; CI runs 60
examples, ``BEAMSCHED_FUZZ_EXAMPLES=1500`` runs more.

Sources: the cell, row and sheet elements of SpreadsheetML, ECMA-376 Part 1: §18.3.1.4 "c
(Cell)" (its ``t`` attribute: ``s`` shared string, ``inlineStr``, ``b`` boolean, ``e`` error,
``n`` number), §18.3.1.40 "f (Formula)", §18.3.1.73 "row (Row)" (``hidden``), §18.3.1.35
"dimension", §18.4.8 "si (String Item)" with rich-text runs ``r`` (§18.4.12) and phonetic runs
``rPh`` (§18.4.6), §18.2.19 "sheet" (``state``: visible, hidden, veryHidden).
"""

from __future__ import annotations

import datetime as dt
import gc
import os
import re
import zipfile
from pathlib import Path

import openpyxl
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from openpyxl.cell.cell import ERROR_CODES

from beamsched.collector import gc_paused
from beamsched.schedule import cells
from beamsched.schedule.cells import (
    EMPTY,
    Cell,
    read_workbook,
    read_workbook_calamine,
    read_workbook_openpyxl,
    scan_sheet,
)
from beamsched.schedule.samples import generate_schedule

SAMPLES = sorted((Path(__file__).resolve().parent.parent / "sample_schedules").glob("*.xlsx"))
MAIN = b'xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main"'


def _typed(grids):
    """Everything a Grid holds, each value with its type (1 == 1.0 == True in Python)."""
    return [(g.name, g.state, g.hidden_rows,
             [(n, [(type(c.value).__name__, c.value, c.formula) for c in row]) for n, row in g.rows]) for g in grids]


def _both_equal(path: Path) -> list:
    fast, ref = read_workbook_calamine(path), read_workbook_openpyxl(path)
    assert _typed(fast) == _typed(ref)
    return fast


def _repack(src: Path, out: Path, sheet: bytes | None = None, shared: bytes | None = None) -> Path:
    """A copy of an openpyxl workbook with its first sheet's XML replaced, and a shared-strings part
    added (ECMA-376 Part 1 §18.4: the part, its relationship and its content type)."""
    with zipfile.ZipFile(src) as z:
        parts = {n: z.read(n) for n in z.namelist()}
    if sheet is not None:
        parts["xl/worksheets/sheet1.xml"] = sheet
    if shared is not None:
        parts["xl/sharedStrings.xml"] = shared
        parts["xl/_rels/workbook.xml.rels"] = parts["xl/_rels/workbook.xml.rels"].replace(
            b"</Relationships>", b'<Relationship Id="rIdStrings" Type="http://schemas.openxmlformats.org/officeDocument/'
                                 b'2006/relationships/sharedStrings" Target="sharedStrings.xml"/></Relationships>')
        parts["[Content_Types].xml"] = parts["[Content_Types].xml"].replace(
            b"</Types>", b'<Override PartName="/xl/sharedStrings.xml" ContentType="application/vnd.openxmlformats-'
                         b'officedocument.spreadsheetml.sharedStrings+xml"/></Types>')
    with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in parts.items():
            z.writestr(name, data)
    return out


def _book(tmp_path: Path, name: str = "b.xlsx") -> Path:
    wb = openpyxl.Workbook()
    wb.active.title = "Beams"
    wb.active["A1"] = "Mark"
    p = tmp_path / name
    wb.save(p)
    return p


@pytest.mark.parametrize("sample", SAMPLES, ids=[p.name for p in SAMPLES])
def test_bundled_samples_read_the_same_both_ways(sample):
    grids = _both_equal(sample)
    assert any(g.header_index() is not None for g in grids)


def test_generated_schedule_reads_the_same_both_ways_and_takes_the_fast_path(tmp_path, monkeypatch):
    p = generate_schedule(tmp_path / "gen.xlsx", 120, seed=7)
    with zipfile.ZipFile(p) as z:
        assert not any(scan_sheet(z, m)[1] for m in z.namelist() if m.startswith("xl/worksheets/sheet"))
    grids = _both_equal(p)
    assert sum(len(g.rows) for g in grids if g.name == "Synthetic") == 121  # the header and 120 spans

    def no_openpyxl(*a, **k):
        raise AssertionError("a sheet without formulas went to openpyxl")

    monkeypatch.setattr(cells, "read_workbook_openpyxl", no_openpyxl)
    assert _typed(read_workbook(p)) == _typed(grids)


def test_every_kind_of_value_reads_the_same_both_ways(tmp_path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Beams"
    values = [None, 300, 300.0, 2.5, -0.0, -7, 1e20, 0.1 + 0.2, 999_999_999_999_999.0, True, False, "4-25M", "  ",
              "", "'=x", "ü–−·", dt.datetime(2024, 1, 2, 3, 4, 5), dt.date(2024, 1, 2), dt.time(3, 4),
              dt.timedelta(hours=30)]
    for j, v in enumerate(values, start=2):
        ws.cell(row=3, column=j, value=v)
    ws.cell(row=7, column=40, value="far right")
    ws.row_dimensions[7].hidden = True
    ws.cell(row=9, column=1, value="   ")  # a row of spaces only is a blank row
    hidden = wb.create_sheet("Old")
    hidden["A1"], hidden.sheet_state = 1, "hidden"
    very = wb.create_sheet("Lists")
    very["C4"], very.sheet_state = "x", "veryHidden"
    wb.create_sheet("Empty")
    p = tmp_path / "kinds.xlsx"
    wb.save(p)
    with zipfile.ZipFile(p) as z:
        assert scan_sheet(z, "xl/worksheets/sheet1.xml") == (frozenset({7}), False)  # calamine reads it
    grids = _both_equal(p)
    beams = grids[0]
    assert [n for n, _ in beams.rows] == [3, 7] and beams.hidden_rows == {7}
    row = beams.rows[0][1]
    assert row[2] == Cell(300) and type(row[3].value) is int and type(row[4].value) is float  # 300.0 is saved as 300
    assert row[13] is EMPTY and row[14] is EMPTY  # "  " and "": blank cells
    assert row[15] == Cell("'=x") and row[16] == Cell("ü–−·")
    assert row[18].value == dt.datetime(2024, 1, 2)  # a date cell reads as a datetime (openpyxl's type)
    assert [(g.name, g.state) for g in grids] == [("Beams", "visible"), ("Old", "hidden"), ("Lists", "veryHidden"),
                                                  ("Empty", "visible")]


def test_shared_strings_with_rich_text_phonetic_runs_and_kept_spaces(tmp_path):
    shared = (b'<sst ' + MAIN + b' count="4" uniqueCount="4">'
              b'<si><t>Mark</t></si>'
              b'<si><r><t>4-</t></r><r><rPr><b/></rPr><t>25M</t></r></si>'
              b'<si><t>B1</t><rPh sb="0" eb="1"><t>X</t></rPh></si>'
              b'<si><t xml:space="preserve">   </t></si></sst>')
    sheet = (b'<worksheet ' + MAIN + b'><dimension ref="A1:B2"/><sheetData>'
             b'<row r="1"><c r="A1" t="s"><v>0</v></c><c r="B1" t="s"><v>3</v></c></row>'
             b'<row r="2"><c r="A2" t="s"><v>2</v></c><c r="B2" t="s"><v>1</v></c><c r="C2" t="b"><v>1</v></c>'
             b'<c r="D2" t="inlineStr"><is><r><t>10M</t></r><r><t>@200</t></r></is></c><c r="E2" s="0"/></row>'
             b'</sheetData></worksheet>')
    p = _repack(_book(tmp_path), tmp_path / "shared.xlsx", sheet, shared)
    (g,) = _both_equal(p)
    assert g.rows == [(1, [Cell("Mark")]), (2, [Cell("B1"), Cell("4-25M"), Cell(True), Cell("10M@200")])]


def test_rows_past_a_stale_dimension_and_hidden_rows_are_read(tmp_path):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "Beams"
    ws.append(["Mark", "bw (mm)"])
    for i in range(2, 9):
        ws.append([f"B{i}", 300 + i])
    ws.row_dimensions[5].hidden = True
    p = tmp_path / "stale.xlsx"
    wb.save(p)
    with zipfile.ZipFile(p) as z:
        xml = z.read("xl/worksheets/sheet1.xml")
    xml = re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:A3"', xml)  # under-states the used range
    (g,) = _both_equal(_repack(p, tmp_path / "stale2.xlsx", xml))
    assert [n for n, _ in g.rows] == list(range(1, 9)) and g.rows[-1][1] == [Cell("B8"), Cell(308)]
    assert g.hidden_rows == {5}


def test_formulas_and_error_cells_take_the_openpyxl_path(tmp_path):
    # calamine reads a formula saved without a result, and a cached error, as an empty cell: a
    # sheet holding either is read by openpyxl, so the formula is reported and the error named
    sheet = (b'<worksheet ' + MAIN + b'><sheetData>'
             b'<row r="1"><c r="A1" t="inlineStr"><is><t>Mark</t></is></c></row>'
             b'<row r="2"><c r="A2"><f>1+1</f></c><c r="B2" t="e"><f>1/0</f><v>#DIV/0!</v></c>'
             b'<c r="C2"><f>2*3</f><v>6</v></c></row></sheetData></worksheet>')
    p = _repack(_book(tmp_path), tmp_path / "f.xlsx", sheet)
    (g,) = read_workbook(p)
    assert g.rows[1] == (2, [Cell(None, "=1+1"), Cell("#DIV/0!", "=1/0"), Cell(6, "=2*3")])
    error_only = sheet.replace(b'<c r="A2"><f>1+1</f></c><c r="B2" t="e"><f>1/0</f>', b'<c r="B2" t="e">').replace(
        b'<c r="C2"><f>2*3</f><v>6</v></c>', b"")
    p2 = _repack(_book(tmp_path, "e0.xlsx"), tmp_path / "e.xlsx", error_only)
    with zipfile.ZipFile(p2) as z:
        assert scan_sheet(z, "xl/worksheets/sheet1.xml") == (frozenset(), True)
    (g2,) = read_workbook(p2)
    assert g2.rows[1] == (2, [EMPTY, Cell("#DIV/0!")])


@pytest.mark.parametrize("chunk", [1 << 20, 7, 61, 256])
def test_the_sheet_scan_finds_the_same_in_any_size_of_piece(tmp_path, monkeypatch, chunk):
    wb = openpyxl.Workbook()
    ws = wb.active
    for i in range(1, 200):
        ws.append([f"B{i}", i, "x" * (i % 13)])
    for i in (3, 77, 198):
        ws.row_dimensions[i].hidden = True
    plain = tmp_path / "plain.xlsx"
    wb.save(plain)
    ws["B150"] = "=B149+1"
    formula = tmp_path / "formula.xlsx"
    wb.save(formula)
    monkeypatch.setattr(cells, "_CHUNK", chunk)
    with zipfile.ZipFile(plain) as z:
        assert scan_sheet(z, "xl/worksheets/sheet1.xml") == (frozenset({3, 77, 198}), False)
    with zipfile.ZipFile(formula) as z:
        assert scan_sheet(z, "xl/worksheets/sheet1.xml") == (frozenset({3, 77, 198}), True)


def test_a_utf16_sheet_counts_as_holding_formulas(tmp_path):
    # the byte patterns cannot see into UTF-16 text, so openpyxl reads such a sheet
    sheet = ('<?xml version="1.0" encoding="UTF-16"?><worksheet xmlns="http://schemas.openxmlformats.org/'
             'spreadsheetml/2006/main"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>Mark</t></is></c>'
             '</row></sheetData></worksheet>').encode("utf-16")
    p = _repack(_book(tmp_path), tmp_path / "u16.xlsx", sheet)
    with zipfile.ZipFile(p) as z:
        assert scan_sheet(z, "xl/worksheets/sheet1.xml")[1] is True
    assert _typed(read_workbook(p)) == _typed(read_workbook_openpyxl(p))


def test_equal_values_share_one_cell():
    g = cells.grid_from_values("S", [["Mark", "bw"], ["B1", 300.0], ["B2", 300.0], ["", ""], ["B3", 300]])
    assert [n for n, _ in g.rows] == [1, 2, 3, 5]
    assert g.rows[1][1][1] is g.rows[2][1][1] and g.rows[1][1][1] == Cell(300)
    assert type(g.rows[3][1][1].value) is int


@pytest.mark.parametrize("was_on", [True, False])
def test_gc_paused_restores_the_collector_as_it_was(was_on):
    before = gc.isenabled()
    try:
        (gc.enable if was_on else gc.disable)()
        with gc_paused():
            assert not gc.isenabled()
        assert gc.isenabled() is was_on
        with pytest.raises(KeyError), gc_paused():
            raise KeyError("x")
        assert gc.isenabled() is was_on
    finally:
        (gc.enable if before else gc.disable)()


class _Sheet:
    """A stand-in for a python-calamine sheet whose ``iter_rows`` starts where ``way`` says."""

    def __init__(self, full: list[list[object]], way: str):
        self.full, self.way = full, way
        used = [(i, j) for i, r in enumerate(full) for j, v in enumerate(r) if v != ""]
        self.start = (min(i for i, _ in used), min(j for _, j in used))
        self.end = (max(i for i, _ in used), max(j for _, j in used))

    def to_python(self, skip_empty_area=True):
        return [list(r) for r in self.full]

    def iter_rows(self):
        (r0, c0), (r1, c1) = self.start, self.end
        rows = self.full[: r1 + 1] if self.way != "used rows" else self.full[r0: r1 + 1]
        c0 = 0 if self.way == "column A" else c0
        return iter([list(r[c0: c1 + 1]) for r in rows])


class _Book:
    def __init__(self, sheet):
        self.sheet = sheet

    def get_sheet_by_name(self, name):
        return self.sheet


@pytest.mark.parametrize("way", ["row 1, first used column", "column A", "used rows"])
def test_rows_and_columns_land_where_they_are_whatever_iter_rows_starts_at(way):
    full = [["", "", "", ""], ["", "", "", ""], ["", "Mark", "bw", ""], ["", "B1", 300.0, ""], ["", "", "", "x"]]
    grid = cells._calamine_grid(_Book(_Sheet(full, way)), "S", frozenset(), "visible")
    assert grid.rows == [(3, [EMPTY, Cell("Mark"), Cell("bw")]), (4, [EMPTY, Cell("B1"), Cell(300)]),
                         (5, [EMPTY, EMPTY, EMPTY, Cell("x")])]


FORMULAS = (b'<worksheet ' + MAIN + b'><sheetData>'
            b'<row r="1"><c r="A1" t="inlineStr"><is><t>Mark</t></is></c><c r="B1" t="inlineStr"><is><t>Mf+</t></is></c>'
            b'</row>'
            b'<row r="2"><c r="A2" t="str"><f>"B"&amp;1</f><v>B1</v></c><c r="B2"><f>1.25*22*6^2/8</f><v>123.75</v></c>'
            b'<c r="C2" t="b"><f>B2&gt;0</f><v>1</v></c><c r="D2"><f t="shared" ref="D2:D3" si="0">B2*2</f><v>247.5</v>'
            b'</c><c r="E2"><f>2*3</f><v>6</v></c></row>'
            b'<row r="3"><c r="A3" t="inlineStr"><is><t>B2</t></is></c><c r="B3"><v>150</v></c>'
            b'<c r="D3"><f t="shared" si="0"/><v>300</v></c>%s</row></sheetData></worksheet>')
NO_RESULT = (b'<c r="E3"><f>1+1</f></c><c r="F3" t="e"><f>1/0</f><v>#DIV/0!</v></c>'
             b'<c r="G3" t="str"><f>""</f><v></v></c>')


@pytest.mark.parametrize("extra", [b"", NO_RESULT], ids=["every result saved", "results missing"])
def test_saved_formula_results_from_calamine_match_openpyxls_values_pass(tmp_path, monkeypatch, extra):
    p = _repack(_book(tmp_path), tmp_path / "formulas.xlsx", FORMULAS % extra)
    reference = _typed(read_workbook_openpyxl(p))  # both openpyxl passes
    passes = []
    real = cells._saved_results
    monkeypatch.setattr(cells, "_saved_results", lambda *a: passes.append(1) or real(*a))
    assert _typed(read_workbook(p)) == reference
    assert passes == ([1] if extra else [])  # the values-only pass only for what calamine cannot tell
    (g,) = read_workbook(p)
    assert g.rows[1][1] == [Cell("B1", '="B"&1'), Cell(123.75, "=1.25*22*6^2/8"), Cell(True, "=B2>0"),
                            Cell(247.5, "=B2*2"), Cell(6, "=2*3")]
    assert g.rows[2][1][3] == Cell(300, "=B3*2")  # the shared formula, moved down a row
    if extra:
        # E3 saved without a result stays a formula with no value (a row problem later); G3's saved
        # result is an empty text (t="str", empty <v>: ECMA-376 Part 1 §18.3.1.4): the spreadsheet
        # shows it blank, so it is the blank cell (and, last in its row, trimmed)
        assert g.rows[2][1][4:] == [Cell(None, "=1+1"), Cell("#DIV/0!", "=1/0")]


EXAMPLES = int(os.environ.get("BEAMSCHED_FUZZ_EXAMPLES", "60"))
_TEXT = st.text(st.characters(blacklist_categories=("Cc", "Cs")), max_size=8).filter(
    lambda s: not s.startswith("=") and s.strip().upper() not in ERROR_CODES)  # those are formulas and errors
_VALUE = st.one_of(st.none(), st.integers(-10**12, 10**12), st.floats(-1e12, 1e12, allow_nan=False), st.booleans(),
                   _TEXT, st.sampled_from(["4-25M", " 4-25M ", "10M@200", "  ", "Mark", "L"]),
                   st.datetimes(dt.datetime(1950, 1, 1), dt.datetime(2090, 1, 1)).map(lambda d: d.replace(microsecond=0)),
                   st.dates(dt.date(1950, 1, 1), dt.date(2090, 1, 1)))


@settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(rows=st.lists(st.lists(_VALUE, max_size=7), min_size=1, max_size=6), hidden=st.sets(st.integers(1, 8)))
def test_any_values_read_the_same_both_ways(tmp_path_factory, rows, hidden):
    wb = openpyxl.Workbook()
    ws = wb.active
    for i, values in enumerate(rows, start=2):
        for j, v in enumerate(values, start=1):
            ws.cell(row=i, column=j, value=v)
    for i in hidden:
        ws.row_dimensions[i].hidden = True
    p = tmp_path_factory.mktemp("v") / "v.xlsx"
    wb.save(p)
    with zipfile.ZipFile(p) as z:
        assert not scan_sheet(z, "xl/worksheets/sheet1.xml")[1]  # the calamine path is the one compared
    _both_equal(p)


def test_a_formula_whose_saved_result_is_empty_text_reads_as_a_blank_demand(tmp_path):
    # =IF(..., "", ...) saved by a spreadsheet application: t="str" and an empty <v> (ECMA-376
    # Part 1 §18.3.1.4); a formula with no <v> at all was never calculated and stays a problem
    from beamsched.schedule import read_schedule

    sheet = (b'<worksheet ' + MAIN + b'><sheetData>'
             + b'<row r="1">' + b"".join(b'<c r="%s1" t="inlineStr"><is><t>%s</t></is></c>' % (c, t) for c, t in (
                 (b"A", b"Mark"), (b"B", b"Type"), (b"C", b"bw (mm)"), (b"D", b"h (mm)"), (b"E", b"f'c (MPa)"),
                 (b"F", b"fy (MPa)"), (b"G", b"Bottom bars"), (b"H", b"Mf+ (kN\xc2\xb7m)"), (b"I", b"Span (m)")))
             + b'</row>'
             + b'<row r="2"><c r="A2" t="inlineStr"><is><t>B1</t></is></c><c r="B2" t="inlineStr"><is><t>Rect</t>'
               b'</is></c><c r="C2"><v>300</v></c><c r="D2"><v>600</v></c><c r="E2"><v>30</v></c><c r="F2"><v>400</v>'
               b'</c><c r="G2" t="inlineStr"><is><t>3-20M</t></is></c><c r="H2" t="str"><f>IF(1&gt;2,5,"")</f><v></v>'
               b'</c><c r="I2"><v>6</v></c></row>'
             + b'<row r="3"><c r="A3" t="inlineStr"><is><t>B2</t></is></c><c r="B3" t="inlineStr"><is><t>Rect</t>'
               b'</is></c><c r="C3"><v>300</v></c><c r="D3"><v>600</v></c><c r="E3"><v>30</v></c><c r="F3"><v>400</v>'
               b'</c><c r="G3" t="inlineStr"><is><t>3-20M</t></is></c><c r="H3"><f>IF(1&gt;2,5,"")</f></c>'
               b'<c r="I3"><v>6</v></c></row>'
             + b'</sheetData></worksheet>')
    p = _repack(_book(tmp_path), tmp_path / "blank_results.xlsx", sheet)
    s = read_schedule(p)
    (b1,) = s.spans
    assert b1.mark == "B1" and b1.Mf_pos is None  # blank: not scheduled, never zero
    (b2,) = s.failures
    assert "a formula with no saved value" in b2.problems[0].message and "Mf+" in b2.problems[0].column
