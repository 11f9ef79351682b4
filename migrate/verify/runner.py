"""`mrlift verify`: run each original job on Hadoop's local runner and its script on local Spark,
over the same sample data, and compare the outputs.

Safety: it executes the repository's own code (the drivers' main()) with the user's rights. Each
run gets its own copies of the inputs, in a temporary working folder that is also its current
folder (compiled classes and both outputs go there too), and a time limit. Inputs must lie inside
the data folder given (the runs file's folder, or --data). The repository, the data folder and
the input copies are fingerprinted before and after the original runs: a job that changed any of
them wrote outside its output, which its script does not reproduce, and gets an error verdict.
A compile error, a failing job or a run past its time limit is a verdict for that job, with the
tool's output, and the batch goes on.
"""
from __future__ import annotations

import json
import os
import re
import shutil
import subprocess
import sys
import tempfile
import time
from dataclasses import asdict, dataclass, field
from datetime import datetime, timezone
from pathlib import Path

from migrate.java.literals import same_driver_branch
from migrate.plan import ADVISORY_CATEGORIES
from migrate.verify.classpath import HadoopClasspath, find_classpath, repository_jars
from migrate.verify.compare import MODES, Verdict, compare_folders, counter_differences, parse_counters
from migrate.verify.hadoop import TIMED_OUT, compile_sources, run_job

AGREES, DIFFERS, SKIPPED, ERROR = "agrees", "differs", "skipped", "error"


class VerifyError(Exception):
    """The verification cannot start (no report, a bad runs file, no Java)."""


@dataclass(frozen=True)
class JobRun:
    """How to run one job on sample data: the driver's arguments ("@out" is the output folder,
    "@tmp1", "@tmp2", … folders chained jobs hand over through) and how to compare."""

    driver: str
    args: tuple[str, ...]
    mode: str | None = None  # one of compare.MODES; None: what the report says the original defines
    intermediates: tuple[str, ...] = ()
    data: str = ""  # where the data came from, for the report
    root: str = ""  # the data folder every input must lie in
    inputs: tuple[int, ...] = ()  # positions of args that are local files or folders (copied for each run)


@dataclass
class Check:
    """One job's verification."""

    job: str
    script: str
    driver: str
    verdict: str  # agrees | differs | skipped | error
    detail: str
    mode: str = ""
    data: str = ""
    checked_at: str = ""
    seconds: float = 0.0
    comparison: dict | None = None  # Verdict fields, for the report
    log: str = ""  # the tail of the tool output where something failed
    intermediates: list[dict] = field(default_factory=list)
    arguments: list[str] = field(default_factory=list)  # the driver's arguments, as in the runs file
    tolerance: float | None = None  # the relative tolerance the comparison allowed, if any
    writes_outside: list[str] = field(default_factory=list)  # files the original changed outside its output
    counters: list[str] = field(default_factory=list)  # the job's counters that differ: group:name a -> b

    def for_report(self) -> dict:
        return asdict(self)  # with the tail of the tool's output where something failed


def load_runs(path: Path) -> dict[str, JobRun]:
    """A runs file: {"runs": [{"driver": …, "args": [...], "values_order"?, "compare"?, "intermediates"?}]}
    (the format of samples/*/runs.json). An argument is a path, relative to the file's folder, when
    it names a file or folder there (each part of a comma list); `-D name=value`, `-Dname=value` and
    other words are passed as they are. Every path must lie inside the data folder: "data" in the
    file (relative to it), else the runs file's own folder."""
    try:
        data = json.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError) as exc:
        raise VerifyError(f"{path}: cannot read the runs file ({exc})") from None
    runs = data.get("runs") if isinstance(data, dict) else None
    if not isinstance(runs, list):
        raise VerifyError(f"{path}: expected an object with a \"runs\" list")
    root = (path.resolve().parent / str(data.get("data", "."))).resolve()
    out: dict[str, JobRun] = {}
    for i, r in enumerate(runs, 1):
        if not isinstance(r, dict) or not isinstance(r.get("driver"), str) or not isinstance(r.get("args"), list):
            raise VerifyError(f"{path}: run {i} needs \"driver\" (a class name) and \"args\" (a list)")
        mode = {"keys": "keys", "lines": "lines"}.get(r.get("compare")) or \
            ("within-key" if r.get("values_order") == "undefined" else None)
        args, inputs = _place_arguments([str(a) for a in r["args"]], path.resolve().parent, root,
                                        f"{path}: run {i} ({r['driver']})")
        # a driver may have several runs (one per branch of a driver that picks its job by an argument)
        key = r["driver"] if r["driver"] not in out else f"{r['driver']}#{i}"
        out[key] = JobRun(r["driver"], args, mode, tuple(r.get("intermediates", [])), str(path), str(root), inputs)
    return out


