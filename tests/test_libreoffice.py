"""Every workbook beamsched writes, as a real spreadsheet application reads it (LibreOffice Calc).

The other report tests read the files back with openpyxl, a library like the one that wrote
them; these open them in LibreOffice (headless) and judge LibreOffice's own reading: its PDF
(what a printed page holds), its CSV export of each sheet (the values as it displays them) and,
for the template, a file it saved. Each file is converted once per test session.

Skipped, with the reason, where LibreOffice (``soffice``) is not installed; ``pdftotext``
(poppler-utils) is needed for the checks that read the printed text. CI installs both.
"""

from __future__ import annotations

import csv
import importlib.util
import json
import math
import re
import shutil
import subprocess
from pathlib import Path

import pytest
from openpyxl import load_workbook

from beamsched.cli import make_plan, run
from beamsched.report import palette as P
from beamsched.report.table import value_header
from beamsched.schedule import read_schedule
from beamsched.schedule.samples import sample_path

SOFFICE = shutil.which("soffice") or shutil.which("libreoffice")
PDFTOTEXT = shutil.which("pdftotext")
TIMEOUT = 300  # seconds for one conversion; the sample's results print to about 220 pages

pytestmark = pytest.mark.skipif(SOFFICE is None, reason="LibreOffice (soffice) is not installed: the "
                                "spreadsheet-application checks need it (apt-get install libreoffice-calc-nogui)")
needs_pdftotext = pytest.mark.skipif(PDFTOTEXT is None, reason="pdftotext (poppler-utils) is not installed")

# Every sheet to its own CSV (the 12th token, -1, in LibreOffice 7.2 and later), UTF-8 (76),
# comma-separated (44), text in double quotes (34), cell contents as shown (the 9th token).
CSV_FILTER = "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,true,false,false,-1"


