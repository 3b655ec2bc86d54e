"""The typed contracts between the parts of beamsched.

Inside beamsched every quantity is SI in the engine's units: lengths in mm, stresses in MPa,
forces in N and moments in N·mm. Units are converted at the edges (the schedule reader on the
way in; results carry display units, kN and kN·m, in their field names or ``unit`` fields).

* :class:`BeamInput` is one span of one beam, as the schedule reader (or the Python API) hands
  it to the checks.
* :class:`CheckResult` is one check at one location; :class:`BeamResult` gathers them with the
  values, the calculation trace, and the problems and defaults that belong to the row.
"""

from __future__ import annotations

from array import array
from collections import OrderedDict
from collections.abc import Iterator, Sequence
from dataclasses import dataclass, field
from enum import Enum
from itertools import chain
from typing import Literal

from .bars import BarArrangement, Stirrups

Shape = Literal["rect", "T", "L"]
EndCondition = Literal["simple", "continuous", "free"]
Location = Literal["left", "mid", "right"] | None
Exposure = Literal["interior", "exterior"]


class CheckStatus(str, Enum):
    PASS = "pass"
    FAIL = "fail"
    NOT_CHECKED = "not_checked"


class BeamStatus(str, Enum):
    PASS = "pass"
    FAIL = "fail"
    INCOMPLETE = "incomplete"
    ERROR = "error"


@dataclass(frozen=True, slots=True)
class Problem:
    """Something wrong with the input: where it is, what was found and what was expected."""

    message: str
    column: str | None = None
    value: object = None
    row: int | None = None
    severity: Literal["error", "warning"] = "error"


@dataclass(frozen=True, slots=True)
class BeamInput:
    """One span of one beam, in engine units (mm, MPa, N, N·mm).

    Bars:
      ``bottom_bars``          bottom bars at midspan (tension under sagging, Mf+)
      ``top_bars_left/right``  top bars at each support (tension under hogging, Mf-)
      ``top_bars_mid``         top bars at midspan (compression steel under Mf+), optional
      ``bottom_bars_support``  bottom bars at the supports (tension under Mf+ at a support,
                               compression steel under Mf-), optional
    Demands are factored; ``None`` means "not scheduled", never zero. ``Mf_neg_*`` are
    magnitudes of hogging moments.
    """

    mark: str
    shape: Shape
    bw: float
    h: float
    fc: float
    fy: float
    span_no: int | None = None
    row: int | None = None
    qty: int = 1
    hf: float | None = None
    bf: float | None = None
    clear_to_next_web: float | None = None
    span: float | None = None  # centre-to-centre span (mm)
    clear_span: float | None = None  # clear span ln (mm)
    left_end: EndCondition = "simple"
    right_end: EndCondition = "simple"
    cover_top: float = 40.0  # clear cover to the stirrups (mm)
    cover_bottom: float = 40.0
    bottom_bars: BarArrangement | None = None
    top_bars_left: BarArrangement | None = None
    top_bars_right: BarArrangement | None = None
    top_bars_mid: BarArrangement | None = None
    bottom_bars_support: BarArrangement | None = None
    stirrups: Stirrups | None = None
    d_bottom: float | None = None  # explicit d of the bottom bars, from the top face (mm)
    d_top: float | None = None  # explicit d of the top bars, from the bottom face (mm)
    fyt: float | None = None  # stirrup yield strength; None: same as fy
    agg: float = 20.0  # maximum aggregate size (mm)
    lam: float = 1.0  # concrete density factor lambda (8.6.5)
    density: str = "normal"
    exposure: Exposure = "exterior"
    precast: bool = False  # made in a plant certified to CSA A23.4
    sfrs: bool | None = None  # member of the seismic force-resisting system
    layer_clear: float | None = None  # clear distance between bar layers (mm); None: code rule
    Mf_pos: float | None = None  # factored sagging moment at midspan (N·mm)
    Mf_neg_left: float | None = None  # factored hogging moment magnitude at each support
    Mf_neg_right: float | None = None
    Mf_pos_left: float | None = None  # factored sagging moment at each support (reversal)
    Mf_pos_right: float | None = None
    Vf_left: float | None = None  # factored shear at each end (N)
    Vf_right: float | None = None
    Tf: float | None = None  # factored torsion (N·mm)
    Pf: float | None = None  # factored axial load, compression positive (N)
    Ms_pos: float | None = None  # service moments for crack control (N·mm), optional
    Ms_neg: float | None = None
    skin_bars: BarArrangement | None = None  # skin reinforcement on each side face (10.6.2)
    epoxy: bool = False  # epoxy-coated bars
    notes: str = ""
    assumed: tuple[str, ...] = ()  # what this span took from defaults, in words
    warnings: tuple[Problem, ...] = ()  # reader warnings that did not stop the check
    source: dict[str, str] = field(default_factory=dict, compare=False)  # scheduled text

    @property
    def label(self) -> str:
        return self.mark if self.span_no is None else f"{self.mark} span {self.span_no}"

    @property
    def fyt_eff(self) -> float:
        return self.fy if self.fyt is None else self.fyt

    def top_bars_at(self, end: Literal["left", "right"]) -> BarArrangement | None:
        return self.top_bars_left if end == "left" else self.top_bars_right

    def end_condition(self, end: Literal["left", "right"]) -> EndCondition:
        return self.left_end if end == "left" else self.right_end


