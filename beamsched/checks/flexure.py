"""Flexural checks: resistance (flexure_pos / flexure_neg), the c/d limit (cd_limit_pos /
cd_limit_neg) and the minimum tension steel (min_steel_pos / min_steel_neg).

Where each is made:
* midspan, sagging (flange in compression): always;
* each support, hogging (flange in tension, top bars in tension): at a continuous end, or
  wherever an Mf- is scheduled (a simple or free end carries no hogging by statics);
* each support, sagging (load reversal): only where an Mf+ at that support is scheduled.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np

from ..model import BeamInput, CheckStatus, Location
from ..solve.flexure import required_scale
from .context import NMM_PER_KNM, FlexureCase, Sense, SpanContext, solve_cases

SENSE_WORDS = {"pos": "sagging", "neg": "hogging"}
MF_NAMES = {("pos", "mid"): "Mf+", ("pos", "left"): "Mf+ L", ("pos", "right"): "Mf+ R",
            ("neg", "left"): "Mf- L", ("neg", "right"): "Mf- R"}
VALUE_KEYS = {("pos", "mid"): "Mr_pos_kNm", ("pos", "left"): "Mr_pos_left_kNm",
              ("pos", "right"): "Mr_pos_right_kNm", ("neg", "left"): "Mr_neg_left_kNm",
              ("neg", "right"): "Mr_neg_right_kNm"}
WHERE = {"mid": "at midspan", "left": "at the left support", "right": "at the right support"}


def demand(ctx: SpanContext, sense: Sense, location: Location) -> float | None:
    return demand_of(ctx.inp, sense, location)


MIDSPAN: tuple[Sense, Location] = ("pos", "mid")  # always solved: scope reads its Mr
DEMAND_FIELDS = {("pos", "mid"): "Mf_pos", ("pos", "left"): "Mf_pos_left", ("pos", "right"): "Mf_pos_right",
                 ("neg", "left"): "Mf_neg_left", ("neg", "right"): "Mf_neg_right"}


def demand_of(inp: BeamInput, sense: Sense, location: Location) -> float | None:
    """The scheduled factored moment of a case (N·mm; hogging as a magnitude), None if blank."""
    return getattr(inp, DEMAND_FIELDS[(sense, location)])


def cases(ctx: SpanContext) -> list[tuple[Sense, Location]]:
    """The flexural sections this span must be checked at (several checks ask; worked out once)."""
    if ctx.cases is None:
        ctx.cases = _cases(ctx)
    return ctx.cases


def _cases(ctx: SpanContext) -> list[tuple[Sense, Location]]:
    inp = ctx.inp
    cantilever = "free" in (inp.left_end, inp.right_end)
    out: list[tuple[Sense, Location]] = [] if cantilever and inp.Mf_pos is None else [("pos", "mid")]
    for end in ("left", "right"):
        if inp.end_condition(end) == "continuous" or demand(ctx, "neg", end) is not None:  # type: ignore[arg-type]
            out.append(("neg", end))  # type: ignore[arg-type]
    for end in ("left", "right"):
        if demand(ctx, "pos", end) is not None:  # type: ignore[arg-type]
            out.append(("pos", end))  # type: ignore[arg-type]
    return out


def utilisation(dem: float, cap: float) -> float:
    if cap <= 0:
        return math.inf if dem > 0 else 0.0
    return dem / cap


def _trace_case(ctx: SpanContext, cid: str, case: FlexureCase) -> None:
    if not ctx.tracing:
        return
    s, inp, cl = case.solution, ctx.inp, ctx.code.clauses
    loc = case.location
    t = ctx.add_trace
    t(cid, loc, "compression face", f"{case.compression_face} ({SENSE_WORDS[case.sense]})", "", cl["flexure"],
      "face in compression")
    t(cid, loc, "f'c", inp.fc, "MPa", cl["fc_range"], "specified concrete strength")
    t(cid, loc, "fy", inp.fy, "MPa", cl["fy_limit"], "specified yield strength of the bars")
    t(cid, loc, "φc", ctx.phi_c, "", cl["phi_c"], "resistance factor, concrete" + (" (precast, certified plant)" if inp.precast else ""))
    t(cid, loc, "φs", ctx.phi_s, "", cl["phi_s"], "resistance factor, reinforcing bars")
    t(cid, loc, "α1", s.alpha1, "", cl["stress_block"], "α1 = 0.85 − 0.0015 f'c ≥ 0.67")
    t(cid, loc, "β1", s.beta1, "", cl["stress_block"], "β1 = 0.97 − 0.0025 f'c ≥ 0.67")
    t(cid, loc, "εcu", s.eps_cu, "", cl["eps_cu"], "strain at the extreme compression fibre")
    t(cid, loc, "α1φcf'c", s.fc_factored, "MPa", cl["stress_block"], "stress-block intensity")
    t(cid, loc, "tension bars", str(case.tension_bars), "", "", "flexural tension steel")
    t(cid, loc, "As", s.As, "mm²", "", "area of the flexural tension steel")
    t(cid, loc, "d", case.d, "mm", "", "depth of the centroid of the tension steel")
    if case.compression_bars is not None:
        t(cid, loc, "compression bars", str(case.compression_bars), "", "7.6.5",
          "counted (tied by stirrups)" if case.compression_tied else "not counted: no stirrups scheduled to tie them")
    outline = ctx.section.outline_from(case.compression_face)
    first = outline[0]
    if len(outline) > 1:
        t(cid, loc, "b1", first.width, "mm", "", f"width of the outline at the compression face, to depth {first.y1:g} mm")
        t(cid, loc, "a (trial)", s.trial_a, "mm", cl["stress_block"],
          "trial with all tension steel yielding and the block within that width: φs As fy / (α1φcf'c b1) "
          + ("≤" if s.trial_in_first_band else ">") + f" {first.y1:g} mm, so the block "
          + ("stays within it" if s.trial_in_first_band else "runs past it (into the web)"))
    t(cid, loc, "c", s.c, "mm", cl["strain_compat"], "neutral-axis depth that balances the forces (strain compatibility)")
    t(cid, loc, "a", s.a, "mm", cl["stress_block"], "a = β1 c")
    t(cid, loc, "c/d", s.c_over_d, "", cl["cd_limit"], "neutral-axis depth over d")
    for b in s.bars:
        yielded = abs(b.stress) >= inp.fy * (1 - 1e-9)
        state = "yields" if yielded else "elastic"
        if not b.bar.counted:
            state = "not counted (untied)"
        t(cid, loc, f"εs {b.bar.label}", b.strain, "", cl["strain_compat"],
          f"strain at depth {b.bar.depth:.1f} mm (compression +)")
        t(cid, loc, f"fs {b.bar.label}", b.stress, "MPa", cl["Es"], f"stress = Es εs capped at fy: {state}")
        t(cid, loc, f"F {b.bar.label}", b.force / 1e3, "kN", cl["phi_s"],
          "φs As fs" + (f" less {b.displaced / 1e3:.1f} kN of displaced concrete" if b.displaced > 0 else ""))
    where = "the flange" if s.block_in_first_band and len(outline) > 1 else (
        "the flange and web" if len(outline) > 1 else "the web")
    t(cid, loc, "Ac", s.block_area, "mm²", cl["stress_block"], f"area of the stress block (in {where})")
    t(cid, loc, "Cc", s.Cc / 1e3, "kN", cl["stress_block"], "concrete compression α1φcf'c Ac")
    t(cid, loc, "ȳc", s.yc, "mm", cl["stress_block"], "centroid of the stress-block area below the compression face")
    t(cid, loc, "C", s.C_total / 1e3, "kN", "", f"total compression, acting {s.y_C:.1f} mm below the compression face")
    t(cid, loc, "T", s.T / 1e3, "kN", "", f"total tension, acting {s.y_T:.1f} mm below the compression face")
    t(cid, loc, "z", s.lever_arm, "mm", "", "lever arm between C and T")
    t(cid, loc, "Mr", s.Mr / NMM_PER_KNM, "kN·m", cl["flexure"], "factored moment resistance")


def _flexure(ctx: SpanContext, sense: Sense, loc: Location) -> FlexureCase | None:
    cid = f"flexure_{sense}"
    mf = demand(ctx, sense, loc)
    name = MF_NAMES[(sense, loc)]
    label = "Flexure " + ("+" if sense == "pos" else "−")
    clause = ctx.code.clauses["flexure"]
    case = ctx.flexure(sense, loc)
    if isinstance(case, str):
        ctx.result(cid, label, loc, clause, CheckStatus.NOT_CHECKED,
                   f"{SENSE_WORDS[sense].capitalize()} flexure {WHERE[loc]} not checked: {case} (cl. {clause}).",
                   demand=None if mf is None else mf / NMM_PER_KNM, unit="kN·m")
        return None
    _trace_case(ctx, cid, case)
    mr = case.Mr / NMM_PER_KNM
    ctx.values[VALUE_KEYS[(sense, loc)]] = mr
    if mf is None:
        ctx.result(cid, label, loc, clause, CheckStatus.NOT_CHECKED,
                   f"{name} is not scheduled, so {SENSE_WORDS[sense]} flexure {WHERE[loc]} was not checked "
                   f"(Mr = {mr:.1f} kN·m; cl. {clause}). A blank demand is never read as zero.",
                   capacity=mr, unit="kN·m")
        return case
    mf_k = mf / NMM_PER_KNM
    u = utilisation(mf_k, mr)
    ok = u <= 1.0
    msg = "" if ok else (
        f"{name} = {mf_k:.1f} kN·m exceeds Mr = {mr:.1f} kN·m {WHERE[loc]} (cl. {clause}): "
        f"add {'bottom' if sense == 'pos' else 'top'} steel or enlarge the section.")
    ctx.result(cid, label, loc, clause, CheckStatus.PASS if ok else CheckStatus.FAIL, msg,
               demand=mf_k, capacity=mr, unit="kN·m", utilisation=u)
    return case


def _cd_limit(ctx: SpanContext, sense: Sense, loc: Location, case: FlexureCase) -> None:
    clause = ctx.code.clauses["cd_limit"]
    limit = ctx.code.cd_limit(ctx.inp.fy)
    cd = case.c_over_d
    ok = cd <= limit
    ctx.add_trace(f"cd_limit_{sense}", loc, "(c/d)max", limit, "", clause, "700 / (700 + fy)")
    msg = "" if ok else (
        f"c/d = {cd:.3f} exceeds {limit:.3f} = 700/(700 + fy) {WHERE[loc]} (cl. {clause}): the tension steel "
        "does not yield (over-reinforced). Mr was found by strain compatibility, but practice avoids "
        "this: enlarge the section, raise f'c, or add compression steel.")
    ctx.result(f"cd_limit_{sense}", "c/d limit " + ("+" if sense == "pos" else "−"), loc, clause,
               CheckStatus.PASS if ok else CheckStatus.FAIL, msg, demand=cd, capacity=limit,
               unit="", utilisation=cd / limit)


def required_steel(ctx: SpanContext, case: FlexureCase, mf: float) -> float:
    """As required for Mf: the tension steel, at the scheduled positions, scaled until Mr = Mf
    (solved on the strain-compatibility solver, not by ratio). Worked out for all of a
    schedule's sections at once by :func:`prepare`; a case it did not see is solved alone."""
    key = (case.sense, case.location, mf)
    held = ctx.required.get(key)
    if held is None:
        held = ctx.roots.get(key)
        held = ctx.required[key] = _required([case], [mf])[0] if held is None else held
    return held


