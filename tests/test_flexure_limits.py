"""Reinforcement limits, effective flange width, statuses and input errors (CSA A23.3-19)."""

import math

import pytest

from beamsched import InputError, check_span
from beamsched.codes import get_code

PHI_C, PHI_S = 0.65, 0.85  # CSA A23.3-19 cl. 8.4.2, 8.4.3
CODE = get_code()


def find(result, key):
    return next(c for c in result.checks if c.key == key)


# --- effective flange width, CSA A23.3-19 cl. 10.3.3 (T) and 10.3.4 (L) -------------------
@pytest.mark.parametrize("shape, span, continuous, clear, bf, expect_bf, governing", [
    # T, continuous: overhang <= span/10 = 720 < 12 hf = 1500 < clear/2 = 1350 (cl. 10.3.3)
    ("T", 7200, True, 2700, 2000, 300 + 2 * 720, "span/10 (continuous)"),
    # T, simply supported: span/5 = 1440; clear/2 = 1350 governs (cl. 10.3.3)
    ("T", 7200, False, 2700, None, 300 + 2 * 1350, "half the clear distance to the next web"),
    # T, span unknown: only 12 hf (and the clear distance, unknown here) apply (cl. 10.3.3)
    ("T", None, False, None, None, 300 + 2 * 12 * 125, "12 hf"),
    # L: span/12 = 600 < 6 hf = 750 (cl. 10.3.4)
    ("L", 7200, True, None, 1500, 300 + 600, "span/12"),
    # L: 6 hf governs a long span (cl. 10.3.4)
    ("L", 12000, False, 4000, None, 300 + 750, "6 hf"),
])
def test_effective_flange_width(shape, span, continuous, clear, bf, expect_bf, governing):
    fw = CODE.effective_flange_width(shape, 300, 125, bf, span, clear, continuous)
    assert fw.bf == pytest.approx(expect_bf)
    assert fw.governing == governing
    assert fw.reduced == (bf is not None) and fw.computed == (bf is None)


def test_flange_within_limits_is_kept_as_scheduled():
    fw = CODE.effective_flange_width("T", 300, 125, 1200, 7200, 2700, True)
    assert (fw.bf, fw.governing, fw.reduced) == (1200, "as scheduled", False)


def test_cantilever_takes_the_continuous_limit():
    # cl. 10.3.3 names simply supported and continuous spans only; beamsched reads a cantilever
    # (one end free) and a one-end-continuous span as continuous: span/10, the smaller limit.
    r = check_span(shape="T", bw=300, h=600, hf=125, fc=30, fy=400, bottom="3-20M", top="4-25M",
                   span=3000, left_end="continuous", right_end="free", Mf_neg_left=100, Mf_pos=0)
    assert r.values["bf_eff_mm"] == pytest.approx(300 + 2 * 300)
    assert "span/10 (continuous)" in r.understood["bf used"]


def test_reduced_flange_is_reported():
    r = check_span(shape="T", bw=300, h=600, hf=125, bf=2500, span=7200, fc=30, fy=400, bottom="4-25M",
                   Mf_pos=200, left_end="continuous", right_end="simple")
    assert r.understood["bf used"].startswith("1740 mm, reduced from 2500 mm: span/10 (continuous) governs")


# --- minimum reinforcement, cl. 10.5.1.2 and 10.5.1.3 ---------------------------------------
def as_required_rect(Mf, b, d, fc, fy):
    # closed form for a rectangle with yielding steel: Mf = phi_s As fy (d - phi_s As fy / (2 fcd b))
    fcd = (0.85 - 0.0015 * fc) * PHI_C * fc  # cl. 10.1.7
    k = (PHI_S * fy) ** 2 / (2 * fcd * b)
    return (PHI_S * fy * d - math.sqrt((PHI_S * fy * d) ** 2 - 4 * k * Mf)) / (2 * k)


def test_min_steel_value():
    # cl. 10.5.1.2: As,min = 0.2 sqrt(f'c) bt h / fy = 0.2 * sqrt(30) * 300 * 600 / 400 = 492.95
    assert CODE.min_tension_steel(30, 400, 300, 600) == pytest.approx(0.2 * math.sqrt(30) * 300 * 600 / 400)
    r = check_span(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="2-15M", d_bottom=540)
    ms = find(r, "min_steel_pos@mid")
    assert ms.status.value == "fail" and ms.demand == pytest.approx(492.95, abs=0.01)
    assert "10.5.1.2" in ms.message


def test_required_steel_is_solved_not_scaled():
    from beamsched.bars import parse_bars
    from beamsched.checks.context import SpanContext
    from beamsched.checks.flexure import required_steel
    from beamsched.model import BeamInput
    inp = BeamInput("X", "rect", 300, 600, 30, 400, bottom_bars=parse_bars("4-25M"), d_bottom=540)
    ctx = SpanContext(inp, CODE)
    case = ctx.flexure("pos", "mid")
    for mf_knm in (50, 150, 250):
        got = required_steel(ctx, case, mf_knm * 1e6)
        assert got == pytest.approx(as_required_rect(mf_knm * 1e6, 300, 540, 30, 400), rel=1e-5)