def branch_taken(mode: dict | None, args: tuple[str, ...]) -> bool:
    """Whether a driver given these arguments takes this job's branch (report.json's `mode`: the
    driver picks its job by testing one argument); True for a job of no such driver."""
    if mode is None:
        return True
    tests = tuple((t["literal"], t["ignore_case"]) for t in mode["tests"])
    return mode["argument"] < len(args) and same_driver_branch(args[mode["argument"]], mode["value"], tests)


def run_for(job: dict, runs: dict[str, JobRun]) -> JobRun | None:
    """The first run of the job's driver whose arguments take the job's branch."""
    return next((r for r in runs.values() if r.driver == job["driver"] and branch_taken(job.get("mode"), r.args)),
                None)


def _place_arguments(raw: list[str], base: Path, root: Path, where: str) -> tuple[tuple[str, ...], tuple[int, ...]]:
    """Resolve the path arguments against `base`, refusing any outside `root`; options stay as they are."""
    args, inputs = [], []
    option_value = False
    for a in raw:
        if option_value or a.startswith("@") or a.startswith("-"):
            option_value = a in ("-D", "-conf", "-fs", "-jt", "-files", "-libjars", "-archives")
            args.append(a)
            continue
        parts = [(base / p).resolve() for p in a.split(",")]
        if not any(p.exists() for p in parts) and not any(c in a for c in "*?["):
            args.append(a)  # a word, not a path (a number, a date, a name)
            continue
        for p in parts:
            if p != root and root not in p.parents:
                raise VerifyError(f"{where}: the input {p} is outside the data folder {root}; verify reads only "
                                  "inputs inside it (copy the sample data there)")
        inputs.append(len(args))
        args.append(",".join(str(p) for p in parts))
    return tuple(args), tuple(inputs)
def runs_from_folder(report: dict, data: Path) -> tuple[dict[str, JobRun], dict[str, str]]:
    """A folder per job, named like its script (`data/rides_per_station/`): the job's one input.
    Returns the runs and, per driver, why a job with a folder could not be run from it."""
    runs, why = {}, {}
    for job in report["jobs"]:
        folder = data / Path(job["script"]).stem
        if not folder.is_dir():
            continue
        slots: dict[int, str] = {}
        tail: dict[int, str] = {}  # arguments counted from the end: args[length - k]
        ends = [a["from_end"] for a in job["arguments"] if a.get("many")]  # a run stops k before the end
        problem = None
        for a in job["arguments"]:
            if a["position"] is None and a.get("from_end") is None:
                continue
            at = tail if a["position"] is None else slots
            where = a["from_end"] if a["position"] is None else a["position"]
            if a["name"] in ("input_path",):
                at[where] = str(folder.resolve())
            elif a["name"] == "output_path":
                at[where] = "@out"
            elif a["name"] == "mode" and (job.get("mode") or {}).get("value") is not None:
                at[where] = job["mode"]["value"]  # the value that picks this job's branch
            elif re.fullmatch(r"job_\d+_output", a["name"]):
                at[where] = "@tmp" + a["name"].split("_")[1]
            else:
                problem = f"argument {a['name']} needs a value: give this job a line in a runs file (--runs)"
        if problem is None and (sorted(slots) != list(range(len(slots)))
                                or sorted(tail) != list(range(1, len(tail) + 1)) or ends and ends != [len(tail)]):
            problem = "the driver's arguments are not all known: use a runs file (--runs)"
        if problem:
            why[job["driver"]] = problem
            continue
        args = tuple(slots[i] for i in sorted(slots)) + tuple(tail[k] for k in sorted(tail, reverse=True))
        runs[job["driver"] if not job.get("mode") else f"{job['driver']}#{job['script']}"] = JobRun(job["driver"], args, None, (), str(folder), str(data.resolve()),
                                     tuple(i for i, a in enumerate(args) if not a.startswith("@")))
    return runs, why


