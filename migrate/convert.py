"""Write one script per job plus the report into an output folder (never over a user's files)."""
from __future__ import annotations

import hashlib
import json
import os
from dataclasses import dataclass, replace
from pathlib import Path

import black

from migrate.gen.pyspark import argument_slots, render_script
from migrate.java.source import ParseFailure
from migrate.lift.job import JobResult
from migrate.plan import EachValue, Group, Identity, Join, Runs, TopN, TopPerKey
from migrate.report.render import assemble_report, job_entry, markdown_files, to_csv, to_json
from migrate.scan import RepoScan, Unread, script_name

MARKER = ".mrlift-output"
CACHE_FOLDER = ".mrlift-cache"  # the cache's default place: a run killed before its first file leaves only it


class OutputFolderError(Exception):
    """The output folder holds files mrlift did not write."""


def check_output_folder(out: Path, force: bool) -> None:
    if out.exists() and not out.is_dir():
        raise OutputFolderError(f"{out} exists and is not a folder")
    if out.is_dir() and any(p.name != CACHE_FOLDER for p in out.iterdir()) and not (out / MARKER).exists() \
            and not force:
        raise OutputFolderError(f"{out} is not empty and was not written by mrlift; choose another folder or pass --force")


def _digest(data: bytes) -> str:
    return hashlib.sha256(data).hexdigest()


def write_atomically(target: Path, data: bytes) -> None:
    """Write a whole file or nothing: a temporary file beside it, then a rename over it."""
    target.parent.mkdir(parents=True, exist_ok=True)
    tmp = target.with_name(f".{target.name}.mrlift-tmp")
    try:
        with tmp.open("wb") as f:
            f.write(data)
        os.replace(tmp, target)
    except BaseException:
        tmp.unlink(missing_ok=True)
        raise


class _Writer:
    """Writes files into the output folder without ever replacing a file mrlift did not write.

    The marker file records a digest of everything mrlift wrote. A file that is missing from
    it (the user's own) or whose content changed since (hand work done in a generated script)
    is left alone; the new version goes beside it as `<name>.mrlift-new<suffix>`.

    An interrupted run must not turn mrlift's own files into "hand edits": the marker exists
    before the first file is written, every file is written whole (temporary file + rename), and
    each digest goes into a journal before its file is renamed into place. The next run reads
    the journal as its own, so a plain re-run finishes the work.
    """

    JOURNAL = MARKER + ".journal"

    def __init__(self, out: Path):
        self.out = out
        self.known: dict[str, set[str]] = {}  # every digest mrlift wrote for a file (old marker and journal)
        marker = out / MARKER
        if marker.exists():
            try:
                files = json.loads(marker.read_text(encoding="utf-8")).get("files", {})
                self.known = {k: {v} for k, v in files.items() if isinstance(v, str)}
            except (ValueError, AttributeError, OSError, UnicodeDecodeError):
                self.known = {}
        try:
            journal = (out / self.JOURNAL).read_text(encoding="utf-8")
        except (OSError, UnicodeDecodeError):
            journal = ""
        for line in journal.splitlines():
            try:
                entry = json.loads(line)
                self.known.setdefault(entry["file"], set()).add(entry["sha256"])
            except (ValueError, KeyError, TypeError):
                continue  # a line cut by the interruption
        self.kept: list[tuple[str, str]] = []  # (file kept, where the new version went)
        self.wrote: dict[str, str] = {}
        if not marker.exists():  # before anything else, so an interrupted first run is still ours
            self._write_marker({})

    def ours(self, name: str) -> bool:
        target = self.out / name
        return not target.exists() or _digest(target.read_bytes()) in self.known.get(name, ())

    def write(self, name: str, text: str) -> str:
        data = text.encode("utf-8")
        if not self.ours(name):
            p = Path(name)
            alt = str(p.with_name(f"{p.stem}.mrlift-new{p.suffix}"))
            self.kept.append((name, alt))
            name = alt
        digest = _digest(data)
        with (self.out / self.JOURNAL).open("a", encoding="utf-8") as j:
            j.write(json.dumps({"file": name, "sha256": digest}) + "\n")
        write_atomically(self.out / name, data)
        self.wrote[name] = digest
        return name

    def _write_marker(self, files: dict[str, str]) -> None:
        body = {"about": "written by mrlift; lists the files it wrote (sha256) so it never replaces your edits",
                "files": dict(sorted(files.items()))}
        write_atomically(self.out / MARKER, (json.dumps(body, indent=2) + "\n").encode("utf-8"))

    def close(self) -> None:
        files = dict(self.wrote)
        for name, digests in self.known.items():  # earlier files still on disk as mrlift wrote them
            target = self.out / name
            if name not in files and target.exists():
                d = _digest(target.read_bytes())
                if d in digests:
                    files[name] = d
        self._write_marker(files)
        (self.out / self.JOURNAL).unlink(missing_ok=True)


