"""The writers: results workbook, annotated copy, JSON and CSV.

They read :class:`~beamsched.model.BeamResult` objects (gathered in a :class:`Report`) and
compute no engineering values. Every output is written whole or not at all, and never onto an
input file. Heavy libraries (xlsxwriter, openpyxl) are imported only when a writer runs.
"""

from __future__ import annotations

from .atomic import OutputError, atomic_path
from .table import Report

__all__ = ["OutputError", "Report", "atomic_path", "write_annotated", "write_csv", "write_json", "write_results"]


def write_results(report, path, protected=()):
    from .workbook import write_results as _w
    return _w(report, path, protected)


def write_annotated(report, source, target, protected=()):
    from .annotate import write_annotated as _w
    return _w(report, source, target, protected)


def write_json(report, path, protected=()):
    from .jsonout import write_json as _w
    return _w(report, path, protected)


def write_csv(report, path, protected=()):
    from .csvout import write_csv as _w
    return _w(report, path, protected)