@dataclass(frozen=True, slots=True)
class TraceLine:
    """One line of working: what, its symbol, value and unit, and the clause it comes from."""

    check: str  # the check id (or "section", "materials") this line belongs to
    location: Location
    symbol: str
    value: float | str | None
    unit: str
    clause: str
    description: str


@dataclass(frozen=True, slots=True)
class CheckResult:
    """One check at one location, in display units (kN, kN·m, mm, mm², N/mm)."""

    id: str  # stable machine id: flexure_pos, flexure_neg, shear, cd_limit_pos, ...
    label: str  # short display label
    location: Location
    clause: str
    status: CheckStatus
    message: str  # plain note for a drafter; always set for fail and not_checked
    demand: float | None = None
    capacity: float | None = None
    unit: str = ""
    utilisation: float | None = None
    required: bool = True  # a check the standard requires for a span to pass

    @property
    def key(self) -> str:
        return self.id if self.location is None else f"{self.id}@{self.location}"


class RecentlyRead:
    """The values last worked out for things read a few times in a row (a writer reads one
    span's trace, checks or row several times, then moves on): at most ``keep`` are held.
    A value keyed by an object's id is put with that ``owner``: the entry then holds the
    object, so its id cannot be reused while the entry lives."""

    def __init__(self, keep: int):
        self.keep = keep
        self._held: OrderedDict[object, tuple[object, object]] = OrderedDict()

    def get(self, key: object):
        hit = self._held.get(key)
        if hit is None:
            return None
        self._held.move_to_end(key)
        return hit[1]

    def put(self, key: object, value, owner: object = None):
        self._held[key] = (owner, value)
        if len(self._held) > self.keep:
            self._held.popitem(last=False)
        return value


class WorkedOutTuple(Sequence):
    """A read-only sequence whose items are a tuple worked out when first read (:meth:`items`):
    indexing, slicing, iteration, ``len``, equality with any sequence and ``+`` behave as on
    the tuple itself."""

    __slots__ = ()

    def items(self) -> tuple:
        raise NotImplementedError

    def __len__(self) -> int:
        return len(self.items())

    def __getitem__(self, i):
        return self.items()[i]

    def __iter__(self) -> Iterator:
        return iter(self.items())

    def __eq__(self, other: object) -> bool:
        if isinstance(other, Sequence) and not isinstance(other, (str, bytes)):
            return self.items() == tuple(other)
        return NotImplemented

    def __add__(self, other: object) -> tuple:
        return self.items() + tuple(other)  # type: ignore[arg-type]

    def __radd__(self, other: object) -> tuple:
        return tuple(other) + self.items()  # type: ignore[arg-type]

    __hash__ = None  # type: ignore[assignment]


