"""Torsion threshold (CSA A23.3-19 cl. 11.2.9.1) and the scope checks (deep members cl. 10.7.1,
deep shear spans cl. 11.4, SFRS Clause 21, beam-columns), with every not_checked and
incomplete path."""

from __future__ import annotations

import math

import pytest

from beamsched import check_span
from beamsched.checks.scope import shear_span
from beamsched.codes import get_code

CODE = get_code()
BASE = dict(mark="X", shape="rect", bw=300, h=600, fc=30, fy=400, bottom="3-25M", stirrups="10M@250",
            Mf_pos=200, Vf=150, span=6000, clear_span=5700, sfrs=False, Tf=0)


def span(**kw):
    return check_span(**{**BASE, **kw})


def find(r, key):
    return next(c for c in r.checks if c.key == key)


# --- torsion ----------------------------------------------------------------------------------
# cl. 11.2.9.1: Tcr = (Acp²/pc) 0.38 λ φc √f'c; 300 x 600: Acp = 180 000 mm², pc = 1800 mm
TCR_RECT = 180_000 ** 2 / 1800 * 0.38 * 0.65 * math.sqrt(30)


@pytest.mark.parametrize("tf, status", [(0.9 * 0.25 * TCR_RECT / 1e6, "pass"), (1.1 * 0.25 * TCR_RECT / 1e6, "not_checked")])
def test_torsion_threshold_rectangle(tf, status):
    r = span(Tf=tf)
    c = find(r, "torsion")
    assert c.capacity == pytest.approx(0.25 * TCR_RECT / 1e6) and c.status.value == status
    if status == "not_checked":
        assert c.required and "full torsion design required (11.3.10)" in c.message
        assert r.status.value == "incomplete"
    else:
        assert r.status.value == "pass"


def test_torsion_over_the_threshold_is_no_utilisation_and_never_governs():
    # Tf twice the threshold of cl. 11.2.9.1: the ratio is to a threshold, not to a resistance,
    # so it gives no utilisation; the span's largest utilisation stays a capacity ratio
    r = span(Tf=2 * 0.25 * TCR_RECT / 1e6)
    c = find(r, "torsion")
    assert c.status.value == "not_checked" and c.utilisation is None
    assert c.demand == pytest.approx(2 * c.capacity)  # both still reported, in kN·m
    assert r.governing is not None and r.governing.id != "torsion" and r.utilisation < 2


def test_torsion_flanged_section_uses_the_smaller_tcr():
    # T: bw 300, h 600, hf 150, bf 1200: overhang min(h - hf = 450, 4 hf = 600, scheduled 450) = 450 (from memory)
    # flanged Acp = 180 000 + 2·450·150 = 315 000, pc = 1800 + 4·450 = 3600: Acp²/pc = 27.56e6 > 18e6 (web alone)
    r = check_span(**{**BASE, "shape": "T", "hf": 150, "bf": 1200, "Tf": 1.0})
    c = find(r, "torsion")
    assert c.capacity == pytest.approx(0.25 * TCR_RECT / 1e6)
    tcrs = [t.value for t in r.trace if t.check == "torsion" and t.symbol == "Tcr"]
    assert tcrs[1] == pytest.approx(315_000 ** 2 / 3600 * 0.38 * 0.65 * math.sqrt(30) / 1e6)
    assert any("h − hf" in t.description for t in r.trace if t.check == "torsion")


@pytest.mark.parametrize("h, hf, overhang", [(600, 150, 450), (600, 100, 400), (300, 100, 200)])
def test_torsion_overhang_rule(h, hf, overhang):
    assert CODE.torsion_flange_overhang(h, hf)[0] == overhang  # min(h − hf, 4 hf), from memory


def test_spandrel_without_tf_is_incomplete():
    r = check_span(**{**BASE, "shape": "L", "hf": 150, "Tf": None})
    c = find(r, "torsion")
    assert c.status.value == "not_checked" and c.required and "torsion not assessed" in c.message.lower()
    assert r.status.value == "incomplete"
    r0 = check_span(**{**BASE, "shape": "L", "hf": 150, "Tf": 0})  # Tf = 0: an explicit statement
    assert find(r0, "torsion").status.value == "pass" and "assessed as none" in find(r0, "torsion").message


