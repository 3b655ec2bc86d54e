"""Flexural resistance by strain compatibility with an equivalent rectangular stress block.

One solver for every case, written over columns: row i of a :class:`SectionColumns` is one
flexural section, so a whole schedule's sections are solved at once and one section is the same
code on columns of length one. Each row is described as seen from its compression face (the
outline as bands, the bars by depth below that face) with the factored material strengths;
sagging and hogging differ only in which face is on top. The solver finds the neutral-axis
depth c at which the forces balance, with the concrete crushing strain at the compression face,
each bar at its own strain (stress capped at fy, never assumed to yield), and returns the
resistance with every intermediate value the trace needs.

Every row follows the same arithmetic, step for step, whatever else is in the columns: the root
finders iterate each row until that row has converged, and rows do not interact. So a span's
numbers are the same solved alone or with a building's other sections.

Sign convention: forces in compression are positive; depths grow from the compression face.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

import numpy as np

from ..section import Rect
from .roots import bracketed_roots

__all__ = [
    "SolverBar", "FlexureSolution", "BarState", "SectionColumns", "SolvedColumns", "solve_columns",
    "resistance_columns", "required_scale", "solution_of", "tension_centroid", "tension_moment", "OutlineRows",
    "BarRows", "outline_rows", "bar_rows",
]

TWO_PI = 2.0 * math.pi
MAX_SCALE = 64.0  # the tension steel is scaled up to 64x in search of a moment before the concrete is said to govern


@dataclass(frozen=True, slots=True)
class SolverBar:
    area: float  # mm²
    depth: float  # centre below the compression face (mm)
    db: float  # diameter (mm): the band of concrete it displaces
    label: str
    counted: bool = True  # False: an untied compression bar, carrying no stress
    tension_steel: bool = True  # True: part of the flexural tension steel (for d and c/d)


@dataclass(frozen=True, slots=True)
class BarState:
    bar: SolverBar
    strain: float  # compression positive
    stress: float  # MPa, compression positive, |fs| <= fy
    force: float  # N: phi_s As fs less the displaced concrete, compression positive
    displaced: float  # N: concrete force deducted for the area the bar displaces


@dataclass(frozen=True, slots=True)
class FlexureSolution:
    Mr: float  # N·mm, factored resistance
    c: float  # neutral-axis depth (mm)
    a: float  # stress-block depth beta1 c (mm)
    d: float  # depth of the centroid of the flexural tension steel (mm)
    Cc: float  # concrete compression force (N)
    yc: float  # depth of its centroid below the compression face (mm)
    block_area: float  # area of the stress block (mm²)
    C_total: float  # all compression, concrete and steel (N)
    y_C: float  # where the total compression acts (mm)
    T: float  # all tension (N)
    y_T: float  # where the tension acts (mm)
    lever_arm: float  # y_T - y_C (mm)
    bars: tuple[BarState, ...]
    trial_a: float  # flange-only trial: a with all tension steel yielding, first band wide
    trial_in_first_band: bool
    block_in_first_band: bool
    alpha1: float
    beta1: float
    eps_cu: float
    fc_factored: float  # alpha1 phi_c f'c (MPa)
    fy_factored: float  # phi_s fy (MPa)
    As: float  # area of the flexural tension steel (mm²)
    residual: float  # force imbalance at the solution (N)

    @property
    def c_over_d(self) -> float:
        return self.c / self.d if self.d > 0 else math.inf


BAND_FIELDS = 3  # y0, y1, width
STEEL_FIELDS = 5  # area, depth, db, counted, tension steel


@dataclass(frozen=True, slots=True)
class OutlineRows:
    """An outline's rows of :class:`SectionColumns`, flat and not yet padded: y0, y1, width of
    each band, with h, the depth a missing band is padded at."""

    values: tuple[float, ...]
    n: int
    h: float


@dataclass(frozen=True, slots=True)
class BarRows:
    """A section's bars as rows of :class:`SectionColumns`, flat and not yet padded: area,
    depth, db, counted, tension steel of each (the two flags as 1.0 or 0.0)."""

    values: tuple[float, ...]
    n: int


def outline_rows(outline: tuple[Rect, ...]) -> OutlineRows:
    """The rows of an outline in :class:`SectionColumns`."""
    return OutlineRows(tuple(v for r in outline for v in (r.y0, r.y1, r.width)), len(outline),
                       max(r.y1 for r in outline))


def bar_rows(bars: tuple[SolverBar, ...]) -> BarRows:
    """The rows of a section's bars in :class:`SectionColumns`."""
    return BarRows(tuple(v for b in bars for v in (b.area, b.depth, b.db, 1.0 if b.counted else 0.0,
                                                   1.0 if b.tension_steel else 0.0)), len(bars))


