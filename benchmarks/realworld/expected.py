"""Make each job's expected output: compile the original sources (from the cache) against the Hadoop
client jars the pyspark wheel ships and run the driver on Hadoop's local runner over our input.

The part files go to expected/<id>/ (committed: they are our outputs); expected/status.json says,
per job, whether the original ran and, if not, why (its exit code and the end of its log).

    python benchmarks/realworld/expected.py            # every job
    python benchmarks/realworld/expected.py ID ...     # some jobs
"""
from __future__ import annotations

import json
import shutil
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from benchmarks.realworld.common import EXPECTED, WORK, lay_out, load_manifest, prepared_sources, source_files  # noqa: E402
from migrate.verify.compare import part_files  # noqa: E402
from migrate.verify.hadoop import compile_sources, run_job  # noqa: E402

STATUS = EXPECTED / "status.json"


def run_original(job, work: Path, timeout: float = 300) -> dict:
    """Compile and run one job in `work` (emptied first); its part files are copied to expected/<id>/."""
    shutil.rmtree(work, ignore_errors=True)
    files = source_files(job)
    missing = [str(f) for f in files if not f.is_file()]
    if missing:
        return {"ran": False, "why": f"not in the cache (run pull.py): {missing[0]}"}
    built = compile_sources(prepared_sources(job, work / "src"), work / "classes")
    if not built.ok:
        return {"ran": False, "why": "does not compile", "log": built.log[-2000:]}
    args, output = lay_out(job, work / "run")
    start = time.monotonic()
    ran = run_job(work / "classes", job.main, args, cwd=work / "run", timeout=timeout)
    seconds = round(time.monotonic() - start, 1)
    if ran.returncode != 0 or not output.is_dir() or not part_files(output):
        why = f"exit {ran.returncode}" if ran.returncode != 0 else f"no part files in {output.name}"
        return {"ran": False, "why": why, "seconds": seconds, "log": "\n".join(ran.log.splitlines()[-25:])}
    target = EXPECTED / job.id
    shutil.rmtree(target, ignore_errors=True)
    target.mkdir(parents=True)
    for p in part_files(output):
        shutil.copyfile(p, target / p.name)
    return {"ran": True, "seconds": seconds, "parts": [p.name for p in part_files(output)]}


def main(argv: list[str]) -> int:
    jobs = load_manifest()
    chosen = [j for j in jobs if not argv or j.id in argv]
    status = json.loads(STATUS.read_text(encoding="utf-8")) if STATUS.is_file() else {}
    for job in chosen:
        st = run_original(job, WORK / job.id / "hadoop")
        status[job.id] = st
        print(f"{job.id:48} {'ran' if st['ran'] else 'FAILED: ' + st['why']}", flush=True)
    status = {j.id: status[j.id] for j in jobs if j.id in status}
    EXPECTED.mkdir(exist_ok=True)
    STATUS.write_text(json.dumps(status, indent=1, ensure_ascii=False) + "\n", encoding="utf-8")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