_STATUS_CODES = {CheckStatus.PASS: 0, CheckStatus.FAIL: 1, CheckStatus.NOT_CHECKED: 2}
_STATUSES = tuple(_STATUS_CODES)
_FAIL_CODE = _STATUS_CODES[CheckStatus.FAIL]
_NOT_CHECKED_AS_ONE = bytes(int(code == _STATUS_CODES[CheckStatus.NOT_CHECKED]) for code in range(256))


class PackedChecks(WorkedOutTuple):
    """One span's check results, held compactly: a read-only sequence of :class:`CheckResult`.

    A building's results are millions of checks; as objects each costs a few hundred bytes
    (the result and its floats). Here a span keeps its numbers in one array, its statuses in
    one bytes object and its texts as shared strings; what does not vary between spans (id,
    label, location, clause, unit, required) is one shared tuple for every span with the same
    list of checks. Reading it gives back results equal to the ones packed, field for field
    and type for type (an int stays an int). The last few spans read are kept unpacked, as a
    writer reads one span's checks several times in a row.
    """

    __slots__ = ("_kinds", "_required", "_status", "_messages", "_numbers", "_absent", "_ints")
    # each list of kinds as first seen, with its required checks as bits (bit 8i: check i)
    _kind_lists: dict[tuple, tuple[tuple, int]] = {}
    KEEP = 64
    _recent = RecentlyRead(KEEP)

    def __init__(self, checks: Sequence[CheckResult]):
        self._pack([(c.id, c.label, c.location, c.clause, c.status, c.message, c.demand, c.capacity, c.unit,
                     c.utilisation, c.required) for c in checks])

    @classmethod
    def of_rows(cls, rows: Sequence[tuple]) -> PackedChecks:
        """The results given as rows, each the fields of a :class:`CheckResult` in order."""
        packed = cls.__new__(cls)
        packed._pack(rows)
        return packed

    def _pack(self, rows: Sequence[tuple]) -> None:
        if not rows:
            ids = labels = locations = clauses = statuses = messages = demands = capacities = units = \
                utilisations = required = ()
        else:
            (ids, labels, locations, clauses, statuses, messages, demands, capacities, units, utilisations,
             required) = zip(*rows, strict=True)
        kinds = tuple(zip(ids, labels, locations, clauses, units, required, strict=True))
        shared = PackedChecks._kind_lists.get(kinds)
        if shared is None:
            shared = PackedChecks._kind_lists[kinds] = (kinds, int.from_bytes(bytes(map(bool, required)), "little"))
        self._kinds, self._required = shared
        self._status = bytes(map(_STATUS_CODES.__getitem__, statuses))
        self._messages = messages
        values = list(chain.from_iterable(zip(demands, capacities, utilisations, strict=True)))
        absent = ints = 0
        for k, v in enumerate(values):  # bit k of each mask: value k is None / an int
            if type(v) is not float:
                if v is None:
                    absent |= 1 << k
                    values[k] = 0.0
                elif type(v) is int:
                    ints |= 1 << k
        self._numbers, self._absent, self._ints = array("d", values), absent, ints

    def status(self) -> BeamStatus:
        """:func:`beam_status` of the results, read from the packed statuses."""
        if _FAIL_CODE in self._status:
            return BeamStatus.FAIL
        not_made = int.from_bytes(self._status.translate(_NOT_CHECKED_AS_ONE), "little")
        if not_made & self._required or not self._status:
            return BeamStatus.INCOMPLETE
        return BeamStatus.PASS

    def _value(self, k: int) -> float | int | None:
        bit = 1 << k
        if self._absent & bit:
            return None
        v = self._numbers[k]
        return int(v) if self._ints & bit else v

    def unpacked(self) -> tuple[CheckResult, ...]:
        """The results, as packed."""
        held = PackedChecks._recent.get(id(self))
        if held is not None:
            return held
        value = self._value
        return PackedChecks._recent.put(id(self), tuple(
            CheckResult(cid, label, loc, clause, _STATUSES[status], message, value(3 * i), value(3 * i + 1), unit,
                        value(3 * i + 2), required)
            for i, ((cid, label, loc, clause, unit, required), status, message)
            in enumerate(zip(self._kinds, self._status, self._messages, strict=True))
        ), self)

    items = unpacked

    def __repr__(self) -> str:
        return f"PackedChecks({list(self.unpacked())!r})"


