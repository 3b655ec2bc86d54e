"""Benchmark: beamsched end to end against the cost of reading and writing the workbooks.

Run from the repository root (plain Python, not part of the test suite)::

    python benchmarks/run.py                      # 1,000 and 10,000 spans
    python benchmarks/run.py --sizes 100000       # the building-sized schedule (slow)
    python benchmarks/run.py --sizes 1000,10000,100000 --out benchmarks/results.json

For each size it generates a schedule with the project's own generator
(``beamsched.schedule.samples.generate_schedule``: every section type and end condition, a
fixed seed, so the files are the same on every run) and measures, in the same run:

* the **I/O floor**: reading the input with python-calamine (the fastest reader we have
  measured; openpyxl read-only is timed beside it) plus writing a plain workbook with
  xlsxwriter in constant-memory mode holding exactly the cells of beamsched's own results
  workbook (the same values, sheet by sheet, without formats);
* **end to end**: ``beamsched check SCHEDULE -o RESULTS.xlsx`` in a subprocess through the
  console entry point ``beamsched.cli:main`` (the path users run), its wall time and the peak
  resident memory of that process (``VmHWM``, which the process reads of itself as it exits:
  ``ru_maxrss`` of a child on Linux also counts the peak of the process it was started from,
  so it reported this script's own size whenever that was larger than beamsched's);
* the **stages** of the same run in this process: ``read_schedule``, the checks
  (``beamsched.engine.check_schedule``, beams per second) and ``write_results``;
* ``beamsched --help``: the best of five subprocess runs.

It prints a table with the ratio end to end / floor and writes every figure to
``benchmarks/results.json`` (with the machine, the Python and library versions and the git
commit), which the README's performance section quotes.
"""

from __future__ import annotations

import argparse
import gc
import json
import os
import platform
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
if str(ROOT) not in sys.path:
    sys.path.insert(0, str(ROOT))

DEFAULT_SIZES = (1_000, 10_000)
SEED = 7
# The console script ``beamsched`` is ``beamsched.cli:main``; run exactly that.
ENTRY = "import sys; from beamsched.cli import main; sys.exit(main(sys.argv[1:]))"
# The same, writing the process's own peak resident memory (VmHWM) to the file named by
# BEAMSCHED_BENCH_PEAK as it exits.
ENTRY_PEAK = (
    "import atexit, os\n"
    "def _peak():\n"
    "    with open('/proc/self/status') as f, open(os.environ['BEAMSCHED_BENCH_PEAK'], 'w') as out:\n"
    "        out.write(next(line for line in f if line.startswith('VmHWM:')))\n"
    "atexit.register(_peak)\n" + ENTRY
)


def _timed_subprocess(args: list[str], env: dict[str, str] | None = None) -> tuple[float, int, int, float]:
    """Run a command; return (wall seconds, exit code, ru_maxrss of the child in bytes (an
    overstatement on Linux, see the module's notes), CPU seconds of the child: user + system,
    the figure that holds on a shared machine)."""
    t0 = time.perf_counter()
    proc = subprocess.Popen(args, cwd=ROOT, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE,
                            env=None if env is None else {**os.environ, **env})
    _, status, usage = os.wait4(proc.pid, 0)
    wall = time.perf_counter() - t0
    proc.returncode = os.waitstatus_to_exitcode(status)
    err = proc.stderr.read().decode(errors="replace") if proc.stderr else ""
    if proc.returncode not in (0, 1, 2):
        raise RuntimeError(f"{' '.join(args)} exited {proc.returncode}:\n{err}")
    kb = usage.ru_maxrss  # kilobytes on Linux
    return wall, proc.returncode, kb * 1024, usage.ru_utime + usage.ru_stime


def schedule_file(workdir: Path, n: int) -> Path:
    """The generated schedule of n spans (made once per work folder; same seed every time)."""
    from beamsched.schedule.samples import generate_schedule

    path = workdir / f"bench_{n}_seed{SEED}.xlsx"
    if not path.exists():
        t0 = time.perf_counter()
        generate_schedule(path, n, seed=SEED)
        print(f"  generated {path.name} in {time.perf_counter() - t0:.1f} s", flush=True)
    return path


def read_calamine(path: Path) -> tuple[float, float, int]:
    from python_calamine import CalamineWorkbook

    t0, p0 = time.perf_counter(), time.process_time()
    wb = CalamineWorkbook.from_path(str(path))
    cells = 0
    for name in wb.sheet_names:
        for row in wb.get_sheet_by_name(name).to_python():
            cells += sum(1 for v in row if v != "" and v is not None)
    return time.perf_counter() - t0, time.process_time() - p0, cells


def read_openpyxl(path: Path) -> tuple[float, float, int]:
    import openpyxl

    t0, p0 = time.perf_counter(), time.process_time()
    wb = openpyxl.load_workbook(path, read_only=True, data_only=True)
    cells = 0
    for ws in wb.worksheets:
        for row in ws.iter_rows(values_only=True):
            cells += sum(1 for v in row if v is not None)
    wb.close()
    return time.perf_counter() - t0, time.process_time() - p0, cells


