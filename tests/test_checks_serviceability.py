"""Crack control (CSA A23.3-19 cl. 10.6.1) and minimum depth for deflection (cl. 9.8.2.1, Table 9.2).

z = fs (dc A)^(1/3): dc from the clear cover (capped at 50 mm) plus db/2; A = 2 ȳ bw / N with
N = As / area of the largest bar; limits 30 000 / 25 000 N/mm; × 1.2 for epoxy-coated bars;
fs = 0.6 fy or from the cracked elastic section under a service moment.
"""

from __future__ import annotations

import math

import pytest

from beamsched import check_span
from beamsched.checks.serviceability import cracked_steel_stress
from beamsched.codes import get_code
from beamsched.section import Rect

CODE = get_code()
BASE = dict(mark="C", shape="rect", bw=300, h=600, fc=30, fy=400, bottom="3-25M", stirrups="10M@250",
            Mf_pos=200, Vf=150, span=6000, clear_span=5700, sfrs=False, Tf=0)


def span(**kw):
    return check_span(**{**BASE, **kw})


def find(r, key):
    return next(c for c in r.checks if c.key == key)


def z_of(fs, dc, ybar, bw, n):
    return fs * (dc * 2 * ybar * bw / n) ** (1 / 3)


@pytest.mark.parametrize("kw, z, limit", [
    # cover 40 + 10M = 51.3 mm clear, capped at 50: dc = 50 + 12.6 = 62.6; ȳ = 63.9 - 1.3 = 62.6; N = 3 (cl. 10.6.1)
    ({}, z_of(240, 62.6, 62.6, 300, 3), 25_000),
    ({"exposure": "interior"}, z_of(240, 62.6, 62.6, 300, 3), 30_000),  # cl. 10.6.1: interior limit
    ({"epoxy": True}, 1.2 * z_of(240, 62.6, 62.6, 300, 3), 25_000),      # cl. 10.6.1: epoxy × 1.2
    ({"cover_bottom": 30}, z_of(240, 53.9, 53.9, 300, 3), 25_000),       # 41.3 mm clear: no cap
    # cover 75: 86.3 mm clear → 50 mm for dc and A: ȳ = (75 + 11.3 + 12.6) - 36.3 = 62.6
    ({"cover_bottom": 75}, z_of(240, 62.6, 62.6, 300, 3), 25_000),
    # mixed sizes: N = 1600 / 500 = 3.2; ȳ = (1000·63.9 + 600·61.05)/1600 - 1.3
    ({"bottom": "2-25M + 2-20M"}, z_of(240, 62.6, (1000 * 63.9 + 600 * 61.05) / 1600 - 1.3, 300, 3.2), 25_000),
    ({"fy": 350, "fyt": 350}, z_of(210, 62.6, 62.6, 300, 3), 25_000),   # fs = 0.6 fy
])
def test_z_by_hand(kw, z, limit):
    c = find(span(**kw), "crack_control@mid")
    assert c.demand == pytest.approx(z, rel=1e-9) and c.capacity == limit
    assert c.status.value == ("pass" if z <= limit else "fail")


def test_crack_fail_message():
    c = find(span(bottom="2-35M", Mf_pos=150, fy=400), "crack_control@mid")
    # dc = 50 + 17.85 = 67.85; ȳ = 67.85; N = 2: A = 2·67.85·300/2 = 20355 → z = 240 (1 381 087)^(1/3) = 26 739
    assert c.demand == pytest.approx(z_of(240, 67.85, 67.85, 300, 2))
    assert c.status.value == "fail" and "more, smaller bars" in c.message and "10.6.1" in c.message


def test_crack_control_at_the_supports_with_hogging():
    r = span(top="4-20M", left_end="continuous", right_end="continuous", Mf_neg=150)
    for where in ("left", "right"):
        c = find(r, f"crack_control@{where}")
        # top cover 40 + 11.3 = 51.3 → 50; dc = 50 + 9.75 = 59.75; ȳ = 61.05 - 1.3; N = 4
        assert c.demand == pytest.approx(z_of(240, 59.75, 59.75, 300, 4))


def test_crack_control_does_not_apply_at_fy_300():
    r = span(fy=300, fyt=300)
    c = find(r, "crack_control")
    assert c.status.value == "pass" and "does not apply" in c.message and c.utilisation is None  # cl. 10.6.1


