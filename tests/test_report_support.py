"""Shared builders for the report and command-line tests (no tests of its own).

Results come from the engine through :func:`beamsched.check_span`; the schedule around them is
built here, so the writers are tested without depending on the schedule reader.
"""

from __future__ import annotations

import hashlib
import math
from dataclasses import replace

from beamsched import check_span
from beamsched.engine import check_schedule
from beamsched.model import BeamResult, CheckResult, CheckStatus, Problem, RowFailure, Schedule
from beamsched.report import Report

PHI_C, PHI_S = 0.65, 0.85  # CSA A23.3-19 cl. 8.4.2, 8.4.3


def alpha1(fc: float) -> float:  # CSA A23.3-19 cl. 10.1.7
    return max(0.85 - 0.0015 * fc, 0.67)


def rect_mr_knm(b: float, d: float, As: float, fc: float, fy: float) -> float:
    """Mr of a singly reinforced rectangle with the tension steel yielding (CSA A23.3-19 cl. 10.1.7
    stress block, equilibrium a = φs As fy / (α1 φc f'c b), Mr = φs As fy (d − a/2))."""
    a = PHI_S * As * fy / (alpha1(fc) * PHI_C * fc * b)
    return PHI_S * As * fy * (d - a / 2) / 1e6


# d of one layer of bars: h − cover − stirrup db − db/2 (common practice), 10M stirrups db 11.3 mm,
# 20M bars db 19.5 mm (CSA G30.18, from memory).
FAIL_D = 500 - 40 - 11.3 - 19.5 / 2
FAIL_MR = rect_mr_knm(300, FAIL_D, 900, 30, 400)


def passing_input(row: int = 5):
    # a continuous T-beam with reserve on every check the engine makes (Tf = 0 and SFRS = no are
    # stated, so torsion and the seismic scope are assessed rather than left open)
    return check_span(mark="B1", shape="T", bw=300, h=600, hf=125, bf=1200, span=7200, fc=30, fy=400,
                      bottom="3-25M", top="4-25M", stirrups="10M@200", Mf_pos=200, Mf_neg=220, Vf=150, Tf=0,
                      sfrs=False, exposure="interior", left_end="continuous", right_end="continuous", row=row,
                      span_no=1).input


def failing_input(row: int = 6):
    # 3-20M bottom in a 300 × 500 rectangle carrying Mf+ = 280 kN·m: well over Mr (about 124 kN·m)
    return check_span(mark="B2", shape="rect", bw=300, h=500, fc=30, fy=400, bottom="3-20M", top="2-15M",
                      stirrups="10M@200", Mf_pos=280, left_end="simple", right_end="simple", row=row, span_no=1,
                      assumed=("Cover 40 mm to the stirrups (project default)",)).input


def unreadable_row(row: int = 7) -> RowFailure:
    return RowFailure("B3", 1, row, (Problem("bw = 'abc': expected a number of mm", "bw (mm)", "abc", row),))


def schedule(rows=None, path: str = "/nonexistent/level3_beams.xlsx", **kw) -> Schedule:
    rows = rows if rows is not None else (passing_input(), failing_input(), unreadable_row())
    kw.setdefault("project", {"Project": "Harbour & Vine Offices", "Project number": "2417", "Level": "3",
                              "Revision": "C", "Prepared by": "A. Engineer", "Checked by": "B. Checker",
                              "Date": "2026-11-30"})
    kw.setdefault("file_sha256", hashlib.sha256(b"not a real file").hexdigest())
    return Schedule(path=path, sheet="Beams", header_row=4, rows=tuple(rows), **kw)


def report(rows=None, **kw) -> Report:
    s = schedule(rows, **kw)
    return Report(check_schedule(s), s)


def with_extra_check(r: BeamResult, cid: str = "crack_control", u: float = 1.2) -> BeamResult:
    """A result carrying a check id no writer knows (as a newly added check would)."""
    extra = CheckResult(cid, "Crack control", "mid", "10.6.1",
                        CheckStatus.FAIL if u > 1 else CheckStatus.PASS,
                        "z = 36 000 N/mm exceeds 30 000 N/mm (cl. 10.6.1)" if u > 1 else "",
                        demand=30000 * u, capacity=30000.0, unit="N/mm", utilisation=u)
    values = dict(r.values, z_Nmm=30000 * u)
    return replace(r, checks=r.checks + (extra,), values=values)


def infinite(r: BeamResult) -> BeamResult:
    """A result with an infinite utilisation (demand against a capacity of zero)."""
    bad = CheckResult("flexure_pos", "Flexure +", "mid", "10.1", CheckStatus.FAIL, "Mr = 0 (cl. 10.1)",
                      demand=10.0, capacity=0.0, unit="kN·m", utilisation=math.inf)
    return replace(r, checks=(bad,), values={"Mr_pos_kNm": 0.0, "Vr_left_kN": math.inf, "odd": math.nan})