def _required(flex: Sequence[FlexureCase], mf: Sequence[float]) -> list[float]:
    """As,req of each case for its Mf (mm²), all solved at once (the cases may come from
    different solves)."""
    out = [0.0] * len(flex)
    by_columns: dict[int, list[int]] = {}
    for i, case in enumerate(flex):
        by_columns.setdefault(id(case.columns), []).append(i)
    for members in by_columns.values():
        columns = flex[members[0]].columns
        rows = np.array([flex[i].row for i in members])
        k = required_scale(columns.take(rows), [flex[i].Mr for i in members], [mf[i] for i in members])
        for i, ki in zip(members, k.tolist(), strict=True):
            out[i] = 0.0 if mf[i] <= 0 else ki * flex[i].As
    return out


def prepare(contexts: Sequence[SpanContext]) -> None:
    """Solve every flexural section of these spans at once, and the steel each moment requires
    (the checks then read them): one set of columns, whatever the number of spans."""
    keys: list[tuple[SpanContext, tuple[Sense, Location]]] = []
    for ctx in contexts:
        wanted = cases(ctx)
        keys.extend((ctx, key) for key in wanted)
        if MIDSPAN not in wanted:
            keys.append((ctx, MIDSPAN))
    solve_cases(keys)
    need: list[tuple[SpanContext, FlexureCase, float]] = []
    for ctx, key in keys:
        case = ctx._flexure[key]
        if isinstance(case, FlexureCase):
            mf = getattr(ctx.inp, DEMAND_FIELDS[key])
            if mf is not None and (*key, mf) not in ctx.roots:
                need.append((ctx, case, mf))
    for (ctx, case, mf), as_req in zip(need, _required([c for _, c, _ in need], [m for _, _, m in need]), strict=True):
        ctx.required[(case.sense, case.location, mf)] = as_req


