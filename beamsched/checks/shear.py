"""Shear checks at each end of a span (CSA A23.3-19, 11.2.8, 11.3): ``shear``, ``min_stirrups``,
``stirrup_spacing`` and ``long_steel_shear``.

The section at each end:
* the flexural tension steel there sets d and dv (cl. 2.3: dv = max(0.9 d, 0.72 h)): the top
  bars at a continuous or free end, or wherever an Mf- is scheduled; otherwise (a simple
  support) the bottom bars, those scheduled at the supports or else the midspan bottom bars,
  taken to run into the support;
* Vf is that end's scheduled shear, taken at the face (conservative: the clause allows the
  section at dv from the face);
* the simplified method (11.3.6.3) where f'c ≤ 60 MPa and fy ≤ 400 MPa, with no axial tension;
  else the general method (11.3.6.4) with εx from that end's scheduled moment, taken ≥ Vf·dv;
* stirrups count (Vs, and β = 0.18 / sze = 300 mm) only where Av ≥ Av,min; where 0 < Av < Av,min
  Vs is ignored (beamsched policy, conservative) and the note says so.

Policy (``required``): all four are required. A blank Vf is never read as zero: with no Vf at
either end one ``not_checked`` result per check stands for the whole span (location None);
with Vf at one end only, the other end is ``not_checked``. Where minimum stirrups are not
required, ``min_stirrups`` passes with a note and no utilisation, and the spacing limits bind
no stirrup (too wide a spacing passes with a note). A negative Vf is read as its magnitude.
In ``long_steel_shear`` Vs is not taken greater than Vf; at a simple support the note says the
bottom bars must be anchored past the face (development is not checked).

How: :func:`prepare` works out both ends of every span of a chunk at once, over columns of one
row an end (the provisions of ``codes/`` and the arithmetic of ``solve/shear.py`` take arrays),
down to each check's decision; :func:`run` then makes each span's results and trace from those
numbers, formatting a note only where one is shown.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from typing import Literal, NamedTuple

import numpy as np

from ..bars import BarArrangement
from ..codes.base import DetailingProvisions
from ..model import CheckStatus, Location
from ..section import centroid_depth
from ..solve.shear import (
    concrete_shear,
    crushing_limit,
    longitudinal_tension,
    shear_resistance,
    stirrup_shear,
    strain_eps_x,
)
from .context import N_PER_KN, NMM_PER_KNM, End, SpanContext

WHERE = {None: "over the span", "left": "at the left support", "right": "at the right support"}


ENDS: tuple[End, End] = ("left", "right")


class TensionSide(NamedTuple):
    face: Literal["top", "bottom"]
    bars: BarArrangement | None
    name: str
    mf: float | None  # moment at the face on this side (N·mm); None: not scheduled
    mf_words: str


# what the tension steel and the moment at an end are called, by end and why the top bars are in tension
_HOGGING_WHY = {"continuous": "continuous end", "free": "free end", "simple": "Mf- scheduled at a simple end"}
_TOP_WORDS = {(end, cond): (f"top bars at the {end} support ({why})", f"Mf- {end[0].upper()} (hogging, {why})")
              for end in ENDS for cond, why in _HOGGING_WHY.items()}
_SAGGING_WORDS = {end: f"Mf+ {end[0].upper()} (sagging at the support)" for end in ENDS}


def tension_side(ctx: SpanContext, end: End) -> TensionSide:
    """Which steel is the flexural tension steel at this end, and the moment there."""
    inp = ctx.inp
    left = end == "left"
    cond = inp.left_end if left else inp.right_end
    mf_neg = inp.Mf_neg_left if left else inp.Mf_neg_right
    if cond == "continuous" or cond == "free" or (mf_neg is not None and mf_neg > 0):
        name, words = _TOP_WORDS.get((end, cond)) or _TOP_WORDS[end, "simple"]
        bars = inp.top_bars_left if left else inp.top_bars_right
        if mf_neg is None and cond == "free":
            return TensionSide("top", bars, name, 0.0, "no moment at a free end (statics)")
        return TensionSide("top", bars, name, mf_neg, words)
    mf_pos = inp.Mf_pos_left if left else inp.Mf_pos_right
    bars, name = inp.bottom_bars_support, "bottom bars at the supports (simple support)"
    if bars is None:
        bars = inp.bottom_bars
        name = "bottom bars (taken to run into the simple support)" if bars is not None else "bottom bars"
    if mf_pos is None:
        return TensionSide("bottom", bars, name, 0.0, "no moment at the face of a simple support (statics)")
    return TensionSide("bottom", bars, name, mf_pos, _SAGGING_WORDS[end])


MIN_STIRRUPS_TOLERANCE = 1 - 1e-12  # Av counts as Av,min when short of it by rounding only
SPACING_TOLERANCE = 1 + 1e-12  # s counts as within a limit when over it by rounding only


class EndShear(NamedTuple):
    """The shear section at one end, as worked out over columns by :func:`prepare`, with what
    the checks there decided (numbers in N, mm, N·mm; ``*_k`` in kN)."""

    end: End
    side: TensionSide
    d: float
    dv: float
    As: float
    vf: float | None
    nf: float  # axial force, tension positive (N)
    simplified: bool
    special: bool  # a special member type (cl. 11.3.6.2 for CSA): β fixed without counted stirrups
    av: float
    s: float | None
    av_min: float | None  # at the scheduled spacing
    has_min: bool
    vs_ignored: bool
    root_fc: float  # √f'c as used (capped)
    beta: float  # as used for Vr ...
    theta: float | None
    rule: int  # ... the code's number for the rule that set β
    sze: float | None
    eps_x: float | None  # as bounded (general method)
    beta0: float  # as without stirrups, for minimum stirrups (11.2.8.1(a))
    rule0: int
    m_used: float | None  # moment in εx (general method)
    eps_raw: float | None
    vc: float
    vc0: float
    vs: float
    vr_max: float
    vr: float
    capped: bool
    # shear
    vr_k: float
    vc_k: float
    vs_k: float
    u: float | None  # Vf / Vr; None without Vf
    over_vc: bool  # Vf > Vc as without stirrups: minimum stirrups required (first test)
    # longitudinal steel for shear (None where not checked: no Vf or no moment)
    long: LongSteel | None


class LongSteel(NamedTuple):
    theta: float
    vs_used: float
    ft: float
    cap: float  # φs As fy
    u: float
    develop_k: float  # Ft − Mf/dv (kN): what bottom bars must develop past the face


class Spacing(NamedTuple):
    """The stirrup-spacing check at one location, decided over columns."""

    dv: float
    vhigh: float  # the Vf above which the limits halve
    loose: float
    loose_dv: bool  # the limit in terms of dv governs
    tight: float
    tight_dv: bool
    high: bool | None  # None: Vf unknown and not needed to decide
    status: CheckStatus
    limit: float
    u: float
    needed: bool  # False where minimum stirrups are known not to be required


class SpanShear(NamedTuple):
    """What :func:`prepare` worked out for one span (see :attr:`SpanContext.shear`)."""

    ends: dict[End, EndShear | str]  # or the reason the section cannot be made
    vf: dict[End, float | None]
    rate: float  # Av,min per mm of spacing
    av_min: float | None  # rate · s, at the scheduled spacing
    satisfied: bool  # stirrups scheduled and Av ≥ Av,min
    u_min: float | None  # Av,min / Av
    deep: bool  # minimum stirrups required whatever Vf is (second test)
    spacing: dict[Location, Spacing | None]  # at each end, and over the span (no Vf anywhere)


def provisions(ctx: SpanContext) -> DetailingProvisions | None:
    return ctx.code if isinstance(ctx.code, DetailingProvisions) else None


def vf_at(ctx: SpanContext, end: End) -> float | None:
    """The magnitude of the scheduled shear at an end (a shear-diagram sign convention often makes
    the right-hand shear negative; its size is what the section carries)."""
    v = ctx.inp.Vf_left if end == "left" else ctx.inp.Vf_right
    return None if v is None else abs(v)


def _or_none(values: np.ndarray, present: np.ndarray) -> list:
    """A column as Python numbers, None where not ``present``."""
    return np.where(present, values.astype(object), None).tolist()


def prepare(contexts: Sequence[SpanContext]) -> None:
    """Work out the shear sections at both ends of every span, and each check's decision, over
    columns (one row an end); each span's context then holds its part (:class:`SpanShear`)."""
    by_code: dict[int, list[SpanContext]] = {}
    for ctx in contexts:
        if provisions(ctx) is not None:
            by_code.setdefault(id(ctx.code), []).append(ctx)
    for spans in by_code.values():
        _prepare(spans, provisions(spans[0]))  # type: ignore[arg-type]


