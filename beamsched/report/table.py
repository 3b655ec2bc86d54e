"""What every writer shows of a result, gathered once from the :class:`BeamResult` objects.

No engineering happens here: numbers come from the results as they are. This module only
decides which columns exist (from the check ids and value names found in the results, so a new
check or a new capacity appears in every writer without a change), their headers and units,
and the plain notes.
"""

from __future__ import annotations

import itertools
import math
import re
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field
from datetime import datetime, timezone
from typing import overload

from ..model import BeamResult, BeamStatus, CheckResult, CheckStatus, Problem, RecentlyRead, Schedule

LOCATION_WORDS = {"left": "left", "mid": "mid", "right": "right", None: ""}

_UNIT_TOKENS = {"kNm": "kN·m", "kN": "kN", "mm": "mm", "mm2": "mm²", "MPa": "MPa", "m": "m",
                "Nmm": "N/mm", "pct": "%", "deg": "°"}
_NAME_TOKENS = {"pos": "+", "neg": "−", "left": " L", "right": " R", "mid": " mid"}
_SYMBOL_ORDER = ("Mr", "Vr")  # capacities first, in this order; anything else after


def value_unit(key: str) -> str:
    """The unit named at the end of a value key (``Mr_pos_kNm`` -> ``kN·m``), or ``""``."""
    last = key.rsplit("_", 1)[-1]
    return _UNIT_TOKENS.get(last, "") if "_" in key else ""


def value_header(key: str) -> str:
    """A display header for a value key: ``Mr_neg_left_kNm`` -> ``Mr− L (kN·m)``."""
    parts = key.split("_")
    unit = ""
    if len(parts) > 1 and parts[-1] in _UNIT_TOKENS:
        unit = _UNIT_TOKENS[parts.pop()]
    text = parts[0]
    for p in parts[1:]:
        text += _NAME_TOKENS.get(p, " " + p)
    return f"{text} ({unit})" if unit else text


def _is_aggregate(key: str, keys: set[str]) -> bool:
    """``Mr_neg_kNm`` is the smaller of ``Mr_neg_left_kNm`` / ``Mr_neg_right_kNm``: the table shows
    the two ends, so it leaves the aggregate out."""
    head, sep, unit = key.rpartition("_")
    if not sep:
        return False
    return f"{head}_left_{unit}" in keys or f"{head}_right_{unit}" in keys


def _base(key: str) -> str:
    return key.replace("_left", "").replace("_right", "")


def value_keys(results: list[BeamResult] | tuple[BeamResult, ...], *, per_end: bool = True) -> list[str]:
    """Every value name found in the results: Mr first, then Vr, then the rest, each group in
    the order first met. ``per_end`` drops the both-ends aggregates where the ends are shown."""
    seen: dict[str, int] = {}
    for r in results:
        for k in r.values:
            seen.setdefault(k, len(seen))
    keys = set(seen)
    if per_end:
        keys = {k for k in keys if not _is_aggregate(k, keys)}

    bases: dict[str, int] = {}
    for k in seen:
        bases.setdefault(_base(k), len(bases))

    def order(k: str) -> tuple[int, int, int]:
        sym = k.split("_", 1)[0]
        end = 1 if "_left" in k else 2 if "_right" in k else 0
        return (_SYMBOL_ORDER.index(sym) if sym in _SYMBOL_ORDER else len(_SYMBOL_ORDER), bases[_base(k)], end)

    return sorted(keys, key=order)


def is_capacity(key: str) -> bool:
    """A factored resistance, by the standard's naming: a symbol ending in ``r`` (Mr, Vr, Tr, Pr)."""
    return re.fullmatch(r"[A-Z][A-Za-z]*r", key.split("_", 1)[0]) is not None


@dataclass(frozen=True)
class CheckColumn:
    id: str
    label: str
    clause: str


def check_columns(results: list[BeamResult] | tuple[BeamResult, ...]) -> list[CheckColumn]:
    """One column per check id found in the results, in the order the checks ran."""
    out: dict[str, CheckColumn] = {}
    for r in results:
        for c in r.checks:
            if c.id not in out:
                out[c.id] = CheckColumn(c.id, c.label, c.clause)
    return list(out.values())


def max_utilisation(checks: list[CheckResult] | tuple[CheckResult, ...]) -> float | None:
    values = [c.utilisation for c in checks if c.utilisation is not None]
    if not values:
        return None
    if any(isinstance(v, float) and math.isnan(v) for v in values):
        return math.inf
    return max(values)


