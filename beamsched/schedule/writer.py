"""Write a schedule workbook or CSV from plain rows (used by the samples, the generator and the
tests). Files are written whole or not at all: to a temporary file, then moved into place."""

from __future__ import annotations

import csv
import os
import tempfile
from collections.abc import Iterable, Sequence
from pathlib import Path


def _atomic(path: Path, write) -> None:
    path.parent.mkdir(parents=True, exist_ok=True)
    fd, tmp = tempfile.mkstemp(prefix=f".{path.stem}-", suffix=path.suffix, dir=path.parent)
    os.close(fd)
    try:
        write(Path(tmp))
        umask = os.umask(0)
        os.umask(umask)
        os.chmod(tmp, 0o666 & ~umask)  # mkstemp makes the file private; give it the usual mode
        os.replace(tmp, path)
    except BaseException:
        if os.path.exists(tmp):
            os.unlink(tmp)
        raise


def write_schedule(
    path: str | Path,
    header: Sequence[str],
    rows: Iterable[Sequence[object]],
    *,
    parameters: Sequence[Sequence[object]] | None = None,
    title: Sequence[Sequence[object]] = (),
    sheet: str = "Schedule",
) -> Path:
    """Write ``header`` and ``rows`` to an .xlsx (with optional title rows above the header and
    a Parameters sheet of name / value / unit rows) or to a .csv (header and rows only)."""
    p = Path(path)
    rows = [list(r) for r in rows]
    if p.suffix.lower() == ".csv":
        def write_csv(tmp: Path) -> None:
            with tmp.open("w", newline="", encoding="utf-8") as fh:
                w = csv.writer(fh)
                for t in title:
                    w.writerow(list(t))
                w.writerow(list(header))
                for r in rows:
                    w.writerow(["" if v is None else v for v in r])
        _atomic(p, write_csv)
        return p

    import openpyxl
    from openpyxl.styles import Font

    def write_xlsx(tmp: Path) -> None:
        wb = openpyxl.Workbook()
        ws = wb.active
        ws.title = sheet
        for t in title:
            ws.append(list(t))
        ws.append(list(header))
        header_row = ws.max_row
        for cell in ws[header_row]:
            cell.font = Font(bold=True)
        for r in rows:
            ws.append(list(r))
        from openpyxl.utils import get_column_letter

        for i, label in enumerate(header, start=1):
            longest = max([len(str(label))] + [len(str(r[i - 1])) for r in rows[:200] if i - 1 < len(r) and
                                               r[i - 1] is not None])
            ws.column_dimensions[get_column_letter(i)].width = min(max(8, longest + 2), 40)
        ws.freeze_panes = ws.cell(row=header_row + 1, column=2)
        if parameters is not None:
            ps = wb.create_sheet("Parameters")
            ps.append(["Name", "Value", "Unit"])
            for r in parameters:
                ps.append(list(r))
        wb.save(tmp)
    _atomic(p, write_xlsx)
    return p