@pytest.mark.parametrize("mf, status", [(50, "pass"), (60, "fail")])
def test_four_thirds_exemption(mf, status):
    # cl. 10.5.1.3: the minimum is waived where As provided >= 4/3 As required by analysis.
    # 2-15M = 400 mm² < As,min = 493; As,req(50 kN·m) * 4/3 < 400 but As,req(60 kN·m) * 4/3 > 400.
    need = 4 / 3 * as_required_rect(mf * 1e6, 300, 540, 30, 400)
    assert (need <= 400) == (status == "pass")
    r = check_span(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="2-15M", d_bottom=540, Mf_pos=mf)
    ms = find(r, "min_steel_pos@mid")
    assert ms.status.value == status
    assert ms.demand == pytest.approx(min(need, 492.95), rel=1e-4)
    if status == "pass":
        assert "10.5.1.3" in ms.message


@pytest.mark.parametrize("shape, bf, bt", [("T", 1740, 2.5 * 300), ("L", 900, 1.5 * 300), ("T", 600, 600)])
def test_min_steel_with_the_flange_in_tension(shape, bf, bt):
    # cl. 10.5.1.2: bt is the flange width in tension, capped at 2.5 bw (T) or 1.5 bw (L)
    r = check_span(shape=shape, bw=300, h=600, hf=125, bf=bf, fc=30, fy=400, bottom="4-25M", top="3-25M",
                   left_end="continuous", right_end="continuous", Mf_pos=100)
    ms = find(r, "min_steel_neg@left")  # no Mf- scheduled: no exemption, the demand is As,min
    assert ms.demand == pytest.approx(0.2 * math.sqrt(30) * bt * 600 / 400)
    trace_bt = next(t.value for t in r.trace if t.check == "min_steel_neg" and t.symbol == "bt" and t.location == "left")
    assert trace_bt == pytest.approx(bt)


# --- the c/d limit, cl. 10.5.2 ----------------------------------------------------------------
@pytest.mark.parametrize("fy, limit", [(300, 0.7), (400, 700 / 1100), (500, 700 / 1200)])
def test_cd_limit(fy, limit):
    assert CODE.cd_limit(fy) == pytest.approx(limit)


# --- statuses ---------------------------------------------------------------------------------
def test_blank_demand_is_not_checked_never_zero():
    r = check_span(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="4-25M")
    f = find(r, "flexure_pos@mid")
    assert f.status.value == "not_checked" and f.utilisation is None
    assert "not scheduled" in f.message and "never read as zero" in f.message
    assert r.status.value == "incomplete"


def test_failing_flexure_names_the_clause_and_the_fix():
    r = check_span(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="3-20M", Mf_pos=400)
    f = find(r, "flexure_pos@mid")
    assert f.status.value == "fail" and f.utilisation > 1
    assert "exceeds Mr" in f.message and "cl. 10.1" in f.message
    assert r.status.value == "fail"


def test_continuous_end_without_top_bars_is_not_checked():
    r = check_span(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="4-25M", Mf_pos=100, Mf_neg_left=120,
                   left_end="continuous", right_end="simple")
    f = find(r, "flexure_neg@left")
    assert f.status.value == "not_checked" and "no top bars at the left support scheduled" in f.message
    assert not any(c.key.endswith("@right") for c in r.checks)  # a simple end carries no hogging


def test_support_sagging_needs_the_bottom_bars_at_the_support():
    r = check_span(shape="T", bw=300, h=600, hf=125, bf=1200, fc=30, fy=400, bottom="4-25M", top="4-25M",
                   Mf_pos=200, Mf_neg=250, Mf_pos_left=40, left_end="continuous", right_end="continuous")
    assert find(r, "flexure_pos@left").status.value == "not_checked"
    r2 = check_span(shape="T", bw=300, h=600, hf=125, bf=1200, fc=30, fy=400, bottom="4-25M", top="4-25M",
                    bottom_support="2-25M", stirrups="10M@200", Mf_pos=200, Mf_neg=250, Mf_pos_left=40,
                    left_end="continuous", right_end="continuous")
    assert find(r2, "flexure_pos@left").status.value == "pass"
    assert r2.values["Mr_pos_left_kNm"] > 40


# --- input outside what the standard covers ---------------------------------------------------
@pytest.mark.parametrize("kwargs, field, fragment", [
    (dict(fc=15), "f'c", "20 to 80 MPa (cl. 8.6.1.1)"),
    (dict(fc=90), "f'c", "20 to 80 MPa"),
    (dict(fy=550), "fy", "at most 500 MPa (cl. 8.5.1)"),
    (dict(shape="T", hf=600, bf=1200), "hf", "less than h = 600 mm"),
    (dict(shape="T", hf=125, bf=250), "bf", "at least bw = 300 mm"),
    (dict(shape="T"), "hf", "flange thickness"),
    (dict(d_bottom=650), "d", "less than h = 600 mm"),
    (dict(bw=0), "bw", "a positive number"),
    (dict(h=-600), "h", "a positive number"),
    # not limits of the standard: under 50 mm is a unit slip (joist ribs are 100 mm and more:
    # common practice)
    (dict(h=0.6), "h", "probably in metres"),
    (dict(bw=30), "bw", "at least 50 mm"),
    (dict(bw=0.3), "bw", "e.g. 'bw (m)'"),
    (dict(Mf_pos=-20), "Mf+", "zero or more"),
])
def test_input_errors_name_the_field(kwargs, field, fragment):
    args = dict(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="4-25M", Mf_pos=100)
    args.update(kwargs)
    with pytest.raises(InputError) as e:
        check_span(**args)
    assert any(p.column == field and fragment in p.message for p in e.value.problems), e.value.problems
