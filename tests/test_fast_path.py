"""The whole-schedule path gives the same results, beam for beam, as checking one span at a
time with every trace line kept (the path it replaced).

``check_schedule`` runs the checks without keeping their trace and works each span's trace out
again when it is read (``LazyTrace``); nothing a check reports may differ. The reference is
``check_beam(row, code)`` with the trace kept eagerly. The schedule is the benchmark's own
generator (``generate_schedule``: every section type and end condition), smaller.
"""

from __future__ import annotations

import math
from dataclasses import fields

import pytest

from beamsched.codes import get_code
from beamsched.engine import LazyTrace, check_beam, check_schedule
from beamsched.model import BeamInput, BeamStatus, CheckResult, CheckStatus, PackedChecks, TraceLine, beam_status
from beamsched.schedule import read_schedule
from beamsched.schedule.samples import generate_schedule

N_SPANS = 300


def same(a, b) -> bool:
    """Equal values, with NaN equal to NaN (a value no check should make, but if one did it
    must be the same on both paths)."""
    if isinstance(a, float) and isinstance(b, float) and math.isnan(a) and math.isnan(b):
        return True
    return type(a) is type(b) and a == b


@pytest.fixture(scope="module")
def both(tmp_path_factory):
    path = generate_schedule(tmp_path_factory.mktemp("fast") / "generated.csv", N_SPANS, seed=3)
    schedule = read_schedule(path)
    code = get_code(schedule.code)
    fast = check_schedule(schedule)
    reference = [check_beam(row, code) if isinstance(row, BeamInput) else None for row in schedule.rows]
    return schedule, fast, reference


def test_the_schedule_covers_every_section_type_and_outcome(both):
    schedule, fast, _ = both
    assert {r.shape for r in schedule.spans} == {"rect", "T", "L"}
    statuses = {r.status for r in fast}
    assert {BeamStatus.PASS, BeamStatus.FAIL} <= statuses
    assert len(fast) == len(schedule.rows) == N_SPANS


def test_every_check_of_every_span_is_the_same(both):
    _, fast, reference = both
    compared = 0
    for got, ref in zip(fast, reference, strict=True):
        if ref is None:  # a row the reader could not turn into a span: no check was run
            assert got.status is BeamStatus.ERROR
            continue
        assert got.status is ref.status, got.label
        assert len(got.checks) == len(ref.checks), got.label
        for c_got, c_ref in zip(got.checks, ref.checks, strict=True):
            for f in fields(CheckResult):  # id, location, clause, status, message, demand, capacity, utilisation...
                assert same(getattr(c_got, f.name), getattr(c_ref, f.name)), (got.label, c_ref.key, f.name)
            compared += 1
        assert got.values.keys() == ref.values.keys(), got.label
        for k in ref.values:
            assert same(got.values[k], ref.values[k]), (got.label, k)
        assert got.understood == ref.understood, got.label
        assert got.problems == ref.problems and got.assumed == ref.assumed, got.label
        assert got.utilisation == ref.utilisation or (got.utilisation is None and ref.utilisation is None)
    assert compared > 10 * N_SPANS  # some 28 checks a span: the comparison really ran


def test_every_trace_line_is_the_same(both):
    _, fast, reference = both
    lines = 0
    for got, ref in zip(fast, reference, strict=True):
        if ref is None:
            continue
        assert isinstance(got.trace, LazyTrace)
        assert len(got.trace) == len(ref.trace) > 0, got.label
        for t_got, t_ref in zip(got.trace, ref.trace, strict=True):
            for f in fields(TraceLine):
                assert same(getattr(t_got, f.name), getattr(t_ref, f.name)), (got.label, t_ref.symbol, f.name)
            lines += 1
        assert got.trace == ref.trace  # the sequence compares equal to the eager tuple
        assert got.trace[0] == ref.trace[0] and tuple(got.trace[-3:]) == ref.trace[-3:]
    assert lines > 50 * N_SPANS


@pytest.mark.parametrize("field, kind", [("trace", LazyTrace), ("checks", PackedChecks)])
def test_worked_out_again_after_many_others_it_is_the_same(both, field, kind):
    _, fast, reference = both
    spans = [(g, r) for g, r in zip(fast, reference, strict=True) if r is not None]
    first = tuple(getattr(spans[0][0], field))
    for g, _ in spans[1: 2 + kind.KEEP]:  # push the first out of those kept after reading
        tuple(getattr(g, field))
    assert tuple(getattr(spans[0][0], field)) == first == getattr(spans[0][1], field)