def summary(job: JobResult) -> str:
    """One sentence on what the job computes, from its plan (for a chain: each job's)."""
    p = job.plan
    if p.upstream:
        plans = [st.plan for st in p.upstream] + [p]
        what = "; ".join(f"job {i}: {_what(q, q.reduce is None and not q.sink.sorted_by_key)}"
                         for i, q in enumerate(plans, 1))
        return f"{len(plans)} jobs in a chain, each reading the output of the one before — {what}."
    shapes = f" Shapes: {', '.join(p.shapes)}." if p.shapes else ""
    return _what(p, job.spec.reduces == 0) + "." + shapes


def _what(p, map_only: bool) -> str:
    r = p.reduce
    if r is None and p.sink.sorted_by_key is False and map_only:
        what = "a map-only job: each input line becomes zero or more output lines"
    elif isinstance(r, Group) and r.distinct:
        what = "the distinct keys the mapper emits, sorted"
    elif isinstance(r, Group):
        fns = ", ".join(sorted({{"any": "any/all", "all": "any/all"}.get(a.fn, a.fn.split("_")[0])
                                for a in r.aggs})) or "a fold"
        writes = f", {len(r.emits)} writes per key" if len(r.emits) > 1 else ""
        what = f"per key: {fns} of the mapper's values{writes}, sorted by key"
    elif isinstance(r, TopN):
        per = " per reduce task" if r.partition is not None else ""
        what = (f"the entries of a TreeMap kept to the {r.n} {'largest' if r.keep_largest else 'smallest'} map keys"
                f"{per} ({r.fold.emits[0].note}), written in cleanup()")
    elif isinstance(r, TopPerKey):
        what = (f"per key, the {r.n} {'largest' if r.keep_largest else 'smallest'} distinct values kept in a "
                "TreeSet, written in set order, sorted by key")
    elif isinstance(r, EachValue):
        what = "the mapper's values, each written (or filtered) by the reducer as it meets them, sorted by key"
    elif isinstance(r, Runs):
        what = ("per group of the grouping comparator, a fold of each run of one key (a control break), the runs "
                "collected in the sort order and written once per group")
    elif isinstance(r, Identity):
        what = "the mapper's pairs sorted by key"
    elif isinstance(r, Join):
        kind = next((s for s in p.shapes if s.startswith("reduce-side join")), "reduce-side join")
        what = (f"a {kind} of the inputs' values, told apart by their tags "
                f"({', '.join(side.name for side in r.sides)}), written per key, sorted by key")
    else:
        what = "not determined: the reduce side needs hand work"
    return what


def header_for(job: JobResult, script: str) -> dict:
    classes = []
    rest = ("combiner", "reducer", "partitioner", "sort_comparator", "grouping_comparator")
    inputs = tuple(r for r in job.classes if r.startswith("mapper "))  # "mapper 1", "mapper 2" of MultipleInputs
    roles = ("driver", "mapper", *inputs, *rest)
    if job.plan.upstream:  # a chain: "job 1 mapper", "job 2 reducer", ...
        roles = tuple(job.classes)
    for role in roles:
        fq = job.classes.get(role)
        if fq:
            span = job.files.get(role)
            classes.append((role, fq, str(span) if span else "ships with Hadoop"))
    usage = " ".join(f"<{s.name}>" + ("..." if s.nargs else "") for s in argument_slots(job.plan.params)
                     if s.read) or "[options]"
    return {"title": f"{job.spec.driver.name}: {job.spec.name}", "classes": classes, "summary": summary(job),
            "status": job.status, "script_name": script, "usage": usage}


@dataclass
class Written:
    scripts: list[str]  # the scripts written, in the report's order
    report: dict
    kept: list[tuple[str, str]]  # files left alone because they were edited or not ours
    unchanged: bool = False  # nothing read changed since the last run: nothing was written
    stats: dict | None = None  # how the work was done: shards worked out, shards taken from the cache


