"""The bad-input corpus: one file per kind of fault, each built by code (test_hostile_support).

Every case goes through the command line as a user would run it, and must give exit code 2,
one line on stderr that says what the file is and what to do (the exact kind of message is
asserted), no traceback, no output file, and the input byte for byte unchanged.
Row-level faults sit beside good rows, which must still be checked.
"""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import zipfile
from pathlib import Path

import pytest
import test_hostile_support as hs
from openpyxl import Workbook

from beamsched import cli
from beamsched.schedule import ScheduleError, read_schedule
from beamsched.schedule.guard import Limits, inspect_file, ole2_names

LOL = (b'<?xml version="1.0" encoding="UTF-8"?>\n<!DOCTYPE worksheet [<!ENTITY a "aaaaaaaaaa">'
       b'<!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;"><!ENTITY c "&b;&b;&b;&b;&b;&b;&b;&b;&b;&b;">]>')


def digest(p: Path) -> str:
    return hashlib.sha256(p.read_bytes()).hexdigest()


def good(tmp: Path, name: str = "good.xlsx", **kw) -> Path:
    return hs.workbook(tmp / name, [hs.GOOD], **kw)


def sheet_xml(tmp: Path) -> bytes:
    return hs.members(good(tmp, "base.xlsx"))["xl/worksheets/sheet1.xml"]


def with_sheet(tmp: Path, name: str, xml: bytes) -> Path:
    return hs.rezip(good(tmp, "base.xlsx"), tmp / name, {"xl/worksheets/sheet1.xml": xml})


# -- builders: (file name, bytes or a function of the folder) ---------------------------------------
def text_renamed(tmp):
    (tmp / "level3.xlsx").write_text("Mark,bw (mm)\nB1,300\n", encoding="utf-8")
    return tmp / "level3.xlsx"


def legacy(tmp, name="level3.xls"):
    (tmp / name).write_bytes(hs.legacy_xls())
    return tmp / name


def encrypted(tmp):
    (tmp / "level3.xlsx").write_bytes(hs.encrypted_workbook())
    return tmp / "level3.xlsx"