def _prepare(spans: list[SpanContext], code: DetailingProvisions) -> None:
    inps = [ctx.inp for ctx in spans]
    # -- per span (one row a span) --------------------------------------------------------
    h = np.array([i.h for i in inps], dtype=float)
    bw = np.array([i.bw for i in inps], dtype=float)
    fc = np.array([i.fc for i in inps], dtype=float)
    fy = np.array([i.fy for i in inps], dtype=float)
    fyt = np.array([i.fyt_eff for i in inps], dtype=float)
    agg = np.array([i.agg for i in inps], dtype=float)
    lam = np.array([i.lam for i in inps], dtype=float)
    phi_c = np.array([ctx.phi_c for ctx in spans], dtype=float)
    phi_s = np.array([ctx.phi_s for ctx in spans], dtype=float)
    es = np.array([ctx.code.Es for ctx in spans], dtype=float)
    nf_list = [-i.Pf if i.Pf is not None else 0.0 for i in inps]
    nf = np.array(nf_list, dtype=float)
    stirrups = [i.stirrups for i in inps]
    has_st = np.array([st is not None for st in stirrups])
    av_list = [st.area if st else 0.0 for st in stirrups]
    s_list = [st.spacing if st else None for st in stirrups]
    av = np.array(av_list, dtype=float)
    s = np.array([math.nan if v is None else v for v in s_list], dtype=float)
    shape = np.array([i.shape for i in inps])
    hf = np.array([math.nan if i.hf is None else i.hf for i in inps], dtype=float)

    # -- per end (row 2i the left end of span i, 2i + 1 its right end) ---------------------
    sides: list[TensionSide] = []
    d_list: list[float] = []
    as_list: list[float] = []
    vf_list: list[float | None] = []
    for ctx in spans:
        h_span = ctx.inp.h
        for end in ENDS:
            side = tension_side(ctx, end)
            sides.append(side)
            vf_list.append(vf_at(ctx, end))
            bars = side.bars
            if bars is None:
                d_list.append(math.nan)
                as_list.append(math.nan)
                continue
            d_list.append(h_span - centroid_depth(ctx.place(bars, side.face, tension=True)))
            as_list.append(bars.area)  # worked out once, when the bars were read
    d = np.array(d_list)
    As = np.array(as_list)
    vf = np.array([math.nan if v is None else v for v in vf_list], dtype=float)
    mf = np.array([math.nan if x.mf is None else x.mf for x in sides], dtype=float)

    def rows(x: np.ndarray) -> np.ndarray:
        return np.repeat(x, 2)

    with np.errstate(divide="ignore", invalid="ignore"):  # NaN in rows without bars, Vf or stirrups
        dv = code.shear_depth(d, rows(h))
        simplified_span = code.shear_simplified_applies(fc, fy, nf > 0)
        special = rows(code.shear_special_member(shape, h, hf, bw))
        av_min_span = code.min_shear_reinforcement(fc, bw, s, fyt)
        has_min_span = has_st & (av >= av_min_span * MIN_STIRRUPS_TOLERANCE)
        simplified, has_min = rows(simplified_span), rows(has_min_span)
        fc_r, agg_r = rows(fc), rows(agg)
        # β and θ by the method that applies, as without stirrups and with them
        simp0 = code.shear_simplified(dv, agg_r, False)
        simp1 = code.shear_simplified(dv, agg_r, True)
        m_used = code.shear_general_moment(mf, vf, dv)
        eps_raw = strain_eps_x(m_used, vf, rows(nf), dv, rows(es), As)
        gen0 = code.shear_general(eps_raw, dv, agg_r, fc_r, False)
        gen1 = code.shear_general(eps_raw, dv, agg_r, fc_r, True)
        sp = code.shear_special()
        beta0 = np.where(special, sp.beta, np.where(simplified, simp0.beta, gen0.beta))
        rule0 = np.where(special, sp.rule, np.where(simplified, simp0.rule, gen0.rule))

        def used(with_min: np.ndarray, without: np.ndarray) -> np.ndarray:
            return np.where(has_min, with_min, without)

        beta = used(np.where(simplified, simp1.beta, gen1.beta), beta0)
        rule = used(np.where(simplified, simp1.rule, gen1.rule), rule0)
        theta = used(np.where(simplified, simp1.theta, gen1.theta), np.where(simplified, simp0.theta, gen0.theta))
        sze = used(np.where(simplified, simp1.sze, gen1.sze), np.where(simplified, simp0.sze, gen0.sze))
        eps_x = used(np.where(simplified, simp1.eps_x, gen1.eps_x), np.where(simplified, simp0.eps_x, gen0.eps_x))

        root = rows(code.shear_root_fc(fc))
        phi_c_r, lam_r, bw_r, fyt_r, av_r, s_r = rows(phi_c), rows(lam), rows(bw), rows(fyt), rows(av), rows(s)
        vc = concrete_shear(phi_c_r, lam_r, beta, root, bw_r, dv)
        vc0 = concrete_shear(phi_c_r, lam_r, beta0, root, bw_r, dv)
        vs = np.where(has_min, stirrup_shear(rows(phi_s), av_r, fyt_r, dv, theta, s_r), 0.0)
        vr_max = crushing_limit(code.shear_crushing_factor(), phi_c_r, fc_r, bw_r, dv)
        res = shear_resistance(vc, vs, vr_max)
        vr_k, vf_k = res.vr / N_PER_KN, vf / N_PER_KN
        u = np.where(vr_k > 0, vf_k / vr_k, math.inf)

        # minimum stirrups
        over_vc, deep_r = code.min_stirrups_tests(vf, vc0, rows(h))
        deep = deep_r[::2]
        rate = code.min_shear_reinforcement(fc, bw, 1.0, fyt)
        av_min = rate * s
        satisfied = has_st & (av >= av_min * MIN_STIRRUPS_TOLERANCE)
        u_min = av_min / av

        # longitudinal steel for shear
        vs_used = code.long_steel_vs_cap(vs, vf)
        ft = longitudinal_tension(mf, vf, vs_used, rows(nf), dv, theta)
        cap = rows(phi_s) * As * rows(fy)
        u_long = np.where(cap > 0, ft / cap, math.inf)
        develop_k = (ft - mf / dv) / N_PER_KN

    # which ends can be worked out, and why not
    has_bars = np.array([x.bars is not None for x in sides])
    no_vf, no_mf = np.isnan(vf), np.isnan(mf)
    solved = has_bars & (simplified | ~(no_vf | no_mf))

    # stirrup spacing at each end (rows 0 .. 2n − 1) and over the span (rows 2n ..: no Vf anywhere)
    ok_l, ok_r, dv_l, dv_r = solved[::2], solved[1::2], dv[::2], dv[1::2]
    dv_span = np.where(ok_l, np.where(ok_r & (dv_r < dv_l), dv_r, dv_l), dv_r)  # the lesser, as min() takes it
    sp_dv = np.concatenate([dv, dv_span])
    sp_vf = np.concatenate([vf, np.full(len(spans), math.nan)])
    sp_s = np.concatenate([s_r, s])

    def both(x: np.ndarray) -> np.ndarray:
        return np.concatenate([rows(x), x])

    with np.errstate(divide="ignore", invalid="ignore"):
        vhigh = code.high_shear_limit(both(lam), both(phi_c), both(fc), both(bw), sp_dv)
        loose, loose_dv = code.stirrup_spacing_limit(sp_dv, False)
        tight, tight_dv = code.stirrup_spacing_limit(sp_dv, True)
        sp_no_vf = np.isnan(sp_vf)
        high = sp_vf > vhigh
        within = sp_s <= np.where(high, tight, loose) * SPACING_TOLERANCE
        # Vf unknown: within the tighter limit passes, between the two is unknown, beyond the looser fails
        sp_status = np.where(sp_no_vf, np.where(sp_s <= tight, 0, np.where(sp_s <= loose, 1, 2)),
                             np.where(within, 0, 2))
        high_known = ~sp_no_vf | (sp_status == 2)  # None where Vf is unknown and s within the looser limit
        limit = np.where(high, tight, loose)
        sp_u = sp_s / limit
        needed = np.concatenate([no_vf | over_vc | deep_r, np.ones(len(spans), dtype=bool)])
    # each span's part, as Python values: only the rows that are read
    n2 = 2 * len(spans)
    nf_rows = [v for v in nf_list for _ in ENDS]
    s_rows = [v for v in s_list for _ in ENDS]
    general = ~simplified
    idx = np.flatnonzero(solved)
    ends: list[EndShear | str] = [""] * n2
    for r, e in zip(idx.tolist(), map(EndShear._make, zip(
            *(_take(c, idx) for c in (list(ENDS * len(spans)), sides, d_list, dv, as_list, vf_list, nf_rows,
                                      simplified, special, av_r, s_rows)),
            _take(rows(av_min_span), idx, rows(has_st)), *(_take(c, idx) for c in (has_min, rows(has_st) & ~has_min,
                                                                                  root, beta)),
            _take(theta, idx, ~np.isnan(theta)), _take(rule, idx), _take(sze, idx, ~np.isnan(sze)),
            _take(eps_x, idx, general), _take(beta0, idx), _take(rule0, idx), _take(m_used, idx, general),
            _take(eps_raw, idx, general),
            *(_take(c, idx) for c in (vc, vc0, vs, vr_max, res.vr, res.capped, vr_k, vc / N_PER_KN, vs / N_PER_KN)),
            _take(u, idx, ~no_vf), _take(over_vc, idx), _long_steel_rows(idx, solved & ~no_vf & ~no_mf, theta, vs_used,
                                                                       ft, cap, u_long, develop_k),
            strict=True)), strict=True):
        ends[r] = e
    for r in np.flatnonzero(~solved).tolist():
        side = sides[r]
        if side.bars is None:
            ends[r] = f"no {side.name} scheduled, so d and dv are unknown"
        elif vf_list[r] is None:
            ends[r] = "the general method needs Vf at this end for εx"
        else:
            ends[r] = (f"the general method (cl. {spans[r // 2].code.clauses['shear_general']}) needs the moment at "
                       f"this end for εx: {side.mf_words} is not scheduled")

    # the spacing check where it is made: stirrups and a section at the end; over the span where no Vf
    # is scheduled at either end (dv the lesser of the ends' that could be made)
    both_none = np.isnan(vf[::2]) & np.isnan(vf[1::2])
    made = np.concatenate([solved & rows(has_st), has_st & both_none & (ok_l | ok_r)])
    spacing: list[Spacing | None] = [None] * len(made)
    sp_idx = np.flatnonzero(made)
    statuses = (CheckStatus.PASS, CheckStatus.NOT_CHECKED, CheckStatus.FAIL)
    for r, x in zip(sp_idx.tolist(), map(Spacing._make, zip(
            *(_take(c, sp_idx) for c in (sp_dv, vhigh, loose, loose_dv, tight, tight_dv)),
            _take(high, sp_idx, high_known), [statuses[k] for k in sp_status[sp_idx].tolist()],
            *(_take(c, sp_idx) for c in (limit, sp_u, needed)), strict=True)), strict=True):
        spacing[r] = x

    rate_l, av_min_l, sat_l, u_min_l, deep_l = (rate.tolist(), _or_none(av_min, has_st), satisfied.tolist(),
                                                _or_none(u_min, has_st), deep.tolist())
    for i, ctx in enumerate(spans):
        ctx.shear = SpanShear(
            {"left": ends[2 * i], "right": ends[2 * i + 1]}, {"left": vf_list[2 * i], "right": vf_list[2 * i + 1]},
            rate_l[i], av_min_l[i], sat_l[i], u_min_l[i], deep_l[i],
            {"left": spacing[2 * i], "right": spacing[2 * i + 1], None: spacing[n2 + i]})