def _names_clause(message: str, clause: str) -> bool:
    return not clause or any(part.strip() in message for part in clause.split(","))


def check_note(c: CheckResult) -> str:
    """The plain note for a failed or unchecked check, always naming its clause."""
    msg = c.message.strip() or (
        f"{c.label} {LOCATION_WORDS[c.location]} {'fails' if c.status is CheckStatus.FAIL else 'was not checked'}".strip())
    if not _names_clause(msg, c.clause):
        msg = msg.rstrip(".") + f" (cl. {c.clause})."
    return msg


def problem_note(p: Problem) -> str:
    where = f"{p.column}: " if p.column and p.column not in p.message else ""
    kind = "Warning" if p.severity == "warning" else "Not read"
    return f"{kind}: {where}{p.message}"


def check_display(c: CheckResult) -> str:
    return c.label if c.location is None else f"{c.label} ({LOCATION_WORDS[c.location]})"


@dataclass(frozen=True)
class SpanRow:
    """One span as every writer shows it."""

    result: BeamResult
    index: int  # position in the schedule, 0-based
    utilisation: float | None
    governing: CheckResult | None
    by_check: dict[str, float | None]  # check id -> largest utilisation at any location
    made: dict[str, bool]  # check id -> at least one location made (False: not checked anywhere)
    state: dict[str, CheckStatus | None]  # check id -> FAIL if any location fails, else PASS if any
    # was made, else NOT_CHECKED; None where the span has no such check (it does not apply)
    notes: tuple[str, ...]
    not_made: tuple[str, ...]

    @property
    def label(self) -> str:
        return self.result.label

    @property
    def status(self) -> BeamStatus:
        return self.result.status

    @property
    def note_text(self) -> str:
        return "\n".join(self.notes)

    @property
    def first_note(self) -> str:
        return self.notes[0] if self.notes else ""


def span_row(r: BeamResult, index: int, columns: list[CheckColumn]) -> SpanRow:
    by_check: dict[str, float | None] = {}
    made: dict[str, bool] = {}
    state: dict[str, CheckStatus | None] = {}
    for col in columns:
        these = [c for c in r.checks if c.id == col.id]
        by_check[col.id] = max_utilisation(these)
        made[col.id] = any(c.status is not CheckStatus.NOT_CHECKED for c in these)
        statuses = {c.status for c in these}
        state[col.id] = next((s for s in (CheckStatus.FAIL, CheckStatus.PASS, CheckStatus.NOT_CHECKED)
                              if s in statuses), None)
    notes: list[str] = []
    if r.status is BeamStatus.ERROR:
        notes += [problem_note(p) for p in r.problems] or ["Not read: the row could not be read."]
    else:
        failed = [c for c in r.checks if c.status is CheckStatus.FAIL]
        gov = r.governing
        if gov is not None and gov in failed:  # the governing check's note first: it says why the span fails most
            failed.remove(gov)
            failed.insert(0, gov)
        notes += [check_note(c) for c in failed]
        # checks the span needed come before reminders, so the first note says why it is incomplete
        notes += [check_note(c) for c in r.checks if c.status is CheckStatus.NOT_CHECKED and c.required]
        notes += [check_note(c) for c in r.checks if c.status is CheckStatus.NOT_CHECKED and not c.required]
        if not r.checks:
            notes.append("No check could be made for this span.")
        notes += [problem_note(p) for p in r.problems]
    gov = r.governing
    u = max_utilisation(r.checks)
    return SpanRow(r, index, u, gov, by_check, made, state, tuple(notes),
                   tuple(check_display(c) for c in r.not_checked))


class SpanRows(Sequence[SpanRow]):
    """Every span as the writers show it (:class:`SpanRow`), made when read.

    Held all at once, a building's rows take hundreds of megabytes (their notes and per-check
    tables), yet each writer reads them one after another, once. So a row is made from its
    result when it is read, and the last few read are kept (a writer reads one row a few times
    in a row). Indexing, slicing, iteration and ``len`` work as on a list.
    """

    KEEP = 64

    def __init__(self, results: list[BeamResult], columns: list[CheckColumn]):
        self._results = results
        self._columns = columns
        self._recent = RecentlyRead(self.KEEP)

    def __len__(self) -> int:
        return len(self._results)

    @overload
    def __getitem__(self, i: int) -> SpanRow: ...
    @overload
    def __getitem__(self, i: slice) -> list[SpanRow]: ...
    def __getitem__(self, i):
        if isinstance(i, slice):
            return [self[j] for j in range(*i.indices(len(self)))]
        n = len(self._results)
        if i < 0:
            i += n
        if not 0 <= i < n:
            raise IndexError("span row index out of range")
        row = self._recent.get(i)
        if row is None:
            row = self._recent.put(i, span_row(self._results[i], i, self._columns))
        return row

    def __iter__(self) -> Iterator[SpanRow]:
        for i in range(len(self._results)):
            yield self[i]


