"""Header and rows: each schedule row becomes a :class:`BeamInput` or a :class:`RowFailure`.

Every problem names the row, the column as the file labels it, the value found, what is wrong
and what was expected. The engine's own :func:`beamsched.engine.validate` (and through it the
code's material limits) is run on each span, and its findings are re-labelled with the file's
column names, so no limit is written twice.
"""

from __future__ import annotations

import dataclasses
import re
from dataclasses import dataclass, field
from functools import lru_cache

from ..bars import BarArrangement, NotationError, Stirrups, parse_bars, parse_stirrups
from ..codes import DesignCode
from ..engine import FIELD_LABELS, validate
from ..model import BeamInput, Problem, RowFailure
from . import values as cv
from .cells import EMPTY, Cell
from .columns import BY_KEY, Column, match_header
from .parameters import DENSITIES, DENSITY_LAMBDA, EXPOSURES, Defaults, density_key
from .units import DIMENSION_WORDS, ENGINE_UNIT, UNIT_SYSTEMS, UnitError, unit_factor

DEFAULT_AGG = 20.0  # mm; issue 3: a 20 mm maximum aggregate, flagged as assumed
DEFAULT_COVER = 40.0  # mm to the stirrups: common practice for beams, always flagged as assumed
DEFAULT_EXPOSURE = "exterior"  # the stricter crack-control limit (cl. 10.6.1)

SHAPES = {"rect": "rect", "r": "rect", "rectangular": "rect", "rectangle": "rect", "rc": "rect",
          "t": "T", "t beam": "T", "tee": "T", "tee beam": "T",
          "l": "L", "l beam": "L", "ell": "L", "spandrel": "L", "spandrel l": "L"}
SHAPE_EXPECTED = "Rect, T or L"
ENDS = {"simple": "simple", "s": "simple", "pinned": "simple", "pin": "simple", "ss": "simple",
        "simply supported": "simple", "hinged": "simple",
        "continuous": "continuous", "cont": "continuous", "c": "continuous", "fixed": "continuous",
        "fix": "continuous", "built in": "continuous", "monolithic": "continuous",
        "free": "free", "tip": "free", "free end": "free"}
ENDS_EXPECTED = "simple, continuous or free"
SUPPORTS = {
    "simple": "simple", "ss": "simple", "simply supported": "simple", "simple span": "simple", "s": "simple",
    "one end continuous": "one", "one end cont": "one", "1 end continuous": "one", "1 end cont": "one",
    "end span": "one", "one end continuous (left)": "one_left", "one end continuous (right)": "one_right",
    "continuous left": "one_left", "continuous right": "one_right",
    "both ends continuous": "both", "both ends cont": "both", "2 ends continuous": "both",
    "continuous": "both", "cont": "both", "interior span": "both", "interior": "both",
    "cantilever": "cant", "cant": "cant", "cantilevered": "cant", "overhang": "cant",
    "cantilever (free left)": "cant_free_left", "cantilever (free right)": "cant_free_right",
}
SUPPORT_EXPECTED = "simple, one end continuous, both ends continuous or cantilever"


class Shared:
    """One object for equal values across the rows of one read: the texts, numbers, bar and
    stirrup arrangements and lists of assumptions a schedule repeats row after row are kept
    once, not once a row (a building's schedule holds a few hundred distinct values in 100,000
    rows). Notation is parsed once per distinct text; a text that cannot be read keeps its
    message, and each row that holds it gets its own error."""

    __slots__ = ("texts", "numbers", "bars", "stirrups", "tuples")

    def __init__(self) -> None:
        self.texts: dict[str, str] = {}
        self.numbers: dict[float, float] = {}
        self.bars: dict[str, BarArrangement | str] = {}  # text -> arrangement, or the NotationError message
        self.stirrups: dict[str, Stirrups | str] = {}
        self.tuples: dict[tuple, tuple] = {}

    def text(self, s: str) -> str:
        return self.texts.setdefault(s, s)

    def number(self, x: float) -> float:
        # zero is left alone: -0.0 and 0.0 are equal keys, and the sign is kept as read
        return self.numbers.setdefault(x, x) if x else x

    def texts_tuple(self, items: list[str]) -> tuple[str, ...]:
        t = tuple(self.text(x) for x in items)
        return self.tuples.setdefault(t, t)

    def parse(self, memo: dict, parse, s: str):
        got = memo.get(s)
        if got is None:
            try:
                got = parse(s)
            except NotationError as exc:
                got = str(exc)
            memo[self.text(s)] = got
        if isinstance(got, str):
            raise NotationError(got)
        return got


