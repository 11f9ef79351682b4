"""A whole repository converted shard by shard, across processes (`mrlift convert --jobs N`).

The survey (migrate/survey.py) picks the files to parse and cuts them into shards. Each worker
scans a shard (parse, index, lower, lift, plan), writes its jobs' scripts, report entries and
review pages, and hands back only text: no syntax tree crosses a process boundary, and a worker
holds one shard's trees at a time. javac runs beside the workers over every parsed file; a shard
that was written before javac's answer came, and whose files javac rejects, is written again.

What the main process decides alone is what depends on the whole repository: the order of the
jobs (the order of a whole-repository scan: driver file, driver line), the script names (unique
in the batch), the effort estimate and the verdicts of an earlier `verify`. Workers leave marks
for those in scripts and pages, replaced at the end. The output is the same, byte for byte,
whatever the number of processes.
"""
from __future__ import annotations

import dataclasses
import html
import json
import multiprocessing
import os
import queue
import threading
import uuid
import zlib
from dataclasses import dataclass, field
from pathlib import Path

from migrate.convert import CACHE_FOLDER, Rendered, RunFacts, render_job, write_results
from migrate.cache import Cache, key_of
from migrate.java.source import MAX_FILE_BYTES, NotRead, ParseFailure, read_limited, shown_path
from migrate.report.render import checked_label, job_entry
from migrate.report.review import job_page, nav_links, neighbours
from migrate.scan import JavacFacts, Unread, apply_javac, duplicate_errors, job_files, naming_of, name_script, \
    repository_entries, run_javac, scan_repo
from migrate.survey import FileFacts, plan_survey, survey_file


@dataclass(frozen=True)
class Settings:
    """What every shard is worked with."""

    root: Path  # the folder the paths are relative to
    max_file_bytes: int
    repository: str  # the name the pages show
    warning: str
    mark: str  # unguessable: the marks workers leave for what only the main process knows
    path_map: object = None


@dataclass
class JobOut:
    order: tuple  # (driver file, driver line, n-th job of the driver): the order of a whole-repository scan
    marks: dict  # what the main process puts in place of what only it knows (see marks())
    naming: tuple
    failure: ParseFailure | None = None
    unread_name: str = ""
    rendered: Rendered | None = None
    page: bytes = b""  # zlib-compressed: pages are most of a run's bytes


@dataclass
class ShardOut:
    shard: int
    jobs: list[JobOut]
    errors: list[ParseFailure]
    unread: list[Unread]
    submitted: dict[str, int]
    read_at: frozenset
    files: int
    needs_javac: set[str] = field(default_factory=set)
    parsed: int = 0  # files of the shard that could be parsed


def marks(settings: Settings, shard: int, k: int) -> dict[str, str]:
    tag = f"{settings.mark}:{shard}:{k}"
    return {w: f"\u27ea{tag}:{w}\u27eb" for w in ("script", "effort", "verdict", "nav")}


_SETTINGS: Settings | None = None
_PARSED: dict = {}  # files parsed in this process, kept while shards that share them pass


def _init(settings: Settings) -> None:
    global _SETTINGS
    _SETTINGS = settings


def run_shard(shard: int, paths: list[Path], javac: JavacFacts | None) -> ShardOut:
    s = _SETTINGS
    if len(_PARSED) > 32:  # shards share a few utilities; more would hold trees no shard needs
        _PARSED.clear()
    scan = scan_repo(s.root, max_file_bytes=s.max_file_bytes, shard=paths, parsed=_PARSED)
    outs, nth = [], {}
    for k, job in enumerate(scan.jobs):
        files = job_files(job, scan.index)
        if javac is not None:
            job = apply_javac(job, files, javac)
        if s.path_map is not None:
            from migrate.pathmap import map_job_paths

            job = map_job_paths(job, s.path_map)
        m = marks(s, shard, k)
        where = (job.spec.driver.file.path, job.spec.driver.line_start)
        nth[where] = nth.get(where, -1) + 1
        out = JobOut((*where, nth[where]), m, naming_of(job))
        text, failure = render_job(job, m["script"])
        if failure is not None:
            out.failure, out.unread_name = failure, job.spec.name or job.spec.driver.fqcn
        else:
            entry, effort = job_entry(job, m["script"])
            out.rendered = Rendered(entry, effort, text)
            page = job_page(entry, s.root, text, s.repository, s.warning,
                            shown={"effort": m["effort"], "verdict": m["verdict"]}, nav=m["nav"])
            out.page = zlib.compress(page.encode("utf-8"), 1)
        outs.append(out)
    needs = {f.path for f in scan.files} if javac is None else set()
    return ShardOut(shard, outs, scan.errors, scan.unread, scan.submitted, scan.read_at, len(paths), needs,
                    len(scan.files))