@dataclass(frozen=True, slots=True)
class SectionColumns:
    """Flexural sections as columns, one row per section, seen from its compression face.

    Bands (``y0``, ``y1``, ``width``: n x B) run down from the compression face; a section with
    fewer bands than B is padded with empty bands at its depth h. Bars (n x L) are padded with
    bars of no area, not counted and not tension steel. Strengths and factors are per row:
    ``fcd`` = α1 φc f'c and ``fy`` (MPa), ``phi_s``, ``Es`` (MPa), ``beta1``, ``eps_cu``."""

    y0: np.ndarray
    y1: np.ndarray
    width: np.ndarray
    area: np.ndarray
    depth: np.ndarray
    db: np.ndarray
    counted: np.ndarray  # bool
    tension: np.ndarray  # bool
    fcd: np.ndarray
    fy: np.ndarray
    phi_s: np.ndarray
    Es: np.ndarray
    beta1: np.ndarray
    eps_cu: np.ndarray

    @property
    def n(self) -> int:
        return len(self.fcd)

    @property
    def h(self) -> np.ndarray:
        return self.y1.max(axis=1)

    @property
    def top(self) -> np.ndarray:
        """Depth of each bar's top, where the block edge starts to reach it."""
        return self.depth - self.db / 2

    @staticmethod
    def stack(sections: Sequence[tuple[tuple[Rect, ...], tuple[SolverBar, ...]]], fcd: Sequence[float],
              fy: Sequence[float], phi_s: Sequence[float], Es: Sequence[float], beta1: Sequence[float],
              eps_cu: Sequence[float]) -> SectionColumns:
        """Columns of the sections given as (outline, bars), with per-section strengths."""
        return SectionColumns.of_rows([outline_rows(o) for o, _ in sections], [bar_rows(b) for _, b in sections],
                                      fcd, fy, phi_s, Es, beta1, eps_cu)

    @staticmethod
    def of_rows(outlines: Sequence[OutlineRows], bars: Sequence[BarRows], fcd: Sequence[float],
                fy: Sequence[float], phi_s: Sequence[float], Es: Sequence[float], beta1: Sequence[float],
                eps_cu: Sequence[float]) -> SectionColumns:
        """Columns of sections given by the rows of their outlines and bars (:func:`outline_rows`,
        :func:`bar_rows`: a section that recurs keeps its rows), with per-section strengths; each
        row padded as :meth:`stack` describes."""
        nb = max((r.n for r in outlines), default=1)
        nl = max((r.n for r in bars), default=1) or 1
        no_bar = (0.0,) * STEEL_FIELDS
        bands = [r.values if r.n == nb else r.values + (r.h, r.h, 0.0) * (nb - r.n) for r in outlines]
        steel = [r.values if r.n == nl else r.values + no_bar * (nl - r.n) for r in bars]
        b = np.array(bands, float).reshape(len(outlines), nb, BAND_FIELDS)
        st = np.array(steel, float).reshape(len(bars), nl, STEEL_FIELDS)
        y0, y1, width = b[:, :, 0].copy(), b[:, :, 1].copy(), b[:, :, 2].copy()
        area, depth, db = st[:, :, 0].copy(), st[:, :, 1].copy(), st[:, :, 2].copy()
        counted, tension = st[:, :, 3] != 0, st[:, :, 4] != 0
        col = np.asarray
        return SectionColumns(y0, y1, width, area, depth, db, counted, tension, col(fcd, float), col(fy, float),
                              col(phi_s, float), col(Es, float), col(beta1, float), col(eps_cu, float))

    def take(self, rows: np.ndarray) -> SectionColumns:
        return SectionColumns(*(getattr(self, f)[rows] for f in self.__slots__))  # type: ignore[attr-defined]

    def scaled(self, k: np.ndarray) -> SectionColumns:
        """The same sections with each row's tension steel scaled by k (its compression steel as it is)."""
        area = np.where(self.tension, self.area * k[:, None], self.area)
        return SectionColumns(self.y0, self.y1, self.width, area, self.depth, self.db, self.counted, self.tension,
                              self.fcd, self.fy, self.phi_s, self.Es, self.beta1, self.eps_cu)

    def tension_area(self) -> np.ndarray:
        """As, the area of the flexural tension steel (summed bar by bar, in order)."""
        total = np.zeros(self.n)
        for j in range(self.area.shape[1]):
            total = total + np.where(self.tension[:, j], self.area[:, j], 0.0)
        return total


