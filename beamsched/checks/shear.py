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
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

from ..bars import BarArrangement
from ..codes.base import DetailingProvisions, ShearAngles
from ..model import CheckResult, CheckStatus, Location
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


@dataclass(frozen=True, slots=True)
class TensionSide:
    face: Literal["top", "bottom"]
    bars: BarArrangement | None
    name: str
    mf: float | None  # moment at the face on this side (N·mm); None: not scheduled
    mf_words: str


def tension_side(ctx: SpanContext, end: End) -> TensionSide:
    """Which steel is the flexural tension steel at this end, and the moment there."""
    inp = ctx.inp
    cond = inp.end_condition(end)
    mf_neg = inp.Mf_neg_left if end == "left" else inp.Mf_neg_right
    if cond in ("continuous", "free") or (mf_neg is not None and mf_neg > 0):
        why = {"continuous": "continuous end", "free": "free end"}.get(cond, "Mf- scheduled at a simple end")
        mf, words = mf_neg, f"Mf- {end[0].upper()} (hogging, {why})"
        if mf is None and cond == "free":
            mf, words = 0.0, "no moment at a free end (statics)"
        return TensionSide("top", inp.top_bars_at(end), f"top bars at the {end} support ({why})", mf, words)
    mf_pos = inp.Mf_pos_left if end == "left" else inp.Mf_pos_right
    bars, name = inp.bottom_bars_support, "bottom bars at the supports (simple support)"
    if bars is None:
        bars = inp.bottom_bars
        name = "bottom bars (taken to run into the simple support)" if bars is not None else "bottom bars"
    if mf_pos is None:
        return TensionSide("bottom", bars, name, 0.0, "no moment at the face of a simple support (statics)")
    return TensionSide("bottom", bars, name, mf_pos, f"Mf+ {end[0].upper()} (sagging at the support)")


@dataclass(frozen=True, slots=True)
class EndShear:
    end: End
    side: TensionSide
    d: float
    dv: float
    As: float
    vf: float | None
    nf: float  # axial force, tension positive (N)
    simplified: bool
    method_words: str
    special: str | None
    av: float
    s: float | None
    av_min: float | None  # at the scheduled spacing
    has_min: bool
    vs_ignored: bool
    angles: ShearAngles  # as used for Vr
    angles0: ShearAngles  # as without stirrups, for 11.2.8.1(a)
    m_used: float | None  # moment in εx (general method)
    eps_raw: float | None
    vc: float
    vc0: float
    vs: float
    vr_max: float
    vr: float
    capped: bool


def provisions(ctx: SpanContext) -> DetailingProvisions | None:
    return ctx.code if isinstance(ctx.code, DetailingProvisions) else None


def vf_at(ctx: SpanContext, end: End) -> float | None:
    """The magnitude of the scheduled shear at an end (a shear-diagram sign convention often makes
    the right-hand shear negative; its size is what the section carries)."""
    v = ctx.inp.Vf_left if end == "left" else ctx.inp.Vf_right
    return None if v is None else abs(v)


