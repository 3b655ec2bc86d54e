"""Compare what two versions of beamsched make of the same generated schedule.

For a change meant to leave every result as it was (a speed-up, moving a check onto columns):
dump a run with the commit before and with the change, then compare the two, result by result
and trace line by trace line::

    git worktree add /tmp/before HEAD
    PYTHONPATH=/tmp/before python tools/compare_runs.py dump /tmp/before.pkl
    python tools/compare_runs.py dump /tmp/after.pkl
    python tools/compare_runs.py diff /tmp/before.pkl /tmp/after.pkl

``dump`` checks a schedule from ``generate_schedule`` (every section type and end condition; the
same seed gives the same file) through ``check_schedule`` and keeps every span's status, each
check's id, location, status, demand, capacity, utilisation and note, its values, what the tool
understood of the row, its problems and defaults, and (unless ``--no-trace``) every trace line. ``diff`` prints what differs and the largest relative
difference of the numbers, and exits 1 if any status, note, text or number differs by more than
``--rel`` (default 0: bit for bit).
"""

from __future__ import annotations

import argparse
import math
import pickle
import sys
import tempfile
from pathlib import Path


def dump(out: Path, spans: int, seed: int, trace: bool) -> None:
    from beamsched.engine import check_schedule
    from beamsched.schedule import read_schedule
    from beamsched.schedule.samples import generate_schedule

    with tempfile.TemporaryDirectory() as tmp:
        schedule = read_schedule(generate_schedule(Path(tmp) / "generated.xlsx", spans, seed=seed))
    rows = []
    for r in check_schedule(schedule):
        checks = [(c.id, c.location, c.status.value, c.demand, c.capacity, c.utilisation, c.message) for c in r.checks]
        lines = [(t.check, t.location, t.symbol, t.value, t.unit, t.clause, t.description) for t in r.trace] if trace else None
        name = f"{r.mark}" + ("" if r.span_no is None else f" span {r.span_no}") + f" (row {r.row})"
        said = (dict(r.understood), [p.message for p in r.problems], list(r.assumed))
        rows.append((name, r.status.value, checks, dict(r.values), lines, said))
    out.write_bytes(pickle.dumps(rows))
    print(f"{len(rows)} rows written to {out}")


def _rel(a: object, b: object) -> float:
    """0 when equal; the relative difference of two floats; inf for anything else that differs."""
    if a == b or (isinstance(a, float) and isinstance(b, float) and math.isnan(a) and math.isnan(b)):
        return 0.0
    if isinstance(a, float) and isinstance(b, float) and math.isfinite(a) and math.isfinite(b):
        return abs(a - b) / max(abs(a), abs(b))
    return math.inf


def diff(before: Path, after: Path, rel: float, show: int) -> int:
    a, b = pickle.loads(before.read_bytes()), pickle.loads(after.read_bytes())
    found: list[str] = []
    worst = 0.0
    numbers = 0

    def compare(where: str, x: object, y: object) -> None:
        nonlocal worst, numbers
        numbers += isinstance(x, float)
        r = _rel(x, y)
        if r:
            worst = max(worst, r) if math.isfinite(r) else worst
            if r > rel:
                found.append(f"{where}: {x!r} -> {y!r}")

    if len(a) != len(b):
        found.append(f"{len(a)} rows before, {len(b)} after")
    for ra, rb in zip(a, b, strict=False):
        name = ra[0]
        compare(f"{name} status", ra[1], rb[1])
        if len(ra[2]) != len(rb[2]):
            found.append(f"{name}: {len(ra[2])} checks before, {len(rb[2])} after")
        for ca, cb in zip(ra[2], rb[2], strict=False):
            for field, x, y in zip(("id", "location", "status", "demand", "capacity", "utilisation", "note"), ca, cb, strict=True):
                compare(f"{name} {ca[0]} ({ca[1]}) {field}", x, y)
        for key in sorted(set(ra[3]) | set(rb[3])):
            compare(f"{name} value {key}", ra[3].get(key), rb[3].get(key))
        if len(ra) > 5 and len(rb) > 5:  # dumps made before these were kept have none
            for what, x, y in zip(("understood", "problems", "assumed"), ra[5], rb[5], strict=True):
                compare(f"{name} {what}", x, y)
        if ra[4] is not None and rb[4] is not None:
            if len(ra[4]) != len(rb[4]):
                found.append(f"{name}: {len(ra[4])} trace lines before, {len(rb[4])} after")
            for i, (ta, tb) in enumerate(zip(ra[4], rb[4], strict=False)):
                for field, x, y in zip(("check", "location", "symbol", "value", "unit", "clause", "description"), ta, tb, strict=True):
                    compare(f"{name} trace line {i + 1} {field}", x, y)
    for line in found[:show]:
        print(line)
    if len(found) > show:
        print(f"... and {len(found) - show} more")
    print(f"{len(a)} rows, {numbers} numbers compared; largest relative difference {worst:.3g}; "
          f"{len(found)} differences beyond {rel:g}")
    return 1 if found else 0


def main(argv: list[str] | None = None) -> int:
    p = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    sub = p.add_subparsers(dest="command", required=True)
    d = sub.add_parser("dump", help="check a generated schedule and keep every result")
    d.add_argument("out", type=Path)
    d.add_argument("--spans", type=int, default=2000)
    d.add_argument("--seed", type=int, default=7)
    d.add_argument("--no-trace", action="store_true", help="leave out the trace lines (faster)")
    c = sub.add_parser("diff", help="compare two dumps")
    c.add_argument("before", type=Path)
    c.add_argument("after", type=Path)
    c.add_argument("--rel", type=float, default=0.0, help="relative difference allowed in a number (default 0)")
    c.add_argument("--show", type=int, default=20, help="differences to print (default 20)")
    args = p.parse_args(argv)
    if args.command == "dump":
        dump(args.out, args.spans, args.seed, not args.no_trace)
        return 0
    return diff(args.before, args.after, args.rel, args.show)


if __name__ == "__main__":
    sys.exit(main())