@dataclass
class Header:
    row: int | None
    index: dict[str, int] = field(default_factory=dict)  # column key -> position in the row
    labels: dict[str, str] = field(default_factory=dict)  # column key -> label as in the file
    factors: dict[str, float] = field(default_factory=dict)  # column key -> to engine units
    units: dict[str, str] = field(default_factory=dict)  # column key -> unit text used
    broken: dict[str, str] = field(default_factory=dict)  # column key -> why it cannot be read
    problems: list[Problem] = field(default_factory=list)
    units_assumed: list[str] = field(default_factory=list)
    shared: Shared = field(default_factory=Shared, repr=False, compare=False)  # values shared by the rows

    def label(self, key: str) -> str:
        return self.labels.get(key) or BY_KEY[key].header()


def _col_letter(i: int) -> str:
    s, n = "", i + 1
    while n:
        n, r = divmod(n - 1, 26)
        s = chr(65 + r) + s
    return s


def read_header(cells: list[Cell], row: int | None, defaults: Defaults, csv: bool = False) -> Header:
    """Match each header cell to a column, and read its unit (or the declared unit system's)."""
    hdr = Header(row)
    where_row = "line" if csv else "row"
    for i, cell in enumerate(cells):
        if cell.blank or cell.value is None:
            continue
        label = str(cell.value).strip()
        where = f"column {_col_letter(i)}" if not csv else f"field {i + 1}"
        col, unit = match_header(label)
        if col is None:
            hdr.problems.append(Problem(f"header {where_row} {row}, {where}: '{label}' is not a column beamsched "
                                        "reads; it is ignored (see the column table for the labels understood)",
                                        label, label, row, "warning"))
            continue
        if col.key in hdr.index:
            first = hdr.labels[col.key]
            hdr.problems.append(Problem(
                f"header {where_row} {row}, {where}: '{label}' names the same column as '{first}'; only the first "
                "is read: delete or rename one", label, label, row))
            continue
        hdr.index[col.key], hdr.labels[col.key] = i, label
        _unit(hdr, col, label, unit, defaults)
    return hdr


def _unit(hdr: Header, col: Column, label: str, unit: str | None, defaults: Defaults) -> None:
    if col.dimension is None:
        if unit and not (col.kind == "stirrups" and unit.strip().lower() == "mm"):
            hdr.broken[col.key] = f"the header gives a unit '{unit}' to a column that takes no unit"
            hdr.problems.append(Problem(f"column '{label}': {hdr.broken[col.key]}; expected the label "
                                        f"'{col.label}'", label, unit, hdr.row))
        return
    dim = col.dimension
    if not unit:
        if defaults.system is None:
            hdr.broken[col.key] = (f"the header gives no unit; expected e.g. '{col.header()}', or declare the Unit "
                                   "system in the Parameters sheet")
            hdr.problems.append(Problem(f"column '{label}': {hdr.broken[col.key]}", label, None, hdr.row))
            return
        unit = UNIT_SYSTEMS[defaults.system][dim]
        hdr.units_assumed.append(f"{label}: {unit} (no unit in the header; {defaults.system} unit system from "
                                 "the Parameters sheet)")
    try:
        hdr.factors[col.key] = unit_factor(unit, dim)  # type: ignore[arg-type]
        hdr.units[col.key] = unit
    except UnitError as exc:
        hdr.broken[col.key] = f"{exc}"
        hdr.problems.append(Problem(f"column '{label}': {exc}", label, unit, hdr.row))


