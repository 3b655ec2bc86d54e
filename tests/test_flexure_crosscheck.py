"""Cross-check of the flexure solver against concreteproperties, an independent general-purpose
reinforced-concrete section-analysis library (PyPI; a test dependency only).

Both are given the same thing: the stress block of CSA A23.3-19 cl. 10.1.7 with the factored
concrete strength phi_c f'c, and an elastic-plastic steel of factored strength phi_s fy (cl.
8.4.3) reached at the unfactored yield strain fy/Es, so that its stress is phi_s Es eps <= phi_s fy.
concreteproperties cuts each bar out of the concrete geometrically and finds the neutral axis by
its own root finder; the two must agree within 0.5 % on every generated section: rectangular, T
and L, one to three layers, mixed sizes, compression steel, tension steel that stays elastic,
sagging and hogging.
"""

from __future__ import annotations

import math
import random

import pytest

cp_material = pytest.importorskip("concreteproperties.material")
from concreteproperties.concrete_section import ConcreteSection  # noqa: E402
from concreteproperties.pre import add_bar  # noqa: E402
from concreteproperties.stress_strain_profile import (  # noqa: E402
    ConcreteLinear,
    RectangularStressBlock,
    SteelElasticPlastic,
)
from sectionproperties.pre.geometry import Geometry  # noqa: E402
from shapely import Polygon  # noqa: E402

from beamsched.bars import CATALOGUE, BarArrangement, BarGroup, BarLayer, parse_stirrups  # noqa: E402
from beamsched.checks.context import SpanContext  # noqa: E402
from beamsched.codes import get_code  # noqa: E402
from beamsched.model import BeamInput  # noqa: E402

CODE = get_code()
N_CASES = 240
SIZES = ["15M", "20M", "25M", "30M", "35M"]


