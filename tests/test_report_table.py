"""Columns come from the results: value names, their headers and order, and the notes."""

from __future__ import annotations

from types import SimpleNamespace

import pytest

from beamsched.model import CheckResult, CheckStatus
from beamsched.report.table import check_note, is_capacity, value_header, value_keys, value_unit


@pytest.mark.parametrize("key, header, unit", [
    ("Mr_pos_kNm", "Mr+ (kN·m)", "kN·m"),
    ("Mr_neg_left_kNm", "Mr− L (kN·m)", "kN·m"),
    ("Vr_right_kN", "Vr R (kN)", "kN"),
    ("bf_eff_mm", "bf eff (mm)", "mm"),
    ("As_req_mm2", "As req (mm²)", "mm²"),
    ("z_Nmm", "z (N/mm)", "N/mm"),
    ("shear_method_left", "shear method L", ""),
])
def test_headers_carry_the_unit_named_in_the_key(key, header, unit):
    assert value_header(key) == header
    assert value_unit(key) == unit


@pytest.mark.parametrize("key, capacity", [  # the standard's symbols for factored resistances end in r
    ("Mr_pos_kNm", True), ("Vr_left_kN", True), ("Tr_kNm", True), ("Vc_left_kN", False),
    ("dv_left_mm", False), ("bf_eff_mm", False), ("shear_method_left", False),
])
def test_resistances(key, capacity):
    assert is_capacity(key) is capacity


def test_value_order_resistances_first_left_before_right_and_no_aggregates():
    results = [SimpleNamespace(values={"bf_eff_mm": 1, "Mr_pos_kNm": 1, "Mr_neg_right_kNm": 1, "Mr_neg_kNm": 1,
                                       "Vc_right_kN": 1, "Vr_right_kN": 1, "Vr_kN": 1}),
               SimpleNamespace(values={"Mr_neg_left_kNm": 2, "Vr_left_kN": 2, "Vc_left_kN": 2})]
    assert value_keys(results) == ["Mr_pos_kNm", "Mr_neg_left_kNm", "Mr_neg_right_kNm", "Vr_left_kN",
                                   "Vr_right_kN", "bf_eff_mm", "Vc_left_kN", "Vc_right_kN"]
    assert "Mr_neg_kNm" in value_keys(results, per_end=False)


@pytest.mark.parametrize("message, clause, expected", [
    ("Mf+ exceeds Mr (cl. 10.1): add steel.", "10.1", "Mf+ exceeds Mr (cl. 10.1): add steel."),
    ("Bars do not fit.", "A23.1 6.6.5.2", "Bars do not fit (cl. A23.1 6.6.5.2)."),
    ("", "11.3", "Shear left was not checked (cl. 11.3)."),
])
def test_every_note_names_its_clause(message, clause, expected):
    c = CheckResult("shear" if not message else "x", "Shear", "left", clause,
                    CheckStatus.NOT_CHECKED if not message else CheckStatus.FAIL, message)
    assert check_note(c) == expected


def test_the_governing_failure_gives_the_first_note():
    from test_report_support import failing_input, with_extra_check

    from beamsched.engine import check_beam
    from beamsched.report.table import check_columns, span_row

    r = check_beam(failing_input())  # flexure fails at about 2.3 (Mf+ 280 against Mr about 124 kN·m)
    first_fail = next(c for c in r.checks if c.status is CheckStatus.FAIL)
    assert span_row(r, 0, check_columns([r])).notes[0] == check_note(first_fail)
    worse = with_extra_check(r, u=5.0)  # a later check fails worse: it governs, and its note comes first
    row = span_row(worse, 0, check_columns([worse]))
    assert worse.governing.id == "crack_control" and row.notes[0] == check_note(worse.governing)
    assert check_note(first_fail) in row.notes[1:]  # every failure still has its note
