"""The flexure solver over columns: each row is solved as if it were alone.

A schedule's flexural sections are solved in one set of columns (``SectionColumns``); one
section is the same code on columns of length one. These tests hold the solver to that: a
row's numbers may not depend on the rows solved with it (padding for other rows' bands and
bars included), and they agree with the closed form where the closed form holds.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from beamsched.section import Rect
from beamsched.solve.flexure import SectionColumns, SolverBar, required_scale, resistance_columns, solve_columns

PHI_C, PHI_S, ES, ECU = 0.65, 0.85, 200_000.0, 0.0035  # CSA A23.3-19 cl. 8.4.2, 8.4.3, 8.5.4.1, 10.1.3


def a1(fc):  # CSA A23.3-19 cl. 10.1.7
    return max(0.85 - 0.0015 * fc, 0.67)


def b1(fc):  # CSA A23.3-19 cl. 10.1.7
    return max(0.97 - 0.0025 * fc, 0.67)


def columns(sections):
    """sections: (outline, bars, f'c, fy)."""
    return SectionColumns.stack(
        [(o, b) for o, b, _, _ in sections], fcd=[a1(fc) * PHI_C * fc for *_, fc, _ in sections],
        fy=[fy for *_, fy in sections], phi_s=[PHI_S] * len(sections), Es=[ES] * len(sections),
        beta1=[b1(fc) for *_, fc, _ in sections], eps_cu=[ECU] * len(sections))


@st.composite
def sections(draw):
    """A rectangle or a flange-in-compression or flange-in-tension T, with one to three layers
    of tension bars and perhaps compression bars (invented sizes; bars 10M to 35M)."""
    h = draw(st.floats(300, 1200))
    bw = draw(st.floats(200, 600))
    kind = draw(st.sampled_from(["rect", "flange_top", "flange_bottom"]))
    if kind == "rect":
        outline = (Rect(0.0, h, bw),)
    else:
        hf = draw(st.floats(80, 0.4 * h))
        bf = draw(st.floats(bw, 4 * bw))
        outline = ((Rect(0.0, hf, bf), Rect(hf, h, bw)) if kind == "flange_top"
                   else (Rect(0.0, h - hf, bw), Rect(h - hf, h, bf)))
    db = st.sampled_from([11.3, 16.0, 19.5, 25.2, 29.9, 35.7])  # CSA G30.18 bar diameters 10M-35M, from memory
    bars = []
    for layer in range(draw(st.integers(1, 3))):
        d = draw(db)
        bars.append(SolverBar(draw(st.integers(2, 6)) * math.pi * d * d / 4, h - 60 - 50 * layer, d, f"t{layer}"))
    if draw(st.booleans()):
        d = draw(db)
        bars.append(SolverBar(2 * math.pi * d * d / 4, 60.0, d, "c", draw(st.booleans()), False))
    return outline, tuple(bars), draw(st.sampled_from([25.0, 30.0, 40.0, 60.0])), draw(st.sampled_from([400.0, 500.0]))


@settings(max_examples=40, deadline=None)
@given(st.lists(sections(), min_size=2, max_size=12))
def test_each_row_is_solved_as_if_it_were_alone(many):
    # property of the method: rows do not interact, so a span's numbers are the same checked
    # alone or with a building (the lazy trace relies on it)
    together = solve_columns(columns(many))
    for i, one in enumerate(many):
        alone = solve_columns(columns([one]))
        for field in ("c", "a", "Mr", "Cc", "yc", "block_area", "As"):
            assert getattr(together, field)[i] == getattr(alone, field)[0], field
        nb = len(one[1])
        for field in ("strain", "stress", "force", "displaced"):
            assert np.array_equal(getattr(together, field)[i, :nb], getattr(alone, field)[0, :nb]), field


@pytest.mark.parametrize("b, d, h, As, fc, fy", [
    (300, 540, 600, 2000, 30, 400),
    (400, 720, 800, 3500, 35, 400),
    (250, 440, 500, 900, 25, 400),
    (350, 630, 700, 2000, 60, 500),
])
def test_rows_agree_with_the_closed_form_where_the_steel_yields(b, d, h, As, fc, fy):
    # CSA A23.3-19 cl. 10.1.7: a = phi_s As fy / (alpha1 phi_c f'c b); Mr = phi_s As fy (d - a/2);
    # the row is solved among others of different shapes (padded bands and bars)
    one = ((Rect(0.0, h, b),), (SolverBar(As, d, 0.0, "As"),), fc, fy)
    other = ((Rect(0.0, 120.0, 1500.0), Rect(120.0, 900.0, 300.0)),
             (SolverBar(3000.0, 820.0, 25.2, "t1"), SolverBar(1500.0, 770.0, 25.2, "t2"),
              SolverBar(600.0, 60.0, 19.5, "c", True, False)), 30.0, 400.0)
    solved = solve_columns(columns([other, one, other]))
    a = PHI_S * As * fy / (a1(fc) * PHI_C * fc * b)
    assert a / b1(fc) / d < 700 / (700 + fy)  # the steel yields, so the closed form holds (cl. 10.5.2)
    assert solved.Mr[1] == pytest.approx(PHI_S * As * fy * (d - a / 2), rel=1e-7)
    assert solved.a[1] == pytest.approx(a, rel=1e-7)


def test_forces_balance_at_every_rows_solution():
    # equilibrium (common practice: the sum of the internal forces of a section in bending is zero)
    rng = np.random.default_rng(11)
    many = []
    for _ in range(50):
        h, bw = rng.uniform(350, 1000), rng.uniform(200, 500)
        bars = (SolverBar(rng.uniform(400, 6000), h - 65, 25.2, "t"), SolverBar(600.0, 60.0, 19.5, "c", True, False))
        many.append(((Rect(0.0, h, bw),), bars, 30.0, 400.0))
    cols = columns(many)
    s = solve_columns(cols)
    residual = s.Cc + s.force.sum(axis=1)
    assert np.all(np.abs(residual) <= 1e-6 * PHI_S * 400.0 * cols.tension_area())


def test_required_scale_gives_mf_and_says_when_no_steel_suffices():
    # the steel found for Mf resists Mf (to the search tolerance); Mf <= 0 needs none; a moment
    # beyond what 64x the steel gives is reported as inf (the concrete governs)
    sec = ((Rect(0.0, 600.0, 300.0),), (SolverBar(1500.0, 540.0, 25.2, "t"),), 30.0, 400.0)
    cols = columns([sec] * 4)
    mr = resistance_columns(cols)
    mf = np.array([0.5 * mr[0], 1.7 * mr[0], -1.0, 50.0 * mr[0]])
    k = required_scale(cols, mr, mf)
    assert k[2] == 0.0 and math.isinf(k[3])
    for i in (0, 1):
        got = resistance_columns(cols.take(np.array([i])).scaled(np.array([k[i]])))[0]
        assert got == pytest.approx(mf[i], rel=1e-6)
    assert 0 < k[0] < 1 < k[1]


def test_a_row_without_tension_steel_resists_nothing():
    # no tension steel, no couple: Mr = 0 (and its neighbours are unaffected)
    none = ((Rect(0.0, 500.0, 300.0),), (SolverBar(400.0, 60.0, 19.5, "c", True, False),), 30.0, 400.0)
    some = ((Rect(0.0, 500.0, 300.0),), (SolverBar(1500.0, 440.0, 25.2, "t"),), 30.0, 400.0)
    s = solve_columns(columns([none, some]))
    assert s.Mr[0] == 0.0 and s.c[0] == 0.0
    assert s.Mr[1] == solve_columns(columns([some])).Mr[0] > 0