class _Row:
    """Reads the cells of one row, collecting problems, assumptions and provenance."""

    def __init__(self, number: int, cells: list[Cell], hdr: Header, defaults: Defaults):
        self.number, self.cells, self.hdr, self.defaults = number, cells, hdr, defaults
        self.problems: list[Problem] = []
        self.warnings: list[Problem] = []
        self.assumed: list[str] = []
        self.origin: dict[str, tuple[str, object]] = {}  # BeamInput field -> (label, value as found)
        self.source: dict[str, str] = {}
        n = len(cells)
        self._by_key = {key: (cells[i] if i < n else EMPTY) for key, i in hdr.index.items()}
        self._filled = {key for key, c in self._by_key.items() if c is not EMPTY and not c.blank}

    # -- cells ------------------------------------------------------------------------
    def cell(self, key: str) -> Cell | None:
        """The row's cell in a column (None when the schedule has no such column)."""
        return self._by_key.get(key)

    def has(self, key: str) -> bool:
        return key in self._filled

    def fail(self, key: str, value: object, what: str, expected: str) -> None:
        label = self.hdr.label(key)
        self.problems.append(Problem(f"row {self.number}, '{label}' = {_show(value)}: {what}; expected {expected}",
                                     label, value, self.number))

    def fail_note(self, key: str, value: object, message: str) -> None:
        label = self.hdr.label(key)
        self.problems.append(Problem(f"row {self.number}, '{label}' = {_show(value)}: {message}", label, value,
                                     self.number))

    def _guard(self, key: str) -> Cell | None:
        if key not in self._filled:  # no such column, or a blank cell
            return None
        c = self._by_key[key]
        self.source[self.hdr.labels[key]] = self.hdr.shared.text(
            str(c.value if c.formula is None or c.value is not None else c.formula))
        if key in self.hdr.broken:
            self.fail(key, c.value, "this column cannot be read", self.hdr.broken[key])
            return None
        return c

    def num(self, key: str, fld: str | None = None) -> float | None:
        if key not in self._filled:  # most of a row's columns: no such column, or blank
            return None
        c = self._guard(key)
        if c is None:
            return None
        col = BY_KEY[key]
        expected = _expected_number(self.hdr.units.get(key, ""))
        try:
            x = cv.number(c, expected)
        except cv.CellError as exc:
            self.fail(key, c.value if c.value is not None else c.formula, exc.what, exc.expected)
            return None
        if x is None:
            return None
        if col.dimension:
            x *= self.hdr.factors[key]
        x = self.hdr.shared.number(x)
        if fld:
            self.origin[fld] = (self.hdr.label(key), c.value)
        return x

    def integer(self, key: str, expected: str) -> int | None:
        c = self._guard(key)
        if c is None:
            return None
        try:
            return cv.integer(c, expected)
        except cv.CellError as exc:
            self.fail(key, c.value, exc.what, exc.expected)
            return None

    def text(self, key: str) -> str | None:
        c = self._guard(key)
        if c is None:
            return None
        try:
            return cv.text(c)
        except cv.CellError as exc:
            self.fail(key, c.value, exc.what, exc.expected)
            return None

    def pick(self, key: str, options: dict[str, str], expected: str) -> str | None:
        c = self._guard(key)
        if c is None:
            return None
        try:
            return cv.choice(c, options, expected)
        except cv.CellError as exc:
            self.fail(key, c.value, exc.what, exc.expected)
            return None

    def yes_no(self, key: str) -> bool | None:
        c = self._guard(key)
        if c is None:
            return None
        try:
            return cv.yes_no(c)
        except cv.CellError as exc:
            self.fail(key, c.value, exc.what, exc.expected)
            return None

    def bars(self, key: str) -> BarArrangement | None:
        c = self._guard(key)
        if c is None:
            return None
        try:
            s = cv.text(c, "bar notation such as '4-25M'")
            if isinstance(c.value, (int, float)):
                raise cv.CellError("a number, not bar notation", "bars as count-size, e.g. '4-25M'")
            return self.hdr.shared.parse(self.hdr.shared.bars, parse_bars, s or "")
        except cv.CellError as exc:
            self.fail(key, c.value, exc.what, exc.expected)
        except NotationError as exc:
            self.fail_note(key, c.value, f"unreadable bar notation: {_tidy(str(exc), c.value)}")
        return None

    def stirrups(self, key: str) -> Stirrups | None:
        c = self._guard(key)
        if c is None:
            return None
        try:
            s = cv.text(c, "stirrups such as '10M@200'")
            if isinstance(c.value, (int, float)):
                raise cv.CellError("a number, not stirrup notation", "stirrups as '10M@200'")
            return self.hdr.shared.parse(self.hdr.shared.stirrups, parse_stirrups, s or "")
        except cv.CellError as exc:
            self.fail(key, c.value, exc.what, exc.expected)
        except NotationError as exc:
            self.fail_note(key, c.value, f"unreadable stirrup notation: {_tidy(str(exc), c.value)}")
        return None

    # -- defaults ---------------------------------------------------------------------
    def with_default(self, key: str | None, fld: str, param: str | None, builtin: float | None,
                     words: str) -> float | None:
        """The row's value, else the Parameters value, else the built-in one (noted)."""
        v = self.num(key, fld) if key else None
        if v is not None or (key and self.has(key)):
            return v
        d = self.defaults
        if param and param in d.values:
            self.assumed.append(f"{words} = {d.words[param]} from the Parameters sheet (row blank)")
            self.origin[fld] = (f"Parameters: {words}", d.words[param])
            return float(d.values[param])  # type: ignore[arg-type]
        if builtin is not None:
            self.assumed.append(f"{words} = {builtin:g} mm assumed (not scheduled, no Parameters value)")
            self.origin[fld] = (f"{words} (assumed)", builtin)
        return builtin


