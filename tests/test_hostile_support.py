"""Builders for the bad-input corpus: every hostile or broken file is made here, by code, at
test time (no binary file is checked in). This module holds no tests.

Formats, as the builders write them:
* zip packages: PKWARE APPNOTE.TXT (central directory 4.3.12, end record 4.3.16), through
  Python's zipfile, with the few fields a test corrupts patched by offset;
* OLE2 compound files: [MS-CFB] version 3 (512-byte sectors, one FAT sector, the directory,
  every stream padded to 4096 bytes or more so that no mini stream is needed);
* password-protected workbooks: [MS-OFFCRYPTO] 2.3.4: an OLE2 file holding the streams
  ``EncryptionInfo`` and ``EncryptedPackage`` (the contents here are filler: the reader must
  refuse on the structure, never try a password).
"""

from __future__ import annotations

import io
import struct
import zipfile
from collections.abc import Callable
from pathlib import Path

from openpyxl import Workbook

HEADER = ["Mark", "Span no.", "Type", "bw (mm)", "h (mm)", "Span (m)", "Left end", "Right end", "Bottom bars",
          "Top bars", "Stirrups", "f'c (MPa)", "fy (MPa)", "Mf+ (kN·m)", "Vf (kN)", "Exposure", "Agg (mm)",
          "Cover (mm)"]
# Passes with room to spare: 4-25M in 400 x 700 gives Mr+ about 400 kN·m (CSA A23.3-19 cl. 10.1.7,
# worked by the engine; the CLI tests hold the same row).
GOOD = ["B10", 1, "Rect", 400, 700, 6.0, "simple", "simple", "4-25M", "2-15M", "10M@200", 30, 400, 250, 150,
        "interior", 20, 40]
# Fails: 3-20M in 300 x 500 under Mf+ = 280 kN·m (Mr+ about 124 kN·m, cl. 10.1.7).
FAILING = ["B12", 1, "Rect", 300, 500, 6.0, "simple", "simple", "3-20M", "2-15M", "10M@200", 30, 400, 280, 100,
           "interior", 20, 40]


def row(mark: str, **changes) -> list:
    """GOOD with a new mark and some cells changed (by header label)."""
    r = list(GOOD)
    r[0] = mark
    for label, value in changes.items():
        r[HEADER.index(label)] = value
    return r


def workbook(path: Path, rows: list[list], *, header: list[str] | None = None, sheet: str = "Beams",
             extra_sheets: int = 0, edit: Callable | None = None) -> Path:
    wb = Workbook()
    ws = wb.active
    ws.title = sheet
    ws.append(header or HEADER)
    for r in rows:
        ws.append(r)
    for i in range(extra_sheets):
        wb.create_sheet(f"Notes {i + 1}")["A1"] = "notes"
    if edit:
        edit(wb)
    wb.save(path)
    return path


def members(path: Path) -> dict[str, bytes]:
    with zipfile.ZipFile(path) as z:
        return {i.filename: z.read(i) for i in z.infolist()}


def rezip(src: Path, dst: Path, change: dict[str, bytes | None] | None = None,
          add: dict[str, bytes] | None = None, method: int = zipfile.ZIP_DEFLATED) -> Path:
    """A copy of a zip package with some parts replaced (None: removed) or added."""
    change = change or {}
    with zipfile.ZipFile(src) as zin, zipfile.ZipFile(dst, "w", method) as zout:
        for info in zin.infolist():
            if info.filename in change:
                if change[info.filename] is not None:
                    zout.writestr(info.filename, change[info.filename])
                continue
            zout.writestr(info.filename, zin.read(info))
        for name, data in (add or {}).items():
            zout.writestr(name, data)
    return dst


def zip_of(parts: dict[str, bytes]) -> bytes:
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as z:
        for name, data in parts.items():
            z.writestr(name, data)
    return buf.getvalue()


def central_entries(data: bytes) -> list[int]:
    """Offsets of the central directory headers (signature PK\\x01\\x02, APPNOTE 4.3.12)."""
    out, at = [], data.find(b"PK\x01\x02")
    while at >= 0:
        out.append(at)
        at = data.find(b"PK\x01\x02", at + 4)
    return out


