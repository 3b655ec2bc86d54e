"""The results workbook (xlsxwriter, values only).

Sheets, in order:

* ``Overview``: title block, counts, a chart of utilisation, the worst spans, the legend;
* ``Spans``: one row per span in schedule order (the results table);
* ``Working``: the calculation trace of every span, laid out to be redone by hand;
* ``Input problems``: every row, column and value that could not be read, and why;
* ``About``: policies, defaults, version and the caution.

The workbook is written in xlsxwriter's constant-memory mode (row by row), so a schedule of
tens of thousands of spans costs little memory; nothing here merges cells for that reason.
"""

from __future__ import annotations

import contextlib
import gc
import math
import os
import textwrap
from collections.abc import Iterator
from pathlib import Path

from .. import CAUTION
from ..model import BeamInput, BeamStatus, CheckResult, CheckStatus
from . import palette as P
from .atomic import OutputError, atomic_path
from .fit import LINE_HEIGHT, LineCounter, wrapped_lines
from .policies import policies_for
from .table import LOCATION_WORDS, TITLE_FIELDS, Report, SpanRow, check_display, value_header, value_unit

SHEETS = ("Overview", "Spans", "Working", "Input problems", "About")
# What the Overview says of the Working sheet, by Report.working (beamsched check --working)
WORKING_NOTE = {
    "all": "The Working sheet holds every span's calculation, each row headed by its span: "
           "filter its Span column to see or print the working of one span.",
    "flagged": "The Working sheet holds the calculation of the spans that fail, are incomplete or could not be "
               "checked, each row headed by its span (passing spans left out: --working flagged).",
    "none": "The Working sheet was left empty on request (--working none): run again with --working all "
            "for every span's calculation.",
}
MAX_ROWS = 1_048_576  # rows in one worksheet (Excel's limit)
TITLE = "Concrete beam schedule check"
# The workbook's own default font (the "Normal" style) is the one every cell uses, 10-point Arial.
# Column widths in a workbook are counted in digits of that font, so with it a spreadsheet
# application lays the columns out alike whether or not it has the font xlsxwriter would
# otherwise name (Calibri, which LibreOffice replaces by a wider face where it is missing).
# 17 px (12.75 pt) is the row height and 64 px the column width that go with 10-point Arial.
DEFAULT_FONT = {"default_format_properties": {"font_name": "Arial", "font_size": 10},
                "default_row_height": 17, "default_column_width": 64}


def _default_font() -> dict:
    """DEFAULT_FONT, a fresh copy for each workbook: xlsxwriter adds to the properties it is given
    (``theme_font_name``), and a workbook made from properties an earlier one changed has another
    default font entry (the theme's font scheme) than the first one written in the process."""
    return {k: dict(v) if isinstance(v, dict) else v for k, v in DEFAULT_FONT.items()}


MAX_LINES = 31  # the tallest row a worksheet allows is 409 pt: 31 lines of 10-point Arial


class Formats:
    """xlsxwriter formats built once per look (swatch + number format + extras)."""

    def __init__(self, wb):
        self.wb = wb
        self._cache: dict[tuple, object] = {}

    def get(self, swatch: P.Swatch | None = None, num: str | None = None, **extra):
        key = (swatch, num, tuple(sorted(extra.items())))
        if key not in self._cache:
            props: dict = {"font_name": "Arial", "font_size": 10, "valign": "top"}
            if swatch is not None:
                props.update(bg_color=swatch.fill, font_color=swatch.text, bold=swatch.bold,
                             italic=swatch.italic, pattern=1)
            if num is not None:
                props["num_format"] = num
            props.update(extra)
            self._cache[key] = self.wb.add_format(props)
        return self._cache[key]

    def header(self):
        return self.get(P.HEADER, text_wrap=True, border=1, border_color="#FFFFFF", valign="bottom")


def sig_format(v: float) -> str:
    """A number format showing about four significant figures (thousands separated)."""
    if v == 0 or not math.isfinite(v):
        return "0"
    mag = math.floor(math.log10(abs(v)))
    if mag < -5:
        return "0.000E+00"
    dec = max(0, 3 - mag)
    return "#,##0" if dec == 0 else "#,##0." + "0" * dec


def sig_text(v: float | None) -> str:
    if v is None:
        return "—"
    if not math.isfinite(v):
        return "∞"
    fmt = sig_format(v)
    if "E" in fmt:
        return f"{v:.3e}"
    dec = fmt.split(".")[1].count("0") if "." in fmt else 0
    return f"{v:,.{dec}f}"


def _hf_escape(text: str) -> str:
    return text.replace("&", "&&")


def _lines(text: str, width: float, bold: bool = False, indent: int = 0) -> int:
    """Wrapped lines a text takes in a column ``width`` digits wide (10-point Arial)."""
    return wrapped_lines(text, width, bold, indent)


def section_text(inp: BeamInput | None) -> str:
    if inp is None:
        return ""
    shape = {"rect": "Rect"}.get(inp.shape, inp.shape)
    text = f"{shape} {inp.bw:g} × {inp.h:g}"
    if inp.hf is not None:
        text += f", hf {inp.hf:g}"
    if inp.bf is not None:
        text += f", bf {inp.bf:g} sched."
    text += f"\nf'c {inp.fc:g}, fy {inp.fy:g}"
    if inp.span is not None:
        text += f"\nspan {inp.span / 1000:g} m"
    text += f", ends {inp.left_end}/{inp.right_end}"
    return text