def copy_inputs(args: tuple[str, ...], inputs: tuple[int, ...], into: Path, n: int | None = None) -> tuple[str, ...]:
    """Copies of the input files (a folder's files one by one) in `into`, all of each file or its
    first `n` lines; the arguments that name them point at the copies."""
    out = list(args)
    for i in inputs:
        paths = []
        for p in args[i].split(","):
            src = Path(p)
            dst = into / f"arg{i}" / src.name
            files = [src] if src.is_file() else sorted(f for f in src.rglob("*") if f.is_file()) if src.is_dir() else []
            if not files:
                paths.append(p)  # a glob or a path that does not exist: passed as it is
                continue
            for f in files:
                target = dst if f == src else dst / f.relative_to(src)
                target.parent.mkdir(parents=True, exist_ok=True)
                with f.open("rb") as fin, target.open("wb") as fout:
                    if n is None:
                        shutil.copyfileobj(fin, fout)
                        continue
                    for k, line in enumerate(fin):
                        if k >= n:
                            break
                        fout.write(line)
            paths.append(str(dst))
        out[i] = ",".join(paths)
    return tuple(out)


def fingerprint(folder: Path) -> dict[str, tuple[int, int]]:
    """(size, modification time) of every file under `folder`: enough to see a write."""
    seen = {}
    for dirpath, _, filenames in os.walk(folder):
        for name in filenames:
            f = Path(dirpath) / name
            try:
                st = f.lstat()
            except OSError:
                continue
            seen[str(f)] = (st.st_size, st.st_mtime_ns)
    return seen


def changed(before: dict[str, tuple[int, int]], after: dict[str, tuple[int, int]]) -> list[str]:
    """Files added, removed or rewritten between two fingerprints."""
    return sorted(f"{'removed' if k not in after else 'added' if k not in before else 'changed'}: {k}"
                  for k in before.keys() | after.keys() if before.get(k) != after.get(k))


def runnable(job: dict) -> str | None:
    """None if the job's script computes the output; else why it is not checked."""
    if job["status"] == "converted":
        return None
    if job["status"] == "partial" and all(h["category"] in ADVISORY_CATEGORIES for h in job["hand_work"]):
        return None
    return "the script stops at hand work until it is done (see the report); nothing to compare yet"


def _tail(text: str, lines: int = 30) -> str:
    return "\n".join(text.strip().splitlines()[-lines:])


def _package_root(java_file: Path) -> Path:
    """The source root of a file: its folder minus the package's folders."""
    m = re.search(r"^\s*package\s+([\w.]+)\s*;", java_file.read_text(encoding="utf-8", errors="replace"), re.M)
    root = java_file.parent
    for _ in (m.group(1).split(".") if m else []):
        root = root.parent
    return root


