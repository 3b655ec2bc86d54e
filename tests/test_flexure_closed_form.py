"""Flexure against the closed-form equations of CSA A23.3-19 (equilibrium of the equivalent
rectangular stress block, cl. 10.1.7, with the factored forces of cl. 8.4.2 and 8.4.3)."""

import math

import pytest

from beamsched import check_span
from beamsched.bars import parse_bars, parse_stirrups
from beamsched.checks.context import SpanContext
from beamsched.codes import get_code
from beamsched.model import BeamInput

PHI_C, PHI_S, ES, ECU = 0.65, 0.85, 200_000.0, 0.0035  # CSA A23.3-19 cl. 8.4.2, 8.4.3, 8.5.4.1, 10.1.3


def a1(fc):  # CSA A23.3-19 cl. 10.1.7
    return max(0.85 - 0.0015 * fc, 0.67)


def b1(fc):  # CSA A23.3-19 cl. 10.1.7
    return max(0.97 - 0.0025 * fc, 0.67)


def mr(result, key="Mr_pos_kNm"):
    return result.values[key]


@pytest.mark.parametrize("fc, alpha1, beta1", [
    (20, 0.82, 0.92), (30, 0.805, 0.895), (40, 0.79, 0.87), (60, 0.76, 0.82), (80, 0.73, 0.77),
])
def test_stress_block_parameters(fc, alpha1, beta1):
    # CSA A23.3-19 cl. 10.1.7: alpha1 = 0.85 - 0.0015 f'c, beta1 = 0.97 - 0.0025 f'c (both >= 0.67)
    sb = get_code().stress_block(fc)
    assert sb.alpha1 == pytest.approx(alpha1) and sb.beta1 == pytest.approx(beta1)
    assert sb.eps_cu == 0.0035  # cl. 10.1.3


@pytest.mark.parametrize("b, d, h, bars, fc, fy", [
    (300, 540, 600, "4-25M", 30, 400),
    (400, 720, 800, "5-30M", 35, 400),
    (250, 440, 500, "3-20M", 25, 400),
    (350, 630, 700, "4-25M", 60, 500),
])
def test_rectangular_singly_reinforced(b, d, h, bars, fc, fy):
    # CSA A23.3-19 cl. 10.1.7: a = phi_s As fy / (alpha1 phi_c f'c b); Mr = phi_s As fy (d - a/2)
    As = parse_bars(bars).area
    a = PHI_S * As * fy / (a1(fc) * PHI_C * fc * b)
    expected = PHI_S * As * fy * (d - a / 2) / 1e6
    r = check_span(shape="rect", bw=b, h=h, fc=fc, fy=fy, bottom=bars, d_bottom=d, Mf_pos=1)
    assert a / b1(fc) / d < 700 / (700 + fy)  # the steel yields, so the closed form holds (cl. 10.5.2)
    assert mr(r) == pytest.approx(expected, rel=1e-6)


def test_t_beam_block_within_flange_is_a_rectangle_bf_wide():
    # CSA A23.3-19 cl. 10.1.7 with a <= hf: the T acts as a rectangle of width bf
    bw, bf, hf, h, d, fc, fy, As = 300, 1200, 125, 600, 536, 30, 400, 2000
    a = PHI_S * As * fy / (a1(fc) * PHI_C * fc * bf)
    assert a < hf
    r = check_span(shape="T", bw=bw, h=h, hf=hf, bf=bf, fc=fc, fy=fy, bottom="4-25M", d_bottom=d, Mf_pos=1)
    assert mr(r) == pytest.approx(PHI_S * As * fy * (d - a / 2) / 1e6, rel=1e-6)


