"""The blank schedule template: the committed file is what ``write_template`` makes, it carries
help and drop-downs, and a filled-in copy reads back.

Source: beamsched issue 3, "beamsched template" (header with unit tags, a help comment on each
header cell, drop-downs for bar notation examples, Type, ends, Exposure and SFRS, a filled-in
Parameters sheet). Data validation and comments as stored by openpyxl (ECMA-376 Part 1,
§18.3.1.32 dataValidation; comments part §18.7).
"""

from __future__ import annotations

from pathlib import Path

import openpyxl
import pytest

from beamsched.engine import check_schedule
from beamsched.model import BeamStatus
from beamsched.schedule import read_schedule
from beamsched.schedule.parameters import PARAMS
from beamsched.schedule.template import HEADER_ROW, TEMPLATE_KEYS, template_columns, write_template

COMMITTED = Path(__file__).resolve().parents[1] / "templates" / "beamsched_template.xlsx"


def _contents(path: Path) -> dict:
    """Everything a user sees in the workbook, cell by cell: values, comments, drop-down lists."""
    wb = openpyxl.load_workbook(path)
    out = {}
    for ws in wb.worksheets:
        cells = {c.coordinate: c.value for row in ws.iter_rows() for c in row if c.value is not None}
        comments = {c.coordinate: c.comment.text for row in ws.iter_rows() for c in row if c.comment}
        lists = sorted((str(dv.sqref), dv.formula1, dv.showErrorMessage) for dv in ws.data_validations.dataValidation)
        out[ws.title] = (ws.sheet_state, cells, comments, lists)
    return out


def test_committed_template_is_what_write_template_makes(tmp_path):
    fresh = write_template(tmp_path / "t.xlsx")
    assert COMMITTED.exists(), "templates/beamsched_template.xlsx is missing: run " \
                               "python -m beamsched.schedule.template templates/beamsched_template.xlsx"
    assert _contents(fresh) == _contents(COMMITTED), "the committed template is stale: regenerate it with " \
                                                     "python -m beamsched.schedule.template"


def test_header_has_units_and_a_help_comment_on_every_cell(tmp_path):
    wb = openpyxl.load_workbook(write_template(tmp_path / "t.xlsx"))
    ws = wb["Schedule"]
    header = [c.value for c in ws[HEADER_ROW]]
    assert header == [c.header() for c in template_columns()]
    assert "Mf- L (kN·m)" in header and "Span (m)" in header and "bw (mm)" in header and "Vf R (kN)" in header
    for cell in ws[HEADER_ROW]:
        assert cell.comment is not None and len(cell.comment.text) > 20, cell.value
    vf = ws.cell(row=HEADER_ROW, column=TEMPLATE_KEYS.index("vf_l") + 1).comment.text
    assert "critical section" in vf and "dv from" in vf and "face of the" in vf


def test_drop_downs(tmp_path):
    wb = openpyxl.load_workbook(write_template(tmp_path / "t.xlsx"))
    ws = wb["Schedule"]
    letters = {c.value: c.column_letter for c in ws[HEADER_ROW]}
    by_column = {str(dv.sqref).split(":")[0].rstrip("0123456789"): dv for dv in ws.data_validations.dataValidation}
    assert by_column[letters["Type"]].formula1 == '"Rect,T,L"'
    assert by_column[letters["Left end"]].formula1 == '"simple,continuous,free"'
    assert by_column[letters["Right end"]].formula1 == '"simple,continuous,free"'
    assert by_column[letters["Exposure"]].formula1 == '"interior,exterior"'
    assert by_column[letters["SFRS"]].formula1 == '"yes,no"'
    bars = by_column[letters["Bottom bars"]]
    assert bars.formula1.startswith("=Lists!") and not bars.showErrorMessage  # examples; any notation allowed
    examples = [c.value for c in wb["Lists"]["A"][1:]]
    assert "4-25M" in examples and "2-25M + 2-20M" in examples
    assert by_column[letters["Stirrups"]].formula1.startswith("=Lists!$B")