def _take(column: np.ndarray | list, idx: np.ndarray, present: np.ndarray | None = None) -> list:
    """Rows ``idx`` of a column as Python values (None where not ``present``)."""
    if not isinstance(column, np.ndarray):
        return [column[i] for i in idx.tolist()]
    if present is None:
        return column[idx].tolist()
    return np.where(present[idx], column[idx].astype(object), None).tolist()


def _long_steel_rows(idx: np.ndarray, checked: np.ndarray, *columns: np.ndarray) -> list[LongSteel | None]:
    """The longitudinal-steel numbers of rows ``idx`` (None where that check is not made)."""
    out: list[LongSteel | None] = [None] * len(idx)
    at = np.flatnonzero(checked[idx])
    for k, row in zip(at.tolist(), zip(*(c[idx[at]].tolist() for c in columns), strict=True), strict=True):
        out[k] = LongSteel._make(row)
    return out


def solve_end(ctx: SpanContext, end: End) -> EndShear | str:
    """The shear section at one end, or the reason it cannot be made (as :func:`prepare` worked
    it out; for a span it has not seen, over columns of one span)."""
    return _prepared(ctx).ends[end]


def _prepared(ctx: SpanContext) -> SpanShear:
    if ctx.shear is None:
        prepare([ctx])
    return ctx.shear  # type: ignore[return-value]


