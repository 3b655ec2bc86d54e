"""Reading beam schedules: .xlsx / .xlsm (formula cells as their saved values) and .csv.

(The implementation behind :func:`beamsched.schedule.read_schedule`.)

:func:`read_schedule` finds the header (the first row within the first 30 holding a ``Mark``
cell), matches the column labels and their units, reads the optional ``Parameters`` sheet, and
turns each row into a :class:`~beamsched.model.BeamInput` or a
:class:`~beamsched.model.RowFailure`. A file that cannot be read at all raises
:class:`ScheduleError`; anything wrong inside it is a :class:`~beamsched.model.Problem`.
"""

from __future__ import annotations

import datetime as _dt
import hashlib
from pathlib import Path

from ..codes import DEFAULT_CODE, get_code
from ..collector import gc_paused
from ..model import BeamInput, Problem, RowFailure, Schedule
from .cells import Grid, ScheduleError, read_csv, read_workbook
from .columns import BY_KEY, COLUMNS, join_subheader, norm
from .parameters import PARAMETERS_SHEET_NAMES, Defaults, read_parameters
from .rows import (
    DEFAULT_AGG,
    DEFAULT_COVER,
    DEFAULT_EXPOSURE,
    SpanPosition,
    add_problem,
    convert_row,
    identical,
    read_header,
)

WORKBOOK_SUFFIXES = (".xlsx", ".xlsm")
CSV_SUFFIXES = (".csv", ".txt")

__all__ = ["read_schedule", "ScheduleError", "COLUMNS", "BeamInput", "RowFailure"]


def _pick_sheet(grids: list[Grid], sheet: str | None, name: str) -> tuple[Grid, int]:
    names = [g.name for g in grids]
    if sheet is not None:
        chosen = [g for g in grids if g.name == sheet] or [g for g in grids if norm(g.name) == norm(sheet)]
        if not chosen:
            raise ScheduleError(f"{name}: no sheet named '{sheet}'; the sheets are {', '.join(map(repr, names))}")
        g = chosen[0]
        i = g.header_index()
        if i is None:
            raise ScheduleError(f"{name}, sheet '{g.name}': no header row with a 'Mark' cell in the first 30 rows "
                                f"(the first row reads {g.first_texts()})")
        return g, i
    seen = []
    for g in grids:
        if norm(g.name) in PARAMETERS_SHEET_NAMES:
            continue
        i = g.header_index()
        if i is not None:
            return g, i
        seen.append(f"'{g.name}': {g.first_texts() or 'empty'}")
    raise ScheduleError(f"{name}: no sheet has a header row with a 'Mark' cell in its first 30 rows; "
                        f"sheets seen: {'; '.join(seen) or 'none'}")


def _defaults_words(d: Defaults) -> dict[str, str]:
    """The defaults in force, in words, for the results' front page."""
    out: dict[str, str] = {}
    labels = {"fc": "f'c", "fy": "fy", "fyt": "fyt", "cover": "Cover", "cover_top": "Cover top",
              "cover_bottom": "Cover bottom", "agg": "Max aggregate", "exposure": "Exposure",
              "density": "Concrete density", "precast": "Precast (certified plant)", "epoxy": "Epoxy-coated bars",
              "layer_clear": "Clear distance between layers"}
    for key, label in labels.items():
        if key in d.words:
            out[label] = f"{d.words[key]} (Parameters sheet)"
    out.setdefault("Max aggregate", f"{DEFAULT_AGG:g} mm (assumed: not stated)")
    out.setdefault("Exposure", f"{DEFAULT_EXPOSURE} (assumed: not stated)")
    if not any(k in out for k in ("Cover", "Cover top", "Cover bottom")):
        out["Cover"] = f"{DEFAULT_COVER:g} mm to the stirrups (assumed: not stated)"
    out.setdefault("Concrete density", "normal, λ = 1.0 (assumed: not stated)")
    out.setdefault("Clear distance between layers", "the clear-spacing rule for bars (1.4 db, 1.4 agg, 30 mm)")
    out.setdefault("fyt", "fy of the row (not stated)")
    if d.system:
        out["Unit system"] = f"{d.system} (Parameters sheet: for headers with no unit)"
    return out


