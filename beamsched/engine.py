"""Check spans: validate each input, run every check, gather a :class:`BeamResult` per span.

A schedule is checked a chunk of spans at a time (:func:`_check_spans`); one span is a chunk of one."""

from __future__ import annotations

import math
from collections.abc import Callable

import numpy as np

from .bars import BarArrangement
from .checks import CHECK_MODULES, flexure
from .checks.context import Remembered, SpanContext, placement
from .codes import DesignCode, get_code
from .collector import gc_paused
from .model import (
    BeamInput,
    BeamResult,
    BeamStatus,
    CheckResult,
    PackedChecks,
    Problem,
    RecentlyRead,
    RowFailure,
    Schedule,
    TraceLine,
    WorkedOutTuple,
    beam_status,
)
from .section import PlacedBars

# Not a limit of the standard: the smallest web width or depth read as millimetres. Joist ribs
# are at least 100 mm wide (common practice), so anything under 50 mm is a unit slip (metres or
# centimetres typed in a millimetre column), and its bars could not be placed anyway.
MIN_SECTION_MM = 50.0

# Field names as the schedule calls them, for messages.
FIELD_LABELS = {
    "bw": "bw", "h": "h", "hf": "hf", "bf": "bf", "fc": "f'c", "fy": "fy", "fyt": "fyt",
    "d_bottom": "d", "d_top": "d top", "cover_top": "Cover top", "cover_bottom": "Cover bottom",
    "span": "Span", "clear_span": "Clear span", "agg": "Agg", "clear_to_next_web": "Clear to next web",
    "Mf_pos": "Mf+", "Mf_pos_left": "Mf+ L", "Mf_pos_right": "Mf+ R", "lam": "λ", "qty": "Qty",
    "layer_clear": "Layer clear distance",
}


# Dimensions, strengths and lengths that must be positive when given, in the order reported.
POSITIVE_FIELDS = ("bw", "h", "fc", "fy", "fyt", "span", "clear_span", "agg", "clear_to_next_web", "layer_clear", "hf",
                   "bf", "d_bottom", "d_top")


def validate(inp: BeamInput, code: DesignCode) -> list[Problem]:
    """Everything about a span that would make a computed number wrong, as problems."""
    out: list[Problem] = []

    def bad(field: str, value, expected: str) -> None:
        out.append(Problem(f"{FIELD_LABELS.get(field, field)} = {value!r}: expected {expected}",
                           FIELD_LABELS.get(field, field), value, inp.row))

    def finite(field: str, v) -> bool:
        if not isinstance(v, (int, float)) or not math.isfinite(v):
            bad(field, v, "a finite number")
            return False
        return True

    for f in POSITIVE_FIELDS:
        v = getattr(inp, f)
        if v is not None and finite(f, v) and v <= 0:
            bad(f, v, "a positive number")
    for f in ("bw", "h"):
        v = getattr(inp, f)
        if isinstance(v, (int, float)) and math.isfinite(v) and 0 < v < MIN_SECTION_MM:
            bad(f, v, f"at least {MIN_SECTION_MM:g} mm: no beam is that small, so the value is probably in metres "
                      f"or centimetres; say so in the header, e.g. '{FIELD_LABELS[f]} (m)'")
    for f in ("cover_top", "cover_bottom"):
        v = getattr(inp, f)
        if v is not None and finite(f, v) and v < 0:
            bad(f, v, "zero or more (clear cover to the stirrups, mm)")
    for f in ("Mf_pos", "Mf_pos_left", "Mf_pos_right"):
        v = getattr(inp, f)
        if v is not None and finite(f, v) and v < 0:
            bad(f, v / 1e6, "zero or more kN·m (sagging); hogging belongs in Mf-")
    if inp.shape not in ("rect", "T", "L"):
        bad("shape", inp.shape, "Rect, T or L")
    if not (0 < inp.lam <= 1.0):
        bad("lam", inp.lam, "0.75, 0.85 or 1.0 (cl. 8.6.5)")
    if out:
        return out
    if inp.shape in ("T", "L"):
        if inp.hf is None:
            bad("hf", None, f"the flange thickness of a {inp.shape}-beam")
        elif inp.hf >= inp.h:
            bad("hf", inp.hf, f"less than h = {inp.h:g} mm")
        if inp.bf is not None and inp.bf < inp.bw:
            bad("bf", inp.bf, f"at least bw = {inp.bw:g} mm")
    for f in ("d_bottom", "d_top"):
        v = getattr(inp, f)
        if v is not None and v >= inp.h:
            bad(f, v, f"less than h = {inp.h:g} mm")
    if inp.span is not None and inp.clear_span is not None and inp.clear_span > inp.span:
        bad("clear_span", inp.clear_span, f"no more than the span, {inp.span:g} mm")
    _bars_inside(inp, code, bad)
    for err in code.material_errors(inp.fc, inp.fy, inp.fyt):
        out.append(Problem(f"{err.field} = {err.value:g} MPa: expected {err.expected}", err.field, err.value, inp.row))
    return out


