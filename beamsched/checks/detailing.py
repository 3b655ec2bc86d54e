"""Detailing checks: ``bar_fit`` (both faces), ``skin_steel`` (10.6.2) and the
``flange_tension`` reminder (10.5.3.1).

bar_fit, where made (only where bars are scheduled):
* ``mid``: the bottom bars and any top bars at midspan;
* ``left`` / ``right``: the top bars at that support and any bottom bars at the supports.
Each layer is counted against how many bars of its largest size fit across the web at the
minimum clear spacing max(1.4 db, 1.4 × aggregate, 30 mm) (CSA A23.1, reproduced in A23.3
Annex A). The corner bars sit in the stirrup bends: a bar resting on the horizontal leg and
touching a bend of inside radius r has its centre r in from the inside face of the vertical leg
(db/2 if the bar is larger than the bend); the bend is the stirrup's minimum inside bend
diameter from CSA A23.1 (4 ds for 10M and 15M, 6 ds for 20M and 25M: from memory). Side cover
is taken equal to the cover at that face. Mixed sizes in a layer are spaced as if all were the
largest. Top bars of a flanged section that do not fit within the web may extend into the
effective flange, at the same spacing; the note says so. Bars of an upper layer sit directly
above those below (A23.1), so an upper layer may not hold more bars than the layer below.

Policy (``required``): bar_fit and skin_steel are required (a span with h > 750 mm and no skin
bars scheduled is incomplete); flange_tension is a reminder (required=False) because the
schedule does not show how the top steel is spread across the flange.
"""

from __future__ import annotations

import math

from ..bars import BarArrangement
from ..codes.base import DetailingProvisions
from ..model import CheckStatus, Location
from ..solve.shear import LayerFit, bars_per_layer
from .context import Remembered, SpanContext
from .flexure import cases

NUMBER_WORDS = {2: "two", 3: "three", 4: "four", 5: "five"}
WHERE = {"mid": "at midspan", "left": "at the left support", "right": "at the right support", None: ""}


def _layer_fit(ctx: SpanContext, code: DetailingProvisions, face: str, db: float) -> tuple[LayerFit, float, str]:
    inp = ctx.inp
    cover = inp.cover_top if face == "top" else inp.cover_bottom
    ds = ctx.stirrup_db
    bend, bend_words = code.stirrup_bend_diameter(ds) if ds > 0 else (0.0, "no stirrups: corner bars at db/2 inside the cover")
    clear = ctx.code.bar_clear_spacing(db, inp.agg)
    return bars_per_layer(inp.bw, cover, ds, bend, db, clear), clear, bend_words


_FACES: Remembered = Remembered()  # see _face


def _face(ctx: SpanContext, code: DetailingProvisions, loc: Location, face: str, bars: BarArrangement,
          name: str) -> tuple[tuple[float, int, int], list[str], list[str]]:
    """((worst count/fit, its count, its fit), problems, notes) for the bars at one face.

    The answer depends only on the values in the key below, and a schedule repeats them from
    span to span: without a trace to write, each distinct face is worked out once."""
    if ctx.tracing:
        return _face_worked(ctx, code, loc, face, bars, name)
    inp = ctx.inp
    flange = None if ctx.flange is None else (ctx.flange.overhang, ctx.flange.clause)
    key = (face, bars, name, inp.shape, inp.bw, inp.cover_top if face == "top" else inp.cover_bottom,
           inp.stirrups, inp.agg, flange, code)
    held = _FACES.get(key)
    if held is None:
        held = _FACES.put(key, _face_worked(ctx, code, loc, face, bars, name))
    return held


