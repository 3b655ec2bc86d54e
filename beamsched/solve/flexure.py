"""Flexural resistance by strain compatibility with an equivalent rectangular stress block.

One solver for every case. The caller describes the section as seen from its compression face
(the outline as bands, the bars by depth below that face) with the factored material strengths;
sagging and hogging differ only in which face is on top. The solver finds the neutral-axis depth
c at which the forces balance, with the concrete crushing strain at the compression face, each
bar at its own strain (stress capped at fy, never assumed to yield), and returns the resistance
with every intermediate value the trace needs.

Sign convention: forces in compression are positive; depths grow from the compression face.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..section import Rect
from .roots import bracketed_root

__all__ = ["SolverBar", "FlexureSolution", "BarState", "solve_flexure", "moment_resistance"]


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


def _block(outline: tuple[Rect, ...], a: float) -> tuple[float, float]:
    """Area of the outline above depth a and its first moment about the compression face."""
    area = moment = 0.0
    for r in outline:
        top, bottom = r.y0, min(r.y1, a)
        if bottom <= top:
            break
        band = r.width * (bottom - top)
        area += band
        moment += band * (top + bottom) / 2
    return area, moment


def _covered(top: float, db: float, depth: float, a: float) -> float:
    """Fraction of a round bar's area lying above depth a (the circular segment), so that the
    concrete a bar displaces enters the balance smoothly as the block edge crosses it. ``top``
    is the depth of the bar's top (depth - db/2); a bar of no diameter counts whole or not at all."""
    if db <= 0:
        return 1.0 if depth < a else 0.0
    t = (a - top) / db
    if t <= 0.0:
        return 0.0
    if t >= 1.0:
        return 1.0
    theta = 2.0 * math.acos(1.0 - 2.0 * t)
    return (theta - math.sin(theta)) / (2.0 * math.pi)


def _overlap(bar: SolverBar, a: float) -> float:
    return _covered(bar.depth - bar.db / 2, bar.db, bar.depth, a)


def _displaced_scale(bars: tuple[SolverBar, ...], a: float, block_area: float) -> float:
    """Factor (<= 1) on the concrete the bars displace, so that together they never displace
    more concrete than the stress block holds. It is 1 for any section whose bars fit; only
    bars scheduled in more area than the concrete around them (a failed bar-fit check) reach it."""
    displaced = sum(b.area * _overlap(b, a) for b in bars)
    return 1.0 if displaced <= block_area else block_area / displaced


def _bar_force(b: SolverBar, c: float, a: float, k: float, fcd: float, fy: float, phi_s: float, Es: float,
               eps_cu: float) -> tuple[float, float, float, float]:
    """One bar at neutral-axis depth c: (strain, stress capped at fy and zero for an untied bar,
    force phi_s As fs less the concrete it displaces, that displaced concrete scaled by k: see
    _displaced_scale)."""
    strain = eps_cu * (c - b.depth) / c
    stress = max(-fy, min(fy, Es * strain)) if b.counted else 0.0
    displaced = k * fcd * b.area * _overlap(b, a)
    return strain, stress, phi_s * b.area * stress - displaced, displaced


def _bar_state(b: SolverBar, c: float, a: float, k: float, fcd: float, fy: float, phi_s: float, Es: float,
               eps_cu: float) -> BarState:
    return BarState(b, *_bar_force(b, c, a, k, fcd, fy, phi_s, Es, eps_cu))


def _neutral_axis(
    outline: tuple[Rect, ...], bars: tuple[SolverBar, ...], fcd: float, fy: float, phi_s: float, Es: float,
    beta1: float, eps_cu: float, fyd: float, As: float,
) -> float:
    """The neutral-axis depth c (mm) at which the forces balance (the one root-find of the solver)."""
    h = max(r.y1 for r in outline)
    bands = tuple((r.y0, r.y1, r.width) for r in outline)
    # per bar: area, depth, top of the bar (where the block edge starts to reach it), diameter, counted
    steel = tuple((b.area, b.depth, b.depth - b.db / 2, b.db, b.counted) for b in bars)

    def imbalance(c: float) -> float:
        """Net compression (N) at neutral-axis depth c; increases with c. (The solver's inner
        loop: each bar's stress written out here, without the state a trace needs.)"""
        a = beta1 * c
        area = 0.0
        for y0, y1, width in bands:  # _block's area
            bottom = y1 if y1 < a else a
            if bottom <= y0:
                break
            area += width * (bottom - y0)
        total = fcd * area
        displaced = 0.0
        for area_i, depth, top, db, counted in steel:
            if counted:
                stress = Es * (eps_cu * (c - depth) / c)
                total += phi_s * area_i * (fy if stress > fy else (-fy if stress < -fy else stress))
            if a > top:
                displaced += area_i * _covered(top, db, depth, a)
        return total - fcd * (displaced if displaced < area else area)

    lo, hi = 1e-9 * h, h
    f_lo, f_hi = imbalance(lo), imbalance(hi)
    while f_hi < 0:  # grows only for sections with more steel than concrete can balance
        lo, f_lo = hi, f_hi
        hi *= 2
        if hi > 1e3 * h:
            raise ArithmeticError("no neutral axis balances the forces")
        f_hi = imbalance(hi)
    return bracketed_root(imbalance, lo, hi, f_lo, f_hi, tol_f=1e-9 * fyd * As, tol_x=1e-12 * h)