@pytest.mark.parametrize("shape, bw, bf, hf, h, d, bars, fc, fy", [
    ("T", 300, 600, 80, 680, 600, "6-30M", 30, 400),
    ("T", 350, 900, 100, 750, 660, "8-30M", 25, 400),
    ("L", 300, 550, 110, 700, 610, "6-30M", 30, 400),
])
def test_flanged_block_in_the_web(shape, bw, bf, hf, h, d, bars, fc, fy):
    # CSA A23.3-19 cl. 10.1.7 with a > hf: overhangs carry Cf = alpha1 phi_c f'c (bf - bw) hf at
    # hf/2; the web carries Cw = phi_s As fy - Cf over a = Cw / (alpha1 phi_c f'c bw).
    As = parse_bars(bars).area
    fcd = a1(fc) * PHI_C * fc
    T = PHI_S * As * fy
    Cf = fcd * (bf - bw) * hf
    a = (T - Cf) / (fcd * bw)
    assert a > hf and a / b1(fc) / d < 700 / (700 + fy)
    expected = (Cf * (d - hf / 2) + (T - Cf) * (d - a / 2)) / 1e6
    inp = BeamInput("X", shape, bw, h, fc, fy, hf=hf, bf=bf, bottom_bars=parse_bars(bars), d_bottom=d,
                    Mf_pos=1e6, left_end="simple", right_end="simple", span=20_000)
    case = SpanContext(inp, get_code()).flexure("pos", "mid")
    assert case.solution.Mr / 1e6 == pytest.approx(expected, rel=1e-6)
    assert case.solution.a == pytest.approx(a, rel=1e-6)
    # the compression force acts at the centroid of the flange-plus-web area
    area = bf * hf + bw * (a - hf)
    ybar = (bf * hf * hf / 2 + bw * (a - hf) * (hf + (a - hf) / 2)) / area
    assert case.solution.yc == pytest.approx(ybar, rel=1e-6)
    assert case.solution.block_area == pytest.approx(area, rel=1e-6)
    assert not case.solution.trial_in_first_band and not case.solution.block_in_first_band


def test_hogging_t_beam_uses_the_web_width():
    # CSA A23.3-19 cl. 10.1.7: under hogging the soffit of the web is in compression (width bw)
    bw, h, d, fc, fy, As = 300, 600, 536, 30, 400, 2000
    a = PHI_S * As * fy / (a1(fc) * PHI_C * fc * bw)
    r = check_span(shape="T", bw=bw, h=h, hf=125, bf=1200, fc=fc, fy=fy, bottom="4-25M", top="4-25M",
                   d_top=d, Mf_neg=1, left_end="continuous", right_end="continuous")
    assert r.values["Mr_neg_left_kNm"] == pytest.approx(PHI_S * As * fy * (d - a / 2) / 1e6, rel=1e-6)
    assert r.values["Mr_neg_kNm"] == r.values["Mr_neg_left_kNm"]


def test_over_reinforced_tension_steel_stays_elastic():
    # Strain compatibility (CSA A23.3-19 cl. 10.1.2, 10.1.3): with fs = Es ecu (d - c)/c < fy,
    # alpha1 phi_c f'c b beta1 c = phi_s As Es ecu (d - c)/c, a quadratic in c.
    b, d, h, fc, fy = 250, 400, 460, 25, 500
    As = parse_bars("4-35M / 2-35M").area
    fcd = a1(fc) * PHI_C * fc
    A, B, C = fcd * b * b1(fc), PHI_S * As * ES * ECU, -PHI_S * As * ES * ECU * d
    c = (-B + math.sqrt(B * B - 4 * A * C)) / (2 * A)
    fs = ES * ECU * (d - c) / c
    assert fs < fy
    a = b1(fc) * c
    expected = fcd * b * a * (d - a / 2) / 1e6
    r = check_span(shape="rect", bw=b, h=h, fc=fc, fy=fy, bottom="4-35M / 2-35M", d_bottom=d, Mf_pos=1)
    assert mr(r) == pytest.approx(expected, rel=1e-6)
    cd = next(ch for ch in r.checks if ch.key == "cd_limit_pos@mid")
    assert cd.status.value == "fail" and "10.5.2" in cd.message  # cl. 10.5.2: c/d > 700/(700+fy)
    assert cd.demand == pytest.approx(c / d, rel=1e-6)
    assert cd.capacity == pytest.approx(700 / 1200)


def test_compression_steel_yielding_with_displaced_concrete():
    # CSA A23.3-19 cl. 10.1.7 with compression steel tied by stirrups (cl. 7.6.5): the bar force
    # is phi_s As' fy less the concrete it displaces, alpha1 phi_c f'c As'.
    b, h, fc, fy = 300, 600, 30, 400
    As, Asc = parse_bars("6-30M").area, parse_bars("2-25M").area
    d = 530.0
    cover, ds, db_c = 40, 11.3, 25.2
    dprime = cover + ds + db_c / 2  # 63.9
    fcd = a1(fc) * PHI_C * fc
    Cs = PHI_S * Asc * fy - fcd * Asc
    a = (PHI_S * As * fy - Cs) / (fcd * b)
    c = a / b1(fc)
    assert ECU * (c - dprime) / c >= fy / ES  # compression steel yields
    assert ECU * (d - c) / c >= fy / ES  # tension steel yields
    assert a > dprime + db_c / 2  # the bar lies wholly within the block
    expected = (fcd * b * a * (d - a / 2) + Cs * (d - dprime)) / 1e6
    r = check_span(shape="rect", bw=b, h=h, fc=fc, fy=fy, bottom="6-30M", d_bottom=d, top_mid="2-25M",
                   stirrups="10M@250", cover_top=cover, Mf_pos=1)
    assert mr(r) == pytest.approx(expected, rel=1e-6)