class Verifier:
    """Verifies the jobs of one `mrlift convert` output folder."""

    def __init__(self, out_dir: Path, source: Path | None = None, classpath: str | None = None,
                 timeout: float = 300, sample: int | None = None, tolerance: float | None = None):
        report_file = out_dir / "report.json"
        try:
            self.report = json.loads(report_file.read_text(encoding="utf-8"))
        except (OSError, ValueError) as exc:
            raise VerifyError(f"{report_file}: not a report mrlift wrote ({exc}); run `mrlift convert` first") from None
        self.out_dir = out_dir.resolve()  # the script runs in another folder
        src = source or (Path(self.report["source"]) if self.report.get("source") else None)
        if src is None or not src.exists():
            raise VerifyError(f"the legacy sources are not at {src}: pass --source")
        self.source = src.resolve()
        if shutil.which("javac") is None or shutil.which("java") is None:
            raise VerifyError("java and javac are needed to run the original jobs (Java 17+)")
        self.hadoop: HadoopClasspath = find_classpath(classpath)
        self.classpath = os.pathsep.join((*self.hadoop.entries, *repository_jars(self.source)))
        self.timeout, self.sample, self.tolerance = timeout, sample, tolerance
        self.work = Path(tempfile.mkdtemp(prefix="mrlift-verify-"))
        self._all_classes: Path | None = None
        self._compiled_all = False

    def close(self) -> None:
        shutil.rmtree(self.work, ignore_errors=True)

    # -- compiling
    def _classes_for(self, job: dict) -> tuple[Path | None, str]:
        """Compiled classes for the job: all sources at once if they compile, else the driver's file
        with what it uses (javac -sourcepath), so one broken file fails only its jobs."""
        if not self._compiled_all:
            self._compiled_all = True
            from migrate.java.source import find_java_files

            files = find_java_files(self.source)
            res = compile_sources(files, self.work / "classes", self.classpath, timeout=self.timeout)
            self._all_classes = res.classes if res.ok else None
        if self._all_classes is not None:
            return self._all_classes, ""
        driver_file = self.source / job["files"]["driver"].rsplit(":", 1)[0]
        classes = self.work / "classes-per-job" / Path(job["script"]).stem
        res = compile_sources([driver_file], classes, self.classpath, sourcepath=_package_root(driver_file),
                              timeout=self.timeout)
        return (classes, "") if res.ok else (None, res.log)

    # -- one job
    def check(self, job: dict, run: JobRun | None, missing_why: str | None = None) -> Check:
        c = Check(job["name"], job["script"], job["driver"], SKIPPED, "",
                  checked_at=datetime.now(timezone.utc).isoformat(timespec="seconds"))
        start = time.monotonic()
        try:
            self._check(job, run, missing_why, c)
        finally:
            c.seconds = round(time.monotonic() - start, 1)
        return c

    def _check(self, job: dict, run: JobRun | None, missing_why: str | None, c: Check) -> None:
        why = runnable(job)
        if why is not None:
            c.detail = why
            return
        if run is None:
            c.detail = missing_why or "no sample data for this job: add it to a runs file (--runs) or a data folder (--data)"
            return
        c.mode = run.mode or job.get("comparison") or "bytes"
        c.data = run.data + (f" (first {self.sample} lines of each file)" if self.sample else "")
        c.arguments = [_shown(a, run.root) for a in run.args]
        c.tolerance = self.tolerance
        here = self.work / Path(job["script"]).stem
        here.mkdir(parents=True, exist_ok=True)
        classes, log = self._classes_for(job)
        if classes is None:
            c.verdict, c.detail, c.log = ERROR, "the original Java does not compile", _tail(log)
            return

        def placed(side: str) -> list[str]:
            """This side's arguments: its own copies of the inputs, its own output folders."""
            args = copy_inputs(run.args, run.inputs, here / side / "in", self.sample)
            return [str(here / side / "out") if a == "@out" else str(here / side / a[1:]) if a.startswith("@tmp")
                    else a for a in args]
        (here / "original").mkdir()
        original_args = placed("original")
        outputs = [here / "original" / a[1:] for a in ("@out", *run.args) if a.startswith("@")]
        watched = [self.source, Path(run.root), here / "original"]  # the repository, the data, the copies
        before = [fingerprint(f) for f in watched]
        ran = run_job(classes, job["driver"], original_args, cwd=here / "original", timeout=self.timeout,
                      classpath=self.classpath)
        after = [fingerprint(f) for f in watched]
        c.writes_outside = [w for b, a in zip(before, after) for w in changed(b, a)
                            if not any(o == Path(w.split(": ", 1)[1]) or o in Path(w.split(": ", 1)[1]).parents
                                       for o in outputs)]
        if ran.returncode != 0:
            c.verdict, c.log = ERROR, _tail(ran.log)
            c.detail = (f"the original job ran longer than the time limit ({self.timeout:g} s)"
                        if ran.returncode == TIMED_OUT else f"the original job failed (exit {ran.returncode})")
            return
        if c.writes_outside:
            c.verdict, c.log = ERROR, "\n".join(c.writes_outside[:20])
            c.detail = (f"the original job changed {len(c.writes_outside)} file(s) outside its output folder, "
                        "which the script does not do: that I/O is hand work (see the log)")
            return
        (here / "converted").mkdir()
        extra = ["--keep-intermediates"] if run.intermediates else []
        script = self.out_dir / job["script"]
        try:
            p = subprocess.run([sys.executable, str(script.resolve()), *placed("converted"), *extra], capture_output=True,
                               text=True, cwd=here / "converted", timeout=self.timeout,
                               env={**os.environ, "PYSPARK_PYTHON": sys.executable})
        except subprocess.TimeoutExpired:
            c.verdict, c.detail = ERROR, f"the script ran longer than the time limit ({self.timeout:g} s)"
            return
        if p.returncode != 0:
            c.verdict, c.detail, c.log = ERROR, f"the script failed (exit {p.returncode})", _tail(p.stderr)
            return
        v = compare_folders(here / "original" / "out", here / "converted" / "out", c.mode, self.tolerance)
        c.comparison = _verdict_dict(v)
        for folder in run.intermediates:
            iv = compare_folders(here / "original" / folder[1:], here / "converted" / folder[1:], "bytes",
                                 self.tolerance)
            c.intermediates.append({"folder": folder, **_verdict_dict(iv)})
        c.counters = counter_differences(job.get("counters") or [], parse_counters(ran.log), parse_counters(p.stderr))
        ok = v.agrees and all(i["agrees"] for i in c.intermediates) and not c.counters
        c.verdict = AGREES if ok else DIFFERS
        c.detail = _summary(v, c.intermediates, self.tolerance)
        if c.counters:  # the script's counter report must say what the job log said
            c.detail += f"; counters differ: {', '.join(c.counters[:5])}" + (" ..." if len(c.counters) > 5 else "")


