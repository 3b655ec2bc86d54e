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
    FlexureSolution,
    SectionColumns,
    SolvedColumns,
    SolverBar,
    solution_of,
    solve_columns,
    tension_centroid,
)

Sense = Literal["pos", "neg"]
End = Literal["left", "right"]

N_PER_KN = 1e3
NMM_PER_KNM = 1e6


@dataclass(frozen=True, slots=True)
class FlexureCase:
    """One flexural section: which bars are in tension and compression, and its solution.

    The checks read ``Mr``, ``As``, ``c`` and ``c_over_d``; the whole :attr:`solution` (every
    bar's state, the forces and where they act) is made from the solved columns only when first
    read, by the trace."""

    sense: Sense
    location: Location
    compression_face: Literal["top", "bottom"]
    tension_bars: BarArrangement
    tension_placed: tuple[PlacedBars, ...]  # depths below the tension face
    compression_bars: BarArrangement | None
    compression_placed: tuple[PlacedBars, ...]  # depths below the compression face
    compression_tied: bool
    d: float  # depth of the tension-steel centroid below the compression face (mm)
    Mr: float  # N·mm, factored resistance
    As: float  # area of the flexural tension steel (mm²)
    c: float  # neutral-axis depth (mm)
    c_over_d: float  # c over the solver's d (the tension steel's centroid, as solved)
    columns: SectionColumns  # the sections it was solved with, and its row there (for As,req)
    solved: SolvedColumns
    row: int
    outline: tuple[Rect, ...]
    bars: tuple[SolverBar, ...]
    alpha1: float
    _solution: list = field(default_factory=list, repr=False, compare=False)

    @property
    def solution(self) -> FlexureSolution:
        if not self._solution:
            self._solution.append(solution_of(self.columns, self.solved, self.row, self.outline, self.bars,
                                              self.alpha1))
        return self._solution[0]


_PLACEMENTS: dict[tuple, tuple[PlacedBars, ...]] = {}
PLACEMENTS_KEPT = 4096  # distinct placements remembered (a building repeats a few hundred)


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

        if len(_PLACEMENTS) >= PLACEMENTS_KEPT:
            _PLACEMENTS.clear()
        placed = _PLACEMENTS[key] = place_bars(bars, cover, stirrup_db, clear, explicit)
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

    def add(self, result: CheckResult) -> None:
        """Add a result made as a :class:`CheckResult` (as :meth:`result`)."""
        self.result(result.id, result.label, result.location, result.clause, result.status, result.message,
                    result.demand, result.capacity, result.unit, result.utilisation, result.required)

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

    def _prepare(self, sense: Sense, location: Location) -> tuple | str:
        """What the solver needs for a case (its bars as seen from the compression face), or
        the reason there is no case."""
        inp = self.inp
        tension, compression, name = self.bars_for(sense, location)
        if tension is None:
            return f"no {name} scheduled"
        comp_face = "top" if sense == "pos" else "bottom"
        tens_face = "bottom" if sense == "pos" else "top"
        t_placed = self.place(tension, tens_face, tension=True)
        c_placed = self.place(compression, comp_face, tension=False) if compression else ()
        tied = inp.stirrups is not None
        return (comp_face, tension, t_placed, compression, c_placed, tied, self.section.outline_from(comp_face),
                solver_bars(t_placed, c_placed, inp.h, tied))


_SOLVER_BARS: dict[tuple, tuple] = {}


def solver_bars(t_placed: tuple[PlacedBars, ...], c_placed: tuple[PlacedBars, ...], h: float,
                tied: bool) -> tuple[SolverBar, ...]:
    """The bars of a flexural case as the solver sees them, by depth below the compression face:
    the tension bars (placed below the tension face, in a section h deep) and the compression
    bars (counted only when ``tied``). Placements are shared (:func:`placement`), so each
    distinct case is made once; an entry holds its placements, so their ids stay theirs."""
    key = (id(t_placed), id(c_placed), h, tied)
    held = _SOLVER_BARS.get(key)
    if held is not None:
        return held[2]
    bars = tuple(
        SolverBar(p.area, h - p.depth, p.db, f"{p.count}-{p.size} layer {p.layer}", True, True)
        for p in t_placed
    ) + tuple(
        SolverBar(p.area, p.depth, p.db, f"{p.count}-{p.size} layer {p.layer} (compression)", tied, False)
        for p in c_placed
    )
    if len(_SOLVER_BARS) >= PLACEMENTS_KEPT:
        _SOLVER_BARS.clear()
    _SOLVER_BARS[key] = (t_placed, c_placed, bars)
    return bars


def solve_cases(wanted: Iterable[tuple[SpanContext, tuple[Sense, Location]]]) -> None:
    """Solve the flexural cases of many spans at once (one set of columns, one solve: see
    :mod:`beamsched.solve.flexure`) and keep each in its span's context. A case already solved
    is not solved again; one without tension bars keeps the reason."""
    todo: list[tuple[SpanContext, tuple[Sense, Location], tuple]] = []
    asked: set[tuple[int, tuple[Sense, Location]]] = set()  # the same case asked for twice is solved once
    for ctx, key in wanted:
        if key in ctx._flexure or (id(ctx), key) in asked:
            continue
        asked.add((id(ctx), key))
        prepared = ctx._prepare(*key)
        if isinstance(prepared, str):
            ctx._flexure[key] = prepared
        else:
            todo.append((ctx, key, prepared))
    if not todo:
        return
    columns = SectionColumns.stack(
        [(p[6], p[7]) for _, _, p in todo],
        fcd=[c.block.alpha1 * c.phi_c * c.inp.fc for c, _, _ in todo], fy=[c.inp.fy for c, _, _ in todo],
        phi_s=[c.phi_s for c, _, _ in todo], Es=[c.code.Es for c, _, _ in todo],
        beta1=[c.block.beta1 for c, _, _ in todo], eps_cu=[c.block.eps_cu for c, _, _ in todo],
    )
    known = [ctx.roots.get(key) for ctx, key, _ in todo]
    solved = solve_columns(columns, None if not any(v is not None for v in known) else
                           np.array([np.nan if v is None else v for v in known]))
    mr, area, depth = solved.Mr.tolist(), solved.As.tolist(), solved.c.tolist()
    for i, (ctx, (sense, location), p) in enumerate(todo):
        comp_face, tension, t_placed, compression, c_placed, tied, outline, bars = p
        d_solved = tension_centroid(bars, area[i])
        ctx._flexure[(sense, location)] = FlexureCase(
            sense, location, comp_face, tension, t_placed, compression, c_placed, tied,
            ctx.inp.h - centroid_depth(t_placed), mr[i], area[i], depth[i],
            depth[i] / d_solved if d_solved > 0 else math.inf, columns, solved, i, outline, bars, ctx.block.alpha1)
