"""Shear over columns: the provisions take arrays, and a span's shear results are the same
checked alone or among other spans.

``checks.shear.prepare`` works out both ends of every span of a chunk at once, with the shear
provisions of ``codes/`` and the arithmetic of ``solve/shear.py`` taking columns. These tests
hold them to it: each row of a column gives, bit for bit, what the same section gives alone,
and a span's results, values and trace lines do not depend on the spans checked with it.
Expected values beside each row are worked out by hand from the clause named.
"""

from __future__ import annotations

import math
import os
from dataclasses import fields

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from beamsched.bars import parse_bars, parse_stirrups
from beamsched.codes import get_code
from beamsched.engine import check_beam, check_schedule
from beamsched.model import BeamInput, CheckResult, Schedule, TraceLine
from beamsched.solve import shear as sh

CODE = get_code()
EXAMPLES = int(os.environ.get("BEAMSCHED_HYPOTHESIS_EXAMPLES", "40"))
SHEAR_CHECKS = {"shear", "min_stirrups", "stirrup_spacing", "long_steel_shear"}


def same(a, b) -> bool:
    """Equal, of the same type, and the same float to the last bit (NaN equal to NaN)."""
    if isinstance(a, float) and isinstance(b, float):
        return a.hex() == b.hex() or (math.isnan(a) and math.isnan(b))
    return type(a) is type(b) and a == b


def bits(x) -> list[str]:
    return [v.hex() for v in np.atleast_1d(np.asarray(x, dtype=float)).tolist()]


# --- the provisions over columns ----------------------------------------------------------------
def test_dv_over_a_column():
    # CSA A23.3-19 cl. 2.3 (dv): the greater of 0.9 d and 0.72 h
    dv = CODE.shear_depth(np.array([536.1, 400.0, 800.0]), np.array([600.0, 600.0, 1000.0]))
    assert dv.tolist() == pytest.approx([482.49, 432.0, 720.0])


def test_root_fc_over_a_column():
    # CSA A23.3-19 cl. 11.3.4: √f'c not taken greater than 8 MPa
    assert CODE.shear_root_fc(np.array([30.0, 64.0, 80.0])).tolist() == pytest.approx([math.sqrt(30), 8.0, 8.0])


def test_method_over_a_column():
    # CSA A23.3-19 cl. 11.3.6.3: simplified where f'c ≤ 60 MPa and fy ≤ 400 MPa; axial tension takes the
    # general method (beamsched policy, conservative)
    ok = CODE.shear_simplified_applies(np.array([60.0, 65.0, 30.0, 30.0]), np.array([400.0, 400.0, 500.0, 400.0]),
                                       np.array([False, False, False, True]))
    assert ok.tolist() == [True, False, False, False]
    assert CODE.shear_method_words(65.0, 500.0, True) == (
        "general method (cl. 11.3.6.4): f'c = 65 MPa > 60 MPa, fy = 500 MPa > 400 MPa, axial tension (Nf must enter εx)")
    assert CODE.shear_method_words(30.0, 400.0, False) == "simplified method (cl. 11.3.6.3): f'c ≤ 60 MPa, fy ≤ 400 MPa"


def test_special_members_over_a_column():
    # CSA A23.3-19 cl. 11.3.6.2 (from memory): (c) h ≤ 250 mm; (e) integral with a slab, depth below the slab
    # ≤ the lesser of bw/2 and 350 mm (beamsched's reading)
    shape = np.array(["rect", "rect", "T", "T", "L", "T"])
    h = np.array([250.0, 251.0, 400.0, 400.0, 1000.0, 1000.0])
    hf = np.array([np.nan, np.nan, 200.0, 100.0, 600.0, 700.0])
    bw = np.array([300.0, 300.0, 400.0, 400.0, 1000.0, 1000.0])
    # depth below the slab: -, -, 200 ≤ 200; 300 > 200; 400 > 350; 300 ≤ 350
    assert CODE.shear_special_member(shape, h, hf, bw).tolist() == [True, False, True, False, False, True]
    assert CODE.shear_special_member_words("rect", 251.0, None, 300.0) is None
    assert CODE.shear_special_member_words("T", 400.0, 200.0, 400.0) == (
        "beam cast integrally with a slab, depth below the slab 200 mm ≤ 200 mm = lesser of bw/2 and 350 mm "
        "(cl. 11.3.6.2)")


