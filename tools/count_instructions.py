"""Count the machine instructions the checks take per span: a measure of their cost that does not
move with the load of a shared machine (CPU seconds there vary by a third from run to run).

Run from the repository root, with valgrind installed (Debian's package ``valgrind``)::

    python tools/count_instructions.py                 # 512 generated spans, seed 7
    python tools/count_instructions.py --spans 1024 --seed 11

It checks a generated schedule (``beamsched.schedule.samples.generate_schedule``) under
``valgrind --tool=callgrind`` twice: once checking the spans once, once checking them twice with
every value remembered between spans forgotten in between (so the second check costs what the
first did). The difference is the instructions of one ``check_schedule`` of the spans, without
Python's start-up, the imports or the reading; it prints that per span. The same code and
inputs give the same count, within a few hundredths of a per cent, whatever else the machine
is doing; compare two versions by running this in each tree. Each run takes a few minutes.
"""

from __future__ import annotations

import argparse
import os
import re
import shutil
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

# Module-level memos of values that repeat between spans: forgotten before the second check.
REMEMBERED = (("beamsched.checks.context", "_PLACEMENTS"), ("beamsched.checks.context", "_OUTLINES"),
              ("beamsched.checks.context", "_SOLVER_BARS"), ("beamsched.checks.detailing", "_FACES"),
              ("beamsched.engine", "_WORDS"))


def child(schedule: str, times: int) -> None:
    """Read the schedule, check it ``times`` times (the measured part is the difference)."""
    import importlib

    from beamsched.engine import check_schedule
    from beamsched.schedule import read_schedule

    read = read_schedule(schedule)
    check_schedule(read)  # the first check also pays for imports made on first use
    if times > 1:
        for module, name in REMEMBERED:
            getattr(importlib.import_module(module), name, {}).clear()
        check_schedule(read)


def collected(schedule: Path, times: int) -> int:
    """Instructions valgrind counts for a child that checks the schedule ``times`` times."""
    out = subprocess.run(
        ["valgrind", "--tool=callgrind", "--callgrind-out-file=/dev/null", sys.executable, __file__,
         "--child", str(schedule), str(times)],
        cwd=ROOT, capture_output=True, text=True,
        # one hash seed for every run: the hashes of texts set the layout of dictionaries, which
        # moves the count by a per cent or so from run to run otherwise
        env={**os.environ, "PYTHONPATH": str(ROOT), "PYTHONHASHSEED": "0"},
    )
    found = re.search(r"Collected\s*:\s*(\d+)", out.stderr)
    if out.returncode != 0 or not found:
        raise RuntimeError(f"valgrind run failed (exit {out.returncode}):\n{out.stderr[-2000:]}")
    return int(found.group(1))


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--spans", type=int, default=512, help="spans in the generated schedule (default %(default)s)")
    ap.add_argument("--seed", type=int, default=7, help="the generator's seed (default %(default)s)")
    ap.add_argument("--child", nargs=2, help=argparse.SUPPRESS)
    args = ap.parse_args(argv)
    if args.child:
        child(args.child[0], int(args.child[1]))
        return 0
    if shutil.which("valgrind") is None:
        print("valgrind is not installed (Debian: apt-get install valgrind)", file=sys.stderr)
        return 2
    sys.path.insert(0, str(ROOT))
    from beamsched.schedule.samples import generate_schedule

    with tempfile.TemporaryDirectory(prefix="beamsched-count-") as tmp:
        schedule = generate_schedule(Path(tmp) / "generated.xlsx", args.spans, seed=args.seed)
        once, twice = collected(schedule, 1), collected(schedule, 2)
    per_span = (twice - once) / args.spans
    print(f"check_schedule: {per_span:,.0f} instructions per span ({args.spans} generated spans, seed {args.seed})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
