"""Command line: ``beamsched check``, ``beamsched demo``, ``beamsched template``.

Exit codes (for scripts and QA gates):

* 0: every span passes;
* 1: at least one span fails or is incomplete (and every row was read);
* 2: some rows could not be read, the input could not be read, an output could not be written,
  or the command was misused.

Heavy libraries (pandas, openpyxl, xlsxwriter, pint) are imported only inside the commands, so
``beamsched --help`` answers at once.
"""

from __future__ import annotations

import argparse
import os
import signal
import sys
import textwrap
import traceback
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import TextIO

from . import CAUTION, __version__

EXIT_PASS = 0
EXIT_FINDINGS = 1
EXIT_UNREADABLE = 2

RESULTS_SUFFIX = "_beamsched"
ANNOTATED_SUFFIX = "_beamsched_checked"
TEMPLATE_NAME = "beamsched_template.xlsx"
PROGRESS_MIN_ROWS = 20

EXIT_CODES_HELP = """\
exit codes:
  0  every span passes
  1  at least one span fails or is incomplete (every row was read)
  2  some rows could not be read, the input could not be read, an output could not be written,
     or the command was misused"""


class UsageError(Exception):
    """The command cannot run as asked; the message is one line."""


class Terminated(BaseException):
    """The process was asked to stop (SIGTERM, SIGHUP): unwinds like Ctrl-C, so that every
    temporary output file is removed and every earlier output is left as it was."""


def one_line(message: object) -> str:
    """A message on one line (a library's exception text may hold line breaks)."""
    return " ".join(str(message).split())


# Whose calculation the Working sheet holds (beamsched.report.table.WORKING_CHOICES, repeated
# here so that --help need not import the report package; a test keeps the two equal).
WORKING_CHOICES = ("all", "flagged", "none")

# The input limits: (Limits field, option, metavar, type, default shown in --help, help). The limits
# themselves are beamsched.schedule.guard.Limits; its defaults are repeated here only for the help
# text, because importing the reader would load pint before --help answers (a test keeps the two
# equal). A refusal names the option that lifts the limit it hit.
LIMIT_OPTIONS = (
    ("file_mb", "--max-file-mb", "MB", float, "100", "largest schedule file read"),
    ("unzipped_mb", "--max-unzipped-mb", "MB", float, "1,000", "largest total of a workbook's parts, decompressed"),
    ("ratio", "--max-ratio", "N", float, "100", "largest compression ratio of one part over 1 MB (a bomb guard)"),
    ("parts", "--max-parts", "N", int, "5,000", "most parts (zip members) in a workbook package"),
    ("sheets", "--max-sheets", "N", int, "200", "most sheets in a workbook"),
    ("rows", "--max-rows", "N", int, "250,000", "the last row a sheet (or a CSV file) may reach"),
    ("columns", "--max-columns", "N", int, "1,000", "the last column a sheet (or a CSV row) may reach"),
    ("cells", "--max-cells", "N", int, "10,000,000", "most cells of one sheet, its last row times its last column"),
)


def _positive(kind):
    def parse(text: str):
        try:
            value = kind(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"expected a {'whole ' if kind is int else ''}number, got {text!r}") from None
        if not value > 0 or value != value or value == float("inf"):
            raise argparse.ArgumentTypeError(f"expected a finite number greater than zero, got {text!r}")
        return value
    parse.__name__ = kind.__name__
    return parse


# -- argument parsing ----------------------------------------------------------------------------
class _Parser(argparse.ArgumentParser):
    def error(self, message: str):  # one line, the usage, and exit code 2
        self.print_usage(sys.stderr)
        self.exit(EXIT_UNREADABLE, f"{self.prog}: error: {message}\n")