def test_eager_schedule_keeps_tuples(both):
    schedule, fast, _ = both
    eager = check_schedule(schedule, lazy_trace=False)
    assert all(isinstance(r.trace, tuple) for r in eager)
    assert eager == fast  # BeamResult equality: every field, the trace through LazyTrace.__eq__


def test_schedule_results_hold_their_checks_packed(both):
    _, fast, _ = both
    checked = [r for r in fast if r.status is not BeamStatus.ERROR]
    assert checked and all(isinstance(r.checks, PackedChecks) for r in checked)
    # spans with the same list of checks share one tuple of what does not vary between spans
    kinds = {id(r.checks._kinds) for r in checked}
    assert len(kinds) < len(checked) / 10


def test_packed_checks_give_back_every_field_and_type():
    made = (
        CheckResult("flexure_pos", "Flexure +", "mid", "10.1", CheckStatus.PASS, "", 120.5, 250.0, "kN·m", 0.482),
        CheckResult("bar_fit", "Bar fit", "mid", "A23.1", CheckStatus.FAIL, "too many bars", 5, 4, "bars", 1.25),
        CheckResult("shear", "Shear", "left", "11.3", CheckStatus.NOT_CHECKED, "no Vf", None, 310.0, "kN", None),
        CheckResult("min_steel_pos", "Min. steel +", "mid", "10.5", CheckStatus.FAIL, "none", 400.0, 0.0, "mm²",
                    math.inf, required=False),
    )
    packed = PackedChecks(made)
    assert len(packed) == 4 and packed == made and made == packed
    for got, ref in zip(packed, made, strict=True):
        for f in fields(CheckResult):
            assert same(getattr(got, f.name), getattr(ref, f.name)), (ref.id, f.name)
    assert packed[1].demand == 5 and type(packed[1].demand) is int  # an int stays an int
    assert packed[2].demand is None and packed[2].utilisation is None
    assert packed[-1].utilisation == math.inf and packed[-1].required is False
    assert packed[1:3] == made[1:3]
    assert packed + made[:1] == made + made[:1] and made[:1] + packed == made[:1] + made


@pytest.mark.parametrize("statuses, required, expected", [
    # the span's status rule of DEVELOPERS.md, "Statuses" (beamsched policy)
    ((), (), BeamStatus.INCOMPLETE),  # nothing checked cannot pass
    (("pass", "pass"), (True, True), BeamStatus.PASS),
    (("pass", "not_checked"), (True, False), BeamStatus.PASS),  # a reminder does not hold a span back
    (("pass", "not_checked"), (True, True), BeamStatus.INCOMPLETE),
    (("not_checked", "fail"), (True, False), BeamStatus.FAIL),  # a failure outranks what was not made
    (("fail",) + ("pass",) * 40, (False,) * 41, BeamStatus.FAIL),
    (("pass",) * 40 + ("not_checked",), (False,) * 40 + (True,), BeamStatus.INCOMPLETE),
])
def test_packed_status_is_the_span_status_rule(statuses, required, expected):
    made = tuple(CheckResult(f"c{i}", "C", None, "", CheckStatus(s), "", None, None, "", None, r)
                 for i, (s, r) in enumerate(zip(statuses, required, strict=True)))
    assert beam_status(made) is expected
    assert PackedChecks(made).status() is expected
    rows = [(c.id, c.label, c.location, c.clause, c.status, c.message, c.demand, c.capacity, c.unit, c.utilisation,
             c.required) for c in made]
    assert PackedChecks.of_rows(rows).status() is expected and PackedChecks.of_rows(rows) == made


def test_a_schedule_is_checked_in_chunks_with_the_same_results(both, monkeypatch):
    # the chunk size is a matter of speed only: checked 7 spans at a time, every result is the
    # same, and progress is reported after each chunk up to the number of rows
    schedule, fast, _ = both
    import beamsched.engine as engine

    monkeypatch.setattr(engine, "CHUNK_SPANS", 7)
    seen: list[int] = []
    small = check_schedule(schedule, progress=seen.append)
    assert seen == sorted(seen) and seen[-1] == len(schedule.rows) and len(seen) > len(schedule.rows) // 7
    for got, ref in zip(small, fast, strict=True):
        assert got.status is ref.status and len(got.checks) == len(ref.checks)
        for a, b in zip(got.checks, ref.checks, strict=True):
            assert all(same(getattr(a, f.name), getattr(b, f.name)) for f in fields(CheckResult)), a.id
        assert tuple(got.trace) == tuple(ref.trace)