def _min_steel(ctx: SpanContext, sense: Sense, loc: Location, case: FlexureCase) -> None:
    inp, code = ctx.inp, ctx.code
    cid = f"min_steel_{sense}"
    clause, exempt_clause = code.clauses["min_steel"], code.clauses["min_steel_exempt"]
    bf = ctx.section.bf if ctx.section.flanged else inp.bw
    bt = code.min_steel_tension_width(inp.shape, inp.bw, bf or inp.bw, flange_in_tension=(sense == "neg"))
    as_min = code.min_tension_steel(inp.fc, inp.fy, bt, inp.h)
    as_prov = case.As
    t = ctx.add_trace
    if ctx.tracing:
        t(cid, loc, "bt", bt, "mm", clause, "width of the tension zone" + (
            " (flange in tension, capped at 2.5 bw for T, 1.5 bw for L)" if sense == "neg" and inp.shape != "rect" else ""))
        t(cid, loc, "As,min", as_min, "mm²", clause, "0.2 √f'c bt h / fy")
        t(cid, loc, "As", as_prov, "mm²", "", "tension steel provided")
    mf = demand(ctx, sense, loc)
    need = as_min
    note = ""
    if mf is not None:
        as_req = required_steel(ctx, case, mf)
        if ctx.tracing:
            t(cid, loc, "As,req", as_req, "mm²", exempt_clause,
              "tension steel needed for Mf (solved by strain compatibility)")
            t(cid, loc, "4/3 As,req", code.min_steel_exemption * as_req, "mm²", exempt_clause,
              "minimum waived when As ≥ 4/3 As,req")
        if code.min_steel_exemption * as_req < as_min:
            need = code.min_steel_exemption * as_req
            if as_prov >= need:
                note = f" (waived by cl. {exempt_clause}: As ≥ 4/3 As,req = {need:.0f} mm²)"
    ok = as_prov >= need * (1 - 1e-9)
    msg = "" if ok else (
        f"As = {as_prov:.0f} mm² is less than As,min = {as_min:.0f} mm² {WHERE[loc]} (cl. {clause}, bt = {bt:.0f} mm)"
        + ("" if mf is None else f" and less than 4/3 of the {as_req:.0f} mm² Mf needs (cl. {exempt_clause})")
        + ": add tension steel.")
    ctx.result(cid, "Min. steel " + ("+" if sense == "pos" else "−"), loc,
               f"{clause}, {exempt_clause}", CheckStatus.PASS if ok else CheckStatus.FAIL,
               msg or note.strip(" ()"), demand=need, capacity=as_prov, unit="mm²",
               utilisation=need / as_prov if as_prov > 0 else math.inf)


