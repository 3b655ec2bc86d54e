"""Bar fit, skin reinforcement and the flange-in-tension reminder.

Bar fit is counted against hand layouts: the clear distance between bars is
max(1.4 db, 1.4 × aggregate, 30 mm) (CSA A23.1 6.6.5.2, reproduced in CSA A23.3 Annex A);
the corner bars sit in the stirrup bends, the inside bend diameter 4 ds for 10M and 15M and
6 ds for 20M and 25M stirrups (CSA A23.1, from memory); a bar resting on the horizontal leg and
touching a bend of radius r has its centre r in from the inside of the vertical leg (geometry).
fit = 1 + floor((bw − 2 cover − 2 ds − 2 offset) / (db + clear)).
"""

from __future__ import annotations

import math

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from beamsched import check_span
from beamsched.bars import parse_bars
from beamsched.codes import get_code
from beamsched.solve.shear import bars_per_layer, corner_bar_offset

CODE = get_code()


def find(r, key):
    return next(c for c in r.checks if c.key == key)


def fit_result(bw, bottom, stirrups="10M@200", **kw):
    r = check_span(shape="rect", bw=bw, h=600, fc=30, fy=400, bottom=bottom, stirrups=stirrups, **kw)
    return r, find(r, "bar_fit@mid")


@pytest.mark.parametrize("bw, bars, stirrups, fits, note", [
    # inside 300-80-22.6 = 197.4; offset r = 2·11.3 = 22.6; pitch 25.2 + 35.28 = 60.48; 1 + floor(152.2/60.48) = 3
    (300, "3-25M", "10M@200", 3, "hand layout, 25M in 300"),
    # 20M: clear max(27.3, 28, 30) = 30, pitch 49.5; 1 + floor(152.2/49.5) = 4
    (300, "4-20M", "10M@200", 4, "hand layout, 20M in 300"),
    # no stirrups: inside 220, offset 12.6, 1 + floor(194.8/60.48) = 4
    (300, "4-25M", None, 4, "hand layout, no stirrups"),
    # 15M stirrups (bend 4·16 = 64, r = 32), 30M: inside 400-80-32 = 288, span 224, pitch 29.9 + 41.86 = 71.76 → 4
    (400, "4-30M", "15M@200", 4, "hand layout, 15M stirrups"),
    # 20M stirrups (bend 6·19.5 = 117, r = 58.5), 35M: inside 600-80-39 = 481, span 364, pitch 85.68 → 5
    (600, "5-35M", "20M@300", 5, "hand layout, 20M stirrups, 6 ds bend (from memory)"),
    # 55M: the bar is larger than the bend: offset db/2 = 28.2; span 141, pitch 56.4 + 78.96 = 135.36 → 2
    (300, "2-55M", "10M@200", 2, "hand layout, bar larger than the bend"),
])
def test_bar_fit_against_hand_layouts(bw, bars, stirrups, fits, note):
    r, c = fit_result(bw, bars, stirrups)
    assert c.status.value == "pass", (note, c.message)
    line = next(t for t in r.trace if t.check == "bar_fit" and t.symbol.startswith("fit bottom bars layer 1"))
    assert line.value == fits, note
    # one more bar does not fit, and the note says how many do and what to change
    n, size = bars.split("-")
    r2, c2 = fit_result(bw, f"{int(n) + 1}-{size}", stirrups)
    assert c2.status.value == "fail" and f"({fits} fit)" in c2.message and "two layers" in c2.message


def test_the_issue_example_message():
    _, c = fit_result(300, "5-25M")
    assert c.message.startswith("5-25M do not fit in one layer of bw = 300 with 40 mm cover and 10M stirrups (3 fit); "
                                "schedule them in two layers")
    assert c.utilisation == pytest.approx(5 / 3) and (c.demand, c.capacity, c.unit) == (5, 3, "bars")


def test_a_full_layer_passes_without_a_utilisation():
    _, c = fit_result(300, "3-25M")  # exactly 3 fit: a pass, never ranked as the governing check
    assert c.status.value == "pass" and c.utilisation is None and (c.demand, c.capacity) == (3, 3)


def test_mixed_sizes_are_spaced_by_the_larger_bar():
    # 2-25M + 2-20M: spaced as 25M → 3 fit (not the 4 that 20M alone allow)
    _, c = fit_result(300, "2-25M + 2-20M")
    assert c.status.value == "fail" and "(3 fit)" in c.message


def test_two_layers_fit_and_upper_layer_rule():
    assert fit_result(300, "3-25M / 2-25M")[1].status.value == "pass"
    _, c = fit_result(300, "2-25M / 3-25M")
    assert c.status.value == "fail" and "directly above" in c.message  # A23.1: upper bars above those below


def test_top_bars_extend_into_the_flange():
    # T, bw 300, bf 1200 (overhang 450 each side, within 12 hf and span/10): 3 fit in the web, 7 more a side
    r = check_span(shape="T", bw=300, h=600, hf=150, bf=1200, span=8000, fc=30, fy=400, bottom="3-25M", top="6-25M",
                   stirrups="10M@200", left_end="continuous", right_end="continuous", Mf_pos=150, Mf_neg=250)
    c = find(r, "bar_fit@left")
    assert c.status.value == "pass" and "3 of the 6-25M" in c.message and "flange" in c.message
    rr = check_span(shape="rect", bw=300, h=600, span=8000, fc=30, fy=400, bottom="3-25M", top="6-25M",
                    stirrups="10M@200", left_end="continuous", right_end="continuous", Mf_pos=150, Mf_neg=250)
    assert find(rr, "bar_fit@left").status.value == "fail"  # a rectangle has no flange to take them


