"""Raw cells from a workbook or a CSV file, before any engineering meaning is given to them.

The reader opens an .xlsx/.xlsm twice, read-only: once for the cached values of formula cells
(what Excel or LibreOffice last calculated) and once for the formulas themselves, so that a
formula saved without a value (as openpyxl and some export tools write them) is reported, never
read as a blank.
"""

from __future__ import annotations

import csv
import io
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
    """Every sheet of an .xlsx/.xlsm workbook as a :class:`Grid` (values and formulas)."""
    import openpyxl

    if not zipfile.is_zipfile(path):
        raise ScheduleError(f"{path.name} is not an .xlsx/.xlsm workbook (not a zip package): "
                            "save it as .xlsx, or export the schedule as .csv")
    try:
        values_wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
        formula_wb = openpyxl.load_workbook(path, read_only=True, data_only=False)
    except Exception as exc:  # openpyxl raises many types for a damaged package
        raise ScheduleError(f"{path.name} cannot be opened as a workbook: {exc}") from exc
    grids = []
    try:
        for ws_v, ws_f in zip(values_wb.worksheets, formula_wb.worksheets, strict=True):
            rows: list[tuple[int, list[Cell]]] = []
            for number, (vals, forms) in enumerate(
                    zip(ws_v.iter_rows(values_only=True), ws_f.iter_rows(values_only=True), strict=False), start=1):
                cells = []
                for v, f in zip(vals, forms, strict=False):
                    formula = _is_formula(f)
                    if formula is not None and isinstance(v, str) and v == f:
                        formula = None  # text that happens to start with '='
                    cells.append(Cell(v, formula))
                if not all(c.blank for c in cells):
                    rows.append((number, cells))
            grids.append(Grid(ws_v.title, rows))
    finally:
        values_wb.close()
        formula_wb.close()
    return grids


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
