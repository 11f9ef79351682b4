"""The `mrlift` command line: scan, convert (rich tables and progress, --json on scan)."""
from __future__ import annotations

import argparse
import json
import sys
import time
from contextlib import contextmanager
from pathlib import Path

from rich.console import Console
from rich.markup import escape
from rich.progress import BarColumn, Progress, TextColumn
from rich.table import Table

from migrate import __version__
from migrate.batch import default_jobs
from migrate.convert import OutputFolderError
from migrate.java.source import MAX_FILE_BYTES
from migrate.pathmap import PathMapError, load_path_map
from migrate.report.effort import EffortConfigError, load_model
from migrate.report.render import where
from migrate.scan import RepoScan, scan_repo

STATUS_STYLE = {"converted": "green", "partial": "yellow", "not_converted": "red"}


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="mrlift", description="Lift legacy Hadoop MapReduce jobs (Java) to PySpark "
                                "DataFrame scripts, and report what is left for hand translation.")
    p.add_argument("--version", action="version", version=f"mrlift {__version__}")
    sub = p.add_subparsers(dest="command", required=True, metavar="COMMAND")
    s = sub.add_parser("scan", help="list the jobs of a repository, their classes and what was recognised")
    s.add_argument("path", type=Path, help="folder (or one .java file) of the legacy repository")
    s.add_argument("--json", action="store_true", help="print the inventory as JSON")
    _size_option(s)
    c = sub.add_parser("convert", help="write one PySpark script per job plus report.json and report.md")
    c.add_argument("path", type=Path, help="folder (or one .java file) of the legacy repository")
    c.add_argument("-o", "--output", type=Path, required=True, help="folder for the scripts and the report")
    c.add_argument("--force", action="store_true", help="write into a non-empty folder mrlift did not create")
    _size_option(c)
    c.add_argument("--effort", type=Path, metavar="FILE",
                   help="TOML file with effort constants, category profiles and your own PERT hours per category "
                        "(see README, Effort)")
    check = c.add_mutually_exclusive_group()
    check.add_argument("--compile-check", dest="compile_check", action="store_const", const="on", default="auto",
                       help="require javac: a job whose files javac rejects is not converted, with javac's message "
                            "at each line (by default javac runs where a JDK and Hadoop jars are found, and a file "
                            "whose imported libraries are missing is noted, not declined)")
    check.add_argument("--no-compile-check", dest="compile_check", action="store_const", const="off",
                       help="do not run javac: only mrlift's own checks of what javac would reject")
    c.add_argument("--classpath", help="jars javac compiles against (default: HADOOP_HOME, `hadoop classpath`, or "
                   "the Hadoop jars the pyspark wheel ships; plus the repository's lib/*.jar)")
    c.add_argument("--with-tests", action="store_true",
                   help="also write tests/test_<script>.py per job (the verify comparison, for your own CI) and a "
                        "tests/runs.json to fill with sample data")
    c.add_argument("-j", "--jobs", type=_processes, default=default_jobs(), metavar="N",
                   help="processes to work with (default: the machine's cores, here %(default)s); the output is the "
                        "same whatever N")
    cache = c.add_mutually_exclusive_group()
    cache.add_argument("--cache", type=Path, metavar="DIR",
                       help="folder for what a run works out, by content hash, so that a re-run redoes only what "
                            "changed (default: .mrlift-cache in the output folder)")
    cache.add_argument("--no-cache", dest="cache", action="store_false", help="keep no cache")
    c.add_argument("--path-map", type=Path, metavar="FILE",
                   help="TOML file whose [paths] table maps old storage prefixes (hdfs://...) to new ones")
    v = sub.add_parser("verify", help="run the original jobs (Hadoop local runner) and their scripts (local Spark) "
                       "on sample data and compare the outputs; verdicts go into the report",
                       description="Runs each original job on Hadoop's local runner and its script on local Spark "
                       "over copies of the same sample data, and compares the outputs. WARNING: this executes the "
                       "repository's Java code (each driver's main()) with your rights on this machine: run it on "
                       "code you trust, or as a user or in a container that can reach only the checkout and the "
                       "data. Runs file paths are relative to the runs file's folder and must lie inside its data "
                       "folder; a job that changes files outside its output folder gets an error verdict.")
    v.add_argument("output", type=Path, help="the folder `mrlift convert` wrote (scripts and report.json)")
    data = v.add_mutually_exclusive_group(required=True)
    data.add_argument("--runs", type=Path, metavar="FILE",
                      help="JSON file with each job's driver arguments on sample data (see samples/*/runs.json)")
    data.add_argument("--data", type=Path, metavar="DIR", help="a folder per job, named like its script, holding "
                      "the job's input")
    v.add_argument("--source", type=Path, help="the legacy sources (default: where convert read them)")
    v.add_argument("--classpath", help="Hadoop jars to compile and run with (default: HADOOP_HOME, `hadoop "
                   "classpath`, or the jars the pyspark wheel ships)")
    v.add_argument("--timeout", type=float, default=300, help="seconds each run may take (default: %(default)s)")
    v.add_argument("--sample", type=int, metavar="N", help="use only the first N lines of every input file")
    v.add_argument("--tolerance", type=float, metavar="REL",
                   help="let numbers differ by this relative amount (floating sums depend on the order of addition)")
    v.add_argument("--job", action="append", metavar="NAME", help="check only this job (name or script); repeatable")
    return p


