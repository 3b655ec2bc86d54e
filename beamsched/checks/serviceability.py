"""Serviceability checks: ``crack_control`` (10.6.1) and ``min_depth`` (9.8.2.1, Table 9.2).

crack_control is made where fy > 300 MPa, at the tension face under sagging (``mid``) and at
each support where hogging is checked (``left``/``right``, same rule as the flexural checks):
z = fs (dc A)^(1/3) against 30 000 N/mm (interior) or 25 000 N/mm (exterior), z × 1.2 for
epoxy-coated bars. fs = 0.6 fy unless a service moment is scheduled (Ms_pos at midspan, Ms_neg
at the supports), in which case fs comes from the cracked elastic section (compression steel
ignored, which raises fs: conservative; Ec per 8.6.2.2). dc is the clear cover (to the bar:
stirrup cover + stirrup) capped at 50 mm plus half the bar, for the layer nearest the face;
A = 2 ȳ bw / N with ȳ the depth of the tension-steel centroid (its cover part capped likewise)
and N = As / area of the largest bar. With fy ≤ 300 MPa one passing result says the clause
does not apply.

min_depth: h against ℓn/16, /18, /21 or /8 by the end conditions (a free end: cantilever),
times (0.4 + fy/670) for fy ≠ 400 MPa and the density factor. ℓn is the clear span, or the
centre-to-centre span (longer, conservative) with a note when no clear span is scheduled. A
pass means Table 9.2 waives the deflection calculation, and only for members not supporting
or attached to partitions likely to be damaged by deflection; a shallower member is
``not_checked`` (required): a deflection calculation is needed, which beamsched does not make.

Policy (``required``): both are required; min_depth with no span length is ``not_checked``.
"""

from __future__ import annotations

from ..codes.base import DetailingProvisions
from ..model import CheckStatus, Location
from ..section import Rect, centroid_depth
from .context import NMM_PER_KNM, Sense, SpanContext
from .flexure import cases

WHERE = {"mid": "at midspan", "left": "at the left support", "right": "at the right support"}


def cracked_steel_stress(outline: tuple[Rect, ...], bars: list[tuple[float, float]], n: float, ms: float) -> tuple[float, float, float]:
    """Service stress in the tension steel of a cracked elastic section (MPa).

    ``outline``: bands below the compression face; ``bars``: (area mm², depth mm below the
    compression face) of the tension steel; ``n`` = Es/Ec; ``ms`` the service moment (N·mm).
    Returns (fs at the steel centroid, kd, Icr). Concrete in tension and compression steel are
    ignored; the neutral axis balances the first moments of the transformed section.
    """
    def first_moment(kd: float) -> float:
        q = 0.0
        for r in outline:
            top, bottom = r.y0, min(r.y1, kd)
            if bottom <= top:
                break
            q += r.width * (bottom - top) * (kd - (top + bottom) / 2)
        return q - n * sum(a * (d - kd) for a, d in bars)

    h = max(r.y1 for r in outline)
    lo, hi = 0.0, h
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if first_moment(mid) < 0:
            lo = mid
        else:
            hi = mid
    kd = 0.5 * (lo + hi)
    icr = 0.0
    for r in outline:
        top, bottom = r.y0, min(r.y1, kd)
        if bottom <= top:
            break
        icr += r.width * ((kd - top) ** 3 - (kd - bottom) ** 3) / 3
    icr += n * sum(a * (d - kd) ** 2 for a, d in bars)
    area = sum(a for a, _ in bars)
    d = sum(a * dd for a, dd in bars) / area
    return n * ms * (d - kd) / icr, kd, icr


