"""What every check of one span shares: the input, the code, the section, the trace.

The context computes each shared quantity once (the effective flange width, the bar depths,
each flexural solution) so that checks can build on one another (shear takes its d from the
flexural tension steel) without recomputing or reformatting anything.
"""

from __future__ import annotations

import math
import sys
from collections.abc import Iterable
from dataclasses import dataclass, field
from typing import Literal

import numpy as np

from ..bars import BarArrangement
from ..codes import DesignCode, FlangeWidth
from ..model import BeamInput, CheckResult, CheckStatus, Location, TraceLine
from ..section import PlacedBars, Rect, Section, centroid_depth, place_bars
from ..solve.flexure import (
    BarRows,
    FlexureSolution,
    OutlineRows,
    SectionColumns,
    SolvedColumns,
    SolverBar,
    bar_rows,
    outline_rows,
    solution_of,
    solve_columns,
    tension_centroid,
    tension_moment,
)

Sense = Literal["pos", "neg"]
End = Literal["left", "right"]

N_PER_KN = 1e3
NMM_PER_KNM = 1e6


@dataclass(frozen=True, slots=True, eq=False)
class CaseOutline:
    """A flexural case's outline seen from its compression face, and its rows in
    :class:`SectionColumns`; the same for every span with an equal section (:func:`case_outline`)."""

    compression_face: Literal["top", "bottom"]
    outline: tuple[Rect, ...]
    rows: OutlineRows


@dataclass(frozen=True, slots=True, eq=False)
class CaseBars:
    """A flexural case's bars as the solver sees them, and their rows in :class:`SectionColumns`;
    the same for every span with the same placed bars, depth and ties (:func:`case_bars`)."""

    tension_placed: tuple[PlacedBars, ...]  # depths below the tension face
    compression_placed: tuple[PlacedBars, ...]  # depths below the compression face
    tied: bool
    bars: tuple[SolverBar, ...]
    d: float  # depth of the tension-steel centroid below the compression face (mm)
    moment: float  # first moment of the tension steel's area about the compression face (mm³)
    rows: BarRows


@dataclass(frozen=True, slots=True)
class FlexureCase:
    """One flexural section: which bars are in tension and compression, and its solution.

    The checks read ``Mr``, ``As``, ``c`` and ``c_over_d``; the whole :attr:`solution` (every
    bar's state, the forces and where they act) is made from the solved columns only when first
    read, by the trace. What does not depend on the span (the outline seen from the compression
    face, the bars as the solver sees them, d) it shares with every case of an equal section
    (``concrete``) and of the same placed bars (``steel``)."""

    sense: Sense
    location: Location
    tension_bars: BarArrangement
    compression_bars: BarArrangement | None
    concrete: CaseOutline
    steel: CaseBars
    Mr: float  # N·mm, factored resistance
    As: float  # area of the flexural tension steel (mm²)
    c: float  # neutral-axis depth (mm)
    c_over_d: float  # c over the solver's d (the tension steel's centroid, as solved)
    columns: SectionColumns  # the sections it was solved with, and its row there (for As,req)
    solved: SolvedColumns
    row: int
    alpha1: float
    _solution: list = field(default_factory=list, repr=False, compare=False)

    @property
    def compression_face(self) -> Literal["top", "bottom"]:
        return self.concrete.compression_face

    @property
    def tension_placed(self) -> tuple[PlacedBars, ...]:
        return self.steel.tension_placed

    @property
    def compression_placed(self) -> tuple[PlacedBars, ...]:
        return self.steel.compression_placed

    @property
    def compression_tied(self) -> bool:
        return self.steel.tied

    @property
    def d(self) -> float:
        """Depth of the tension-steel centroid below the compression face (mm)."""
        return self.steel.d

    @property
    def outline(self) -> tuple[Rect, ...]:
        return self.concrete.outline

    @property
    def bars(self) -> tuple[SolverBar, ...]:
        return self.steel.bars

    @property
    def solution(self) -> FlexureSolution:
        if not self._solution:
            self._solution.append(solution_of(self.columns, self.solved, self.row, self.outline, self.bars,
                                              self.alpha1))
        return self._solution[0]


REMEMBERED_KEPT = 4096  # distinct values each memo remembers (a building repeats a few hundred)


