"""The bundled sample schedules and the synthetic generator.

Sources: beamsched issue 3 ("sample_schedules/": 60 to 120 spans of an invented floor with
girders, continuous T-beams with different ends, spandrel L-beams, cantilevers with back-spans,
a deep transfer girder that must never pass, a few overstressed spans and a few drafters'
mistakes; a US-customary variant leaning on the Parameters sheet; a generator). The deep
member limit is CSA A23.3-19 cl. 10.7.1 (ℓn/h below 2.5 for a continuous span, from memory as
in beamsched.codes); the sample's girder is at ℓn/h = 1.75, clearly within it.
"""

from __future__ import annotations

import collections
from pathlib import Path

import openpyxl
import pytest

from beamsched.engine import check_schedule
from beamsched.model import BeamStatus
from beamsched.schedule import read_schedule
from beamsched.schedule.samples import SAMPLE_NAME, SAMPLE_US_NAME, generate_schedule, sample_path

ROOT = Path(__file__).resolve().parents[1]


def _cells(path: Path) -> dict:
    wb = openpyxl.load_workbook(path)
    return {ws.title: [[c.value for c in row] for row in ws.iter_rows()] for ws in wb.worksheets}


@pytest.mark.parametrize("name", [SAMPLE_NAME, SAMPLE_US_NAME])
def test_package_copy_and_sample_schedules_copy_are_the_same(name):
    assert _cells(ROOT / "beamsched" / "data" / name) == _cells(ROOT / "sample_schedules" / name)


def test_sample_path_is_package_data():
    p = sample_path()
    assert p.name == SAMPLE_NAME and p.exists() and p.parent.name == "data"
    assert sample_path("us").name == SAMPLE_US_NAME


@pytest.fixture(scope="module")
def sample():
    s = read_schedule(sample_path())
    return s, {(r.mark, r.span_no, r.row): r for r in check_schedule(s)}


def _result(results, mark, span_no=None):
    found = [r for (m, n, _), r in results.items() if m == mark and n == span_no]
    assert found, (mark, span_no)
    return found[0]


def test_sample_floor_size_and_content(sample):
    s, _ = sample
    assert 60 <= len(s.spans) <= 120
    assert s.header_row == 5 and s.project["project"] == "Wrenfield Public Library"
    shapes = collections.Counter(b.shape for b in s.spans)
    assert shapes["T"] and shapes["L"] and shapes["rect"]
    ends = {(b.left_end, b.right_end) for b in s.spans}
    assert {("simple", "continuous"), ("continuous", "continuous"), ("continuous", "simple"),
            ("continuous", "free"), ("simple", "simple")} <= ends
    # cantilevers with back-spans: span 1 fixed at the wall, span 2 free at the tip
    ct = [b for b in s.spans if b.mark.startswith("CT")]
    assert len(ct) == 8 and all((b.left_end, b.right_end) == ("continuous", "free") for b in ct if b.span_no == 2)
    assert any(b.Mf_pos_left and b.bottom_bars_support for b in ct)
    assert any(b.mark.startswith("SP") and b.exposure == "exterior" for b in s.spans)


def test_realistic_demands_for_the_sizes(sample):
    # rough sanity, common practice: factored Mf+ of a floor beam within about 1.5-15 kN·m per
    # 1000 mm² of section ... here: the ratio of Mf to bw d² (a "K" value) between 0.3 and 6 MPa
    s, _ = sample
    for b in s.spans:
        if b.Mf_pos and b.mark != "TG1":
            d = b.h - 60
            k = b.Mf_pos / (b.bw * d * d)
            assert 0.2 < k < 6.0, (b.label, k)


def test_transfer_girder_is_deep_and_never_passes(sample):
    s, results = sample
    (tg,) = [b for b in s.spans if b.mark == "TG1"]
    assert tg.clear_span / tg.h < 2
    r = _result(results, "TG1")
    assert r.status is not BeamStatus.PASS
    assert any(c.id == "scope_deep" and c.status.value == "not_checked" for c in r.checks)


@pytest.mark.parametrize("mark,span_no,check_id", [
    ("B3", 3, "flexure_pos"), ("G4", 2, "shear"), ("CT3", 2, "flexure_neg"), ("CT3", 1, "flexure_neg"),
    ("SP4", 5, "flexure_neg"),
])
def test_overstressed_spans_fail(sample, mark, span_no, check_id):
    _, results = sample
    r = _result(results, mark, span_no)
    assert r.status is BeamStatus.FAIL
    assert any(c.id == check_id and c.status.value == "fail" for c in r.checks)