def _layer(rng: random.Random, bw: float, side: float, max_bars: int, sizes: list[str] = SIZES) -> BarLayer:
    sizes = rng.sample(sizes, k=min(len(sizes), rng.choice([1, 1, 2])))
    groups = []
    for size in sizes:
        groups.append(BarGroup(rng.randint(1 if len(sizes) > 1 else 2, max(2, max_bars // len(sizes))),
                               CATALOGUE[size]))
    # keep the bars of a layer from overlapping in the web (bars must be distinct shapes)
    while sum(g.count * g.bar.db * 1.6 for g in groups) > bw - 2 * side and sum(g.count for g in groups) > 2:
        g0 = groups[0]
        groups[0] = BarGroup(max(1, g0.count - 1), g0.bar)
        if len(groups) > 1 and groups[0].count == 1:
            groups.pop(1)
    return BarLayer(tuple(groups))


def make_case(i: int) -> tuple[BeamInput, str]:
    rng = random.Random(1000 + i)
    shape = ["rect", "T", "L"][i % 3]
    sense = "pos" if (i // 3) % 2 == 0 else "neg"
    fc = rng.choice([20, 25, 30, 35, 40, 50, 60, 70, 80])
    fy = rng.choice([300, 350, 400, 450, 500])
    bw = rng.choice(range(250, 650, 50))
    h = rng.choice(range(400, 1250, 50))
    hf = bf = None
    if shape != "rect":
        hf = rng.choice(range(90, min(260, h // 3), 10))
        ov = rng.choice(range(100, 1100, 50))
        bf = bw + (2 * ov if shape == "T" else ov)
    cover = rng.choice([30, 40, 50])
    stirrups = parse_stirrups(rng.choice(["10M@200", "15M@250"]))
    side = cover + stirrups.bar.db
    n_layers = rng.choice([1, 1, 2, 2, 3])
    heavy = i % 7 == 0  # over-reinforced: the tension steel stays elastic
    if heavy:
        h = rng.choice(range(400, 650, 50))
        n_layers = 3
    tension = BarArrangement(tuple(_layer(rng, bw, side, 8 if heavy else 5, ["35M"] if heavy else SIZES)
                                   for _ in range(n_layers)))
    compression = BarArrangement((_layer(rng, bw, side, 3),)) if i % 2 == 0 else None
    common = dict(hf=hf, bf=bf, cover_top=cover, cover_bottom=cover, stirrups=stirrups, agg=20,
                  span=None, left_end="continuous", right_end="continuous", clear_to_next_web=None)
    if sense == "pos":
        inp = BeamInput(f"X{i}", shape, bw, h, fc, fy, bottom_bars=tension, top_bars_mid=compression, **common)
    else:
        inp = BeamInput(f"X{i}", shape, bw, h, fc, fy, top_bars_left=tension, top_bars_right=tension,
                        bottom_bars_support=compression, **common)
    return inp, sense


def concreteproperties_mr(inp: BeamInput, ctx: SpanContext, sense: str) -> float:
    sb = CODE.stress_block(inp.fc)
    concrete = cp_material.Concrete(
        name="concrete", density=2.4e-6, stress_strain_profile=ConcreteLinear(elastic_modulus=25_000),
        ultimate_stress_strain_profile=RectangularStressBlock(
            compressive_strength=CODE.phi_c() * inp.fc, alpha=sb.alpha1, gamma=sb.beta1, ultimate_strain=sb.eps_cu),
        flexural_tensile_strength=0.0, colour="lightgrey")
    steel = cp_material.SteelBar(
        name="steel", density=7.85e-6, colour="grey",
        stress_strain_profile=SteelElasticPlastic(
            yield_strength=CODE.phi_s() * inp.fy, elastic_modulus=CODE.phi_s() * CODE.Es, fracture_strain=1.0))
    bw, h = inp.bw, inp.h
    if inp.shape == "rect":
        pts = [(0, 0), (bw, 0), (bw, h), (0, h)]
    else:
        bf, hf = ctx.section.bf, inp.hf
        left = (bf - bw) / 2 if inp.shape == "T" else 0.0
        right = bf - bw - left
        pts = [(0, 0), (bw, 0), (bw, h - hf), (bw + right, h - hf), (bw + right, h), (-left, h),
               (-left, h - hf), (0, h - hf)]
    geom = Geometry(Polygon(pts), material=concrete)
    case = ctx.flexure(sense, "mid" if sense == "pos" else "left")
    faces = [(case.tension_placed, "bottom" if sense == "pos" else "top")]
    if case.compression_bars is not None:
        faces.append((case.compression_placed, "top" if sense == "pos" else "bottom"))
    for placed, face in faces:
        layers: dict[int, list] = {}
        for p in placed:
            layers.setdefault(p.layer, []).append(p)
        for groups in layers.values():
            bars = [(p, k) for p in groups for k in range(p.count)]
            side = inp.cover_bottom + inp.stirrups.bar.db
            xs = [side + (bw - 2 * side) * (j + 0.5) / len(bars) for j in range(len(bars))]
            for x, (p, _) in zip(xs, bars, strict=True):
                y = p.depth if face == "bottom" else h - p.depth
                geom = add_bar(geom, p.area / p.count, steel, x, y, n=24)
    section = ConcreteSection(geom)
    res = section.ultimate_bending_capacity(theta=0.0 if sense == "pos" else math.pi)
    # the beam bends about the horizontal axis (an L is restrained laterally by its slab): m_x
    return abs(res.m_x)


CASES = [make_case(i) for i in range(N_CASES)]


def test_the_generated_sections_cover_every_kind():
    kinds = set()
    for inp, sense in CASES:
        ctx = SpanContext(inp, CODE)
        case = ctx.flexure(sense, "mid" if sense == "pos" else "left")
        s = case.solution
        kinds.add(inp.shape)
        kinds.add(sense)
        kinds.add(f"layers={len(case.tension_bars.layers)}")
        if case.compression_bars is not None:
            kinds.add("compression steel")
        if any(b.bar.tension_steel and abs(b.stress) < inp.fy * 0.999 for b in s.bars):
            kinds.add("elastic tension steel")
        if inp.shape != "rect" and sense == "pos" and not s.block_in_first_band:
            kinds.add("block in the web")
    assert {"rect", "T", "L", "pos", "neg", "layers=1", "layers=2", "layers=3", "compression steel",
            "elastic tension steel", "block in the web"} <= kinds, kinds


@pytest.mark.parametrize("i", range(N_CASES))
def test_agrees_with_concreteproperties(i):
    inp, sense = CASES[i]
    ctx = SpanContext(inp, CODE)
    case = ctx.flexure(sense, "mid" if sense == "pos" else "left")
    ours = case.solution.Mr
    theirs = concreteproperties_mr(inp, ctx, sense)
    assert ours == pytest.approx(theirs, rel=5e-3), (inp.shape, sense, str(case.tension_bars), ours / 1e6, theirs / 1e6)
