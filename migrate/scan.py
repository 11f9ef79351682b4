"""The front half of the flow for a whole repository: files → class index → roles → jobs → plans."""
from __future__ import annotations

import os
from dataclasses import dataclass, field, replace
from pathlib import Path

from migrate.java.compile_checks import CompileProblem, compile_problems
from migrate.java.driver import read_drivers, submissions
from migrate.java.index import ClassIndex
from migrate.java.roles import classify
from migrate.java.source import MAX_FILE_BYTES, ParsedFile, ParseFailure, java_sources, read_java
from migrate.inventory import PROFILES, RUNS_WITH, other_sources
from migrate.survey import plan_survey, survey_file
from migrate.lift.exprs import Unsupported
from migrate.lower import lower_task_classes
from migrate.lift.chain import chain_jobs
from migrate.lift.job import JobResult, plan_job
from migrate.plan import HandWork, Span


@dataclass(frozen=True)
class Unread:
    """Code that could not be converted at all: a file not read, a driver whose job could not be
    read, a job that could not be planned. Each is a `not_converted` entry in every output."""

    kind: str  # "file" | "driver" | "job", or another engine's job source: "hive" | "pig" | "streaming" | "workflow"
    name: str
    error: ParseFailure
    category: str = "not-read"  # the hand-work category of its entry
    profile: str = "P3"  # the effort profile it is counted with
    sloc: int | None = None  # counted by the file's own comment rules (None: as Java)


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
    compiled: str = "not run: only mrlift's own checks of what javac would reject"  # see compile_check()
    submissions: tuple[int, int] = (0, 0)  # job submissions seen in drivers, and those read into the jobs
    not_compiled: list[str] = field(default_factory=list)  # files javac could not check (a missing library)
    skipped: int = 0  # Java files the survey found no Hadoop in, nor any way to reach Hadoop code: not parsed
    found: int = 0  # Java files found
    submitted: dict[str, int] = field(default_factory=dict)  # submissions seen per driver class
    read_at: frozenset = frozenset()  # (driver class, line) of each submission read into a job


def repository_entries(root: Path) -> tuple[list[Path], list[ParseFailure], list[Unread]]:
    """The repository's .java files, what was passed over (links out, unreadable folders) and the
    other engines' job files (listed, not converted: another engine runs them)."""
    paths, passed_over = java_sources(root)
    unread = [Unread("file", Path(e.path).name, e) for e in passed_over]
    for o in other_sources(root):
        unread.append(Unread(o.kind, o.path, ParseFailure(o.path, 1, f"{o.detail}, run by {RUNS_WITH[o.kind]}: "
                                                                     "not converted by this version"),
                             "other-engine", PROFILES[o.kind], o.sloc))
    return paths, list(passed_over), unread


def duplicate_errors(survey) -> list[ParseFailure]:
    """A top-level class declared again in a later file: only the first is read (as the class index
    keeps the first definition); the later file is not parsed."""
    by_path = {f.path: f for f in survey.facts}
    out = []
    for path, first in sorted(survey.duplicates.items()):
        f = by_path[path]
        fq = f"{f.package}.{f.declared[0]}" if f.package else f.declared[0]
        out.append(ParseFailure(path, f.top_line, f"class {fq} is defined again here (first in {first}); only the "
                                                  "first definition is converted: scan the modules one at a time"))
    return out


def parse_once(path: Path, base: Path, max_file_bytes: int, parsed: dict):
    """read_java, once per path in a process (shards that share a utility parse it once)."""
    if path not in parsed:
        parsed[path] = read_java(path, base, max_file_bytes)
    return parsed[path]