def solve_end(ctx: SpanContext, end: End) -> EndShear | str:
    """The shear section at one end, or the reason it cannot be made."""
    inp, code = ctx.inp, provisions(ctx)
    assert code is not None
    side = tension_side(ctx, end)
    if side.bars is None:
        return f"no {side.name} scheduled, so d and dv are unknown"
    placed = ctx.place(side.bars, side.face, tension=True)
    d = inp.h - centroid_depth(placed)
    dv = code.shear_depth(d, inp.h)
    As = side.bars.area
    vf = vf_at(ctx, end)
    nf = -inp.Pf if inp.Pf is not None else 0.0
    simplified, method_words = code.shear_simplified_applies(inp.fc, inp.fy, nf > 0)
    special = code.shear_special_member(inp.shape, inp.h, inp.hf, inp.bw)
    st = inp.stirrups
    av = st.area if st else 0.0
    s = st.spacing if st else None
    av_min = code.min_shear_reinforcement(inp.fc, inp.bw, s, inp.fyt_eff) if s else None
    has_min = st is not None and av >= av_min * (1 - 1e-12)  # type: ignore[operator]
    vs_ignored = st is not None and not has_min
    m_used = eps_raw = None
    if simplified:
        angles0 = code.shear_simplified(dv, inp.agg, False)
        angles = code.shear_simplified(dv, inp.agg, True) if has_min else angles0
    else:
        if vf is None:
            return "the general method needs Vf at this end for εx"
        if side.mf is None:
            return f"the general method (cl. {ctx.code.clauses['shear_general']}) needs the moment at this end for εx: {side.mf_words} is not scheduled"
        m_used = code.shear_general_moment(side.mf, vf, dv)
        eps_raw = strain_eps_x(m_used, vf, nf, dv, ctx.code.Es, As)
        angles0 = code.shear_general(eps_raw, dv, inp.agg, inp.fc, False)
        angles = code.shear_general(eps_raw, dv, inp.agg, inp.fc, True) if has_min else angles0
    if special is not None:
        sp = code.shear_special()
        angles0 = ShearAngles(sp.beta, angles0.theta, sp.method, sp.basis, sp.clause, angles0.sze, angles0.eps_x)
        if not has_min:
            angles = angles0
    root = code.shear_root_fc(inp.fc)
    vc = concrete_shear(ctx.phi_c, inp.lam, angles.beta, root, inp.bw, dv)
    vc0 = concrete_shear(ctx.phi_c, inp.lam, angles0.beta, root, inp.bw, dv)
    vs = stirrup_shear(ctx.phi_s, av, inp.fyt_eff, dv, angles.theta, s) if has_min else 0.0  # type: ignore[arg-type]
    vr_max = crushing_limit(code.shear_crushing_factor(), ctx.phi_c, inp.fc, inp.bw, dv)
    res = shear_resistance(vc, vs, vr_max)
    return EndShear(end, side, d, dv, As, vf, nf, simplified, method_words, special, av, s, av_min, has_min,
                    vs_ignored, angles, angles0, m_used, eps_raw, vc, vc0, vs, vr_max, res.vr, res.capped)


def _trace(ctx: SpanContext, e: EndShear) -> None:
    if not ctx.tracing:
        return
    inp, cl = ctx.inp, ctx.code.clauses
    loc, t = e.end, ctx.add_trace
    t("shear", loc, "tension steel", f"{e.side.bars} ({e.side.name})", "", cl["dv"], "sets d and dv at this end")
    t("shear", loc, "d", e.d, "mm", "", "depth of the centroid of that steel")
    t("shear", loc, "0.9 d", 0.9 * e.d, "mm", cl["dv"], "")
    t("shear", loc, "0.72 h", 0.72 * inp.h, "mm", cl["dv"], "")
    t("shear", loc, "dv", e.dv, "mm", cl["dv"], "effective shear depth, the greater of 0.9 d and 0.72 h")
    t("shear", loc, "bw", inp.bw, "mm", cl["vc"], "web width")
    t("shear", loc, "λ", inp.lam, "", cl["lambda"], "concrete density factor")
    t("shear", loc, "√f'c", ctx.code.shear_root_fc(inp.fc), "MPa", cl["vc"],  # type: ignore[attr-defined]
      "√f'c, not more than 8 MPa" + (" (capped)" if math.sqrt(inp.fc) > 8 else ""))
    t("shear", loc, "method", e.method_words, "", e.angles.clause, "")
    if e.special:
        t("shear", loc, "special member", e.special, "", cl["shear_special"], "β = 0.21 without counted stirrups")
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
        t("shear", loc, "εx", e.angles.eps_x, "", cl["shear_general"], "taken ≥ 0 (conservative) and ≤ 3.0e-3")
    if e.angles.sze is not None:
        t("shear", loc, "sze", e.angles.sze, "mm", e.angles.clause, "equivalent crack spacing")
    t("shear", loc, "β", e.angles.beta, "", e.angles.clause, e.angles.basis)
    if e.angles.theta is not None:
        t("shear", loc, "θ", e.angles.theta, "°", e.angles.clause, "angle of the diagonal compression")
    t("shear", loc, "Vc", e.vc / N_PER_KN, "kN", cl["vc"], "φc λ β √f'c bw dv")
    if e.vs_ignored:
        t("shear", loc, "Vs", 0.0, "kN", cl["vs"],
          f"ignored: Av = {e.av:.0f} mm² < Av,min = {e.av_min:.0f} mm² (beamsched policy, conservative)")
    elif inp.stirrups is not None:
        t("shear", loc, "Vs", e.vs / N_PER_KN, "kN", cl["vs"], "φs Av fyt dv cot θ / s")
    t("shear", loc, "Vr,max", e.vr_max / N_PER_KN, "kN", cl["shear_resistance"], "0.25 φc f'c bw dv (crushing)")
    t("shear", loc, "Vr", e.vr / N_PER_KN, "kN", cl["shear_resistance"],
      "Vc + Vs" + (", capped at Vr,max" if e.capped else ""))