class Remembered(dict):
    """A memo of a pure function of the values in its keys, bounded: when it holds
    :data:`REMEMBERED_KEPT` entries it forgets them all and starts again (a schedule repeats a
    few hundred distinct values, so this is rare and costs only their working out again)."""

    def put(self, key, value):
        if len(self) >= REMEMBERED_KEPT:
            self.clear()
        self[key] = value
        return value


_PLACEMENTS: Remembered = Remembered()


def placement(inp: BeamInput, code: DesignCode, bars: BarArrangement, face: Literal["top", "bottom"],
              explicit: float | None = None) -> tuple[PlacedBars, ...]:
    """A span's bars placed below a face (:func:`~beamsched.section.place_bars`, with the span's
    cover, stirrups and layer spacing; ``explicit``: a scheduled depth below the face).

    The placement depends only on those values, and a schedule repeats the same bars, covers and
    stirrups from span to span: each distinct placement is worked out once and remembered."""
    cover = inp.cover_top if face == "top" else inp.cover_bottom
    stirrup_db = inp.stirrups.bar.db if inp.stirrups else 0.0
    key = (bars, cover, stirrup_db, inp.layer_clear, inp.agg, explicit, code)
    placed = _PLACEMENTS.get(key)
    if placed is None:
        def clear(db_below: float, db_above: float) -> float:
            if inp.layer_clear is not None:
                return inp.layer_clear
            return code.bar_clear_spacing(max(db_below, db_above), inp.agg)

        placed = _PLACEMENTS.put(key, place_bars(bars, cover, stirrup_db, clear, explicit))
    return placed