@dataclass
class Rendered:
    """One job made ready to write: its report entry, its share of the effort, its script and, where
    a worker made it, its review page (with the marks `fill_page` replaces)."""

    entry: dict
    effort: object  # report.effort.JobEffort
    script: str
    page: str | None = None


@dataclass(frozen=True)
class RunFacts:
    """What the scan says about the whole run, for the report."""

    root: Path
    max_file_bytes: int
    submissions: tuple[int, int]
    compiled: str
    not_compiled: list[str]


def render_job(job: JobResult, name: str) -> tuple[str | None, ParseFailure | None]:
    """The job's script, or the reason none could be written (a generator bug: reported, not raised)."""
    try:
        text = render_script(job.plan, header_for(job, name), list(job.plan.hand_work))
        compile(text, name, "exec")  # a script that Python cannot even read is never written
    except (TypeError, ValueError, KeyError, SyntaxError, black.InvalidInput) as exc:
        return None, ParseFailure(job.spec.driver.file.path, job.spec.origin.line_start,
                                  f"could not write a script for {job.spec.name!r}: {type(exc).__name__}: {exc}")
    return text, None


def write_outputs(scan: RepoScan, out: Path, root_label: str, force: bool = False, progress=None,
                  path_map=None, with_tests: bool = False, effort_model=None) -> Written:
    """Scripts, reports and review pages for a scan made in this process."""
    check_output_folder(out, force)
    taken: set[str] = set()
    done = []
    errors = list(scan.errors)
    unread = list(scan.unread)
    for job in scan.jobs:
        if path_map is not None:
            from migrate.pathmap import map_job_paths

            job = map_job_paths(job, path_map)
        name = script_name(job, taken)
        text, failure = render_job(job, name)
        if failure is not None:
            errors.append(failure)
            unread.append(Unread("job", job.spec.name or job.spec.driver.fqcn, failure))
            continue
        done.append(Rendered(*job_entry(job, name), text))
        if progress:
            progress(job)
    facts = RunFacts(scan.root, scan.max_file_bytes, scan.submissions, scan.compiled, scan.not_compiled)
    return write_results(out, root_label, done, errors, unread, facts, with_tests, effort_model)


def write_results(out: Path, root_label: str, done: list[Rendered], errors: list[ParseFailure], unread: list[Unread],
                  facts: RunFacts, with_tests: bool = False, effort_model=None, fill_page=None) -> Written:
    """Write the scripts, then the reports and the review built from them. `fill_page(page, job entry,
    report, k)`: finishes a page a worker made (else every page is made here)."""
    out.mkdir(parents=True, exist_ok=True)
    writer = _Writer(out)
    entries = []
    for r in done:
        name = writer.write(r.entry["script"], r.script)  # beside a hand-edited script: another name
        entries.append(({**r.entry, "script": name}, replace(r.effort, name=name)))
    base = facts.root if facts.root.is_dir() else facts.root.parent  # the job files' paths start here
    report = assemble_report(entries, errors, root_label, str(base), effort_model, unread, facts.max_file_bytes)
    report["summary"]["submissions"] = {"seen": facts.submissions[0], "read": facts.submissions[1]}
    report["settings"] = {"max_file_bytes": facts.max_file_bytes,  # files over it are listed as not read
                          "compile_check": facts.compiled, "not_compiled": facts.not_compiled}
    _keep_verdicts(writer, report)
    pages = None
    if fill_page is not None:
        from migrate.report.review import job_page, nav_links, neighbours, page_name

        pages = {}
        for k, j in enumerate(report["jobs"]):
            if k < len(done) and done[k].page is not None:
                pages[page_name(j, k)] = fill_page(done[k].page, j, report, k)
            else:  # code not read: its Java, made here
                pages[page_name(j, k)] = job_page(j, base, None, report["repository"], report["warning"],
                                                  nav=nav_links(*neighbours(report, k)))
    _write_reports(writer, report, out, pages)
    if with_tests:
        _write_checks(writer, report)
    writer.close()
    return Written([e["script"] for e, _ in entries], report, writer.kept)