def _shown(arg: str, root: str) -> str:
    """An argument as the report shows it: paths relative to the data folder."""
    return ",".join(os.path.relpath(p, root) if root and os.path.isabs(p) else p for p in arg.split(","))


def _verdict_dict(v: Verdict) -> dict:
    return {"agrees": v.agrees, "original_lines": v.original_lines, "converted_lines": v.converted_lines,
            "missing": v.missing, "extra": v.extra, "tolerance_used": v.tolerance_used,
            "differences": [{"line": n, "original": a, "converted": b} for n, a, b in v.differences]}


def _summary(v: Verdict, intermediates: list[dict], tolerance: float | None = None) -> str:
    if v.agrees:
        text = f"{v.original_lines} lines, {MODES[v.mode].split(' (')[0]}"
        if v.tolerance_used:  # not "the same bytes": some numbers differ in their last digits
            text = (text.replace("the same bytes", "the same lines") +
                    f", numbers equal within a relative tolerance of {tolerance:g} (some differ in their last digits)")
    else:
        text = (f"{v.original_lines} lines in the original, {v.converted_lines} in the script's output: "
                f"{v.missing} missing, {v.extra} extra")
        if v.missing == v.extra == 0:
            text += f" (the same lines; not {MODES[v.mode].split(' (')[0]})"
    bad = [i["folder"] for i in intermediates if not i["agrees"]]
    if intermediates:
        text += f"; intermediate folders: {'differ: ' + ', '.join(bad) if bad else 'the same'}"
    return text


def verify(out_dir: Path, runs: dict[str, JobRun], *, why_missing: dict[str, str] | None = None,
           source: Path | None = None, classpath: str | None = None, timeout: float = 300,
           sample: int | None = None, tolerance: float | None = None, only: list[str] | None = None,
           progress=None) -> tuple[list[Check], Verifier]:
    """Check every job of the report (or those named in `only`, by job name or script)."""
    v = Verifier(out_dir, source, classpath, timeout, sample, tolerance)
    names = {n for j in v.report["jobs"] for n in (j["name"], j["script"], Path(j["script"]).stem)}
    unknown = [n for n in only or [] if n not in names]
    if unknown:
        v.close()
        raise VerifyError(f"no job named {', '.join(unknown)} in {out_dir / 'report.json'}")
    checks = []
    try:
        for job in v.report["jobs"]:
            if only and job["name"] not in only and job["script"] not in only and Path(job["script"]).stem not in only:
                continue
            checks.append(v.check(job, run_for(job, runs), (why_missing or {}).get(job["driver"])))
            if progress:
                progress(checks[-1])
    finally:
        v.close()
    return checks, v
