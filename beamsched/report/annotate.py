"""The annotated copy: the user's own workbook with the results beside each span (openpyxl).

The copy keeps the user's sheets, cell values, formulas and formatting. It gains:

* a first sheet that says it is a checked copy (of which file, when, by which version), the
  caution, the legend, and what of the original the copy could not carry (images, charts,
  shapes, controls ... that openpyxl drops), found by comparing the parts of the two files;
* result columns to the right of the schedule table: Mr+, Mr−, Vr, maximum utilisation, status
  and a note, coloured from the palette, with a cell comment on every span that is not a pass.

The input is only ever read; the copy goes to a new name through a temporary file.
"""

from __future__ import annotations

import io
import math
import os
import re
import warnings
import zipfile
from dataclasses import dataclass, field
from pathlib import Path

from .. import CAUTION
from ..model import BeamStatus
from . import palette as P
from .atomic import OutputError, atomic_path
from .jsonout import _smaller_of_ends
from .table import Report, SpanRow

NOTICE_SHEET = "beamsched check"
# One-line headers: the user's header row keeps its height. The header is in the user's own font,
# bold, which may be wider than the digits columns are counted in (DejaVu Sans, where Calibri is
# missing, runs a third wider): 1.25 units a character holds it in any of the usual faces.
_WIDE = 1.25


def _fit(head: str) -> float:
    return math.ceil(len(head) * _WIDE) + 2


RESULT_COLUMNS = tuple((head, _fit(head) if width is None else width, key) for head, width, key in (
    ("beamsched Mr+ (kN·m)", None, "Mr_pos_kNm"),
    ("beamsched Mr− (kN·m), smaller end", None, "Mr_neg_kNm"),
    ("beamsched Vr (kN), smaller end", None, "Vr_kN"),
    ("beamsched max utilisation", None, None),
    ("beamsched status", None, None),
    ("beamsched note (all notes in the cell comment and the results workbook)", 90, None),
))

# Parts of an .xlsx package, counted in the original and in the copy.
_PARTS = {
    "images": re.compile(r"^xl/media/"),
    "charts": re.compile(r"^xl/charts/chart[^/]*\.xml$"),
    "embedded objects": re.compile(r"^xl/embeddings/"),
    "form controls": re.compile(r"^xl/ctrlProps/"),
    "pivot tables": re.compile(r"^xl/pivotTables/[^/]*\.xml$"),
    "slicers": re.compile(r"^xl/slicers/"),
    "macros": re.compile(r"^xl/vbaProject\.bin$"),
}
_SHAPE = re.compile(rb"<(?:\w+:)?sp[\s>]")


def count_parts(path: str | os.PathLike) -> dict[str, int]:
    """How many images, charts, shapes ... an .xlsx/.xlsm package holds."""
    out = {k: 0 for k in _PARTS}
    out["shapes and text boxes"] = 0
    with zipfile.ZipFile(path) as z:
        for name in z.namelist():
            for kind, pattern in _PARTS.items():
                if pattern.search(name):
                    out[kind] += 1
            if re.match(r"^xl/drawings/drawing[^/]*\.xml$", name):
                out["shapes and text boxes"] += len(_SHAPE.findall(z.read(name)))
    return out


@dataclass
class AnnotateOutcome:
    path: Path
    lost: list[str] = field(default_factory=list)  # what the copy could not carry, in words
    sheet: str = ""
    first_result_column: str = ""


def _lost(before: dict[str, int], after: dict[str, int]) -> list[str]:
    out = []
    for kind, n in before.items():
        m = after.get(kind, 0)
        if m < n:
            out.append(f"{n - m} of the {n} {kind}" if m else f"{n} {kind}")
    return out


def _argb(hex_colour: str) -> str:
    return "FF" + hex_colour.lstrip("#").upper()