def _block(s: SectionColumns, a: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Area of each outline above depth a and its first moment about the compression face."""
    area, moment = np.zeros(s.n), np.zeros(s.n)
    for j in range(s.y0.shape[1]):
        top, bottom = s.y0[:, j], np.minimum(s.y1[:, j], a)
        band = np.where(bottom > top, s.width[:, j] * (bottom - top), 0.0)
        area = area + band
        moment = moment + band * (top + bottom) / 2
    return area, moment


def _covered(top: np.ndarray, db: np.ndarray, depth: np.ndarray, a: np.ndarray) -> np.ndarray:
    """Fraction of each round bar's area lying above depth a (the circular segment), so that the
    concrete a bar displaces enters the balance smoothly as the block edge crosses it. ``top``
    is the depth of the bar's top (depth - db/2); a bar of no diameter counts whole or not at all."""
    with np.errstate(divide="ignore", invalid="ignore"):
        t = (a - top) / db
    theta = 2.0 * np.arccos(1.0 - 2.0 * np.clip(t, 0.0, 1.0))
    segment = np.where(t <= 0.0, 0.0, np.where(t >= 1.0, 1.0, (theta - np.sin(theta)) / TWO_PI))
    return np.where(db <= 0, np.where(depth < a, 1.0, 0.0), segment)


def _imbalance(s: SectionColumns, c: np.ndarray) -> np.ndarray:
    """Net compression (N) of each row at its neutral-axis depth c; increases with c."""
    a = s.beta1 * c
    area, _ = _block(s, a)
    total = s.fcd * area
    top = s.top
    displaced = np.zeros(s.n)
    for j in range(s.area.shape[1]):
        area_j = s.area[:, j]
        stress = s.Es * (s.eps_cu * (c - s.depth[:, j]) / c)
        capped = np.where(stress > s.fy, s.fy, np.where(stress < -s.fy, -s.fy, stress))
        total = total + np.where(s.counted[:, j], s.phi_s * area_j * capped, 0.0)
        displaced = displaced + area_j * _covered(top[:, j], s.db[:, j], s.depth[:, j], a)
    return total - s.fcd * np.where(displaced < area, displaced, area)


def _searching(s: SectionColumns) -> Callable[[np.ndarray], SectionColumns]:
    """The rows of s still searching, for a root finder's ``fn(x, rows)``: the rows only shrink
    as they converge, so the subset taken last is kept until fewer rows remain."""
    held: dict[int, SectionColumns] = {}

    def rows_of(rows: np.ndarray) -> SectionColumns:
        key = len(rows)
        sub = held.get(key)
        if sub is None:
            held.clear()
            sub = held[key] = s.take(rows) if key < s.n else s
        return sub

    return rows_of


def neutral_axis(s: SectionColumns) -> np.ndarray:
    """The neutral-axis depth c (mm) of each row at which its forces balance."""
    h = s.h
    As = s.tension_area()
    rows_of = _searching(s)

    def imbalance(c: np.ndarray, rows: np.ndarray) -> np.ndarray:
        return _imbalance(rows_of(rows), c)

    lo, hi = 1e-9 * h, h.copy()
    f_lo, f_hi = _imbalance(s, lo), _imbalance(s, hi)
    short = f_hi < 0  # grows only for sections with more steel than concrete can balance
    while short.any():
        lo, f_lo = np.where(short, hi, lo), np.where(short, f_hi, f_lo)
        hi = np.where(short, hi * 2, hi)
        if (hi > 1e3 * h).any():
            raise ArithmeticError("no neutral axis balances the forces")
        idx = np.flatnonzero(short)
        f_hi[idx] = _imbalance(s.take(idx), hi[idx])
        short = f_hi < 0
    return bracketed_roots(imbalance, lo, hi, f_lo, f_hi, tol_f=1e-9 * (s.phi_s * s.fy) * As, tol_x=1e-12 * h)


@dataclass(frozen=True, slots=True)
class SolvedColumns:
    """Each row's solution: the neutral axis, the stress block and each bar's state."""

    c: np.ndarray
    a: np.ndarray
    block_area: np.ndarray
    first_moment: np.ndarray
    Cc: np.ndarray
    yc: np.ndarray
    As: np.ndarray
    strain: np.ndarray  # n x L
    stress: np.ndarray
    force: np.ndarray
    displaced: np.ndarray
    Mr: np.ndarray  # N·mm


def _states(s: SectionColumns, c: np.ndarray, As: np.ndarray) -> SolvedColumns:
    """Everything at neutral-axis depth c: the block, each bar's strain, stress and force."""
    a = s.beta1 * c
    area, first = _block(s, a)
    Cc = s.fcd * area
    with np.errstate(divide="ignore", invalid="ignore"):
        yc = np.where(area > 0, first / area, 0.0)
    overlap = _covered(s.top, s.db, s.depth, a[:, None])
    # the bars never displace more concrete than the block holds: a factor k <= 1 on what they
    # displace, 1 for any section whose bars fit (only bars over-filling the concrete reach it)
    displaced_area = np.zeros(s.n)
    for j in range(s.area.shape[1]):
        displaced_area = displaced_area + s.area[:, j] * overlap[:, j]
    with np.errstate(divide="ignore", invalid="ignore"):
        k = np.where(displaced_area <= area, 1.0, area / displaced_area)
    with np.errstate(divide="ignore", invalid="ignore"):
        strain = s.eps_cu[:, None] * (c[:, None] - s.depth) / c[:, None]
    fy = s.fy[:, None]
    # stress capped at fy; an untied compression bar (not counted) carries none
    stress = np.where(s.counted, np.maximum(-fy, np.minimum(fy, s.Es[:, None] * strain)), 0.0)
    displaced = k[:, None] * s.fcd[:, None] * s.area * overlap
    force = s.phi_s[:, None] * s.area * stress - displaced
    moment = np.zeros(s.n)
    for j in range(s.area.shape[1]):
        moment = moment + force[:, j] * s.depth[:, j]
    # Never below zero: only a physically impossible layout (bars over-filling the concrete
    # round them) could make the internal couple act the wrong way; it then resists nothing.
    Mr = np.maximum(-(Cc * yc + moment), 0.0)
    return SolvedColumns(c, a, area, first, Cc, yc, As, strain, stress, force, displaced, Mr)


def solve_columns(s: SectionColumns, known_c: np.ndarray | None = None) -> SolvedColumns:
    """Every row solved: c where the forces balance, then the states and Mr there. A row with no
    tension steel has no solution: its Mr and c are 0. ``known_c``: where finite, the neutral
    axis this solver found for the row before (a trace worked out again is made at the root
    the checks found, without searching for it again)."""
    As = s.tension_area()
    some = As > 0
    search = some if known_c is None else some & ~np.isfinite(known_c)
    c = np.zeros(s.n) if known_c is None else np.where(np.isfinite(known_c), known_c, 0.0)
    if search.all():
        c = neutral_axis(s)
    elif search.any():
        idx = np.flatnonzero(search)
        c[idx] = neutral_axis(s.take(idx))
    solved = _states(s, np.where(some, c, 1.0), As)
    if some.all():
        return solved
    none = ~some
    zero = {f: np.where(none if getattr(solved, f).ndim == 1 else none[:, None], 0.0, getattr(solved, f))
            for f in SolvedColumns.__slots__ if f != "As"}  # type: ignore[attr-defined]
    return SolvedColumns(As=As, **zero)


def resistance_columns(s: SectionColumns) -> np.ndarray:
    """Each row's factored resistance Mr (N·mm)."""
    return solve_columns(s).Mr


def required_scale(s: SectionColumns, Mr: np.ndarray, mf: np.ndarray) -> np.ndarray:
    """For each row, the factor k on its tension steel (at the same positions) at which Mr = Mf,
    found on the strain-compatibility solver (not by ratio); ``Mr`` is the row's resistance as
    scheduled (k = 1). 0 where Mf <= 0; inf where no amount of this steel up to 64 times what is
    scheduled reaches Mf (the concrete governs)."""
    n = s.n
    out = np.zeros(n)
    mf = np.asarray(mf, float)
    live = np.flatnonzero(mf > 0)
    if not len(live):
        return out
    s, mf, Mr = s.take(live), mf[live], np.asarray(Mr, float)[live]
    lo, hi, f_lo, f_hi = np.zeros(len(live)), np.ones(len(live)), -mf, Mr - mf
    hopeless = np.zeros(len(live), bool)
    short = f_hi < 0
    while short.any():
        lo, f_lo = np.where(short, hi, lo), np.where(short, f_hi, f_lo)
        hi = np.where(short, hi * 2, hi)
        hopeless |= short & (hi > MAX_SCALE)
        short &= ~hopeless
        idx = np.flatnonzero(short)
        if len(idx):
            f_hi[idx] = resistance_columns(s.take(idx).scaled(hi[idx])) - mf[idx]
        short = (f_hi < 0) & ~hopeless
    search = np.flatnonzero(~hopeless)
    k = np.full(len(live), math.inf)
    if len(search):
        sub_mf = mf[search]
        rows_of = _searching(s.take(search))

        def gap(x: np.ndarray, rows: np.ndarray) -> np.ndarray:
            return resistance_columns(rows_of(rows).scaled(x)) - sub_mf[rows]

        k[search] = bracketed_roots(gap, lo[search], hi[search], f_lo[search], f_hi[search],
                                    tol_f=1e-7 * sub_mf, tol_x=np.full(len(search), 1e-9))
    out[live] = k
    return out


def tension_moment(bars: tuple[SolverBar, ...]) -> float:
    """The first moment of the flexural tension steel's area about the compression face (mm³)."""
    return sum(b.area * b.depth for b in bars if b.tension_steel)


def tension_centroid(bars: tuple[SolverBar, ...], As: float, moment: float | None = None) -> float:
    """d: the depth of the centroid of the flexural tension steel below the compression face
    (0 without tension steel); ``moment``: :func:`tension_moment` of the bars, if known."""
    if moment is None:
        moment = tension_moment(bars)
    return moment / As if As > 0 else 0.0


def solution_of(s: SectionColumns, solved: SolvedColumns, i: int, outline: tuple[Rect, ...],
                bars: tuple[SolverBar, ...], alpha1: float) -> FlexureSolution:
    """Row i of solved columns as one section's solution, with every value the trace shows."""
    fcd, fy, phi_s = float(s.fcd[i]), float(s.fy[i]), float(s.phi_s[i])
    beta1, eps_cu = float(s.beta1[i]), float(s.eps_cu[i])
    fyd = phi_s * fy
    As = float(solved.As[i])
    d = tension_centroid(bars, As)
    trial_a = fyd * As / (fcd * outline[0].width) if As > 0 else 0.0
    if As <= 0:
        return FlexureSolution(
            0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, (), 0.0, True, True,
            alpha1, beta1, eps_cu, fcd, fyd, 0.0, 0.0,
        )
    row = (solved.strain[i].tolist(), solved.stress[i].tolist(), solved.force[i].tolist(), solved.displaced[i].tolist())
    st = tuple(BarState(b, row[0][j], row[1][j], row[2][j], row[3][j]) for j, b in enumerate(bars))
    Cc, yc, a = float(solved.Cc[i]), float(solved.yc[i]), float(solved.a[i])
    comp = [(b.force, b.bar.depth) for b in st if b.force > 0]
    tens = [(-b.force, b.bar.depth) for b in st if b.force < 0]
    C_total = Cc + sum(f for f, _ in comp)
    y_C = (Cc * yc + sum(f * y for f, y in comp)) / C_total if C_total > 0 else 0.0
    T = sum(f for f, _ in tens)
    y_T = sum(f * y for f, y in tens) / T if T > 0 else 0.0
    residual = Cc + sum(b.force for b in st)
    return FlexureSolution(
        Mr=float(solved.Mr[i]), c=float(solved.c[i]), a=a, d=d, Cc=Cc, yc=yc, block_area=float(solved.block_area[i]),
        C_total=C_total, y_C=y_C, T=T, y_T=y_T, lever_arm=y_T - y_C, bars=st, trial_a=trial_a,
        trial_in_first_band=trial_a <= outline[0].y1, block_in_first_band=a <= outline[0].y1,
        alpha1=alpha1, beta1=beta1, eps_cu=eps_cu, fc_factored=fcd, fy_factored=fyd, As=As, residual=residual,
    )