class NothingRead(Exception):
    """No Java file could be read: nothing was written. `errors` say why."""

    def __init__(self, errors: list[ParseFailure]):
        super().__init__("no Java source could be read")
        self.errors = errors


@dataclass
class Progress:
    """Counts for a progress display: files and jobs done of the totals known so far."""

    files_total: int = 0
    files: int = 0
    jobs: int = 0
    shards_total: int = 0
    shards: int = 0
    cached: int = 0  # shards taken from the cache


def convert_repository(root: Path, out: Path, root_label: str, *, jobs: int = 1, force: bool = False,
                       max_file_bytes: int = MAX_FILE_BYTES, compile_mode: str = "auto", classpath: str | None = None,
                       path_map=None, with_tests: bool = False, effort_model=None, progress=None,
                       cache_dir: Path | None | bool = None):
    """Survey, scan, convert and report the repository at `root` into `out` with `jobs` processes.
    `progress(Progress)` is called as work is done; `cache_dir`: the cache folder (None: in `out`;
    False: no cache). Raises HadoopUnavailable (compile_mode "on"), NothingRead, CacheFolderError."""
    from migrate.convert import check_output_folder
    from migrate.report.render import VERIFY_WARNING

    check_output_folder(out, force)
    root = root.resolve()
    base = root if root.is_dir() else root.parent
    counts = Progress()
    paths, errors, unread = repository_entries(root)
    cache = Cache(None if cache_dir is False else (cache_dir or out / CACHE_FOLDER))
    digests = [file_digest(p, max_file_bytes) for p in paths]
    rels = [shown_path(p, root) if root.is_dir() else p.name for p in paths]
    setting = (str(base), root_label, max_file_bytes, repr(path_map), with_tests, repr(effort_model))
    jars = classpath_facts(compile_mode, classpath, base)  # may ask `hadoop classpath`: once
    run_key = key_of("run", setting, compile_mode, jars, list(zip(rels, digests)), unread, errors)
    done = unchanged_run(out, cache, run_key)
    if done is not None:
        return done
    settings = Settings(base, max_file_bytes, root_label, VERIFY_WARNING, uuid.uuid4().hex, path_map)
    pool = multiprocessing.get_context("fork").Pool(jobs, initializer=_init, initargs=(settings,)) if jobs > 1 else None
    try:
        facts = _survey(paths, rels, digests, base, max_file_bytes, pool, cache)
        survey = plan_survey(facts)
        real = {f.path: p for f, p in zip(facts, paths)}  # a name that is not UTF-8 is shown escaped
        digest_of = dict(zip(rels, digests))
        shards = [[real[p] for p in shard] for shard in survey.shards]
        errors += duplicate_errors(survey)
        del facts, survey.facts[:]  # every file's names: no longer needed, and a monorepo has many
        counts.files_total, counts.shards_total = len(survey.parse), len(survey.shards)
        if progress:
            progress(counts)
        javac_key = key_of("javac", compile_mode, jars, [(p, digest_of[p]) for p in survey.parse])
        javac: list = [cache.get("javac", javac_key)]
        if javac[0] is None and compile_mode == "off":
            javac = [run_javac(base, [], "off")]
        thread = None
        if javac[0] is None:
            javac.clear()
            thread = threading.Thread(target=_javac, args=(javac, base, [real[p] for p in survey.parse], compile_mode,
                                                           classpath), daemon=True)
            thread.start()
        shard_keys = [key_of("shard", setting, [(p, digest_of[p]) for p in shard]) for shard in survey.shards]
        results = _run_shards(shards, settings, pool, javac, counts, progress, cache=cache, keys=shard_keys,
                              rel_shards=survey.shards)
        if thread is not None:
            thread.join()
        if isinstance(javac[0], BaseException):
            raise javac[0]
        facts_javac: JavacFacts = javac[0]
        cache.put("javac", javac_key, facts_javac)
        if not paths or survey.parse and not any(r.parsed for r in results.values()):
            raise NothingRead(errors + [e for r in results.values() for e in r.errors])
        again = [r.shard for r in results.values() if r.needs_javac & (facts_javac.problems.keys() |
                                                                        set(facts_javac.unchecked))]
        if again:  # written before javac answered, and javac has something to say about them
            redo = _run_shards([shards[i] for i in again], settings, pool, javac, None, None, ids=again)
            results.update(redo)
        for i, r in results.items():  # each under what it depends on: its files and javac's word on them
            r.needs_javac = set()
            cache.put("shard", key_of(shard_keys[i], javac_part(facts_javac, survey.shards[i])), r)
    finally:
        if pool is not None:
            pool.close()
            pool.join()
    written = _write(results, errors, unread, settings, out, root_label, facts_javac, with_tests, effort_model,
                     (root, max_file_bytes))
    remember_run(out, cache, run_key)
    written.stats = {"shards": counts.shards_total, "cached": counts.cached, "javac_cached": thread is None,
                     "again": len(again)}
    return written