def _shear(ctx: SpanContext, loc: Location, e: EndShear | str) -> None:
    clause = ctx.code.clauses["shear_resistance"]
    vf = None if loc is None else vf_at(ctx, loc)  # type: ignore[arg-type]
    vf_k = None if vf is None else vf / N_PER_KN
    if isinstance(e, str):
        ctx.add(CheckResult("shear", "Shear", loc, clause, CheckStatus.NOT_CHECKED,
                            f"Shear {WHERE[loc]} not checked: {e} (cl. {clause}).", demand=vf_k, unit="kN"))
        return
    _trace(ctx, e)
    vr = e.vr / N_PER_KN
    ctx.values[f"Vr_{e.end}_kN"] = vr
    ctx.values[f"Vc_{e.end}_kN"] = e.vc / N_PER_KN
    ctx.values[f"Vs_{e.end}_kN"] = e.vs / N_PER_KN
    ctx.values[f"dv_{e.end}_mm"] = e.dv
    ctx.values[f"shear_method_{e.end}"] = e.angles.method
    if vf is None:
        ctx.add(CheckResult("shear", "Shear", loc, clause, CheckStatus.NOT_CHECKED,
                            f"Vf {WHERE[loc]} is not scheduled, so shear there was not checked (Vr = {vr:.1f} kN; "
                            f"cl. {clause}). A blank demand is never read as zero.", capacity=vr, unit="kN"))
        return
    u = vf_k / vr if vr > 0 else math.inf  # type: ignore[operator]
    notes = []
    if e.vs_ignored:
        notes.append(f"Vs ignored: Av = {e.av:.0f} mm² is less than Av,min = {e.av_min:.0f} mm² (cl. "
                     f"{ctx.code.clauses['min_stirrups_area']})")
    if e.capped:
        notes.append(f"Vr is at the crushing limit 0.25 φc f'c bw dv = {e.vr_max / N_PER_KN:.1f} kN")
    if u <= 1:
        msg = "; ".join(notes)
        status = CheckStatus.PASS
    else:
        if e.capped:
            fix = "stirrups cannot raise Vr further: widen or deepen the web, or raise f'c"
        elif ctx.inp.stirrups is None or e.vs_ignored:
            fix = "provide at least the minimum stirrups (then Vs counts) or enlarge the section"
        else:
            fix = "close up or enlarge the stirrups, or enlarge the section"
        msg = (f"Vf = {vf_k:.1f} kN exceeds Vr = {vr:.1f} kN {WHERE[loc]} ({e.angles.method} method, cl. {clause}): "
               f"{fix}." + ("" if not notes else " " + "; ".join(notes) + "."))
        status = CheckStatus.FAIL
    ctx.add(CheckResult("shear", "Shear", loc, clause, status, msg, demand=vf_k, capacity=vr, unit="kN", utilisation=u))