def test_rectangle_without_tf_gets_a_reminder_only():
    r = span(Tf=None)
    c = find(r, "torsion")
    assert c.status.value == "not_checked" and not c.required and r.status.value == "pass"


# --- deep members ---------------------------------------------------------------------------------
@pytest.mark.parametrize("ln, h, ends, status", [
    (1800, 1500, ("simple", "simple"), "not_checked"),       # ℓn/h = 1.2 < 1.25 (cl. 10.7.1, from memory)
    (2000, 1500, ("simple", "simple"), "pass"),              # 1.33 ≥ 1.25
    (3600, 1500, ("continuous", "continuous"), "not_checked"),  # 2.4 < 2.5 (continuous)
    (3900, 1500, ("continuous", "continuous"), "pass"),      # 2.6 ≥ 2.5
])
def test_deep_flexural_member(ln, h, ends, status):
    r = check_span(shape="rect", bw=600, h=h, fc=35, fy=400, bottom="6-30M", top="6-30M", stirrups="4L-15M@200",
                   clear_span=ln, span=ln + 400, left_end=ends[0], right_end=ends[1], sfrs=False, Tf=0)
    c = find(r, "scope_deep")
    assert c.status.value == status
    if status == "not_checked":
        assert c.required and "10.7.1" in c.message and r.status.value in ("incomplete", "fail")


def test_transfer_girder_deep_shear_span():
    # a column load near the left support: Vf L = 2800, Vf R = 900 kN, Mf+ = 3200 kN·m, ℓn = 3900:
    # a1 = 3200/2800 = 1143 mm; a2 = 3900 · 900/3700 = 949 mm; a = 1143 mm; d ≈ 1400 mm, a/d ≈ 0.82 < 2
    r = check_span(shape="rect", bw=600, h=1500, fc=40, fy=400, bottom="6-30M / 4-30M", stirrups="4L-15M@150",
                   Mf_pos=3200, Vf_left=2800, Vf_right=900, span=4500, clear_span=3900, sfrs=False, Tf=0)
    c = find(r, "scope_deep")
    assert c.status.value == "not_checked" and "deep shear span" in c.message and "11.4" in c.message
    assert "at the left end (a ≈ 1143 mm" in c.message and "right end" not in c.message
    assert r.status.value != "pass"


@pytest.mark.parametrize("mf, vend, vother, ln, a", [
    (5000 / 6 * 1000, 5000 / 6, 1000 / 6, 6000, 1000),  # one point load P = 1000 at 1 m on 6 m: exact
    (25 * 6000 ** 2 / 8, 25 * 3000, 25 * 3000, 6000, 3000),  # uniform load: ℓn/2, the distance to zero shear
])
def test_shear_span_estimate(mf, vend, vother, ln, a):
    # statics of a simple span
    assert shear_span(mf, 0.0, vend, vother, ln)[0] == pytest.approx(a)


def test_scope_without_span_length():
    r = span(span=None, clear_span=None)
    c = find(r, "scope_deep")
    assert c.status.value == "not_checked" and "no span length" in c.message


# --- SFRS and axial load ------------------------------------------------------------------------------
def test_sfrs():
    r = span(sfrs=True)
    c = find(r, "scope_seismic")
    assert c.status.value == "not_checked" and c.required and "Clause 21" in c.message and r.status.value == "incomplete"
    r2 = span(sfrs=None)
    c2 = find(r2, "scope_seismic")
    assert c2.status.value == "not_checked" and not c2.required and r2.status.value == "pass"
    assert find(span(), "scope_seismic").status.value == "pass"


@pytest.mark.parametrize("pf, status", [
    (500, "pass"),         # ≤ 0.1 f'c Ag = 0.1 · 30 · 180 000 = 540 kN (beamsched's limit)
    (600, "not_checked"),  # a beam-column
    (-50, "not_checked"),  # axial tension: flexure ignores it
])
def test_axial(pf, status):
    r = span(Pf=pf)
    c = find(r, "scope_axial")
    assert c.status.value == status
    if status == "not_checked":
        assert c.required and r.status.value == "incomplete"
        assert c.utilisation is None  # a scope limit, not a resistance: never the governing check
    else:
        assert c.capacity == pytest.approx(540)


def test_blank_pf_makes_no_axial_result():
    assert not any(c.id == "scope_axial" for c in span().checks)