def scan_repo(root: Path, progress=None, max_file_bytes: int = MAX_FILE_BYTES, *, shard: list[Path] | None = None,
              parsed: dict | None = None) -> RepoScan:
    """Read the .java files that matter (a bad file becomes an error entry; the batch goes on) and plan
    every job. The survey picks the files to parse (see migrate/survey.py); `shard`: parse only these
    files and leave the repository-wide entries to the caller; `parsed`: files
    already parsed in this process, by path and digest."""
    root = root.resolve()
    files, errors, unread = [], [], []
    base = root if root.is_dir() else root.parent
    skipped = found = 0
    if shard is None:
        paths, errors, unread = repository_entries(root)
        survey = plan_survey([survey_file(p, base, max_file_bytes) for p in paths])
        for e in duplicate_errors(survey):
            errors.append(e)
        keep = set(survey.parse)
        skipped, found = len(paths) - len(keep), len(paths)
        paths = [p for p, f in zip(paths, survey.facts) if f.path in keep]
    else:
        paths = shard
    for path in paths:
        got = read_java(path, base, max_file_bytes) if parsed is None else parse_once(path, base, max_file_bytes, parsed)
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
    submitted = {c.fqcn: len(submissions(c)) for c in index if "driver" in c.roles}
    read_at = frozenset((s.driver.fqcn, line) for s in specs for line in s.submitted_at)
    seen, read = sum(submitted.values()), len(read_at)
    for spec in specs:  # roles that only the driver's use reveals
        for role in ("combiner", "sort_comparator", "grouping_comparator"):
            c = index.get(spec.classes.get(role))
            if c is not None:
                c.roles.add(role.replace("_", "-"))
    lower_task_classes(index)  # one core form of each meaning before the lift rules match
    for cls, line, msg in problems:
        errors.append(ParseFailure(cls.file.path, line, msg))
        unread.append(Unread("driver", cls.fqcn, errors[-1]))
    scan = RepoScan(root, files, errors, index, unread=unread, max_file_bytes=max_file_bytes, submissions=(seen, read),
                    skipped=skipped, found=found, submitted=submitted, read_at=read_at)
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
    # jobs that read the folder the one before wrote: one script
    scan.jobs = chain_jobs(scan.jobs, replan=lambda spec, pairs: plan_job(spec, index, pairs))
    used = [job_files(job, index) for job in scan.jobs]
    by_path = {f.path: f for f in files}
    # only files some job uses: the rest of a monorepo's Java is never converted, so never checked
    problems = {p: _with_snippets(compile_problems(by_path[p].tree, Path(p).stem), by_path[p])
                for p in sorted({p for paths in used for p in paths}) if p in by_path}
    scan.jobs = [decline_uncompilable(job, {p: problems[p] for p in paths if problems.get(p)})
                 for job, paths in zip(scan.jobs, used)]
    return scan


MAX_PROBLEMS_PER_FILE = 20  # javac itself stops at 100; a few name the trouble


def _with_snippets(found: list, f: ParsedFile) -> list[tuple]:
    """The first problems of a file, each with the text of its line."""
    if not found:
        return []
    lines = f.lines
    return [(p, lines[p.line - 1].strip() if 0 < p.line <= len(lines) else "") for p in found[:MAX_PROBLEMS_PER_FILE]]


def job_files(job: JobResult, index: ClassIndex) -> list[str]:
    """The Java files a job's classes come from (driver, mapper, reducer, ..., custom Writables)."""
    paths = {span.file for span in job.files.values()}
    for fq in list(job.classes.values()) + [t for t in job.spec.types.values() if t]:
        c = index.get(fq)
        if c is not None:
            paths.add(c.file.path)
    return sorted(paths)


MISSING_DEPENDENCY = ("does not exist", "cannot access", "class file for", "bad class file")


@dataclass(frozen=True)
class JavacFacts:
    """What javac said of the files: problems (with the line's text) per file, the files it could not
    check for a missing library ("auto" only), and how it ran, for the report."""

    problems: dict[str, list] = field(default_factory=dict)
    unchecked: tuple[str, ...] = ()
    label: str = "not run: only mrlift's own checks of what javac would reject"


def run_javac(base: Path, paths: list[Path], mode: str, classpath: str | None = None) -> JavacFacts:
    """javac over the repository's parsed files (mode "on": required; "auto": where a JDK and Hadoop
    jars are found; "off"). Raises HadoopUnavailable in mode "on" where javac cannot run."""
    from migrate.java.source import read_inside, shown_path
    from migrate.verify.classpath import find_classpath, repository_jars
    from migrate.verify.hadoop import HadoopUnavailable, javac_errors

    if mode == "off":
        return JavacFacts(label="off (--no-compile-check): only mrlift's own checks of what javac would reject")
    try:
        hadoop = find_classpath(classpath)
        errors = javac_errors(paths, ":".join((*hadoop.entries, *repository_jars(base))))
    except HadoopUnavailable as exc:
        if mode == "on":
            raise
        return JavacFacts(label=f"not run ({exc}): only mrlift's own checks of what javac would reject")
    known = {shown_path(p, base) if p != base else p.name for p in paths}
    by_path, unchecked = {}, []
    for path, found in errors.items():
        rel = shown_path(path, base)
        if base not in path.parents or rel not in known:
            continue
        if mode == "auto" and any(any(m in msg for m in MISSING_DEPENDENCY) for _, msg in found):
            unchecked.append(rel)
            continue
        try:
            lines = read_inside(base, rel).decode("utf-8", "replace").replace("\r\n", "\n").split("\n")
        except OSError:
            lines = []
        problems = [CompileProblem(line, f"javac: {msg}") for line, msg in found][:MAX_PROBLEMS_PER_FILE]
        by_path[rel] = [(p, lines[p.line - 1].strip() if 0 < p.line <= len(lines) else "") for p in problems]
    return JavacFacts(by_path, tuple(sorted(unchecked)),
                      f"javac with {hadoop.origin}" + (" (auto)" if mode == "auto" else ""))