BAR_FIELDS = {"bottom_bars": ("Bottom bars", "bottom"), "top_bars_left": ("Top bars L", "top"),
              "top_bars_right": ("Top bars R", "top"), "top_bars_mid": ("Top bars at midspan", "top"),
              "bottom_bars_support": ("Bottom bars at support", "bottom")}


def _bars_inside(inp: BeamInput, code: DesignCode, bad) -> None:
    """Every bar must lie within the section, placed as the checks place it (cover, stirrup,
    layers): bars that cannot even be placed inside h give no meaningful resistance. (Bars too
    many for the width are a failed bar-fit check, not an input error.)"""
    numbers = (inp.h, inp.cover_top, inp.cover_bottom, inp.agg)
    if not all(isinstance(v, (int, float)) and math.isfinite(v) for v in numbers):
        return  # a value it needs is itself in error (reported elsewhere)
    for name, (label, face) in BAR_FIELDS.items():
        bars = getattr(inp, name)
        if bars is None:
            continue
        deepest = max(p.depth + p.db / 2 for p in placement(inp, code, bars, face))
        if deepest > inp.h:
            cover = inp.cover_top if face == "top" else inp.cover_bottom
            FIELD_LABELS.setdefault(name, label)
            bad(name, str(bars), f"bars that fit within h = {inp.h:g} mm: placed from the {face} face with "
                                 f"{cover:g} mm cover{' and the stirrups' if inp.stirrups else ''}, they reach "
                                 f"{deepest:.0f} mm deep")


def _understood(ctx: SpanContext) -> None:
    """What the tool took from the row, in words, for the results table."""
    inp, u = ctx.inp, ctx.understood
    if ctx.flange is not None:
        f = ctx.flange
        if f.computed:
            why = f"computed: {f.governing} governs (cl. {f.clause})"
        elif f.reduced:
            why = f"reduced from {inp.bf:g} mm: {f.governing} governs (cl. {f.clause})"
        else:
            why = f"as scheduled, within the limit of cl. {f.clause} ({min(f.limits.values()):.0f} mm overhang)"
        u["bf used"] = f"{f.bf:.0f} mm, {why}"
        ctx.values["bf_eff_mm"] = f.bf
        for words, value in f.limits.items():
            ctx.add_trace("section", None, "overhang limit", value, "mm", f.clause, words)
        ctx.add_trace("section", None, "bf", f.bf, "mm", f.clause, f"effective flange width ({why})")
    for name, field, face, tension in UNDERSTOOD_BARS:
        bars = getattr(inp, field)
        if bars is not None:
            u[name] = _bars_in_words(bars, ctx.place(bars, face, tension), inp.h)


UNDERSTOOD_BARS = (("bottom bars", "bottom_bars", "bottom", True), ("top bars L", "top_bars_left", "top", True),
                   ("top bars R", "top_bars_right", "top", True), ("top bars mid", "top_bars_mid", "top", False),
                   ("bottom bars at supports", "bottom_bars_support", "bottom", True))
_WORDS: Remembered = Remembered()