def _min_stirrups(ctx: SpanContext, loc: Location, e: EndShear | str | None, vf: float | None) -> None:
    inp, code = ctx.inp, provisions(ctx)
    assert code is not None
    cl, cl_a = ctx.code.clauses["min_stirrups"], ctx.code.clauses["min_stirrups_area"]
    clause = f"{cl}, {cl_a}"
    st = inp.stirrups
    rate = code.min_shear_reinforcement(inp.fc, inp.bw, 1.0, inp.fyt_eff)  # Av,min per mm of spacing
    t = ctx.add_trace
    t("min_stirrups", loc, "Av,min/s", rate, "mm²/mm", cl_a, "0.06 √f'c bw / fyt")
    if isinstance(e, EndShear):
        t("min_stirrups", loc, "Vc (no stirrups)", e.vc0 / N_PER_KN, "kN", cl,
          f"Vc with β = {e.angles0.beta:.4f} as without stirrups ({e.angles0.basis})")
        reasons = code.min_stirrups_reasons(vf, e.vc0, inp.h)
    else:
        reasons = code.min_stirrups_reasons(None, math.inf, inp.h)
    av = st.area if st else 0.0
    av_min = rate * st.spacing if st else None
    if st is not None:
        t("min_stirrups", loc, "Av", av, "mm²", cl_a, f"{st}")
        t("min_stirrups", loc, "Av,min", av_min, "mm²", cl_a, f"at s = {st.spacing:g} mm")
    satisfied = st is not None and av >= av_min * (1 - 1e-12)  # type: ignore[operator]
    known = vf is not None and isinstance(e, EndShear)  # Vf and Vc both known: (a) can be decided
    if not reasons:
        if not known and not satisfied:
            why = e if isinstance(e, str) else "Vf is not scheduled"
            ctx.add(CheckResult("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.NOT_CHECKED,
                                f"Whether minimum stirrups are required {WHERE[loc]} is unknown: {why} "
                                f"(cl. {cl}: required where Vf > Vc).", unit="mm²"))
            return
        msg = (f"Minimum stirrups are not required {WHERE[loc]} (cl. {cl}): Vf ≤ Vc and h ≤ 750 mm"
               if known else f"Av ≥ Av,min {WHERE[loc]} (cl. {cl_a}), whether or not they are required")
        ctx.add(CheckResult("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.PASS, msg,
                            demand=av_min, capacity=av if st else None, unit="mm²"))
        return
    t("min_stirrups", loc, "required", "; ".join(reasons), "", cl, "why minimum stirrups are required")
    if satisfied:
        ctx.add(CheckResult("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.PASS,
                            f"required ({'; '.join(reasons)}) and provided", demand=av_min, capacity=av, unit="mm²",
                            utilisation=av_min / av))  # type: ignore[operator]
        return
    if st is None:
        s10 = 200.0 / rate
        msg = (f"Minimum stirrups are required {WHERE[loc]} ({'; '.join(reasons)}) but none are scheduled: "
               f"Av,min/s = {rate:.3f} mm²/mm (cl. {cl_a}), e.g. 2 legs of 10M at no more than {s10:.0f} mm "
               "(and within the spacing limits of cl. 11.3.8).")
        ctx.add(CheckResult("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.FAIL, msg, demand=None,
                            capacity=0.0, unit="mm²", utilisation=math.inf))
        return
    msg = (f"{st} gives Av = {av:.0f} mm², less than Av,min = {av_min:.0f} mm² at s = {st.spacing:g} mm "
           f"{WHERE[loc]} (cl. {cl_a}; required: {'; '.join(reasons)}): close up or enlarge the stirrups. "
           "Vs is ignored in the shear check until Av ≥ Av,min.")
    ctx.add(CheckResult("min_stirrups", "Min. stirrups", loc, clause, CheckStatus.FAIL, msg, demand=av_min,
                        capacity=av, unit="mm²", utilisation=av_min / av))  # type: ignore[operator]