def _face_worked(ctx: SpanContext, code: DetailingProvisions, loc: Location, face: str, bars: BarArrangement,
                 name: str) -> tuple[tuple[float, int, int], list[str], list[str]]:
    inp, t = ctx.inp, ctx.add_trace
    clause = ctx.code.clauses["bar_spacing"]
    cover = inp.cover_top if face == "top" else inp.cover_bottom
    st = inp.stirrups
    problems: list[str] = []
    notes: list[str] = []
    worst: tuple[float, int, int] = (0.0, 0, 0)
    flanged = face == "top" and ctx.flange is not None and inp.shape in ("T", "L")
    previous = None
    for i, layer in enumerate(bars.layers, start=1):
        db = layer.max_db
        fit, clear, bend_words = _layer_fit(ctx, code, face, db)
        tag = f"{name} layer {i}"
        t("bar_fit", loc, f"s,clear {tag}", clear, "mm", clause, f"max(1.4 db, 1.4 agg, 30 mm), db = {db:g} mm (largest in the layer)")
        t("bar_fit", loc, f"inside {tag}", fit.inside, "mm", clause,
          f"bw − 2 (cover {cover:g} + stirrup {ctx.stirrup_db:g}); side cover taken as the {face} cover")
        t("bar_fit", loc, f"corner offset {tag}", fit.offset, "mm", ctx.code.clauses["stirrup_bend"],
          f"corner-bar centre in from the inside of the stirrup leg: max(D/2, db/2), {bend_words}")
        t("bar_fit", loc, f"fit {tag}", fit.fit, "bars", clause,
          f"1 + floor((inside − 2 × offset) / (db + s,clear)) = 1 + floor({fit.span:.1f} / {fit.pitch:.1f})")
        capacity = fit.fit
        in_flange = 0
        if flanged and layer.count > fit.fit and fit.fit >= 1:
            sides = 2 if inp.shape == "T" else 1
            per_side = math.floor(ctx.flange.overhang / fit.pitch + 1e-9)  # type: ignore[union-attr]
            capacity = fit.fit + sides * per_side
            in_flange = min(layer.count, capacity) - fit.fit
            t("bar_fit", loc, f"flange {tag}", sides * per_side, "bars", ctx.flange.clause,  # type: ignore[union-attr]
              f"more at {fit.pitch:.1f} mm across the effective overhang {ctx.flange.overhang:.0f} mm"  # type: ignore[union-attr]
              f" ({'each side' if sides == 2 else 'one side'})")
        worst = max(worst, (layer.count / capacity if capacity > 0 else math.inf, layer.count, capacity))
        stirrup_words = f"{st.bar.size} stirrups" if st else "no stirrups"
        where = f"one layer of bw = {inp.bw:g} with {cover:g} mm cover and {stirrup_words}"
        if layer.count > capacity:
            if fit.fit == 0:
                problems.append(f"not even one {layer} bar fits {where}: widen the web")
            else:
                n_layers = math.ceil(layer.count / fit.fit)
                what = f"{layer}" if len(bars.layers) == 1 else f"{layer} (layer {i} of the {name})"
                extra = f" (with the effective flange, {capacity})" if capacity != fit.fit else ""
                if len(bars.layers) == 1:
                    fix = f"schedule them in {NUMBER_WORDS.get(n_layers, str(n_layers))} layers or use fewer, larger bars"
                else:
                    fix = (f"move {layer.count - capacity} to another layer (no layer may hold more than the one "
                           "below it) or use fewer, larger bars")
                problems.append(f"{what} do not fit in {where} ({fit.fit} fit{extra}); {fix}")
        elif in_flange > 0:
            notes.append(f"{in_flange} of the {layer} ({name}) do not fit within the web ({fit.fit} fit) and extend "
                         f"into the flange beside it, at {fit.pitch:.0f} mm centres")
        if previous is not None and layer.count > previous.count:
            problems.append(f"layer {i} of the {name} ({layer}) has more bars than the layer below ({previous}); "
                            "bars of an upper layer sit directly above those below (A23.1)")
        previous = layer
    return worst, problems, notes


def _bar_fit(ctx: SpanContext, code: DetailingProvisions, loc: Location,
             faces: list[tuple[str, BarArrangement | None, str]]) -> None:
    clause = ctx.code.clauses["bar_spacing"]
    present = [(f, b, n) for f, b, n in faces if b is not None]
    if not present:
        return
    worst: tuple[float, int, int] = (0.0, 0, 0)
    problems: list[str] = []
    notes: list[str] = []
    for face, bars, name in present:
        w, p, n = _face(ctx, code, loc, face, bars, name)  # type: ignore[arg-type]
        worst, problems, notes = max(worst, w), problems + p, notes + n
    ratio, count, fit = worst
    if problems:
        msg = "; ".join(problems) + f" (minimum clear spacing: {clause})."
        ctx.result("bar_fit", "Bar fit", loc, clause, CheckStatus.FAIL, msg[0].upper() + msg[1:],
                   demand=count, capacity=fit, unit="bars", utilisation=max(ratio, 1.0 + 1e-9))
    else:
        # a full layer (count = fit) is not "near failure" as Mf = Mr is: no utilisation on a pass,
        # so a fitting layer never ranks as a span's governing check
        ctx.result("bar_fit", "Bar fit", loc, clause, CheckStatus.PASS, "; ".join(notes),
                   demand=count, capacity=fit, unit="bars")


def _flange_tension(ctx: SpanContext, loc: Location) -> None:
    clause = ctx.code.clauses["flange_tension"]
    ctx.result(
        "flange_tension", "Flange in tension", loc, clause, CheckStatus.NOT_CHECKED,
        f"Reminder: the flange is in tension {WHERE[loc]}; part of the top steel there must be distributed over the "
        f"effective flange width (cl. {clause}). The schedule does not show the distribution, so it was not checked.",
        required=False)