def _bars_in_words(bars: BarArrangement, placed: tuple[PlacedBars, ...], h: float) -> str:
    """Scheduled bars as understood: their area and the depth d of each group. Placements are
    shared (``checks.context.placement``), so each distinct text is made once; an entry holds
    its placement, so the placement's id stays its own."""
    key = (id(placed), bars, h)
    held = _WORDS.get(key)
    if held is None:
        depths = ", ".join(f"{p.count}-{p.size} at {h - p.depth:.1f}" for p in placed)
        text = f"{bars}: As = {bars.area:.0f} mm²; d = {depths} mm" + (
            " (explicit d, lumped)" if placed and placed[0].lumped else "")
        held = _WORDS.put(key, (placed, text))
    return held[1]


CHUNK_SPANS = 512  # spans checked together: their sections solved in one set of columns


class SpansToTrace:
    """The spans of one chunk of a schedule, whose traces have not been worked out, with what
    the checks found by searching (each flexural neutral axis and As,req): a trace worked out
    again for one span starts from those roots, so it shows the numbers the checks found
    without searching again (a search over columns of one row costs tens of milliseconds)."""

    __slots__ = ("inputs", "code", "roots", "last_read")

    def __init__(self, inputs: list[BeamInput], code: DesignCode):
        self.inputs = inputs
        self.code = code
        self.roots = np.full((len(inputs), 2 * len(flexure.CASE_KEYS)), np.nan)  # see flexure.found_roots
        self.last_read = -2  # the index of the span whose trace was last worked out


class LazyTrace(WorkedOutTuple):
    """The calculation trace of one span, worked out when it is first read.

    A whole schedule's trace is some 200 lines a span: held as objects, 100,000 spans would
    take gigabytes, and the results workbook shows the working of only the spans that fit on
    one worksheet. So :func:`check_schedule` keeps, for each span, only what makes its trace
    (the input, the design code and the roots its checks found, see :class:`SpansToTrace`) and
    this sequence runs the checks again, with the trace, when a writer reads it. The lines are
    the same as an eager run's: the checks are pure functions of the input and the code, and a
    span's numbers do not depend on the spans solved with it (``tests/test_fast_path.py``
    compares them). The last few traces read are kept, so reading one twice costs one run.
    """

    __slots__ = ("_chunk", "_index")
    WINDOW = 32  # spans whose traces are worked out together when traces are read in order
    KEEP = 2 * WINDOW  # traces kept after reading (a writer reads a span's trace a few times in a row)
    _recent = RecentlyRead(KEEP)

    def __init__(self, chunk: SpansToTrace, index: int):
        self._chunk = chunk
        self._index = index

    def lines(self) -> tuple[TraceLine, ...]:
        """The trace, worked out again (or as last worked out)."""
        held = LazyTrace._recent.get(id(self))
        if held is None:
            held = LazyTrace._recent.get((id(self._chunk), self._index))
        if held is not None:
            self._chunk.last_read = self._index
            return held
        chunk, i = self._chunk, self._index
        # Read in order (the Working sheet with every span), the traces of the next spans are
        # worked out with this one: the columns' fixed cost is shared. Read here and there
        # (only the flagged spans), each is worked out alone. The lines are the same either way.
        end = min(i + (LazyTrace.WINDOW if i == chunk.last_read + 1 else 1), len(chunk.inputs))
        inputs = chunk.inputs[i:end]
        roots = [flexure.given_roots(inp, chunk.roots[j].tolist()) for j, inp in enumerate(inputs, start=i)]
        results = _check_spans(inputs, chunk.code, tracing=True, roots=roots)
        for j, result in enumerate(results[1:], start=i + 1):
            LazyTrace._recent.put((id(chunk), j), result.trace, chunk)
        chunk.last_read = end - 1
        return LazyTrace._recent.put(id(self), results[0].trace, self)  # type: ignore[arg-type]

    items = lines

    def __repr__(self) -> str:
        inp = self._chunk.inputs[self._index]
        return f"LazyTrace({inp.mark!r}, span {inp.span_no})"


