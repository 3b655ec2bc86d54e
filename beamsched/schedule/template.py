"""The blank schedule workbook that ``beamsched template`` writes.

Sheet ``Schedule``: two title rows, then the header (row 3) with the unit of each dimensioned
column in brackets and a help comment on every header cell, drop-down lists for the bar and
stirrup notation (examples only: any notation may be typed), Type, the ends, Exposure and SFRS.
Sheet ``Parameters``: every project parameter beamsched reads, filled in with a starting value,
its unit and a note. ``templates/beamsched_template.xlsx`` in the repository is this file.
"""

from __future__ import annotations

from pathlib import Path

from .columns import BY_KEY, Column
from .parameters import PARAMS
from .writer import _atomic

TEMPLATE_KEYS = (
    "mark", "span_no", "qty", "type", "bw", "h", "hf", "bf", "clear_to_next_web", "span", "clear_span",
    "left_end", "right_end", "cover", "bottom_bars", "top_bars_l", "top_bars_r", "top_bars_mid",
    "bottom_bars_support", "stirrups", "skin_bars", "d", "fc", "fy", "fyt", "agg", "exposure",
    "mf_pos", "mf_neg_l", "mf_neg_r", "mf_pos_l", "mf_pos_r", "vf_l", "vf_r", "tf", "pf", "ms_pos", "ms_neg",
    "sfrs", "notes",
)
TITLE = ("Beam schedule", "One row per span. Units are in the headers; hover over a header for help. "
                          "Project defaults are on the Parameters sheet.")
HEADER_ROW = 3
DATA_ROWS = 1000  # rows given drop-down lists below the header

BAR_EXAMPLES = ("2-15M", "2-20M", "3-20M", "4-20M", "2-25M", "3-25M", "4-25M", "5-25M", "6-25M", "4-30M",
                "2-25M + 2-20M", "4-25M / 2-25M", "4-30M / 4-30M")
STIRRUP_EXAMPLES = ("10M@150", "10M@200", "10M@250", "10M@300", "15M@200", "4L-10M@200", "10M@100 (4 legs)")
SKIN_EXAMPLES = ("2-10M", "3-10M", "4-10M", "3-15M")
_EXAMPLES = {"bars": BAR_EXAMPLES, "stirrups": STIRRUP_EXAMPLES}
PARAMETER_CHOICES = {"units": ("SI", "US customary"), "exposure": ("interior", "exterior"),
                     "density": ("normal", "semi-low-density", "low-density"), "precast": ("yes", "no"),
                     "epoxy": ("yes", "no")}


def template_columns() -> list[Column]:
    return [BY_KEY[k] for k in TEMPLATE_KEYS]


def _help(col: Column) -> str:
    text = col.help
    if col.unit:
        text += f" Unit: {col.unit} (change the unit in the brackets if you work in another; e.g. "
        text += {"length": "in", "span": "ft", "stress": "psi or ksi", "force": "kip",
                 "moment": "kip-ft"}[col.dimension or "length"] + ")."
    if col.choices:
        text += " Choices: " + ", ".join(col.choices) + "."
    return text


def write_template(path: str | Path) -> Path:
    """Write the blank schedule workbook to ``path`` (written whole, or not at all)."""
    import openpyxl
    from openpyxl.comments import Comment
    from openpyxl.styles import Alignment, Font, PatternFill
    from openpyxl.utils import get_column_letter
    from openpyxl.worksheet.datavalidation import DataValidation

    p = Path(path)

    def build(tmp: Path) -> None:
        wb = openpyxl.Workbook()
        ws = wb.active
        ws.title = "Schedule"
        ws["A1"] = TITLE[0]
        ws["A1"].font = Font(bold=True, size=14)
        ws["A2"] = TITLE[1]
        ws["A2"].font = Font(italic=True)
        fill = PatternFill("solid", fgColor="DDE4EE")
        cols = template_columns()
        for i, col in enumerate(cols, start=1):
            cell = ws.cell(row=HEADER_ROW, column=i, value=col.header())
            cell.font = Font(bold=True)
            cell.fill = fill
            cell.alignment = Alignment(wrap_text=True, vertical="top")
            comment = Comment(_help(col), "beamsched")
            comment.width, comment.height = 320, 140
            cell.comment = comment
            ws.column_dimensions[get_column_letter(i)].width = max(9, min(24, len(col.header()) + 3))
        ws.freeze_panes = ws.cell(row=HEADER_ROW + 1, column=2)
        # print set-up: landscape, one page wide, the title and header rows on every page
        ws.page_setup.orientation = "landscape"
        ws.page_setup.paperSize = ws.PAPERSIZE_TABLOID
        ws.page_setup.fitToWidth, ws.page_setup.fitToHeight = 1, 0
        ws.sheet_properties.pageSetUpPr.fitToPage = True
        ws.print_title_rows = f"1:{HEADER_ROW}"
        first, last = HEADER_ROW + 1, HEADER_ROW + DATA_ROWS
        lists = wb.create_sheet("Lists")  # long example lists live here (a list formula is limited in length)
        lists.sheet_state = "hidden"
        list_cols = {}
        for j, (name, values) in enumerate((("bars", BAR_EXAMPLES), ("stirrups", STIRRUP_EXAMPLES),
                                            ("skin", SKIN_EXAMPLES)), start=1):
            lists.cell(row=1, column=j, value=name)
            for k, v in enumerate(values, start=2):
                lists.cell(row=k, column=j, value=v)
            letter = get_column_letter(j)
            list_cols[name] = f"=Lists!${letter}$2:${letter}${len(values) + 1}"
        for i, col in enumerate(cols, start=1):
            letter = get_column_letter(i)
            if col.choices:
                dv = DataValidation(type="list", formula1='"' + ",".join(col.choices) + '"', allow_blank=True,
                                    showErrorMessage=True, errorTitle=col.label,
                                    error=f"Choose one of: {', '.join(col.choices)}", promptTitle=col.label,
                                    prompt=", ".join(col.choices), showInputMessage=False)
            elif col.kind in ("bars", "stirrups"):
                source = list_cols["skin" if col.key == "skin_bars" else
                                   ("stirrups" if col.kind == "stirrups" else "bars")]
                # examples only: any notation may be typed, so no error on other entries
                dv = DataValidation(type="list", formula1=source, allow_blank=True, showErrorMessage=False)
            else:
                continue
            ws.add_data_validation(dv)
            dv.add(f"{letter}{first}:{letter}{last}")

        ps = wb.create_sheet("Parameters")
        ps.append(["Name", "Value", "Unit", "Notes"])
        for c in ps[1]:
            c.font = Font(bold=True)
            c.fill = fill
        for param in PARAMS:
            ps.append([param.label, param.example, param.unit or None, param.help or None])
            row = ps.max_row
            if param.key in PARAMETER_CHOICES:
                options = PARAMETER_CHOICES[param.key]
                dv = DataValidation(type="list", formula1='"' + ",".join(options) + '"', allow_blank=True,
                                    showErrorMessage=True, error=f"Choose one of: {', '.join(options)}")
                ps.add_data_validation(dv)
                dv.add(f"B{row}")
        for letter, width in zip("ABCD", (30, 18, 8, 90), strict=True):
            ps.column_dimensions[letter].width = width
        wb.save(tmp)

    _atomic(p, build)
    return p


if __name__ == "__main__":  # python -m beamsched.schedule.template templates/beamsched_template.xlsx
    import sys

    print(write_template(sys.argv[1] if len(sys.argv) > 1 else "templates/beamsched_template.xlsx"))