def _trace(ctx: SpanContext, code: DetailingProvisions, e: EndShear) -> None:
    inp, cl = ctx.inp, ctx.code.clauses
    loc, t = e.end, ctx.add_trace
    method_clause = code.shear_rule(e.rule)[1]
    t("shear", loc, "tension steel", f"{e.side.bars} ({e.side.name})", "", cl["dv"], "sets d and dv at this end")
    t("shear", loc, "d", e.d, "mm", "", "depth of the centroid of that steel")
    t("shear", loc, "0.9 d", 0.9 * e.d, "mm", cl["dv"], "")
    t("shear", loc, "0.72 h", 0.72 * inp.h, "mm", cl["dv"], "")
    t("shear", loc, "dv", e.dv, "mm", cl["dv"], "effective shear depth, the greater of 0.9 d and 0.72 h")
    t("shear", loc, "bw", inp.bw, "mm", cl["vc"], "web width")
    t("shear", loc, "λ", inp.lam, "", cl["lambda"], "concrete density factor")
    t("shear", loc, "√f'c", e.root_fc, "MPa", cl["vc"],
      "√f'c, not more than 8 MPa" + (" (capped)" if e.root_fc < math.sqrt(inp.fc) else ""))
    t("shear", loc, "method", code.shear_method_words(inp.fc, inp.fy, e.nf > 0), "", method_clause, "")
    if e.special:
        t("shear", loc, "special member", code.shear_special_member_words(inp.shape, inp.h, inp.hf, inp.bw), "",
          cl["shear_special"], "β = 0.21 without counted stirrups")
    if inp.stirrups is not None:
        t("shear", loc, "stirrups", str(inp.stirrups), "", cl["vs"], f"{inp.stirrups.legs} legs")
        t("shear", loc, "Av", e.av, "mm²", cl["vs"], "area of all legs at one section")
        t("shear", loc, "s", e.s, "mm", cl["vs"], "stirrup spacing")
        t("shear", loc, "fyt", inp.fyt_eff, "MPa", cl["vs"], "stirrup yield strength")
        t("shear", loc, "Av,min", e.av_min, "mm²", cl["min_stirrups_area"], "0.06 √f'c bw s / fyt")
    if e.m_used is not None:
        t("shear", loc, "Mf (εx)", e.m_used / NMM_PER_KNM, "kN·m", cl["shear_general"],
          f"{e.side.mf_words} = {(e.side.mf or 0) / NMM_PER_KNM:.1f} kN·m, not less than Vf·dv = "
          f"{(e.vf or 0) * e.dv / NMM_PER_KNM:.1f} kN·m; the end's scheduled moment is paired with the end's "
          "largest Vf, which is conservative")
        t("shear", loc, "Nf", e.nf / N_PER_KN, "kN", cl["shear_general"], "axial force, tension positive")
        t("shear", loc, "As", e.As, "mm²", cl["shear_general"], "flexural tension steel, taken as fully developed")
        t("shear", loc, "εx (raw)", e.eps_raw, "", cl["shear_general"], "(Mf/dv + Vf + 0.5 Nf) / (2 Es As)")
        t("shear", loc, "εx", e.eps_x, "", cl["shear_general"], "taken ≥ 0 (conservative) and ≤ 3.0e-3")
    if e.sze is not None:
        t("shear", loc, "sze", e.sze, "mm", method_clause, "equivalent crack spacing")
    t("shear", loc, "β", e.beta, "", method_clause, code.shear_basis(e.rule, inp.agg, inp.fc))
    if e.theta is not None:
        t("shear", loc, "θ", e.theta, "°", method_clause, "angle of the diagonal compression")
    t("shear", loc, "Vc", e.vc / N_PER_KN, "kN", cl["vc"], "φc λ β √f'c bw dv")
    if e.vs_ignored:
        t("shear", loc, "Vs", 0.0, "kN", cl["vs"],
          f"ignored: Av = {e.av:.0f} mm² < Av,min = {e.av_min:.0f} mm² (beamsched policy, conservative)")
    elif inp.stirrups is not None:
        t("shear", loc, "Vs", e.vs / N_PER_KN, "kN", cl["vs"], "φs Av fyt dv cot θ / s")
    t("shear", loc, "Vr,max", e.vr_max / N_PER_KN, "kN", cl["shear_resistance"], "0.25 φc f'c bw dv (crushing)")
    t("shear", loc, "Vr", e.vr / N_PER_KN, "kN", cl["shear_resistance"],
      "Vc + Vs" + (", capped at Vr,max" if e.capped else ""))


