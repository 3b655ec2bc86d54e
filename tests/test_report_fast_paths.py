"""The results workbook's fast paths write exactly what the plain ones would.

``beamsched/report/workbook.py`` writes the Working sheet (nearly every cell of the workbook)
with formats looked up once, xlsxwriter's undecorated cell methods, remembered line counts
(:class:`beamsched.report.fit.LineCounter`) and number formats remembered by value. Each is
swapped here for its plain counterpart (the public ``write_string``/``write_number``, a fresh
``wrapped_lines`` and ``sig_format`` for every cell) and the two packages must be the same,
part by part and byte by byte: the same cells, values, formats, row heights and print setup.
Both workbooks come from the same code and the same results, so the comparison holds whatever
the checks or their wording become.
"""

from __future__ import annotations

import zipfile
from dataclasses import replace

import pytest
from test_report_support import failing_input, infinite, passing_input, schedule, unreadable_row, with_extra_check

import beamsched.report.workbook as wbmod
from beamsched.engine import check_schedule
from beamsched.report.fit import wrapped_lines
from beamsched.report.table import Report
from beamsched.schedule import read_schedule
from beamsched.schedule.samples import generate_schedule


class _PlainCounter:
    """A line counter that remembers nothing: ``wrapped_lines`` for every text."""

    def __init__(self, width, bold=False, indent=0, size=10.0, keep=0):
        self.args = (width, bold, indent, size)

    def __call__(self, text):
        width, bold, indent, size = self.args
        return wrapped_lines(text, width, bold, indent, size)


def _plain_paths(monkeypatch) -> None:
    monkeypatch.setattr(wbmod, "_cell_writers", lambda ws: (ws.write_string, ws.write_number))
    monkeypatch.setattr(wbmod, "LineCounter", _PlainCounter)
    monkeypatch.setattr(wbmod._Writer, "number_format", lambda self, v: self.f.get(num=wbmod.sig_format(v)))
    monkeypatch.setattr(wbmod, "_forget_written_rows", lambda ws: None)  # xlsxwriter keeps every row height


def _parts(path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as z:
        # docProps/core.xml holds the moment the file was made, which differs between any two writes
        return {name: z.read(name) for name in z.namelist() if name != "docProps/core.xml"}


@pytest.fixture(scope="module")
def generated(tmp_path_factory):
    path = tmp_path_factory.mktemp("gen") / "generated.xlsx"
    generate_schedule(path, 60, seed=7)  # every section type and end condition
    s = read_schedule(path)
    return Report(check_schedule(s), s)


def _support_report() -> Report:
    s = schedule((passing_input(), failing_input(), unreadable_row()))
    results = check_schedule(s)
    # a check no writer knows, an infinite utilisation (no capacity) and the same span twice
    results = [with_extra_check(results[0]), infinite(results[1]), results[2], replace(results[1], mark="B4")]
    return Report(results, s)


@pytest.mark.parametrize("which", ["generated", "support"])
def test_fast_paths_write_the_same_package(which, generated, tmp_path, monkeypatch):
    rep = generated if which == "generated" else _support_report()
    fast, plain = tmp_path / "fast.xlsx", tmp_path / "plain.xlsx"
    with monkeypatch.context() as m:  # forget the written rows often, so that it happens here
        m.setattr(wbmod, "FORGET_EVERY_SPANS", 2)
        m.setattr(wbmod, "FORGET_EVERY_ROWS", 2)
        wbmod.write_results(rep, fast)
    with monkeypatch.context() as m:
        _plain_paths(m)
        wbmod.write_results(rep, plain)
    a, b = _parts(fast), _parts(plain)
    assert sorted(a) == sorted(b)
    assert "xl/worksheets/sheet3.xml" in a  # Working
    for name in a:
        assert a[name] == b[name], name


def test_cell_writers_fall_back_to_the_public_methods():
    class Sheet:  # a worksheet without xlsxwriter's undecorated methods
        def write_string(self, *a):
            return "s"

        def write_number(self, *a):
            return "n"

    put, put_number = wbmod._cell_writers(Sheet())
    assert (put(0, 0, "x"), put_number(0, 0, 1.0)) == ("s", "n")


def test_written_rows_are_forgotten_as_the_sheet_grows(generated, tmp_path, monkeypatch):
    # the Working sheet of 60 spans is some 12,000 rows; after each pruning xlsxwriter holds the
    # heights of only the rows not yet written out (the file is the same: the test above)
    held = []
    real = wbmod._forget_written_rows

    def spy(ws):
        real(ws)
        held.append((len(ws.row_info), len(ws.row_sizes), ws.previous_row))

    monkeypatch.setattr(wbmod, "_forget_written_rows", spy)
    monkeypatch.setattr(wbmod, "FORGET_EVERY_SPANS", 4)
    monkeypatch.setattr(wbmod, "FORGET_EVERY_ROWS", 8)
    wbmod.write_results(generated, tmp_path / "r.xlsx")
    assert len(held) > 15 and max(rows for _, _, rows in held) > 5000
    assert all(info <= 1 and sizes <= 1 for info, sizes, _ in held)