def read_schedule(path: str | Path, sheet: str | None = None) -> Schedule:
    """Read a beam schedule (.xlsx, .xlsm or .csv) into a :class:`~beamsched.model.Schedule`.

    ``sheet`` names the schedule sheet; without it, the first sheet with a ``Mark`` header is
    used. The file is only read, never written.
    """
    with gc_paused():  # see gc_paused: millions of live objects and no cycles
        return _read_schedule(Path(path), sheet)


def _read_schedule(p: Path, sheet: str | None) -> Schedule:
    if not p.exists():
        raise ScheduleError(f"{p}: no such file")
    if p.is_dir():
        raise ScheduleError(f"{p} is a folder, not a schedule file")
    suffix = p.suffix.lower()
    try:
        head, sha = _fingerprint(p)
    except OSError as exc:
        raise ScheduleError(f"{p}: cannot be read ({exc.strerror or exc})") from exc
    modified = _dt.datetime.fromtimestamp(p.stat().st_mtime, tz=_dt.timezone.utc).isoformat(timespec="seconds")
    is_csv = suffix in CSV_SUFFIXES
    if suffix == ".xls":
        raise ScheduleError(f"{p.name}: the old .xls format is not read; save it as .xlsx, or export as .csv")
    if not is_csv and suffix not in WORKBOOK_SUFFIXES and not head.startswith(b"PK"):
        raise ScheduleError(f"{p.name}: not a schedule file beamsched reads (expected .xlsx, .xlsm or .csv)")
    grids = [read_csv(p)] if is_csv else read_workbook(p)
    grid, header_at = _pick_sheet(grids, None if is_csv else sheet, p.name)
    notes: list[Problem] = []
    if is_csv and sheet is not None:
        notes.append(Problem(f"a CSV file holds one table: the sheet '{sheet}' asked for does not apply", None, sheet,
                             None, "warning"))
    if not is_csv and sheet is None:
        others = [g.name for g in grids if g is not grid and norm(g.name) not in PARAMETERS_SHEET_NAMES
                  and g.header_index() is not None]
        if others:
            notes.append(Problem(f"sheet '{grid.name}' is read; {', '.join(map(repr, others))} also "
                                 f"{'holds' if len(others) == 1 else 'hold'} a schedule: check "
                                 f"{'it' if len(others) == 1 else 'each'} with --sheet", None, others, None,
                                 "warning"))
    params_grid = None if is_csv else next((g for g in grids if norm(g.name) in PARAMETERS_SHEET_NAMES
                                            and g is not grid), None)
    defaults = read_parameters(params_grid)
    try:
        code = get_code(defaults.code or DEFAULT_CODE)
    except KeyError as exc:
        raise ScheduleError(f"{p.name}: the Parameters sheet asks for design code '{defaults.code}', which beamsched "
                            f"does not check ({exc.args[0].split(': ', 1)[-1]})") from exc

    header_row, header_cells = grid.rows[header_at]
    body_at = header_at + 1
    if body_at < len(grid.rows) and grid.rows[body_at][0] == header_row + 1:
        joined = join_subheader(header_cells, grid.rows[body_at][1])
        if joined is not None:
            header_cells, body_at = joined, body_at + 1
    hdr = read_header(header_cells, header_row, defaults, csv=is_csv)
    problems: list[Problem] = notes + list(defaults.problems) + hdr.problems
    hidden = sorted(n for n, _ in grid.rows[body_at:] if n in grid.hidden_rows)
    if hidden:
        shown = ", ".join(map(str, hidden[:20])) + (" …" if len(hidden) > 20 else "")
        one = len(hidden) == 1
        problems.append(Problem(f"{'row' if one else 'rows'} {shown} {'is' if one else 'are'} hidden in the workbook; "
                                f"{'it is' if one else 'they are'} read and checked like the others (delete rows "
                                "that are not part of the schedule)", None, hidden, hidden[0], "warning"))
    for key, words in (("bw", "the web width bw"), ("h", "the overall depth h")):
        if key not in hdr.index:
            problems.append(Problem(f"the schedule has no '{BY_KEY[key].header()}' column: {words} of every "
                                    "span is needed", BY_KEY[key].header(), None, header_row))
    for key in ("fc", "fy"):
        if key not in hdr.index and key not in defaults.values:
            problems.append(Problem(f"the schedule has no '{BY_KEY[key].header()}' column and the Parameters "
                                    f"sheet gives no {BY_KEY[key].label}: every span needs one",
                                    BY_KEY[key].header(), None, header_row))

    body = grid.rows[body_at:]
    sheet_name = grid.name
    del grids, grid, params_grid, header_cells  # the rows are all that is still needed of the file
    # Span positions within each beam, for the Support shorthand; mark and span of each row for
    # the duplicates.
    spans_of: dict[str, list[int]] = {}
    mark_i, span_i = hdr.index["mark"], hdr.index.get("span_no")
    keys: list[tuple[str | None, int | None]] = []
    for _, cells in body:
        m, s = _peek(cells, mark_i), _peek_int(cells, span_i)
        keys.append((m, s))
        if m is not None and s is not None:
            spans_of.setdefault(m, []).append(s)
    groups = _groups(keys)
    repeated = {i for members in groups.values() if len(members) > 1 for i in members}
    positions: dict[str, tuple[int, int, bool]] = {m: (min(k), max(k), len(set(k)) > 1) for m, k in spans_of.items()}
    rows: list[BeamInput | RowFailure] = []
    for i, (number, cells) in enumerate(body):
        m, s = keys[i]
        lo, hi, multi = positions.get(m or "", (None, None, False))
        pos = SpanPosition(first=lo is not None and s == lo, last=hi is not None and s == hi, multi=multi)
        rows.append(convert_row(number, cells, hdr, defaults, code, pos))
        if i not in repeated:
            body[i] = None  # type: ignore[call-overload] # its cells are not compared again: free them
    del keys, positions
    rows = _duplicates(rows, body, hdr, groups)
    rows = _continuity(rows, hdr)
    return Schedule(
        path=str(p), sheet=sheet_name, header_row=None if is_csv else header_row, rows=tuple(rows),
        problems=tuple(problems), project=dict(defaults.project), code=code.id,
        units_assumed=tuple(hdr.units_assumed), columns=dict(hdr.labels), defaults=_defaults_words(defaults),
        file_sha256=sha, file_modified=modified,
    )