def output_cells(path: Path) -> list[tuple[str, list[list]]]:
    """Every sheet of a results workbook as rows of values (read back with calamine)."""
    from python_calamine import CalamineWorkbook

    wb = CalamineWorkbook.from_path(str(path))
    return [(name, wb.get_sheet_by_name(name).to_python()) for name in wb.sheet_names]


def write_plain(sheets: list[tuple[str, list[list]]], path: Path) -> tuple[float, float, int]:
    """The writing floor: the same cells, no formats, xlsxwriter constant-memory mode."""
    import xlsxwriter

    t0, p0 = time.perf_counter(), time.process_time()
    wb = xlsxwriter.Workbook(str(path), {"constant_memory": True})
    cells = 0
    for name, rows in sheets:
        ws = wb.add_worksheet(name[:31])
        for r, row in enumerate(rows):
            # calamine pads rows with "" up to the sheet's width; write only the filled cells
            for c, v in enumerate(row):
                if v == "" or v is None:
                    continue
                ws.write(r, c, v)
                cells += 1
    wb.close()
    return time.perf_counter() - t0, time.process_time() - p0, cells


def stages(path: Path, out: Path) -> dict:
    """read_schedule, the checks and write_results, timed one after another in this process."""
    from beamsched.engine import check_schedule
    from beamsched.report import Report, write_results
    from beamsched.schedule import read_schedule

    gc.collect()
    t0, p0 = time.perf_counter(), time.process_time()
    schedule = read_schedule(path)
    t1, p1 = time.perf_counter(), time.process_time()
    results = check_schedule(schedule)
    t2, p2 = time.perf_counter(), time.process_time()
    write_results(Report(results, schedule), out, [path])
    t3, p3 = time.perf_counter(), time.process_time()
    n = len(results)
    return {
        "read_schedule_s": t1 - t0,
        "checks_s": t2 - t1,
        "checks_beams_per_s": n / (t2 - t1),
        "write_results_s": t3 - t2,
        "read_schedule_cpu_s": p1 - p0,
        "checks_cpu_s": p2 - p1,
        "checks_beams_per_cpu_s": n / (p2 - p1),
        "write_results_cpu_s": p3 - p2,
        "spans": n,
        "trace_lines": sum(len(r.trace) for r in results),
        "check_results": sum(len(r.checks) for r in results),
    }


def help_time(repeat: int = 5) -> float:
    best = float("inf")
    for _ in range(repeat):
        wall, code, _, _ = _timed_subprocess([sys.executable, "-c", ENTRY, "--help"])
        if code != 0:
            raise RuntimeError(f"beamsched --help exited {code}")
        best = min(best, wall)
    return best


def bare_python_time(repeat: int = 5) -> float:
    best = float("inf")
    for _ in range(repeat):
        wall, _, _, _ = _timed_subprocess([sys.executable, "-c", "pass"])
        best = min(best, wall)
    return best


def measure(n: int, workdir: Path) -> dict:
    print(f"\n{n:,} spans", flush=True)
    src = schedule_file(workdir, n)
    res: dict = {"spans": n, "input_bytes": src.stat().st_size}
    res["read_calamine_s"], res["read_calamine_cpu_s"], res["input_cells"] = read_calamine(src)
    res["read_openpyxl_s"], res["read_openpyxl_cpu_s"], _ = read_openpyxl(src)
    print(f"  read: calamine {res['read_calamine_s']:.2f} s, openpyxl read-only {res['read_openpyxl_s']:.2f} s",
          flush=True)

    out = workdir / f"bench_{n}_results.xlsx"
    peak_file = workdir / f"bench_{n}_peak.txt"
    peak_file.unlink(missing_ok=True)
    wall, code, _, cpu = _timed_subprocess([sys.executable, "-c", ENTRY_PEAK, "check", str(src), "-o", str(out)],
                                           env={"BEAMSCHED_BENCH_PEAK": str(peak_file)})
    rss = int(peak_file.read_text().split()[1]) * 1024  # "VmHWM:  139456 kB"
    res.update(end_to_end_s=wall, end_to_end_cpu_s=cpu, exit_code=code, peak_rss_mb=rss / 2**20,
               output_bytes=out.stat().st_size)
    print(f"  beamsched check: {wall:.2f} s ({cpu:.2f} s CPU), peak RSS {rss / 2**20:.0f} MB (exit {code})",
          flush=True)

    sheets = output_cells(out)
    res["output_sheets"] = {name: sum(1 for row in rows for v in row if v != "" and v is not None)
                            for name, rows in sheets}
    res["write_plain_s"], res["write_plain_cpu_s"], res["output_cells"] = write_plain(
        sheets, workdir / f"bench_{n}_plain.xlsx")
    del sheets
    gc.collect()
    res["floor_s"] = res["read_calamine_s"] + res["write_plain_s"]
    res["floor_cpu_s"] = res["read_calamine_cpu_s"] + res["write_plain_cpu_s"]
    res["ratio_end_to_end_over_floor"] = wall / res["floor_s"]
    res["ratio_cpu"] = cpu / res["floor_cpu_s"]
    print(f"  floor: read {res['read_calamine_s']:.2f} s + plain write of {res['output_cells']:,} cells "
          f"{res['write_plain_s']:.2f} s = {res['floor_s']:.2f} s ({res['floor_cpu_s']:.2f} s CPU); "
          f"ratio {res['ratio_end_to_end_over_floor']:.2f} wall, {res['ratio_cpu']:.2f} CPU", flush=True)

    st = stages(src, workdir / f"bench_{n}_stages.xlsx")
    res["stages"] = st
    print(f"  stages: read_schedule {st['read_schedule_s']:.2f} s, checks {st['checks_s']:.2f} s "
          f"({st['checks_beams_per_s']:,.0f} beams/s; {st['checks_beams_per_cpu_s']:,.0f} per CPU second), "
          f"write_results {st['write_results_s']:.2f} s", flush=True)
    return res