class SpanContext:
    """``tracing=False`` runs every check without keeping its calculation trace (a whole
    schedule keeps only results; the trace is worked out again when a writer reads it, see
    :class:`beamsched.engine.LazyTrace`). The checks make the same numbers either way: trace
    lines are only ever written, never read back by a check."""

    def __init__(self, inp: BeamInput, code: DesignCode, tracing: bool = True,
                 roots: dict[tuple, float] | None = None):
        self.inp = inp
        # what an earlier run of the same checks found by searching ({(sense, location): c} and
        # {(sense, location, Mf): As,req}): a trace worked out again starts from them
        self.roots = roots or {}
        self.code = code
        self.tracing = tracing
        self.phi_c = code.phi_c(inp.precast)
        self.phi_s = code.phi_s()
        self.block = code.stress_block(inp.fc)
        self.trace: list[TraceLine] = []
        self.values: dict[str, float | str | None] = {}
        self.understood: dict[str, str] = {}
        self.results: list[tuple] = []  # each a CheckResult's fields, in order (see result)
        self._flexure: dict[tuple[Sense, Location], FlexureCase | str] = {}
        self.cases: list[tuple[Sense, Location]] | None = None  # see checks.flexure.cases
        self.shear: object | None = None  # this span's part of checks.shear.prepare's columns
        # As,req by (sense, location, Mf): see checks.flexure.required_steel
        self.required: dict[tuple[Sense, Location, float], float] = {}
        self._strengths: tuple[float, float, float, float, float, float] | None = None  # see flexure_strengths
        self.flange: FlangeWidth | None = None
        bf = None
        if inp.shape in ("T", "L") and inp.hf is not None:
            self.flange = code.effective_flange_width(
                inp.shape, inp.bw, inp.hf, inp.bf, inp.span or inp.clear_span,
                inp.clear_to_next_web, self.continuous,
            )
            bf = self.flange.bf
        self.section = Section(inp.shape, inp.bw, inp.h, inp.hf, bf)

    # -- shared quantities -------------------------------------------------------------
    @property
    def continuous(self) -> bool:
        """True when either end is continuous or free (the conservative reading for
        cantilevers and one-end-continuous spans, where flange width limits differ)."""
        return self.inp.left_end != "simple" or self.inp.right_end != "simple"

    @property
    def stirrup_db(self) -> float:
        return self.inp.stirrups.bar.db if self.inp.stirrups else 0.0

    def place(self, bars: BarArrangement, face: Literal["top", "bottom"], tension: bool) -> tuple[PlacedBars, ...]:
        """Bars at a face, depths below that face; an explicit d applies to tension bars."""
        inp = self.inp
        explicit = None
        if tension:
            d = inp.d_bottom if face == "bottom" else inp.d_top
            explicit = None if d is None else inp.h - d
        return placement(inp, self.code, bars, face, explicit)

    def add_trace(self, check: str, location: Location, symbol: str, value, unit: str, clause: str, description: str) -> None:
        if self.tracing:
            self.trace.append(TraceLine(check, location, symbol, value, unit, clause, description))

    def result(self, id: str, label: str, location: Location, clause: str, status: CheckStatus, message: str,
               demand: float | None = None, capacity: float | None = None, unit: str = "",
               utilisation: float | None = None, required: bool = True) -> None:
        """Add one check's result (the fields of a :class:`CheckResult`, in its order).

        A span's results are kept as rows of those fields: a whole schedule's are packed
        (:class:`~beamsched.model.PackedChecks`) and made into objects only when read. The same
        note recurs across a schedule (a few thousand distinct texts in 280,000 results for
        10,000 spans): one shared copy of each keeps a building's results small."""
        self.results.append((id, label, location, clause, status, sys.intern(message), demand, capacity, unit,
                             utilisation, required))

    def checks(self) -> tuple[CheckResult, ...]:
        """The results added so far, as objects."""
        return tuple(CheckResult(*row) for row in self.results)

    # -- flexure ----------------------------------------------------------------------
    def bars_for(self, sense: Sense, location: Location) -> tuple[BarArrangement | None, BarArrangement | None, str]:
        """(tension bars, compression bars, what the tension bars are called) for a case."""
        inp = self.inp
        if sense == "pos":
            if location == "mid":
                return inp.bottom_bars, inp.top_bars_mid, "bottom bars"
            return inp.bottom_bars_support, inp.top_bars_at(location), "bottom bars at the support"  # type: ignore[arg-type]
        if location == "mid":
            raise ValueError("hogging is checked at the supports")
        return inp.top_bars_at(location), inp.bottom_bars_support, f"top bars at the {location} support"  # type: ignore[arg-type]

    def flexure(self, sense: Sense, location: Location) -> FlexureCase | str:
        """The flexural solution at a location, or the reason there is none."""
        key = (sense, location)
        if key not in self._flexure:
            solve_cases([(self, key)])
        return self._flexure[key]

    def flexure_strengths(self) -> tuple[float, float, float, float, float, float]:
        """The strengths and factors of this span's flexural sections, as the solver's columns
        take them: α1 φc f'c, fy, φs, Es, β1, εcu."""
        held = self._strengths
        if held is None:
            block = self.block
            held = self._strengths = (block.alpha1 * self.phi_c * self.inp.fc, self.inp.fy, self.phi_s, self.code.Es,
                                      block.beta1, block.eps_cu)
        return held

    def _prepare(self, sense: Sense, location: Location
                 ) -> tuple[BarArrangement, BarArrangement | None, CaseOutline, CaseBars] | str:
        """What the solver needs for a case (tension bars, compression bars, the outline seen from
        the compression face and the bars as the solver sees them), or the reason there is no case."""
        inp = self.inp
        tension, compression, name = self.bars_for(sense, location)
        if tension is None:
            return f"no {name} scheduled"
        comp_face = "top" if sense == "pos" else "bottom"
        tens_face = "bottom" if sense == "pos" else "top"
        t_placed = self.place(tension, tens_face, tension=True)
        c_placed = self.place(compression, comp_face, tension=False) if compression else ()
        return (tension, compression, case_outline(self.section, comp_face),
                case_bars(t_placed, c_placed, inp.h, inp.stirrups is not None))


_OUTLINES: Remembered = Remembered()


def case_outline(section: Section, comp_face: Literal["top", "bottom"]) -> CaseOutline:
    """A section seen from its compression face. Each distinct one is made once and remembered
    (up to :data:`REMEMBERED_KEPT`; keyed by the section's values, as a plain tuple: cheaper to
    hash and compare than the section itself)."""
    key = (comp_face, section.shape, section.bw, section.h, section.hf, section.bf)
    held = _OUTLINES.get(key)
    if held is None:
        outline = section.outline_from(comp_face)
        held = _OUTLINES.put(key, CaseOutline(comp_face, outline, outline_rows(outline)))
    return held