_UNIT_WORDS = {"in": "inches", "inch": "inches", '"': "inches", "ft": "feet", "'": "feet"}


@lru_cache(maxsize=256)
def _expected_number(unit: str) -> str:
    """What a number cell of a column in ``unit`` should hold, in words."""
    words = _UNIT_WORDS.get(unit.strip(), unit)
    return f"a number in {words}" if unit else "a number"


def _tidy(message: str, value: object) -> str:
    """A notation error without the repeats of the value the message already shows."""
    v = str(value).strip()
    for lead in (f"cannot read '{v}' in '{v}': ", f"cannot read stirrups '{v}': ", f"'{v}': "):
        if message.startswith(lead):
            message = message[len(lead):]
            break
    if re.search(r"#\s*\d", v):
        message += " (inch-pound bar sizes such as #4 are not read: write the CSA G30.18 size, e.g. 10M, 15M)"
    return message


def _show(value: object) -> str:
    """A cell value as a message shows it: numbers plain (also from CSV text), text quoted."""
    if isinstance(value, float) and value.is_integer():
        return str(int(value))
    if value is None:
        return "(blank)"
    if isinstance(value, str):
        return value.strip() if re.fullmatch(r"\s*[-+]?\d+(\.\d+)?\s*", value) else repr(value)
    return str(value)


@dataclass
class SpanPosition:
    """Where a span sits in its beam, for the Support shorthand."""

    first: bool
    last: bool
    multi: bool


