"""Look at a schedule file before any parser touches it, and refuse what is not safe to read.

Schedules arrive by e-mail from other firms. Before the workbook or CSV reader opens a file,
:func:`inspect_file` checks, from the raw bytes only:

* what the file is, by its first bytes (not its name): a zip package (.xlsx/.xlsm), an OLE2
  compound file (a legacy .xls, or a password-protected workbook, which Office wraps in OLE2
  with an ``EncryptedPackage`` stream), a PDF, HTML or XML, plain text, or nothing at all;
* the file's size;
* for a zip package, its central directory before anything is decompressed: the number of
  parts, each part's uncompressed size and compression ratio, their total, encrypted or
  duplicated parts, parts with unsafe names, archives nested outside ``xl/embeddings``, and
  compression methods beyond stored/deflate;
* then every XML part, decompressed as a stream (at most the sizes the directory declares:
  Python's zipfile stops there and fails the CRC): no DOCTYPE (so no entity can be declared,
  expanded or fetched), a UTF-8/UTF-16 encoding, an intact checksum;
* the number of sheets, and the extent each worksheet claims (its ``dimension`` and every row
  and cell reference: openpyxl's read-only mode pads every row to the dimension's width and
  fills every gap up to its last row, so one cell at XFD1048576 would make 17 billion values);
* for a CSV file, its rows and the widest row.

Each limit is a field of :class:`Limits`; a refusal is a one-line :class:`ScheduleError`
naming the limit and the command-line option that lifts it. Nothing here parses XML: the
workbook reader (openpyxl) parses it later through defusedxml, which :func:`xml_is_defused`
confirms; the DOCTYPE check here is a second, independent line of defence.
"""

from __future__ import annotations

import codecs
import re
import struct
import zipfile
import zlib
from dataclasses import dataclass, fields
from pathlib import Path, PurePosixPath

from .cells import ScheduleError

MB = 1_000_000


@dataclass(frozen=True)
class Limits:
    """What beamsched will read. Each limit has a ``beamsched check`` option that lifts it
    (``OPTIONS``). The defaults sit far beyond any floor's schedule (a generated 10,000-span
    schedule, measured: a 0.8 MB workbook holding an 8 MB worksheet of 10,001 rows by 28
    columns) and far below what would exhaust a desktop."""

    file_mb: float = 100.0  # the file as it arrives
    unzipped_mb: float = 1000.0  # all the parts of a workbook, decompressed
    ratio: float = 100.0  # uncompressed / compressed size of one part (above RATIO_FLOOR)
    parts: int = 5000  # members of the zip package
    sheets: int = 200  # sheets in the workbook
    rows: int = 250_000  # the last row a sheet (or a CSV file) reaches
    columns: int = 1000  # the last column a sheet (or a CSV row) reaches
    cells: int = 10_000_000  # rows x columns of one sheet: what the spreadsheet library fills in


OPTIONS = {  # Limits field -> the `beamsched check` option that sets it
    "file_mb": "--max-file-mb",
    "unzipped_mb": "--max-unzipped-mb",
    "ratio": "--max-ratio",
    "parts": "--max-parts",
    "sheets": "--max-sheets",
    "rows": "--max-rows",
    "columns": "--max-columns",
    "cells": "--max-cells",
}
assert set(OPTIONS) == {f.name for f in fields(Limits)}

# A part smaller than this is not held to the ratio limit: it cannot hurt, and small XML parts
# (VML drawings, repeated empty cells) legitimately compress 30 to 100 times.
RATIO_FLOOR = 1 * MB
# Deflate cannot compress better than about 1032:1 (zlib technical details, from memory), so a
# ratio of 100 leaves real workbooks (about 10:1 for schedule data, measured) well inside.

# Python's csv module refuses a field longer than 131,072 characters (csv.field_size_limit()):
# no line of a schedule comes near it. Excel's cell limit, 32,767 characters, from memory.
CSV_LINE_LIMIT = 131_072
PROLOG_LIMIT = 64 * 1024  # the root element of an XML part must start within its first 64 KiB
CHUNK = 1 << 20
OLE2_MAGIC = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"  # [MS-CFB] 2.2 header signature
ZIP_LOCAL = b"PK\x03\x04"
ZIP_EMPTY = b"PK\x05\x06"
ALLOWED_METHODS = {zipfile.ZIP_STORED: "stored", zipfile.ZIP_DEFLATED: "deflate"}
XML_SUFFIXES = (".xml", ".rels", ".vml")
ARCHIVE_SUFFIXES = (".zip", ".gz", ".tgz", ".bz2", ".xz", ".7z", ".rar", ".tar", ".jar", ".cab")
EXCEL_MAX_ROWS, EXCEL_MAX_COLUMNS = 1_048_576, 16_384  # the sheet grid of the file format (ECMA-376)


