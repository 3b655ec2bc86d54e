"""Raw cells from a workbook or a CSV file, before any engineering meaning is given to them.

A sheet of an .xlsx/.xlsm is read by python-calamine (every cell's value, a formula's saved
result included) unless its XML holds a formula or a cell of error type: calamine reads a
formula saved without a result, a result that is an empty text and a cached error (#DIV/0!)
all as an empty cell. Such a sheet is read by openpyxl as before: read-only, once for the
formulas themselves and once for their saved results (what Excel or LibreOffice last
calculated), so that a formula saved without a value is reported, never read as a blank. Both
ways give the same :class:`Cell` values (``tests/test_schedule_cells.py`` compares them).
"""

from __future__ import annotations

import csv
import datetime as _dt
import io
import itertools
import posixpath
import re
import zipfile
from collections.abc import Iterable
from dataclasses import dataclass
from pathlib import Path

from .columns import is_mark

HEADER_SEARCH_ROWS = 30  # the header must sit within the first 30 rows


class ScheduleError(Exception):
    """The file cannot be read as a schedule at all; the message says why, in one line."""


@dataclass(frozen=True, slots=True)
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


def _plain(v: object) -> Cell:
    """A value as a Cell: an empty cell, and text that is only spaces, is the one blank cell."""
    if v is None or (isinstance(v, str) and not v.strip()):
        return EMPTY
    return Cell(v)


def _trim(cells: list[Cell]) -> list[Cell]:
    """The row without its trailing blank cells (a row is as long as its last filled cell)."""
    n = len(cells)
    while n and cells[n - 1].blank:
        n -= 1
    del cells[n:]
    return cells


def read_workbook(path: Path) -> list[Grid]:
    """Every sheet of an .xlsx/.xlsm workbook as a :class:`Grid` (values and formulas).

    python-calamine reads each sheet that holds no formula and no error cell; openpyxl reads
    the others (:func:`read_workbook_openpyxl`), and the whole workbook when its structure is
    one the fast path does not know (it then answers exactly as before).
    """
    if not zipfile.is_zipfile(path):
        raise ScheduleError(f"{path.name} is not an .xlsx/.xlsm workbook (not a zip package): "
                            "save it as .xlsx, or export the schedule as .csv")
    try:
        return read_workbook_calamine(path)
    except Exception:  # noqa: BLE001 - any surprise: the openpyxl path answers, with its own messages
        return read_workbook_openpyxl(path)


class _NotFast(Exception):
    """The workbook's structure is one only openpyxl's path reads."""


_NS_REL = ("http://schemas.openxmlformats.org/officeDocument/2006/relationships",
           "http://purl.oclc.org/ooxml/officeDocument/relationships")


def _local(tag: str) -> str:
    return tag.rsplit("}", 1)[-1]


def _rels(z: zipfile.ZipFile, part: str) -> dict[str, tuple[str, str]]:
    """The relationships of a package part: id -> (type, member name)."""
    from defusedxml.ElementTree import fromstring

    folder, name = posixpath.split(part)
    rels_name = posixpath.join(folder, "_rels", name + ".rels")
    out: dict[str, tuple[str, str]] = {}
    for el in fromstring(z.read(rels_name)):
        if _local(el.tag) != "Relationship" or el.get("TargetMode") == "External":
            continue
        target = el.get("Target", "")
        member = target.lstrip("/") if target.startswith("/") else posixpath.normpath(posixpath.join(folder, target))
        out[el.get("Id", "")] = (el.get("Type", ""), member)
    return out


def _sheet_parts(z: zipfile.ZipFile) -> list[tuple[str, str, str]]:
    """The worksheets in workbook order: (name, package member, state)."""
    from defusedxml.ElementTree import fromstring

    root = [m for t, m in _rels(z, "").values() if t.endswith("/officeDocument")]
    if len(root) != 1:
        raise _NotFast("no single workbook part")
    book = root[0]
    rels = _rels(z, book)
    names = set(z.namelist())
    out = []
    for el in fromstring(z.read(book)).iter():
        if _local(el.tag) != "sheet":
            continue
        rid = next((el.get(f"{{{ns}}}id") for ns in _NS_REL if el.get(f"{{{ns}}}id") is not None), None)
        kind, member = rels.get(rid or "", ("", ""))
        if kind.endswith("/chartsheet"):
            continue  # openpyxl's worksheets leave chart sheets out too
        if not kind.endswith("/worksheet") or member not in names:
            raise _NotFast(f"sheet {el.get('name')!r}: {kind or 'no relationship'}")
        out.append((el.get("name", ""), member, el.get("state") or "visible"))
    return out


