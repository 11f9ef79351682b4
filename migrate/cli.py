"""The `mrlift` command line: scan, convert (rich tables and progress, --json on scan)."""
from __future__ import annotations

import argparse
import json
from pathlib import Path

from rich.console import Console
from rich.progress import BarColumn, Progress, TextColumn
from rich.table import Table

from migrate import __version__
from migrate.convert import OutputFolderError, write_outputs
from migrate.pathmap import PathMapError, load_path_map
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
    c = sub.add_parser("convert", help="write one PySpark script per job plus report.json and report.md")
    c.add_argument("path", type=Path, help="folder (or one .java file) of the legacy repository")
    c.add_argument("-o", "--output", type=Path, required=True, help="folder for the scripts and the report")
    c.add_argument("--force", action="store_true", help="write into a non-empty folder mrlift did not create")
    c.add_argument("--path-map", type=Path, metavar="FILE",
                   help="TOML file whose [paths] table maps old storage prefixes (hdfs://...) to new ones")
    return p


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    console = Console(soft_wrap=True)
    if not args.path.exists():
        console.print(f"[red]mrlift: {args.path} does not exist[/red]")
        return 2
    if args.command == "scan":
        scan = scan_repo(args.path)
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
        except (OutputFolderError, PathMapError) as exc:
            console.print(f"[red]mrlift: {exc}[/red]")
            return 2
        files = []
        with Progress(TextColumn("{task.description}"), BarColumn(), TextColumn("{task.completed}/{task.total}"),
                      console=console, transient=True) as bar:
            from migrate.java.source import find_java_files

            files = find_java_files(args.path.resolve())
            t = bar.add_task("reading Java", total=len(files))
            scan = scan_repo(args.path, progress=lambda _p: bar.advance(t))
            t2 = bar.add_task("writing scripts", total=len(scan.jobs))
            if not scan.files:
                _print_errors(console, scan)
                console.print(f"[red]mrlift: no Java source could be read under {args.path}[/red]")
                return 1
            written = write_outputs(scan, args.output, args.path.name, args.force, progress=lambda _j: bar.advance(t2),
                                    path_map=path_map)
        _print_summary(console, written.report, args.output)
        for kept, new in written.kept:
            console.print(f"[yellow]kept[/yellow] {args.output / kept} (edited or not written by mrlift); "
                          f"the new version is {args.output / new}")
        return 0
    return 2


def _inventory(scan: RepoScan) -> dict:
    return {
        "repository": str(scan.root.name),
        "files": len(scan.files),
        "classes": [{"class": c.fqcn, "file": str(c.span), "roles": sorted(c.roles), "api": c.api}
                    for c in scan.index if c.roles],
        "jobs": [{"name": j.spec.name, "driver": j.spec.driver.fqcn, "api": j.spec.api,
                  "classes": dict(sorted(j.classes.items())), "reduce_tasks": j.spec.reduces,
                  "shapes": list(j.plan.shapes), "status": j.status, "hand_work": len(j.plan.hand_work)}
                 for j in scan.jobs],
        "errors": [{"file": e.path, "line": e.line, "message": e.message} for e in scan.errors],
    }


def _short(fq: str | None) -> str:
    return fq.rsplit(".", 1)[-1] if fq else "-"


def _print_inventory(console: Console, scan: RepoScan) -> None:
    t = Table(title=f"Jobs in {scan.root.name} ({len(scan.files)} Java files)")
    for col in ("job", "driver", "API", "mapper", "reducer", "shapes", "status"):
        t.add_column(col)
    for j in scan.jobs:
        reducer = "(map only)" if j.spec.reduces == 0 else _short(j.classes.get("reducer")) if j.classes.get("reducer") else "(identity)"
        t.add_row(j.spec.name, _short(j.spec.driver.fqcn), j.spec.api, _short(j.classes.get("mapper")), reducer,
                  ", ".join(j.plan.shapes), f"[{STATUS_STYLE[j.status]}]{j.status}[/]")
    console.print(t)
    _print_errors(console, scan)


def _print_errors(console: Console, scan: RepoScan) -> None:
    for e in scan.errors:
        console.print(f"[red]not read[/red] {e.path}:{e.line}: {e.message}")


def _print_summary(console: Console, report: dict, out: Path) -> None:
    t = Table(title=f"Converted into {out}")
    for col in ("job", "script", "status", "hand work", "effort (h)"):
        t.add_column(col)
    for j in report["jobs"]:
        t.add_row(j["name"], j["script"], f"[{STATUS_STYLE[j['status']]}]{j['status']}[/]", str(len(j["hand_work"])),
                  f"{j['effort_hours']:.1f}")
    console.print(t)
    for e in report["errors"]:
        console.print(f"[red]not read[/red] {e['file']}:{e['line']}: {e['message']}")
    console.print(f"report: {out / 'report.md'} and {out / 'report.json'}")
    console.print(f"[bold]{report['warning']}[/bold]")
