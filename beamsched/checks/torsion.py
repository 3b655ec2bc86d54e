"""Torsion threshold (``torsion``, CSA A23.3-19 11.2.9.1).

Where Tf is scheduled it is compared with 0.25 Tcr, Tcr = (Acp²/pc) 0.38 λ φc √f'c. For a
flanged section Acp and pc are found twice: for the web alone (bw × h) and with the flange
overhang the clause allows on each flanged side, not more than the web's projection below the
slab (h − hf) nor 4 hf (from memory), nor the scheduled overhang; beamsched uses the smaller
Tcr of the two, which is conservative, and the trace says which governed.

Policy (``required``): Tf above the threshold makes the span incomplete ("full torsion design
required (11.3.10)"): beamsched does not design for torsion. An L-beam (a spandrel) with no Tf
is ``not_checked`` and required ("torsion not assessed"); Tf = 0 is an explicit statement that
torsion was assessed. A rectangular or T-beam with no Tf gets a reminder (required=False).
"""

from __future__ import annotations

from ..codes.base import DetailingProvisions
from ..model import CheckStatus
from .context import NMM_PER_KNM, SpanContext


def sections(ctx: SpanContext, code: DetailingProvisions) -> list[tuple[str, float, float]]:
    """(words, Acp, pc) for the web alone and, for T and L, with the allowed overhang."""
    inp = ctx.inp
    out = [("web alone, bw × h", inp.bw * inp.h, 2 * (inp.bw + inp.h))]
    if inp.shape in ("T", "L") and inp.hf is not None:
        sides = 2 if inp.shape == "T" else 1
        o, words = code.torsion_flange_overhang(inp.h, inp.hf)
        if inp.bf is not None and (inp.bf - inp.bw) / sides < o:
            o, words = (inp.bf - inp.bw) / sides, "the scheduled overhang"
        if o > 0:
            out.append((f"with {o:.0f} mm of flange on {'each side' if sides == 2 else 'one side'} ({words})",
                        inp.bw * inp.h + sides * o * inp.hf, 2 * (inp.bw + inp.h) + 2 * sides * o))
    return out


def run(ctx: SpanContext) -> None:
    code = ctx.code if isinstance(ctx.code, DetailingProvisions) else None
    if code is None:
        return
    inp, t = ctx.inp, ctx.add_trace
    clause, design = ctx.code.clauses["torsion_threshold"], ctx.code.clauses["torsion_design"]
    if inp.Tf is None:
        if inp.shape == "L":
            ctx.result("torsion", "Torsion", None, clause, CheckStatus.NOT_CHECKED,
                       f"Torsion not assessed: an L-beam (a spandrel) usually carries torsion from the slab "
                       f"it supports, and no Tf is scheduled (cl. {clause}). Schedule Tf, or Tf = 0 where it "
                       "has been assessed as negligible.", unit="kN·m")
        else:
            ctx.result("torsion", "Torsion", None, clause, CheckStatus.NOT_CHECKED,
                       f"Reminder: no Tf is scheduled, so torsion was not assessed (cl. {clause}).",
                       unit="kN·m", required=False)
        return
    tf = abs(inp.Tf)
    frac = code.torsion_threshold_fraction()
    results = []
    for words, acp, pc in sections(ctx, code):
        tcr = code.torsion_cracking(acp, pc, inp.lam, ctx.phi_c, inp.fc)
        results.append((tcr, words))
        t("torsion", None, "Acp", acp, "mm²", clause, words)
        t("torsion", None, "pc", pc, "mm", clause, words)
        t("torsion", None, "Tcr", tcr / NMM_PER_KNM, "kN·m", clause, "(Acp²/pc) 0.38 λ φc √f'c, " + words)
    tcr, words = min(results)
    limit = frac * tcr
    t("torsion", None, "0.25 Tcr", limit / NMM_PER_KNM, "kN·m", clause,
      f"threshold from the smaller Tcr ({words})" + ("; the smaller of the two, conservative" if len(results) > 1 else ""))
    t("torsion", None, "Tf", tf / NMM_PER_KNM, "kN·m", clause, "factored torsion, as scheduled")
    u = tf / limit
    if u <= 1:
        ctx.result("torsion", "Torsion", None, clause, CheckStatus.PASS,
                   f"Tf ≤ 0.25 Tcr: torsion may be neglected (cl. {clause})" if tf > 0 else
                   f"Tf = 0 as scheduled: torsion assessed as none (cl. {clause})",
                   demand=tf / NMM_PER_KNM, capacity=limit / NMM_PER_KNM, unit="kN·m", utilisation=u)
        return
    ctx.result("torsion", "Torsion", None, f"{clause}, {design}", CheckStatus.NOT_CHECKED,
               f"Tf = {tf / NMM_PER_KNM:.1f} kN·m exceeds 0.25 Tcr = {limit / NMM_PER_KNM:.1f} kN·m (cl. {clause}, "
               f"{words}): full torsion design required ({design}), which beamsched does not make; the "
               "shear and longitudinal steel checks here ignore torsion.",
               # Tf against the threshold, not against a resistance: no utilisation, so that
               # the span's largest utilisation and governing check stay capacity ratios
               demand=tf / NMM_PER_KNM, capacity=limit / NMM_PER_KNM, unit="kN·m")
