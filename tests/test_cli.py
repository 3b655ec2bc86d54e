"""The command line: every exit code, the refusals, the outputs and the console.

The schedules are typed here as CSV (the reader's own column names, issue 3); the spans' statuses
are those of the engine. The passing spans are generous on purpose (about 0.8 at most).
"""

from __future__ import annotations

import hashlib
import io
import json
import subprocess
import sys
import types
from pathlib import Path

import pytest
from openpyxl import Workbook, load_workbook

import beamsched
from beamsched import cli

HEADER = ("Mark,Span no.,Type,bw (mm),h (mm),Span (m),Left end,Right end,Bottom bars,Top bars,Stirrups,"
          "f'c (MPa),fy (MPa),Mf+ (kN·m),Vf (kN),Tf (kN·m),SFRS,Exposure,Agg (mm),Cover (mm)")
PASS = "B10,1,Rect,400,700,6.0,simple,simple,4-25M,2-15M,10M@200,30,400,250,150,0,no,interior,20,40"
PASS2 = "B11,1,Rect,400,700,6.0,simple,simple,4-25M,2-15M,10M@200,30,400,200,120,0,no,interior,20,40"
# 3-20M in 300 × 500 under Mf+ = 280 kN·m: Mr ≈ 124 kN·m by CSA A23.3-19 cl. 10.1.7
FAIL = "B12,1,Rect,300,500,6.0,simple,simple,3-20M,2-15M,10M@200,30,400,280,100,0,no,interior,20,40"
# no Mf+ scheduled: a blank demand is never zero, so flexure is not checked
BLANK = "B13,1,Rect,400,700,6.0,simple,simple,4-25M,2-15M,10M@200,30,400,,150,0,no,interior,20,40"
BAD = "B14,1,Rect,400,abc,6.0,simple,simple,4-25M,2-15M,10M@200,30,400,250,150,0,no,interior,20,40"


def schedule_csv(folder: Path, *rows: str, name: str = "level3.csv") -> Path:
    path = folder / name
    path.write_text("\n".join([HEADER, *rows]) + "\n", encoding="utf-8")
    return path


def schedule_xlsx(folder: Path, *rows: str, name: str = "level3.xlsx") -> Path:
    wb = Workbook()
    ws = wb.active
    ws.title = "Beams"
    ws["A1"] = "Level 3 beams"
    for j, h in enumerate(HEADER.split(","), start=1):
        ws.cell(3, j, h)
    for i, row in enumerate(rows, start=4):
        for j, v in enumerate(row.split(","), start=1):
            if v == "":
                continue
            try:
                ws.cell(i, j, float(v))
            except ValueError:
                ws.cell(i, j, v)
    path = folder / name
    wb.save(path)
    return path


