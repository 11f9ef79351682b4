"""Benchmark (run by hand, not part of the tests): mrlift convert on a generated repository of any size.

Generates a repository with benchmarks/repogen.py (seeded: the same repository every time), then,
several times in one invocation, runs `mrlift convert` with 1 and with 2 processes into fresh
folders and once more, unchanged, into the folder of the 2-process run. Reports medians: wall time,
lines per second, peak memory (the largest single mrlift process, all of them together, and
javac's JVM apart), the speed-up of 2 processes over 1, the unchanged re-run, the ratio to javalang's bare
single-process parse of the same files, the size of the review index, and whether the outputs of
1 and 2 processes are the same byte for byte. These machines are shared and noisy: quote medians
and ratios.

    make setup && .venv/bin/python benchmarks/scale.py --lines 1000000 --runs 3
"""
from __future__ import annotations

import argparse
import filecmp
import json
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
import repogen  # noqa: E402


def _tree_rss(pid: int) -> tuple[int, int, int]:
    """Resident memory in bytes of pid and its descendants: the largest mrlift process, all mrlift
    processes together, and javac's JVM (a tool mrlift runs, counted apart)."""
    kids: dict[int, list[int]] = {}
    for d in os.listdir("/proc"):
        if d.isdigit():
            try:
                with open(f"/proc/{d}/stat") as f:
                    ppid = int(f.read().rsplit(")", 1)[1].split()[1])
                kids.setdefault(ppid, []).append(int(d))
            except (OSError, IndexError, ValueError):
                continue
    todo, rss, jvm = [pid], [], 0
    while todo:
        p = todo.pop()
        todo += kids.get(p, [])
        try:
            with open(f"/proc/{p}/statm") as f:
                size = int(f.read().split()[1]) * os.sysconf("SC_PAGE_SIZE")
            with open(f"/proc/{p}/comm") as f:
                is_java = f.read().strip() in ("java", "javac")
        except OSError:
            continue
        if is_java:
            jvm = max(jvm, size)
        else:
            rss.append(size)
    return (max(rss), sum(rss), jvm) if rss else (0, 0, jvm)


def run_convert(repo: Path, out: Path, jobs: int, extra: list[str]) -> dict:
    """One `mrlift convert`: seconds, peak RSS of the largest process and of all of them (sampled)."""
    cmd = [sys.executable, "-m", "migrate", "convert", str(repo), "-o", str(out), "--jobs", str(jobs), *extra]
    start = time.perf_counter()
    p = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, cwd=HERE.parent)
    peak = [0, 0, 0]

    def sample() -> None:
        while p.poll() is None:
            for i, v in enumerate(_tree_rss(p.pid)):
                peak[i] = max(peak[i], v)
            time.sleep(0.05)

    t = threading.Thread(target=sample)
    t.start()
    _, err = p.communicate()
    took = time.perf_counter() - start
    t.join()
    if p.returncode != 0:
        raise SystemExit(f"mrlift convert failed ({p.returncode}): {err.decode()[-2000:]}")
    return {"seconds": took, "rss_one": peak[0], "rss_all": peak[1], "rss_javac": peak[2]}


def bare_parse(repo: Path) -> float:
    """javalang alone, one process, every .java file: the floor a Python Java parser sets."""
    import javalang

    files = sorted(repo.rglob("*.java"))
    start = time.perf_counter()
    for f in files:
        javalang.parse.parse(f.read_text(encoding="utf-8"))
    return time.perf_counter() - start


