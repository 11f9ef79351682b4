"""The real-world benchmark: convert each public job of the manifest with mrlift, run the generated
script on local Spark over our input, and compare with the output the original made on Hadoop's
local runner (expected/). Prints per split the counts that matter and rewrites RESULTS.md.

    python benchmarks/realworld/run.py                 # both splits, rewrites RESULTS.md
    python benchmarks/realworld/run.py --split dev     # the dev split only (RESULTS.md untouched)
    python benchmarks/realworld/run.py --job ID ...    # some dev jobs, with their details

Trust violation: mrlift says a job is converted (its script runs without hand work) and the
script's output differs from the original's under the comparison mrlift itself claims for the
job (the same bytes, the same lines, ...). Numbers that differ only in their last digits count as
the same where the job sums floating-point numbers, and are counted apart. Crash: mrlift itself
fails on the job, or a script it calls converted fails.

Only the dev split's jobs are shown one by one; of the holdout split, only totals.
"""
from __future__ import annotations

import argparse
import json
import os
import re
import shutil
import subprocess
import sys
import time
from collections import Counter
from concurrent.futures import ThreadPoolExecutor
from dataclasses import asdict, dataclass, field
from datetime import datetime, timezone
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))
from benchmarks.realworld.common import (EXPECTED, HERE, WORK, Job, lay_out, load_manifest, prepared_sources,  # noqa: E402
                                         source_files)
from migrate.verify.compare import compare_folders, part_files  # noqa: E402
from migrate.verify.runner import branch_taken, runnable  # noqa: E402

RESULTS = HERE / "RESULTS.md"
HISTORY = HERE / "history.json"  # one entry per full run that rewrote RESULTS.md: the before/after record
AGREES = ("exact", "same rows", "within tolerance")
HISTORY_KEYS = ("converted", "converted with parity", "trust violations", "crashes")
TOLERANCE = 1e-9  # relative; only for jobs that sum floating-point numbers
SPLITS = ("dev", "holdout")


@dataclass
class Outcome:
    id: str
    split: str
    found: bool = False
    status: str = "not found"  # converted | partial | not_converted | not found | crash
    runs: bool = False  # the script computes the output (no hand work left in it)
    parity: str = ""  # exact | same rows | within tolerance | differs | no expected output | ""
    mode: str = ""  # the comparison mrlift claims for the job
    trust_violation: bool = False
    crash: str = ""
    detail: str = ""
    reasons: list[str] = field(default_factory=list)
    seconds: float = 0.0


def _reason(item: dict, own_classes: set[str]) -> str:
    """A hand-work item as a reason shared by many jobs: its category and its text without the
    code, the numbers and the names of the job's own classes."""
    text = re.sub(r"`[^`]*`", "`…`", item.get("reason", ""))
    text = re.sub(r"\b\d+\b", "N", text)
    text = re.sub(r"\b\w+\b", lambda m: "C" if m.group(0) in own_classes else m.group(0), text)
    return f"{item.get('category', '?')}: {text[:160]}"


def _own_classes(job: Job) -> set[str]:
    names = set()
    for path in source_files(job):
        code = re.sub(r"/\*.*?\*/|//[^\n]*", " ", path.read_text(encoding="utf-8", errors="replace"), flags=re.S)
        names |= set(re.findall(r"\b(?:class|interface|enum)\s+([A-Za-z_$][\w$]*)", code))
    return names


def convert(job: Job, work: Path, timeout: float) -> tuple[dict | None, str]:
    """mrlift convert on the job's files alone (a folder holding them at their repository paths)."""
    src = work / "src"
    prepared_sources(job, src)
    out = work / "mrlift"
    try:
        p = subprocess.run([sys.executable, "-m", "migrate", "convert", str(src), "-o", str(out), "--force"],
                           capture_output=True, text=True, cwd=ROOT, timeout=timeout)
    except subprocess.TimeoutExpired:
        return None, f"mrlift convert ran longer than {timeout:g} s"
    report = out / "report.json"
    if p.returncode != 0 or "Traceback" in p.stderr or not report.is_file():
        return None, f"mrlift convert exit {p.returncode}: " + "\n".join(p.stderr.strip().splitlines()[-6:])
    return json.loads(report.read_text(encoding="utf-8")), ""


def run_one(job: Job, status: dict, timeout: float) -> Outcome:
    start = time.monotonic()
    o = Outcome(job.id, job.split)
    work = WORK / job.id / "bench"
    shutil.rmtree(work, ignore_errors=True)
    try:
        _run(job, status, timeout, work, o)
    finally:
        o.seconds = round(time.monotonic() - start, 1)
    return o