def _fingerprint(p: Path) -> tuple[bytes, str]:
    """The file's first bytes and its SHA-256, read a megabyte at a time (never held whole)."""
    h = hashlib.sha256()
    with p.open("rb") as f:
        head = f.read(8)
        h.update(head)
        for chunk in iter(lambda: f.read(1 << 20), b""):
            h.update(chunk)
    return head, h.hexdigest()


def _peek(cells, i: int | None) -> str | None:
    if i is None or i >= len(cells) or cells[i].blank or cells[i].value is None:
        return None
    v = cells[i].value
    return (str(int(v)) if isinstance(v, float) and v.is_integer() else str(v)).strip().upper()


def _peek_int(cells, i: int | None) -> int | None:
    s = _peek(cells, i)
    try:
        return int(float(s)) if s is not None else None
    except (ValueError, OverflowError):  # not a number, or 'INF' (float reads it, int cannot)
        return None


def _continuity(rows: list[BeamInput | RowFailure], hdr) -> list[BeamInput | RowFailure]:
    """Spans of one beam that disagree at a shared support (warnings: the drafter should look):
    one span continuous there and the next not, different top bars over the support (the same
    bars cross it), or a gap in the span numbers."""
    out = list(rows)
    by_mark: dict[str, list[int]] = {}
    for i, r in enumerate(rows):
        if r.span_no is not None and r.mark:
            by_mark.setdefault(r.mark.strip().upper(), []).append(i)
    for members in by_mark.values():
        spans = sorted((rows[i].span_no, i) for i in members)
        numbers = [n for n, _ in spans]
        if len(set(numbers)) != len(numbers):
            continue  # duplicates are reported already
        missing = sorted(set(range(numbers[0], numbers[-1] + 1)) - set(numbers))
        if missing:
            i = spans[0][1]
            out[i] = add_problem(out[i], Problem(
                f"row {rows[i].row}, '{hdr.label('span_no')}': beam {rows[i].mark} has spans "
                f"{', '.join(map(str, numbers))}, with no span {', '.join(map(str, missing))}: check for a missing row",
                hdr.label("span_no"), numbers, rows[i].row, "warning"))
        for (n1, i), (n2, j) in zip(spans, spans[1:], strict=False):
            a, b = rows[i], rows[j]
            if n2 != n1 + 1 or not isinstance(a, BeamInput) or not isinstance(b, BeamInput):
                continue
            where = f"the support between span {n1} (row {a.row}) and span {n2} (row {b.row})"
            if (a.right_end == "continuous") != (b.left_end == "continuous"):
                msg = (f"row {b.row}: beam {b.mark} is read as {a.right_end} at the right of span {n1} but "
                       f"{b.left_end} at the left of span {n2}, at {where}: expected the same support condition")
                out[j] = add_problem(out[j], Problem(msg, hdr.label("left_end") if "left_end" in hdr.index
                                                     else hdr.label("support"), b.left_end, b.row, "warning"))
            if a.top_bars_right is not None and b.top_bars_left is not None and \
                    a.top_bars_right is not b.top_bars_left and str(a.top_bars_right) != str(b.top_bars_left):
                msg = (f"row {b.row}: top bars R of span {n1} ({a.top_bars_right}) and top bars L of span {n2} "
                       f"({b.top_bars_left}) differ at {where}: the same bars normally cross the support; each span "
                       "is checked with its own")
                label = hdr.label("top_bars_l") if "top_bars_l" in hdr.index else hdr.label("top_bars")
                out[j] = add_problem(out[j], Problem(msg, label, str(b.top_bars_left), b.row, "warning"))
    return out