def _write_checks(writer: _Writer, report: dict) -> None:
    """tests/test_<script>.py per job whose script runs, and a runs.json skeleton to fill with sample data."""
    from migrate.gen.pyspark import _ENV, docstring_text
    from migrate.verify.compare import MODES

    from migrate.verify.runner import runnable

    runs = []
    for j in report["jobs"]:
        if runnable(j) is not None:  # the script stops at hand work: nothing to compare yet
            continue
        stem = Path(j["script"]).stem
        text = _ENV.get_template("check_job.py.j2").render(
            script=j["script"], driver=j["driver"], mode=j["comparison"], mode_text=MODES[j["comparison"]],
            test_name=stem, doc=docstring_text)
        text = black.format_str(text, mode=black.Mode(line_length=100))
        compile(text, f"test_{stem}.py", "exec")  # names are sanitised: a failure here is a bug, not input
        writer.write(f"tests/test_{stem}.py", text)
        args = sorted((a for a in j["arguments"] if a["position"] is not None), key=lambda a: a["position"])
        runs.append({"driver": j["driver"], "args": ["@out" if a["name"] == "output_path" else
                                                    "@tmp" + a["name"].split("_")[1] if a["name"].startswith("job_")
                                                    else f"<{a['name']}: a sample file or folder>" for a in args]})
    skeleton = {"about": "Sample data per job for tests/test_*.py and `mrlift verify --runs`: the driver's "
                         "arguments, paths relative to this file; '@out' is the output folder; every input must lie "
                         "in the 'data' folder (relative to this file). Move an entry from 'todo' into 'runs' once "
                         "its paths point at sample data; until then its test is skipped.",
                "data": ".", "runs": [], "todo": runs}
    writer.write("tests/runs.json", json.dumps(skeleton, indent=2) + "\n")


def job_fingerprint(out: Path, job: dict, source: str) -> str:
    """The sha256 of what a verdict is about: the job's script as it is on disk and its Java files."""
    h = hashlib.sha256()
    for f in [out / job["script"]] + sorted({Path(source) / span.rsplit(":", 1)[0] for span in job["files"].values()}):
        h.update(str(f.name).encode("utf-8", "surrogateescape") + b"\0")
        try:
            h.update(hashlib.sha256(f.read_bytes()).digest())
        except OSError:
            h.update(b"missing")
    return h.hexdigest()


def _keep_verdicts(writer: _Writer, report: dict) -> None:
    """A verdict of an earlier `mrlift verify` stays with a job whose script and Java files are unchanged."""
    try:
        old = json.loads((writer.out / "report.json").read_text(encoding="utf-8")) if writer.ours("report.json") else {}
    except (OSError, ValueError, UnicodeDecodeError):
        return
    before = {j.get("script"): j.get("verification") for j in old.get("jobs", []) if isinstance(j, dict)}
    for j in report["jobs"]:
        v = before.get(j["script"])
        if v and v.get("fingerprint") == job_fingerprint(writer.out, j, report["source"]):
            j["verification"] = v
    _count_verified(report)


def _count_verified(report: dict) -> None:
    report["summary"]["verified"] = sum(1 for j in report["jobs"]
                                        if (j.get("verification") or {}).get("verdict") == "agrees")


def record_checks(out: Path, report: dict, checks) -> list[tuple[str, str]]:
    """Put `mrlift verify`'s verdicts into report.json and report.md (never over a file the user
    edited: the new version then goes beside it). Returns the files kept."""
    by_script = {c.script: c for c in checks}
    for j in report["jobs"]:
        c = by_script.get(j["script"])
        if c is not None:
            j["verification"] = {**c.for_report(), "fingerprint": job_fingerprint(out, j, report["source"])}
    _count_verified(report)
    writer = _Writer(out)
    _write_reports(writer, report, out)
    writer.close()
    return writer.kept


def _write_reports(writer: _Writer, report: dict, out: Path, pages: dict[str, str] | None = None) -> None:
    """report.json (the source of all the rest), report.md, effort.csv, review.html and the job pages
    (`pages`: made already, else made here from the report and the files)."""
    from migrate.report.review import index_page, render_review

    writer.write("report.json", to_json(report))
    for name, text in markdown_files(report).items():
        writer.write(name, text)
    writer.write("effort.csv", to_csv(report))
    if pages is None:
        pages = render_review(report, out)
    else:
        pages = {"review.html": index_page(report), **pages}
    for name, page in pages.items():
        writer.write(name, page)