def test_simplified_beta_over_a_column():
    dv = np.array([482.49, 482.49, 482.49, 900.0])
    agg = np.array([20.0, 28.0, 10.0, 14.0])
    a = CODE.shear_simplified(dv, agg, np.array([True, False, False, False]))
    assert a.beta.tolist() == pytest.approx([
        0.18,                              # CSA A23.3-19 cl. 11.3.6.3(a): at least minimum stirrups
        230 / (1000 + 482.49),             # cl. 11.3.6.3(b): aggregate ≥ 20 mm
        230 / (1000 + 35 * 482.49 / 25),   # cl. 11.3.6.3(c): sze = 35 dv/(15 + ag)
        230 / (1000 + 35 * 900 / 29),      # cl. 11.3.6.3(c)
    ])
    assert a.theta.tolist() == [35.0] * 4  # cl. 11.3.6.3: θ = 35°
    assert np.isnan(a.sze[0]) and a.sze[1] == 482.49  # no sze with minimum stirrups; sze = dv for ag ≥ 20 mm
    assert [CODE.shear_basis(r, g, 30.0) for r, g in zip(a.rule.tolist(), agg.tolist(), strict=True)] == [
        "β = 0.18 with at least the minimum stirrups",
        "β = 230/(1000 + dv), aggregate 28 mm ≥ 20 mm",
        "β = 230/(1000 + sze), sze = 35 dv/(15 + ag), aggregate 10 mm < 20 mm",
        "β = 230/(1000 + sze), sze = 35 dv/(15 + ag), aggregate 14 mm < 20 mm",
    ]
    assert {CODE.shear_rule(r) for r in a.rule.tolist()} == {("simplified", "11.3.6.3")}


def test_general_beta_theta_over_a_column():
    # CSA A23.3-19 cl. 11.3.6.4: β = 0.40/(1 + 1500 εx) · 1300/(1000 + sze), θ = 29 + 7000 εx
    eps = np.array([1.0e-3, -0.5e-3, 5.0e-3, 1.0e-3, 1.0e-3, 1.0e-3])
    fc = np.array([65.0, 65.0, 65.0, 50.0, 75.0, 65.0])
    with_min = np.array([True, True, True, False, False, False])
    a = CODE.shear_general(eps, 500.0, 20.0, fc, with_min)
    assert a.beta.tolist() == pytest.approx([
        0.40 / 2.5,                               # sze = 300 mm with minimum stirrups
        0.40,                                     # εx < 0 taken as 0 (the conservative option)
        0.40 / 5.5,                               # εx ≤ 3.0e-3 (from memory)
        0.40 / 2.5 * 1300 / (1000 + 35 * 500 / 35),  # sze = 35 sz/(15 + ag)
        0.40 / 2.5 * 1300 / (1000 + 35 * 500 / 15),  # ag = 0 above 70 MPa (from memory)
        0.40 / 2.5 * 1300 / (1000 + 35 * 500 / 25),  # ag halved at 65 MPa (from memory)
    ])
    assert a.theta.tolist() == pytest.approx([36.0, 29.0, 50.0, 36.0, 36.0, 36.0])
    assert CODE.shear_basis(int(a.rule[5]), 20.0, 65.0).endswith("with ag = 10 mm")
    assert CODE.shear_rule(int(a.rule[0])) == ("general", "11.3.6.4")


def test_general_moment_floor_over_a_column():
    # CSA A23.3-19 cl. 11.3.6.4: Mf in εx not taken less than Vf dv
    m = CODE.shear_general_moment(np.array([50e6, 150e6]), np.array([200e3, 200e3]), np.array([500.0, 500.0]))
    assert m.tolist() == pytest.approx([100e6, 150e6])


