#!/usr/bin/env python3
"""Render beamsched's results workbook to PNG pages, as a spreadsheet application prints it.

    python tools/render_results.py                      # the bundled sample, into ./rendered
    python tools/render_results.py level3_beams.xlsx --out /tmp/level3 --gray
    python tools/render_results.py --sheet Spans --dpi 150 --first 1 --last 2
    python tools/render_results.py --annotate           # also the annotated copy of the schedule

It checks the schedule (the bundled sample when none is given) with beamsched, converts the
results workbook to PDF with LibreOffice (``soffice``, headless, with a private profile so it
never disturbs a LibreOffice the developer has open), and turns the PDF into one PNG per page
with ``pdftoppm`` (poppler). ``--gray`` renders in greyscale, to see what a black-and-white
printer makes of the colours. ``--sheet`` renders one sheet only: the copy converted has the
other sheets hidden, and LibreOffice does not print hidden sheets.

Needs only LibreOffice and poppler's ``pdftoppm`` besides beamsched itself; run it from a
checkout (the repository root is put on the import path) or with beamsched installed.
"""

from __future__ import annotations

import argparse
import os
import re
import shutil
import subprocess
import sys
import tempfile
import zipfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
SOFFICE_TIMEOUT = 600  # seconds; the Working sheet of a large schedule runs to hundreds of pages


def find_soffice(given: str | None = None) -> str | None:
    """The LibreOffice executable: ``given``, else ``soffice`` / ``libreoffice`` on the PATH."""
    for name in ([given] if given else ["soffice", "libreoffice"]):
        found = shutil.which(name) if name else None
        if found:
            return found
    return None


def convert(soffice: str, source: Path, target_format: str, outdir: Path, timeout: float = SOFFICE_TIMEOUT,
            profile: Path | None = None) -> subprocess.CompletedProcess:
    """``soffice --headless --convert-to FORMAT`` with a private user profile.

    A private profile keeps parallel or repeated runs from colliding with each other or with
    a LibreOffice the user has open. Raises ``RuntimeError`` when LibreOffice fails or times out.
    """
    outdir.mkdir(parents=True, exist_ok=True)
    own = profile is None
    prof = Path(tempfile.mkdtemp(prefix="beamsched-lo-")) if own else profile
    try:
        cmd = [soffice, f"-env:UserInstallation={prof.resolve().as_uri()}", "--headless", "--norestore",
               "--convert-to", target_format, "--outdir", str(outdir), str(source)]
        try:
            done = subprocess.run(cmd, capture_output=True, text=True, timeout=timeout, check=False)
        except subprocess.TimeoutExpired as exc:
            raise RuntimeError(f"LibreOffice did not finish converting {source.name} within {timeout:g} s") from exc
        if done.returncode != 0:
            raise RuntimeError(f"LibreOffice could not convert {source.name} (exit {done.returncode}): "
                               f"{(done.stderr or done.stdout).strip()[-500:]}")
        return done
    finally:
        if own:
            shutil.rmtree(prof, ignore_errors=True)


def only_sheet(source: Path, sheet: str, target: Path) -> Path:
    """A copy of the workbook ``source`` in which every sheet but ``sheet`` is hidden (and
    ``sheet`` is the active one). Only ``xl/workbook.xml`` changes; every sheet's own part is
    copied byte for byte, so the application reads the same cells, widths and print set-up."""
    with zipfile.ZipFile(source) as z:
        book = z.read("xl/workbook.xml").decode("utf-8")
        tags = re.findall(r"<sheet\b[^>]*/>", book)
        names = [re.search(r'name="([^"]*)"', t).group(1) for t in tags]
        wanted = sheet.replace("&", "&amp;")
        if wanted not in names:
            raise SystemExit(f"render_results: no sheet named '{sheet}'; the sheets are {', '.join(names)}")
        index = names.index(wanted)
        for i, tag in enumerate(tags):
            new = re.sub(r'\sstate="[^"]*"', "", tag)
            if i != index:
                new = new.replace("<sheet ", '<sheet state="hidden" ', 1)
            book = book.replace(tag, new, 1)
        book = re.sub(r"\s(?:activeTab|firstSheet)=\"\d+\"", "", book)
        book = book.replace("<workbookView ", f'<workbookView activeTab="{index}" firstSheet="{index}" ', 1)
        with zipfile.ZipFile(target, "w", zipfile.ZIP_DEFLATED) as out:
            for info in z.infolist():
                data = book.encode("utf-8") if info.filename == "xl/workbook.xml" else z.read(info.filename)
                out.writestr(info, data)
    return target