def defaults_text(assumed: tuple[str, ...] | list[str]) -> str:
    """The defaults a span relied on, for its cell in the results table: those taken from the same
    source are listed once with it ("f'c = 35 MPa; fy = 400 MPa from the Parameters sheet (row
    blank)"), so the cell stays short when every span takes its materials from the Parameters."""
    groups: dict[str, list[str]] = {}
    for item in assumed:
        what, sep, source = item.rpartition(" from ")
        key = f" from {source}" if sep and what else ""
        groups.setdefault(key, []).append(what if key else item)
    return "\n".join("; ".join(items) + key for key, items in groups.items())


def understood_text(row: SpanRow) -> str:
    return "\n".join(f"{k}: {v}" for k, v in row.result.understood.items())


def _cell_writers(ws):
    """``write_string`` and ``write_number`` of a worksheet, for the loops that write a million
    rows: xlsxwriter's own undecorated methods where it has them (the public ones only add the
    conversion of "A1" cell names, which these loops never pass), else the public ones."""
    put, put_number = getattr(ws, "_write_string", None), getattr(ws, "_write_number", None)
    if callable(put) and callable(put_number):
        return put, put_number
    return ws.write_string, ws.write_number


FORGET_EVERY_SPANS, FORGET_EVERY_ROWS = 64, 1024  # how often the Working and Spans loops prune


def _forget_written_rows(ws) -> None:
    """Let xlsxwriter forget the heights of the rows it has already written out.

    In constant-memory mode a row goes to disk once a later row is begun, but xlsxwriter keeps
    every row's height to the end (``row_info``, and ``row_sizes`` for placing pictures): a
    million-row Working sheet holds some 200 MB of them. Only the rows before the one being
    filled are forgotten, and only on sheets without pictures (Spans and Working), so the file is
    the same. Without those attributes (another xlsxwriter) this does nothing."""
    info, sizes = getattr(ws, "row_info", None), getattr(ws, "row_sizes", None)
    done = getattr(ws, "previous_row", None)
    if not (getattr(ws, "constant_memory", False) and isinstance(info, dict) and isinstance(sizes, dict)
            and isinstance(done, int)):
        return
    for table in (info, sizes):
        for row in [row for row in table if row < done]:
            del table[row]


class _ResultRows:
    """The Working sheet's row for one check result: its utilisation, status, clause and note.

    Made once per sheet, with its formats and line counters looked up once."""

    def __init__(self, w: _Writer, put, put_number, set_row, widths: list[float]):
        f = w.f
        self.put, self.put_number, self.set_row = put, put_number, set_row
        self.top = f.get(bold=True, top=1, text_wrap=True)
        self.label_fmt = f.get(top=1, font_color="#404040")
        self.none_fmt = f.get(align="center", top=1)
        self.band_fmt = {band.name: (f.get(band.swatch, "0.000", top=1), f.get(band.swatch, top=1))
                         for band in P.BANDS}
        self.status = {state: (st.word, f.get(st.swatch, align="center", top=1, text_wrap=True),
                               wrapped_lines(st.word, widths[5]))
                       for state, st in P.CHECK_STATUS.items()}
        self.n_text = LineCounter(widths[7], bold=True)
        self.n_clause = LineCounter(widths[6], bold=True)
        self.n_label = LineCounter(widths[1], bold=True)

    def write(self, row: int, c: CheckResult, label: str) -> int:
        put, top = self.put, self.top
        word, status_fmt, n_word = self.status[c.status]
        text = f"Result: demand {sig_text(c.demand)} against capacity {sig_text(c.capacity)} {c.unit}".rstrip()
        if c.demand is None and c.capacity is None:
            text = "Result"
        if c.message:
            text += ". " + c.message
        lines = max(self.n_text(text), self.n_clause(c.clause), self.n_label(c.label), n_word)
        self.set_row(row, LINE_HEIGHT * min(lines, MAX_LINES))
        put(row, 0, label, self.label_fmt)
        put(row, 1, c.label, top)
        put(row, 2, LOCATION_WORDS[c.location], top)
        put(row, 3, "utilisation", top)
        u = c.utilisation
        if u is None:
            put(row, 4, "—", self.none_fmt)
        else:
            number_fmt, word_fmt = self.band_fmt[P.band_for(u).name]
            if math.isfinite(u):
                self.put_number(row, 4, u, number_fmt)
            else:
                put(row, 4, "∞", word_fmt)
        put(row, 5, word, status_fmt)
        put(row, 6, c.clause, top)
        put(row, 7, text, top)
        return row + 1


