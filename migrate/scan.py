"""The front half of the flow for a whole repository: files → class index → roles → jobs → plans."""
from __future__ import annotations

import os
from dataclasses import dataclass, field
from pathlib import Path

from migrate.java.driver import read_drivers
from migrate.java.index import ClassIndex
from migrate.java.roles import classify
from migrate.java.source import MAX_FILE_BYTES, ParsedFile, ParseFailure, java_sources, read_java
from migrate.lift.exprs import Unsupported
from migrate.lift.chain import chain_jobs
from migrate.lift.job import JobResult, plan_job


@dataclass(frozen=True)
class Unread:
    """Code that could not be converted at all: a file not read, a driver whose job could not be
    read, a job that could not be planned. Each is a `not_converted` entry in every output."""

    kind: str  # "file" | "driver" | "job"
    name: str
    error: ParseFailure


@dataclass
class RepoScan:
    """Everything mrlift learned about one repository."""

    root: Path
    files: list[ParsedFile]
    errors: list[ParseFailure]
    index: ClassIndex
    jobs: list[JobResult] = field(default_factory=list)
    unread: list[Unread] = field(default_factory=list)
    max_file_bytes: int = MAX_FILE_BYTES


def scan_repo(root: Path, progress=None, max_file_bytes: int = MAX_FILE_BYTES) -> RepoScan:
    """Read every .java file (a bad file becomes an error entry; the batch goes on) and plan every job."""
    root = root.resolve()
    files, errors, unread = [], [], []
    base = root if root.is_dir() else root.parent
    paths, passed_over = java_sources(root)
    errors += passed_over
    unread += [Unread("file", Path(e.path).name, e) for e in passed_over]
    for path in paths:
        got = read_java(path, base, max_file_bytes)
        if isinstance(got, ParsedFile):
            files.append(got)
        else:
            errors.append(got)
            unread.append(Unread("file", Path(got.path).name, got))
        if progress:
            progress(path)
    index = ClassIndex(files)
    for kept, ignored in index.duplicates:
        errors.append(ParseFailure(ignored.file.path, ignored.line_start,
                                   f"class {ignored.fqcn} is defined again here (first in {kept.file.path}); "
                                   "only the first definition is converted: scan the modules one at a time"))
    classify(index)
    specs, problems = read_drivers(index)
    for spec in specs:  # roles that only the driver's use reveals
        for role in ("combiner", "sort_comparator", "grouping_comparator"):
            c = index.get(spec.classes.get(role))
            if c is not None:
                c.roles.add(role.replace("_", "-"))
    for cls, line, msg in problems:
        errors.append(ParseFailure(cls.file.path, line, msg))
        unread.append(Unread("driver", cls.fqcn, errors[-1]))
    scan = RepoScan(root, files, errors, index, unread=unread, max_file_bytes=max_file_bytes)
    for spec in specs:
        try:
            job = plan_job(spec, index)
        except (Unsupported, RecursionError, ValueError, KeyError, AttributeError, TypeError) as exc:
            # A converter bug or an unforeseen shape must not stop the batch; it is reported.
            if os.environ.get("MRLIFT_DEBUG"):
                raise
            errors.append(ParseFailure(spec.driver.file.path, spec.origin.line_start,
                                       f"could not plan job {spec.name!r}: {type(exc).__name__}: {exc}"))
            unread.append(Unread("job", spec.name or spec.driver.fqcn, errors[-1]))
            continue
        scan.jobs.append(job)
    scan.jobs = chain_jobs(scan.jobs)  # jobs that read the folder the one before wrote: one script
    return scan


def script_name(job: JobResult, taken: set[str]) -> str:
    """A file name for the generated script: snake_case of the driver class, unique in the batch.
    Only ASCII letters, digits and `_`, so that it is a Python module name and a test name too
    (`Tally$Job` → tally_job, `Fare€Tally` → fare_tally)."""
    import re

    def snake(text: str) -> str:
        text = re.sub(r"(?<=[a-z0-9])(?=[A-Z])", "_", text).lower()
        return re.sub(r"[^a-z0-9]+", "_", text).strip("_")

    base = snake(job.spec.driver.name) or "job"
    if base[0].isdigit():
        base = "job_" + base
    if base + ".py" in taken and job.spec.name and snake(job.spec.name):  # a driver that runs several jobs
        base = f"{base}_{snake(job.spec.name)}"
    name, i = base + ".py", 2
    while name in taken:
        name, i = f"{base}_{i}.py", i + 1
    taken.add(name)
    return name