WORKING_CHOICES = ("all", "flagged", "none")


@dataclass
class Report:
    """The results of one run and what is known about where they came from."""

    results: list[BeamResult]
    schedule: Schedule
    checked_at: datetime = field(default_factory=lambda: datetime.now(timezone.utc).astimezone())
    version: str = ""
    # whose calculation the Working sheet holds: every span's ("all"), only the spans that fail,
    # are incomplete or could not be checked ("flagged"), or none ("none")
    working: str = "all"

    def __post_init__(self) -> None:
        if self.working not in WORKING_CHOICES:
            raise ValueError(f"working = {self.working!r}: expected one of {', '.join(WORKING_CHOICES)}")
        if not self.version:
            from .. import __version__
            self.version = __version__
        self.columns = check_columns(self.results)
        self.value_keys = value_keys(self.results)
        self.capacity_keys = [k for k in self.value_keys if is_capacity(k)]
        # each span's largest utilisation, the one figure the rankings and the chart need of every span
        self.utilisations = [max_utilisation(r.checks) for r in self.results]
        self.rows = SpanRows(self.results, self.columns)

    def shows_working(self, row: SpanRow | BeamResult) -> bool:
        """Whether the Working sheet holds this span's calculation (see ``working``)."""
        if self.working == "all":
            return True
        result = row.result if isinstance(row, SpanRow) else row
        return self.working == "flagged" and result.status is not BeamStatus.PASS

    # -- counts and rankings ---------------------------------------------------------------
    def count(self, status: BeamStatus) -> int:
        return sum(1 for r in self.results if r.status is status)

    @property
    def counts(self) -> dict[BeamStatus, int]:
        return {s: self.count(s) for s in BeamStatus}

    def worst(self, n: int = 10) -> list[SpanRow]:
        """The n spans with the largest utilisation (infinite first), ties in schedule order."""
        rated = [i for i, u in enumerate(self.utilisations) if u is not None]
        top = sorted(rated, key=lambda i: (-_sort_value(self.utilisations[i]), i))[:n]  # type: ignore[arg-type]
        return [self.rows[i] for i in top]

    def incomplete(self, n: int = 10) -> list[SpanRow]:
        """The first n incomplete spans in schedule order (never hidden behind the utilisation ranking)."""
        found = (i for i, r in enumerate(self.results) if r.status is BeamStatus.INCOMPLETE)
        return [self.rows[i] for i in itertools.islice(found, n)]

    def all_problems(self) -> list[tuple[int | None, str, Problem]]:
        """(row, span label, problem): the file's own problems, then each row's, in order."""
        out = [(p.row, "", p) for p in self.schedule.problems]
        for r in self.results:
            for p in r.problems:
                out.append((p.row if p.row is not None else r.row, r.label, p))
        return out

    @property
    def assumed_counts(self) -> dict[str, int]:
        """Each default applied, in words, with the number of spans that relied on it."""
        out: dict[str, int] = {}
        for r in self.results:
            for a in r.assumed:
                out[a] = out.get(a, 0) + 1
        return out

    def project(self, *names: str) -> str:
        """A title-block entry from the schedule's Parameters, matched loosely by name."""
        wanted = {_norm(n) for n in names}
        for k, v in self.schedule.project.items():
            if _norm(k) in wanted:
                return str(v)
        return ""


def _norm(text: str) -> str:
    return re.sub(r"[^a-z0-9]", "", text.lower())


def _sort_value(u: float | None) -> float:
    if u is None:
        return -math.inf
    return math.inf if math.isnan(u) else u


TITLE_FIELDS: tuple[tuple[str, tuple[str, ...]], ...] = (
    ("Project", ("project", "project name", "projectname")),
    ("Project number", ("number", "project number", "project no", "project no.", "job number", "job no")),
    ("Level", ("level", "floor")),
    ("Revision", ("revision", "rev", "rev.")),
    ("Prepared by", ("prepared by", "designed by", "preparer")),
    ("Checked by", ("checked by", "checker")),
    ("Date", ("date", "issue date")),
)
