"""The JSON and CSV outputs against the contract of issue 4 (schema 1)."""

from __future__ import annotations

import csv
import json
import math

import pytest
from test_report_support import FAIL_MR, infinite, report, with_extra_check

from beamsched.report import Report
from beamsched.report.csvout import write_csv
from beamsched.report.jsonout import write_json

BEAM_KEYS = {"mark", "span", "row", "status", "utilisation", "governing", "values", "checks", "problems", "assumed"}
CHECK_KEYS = {"id", "location", "clause", "demand", "capacity", "unit", "utilisation", "status", "message"}
PROBLEM_KEYS = {"column", "value", "message"}
VALUE_KEYS = {"Mr_pos_kNm", "Mr_neg_kNm", "Mr_neg_left_kNm", "Mr_neg_right_kNm", "Vr_kN"}


def strict_load(path):
    """json.loads that refuses NaN / Infinity, which are not JSON (RFC 8259, section 6)."""
    def bad(name):
        raise ValueError(f"non-JSON constant {name}")
    return json.loads(path.read_text(encoding="utf-8"), parse_constant=bad)


@pytest.fixture(scope="module")
def doc(tmp_path_factory):
    rep = report()
    path = tmp_path_factory.mktemp("json") / "r.json"
    write_json(rep, path)
    return rep, strict_load(path)


def test_top_level(doc):
    _, d = doc
    assert d["schema"] == 1
    assert d["code"] == "CSA A23.3-19"
    assert [b["mark"] for b in d["beams"]] == ["B1", "B2", "B3"]  # schedule order


def test_every_beam_matches_the_contract(doc):
    rep, d = doc
    for beam, res in zip(d["beams"], rep.results, strict=True):
        assert BEAM_KEYS <= set(beam)
        assert beam["status"] in {"pass", "fail", "incomplete", "error"}
        assert beam["status"] == res.status.value
        assert beam["span"] == res.span_no and beam["row"] == res.row
        assert VALUE_KEYS <= set(beam["values"])
        for c in beam["checks"]:
            assert CHECK_KEYS <= set(c)
            assert c["location"] in {"left", "mid", "right", None}
            assert c["status"] in {"pass", "fail", "not_checked"}
            if c["status"] != "pass":
                assert c["message"]  # a reason, always
        for p in beam["problems"]:
            assert PROBLEM_KEYS <= set(p)
        assert isinstance(beam["assumed"], list)


def test_check_ids_from_the_contract_appear(doc):
    _, d = doc
    ids = {c["id"] for b in d["beams"] for c in b["checks"]}
    assert {"flexure_pos", "flexure_neg", "cd_limit_pos", "cd_limit_neg", "min_steel_pos", "min_steel_neg"} <= ids


def test_values_and_governing(doc):
    rep, d = doc
    ok, bad, unread = d["beams"]
    v = ok["values"]
    assert v["Mr_neg_kNm"] == pytest.approx(min(v["Mr_neg_left_kNm"], v["Mr_neg_right_kNm"]))
    assert ok["governing"]["id"] == rep.results[0].governing.id
    assert ok["utilisation"] == pytest.approx(rep.results[0].utilisation)
    assert bad["values"]["Mr_pos_kNm"] == pytest.approx(FAIL_MR, rel=1e-4)  # CSA A23.3-19 cl. 10.1.7 closed form
    flex = next(c for c in bad["checks"] if c["id"] == "flexure_pos")
    assert flex["demand"] == 280 and flex["unit"] == "kN·m" and flex["status"] == "fail"
    assert flex["utilisation"] == pytest.approx(280 / FAIL_MR, rel=1e-4)
    assert bad["assumed"] == ["Cover 40 mm to the stirrups (project default)"]
    assert unread["status"] == "error" and unread["checks"] == [] and unread["governing"] is None
    assert unread["problems"] == [{"column": "bw (mm)", "value": "abc", "message": unread["problems"][0]["message"],
                                   "row": 7, "severity": "error"}]


def test_vr_is_the_smaller_end(tmp_path):
    rep = report()
    from dataclasses import replace
    r0 = replace(rep.results[0], values={"Vr_left_kN": 310.0, "Vr_right_kN": 295.5})
    path = tmp_path / "v.json"
    write_json(Report([r0], rep.schedule), path)
    assert strict_load(path)["beams"][0]["values"]["Vr_kN"] == 295.5


def test_non_finite_numbers_make_valid_json(tmp_path):
    rep = report()
    path = tmp_path / "inf.json"
    write_json(Report([infinite(rep.results[1])], rep.schedule), path)
    beam = strict_load(path)["beams"][0]
    assert beam["utilisation"] is None and beam["status"] == "fail"
    assert beam["checks"][0]["utilisation"] is None
    assert beam["values"]["Vr_left_kN"] is None and beam["values"]["odd"] is None


def test_new_check_ids_reach_json_and_csv(tmp_path):
    rep = report()
    results = [with_extra_check(rep.results[0]), *rep.results[1:]]
    r2 = Report(results, rep.schedule)
    write_json(r2, tmp_path / "n.json")
    write_csv(r2, tmp_path / "n.csv")
    ids = [c["id"] for c in strict_load(tmp_path / "n.json")["beams"][0]["checks"]]
    assert "crack_control" in ids
    rows = list(csv.DictReader((tmp_path / "n.csv").open(encoding="utf-8", newline="")))
    assert float(rows[0]["util_crack_control"]) == pytest.approx(1.2)


def test_csv_one_flat_row_per_span(tmp_path):
    rep = report()
    path = tmp_path / "r.csv"
    write_csv(rep, path)
    rows = list(csv.DictReader(path.open(encoding="utf-8", newline="")))
    assert [r["mark"] for r in rows] == ["B1", "B2", "B3"]
    assert [r["status"] for r in rows] == ["pass", "fail", "error"]
    assert [r["row"] for r in rows] == ["5", "6", "7"]
    assert float(rows[1]["Mr_pos_kNm"]) == pytest.approx(FAIL_MR, rel=1e-5)
    assert float(rows[1]["util_flexure_pos"]) == pytest.approx(280 / FAIL_MR, rel=1e-5)
    assert rows[1]["governing"] == "flexure_pos" and rows[1]["governing_location"] == "mid"
    assert "cl. 10.1" in rows[1]["notes"]
    assert rows[2]["utilisation"] == "" and "bw" in rows[2]["notes"]
    assert all(h.isascii() for h in rows[0])
    assert math.isfinite(float(rows[0]["utilisation"]))
