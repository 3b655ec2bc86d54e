"""Outputs are written whole or not at all, and never onto an input (RULES 7)."""

from __future__ import annotations

import hashlib
import os

import pytest
from test_report_support import report

from beamsched.report import OutputError
from beamsched.report import workbook as wbmod
from beamsched.report.atomic import atomic_path
from beamsched.report.csvout import write_csv
from beamsched.report.jsonout import write_json
from beamsched.report.workbook import write_results


def digest(path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def leftovers(folder, keep):
    return sorted(p.name for p in folder.iterdir() if p.name not in keep)


@pytest.mark.parametrize("writer", [write_results, write_json, write_csv])
def test_output_onto_the_input_is_refused(tmp_path, writer):
    src = tmp_path / "schedule.xlsx"
    src.write_bytes(b"PK\x03\x04 the user's schedule")
    before = digest(src)
    with pytest.raises(OutputError, match="input"):
        writer(report(), src, [src])
    assert digest(src) == before
    # also through another spelling of the same path
    with pytest.raises(OutputError):
        writer(report(), tmp_path / "." / "schedule.xlsx", [src])
    assert digest(src) == before
    assert leftovers(tmp_path, {"schedule.xlsx"}) == []


def test_interrupted_workbook_leaves_no_partial_file_and_the_old_output(tmp_path, monkeypatch):
    target = tmp_path / "results.xlsx"
    write_results(report(), target)
    before = digest(target)

    def boom(self):  # fail half way: after the Overview and Spans sheets are written
        raise RuntimeError("disk pulled out")

    monkeypatch.setattr(wbmod._Writer, "working", boom)
    with pytest.raises(RuntimeError, match="disk pulled out"):
        write_results(report(), target)
    assert digest(target) == before
    assert leftovers(tmp_path, {"results.xlsx"}) == []


def test_interrupted_first_write_leaves_nothing(tmp_path, monkeypatch):
    monkeypatch.setattr(wbmod._Writer, "problems", lambda self: (_ for _ in ()).throw(OSError(28, "No space")))
    with pytest.raises(OSError):
        write_results(report(), tmp_path / "new.xlsx")
    assert list(tmp_path.iterdir()) == []


def test_interrupted_text_write(tmp_path, monkeypatch):
    target = tmp_path / "r.json"
    target.write_text('{"old": true}\n', encoding="utf-8")
    import beamsched.report.jsonout as jmod

    def half(report):
        raise KeyboardInterrupt

    monkeypatch.setattr(jmod, "report_json", half)
    with pytest.raises(KeyboardInterrupt):
        write_json(report(), target)
    assert target.read_text(encoding="utf-8") == '{"old": true}\n'
    assert leftovers(tmp_path, {"r.json"}) == []


def test_atomic_path_moves_into_place_with_normal_permissions(tmp_path):
    target = tmp_path / "out.csv"
    with atomic_path(target) as tmp:
        assert tmp.parent == tmp_path and tmp != target
        tmp.write_text("a,b\n")
        assert not target.exists()
    assert target.read_text() == "a,b\n"
    umask = os.umask(0)
    os.umask(umask)
    assert (target.stat().st_mode & 0o777) == (0o666 & ~umask)


def test_missing_folder_is_a_clear_error(tmp_path):
    with pytest.raises(OutputError, match="does not exist"):
        write_json(report(), tmp_path / "nowhere" / "r.json")


def test_a_failure_while_zipping_the_workbook_is_a_clear_error(tmp_path, monkeypatch):
    import xlsxwriter
    from xlsxwriter.exceptions import FileCreateError

    target = tmp_path / "results.xlsx"
    target.write_bytes(b"previous results")

    def full_disk(self):
        raise FileCreateError("[Errno 28] No space left on device")

    monkeypatch.setattr(xlsxwriter.Workbook, "close", full_disk)
    with pytest.raises(OutputError, match="No space left"):
        write_results(report(), target)
    assert target.read_bytes() == b"previous results"
    assert leftovers(tmp_path, {"results.xlsx"}) == []