_SOLVER_BARS: Remembered = Remembered()


def case_bars(t_placed: tuple[PlacedBars, ...], c_placed: tuple[PlacedBars, ...], h: float, tied: bool) -> CaseBars:
    """The bars of a flexural case as the solver sees them (:func:`solver_bars`), with d and the
    tension steel's first moment. Placements are shared (:func:`placement`), so each distinct
    case is made once and remembered (up to :data:`REMEMBERED_KEPT`); an entry holds the
    placements whose ids its key uses, so those ids stay theirs."""
    key = (id(t_placed), id(c_placed), h, tied)
    held = _SOLVER_BARS.get(key)
    if held is None:
        bars = solver_bars(t_placed, c_placed, h, tied)
        held = _SOLVER_BARS.put(key, CaseBars(t_placed, c_placed, tied, bars, h - centroid_depth(t_placed),
                                              tension_moment(bars), bar_rows(bars)))
    return held


def solver_bars(t_placed: tuple[PlacedBars, ...], c_placed: tuple[PlacedBars, ...], h: float,
                tied: bool) -> tuple[SolverBar, ...]:
    """The bars of a flexural case as the solver sees them, by depth below the compression face:
    the tension bars (placed below the tension face, in a section h deep) and the compression
    bars (counted only when ``tied``)."""
    return tuple(
        SolverBar(p.area, h - p.depth, p.db, f"{p.count}-{p.size} layer {p.layer}", True, True)
        for p in t_placed
    ) + tuple(
        SolverBar(p.area, p.depth, p.db, f"{p.count}-{p.size} layer {p.layer} (compression)", tied, False)
        for p in c_placed
    )


def solve_cases(wanted: Iterable[tuple[SpanContext, tuple[Sense, Location]]]) -> None:
    """Solve the flexural cases of many spans at once (one set of columns, one solve: see
    :mod:`beamsched.solve.flexure`) and keep each in its span's context. A case already solved
    is not solved again; one without tension bars keeps the reason."""
    todo_ctx: list[SpanContext] = []
    todo_key: list[tuple[Sense, Location]] = []
    todo_bars: list[tuple[BarArrangement, BarArrangement | None]] = []
    todo_shape: list[CaseOutline] = []
    todo_steel: list[CaseBars] = []
    asked: set[tuple[int, tuple[Sense, Location]]] = set()  # the same case asked for twice is solved once
    for ctx, key in wanted:
        mark = (id(ctx), key)
        if key in ctx._flexure or mark in asked:
            continue
        asked.add(mark)
        prepared = ctx._prepare(*key)
        if isinstance(prepared, str):
            ctx._flexure[key] = prepared
        else:
            todo_ctx.append(ctx)
            todo_key.append(key)
            todo_bars.append(prepared[:2])
            todo_shape.append(prepared[2])
            todo_steel.append(prepared[3])
    if not todo_ctx:
        return
    fcd, fy, phi_s, Es, beta1, eps_cu = zip(*[ctx.flexure_strengths() for ctx in todo_ctx], strict=True)
    columns = SectionColumns.of_rows([shape.rows for shape in todo_shape], [steel.rows for steel in todo_steel],
                                     fcd, fy, phi_s, Es, beta1, eps_cu)
    known = [ctx.roots.get(key) for ctx, key in zip(todo_ctx, todo_key, strict=True)] if any(
        ctx.roots for ctx in todo_ctx) else []
    solved = solve_columns(columns, None if not any(v is not None for v in known) else
                           np.array([np.nan if v is None else v for v in known]))
    mr, area, depth = solved.Mr.tolist(), solved.As.tolist(), solved.c.tolist()
    for i, (ctx, key, (tension, compression), shape, steel) in enumerate(
            zip(todo_ctx, todo_key, todo_bars, todo_shape, todo_steel, strict=True)):
        d_solved = tension_centroid(steel.bars, area[i], steel.moment)
        ctx._flexure[key] = FlexureCase(
            key[0], key[1], tension, compression, shape, steel, mr[i], area[i], depth[i],  # type: ignore[arg-type]
            depth[i] / d_solved if d_solved > 0 else math.inf, columns, solved, i, ctx.block.alpha1)