def convert_row(number: int, cells: list[Cell], hdr: Header, defaults: Defaults, code: DesignCode,
                position: SpanPosition) -> BeamInput | RowFailure:
    """One schedule row -> a BeamInput, or a RowFailure listing every problem found in it."""
    r = _Row(number, cells, hdr, defaults)
    shared = hdr.shared
    if r._filled == {"mark"}:
        label = hdr.label("mark")
        value = r.cell("mark").value  # type: ignore[union-attr]
        return RowFailure(str(value).strip(), None, number, (Problem(
            f"row {number}, '{label}' = {_show(value)}: only the Mark is filled; expected the span's data (bw, h, "
            "bars, demands) on the same row — if this row is a sub-heading, move it above the header or delete it",
            label, value, number),))
    mark = r.text("mark")
    if mark is None and not r.has("mark"):
        r.fail("mark", None, "the Mark is blank", "the beam mark, e.g. 'B12'")
    span_no = r.integer("span_no", "a whole span number (1, 2, 3 ...)")
    qty = r.integer("qty", "a whole number of beams, 1 or more")
    if qty is not None and qty < 1:
        r.fail("qty", qty, "not a count of beams", "1 or more")
        qty = None

    # section --------------------------------------------------------------------------
    shape = r.pick("type", SHAPES, SHAPE_EXPECTED)
    bw = r.num("bw", "bw")
    h = r.num("h", "h")
    hf = r.num("hf", "hf")
    bf = r.num("bf", "bf")
    for key, value in (("bw", bw), ("h", h)):
        if value is None and not r.has(key):
            r.fail(key, None, f"{'the web width bw' if key == 'bw' else 'the overall depth h'} is blank "
                   + ("(no such column in the file)" if key not in hdr.index else "(required)"),
                   f"a positive number in {hdr.units.get(key, 'mm')}")
    if shape is None and not r.has("type"):
        if hf is not None or bf is not None:
            r.fail("type", None, "the Type is blank but flange sizes are given", "Rect, T or L")
        else:
            shape = "rect"
            if "type" in hdr.index:
                r.assumed.append("Type blank: rectangular section assumed")
    if shape == "rect" and (hf is not None or bf is not None):
        r.warnings.append(Problem(f"row {number}, '{hdr.label('type')}' = {_show(r.cell('type').value if r.cell('type') else 'Rect')}: "
                                  "a rectangular section, so the flange sizes given (hf, bf) are ignored",
                                  hdr.label("type"), shape, number, "warning"))
        hf = bf = None
    clear_web = r.num("clear_to_next_web", "clear_to_next_web")

    # span and ends --------------------------------------------------------------------
    span = r.num("span", "span")
    clear_span = r.num("clear_span", "clear_span")
    if clear_span is None and span is not None and not r.has("clear_span"):
        clear_span = span
        r.assumed.append(f"Clear span not scheduled: the c/c span {span / 1000:g} m stands in")
    left, right = _ends(r, span_no, position)

    # materials and detailing ---------------------------------------------------------
    fc = r.with_default("fc", "fc", "fc", None, "f'c")
    fy = r.with_default("fy", "fy", "fy", None, "fy")
    for key, value, words in (("fc", fc, "f'c"), ("fy", fy, "fy")):
        if value is None and not r.has(key):
            r.fail(key, None, f"{words} is blank and the Parameters sheet gives none",
                   f"{words} in the row (MPa), or a default {words} in the Parameters sheet")
    fyt = r.num("fyt", "fyt")
    if fyt is None and not r.has("fyt"):
        if "fyt" in defaults.values:
            fyt = float(defaults.values["fyt"])  # type: ignore[arg-type]
            r.assumed.append(f"fyt = {defaults.words['fyt']} from the Parameters sheet (row blank)")
            r.origin["fyt"] = ("Parameters: fyt", defaults.words["fyt"])
        elif r.has("stirrups"):
            r.assumed.append("fyt not scheduled: the stirrups taken as fy")
    cover_top = _cover(r, "cover_top", "Cover top")
    cover_bottom = _cover(r, "cover_bottom", "Cover bottom")
    agg = r.with_default("agg", "agg", "agg", DEFAULT_AGG, "Max aggregate")
    exposure = r.pick("exposure", EXPOSURES, "interior or exterior")
    if exposure is None and not r.has("exposure"):
        if "exposure" in defaults.values:
            exposure = str(defaults.values["exposure"])
            r.assumed.append(f"Exposure {exposure} from the Parameters sheet (row blank)")
        else:
            exposure = DEFAULT_EXPOSURE
            r.assumed.append("Exposure not stated: exterior assumed (the stricter crack-control limit)")
    density_text = r.text("density")
    density = None
    if density_text is not None:
        if density_key(density_text) in DENSITIES:
            density = DENSITIES[density_key(density_text)][0]
        else:
            r.fail("density", density_text, "concrete density not understood",
                   "normal, semi-low-density or low-density (cl. 8.6.5)")
    elif "density" in defaults.values:
        density = str(defaults.values["density"])
        r.assumed.append(f"Concrete density {defaults.words['density']} from the Parameters sheet")
    else:
        density = "normal"
        r.assumed.append("Concrete density not stated: normal density assumed (λ = 1.0, cl. 8.6.5)")
    precast = _flag(r, "precast", "Precast (certified plant)")
    epoxy = _flag(r, "epoxy", "Epoxy-coated bars")
    sfrs = r.yes_no("sfrs")
    layer_clear = None
    if "layer_clear" in defaults.values:
        layer_clear = float(defaults.values["layer_clear"])  # type: ignore[arg-type]
        r.assumed.append(f"Clear distance between layers = {defaults.words['layer_clear']} from the Parameters sheet")
        r.origin["layer_clear"] = ("Parameters: Clear distance between layers", defaults.words["layer_clear"])
    d_bottom = r.num("d", "d_bottom")
    d_top = r.num("d_top", "d_top")

    # bars -----------------------------------------------------------------------------
    bottom = r.bars("bottom_bars")
    top = r.bars("top_bars")
    top_l = r.bars("top_bars_l")
    top_r = r.bars("top_bars_r")
    top_mid = r.bars("top_bars_mid")
    bottom_sup = r.bars("bottom_bars_support")
    skin = r.bars("skin_bars")
    stirrups = r.stirrups("stirrups")

    # demands --------------------------------------------------------------------------
    mf_pos = r.num("mf_pos", "Mf_pos")
    mf_neg = _magnitude(r.num("mf_neg"), shared)
    mf_neg_l = _magnitude(r.num("mf_neg_l"), shared)
    mf_neg_r = _magnitude(r.num("mf_neg_r"), shared)
    mf_pos_l = r.num("mf_pos_l", "Mf_pos_left")
    mf_pos_r = r.num("mf_pos_r", "Mf_pos_right")
    vf = _magnitude(r.num("vf"), shared)
    vf_l = _magnitude(r.num("vf_l"), shared)
    vf_r = _magnitude(r.num("vf_r"), shared)
    tf = _magnitude(r.num("tf"), shared)
    pf = r.num("pf")
    ms_pos = r.num("ms_pos")
    if ms_pos is not None and ms_pos < 0:
        r.fail("ms_pos", r.cell("ms_pos").value, "a negative service sagging moment",  # type: ignore[union-attr]
               "zero or more (hogging service moments belong in Ms-)")
    ms_neg = _magnitude(r.num("ms_neg"), shared)
    notes = shared.text(r.text("notes") or "")

    mark_text = shared.text(mark or "")
    if bw is None or h is None or fc is None or fy is None or shape is None:
        if fc is not None and fy is not None:  # the materials can still be judged
            r.problems += [_relabel(Problem(f"{e.field} = {e.value:g} MPa: expected {e.expected}", e.field, e.value),
                                    r) for e in code.material_errors(fc, fy, fyt)]
        return RowFailure(mark_text, span_no, number, tuple(r.problems))
    # The span as read (cells that could not be read are left out), checked by the engine's own
    # validation, so that every problem of the row is reported at once.
    density = density or "normal"
    inp = BeamInput(
        mark=mark_text, shape=shape, bw=bw, h=h, fc=fc, fy=fy, span_no=span_no, row=number,  # type: ignore[arg-type]
        qty=qty or 1, hf=hf, bf=bf, clear_to_next_web=clear_web, span=span, clear_span=clear_span,
        left_end=left, right_end=right, cover_top=cover_top, cover_bottom=cover_bottom,  # type: ignore[arg-type]
        bottom_bars=bottom, top_bars_left=top_l or top, top_bars_right=top_r or top, top_bars_mid=top_mid,
        bottom_bars_support=bottom_sup, stirrups=stirrups, d_bottom=d_bottom, d_top=d_top, fyt=fyt,
        agg=agg, lam=DENSITY_LAMBDA[density], density=density, exposure=exposure,  # type: ignore[arg-type]
        precast=precast, sfrs=sfrs, layer_clear=layer_clear,
        Mf_pos=mf_pos, Mf_neg_left=_first(mf_neg_l, mf_neg), Mf_neg_right=_first(mf_neg_r, mf_neg),
        Mf_pos_left=mf_pos_l, Mf_pos_right=mf_pos_r, Vf_left=_first(vf_l, vf), Vf_right=_first(vf_r, vf),
        Tf=tf, Pf=pf, Ms_pos=ms_pos, Ms_neg=ms_neg, skin_bars=skin, epoxy=epoxy, notes=notes,
        assumed=shared.texts_tuple(r.assumed), warnings=tuple(r.warnings), source=r.source,
    )
    found = _validate_all(inp, code, r)
    if r.problems or found:
        return RowFailure(mark_text, span_no, number, tuple(r.problems) + tuple(found))
    return inp