class _Styles:
    def __init__(self, font_name: str | None = None, font_size: float | None = None):
        from openpyxl.styles import Alignment, Font, PatternFill

        self.Alignment, self.PatternFill = Alignment, PatternFill
        self.name, self.size = font_name or "Calibri", font_size or 11

        def font(**kw):  # the user's font face and size, our colour and weight
            kw.setdefault("name", self.name)
            kw.setdefault("size", self.size)
            return Font(**kw)

        self.Font = font

    def apply(self, cell, swatch: P.Swatch | None, *, num: str | None = None, wrap: bool = False,
              center: bool = False) -> None:
        if swatch is not None:
            cell.fill = self.PatternFill("solid", fgColor=_argb(swatch.fill), bgColor=_argb(swatch.fill))
            cell.font = self.Font(color=_argb(swatch.text), bold=swatch.bold, italic=swatch.italic)
        else:
            cell.font = self.Font()
        if num:
            cell.number_format = num
        cell.alignment = self.Alignment(wrap_text=wrap, vertical="top", horizontal="center" if center else None)


def _last_table_column(ws, first_row: int, last_row: int) -> int:
    last = 0
    for row in ws.iter_rows(min_row=first_row, max_row=max(last_row, first_row)):
        for cell in row:
            if cell.value is not None and cell.column > last:
                last = cell.column
    return last


def _notice(wb, report: Report, source: Path, sheet: str, first_col: str, lost: list[str], load_warnings: list[str],
            styles: _Styles) -> None:
    name = NOTICE_SHEET
    while name in wb.sheetnames:
        name = name + " 2" if not name[-1].isdigit() else name[:-1] + str(int(name[-1]) + 1)
    ws = wb.create_sheet(name, 0)
    ws.column_dimensions["A"].width = 22
    ws.column_dimensions["B"].width = 110
    Font, Alignment = styles.Font, styles.Alignment
    rows: list[tuple[str, str, P.Swatch | None]] = [
        ("CHECKED COPY", (f"This is a copy of {source.name} made by beamsched {report.version} on "
                         f"{report.checked_at:%Y-%m-%d %H:%M}. The original file is unchanged."), None),
        ("Caution", CAUTION, None),
        ("Results", (f"Result columns were added on sheet “{sheet}” from column {first_col} on, to the right of "
                    "the schedule table. The full results, working and notes are in the results workbook."), None),
        ("Original file", f"{source.name}; SHA-256 {report.schedule.file_sha256 or 'not known'}", None),
    ]
    if lost:
        rows.append(("NOT CARRIED OVER", "This copy does not carry " + "; ".join(lost) + " of the original: "
                     "the spreadsheet library used for the copy cannot keep them. Open the original for them.", None))
    for w in load_warnings:
        rows.append(("Library warning", w, None))
    rows.append(("", "", None))
    for status in BeamStatus:
        st = P.SPAN_STATUS[status]
        rows.append((st.word, st.meaning, st.swatch))
    for band in P.BANDS:
        rows.append((f"utilisation {band.name}", band.meaning, band.swatch))
    r = 1
    for label, text, swatch in rows:
        a, b = ws.cell(r, 1, label), ws.cell(r, 2, text)
        a.font = Font(bold=True, color="FF9E1B22" if label == "NOT CARRIED OVER" else None)
        b.font = Font()
        b.alignment = Alignment(wrap_text=True, vertical="top")
        a.alignment = Alignment(vertical="top", horizontal="center" if swatch else None)
        if swatch is not None:
            styles.apply(a, swatch, center=True)
        lines = sum(max(1, math.ceil(len(part) / 105)) for part in text.split("\n")) if text else 1
        ws.row_dimensions[r].height = 15 * lines
        r += 1
    from openpyxl.worksheet.properties import PageSetupProperties

    ws.page_setup.orientation = "landscape"
    ws.page_setup.fitToWidth, ws.page_setup.fitToHeight = 1, 0
    ws.sheet_properties.pageSetUpPr = PageSetupProperties(fitToPage=True)
    ws.sheet_view.tabSelected = True
    for other in wb.worksheets[1:]:
        other.sheet_view.tabSelected = False
    wb.active = 0