def test_minimum_stirrups_over_a_column():
    # CSA A23.3-19 cl. 11.2.8.2, Eq. 11.1: Av,min = 0.06 √f'c bw s / fyt
    av = CODE.min_shear_reinforcement(np.array([30.0, 40.0]), np.array([300.0, 400.0]), np.array([250.0, 200.0]), 400.0)
    assert av.tolist() == pytest.approx([0.06 * math.sqrt(30) * 300 * 250 / 400, 0.06 * math.sqrt(40) * 400 * 200 / 400])
    # cl. 11.2.8.1: (a) Vf > Vc (a blank Vf meets no test); (b) h > 750 mm
    over_vc, deep = CODE.min_stirrups_tests(np.array([100e3, 50e3, np.nan]), np.array([80e3, 80e3, 80e3]),
                                            np.array([600.0, 800.0, 750.0]))
    assert over_vc.tolist() == [True, False, False] and deep.tolist() == [False, True, False]
    assert CODE.min_stirrups_reasons(100e3, 80e3, 800.0) == [
        "Vf = 100.0 kN > Vc = 80.0 kN (cl. 11.2.8.1(a))", "h = 800 mm > 750 mm (cl. 11.2.8.1(b))"]


def test_spacing_limits_over_a_column():
    dv = np.array([482.49, 1000.0, 482.49, 1000.0])
    high = np.array([False, False, True, True])
    limit, dv_governs = CODE.stirrup_spacing_limit(dv, high)
    assert limit.tolist() == pytest.approx([
        0.7 * 482.49,   # CSA A23.3-19 cl. 11.3.8.1: 0.7 dv
        600.0,          # cl. 11.3.8.1: 600 mm
        0.35 * 482.49,  # cl. 11.3.8.3: halved
        300.0,          # cl. 11.3.8.3: 300 mm
    ])
    words = [CODE.stirrup_spacing_words(h, g) for h, g in zip(high.tolist(), dv_governs.tolist(), strict=True)]
    assert words == ["0.7 dv", "600 mm", "0.35 dv", "300 mm"]
    # cl. 11.3.8.3: the limits halve where Vf > 0.125 λ φc f'c bw dv
    assert CODE.high_shear_limit(1.0, 0.65, 30.0, 300.0, dv[:1]).tolist() == pytest.approx(
        [0.125 * 0.65 * 30 * 300 * 482.49])


def test_generic_arithmetic_over_a_column():
    # CSA A23.3-19 cl. 11.3.5.1: Vs = φs Av fyt dv cot θ / s; cl. 11.3.3: Vr = Vc + Vs ≤ 0.25 φc f'c bw dv;
    # cl. 11.3.9: Ft = Mf/dv + 0.5 Nf + (Vf − 0.5 Vs) cot θ
    theta = np.array([35.0, 36.0])
    vs = sh.stirrup_shear(0.85, 200.0, 400.0, np.array([482.49, 500.0]), theta, 250.0)
    assert vs.tolist() == pytest.approx([0.85 * 200 * 400 * 482.49 / math.tan(math.radians(35)) / 250,
                                         0.85 * 200 * 400 * 500 / math.tan(math.radians(36)) / 250])
    r = sh.shear_resistance(np.array([100e3, 300e3]), np.array([150e3, 300e3]), np.array([500e3, 500e3]))
    assert r.vr.tolist() == [250e3, 500e3] and r.capped.tolist() == [False, True]
    ft = sh.longitudinal_tension(np.array([100e6, 0.0]), 200e3, 100e3, 0.0, 500.0, theta)
    assert ft.tolist() == pytest.approx([200e3 + 150e3 / math.tan(math.radians(35)), 150e3 / math.tan(math.radians(36))])
    # cl. 11.3.6.4: εx = (Mf/dv + Vf + 0.5 Nf) / (2 Es As); no tension steel: unbounded
    eps = sh.strain_eps_x(np.array([200e6, 200e6]), 250e3, 0.0, 500.0, 200_000.0, np.array([1500.0, 0.0]))
    assert eps[0] == pytest.approx((400e3 + 250e3) / (2 * 2e5 * 1500)) and eps[1] == math.inf


@settings(max_examples=EXAMPLES, deadline=None)
@given(st.lists(st.floats(29.0, 50.0), min_size=1, max_size=40))
def test_tangent_is_maths_own(thetas):
    # numpy's tangent may differ from math.tan in the last bit; the columns use math.tan's
    assert bits(sh.tan_degrees(np.array(thetas))) == [math.tan(math.radians(t)).hex() for t in thetas]