_HIDDEN_ROW = re.compile(rb'<(?:\w+:)?row\b[^>]*?\br="(\d+)"[^>]*?\bhidden="(?:1|true)"')
_HIDDEN_ROW_2 = re.compile(rb'<(?:\w+:)?row\b[^>]*?\bhidden="(?:1|true)"[^>]*?\br="(\d+)"')
_FORMULA_TAG = re.compile(rb"<(?:\w+:)?f[\s>/]")
_ERROR_CELL = re.compile(rb"""<(?:\w+:)?c\s[^>]*\bt\s*=\s*["']e["']""")
_CHUNK = 1 << 20


def _hidden_in(xml: bytes) -> set[int]:
    if b"hidden=" not in xml:  # the regexes are slow; nearly no sheet hides rows
        return set()
    return {int(m.group(1)) for rx in (_HIDDEN_ROW, _HIDDEN_ROW_2) for m in rx.finditer(xml)}


def _special_in(xml: bytes) -> bool:
    """Whether this piece of sheet XML holds a formula or a cell of error type."""
    if (b"<f" in xml or b":f" in xml) and _FORMULA_TAG.search(xml):
        return True
    return (b"e'" in xml or b'e"' in xml) and _ERROR_CELL.search(xml) is not None


def scan_sheet(z: zipfile.ZipFile, member: str) -> tuple[frozenset[int], bool]:
    """A worksheet's hidden rows, and whether it holds a formula or an error cell (then it is
    read by openpyxl). The part is streamed, a megabyte at a time, and never held whole; a piece
    ends before its last ``<``, so no tag is cut in two. A sheet not in UTF-8 (UTF-16) counts as
    holding formulas: the byte patterns cannot see into it."""
    hidden: set[int] = set()
    special = False
    with z.open(member) as f:
        buf = f.read(_CHUNK)
        if buf[:2] in (b"\xff\xfe", b"\xfe\xff") or buf[:2] in (b"<\x00", b"\x00<"):
            return frozenset(), True
        while buf:
            chunk = f.read(_CHUNK)
            if chunk:
                buf += chunk
                cut = buf.rfind(b"<")
                if cut <= 0:
                    continue
                piece, buf = buf[:cut], buf[cut:]
            else:
                piece, buf = buf, b""
            hidden |= _hidden_in(piece)
            special = special or _special_in(piece)
    return frozenset(hidden), special


def _hidden_rows(path: Path, member: str | None) -> frozenset[int]:
    """Rows the workbook hides (a drafter's way of setting rows aside): they are still read."""
    xml = _sheet_xml(path, member)
    return frozenset() if xml is None else frozenset(_hidden_in(xml))


def _sheet_xml(path: Path, member: str | None) -> bytes | None:
    """A sheet part's XML (None when the part cannot be read: the caller then knows nothing more)."""
    if not member:
        return None
    try:
        with zipfile.ZipFile(path) as z:
            return z.read(member.lstrip("/"))
    except (KeyError, OSError, zipfile.BadZipFile):
        return None


_CELL = re.compile(rb'<(?:\w+:)?c\b([^>]*)>(.*?)</(?:\w+:)?c>', re.S)
_REF = re.compile(rb'\br="([A-Z]+)(\d+)"')
_TEXT_TYPE = re.compile(rb'\bt="str"')
_EMPTY_VALUE = re.compile(rb'<(?:\w+:)?v\s*/>|<(?:\w+:)?v>\s*</(?:\w+:)?v>')


def _column_index(letters: bytes) -> int:
    n = 0
    for ch in letters:
        n = n * 26 + ch - 64
    return n - 1