def git_commit() -> str:
    try:
        out = subprocess.run(["git", "rev-parse", "--short", "HEAD"], cwd=ROOT, capture_output=True, text=True)
        dirty = subprocess.run(["git", "status", "--porcelain", "--", "beamsched"], cwd=ROOT,
                               capture_output=True, text=True).stdout.strip()
        return out.stdout.strip() + (" (beamsched/ has uncommitted changes)" if dirty else "")
    except OSError:
        return ""


def versions() -> dict:
    from importlib import metadata

    out = {"python": platform.python_version()}
    for pkg in ("numpy", "openpyxl", "xlsxwriter", "python-calamine", "pandas", "pint"):
        try:
            out[pkg] = metadata.version(pkg)
        except metadata.PackageNotFoundError:
            out[pkg] = None
    return out


def print_table(sizes: list[dict], help_s: float) -> None:
    print("\n  spans | floor s (read + write) | end to end s | ratio | CPU ratio | checks beams/s | peak RSS MB")
    print("--------|------------------------|--------------|-------|-----------|----------------|------------")
    for r in sizes:
        floor = f"{r['floor_s']:.2f} ({r['read_calamine_s']:.2f} + {r['write_plain_s']:.2f})"
        print(f"{r['spans']:>7} | {floor:>22} | {r['end_to_end_s']:>12.2f} | {r['ratio_end_to_end_over_floor']:>5.2f} | "
              f"{r['ratio_cpu']:>9.2f} | {r['stages']['checks_beams_per_s']:>14,.0f} | {r['peak_rss_mb']:>10.0f}")
    print(f"beamsched --help: {help_s * 1000:.0f} ms (best of 5)")


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--sizes", default=",".join(str(s) for s in DEFAULT_SIZES),
                    help="comma-separated numbers of spans (default: %(default)s)")
    ap.add_argument("--out", default=str(ROOT / "benchmarks" / "results.json"), help="where to write the figures")
    ap.add_argument("--workdir", default=None,
                    help="folder for the generated schedules and outputs (default: a temporary folder); "
                         "the schedules are reused when they are already there")
    args = ap.parse_args(argv)
    sizes = [int(s.replace("_", "")) for s in args.sizes.split(",") if s.strip()]
    t_start = time.perf_counter()
    with tempfile.TemporaryDirectory(prefix="beamsched-bench-") as tmp:
        workdir = Path(args.workdir) if args.workdir else Path(tmp)
        workdir.mkdir(parents=True, exist_ok=True)
        results = [measure(n, workdir) for n in sizes]
    help_s = help_time()
    python_s = bare_python_time()
    print_table(results, help_s)
    total = time.perf_counter() - t_start
    doc = {
        "command": "python benchmarks/run.py --sizes " + ",".join(str(s) for s in sizes),
        "when": time.strftime("%Y-%m-%dT%H:%M:%SZ", time.gmtime()),
        "git_commit": git_commit(),
        "machine": {"cpus": os.cpu_count(), "platform": platform.platform(), "processor": platform.processor()},
        "versions": versions(),
        "seed": SEED,
        "help_s": help_s,
        "bare_python_startup_s": python_s,
        "load_average_at_end": os.getloadavg(),
        "benchmark_wall_s": total,
        "sizes": results,
        "self_peak_rss_mb": resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024,
    }
    out = Path(args.out)
    out.parent.mkdir(parents=True, exist_ok=True)
    tmp_out = out.with_suffix(out.suffix + ".tmp")
    tmp_out.write_text(json.dumps(doc, indent=2) + "\n", encoding="utf-8")
    os.replace(tmp_out, out)
    print(f"benchmark took {total:.0f} s; figures written to {out}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