@settings(max_examples=EXAMPLES, deadline=None)
@given(eps=st.lists(st.floats(-1e-3, 4e-3), min_size=2, max_size=12), fc=st.floats(20, 80),
       dv=st.floats(150, 1500), agg=st.sampled_from([10.0, 14.0, 20.0, 28.0]), with_min=st.booleans())
def test_each_row_of_a_column_is_the_section_alone(eps, fc, dv, agg, with_min):
    column = CODE.shear_general(np.array(eps), dv, agg, fc, with_min)
    for i, e in enumerate(eps):
        alone = CODE.shear_general(e, dv, agg, fc, with_min)
        for f in ("beta", "theta", "sze", "eps_x"):
            assert bits(getattr(column, f)[i]) == bits(getattr(alone, f)), f
    vs = sh.stirrup_shear(0.85, 200.0, 400.0, dv, column.theta, 200.0)
    assert bits(vs) == [sh.stirrup_shear(0.85, 200.0, 400.0, dv, t, 200.0).item().hex() for t in column.theta.tolist()]


# --- a span alone or among others ---------------------------------------------------------------
BARS = ["2-15M", "3-20M", "3-25M", "4-25M", "4-30M", "2-25M + 2-20M", "3-25M / 2-20M"]


@st.composite
def spans(draw) -> BeamInput:
    """A span meant to reach every branch of the shear checks: either method (f'c to 80 MPa, fy 500,
    axial tension), the special members (h ≤ 250 mm, thin webs below a slab), stirrups below the
    minimum or none, Vf at one end, at neither or negative, free and continuous ends (invented values)."""
    shape = draw(st.sampled_from(["rect", "rect", "T", "L"]))
    h = draw(st.sampled_from([200.0, 250.0, 300.0, 450.0, 600.0, 800.0, 1000.0]))
    hf = draw(st.sampled_from([100.0, 150.0])) if shape != "rect" else None
    left = draw(st.sampled_from(["simple", "continuous", "free"]))
    right = draw(st.sampled_from(["simple", "continuous"]))
    bars = st.sampled_from(BARS).map(parse_bars)
    moment = st.none() | st.floats(0, 600e6)
    shear = st.none() | st.floats(-900e3, 900e3)
    stirrups = st.none() | st.builds(lambda kind, s: parse_stirrups(f"{kind}@{s}"),
                                     st.sampled_from(["10M", "15M", "4L-10M"]),
                                     st.sampled_from([75, 150, 250, 350, 500, 700]))
    return BeamInput(
        mark="C", shape=shape, bw=draw(st.sampled_from([200.0, 300.0, 400.0, 600.0])), h=h, hf=hf,
        fc=draw(st.sampled_from([25.0, 30.0, 60.0, 62.5, 65.0, 70.0, 80.0])), fy=draw(st.sampled_from([400.0, 500.0])),
        span=8000.0, clear_span=7600.0, left_end=left, right_end=right, bottom_bars=draw(st.none() | bars),
        top_bars_left=draw(st.none() | bars), top_bars_right=draw(st.none() | bars),
        bottom_bars_support=draw(st.none() | bars), stirrups=draw(stirrups),
        fyt=draw(st.none() | st.sampled_from([300.0, 400.0])), agg=draw(st.sampled_from([10.0, 20.0, 28.0])),
        lam=draw(st.sampled_from([1.0, 0.75])), Mf_pos=draw(moment), Mf_neg_left=draw(moment),
        Mf_neg_right=draw(moment), Mf_pos_left=draw(st.none() | st.just(50e6)), Vf_left=draw(shear),
        Vf_right=draw(shear), Pf=draw(st.none() | st.floats(-400e3, 400e3)), Tf=0.0,
    )


