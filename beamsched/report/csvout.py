"""One flat CSV row per span, in schedule order, with machine-friendly ASCII headers:
``row, mark, span, status, utilisation, governing, governing_location``, then every value
(``Mr_pos_kNm`` ...), one ``util_<check id>`` column per check found (largest utilisation over
the span's locations), ``not_checked``, ``assumed`` and ``notes`` (joined with `` | ``)."""

from __future__ import annotations

import csv
import io
import math
import os
from pathlib import Path

from .atomic import write_text
from .table import Report, value_keys


def _num(v: object) -> object:
    if isinstance(v, float):
        if math.isnan(v):
            return "nan"
        if math.isinf(v):
            return "inf" if v > 0 else "-inf"
        return f"{v:.6g}"
    return "" if v is None else v


def csv_text(report: Report) -> str:
    keys = value_keys(report.results, per_end=False)
    cols = report.columns
    buf = io.StringIO()
    w = csv.writer(buf, lineterminator="\n")
    w.writerow(["row", "mark", "span", "status", "utilisation", "governing", "governing_location", *keys,
                *(f"util_{c.id}" for c in cols), "not_checked", "assumed", "notes"])
    for row in report.rows:
        r = row.result
        gov = row.governing
        w.writerow([
            _num(r.row), r.mark, _num(r.span_no), r.status.value, _num(row.utilisation),
            gov.id if gov else "", (gov.location or "") if gov else "",
            *(_num(r.values.get(k)) for k in keys),
            *(_num(row.by_check[c.id]) for c in cols),
            "; ".join(row.not_made), "; ".join(r.assumed), " | ".join(row.notes),
        ])
    return buf.getvalue()


def write_csv(report: Report, path: str | os.PathLike, protected: tuple | list = ()) -> Path:
    return write_text(path, csv_text(report), protected, newline="")