def pdf_pages(pdf: Path) -> int:
    """Pages in a PDF that LibreOffice wrote (its page objects are plain dictionaries)."""
    return len(re.findall(rb"/Type\s*/Page(?![a-zA-Z])", pdf.read_bytes()))


def to_png(pdf: Path, outdir: Path, dpi: int, gray: bool, first: int | None, last: int | None,
           prefix: str = "page") -> list[Path]:
    """One PNG per page with pdftoppm; returns the files made, in page order."""
    pdftoppm = shutil.which("pdftoppm")
    if pdftoppm is None:
        raise SystemExit("render_results: pdftoppm (poppler-utils) is not installed")
    cmd = [pdftoppm, "-png", "-r", str(dpi)]
    if gray:
        cmd.append("-gray")
    if first:
        cmd += ["-f", str(first)]
    if last:
        cmd += ["-l", str(last)]
    cmd += [str(pdf), str(outdir / prefix)]
    subprocess.run(cmd, check=True, timeout=SOFFICE_TIMEOUT)
    return sorted(outdir.glob(f"{prefix}-*.png"))


def check_schedule(schedule: Path, outdir: Path, annotate: bool) -> tuple[Path, Path | None]:
    """Run ``beamsched check`` on the schedule; returns the results workbook (and the annotated copy)."""
    if str(ROOT) not in sys.path and (ROOT / "beamsched").is_dir():
        sys.path.insert(0, str(ROOT))
    from beamsched.cli import make_plan, run

    results = outdir / f"{schedule.stem}_beamsched.xlsx"
    plan = make_plan(str(schedule), str(results), None, None, annotate, None)
    with open(os.devnull, "w", encoding="utf-8") as quiet:
        outcome = run(plan, out=quiet, err=sys.stderr)
    written = dict(outcome.written)
    if "Results workbook" not in written:
        raise SystemExit("render_results: beamsched could not write the results workbook")
    return written["Results workbook"], written.get("Annotated copy")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description="Render beamsched's results workbook to PNG pages through "
                                             "LibreOffice, to see what a reader will see.")
    ap.add_argument("schedule", nargs="?", help="the schedule to check (default: the bundled sample)")
    ap.add_argument("--out", default="rendered", help="folder for the workbook, the PDF and the PNG pages "
                                                       "(default: ./rendered)")
    ap.add_argument("--dpi", type=int, default=80, help="resolution of the PNG pages (default 80)")
    ap.add_argument("--gray", action="store_true", help="render the pages in greyscale")
    ap.add_argument("--sheet", help="render only this sheet (for example Spans or Working)")
    ap.add_argument("--first", type=int, help="first page to render (default: the first)")
    ap.add_argument("--last", type=int, help="last page to render (default: the last)")
    ap.add_argument("--annotate", action="store_true", help="also render the annotated copy of the schedule")
    ap.add_argument("--soffice", help="the LibreOffice executable (default: soffice on the PATH)")
    ap.add_argument("--timeout", type=float, default=SOFFICE_TIMEOUT,
                    help=f"seconds allowed for each conversion (default {SOFFICE_TIMEOUT})")
    args = ap.parse_args(argv)

    soffice = find_soffice(args.soffice)
    if soffice is None:
        print("render_results: LibreOffice (soffice) is not installed or not on the PATH", file=sys.stderr)
        return 2
    out = Path(args.out)
    out.mkdir(parents=True, exist_ok=True)
    if args.schedule:
        schedule = Path(args.schedule)
    else:
        if str(ROOT) not in sys.path and (ROOT / "beamsched").is_dir():
            sys.path.insert(0, str(ROOT))
        from beamsched.schedule.samples import sample_path
        schedule = Path(sample_path())
    results, annotated = check_schedule(schedule, out, args.annotate)
    books = [("results", results)] + ([("annotated", annotated)] if annotated else [])
    for kind, book in books:
        source = book
        if args.sheet and kind == "results":
            source = only_sheet(book, args.sheet, out / f"{book.stem}-{args.sheet.replace(' ', '_')}.xlsx")
        convert(soffice, source, "pdf", out, args.timeout)
        pdf = out / f"{source.stem}.pdf"
        pages_dir = out / f"{source.stem}-pages"
        shutil.rmtree(pages_dir, ignore_errors=True)
        pages_dir.mkdir()
        pngs = to_png(pdf, pages_dir, args.dpi, args.gray, args.first, args.last)
        print(f"{kind}: {source.name} -> {pdf.name}, {pdf_pages(pdf)} pages; {len(pngs)} PNG pages in {pages_dir}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