def same_outputs(a: Path, b: Path) -> bool:
    """Every file in both folders, byte for byte (the cache is a record of work, not output)."""
    names_a = sorted(p.relative_to(a) for p in a.rglob("*") if p.is_file() and ".mrlift-cache" not in p.parts)
    names_b = sorted(p.relative_to(b) for p in b.rglob("*") if p.is_file() and ".mrlift-cache" not in p.parts)
    if names_a != names_b:
        return False
    match, mismatch, errors = filecmp.cmpfiles(a, b, [str(n) for n in names_a], shallow=False)
    return not mismatch and not errors


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--lines", type=int, default=1_000_000)
    ap.add_argument("--runs", type=int, default=3)
    ap.add_argument("--seed", type=int, default=7)
    ap.add_argument("--hadoop-share", type=float, default=0.2, help="share of lines in jobs and their utilities")
    ap.add_argument("--no-compile-check", action="store_true", help="pass --no-compile-check (javac not run)")
    ap.add_argument("--json", type=Path, help="also write the figures here")
    args = ap.parse_args()
    extra = ["--no-compile-check"] if args.no_compile_check else []
    with tempfile.TemporaryDirectory(prefix="mrlift-scale-") as tmp:
        tmp = Path(tmp)
        repo = tmp / "repo"
        made = repogen.generate(repo, args.lines, args.seed, args.hadoop_share)
        print(f"repository: {made['files']} files, {made['lines']} lines ({made['hadoop_lines']} in jobs and their "
              f"utilities), {made['jobs']} jobs; seed {args.seed}", flush=True)
        rows: dict[str, list] = {"one": [], "two": [], "rerun": [], "parse": [], "same": []}
        for r in range(args.runs):
            rows["parse"].append(bare_parse(repo))
            one = run_convert(repo, tmp / f"one{r}", 1, extra)
            two = run_convert(repo, tmp / f"two{r}", 2, extra)
            again = run_convert(repo, tmp / f"two{r}", 2, extra)
            rows["one"].append(one)
            rows["two"].append(two)
            rows["rerun"].append(again)
            rows["same"].append(same_outputs(tmp / f"one{r}", tmp / f"two{r}"))
            print(f"run {r + 1}: 1 process {one['seconds']:.1f} s, 2 processes {two['seconds']:.1f} s, unchanged "
                  f"re-run {again['seconds']:.1f} s, bare javalang parse {rows['parse'][-1]:.1f} s, same output: "
                  f"{rows['same'][-1]}", flush=True)
            if r:
                shutil.rmtree(tmp / f"one{r}")
                shutil.rmtree(tmp / f"two{r}")
        out = tmp / "two0"
        report = json.loads((out / "report.json").read_text())
        med = statistics.median
        t1, t2 = med(x["seconds"] for x in rows["one"]), med(x["seconds"] for x in rows["two"])
        figures = {
            "lines": made["lines"], "files": made["files"], "jobs_generated": made["jobs"],
            "jobs_reported": report["summary"]["jobs"], "converted": report["summary"]["converted"],
            "runs": args.runs, "compile_check": not args.no_compile_check,
            "seconds_1": round(t1, 2), "seconds_2": round(t2, 2), "speedup": round(t1 / t2, 2),
            "lines_per_second_2": round(made["lines"] / t2),
            "rerun_seconds": round(med(x["seconds"] for x in rows["rerun"]), 2),
            "rss_one_process_mib": round(med(max(x["rss_one"] for x in (a, b)) for a, b in zip(rows["one"], rows["two"]))
                                         / 2**20),
            "rss_all_processes_2_mib": round(med(x["rss_all"] for x in rows["two"]) / 2**20),
            "rss_javac_mib": round(med(x["rss_javac"] for x in rows["two"]) / 2**20),
            "bare_parse_seconds": round(med(rows["parse"]), 2),
            "ratio_to_bare_parse_2": round(t2 / med(rows["parse"]), 2),
            "review_index_bytes": (out / "review.html").stat().st_size,
            "report_md_bytes": (out / "report.md").stat().st_size,
            "byte_identical_1_2": all(rows["same"]),
        }
        for k, v in figures.items():
            print(f"{k:>26}: {v}")
        if args.json:
            args.json.write_text(json.dumps(figures, indent=2) + "\n")


if __name__ == "__main__":
    main()