@dataclass(frozen=True, slots=True)
class BeamResult:
    """Everything known about one span after checking: the report writers read only this."""

    mark: str
    span_no: int | None
    row: int | None
    status: BeamStatus
    checks: tuple[CheckResult, ...] | PackedChecks = ()
    values: dict[str, float | str | None] = field(default_factory=dict)
    trace: tuple[TraceLine, ...] = ()
    problems: tuple[Problem, ...] = ()
    assumed: tuple[str, ...] = ()
    understood: dict[str, str] = field(default_factory=dict)  # what the tool read, in words
    input: BeamInput | None = None

    @property
    def label(self) -> str:
        return self.mark if self.span_no is None else f"{self.mark} span {self.span_no}"

    @property
    def utilisation(self) -> float | None:
        """The largest utilisation of any check made (None when none was made)."""
        values = [c.utilisation for c in self.checks if c.utilisation is not None]
        return max(values) if values else None

    @property
    def governing(self) -> CheckResult | None:
        """The check with the largest utilisation."""
        made = [c for c in self.checks if c.utilisation is not None]
        return max(made, key=lambda c: c.utilisation) if made else None

    @property
    def not_checked(self) -> tuple[CheckResult, ...]:
        return tuple(c for c in self.checks if c.status is CheckStatus.NOT_CHECKED)


def beam_status(checks: Sequence[CheckResult]) -> BeamStatus:
    """A span passes only when every required check was made and passed (issue contract)."""
    if any(c.status is CheckStatus.FAIL for c in checks):
        return BeamStatus.FAIL
    if any(c.status is CheckStatus.NOT_CHECKED and c.required for c in checks):
        return BeamStatus.INCOMPLETE
    if not checks:
        return BeamStatus.INCOMPLETE
    return BeamStatus.PASS


@dataclass(frozen=True, slots=True)
class RowFailure:
    """A schedule row that could not be turned into a :class:`BeamInput`."""

    mark: str
    span_no: int | None
    row: int | None
    problems: tuple[Problem, ...]


@dataclass(frozen=True, slots=True)
class Schedule:
    """A whole schedule as read: every row in schedule order, and what the reader saw."""

    path: str
    sheet: str
    header_row: int | None  # 1-based spreadsheet row of the header (None for CSV line 1)
    rows: tuple[BeamInput | RowFailure, ...]
    problems: tuple[Problem, ...] = ()  # file-level problems (not tied to one row)
    project: dict[str, str] = field(default_factory=dict)  # title block from Parameters
    code: str = "CSA A23.3-19"
    units_assumed: tuple[str, ...] = ()
    columns: dict[str, str] = field(default_factory=dict)  # field -> header label seen
    defaults: dict[str, str] = field(default_factory=dict)  # defaults in force, in words
    file_sha256: str = ""
    file_modified: str = ""  # ISO date-time of the input file

    @property
    def spans(self) -> tuple[BeamInput, ...]:
        return tuple(r for r in self.rows if isinstance(r, BeamInput))

    @property
    def failures(self) -> tuple[RowFailure, ...]:
        return tuple(r for r in self.rows if isinstance(r, RowFailure))