class _Writer:
    def __init__(self, wb, report: Report):
        self.wb, self.r = wb, report
        self.f = Formats(wb)
        self._number_formats: dict[float, object] = {}
        self._cell_looks()

    def number_format(self, v: float):
        """The format showing a finite number to about four significant figures (see
        :func:`sig_format`), remembered by value: a schedule's working repeats its numbers."""
        fmt = self._number_formats.get(v)
        if fmt is None:
            if len(self._number_formats) >= 1 << 16:
                self._number_formats.clear()
            fmt = self._number_formats[v] = self.f.get(num=sig_format(v))
        return fmt

    # -- shared bits -------------------------------------------------------------------
    def status_cell(self, ws, row: int, col: int, status: BeamStatus, **extra) -> None:
        st = P.SPAN_STATUS[status]
        ws.write_string(row, col, st.word, self.f.get(st.swatch, align="center", **extra))

    def _cell_looks(self) -> None:
        """The formats of the status and utilisation cells, looked up once (Spans writes one
        utilisation cell per check for every span)."""
        f = self.f
        self.status_look = {status: (st.word, f.get(st.swatch, align="center"))
                            for status, st in P.SPAN_STATUS.items()}
        self.band_look = {band.name: (f.get(band.swatch, "0.000", align="center"), f.get(band.swatch, align="center"))
                          for band in P.BANDS}
        self.dash_look = f.get(P.NEUTRAL, align="center")
        self.not_checked_look = (P.NOT_CHECKED_CELL.word,
                                 f.get(P.NOT_CHECKED_CELL.swatch, align="center", text_wrap=True))
        self.state_look = {state: (st.word, f.get(st.swatch, align="center", text_wrap=True))
                           for state, st in P.CHECK_STATUS.items()}

    def util_cell(self, ws, row: int, col: int, u: float | None, made: bool = True) -> None:
        if u is None:
            if made:
                ws.write_string(row, col, "—", self.dash_look)
            else:
                ws.write_string(row, col, *self.not_checked_look)
            return
        number_fmt, word_fmt = self.band_look[P.band_for(u).name]
        if math.isfinite(u):
            ws.write_number(row, col, u, number_fmt)
        else:
            ws.write_string(row, col, "∞", word_fmt)

    def check_cell(self, ws, row: int, col: int, u: float | None, state: CheckStatus | None) -> None:
        """One check's cell in the results table: its largest utilisation; where it has no number,
        its status word; "—" where the span has no such check."""
        if u is not None:
            self.util_cell(ws, row, col, u)
        elif state is None:
            ws.write_string(row, col, "—", self.dash_look)
        else:
            ws.write_string(row, col, *self.state_look[state])

    def page_setup(self, ws, repeat_row: int | None, last_col: int, title: str) -> None:
        r = self.r
        ws.set_landscape()
        ws.set_paper(1)  # Letter; fit_to_pages scales to one page wide on any paper
        ws.fit_to_pages(1, 0)
        ws.set_margins(left=0.4, right=0.4, top=0.75, bottom=0.6)
        if repeat_row is not None:
            ws.repeat_rows(repeat_row)
        project = " ".join(x for x in (r.project("project", "project name"),
                                       r.project("number", "project number", "project no")) if x)
        rev = r.project("revision", "rev")
        head = f"&L{_hf_escape(project or 'Project not named')}&C{_hf_escape(title)}&R{_hf_escape('Rev ' + rev if rev else 'Revision not stated')}"
        date = r.checked_at.strftime("%Y-%m-%d %H:%M")
        source = os.path.basename(r.schedule.path) or "schedule"
        foot = (f"&L{_hf_escape('Checked ' + date + ' by beamsched ' + r.version)}&CPage &P of &N"
                f"&R{_hf_escape(source)}")
        ws.set_header(head[:255], {"margin": 0.3})
        ws.set_footer(foot[:255], {"margin": 0.3})

    # -- Overview ----------------------------------------------------------------------
    def overview(self) -> None:
        r, f = self.r, self.f
        ws = self.wb.add_worksheet("Overview")
        widths = [28, 14, 14, 14, 24, 8, 90]
        for i, w in enumerate(widths):
            ws.set_column(i, i, w)
        bold = f.get(bold=True)
        plain = f.get()
        section = f.get(bold=True, font_size=12, bottom=1)
        row = 0
        ws.set_row(row, 24)
        ws.write_string(row, 0, TITLE + " — results", f.get(bold=True, font_size=16))
        row += 1
        for line in textwrap.wrap("CAUTION: " + CAUTION, 150):
            ws.write_string(row, 0, line, f.get(bold=True, italic=True))
            row += 1
        row += 1
        ws.write_string(row, 0, "Title block", section)
        row += 1
        s = r.schedule
        block = [(label, r.project(*names) or "not stated") for label, names in TITLE_FIELDS]
        block += [
            ("Standard and edition", s.code),
            ("Input file", os.path.basename(s.path) or "not stated"),
            ("Input sheet", s.sheet or "—"),
            ("Input file date", s.file_modified or "not known"),
            ("Input file SHA-256", s.file_sha256 or "not known"),
            ("Checked on", r.checked_at.strftime("%Y-%m-%d %H:%M %Z").strip()),
            ("beamsched version", r.version),
        ]
        if s.units_assumed:
            block.append(("Units assumed", "; ".join(s.units_assumed)))
        for label, value in block:
            ws.write_string(row, 0, label, bold)
            fmt = f.get(P.ASSUMED) if label == "Units assumed" else plain
            ws.write_string(row, 1, value, fmt)
            row += 1
        row += 1
        ws.write_string(row, 0, "Spans", section)
        row += 1
        for col, head in enumerate(("Status", "Spans", "Meaning")):
            ws.write_string(row, col, head, f.header())
        row += 1
        counts = r.counts
        for status in (BeamStatus.PASS, BeamStatus.FAIL, BeamStatus.INCOMPLETE, BeamStatus.ERROR):
            self.status_cell(ws, row, 0, status)
            ws.write_number(row, 1, counts[status], f.get(num="0", align="center"))
            ws.write_string(row, 2, P.SPAN_STATUS[status].meaning, plain)
            row += 1
        ws.write_string(row, 0, "Total rows", bold)
        ws.write_number(row, 1, len(r.results), f.get(num="0", align="center", bold=True))
        row += 1
        if s.problems:
            ws.write_string(row, 0, "File problems", bold)
            ws.write_number(row, 1, len(s.problems), f.get(num="0", align="center"))
            ws.write_string(row, 2, "problems with the file as a whole: see Input problems", plain)
            row += 1
        row += 1
        ws.write_string(row, 0, "Largest utilisation of each span", section)
        row += 1
        ws.set_row(row, 30)
        for col, head in enumerate(("Utilisation (demand / capacity)", "Spans", "Band")):
            ws.write_string(row, col, head, f.header())
        row += 1
        first_bin = row
        bins = P.histogram_bins()
        colours = []
        for label, lo, hi in bins:
            n = sum(1 for u in r.utilisations if u is not None and (lo < u <= hi or (hi == math.inf and u > lo)))
            band = P.band_for(hi if math.isfinite(hi) else math.inf)
            colours.append(band.swatch.fill)
            ws.write_string(row, 0, label, f.get(band.swatch, align="center"))
            ws.write_number(row, 1, n, f.get(num="0", align="center"))
            ws.write_string(row, 2, band.name, plain)
            row += 1
        none = sum(1 for u in r.utilisations if u is None)
        ws.write_string(row, 0, "no check made", f.get(P.NOT_CHECKED_CELL.swatch, align="center"))
        ws.write_number(row, 1, none, f.get(num="0", align="center"))
        ws.write_string(row, 2, "not read, or nothing could be checked", plain)
        row += 1
        chart = self.wb.add_chart({"type": "column"})
        chart.add_series({
            "name": "Spans",
            "categories": ["Overview", first_bin, 0, first_bin + len(bins) - 1, 0],
            "values": ["Overview", first_bin, 1, first_bin + len(bins) - 1, 1],
            "points": [{"fill": {"color": c}, "border": {"color": "#000000"}} for c in colours],
            "data_labels": {"value": True},
            "gap": 40,
        })
        chart.set_title({"name": "Spans by largest utilisation", "name_font": {"size": 11, "bold": True}})
        chart.set_x_axis({"name": "largest utilisation of the span (demand / capacity)"})
        most = max([1] + [sum(1 for u in r.utilisations if u is not None and lo < u <= hi) for _, lo, hi in bins])
        chart.set_y_axis({"name": "spans", "min": 0, "num_format": "0", "major_unit": max(1, math.ceil(most / 8)),
                          "major_gridlines": {"visible": True, "line": {"color": "#D0D0D0"}}})
        chart.set_legend({"none": True})
        chart.set_size({"width": 560, "height": 300})
        ws.insert_chart(first_bin - 2, 4, chart, {"x_offset": 10, "y_offset": 0})
        row = max(row, first_bin - 2 + 17) + 1
        ws.write_string(row, 0, "Worst spans (largest utilisation first)", section)
        row += 1
        heads = ("Span", "Schedule row", "Max utilisation", "Status", "Governing check", "At", "Note")
        ws.set_row(row, 30)
        for col, head in enumerate(heads):
            ws.write_string(row, col, head, f.header())
        row += 1
        worst = r.worst(10)
        if not worst:
            ws.write_string(row, 0, "No span has a utilisation: nothing could be checked.", plain)
            row += 1
        wrap = f.get(text_wrap=True)
        def span_line(x, check: str, at: str) -> None:
            """One span of the worst / incomplete tables: label, row, utilisation, status, check, note."""
            note = x.first_note
            ws.set_row(row, LINE_HEIGHT * min(_lines(note, widths[6]), MAX_LINES))
            ws.write_string(row, 0, x.label, bold)
            if x.result.row is not None:
                ws.write_number(row, 1, x.result.row, f.get(num="0", align="center"))
            self.util_cell(ws, row, 2, x.utilisation)
            self.status_cell(ws, row, 3, x.status)
            ws.write_string(row, 4, check, wrap)
            ws.write_string(row, 5, at, plain)
            ws.write_string(row, 6, note, wrap)

        for x in worst:
            g = x.governing
            span_line(x, g.label if g else "—", LOCATION_WORDS[g.location] if g else "")
            row += 1
        incomplete = r.incomplete(10)
        if incomplete:
            row += 1
            n = r.count(BeamStatus.INCOMPLETE)
            ws.write_string(row, 0, "Incomplete spans (a required check could not be made; never a pass)"
                            + ("" if n <= 10 else f": the first 10 of {n}, all on Spans"), section)
            row += 1
            ws.set_row(row, 30)
            for col, head in enumerate(("Span", "Schedule row", "Max utilisation", "Status", "Check not made", "",
                                        "Why")):
                ws.write_string(row, col, head, f.header())
            row += 1
            for x in incomplete:
                why = next((c for c in x.result.not_checked if c.required), None)
                span_line(x, check_display(why) if why else "—", "")
                row += 1
        row += 1
        ws.write_string(row, 0, "Legend", section)
        row += 1
        ws.write_string(row, 0, "Span status (Status column)", bold)
        row += 1
        for status in BeamStatus:
            self.status_cell(ws, row, 0, status)
            ws.write_string(row, 1, P.SPAN_STATUS[status].meaning, plain)
            row += 1
        ws.write_string(row, 0, "Utilisation cells", bold)
        row += 1
        samples = {"within": 0.75, "near limit": 0.95, "over": 1.12}
        for band in P.BANDS:
            ws.write_number(row, 0, samples.get(band.name, 0.5), f.get(band.swatch, "0.000", align="center"))
            ws.write_string(row, 1, f"{band.name}: {band.meaning}", plain)
            row += 1
        for cs in (CheckStatus.PASS, CheckStatus.FAIL):
            cst = P.CHECK_STATUS[cs]
            ws.write_string(row, 0, cst.word, f.get(cst.swatch, align="center"))
            ws.write_string(row, 1, f"in a check column: the check was made and gives no number ({cst.meaning})", plain)
            row += 1
        st = P.NOT_CHECKED_CELL
        ws.write_string(row, 0, st.word, f.get(st.swatch, align="center"))
        ws.write_string(row, 1, "the check applies to the span but could not be made: the note says why", plain)
        row += 1
        ws.write_string(row, 0, "—", f.get(P.NEUTRAL, align="center"))
        ws.write_string(row, 1, "the check does not apply to this span (for example hogging at a simple end)", plain)
        row += 1
        ws.write_string(row, 0, "default applied", f.get(P.ASSUMED, align="center"))
        ws.write_string(row, 1, "a value the schedule did not give, taken from a default (listed per span)", plain)
        row += 1
        ws.write_string(row, 0, "The words and numbers carry the meaning; the colours only repeat it, so a "
                                "greyscale print reads the same.", f.get(italic=True))
        row += 1
        ws.write_string(row, 0, WORKING_NOTE[r.working], f.get(italic=True))
        self.page_setup(ws, None, len(widths) - 1, "Overview")
        ws.fit_to_pages(1, 1)
        ws.set_portrait()

    # -- Spans -------------------------------------------------------------------------
    def spans(self) -> None:
        r, f = self.r, self.f
        ws = self.wb.add_worksheet("Spans")
        cols: list[tuple[str, float]] = [
            ("Row", 5), ("Mark", 8), ("Span\nno.", 5), ("Status", 11.5), ("Max\nutilisation", 9.5),
            ("Governing check", 13), ("Governs\nat", 9),
        ]
        n_fixed = len(cols)
        cols += [(f"{c.label}\nutilisation", 6.5) for c in r.columns]
        cols += [(value_header(k).replace(" (", "\n("), 7.5) for k in r.capacity_keys]
        n_rotated = len(cols)
        cols += [("Understood from the schedule (mm, MPa)", 48),
                 ("Defaults applied", 34), ("Checks not made", 18), ("Notes (clause named)", 64)]
        for i, (_, w) in enumerate(cols):
            ws.set_column(i, i, w)
        longest = max((len(line) for head, _ in cols[n_fixed:n_rotated] for line in head.split("\n")), default=10)
        ws.set_row(0, max(LINE_HEIGHT * 3.2, 6.0 * longest + 8))
        rotated = f.get(P.HEADER, text_wrap=True, border=1, border_color="#FFFFFF", rotation=90, valign="bottom",
                        align="center")
        for i, (head, _) in enumerate(cols):
            ws.write_string(0, i, head, rotated if n_fixed <= i < n_rotated else f.header())
        wrap = f.get(text_wrap=True)
        plain = f.get()
        whole = f.get(num="0", align="center")
        bold = f.get(bold=True)
        centre = f.get(align="center")
        capacity = f.get(num="#,##0.0")
        indented = f.get(text_wrap=True, indent=1)
        assumed = f.get(P.ASSUMED, text_wrap=True)
        put, put_number = _cell_writers(ws)
        status_look, band_look, state_look = self.status_look, self.band_look, self.state_look
        dash = self.dash_look
        i_sec = n_rotated
        n_understood = LineCounter(cols[i_sec][1], indent=1)
        n_defaults, n_not_made, n_notes = (LineCounter(cols[i][1]) for i in (i_sec + 1, i_sec + 2, i_sec + 3))
        n_governing = LineCounter(cols[5][1])
        check_ids = [(n_fixed + j, c.id) for j, c in enumerate(r.columns)]
        capacity_cols = [(n_fixed + len(r.columns) + j, k) for j, k in enumerate(r.capacity_keys)]
        for n, x in enumerate(r.rows, start=1):
            if n % FORGET_EVERY_ROWS == 0:
                _forget_written_rows(ws)
            res = x.result
            section = section_text(res.input).replace("\n", "; ")
            understood = "\n".join(t for t in (f"section: {section}" if section else "", understood_text(x)) if t)
            defaults = defaults_text(res.assumed) or "none"
            not_made = "\n".join(x.not_made)
            notes = x.note_text
            g = x.governing
            governing = g.label if g else "—"
            lines = max(n_understood(understood), n_defaults(defaults), n_not_made(not_made), n_notes(notes),
                        n_governing(g.label if g else ""))
            ws.set_row(n, LINE_HEIGHT * min(max(lines, 1), MAX_LINES))
            if res.row is not None:
                put_number(n, 0, res.row, whole)
            put(n, 1, res.mark, bold)
            if res.span_no is not None:
                put_number(n, 2, res.span_no, whole)
            put(n, 3, *status_look[res.status])
            self.util_cell(ws, n, 4, x.utilisation, made=res.status is BeamStatus.ERROR or bool(res.checks))
            put(n, 5, governing, wrap)  # wraps: the row height counts its lines
            put(n, 6, LOCATION_WORDS[g.location] if g else "", centre)
            by_check, state = x.by_check, x.state
            for col, cid in check_ids:
                u = by_check[cid]
                if u is not None:
                    number_fmt, word_fmt = band_look[P.band_for(u).name]
                    if math.isfinite(u):
                        put_number(n, col, u, number_fmt)
                    else:
                        put(n, col, "∞", word_fmt)
                elif state[cid] is None:
                    put(n, col, "—", dash)
                else:
                    put(n, col, *state_look[state[cid]])
            values = res.values
            for col, k in capacity_cols:
                v = values.get(k)
                if isinstance(v, (int, float)) and math.isfinite(v):
                    put_number(n, col, v, capacity)
                elif v is not None:
                    put(n, col, str(v), plain)
            put(n, i_sec, understood, indented)
            put(n, i_sec + 1, defaults, assumed if res.assumed else wrap)
            put(n, i_sec + 2, not_made, wrap)
            put(n, i_sec + 3, notes, wrap)
        last = len(cols) - 1
        ws.freeze_panes(1, 2)
        ws.autofilter(0, 0, max(len(r.rows), 1), last)
        self.page_setup(ws, 0, last, "Results by span")
        ws.set_paper(3)  # Tabloid (11 × 17 in), the usual office size for schedules (common practice)
        ws.fit_to_pages(1, 0)
        ws.hide_gridlines(0)  # printed gridlines keep each number apart from the text beside it

    # -- Working -----------------------------------------------------------------------
    def working(self) -> None:
        r, f = self.r, self.f
        ws = self.wb.add_worksheet("Working")
        # The span's label on every row: a printed page taken from the middle of the sheet still
        # says which span it shows, and a filter on the column picks one span's working.
        cols = [("Span", 12), ("Check", 20), ("At", 5.5), ("Symbol", 17), ("Value", 14), ("Unit", 8),
                ("Clause", 13), ("Working (what the value is, how it was found)", 86)]
        widths = [w for _, w in cols]
        for i, (_, w) in enumerate(cols):
            ws.set_column(i, i, w)
        for i, (head, _) in enumerate(cols):
            ws.write_string(0, i, head, f.header())
        ws.freeze_panes(1, 0)
        # This sheet is nearly every cell of the workbook (a million rows for a large schedule), so
        # everything that is the same from line to line is looked up once here, not per cell:
        # the formats, the line counters of each column and the words of each check and value.
        put, put_number = _cell_writers(ws)
        set_row = ws.set_row
        wrap = f.get(text_wrap=True)
        plain = f.get()
        unit_fmt = f.get(indent=1)
        small = f.get(font_color="#404040")
        bold = f.get(bold=True)
        bold_right = f.get(bold=True, align="right")
        italic = f.get(italic=True)
        number_format = self.number_format
        heads = {status: (st.word, f.get(st.swatch, bold=True, font_size=11), f.get(st.swatch))
                 for status, st in P.SPAN_STATUS.items()}
        n_name, n_symbol, n_value = LineCounter(widths[1]), LineCounter(widths[3]), LineCounter(widths[4])
        n_clause, n_text = LineCounter(widths[6]), LineCounter(widths[7])
        results = _ResultRows(self, put, put_number, set_row, widths)
        labels = {c.id: c.label for c in r.columns}
        names: dict[str, tuple[str, int]] = {}  # check id -> (its name in the Check column, lines)
        shapes: dict[tuple[str, str, str, str], tuple[str, int]] = {}  # (check, symbol, clause, working)
        # -> (the check's name, the lines of the row's fixed texts)
        number_formats, isfinite = self._number_formats, math.isfinite
        wheres: dict = dict(LOCATION_WORDS)
        values: dict[str, tuple[str, str, str]] = {}  # value key -> (symbol, unit, note)
        row = 1
        if r.working != "all":
            left_out = sum(1 for x in r.results if not r.shows_working(x))
            put(row, 0, WORKING_NOTE[r.working], italic)  # two short lines: each fits the printed width
            put(row + 1, 0, f"{left_out} of {len(r.rows)} spans left out; their results are on the Spans sheet.",
                italic)
            row += 3
        shown = range(len(r.rows)) if r.working == "all" else [
            i for i, res in enumerate(r.results) if r.shows_working(res)]
        for n_shown, i in enumerate(shown):
            if n_shown % FORGET_EVERY_SPANS == 0:
                _forget_written_rows(ws)
            x = r.rows[i]
            res = x.result
            trace = res.trace if isinstance(res.trace, tuple) else tuple(res.trace)  # a LazyTrace runs once
            label = x.label
            size = 3 + len(trace) + len(res.checks) + len(res.problems) + len(res.values)
            if row + size >= MAX_ROWS:
                put(row, 0, f"The working of {len(shown) - n_shown} more spans, from {x.label} on, "
                            "is not shown: a worksheet holds 1,048,576 rows. Check them in smaller "
                            "batches to see their working" + (
                                ", or write the working of only the spans that fail or are incomplete "
                                "(--working flagged)." if r.working == "all" else "."), bold)
                break
            set_row(row, 18)
            word, head_fmt, fill_fmt = heads[res.status]
            put(row, 0, label, head_fmt)
            put(row, 1, word, head_fmt)
            put(row, 2, "", fill_fmt)
            put(row, 3, "max. utilisation", bold_right)
            self.util_cell(ws, row, 4, x.utilisation)
            g = x.governing
            info = f"schedule row {res.row if res.row is not None else '—'}"
            if g is not None:
                info += f"; governing: {check_display(g)}, utilisation {P.format_utilisation(g.utilisation)}"
            put(row, 7, info, bold)
            row += 1
            if res.status is BeamStatus.ERROR or res.problems:
                for p in res.problems:
                    text = ("Warning: " if p.severity == "warning" else "Not read: ") + p.message
                    value = "" if p.value is None else str(p.value)
                    set_row(row, LINE_HEIGHT * min(max(n_text(text), n_value(value), n_symbol(p.column or "")),
                                                   MAX_LINES))
                    put(row, 0, label, small)
                    put(row, 1, "Input", plain)
                    put(row, 3, p.column or "", wrap)
                    put(row, 4, value, wrap)
                    put(row, 7, text, wrap)
                    row += 1
            for k, v in res.values.items():
                if v is None:
                    continue
                words = values.get(k)
                if words is None:
                    words = values[k] = (value_header(k).split(" (")[0], value_unit(k),
                                         f"{k} (the name in the JSON and CSV results)")
                put(row, 0, label, small)
                put(row, 1, "Result values", plain)
                put(row, 3, words[0], plain)
                if isinstance(v, (int, float)) and not isinstance(v, bool) and math.isfinite(v):
                    put_number(row, 4, v, number_format(v))
                else:
                    text = str(v)
                    n = n_value(text)
                    if n > 1:
                        set_row(row, LINE_HEIGHT * min(n, MAX_LINES))
                    put(row, 4, text, wrap)
                put(row, 5, words[1], unit_fmt)
                put(row, 7, words[2], italic)
                row += 1
            groups: dict[tuple, list] = {}
            for t in trace:
                key = (t.check, t.location)
                group = groups.get(key)
                if group is None:
                    groups[key] = [t]
                else:
                    group.append(t)
            results_by_key: dict[tuple, list[CheckResult]] = {}
            for c in res.checks:
                results_by_key.setdefault((c.id, c.location), []).append(c)
            for key, lines in groups.items():
                for t in lines:
                    check, value, symbol, clause, text = t.check, t.value, t.symbol, t.clause, t.description
                    shape = (check, symbol, clause, text)  # a few hundred of these recur span after span
                    known = shapes.get(shape)
                    if known is None:
                        named = names.get(check)
                        if named is None:
                            name = labels[check] if check in labels else check.replace("_", " ").capitalize()
                            named = names[check] = (name, n_name(name))
                        if len(shapes) >= 1 << 15:
                            shapes.clear()
                        known = shapes[shape] = (named[0], max(named[1], n_text(text), n_symbol(symbol),
                                                               n_clause(clause)))
                    name, n_lines = known
                    if isinstance(value, str):
                        n_lines = max(n_lines, n_value(value))
                    if n_lines > 1:
                        set_row(row, LINE_HEIGHT * min(n_lines, MAX_LINES))
                    put(row, 0, label, small)
                    put(row, 1, name, wrap)
                    where = wheres.get(t.location)
                    if where is None:
                        where = wheres[t.location] = str(t.location)
                    if where:  # empty cells are left unwritten: the sheet can run to a million rows
                        put(row, 2, where, plain)
                    put(row, 3, symbol, wrap)
                    kind = value.__class__
                    if kind is float or kind is int or (isinstance(value, (int, float)) and not isinstance(value, bool)):
                        if isfinite(value):
                            put_number(row, 4, value, number_formats.get(value) or number_format(value))
                        else:
                            put(row, 4, "∞" if value > 0 else "−∞", plain)
                    elif value is not None:
                        put(row, 4, str(value), wrap)
                    if t.unit:
                        put(row, 5, t.unit, unit_fmt)
                    if clause:
                        put(row, 6, clause, wrap)
                    put(row, 7, text, wrap)
                    row += 1
                for c in results_by_key.pop(key, ()):
                    row = results.write(row, c, label)
            for checks in results_by_key.values():  # results with no working of their own
                for c in checks:
                    row = results.write(row, c, label)
            row += 1
        ws.autofilter(0, 0, max(row - 1, 1), len(cols) - 1)  # filter one span's rows to print its working alone
        self.page_setup(ws, 0, len(cols) - 1, "Calculation working")
        # Tabloid portrait: one page wide at about three quarters of full size (7-point text), and
        # about 120 rows a page. No page break per span: LibreOffice then adds pages (and a blank
        # one), and the span named on every row already tells whose working a page holds.
        ws.set_portrait()
        ws.set_paper(3)
        ws.hide_gridlines(0)  # printed gridlines guide the eye along the long rows

    # -- Input problems ----------------------------------------------------------------
    def problems(self) -> None:
        r, f = self.r, self.f
        ws = self.wb.add_worksheet("Input problems")
        cols = [("Row", 7), ("Span", 16), ("Column", 20), ("Value", 20), ("Reason and what was expected", 90),
                ("Severity", 10)]
        for i, (_, w) in enumerate(cols):
            ws.set_column(i, i, w)
        for i, (head, _) in enumerate(cols):
            ws.write_string(0, i, head, f.header())
        wrap = f.get(text_wrap=True)
        items = r.all_problems()
        row = 1
        if not items:
            ws.write_string(row, 4, "No problems: every row was read.", f.get(italic=True))
            row += 1
        for rownum, label, p in items:
            value = "" if p.value is None else str(p.value)
            lines = max(_lines(p.message, 90), _lines(label, 16), _lines(p.column or "", 20), _lines(value, 20))
            ws.set_row(row, LINE_HEIGHT * min(lines, MAX_LINES))
            if rownum is not None:
                ws.write_number(row, 0, rownum, f.get(num="0", align="center"))
            else:
                ws.write_string(row, 0, "file", f.get(align="center"))
            ws.write_string(row, 1, label, wrap)
            ws.write_string(row, 2, p.column or "", wrap)
            ws.write_string(row, 3, "" if p.value is None else str(p.value), wrap)
            ws.write_string(row, 4, p.message, wrap)
            sw = P.SPAN_STATUS[BeamStatus.ERROR].swatch if p.severity == "error" else P.ASSUMED
            ws.write_string(row, 5, p.severity, f.get(sw, align="center"))
            row += 1
        ws.freeze_panes(1, 0)
        ws.autofilter(0, 0, max(row - 1, 1), len(cols) - 1)
        self.page_setup(ws, 0, len(cols) - 1, "Input problems")
        ws.hide_gridlines(0)

    # -- About -------------------------------------------------------------------------
    def about(self) -> None:
        r, f = self.r, self.f
        ws = self.wb.add_worksheet("About")
        ws.set_column(0, 0, 30)
        ws.set_column(1, 1, 110)
        bold = f.get(bold=True, text_wrap=True)
        wrap = f.get(text_wrap=True)
        row = 0
        ws.set_row(row, 22)
        ws.write_string(row, 0, "About these results", f.get(bold=True, font_size=14))
        row += 2

        def put(topic: str, text: str, fmt=None) -> None:
            nonlocal row
            ws.set_row(row, LINE_HEIGHT * min(max(_lines(text, 110, bold=fmt is not None),
                                                  _lines(topic, 30, bold=True)), MAX_LINES))
            ws.write_string(row, 0, topic, bold)
            ws.write_string(row, 1, text, fmt or wrap)
            row += 1

        put("Caution", CAUTION, f.get(bold=True, text_wrap=True))
        put("beamsched version", r.version)
        put("Design standard", r.schedule.code)
        row += 1
        for status in BeamStatus:
            st = P.SPAN_STATUS[status]
            put(f"Status {st.word}", st.meaning)
        row += 1
        for i, text in enumerate(policies_for([c.id for c in r.columns])):
            put("Policies" if i == 0 else "", text)
        row += 1
        for i, c in enumerate(r.columns):
            put("Checks made in this run" if i == 0 else "", f"{c.label} ({c.id}): cl. {c.clause}")
        if not r.columns:
            put("Checks made in this run", "none")
        row += 1
        defaults = r.schedule.defaults
        if defaults:
            for i, (k, v) in enumerate(defaults.items()):
                put("Defaults in force" if i == 0 else "", f"{k}: {v}")
        else:
            put("Defaults in force", "none declared in the schedule (no Parameters sheet, or it sets none)")
        assumed = r.assumed_counts
        if assumed:
            for i, (text, n) in enumerate(assumed.items()):
                put("Defaults applied to spans" if i == 0 else "", f"{text} ({n} span{'s' if n != 1 else ''})",
                    f.get(P.ASSUMED, text_wrap=True))
        else:
            put("Defaults applied to spans", "none: every span gave every value it needed")
        if r.schedule.units_assumed:
            put("Units assumed", "; ".join(r.schedule.units_assumed), f.get(P.ASSUMED, text_wrap=True))
        if r.schedule.columns:
            put("Columns read", "; ".join(f"{k} ← “{v}”" for k, v in r.schedule.columns.items()))
        s = r.schedule
        put("Input", f"{os.path.basename(s.path) or 'not stated'}, sheet {s.sheet or '—'}, header row "
                     f"{s.header_row if s.header_row is not None else '—'}; SHA-256 {s.file_sha256 or 'not known'}; "
                     f"modified {s.file_modified or 'not known'}")
        put("Checked on", r.checked_at.strftime("%Y-%m-%d %H:%M %Z").strip())
        self.page_setup(ws, None, 1, "About")
        ws.set_portrait()