_VALUE_KEYS = {end: (f"Vr_{end}_kN", f"Vc_{end}_kN", f"Vs_{end}_kN", f"dv_{end}_mm", f"shear_method_{end}")
               for end in ENDS}


def _shear(ctx: SpanContext, code: DetailingProvisions, loc: Location, e: EndShear | str,
           vf: float | None) -> None:
    clause = ctx.code.clauses["shear_resistance"]
    vf_k = None if vf is None else vf / N_PER_KN
    if isinstance(e, str):
        ctx.result("shear", "Shear", loc, clause, CheckStatus.NOT_CHECKED,
                   f"Shear {WHERE[loc]} not checked: {e} (cl. {clause}).", demand=vf_k, unit="kN")
        return
    if ctx.tracing:
        _trace(ctx, code, e)
    vr = e.vr_k
    values = ctx.values
    vr_key, vc_key, vs_key, dv_key, method_key = _VALUE_KEYS[e.end]
    values[vr_key] = vr
    values[vc_key] = e.vc_k
    values[vs_key] = e.vs_k
    values[dv_key] = e.dv
    method = code.shear_rule(e.rule)[0]
    values[method_key] = method
    if e.u is None:
        ctx.result("shear", "Shear", loc, clause, CheckStatus.NOT_CHECKED,
                   f"Vf {WHERE[loc]} is not scheduled, so shear there was not checked (Vr = {vr:.1f} kN; "
                   f"cl. {clause}). A blank demand is never read as zero.", capacity=vr, unit="kN")
        return
    u = e.u
    msg = ""
    if e.vs_ignored or e.capped or not u <= 1:
        notes = []
        if e.vs_ignored:
            notes.append(f"Vs ignored: Av = {e.av:.0f} mm² is less than Av,min = {e.av_min:.0f} mm² (cl. "
                         f"{ctx.code.clauses['min_stirrups_area']})")
        if e.capped:
            notes.append(f"Vr is at the crushing limit 0.25 φc f'c bw dv = {e.vr_max / N_PER_KN:.1f} kN")
        if u <= 1:
            msg = "; ".join(notes)
        else:
            if e.capped:
                fix = "stirrups cannot raise Vr further: widen or deepen the web, or raise f'c"
            elif ctx.inp.stirrups is None or e.vs_ignored:
                fix = "provide at least the minimum stirrups (then Vs counts) or enlarge the section"
            else:
                fix = "close up or enlarge the stirrups, or enlarge the section"
            msg = (f"Vf = {vf_k:.1f} kN exceeds Vr = {vr:.1f} kN {WHERE[loc]} ({method} method, cl. {clause}): "
                   f"{fix}." + ("" if not notes else " " + "; ".join(notes) + "."))
    ctx.result("shear", "Shear", loc, clause, CheckStatus.PASS if u <= 1 else CheckStatus.FAIL, msg,
               demand=vf_k, capacity=vr, unit="kN", utilisation=u)