def _skin(ctx: SpanContext, code: DetailingProvisions) -> None:
    inp, t = ctx.inp, ctx.add_trace
    clause = ctx.code.clauses["skin"]
    if isinstance(inp.skin_bars, str):  # the Python API passes other fields through unparsed
        from dataclasses import replace

        from ..bars import parse_bars
        ctx.inp = inp = replace(inp, skin_bars=parse_bars(inp.skin_bars))
    if not code.skin_required(inp.h):
        return
    rho = code.skin_ratio(inp.exposure)
    smax = code.skin_max_spacing()
    hogging = any(sense == "neg" for sense, _ in cases(ctx))
    zone = inp.h if hogging else inp.h / 2
    zone_words = ("the full depth (tension at the bottom at midspan and at the top over the supports)"
                  if hogging else "the half depth h/2 nearest the flexural tension steel")
    side_cover = inp.cover_bottom
    db = inp.skin_bars.max_db if inp.skin_bars is not None else 11.3
    ts = min(2 * (side_cover + ctx.stirrup_db + db / 2), inp.bw / 2)
    need = rho * ts * zone
    n_need = max(1, math.ceil(zone / smax - 1e-9) - 1)  # n bars leave n + 1 gaps over the zone
    t("skin_steel", None, "ρsk", rho, "", clause, f"{inp.exposure} exposure (from memory)")
    t("skin_steel", None, "zone", zone, "mm", clause, zone_words)
    t("skin_steel", None, "ts", ts, "mm", clause,
      "strip width: twice the side cover to the skin-bar centre, ≤ bw/2 (side cover taken as the bottom cover; from memory)")
    t("skin_steel", None, "As,sk,min", need, "mm²", clause, "ρsk ts × zone, on each side face")
    t("skin_steel", None, "n,min", n_need, "bars", clause, f"bars on each face so that none is more than {smax:g} mm apart")
    if inp.skin_bars is None:
        ctx.result(
            "skin_steel", "Skin steel", None, clause, CheckStatus.NOT_CHECKED,
            f"h = {inp.h:g} mm > 750 mm: skin reinforcement is required on both side faces over {zone_words} (cl. "
            f"{clause}): about {need:.0f} mm² on each face (ρsk = {rho:g}), at most {smax:g} mm apart (at least "
            f"{n_need} bar{'s' if n_need > 1 else ''} a face). None is scheduled, so it was not checked: schedule the skin bars.",
            demand=need, unit="mm²")
        return
    have = inp.skin_bars.area
    n = inp.skin_bars.count
    spacing = zone / (n + 1)
    t("skin_steel", None, "skin bars", str(inp.skin_bars), "", clause, f"on each face: As = {have:.0f} mm², {n} bars")
    t("skin_steel", None, "s", spacing, "mm", clause, "zone / (n + 1): the gaps from the principal steel, between bars and to the end of the zone")
    problems = []
    if have < need * (1 - 1e-9):
        problems.append(f"{inp.skin_bars} on each face give {have:.0f} mm² < {need:.0f} mm² = ρsk ts × zone")
    if spacing > smax * (1 + 1e-9):
        problems.append(f"{n} bars a face over {zone:.0f} mm are {spacing:.0f} mm apart > {smax:g} mm")
    u = max(need / have if have > 0 else math.inf, spacing / smax)
    if problems:
        ctx.result("skin_steel", "Skin steel", None, clause, CheckStatus.FAIL,
                   "Skin reinforcement (h > 750 mm, cl. " + clause + "): " + "; ".join(problems)
                   + f": use at least {max(n_need, math.ceil(need / inp.skin_bars.largest_bar.area))}-"
                   f"{inp.skin_bars.largest_bar.size} a face ({need:.0f} mm², at most {smax:g} mm apart).",
                   demand=need, capacity=have, unit="mm²", utilisation=u)
    else:
        ctx.result("skin_steel", "Skin steel", None, clause, CheckStatus.PASS,
                   f"h > 750 mm: skin bars required and provided ({zone_words})",
                   demand=need, capacity=have, unit="mm²", utilisation=u)


def run(ctx: SpanContext) -> None:
    code = ctx.code if isinstance(ctx.code, DetailingProvisions) else None
    if code is None:
        return
    inp = ctx.inp
    _bar_fit(ctx, code, "mid", [("bottom", inp.bottom_bars, "bottom bars"), ("top", inp.top_bars_mid, "top bars at midspan")])
    for end in ("left", "right"):
        _bar_fit(ctx, code, end, [("top", inp.top_bars_at(end), f"top bars at the {end} support"),  # type: ignore[arg-type]
                                  ("bottom", inp.bottom_bars_support, "bottom bars at the supports")])
    if inp.shape in ("T", "L"):
        for sense, loc in cases(ctx):
            if sense == "neg":
                _flange_tension(ctx, loc)
    _skin(ctx, code)