_REQUIRED_FIELDS = ("bw", "h", "fc", "fy", "shape", "lam")


def _validate_all(inp: BeamInput, code: DesignCode, r: _Row) -> list[Problem]:
    """engine.validate, re-labelled; it stops at its first group of findings, so an optional
    field it rejects is set aside and the rest validated again, to list every problem."""
    seen = {p.column for p in r.problems}
    out: list[Problem] = []
    for _ in range(4):
        found = validate(inp, code)
        if not found:
            break
        fields = {_FIELD_OF_LABEL.get(p.column or "", p.column or "") for p in found}
        new = []
        for q in (_relabel(p, r) for p in found):
            if q.column not in seen and q.message not in {x.message for x in new}:
                new.append(q)
        out += new
        seen |= {q.column for q in new}
        optional = {f for f in fields if f not in _REQUIRED_FIELDS and hasattr(inp, f)}
        if not optional or fields & set(_REQUIRED_FIELDS):
            break
        inp = dataclasses.replace(inp, **{f: None for f in optional})
    return out


def _cover(r: _Row, key: str, words: str) -> float | None:
    """Cover top / Cover bottom, else Cover, else the Parameters value, else 40 mm (noted)."""
    own = r.num(key, key)
    if own is not None or r.has(key):
        return own
    both = r.num("cover", key)
    if both is not None or r.has("cover"):
        return both
    param = key if key in r.defaults.values else "cover"
    return r.with_default(None, key, param, DEFAULT_COVER, words)