def _check_spans(inputs: list[BeamInput], code: DesignCode, tracing: bool,
                 roots: list[dict] | None = None) -> list[BeamResult]:
    """Check spans together: each check module first works out what it can for all of them at
    once (``prepare``: the flexural sections are solved in one set of columns), then makes each
    span's results (``run``). Without ``tracing`` the results are packed and each trace is a
    :class:`LazyTrace`. ``roots``: per span, what an earlier run's searches found (see
    :class:`SpansToTrace`)."""
    out: list[BeamResult | None] = [None] * len(inputs)
    contexts: list[tuple[int, SpanContext]] = []
    for i, inp in enumerate(inputs):
        problems = validate(inp, code)
        if problems:
            out[i] = BeamResult(inp.mark, inp.span_no, inp.row, BeamStatus.ERROR,
                                problems=tuple(problems) + inp.warnings, assumed=inp.assumed, input=inp)
            continue
        ctx = SpanContext(inp, code, tracing=tracing, roots=None if roots is None else roots[i])
        _understood(ctx)
        contexts.append((i, ctx))
    spans = [ctx for _, ctx in contexts]
    for module in CHECK_MODULES:
        prepare = getattr(module, "prepare", None)
        if prepare is not None:
            prepare(spans)
    chunk = None if tracing else SpansToTrace(inputs, code)
    for i, ctx in contexts:
        for module in CHECK_MODULES:
            module.run(ctx)
        inp = ctx.inp
        if chunk is None:
            checks: tuple[CheckResult, ...] | PackedChecks = ctx.checks()
            status = beam_status(checks)
        else:
            chunk.roots[i] = flexure.found_roots(ctx)
            checks = PackedChecks.of_rows(ctx.results)
            status = checks.status()
        out[i] = BeamResult(
            inp.mark, inp.span_no, inp.row, status, checks=checks, values=dict(ctx.values),
            trace=tuple(ctx.trace) if chunk is None else LazyTrace(chunk, i),  # type: ignore[arg-type]
            problems=inp.warnings, assumed=inp.assumed, understood=dict(ctx.understood), input=inp,
        )
    return out  # type: ignore[return-value]


def check_beam(inp: BeamInput, code: DesignCode | str | None = None, *, lazy_trace: bool = False) -> BeamResult:
    """Check one span against the design code (CSA A23.3-19 by default).

    Returns a :class:`BeamResult`; input that the standard does not cover gives a result with
    status ``error`` and problems naming each field, never a number. With ``lazy_trace`` the
    checks run without keeping their trace, and the result's ``trace`` is a :class:`LazyTrace`
    that works it out when read (the same lines); its checks are then held as
    :class:`~beamsched.model.PackedChecks` (equal results, a fraction of the memory).
    """
    code = code if isinstance(code, DesignCode) else get_code(code)
    return _check_spans([inp], code, tracing=not lazy_trace)[0]


def check_schedule(schedule: Schedule, code: DesignCode | str | None = None, *,
                   lazy_trace: bool = True, progress: Callable[[int], object] | None = None) -> list[BeamResult]:
    """Check every row of a schedule, in schedule order; unreadable rows come back as
    ``error`` results carrying their problems, so nothing is lost.

    The spans are checked in chunks of :data:`CHUNK_SPANS` (see :func:`_check_spans`). Each
    result's trace is worked out when it is read (``lazy_trace``, see :class:`LazyTrace`);
    ``lazy_trace=False`` keeps every trace line from the start. ``progress`` is called with the
    number of rows checked so far, after each chunk."""
    code = code if isinstance(code, DesignCode) else get_code(code or schedule.code)
    with gc_paused():  # see gc_paused: many live objects and no cycles
        return _check_rows(schedule, code, lazy_trace, progress)


def _check_rows(schedule: Schedule, code: DesignCode, lazy_trace: bool,
                progress: Callable[[int], object] | None) -> list[BeamResult]:
    out: list[BeamResult] = []
    pending: list[BeamInput] = []

    def flush() -> None:
        nonlocal pending
        if pending:
            out.extend(_check_spans(pending, code, tracing=not lazy_trace))
            pending = []  # a new list: the chunk's traces keep theirs
        if progress is not None:
            progress(len(out))

    for row in schedule.rows:
        if isinstance(row, RowFailure):
            if pending:
                flush()
            out.append(BeamResult(row.mark, row.span_no, row.row, BeamStatus.ERROR, problems=row.problems))
        else:
            pending.append(row)
            if len(pending) >= CHUNK_SPANS:
                flush()
    flush()
    return out
