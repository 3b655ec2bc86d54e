"""Turning one raw cell into a number, text, yes/no or a choice; each returns the value or the
reason it cannot, in words a drafter understands."""

from __future__ import annotations

import datetime as _dt
import math
import re

from .cells import Cell


class CellError(ValueError):
    """One cell that cannot be read; ``what`` is the reason and ``expected`` what would do."""

    def __init__(self, what: str, expected: str):
        self.what, self.expected = what, expected
        super().__init__(f"{what}; expected {expected}")


_THOUSANDS = re.compile(r"^[-+]?\d{1,3}(,\d{3})+(\.\d*)?$")
_NUMBER = re.compile(r"^[-+]?(\d+(\.\d*)?|\.\d+)([eE][-+]?\d+)?$")
_EXCEL_ERRORS = ("#DIV/0!", "#N/A", "#NAME?", "#NULL!", "#NUM!", "#REF!", "#VALUE!", "#SPILL!", "#CALC!")


def common_checks(cell: Cell, expected: str) -> None:
    if cell.uncached:
        raise CellError("a formula with no saved value",
                        f"{expected}: open and save the workbook in Excel or LibreOffice so the result is stored, "
                        "or paste the values")
    if isinstance(cell.value, str) and cell.value.strip().upper() in _EXCEL_ERRORS:
        raise CellError(f"the formula result is the error {cell.value.strip()}", expected)


def number(cell: Cell, expected: str = "a number") -> float | None:
    """A number, or None for a blank cell. Text such as '300mm' or '7,2' is an error."""
    common_checks(cell, expected)
    v = cell.value
    if cell.blank:
        return None
    if isinstance(v, bool):
        raise CellError(f"a TRUE/FALSE value ({v})", expected)
    if isinstance(v, (int, float)):
        x = float(v)
    elif isinstance(v, (_dt.datetime, _dt.date, _dt.time)):
        raise CellError("a date (the spreadsheet turned the entry into a date)", expected)
    else:
        s = str(v).strip().replace("\u2212", "-")
        if _THOUSANDS.match(s):
            s = s.replace(",", "")
        if not _NUMBER.match(s):
            hint = ""
            if re.match(r"^[-+]?\d+(\.\d*)?\s*[^\d\s,.]", s):
                hint = " (the unit belongs in the column header, not the cell)"
            elif re.match(r"^[-+]?\d+,\d+$", s):
                hint = " (write the decimal point as '.')"
            raise CellError(f"text, not a number{hint}", expected)
        x = float(s)
    if not math.isfinite(x):
        raise CellError("not a finite number", expected)
    return x


def integer(cell: Cell, expected: str = "a whole number") -> int | None:
    x = number(cell, expected)
    if x is None:
        return None
    if abs(x - round(x)) > 1e-9:
        raise CellError("not a whole number", expected)
    return int(round(x))


def text(cell: Cell, expected: str = "text") -> str | None:
    common_checks(cell, expected)
    if cell.blank:
        return None
    v = cell.value
    if isinstance(v, float) and v.is_integer():
        return str(int(v))
    if isinstance(v, (_dt.datetime, _dt.date)):
        raise CellError("a date (the spreadsheet turned the entry into a date; format the column as Text)",
                        expected)
    return str(v).strip()


_YES = {"yes", "y", "true", "1", "x", "✓", "ja", "oui"}
_NO = {"no", "n", "false", "0", "-", "none"}


def yes_no(cell: Cell, expected: str = "yes or no") -> bool | None:
    common_checks(cell, expected)
    if cell.blank:
        return None
    v = cell.value
    if isinstance(v, bool):
        return v
    s = str(int(v) if isinstance(v, float) and v.is_integer() else v).strip().lower()
    if s in _YES:
        return True
    if s in _NO:
        return False
    raise CellError("not yes or no", expected)


def choice(cell: Cell, options: dict[str, str], expected: str) -> str | None:
    """Map the cell text (case, spaces and punctuation free) through ``options``."""
    s = text(cell, expected)
    if s is None:
        return None
    key = re.sub(r"[\s._\-]+", " ", s.lower()).strip()
    if key in options:
        return options[key]
    raise CellError("not one of the values understood", expected)