def test_cracked_section_matches_the_rectangular_closed_form():
    # Rectangle, b = 300, d = 536.1, As = 1500, n = Es / Ec with Ec = (3300 √30 + 6900) (cl. 8.6.2.2):
    # k = √(2ρn + (ρn)²) − ρn; fs = Ms / (As d (1 − k/3)) (elastic cracked section, textbook closed form)
    ec = 3300 * math.sqrt(30) + 6900
    n = 200_000 / ec
    rho = 1500 / (300 * 536.1)
    k = math.sqrt(2 * rho * n + (rho * n) ** 2) - rho * n
    fs = 120e6 / (1500 * 536.1 * (1 - k / 3))
    got, kd, _ = cracked_steel_stress((Rect(0, 600, 300),), [(1500, 536.1)], n, 120e6)
    assert kd == pytest.approx(k * 536.1, rel=1e-6) and got == pytest.approx(fs, rel=1e-6)
    c = find(span(Ms_pos=120e6), "crack_control@mid")
    assert c.demand == pytest.approx(fs * (62.6 * 2 * 62.6 * 300 / 3) ** (1 / 3), rel=1e-6)


def test_cracked_t_section_with_the_axis_in_the_flange_is_a_wide_rectangle():
    n = 8.0
    a, kd_a, _ = cracked_steel_stress((Rect(0, 150, 1200), Rect(150, 600, 300)), [(1500, 536.1)], n, 150e6)
    b, kd_b, _ = cracked_steel_stress((Rect(0, 600, 1200),), [(1500, 536.1)], n, 150e6)
    assert kd_a < 150 and a == pytest.approx(b) and kd_a == pytest.approx(kd_b)


# --- minimum depth, cl. 9.8.2.1 Table 9.2 ---------------------------------------------------------
@pytest.mark.parametrize("left, right, divisor", [
    ("simple", "simple", 16), ("continuous", "simple", 18), ("continuous", "continuous", 21),
    ("continuous", "free", 8), ("free", "simple", 8),
])
def test_table_9_2_divisors(left, right, divisor):
    assert CODE.min_depth_divisor(left, right)[0] == divisor  # Table 9.2, beams


@pytest.mark.parametrize("fy, factor", [(400, 1.0), (500, 0.4 + 500 / 670), (300, 0.4 + 300 / 670)])
def test_fy_factor(fy, factor):
    assert CODE.min_depth_fy_factor(fy) == pytest.approx(factor)  # Table 9.2 note: (0.4 + fy/670)


@pytest.mark.parametrize("lam, factor", [
    (1.0, 1.0),
    (0.85, 1.65 - 0.0003 * 1850),  # semi-low density, lowest of its class (from memory)
    (0.75, 1.65 - 0.0003 * 1400),  # low density (from memory)
])
def test_density_factor(lam, factor):
    assert CODE.min_depth_density_factor(CODE.density_kg_m3("", lam)) == pytest.approx(factor)


def test_min_depth_pass_and_caveat():
    c = find(span(), "min_depth")
    assert c.status.value == "pass" and c.demand == pytest.approx(5700 / 16)
    assert "partitions" in c.message and "not a statement that deflections are acceptable" in c.message


def test_min_depth_shallow_needs_a_calculation():
    r = span(h=340, clear_span=5700, Mf_pos=60, Vf=60, bottom="3-20M")
    c = find(r, "min_depth")
    assert c.status.value == "not_checked" and c.required and "deflection calculation is needed" in c.message
    assert r.status.value in ("incomplete", "fail")
    assert c.demand == pytest.approx(5700 / 16)


def test_min_depth_with_fy_and_density():
    c = find(span(fy=500, fyt=400, lam=0.85), "min_depth")
    assert c.demand == pytest.approx(5700 / 16 * (0.4 + 500 / 670) * (1.65 - 0.0003 * 1850))


def test_min_depth_without_span():
    r = span(span=None, clear_span=None)
    c = find(r, "min_depth")
    assert c.status.value == "not_checked" and "no span length" in c.message and r.status.value == "incomplete"


def test_min_depth_uses_span_when_no_clear_span():
    r = span(clear_span=None)
    assert find(r, "min_depth").demand == pytest.approx(6000 / 16)
    assert any(t.check == "min_depth" and "conservative" in t.description for t in r.trace)