def empty_text_results(path: Path, member: str | None, rows: set[int]) -> set[tuple[int, int]]:
    """(row number, 0-based column) of the formula cells in ``rows`` whose saved result is an
    empty text (``t="str"`` with an empty ``<v>``, as a formula such as ``=IF(..., "", ...)``
    stores it): openpyxl reads those as None, like a formula saved without any result, but the
    spreadsheet shows them blank and they are to be read as blank cells."""
    xml = _sheet_xml(path, member) if rows else None
    if xml is None:
        return set()
    out = set()
    for m in _CELL.finditer(xml):
        attrs, inner = m.group(1), m.group(2)
        if not _TEXT_TYPE.search(attrs) or not _EMPTY_VALUE.search(inner) or b"<f" not in inner:
            continue
        ref = _REF.search(attrs)
        if ref is not None and int(ref.group(2)) in rows:
            out.add((int(ref.group(2)), _column_index(ref.group(1))))
    return out


_BIG = 1e15  # integral floats below this are written without '.' or 'E' in the sheet XML: openpyxl reads ints


def _value(v: object) -> object:
    """A calamine value as openpyxl gives it: integral numbers as int, a date as a datetime at
    midnight (openpyxl's type for a date cell), an empty cell as None."""
    if isinstance(v, float):
        return int(v) if v.is_integer() and -_BIG < v < _BIG else v
    if isinstance(v, _dt.date) and not isinstance(v, _dt.datetime):
        return _dt.datetime(v.year, v.month, v.day)
    return v


def grid_from_values(name: str, values: Iterable[list[object]], hidden: frozenset[int] = frozenset(),
                     state: str = "visible", first_column: int = 0) -> Grid:
    """A Grid from calamine's rows of values: row 1 first, the first value of each in column
    ``first_column`` + 1 (0: column A). Equal values share one Cell object (a schedule repeats
    its sizes, bars and words row after row)."""
    cache: dict[tuple[type, object], Cell] = {}
    get = cache.get
    rows: list[tuple[int, list[Cell]]] = []
    lead = [EMPTY] * first_column
    for i, vals in enumerate(values):
        cells: list[Cell] = lead.copy()
        last = 0
        for v in vals:
            if v == "" or v is None:
                cells.append(EMPTY)
                continue
            key = (v.__class__, v)
            c = get(key)
            if c is None:
                c = cache[key] = _plain(_value(v))
            cells.append(c)
            if c is not EMPTY:
                last = len(cells)
        if last:
            del cells[last:]
            rows.append((i + 1, cells))
    return Grid(name, rows, hidden, state)


def _calamine_grid(wb, name: str, hidden: frozenset[int], state: str) -> Grid:
    """One sheet through calamine, row by row (the sheet's values are never all in Python at
    once). ``iter_rows`` starts at row 1 and at the first column used; where a version of
    python-calamine answers otherwise (the number of rows tells), the whole sheet is taken from
    column A and row 1 with ``to_python``."""
    sheet = wb.get_sheet_by_name(name)
    if sheet.start is None:  # an empty sheet
        return Grid(name, [], hidden, state)
    (_, col0), (row1, col1) = sheet.start, sheet.end
    rows = sheet.iter_rows()
    first = next(rows, [])
    if len(first) == col1 + 1:  # rows that start at column A
        col0 = 0
    if len(first) == col1 - col0 + 1:
        grid = grid_from_values(name, itertools.chain([first], rows), hidden, state, col0)
        if (grid.rows[-1][0] if grid.rows else 0) == row1 + 1:
            return grid
    return grid_from_values(name, sheet.to_python(skip_empty_area=False), hidden, state)


def read_workbook_calamine(path: Path) -> list[Grid]:
    """The fast path of :func:`read_workbook`: python-calamine for every sheet that holds no
    formula and no error cell, openpyxl for the others (calamine's saved results stand in for
    openpyxl's values-only pass wherever calamine has one). Raises for a structure it does not
    know."""
    from python_calamine import CalamineWorkbook

    with zipfile.ZipFile(path) as z:
        parts = _sheet_parts(z)
        scans = [scan_sheet(z, member) for _, member, _ in parts]
    grids: list[Grid] = []
    saved: dict[str, Grid] = {}
    wb = CalamineWorkbook.from_path(str(path))
    try:
        for (name, _, state), (hidden, special) in zip(parts, scans, strict=True):
            grid = _calamine_grid(wb, name, hidden, state)
            if special:
                saved[name] = grid
            grids.append(grid)
    finally:
        wb.close()
    if saved:
        by_name = {g.name: g for g in read_workbook_openpyxl(path, only=set(saved), saved=saved)}
        grids = [by_name[g.name] if g.name in saved else g for g in grids]
    return grids


