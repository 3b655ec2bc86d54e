"""Scope checks: is the span a member that sectional design, as beamsched makes it, covers?
``scope_deep``, ``scope_seismic`` and ``scope_axial`` (location None).

* ``scope_deep``: a deep flexural member by cl. 10.7.1 (h/ℓn > 2/5 continuous, > 4/5 simple:
  from memory; a free end counts as continuous, the stricter limit), or a deep shear span
  (shear span / d < 2, designed by strut-and-tie, cl. 11.4). The schedule does not say where
  the loads are, so the shear span at each end is estimated (see :func:`shear_span`): exact
  for one concentrated load (a transfer girder carrying a column) and for uniform load on a
  simple span; a heavy load near a support among other loads may escape it, so the engineer
  must still identify transfer girders. d is that of the midspan bottom bars.
* ``scope_seismic``: SFRS = yes is out of scope (Clause 21 is not covered); SFRS not stated
  gives a reminder.
* ``scope_axial``: made only when Pf is scheduled (a blank Pf is taken as a beam without axial
  force, the schedule's usual meaning). Compression above 0.1 f'c Ag (beamsched's limit for a
  beam-column) or any axial tension (the flexural checks ignore axial force) is out of scope.

Policy (``required``): out of scope is ``not_checked`` and required, so the span is
incomplete, never pass; a span with no length is ``not_checked`` on scope_deep too. The
SFRS reminder is required=False.
"""

from __future__ import annotations

from ..codes.base import DetailingProvisions
from ..model import CheckStatus
from .context import N_PER_KN, FlexureCase, SpanContext
from .shear import vf_at


def shear_span(mf_pos: float, mf_neg_end: float, vf_end: float, vf_other: float | None,
               ln: float | None) -> tuple[float, str]:
    """Estimate the shear span at one end (mm), and how.

    a1 = (Mf+ + Mf- at the end) / Vf at the end: the moment at a load is Vf times its distance
    from the support when no other load lies between, so a1 is exact for one concentrated load
    and never more than the distance to zero shear. a2 = ℓn · Vf,other / (Vf,end + Vf,other):
    by statics of a simple span, the distance to the resultant of the loads (ℓn/2 under uniform
    load, exactly a under one concentrated load). The larger of the two is used where both are
    known: exact for one concentrated load and for uniform load on a simple span.
    """
    a1 = (mf_pos + mf_neg_end) / vf_end
    if ln is None or vf_other is None or vf_end + vf_other <= 0:
        return a1, "(Mf+ + Mf-) / Vf, exact for one concentrated load"
    a2 = ln * vf_other / (vf_end + vf_other)
    if a2 > a1:
        return a2, "ℓn · Vf,other / (Vf,L + Vf,R): distance to the resultant of the loads"
    return a1, "(Mf+ + Mf-) / Vf at that end: the moment over the shear"


# beamsched policy: with only the centre-to-centre span scheduled, a span/h below this multiple of
# the deep-member limit leaves the question open (the clear span is shorter by the supports'
# width, unknown here), rather than passing on the longer, unconservative length.
UNKNOWN_CLEAR_MARGIN = 2.0


def _deep(ctx: SpanContext, code: DetailingProvisions) -> None:
    inp, t = ctx.inp, ctx.add_trace
    c_deep, c_ss = ctx.code.clauses["deep_member"], ctx.code.clauses["deep_shear_span"]
    clause = f"{c_deep}, {c_ss}"
    reasons: list[str] = []
    reasons_unknown: list[str] = []
    made: list[str] = []
    ln = inp.clear_span if inp.clear_span is not None else inp.span
    continuous = inp.left_end != "simple" or inp.right_end != "simple"
    if ln is not None:
        limit = code.deep_member_span_ratio(continuous)
        ratio = ln / inp.h
        t("scope_deep", None, "ℓn / h", ratio, "", c_deep,
          ("clear span" if inp.clear_span is not None else "centre-to-centre span (no clear span)")
          + f" over h; deep below {limit:g} ({'continuous' if continuous else 'simple'} span)")
        if ratio < limit:
            reasons.append(f"ℓn/h = {ratio:.2f} < {limit:g}: a deep flexural member (cl. {c_deep}); design it for the "
                           "nonlinear strain distribution and lateral buckling, e.g. by strut-and-tie (cl. 11.4)")
        elif inp.clear_span is None and ratio < UNKNOWN_CLEAR_MARGIN * limit:
            reasons_unknown.append(
                f"only the centre-to-centre span is scheduled and span/h = {ratio:.2f} is within "
                f"{UNKNOWN_CLEAR_MARGIN:g} × {limit:g}: the clear span, shorter by the supports' width, may fall below "
                f"the deep-member limit of cl. {c_deep}; schedule the clear span")
        else:
            made.append(f"ℓn/h = {ratio:.2f} ≥ {limit:g}")
    flex = ctx.flexure("pos", "mid")
    deep_ends: list[str] = []
    if isinstance(flex, FlexureCase) and inp.Mf_pos is not None:
        ratio_min = code.deep_shear_span_ratio()
        for end in ("left", "right"):
            vf = vf_at(ctx, end)  # magnitudes
            other = vf_at(ctx, "right" if end == "left" else "left")
            mneg = (inp.Mf_neg_left if end == "left" else inp.Mf_neg_right) or 0.0
            if not vf:
                continue
            a, words = shear_span(inp.Mf_pos, mneg, vf, other, ln)
            t("scope_deep", None, f"a {end}", a, "mm", c_ss, words)
            t("scope_deep", None, f"a/d {end}", a / flex.d, "", c_ss, f"d = {flex.d:.0f} mm (midspan bottom bars)")
            if a / flex.d < ratio_min:
                deep_ends.append(f"the {end} end (a ≈ {a:.0f} mm = {a / flex.d:.2f} d)")
            else:
                made.append(f"a/d {end} = {a / flex.d:.2f} ≥ {ratio_min:g}")
    if deep_ends:
        reasons.append(f"deep shear span (shear span < {code.deep_shear_span_ratio():g} d; estimate in the trace) at "
                       + " and ".join(deep_ends) + f": design by strut-and-tie (cl. {c_ss}); sectional shear does not "
                       "check its ties, nodes and anchorage")
    if reasons:
        ctx.result("scope_deep", "Scope: deep member", None, clause, CheckStatus.NOT_CHECKED,
                   "Outside sectional design: " + "; ".join(reasons) + ". beamsched does not check it.")
    elif reasons_unknown:
        ctx.result("scope_deep", "Scope: deep member", None, clause, CheckStatus.NOT_CHECKED,
                   "Whether this is a deep flexural member is unknown: " + "; ".join(reasons_unknown) + ".")
    elif ln is None:
        ctx.result("scope_deep", "Scope: deep member", None, clause, CheckStatus.NOT_CHECKED,
                   f"Whether this is a deep flexural member (cl. {c_deep}) is unknown: no span length is "
                   "scheduled.")
    else:
        ctx.result("scope_deep", "Scope: deep member", None, clause, CheckStatus.PASS,
                   "not a deep member: " + ", ".join(made))


