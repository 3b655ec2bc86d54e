"""Reading beam schedules: .xlsx / .xlsm (formula cells as their saved values) and .csv.

:func:`read_schedule` finds the header (the first row within the first 30 holding a ``Mark``
cell), matches the column labels and their units, reads the optional ``Parameters`` sheet, and
turns each row into a :class:`~beamsched.model.BeamInput` or a
:class:`~beamsched.model.RowFailure`. A file that cannot be read at all raises
:class:`ScheduleError`; anything wrong inside it is a :class:`~beamsched.model.Problem`.

Importing this package is cheap (no workbook or units library is loaded until a schedule is
read), so the command line's help and the file guard stay quick.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

from .cells import ScheduleError

if TYPE_CHECKING:
    from ..model import Schedule
    from .guard import Limits

__all__ = ["read_schedule", "ScheduleError"]


def read_schedule(path: str | Path, sheet: str | None = None, *, limits: Limits | None = None) -> Schedule:
    """Read a beam schedule (.xlsx, .xlsm or .csv) into a :class:`~beamsched.model.Schedule`.

    ``sheet`` names the schedule sheet; without it, the first sheet with a ``Mark`` header is
    used. The file is only read, never written. Raises :class:`ScheduleError` for a file that
    cannot be read at all.

    Before anything parses it, the file passes :func:`beamsched.schedule.guard.inspect_file`
    with ``limits`` (the defaults of :class:`~beamsched.schedule.guard.Limits` when None), which
    refuses hostile, damaged, encrypted or legacy files and files past a limit.
    """
    from .guard import inspect_file
    from .reader import read_schedule as _read

    inspect_file(path, limits)
    return _read(path, sheet)