def _crack(ctx: SpanContext, code: DetailingProvisions, sense: Sense, loc: Location) -> None:
    inp, t = ctx.inp, ctx.add_trace
    clause = ctx.code.clauses["crack_control"]
    tension, _, name = ctx.bars_for(sense, loc)
    face = "bottom" if sense == "pos" else "top"
    if tension is None:
        ctx.result("crack_control", "Crack control", loc, clause, CheckStatus.NOT_CHECKED,
                   f"Crack control {WHERE[loc]} not checked: no {name} scheduled (cl. {clause}).", unit="N/mm")
        return
    placed = ctx.place(tension, face, tension=True)
    cover_face = inp.cover_top if face == "top" else inp.cover_bottom
    clear = cover_face + ctx.stirrup_db  # clear cover to the bars
    cap = code.crack_cover_cap()
    used = min(clear, cap)
    first = [p for p in placed if p.layer == 1]
    db1 = max(p.db for p in first)
    lumped = placed[0].lumped
    if lumped:  # explicit d: the bars sit at h − d, their clear cover is that less db/2
        clear = placed[0].depth - db1 / 2
        used = min(clear, cap)
    dc = used + db1 / 2
    ybar = centroid_depth(placed) - (clear - used)
    largest = tension.largest_bar
    nbars = tension.area / largest.area
    A = 2 * ybar * inp.bw / nbars
    ms = inp.Ms_pos if sense == "pos" else inp.Ms_neg
    if ms is None:
        fs = code.crack_fs_default(inp.fy)
        fs_words = "fs = 0.6 fy (no service moment scheduled)"
    else:
        rho = code.density_kg_m3(inp.density, inp.lam) or 2300.0
        ec = code.concrete_modulus(inp.fc, rho)
        n = ctx.code.Es / ec
        outline = ctx.section.outline_from("top" if sense == "pos" else "bottom")
        bars = [(p.area, inp.h - p.depth) for p in placed]
        fs, kd, icr = cracked_steel_stress(outline, bars, n, abs(ms))
        t("crack_control", loc, "Ms", abs(ms) / NMM_PER_KNM, "kN·m", clause, "service moment, as scheduled")
        t("crack_control", loc, "Ec", ec, "MPa", ctx.code.clauses["Ec"], f"(3300 √f'c + 6900)(γc/2300)^1.5, γc = {rho:g} kg/m³")
        t("crack_control", loc, "n", n, "", clause, "Es / Ec")
        t("crack_control", loc, "kd", kd, "mm", clause, "neutral axis of the cracked elastic section (compression steel ignored)")
        t("crack_control", loc, "Icr", icr, "mm⁴", clause, "cracked transformed moment of inertia")
        fs_words = "fs = n Ms (d − kd) / Icr"
        if fs > inp.fy:
            fs_words += " (more than fy: the service moment is too large for this steel)"
    factor = code.crack_epoxy_factor() if inp.epoxy else 1.0
    z = factor * fs * (dc * A) ** (1 / 3)
    limit = code.crack_z_limit(inp.exposure)
    if ctx.tracing:
        t("crack_control", loc, "fs", fs, "MPa", clause, fs_words)
        t("crack_control", loc, "clear cover", clear, "mm", clause, f"to the {name}, used as {used:g} mm (≤ {cap:g} mm)")
        t("crack_control", loc, "dc", dc, "mm", clause, "capped clear cover + db/2 of the bars nearest the face")
        t("crack_control", loc, "N", nbars, "", clause, f"As / area of the largest bar ({largest.size})")
        t("crack_control", loc, "A", A, "mm²", clause, f"2 ȳ bw / N, ȳ = {ybar:.1f} mm (cover part capped)")
        t("crack_control", loc, "z", z, "N/mm", clause,
          "fs (dc A)^(1/3)" + (" × 1.2 (epoxy-coated bars)" if inp.epoxy else ""))
        t("crack_control", loc, "z limit", limit, "N/mm", clause, f"{inp.exposure} exposure")
    u = z / limit
    if u <= 1:
        ctx.result("crack_control", "Crack control", loc, clause, CheckStatus.PASS, "",
                   demand=z, capacity=limit, unit="N/mm", utilisation=u)
        return
    ctx.result(
        "crack_control", "Crack control", loc, clause, CheckStatus.FAIL,
        f"z = {z:.0f} N/mm exceeds {limit:.0f} N/mm ({inp.exposure} exposure) {WHERE[loc]} for the {name} "
        f"(cl. {clause}, {fs_words}): use more, smaller bars (the same area in more bars) or reduce the cover"
        + ("" if ms is not None else ", or schedule the service moment so fs is computed") + ".",
        demand=z, capacity=limit, unit="N/mm", utilisation=u)


