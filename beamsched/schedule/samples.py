"""The bundled sample schedules and a generator of large synthetic schedules.

The sample is an invented floor: level 2 of the "Wrenfield Public Library", framed by the
fictional firm "Calder Point Structural Inc." Demands are rough hand estimates (moment
coefficients on the clear span, wl²/8 and PL/4-style values for point loads) from invented
loads; the bars and stirrups come from a simple rectangular-stress-block sizing. It holds
girders, continuous secondary T-beams with different ends, spandrel L-beams, cantilevers with
back-spans, a deep transfer girder (outside the scope of sectional design), a few spans that
are overstressed on purpose and a few rows with the mistakes drafters make.

Regenerate the committed copies with ``python -m beamsched.schedule.samples`` (it writes
``beamsched/data/`` and ``sample_schedules/``).
"""

from __future__ import annotations

import math
import random
import re
import zipfile
from dataclasses import dataclass, field
from importlib import resources
from pathlib import Path

from ..bars import CATALOGUE
from .columns import BY_KEY
from .writer import _atomic, write_schedule

SAMPLE_NAME = "wrenfield_level2_beams.xlsx"
SAMPLE_US_NAME = "wrenfield_level2_beams_us.xlsx"


def sample_path(variant: str = "si") -> Path:
    """The bundled sample schedule ('si', or 'us' for the US-customary header variant), read
    from the installed package's data. Where the package is not a plain folder (a zip import),
    the file is copied once to a temporary folder and that copy is returned."""
    name = {"si": SAMPLE_NAME, "us": SAMPLE_US_NAME}[variant]
    ref = resources.files("beamsched") / "data" / name
    if isinstance(ref, Path):
        return ref
    import tempfile

    from .. import __version__

    target = Path(tempfile.gettempdir()) / f"beamsched-{__version__}-data" / name
    if not target.exists():
        data = ref.read_bytes()

        def copy(tmp: Path) -> None:
            tmp.write_bytes(data)

        _atomic(target, copy)
    return target


# -- sizing (rough: the checks, not this, decide) ---------------------------------------------
FC, FY = 35.0, 400.0
PHI_C, PHI_S = 0.65, 0.85
COVER, STIRRUP = 40.0, "10M"
KN, KNM = 1e3, 1e6


def _alpha1(fc: float) -> float:
    return max(0.85 - 0.0015 * fc, 0.67)  # CSA A23.3-19 cl. 10.1.7


def _as_required(m_knm: float, b: float, d: float, fc: float = FC, fy: float = FY) -> float:
    """Tension steel for Mf (rectangular stress block, width b)."""
    if m_knm <= 0:
        return 0.0
    k = _alpha1(fc) * PHI_C * fc * b
    mf = m_knm * KNM
    # Mr = phi_s As fy (d - phi_s As fy / (2k)) = Mf -> quadratic in T = phi_s As fy
    disc = d * d - 2 * mf / k
    if disc <= 0:
        return math.inf
    t = k * (d - math.sqrt(disc))
    return t / (PHI_S * fy)