def file_digest(path: Path, max_file_bytes: int) -> str:
    """sha256 of a file's bytes ("" where it cannot be read: the survey reports why)."""
    import hashlib

    try:
        return hashlib.sha256(read_limited(path, max_file_bytes)).hexdigest()
    except NotRead:
        return ""


def classpath_facts(mode: str, classpath: str | None, base: Path) -> tuple:
    """What javac's answer depends on besides the sources: the jars it would compile against."""
    if mode == "off":
        return ()
    from migrate.verify.classpath import find_classpath, repository_jars
    from migrate.verify.hadoop import HadoopUnavailable

    try:
        found = find_classpath(classpath)
    except HadoopUnavailable as exc:
        return ("unavailable", str(exc))
    return (found.origin, found.entries, repository_jars(base))


def javac_part(facts: JavacFacts, shard: list[str]) -> tuple:
    """javac's answer for a shard's files only (empty where it has nothing to say of them)."""
    return (tuple((p, tuple(facts.problems[p])) for p in shard if p in facts.problems),
            tuple(p for p in shard if p in facts.unchecked))


def unchanged_run(out: Path, cache: Cache, run_key: str):
    """The last run's result where nothing it read changed and the output folder is as it left it."""
    from migrate.convert import MARKER, Written, _digest

    if cache.get("run", key_of("run-of", str(out.resolve()))) != run_key:
        return None
    try:
        files = json.loads((out / MARKER).read_text(encoding="utf-8"))["files"]
        for name, digest in files.items():
            if _digest((out / name).read_bytes()) != digest:
                return None  # hand work in a script, a file removed: the whole run is made again
        report = json.loads((out / "report.json").read_text(encoding="utf-8"))
    except (OSError, ValueError, KeyError, TypeError, AttributeError):
        return None
    return Written([j["script"] for j in report["jobs"] if j["script"]], report, [], unchanged=True)


def remember_run(out: Path, cache: Cache, run_key: str) -> None:
    cache.put("run", key_of("run-of", str(out.resolve())), run_key)


def _survey(paths: list[Path], rels: list[str], digests: list[str], base: Path, max_file_bytes: int, pool,
            cache: Cache) -> list[FileFacts]:
    """Every file's facts: from the last run's where its bytes are the same, else read now."""
    known = cache.get("survey", "facts") or {}
    todo = [i for i, d in enumerate(digests) if not d or d not in known]
    args = [(paths[i], base, max_file_bytes) for i in todo]
    fresh = [survey_file(*a) for a in args] if pool is None else pool.starmap(survey_file, args, chunksize=64)
    got = dict(zip(todo, fresh))
    facts = [got[i] if i in got else dataclasses.replace(known[d], path=rels[i]) for i, d in enumerate(digests)]
    if todo:
        cache.put("survey", "facts", {f.digest: f for f in facts if f.digest})
    return facts


def _javac(into: list, base: Path, paths: list[Path], mode: str, classpath: str | None) -> None:
    try:
        into.append(run_javac(base, paths, mode, classpath))
    except BaseException as exc:  # noqa: BLE001 - handed to the main thread
        into.append(exc)


