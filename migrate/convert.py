"""Write one script per job plus the report into an output folder (never over a user's files)."""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from migrate.gen.pyspark import render_script
from migrate.lift.job import JobResult
from migrate.plan import AggRef, Group, Identity
from migrate.report.render import build_report, to_json, to_markdown
from migrate.scan import RepoScan, script_name

MARKER = ".mrlift-output"


class OutputFolderError(Exception):
    """The output folder holds files mrlift did not write."""


def check_output_folder(out: Path, force: bool) -> None:
    if out.exists() and not out.is_dir():
        raise OutputFolderError(f"{out} exists and is not a folder")
    if out.is_dir() and any(out.iterdir()) and not (out / MARKER).exists() and not force:
        raise OutputFolderError(f"{out} is not empty and was not written by mrlift; choose another folder or pass --force")


def summary(job: JobResult) -> str:
    """One sentence on what the job computes, from its plan."""
    p = job.plan
    r = p.reduce
    if r is None and p.sink.sorted_by_key is False and job.spec.reduces == 0:
        what = "a map-only job: each input line becomes zero or more output lines"
    elif isinstance(r, Group) and r.distinct:
        what = "the distinct keys the mapper emits, sorted"
    elif isinstance(r, Group):
        fns = ", ".join(sorted({a.fn.split("_")[0] for a in r.aggs})) or "a fold"
        what = f"per key: {fns} of the mapper's values, sorted by key"
    elif isinstance(r, Identity):
        what = "the mapper's pairs sorted by key"
    else:
        what = "not determined: the reduce side needs hand work"
    shapes = f" Shapes: {', '.join(p.shapes)}." if p.shapes else ""
    return what + "." + shapes


def header_for(job: JobResult, script: str) -> dict:
    classes = []
    for role in ("driver", "mapper", "combiner", "reducer", "partitioner", "sort_comparator", "grouping_comparator"):
        fq = job.classes.get(role)
        if fq:
            span = job.files.get(role)
            classes.append((role, fq, str(span) if span else "ships with Hadoop"))
    slots = sorted([p for p in job.plan.params if p.position is not None], key=lambda p: p.position)
    usage = " ".join(f"<{p.name}>" for p in slots) or "[options]"
    return {"title": f"{job.spec.driver.name}: {job.spec.name}", "classes": classes, "summary": summary(job),
            "status": job.status, "script_name": script, "usage": usage}


@dataclass
class Written:
    scripts: list[tuple[JobResult, str]]
    report: dict


def write_outputs(scan: RepoScan, out: Path, root_label: str, force: bool = False, progress=None) -> Written:
    check_output_folder(out, force)
    out.mkdir(parents=True, exist_ok=True)
    (out / MARKER).write_text("written by mrlift; safe to delete\n", encoding="utf-8")
    taken: set[str] = set()
    written = []
    for job in scan.jobs:
        name = script_name(job, taken)
        text = render_script(job.plan, header_for(job, name), list(job.plan.hand_work))
        (out / name).write_text(text, encoding="utf-8")
        written.append((job, name))
        if progress:
            progress(job)
    report = build_report(written, scan.errors, root_label)
    (out / "report.json").write_text(to_json(report), encoding="utf-8")
    (out / "report.md").write_text(to_markdown(report), encoding="utf-8")
    return Written(written, report)
