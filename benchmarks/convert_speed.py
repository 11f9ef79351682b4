"""Benchmark (run by hand, not part of the tests): scan + convert time for a synthetic repository.

The synthetic repository repeats the bundled sample jobs N times under fresh package names, so
it has realistic Java in realistic proportions. Prints the median of several runs and the time
per job; these machines are shared and noisy, so compare medians and ratios, not single runs.

    make setup && .venv/bin/python benchmarks/convert_speed.py --copies 10 --runs 5
"""
from __future__ import annotations

import argparse
import re
import shutil
import statistics
import tempfile
import time
from pathlib import Path

from migrate.convert import write_outputs
from migrate.scan import scan_repo

SAMPLES = Path(__file__).resolve().parent.parent / "samples" / "bikeshare" / "src"


def synthetic_repo(root: Path, copies: int) -> int:
    """Copy the sample sources `copies` times, each copy in its own package; returns the file count."""
    n = 0
    for i in range(copies):
        for src in SAMPLES.rglob("*.java"):
            text = src.read_text(encoding="utf-8")
            text = re.sub(r"\bnet\.brindleharbour\b", f"net.copy{i}.brindleharbour", text)
            if not text.lstrip().startswith(("package", "//")) or "package " not in text:
                text = f"package copy{i}.nopkg;\n" + text  # default-package files get a package per copy
            dest = root / f"copy{i}" / src.relative_to(SAMPLES)
            dest.parent.mkdir(parents=True, exist_ok=True)
            dest.write_text(text, encoding="utf-8")
            n += 1
    return n


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--copies", type=int, default=10)
    ap.add_argument("--runs", type=int, default=5)
    args = ap.parse_args()
    with tempfile.TemporaryDirectory() as tmp:
        repo = Path(tmp) / "repo"
        files = synthetic_repo(repo, args.copies)
        times, jobs = [], 0
        for r in range(args.runs):
            out = Path(tmp) / f"out{r}"
            start = time.perf_counter()
            scan = scan_repo(repo)
            write_outputs(scan, out, "synthetic")
            times.append(time.perf_counter() - start)
            jobs = len(scan.jobs)
            shutil.rmtree(out)
        med = statistics.median(times)
        print(f"{files} files, {jobs} jobs: median {med:.2f} s over {args.runs} runs "
              f"(min {min(times):.2f}, max {max(times):.2f}); {1000 * med / max(jobs, 1):.1f} ms per job")


if __name__ == "__main__":
    main()