def read_workbook_openpyxl(path: Path, only: set[str] | None = None,
                           saved: dict[str, Grid] | None = None) -> list[Grid]:
    """Every sheet (or the sheets named in ``only``) read by openpyxl, read-only.

    The formulas pass reads every cell; a second, values-only pass is made only when the
    workbook holds formulas, to take their saved results. ``saved`` (sheet name -> the sheet as
    calamine read it) gives the saved result of each formula calamine has one for; the
    values-only pass is then made only for the others: those saved without a result, with an
    empty text or with an error as their result, which calamine all reads as an empty cell.
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
    shared: dict[tuple[type, object], Cell] = {}  # one Cell for equal values (of one type)
    try:
        for ws in wb.worksheets:
            if only is not None and ws.title not in only:
                continue
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
                        try:
                            key = (v.__class__, v)
                            c = shared.get(key)
                            if c is None:
                                c = shared[key] = _plain(v)
                        except TypeError:  # a value that cannot be a key: its own Cell
                            c = _plain(v)
                        cells.append(c)
                if not all(c.blank for c in cells):
                    rows.append((number, cells))
            grids.append(Grid(ws.title, rows, _hidden_rows(path, getattr(ws, "_worksheet_path", None)),
                              getattr(ws, "sheet_state", "visible") or "visible"))
            formulas.append(found)
    except Exception as exc:
        raise ScheduleError(f"{path.name} cannot be read as a workbook: {exc}") from exc
    finally:
        wb.close()
    if saved:
        formulas = [_from_saved(g, found, saved.get(g.name)) for g, found in zip(grids, formulas, strict=True)]
    if any(formulas):
        _saved_results(path, grids, formulas)
    for grid in grids:
        for _, cells in grid.rows:
            _trim(cells)
    return grids


def _from_saved(grid: Grid, found: list[tuple[int, int, int, str]],
                saved: Grid | None) -> list[tuple[int, int, int, str]]:
    """Fill in each formula's saved result that calamine read; the formulas still without one."""
    if saved is None:
        return found
    by_number = dict(saved.rows)
    left = []
    for i, j, number, formula in found:
        row = by_number.get(number, ())
        c = row[j] if j < len(row) else EMPTY
        if c.blank:
            left.append((i, j, number, formula))
            continue
        grid.rows[i][1][j] = Cell(c.value) if c.value == formula else Cell(c.value, formula)
    return left


def _result(saved: dict[int, tuple], number: int, j: int) -> object:
    """The saved value at row ``number``, column ``j`` of a values-only pass (None past its end)."""
    row = saved.get(number, ())
    return row[j] if j < len(row) else None


def _saved_results(path: Path, grids: list[Grid], formulas: list[list[tuple[int, int, int, str]]]) -> None:
    """Fill in the saved result of every formula cell (None where the file stores none)."""
    import openpyxl

    wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
    try:
        sheets = {ws.title: ws for ws in wb.worksheets}
        for grid, found in zip(grids, formulas, strict=True):
            if not found:
                continue
            ws = sheets[grid.name]
            wanted = {number for _, _, number, _ in found}
            saved: dict[int, tuple] = {}
            ws.reset_dimensions()
            for number, values in enumerate(ws.iter_rows(values_only=True, max_row=max(wanted)), start=1):
                if number in wanted:
                    saved[number] = values
            results = {(number, j): _result(saved, number, j) for _, j, number, _ in found}
            no_result = {number for (number, _), value in results.items() if value is None}
            empty = empty_text_results(path, getattr(ws, "_worksheet_path", None), no_result)
            for i, j, number, formula in found:
                value = results[(number, j)]
                if value is None and (number, j) in empty:
                    grid.rows[i][1][j] = EMPTY  # the formula's saved result is an empty text: a blank cell
                    continue
                # text that merely starts with '=' reads the same in both passes: it is not a formula
                grid.rows[i][1][j] = _plain(value) if value == formula else Cell(value, formula)
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
    shared: dict[str, Cell] = {}  # one Cell for each distinct text
    for number, values in enumerate(csv.reader(io.StringIO(text), dialect), start=1):
        cells = [shared.get(v) or shared.setdefault(v, _plain(v)) for v in values]
        if not all(c.blank for c in cells):
            rows.append((number, _trim(cells)))
    return Grid(path.stem, rows)