def digest(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def run(capsys, *argv):
    code = cli.main([str(a) for a in argv])
    out, err = capsys.readouterr()
    return code, out, err


# -- help --------------------------------------------------------------------------------------
@pytest.mark.parametrize("argv, must", [
    (["--help"], ["check", "demo", "template", "exit codes", "0 every span passes", "2 some rows could not be read", "CAUTION"]),
    (["check", "--help"], ["SCHEDULE", "-o", "--json", "--csv", "--annotate", "--sheet", "exit codes",
                           "_beamsched.xlsx", "Overview, Spans, Working, Input problems, About", "CAUTION"]),
    (["demo", "--help"], ["--output-dir", "current directory"]),
    (["template", "--help"], ["PATH", "--force"]),
])
def test_help_is_complete(capsys, argv, must):
    code, out, _ = run(capsys, *argv)
    assert code == 0
    flat = " ".join(out.split())
    for word in must:
        assert word in flat, word


def test_version(capsys):
    code, out, _ = run(capsys, "--version")
    assert code == 0 and beamsched.__version__ in out


@pytest.mark.parametrize("args", [["--help"], ["check", "--help"], ["--version"]])
def test_help_does_not_import_heavy_libraries(args):
    # the README's performance section: --help answers in under half a second; importing numpy
    # and the checks took 0.1 to 0.3 s of that on the 2-core development machine (measured with
    # python -X importtime), so none of them may load
    probe = ("import sys, contextlib, io\nimport beamsched.cli as c\n"
             "with contextlib.redirect_stdout(io.StringIO()):\n"
             f"    try: c.main({args!r})\n"
             "    except SystemExit: pass\n"
             "print([m for m in ('numpy', 'pandas', 'openpyxl', 'xlsxwriter', 'pint', 'python_calamine',\n"
             "                   'beamsched.engine', 'beamsched.checks') if m in sys.modules])")
    root = Path(beamsched.__file__).resolve().parent.parent
    out = subprocess.run([sys.executable, "-c", probe], cwd=root, capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


def test_every_public_name_loads_on_first_use():
    # beamsched/__init__.py lists its public names twice (__all__ for linters, _PUBLIC for the
    # loading on first use): each listed name must load, and each loadable name be listed
    probe = ("import beamsched\nnames = [n for n in beamsched.__all__ if getattr(beamsched, n, None) is None]\n"
             "print(names, sorted(set(beamsched._PUBLIC) - set(beamsched.__all__)))")
    root = Path(beamsched.__file__).resolve().parent.parent
    out = subprocess.run([sys.executable, "-c", probe], cwd=root, capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[] []"


# -- exit codes --------------------------------------------------------------------------------
def test_exit_0_when_every_span_passes(tmp_path, capsys):
    src = schedule_csv(tmp_path, PASS, PASS2)
    code, out, err = run(capsys, "check", src)
    assert code == 0, out + err
    result = tmp_path / "level3_beamsched.xlsx"  # default: beside the input, with a suffix
    assert result.exists()
    assert "2 PASS, 0 FAIL, 0 INCOMPLETE, 0 NOT READ" in out
    assert str(result.resolve()) in out
    assert "Exit code 0" in out
    assert beamsched.CAUTION.split(";")[0] in out.replace("\n", " ")
    assert err == ""  # no progress bar off a terminal


def test_exit_1_when_a_span_fails(tmp_path, capsys):
    src = schedule_csv(tmp_path, PASS, FAIL)
    code, out, _ = run(capsys, "check", src)
    assert code == 1
    assert "1 PASS, 1 FAIL" in out
    worst = out.split("Worst spans")[1].splitlines()[2]
    assert worst.split()[0] == "B12" and "FAIL" in worst


def test_exit_1_when_a_span_is_incomplete(tmp_path, capsys):
    src = schedule_csv(tmp_path, PASS, BLANK)
    code, out, _ = run(capsys, "check", src)
    assert code == 1
    assert "1 INCOMPLETE" in out


def test_exit_2_when_a_row_cannot_be_read_and_the_rest_is_checked(tmp_path, capsys):
    src = schedule_csv(tmp_path, PASS, BAD, FAIL)
    code, out, _ = run(capsys, "check", src, "--json", tmp_path / "r.json")
    assert code == 2
    assert "1 PASS, 1 FAIL, 0 INCOMPLETE, 1 NOT READ" in out
    assert "row 3" in out and "abc" in out
    beams = json.loads((tmp_path / "r.json").read_text(encoding="utf-8"))["beams"]
    assert [b["status"] for b in beams] == ["pass", "error", "fail"]


@pytest.mark.parametrize("argv, message", [
    (["check", "{tmp}/missing.xlsx"], "no such file"),
    (["check", "{tmp}/garbage.xlsx"], ""),
    (["check"], "required"),
    ([], ""),
    (["check", "{src}", "--colour"], "unrecognized"),
    (["frobnicate"], "invalid choice"),
    (["check", "{src}", "--annotate"], "--annotate needs an .xlsx"),
    (["check", "{src}", "-o", "{tmp}/out.pdf"], "must be named .xlsx"),
    (["check", "{src}", "--json", "{tmp}/same.json", "--csv", "{tmp}/same.json"], "both be written"),
    (["check", "{xsrc}", "--sheet", "Nope"], "Nope"),
])
def test_exit_2_for_unreadable_input_or_misuse(tmp_path, capsys, argv, message):
    src = schedule_csv(tmp_path, PASS)
    xsrc = schedule_xlsx(tmp_path, PASS, name="x.xlsx")
    (tmp_path / "garbage.xlsx").write_bytes(b"this is not a workbook")
    argv = [a.format(tmp=tmp_path, src=src, xsrc=xsrc) for a in argv]
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert message in err
    assert not list(tmp_path.glob("*_beamsched.xlsx"))  # nothing written


@pytest.mark.parametrize("flag", ["-o", "--json", "--csv"])
def test_output_equal_to_input_is_refused_and_the_input_unchanged(tmp_path, capsys, flag):
    src = schedule_xlsx(tmp_path, PASS)
    before = digest(src)
    code, _, err = run(capsys, "check", src, flag, tmp_path / "." / "level3.xlsx")
    assert code == 2 and "never overwrites" in err
    assert digest(src) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["level3.xlsx"]


def test_interrupted_write_leaves_the_previous_output(tmp_path, capsys, monkeypatch):
    from beamsched.report import workbook as wbmod

    src = schedule_csv(tmp_path, PASS)
    assert run(capsys, "check", src)[0] == 0
    result = tmp_path / "level3_beamsched.xlsx"
    before = digest(result)

    def boom(self):
        raise OSError(28, "No space left on device")

    monkeypatch.setattr(wbmod._Writer, "working", boom)
    code, out, err = run(capsys, "check", src)
    assert code == 2
    assert "No space left on device" in err and "nothing was left" in err
    assert digest(result) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["level3.csv", "level3_beamsched.xlsx"]
    assert "Results workbook:" not in out


# -- outputs -----------------------------------------------------------------------------------
def test_all_outputs_and_the_annotated_copy(tmp_path, capsys):
    src = schedule_xlsx(tmp_path, PASS, FAIL)
    before = digest(src)
    out_dir = tmp_path / "results"
    out_dir.mkdir()
    code, out, _ = run(capsys, "check", src, "-o", out_dir / "l3.xlsx", "--json", out_dir / "l3.json",
                       "--csv", out_dir / "l3.csv", "--annotate", "--sheet", "Beams")
    assert code == 1
    assert digest(src) == before
    copy = out_dir / "level3_beamsched_checked.xlsx"
    for p in (out_dir / "l3.xlsx", out_dir / "l3.json", out_dir / "l3.csv", copy):
        assert p.exists() and str(p.resolve()) in out
    wb = load_workbook(copy)
    assert wb.sheetnames[0] == "beamsched check" and "Beams" in wb.sheetnames
    ws = wb["Beams"]
    statuses = [ws.cell(r, ws.max_column - 1).value for r in (4, 5)]
    assert statuses == ["PASS", "FAIL"]
    assert load_workbook(out_dir / "l3.xlsx")["Spans"]["B2"].value == "B10"


# -- demo and template ---------------------------------------------------------------------------
def test_demo_writes_into_the_output_dir(tmp_path, capsys, monkeypatch):
    sample = schedule_csv(tmp_path, PASS, FAIL, BAD, name="sample_floor.csv")
    fake = types.ModuleType("beamsched.schedule.samples")
    fake.sample_path = lambda: sample
    monkeypatch.setitem(sys.modules, "beamsched.schedule.samples", fake)
    out_dir = tmp_path / "demo"
    out_dir.mkdir()
    code, out, _ = run(capsys, "demo", "--output-dir", out_dir)
    assert code == 0  # demo succeeds once it has written the results, whatever the sample holds
    result = out_dir / "sample_floor_beamsched.xlsx"
    assert result.exists() and f"The demo results are in {result.resolve()}" in out
    assert "1 FAIL" in out and "1 NOT READ" in out


def test_demo_into_a_missing_dir_is_misuse(tmp_path, capsys):
    code, _, err = run(capsys, "demo", "--output-dir", tmp_path / "nope")
    assert code == 2 and "does not exist" in err


def test_demo_bundled_sample(tmp_path, capsys, monkeypatch):
    pytest.importorskip("beamsched.schedule.samples", reason="the bundled sample has not landed yet")
    monkeypatch.chdir(tmp_path)
    code, out, _ = run(capsys, "demo")
    assert code == 0
    written = list(tmp_path.glob("*_beamsched.xlsx"))
    assert len(written) == 1 and str(written[0].resolve()) in out


def test_template_written_whole_and_not_over_an_existing_file(tmp_path, capsys, monkeypatch):
    calls = []

    def write_template(path):
        calls.append(Path(path))
        wb = Workbook()
        wb.active["A1"] = "Mark"
        wb.save(path)

    fake = types.ModuleType("beamsched.schedule.template")
    fake.write_template = write_template
    monkeypatch.setitem(sys.modules, "beamsched.schedule.template", fake)
    target = tmp_path / "blank.xlsx"
    code, out, _ = run(capsys, "template", target)
    assert code == 0 and load_workbook(target).active["A1"].value == "Mark"
    assert calls[0] != target and calls[0].parent == tmp_path  # written to a temporary name first
    before = digest(target)
    code, _, err = run(capsys, "template", target)
    assert code == 2 and "already exists" in err and digest(target) == before
    assert run(capsys, "template", target, "--force")[0] == 0
    monkeypatch.chdir(tmp_path)
    assert run(capsys, "template")[0] == 0 and (tmp_path / cli.TEMPLATE_NAME).exists()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["beamsched_template.xlsx", "blank.xlsx"]


def test_template_real_writer(tmp_path, capsys):
    pytest.importorskip("beamsched.schedule.template", reason="the template writer has not landed yet")
    code, _, _ = run(capsys, "template", tmp_path / "t.xlsx")
    assert code == 0 and load_workbook(tmp_path / "t.xlsx").sheetnames


# -- console -----------------------------------------------------------------------------------
class FakeTerminal(io.StringIO):
    def isatty(self):
        return True


def test_progress_bar_only_on_a_terminal():
    term = FakeTerminal()
    p = cli.Progress(40, term)
    for i in range(1, 41):
        p.update(i)
    p.done()
    assert "40/40 spans" in term.getvalue() and "#" * 30 in term.getvalue()
    plain = io.StringIO()
    q = cli.Progress(40, plain)
    for i in range(1, 41):
        q.update(i)
    q.done()
    assert plain.getvalue() == ""


def test_long_schedule_is_silent_on_stderr_off_a_terminal(tmp_path, capsys):
    rows = [PASS.replace("B10", f"B{100 + i}") for i in range(25)]
    code, out, err = run(capsys, "check", schedule_csv(tmp_path, *rows))
    assert code == 0 and err == ""
    assert out.count(" PASS ") == 10  # the ten worst spans, not all 25


def test_working_flagged_leaves_the_passing_spans_out(tmp_path, capsys):
    src = schedule_csv(tmp_path, PASS, FAIL)
    out = tmp_path / "flagged.xlsx"
    code, _, _ = run(capsys, "check", src, "-o", out, "--working", "flagged")
    assert code == 1
    ws = load_workbook(out)["Working"]
    heads = [r[0] for r in ws.iter_rows(min_row=2, values_only=True) if r[1] in ("PASS", "FAIL")]
    assert heads == ["B12 span 1"]  # the failing span only; the passing one is on the Spans sheet
    assert "1 of 2 spans left out" in ws.cell(3, 1).value
    code, _, err = run(capsys, "check", src, "-o", out, "--working", "some")
    assert code == 2 and "invalid choice" in err