def _megabytes(text: str) -> int:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a number of megabytes") from None
    if not value > 0:
        raise argparse.ArgumentTypeError("the limit must be more than 0 MB")
    return int(value * 1024 * 1024)


def _processes(text: str) -> int:
    try:
        n = int(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a number of processes") from None
    if n < 1:
        raise argparse.ArgumentTypeError("at least 1 process")
    return n


@contextmanager
def progress_display(console: Console):
    """A progress callback: on a terminal a bar with files and jobs per second and the time left;
    otherwise a plain line now and then (a CI log is not redrawn)."""
    start = time.monotonic()

    def rates(c) -> str:
        took = max(time.monotonic() - start, 1e-6)
        files = min(c.files, c.files_total)
        left = (took / files * (c.files_total - files)) if files else None
        return (f"{files}/{c.files_total} files, {c.jobs} jobs ({files / took:.0f} files/s, {c.jobs / took:.1f} "
                f"jobs/s)" + (f", about {left:.0f} s left" if left is not None and files < c.files_total else ""))

    if console.is_terminal:
        with Progress(TextColumn("{task.description}"), BarColumn(), TextColumn("{task.fields[rates]}"),
                      console=console, transient=True) as bar:
            t = bar.add_task("converting", total=None, rates="surveying the files")

            def show(c) -> None:
                bar.update(t, total=max(c.files_total, 1), completed=min(c.files, c.files_total), rates=rates(c))

            yield show
        return
    last = [0.0]

    def show(c) -> None:
        now = time.monotonic()
        if now - last[0] >= 5 or c.shards == c.shards_total:
            last[0] = now
            console.print(f"mrlift: {rates(c)}", highlight=False)

    yield show


def _size_option(p: argparse.ArgumentParser) -> None:
    p.add_argument("--max-file-size", type=_megabytes, default=MAX_FILE_BYTES, metavar="MB",
                   help=f"skip (and report) Java files larger than this (default: {MAX_FILE_BYTES // 2**20} MB)")


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    # not a terminal (a pipe, a CI log): wide enough that no table cell is cut to "…"
    console = Console(soft_wrap=True, width=None if sys.stdout.isatty() else 240)
    try:
        return _run(console, args)
    except KeyboardInterrupt:
        console.print("[red]mrlift: interrupted[/red]; every file written so far is whole, and the same command "
                      "run again finishes the work (no --force needed)")
        return 130


def _run(console: Console, args) -> int:
    if args.command == "verify":
        return _verify(console, args)
    if not args.path.exists():
        console.print(f"[red]mrlift: {args.path} does not exist[/red]")
        return 2
    if args.command == "scan":
        scan = scan_repo(args.path, max_file_bytes=args.max_file_size)
        if not scan.files and scan.errors or not scan.files and not scan.jobs:
            _print_errors(console, scan)
            console.print(f"[red]mrlift: no Java source could be read under {args.path}[/red]")
            return 1
        if args.json:
            print(json.dumps(_inventory(scan), indent=2, ensure_ascii=False))
        else:
            _print_inventory(console, scan)
        return 0
    if args.command == "convert":
        try:
            from migrate.convert import check_output_folder

            check_output_folder(args.output, args.force)
            path_map = load_path_map(args.path_map) if args.path_map else None
            model = load_model(args.effort) if args.effort else None
        except (OutputFolderError, PathMapError, EffortConfigError) as exc:
            console.print(f"[red]mrlift: {exc}[/red]")
            return 2
        from migrate.batch import NothingRead, convert_repository
        from migrate.cache import CacheFolderError
        from migrate.verify.hadoop import HadoopUnavailable

        try:
            with progress_display(console) as show:
                written = convert_repository(args.path, args.output, args.path.name, jobs=args.jobs, force=args.force,
                                             max_file_bytes=args.max_file_size, compile_mode=args.compile_check,
                                             classpath=args.classpath, path_map=path_map, with_tests=args.with_tests,
                                             effort_model=model, progress=show, cache_dir=args.cache)
        except HadoopUnavailable as exc:
            console.print(f"[red]mrlift: --compile-check: {exc}[/red]")
            return 2
        except CacheFolderError as exc:
            console.print(f"[red]mrlift: --cache: {exc}[/red]")
            return 2
        except NothingRead as exc:
            for e in exc.errors:
                console.print("[red]not read[/red] " + shown(f"{where(e.path, e.line)}: {e.message}"))
            console.print(f"[red]mrlift: no Java source could be read under {args.path}[/red]")
            return 1
        except OSError as exc:  # a read-only disk, no permission, a file where a folder should be
            console.print(f"[red]mrlift: cannot write the output into {args.output}: "
                          f"{exc.strerror or exc} ({exc.filename or args.output})[/red]; files written before "
                          "this are whole, nothing else was changed")
            return 2
        if written.unchanged:
            console.print("nothing changed since the last run (sources, settings and the output folder checked by "
                          "hash): the output is as it was")
        _print_summary(console, written.report, args.output)
        for kept, new in written.kept:
            console.print(f"[yellow]kept[/yellow] {args.output / kept} (edited or not written by mrlift); "
                          f"the new version is {args.output / new}")
        return 0
    return 2


VERDICT_STYLE = {"agrees": "green", "differs": "red", "error": "red", "skipped": "yellow"}


def _verify(console: Console, args) -> int:
    from migrate.convert import record_checks
    from migrate.verify.runner import VerifyError, load_runs, runs_from_folder, verify

    try:
        report = json.loads((args.output / "report.json").read_text(encoding="utf-8"))
        why = {}
        if args.runs:
            runs = load_runs(args.runs)
        else:
            runs, why = runs_from_folder(report, args.data)
        with console.status("verifying") as status:
            checks, _ = verify(args.output, runs, why_missing=why, source=args.source, classpath=args.classpath,
                               timeout=args.timeout, sample=args.sample, tolerance=args.tolerance, only=args.job,
                               progress=lambda c: status.update(f"verified {c.job}: {c.verdict}"))
    except (OSError, ValueError, VerifyError) as exc:
        console.print(f"[red]mrlift: {exc}[/red]")
        return 2
    t = Table(title=f"Original (Hadoop local runner) against script (local Spark): {args.output}")
    for col in ("job", "verdict", "compared as", "seconds", "detail"):
        t.add_column(col)
    for c in checks:
        t.add_row(shown(c.job), f"[{VERDICT_STYLE[c.verdict]}]{c.verdict}[/]", c.mode or "-", f"{c.seconds:.0f}",
                  shown(c.detail))
    console.print(t)
    for c in checks:
        if c.verdict == "differs" and c.comparison:
            d = Table(title=f"{c.job}: first differences")
            for col in ("line", "original", "script"):
                d.add_column(col)
            for row in c.comparison["differences"]:
                d.add_row(str(row["line"]), shown(row["original"]), shown(row["converted"]))
            console.print(d)
        if c.verdict == "error" and c.log:
            console.print(f"[red]{c.job}[/red]: {c.detail}")
            console.print(c.log, style="dim", markup=False, highlight=False)
    kept = record_checks(args.output, report, checks)
    for name, new in kept:
        console.print(f"[yellow]kept[/yellow] {args.output / name} (edited); the verdicts are in {args.output / new}")
    console.print(f"verdicts recorded in {args.output / 'report.json'} and report.md")
    return 1 if any(c.verdict in ("differs", "error") for c in checks) else 0


def _inventory(scan: RepoScan) -> dict:
    return {
        "repository": str(scan.root.name),
        "files": scan.found,
        "parsed": len(scan.files),  # the rest mention no Hadoop and no Hadoop code names them
        "classes": [{"class": c.fqcn, "file": str(c.span), "roles": sorted(c.roles), "api": c.api}
                    for c in scan.index if c.roles],
        "jobs": [{"name": j.spec.name, "driver": j.spec.driver.fqcn, "api": j.spec.api,
                  "classes": dict(sorted(j.classes.items())), "reduce_tasks": j.spec.reduces,
                  "shapes": list(j.plan.shapes), "status": j.status, "hand_work": len(j.plan.hand_work)}
                 for j in scan.jobs],
        "submissions": {"seen": scan.submissions[0], "read": scan.submissions[1]},
        "errors": [{"file": e.path, "line": e.line, "message": e.message} for e in scan.errors],
    }


def shown(text) -> str:
    """Text from the sources as the console shows it: markup escaped, control characters visible."""
    return escape("".join(c if c.isprintable() else repr(c)[1:-1] for c in str(text)))


def _short(fq: str | None) -> str:
    return fq.rsplit(".", 1)[-1] if fq else "-"


def _print_inventory(console: Console, scan: RepoScan) -> None:
    rest = (f", {len(scan.files)} of them parsed: the rest name no Hadoop type and no Hadoop code names them"
            if scan.skipped else "")
    t = Table(title=f"Jobs in {scan.root.name} ({scan.found} Java files{rest})")
    for col in ("job", "driver", "API", "mapper", "reducer", "shapes", "status"):
        t.add_column(col)
    for j in scan.jobs:
        reducer = "(map only)" if j.spec.reduces == 0 else _short(j.classes.get("reducer")) if j.classes.get("reducer") else "(identity)"
        t.add_row(shown(j.spec.name), shown(_short(j.spec.driver.fqcn)), j.spec.api, shown(_short(j.classes.get("mapper"))),
                  shown(reducer),
                  ", ".join(j.plan.shapes), f"[{STATUS_STYLE[j.status]}]{j.status}[/]")
    console.print(t)
    seen, read = scan.submissions
    console.print(f"job submissions seen in drivers: {seen}; read into the jobs above: {read}"
                  + ("" if seen == read else " (each one not read is an entry below)"))
    _print_errors(console, scan)


def _print_errors(console: Console, scan: RepoScan) -> None:
    for e in scan.errors:
        console.print("[red]not read[/red] " + shown(f"{where(e.path, e.line)}: {e.message}"))


def _print_summary(console: Console, report: dict, out: Path) -> None:
    t = Table(title=f"Converted into {out}")
    for col in ("job", "script", "status", "hand work", "effort (h)"):
        t.add_column(col)
    for j in report["jobs"]:
        t.add_row(shown(j["name"]), j["script"], f"[{STATUS_STYLE[j['status']]}]{j['status']}[/]", str(len(j["hand_work"])),
                  f"{j['effort_hours']:.1f}")
    console.print(t)
    for e in report["errors"]:
        console.print("[red]not read[/red] " + shown(f"{where(e['file'], e['line'])}: {e['message']}"))
    s, e = report["summary"], report["effort"]
    console.print(f"jobs: [green]{s['converted']} converted[/green], [yellow]{s['partial']} partial[/yellow], "
                  f"[red]{s['not_converted']} not converted[/red] of {s['jobs']}")
    from collections import Counter

    top = Counter(h["category"] for j in report["jobs"] for h in j["hand_work"]).most_common(5)
    if top:
        console.print("hand work by category: " + ", ".join(f"{c} {n}" for c, n in top))
    console.print(f"estimated effort: [bold]{e['hours']:.1f} h[/bold] (range {e['range_hours'][0]:.1f} to "
                  f"{e['range_hours'][1]:.1f} h, {e['model']})")
    console.print(f"report: {out / 'report.md'}, {out / 'report.json'}, {out / 'effort.csv'}; "
                  f"side by side: {out / 'review.html'}")
    console.print(f"[bold]{report['warning']}[/bold]")