def _min_stirrups(ctx: SpanContext, code: DetailingProvisions, loc: Location, span: SpanShear,
                  e: EndShear | str, vf: float | None) -> None:
    inp = ctx.inp
    cl, cl_a = ctx.code.clauses["min_stirrups"], ctx.code.clauses["min_stirrups_area"]
    clause = f"{cl}, {cl_a}"
    st = inp.stirrups
    rate, av_min, satisfied = span.rate, span.av_min, span.satisfied
    solved = isinstance(e, EndShear)
    required = span.deep or (solved and e.over_vc)  # type: ignore[union-attr]
    if ctx.tracing:
        t = ctx.add_trace
        t("min_stirrups", loc, "Av,min/s", rate, "mm²/mm", cl_a, "0.06 √f'c bw / fyt")
        if solved:
            t("min_stirrups", loc, "Vc (no stirrups)", e.vc0 / N_PER_KN, "kN", cl,  # type: ignore[union-attr]
              f"Vc with β = {e.beta0:.4f} as without stirrups "  # type: ignore[union-attr]
              f"({code.shear_basis(e.rule0, inp.agg, inp.fc)})")  # type: ignore[union-attr]
        if st is not None:
            t("min_stirrups", loc, "Av", st.area, "mm²", cl_a, f"{st}")
            t("min_stirrups", loc, "Av,min", av_min, "mm²", cl_a, f"at s = {st.spacing:g} mm")
    if not required:
        known = vf is not None and solved  # Vf and Vc both known: (a) can be decided
        if not known and not satisfied:
            why = e if isinstance(e, str) else "Vf is not scheduled"
            ctx.result("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.NOT_CHECKED,
                       f"Whether minimum stirrups are required {WHERE[loc]} is unknown: {why} "
                       f"(cl. {cl}: required where Vf > Vc).", unit="mm²")
            return
        msg = (f"Minimum stirrups are not required {WHERE[loc]} (cl. {cl}): Vf ≤ Vc and h ≤ 750 mm"
               if known else f"Av ≥ Av,min {WHERE[loc]} (cl. {cl_a}), whether or not they are required")
        ctx.result("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.PASS, msg,
                   demand=av_min, capacity=st.area if st else None, unit="mm²")
        return
    reasons = "; ".join(code.min_stirrups_reasons(vf, e.vc0 if solved else math.inf, inp.h))  # type: ignore[union-attr]
    if ctx.tracing:
        ctx.add_trace("min_stirrups", loc, "required", reasons, "", cl, "why minimum stirrups are required")
    if satisfied:
        ctx.result("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.PASS,
                   f"required ({reasons}) and provided", demand=av_min, capacity=st.area,  # type: ignore[union-attr]
                   unit="mm²", utilisation=span.u_min)
        return
    if st is None:
        s10 = 200.0 / rate
        msg = (f"Minimum stirrups are required {WHERE[loc]} ({reasons}) but none are scheduled: "
               f"Av,min/s = {rate:.3f} mm²/mm (cl. {cl_a}), e.g. 2 legs of 10M at no more than {s10:.0f} mm "
               "(and within the spacing limits of cl. 11.3.8).")
        ctx.result("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.FAIL, msg, demand=None,
                   capacity=0.0, unit="mm²", utilisation=math.inf)
        return
    msg = (f"{st} gives Av = {st.area:.0f} mm², less than Av,min = {av_min:.0f} mm² at s = {st.spacing:g} mm "
           f"{WHERE[loc]} (cl. {cl_a}; required: {reasons}): close up or enlarge the stirrups. "
           "Vs is ignored in the shear check until Av ≥ Av,min.")
    ctx.result("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.FAIL, msg, demand=av_min,
               capacity=st.area, unit="mm²", utilisation=span.u_min)