CASE_KEYS: tuple[tuple[Sense, Location], ...] = (("pos", "mid"), ("neg", "left"), ("neg", "right"),
                                                 ("pos", "left"), ("pos", "right"))


CASE_INDEX = {key: j for j, key in enumerate(CASE_KEYS)}


def found_roots(ctx: SpanContext) -> list[float]:
    """What the searches found for a span, in a fixed order (NaN where none): the neutral-axis
    depth of each case of :data:`CASE_KEYS`, then the As,req of each. A trace worked out again
    starts from them (:func:`given_roots`) and so shows the numbers the checks found."""
    out = [math.nan] * (2 * len(CASE_KEYS))
    for key, case in ctx._flexure.items():
        if isinstance(case, FlexureCase):
            out[CASE_INDEX[key]] = case.c
    for (sense, loc, _), value in ctx.required.items():
        out[len(CASE_KEYS) + CASE_INDEX[(sense, loc)]] = value
    return out


def given_roots(inp: BeamInput, found: Sequence[float]) -> dict[tuple, float]:
    """:func:`found_roots` as :class:`SpanContext` takes them."""
    out: dict[tuple, float] = {}
    for j, key in enumerate(CASE_KEYS):
        c, as_req = found[j], found[len(CASE_KEYS) + j]
        if not math.isnan(c):
            out[key] = c
        mf = demand_of(inp, *key)
        if not math.isnan(as_req) and mf is not None:
            out[(*key, mf)] = as_req
    return out


def run(ctx: SpanContext) -> None:
    """Every flexural check of the span, in reading order: midspan, then each support.

    A cantilever (one end free) with no Mf+ scheduled hogs along its whole length under
    gravity load: midspan sagging is then reported as not checked but not required."""
    inp = ctx.inp
    if "free" in (inp.left_end, inp.right_end) and inp.Mf_pos is None:
        clause = ctx.code.clauses["flexure"]
        ctx.result("flexure_pos", "Flexure +", "mid", clause, CheckStatus.NOT_CHECKED,
                   f"Cantilever with no Mf+ scheduled: a cantilever under gravity load hogs along its "
                   f"length, so sagging at midspan was not checked (cl. {clause}). Schedule Mf+ if the "
                   f"span can sag (uplift, load reversal).", unit="kN·m", required=False)
    for sense, loc in cases(ctx):
        case = _flexure(ctx, sense, loc)
        if case is None:
            continue
        _cd_limit(ctx, sense, loc, case)
        _min_steel(ctx, sense, loc, case)
    left, right = ctx.values.get("Mr_neg_left_kNm"), ctx.values.get("Mr_neg_right_kNm")
    both = [v for v in (left, right) if v is not None]
    if both:
        ctx.values["Mr_neg_kNm"] = min(both)  # type: ignore[type-var]
