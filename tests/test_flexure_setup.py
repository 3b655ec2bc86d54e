"""Each distinct outline of a flexural case (a section seen from its compression face) and each
distinct set of its bars (placed bars, depth, ties) is made once and remembered; a case made
from remembered ones must be the same, number for number, as one made fresh.

The sections are the benchmark's own generator (``generate_schedule``: every section type and
end condition). These tests assert no engineering value: they hold the remembered path to the
fresh one, bit for bit.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from beamsched.checks import context, flexure
from beamsched.checks.context import FlexureCase, SpanContext
from beamsched.codes import get_code
from beamsched.engine import validate
from beamsched.model import BeamInput
from beamsched.schedule import read_schedule
from beamsched.schedule.samples import generate_schedule
from beamsched.section import Rect, Section
from beamsched.solve.flexure import SectionColumns, SolverBar, bar_rows, outline_rows

N_SPANS = 120
CASE_FIELDS = ("Mr", "As", "c", "c_over_d", "d", "compression_face", "compression_tied", "row")
COLUMN_FIELDS = ("y0", "y1", "width", "area", "depth", "db", "counted", "tension", "fcd", "fy", "phi_s", "Es",
                 "beta1", "eps_cu")


@pytest.fixture(scope="module")
def inputs(tmp_path_factory):
    path = generate_schedule(tmp_path_factory.mktemp("setup") / "generated.csv", N_SPANS, seed=5)
    code = get_code(None)
    return [r for r in read_schedule(path).rows if isinstance(r, BeamInput) and not validate(r, code)], code


def forget() -> None:
    context._PLACEMENTS.clear()
    context._OUTLINES.clear()
    context._SOLVER_BARS.clear()


def prepared(inputs, code, chunk: int, remember: bool = True) -> list[SpanContext]:
    contexts = [SpanContext(inp, code, tracing=False) for inp in inputs]
    for i in range(0, len(contexts), chunk):
        if not remember:
            forget()
        flexure.prepare(contexts[i:i + chunk])
    return contexts


def same(a, b) -> bool:
    if isinstance(a, float) and isinstance(b, float) and math.isnan(a) and math.isnan(b):
        return True
    return type(a) is type(b) and a == b


def test_a_case_from_remembered_parts_equals_one_made_fresh(inputs):
    spans, code = inputs
    forget()
    fresh = prepared(spans, code, len(spans))  # each part made the first time it is met
    remembered = prepared(spans, code, 7)  # every part remembered, other rows beside it
    alone = prepared(spans, code, 1, remember=False)  # each span alone, nothing remembered
    compared = 0
    for a, b, c in zip(fresh, remembered, alone, strict=True):
        assert a._flexure.keys() == b._flexure.keys() == c._flexure.keys()
        assert a.required == b.required == c.required
        for key, case in a._flexure.items():
            others = (b._flexure[key], c._flexure[key])
            if not isinstance(case, FlexureCase):
                assert all(o == case for o in others)
                continue
            for other in others:
                for name in CASE_FIELDS[:-1]:
                    assert same(getattr(case, name), getattr(other, name)), name
                assert other.bars == case.bars and other.outline == case.outline
                assert other.tension_placed == case.tension_placed
                assert other.compression_placed == case.compression_placed
                assert other.tension_bars == case.tension_bars and other.compression_bars == case.compression_bars
                assert other.solution == case.solution  # every bar's state, the forces, where they act
            compared += 1
    assert compared > 2 * len(spans)


def test_equal_parts_are_shared_and_each_entry_holds_what_its_key_names(inputs):
    spans, code = inputs
    forget()
    contexts = prepared(spans, code, len(spans))
    cases = [case for ctx in contexts for case in ctx._flexure.values() if isinstance(case, FlexureCase)]
    for part, memo in (("concrete", context._OUTLINES), ("steel", context._SOLVER_BARS)):
        distinct = {id(getattr(case, part)) for case in cases}
        assert len(distinct) < len(cases)  # a generated schedule repeats sections and bars
        assert len(memo) == len(distinct)
    for (face, *values), concrete in context._OUTLINES.items():
        assert concrete.compression_face == face and concrete.outline == Section(*values).outline_from(face)
    for key, steel in context._SOLVER_BARS.items():
        # the ids in a key are those of placements the entry holds: never reused by another object
        assert key[0] == id(steel.tension_placed) and key[1] == id(steel.compression_placed)
        assert key[3] is steel.tied


def test_what_is_remembered_is_bounded(inputs, monkeypatch):
    spans, code = inputs
    forget()
    reference = prepared(spans, code, len(spans))
    monkeypatch.setattr(context, "REMEMBERED_KEPT", 5)
    forget()
    bounded = prepared(spans, code, 3)
    assert len(context._OUTLINES) <= 5 and len(context._SOLVER_BARS) <= 5 and len(context._PLACEMENTS) <= 5
    for a, b in zip(reference, bounded, strict=True):
        for key, case in a._flexure.items():
            if isinstance(case, FlexureCase):
                other = b._flexure[key]
                assert (other.Mr, other.As, other.c, other.c_over_d, other.d) == (
                    case.Mr, case.As, case.c, case.c_over_d, case.d)
    forget()


SECTIONS = [
    ((Rect(0.0, 600.0, 300.0),), (SolverBar(2000.0, 540.0, 25.2, "t"),)),
    ((Rect(0.0, 120.0, 1200.0), Rect(120.0, 700.0, 350.0)),
     (SolverBar(1500.0, 630.0, 25.2, "t1"), SolverBar(600.0, 580.0, 19.5, "t2"),
      SolverBar(400.0, 60.0, 16.0, "c", False, False))),
    ((Rect(0.0, 580.0, 300.0), Rect(580.0, 700.0, 900.0)),
     (SolverBar(900.0, 640.0, 19.5, "t"), SolverBar(1000.0, 62.0, 25.2, "c", True, False))),
]


def test_columns_from_remembered_rows_equal_columns_stacked_fresh():
    # the padding (empty bands at h, bars of no area, not counted, not tension steel) and every
    # value are the same whichever way the columns are made
    order = [0, 1, 2, 2, 0, 1, 0]
    fcd = [0.805 * 0.65 * 30.0 + i for i in range(len(order))]
    fy = [400.0] * len(order)
    rest = ([0.85] * len(order), [200_000.0] * len(order), [0.895] * len(order), [0.0035] * len(order))
    fresh = SectionColumns.stack([SECTIONS[i] for i in order], fcd, fy, *rest)
    outlines = [outline_rows(o) for o, _ in SECTIONS]
    bars = [bar_rows(b) for _, b in SECTIONS]
    remembered = SectionColumns.of_rows([outlines[i] for i in order], [bars[i] for i in order], tuple(fcd), tuple(fy),
                                        *rest)
    for name in COLUMN_FIELDS:
        a, b = getattr(fresh, name), getattr(remembered, name)
        assert a.dtype == b.dtype and a.shape == b.shape and np.array_equal(a, b), name
    assert fresh.y0.shape == (len(order), 2) and fresh.area.shape == (len(order), 3)
    assert np.array_equal(fresh.y0[0], [0.0, 600.0]) and np.array_equal(fresh.width[0], [300.0, 0.0])
    assert not fresh.counted[0, 1:].any() and not fresh.tension[0, 1:].any() and not fresh.area[0, 1:].any()