def _spacing(ctx: SpanContext, loc: Location, dv: float, vf: float | None, needed: bool = True) -> None:
    """``needed``: False where Vf is known and minimum stirrups are not required (Vf ≤ Vc as
    without stirrups, h ≤ 750 mm): the spacing limits then bind no stirrup, and too wide a
    spacing passes with a note (the shear check did not rely on the stirrups)."""
    inp, code = ctx.inp, provisions(ctx)
    assert code is not None and inp.stirrups is not None
    cl1, cl3 = ctx.code.clauses["stirrup_spacing"], ctx.code.clauses["stirrup_spacing_high"]
    s = inp.stirrups.spacing
    vhigh = code.high_shear_limit(inp.lam, ctx.phi_c, inp.fc, inp.bw, dv)
    t = ctx.add_trace
    t("stirrup_spacing", loc, "dv", dv, "mm", ctx.code.clauses["dv"], "effective shear depth used")
    t("stirrup_spacing", loc, "0.125 λ φc f'c bw dv", vhigh / N_PER_KN, "kN", cl3, "Vf above this halves the limits")
    loose, loose_words = code.stirrup_spacing_limit(dv, False)
    tight, tight_words = code.stirrup_spacing_limit(dv, True)
    if vf is None:
        if s <= tight:
            high, status = None, CheckStatus.PASS
        elif s <= loose:
            high, status = None, CheckStatus.NOT_CHECKED
        else:
            high, status = False, CheckStatus.FAIL
    else:
        high = vf > vhigh
        status = CheckStatus.PASS if s <= (tight if high else loose) * (1 + 1e-12) else CheckStatus.FAIL
    limit, words = (tight, tight_words) if high else (loose, loose_words)
    clause = cl3 if high else cl1
    t("stirrup_spacing", loc, "s,max", limit, "mm", clause, f"{words} governs" + (" (high shear)" if high else ""))
    if status is CheckStatus.NOT_CHECKED:
        msg = (f"s = {s:g} mm is within {loose:.0f} mm ({loose_words}, cl. {cl1}) but above {tight:.0f} mm "
               f"({tight_words}, cl. {cl3}), which applies if Vf > {vhigh / N_PER_KN:.1f} kN; Vf is not scheduled.")
        ctx.add(CheckResult("stirrup_spacing", "Stirrup spacing", loc, f"{cl1}, {cl3}", status, msg, demand=s,
                            unit="mm"))
        return
    if status is CheckStatus.FAIL and not needed:
        ctx.add(CheckResult("stirrup_spacing", "Stirrup spacing", loc, f"{cl1}, {cl3}", CheckStatus.PASS,
                            f"s = {s:g} mm exceeds {limit:.0f} mm ({words}, cl. {clause}), but no stirrups are required "
                            f"{WHERE[loc]} (Vf ≤ Vc without them, h ≤ 750 mm), so the limit binds none here",
                            demand=s, capacity=limit, unit="mm"))
        return
    if status is CheckStatus.PASS:
        msg = "" if vf is not None else f"s ≤ {tight:.0f} mm, the tighter limit of cl. {cl3}"
    else:
        msg = (f"Stirrups at s = {s:g} mm exceed the largest spacing {limit:.0f} mm ({words}"
               + (f", halved because Vf > 0.125 λ φc f'c bw dv = {vhigh / N_PER_KN:.1f} kN" if high else "")
               + f") {WHERE[loc]} (cl. {clause}): space them at {math.floor(limit):.0f} mm or less.")
    ctx.add(CheckResult("stirrup_spacing", "Stirrup spacing", loc, f"{cl1}, {cl3}", status, msg, demand=s,
                        capacity=limit, unit="mm", utilisation=s / limit))