def write_results(report: Report, path: str | os.PathLike, protected: tuple | list = ()) -> Path:
    """Write the results workbook to ``path`` (whole or not at all)."""
    import xlsxwriter
    from xlsxwriter.exceptions import XlsxWriterException

    try:
        _write(report, path, protected, xlsxwriter)
    except XlsxWriterException as exc:  # e.g. the disk filled while the package was being zipped
        raise OutputError(f"could not write the results workbook {path}: {exc}; nothing was left at that name") from exc
    return Path(path)


@contextlib.contextmanager
def _collector_spared() -> Iterator[None]:
    """Keep Python's cyclic garbage collector off the objects alive when the write starts.

    The results of a large schedule are hundreds of thousands of objects that live through the
    whole write, and every full collection the write sets off walked all of them (measured:
    2.3 of 94 CPU seconds for 10,000 spans). They are set aside (``gc.freeze``) and handed back
    afterwards; what the write itself makes is still collected as usual. Nothing is done when
    the collector is off or the caller has set objects aside itself.
    """
    if not gc.isenabled() or gc.get_freeze_count():
        yield
        return
    gc.freeze()
    try:
        yield
    finally:
        gc.unfreeze()


def _write(report: Report, path, protected, xlsxwriter) -> None:
    with atomic_path(path, protected) as tmp, _collector_spared():
        wb = xlsxwriter.Workbook(str(tmp), {"constant_memory": True, "strings_to_numbers": False,
                                            "strings_to_formulas": False, "strings_to_urls": False,
                                            **_default_font()})
        try:
            wb.set_properties({"title": TITLE, "subject": report.schedule.code, "author": "beamsched",
                               "comments": CAUTION})
            w = _Writer(wb, report)
            w.overview()
            w.spans()
            w.working()
            w.problems()
            w.about()
        except BaseException:
            # Release xlsxwriter's own temporary files; the partial file is then deleted.
            with contextlib.suppress(Exception):
                wb.close()
            raise
        wb.close()