def _spacing(ctx: SpanContext, code: DetailingProvisions, loc: Location, x: Spacing, vf: float | None) -> None:
    """Where ``x.needed`` is False (Vf is known and minimum stirrups are not required: Vf ≤ Vc as
    without stirrups, h ≤ 750 mm) the spacing limits bind no stirrup, and too wide a spacing
    passes with a note (the shear check did not rely on the stirrups)."""
    inp = ctx.inp
    cl1, cl3 = ctx.code.clauses["stirrup_spacing"], ctx.code.clauses["stirrup_spacing_high"]
    s = inp.stirrups.spacing  # type: ignore[union-attr]
    status, high, limit = x.status, x.high, x.limit
    clause = cl3 if high else cl1
    if ctx.tracing:
        t = ctx.add_trace
        t("stirrup_spacing", loc, "dv", x.dv, "mm", ctx.code.clauses["dv"], "effective shear depth used")
        t("stirrup_spacing", loc, "0.125 λ φc f'c bw dv", x.vhigh / N_PER_KN, "kN", cl3,
          "Vf above this halves the limits")
        t("stirrup_spacing", loc, "s,max", limit, "mm", clause,
          f"{_limit_words(code, x, bool(high))} governs" + (" (high shear)" if high else ""))
    if status is CheckStatus.NOT_CHECKED:
        msg = (f"s = {s:g} mm is within {x.loose:.0f} mm ({_limit_words(code, x, False)}, cl. {cl1}) but above "
               f"{x.tight:.0f} mm ({_limit_words(code, x, True)}, cl. {cl3}), which applies if Vf > "
               f"{x.vhigh / N_PER_KN:.1f} kN; Vf is not scheduled.")
        ctx.result("stirrup_spacing", "Stirrup spacing", loc, f"{cl1}, {cl3}", status, msg, demand=s,
                   unit="mm")
        return
    if status is CheckStatus.FAIL and not x.needed:
        ctx.result("stirrup_spacing", "Stirrup spacing", loc, f"{cl1}, {cl3}", CheckStatus.PASS,
                   f"s = {s:g} mm exceeds {limit:.0f} mm ({_limit_words(code, x, bool(high))}, cl. {clause}), "
                   f"but no stirrups are required {WHERE[loc]} (Vf ≤ Vc without them, h ≤ 750 mm), so the "
                   "limit binds none here", demand=s, capacity=limit, unit="mm")
        return
    if status is CheckStatus.PASS:
        msg = "" if vf is not None else f"s ≤ {x.tight:.0f} mm, the tighter limit of cl. {cl3}"
    else:
        msg = (f"Stirrups at s = {s:g} mm exceed the largest spacing {limit:.0f} mm ({_limit_words(code, x, bool(high))}"
               + (f", halved because Vf > 0.125 λ φc f'c bw dv = {x.vhigh / N_PER_KN:.1f} kN" if high else "")
               + f") {WHERE[loc]} (cl. {clause}): space them at {math.floor(limit):.0f} mm or less.")
    ctx.result("stirrup_spacing", "Stirrup spacing", loc, f"{cl1}, {cl3}", status, msg, demand=s,
               capacity=limit, unit="mm", utilisation=x.u)


