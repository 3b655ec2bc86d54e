"""Outputs never damage inputs, and an output is whole or absent (RULES 7), path by path:
the output is the input (by any spelling or link), its folder is missing or not writable, the
file there is read-only or locked by another program, and the run is interrupted or stopped.
"""

from __future__ import annotations

import hashlib
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest
import test_hostile_support as hs

from beamsched import cli


def digest(p: Path) -> str:
    return hashlib.sha256(p.read_bytes()).hexdigest()


def listing(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


@pytest.fixture
def src(tmp_path) -> Path:
    return hs.workbook(tmp_path / "level3.xlsx", [hs.GOOD])


def run(capsys, *argv):
    code = cli.main([str(a) for a in argv])
    out, err = capsys.readouterr()
    return code, out, err


def spellings(tmp_path: Path, src: Path):
    (tmp_path / "sub").mkdir(exist_ok=True)
    link = tmp_path / "link.xlsx"
    if not link.exists():
        link.symlink_to(src)
    hard = tmp_path / "hard.xlsx"
    if not hard.exists():
        os.link(src, hard)
    return {"dot": tmp_path / "." / src.name, "dotdot": tmp_path / "sub" / ".." / src.name, "symlink": link,
            "hardlink": hard, "relative": Path(os.path.relpath(src))}


@pytest.mark.parametrize("how", ["dot", "dotdot", "symlink", "hardlink", "relative"])
@pytest.mark.parametrize("flag", ["-o", "--json", "--csv"])
def test_an_output_onto_the_input_is_refused_by_any_spelling(tmp_path, capsys, src, how, flag):
    target = spellings(tmp_path, src)[how]
    if flag != "-o" and target.suffix != ".xlsx":  # pragma: no cover - all spellings keep the name
        pytest.skip("the spelling changes the name")
    before, names = digest(src), listing(tmp_path)
    code, out, err = run(capsys, "check", src, flag, target)
    assert code == 2 and "never overwrites" in err and out == ""
    assert digest(src) == before and listing(tmp_path) == names


def test_a_missing_output_folder_is_refused_before_the_schedule_is_read(tmp_path, capsys, src, monkeypatch):
    import beamsched.schedule as reader

    monkeypatch.setattr(reader, "read_schedule", lambda *a, **k: pytest.fail("the schedule was read"))
    for flag in ("-o", "--json", "--csv"):
        name = "r.xlsx" if flag == "-o" else "r.txt"
        code, _, err = run(capsys, "check", src, flag, tmp_path / "nowhere" / name)
        assert code == 2 and "does not exist (create it first)" in err
    assert listing(tmp_path) == ["level3.xlsx"]


def test_a_folder_without_write_permission_is_refused(tmp_path, capsys, src, monkeypatch):
    out_dir = tmp_path / "locked"
    out_dir.mkdir()
    real = os.access
    monkeypatch.setattr(os, "access", lambda p, mode, **k: False if Path(p) == out_dir else real(p, mode, **k))
    code, _, err = run(capsys, "check", src, "-o", out_dir / "r.xlsx")
    assert code == 2 and "is not writable (permission denied)" in err
    assert listing(out_dir) == []


@pytest.mark.skipif(hasattr(os, "geteuid") and os.geteuid() == 0, reason="root may write anywhere")
def test_a_real_read_only_folder(tmp_path, capsys, src):  # pragma: no cover - not run as root
    out_dir = tmp_path / "ro"
    out_dir.mkdir()
    out_dir.chmod(0o555)
    try:
        code, _, err = run(capsys, "check", src, "-o", out_dir / "r.xlsx")
        assert code == 2 and "not writable" in err
    finally:
        out_dir.chmod(0o755)


def test_a_read_only_output_file_is_not_replaced(tmp_path, capsys, src):
    old = tmp_path / "level3_beamsched.xlsx"
    old.write_bytes(b"the engineer's marked-up results")
    old.chmod(0o444)
    try:
        code, _, err = run(capsys, "check", src)
        assert code == 2 and "read-only" in err
        assert old.read_bytes() == b"the engineer's marked-up results"
    finally:
        old.chmod(0o644)
    assert listing(tmp_path) == ["level3.xlsx", "level3_beamsched.xlsx"]


def test_a_file_locked_by_another_program(tmp_path, capsys, src, monkeypatch):
    """On Windows a workbook open in a spreadsheet program cannot be replaced: os.replace raises
    PermissionError (WinError 5/32). The previous results stay, no temporary file is left."""
    assert run(capsys, "check", src)[0] == 0
    result = tmp_path / "level3_beamsched.xlsx"
    before = digest(result)
    real = os.replace

    def locked(a, b, *args, **kw):
        if Path(b) == result:
            raise PermissionError(13, "Permission denied", str(b))
        return real(a, b, *args, **kw)

    monkeypatch.setattr(os, "replace", locked)
    code, out, err = run(capsys, "check", src, "--json", tmp_path / "r.json")
    assert code == 2
    assert "Permission denied" in err and "open in another program" in err and "unchanged" in err
    assert digest(result) == before
    assert listing(tmp_path) == ["level3.xlsx", "level3_beamsched.xlsx", "r.json"]  # the JSON still written
    assert "JSON:" in out and "Results workbook:" not in out


def test_the_temporary_file_reaches_the_disk_before_it_replaces_the_old_one(tmp_path, monkeypatch):
    from beamsched.report.atomic import atomic_path

    events = []
    real_fsync, real_replace = os.fsync, os.replace
    monkeypatch.setattr(os, "fsync", lambda fd: (events.append("fsync"), real_fsync(fd))[1])
    monkeypatch.setattr(os, "replace", lambda a, b: (events.append("replace"), real_replace(a, b))[1])
    with atomic_path(tmp_path / "r.csv") as tmp:
        tmp.write_text("a\n")
    assert events[:2] == ["fsync", "replace"]
    assert (tmp_path / "r.csv").read_text() == "a\n"


def test_ctrl_c_while_writing_leaves_the_previous_output(tmp_path, capsys, src, monkeypatch):
    from beamsched.report import workbook as wbmod

    assert run(capsys, "check", src)[0] == 0
    result = tmp_path / "level3_beamsched.xlsx"
    before = digest(result)

    def interrupted(self):
        raise KeyboardInterrupt

    monkeypatch.setattr(wbmod._Writer, "working", interrupted)
    code, _, err = run(capsys, "check", src)
    assert code == 2 and "interrupted" in err and "unchanged" in err
    assert digest(result) == before and listing(tmp_path) == ["level3.xlsx", "level3_beamsched.xlsx"]


STOPPED_RUN = """
import sys, time
from pathlib import Path
from beamsched import cli
from beamsched.report import workbook as wbmod

def working(self):
    Path(sys.argv[2]).write_text("ready")
    time.sleep(120)

wbmod._Writer.working = working
sys.exit(cli.main(["check", sys.argv[1]]))
"""


@pytest.mark.skipif(not hasattr(signal, "SIGTERM") or os.name != "posix", reason="POSIX signals")
def test_a_run_stopped_mid_write_leaves_the_previous_output(tmp_path, capsys, src):
    """SIGTERM (a closed terminal, a killed job) while the results workbook is half written:
    the temporary file is removed and the earlier results are untouched."""
    assert run(capsys, "check", src)[0] == 0
    result = tmp_path / "level3_beamsched.xlsx"
    before = digest(result)
    ready = tmp_path.parent / f"{tmp_path.name}.ready"
    root = Path(cli.__file__).resolve().parent.parent
    proc = subprocess.Popen([sys.executable, "-c", STOPPED_RUN, str(src), str(ready)], cwd=root,
                            stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True)
    try:
        for _ in range(1200):  # wait (up to a minute) until the writer is half way; not a timing assertion
            if ready.exists() or proc.poll() is not None:
                break
            time.sleep(0.05)
        assert ready.exists(), proc.communicate()
        partial = [p.name for p in tmp_path.iterdir() if ".partial" in p.name]
        assert partial  # the half-written temporary file exists at this moment
        proc.send_signal(signal.SIGTERM)
        out, err = proc.communicate(timeout=60)
    finally:
        if proc.poll() is None:
            proc.kill()
    assert proc.returncode == 2 and "stopped" in err, err
    assert digest(result) == before
    assert listing(tmp_path) == ["level3.xlsx", "level3_beamsched.xlsx"]
