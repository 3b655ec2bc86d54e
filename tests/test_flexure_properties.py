"""Invariants of the flexure solver (hypothesis): equilibrium, limiting cases, monotonicity."""

from __future__ import annotations

import os

import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from beamsched.bars import CATALOGUE, BarArrangement, BarGroup, BarLayer, parse_stirrups
from beamsched.checks.context import SpanContext
from beamsched.codes import get_code
from beamsched.model import BeamInput

CODE = get_code()
EXAMPLES = int(os.environ.get("BEAMSCHED_HYPOTHESIS_EXAMPLES", "60"))
SETTINGS = settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=[HealthCheck.too_slow])

sizes = st.sampled_from(["10M", "15M", "20M", "25M", "30M", "35M"])
layer = st.lists(st.tuples(st.integers(1, 4), sizes), min_size=1, max_size=2).map(
    lambda gs: BarLayer(tuple(BarGroup(n, CATALOGUE[s]) for n, s in gs)))
arrangement = st.lists(layer, min_size=1, max_size=3).map(lambda ls: BarArrangement(tuple(ls)))


@st.composite
def sections(draw, shape=None):
    shape = shape or draw(st.sampled_from(["rect", "T", "L"]))
    fc = draw(st.floats(20, 80))
    fy = draw(st.floats(300, 500))
    bw = draw(st.floats(200, 700))
    h = draw(st.floats(350, 1400))
    hf = bf = None
    if shape != "rect":
        hf = draw(st.floats(80, h / 3))
        bf = bw + draw(st.floats(0, 1500))
    comp = draw(st.none() | arrangement)
    return BeamInput("P", shape, bw, h, fc, fy, hf=hf, bf=bf, bottom_bars=draw(arrangement),
                     top_bars_left=draw(arrangement), top_bars_mid=comp, bottom_bars_support=comp,
                     stirrups=parse_stirrups("10M@200"), left_end="continuous", right_end="continuous")


def solve(inp: BeamInput, sense: str):
    return SpanContext(inp, CODE).flexure(sense, "mid" if sense == "pos" else "left").solution


@SETTINGS
@given(sections(), st.sampled_from(["pos", "neg"]))
def test_forces_balance_at_the_solution(inp, sense):
    # equilibrium of the section (CSA A23.3-19 cl. 10.1.2): sum of forces = 0
    s = solve(inp, sense)
    assert abs(s.residual) <= 1e-6 * s.T + 1e-3
    assert s.C_total == pytest.approx(s.T, rel=1e-6)
    assert s.Mr > 0 and s.lever_arm > 0
    assert all(abs(b.stress) <= inp.fy + 1e-9 for b in s.bars)  # steel stress capped at fy


@SETTINGS
@given(sections(shape="T"), st.sampled_from(["pos", "neg"]))
def test_t_with_bf_equal_to_bw_is_the_rectangle(inp, sense):
    from dataclasses import replace
    t = replace(inp, bf=inp.bw)
    r = replace(inp, shape="rect", hf=None, bf=None)
    assert solve(t, sense).Mr == pytest.approx(solve(r, sense).Mr, rel=1e-9)


@SETTINGS
@given(sections(shape="T"))
def test_t_whose_block_stays_in_the_flange_is_a_rectangle_bf_wide(inp):
    from dataclasses import replace
    s = solve(inp, "pos")
    if not s.block_in_first_band:
        return  # the property is about the flange-only case
    wide = replace(inp, shape="rect", bw=inp.bf, hf=None, bf=None)
    assert s.Mr == pytest.approx(solve(wide, "pos").Mr, rel=1e-9)


@SETTINGS
@given(sections(), st.sampled_from(["pos", "neg"]), sizes)
def test_adding_tension_bars_never_lowers_mr(inp, sense, size):
    from dataclasses import replace
    before = solve(inp, sense).Mr
    field = "bottom_bars" if sense == "pos" else "top_bars_left"
    bars: BarArrangement = getattr(inp, field)
    first = bars.layers[0]
    if CATALOGUE[size].db > first.max_db:
        size = max((g.bar for g in first.groups), key=lambda b: b.db).size  # keep the layers where they are
    more = BarArrangement((BarLayer(first.groups + (BarGroup(1, CATALOGUE[size]),)),) + bars.layers[1:])
    after = solve(replace(inp, **{field: more}), sense).Mr
    assert after >= before * (1 - 1e-9)