def _fail(name: str, message: str) -> None:
    raise ScheduleError(f"{name}: {message}")


LIMIT_WORDS = {
    "file_mb": "file-size limit", "unzipped_mb": "limit on the decompressed size", "ratio": "compression-ratio limit",
    "parts": "limit on the parts of a workbook", "sheets": "sheet limit", "rows": "row limit",
    "columns": "column limit", "cells": "cell limit",
}


def _over(found: str, limit: str, field_: str, suggest: float | int, note: str = "") -> str:
    """One line: what was found, the limit it passes, and the option (with a value) that lifts it."""
    shown = _nice(suggest)
    return (f"{found}, over the {LIMIT_WORDS[field_]} of {limit}{note}; if the file is genuine, raise the limit "
            f"with {OPTIONS[field_]} {shown}")


def _nice(x: float) -> str:
    """A round value at or above ``x`` to suggest for an option: 1, 2 or 5 times a power of ten."""
    step = 1
    while True:
        for m in (1, 2, 5):
            if m * step >= x:
                return str(m * step)
        step *= 10


def _mb(n: float) -> str:
    return f"{n / MB:,.1f} MB"


# -- the entry point ---------------------------------------------------------------------------
def inspect_file(path: str | Path, limits: Limits | None = None) -> str:
    """Check ``path`` before it is parsed; return its kind (``"workbook"`` or ``"csv"``).

    Raises :class:`ScheduleError` (one line: what the file is, and what to do) for a file that
    is missing, unreadable, empty, of another kind than its name says, damaged, encrypted, a
    legacy .xls, or over a limit of ``limits``.
    """
    limits = limits or Limits()
    p = Path(path)
    name = p.name or str(p)
    try:
        st = p.stat()
    except FileNotFoundError:
        raise ScheduleError(f"{p}: no such file") from None
    except OSError as exc:
        raise ScheduleError(f"{p}: cannot be read ({exc.strerror or exc})") from None
    if p.is_dir():
        raise ScheduleError(f"{p} is a folder, not a schedule file: name the .xlsx, .xlsm or .csv file in it")
    if not p.is_file():
        raise ScheduleError(f"{p} is not a regular file (a device or a pipe): name a saved .xlsx, .xlsm or .csv file")
    size = st.st_size
    if size > limits.file_mb * MB:
        _fail(name, _over(f"the file is {_mb(size)}", f"{limits.file_mb:g} MB", "file_mb", _ceil(size / MB * 1.5)))
    try:
        with p.open("rb") as fh:
            head = fh.read(4096)
    except OSError as exc:
        raise ScheduleError(f"{p}: cannot be read ({exc.strerror or exc}): check the file's permissions, "
                            "or copy it somewhere you can read it") from None
    if size == 0 or not head:
        _fail(name, "the file is empty (0 bytes): the attachment or export did not arrive whole; ask for it again")
    suffix = p.suffix.lower()
    if head.startswith(OLE2_MAGIC):
        _ole2(p, name, suffix)
    if head.startswith(ZIP_LOCAL) or head.startswith(ZIP_EMPTY) or head.startswith(b"PK\x07\x08"):
        if suffix in (".csv", ".txt", ".xls"):
            _fail(name, f"this is a zip package (an .xlsx workbook?) named {suffix}: rename it .xlsx and check again")
        _zip(p, name, size, limits)
        return "workbook"
    if suffix in (".csv", ".txt"):
        _csv(p, name, head, limits)
        return "csv"
    _not_a_workbook(name, suffix, head)
    return "workbook"  # pragma: no cover - _not_a_workbook always raises