def build_parser() -> argparse.ArgumentParser:
    fmt = argparse.RawDescriptionHelpFormatter
    caution = "\n".join(textwrap.wrap("CAUTION: " + CAUTION, 92))
    parser = _Parser(
        prog="beamsched", formatter_class=fmt,
        description="Check a floor's reinforced-concrete beam schedule against CSA A23.3-19 and write a "
                    "colour-coded results workbook.",
        epilog=f"{EXIT_CODES_HELP}\n\nRun 'beamsched COMMAND --help' for each command.\n\n{caution}",
    )
    parser.add_argument("--version", action="version", version=f"beamsched {__version__}")
    common = argparse.ArgumentParser(add_help=False)
    common.add_argument("--debug", action="store_true",
                        help="on an error, also print the Python traceback (for a bug report)")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)

    check = sub.add_parser(
        "check", formatter_class=fmt, help="check a schedule and write the results", parents=[common],
        description="Check every span of a beam schedule (.xlsx, .xlsm or .csv) and write the results workbook.\n"
                    "The input file is only read; it is never modified or overwritten. Every output is written\n"
                    "to a temporary file and moved into place, so a failure never leaves half a file.",
        epilog=textwrap.dedent(f"""\
            outputs:
              results workbook  always; default: beside the schedule, named SCHEDULE{RESULTS_SUFFIX}.xlsx.
                                Sheets: Overview, Spans, Working, Input problems, About.
              --json FILE       JSON for scripts (schema 1: one entry per span with status, checks, values).
              --csv FILE        one flat row per span.
              --annotate        a copy of the schedule workbook named SCHEDULE{ANNOTATED_SUFFIX}.xlsx (or .xlsm),
                                beside the results workbook, with result columns to the right of the table.

            examples:
              beamsched check level3_beams.xlsx
              beamsched check level3_beams.xlsx -o results/level3.xlsx --json results/level3.json --annotate
              beamsched check export.csv --csv export_results.csv

            {EXIT_CODES_HELP}

            {caution}"""))
    check.add_argument("schedule", metavar="SCHEDULE", help="the beam schedule: .xlsx, .xlsm or .csv")
    check.add_argument("-o", "--output", metavar="RESULTS.xlsx",
                       help=f"the results workbook (default: SCHEDULE{RESULTS_SUFFIX}.xlsx beside the schedule)")
    check.add_argument("--json", metavar="FILE", help="also write the results as JSON")
    check.add_argument("--csv", metavar="FILE", help="also write one CSV row per span")
    check.add_argument("--annotate", action="store_true",
                       help="also write a checked copy of the schedule workbook with the results beside each span")
    check.add_argument("--sheet", metavar="NAME",
                       help="the sheet holding the schedule (default: the first sheet with a 'Mark' header)")
    check.add_argument("--working", choices=WORKING_CHOICES, default="all",
                       help="whose calculation the Working sheet holds: every span's (all, the default), only the "
                            "spans that fail, are incomplete or could not be checked (flagged: a much smaller "
                            "workbook for a large schedule), or none")
    limits = check.add_argument_group(
        "limits on the input",
        "A file past a limit is refused before it is parsed, with a message naming the limit and the option\n"
        "that lifts it. Raise a limit only for a file you trust.")
    for fld, option, metavar, kind, shown, words in LIMIT_OPTIONS:
        limits.add_argument(option, dest=f"limit_{fld}", metavar=metavar, type=_positive(kind), default=None,
                            help=f"{words} (default {shown})")
    check.set_defaults(func=_cmd_check)

    demo = sub.add_parser(
        "demo", formatter_class=fmt, help="check the bundled sample schedule", parents=[common],
        description="Check the sample schedule that ships with beamsched (an invented floor) and write its\n"
                    f"results workbook, named SAMPLE{RESULTS_SUFFIX}.xlsx, into the output directory.\n"
                    "The sample holds failing spans and unreadable rows on purpose, to show how they are\n"
                    "reported; demo exits 0 once the results are written, and 2 if they could not be.",
        epilog=caution)
    demo.add_argument("--output-dir", metavar="DIR", default=None,
                      help="where to write the results (default: the current directory)")
    demo.set_defaults(func=_cmd_demo)

    tpl = sub.add_parser(
        "template", formatter_class=fmt, help="write a blank schedule workbook to fill in", parents=[common],
        description="Write a blank schedule workbook: the header with units, a help comment on each header\n"
                    "cell, drop-down lists, and a Parameters sheet for the project defaults. An existing file\n"
                    "is not overwritten unless --force is given.",
        epilog="exit codes: 0 written; 2 not written (the message says why)")
    tpl.add_argument("path", metavar="PATH", nargs="?", default=TEMPLATE_NAME,
                     help=f"where to write it (default: {TEMPLATE_NAME} in the current directory)")
    tpl.add_argument("--force", action="store_true", help="replace an existing file at PATH")
    tpl.set_defaults(func=_cmd_template)
    return parser