def _groups(keys: list[tuple[str | None, int | None]]) -> dict[tuple[str, int | None], list[int]]:
    """The rows (indices) of each mark and span number; rows without a mark are in none."""
    groups: dict[tuple[str, int | None], list[int]] = {}
    for i, (m, s) in enumerate(keys):
        if m is not None:
            groups.setdefault((m, s), []).append(i)
    return groups


def _duplicates(rows: list[BeamInput | RowFailure], body, hdr,
                groups: dict[tuple[str, int | None], list[int]]) -> list[BeamInput | RowFailure]:
    """Same mark and span twice: identical rows are a warning on each; different rows are an
    error on both (a drafting error that would reach site). ``groups`` holds the rows of each
    mark and span (:func:`_groups`); ``body`` keeps the cells of every row in a group of two
    or more."""
    out = list(rows)
    for (_mark, span_no), members in groups.items():
        if len(members) < 2:
            continue
        what = f"mark {rows[members[0]].mark}" + ("" if span_no is None else f" span {span_no}")
        for i in members:
            others = [j for j in members if j != i]
            numbers = ", ".join(str(body[j][0]) for j in others)
            same = [identical(body[i][1], body[j][1], hdr) for j in others]
            if all(s for s, _ in same):
                p = Problem(f"row {body[i][0]}, '{hdr.label('mark')}' = '{rows[i].mark}': {what} is scheduled again, "
                            f"identically, on row {numbers}; each copy "
                            "is checked: delete the repeat, or use Qty for identical beams",
                            hdr.label("mark"), rows[i].mark, body[i][0], "warning")
            else:
                differ = sorted({label for s, d in same for label in d})
                hint = "" if "span_no" in hdr.index else "; if they are spans of one beam, number them in 'Span no.'"
                p = Problem(f"row {body[i][0]}, '{hdr.label('mark')}' = '{rows[i].mark}': {what} is scheduled again "
                            f"on row {numbers} with different contents "
                            f"({', '.join(differ)}): expected one row per mark and span{hint}",
                            hdr.label("mark"), rows[i].mark, body[i][0])
            out[i] = add_problem(out[i], p)
    return out