def test_parameters_sheet_is_filled_in(tmp_path):
    wb = openpyxl.load_workbook(write_template(tmp_path / "t.xlsx"))
    ps = wb["Parameters"]
    names = [r[0].value for r in ps.iter_rows(min_row=2)]
    assert names == [p.label for p in PARAMS]
    values = {r[0].value: (r[1].value, r[2].value) for r in ps.iter_rows(min_row=2)}
    assert values["f'c"] == (30, "MPa") and values["Design code"][0] == "CSA A23.3-19"
    assert values["Exposure"][0] == "exterior" and values["Unit system"][0] == "SI"


def test_template_round_trip(tmp_path):
    path = write_template(tmp_path / "t.xlsx")
    wb = openpyxl.load_workbook(path)
    ws = wb["Schedule"]
    col = {c.value: c.column for c in ws[HEADER_ROW]}
    spans = [
        {"Mark": "G1", "Span no.": 1, "Type": "T", "bw (mm)": 400, "h (mm)": 750, "hf (mm)": 150, "Span (m)": 8.5,
         "Clear span (m)": 8.0, "Left end": "simple", "Right end": "continuous", "Bottom bars": "5-25M",
         "Top bars L": "2-20M", "Top bars R": "6-25M", "Stirrups": "10M@250", "Mf+ (kN·m)": 420,
         "Mf- R (kN·m)": 510, "Vf L (kN)": 280, "Vf R (kN)": 350, "Notes": "grid 4"},
        {"Mark": "G1", "Span no.": 2, "Type": "T", "bw (mm)": 400, "h (mm)": 750, "hf (mm)": 150, "Span (m)": 8.5,
         "Left end": "continuous", "Right end": "simple", "Bottom bars": "5-25M", "Top bars L": "6-25M",
         "Top bars R": "2-20M", "Stirrups": "10M@250", "Mf+ (kN·m)": 420, "Mf- L (kN·m)": 510,
         "f'c (MPa)": 35, "Exposure": "interior"},
    ]
    for i, span in enumerate(spans):
        for label, value in span.items():
            ws.cell(row=HEADER_ROW + 1 + i, column=col[label], value=value)
    wb["Parameters"]["B2"] = "Harrowgate Depot"
    wb.save(path)
    s = read_schedule(path)
    assert s.header_row == HEADER_ROW and not [p for p in s.problems if p.severity == "error"]
    assert s.project["project"] == "Harrowgate Depot"
    # the template's placeholders left unfilled, "(number)", "(initials)" ..., are no title block
    assert "project_no" not in s.project and "prepared_by" not in s.project and "date" not in s.project
    assert s.project["revision"] == "A"  # a real value the template fills in is kept
    g1, g2 = s.spans
    assert (g1.mark, g1.span_no, g1.shape, g1.bw, g1.h, g1.hf, g1.span, g1.clear_span) == \
        ("G1", 1, "T", 400, 750, 150, 8500, 8000)
    assert (g1.left_end, g1.right_end, g1.Mf_pos, g1.Mf_neg_right, g1.Mf_neg_left) == \
        ("simple", "continuous", 420e6, 510e6, None)
    assert g1.fc == 30 and g2.fc == 35  # Parameters default, then the row's own value
    assert g1.exposure == "exterior" and g2.exposure == "interior"
    assert g1.cover_top == 40 and g1.agg == 20 and g1.notes == "grid 4"
    assert any("c/c span 8.5 m stands in" in a for a in g2.assumed)
    assert [r.status for r in check_schedule(s)] != [BeamStatus.ERROR, BeamStatus.ERROR]


@pytest.mark.parametrize("key", TEMPLATE_KEYS)
def test_every_template_header_reads_back_as_its_column(key):
    from beamsched.schedule.columns import BY_KEY, match_header

    col, unit = match_header(BY_KEY[key].header())
    assert col is not None and col.key == key and unit == BY_KEY[key].unit


def test_column_table_for_the_readme_covers_every_column():
    from beamsched.schedule.columns import COLUMNS, FIELDS, markdown_table

    assert set(FIELDS) == {c.key for c in COLUMNS}
    table = markdown_table()
    assert table == markdown_table()  # stable, so the README can be regenerated
    for c in COLUMNS:
        assert f"| `{c.header()}`" in table