def _run(job: Job, status: dict, timeout: float, work: Path, o: Outcome) -> None:
    report, problem = convert(job, work, timeout)
    if report is None:
        o.status, o.crash = "crash", problem
        return
    entries = [j for j in report["jobs"] if j.get("driver") == job.main and branch_taken(j.get("mode"), job.args)]
    if not entries:
        o.detail = f"no job with driver {job.main} in the report ({len(report['jobs'])} jobs listed)"
        return
    o.found = True
    rank = {"not_converted": 0, "partial": 1, "converted": 2}
    entry = min(entries, key=lambda e: rank.get(e["status"], 0))
    o.status = entry["status"]
    own = _own_classes(job)
    o.reasons = sorted({_reason(h, own) for e in entries for h in e.get("hand_work", [])})
    if runnable(entry) is not None:
        return
    unset = [a["name"] for a in entry.get("arguments", []) if a["position"] is None and a.get("from_end") is None
             and not a.get("derived") and a["default"] is None]
    if unset:  # the driver's own arguments are not enough: the script asks for these by name
        o.detail = "the script needs " + ", ".join("--" + n.replace("_", "-") for n in unset)
        return
    o.runs = True
    o.mode = entry.get("comparison") or "bytes"
    if not status.get(job.id, {}).get("ran"):
        o.parity, o.detail = "no expected output", status.get(job.id, {}).get("why", "expected.py has not run")
        return
    cwd = work / "spark"
    args, output = lay_out(job, cwd)
    script = work / "mrlift" / entry["script"]
    try:
        p = subprocess.run([sys.executable, str(script), *args], capture_output=True, text=True, cwd=cwd,
                           timeout=timeout, env={**os.environ, "PYSPARK_PYTHON": sys.executable})
    except subprocess.TimeoutExpired:
        o.crash = f"the script ran longer than {timeout:g} s"
        return
    if p.returncode != 0 or not output.is_dir() or not part_files(output):
        o.crash = f"the script failed (exit {p.returncode}): " + "\n".join(p.stderr.strip().splitlines()[-8:])
        return
    expected = EXPECTED / job.id
    claimed = compare_folders(expected, output, o.mode, TOLERANCE if job.float_sums else None)
    exact = compare_folders(expected, output, "bytes")
    rows = compare_folders(expected, output, "lines")
    if exact.agrees:
        o.parity = "exact"
    elif claimed.agrees and claimed.tolerance_used:
        o.parity = "within tolerance"
    elif claimed.agrees or rows.agrees:
        o.parity = "same rows"
    else:
        o.parity = "differs"
    o.trust_violation = o.status == "converted" and not claimed.agrees
    if not claimed.agrees:
        first = claimed.differences[0] if claimed.differences else None
        o.detail = (f"compared as {o.mode}: {claimed.missing} lines missing, {claimed.extra} extra"
                    + (f"; line {first[0]}: original {first[1]!r}, script {first[2]!r}" if first else ""))


def totals(outcomes: list[Outcome], manifest_jobs: int) -> dict:
    c = Counter(o.status for o in outcomes)
    runs = [o for o in outcomes if o.runs and o.parity not in ("", "no expected output")]
    return {
        "jobs in the manifest": manifest_jobs,
        "jobs mrlift found": sum(o.found for o in outcomes),
        "converted": c["converted"], "partial": c["partial"], "not converted": c["not_converted"],
        "scripts run (no hand work left)": len(runs),
        "parity: exact": sum(o.parity == "exact" for o in runs),
        "parity: same rows": sum(o.parity == "same rows" for o in runs),
        "parity: within tolerance": sum(o.parity == "within tolerance" for o in runs),
        "parity: differs": sum(o.parity == "differs" for o in runs),
        "converted with parity": sum(o.status == "converted" and o.parity in AGREES for o in outcomes),
        "trust violations": sum(o.trust_violation for o in outcomes),
        "crashes": sum(bool(o.crash) for o in outcomes),
    }


def reasons_table(outcomes: list[Outcome], n: int = 20) -> list[tuple[str, int]]:
    return Counter(r for o in outcomes for r in o.reasons).most_common(n)