def _run_shards(shards: list[list[Path]], settings: Settings, pool, javac: list, counts, progress,
                ids: list[int] | None = None, cache: Cache | None = None, keys: list[str] | None = None,
                rel_shards: list[list[str]] | None = None) -> dict[int, ShardOut]:
    """Every shard's result by shard number; each task carries javac's answer once it has come. A
    shard the cache holds for the same files and the same javac answer is taken from it."""
    ids = ids if ids is not None else list(range(len(shards)))
    order = sorted(range(len(shards)), key=lambda i: -len(shards[i]))  # the largest first: no long tail

    def answer():
        return javac[0] if javac and not isinstance(javac[0], BaseException) else None

    results: dict[int, ShardOut] = {}
    if cache is not None:
        known = answer()
        for i in list(order):
            # before javac's answer: the entry made where javac had nothing to say, checked when it comes
            hit = cache.get("shard", key_of(keys[i], javac_part(known or JavacFacts(), rel_shards[i])))
            if hit is not None:
                hit.shard = ids[i]
                hit.needs_javac = set() if known is not None else set(rel_shards[i])
                results[hit.shard] = hit
                order.remove(i)
                if counts is not None:
                    counts.cached += 1
                _count(counts, hit, progress)
    if pool is None:
        _init(settings)
        for i in order:
            r = run_shard(ids[i], shards[i], answer())
            results[r.shard] = r
            _count(counts, r, progress)
        return results
    done: queue.Queue = queue.Queue()
    window = 4 * pool._processes
    pending = iter(order)
    running = 0
    failed: list = []
    while True:
        while running < window:
            i = next(pending, None)
            if i is None:
                break
            pool.apply_async(run_shard, (ids[i], shards[i], answer()), callback=done.put, error_callback=done.put)
            running += 1
        if running == 0:
            break
        r = done.get()
        running -= 1
        if isinstance(r, BaseException):
            failed.append(r)
            continue
        results[r.shard] = r
        _count(counts, r, progress)
    if failed:
        raise failed[0]
    return results


def _count(counts: Progress | None, r: ShardOut, progress) -> None:
    if counts is None:
        return
    counts.files += r.files
    counts.jobs += len(r.jobs)
    counts.shards += 1
    if progress:
        progress(counts)


def _write(results: dict[int, ShardOut], errors: list, unread: list, settings: Settings, out: Path, root_label: str,
           javac: JavacFacts, with_tests: bool, effort_model, root_and_limit):
    """Merge the shards in one order, name the scripts, estimate, fill the marks and write."""
    seen_jobs: dict[tuple, tuple[int, int, JobOut]] = {}
    submitted: dict[str, int] = {}
    read_at: set = set()
    for i in sorted(results):  # a job reached from two shards is the same job: the first shard's
        r = results[i]
        errors += r.errors
        unread += r.unread
        submitted.update(r.submitted)
        read_at |= r.read_at
        for j in r.jobs:
            seen_jobs.setdefault(j.order, (i, j))
    errors = list(dict.fromkeys(errors))
    unread = list(dict.fromkeys(unread))
    taken: set[str] = set()
    done, filled = [], {}
    for i, j in sorted(seen_jobs.values(), key=lambda t: t[1].order):
        if j.failure is not None:
            errors.append(j.failure)
            unread.append(Unread("job", j.unread_name, j.failure))
            continue
        name = name_script(j.naming, taken)
        m = j.marks
        r = j.rendered
        done.append(Rendered({**r.entry, "script": name}, r.effort, r.script.replace(m["script"], name), j.page))
        filled[len(done) - 1] = m
    root, limit = root_and_limit

    def fill_page(page: bytes, job: dict, report: dict, k: int) -> str:
        m = filled[k]
        text = zlib.decompress(page).decode("utf-8")
        for word, value in (("script", job["script"]), ("effort", f"{job['effort_hours']:.1f}"),
                            ("verdict", html.escape(checked_label(job))), ("nav", nav_links(*neighbours(report, k)))):
            text = text.replace(m[word], value)
        return text

    facts = RunFacts(root, limit, (sum(submitted.values()), len(read_at)), javac.label, list(javac.unchecked))
    return write_results(out, root_label, done, errors, unread, facts, with_tests, effort_model, fill_page)


def default_jobs() -> int:
    return len(os.sched_getaffinity(0)) if hasattr(os, "sched_getaffinity") else (os.cpu_count() or 1)