def _first(a, b):
    return a if a is not None else b


def _magnitude(x: float | None, shared: Shared) -> float | None:
    return None if x is None else x if x > 0 else shared.number(abs(x))


def _flag(r: _Row, key: str, words: str) -> bool:
    v = r.yes_no(key)
    if v is not None:
        return v
    if key in r.defaults.values:
        v = bool(r.defaults.values[key])
        if v:
            r.assumed.append(f"{words}: yes, from the Parameters sheet")
        return v
    return False


_FIELD_OF_LABEL = {v: k for k, v in FIELD_LABELS.items()}
_FIELD_OF_LABEL.update({"f'c": "fc", "fy": "fy", "fyt": "fyt", "shape": "shape"})
_KEY_OF_FIELD = {"bw": "bw", "h": "h", "hf": "hf", "bf": "bf", "fc": "fc", "fy": "fy", "fyt": "fyt",
                 "d_bottom": "d", "d_top": "d_top", "cover_top": "cover_top", "cover_bottom": "cover_bottom",
                 "span": "span", "clear_span": "clear_span", "agg": "agg", "clear_to_next_web": "clear_to_next_web",
                 "Mf_pos": "mf_pos", "Mf_pos_left": "mf_pos_l", "Mf_pos_right": "mf_pos_r", "qty": "qty",
                 "shape": "type", "lam": "density", "layer_clear": "layer_clear"}


def _relabel(p: Problem, r: _Row) -> Problem:
    """An engine validation problem, re-labelled with the column (or default) it came from."""
    fld = _FIELD_OF_LABEL.get(p.column or "", p.column or "")
    if fld in r.origin:
        label, raw = r.origin[fld]
    else:
        key = _KEY_OF_FIELD.get(fld)
        label = r.hdr.label(key) if key and key in BY_KEY else (p.column or "")
        c = r.cell(key) if key else None
        raw = c.value if c is not None else p.value
    message = p.message
    head = f"{p.column} = "
    if message.startswith(head) and ": " in message:
        message = message.split(": ", 1)[1]  # the value is shown as the file has it
    message = message.replace(" a L-beam", " an L-beam")
    if fld in ("fc", "fy", "fyt") and isinstance(p.value, (int, float)) and p.value > 1000:
        name = {"fc": "f'c", "fy": "fy", "fyt": "fyt"}[fld]
        message += f"; if the value is in psi, say so in the header, e.g. '{name} (psi)'"
    return Problem(f"row {r.number}, '{label}' = {_show(raw)}: {message}", label, raw, r.number, p.severity)