def truncated(tmp):
    data = good(tmp, "base.xlsx").read_bytes()
    (tmp / "level3.xlsx").write_bytes(data[: len(data) * 2 // 3])
    return tmp / "level3.xlsx"


def corrupt_member(tmp):
    """The sheet's compressed bytes overwritten in the middle (a damaged download)."""
    src = good(tmp, "base.xlsx")
    data = bytearray(src.read_bytes())
    with zipfile.ZipFile(src) as z:
        info = z.getinfo("xl/worksheets/sheet1.xml")
    start = info.header_offset + 30 + len(info.filename.encode()) + len(info.extra)
    for k in range(start + 20, start + 60):
        data[k] ^= 0x5A
    (tmp / "level3.xlsx").write_bytes(bytes(data))
    return tmp / "level3.xlsx"


def lying_size(tmp):
    """A part whose directory entry claims 1 kB while its data inflates to 30 MB (a bomb in disguise)."""
    big = b"<worksheet>" + b" " * 30_000_000 + b"</worksheet>"
    src = hs.rezip(good(tmp, "base.xlsx"), tmp / "b.xlsx", {"xl/worksheets/sheet1.xml": big})
    data = hs.patch_central(src.read_bytes(), "xl/worksheets/sheet1.xml", 24, "<L", 1000)
    (tmp / "level3.xlsx").write_bytes(data)
    return tmp / "level3.xlsx"


def empty_file(tmp):
    (tmp / "level3.xlsx").write_bytes(b"")
    return tmp / "level3.xlsx"


def empty_workbook(tmp):
    Workbook().save(tmp / "level3.xlsx")
    return tmp / "level3.xlsx"


def no_mark(tmp):
    return hs.workbook(tmp / "level3.xlsx", [["B1", 300]], header=["Ref", "Width (mm)"], extra_sheets=1)


def entity_bomb(tmp):
    xml = sheet_xml(tmp)
    return with_sheet(tmp, "level3.xlsx", LOL + xml.replace(b">B10<", b">&c;<"))


def external_entity(tmp):
    secret = tmp / "secret.txt"
    secret.write_text("TOPSECRET", encoding="utf-8")
    xml = sheet_xml(tmp)
    dtd = f'<?xml version="1.0"?><!DOCTYPE worksheet [<!ENTITY x SYSTEM "{secret.as_uri()}">]>'.encode()
    return with_sheet(tmp, "level3.xlsx", dtd + xml.replace(b">B10<", b">&x;<"))


def utf16_doctype(tmp):
    """The DOCTYPE spelled in UTF-16, where a byte search for '<!DOCTYPE' would miss it."""
    xml = (LOL.decode() + sheet_xml(tmp).decode()).replace('encoding="UTF-8"', 'encoding="UTF-16"')
    return with_sheet(tmp, "level3.xlsx", xml.encode("utf-16"))


def odd_encoding(tmp):
    xml = b'<?xml version="1.0" encoding="cp500"?>' + sheet_xml(tmp)
    return with_sheet(tmp, "level3.xlsx", xml)


def ratio_bomb(tmp):
    return hs.rezip(good(tmp, "base.xlsx"), tmp / "level3.xlsx",
                    add={"xl/media/image1.png": b"\x00" * 60_000_000})


def whole_grid(tmp):
    """One cell, and a dimension claiming the whole grid: openpyxl's read-only mode would pad
    1,048,576 rows to 16,384 columns."""
    xml = sheet_xml(tmp)
    import re

    xml = re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:XFD1048576"', xml)
    return with_sheet(tmp, "level3.xlsx", xml)


def stale_dimension(tmp):
    """A dimension that under-states the used range: openpyxl's read-only mode would drop every
    row past it without a word (3 of these 5 spans)."""
    import re

    src = hs.workbook(tmp / "base.xlsx", [hs.row(f"B{i}") for i in range(1, 6)])
    xml = re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:R3"', hs.members(src)["xl/worksheets/sheet1.xml"])
    return hs.rezip(src, tmp / "level3.xlsx", {"xl/worksheets/sheet1.xml": xml})


def whole_grid_utf16(tmp):
    """The whole-grid dimension with the sheet in UTF-16, where a byte search would see nothing."""
    import re

    xml = re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:XFD1048576"', sheet_xml(tmp))
    return with_sheet(tmp, "level3.xlsx", ('<?xml version="1.0" encoding="UTF-16"?>' + xml.decode()).encode("utf-16"))


def long_csv_line(tmp):
    text = ",".join(hs.HEADER) + "\n" + ",".join(map(str, hs.GOOD)) + ',"' + "x" * 200_000 + '"\n'
    (tmp / "level3.csv").write_text(text, encoding="utf-8")
    return tmp / "level3.csv"


def wide_and_long(tmp):
    """Each limit on its own is kept (200,000 rows, 900 columns), but together they make a grid of
    180 million cells for the spreadsheet library to fill in."""
    import re

    xml = re.sub(rb'<dimension ref="[^"]*"', b'<dimension ref="A1:AHP200000"', sheet_xml(tmp))
    return with_sheet(tmp, "level3.xlsx", xml)


def far_cell(tmp):
    def edit(wb):
        wb.active["XFD3"] = "stray"
    return good(tmp, "level3.xlsx", edit=edit)


def duplicate_part(tmp):
    src = good(tmp, "base.xlsx")
    parts = hs.members(src)
    with zipfile.ZipFile(tmp / "level3.xlsx", "w") as z:
        for name, data in parts.items():
            z.writestr(name, data)
        import warnings

        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            z.writestr("xl/worksheets/sheet1.xml", parts["xl/worksheets/sheet1.xml"])
    return tmp / "level3.xlsx"


def zip_encrypted(tmp):
    src = good(tmp, "base.xlsx")
    data = hs.patch_central(src.read_bytes(), "xl/worksheets/sheet1.xml", 8, "<H", 0x1)
    (tmp / "level3.xlsx").write_bytes(data)
    return tmp / "level3.xlsx"


def unsafe_name(tmp):
    return hs.rezip(good(tmp, "base.xlsx"), tmp / "level3.xlsx", add={"../../evil.xml": b"<a/>"})


def nested_archive(tmp):
    return hs.rezip(good(tmp, "base.xlsx"), tmp / "level3.xlsx", add={"xl/media/more.zip": hs.zip_of({"a": b"1"})})


def docx(tmp):
    parts = {"[Content_Types].xml": b"<Types/>", "word/document.xml": b"<document/>"}
    (tmp / "level3.xlsx").write_bytes(hs.zip_of(parts))
    return tmp / "level3.xlsx"


def opendocument(tmp):
    parts = {"mimetype": b"application/vnd.oasis.opendocument.spreadsheet", "content.xml": b"<office/>"}
    (tmp / "level3.xlsx").write_bytes(hs.zip_of(parts))
    return tmp / "level3.xlsx"


def plain_zip(tmp):
    (tmp / "level3.xlsx").write_bytes(hs.zip_of({"level3.xlsx": b"PK..."}))
    return tmp / "level3.xlsx"


def xlsb(tmp):
    parts = {"[Content_Types].xml": b"<Types/>", "xl/workbook.bin": b"\x83\x01\x00"}
    (tmp / "level3.xlsx").write_bytes(hs.zip_of(parts))
    return tmp / "level3.xlsx"


def html(tmp):
    (tmp / "level3.xlsx").write_text("<html><body><table><tr><td>Mark</td></tr></table></body></html>")
    return tmp / "level3.xlsx"


def pdf(tmp):
    (tmp / "level3.xlsx").write_bytes(b"%PDF-1.7\n%\xe2\xe3\xcf\xd3\n1 0 obj\n")
    return tmp / "level3.xlsx"


def xlsx_named_csv(tmp):
    return shutil.copy(good(tmp, "base.xlsx"), tmp / "level3.csv")


def binary_csv(tmp):
    (tmp / "level3.csv").write_bytes(b"Mark,bw\x00\x01\x02\xff")
    return tmp / "level3.csv"


def wide_csv(tmp):
    (tmp / "level3.csv").write_text("Mark" + "," * 5000 + "\nB1\n", encoding="utf-8")
    return tmp / "level3.csv"


def long_csv(tmp):
    lines = [",".join(hs.HEADER)] + [",".join(map(str, hs.row(f"B{i}"))) for i in range(5)]
    (tmp / "level3.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    return tmp / "level3.csv"


def missing(tmp):
    return tmp / "nowhere.xlsx"


def folder(tmp):
    (tmp / "level3.xlsx").mkdir()
    return tmp / "level3.xlsx"


# (case, builder, extra options, words the one-line message must hold)
CORPUS = [
    ("text renamed .xlsx", text_renamed, [], ["text file named .xlsx", "begins 'Mark,bw (mm)'", "rename it .csv"]),
    ("legacy .xls", legacy, [], ["legacy Excel 97-2003 workbook (.xls)", "save it as .xlsx"]),
    (".xls renamed .xlsx", lambda t: legacy(t, "level3.xlsx"), [], ["(.xls) named .xlsx", "save it as .xlsx"]),
    ("password-protected", encrypted, [], ["password-protected (encrypted)", "remove the password"]),
    ("truncated archive", truncated, [], ["damaged or truncated", "ask for the file again"]),
    ("corrupt part", corrupt_member, [], ["damaged", "ask for the file again"]),
    ("part larger than declared", lying_size, [], ["damaged", "Bad CRC-32"]),
    ("empty file", empty_file, [], ["empty (0 bytes)", "ask for it again"]),
    ("empty workbook", empty_workbook, [], ["no sheet has a header row with a 'Mark' cell", "'Sheet': empty"]),
    ("no Mark header", no_mark, [], ["no sheet has a header row with a 'Mark' cell",
                                     "'Beams': ['Ref', 'Width (mm)']", "'Notes 1': ['notes']"]),
    ("entity expansion", entity_bomb, [], ["'xl/worksheets/sheet1.xml' holds a DOCTYPE", "ask for the file again"]),
    ("external entity", external_entity, [], ["holds a DOCTYPE"]),
    ("DOCTYPE in UTF-16", utf16_doctype, [], ["holds a DOCTYPE"]),
    ("EBCDIC encoding", odd_encoding, [], ["declares the text encoding 'cp500'"]),
    ("compression bomb", ratio_bomb, [], ["'xl/media/image1.png' expands", "compression-ratio limit of 100",
                                          "--max-ratio"]),
    ("whole-grid dimension", whole_grid, [], ["sheet 'Beams' reaches row 1,048,576", "row limit of 250,000",
                                              "--max-rows"]),
    ("whole grid, UTF-16", whole_grid_utf16, [], ["reaches row 1,048,576", "--max-rows"]),
    ("CSV line too long", long_csv_line, [], ["line 2 of the CSV file is 200,", "ask for the schedule again"]),
    ("stray cell far right", far_cell, [], ["sheet 'Beams' reaches column XFD (column 16,384)",
                                            "column limit of 1,000", "--max-columns"]),
    ("duplicate parts", duplicate_part, [], ["two parts named 'xl/worksheets/sheet1.xml'"]),
    ("encrypted zip part", zip_encrypted, [], ["encrypted inside the zip package"]),
    ("unsafe part name", unsafe_name, [], ["unsafe name '../../evil.xml'"]),
    ("archive inside", nested_archive, [], ["holds an archive 'xl/media/more.zip'"]),
    ("Word document", docx, [], ["a Word document (.docx)"]),
    ("plain zip", plain_zip, [], ["a zip archive, not a workbook"]),
    ("OpenDocument", opendocument, [], ["an OpenDocument file (.ods/.odt)", "save it as .xlsx"]),
    ("binary workbook", xlsb, [], ["Excel binary workbook (.xlsb)", "save it as .xlsx"]),
    ("web page", html, [], ["web page (HTML) named .xlsx", "save it as .xlsx"]),
    ("PDF", pdf, [], ["PDF document named .xlsx"]),
    ("workbook named .csv", xlsx_named_csv, [], ["zip package (an .xlsx workbook?) named .csv", "rename it .xlsx"]),
    ("binary named .csv", binary_csv, [], ["binary file named .csv"]),
    ("CSV too wide", wide_csv, [], ["5,001 fields", "column limit of 1,000", "--max-columns"]),
    ("CSV too long", lambda t: long_csv(t), ["--max-rows", "3"], ["more than 3 lines", "row limit of 3 rows",
                                                                  "--max-rows"]),
    ("file size limit", lambda t: good(t, "level3.xlsx"), ["--max-file-mb", "0.001"],
     ["file-size limit of 0.001 MB", "--max-file-mb"]),
    ("decompressed size limit", lambda t: good(t, "level3.xlsx"), ["--max-unzipped-mb", "0.01"],
     ["decompress to", "limit on the decompressed size of 0.01 MB", "--max-unzipped-mb"]),
    ("parts limit", lambda t: good(t, "level3.xlsx"), ["--max-parts", "3"],
     ["package holds 9 parts", "--max-parts"]),
    ("sheet limit", lambda t: good(t, "level3.xlsx", extra_sheets=2), ["--max-sheets", "2"],
     ["the workbook has 3 sheets", "sheet limit of 2", "--max-sheets"]),
    ("cell limit", wide_and_long, [], ["sheet 'Beams' spans 200,000 rows by 900 columns, 180,000,000 cells",
                                       "cell limit of 10,000,000", "--max-cells"]),
    ("row limit", lambda t: hs.workbook(t / "level3.xlsx", [hs.row(f"B{i}") for i in range(5)]), ["--max-rows", "3"],
     ["reaches row 6", "row limit of 3", "--max-rows"]),
    ("missing file", missing, [], ["no such file"]),
    ("a folder", folder, [], ["it is a folder"]),
]


@pytest.mark.parametrize("case, build, options, words", CORPUS, ids=[c[0] for c in CORPUS])
def test_each_fault_is_refused_in_one_line(tmp_path, capsys, case, build, options, words):
    src = Path(build(tmp_path))
    before = digest(src) if src.is_file() else None
    listing = sorted(p.name for p in tmp_path.iterdir())
    code = cli.main(["check", str(src), *options])
    out, err = capsys.readouterr()
    assert code == 2, (case, out, err)
    lines = err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("beamsched: "), err
    assert "Traceback" not in err and "internal error" not in err
    for w in words:
        assert w in lines[0], (w, lines[0])
    assert out == ""  # nothing was checked, nothing written
    assert sorted(p.name for p in tmp_path.iterdir()) == listing
    if before is not None:
        assert digest(src) == before


def test_debug_adds_the_traceback(tmp_path, capsys):
    src = truncated(tmp_path)
    assert cli.main(["check", str(src), "--debug"]) == 2
    err = capsys.readouterr().err
    assert "Traceback" in err and err.strip().splitlines()[-1].startswith("beamsched: ")


@pytest.mark.parametrize("options, raised", [
    (["--max-sheets", "2"], ["--max-sheets", "3"]),
    (["--max-rows", "2"], ["--max-rows", "3"]),
    (["--max-file-mb", "0.001"], ["--max-file-mb", "1"]),
])
def test_the_override_lifts_the_limit_and_the_file_is_checked(tmp_path, capsys, options, raised):
    src = hs.workbook(tmp_path / "level3.xlsx", [hs.GOOD, hs.FAILING], extra_sheets=2)
    assert cli.main(["check", str(src), *options]) == 2
    capsys.readouterr()
    code = cli.main(["check", str(src), *raised, "--json", str(tmp_path / "r.json")])
    out, _ = capsys.readouterr()
    assert code == 1 and "1 PASS, 1 FAIL" in out
    assert [b["status"] for b in json.loads((tmp_path / "r.json").read_text())["beams"]] == ["pass", "fail"]


def test_a_limit_must_be_a_positive_number(capsys):
    for bad in ("0", "-5", "nan", "inf", "lots"):
        assert cli.main(["check", "x.xlsx", "--max-rows" if bad == "lots" else "--max-ratio", bad]) == 2
        assert "expected a" in capsys.readouterr().err


def test_unreadable_file(tmp_path, capsys, monkeypatch):
    """No permission to read: as root a mode of 000 does not stop reading, so the operating
    system's refusal is imitated at the open call as well."""
    src = good(tmp_path, "level3.xlsx")
    real_open = Path.open

    def refuse(self, *a, **k):
        if self == src:
            raise PermissionError(13, "Permission denied", str(self))
        return real_open(self, *a, **k)

    monkeypatch.setattr(Path, "open", refuse)
    code = cli.main(["check", str(src)])
    err = capsys.readouterr().err
    assert code == 2 and "cannot be read (Permission denied)" in err and "permissions" in err
    assert len(err.strip().splitlines()) == 1


# -- the XML parser: defusedxml, proven on the files above ------------------------------------------------------
@pytest.mark.parametrize("read_only", [True, False])  # read-only: the reader; full: the annotated copy
def test_openpyxl_refuses_the_entities_itself(tmp_path, read_only):
    """Without beamsched's own DOCTYPE check, openpyxl (through defusedxml) still refuses to
    expand an entity or fetch an external one; it never returns the expanded text."""
    import defusedxml
    import openpyxl

    for src in (entity_bomb(tmp_path), external_entity(tmp_path)):
        with pytest.raises(Exception) as info:
            wb = openpyxl.load_workbook(src, read_only=read_only)
            list(wb.worksheets[0].iter_rows(values_only=True))
        chain, e = [], info.value
        while e is not None:
            chain.append(e)
            e = e.__cause__ or e.__context__
        assert any(isinstance(x, defusedxml.DefusedXmlException) for x in chain), chain
        assert "TOPSECRET" not in "".join(map(str, chain))


def test_without_defusedxml_the_entity_would_be_expanded(tmp_path):
    """The control: with openpyxl told not to use defusedxml the same file expands (so the test
    above can fail), and beamsched then refuses to read workbooks at all."""
    import subprocess
    import sys

    src = entity_bomb(tmp_path)
    probe = (f"import openpyxl\nwb = openpyxl.load_workbook(r'{src}', read_only=True)\n"
             "print(len(str(next(wb.worksheets[0].iter_rows(min_row=2, values_only=True))[0])))\n"
             "from beamsched.schedule.guard import require_defused_xml\n"
             "try:\n    require_defused_xml()\nexcept Exception as e:\n    print(type(e).__name__)\n")
    root = Path(cli.__file__).resolve().parent.parent
    env = {**os.environ, "OPENPYXL_DEFUSEDXML": "False"}
    out = subprocess.run([sys.executable, "-c", probe], cwd=root, env=env, capture_output=True, text=True,
                         check=True).stdout.split()
    assert out == ["1000", "ScheduleError"]  # "&c;" = 10 x 10 x "aaaaaaaaaa"


def test_read_schedule_through_the_guard_refuses_the_same(tmp_path):
    """The guard on its own, as the reader calls it."""
    for build, words in ((entity_bomb, "DOCTYPE"), (whole_grid, "--max-rows"), (encrypted, "password")):
        with pytest.raises(ScheduleError, match=words):
            inspect_file(build(tmp_path))
    assert inspect_file(good(tmp_path)) == "workbook"
    assert inspect_file(hs.workbook(tmp_path / "x.xlsx", [hs.GOOD]), Limits(rows=2)) == "workbook"


def test_ole2_directory_names_of_the_test_files():
    # [MS-CFB] 2.6.1: directory entry names; [MS-OFFCRYPTO] 2.3.4.5: the two encryption streams
    assert ole2_names(hs.encrypted_workbook()) == ["Root Entry", "EncryptionInfo", "EncryptedPackage",
                                                   "\x06DataSpaces"]
    assert ole2_names(hs.legacy_xls())[:2] == ["Root Entry", "Workbook"]
    with pytest.raises(ValueError):
        ole2_names(hs.legacy_xls()[:600])  # the directory sector cut off


# -- row-level faults beside good rows -------------------------------------------------------------------------
BAD_ROWS = [  # (mark, changes, column named, words of the message)
    ("B21", {"h (mm)": "700mm"}, "h (mm)", "the unit belongs in the column header"),
    ("B22", {"bw (mm)": "wide"}, "bw (mm)", "text, not a number"),
    ("B23", {"Bottom bars": "4-25"}, "Bottom bars", "unreadable bar notation"),
    ("B24", {"Stirrups": "10M@0"}, "Stirrups", "greater than zero"),
    ("B25", {"bw (mm)": -400}, "bw (mm)", "positive"),
    ("B26", {"f'c (MPa)": "=B2*2"}, "f'c (MPa)", "formula with no saved value"),
    ("B27", {"Vf (kN)": "#DIV/0!"}, "Vf (kN)", "#DIV/0!"),
    ("B28", {"Top bars": "2-28M"}, "Top bars", "unknown bar size '28M'"),
    ("B29", {"Type": "T"}, "hf", "flange thickness"),
]


def test_bad_rows_are_named_and_the_good_rows_beside_them_are_checked(tmp_path, capsys):
    import datetime as dt

    rows = [hs.GOOD]
    for mark, changes, _, _ in BAD_ROWS:
        rows.append(hs.row(mark, **changes))
    rows.append(hs.row("B30", **{"Bottom bars": dt.datetime(2025, 4, 25)}))  # '4-25' turned into a date
    rows.append(hs.FAILING)
    src = hs.workbook(tmp_path / "level3.xlsx", rows)
    before = digest(src)
    code = cli.main(["check", str(src), "--json", str(tmp_path / "r.json")])
    out, err = capsys.readouterr()
    assert code == 2 and err == ""
    beams = {b["mark"]: b for b in json.loads((tmp_path / "r.json").read_text())["beams"]}
    assert beams["B10"]["status"] == "pass" and beams["B12"]["status"] == "fail"  # still checked
    assert beams["B12"]["values"]["Mr_pos_kNm"] > 0
    for mark, _, column, words in BAD_ROWS + [("B30", {}, "Bottom bars", "a date")]:
        b = beams[mark]
        assert b["status"] == "error", mark
        hits = [p for p in b["problems"] if p["severity"] == "error" and column in (p["column"] or "")]
        assert hits, (mark, b["problems"])
        assert any(words in p["message"] and f"row {b['row']}" in p["message"] for p in hits), (mark, hits)
    assert digest(src) == before


def test_a_good_file_passes_the_guard_and_reads_the_same(tmp_path):
    """The guard changes nothing for a genuine schedule: the bundled sample passes it."""
    from beamsched.schedule.samples import sample_path

    for variant in ("si", "us"):
        p = Path(sample_path(variant))
        assert inspect_file(p) == "workbook"
        assert read_schedule(p).rows


def test_the_help_shows_the_limits_in_force(capsys):
    """cli repeats the defaults of Limits for its --help (so that --help needs no reader import)."""
    from dataclasses import asdict

    shown = {fld: float(text.replace(",", "")) for fld, _, _, _, text, _ in cli.LIMIT_OPTIONS}
    assert shown == {k: float(v) for k, v in asdict(Limits()).items()}
    assert cli.main(["check", "--help"]) == 0
    out = " ".join(capsys.readouterr().out.split())
    for _, option, _, _, text, _ in cli.LIMIT_OPTIONS:
        assert option in out and f"(default {text})" in out


def test_formatted_empty_rows_past_the_used_range_are_not_a_stale_range(tmp_path, capsys):
    """Excel writes a <row> for a row given a height or format, with no cells, past the used
    range: nothing is lost by reading such a file, so it is read (and checked)."""
    src = hs.workbook(tmp_path / "base.xlsx", [hs.GOOD, hs.FAILING])
    xml = hs.members(src)["xl/worksheets/sheet1.xml"].replace(
        b"</sheetData>", b'<row r="200" spans="1:18" ht="20" customHeight="1"/></sheetData>')
    fmt = hs.rezip(src, tmp_path / "level3.xlsx", {"xl/worksheets/sheet1.xml": xml})
    assert inspect_file(fmt) == "workbook"
    assert cli.main(["check", str(fmt)]) == 1
    assert "1 PASS, 1 FAIL" in capsys.readouterr().out


def test_read_schedule_runs_the_guard_with_its_limits(tmp_path):
    """The Python API is guarded as the command line is: read_schedule(..., limits=)."""
    with pytest.raises(ScheduleError, match="holds a DOCTYPE"):
        read_schedule(entity_bomb(tmp_path))
    with pytest.raises(ScheduleError, match="password-protected"):
        read_schedule(encrypted(tmp_path))
    src = hs.workbook(tmp_path / "five.xlsx", [hs.row(f"B{i}") for i in range(5)])
    with pytest.raises(ScheduleError, match="--max-rows"):
        read_schedule(src, limits=Limits(rows=3))
    assert len(read_schedule(src, limits=Limits(rows=10)).rows) == 5


def test_a_stale_used_range_loses_no_rows(tmp_path):
    # openpyxl read-only mode trusts the declared dimension (A1:R3 here); the reader measures the
    # sheet itself, so all five spans are read (common practice: exporters write stale ranges)
    from beamsched.schedule import read_schedule

    schedule = read_schedule(stale_dimension(tmp_path))
    assert [r.mark for r in schedule.rows] == [f"B{i}" for i in range(1, 6)]