def patch_central(data: bytes, member: str, offset: int, fmt: str, value: int) -> bytes:
    """Patch one field of a member's central directory header (4.3.12: +8 flags, +24 size)."""
    buf = bytearray(data)
    for at in central_entries(data):
        n = struct.unpack_from("<H", buf, at + 28)[0]
        if bytes(buf[at + 46:at + 46 + n]).decode() == member:
            struct.pack_into(fmt, buf, at + offset, value)
            return bytes(buf)
    raise KeyError(member)


# -- OLE2 ---------------------------------------------------------------------------------------
FREESECT, ENDOFCHAIN, FATSECT, NOSTREAM = 0xFFFFFFFF, 0xFFFFFFFE, 0xFFFFFFFD, 0xFFFFFFFF


def cfb(streams: dict[str, bytes]) -> bytes:
    """A version-3 OLE2 compound file holding ``streams`` in its root storage ([MS-CFB])."""
    ssize = 512
    names = ["Root Entry", *streams]
    n_dir = (len(names) + 3) // 4
    datas = [d + b"\x00" * (-len(d) % ssize) for d in (s.ljust(4096, b"\x00") for s in streams.values())]
    fat = [FATSECT]
    dir_start = len(fat)
    fat += [dir_start + i + 1 for i in range(n_dir - 1)] + [ENDOFCHAIN]
    starts = []
    for d in datas:
        k = len(d) // ssize
        starts.append(len(fat))
        fat += [len(fat) + i + 1 for i in range(k - 1)] + [ENDOFCHAIN]
    assert len(fat) <= ssize // 4, "one FAT sector is enough for a test file"
    fat += [FREESECT] * (ssize // 4 - len(fat))
    header = bytearray(512)
    header[0:8] = b"\xd0\xcf\x11\xe0\xa1\xb1\x1a\xe1"
    struct.pack_into("<HHHHH", header, 0x18, 0x3E, 3, 0xFFFE, 9, 6)
    struct.pack_into("<LLLLLLLLL", header, 0x28, 0, 1, dir_start, 0, 4096, ENDOFCHAIN, 0, ENDOFCHAIN, 0)
    struct.pack_into("<109L", header, 0x4C, 0, *([FREESECT] * 108))
    entries = bytearray()
    for i, name in enumerate(names):
        e = bytearray(128)
        raw = name.encode("utf-16-le") + b"\x00\x00"
        e[0:len(raw)] = raw
        right = i + 1 if 0 < i < len(names) - 1 else NOSTREAM
        child = 1 if i == 0 and len(names) > 1 else NOSTREAM
        struct.pack_into("<HBB3L", e, 64, len(raw), 5 if i == 0 else 2, 1, NOSTREAM, right, child)
        start, size = (ENDOFCHAIN, 0) if i == 0 else (starts[i - 1], len(datas[i - 1]))
        struct.pack_into("<LQ", e, 116, start, size)
        entries += e
    entries += b"\x00" * (n_dir * ssize - len(entries))
    return bytes(header) + struct.pack(f"<{ssize // 4}L", *fat) + bytes(entries) + b"".join(datas)


def legacy_xls() -> bytes:
    """What an Excel 97-2003 file is on the outside: OLE2 with a 'Workbook' stream (BIFF8 inside;
    a BOF record here, the rest filler)."""
    bof = struct.pack("<HHHHLL", 0x0809, 16, 0x0600, 0x0005, 0, 0)  # [MS-XLS] 2.4.21 BOF
    return cfb({"Workbook": bof, "\x05SummaryInformation": b"\xfe\xff"})


def encrypted_workbook() -> bytes:
    """The outside of a password-protected .xlsx ([MS-OFFCRYPTO] 2.3.4.5: agile encryption):
    EncryptionInfo (version 4.4) and EncryptedPackage (a size, then the ciphertext)."""
    info = struct.pack("<HHL", 4, 4, 0x40) + b'<?xml version="1.0"?><encryption/>'
    package = struct.pack("<Q", 1234) + bytes(range(256)) * 8
    return cfb({"EncryptionInfo": info, "EncryptedPackage": package, "\x06DataSpaces": b""})