def apply_javac(job: JobResult, files: list[str], facts: JavacFacts) -> JobResult:
    """The job declined at every line javac rejects in its files, with a note for a file javac could
    not check (a library it imports is not on the classpath)."""
    job = decline_uncompilable(job, {p: facts.problems[p] for p in files if p in facts.problems})
    missing = [p for p in files if p in facts.unchecked]
    if missing:
        note = (f"javac could not check {', '.join(missing)}: a library it imports is not on the classpath "
                "(give the jars with --classpath to check it)")
        job = replace(job, plan=replace(job.plan, notes=job.plan.notes + (note,)))
    return job


def compile_check(scan: RepoScan, mode: str, classpath: str | None = None) -> RepoScan:
    """javac over the scan's files (see run_javac). A job whose files javac rejects is declined at
    each line it names. In "auto", a file javac cannot check because a library it imports is missing
    is not declined: its jobs get a note, and the report lists it."""
    base = scan.root if scan.root.is_dir() else scan.root.parent
    facts = run_javac(base, [base / f.path for f in scan.files], mode, classpath)
    scan.jobs = [apply_javac(job, job_files(job, scan.index), facts) for job in scan.jobs]
    scan.not_compiled = list(facts.unchecked)
    scan.compiled = facts.label
    return scan


def decline_uncompilable(job: JobResult, problems: dict[str, list]) -> JobResult:
    """A job whose files javac would reject is not converted: parity with code that never ran
    cannot be proven. Each problem becomes a blocking item at its line."""

    if not problems:
        return job
    items = tuple(HandWork("does-not-compile", Span(path, p.line, p.line),
                           p.message if p.message.startswith("javac: ") else f"javac would reject this file: "
                                                                               f"{p.message}",
                           "fix the Java so that it compiles (and check that the job still does what it did), "
                           "then run mrlift again", snippet, "P1", 1)
                  for path, found in sorted(problems.items()) for p, snippet in found)
    return replace(job, plan=replace(job.plan, hand_work=job.plan.hand_work + items))


def script_name(job: JobResult, taken: set[str]) -> str:
    """A file name for the generated script: snake_case of the driver class, unique in the batch.
    Only ASCII letters, digits and `_`, so that it is a Python module name and a test name too
    (`Tally$Job` → tally_job, `Fare€Tally` → fare_tally)."""
    return name_script(naming_of(job), taken)


def naming_of(job: JobResult) -> tuple[str, str | None, str]:
    """What a script's name is made of: the driver's class name, the branch's label, the job's name."""
    return job.spec.driver.name, (job.spec.mode.label if job.spec.mode is not None else None), job.spec.name


def name_script(naming: tuple[str, str | None, str], taken: set[str]) -> str:
    import re

    driver, mode, job_name = naming

    def snake(text: str) -> str:
        text = re.sub(r"(?<=[a-z0-9])(?=[A-Z])", "_", text).lower()
        return re.sub(r"[^a-z0-9]+", "_", text).strip("_")

    base = snake(driver) or "job"
    if base[0].isdigit():
        base = "job_" + base
    if mode is not None:  # one script per branch of a driver that picks its job by an argument
        base = f"{base}_{snake(mode) or 'mode'}"
    if base + ".py" in taken and job_name and snake(job_name):  # a driver that runs several jobs
        base = f"{base}_{snake(job_name)}"
    name, i = base + ".py", 2
    while name in taken:
        name, i = f"{base}_{i}.py", i + 1
    taken.add(name)
    return name