def _md(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def write_results(by_split: dict[str, list[Outcome]], counts: dict[str, int], seconds: float) -> None:
    commit = subprocess.run(["git", "rev-parse", "--short", "HEAD"], capture_output=True, text=True,
                            cwd=ROOT).stdout.strip() or "unknown"
    dirty = subprocess.run(["git", "status", "--porcelain", "--", "migrate", "templates"], capture_output=True,
                           text=True, cwd=ROOT).stdout.strip()
    t = {s: totals(by_split[s], counts[s]) for s in SPLITS}
    lines = [
        "# Real-world benchmark: results",
        "",
        f"mrlift at commit `{commit}`{' with uncommitted changes to migrate/ or templates/' if dirty else ''}, "
        f"run on {datetime.now(timezone.utc).date().isoformat()} in {seconds / 60:.0f} min "
        "(`python benchmarks/realworld/run.py`; see README.md in this folder).",
        "",
        "Public MapReduce jobs that nobody here wrote, converted as they are; each generated script run on",
        "local Spark over our input and compared with the output the original made on Hadoop's local runner.",
        "A trust violation is a job mrlift calls converted whose output differs from the original's.",
        "",
        "| | " + " | ".join(SPLITS) + " |",
        "|---|" + "---:|" * len(SPLITS),
    ]
    for k in t["dev"]:
        lines.append(f"| {k} | " + " | ".join(str(t[s][k]) for s in SPLITS) + " |")
    lines += _history(commit, t)
    lines += ["", "## The 20 most frequent hand-work reasons (dev split)", "",
              "| jobs | reason |", "|---:|---|"]
    lines += [f"| {n} | {_md(r)} |" for r, n in reasons_table(by_split["dev"])]
    lines += ["", "## Dev split, job by job", "", "| job | status | script output | note |", "|---|---|---|---|"]
    for o in sorted(by_split["dev"], key=lambda o: o.id):
        note = o.crash or o.detail
        lines.append(f"| {o.id} | {o.status} | {o.parity or '-'} | {_md(note[:200])} |")
    lines += ["", "The holdout split is shown only in totals: its jobs are not read while rules are written.", ""]
    RESULTS.write_text("\n".join(lines), encoding="utf-8")


def _history(commit: str, t: dict) -> list[str]:
    """Append this run to history.json (one entry per commit) and render the before/after table."""
    runs = json.loads(HISTORY.read_text(encoding="utf-8")) if HISTORY.exists() else []
    entry = {"commit": commit, "date": datetime.now(timezone.utc).date().isoformat(),
             **{s: {k: t[s][k] for k in HISTORY_KEYS} for s in SPLITS}}
    runs = [r for r in runs if r["commit"] != commit] + [entry]
    HISTORY.write_text(json.dumps(runs, indent=1) + "\n", encoding="utf-8")
    lines = ["", "## Before and after (every full run, history.json)", "",
             "| commit | date | " + " | ".join(f"{s}: {k}" for s in SPLITS for k in HISTORY_KEYS[:2]) +
             " | trust violations | crashes |", "|---|---|" + "---:|" * (2 * len(SPLITS) + 2)]
    for r in runs:
        cells = [str(r[s].get(k, "-")) for s in SPLITS for k in HISTORY_KEYS[:2]]
        bad = [sum(r[s].get(k, 0) for s in SPLITS) for k in HISTORY_KEYS[2:]]
        lines.append(f"| `{r['commit']}` | {r['date']} | " + " | ".join(cells) + f" | {bad[0]} | {bad[1]} |")
    return lines


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--split", choices=SPLITS, help="one split only (RESULTS.md is not rewritten)")
    ap.add_argument("--job", nargs="+", help="dev jobs by id, with details (RESULTS.md is not rewritten)")
    ap.add_argument("--workers", type=int, default=2, help="jobs run at once (default 2)")
    ap.add_argument("--timeout", type=float, default=600, help="seconds per conversion or script run")
    a = ap.parse_args(argv)
    jobs = load_manifest()
    missing = [str(p) for j in jobs for p in source_files(j) if not p.is_file()]
    if missing:
        print(f"{len(missing)} source files are not in the cache (first: {missing[0]}): run pull.py first",
              file=sys.stderr)
        return 2
    status_file = EXPECTED / "status.json"
    status = json.loads(status_file.read_text(encoding="utf-8")) if status_file.is_file() else {}
    chosen = jobs
    if a.job:
        unknown = [i for i in a.job if i not in {j.id for j in jobs if j.split == "dev"}]
        if unknown:
            print(f"not dev jobs of the manifest: {', '.join(unknown)}", file=sys.stderr)
            return 2
        chosen = [j for j in jobs if j.id in a.job]
    elif a.split:
        chosen = [j for j in jobs if j.split == a.split]
    start = time.monotonic()
    with ThreadPoolExecutor(max(1, a.workers)) as pool:
        outcomes = list(pool.map(lambda j: run_one(j, status, a.timeout), chosen))
    seconds = time.monotonic() - start
    by_split = {s: [o for o in outcomes if o.split == s] for s in SPLITS}
    counts = Counter(j.split for j in chosen)
    for s in SPLITS:
        if not by_split[s]:
            continue
        print(f"\n== {s} split")
        for k, v in totals(by_split[s], counts[s]).items():
            print(f"  {k:34} {v}")
        if s == "dev":
            for o in sorted(by_split[s], key=lambda o: o.id):
                note = (o.crash or o.detail).splitlines()
                print(f"  {o.id:40} {o.status:14} {o.parity or '-':17} {note[0][:110] if note else ''}")
            print("  most frequent hand-work reasons:")
            for r, n in reasons_table(by_split[s]):
                print(f"    {n:3}  {r}")
    if a.job:
        for o in outcomes:
            print(json.dumps(asdict(o), indent=1, ensure_ascii=False))
    elif not a.split:
        write_results(by_split, counts, seconds)
        print(f"\nwrote {RESULTS}")
    violations = sum(o.trust_violation for o in outcomes) + sum(bool(o.crash) for o in outcomes)
    return 1 if violations else 0


if __name__ == "__main__":
    sys.exit(main())
