"""Raw cells from a workbook or a CSV file, before any engineering meaning is given to them.

The reader opens an .xlsx/.xlsm twice, read-only: once for the cached values of formula cells
(what Excel or LibreOffice last calculated) and once for the formulas themselves, so that a
formula saved without a value (as openpyxl and some export tools write them) is reported, never
read as a blank.
"""

from __future__ import annotations

import csv
import io
import re
import zipfile
from dataclasses import dataclass
from pathlib import Path

from .columns import is_mark

HEADER_SEARCH_ROWS = 30  # the header must sit within the first 30 rows


class ScheduleError(Exception):
    """The file cannot be read as a schedule at all; the message says why, in one line."""


@dataclass(frozen=True)
class Cell:
    value: object  # the cached value (None for an empty cell)
    formula: str | None = None  # the formula text, where the cell holds one

    @property
    def uncached(self) -> bool:
        """A formula with no stored result."""
        return self.formula is not None and self.value is None

    @property
    def blank(self) -> bool:
        if self.formula is not None:
            return False
        return self.value is None or (isinstance(self.value, str) and not self.value.strip())


EMPTY = Cell(None)


@dataclass
class Grid:
    """One sheet (or the CSV file): rows of cells with their 1-based row numbers."""

    name: str
    rows: list[tuple[int, list[Cell]]]
    hidden_rows: frozenset[int] = frozenset()  # 1-based rows hidden in the workbook
    state: str = "visible"  # the sheet's own state: visible, hidden, veryHidden

    def header_index(self) -> int | None:
        """Index into ``rows`` of the first row within the first 30 that holds a Mark cell."""
        for i, (number, cells) in enumerate(self.rows):
            if number > HEADER_SEARCH_ROWS:
                break
            if any(isinstance(c.value, str) and is_mark(c.value) for c in cells):
                return i
        return None

    def first_texts(self, limit: int = 8) -> list[str]:
        """The text of the first non-blank row, for messages."""
        for _, cells in self.rows[:HEADER_SEARCH_ROWS]:
            texts = [str(c.value).strip() for c in cells if not c.blank and c.value is not None]
            if texts:
                return texts[:limit]
        return []


def _is_formula(v: object) -> str | None:
    if isinstance(v, str) and v.startswith("=") and len(v) > 1:
        return v
    name = type(v).__name__
    if name in ("ArrayFormula", "DataTableFormula"):
        return str(getattr(v, "text", "") or "=array formula")
    return None


def read_workbook(path: Path) -> list[Grid]:
    """Every sheet of an .xlsx/.xlsm workbook as a :class:`Grid` (values and formulas).

    The formulas pass reads every cell; a second, values-only pass is made only when the
    workbook holds formulas, to take their saved results.
    """
    import openpyxl

    if not zipfile.is_zipfile(path):
        raise ScheduleError(f"{path.name} is not an .xlsx/.xlsm workbook (not a zip package): "
                            "save it as .xlsx, or export the schedule as .csv")
    grids: list[Grid] = []
    formulas: list[list[tuple[int, int, int, str]]] = []  # per sheet: (row index, column, row number, text)
    try:
        wb = openpyxl.load_workbook(path, read_only=True, data_only=False)
    except Exception as exc:  # openpyxl raises many types for a damaged package
        raise ScheduleError(f"{path.name} cannot be opened as a workbook: {exc}") from exc
    try:
        for ws in wb.worksheets:
            rows: list[tuple[int, list[Cell]]] = []
            found: list[tuple[int, int, int, str]] = []
            # read-only mode trusts the sheet's declared used range and would silently drop rows and
            # columns past a stale one (some exporters write it wrong): measure the sheet instead
            ws.reset_dimensions()
            for number, values in enumerate(ws.iter_rows(values_only=True), start=1):
                cells = []
                for j, v in enumerate(values):
                    formula = _is_formula(v)
                    if formula is not None:
                        found.append((len(rows), j, number, formula))
                        cells.append(Cell(None, formula))
                    else:
                        cells.append(Cell(v))
                if not all(c.blank for c in cells):
                    rows.append((number, cells))
            grids.append(Grid(ws.title, rows, _hidden_rows(path, getattr(ws, "_worksheet_path", None)),
                              getattr(ws, "sheet_state", "visible") or "visible"))
            formulas.append(found)
    except Exception as exc:
        raise ScheduleError(f"{path.name} cannot be read as a workbook: {exc}") from exc
    finally:
        wb.close()
    if any(formulas):
        _saved_results(path, grids, formulas)
    return grids


_HIDDEN_ROW = re.compile(rb'<(?:\w+:)?row\b[^>]*?\br="(\d+)"[^>]*?\bhidden="(?:1|true)"')
_HIDDEN_ROW_2 = re.compile(rb'<(?:\w+:)?row\b[^>]*?\bhidden="(?:1|true)"[^>]*?\br="(\d+)"')


def _hidden_rows(path: Path, member: str | None) -> frozenset[int]:
    """Rows the workbook hides (a drafter's way of setting rows aside): they are still read."""
    if not member:
        return frozenset()
    try:
        with zipfile.ZipFile(path) as z:
            xml = z.read(member.lstrip("/"))
    except (KeyError, OSError, zipfile.BadZipFile):
        return frozenset()
    return frozenset(int(m.group(1)) for rx in (_HIDDEN_ROW, _HIDDEN_ROW_2) for m in rx.finditer(xml))


def _saved_results(path: Path, grids: list[Grid], formulas: list[list[tuple[int, int, int, str]]]) -> None:
    """Fill in the saved result of every formula cell (None where the file stores none)."""
    import openpyxl

    wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
    try:
        for grid, ws, found in zip(grids, wb.worksheets, formulas, strict=True):
            if not found:
                continue
            wanted = {number for _, _, number, _ in found}
            saved: dict[int, tuple] = {}
            ws.reset_dimensions()
            for number, values in enumerate(ws.iter_rows(values_only=True, max_row=max(wanted)), start=1):
                if number in wanted:
                    saved[number] = values
            for i, j, number, formula in found:
                row = saved.get(number, ())
                value = row[j] if j < len(row) else None
                # text that merely starts with '=' reads the same in both passes: it is not a formula
                grid.rows[i][1][j] = Cell(value) if value == formula else Cell(value, formula)
    finally:
        wb.close()


def read_csv(path: Path) -> Grid:
    """A CSV file as one :class:`Grid`: every cell is text (UTF-8, a BOM is allowed; the
    delimiter , ; or tab is detected)."""
    raw = path.read_bytes()
    for encoding in ("utf-8-sig", "cp1252"):
        try:
            text = raw.decode(encoding)
            break
        except UnicodeDecodeError:
            continue
    else:  # pragma: no cover - cp1252 decodes nearly anything
        raise ScheduleError(f"{path.name}: cannot decode the text (expected UTF-8)")
    if "\x00" in text:
        raise ScheduleError(f"{path.name} is not a text CSV file")
    try:
        dialect = csv.Sniffer().sniff(text[:4096], delimiters=",;\t")
    except csv.Error:
        dialect = csv.excel
    rows = []
    for number, values in enumerate(csv.reader(io.StringIO(text), dialect), start=1):
        cells = [Cell(v if v.strip() else None) for v in values]
        if not all(c.blank for c in cells):
            rows.append((number, cells))
    return Grid(path.stem, rows)