def moment_resistance(
    outline: tuple[Rect, ...],
    bars: tuple[SolverBar, ...],
    *,
    fc: float,
    fy: float,
    phi_c: float,
    phi_s: float,
    Es: float,
    alpha1: float,
    beta1: float,
    eps_cu: float,
) -> float:
    """The factored resistance Mr (N·mm) alone: :func:`solve_flexure`'s ``Mr``, the same
    neutral axis and the same arithmetic, without building the states a trace needs (for
    callers that solve many times, such as the steel required for a moment)."""
    fcd = alpha1 * phi_c * fc
    fyd = phi_s * fy
    As = sum(b.area for b in bars if b.tension_steel)
    if As <= 0:
        return 0.0
    c = _neutral_axis(outline, bars, fcd, fy, phi_s, Es, beta1, eps_cu, fyd, As)
    a = beta1 * c
    area, first = _block(outline, a)
    Cc = fcd * area
    yc = first / area if area > 0 else 0.0
    k = _displaced_scale(bars, a, area)
    moment = sum(_bar_force(b, c, a, k, fcd, fy, phi_s, Es, eps_cu)[2] * b.depth for b in bars)
    return max(-(Cc * yc + moment), 0.0)


def solve_flexure(
    outline: tuple[Rect, ...],
    bars: tuple[SolverBar, ...],
    *,
    fc: float,
    fy: float,
    phi_c: float,
    phi_s: float,
    Es: float,
    alpha1: float,
    beta1: float,
    eps_cu: float,
) -> FlexureSolution:
    """Find c such that the forces balance, and the factored resistance Mr (N·mm)."""
    fcd = alpha1 * phi_c * fc  # stress-block intensity
    fyd = phi_s * fy
    tension = [b for b in bars if b.tension_steel]
    As = sum(b.area for b in tension)
    d = sum(b.area * b.depth for b in tension) / As if As > 0 else 0.0

    def states(c: float) -> tuple[float, float, float, list[BarState]]:
        a = beta1 * c
        area, first = _block(outline, a)
        k = _displaced_scale(bars, a, area)
        return a, area, first, [_bar_state(b, c, a, k, fcd, fy, phi_s, Es, eps_cu) for b in bars]

    trial_a = fyd * As / (fcd * outline[0].width) if As > 0 else 0.0
    if As <= 0:
        return FlexureSolution(
            0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, (), 0.0, True, True,
            alpha1, beta1, eps_cu, fcd, fyd, 0.0, 0.0,
        )
    c = _neutral_axis(outline, bars, fcd, fy, phi_s, Es, beta1, eps_cu, fyd, As)
    a, area, first, st = states(c)
    Cc = fcd * area
    yc = first / area if area > 0 else 0.0
    comp = [(s.force, s.bar.depth) for s in st if s.force > 0]
    tens = [(-s.force, s.bar.depth) for s in st if s.force < 0]
    C_total = Cc + sum(f for f, _ in comp)
    y_C = (Cc * yc + sum(f * y for f, y in comp)) / C_total if C_total > 0 else 0.0
    T = sum(f for f, _ in tens)
    y_T = sum(f * y for f, y in tens) / T if T > 0 else 0.0
    # Never below zero: only a physically impossible layout (bars over-filling the concrete
    # round them) could make the internal couple act the wrong way; it then resists nothing.
    Mr = max(-(Cc * yc + sum(s.force * s.bar.depth for s in st)), 0.0)
    residual = Cc + sum(s.force for s in st)
    return FlexureSolution(
        Mr=Mr, c=c, a=a, d=d, Cc=Cc, yc=yc, block_area=area, C_total=C_total, y_C=y_C, T=T,
        y_T=y_T, lever_arm=y_T - y_C, bars=tuple(st), trial_a=trial_a,
        trial_in_first_band=trial_a <= outline[0].y1, block_in_first_band=a <= outline[0].y1,
        alpha1=alpha1, beta1=beta1, eps_cu=eps_cu, fc_factored=fcd, fy_factored=fyd, As=As,
        residual=residual,
    )