# (mark, span no., words in the problem) — each mistake gives its message
MISTAKES = [
    ("B6", 3, "'350 mm': text, not a number"), ("B7", 2, "'4-25': unreadable bar notation: expected a bar group"), ("G6", 1, "unknown bar size '28M'"),
    ("B8", 4, "spacing must be greater than zero"), ("TR4", None, "3500: expected 20 to 80 MPa"),
    ("B9", 1, "flange thickness"), ("AT3", 1, "less than h = 700 mm"), ("TR5", None, "-85: expected zero or more"),
    ("B10", 1, "depth h is blank"), ("TR3", None, "a formula with no saved value"),
    ("B2", 4, "with different contents (Bottom bars)"),
]


@pytest.mark.parametrize("mark,span_no,words", MISTAKES)
def test_drafting_mistakes_are_explained(sample, mark, span_no, words):
    s, results = sample
    failures = [f for f in s.failures if f.mark == mark and f.span_no == span_no]
    assert failures and all(any(words in p.message for p in f.problems) for f in failures)
    assert _result(results, mark, span_no).status is BeamStatus.ERROR


def test_identical_duplicate_is_a_warning_and_most_good_spans_pass(sample):
    s, results = sample
    tr1 = [b for b in s.spans if b.mark == "TR1"]
    assert len(tr1) == 2 and all("identically" in b.warnings[0].message for b in tr1)
    tr2 = [b for b in s.spans if b.mark == "TR2"]
    assert tr2[0].Mf_pos is not None  # its formula's stored result
    statuses = collections.Counter(r.status for r in results.values())
    # 68 readable spans: 5 overstressed, 1 deep; the rest were sized to pass
    assert statuses[BeamStatus.ERROR] == len(s.failures) == 12
    assert statuses[BeamStatus.PASS] >= 0.8 * (len(s.spans) - 6)
    # the sizing gives the same top bars to both sides of each shared support: no continuity warnings
    assert not [w for b in s.spans for w in b.warnings if "cross the support" in w.message]


def test_us_variant_reads_to_the_same_spans(sample):
    s, _ = sample
    us = read_schedule(sample_path("us"))
    assert not [p for p in us.problems if p.severity == "error"] and not us.failures
    assert not [w for b in us.spans for w in b.warnings]  # a clean variant: no duplicates, no gaps
    assert any("US customary" in u for u in us.units_assumed)
    si = {(b.mark, b.span_no): b for b in s.spans}
    missing = {(b.mark, b.span_no) for b in us.spans} - set(si)
    # TR3's Mf+ in the SI file is a formula saved without a value; B2 span 4 is scheduled twice there
    assert missing == {("TR3", None), ("B2", 4)}
    for b in us.spans:
        if (b.mark, b.span_no) in missing:
            continue
        a = si[(b.mark, b.span_no)]
        for f in ("bw", "h", "span", "clear_span", "fc", "fy", "cover_top", "agg", "Mf_pos", "Mf_neg_left",
                  "Mf_neg_right", "Mf_pos_left", "Vf_left", "Vf_right", "Tf"):
            x, y = getattr(a, f), getattr(b, f)
            assert (x is None) == (y is None), (b.label, f)
            if x is not None:
                assert y == pytest.approx(x, rel=2e-4, abs=1e-3), (b.label, f, x, y)
        assert (a.bottom_bars, a.top_bars_left, a.stirrups) == (b.bottom_bars, b.top_bars_left, b.stirrups)
    si_status = {(r.mark, r.span_no): r.status for r in check_schedule(s) if r.status is not BeamStatus.ERROR}
    us_status = {(r.mark, r.span_no): r.status for r in check_schedule(us) if (r.mark, r.span_no) not in missing}
    assert {k: v for k, v in us_status.items()} == {k: si_status[k] for k in us_status}


@pytest.mark.parametrize("suffix", [".xlsx", ".csv"])
def test_generator_covers_every_section_type_and_is_reproducible(tmp_path, suffix):
    a = read_schedule(generate_schedule(tmp_path / f"a{suffix}", 400, seed=7))
    b = read_schedule(generate_schedule(tmp_path / f"b{suffix}", 400, seed=7))
    c = read_schedule(generate_schedule(tmp_path / f"c{suffix}", 400, seed=8))
    assert len(a.spans) == 400 and not a.failures and a.spans == b.spans and a.spans != c.spans
    assert {x.shape for x in a.spans} == {"rect", "T", "L"}
    assert {x.right_end for x in a.spans} == {"simple", "continuous", "free"}
    assert any(x.span_no and x.span_no > 1 for x in a.spans)
    statuses = collections.Counter(r.status for r in check_schedule(a))
    assert statuses[BeamStatus.PASS] > 0.6 * 400