def _long_steel(ctx: SpanContext, loc: Location, e: EndShear | str) -> None:
    inp, code = ctx.inp, provisions(ctx)
    assert code is not None
    clause = ctx.code.clauses["long_steel"]
    if isinstance(e, str) or e.vf is None:
        why = e if isinstance(e, str) else "Vf is not scheduled"
        ctx.add(CheckResult("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.NOT_CHECKED,
                            f"Longitudinal steel for shear {WHERE[loc]} not checked: {why} (cl. {clause}).",
                            unit="kN"))
        return
    side = e.side
    if side.mf is None:
        ctx.add(CheckResult("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.NOT_CHECKED,
                            f"Longitudinal steel for shear {WHERE[loc]} not checked: {side.mf_words} is not "
                            f"scheduled (cl. {clause}).", unit="kN"))
        return
    theta = e.angles.theta
    if theta is None:  # the special member β carries no θ: the method's θ
        theta = 35.0
    vs_used = code.long_steel_vs_cap(e.vs, e.vf)
    ft = longitudinal_tension(side.mf, e.vf, vs_used, e.nf, e.dv, theta)
    cap = ctx.phi_s * e.As * inp.fy
    t = ctx.add_trace
    t("long_steel_shear", loc, "Mf", side.mf / NMM_PER_KNM, "kN·m", clause, side.mf_words)
    t("long_steel_shear", loc, "θ", theta, "°", e.angles.clause, "as in the shear check")
    t("long_steel_shear", loc, "Vs used", vs_used / N_PER_KN, "kN", clause, "Vs, not taken greater than Vf")
    t("long_steel_shear", loc, "Ft", ft / N_PER_KN, "kN", clause, "Mf/dv + 0.5 Nf + (Vf − 0.5 Vs) cot θ")
    t("long_steel_shear", loc, "φs As fy", cap / N_PER_KN, "kN", clause, f"{side.bars}: As = {e.As:.0f} mm²")
    ft_k, cap_k = ft / N_PER_KN, cap / N_PER_KN
    u = ft / cap if cap > 0 else math.inf
    anchor = ""
    if side.face == "bottom":
        anchor = (f"At this simple support the {side.bars} bottom bars must be anchored past the inside face of the "
                  f"support to develop {(ft - side.mf / e.dv) / N_PER_KN:.1f} kN; check their extension or hooks.")
        if inp.bottom_bars_support is None:
            anchor += (" All the midspan bottom bars were taken to run into the support; schedule the bottom bars at "
                       "the supports if fewer do.")
    if u <= 1:
        ctx.add(CheckResult("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.PASS, anchor,
                            demand=ft_k, capacity=cap_k, unit="kN", utilisation=u))
        return
    msg = (f"The tension steel {WHERE[loc]} must carry Ft = Mf/dv + (Vf − 0.5 Vs) cot θ = {ft_k:.1f} kN but "
           f"φs As fy = {cap_k:.1f} kN ({side.bars}; cl. {clause}): add {side.face} bars there"
           + (" or more stirrups" if e.vs > 0 or inp.stirrups is None else "") + ". " + anchor)
    ctx.add(CheckResult("long_steel_shear", "Long. steel for shear", loc, clause, CheckStatus.FAIL, msg.strip(),
                        demand=ft_k, capacity=cap_k, unit="kN", utilisation=u))


def run(ctx: SpanContext) -> None:
    """Shear at each end (or once for the span when no Vf is scheduled at all)."""
    inp = ctx.inp
    clause = ctx.code.clauses.get("shear_resistance", "11.3")
    if provisions(ctx) is None:
        ctx.add(CheckResult("shear", "Shear", None, clause, CheckStatus.NOT_CHECKED,
                            f"The design code in force ({ctx.code.id}) provides no shear provisions to beamsched."))
        return
    ends: tuple[End, End] = ("left", "right")
    solved = {end: solve_end(ctx, end) for end in ends}
    if inp.Vf_left is None and inp.Vf_right is None:
        why = "no Vf is scheduled at either end; a blank demand is never read as zero"
        _shear(ctx, None, why)
        first = next((solved[x] for x in ends if isinstance(solved[x], EndShear)), why)
        _min_stirrups(ctx, None, first if isinstance(first, EndShear) else why, None)
        dvs = [e.dv for e in solved.values() if isinstance(e, EndShear)]
        if inp.stirrups is not None and dvs:
            _spacing(ctx, None, min(dvs), None)
        _long_steel(ctx, None, why)
    else:
        for end in ends:
            e = solved[end]
            if inp.end_condition(end) == "free" and vf_at(ctx, end) is None:
                # the tip of a cantilever carries no shear by statics: nothing to check there
                ctx.add_trace("shear", end, "Vf", "not scheduled", "", clause,
                              "free end (cantilever tip): no shear by statics, no check made there")
                continue
            _shear(ctx, end, e)
            _min_stirrups(ctx, end, e, vf_at(ctx, end))
            if inp.stirrups is not None and isinstance(e, EndShear):
                vf = vf_at(ctx, end)
                needed = vf is None or bool(provisions(ctx).min_stirrups_reasons(vf, e.vc0, inp.h))  # type: ignore[union-attr]
                _spacing(ctx, end, e.dv, vf, needed)
            _long_steel(ctx, end, e)
    vr = [v for v in (ctx.values.get("Vr_left_kN"), ctx.values.get("Vr_right_kN")) if v is not None]
    if vr:
        ctx.values["Vr_kN"] = min(vr)  # type: ignore[type-var]