def main(argv: list[str] | None = None) -> int:
    """The console entry point; returns the exit code."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
    except SystemExit as exc:  # --help, --version (0) or a usage error (2)
        return exc.code if isinstance(exc.code, int) else EXIT_UNREADABLE
    if args.command is None:
        parser.print_help(sys.stderr)
        return EXIT_UNREADABLE
    debug = bool(getattr(args, "debug", False))
    previous = _catch_termination()
    try:
        return args.func(args)
    except UsageError as exc:
        _show_traceback(debug)
        print(f"beamsched: {one_line(exc)}", file=sys.stderr)
        return EXIT_UNREADABLE
    except (KeyboardInterrupt, Terminated) as exc:
        why = "interrupted" if isinstance(exc, KeyboardInterrupt) else "stopped"
        print(f"beamsched: {why}; no partial output was left behind, and earlier outputs are unchanged",
              file=sys.stderr)
        return EXIT_UNREADABLE
    except Exception as exc:  # a bug: one line for the user, the traceback with --debug
        if debug:
            traceback.print_exc()
        print(f"beamsched: internal error ({type(exc).__name__}: {one_line(exc)}); no partial output was left "
              "behind. Run again with --debug for the traceback, and report it with the file if you can",
              file=sys.stderr)
        return EXIT_UNREADABLE
    finally:
        _restore_signals(previous)


def _show_traceback(debug: bool) -> None:
    if debug and sys.exc_info()[0] is not None:
        traceback.print_exc()


def _terminate(signum, frame):
    raise Terminated(signum)


def _catch_termination() -> dict:
    """SIGTERM (and SIGHUP) unwind like Ctrl-C, so that temporary outputs are cleaned up."""
    previous = {}
    for name in ("SIGTERM", "SIGHUP"):
        sig = getattr(signal, name, None)
        if sig is None:
            continue
        try:
            previous[sig] = signal.signal(sig, _terminate)
        except (ValueError, OSError):  # not the main thread, or not allowed here
            pass
    return previous


def _restore_signals(previous: dict) -> None:
    for sig, handler in previous.items():
        try:
            signal.signal(sig, handler)
        except (ValueError, OSError, TypeError):
            pass


# -- progress -----------------------------------------------------------------------------------
class Progress:
    """A one-line progress bar on a terminal; silent when the stream is not one."""

    def __init__(self, total: int, stream: TextIO | None = None, label: str = "checking"):
        self.stream = stream if stream is not None else sys.stderr
        self.total, self.label = total, label
        self.enabled = total >= PROGRESS_MIN_ROWS and _isatty(self.stream)
        self._shown = -1

    def update(self, done: int) -> None:
        if not self.enabled:
            return
        pct = int(100 * done / max(self.total, 1))
        if pct == self._shown:
            return
        self._shown = pct
        width = 30
        filled = width * done // max(self.total, 1)
        self.stream.write(f"\r{self.label} [{'#' * filled}{'.' * (width - filled)}] {done}/{self.total} spans")
        self.stream.flush()

    def message(self, text: str) -> None:
        if self.enabled:
            self.stream.write(f"\r{text:<70}")
            self.stream.flush()

    def done(self) -> None:
        if self.enabled:
            self.stream.write("\r" + " " * 78 + "\r")
            self.stream.flush()


def _isatty(stream) -> bool:
    try:
        return bool(stream.isatty())
    except (AttributeError, ValueError):
        return False


# -- the run ------------------------------------------------------------------------------------
@dataclass
class Plan:
    schedule: Path
    output: Path
    json: Path | None = None
    csv: Path | None = None
    annotate: Path | None = None
    sheet: str | None = None
    limits: object = None  # beamsched.schedule.guard.Limits; None: the defaults
    debug: bool = False
    working: str = "all"  # whose calculation the Working sheet holds (WORKING_CHOICES)


@dataclass
class Outcome:
    code: int
    written: list[tuple[str, Path]] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)


def default_output(schedule: Path) -> Path:
    return schedule.with_name(f"{schedule.stem}{RESULTS_SUFFIX}.xlsx")


def annotated_name(schedule: Path, folder: Path) -> Path:
    return folder / f"{schedule.stem}{ANNOTATED_SUFFIX}{schedule.suffix.lower()}"


def make_plan(schedule: str, output: str | None, json: str | None, csv: str | None, annotate: bool,
              sheet: str | None, limits=None, debug: bool = False) -> Plan:
    """Settle every path, and refuse what cannot be done, before anything is read or written."""
    from .report.atomic import OutputError, refuse_unwritable, same_file

    src = Path(schedule)
    if not src.exists():
        raise UsageError(f"cannot read {src}: no such file")
    if src.is_dir():
        raise UsageError(f"cannot read {src}: it is a folder, not a schedule file")
    out = Path(output) if output else default_output(src)
    if out.suffix.lower() != ".xlsx":
        raise UsageError(f"the results workbook {out} must be named .xlsx")
    plan = Plan(src, out, Path(json) if json else None, Path(csv) if csv else None, None, sheet, limits, debug)
    if annotate:
        if src.suffix.lower() not in (".xlsx", ".xlsm"):
            raise UsageError(f"--annotate needs an .xlsx or .xlsm schedule; {src.name} is not one")
        plan.annotate = annotated_name(src, out.parent)
    outputs = [("results workbook", plan.output), ("JSON", plan.json), ("CSV", plan.csv),
               ("annotated copy", plan.annotate)]
    outputs = [(k, p) for k, p in outputs if p is not None]
    for kind, p in outputs:
        if same_file(p, src):
            raise UsageError(f"refusing to write the {kind} to {p}: it is the input schedule, which beamsched never "
                             "overwrites; choose another name")
        if p.is_dir():
            raise UsageError(f"cannot write the {kind} to {p}: it is a folder")
        folder = p.parent if str(p.parent) else Path(".")
        if not folder.is_dir():
            raise UsageError(f"cannot write the {kind} to {p}: the folder {folder} does not exist (create it first)")
        if not os.access(folder, os.W_OK):
            raise UsageError(f"cannot write the {kind} to {p}: the folder {folder} is not writable (permission "
                             "denied); choose another folder")
        try:
            refuse_unwritable(p)
        except OutputError as exc:
            raise UsageError(f"the {kind}: {exc}") from exc
    for i, (kind, p) in enumerate(outputs):
        for kind2, p2 in outputs[i + 1:]:
            if same_file(p, p2):
                raise UsageError(f"the {kind} and the {kind2} would both be written to {p}; give them different names")
    return plan


def check_rows(schedule, progress: Progress):
    """Check every row in schedule order through the engine (a chunk of spans at a time: the
    progress bar moves after each chunk)."""
    from .codes import get_code
    from .engine import check_schedule

    try:
        code = get_code(schedule.code)
    except KeyError as exc:
        raise UsageError(str(exc).strip("'\"")) from exc
    return check_schedule(schedule, code, progress=progress.update)


def run(plan: Plan, out: TextIO | None = None, err: TextIO | None = None, demo: bool = False) -> Outcome:
    """Read, check and write as planned; print the summary. Returns the exit code and the files."""
    out = out if out is not None else sys.stdout
    err = err if err is not None else sys.stderr
    from .report import OutputError, Report, write_annotated, write_csv, write_json, write_results
    from .schedule import ScheduleError, read_schedule

    try:  # read_schedule refuses a hostile or broken file (beamsched.schedule.guard) before parsing it
        schedule = read_schedule(plan.schedule, sheet=plan.sheet, limits=plan.limits)
    except ScheduleError as exc:
        _show_traceback(plan.debug)
        print(f"beamsched: {one_line(exc)}", file=err)
        return Outcome(EXIT_UNREADABLE)
    except OSError as exc:
        _show_traceback(plan.debug)
        print(f"beamsched: cannot read {plan.schedule}: {one_line(exc.strerror or exc)}", file=err)
        return Outcome(EXIT_UNREADABLE)
    if not schedule.rows:
        print(f"beamsched: {plan.schedule.name}: the schedule table has no spans under its header", file=err)
        return Outcome(EXIT_UNREADABLE)
    progress = Progress(len(schedule.rows), err)
    results = check_rows(schedule, progress)
    report = Report(results, schedule, working=plan.working)
    outcome = Outcome(exit_code(report))
    protected = [plan.schedule]
    jobs = [("Results workbook", plan.output, lambda p: write_results(report, p, protected))]
    if plan.json:
        jobs.append(("JSON", plan.json, lambda p: write_json(report, p, protected)))
    if plan.csv:
        jobs.append(("CSV", plan.csv, lambda p: write_csv(report, p, protected)))
    if plan.annotate:
        jobs.append(("Annotated copy", plan.annotate, lambda p: write_annotated(report, plan.schedule, p, protected)))
    for kind, path, job in jobs:
        progress.message(f"writing the {kind.lower()} ...")
        try:
            result = job(path)
        except OutputError as exc:
            progress.done()
            _show_traceback(plan.debug)
            print(f"beamsched: {one_line(exc)}", file=err)
            outcome.code = EXIT_UNREADABLE
            continue
        except OSError as exc:
            progress.done()
            _show_traceback(plan.debug)
            hint = (" (is the file open in another program, or read-only?)"
                    if isinstance(exc, PermissionError) else "")
            print(f"beamsched: could not write the {kind.lower()} {path}: {one_line(exc.strerror or exc)}{hint}; "
                  "nothing was left half-written at that name, and an earlier file there is unchanged", file=err)
            outcome.code = EXIT_UNREADABLE
            continue
        outcome.written.append((kind, Path(path)))
        lost = getattr(result, "lost", None)
        if lost:
            note = (f"the annotated copy does not carry {'; '.join(lost)} of the original (the copy's first sheet "
                    "says so); open the original for them")
            outcome.notes.append(note)
            print(f"beamsched: note: {note}", file=err)
    progress.done()
    print_summary(report, outcome, out, demo)
    return outcome


def exit_code(report) -> int:
    from .model import BeamStatus

    if report.count(BeamStatus.ERROR) or any(p.severity == "error" for p in report.schedule.problems):
        return EXIT_UNREADABLE
    if report.count(BeamStatus.FAIL) or report.count(BeamStatus.INCOMPLETE):
        return EXIT_FINDINGS
    return EXIT_PASS


EXIT_WORDS = {
    EXIT_PASS: "every span passes",
    EXIT_FINDINGS: "at least one span fails or is incomplete",
    EXIT_UNREADABLE: "some rows or files could not be read or written",
}


def print_summary(report, outcome: Outcome, out: TextIO, demo: bool = False) -> None:
    from .model import BeamStatus
    from .report.palette import SPAN_STATUS, format_utilisation
    from .report.table import check_display

    s = report.schedule
    w = out.write
    w(f"beamsched {report.version}, {s.code}: {Path(s.path).name}" + (f", sheet '{s.sheet}'" if s.sheet else "") + "\n")
    counts = report.counts
    parts = [f"{counts[st]} {SPAN_STATUS[st].word}" for st in (BeamStatus.PASS, BeamStatus.FAIL,
                                                               BeamStatus.INCOMPLETE, BeamStatus.ERROR)]
    w(f"{len(report.results)} rows: " + ", ".join(parts) + "\n")
    worst = report.worst(10)
    if worst:
        w("\nWorst spans (largest utilisation first):\n")
        wl = max(len(x.label) for x in worst)
        w(f"  {'span':<{wl}}  {'row':>5}  {'utilisation':>15}  {'status':<10}  governing\n")
        for x in worst:
            g = x.governing
            row = "" if x.result.row is None else str(x.result.row)
            w(f"  {x.label:<{wl}}  {row:>5}  {format_utilisation(x.utilisation):>15}  "
              f"{SPAN_STATUS[x.status].word:<10}  {check_display(g) if g else ''}\n")
    incomplete = report.incomplete(10)
    if incomplete:
        n = counts[BeamStatus.INCOMPLETE]
        w(f"\nIncomplete spans (a required check could not be made; never a pass){'' if n <= 10 else ', the first 10'}:\n")
        for x in incomplete:
            row = "" if x.result.row is None else f"row {x.result.row}"
            w(f"  {x.label} ({row}): {x.first_note}\n")
    problems = report.all_problems()
    errors = [(r, lbl, p) for r, lbl, p in problems if p.severity == "error"]
    if errors:
        w(f"\n{len(errors)} input problem{'s' if len(errors) != 1 else ''} (all are on the 'Input problems' sheet):\n")
        for r, _lbl, p in errors[:10]:
            where = f"row {r}" if r is not None else "file"
            msg = p.message
            if msg.lower().startswith((where + ",", where + ":")):
                msg = msg[len(where) + 1:].strip()
            w(f"  {where}: {msg}\n")
        if len(errors) > 10:
            w(f"  ... and {len(errors) - 10} more\n")
    if outcome.written:
        w("\nWritten:\n")
        for kind, path in outcome.written:
            w(f"  {kind + ':':<18} {path.resolve()}\n")
    for note in outcome.notes:
        w(f"Note: {note}\n")
    if demo:
        w(f"\n'beamsched check' of this schedule would exit {outcome.code}: {EXIT_WORDS[outcome.code]}.\n")
    else:
        w(f"\nExit code {outcome.code}: {EXIT_WORDS[outcome.code]}.\n")
    w(f"\nCAUTION: {CAUTION}\n")


# -- commands -----------------------------------------------------------------------------------
def limits_from(args):
    """The input limits: the defaults, with each option given on the command line."""
    from .schedule.guard import Limits

    given = {fld: getattr(args, f"limit_{fld}", None) for fld, *_ in LIMIT_OPTIONS}
    return replace(Limits(), **{k: v for k, v in given.items() if v is not None})


def _cmd_check(args) -> int:
    plan = make_plan(args.schedule, args.output, args.json, args.csv, args.annotate, args.sheet,
                     limits_from(args), args.debug)
    plan.working = args.working
    return run(plan).code


def _cmd_demo(args) -> int:
    folder = Path(args.output_dir) if args.output_dir else Path.cwd()
    if not folder.is_dir():
        raise UsageError(f"the output directory {folder} does not exist")
    try:
        from .schedule.samples import sample_path
    except ImportError as exc:
        raise UsageError(f"the bundled sample schedule is not installed ({exc})") from exc
    sample = Path(sample_path())
    output = folder / f"{sample.stem}{RESULTS_SUFFIX}.xlsx"
    print(f"Checking the bundled sample schedule {sample}")
    print("(an invented floor; some spans fail and some rows are unreadable on purpose)\n")
    outcome = run(make_plan(str(sample), str(output), None, None, False, None, debug=args.debug), demo=True)
    if not any(kind == "Results workbook" for kind, _ in outcome.written):
        return EXIT_UNREADABLE
    print(f"\nThe demo results are in {output.resolve()}")
    return EXIT_PASS


def _cmd_template(args) -> int:
    from .report.atomic import OutputError, atomic_path
    from .schedule.template import write_template

    path = Path(args.path)
    if path.suffix.lower() != ".xlsx":
        raise UsageError(f"the template {path} must be named .xlsx")
    if path.exists() and not args.force:
        raise UsageError(f"{path} already exists; give another name, or --force to replace it")
    try:
        with atomic_path(path) as tmp:
            write_template(tmp)
    except (OutputError, OSError) as exc:
        raise UsageError(f"could not write the template {path}: {getattr(exc, 'strerror', None) or exc}") from exc
    print(f"Wrote a blank schedule template to {path.resolve()}")
    print("Fill in one row per span (the header comments say what each column holds), then run "
          f"'beamsched check {path.name}'.")
    return EXIT_PASS


if __name__ == "__main__":
    sys.exit(main())