def _min_depth(ctx: SpanContext, code: DetailingProvisions) -> None:
    inp, t = ctx.inp, ctx.add_trace
    clause = ctx.code.clauses["min_depth"]
    caveat = ("Table 9.2 applies only to members not supporting or attached to partitions or other construction "
              "likely to be damaged by large deflections; otherwise deflections must be calculated")
    if inp.clear_span is not None:
        ln, ln_words = inp.clear_span, "clear span"
    elif inp.span is not None:
        ln, ln_words = inp.span, "centre-to-centre span (no clear span scheduled; longer, conservative)"
    else:
        ctx.result("min_depth", "Min. depth", None, clause, CheckStatus.NOT_CHECKED,
                   f"Minimum depth for deflection (cl. {clause}, Table 9.2) not checked: no span length is "
                   "scheduled.", unit="mm")
        return
    div, ends = code.min_depth_divisor(inp.left_end, inp.right_end)
    kfy = code.min_depth_fy_factor(inp.fy)
    rho = code.density_kg_m3(inp.density, inp.lam)
    kd = code.min_depth_density_factor(rho)
    hmin = ln / div * kfy * kd
    t("min_depth", None, "ℓn", ln, "mm", clause, ln_words)
    t("min_depth", None, "ℓn / h,min", div, "", clause, f"Table 9.2, beams, {ends}")
    t("min_depth", None, "fy factor", kfy, "", clause, "0.4 + fy/670 for fy other than 400 MPa")
    t("min_depth", None, "density factor", kd, "", clause,
      "1.65 − 0.0003 γc ≥ 1.00 (from memory)" + (f", γc = {rho:g} kg/m³" if rho else ": normal density, 1.0"))
    t("min_depth", None, "h,min", hmin, "mm", clause, "ℓn / divisor × factors")
    u = hmin / inp.h
    if u <= 1:
        ctx.result("min_depth", "Min. depth", None, clause, CheckStatus.PASS,
                   f"h = {inp.h:g} mm ≥ h,min = {hmin:.0f} mm ({ends}): no deflection calculation is required "
                   f"by cl. {clause}. {caveat}. This is not a statement that deflections are acceptable.",
                   demand=hmin, capacity=inp.h, unit="mm", utilisation=u)
        return
    ctx.result("min_depth", "Min. depth", None, clause, CheckStatus.NOT_CHECKED,
               f"h = {inp.h:g} mm is less than h,min = ℓn/{div:g} × {kfy:.3f} × {kd:.2f} = {hmin:.0f} mm "
               f"({ends}, cl. {clause}, Table 9.2): a deflection calculation is needed (beamsched does not "
               f"make one), or deepen the member. {caveat}.",
               demand=hmin, capacity=inp.h, unit="mm", utilisation=u)


def run(ctx: SpanContext) -> None:
    code = ctx.code if isinstance(ctx.code, DetailingProvisions) else None
    if code is None:
        return
    inp = ctx.inp
    if code.crack_control_applies(inp.fy):
        for sense, loc in cases(ctx):
            if loc == "mid" or sense == "neg":
                _crack(ctx, code, sense, loc)
    else:
        clause = ctx.code.clauses["crack_control"]
        ctx.result("crack_control", "Crack control", None, clause, CheckStatus.PASS,
                   f"fy = {inp.fy:g} MPa ≤ 300 MPa: the z limit of cl. {clause} does not apply.")
    _min_depth(ctx, code)