def _ceil(x: float) -> int:
    return max(1, int(-(-x // 1)))


# -- what a file is, when it is not a zip package ----------------------------------------------------
def _not_a_workbook(name: str, suffix: str, head: bytes) -> None:
    named = f"named {suffix}" if suffix else "with no extension"
    if suffix == ".xls" or head.startswith(OLE2_MAGIC[:4]):
        _fail(name, LEGACY_XLS.format(renamed="" if suffix == ".xls" else f" named {suffix}"))
    stripped = head.lstrip(b"\xef\xbb\xbf \t\r\n").lower()
    if stripped.startswith(b"%pdf"):
        _fail(name, f"this is a PDF document {named}, not a workbook: ask for the schedule as .xlsx or .csv")
    if stripped.startswith((b"<!doctype html", b"<html", b"<table")) or b"<html" in stripped[:512]:
        _fail(name, f"this is a web page (HTML) {named}, not a workbook (some programs export 'Excel' files as "
                    "HTML): open it in a spreadsheet program and save it as .xlsx")
    if stripped.startswith(b"<?xml") or stripped.startswith(b"<"):
        _fail(name, f"this is an XML file {named}, not an .xlsx package (perhaps an 'XML Spreadsheet 2003' "
                    "export): open it in a spreadsheet program and save it as .xlsx")
    if stripped.startswith(b"{\\rtf"):
        _fail(name, f"this is an RTF document {named}, not a workbook: ask for the schedule as .xlsx or .csv")
    if _looks_like_text(head):
        first = head.decode("utf-8", "replace").splitlines()[0][:40] if head.strip() else ""
        _fail(name, f"this is a text file {named} (it begins '{first}'), not an .xlsx/.xlsm workbook: if it is a CSV "
                    "export, rename it .csv; otherwise save the schedule from the spreadsheet as .xlsx")
    _fail(name, f"this is not a workbook beamsched reads (its first bytes are {head[:8].hex(' ')}, not a zip "
                "package): save the schedule as .xlsx, or export it as .csv")


def _looks_like_text(head: bytes) -> bool:
    if b"\x00" in head:
        return False
    try:
        text = head.decode("utf-8")
    except UnicodeDecodeError:
        try:
            text = head.decode("cp1252")
        except UnicodeDecodeError:
            return False
    printable = sum(ch.isprintable() or ch in "\r\n\t" for ch in text)
    return printable >= 0.95 * len(text)


# -- OLE2 compound files ([MS-CFB]) -------------------------------------------------------------------
def ole2_names(data: bytes) -> list[str]:
    """The names of the storages and streams in an OLE2 compound file ([MS-CFB] 2.2, 2.6).

    Reads the header, the FAT (through the DIFAT, also its chain), and the directory chain,
    with every chain bounded by the number of sectors in the file. Raises ValueError when the
    structure is damaged."""
    if len(data) < 512 or not data.startswith(OLE2_MAGIC):
        raise ValueError("too short for an OLE2 header")
    shift = struct.unpack_from("<H", data, 0x1E)[0]
    if shift not in (9, 12):
        raise ValueError(f"sector shift {shift}")
    ssize = 1 << shift
    nsect = len(data) // ssize + 1  # no chain can be longer than the file has sectors
    first_dir, first_difat, n_difat = struct.unpack_from("<L", data, 0x30)[0], *struct.unpack_from("<LL", data, 0x44)
    difat = list(struct.unpack_from("<109L", data, 0x4C))
    per = ssize // 4
    s, seen = first_difat, 0
    while s < 0xFFFFFFFA and seen <= n_difat and seen < nsect:
        entries = _sector(data, s, ssize, shift)
        ids = struct.unpack(f"<{per}L", entries)
        difat += ids[:-1]
        s, seen = ids[-1], seen + 1
    fat: list[int] = []
    for fs in difat:
        if fs >= 0xFFFFFFFA:
            continue
        fat += struct.unpack(f"<{per}L", _sector(data, fs, ssize, shift))
    names: list[str] = []
    s, seen = first_dir, 0
    while s < 0xFFFFFFFA:
        if seen > nsect:
            raise ValueError("the directory chain loops")
        block = _sector(data, s, ssize, shift)
        for off in range(0, ssize, 128):
            n = struct.unpack_from("<H", block, off + 64)[0]
            if 2 <= n <= 64:
                names.append(block[off:off + n - 2].decode("utf-16-le", "replace"))
        s = fat[s] if s < len(fat) else 0xFFFFFFFE
        seen += 1
    return names


def _sector(data: bytes, s: int, ssize: int, shift: int) -> bytes:
    start = (s + 1) << shift  # sector 0 follows the header, which fills sector -1 ([MS-CFB] 2.2)
    block = data[start:start + ssize]
    if len(block) < ssize:
        raise ValueError(f"sector {s} lies beyond the end of the file")
    return block


LEGACY_XLS = ("this is a legacy Excel 97-2003 workbook (.xls){renamed}: the .xls format is not read; open it and "
              "save it as .xlsx (or export the schedule as .csv)")


def _ole2(p: Path, name: str, suffix: str) -> None:
    try:
        names = {n.lower() for n in ole2_names(p.read_bytes())}
    except (ValueError, struct.error):
        names = set()
    renamed = f" named {suffix}" if suffix not in (".xls", "") else ""
    if "encryptedpackage" in names or "encryptioninfo" in names:
        _fail(name, "this workbook is password-protected (encrypted), so it cannot be read: open it with its "
                    "password, remove the password to open, save a copy as .xlsx, and check the copy")
    if "workbook" in names or "book" in names:
        _fail(name, LEGACY_XLS.format(renamed=renamed))
    if "worddocument" in names:
        _fail(name, f"this is a Word document (.doc){renamed}, not a workbook: ask for the schedule as .xlsx or .csv")
    if "powerpoint document" in names:
        _fail(name, f"this is a PowerPoint file (.ppt){renamed}, not a workbook: ask for the schedule as .xlsx or .csv")
    _fail(name, f"this is a legacy Office binary file (OLE2){renamed}, not an .xlsx workbook: open it in the program "
                "that made it and save the schedule as .xlsx (or export it as .csv)")


# -- zip packages --------------------------------------------------------------------------------------
def _end_record(p: Path, size: int) -> tuple[int, int] | None:
    """(entries, central directory size) from the end-of-central-directory record (APPNOTE 4.3.16,
    4.3.14 for ZIP64), or None when there is none: the archive is truncated."""
    tail_len = min(size, 22 + 65535)
    with p.open("rb") as fh:
        fh.seek(size - tail_len)
        tail = fh.read(tail_len)
        at = tail.rfind(b"PK\x05\x06")
        if at < 0 or len(tail) - at < 22:
            return None
        _sig, disk, disk_cd, _n_disk, entries, cd_size, _cd_off, _clen = struct.unpack_from("<4s4H2LH", tail, at)
        if disk or disk_cd:
            raise ScheduleError(f"{p.name}: this is one part of a split (multi-volume) zip archive: join the "
                                "parts, save the workbook as one .xlsx, and check that")
        if entries == 0xFFFF or cd_size == 0xFFFFFFFF:
            loc = at - 20
            if loc >= 0 and tail[loc:loc + 4] == b"PK\x06\x07":
                off64 = struct.unpack_from("<Q", tail, loc + 8)[0]
                fh.seek(off64)
                rec = fh.read(56)
                if len(rec) == 56 and rec.startswith(b"PK\x06\x06"):
                    entries, cd_size = struct.unpack_from("<QQ", rec, 32)[0], struct.unpack_from("<Q", rec, 40)[0]
        return entries, cd_size


def _zip(p: Path, name: str, size: int, limits: Limits) -> None:
    end = _end_record(p, size)
    if end is None:
        _fail(name, "the workbook is damaged or truncated (its zip directory, stored at the end, is missing: the "
                    "download or attachment was cut short): ask for the file again")
    entries, _cd_size = end
    if entries > limits.parts:
        _fail(name, _over(f"the workbook package holds {entries:,} parts", f"{limits.parts:,}", "parts",
                          int(entries * 1.5)))
    try:
        with zipfile.ZipFile(p) as z:
            infos = z.infolist()
            _directory(name, infos, limits)
            kind = _package_kind(name, {i.filename for i in infos})
            if kind != "workbook":
                _fail(name, kind)
            workbook_part = _workbook_part(z)
            sheets = _sheet_parts(z, workbook_part)
            _scan_parts(z, name, infos, sheets, limits)
        require_defused_xml()
    except ScheduleError:
        raise
    except (zipfile.BadZipFile, zlib.error) as exc:
        _fail(name, f"the workbook is damaged ({exc}): ask for the file again, or open and re-save it")
    except (OSError, EOFError, ValueError, NotImplementedError, RuntimeError, struct.error) as exc:
        _fail(name, f"the workbook is damaged and cannot be read ({exc}): ask for the file again, or open and "
                    "re-save it")


def _directory(name: str, infos: list[zipfile.ZipInfo], limits: Limits) -> None:
    """Everything the central directory says, before anything is decompressed."""
    seen: set[str] = set()
    total = 0
    for i in infos:
        fn = i.filename
        key = fn.lower()
        if key in seen:
            _fail(name, f"the workbook package holds two parts named '{fn}' (a sign of a tampered file; readers "
                        "disagree on which one counts): ask for the file again")
        seen.add(key)
        pure = PurePosixPath(fn.replace("\\", "/"))
        if pure.is_absolute() or ".." in pure.parts or re.match(r"^[A-Za-z]:", fn) or "\x00" in fn:
            _fail(name, f"the workbook package holds a part with an unsafe name '{fn}' (an absolute path or '..'), "
                        "which no spreadsheet program writes: ask for the file again")
        if i.flag_bits & 0x1:
            _fail(name, f"the part '{fn}' is encrypted inside the zip package (a password-protected zip, not a "
                        "workbook): ask for the schedule as an unprotected .xlsx")
        if i.compress_type not in ALLOWED_METHODS:
            _fail(name, f"the part '{fn}' uses zip compression method {i.compress_type}, which workbooks do not use "
                        "(only stored and deflate): open and re-save the workbook in a spreadsheet program")
        if key.endswith(ARCHIVE_SUFFIXES):
            _fail(name, f"the workbook package holds an archive '{fn}' inside it, which a workbook does not: "
                        "ask for the schedule as a plain .xlsx")
        total += i.file_size
        if i.file_size > RATIO_FLOOR:
            ratio = i.file_size / max(i.compress_size, 1)
            if ratio > limits.ratio:
                _fail(name, _over(f"the part '{fn}' expands {ratio:,.0f} times ({_mb(i.file_size)} from "
                                  f"{_mb(i.compress_size)})", f"{limits.ratio:g}", "ratio", _ceil(ratio * 1.5),
                                  " (a compression bomb?)"))
        if total > limits.unzipped_mb * MB:
            break
    if total > limits.unzipped_mb * MB:
        _fail(name, _over(f"the workbook's parts decompress to {_mb(total)} or more",
                          f"{limits.unzipped_mb:g} MB", "unzipped_mb", _ceil(total / MB * 1.5)))


def _package_kind(name: str, names: set[str]) -> str:
    low = {n.lower() for n in names}
    if "mimetype" in low and "content.xml" in low:
        return ("this is an OpenDocument file (.ods/.odt), not an .xlsx workbook: open it and save it as .xlsx, "
                "or export the schedule as .csv")
    if "[content_types].xml" not in low:
        return ("this is a zip archive, not a workbook (it has no [Content_Types].xml): unzip it and check the "
                ".xlsx inside, or save the schedule as .xlsx")
    if any(n.startswith("xl/") and n.endswith(".bin") and "/workbook" in n for n in low):
        return ("this is an Excel binary workbook (.xlsb), which beamsched does not read: open it and save it as "
                ".xlsx, or export the schedule as .csv")
    if any(n.startswith("xl/") for n in low):
        return "workbook"
    if any(n.startswith("word/") for n in low):
        return "this is a Word document (.docx), not a workbook: ask for the schedule as .xlsx or .csv"
    if any(n.startswith("ppt/") for n in low):
        return "this is a PowerPoint file (.pptx), not a workbook: ask for the schedule as .xlsx or .csv"
    return "this is an Office package with no workbook in it (no xl/ folder): save the schedule as .xlsx"


_REL = re.compile(rb"<(?:\w+:)?Relationship\b[^>]*>")
_ATTR = re.compile(rb'\b(Type|Target)\s*=\s*["\']([^"\']*)["\']')


def _workbook_part(z: zipfile.ZipFile) -> str:
    """The workbook part named by the package's root relationships (usually xl/workbook.xml)."""
    try:
        rels = _bounded_read(z, "_rels/.rels")
    except KeyError:
        return "xl/workbook.xml"
    for m in _REL.finditer(rels):
        attrs = dict((k.decode(), v.decode("utf-8", "replace")) for k, v in _ATTR.findall(m.group(0)))
        if attrs.get("Type", "").endswith("/officeDocument"):
            return attrs.get("Target", "xl/workbook.xml").lstrip("/")
    return "xl/workbook.xml"


_SHEET = re.compile(rb"<(?:\w+:)?sheet\b[^>]*>")
_RID = re.compile(rb'\br:id\s*=\s*["\']([^"\']*)["\']|\b\w+:id\s*=\s*["\']([^"\']*)["\']')
_RELID = re.compile(rb'\bId\s*=\s*["\']([^"\']*)["\']')


def _sheet_parts(z: zipfile.ZipFile, workbook_part: str) -> list[str]:
    """The sheets the workbook lists, as part names (each `<sheet>` through the workbook's rels)."""
    try:
        wb = _bounded_read(z, workbook_part)
    except KeyError:
        return []
    folder = str(PurePosixPath(workbook_part).parent)
    rels_name = f"{folder}/_rels/{PurePosixPath(workbook_part).name}.rels"
    targets: dict[str, str] = {}
    try:
        for m in _REL.finditer(_bounded_read(z, rels_name)):
            tag = m.group(0)
            rid = _RELID.search(tag)
            attrs = dict((k.decode(), v.decode("utf-8", "replace")) for k, v in _ATTR.findall(tag))
            if rid and "Target" in attrs:
                t = attrs["Target"]
                targets[rid.group(1).decode()] = t.lstrip("/") if t.startswith("/") else f"{folder}/{t}"
    except KeyError:
        pass
    parts = []
    for m in _SHEET.finditer(wb):
        rid = _RID.search(m.group(0))
        key = (rid.group(1) or rid.group(2)).decode() if rid else ""
        parts.append(targets.get(key, ""))
    return parts


def _bounded_read(z: zipfile.ZipFile, member: str, limit: int = 16 * MB) -> bytes:
    with z.open(member) as fh:
        data = fh.read(limit + 1)
    if len(data) > limit:
        raise ValueError(f"the part {member} is larger than a workbook's index should be")
    return data


# -- the XML parts -------------------------------------------------------------------------------------
_DIMENSION = re.compile(rb'<(?:\w+:)?dimension\s+ref\s*=\s*"([A-Z]*)(\d*)(?::([A-Z]*)(\d*))?"')
_REF_ROW = re.compile(rb'\sr\s*=\s*"[A-Z]{0,3}(\d{1,8})"')  # the row of a <row r="12"> or a <c r="AB12">
_REF_COL = re.compile(rb'\sr\s*=\s*"([A-Z]{1,3})\d')  # the column of a <c r="AB12">
_REF_CELL_ROW = re.compile(rb'\sr\s*=\s*"[A-Z]{1,3}(\d{1,8})"')  # the row of a <c r="AB12"> only
_ENCODING = re.compile(rb"""^<\?xml[^>]*?\bencoding\s*=\s*["']([A-Za-z0-9._-]+)["']""")
_SAFE_ENCODINGS = {"utf-8", "utf8", "utf-16", "utf16", "utf-16le", "utf-16be", "us-ascii", "ascii"}


def column_number(letters: str) -> int:
    n = 0
    for ch in letters:
        n = n * 26 + (ord(ch) - 64)
    return n


def _scan_parts(z: zipfile.ZipFile, name: str, infos: list[zipfile.ZipInfo], sheets: list[str],
                limits: Limits) -> None:
    if len(sheets) > limits.sheets:
        _fail(name, _over(f"the workbook has {len(sheets):,} sheets", f"{limits.sheets:,}", "sheets",
                          int(len(sheets) * 1.5)))
    sheet_names = {s.lower(): i for i, s in enumerate(sheets)}
    titles = _sheet_titles(z)
    for info in infos:
        fn = info.filename
        low = fn.lower()
        if info.is_dir():
            continue
        is_xml = low.endswith(XML_SUFFIXES)
        is_sheet = low in sheet_names
        if not (is_xml or is_sheet):
            _drain(z, info)  # checks the CRC of every other part too (images, vbaProject.bin ...)
            continue
        extent = _scan_xml(z, info, name, measure=is_sheet)
        if is_sheet and extent is not None:
            rows, cols = extent.reach
            title = titles[sheet_names[low]] if sheet_names[low] < len(titles) else fn
            if rows > limits.rows:
                _fail(name, _over(f"sheet '{title}' reaches row {rows:,}", f"{limits.rows:,} rows", "rows",
                                  min(EXCEL_MAX_ROWS, int(rows * 1.2) + 1)))
            if cols > limits.columns:
                _fail(name, _over(f"sheet '{title}' reaches column {_letters(cols)} (column {cols:,})",
                                  f"{limits.columns:,} columns", "columns", min(EXCEL_MAX_COLUMNS, int(cols * 1.2) + 1)))
            if rows * cols > limits.cells:
                _fail(name, _over(f"sheet '{title}' spans {rows:,} rows by {cols:,} columns, {rows * cols:,} cells",
                                  f"{limits.cells:,}", "cells", rows * cols * 1.2))


def _sheet_titles(z: zipfile.ZipFile) -> list[str]:
    try:
        wb = _bounded_read(z, _workbook_part(z))
    except (KeyError, ValueError):
        return []
    out = []
    for m in _SHEET.finditer(wb):
        t = re.search(rb'\bname\s*=\s*"([^"]*)"', m.group(0))
        out.append(t.group(1).decode("utf-8", "replace") if t else "?")
    return out


def _letters(n: int) -> str:
    s = ""
    while n:
        n, r = divmod(n - 1, 26)
        s = chr(65 + r) + s
    return s


def _drain(z: zipfile.ZipFile, info: zipfile.ZipInfo) -> None:
    with z.open(info) as fh:
        while fh.read(CHUNK):
            pass


@dataclass
class Extent:
    """How far a worksheet reaches: by its cells' references, and by its declared dimension."""

    rows: int = 0  # the last row any <row> or <c> names
    columns: int = 0
    cell_rows: int = 0  # the last row a cell names (Excel writes empty, formatted <row>s past the used range)
    dim_rows: int | None = None
    dim_columns: int | None = None

    @property
    def reach(self) -> tuple[int, int]:
        return max(self.rows, self.dim_rows or 0), max(self.columns, self.dim_columns or 0)


def _scan_xml(z: zipfile.ZipFile, info: zipfile.ZipInfo, name: str, measure: bool) -> Extent | None:
    """Read one XML part as a stream: refuse a DOCTYPE or an unusual encoding; for a worksheet,
    return how far its dimension and its row and cell references reach."""
    fn = info.filename
    ext = Extent()
    prolog_done = False
    carry = b""
    head = b""
    decoder = None
    with z.open(info) as fh:
        while True:
            chunk = fh.read(CHUNK)
            if not prolog_done:
                head += chunk
                verdict = _prolog(head, len(chunk) == 0)
                if verdict is None:
                    if not chunk:
                        break
                    continue
                if verdict:
                    _fail(name, f"the part '{fn}' {verdict}: workbooks never carry one, and beamsched does not read "
                                "a file that does (it could expand or fetch content): ask for the file again")
                prolog_done = True
                if _is_utf16(head):
                    decoder = codecs.getincrementaldecoder("utf-16")("replace")
                chunk, head = head, b""
            if not chunk:
                break
            if measure:
                if decoder is not None:
                    chunk = decoder.decode(chunk).encode("utf-8")
                text = carry + chunk
                if ext.dim_rows is None:
                    d = _DIMENSION.search(text)
                    if d:
                        first = (d.group(1), d.group(2))
                        last = (d.group(3), d.group(4)) if d.group(3) is not None else first
                        ext.dim_columns = column_number(last[0].decode()) if last[0] else EXCEL_MAX_COLUMNS
                        ext.dim_rows = int(last[1]) if last[1] else EXCEL_MAX_ROWS
                # distinct values first: a sheet repeats each row number and column letter many times
                ext.rows = max([ext.rows, *map(int, set(_REF_ROW.findall(text)))])
                ext.cell_rows = max([ext.cell_rows, *map(int, set(_REF_CELL_ROW.findall(text)))])
                ext.columns = max([ext.columns, *(column_number(c.decode()) for c in set(_REF_COL.findall(text)))])
                carry = text[-64:]
    return ext if measure else None


def _is_utf16(head: bytes) -> bool:
    return head.startswith((b"\xff\xfe", b"\xfe\xff")) or (len(head) > 1 and b"\x00" in head[:4])


def _prolog(head: bytes, at_end: bool) -> str | None:
    """'' when the XML prolog is safe, a reason when it is not, None when more bytes are needed."""
    text = head
    if _is_utf16(text):
        enc = "utf-16-be" if text.startswith(b"\xfe\xff") or text[:1] == b"\x00" else "utf-16-le"
        try:
            text = text[:PROLOG_LIMIT * 2].decode(enc, "ignore").lstrip("\ufeff").encode("utf-8")
        except LookupError:  # pragma: no cover
            return "uses an unreadable text encoding"
    text = text.removeprefix(b"\xef\xbb\xbf")
    m = _ENCODING.match(text)
    if m and m.group(1).decode().lower() not in _SAFE_ENCODINGS:
        return f"declares the text encoding '{m.group(1).decode()}' (a workbook's XML is UTF-8 or UTF-16)"
    i, n = 0, len(text)
    while True:
        while i < n and text[i:i + 1] in b" \t\r\n":
            i += 1
        if i >= min(n, PROLOG_LIMIT):
            if n >= PROLOG_LIMIT:
                return f"has no root element in its first {PROLOG_LIMIT // 1024} KiB (an unusually long prolog)"
            return "" if at_end else None
        if text.startswith(b"<?", i):
            j = text.find(b"?>", i)
        elif text.startswith(b"<!--", i):
            j = text.find(b"-->", i)
            j = j + 1 if j >= 0 else j
        elif text.startswith(b"<!", i):
            return "holds a DOCTYPE declaration (a DTD, where XML entities are declared)"
        else:
            return ""  # the root element, or text that the parser will refuse
        if j < 0:
            if n >= PROLOG_LIMIT:
                return f"has no root element in its first {PROLOG_LIMIT // 1024} KiB (an unusually long prolog)"
            return "" if at_end else None
        i = j + 2


# -- CSV ---------------------------------------------------------------------------------------------
def _csv(p: Path, name: str, head: bytes, limits: Limits) -> None:
    if b"\x00" in head:
        _fail(name, "this is a binary file named .csv, not a text CSV export: ask for the schedule as .csv or .xlsx")
    rows = widest = 0
    with p.open("rb") as fh:
        for line in fh:
            rows += 1
            if len(line) > CSV_LINE_LIMIT:
                _fail(name, f"line {rows:,} of the CSV file is {len(line):,} characters long, longer than the "
                            f"{CSV_LINE_LIMIT:,} a CSV reader takes (a spreadsheet cell holds at most 32,767): "
                            "this is not a schedule export; ask for the schedule again")
            width = max(line.count(b","), line.count(b";"), line.count(b"\t")) + 1
            widest = max(widest, width)
            if rows > limits.rows:
                _fail(name, _over(f"the CSV file has more than {limits.rows:,} lines", f"{limits.rows:,} rows", "rows", int(limits.rows * 2)))
    if widest > limits.columns:
        _fail(name, _over(f"a line of the CSV file holds {widest:,} fields", f"{limits.columns:,} columns", "columns", int(widest * 1.2) + 1))


# -- the XML parser behind openpyxl ------------------------------------------------------------------------
def xml_is_defused() -> bool:
    """True when openpyxl parses workbook XML through defusedxml (entity declarations and
    external references refused): openpyxl switches to it when defusedxml is installed, unless
    the environment variable OPENPYXL_DEFUSEDXML is set to anything but 'True'."""
    import openpyxl
    from openpyxl.xml import functions

    return bool(getattr(openpyxl, "DEFUSEDXML", False)) and functions.iterparse.__module__.startswith("defusedxml")


def require_defused_xml() -> None:
    if not xml_is_defused():
        raise ScheduleError("the spreadsheet library is not using defusedxml to parse workbooks (is defusedxml "
                            "installed, and OPENPYXL_DEFUSEDXML unset?): beamsched will not read a workbook without "
                            "it; reinstall beamsched with its dependencies")


__all__ = ["Limits", "OPTIONS", "inspect_file", "ole2_names", "xml_is_defused", "require_defused_xml"]