@settings(max_examples=EXAMPLES, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(st.lists(spans(), min_size=2, max_size=10))
def test_a_span_checked_alone_or_among_others_is_the_same(inputs):
    schedule = Schedule(path="", sheet="", header_row=None, rows=tuple(inputs))
    together = check_schedule(schedule, CODE, lazy_trace=False)  # one chunk: each module's prepare sees them all
    for inp, got in zip(inputs, together, strict=True):
        ref = check_beam(inp, CODE)  # columns of one span
        assert got.status is ref.status
        assert len(got.checks) == len(ref.checks)
        for a, b in zip(got.checks, ref.checks, strict=True):
            assert all(same(getattr(a, f.name), getattr(b, f.name)) for f in fields(CheckResult)), (b.key, a, b)
        assert list(got.values) == list(ref.values)
        assert all(same(got.values[k], ref.values[k]) for k in ref.values), got.values
        assert len(got.trace) == len(ref.trace)
        for a, b in zip(got.trace, ref.trace, strict=True):
            assert all(same(getattr(a, f.name), getattr(b, f.name)) for f in fields(TraceLine)), (a, b)


def _inp(**kw) -> BeamInput:
    args = dict(mark="B", shape="rect", bw=300.0, h=600.0, fc=30.0, fy=400.0, bottom_bars=parse_bars("3-25M"),
                stirrups=parse_stirrups("10M@250"), Vf_left=150e3, Vf_right=-150e3, Mf_pos=200e6, Tf=0.0)
    args.update(kw)
    return BeamInput(**args)


# One span for each branch of the shear checks (invented values), and the trace line or note that shows it
BRANCHES = [
    (_inp(), "β = 0.18 with at least the minimum stirrups"),
    (_inp(fc=65.0), "general method (cl. 11.3.6.4): f'c = 65 MPa > 60 MPa"),
    (_inp(Pf=-100e3), "axial tension (Nf must enter εx)"),
    (_inp(bw=400.0, h=250.0, bottom_bars=parse_bars("4-15M"), stirrups=None, Mf_pos=20e6, Vf_left=30e3,
          Vf_right=30e3), "β = 0.21 for the special member types"),
    (_inp(shape="T", hf=200.0, h=400.0, bw=400.0, stirrups=None, Vf_left=60e3), "beam cast integrally with a slab"),
    (_inp(bw=500.0, stirrups=parse_stirrups("10M@600"), bottom_bars=parse_bars("4-25M")), "Vs ignored"),
    (_inp(stirrups=parse_stirrups("4L-15M@75"), Vf_left=800e3), "crushing limit"),
    (_inp(stirrups=None, Vf_left=90e3), "none are scheduled"),
    (_inp(Vf_left=None, Vf_right=None, stirrups=parse_stirrups("10M@300")), "Vf is not scheduled."),
    (_inp(Vf_right=None), "Vf at the right support is not scheduled"),
    (_inp(left_end="free", top_bars_left=parse_bars("3-20M"), Mf_neg_left=None, Vf_left=None, Mf_pos=None,
          Mf_neg_right=100e6, right_end="continuous", top_bars_right=parse_bars("3-20M")),
     "free end (cantilever tip)"),
    (_inp(fc=65.0, left_end="continuous", top_bars_left=parse_bars("3-20M")), "needs the moment"),
    (_inp(agg=10.0, stirrups=None, Vf_left=50e3), "sze = 35 dv/(15 + ag), aggregate 10 mm < 20 mm"),
    (_inp(top_bars_left=parse_bars("3-20M"), left_end="continuous", Mf_neg_left=140e6, Vf_left=200e3),
     "add top bars"),
]


def test_every_shear_branch_is_the_same_alone_or_among_the_others():
    inputs = [inp for inp, _ in BRANCHES]
    together = check_schedule(Schedule(path="", sheet="", header_row=None, rows=tuple(inputs)), CODE,
                              lazy_trace=False)
    for (inp, shows), got in zip(BRANCHES, together, strict=True):
        ref = check_beam(inp, CODE)
        words = [c.message for c in ref.checks if c.id in SHEAR_CHECKS] + [
            f"{t.value} {t.description}" for t in ref.trace if t.check in SHEAR_CHECKS]
        assert any(shows in w for w in words), shows  # the span reaches its branch
        assert got.checks == ref.checks and got.values == ref.values and got.trace == ref.trace
        for a, b in zip(got.checks, ref.checks, strict=True):
            assert all(same(getattr(a, f.name), getattr(b, f.name)) for f in fields(CheckResult)), b.key