def _ends(r: _Row, span_no: int | None, pos: SpanPosition) -> tuple[str, str]:
    left = r.pick("left_end", ENDS, ENDS_EXPECTED)
    right = r.pick("right_end", ENDS, ENDS_EXPECTED)
    support = r.pick("support", SUPPORTS, SUPPORT_EXPECTED)
    if support is not None:
        sl, sr, words = _shorthand(support, pos)
        if left is None and right is None:
            r.assumed.append(f"Support '{r.cell('support').value}' read as {words}")  # type: ignore[union-attr]
        elif (left or sl, right or sr) != (sl, sr):
            r.warnings.append(Problem(
                f"row {r.number}, '{r.hdr.label('support')}' = {_show(r.cell('support').value)}: "  # type: ignore[union-attr]
                f"({words}) disagrees with Left end / Right end ({left or sl}, {right or sr}); "
                "the Left end / Right end columns are used",
                r.hdr.label("support"), r.cell("support").value, r.number, "warning"))  # type: ignore[union-attr]
        left, right = left or sl, right or sr
    if left is None or right is None:
        missing = [w for w, v in (("left", left), ("right", right)) if v is None]
        if not (r.has("left_end") or r.has("right_end") or r.has("support")):
            r.assumed.append("End conditions not scheduled: both ends taken as simple supports")
        elif not r.problems:
            r.assumed.append(f"{' and '.join(missing).capitalize()} end not scheduled: taken as simple")
        left, right = left or "simple", right or "simple"
    return left, right


def _shorthand(code: str, pos: SpanPosition) -> tuple[str, str, str]:
    """The Support shorthand -> (left end, right end, words).

    * simple: simple at both ends;
    * both ends continuous: continuous at both ends;
    * one end continuous: continuous toward the rest of the beam: the right end for a single span
      or the first span of a beam, the left end for the last span of a multi-span beam
      (``one end continuous (left)`` / ``(right)`` say it outright);
    * cantilever: fixed (continuous) at the supported end, free at the tip: the tip is at the
      right, except for span 1 of a beam with further spans, which overhangs to the left
      (``cantilever (free left)`` / ``(free right)`` say it outright).
    """
    if code == "simple":
        return "simple", "simple", "simple at both ends"
    if code == "both":
        return "continuous", "continuous", "continuous at both ends"
    if code == "one_left" or (code == "one" and pos.multi and pos.last and not pos.first):
        return "continuous", "simple", "left end continuous, right end simple"
    if code in ("one", "one_right"):
        return "simple", "continuous", "left end simple, right end continuous"
    if code == "cant_free_left" or (code == "cant" and pos.multi and pos.first and not pos.last):
        return "free", "continuous", "a cantilever: free at the left, fixed (continuous) at the right"
    return "continuous", "free", "a cantilever: fixed (continuous) at the left, free at the right"


def identical(a: list[Cell], b: list[Cell], hdr: Header) -> tuple[bool, list[str]]:
    """Whether two rows hold the same contents in every column read, and which labels differ."""
    differ = []
    for key, i in hdr.index.items():
        va = a[i].value if i < len(a) else None
        vb = b[i].value if i < len(b) else None
        if _canon(va) != _canon(vb):
            differ.append(hdr.labels[key])
    return not differ, differ


def _canon(v: object) -> object:
    if v is None:
        return None
    if isinstance(v, str):
        s = " ".join(v.split()).upper()
        if not s:
            return None
        try:
            return float(s)
        except ValueError:
            return s
    if isinstance(v, (int, float)) and not isinstance(v, bool):
        return float(v)
    return v


def add_problem(row: BeamInput | RowFailure, problem: Problem) -> BeamInput | RowFailure:
    """The row with one more problem: a warning rides on a BeamInput, an error makes it fail."""
    if isinstance(row, RowFailure):
        return dataclasses.replace(row, problems=row.problems + (problem,))
    if problem.severity == "warning":
        return dataclasses.replace(row, warnings=row.warnings + (problem,))
    return RowFailure(row.mark, row.span_no, row.row, (problem,) + row.warnings)


__all__ = ["Header", "read_header", "convert_row", "SpanPosition", "identical", "add_problem",
           "DIMENSION_WORDS", "ENGINE_UNIT"]
