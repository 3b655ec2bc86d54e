"""The JSON results, for scripts. Other tools depend on these names (schema 1):

``{"schema": 1, "code", "beams": [{"mark", "span", "row", "status", "utilisation", "governing",
"values": {...}, "checks": [{"id", "location", "clause", "demand", "capacity", "unit",
"utilisation", "status", "message"}], "problems": [{"column", "value", "message"}],
"assumed": [...]}]}``

Besides these the document carries ``version``, ``checked_at``, ``input`` (file name, sheet,
SHA-256) and the file-level ``problems``; each beam also carries its ``label``, and
``governing`` is ``{"id", "location"}`` or null. A number that is not finite (the utilisation
against a capacity of zero) is written as null: its ``status`` still says ``fail``.
"""

from __future__ import annotations

import json
import math
import os
from pathlib import Path

from ..model import BeamResult, CheckResult, Problem
from .atomic import write_text
from .table import Report

SCHEMA = 1
# Names the contract promises in every beam's "values" (null when not known).
CONTRACT_VALUES = ("Mr_pos_kNm", "Mr_neg_kNm", "Mr_neg_left_kNm", "Mr_neg_right_kNm", "Vr_kN")


def _clean(value: object) -> object:
    """A JSON-safe copy: non-finite floats become null, anything unknown becomes text."""
    if value is None or isinstance(value, (bool, str)):
        return value
    if isinstance(value, int):
        return value
    if isinstance(value, float):
        return value if math.isfinite(value) else None
    if isinstance(value, dict):
        return {str(k): _clean(v) for k, v in value.items()}
    if isinstance(value, (list, tuple)):
        return [_clean(v) for v in value]
    try:  # numpy scalars and the like
        f = float(value)  # type: ignore[arg-type]
    except (TypeError, ValueError):
        return str(value)
    return f if math.isfinite(f) else None


def _smaller_of_ends(values: dict, key: str) -> object:
    """``Mr_neg_kNm`` / ``Vr_kN``: as given, else the smaller of the ``_left`` / ``_right`` values."""
    if values.get(key) is not None:
        return values[key]
    head, _, unit = key.rpartition("_")
    ends = [values.get(f"{head}_{end}_{unit}") for end in ("left", "right")]
    numbers = [v for v in ends if isinstance(v, (int, float))]
    return min(numbers) if numbers else None


def check_json(c: CheckResult) -> dict:
    return {"id": c.id, "location": c.location, "clause": c.clause, "demand": c.demand,
            "capacity": c.capacity, "unit": c.unit, "utilisation": c.utilisation,
            "status": c.status.value, "message": c.message, "label": c.label, "required": c.required}


def problem_json(p: Problem) -> dict:
    return {"column": p.column, "value": p.value, "message": p.message, "row": p.row, "severity": p.severity}


def beam_json(r: BeamResult) -> dict:
    values = dict(r.values)
    for key in CONTRACT_VALUES:
        values[key] = _smaller_of_ends(values, key)
    gov = r.governing
    return {
        "mark": r.mark, "span": r.span_no, "row": r.row, "label": r.label, "status": r.status.value,
        "utilisation": r.utilisation,
        "governing": None if gov is None else {"id": gov.id, "location": gov.location},
        "values": values,
        "checks": [check_json(c) for c in r.checks],
        "problems": [problem_json(p) for p in r.problems],
        "assumed": list(r.assumed),
    }


def report_json(report: Report) -> dict:
    s = report.schedule
    doc = {
        "schema": SCHEMA,
        "code": s.code,
        "version": report.version,
        "checked_at": report.checked_at.isoformat(timespec="seconds"),
        "input": {"file": os.path.basename(s.path), "sheet": s.sheet, "sha256": s.file_sha256,
                  "modified": s.file_modified},
        "problems": [problem_json(p) for p in s.problems],
        "beams": [beam_json(r) for r in report.results],
    }
    return _clean(doc)  # type: ignore[return-value]


def write_json(report: Report, path: str | os.PathLike, protected: tuple | list = ()) -> Path:
    text = json.dumps(report_json(report), ensure_ascii=False, indent=1, allow_nan=False)
    return write_text(path, text + "\n", protected)