def write_annotated(report: Report, source: str | os.PathLike, target: str | os.PathLike,
                    protected: tuple | list = ()) -> AnnotateOutcome:
    """Write the annotated copy of ``source`` (the schedule that was read) to ``target``."""
    from openpyxl import load_workbook
    from openpyxl.comments import Comment
    from openpyxl.utils import get_column_letter

    source, target = Path(source), Path(target)
    ext = source.suffix.lower()
    if ext not in (".xlsx", ".xlsm"):
        raise OutputError(f"--annotate needs an .xlsx or .xlsm schedule; {source.name} is not one (the results "
                          "workbook holds everything the copy would)")
    if target.suffix.lower() != ext:
        raise OutputError(f"the annotated copy {target.name} must keep the input's extension ({ext})")
    protected = [source, *protected]
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        wb = load_workbook(source, keep_vba=(ext == ".xlsm"), data_only=False, keep_links=True)
    load_warnings = sorted({str(w.message) for w in caught})
    sheet = report.schedule.sheet if report.schedule.sheet in wb.sheetnames else wb.sheetnames[0]
    ws = wb[sheet]
    header = report.schedule.header_row or 1
    span_rows = [x.result.row for x in report.rows if x.result.row is not None]
    last = _last_table_column(ws, header, max(span_rows, default=header))
    first = last + 1
    user_font = ws.cell(header, max(last, 1)).font
    styles = _Styles(user_font.name if user_font else None, user_font.sz if user_font else None)
    for j, (head, width, _) in enumerate(RESULT_COLUMNS):
        col = first + j
        cell = ws.cell(header, col, head)
        styles.apply(cell, P.HEADER, center=True)
        ws.column_dimensions[get_column_letter(col)].width = width
    for x in report.rows:
        _annotate_row(ws, x, first, styles, Comment)
    outcome = AnnotateOutcome(target, sheet=sheet, first_result_column=get_column_letter(first))
    before = count_parts(source)
    with atomic_path(target, protected) as tmp:
        _notice(wb, report, source, sheet, outcome.first_result_column, [], load_warnings, styles)
        wb.save(tmp)
        lost = _lost(before, count_parts(tmp))
        if lost:
            # Say so on the first sheet. The copy is reopened (not saved twice: openpyxl reads the
            # images it carried lazily from the original and cannot write them a second time).
            again = load_workbook(tmp, keep_vba=(ext == ".xlsm"), data_only=False, keep_links=True)
            del again[again.sheetnames[0]]
            _notice(again, report, source, sheet, outcome.first_result_column, lost, load_warnings, styles)
            buf = io.BytesIO()
            again.save(buf)
            tmp.write_bytes(buf.getvalue())
    outcome.lost = lost
    return outcome


def _annotate_row(ws, x: SpanRow, first: int, styles: _Styles, Comment) -> None:
    res = x.result
    if res.row is None:
        return
    values = res.values
    for j, (_, _, key) in enumerate(RESULT_COLUMNS[:3]):
        v = _smaller_of_ends(values, key) if key else None
        cell = ws.cell(res.row, first + j)
        if isinstance(v, (int, float)) and math.isfinite(v):
            cell.value = float(v)
            styles.apply(cell, None, num="#,##0.0")
        else:
            cell.value = "—"
            styles.apply(cell, None, center=True)
    u = x.utilisation
    cell = ws.cell(res.row, first + 3)
    if u is None:
        cell.value = "—"
        styles.apply(cell, None, center=True)
    else:
        band = P.band_for(u)
        cell.value = float(u) if math.isfinite(u) else "∞"
        styles.apply(cell, band.swatch, num="0.000", center=True)
    st = P.SPAN_STATUS[res.status]
    cell = ws.cell(res.row, first + 4, st.word)
    styles.apply(cell, st.swatch, center=True)
    note = x.note_text
    ncell = ws.cell(res.row, first + 5, note.split("\n")[0] + (f" (+{len(x.notes) - 1} more)" if len(x.notes) > 1 else ""))
    styles.apply(ncell, None, wrap=False)
    if res.status is not BeamStatus.PASS and note:
        text = f"{res.label}: {st.word}\n{note}"[:2000]
        comment = Comment(text, "beamsched")
        comment.width = 420
        comment.height = min(60 + 15 * text.count("\n") + len(text) // 3, 600)
        cell.comment = comment