def _tool():
    spec = importlib.util.spec_from_file_location(
        "render_results", Path(__file__).resolve().parent.parent / "tools" / "render_results.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


TOOL = _tool()


@pytest.fixture(scope="module")
def lo(tmp_path_factory):
    """A converter with its own LibreOffice profile (parallel and repeated runs never collide)."""
    profile = tmp_path_factory.mktemp("lo-profile")

    def convert(source: Path, fmt: str, outdir: Path) -> Path:
        TOOL.convert(SOFFICE, source, fmt, outdir, TIMEOUT, profile)
        return outdir

    return convert


@pytest.fixture(scope="module")
def sample_run(tmp_path_factory):
    """beamsched check of the bundled sample: results workbook, JSON and the annotated copy."""
    folder = tmp_path_factory.mktemp("sample")
    schedule = folder / Path(sample_path()).name
    shutil.copyfile(sample_path(), schedule)
    plan = make_plan(str(schedule), str(folder / "results.xlsx"), str(folder / "results.json"), None, True, None)
    with open(folder / "console.txt", "w", encoding="utf-8") as out:
        outcome = run(plan, out=out, err=out)
    written = dict(outcome.written)
    doc = json.loads((folder / "results.json").read_text(encoding="utf-8"))
    return {"results": written["Results workbook"], "annotated": written["Annotated copy"], "json": doc,
            "folder": folder}


@pytest.fixture(scope="module")
def results_pdf(sample_run, lo):
    out = lo(sample_run["results"], "pdf", sample_run["folder"] / "pdf")
    return out / "results.pdf"


@pytest.fixture(scope="module")
def spans_pdf(sample_run, lo):
    """The Spans sheet alone: a copy whose other sheets are hidden (LibreOffice prints no hidden sheet)."""
    folder = sample_run["folder"] / "spans"
    folder.mkdir()
    copy = TOOL.only_sheet(sample_run["results"], "Spans", folder / "spans_only.xlsx")
    lo(copy, "pdf", folder)
    return folder / "spans_only.pdf"


def _csv_sheets(folder: Path, stem: str) -> dict[str, list[list[str]]]:
    out = {}
    for f in sorted(folder.glob(f"{stem}-*.csv")):
        with open(f, encoding="utf-8", newline="") as fh:
            out[f.stem[len(stem) + 1:]] = list(csv.reader(fh))
    return out


@pytest.fixture(scope="module")
def results_csv(sample_run, lo):
    folder = lo(sample_run["results"], CSV_FILTER, sample_run["folder"] / "csv")
    sheets = _csv_sheets(folder, "results")
    if not sheets and (folder / "results.csv").exists():
        pytest.skip("this LibreOffice exports only the first sheet to CSV (the all-sheets option needs 7.2 or later)")
    return sheets


def _pages_text(pdf: Path) -> list[str]:
    text = subprocess.run([PDFTOTEXT, "-layout", str(pdf), "-"], capture_output=True, text=True, check=True,
                          timeout=TIMEOUT).stdout
    return [p for p in text.split("\f") if p.strip()]


# -- the results workbook -----------------------------------------------------------------------
SHEET_TITLES = {"Overview": "Overview", "Spans": "Results by span", "Working": "Calculation working",
                "Input problems": "Input problems", "About": "About"}  # the page header's centre


def _sheet_of_page(page: str) -> str | None:
    head = "\n".join(page.splitlines()[:4])
    for sheet, title in SHEET_TITLES.items():
        if re.search(rf"(^|\s{{2,}}){re.escape(title)}(\s{{2,}}|$)", head, re.M):
            return sheet
    return None


def test_results_workbook_converts_to_pdf(results_pdf):
    assert results_pdf.read_bytes()[:5] == b"%PDF-"
    assert TOOL.pdf_pages(results_pdf) >= len(SHEET_TITLES)


@needs_pdftotext
def test_every_printed_page_carries_its_sheet_title_and_the_caution_is_printed(results_pdf):
    pages = _pages_text(results_pdf)
    assert len(pages) == TOOL.pdf_pages(results_pdf)
    sheets = [_sheet_of_page(p) for p in pages]
    assert None not in sheets, [i + 1 for i, s in enumerate(sheets) if s is None]
    assert set(sheets) == set(SHEET_TITLES)
    assert sheets[0] == "Overview" and sheets.count("Overview") == 1  # the front page fits one page
    words = " ".join(" ".join(p.split()) for p in pages)
    assert "engineer of record must review every result" in words  # beamsched.CAUTION, as printed


def test_spans_sheet_prints_in_a_few_pages(spans_pdf, sample_run):
    pages = TOOL.pdf_pages(spans_pdf)
    spans = len(sample_run["json"]["beams"])
    # one page wide on Tabloid with rows of up to a dozen lines: at least 8 spans a page (the
    # sample's 80 rows print on 8 pages); a table split across pages would double the count
    assert 1 <= pages <= math.ceil(spans / 8)


@needs_pdftotext
def test_spans_sheet_is_one_page_wide(spans_pdf, sample_run):
    pages = _pages_text(spans_pdf)
    assert pages and all(_sheet_of_page(p) == "Spans" for p in pages)
    for i, page in enumerate(pages, start=1):
        # the header row repeats on each page, and its first and last columns are on every page
        assert re.search(r"\bMark\b", page) and "Notes (clause named)" in page, f"Spans page {i}"
    marks = {b["mark"] for b in sample_run["json"]["beams"] if b["mark"]}
    printed = " ".join(pages)
    assert all(re.search(rf"\b{re.escape(m)}\b", printed) for m in marks)


@needs_pdftotext
def test_working_sheet_pages_name_their_span_and_stay_bounded(results_pdf, sample_run):
    pages = [p for p in _pages_text(results_pdf) if _sheet_of_page(p) == "Working"]
    beams = sample_run["json"]["beams"]
    labels = [b["label"] for b in beams]
    for i, page in enumerate(pages, start=1):
        assert any(label in page for label in labels), f"Working page {i} does not say whose working it is"
    checked = sum(1 for b in beams if b["checks"])
    # about 240 rows of working a span at about 120 rows a page (Tabloid, one page wide): under
    # three pages a span; more would mean the rows no longer fit (or the sheet prints in strips)
    assert 1 <= len(pages) <= 3 * checked


def _shown(v: float | None, decimals: int) -> str:
    return "—" if v is None else f"{v:,.{decimals}f}"


def _table(rows: list[list[str]]) -> tuple[dict[str, int], list[list[str]]]:
    head = {h: i for i, h in enumerate(rows[0])}
    return head, rows[1:]


def test_spans_csv_holds_the_json_results_as_displayed(results_csv, sample_run):
    head, rows = _table(results_csv["Spans"])
    beams = sample_run["json"]["beams"]
    assert len(rows) == len(beams)
    ids = {c["id"]: c["label"] for b in beams for c in b["checks"]}
    for row, b in zip(rows, beams, strict=True):
        cell = {h: row[i] for h, i in head.items()}
        where = f"Spans, {b['label']}"
        assert cell["Mark"] == b["mark"], where
        assert cell["Row"] == str(b["row"]), where
        assert cell["Status"] == P.SPAN_STATUS[P_STATUS[b["status"]]].word, where
        u = b["utilisation"]
        if b["checks"]:
            assert cell["Max\nutilisation"] == ("∞" if u is None else f"{u:.3f}"), where
        for cid, label in ids.items():
            mine = [c for c in b["checks"] if c["id"] == cid]
            numbers = [c["utilisation"] for c in mine if c["utilisation"] is not None]
            shown = cell[f"{label}\nutilisation"]
            if numbers:
                assert shown == f"{max(numbers):.3f}", (where, label)
            elif not mine:
                assert shown == "—", (where, label)
            else:
                assert shown in ("pass", "FAIL", "not checked"), (where, label, shown)
        for key, v in b["values"].items():
            header = value_header(key).replace(" (", "\n(")
            if header in head and isinstance(v, (int, float)):
                assert cell[header] == _shown(v, 1), (where, key)


P_STATUS = {s.value: s for s in P.SPAN_STATUS}


def test_overview_csv_counts_match_the_json(results_csv, sample_run):
    rows = results_csv["Overview"]
    counts = {}
    for r in rows:
        if len(r) > 1 and r[0] in {st.word for st in P.SPAN_STATUS.values()} and r[1].isdigit():
            counts.setdefault(r[0], int(r[1]))  # the first table: the counts (the legend follows)
    beams = sample_run["json"]["beams"]
    for status, st in P.SPAN_STATUS.items():
        assert counts[st.word] == sum(1 for b in beams if b["status"] == status.value)


def test_working_csv_results_match_the_json_checks(results_csv, sample_run):
    head, rows = _table(results_csv["Working"])
    results = {}
    for r in rows:
        if len(r) > 4 and r[head["Symbol"]] == "utilisation":
            results.setdefault((r[head["Span"]], r[head["Check"]], r[head["At"]]), []).append(r)
    n = 0
    for b in sample_run["json"]["beams"]:
        for c in b["checks"]:
            got = results[(b["label"], c["label"], c["location"] or "")].pop(0)
            assert got[head["Value"]] == ("—" if c["utilisation"] is None else f"{c['utilisation']:.3f}"), c
            assert got[head["Unit"]] == P.CHECK_STATUS[CHECK_STATUS[c["status"]]].word, c
            assert got[head["Clause"]] == c["clause"]
            n += 1
    assert n > 0 and not any(results.values())  # every result line is a check of the JSON, and back


CHECK_STATUS = {s.value: s for s in P.CHECK_STATUS}


def test_problems_csv_lists_every_problem_of_the_json(results_csv, sample_run):
    head, rows = _table(results_csv["Input problems"])
    doc = sample_run["json"]
    expected = [(str(p["row"] if p["row"] is not None else b["row"]), p["message"])
                for b in doc["beams"] for p in b["problems"]]
    got = [(r[head["Row"]], r[head["Reason and what was expected"]]) for r in rows]
    assert len(got) == len(doc["problems"]) + len(expected)
    assert set(expected) <= set(got)


# -- the annotated copy -------------------------------------------------------------------------
def test_annotated_copy_converts_and_carries_the_json_results(sample_run, lo):
    annotated = sample_run["annotated"]
    pdf_dir = lo(annotated, "pdf", sample_run["folder"] / "annotated-pdf")
    pdf = pdf_dir / f"{annotated.stem}.pdf"
    assert pdf.read_bytes()[:5] == b"%PDF-" and TOOL.pdf_pages(pdf) >= 2
    folder = lo(annotated, CSV_FILTER, sample_run["folder"] / "annotated-csv")
    sheets = _csv_sheets(folder, annotated.stem)
    doc = sample_run["json"]
    assert "beamsched check" in sheets  # the notice sheet, first
    grid = sheets[doc["input"]["sheet"]]
    header_at = next(i for i, r in enumerate(grid) if "beamsched status" in r)
    head = {h: i for i, h in enumerate(grid[header_at])}
    seen = 0
    for b in doc["beams"]:
        row = grid[b["row"] - 1]
        where = f"annotated copy, row {b['row']}"

        def at(name: str, row=row) -> str:
            return row[head[name]]

        assert at("beamsched status") == P.SPAN_STATUS[P_STATUS[b["status"]]].word, where
        u = b["utilisation"]
        assert at("beamsched max utilisation") == ("—" if u is None and not b["checks"] else
                                                   "∞" if u is None else f"{u:.3f}"), where
        for name, key in (("beamsched Mr+ (kN·m)", "Mr_pos_kNm"), ("beamsched Mr− (kN·m), smaller end", "Mr_neg_kNm"),
                          ("beamsched Vr (kN), smaller end", "Vr_kN")):
            assert at(name) == _shown(b["values"].get(key), 1), (where, key)
        seen += 1
    assert seen == len(doc["beams"])


# -- the template -------------------------------------------------------------------------------
def _fill_template(path: Path) -> None:
    """Two spans typed into the blank template, choosing from its drop-down lists."""
    wb = load_workbook(path)
    ws = wb["Schedule"]
    heads = {str(c.value).split(" (")[0].split("\n")[0]: c.column for c in ws[3] if c.value}
    rows = [
        {"Mark": "B1", "Span no.": 1, "Type": "T", "bw": 350, "h": 650, "hf": 200, "Span": 8.4,
         "Left end": "simple", "Right end": "continuous", "Bottom bars": "4-25M", "Top bars L": "2-15M",
         "Top bars R": "4-25M / 2-25M", "Stirrups": "10M@200", "Mf+": 310, "Mf- R": 290, "Vf L": 180, "Vf R": 240},
        {"Mark": "B2", "Span no.": 1, "Type": "Rect", "bw": 300, "h": 500, "Span": 6.0, "Left end": "simple",
         "Right end": "simple", "Bottom bars": "3-20M", "Stirrups": "10M@250", "Mf+": 120, "Vf L": 95, "Vf R": 95},
    ]
    for i, values in enumerate(rows, start=4):
        for name, v in values.items():
            col = heads.get(name)
            assert col is not None, f"template has no '{name}' column: {sorted(heads)}"
            ws.cell(i, col, v)
    ps = wb["Parameters"]
    for r in ps.iter_rows(min_row=2):
        if r[0].value and str(r[0].value).lower().startswith("project"):
            r[1].value = "Test tower"
            break
    wb.save(path)


def _validations(path: Path) -> set[tuple]:
    wb = load_workbook(path)
    out = set()
    for ws in wb.worksheets:
        for dv in ws.data_validations.dataValidation:
            formula = (dv.formula1 or "").lstrip("=").replace("$", "")
            cells = frozenset(c for rng in str(dv.sqref).split() for c in _cells(rng))
            out.add((ws.title, dv.type, formula, bool(dv.showErrorMessage), cells))
    return out


def _cells(rng: str) -> list[str]:
    from openpyxl.utils.cell import range_boundaries
    c1, r1, c2, r2 = range_boundaries(rng)
    return [f"{c}:{r}" for c in range(c1, c2 + 1) for r in range(r1, r2 + 1)]


def test_template_survives_a_round_trip_through_libreoffice(tmp_path, lo):
    from beamsched.schedule.template import write_template

    original = tmp_path / "schedule.xlsx"
    write_template(original)
    _fill_template(original)
    out = lo(original, "xlsx:Calc MS Excel 2007 XML", tmp_path / "saved")
    saved = out / "schedule.xlsx"
    pdf = lo(original, "pdf", tmp_path / "pdf") / "schedule.pdf"
    assert pdf.read_bytes()[:5] == b"%PDF-"

    a, b = read_schedule(original), read_schedule(saved)
    assert len(a.rows) == 2 and all(hasattr(r, "bw") for r in a.rows), a.problems
    assert b.rows == a.rows  # the same spans, read the same way
    assert b.defaults == a.defaults and b.project == a.project and b.code == a.code
    assert [p.message for p in b.problems] == [p.message for p in a.problems]
    assert a.project  # the Parameters sheet was read (the project name typed in)
    # the drop-down lists: the same lists on the same cells, in the Schedule and the Parameters
    before, after = _validations(original), _validations(saved)
    assert before and after == before
    hidden = load_workbook(saved)["Lists"].sheet_state
    assert hidden == "hidden"  # the example lists stay out of the way