def test_generic_geometry():
    assert corner_bar_offset(25.2, 45.2) == pytest.approx(22.6)  # bend radius governs
    assert corner_bar_offset(56.4, 45.2) == pytest.approx(28.2)  # db/2 governs
    f = bars_per_layer(300, 40, 11.3, 45.2, 25.2, 35.28)
    assert (f.inside, f.offset, f.fit) == (pytest.approx(197.4), pytest.approx(22.6), 3)
    assert bars_per_layer(100, 40, 11.3, 45.2, 25.2, 35.28).fit == 0  # too narrow for any bar


@pytest.mark.parametrize("ds, diameter", [(11.3, 45.2), (16.0, 64.0), (19.5, 117.0), (25.2, 151.2)])
def test_stirrup_bend_diameters(ds, diameter):
    # CSA A23.1 stirrup bends (from memory): 4 ds for 10M, 15M; 6 ds for 20M, 25M
    assert CODE.stirrup_bend_diameter(ds)[0] == pytest.approx(diameter)


# --- skin reinforcement, cl. 10.6.2 (from memory: ρsk 0.008 / 0.010, s ≤ 200 mm) -----------------
SKIN = dict(shape="rect", bw=400, h=900, fc=30, fy=400, bottom="4-25M", stirrups="10M@300", Mf_pos=300, Vf=200,
            span=8000, clear_span=7600, sfrs=False, Tf=0)


def test_skin_not_scheduled_is_incomplete():
    r = check_span(**SKIN)
    c = find(r, "skin_steel")
    # ts = min(2 (40 + 11.3 + 11.3/2), 200) = 113.9; zone h/2 = 450; need 0.010 · 113.9 · 450 = 512.6 mm²
    assert c.status.value == "not_checked" and c.required and c.demand == pytest.approx(0.010 * 113.9 * 450)
    assert "schedule the skin bars" in c.message and r.status.value == "incomplete"


@pytest.mark.parametrize("bars, status", [
    ("3-15M", "pass"),  # ts = 2 (40 + 11.3 + 8) = 118.6, need 533.7 ≤ 600 mm²; s = 450/4 = 112.5 ≤ 200
    ("2-10M", "fail"),  # 200 mm² < 512.6 mm²
    ("1-25M", "fail"),  # ts = 2 (40 + 11.3 + 12.6) = 127.8, need 575.1 > 500 mm²; and s = 450/2 = 225 > 200
])
def test_skin_scheduled(bars, status):
    r = check_span(**SKIN, skin_bars=parse_bars(bars))
    assert find(r, "skin_steel").status.value == status


def test_skin_not_required_at_750():
    r = check_span(**{**SKIN, "h": 750})
    assert not any(c.id == "skin_steel" for c in r.checks)  # cl. 10.6.2: only where h > 750 mm


def test_flange_tension_reminder_does_not_block_a_pass():
    r = check_span(shape="T", bw=300, h=600, hf=150, bf=1200, span=8000, clear_span=7700, fc=30, fy=400,
                   bottom="3-25M", top="3-25M", stirrups="10M@250", left_end="continuous", right_end="continuous",
                   Mf_pos=150, Mf_neg=170, Vf=150, sfrs=False, Tf=0, exposure="interior")
    c = find(r, "flange_tension@left")
    assert c.status.value == "not_checked" and not c.required and "10.5.3.1" in c.message
    assert r.status.value == "pass", [x.message for x in r.checks if x.status.value != "pass" and x.required]
    assert math.isfinite(r.utilisation)


def test_overfull_lower_layer_of_two():
    # 4-25M / 2-25M in bw = 300: layer 1 holds 3 (hand layout above), so one bar must move
    _, c = fit_result(300, "4-25M / 2-25M")
    assert c.status.value == "fail" and "(layer 1 of the bottom bars)" in c.message and "move 1 to another layer" in c.message


@settings(max_examples=200, deadline=None)
@given(bw=st.floats(150, 1500), cover=st.floats(20, 75), ds=st.sampled_from([0.0, 11.3, 16.0, 19.5]),
       db=st.sampled_from([11.3, 16.0, 19.5, 25.2, 29.9, 35.7, 43.7, 56.4]), agg=st.floats(10, 40))
def test_fit_is_the_largest_count_that_fits(bw, cover, ds, db, agg):
    # geometry: n bars fit when (n - 1) pitches fit between the corner-bar centres; n + 1 do not
    bend = CODE.stirrup_bend_diameter(ds)[0] if ds else 0.0
    clear = CODE.bar_clear_spacing(db, agg)
    f = bars_per_layer(bw, cover, ds, bend, db, clear)
    if f.span >= 0:
        assert (f.fit - 1) * f.pitch <= f.span + 1e-6 < f.fit * f.pitch
        assert f.pitch - db >= max(1.4 * db, 1.4 * agg, 30.0) - 1e-9  # A23.1 6.6.5.2
    wider = bars_per_layer(bw + 100, cover, ds, bend, db, clear)
    assert wider.fit >= f.fit  # monotone in bw