def _seismic(ctx: SpanContext) -> None:
    clause = ctx.code.clauses["sfrs"]
    sfrs = ctx.inp.sfrs
    if sfrs:
        ctx.result("scope_seismic", "Scope: SFRS", None, clause, CheckStatus.NOT_CHECKED,
                   f"SFRS = yes: members of the seismic force-resisting system are designed to Clause {clause} "
                   "(capacity design, ductile detailing), which beamsched does not cover.")
    elif sfrs is None:
        ctx.result("scope_seismic", "Scope: SFRS", None, clause, CheckStatus.NOT_CHECKED,
                   f"Reminder: SFRS is not stated; checked as a gravity member. If it is part of the seismic "
                   f"force-resisting system, Clause {clause} applies and is not covered.", required=False)
    else:
        ctx.result("scope_seismic", "Scope: SFRS", None, clause, CheckStatus.PASS,
                   "not part of the seismic force-resisting system (as scheduled)")


def _axial(ctx: SpanContext, code: DetailingProvisions) -> None:
    inp, t = ctx.inp, ctx.add_trace
    if inp.Pf is None:
        return
    clause = ctx.code.clauses["beam_column"]
    ag = ctx.section.area
    limit = code.beam_column_axial_limit(inp.fc, ag)
    t("scope_axial", None, "Ag", ag, "mm²", clause, "gross area (with the effective flange)")
    t("scope_axial", None, "0.1 f'c Ag", limit / N_PER_KN, "kN", clause, "beamsched's beam-column limit (a policy)")
    t("scope_axial", None, "Pf", inp.Pf / N_PER_KN, "kN", clause, "compression positive")
    pf_k = inp.Pf / N_PER_KN
    if inp.Pf > limit:
        ctx.result("scope_axial", "Scope: axial load", None, clause, CheckStatus.NOT_CHECKED,
                   f"Pf = {pf_k:.1f} kN compression exceeds 0.1 f'c Ag = {limit / N_PER_KN:.1f} kN: design it as "
                   "a beam-column (flexure with axial load, slenderness); beamsched checks beams only.",
                   # against the scope limit, not a resistance: no utilisation (see torsion)
                   demand=pf_k, capacity=limit / N_PER_KN, unit="kN")
    elif inp.Pf < 0:
        ctx.result("scope_axial", "Scope: axial load", None, clause, CheckStatus.NOT_CHECKED,
                   f"Pf = {-pf_k:.1f} kN tension: the flexural checks ignore axial force, and tension lowers "
                   "Mr; design for flexure with axial tension (the shear checks include Nf).",
                   demand=pf_k, unit="kN")
    else:
        ctx.result("scope_axial", "Scope: axial load", None, clause, CheckStatus.PASS,
                   f"Pf = {pf_k:.1f} kN ≤ 0.1 f'c Ag: checked as a beam; Pf is ignored in flexure and shear "
                   "(compression, conservative there)", demand=pf_k, capacity=limit / N_PER_KN, unit="kN",
                   utilisation=max(inp.Pf, 0.0) / limit)


def run(ctx: SpanContext) -> None:
    code = ctx.code if isinstance(ctx.code, DetailingProvisions) else None
    if code is None:
        return
    _deep(ctx, code)
    _seismic(ctx)
    _axial(ctx, code)