def test_untied_compression_steel_carries_nothing_but_still_displaces_concrete():
    # CSA A23.3-19 cl. 7.6.5: compression bars count only when enclosed by ties or stirrups
    b, h, fc, fy, d = 300, 600, 30, 400, 530.0
    tied = check_span(shape="rect", bw=b, h=h, fc=fc, fy=fy, bottom="6-30M", d_bottom=d, top_mid="2-25M",
                      stirrups="10M@250", Mf_pos=1)
    untied = check_span(shape="rect", bw=b, h=h, fc=fc, fy=fy, bottom="6-30M", d_bottom=d, top_mid="2-25M",
                        Mf_pos=1)
    none = check_span(shape="rect", bw=b, h=h, fc=fc, fy=fy, bottom="6-30M", d_bottom=d, Mf_pos=1)
    assert mr(untied) < mr(none) < mr(tied)
    assert any("not counted" in str(t.description) for t in untied.trace if t.symbol == "compression bars")


def test_layers_and_mixed_sizes_are_placed_bar_by_bar():
    # Each bar of the first layer rests on the stirrup: cover + ds + db/2; the second layer sits
    # at the clear spacing for parallel bars, max(1.4 db, 1.4 agg, 30 mm) (CSA A23.1 cl. 6.6.5.2,
    # from memory), above the largest bar below.
    inp = BeamInput("X", "rect", 400, 700, 30, 400, cover_bottom=40, agg=20,
                    bottom_bars=parse_bars("2-25M + 2-20M / 2-25M"), stirrups=parse_stirrups("10M@200"))
    ctx = SpanContext(inp, get_code())
    placed = ctx.place(inp.bottom_bars, "bottom", tension=True)
    depths = [(p.size, p.layer, round(p.depth, 2)) for p in placed]
    clear = max(1.4 * 25.2, 1.4 * 20, 30)  # 35.28 mm
    assert depths == [
        ("25M", 1, round(40 + 11.3 + 25.2 / 2, 2)),  # 63.90
        ("20M", 1, round(40 + 11.3 + 19.5 / 2, 2)),  # 61.05
        ("25M", 2, round(40 + 11.3 + 25.2 + clear + 25.2 / 2, 2)),  # 124.38
    ]


def test_layer_clear_distance_from_project_defaults():
    inp = BeamInput("X", "rect", 400, 700, 30, 400, layer_clear=25.0,
                    bottom_bars=parse_bars("4-25M / 2-25M"), stirrups=parse_stirrups("10M@200"))
    placed = SpanContext(inp, get_code()).place(inp.bottom_bars, "bottom", tension=True)
    assert placed[1].depth == pytest.approx(40 + 11.3 + 25.2 + 25.0 + 12.6)


def test_explicit_d_lumps_all_tension_bars():
    r = check_span(shape="rect", bw=300, h=600, fc=30, fy=400, bottom="4-25M / 2-25M", d_bottom=520, Mf_pos=1)
    As = 3000
    a = PHI_S * As * 400 / (a1(30) * PHI_C * 30 * 300)
    assert mr(r) == pytest.approx(PHI_S * As * 400 * (520 - a / 2) / 1e6, rel=1e-6)


def test_precast_phi_c():
    # CSA A23.3-19 cl. 8.4.2 / 16.1.3: phi_c = 0.70 for precast made in a certified plant
    code = get_code()
    assert code.phi_c(False) == 0.65 and code.phi_c(True) == 0.70 and code.phi_s() == 0.85
    b, d, As, fc, fy = 300, 540, 2000, 30, 400
    a = PHI_S * As * fy / (a1(fc) * 0.70 * fc * b)
    r = check_span(shape="rect", bw=b, h=600, fc=fc, fy=fy, bottom="4-25M", d_bottom=d, precast=True, Mf_pos=1)
    assert mr(r) == pytest.approx(PHI_S * As * fy * (d - a / 2) / 1e6, rel=1e-6)