def _limit_words(code: DetailingProvisions, x: Spacing, high: bool) -> str:
    return code.stirrup_spacing_words(high, x.tight_dv if high else x.loose_dv)


def _long_steel(ctx: SpanContext, code: DetailingProvisions, loc: Location, e: EndShear | str) -> None:
    inp = ctx.inp
    clause = ctx.code.clauses["long_steel"]
    if isinstance(e, str) or e.vf is None:
        why = e if isinstance(e, str) else "Vf is not scheduled"
        ctx.result("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.NOT_CHECKED,
                   f"Longitudinal steel for shear {WHERE[loc]} not checked: {why} (cl. {clause}).",
                   unit="kN")
        return
    side, x = e.side, e.long
    if x is None:  # no moment scheduled
        ctx.result("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.NOT_CHECKED,
                   f"Longitudinal steel for shear {WHERE[loc]} not checked: {side.mf_words} is not "
                   f"scheduled (cl. {clause}).", unit="kN")
        return
    ft_k, cap_k = x.ft / N_PER_KN, x.cap / N_PER_KN
    if ctx.tracing:
        t = ctx.add_trace
        t("long_steel_shear", loc, "Mf", side.mf / NMM_PER_KNM, "kN·m", clause, side.mf_words)  # type: ignore[operator]
        t("long_steel_shear", loc, "θ", x.theta, "°", code.shear_rule(e.rule)[1], "as in the shear check")
        t("long_steel_shear", loc, "Vs used", x.vs_used / N_PER_KN, "kN", clause, "Vs, not taken greater than Vf")
        t("long_steel_shear", loc, "Ft", ft_k, "kN", clause, "Mf/dv + 0.5 Nf + (Vf − 0.5 Vs) cot θ")
        t("long_steel_shear", loc, "φs As fy", cap_k, "kN", clause, f"{side.bars}: As = {e.As:.0f} mm²")
    anchor = ""
    if side.face == "bottom":
        anchor = (f"At this simple support the {side.bars} bottom bars must be anchored past the inside face of the "
                  f"support to develop {x.develop_k:.1f} kN; check their extension or hooks.")
        if inp.bottom_bars_support is None:
            anchor += (" All the midspan bottom bars were taken to run into the support; schedule the bottom bars at "
                       "the supports if fewer do.")
    if x.u <= 1:
        ctx.result("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.PASS, anchor,
                   demand=ft_k, capacity=cap_k, unit="kN", utilisation=x.u)
        return
    msg = (f"The tension steel {WHERE[loc]} must carry Ft = Mf/dv + (Vf − 0.5 Vs) cot θ = {ft_k:.1f} kN but "
           f"φs As fy = {cap_k:.1f} kN ({side.bars}; cl. {clause}): add {side.face} bars there"
           + (" or more stirrups" if e.vs > 0 or inp.stirrups is None else "") + ". " + anchor)
    ctx.result("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.FAIL, msg.strip(),
               demand=ft_k, capacity=cap_k, unit="kN", utilisation=x.u)


def run(ctx: SpanContext) -> None:
    """Shear at each end (or once for the span when no Vf is scheduled at all), from what
    :func:`prepare` worked out."""
    inp = ctx.inp
    clause = ctx.code.clauses.get("shear_resistance", "11.3")
    code = provisions(ctx)
    if code is None:
        ctx.result("shear", "Shear", None, clause, CheckStatus.NOT_CHECKED,
                   f"The design code in force ({ctx.code.id}) provides no shear provisions to beamsched.")
        return
    span = _prepared(ctx)
    if inp.Vf_left is None and inp.Vf_right is None:
        why = "no Vf is scheduled at either end; a blank demand is never read as zero"
        _shear(ctx, code, None, why, None)
        first = next((span.ends[x] for x in ENDS if isinstance(span.ends[x], EndShear)), why)
        _min_stirrups(ctx, code, None, span, first, None)
        spacing = span.spacing[None]
        if spacing is not None:
            _spacing(ctx, code, None, spacing, None)
        _long_steel(ctx, code, None, why)
    else:
        for end in ENDS:
            e, vf = span.ends[end], span.vf[end]
            if vf is None and inp.end_condition(end) == "free":
                # the tip of a cantilever carries no shear by statics: nothing to check there
                ctx.add_trace("shear", end, "Vf", "not scheduled", "", clause,
                              "free end (cantilever tip): no shear by statics, no check made there")
                continue
            _shear(ctx, code, end, e, vf)
            _min_stirrups(ctx, code, end, span, e, vf)
            spacing = span.spacing[end]
            if spacing is not None:
                _spacing(ctx, code, end, spacing, vf)
            _long_steel(ctx, code, end, e)
    vr = [v for v in (ctx.values.get("Vr_left_kN"), ctx.values.get("Vr_right_kN")) if v is not None]
    if vr:
        ctx.values["Vr_kN"] = min(vr)  # type: ignore[type-var]