def _per_layer(db: float, bw: float, agg: float = 20.0) -> int:
    s = max(1.4 * db, 1.4 * agg, 30.0)
    ds = CATALOGUE[STIRRUP].db
    inside = bw - 2 * COVER - 2 * ds - 2 * max(2 * ds - db / 2, 0)  # corner bars sit in the stirrup bends
    return max(int((inside - db) // (db + s)) + 1, 0)


def bars_for(as_req: float, bw: float, sizes=("15M", "20M", "25M", "30M", "35M"), min_count: int = 2) -> str:
    """The preferred arrangement with area >= as_req: one layer of one size where it will do,
    two layers (the upper of at least two bars) only when clearly lighter."""
    from ..bars import parse_bars

    for text in _ladder(bw, sizes):
        bars = parse_bars(text)
        if bars.area >= as_req and bars.count >= min_count:
            return text
    # nothing fits: the heaviest arrangement that does (the span will fail its checks)
    size = max((z for z in sizes if _per_layer(CATALOGUE[z].db, bw) >= 2), key=lambda z: CATALOGUE[z].db)
    fit = _per_layer(CATALOGUE[size].db, bw)
    return f"{fit}-{size} / {fit}-{size}"


def d_of(h: float, db: float = 25.2) -> float:
    return h - COVER - CATALOGUE[STIRRUP].db - db / 2


def stirrups_for(vf_kn: float, bw: float, h: float, d: float, fc: float = FC, fyt: float = FY) -> str:
    """Vertical stirrups for Vf by the simplified method (beta 0.18, theta 35 deg, cl. 11.3.6.3)."""
    dv = max(0.9 * d, 0.72 * h)
    vc = PHI_C * 0.18 * min(math.sqrt(fc), 8.0) * bw * dv
    high = vf_kn * KN > 0.125 * PHI_C * fc * bw * dv
    s_max = 0.95 * (min(0.35 * dv, 300.0) if high else min(0.7 * dv, 600.0))
    for size, legs in (("10M", 2), ("10M", 4), ("15M", 2), ("15M", 4)):
        av = legs * CATALOGUE[size].area
        s_min_steel = av * fyt / (0.06 * math.sqrt(fc) * bw)
        need = vf_kn * KN * 1.05 - vc
        s_strength = math.inf if need <= 0 else PHI_S * av * fyt * dv / math.tan(math.radians(35)) / need
        s = min(s_max, s_min_steel, s_strength)
        step = 50.0 if s >= 200 else 25.0  # spacings as detailers write them
        s = math.floor(s / step) * step
        if s >= 100:
            return f"{size}@{s:g}" if legs == 2 else f"{legs}L-{size}@{s:g}"
    return "4L-15M@100"


def as_min(bw: float, h: float, fc: float = FC, fy: float = FY) -> float:
    return 0.2 * math.sqrt(fc) * bw * h / fy  # CSA A23.3-19 cl. 10.5.1.2


def size_span(s: dict, bf_pos: float | None = None) -> dict:
    """Fill in bars and stirrups for the demands of a span dict (keys as the column keys)."""
    bw, h = s["bw"], s["h"]
    fc = s.get("fc") or FC
    shape = s.get("type", "Rect")
    d = d_of(h)
    b_pos = bw if shape == "Rect" else (bf_pos or bw + (8 if shape == "T" else 4) * s.get("hf", 0))
    bt_neg = bw if shape == "Rect" else min(bf_pos or bw * 2.5, (2.5 if shape == "T" else 1.5) * bw)

    def need(m, b, bt, face_min=True):
        req = _as_required(m, b, d, fc)
        if not face_min:
            return req * 1.05
        return max(req * 1.06, min(as_min(bt, h, fc), 4 / 3 * req * 1.02))

    dv = 0.9 * d
    cot = 1 / math.tan(math.radians(35.0))
    vc = PHI_C * 0.18 * min(math.sqrt(fc), 8.0) * bw * max(dv, 0.72 * h) / KN

    def long_steel(m, v):
        """cl. 11.3.9: Ft = Mf/dv + (Vf - 0.5 Vs) cot(theta), with Vs about Vf - Vc."""
        if not v:
            return 0.0
        vs = max(v - vc, 0.0)
        ft = (m or 0) * KNM / dv + (v - 0.5 * vs) * KN * cot
        return 1.05 * ft / (PHI_S * FY)

    if "bottom_bars" not in s:
        req = need(s.get("mf_pos") or 0, b_pos, bw)
        for end in ("l", "r"):
            if not s.get(f"mf_neg_{end}") and not s.get("bottom_bars_support"):
                req = max(req, long_steel(0, s.get(f"vf_{end}")))
        s["bottom_bars"] = bars_for(req, bw, min_count=3 if bw >= 350 else 2)
    for end in ("l", "r"):
        key = f"top_bars_{end}"
        if key in s:
            continue
        m = abs(s.get(f"mf_neg_{end}") or 0)
        req = max(need(m, bw, bt_neg), long_steel(m, s.get(f"vf_{end}"))) if m else 0
        s[key] = bars_for(req, bw, sizes=("15M", "20M", "25M", "30M"), min_count=2 if not m else 3)
    if "stirrups" not in s:
        v = max(s.get("vf_l") or 0, s.get("vf_r") or 0)
        s["stirrups"] = stirrups_for(v, bw, h, d, fc)
    if h > 750 and "skin_bars" not in s:
        rho = 0.010 if s.get("exposure") == "exterior" else 0.008  # cl. 10.6.2 (from memory)
        area = rho * min(2 * (COVER + CATALOGUE[STIRRUP].db + 8), bw / 2) * h
        size = "10M" if area / 100 <= 14 else "15M"
        n = max(math.ceil(h / 200) - 1, math.ceil(area / CATALOGUE[size].area), 2)
        s["skin_bars"] = f"{n}-{size}"
    return s


def _ladder(bw: float, sizes=("15M", "20M", "25M", "30M", "35M")) -> list[str]:
    """Bar arrangements that fit across bw, lightest first (one layer, then two)."""
    out = []
    for size in sizes:
        bar = CATALOGUE[size]
        fit = _per_layer(bar.db, bw)
        for n in range(2, 2 * fit + 1):
            if n > fit and n - fit < 2:
                continue  # a second layer of one bar: not how bars are detailed
            text = f"{n}-{size}" if n <= fit else f"{fit}-{size} / {n - fit}-{size}"
            # a second layer costs placing and depth: take it only when clearly lighter
            out.append((n * bar.area * (1.25 if n > fit else 1.0), n * bar.area, text))
    return [t for _, _, t in sorted(out)]


def _bigger(current: str | None, bw: float, sizes=("15M", "20M", "25M", "30M", "35M")) -> str:
    from ..bars import parse_bars

    area = parse_bars(current).area if current else 0.0
    for text in _ladder(bw, sizes):  # the first (preferred) arrangement heavier than the current one
        if parse_bars(text).area > area + 1e-9:
            return text
    raise ValueError(f"no heavier arrangement than {current} fits in bw = {bw:g} mm")


_STIRRUP_LADDER = [f"{legs}L-{size}@{s}" if legs != 2 else f"{size}@{s}"
                   for size, legs in (("10M", 2), ("10M", 4), ("15M", 4))
                   for s in (300, 250, 225, 200, 175, 150, 125, 100)]


def _tighter(current: str) -> str:
    from ..bars import parse_stirrups

    cur = parse_stirrups(current)
    for text in _STIRRUP_LADDER:
        st = parse_stirrups(text)
        if st.area / st.spacing > cur.area / cur.spacing + 1e-12 and st.spacing <= cur.spacing:
            return text
    return "4L-15M@100"


def check_plain(s: dict):
    """Check a span dict (column keys, schedule units) with the engine, as the sample's
    Parameters sheet would fill it in."""
    from ..api import check_span

    kw = dict(mark=str(s["mark"]), shape=s.get("type", "Rect"), bw=s["bw"], h=s["h"], fc=s.get("fc") or FC, fy=FY,
              hf=s.get("hf") or None, bottom=s.get("bottom_bars"), top_left=s.get("top_bars_l"),
              top_right=s.get("top_bars_r"), bottom_support=s.get("bottom_bars_support"), stirrups=s.get("stirrups"),
              Mf_pos=s.get("mf_pos"), Mf_neg_left=_abs(s.get("mf_neg_l")), Mf_neg_right=_abs(s.get("mf_neg_r")),
              Mf_pos_left=s.get("mf_pos_l"), Mf_pos_right=s.get("mf_pos_r"), Vf_left=s.get("vf_l"),
              Vf_right=s.get("vf_r"), Tf=s.get("tf"),
              span=s["span"] * 1000, clear_span=(s.get("clear_span") or s["span"]) * 1000,
              exposure=s.get("exposure", "interior"), clear_to_next_web=s.get("clear_to_next_web"),
              fyt=FY, cover_top=COVER, cover_bottom=COVER, agg=20.0)
    ends = _ends_of(s)
    kw["left_end"], kw["right_end"] = ends
    if s.get("skin_bars"):
        from ..bars import parse_bars

        kw["skin_bars"] = parse_bars(s["skin_bars"])
    return check_span(**kw)


def _abs(x):
    return None if x is None else abs(x)


def _ends_of(s: dict) -> tuple[str, str]:
    if "left_end" in s:
        return s["left_end"], s["right_end"]
    return {"simple": ("simple", "simple"), "both ends continuous": ("continuous", "continuous"),
            "cantilever": ("continuous", "free")}[s["support"]]


def settle(s: dict, rounds: int = 40) -> dict:
    """Raise bars and stirrups until the engine finds no failure (used to finish the sample's
    sizing; the overstressed spans are changed afterwards)."""
    for _ in range(rounds):
        r = check_plain(s)
        failed = {(c.id, c.location) for c in r.checks if c.status.value == "fail"}
        if not failed:
            return s
        bw = s["bw"]
        for cid, loc in failed:
            if cid in ("flexure_pos", "min_steel_pos", "crack_control", "cd_limit_pos", "long_steel_shear",
                       "flexure_neg", "min_steel_neg", "cd_limit_neg", "bar_fit") and loc in ("left", "right"):
                key = f"top_bars_{loc[0]}"
                if cid in ("flexure_pos", "min_steel_pos", "cd_limit_pos") or (
                        cid == "long_steel_shear" and not s.get(f"mf_neg_{loc[0]}")):
                    key = "bottom_bars_support" if s.get("bottom_bars_support") else "bottom_bars"
                if cid == "bar_fit":
                    continue
                s[key] = _bigger(s.get(key), bw, ("15M", "20M", "25M", "30M"))
            elif cid in ("flexure_pos", "min_steel_pos", "crack_control", "cd_limit_pos"):
                s["bottom_bars"] = _bigger(s.get("bottom_bars"), bw)
            elif cid in ("shear", "min_stirrups", "stirrup_spacing"):
                s["stirrups"] = _tighter(s["stirrups"])
            elif cid == "skin_steel":
                m = re.match(r"^(\d+)-(\d+M)$", s["skin_bars"])
                n, size = int(m.group(1)), m.group(2)
                s["skin_bars"] = f"{n + 1}-{size}" if n < 14 else f"{n}-{'15M' if size == '10M' else '20M'}"
    return s


# -- the invented floor ----------------------------------------------------------------------
# Loads (invented): 200 mm slab 4.8 kPa, superimposed dead 1.5 kPa, live 4.8 kPa (reading rooms),
# 7.2 kPa (stacks). Factored 1.25 D + 1.5 L. Concrete 24 kN/m³.
SLAB, SDL, LL, LL_STACKS = 4.8, 1.5, 4.8, 7.2
GAMMA = 24.0


def wf(trib: float, bw: float, h: float, hf: float = 200.0, ll: float = LL, extra_d: float = 0.0) -> float:
    """Factored line load (kN/m) on a beam with tributary width trib (m)."""
    dead = (SLAB + SDL) * trib + GAMMA * bw / 1000 * (h - hf) / 1000 + extra_d
    return 1.25 * dead + 1.5 * ll * trib


def _continuous_run(mark: str, n: int, length: float, support_w: float, w: float, base: dict,
                    left_ext: str = "simple", right_ext: str = "simple", notes: dict | None = None) -> list[dict]:
    """Spans of a continuous beam from moment coefficients on the clear span ln (common practice:
    +wl²/14 end span, +wl²/16 interior, -wl²/10 first interior support, -wl²/11 other interior
    supports, -wl²/24 at a spandrel support; shear 1.15 wl/2 at the first interior support)."""
    out = []
    ln = length - support_w
    wl2 = w * ln * ln
    for i in range(1, n + 1):
        first, last = i == 1, i == n
        s = dict(base, mark=mark, span_no=i, span=length, clear_span=ln)
        s["left_end"] = left_ext if first else "continuous"
        s["right_end"] = right_ext if last else "continuous"
        s["mf_pos"] = round(wl2 / (14 if first or last else 16))
        s["mf_neg_l"] = round(wl2 / 24) if first else round(wl2 / (10 if i == 2 and n > 2 else 11 if n > 2 else 9))
        s["mf_neg_r"] = round(wl2 / 24) if last else round(wl2 / (10 if i == n - 1 and n > 2 else 11 if n > 2 else 9))
        if n == 2:
            s["mf_neg_l"] = round(wl2 / 24) if first else round(wl2 / 9)
            s["mf_neg_r"] = round(wl2 / 9) if first else round(wl2 / 24)
        s["vf_l"] = round(w * ln / 2 * (1.15 if (i == 2 and n > 1) else 1.0))
        s["vf_r"] = round(w * ln / 2 * (1.15 if (i == n - 1 and n > 1) else 1.0))
        if s["left_end"] == "simple" and first:
            s["mf_neg_l"] = round(wl2 / 24)
        if notes and i in notes:
            s["notes"] = notes[i]
        out.append(s)
    return out


def floor_spans() -> list[dict]:
    """Every span of the invented floor, as dicts keyed by column key (SI engine-friendly units:
    mm, m for spans, MPa, kN, kN·m). Mistakes and overstressed spans are marked in ``_role``."""
    spans: list[dict] = []
    # Secondary T-beams, E-W, 5 spans of 8.4 m on lines 1.5 to 3.5 (3.6 m apart); 400 mm girder webs.
    sec = dict(type="T", bw=350, h=650, hf=200, clear_to_next_web=3250)
    lines = [("B1", LL, {}), ("B2", LL, {}), ("B3", LL_STACKS, {3: "stacks bay, 7.2 kPa"}),
             ("B4", LL, {}), ("B5", LL, {})]
    for mark, ll, notes in lines:
        w = wf(3.6, 350, 650, ll=ll)
        run = _continuous_run(mark, 5, 8.4, 0.5, w, sec, "simple", "simple", notes)
        if ll == LL_STACKS:
            for s in run:
                s["notes"] = s.get("notes", "stacks 7.2 kPa")
        spans += run
    # Interior girders, N-S, 3 spans of 7.2 m on lines B-E, each carrying a secondary-beam reaction
    # at midspan: P = w_sec x 8.4 m. Coefficients for a central point load on 3 equal spans
    # (end span +0.20 PL, interior +0.17 PL with pattern live load, interior support -0.15 PL).
    for k, mark in enumerate(("G2", "G3", "G4", "G5")):
        p = wf(3.6, 350, 650) * 8.4
        wg = wf(0.0, 500, 800)
        L, ln = 7.2, 6.6
        for i in (1, 2, 3):
            end = i in (1, 3)
            s = dict(mark=mark, span_no=i, type="T", bw=500, h=800, hf=200, span=L, clear_span=ln,
                     left_end="simple" if i == 1 else "continuous", right_end="simple" if i == 3 else "continuous")
            s["mf_pos"] = round((0.20 if end else 0.17) * p * L + wg * ln * ln / 11)
            neg_int = round(0.15 * p * L + wg * ln * ln / 10)
            s["mf_neg_l"] = round(0.05 * p * L) if i == 1 else neg_int
            s["mf_neg_r"] = round(0.05 * p * L) if i == 3 else neg_int
            v_int, v_ext = round(0.65 * p + wg * ln / 2 * 1.15), round(0.35 * p + wg * ln / 2)
            s["vf_l"] = v_ext if i == 1 else (v_int if i == 2 else round(0.5 * p + wg * ln / 2))
            s["vf_r"] = v_ext if i == 3 else (v_int if i == 2 else round(0.5 * p + wg * ln / 2))
            if k == 1 and i == 2:
                s["mf_pos_l"] = s["mf_pos_r"] = 45  # pattern + wind reversal noted by the frame analysis
                s["bottom_bars_support"] = "3-25M"
                s["notes"] = "reversal at supports from the frame analysis"
            spans.append(s)
    # Spandrel L-beams, E-W on lines 1 and 4: half a 3.6 m strip of slab plus cladding 9 kN/m.
    for mark in ("SP1", "SP4"):
        w = wf(1.8, 400, 750, extra_d=9.0)
        run = _continuous_run(mark, 5, 8.4, 0.5, w, dict(type="L", bw=400, h=750, hf=200, exposure="exterior"),
                              "continuous", "continuous")
        for s in run:
            s["tf"] = 12  # compatibility torsion from the slab edge (rough)
        spans += run
    # Spandrel L-girders on lines A and F: half the girder point load, plus cladding.
    for mark in ("SG-A", "SG-F"):
        p = wf(3.6, 350, 650) * 4.2
        wg = wf(0.0, 450, 800, extra_d=9.0)
        for i in (1, 2, 3):
            L, ln = 7.2, 6.6
            s = dict(mark=mark, span_no=i, type="L", bw=450, h=800, hf=200, span=L, clear_span=ln,
                     exposure="exterior", tf=18, left_end="continuous", right_end="continuous")
            s["mf_pos"] = round((0.20 if i != 2 else 0.17) * p * L + wg * ln * ln / 14)
            s["mf_neg_l"] = round((0.06 if i == 1 else 0.15) * p * L + wg * ln * ln / (16 if i == 1 else 10))
            s["mf_neg_r"] = round((0.06 if i == 3 else 0.15) * p * L + wg * ln * ln / (16 if i == 3 else 10))
            s["vf_l"] = round((0.4 if i == 1 else 0.6) * p + wg * ln / 2)
            s["vf_r"] = round((0.4 if i == 3 else 0.6) * p + wg * ln / 2)
            spans.append(s)
    # Reading-terrace cantilevers, north side: back-span 6.0 m fixed into the core wall, cantilever
    # 2.7 m. The cantilever moment carries over to the wall end: sagging there when the back-span
    # is unloaded (Mf+ L, resisted by the bottom bars at the support).
    for j, mark in enumerate(("CT1", "CT2", "CT3", "CT4")):
        bw, h = 400, 700
        w_c = wf(3.0, bw, h, extra_d=4.0)  # planters and guard
        mc = w_c * 2.7 ** 2 / 2
        w_b = wf(3.0, bw, h)
        back = dict(mark=mark, span_no=1, type="T", bw=bw, h=h, hf=200, span=6.0, clear_span=5.6,
                    mf_pos=round(w_b * 5.6 ** 2 / 14), mf_neg_l=round(w_b * 5.6 ** 2 / 12),
                    mf_neg_r=round(mc), mf_pos_l=round(0.5 * mc - 1.25 * 6.3 * 3 * 5.6 ** 2 / 12 * 0.5),
                    bottom_bars_support="3-20M", vf_l=round(w_b * 2.8), vf_r=round(w_b * 2.8 + mc / 5.6))
        cant = dict(mark=mark, span_no=2, type="T", bw=bw, h=h, hf=200, span=2.7, clear_span=2.5, mf_pos=0,
                    mf_neg_l=round(mc), mf_neg_r=0, vf_l=round(w_c * 2.5), vf_r=0, exposure="exterior")
        if j % 2 == 0:
            back["support"], cant["support"] = "both ends continuous", "cantilever"
        else:
            back.update(left_end="continuous", right_end="continuous")
            cant.update(left_end="continuous", right_end="free")
        spans += [back, cant]
    # Transfer girder under the reading-room column at grid C/2.5: 4.8 m between walls, h 2400:
    # deep (clear span / h = 1.75), outside sectional design. P = 2900 kN factored at midspan.
    p = 2900.0
    spans.append(dict(mark="TG1", type="Rect", bw=900, h=2400, span=4.8, clear_span=4.2, left_end="continuous",
                      right_end="continuous", fc=45, mf_pos=round(p * 4.8 / 8), mf_neg_l=round(p * 4.8 / 8),
                      mf_neg_r=round(p * 4.8 / 8), vf_l=round(p / 2 + 60), vf_r=round(p / 2 + 60),
                      bottom_bars="6-35M / 6-35M", top_bars_l="6-30M / 4-30M", top_bars_r="6-30M / 4-30M",
                      stirrups="4L-15M@150", skin_bars="9-15M", notes="carries column C/2.5 from level 3",
                      _role="deep"))
    # Stair trimmers and atrium edge beams.
    for i, (mark, L) in enumerate((("TR1", 4.2), ("TR2", 4.2), ("TR3", 5.4))):
        w = wf(2.4, 300, 500, hf=0)
        spans.append(dict(mark=mark, type="Rect", bw=300, h=500, span=L, clear_span=L - 0.4, support="simple",
                          qty=2 if i == 0 else 1, mf_pos=round(w * (L - 0.4) ** 2 / 8),
                          vf_l=round(w * (L - 0.4) / 2), vf_r=round(w * (L - 0.4) / 2)))
    for mark in ("AT1", "AT2"):
        w = wf(1.8, 400, 700, extra_d=3.0)  # glass guard
        spans += _continuous_run(mark, 2, 8.4, 0.5, w, dict(type="L", bw=400, h=700, hf=200, tf=8,
                                                             exposure="interior"), "simple", "simple")
    for s in spans:
        size_span(s)
        settle(s)
    _same_bars_over_supports(spans)
    return spans


def _same_bars_over_supports(spans: list[dict]) -> None:
    """The top bars over a support shared by two spans of one beam are the same bars: give both
    spans the heavier of their two arrangements, then settle again."""
    from ..bars import parse_bars

    for _ in range(3):
        changed = False
        by_mark: dict[str, list[dict]] = {}
        for s in spans:
            if s.get("span_no") is not None:
                by_mark.setdefault(s["mark"], []).append(s)
        for run in by_mark.values():
            run.sort(key=lambda x: x["span_no"])
            for a, b in zip(run, run[1:], strict=False):
                ta, tb = a["top_bars_r"], b["top_bars_l"]
                if ta == tb:
                    continue
                heavier = ta if parse_bars(ta).area >= parse_bars(tb).area else tb
                if a["bw"] != b["bw"]:
                    continue
                a["top_bars_r"] = b["top_bars_l"] = heavier
                settle(a)
                settle(b)
                changed = True
        if not changed:
            return


def _overstress(spans: list[dict]) -> None:
    """Spans made to fail on purpose: demands raised after the bars were chosen, as happens when
    a load changes late and the schedule is not updated."""
    def find(mark, span_no=None):
        return next(s for s in spans if s["mark"] == mark and s.get("span_no") == span_no)

    s = find("B3", 3)
    s["mf_pos"] = round(s["mf_pos"] * 1.45)
    s["notes"] = "compact shelving added rev B (load 12 kPa)"
    s["_role"] = "over"
    s = find("G4", 2)
    s["vf_l"], s["vf_r"] = round(s["vf_l"] * 1.9), round(s["vf_r"] * 1.9)
    s["notes"] = "rooftop unit moved over this girder"
    s["_role"] = "over"
    s = find("CT3", 2)
    s["mf_neg_l"] = round(s["mf_neg_l"] * 2.2)
    s["vf_l"] = round(s["vf_l"] * 1.6)
    s["notes"] = "deep soil planters at the tip"
    s["_role"] = "over"
    back = find("CT3", 1)  # the same moment at the back-span's end over the same support
    back["mf_neg_r"] = s["mf_neg_l"]
    back["notes"] = "planters on the cantilever CT3 span 2"
    back["_role"] = "over"
    s = find("SP4", 5)
    s["top_bars_r"] = "2-15M"
    s["_role"] = "over"


def _mistakes(spans: list[dict]) -> list[dict]:
    """Rows with the mistakes drafters make, inserted after the span they copy."""
    def copy(original, span_no, **changes):
        base = next(s for s in spans if s["mark"] == original and s.get("span_no") == span_no)
        out = {k: v for k, v in base.items() if k != "_role"}
        out.update(changes)
        out["_role"] = "mistake"
        return out

    return [
        copy("B1", 3, mark="B6", bw="350 mm"),  # unit typed into the cell
        copy("B2", 2, mark="B7", bottom_bars="4-25"),  # size letter missing
        copy("G2", 1, mark="G6", top_bars_r="4-28M"),  # not a CSA bar size
        copy("B4", 4, mark="B8", stirrups="10M@0"),  # zero spacing
        copy("TR2", None, mark="TR4", fc=3500),  # psi typed into the MPa column
        copy("B5", 1, mark="B9", hf=None),  # T-beam with no flange thickness
        copy("AT1", 1, mark="AT3", hf=700),  # flange thicker than the beam
        copy("TR3", None, mark="TR5", mf_pos=-85),  # sign convention of an analysis export
        copy("B1", 1, mark="B10", h=None),  # depth left blank
    ]


HEADER_KEYS = ("mark", "span_no", "qty", "type", "bw", "h", "hf", "clear_to_next_web", "span", "clear_span",
               "left_end", "right_end", "support", "bottom_bars", "top_bars_l", "top_bars_r", "bottom_bars_support",
               "stirrups", "skin_bars", "fc", "exposure", "mf_pos", "mf_neg_l", "mf_neg_r", "mf_pos_l", "mf_pos_r",
               "vf_l", "vf_r", "tf", "sfrs", "notes")


def sample_rows() -> list[dict]:
    """The sample floor in schedule order: each beam's spans together, mistakes beside their
    originals, one duplicate (identical) and one clash (same mark and span, different bars)."""
    spans = floor_spans()
    _overstress(spans)
    rows: list[dict] = []
    mistakes = {m["mark"]: m for m in _mistakes(spans)}
    after = {("B1", 3): "B6", ("B2", 2): "B7", ("G2", 1): "G6", ("B4", 4): "B8", ("TR2", None): "TR4",
             ("B5", 1): "B9", ("AT1", 1): "AT3", ("TR3", None): "TR5", ("B1", 1): "B10"}
    for s in spans:
        s.setdefault("sfrs", "no")
        rows.append(s)
        key = (s["mark"], s.get("span_no"))
        if key == ("TR1", None):
            rows.append(dict(s, _role="duplicate"))  # the same row pasted twice
        if key == ("B2", 4):
            clash = dict(s, bottom_bars=_one_less(s["bottom_bars"]), _role="clash")
            s["_role"] = "clashed"  # the original: kept in the US variant, an error here (its twin differs)
            rows.append(clash)
        if key in after:
            rows.append(mistakes[after[key]])
    # Mf- signs as an analysis export gives them (hogging negative) on the G lines.
    for s in rows:
        if str(s["mark"]).startswith("G") and s.get("_role") != "mistake":
            for k in ("mf_neg_l", "mf_neg_r"):
                if isinstance(s.get(k), (int, float)):
                    s[k] = -abs(s[k])
    return rows


def _one_less(text: str) -> str:
    m = re.match(r"^(\d+)-(.*)$", text)
    return f"{int(m.group(1)) - 1}-{m.group(2)}" if m and int(m.group(1)) > 2 else text.replace("25M", "20M")


PROJECT = [
    ("Project", "Wrenfield Public Library", None), ("Project no.", "CP-2417", None), ("Level", "Level 2", None),
    ("Revision", "B", None), ("Prepared by", "R. Okafor", None), ("Checked by", "T. Nguyen", None),
    ("Date", "2026-11-20", None), ("Design code", "CSA A23.3-19", None),
]
PARAMETERS_SI = PROJECT + [
    ("Unit system", "SI", None), ("f'c", 35, "MPa"), ("fy", 400, "MPa"), ("fyt", 400, "MPa"), ("Cover", 40, "mm"),
    ("Max aggregate", 20, "mm"), ("Exposure", "interior", None), ("Concrete density", "normal", None),
    ("Precast (certified plant)", "no", None),
]
TITLE = [["Calder Point Structural Inc."],
         ["Wrenfield Public Library - Level 2 framing - concrete beam schedule"],
         ["Rev B, issued for coordination 2026-11-20 (invented example project)"], []]



def write_sample(path: str | Path) -> Path:
    """Write the SI sample floor (title block, header on row 5, Parameters sheet)."""
    import openpyxl

    rows = sample_rows()
    header = [BY_KEY[k].header() for k in HEADER_KEYS]
    data = [[s.get(k) for k in HEADER_KEYS] for s in rows]
    p = write_schedule(path, header, data, parameters=[list(r) for r in PARAMETERS_SI], title=TITLE,
                       sheet="L2 beams")

    def merge(tmp: Path) -> None:
        wb = openpyxl.load_workbook(p)
        ws = wb["L2 beams"]
        for r in (1, 2, 3):
            ws.merge_cells(start_row=r, start_column=1, end_row=r, end_column=8)
        # Two formula cells with their results stored (as Excel saves them) and one without.
        header_row = len(TITLE) + 1
        col = {k: i + 1 for i, k in enumerate(HEADER_KEYS)}
        formulas = []
        for i, s in enumerate(rows):
            if s["mark"] in ("TR2", "TR3") and s.get("_role") is None:
                r = header_row + 1 + i
                span_cell = ws.cell(row=r, column=col["clear_span"]).coordinate
                ws.cell(row=r, column=col["mf_pos"], value=f"=ROUND({_W_TRIM:.3f}*{span_cell}^2/8,0)")
                formulas.append((ws.cell(row=r, column=col["mf_pos"]).coordinate, s["mf_pos"]))
        wb.save(tmp)
        _store_cached(tmp, "xl/worksheets/sheet1.xml", dict(formulas[:-1]))

    _atomic(p, merge)
    return p


_W_TRIM = wf(2.4, 300, 500, hf=0)


def _store_cached(path: Path, member: str, values: dict[str, float]) -> None:
    """Write the stored result of formula cells into the sheet XML, as a spreadsheet program
    does on saving (openpyxl writes formulas without results)."""
    with zipfile.ZipFile(path) as zin:
        items = [(i, zin.read(i.filename)) for i in zin.infolist()]
    with zipfile.ZipFile(path, "w", zipfile.ZIP_DEFLATED) as zout:
        for info, data in items:
            if info.filename == member:
                text = data.decode()
                for ref, v in values.items():
                    text, n = re.subn(rf'(<c r="{ref}"[^>]*><f>[^<]*</f>)<v\s*/>', rf"\g<1><v>{v}</v>", text)
                    if n != 1:
                        raise RuntimeError(f"formula cell {ref} not found in {member}")
                data = text.encode()
            zout.writestr(info, data)


# -- the US-customary variant -----------------------------------------------------------------
IN, FT = 25.4, 304.8  # mm, exact (NIST SP 811)
KIP = 4.4482216152605  # kN
KIPFT = KIP * 0.3048  # kN·m
PSI = 0.006894757293168  # MPa
US_HEADER = {  # header text per key: some with units, some bare (the Parameters unit system fills them)
    "bw": "bw", "h": "h", "hf": "hf (in)", "clear_to_next_web": "Clear to next web (in)", "span": "Span",
    "clear_span": "Clear span (ft)", "fc": "f'c (psi)", "mf_pos": "Mf+ (kip-ft)", "mf_neg_l": "Mf- L (kip-ft)",
    "mf_neg_r": "Mf- R (kip-ft)", "mf_pos_l": "Mf+ L (kip·in)", "mf_pos_r": "Mf+ R (kip·in)", "vf_l": "Vf L",
    "vf_r": "Vf R", "tf": "Tf (kip-ft)",
}
_TO_US = {"bw": 1 / IN, "h": 1 / IN, "hf": 1 / IN, "clear_to_next_web": 1 / IN, "span": 1000 / FT,
          "clear_span": 1000 / FT, "fc": 1 / PSI, "mf_pos": 1 / KIPFT, "mf_neg_l": 1 / KIPFT, "mf_neg_r": 1 / KIPFT,
          "mf_pos_l": 12 / KIPFT, "mf_pos_r": 12 / KIPFT, "vf_l": 1 / KIP, "vf_r": 1 / KIP, "tf": 1 / KIPFT}
PARAMETERS_US = PROJECT + [
    ("Unit system", "US customary", None), ("f'c", 5076.3, "psi"), ("fy", "58.015 ksi", None),
    ("fyt", 58.015, "ksi"), ("Cover", 1.5748, "in"), ("Max aggregate", 0.7874, "in"), ("Exposure", "interior", None),
    ("Concrete density", "normal", None),
]


_LENGTH_KEYS = ("bw", "h", "hf", "clear_to_next_web", "span", "clear_span")


def _us_value(key: str, x: float) -> float:
    """Sizes rounded down at the 4th decimal (never across a limit such as h > 750 mm);
    demands and f'c rounded up at the 4th decimal."""
    if key in _LENGTH_KEYS:
        return math.floor(x * 1e4) / 1e4
    return math.ceil(x * 1e4) / 1e4 if x >= 0 else -math.ceil(-x * 1e4) / 1e4


def us_rows() -> list[dict]:
    """The clean and overstressed spans of the sample in US customary units (4 decimals); bars
    stay in CSA G30.18 metric notation."""
    out = []
    for s in sample_rows():
        if s.get("_role") in ("mistake", "duplicate", "clash"):
            continue
        u = dict(s)
        for k, f in _TO_US.items():
            if isinstance(u.get(k), (int, float)):
                u[k] = _us_value(k, u[k] * f)
        out.append(u)
    return out


def write_sample_us(path: str | Path) -> Path:
    rows = us_rows()
    header = [US_HEADER.get(k, BY_KEY[k].header()) for k in HEADER_KEYS]
    data = [[s.get(k) for k in HEADER_KEYS] for s in rows]
    return write_schedule(path, header, data, parameters=[list(r) for r in PARAMETERS_US], title=TITLE,
                          sheet="L2 beams (US)")


# -- large synthetic schedules --------------------------------------------------------------
@dataclass
class _Kind:
    name: str
    shape: str
    bw: tuple[int, ...]
    h: tuple[int, ...]
    spans: tuple[float, ...]
    extra: dict = field(default_factory=dict)


_KINDS = (
    _Kind("secondary", "T", (300, 350, 400), (550, 600, 650, 700), (6.0, 7.2, 8.4, 9.0)),
    _Kind("girder", "T", (400, 450, 500, 600), (700, 800, 900), (7.2, 8.4, 9.0)),
    _Kind("spandrel", "L", (350, 400, 450), (600, 700, 750, 800), (6.0, 7.2, 8.4), {"exposure": "exterior"}),
    _Kind("trimmer", "Rect", (250, 300, 350), (400, 450, 500, 600), (3.6, 4.2, 5.4)),
    _Kind("cantilever", "T", (350, 400), (600, 700), (1.8, 2.4, 3.0)),
)


def generate_rows(n_spans: int, seed: int = 0) -> list[dict]:
    """``n_spans`` synthetic spans (seeded, reproducible): continuous T-beams, girders, spandrel
    L-beams, rectangular trimmers and cantilevers, sized by :func:`size_span`."""
    rng = random.Random(seed)
    out: list[dict] = []
    n = 0
    while len(out) < n_spans:
        kind = _KINDS[rng.randrange(len(_KINDS))]
        n += 1
        bw, h = rng.choice(kind.bw), rng.choice(kind.h)
        hf = 0 if kind.shape == "Rect" else rng.choice((150, 175, 200))
        trib = rng.uniform(1.5, 4.5)
        ll = rng.choice((2.4, 4.8, 7.2))
        mark = f"{kind.name[0].upper()}{n}"
        if kind.name == "cantilever":
            L = rng.choice(kind.spans)
            w = wf(trib, bw, h, hf or 200, ll)
            s = dict(mark=mark, type=kind.shape, bw=bw, h=h, hf=hf, span=L, clear_span=L - 0.2,
                     left_end="continuous", right_end="free", mf_pos=0, mf_neg_l=round(w * (L - 0.2) ** 2 / 2),
                     mf_neg_r=0, vf_l=round(w * (L - 0.2)), vf_r=0)
            out.append(size_span(s))
            continue
        spans = 1 if kind.name == "trimmer" else rng.randint(1, 5)
        L = rng.choice(kind.spans)
        w = wf(trib, bw, h, hf or 200, ll)
        base = dict(type=kind.shape, bw=bw, h=h, **({"hf": hf} if hf else {}), **kind.extra)
        if kind.shape == "L":
            base["tf"] = round(rng.uniform(2, 10))
        if spans == 1:
            ln = L - 0.4
            s = dict(base, mark=mark, span=L, clear_span=ln, left_end="simple", right_end="simple",
                     mf_pos=round(w * ln * ln / 8), vf_l=round(w * ln / 2), vf_r=round(w * ln / 2))
            out.append(size_span(s))
        else:
            ends = rng.choice((("simple", "simple"), ("continuous", "continuous"), ("simple", "continuous")))
            for s in _continuous_run(mark, spans, L, 0.4, w, base, *ends):
                out.append(size_span(s))
    return out[:n_spans]


def generate_schedule(path: str | Path, n_spans: int, seed: int = 0) -> Path:
    """Write a synthetic schedule of ``n_spans`` spans (.xlsx with a Parameters sheet, or .csv
    with every material in the row) covering every section type and end condition."""
    rows = generate_rows(n_spans, seed)
    p = Path(path)
    keys = [k for k in HEADER_KEYS if k not in ("support", "sfrs", "notes")]
    if p.suffix.lower() == ".csv":
        keys += ["fy"]
        for s in rows:
            s.setdefault("fc", FC)
            s.setdefault("fy", FY)
            s.setdefault("cover", COVER)
            s.setdefault("exposure", "interior")
        keys += ["cover"]
    header = [BY_KEY[k].header() for k in keys]
    data = [[s.get(k) for k in keys] for s in rows]
    params = [list(r) for r in PARAMETERS_SI]
    return write_schedule(p, header, data, parameters=params, sheet="Synthetic")


def write_all(root: str | Path = ".") -> list[Path]:
    """Regenerate the committed samples: beamsched/data/ and sample_schedules/."""
    root = Path(root)
    out = []
    for folder in (root / "beamsched" / "data", root / "sample_schedules"):
        out.append(write_sample(folder / SAMPLE_NAME))
        out.append(write_sample_us(folder / SAMPLE_US_NAME))
    return out


if __name__ == "__main__":  # python -m beamsched.schedule.samples [repository root]
    import sys

    for written in write_all(sys.argv[1] if len(sys.argv) > 1 else "."):
        print(written)
