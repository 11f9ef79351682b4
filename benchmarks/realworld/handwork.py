"""Hand work of the dev split on one side of the shuffle, against its first measurement.

    python benchmarks/realworld/run.py --split dev                  # converts every dev job into work/
    python benchmarks/realworld/handwork.py --side map              # what is left of the baseline's items
    python benchmarks/realworld/handwork.py --side reduce --record   # write a baseline (once, at the first measurement)

Map side (issue 15's baseline, mapside-baseline.json): what the mapper's code causes, map-logic and
dates items and task-lifecycle items that are not the reducer's. Reduce side (issue 16's,
reduceside-baseline.json): reducers, combiners, partitioners, comparators, task lifecycles and
per-task state, output layout. Each baseline item is `gone` (that line of that job has no item of
the side any more), `sharper` (an item remains at the line with another reason) or `left`.
Only job ids, file names, lines, categories and reasons are kept: no one else's code.
"""
from __future__ import annotations

import argparse
import json
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))
from benchmarks.realworld.common import HERE, WORK, load_manifest  # noqa: E402
from migrate.verify.runner import branch_taken  # noqa: E402

BASELINES = {"map": HERE / "mapside-baseline.json", "reduce": HERE / "reduceside-baseline.json"}
MAP_CATEGORIES = {"map-logic", "dates"}
REDUCE_CATEGORIES = {"reduce-logic", "combiner", "partitioner", "secondary-sort", "value-order", "output-layout",
                     "task-lifecycle", "task-state", "per-task-state", "top-n"}


def map_side(item: dict) -> bool:
    if item["category"] in MAP_CATEGORIES:
        return True
    return item["category"] == "task-lifecycle" and "of the reducer" not in item["reason"]


def reduce_side(item: dict) -> bool:
    return item["category"] in REDUCE_CATEGORIES


def current_items(split: str = "dev", side=map_side) -> tuple[list[dict], set[str]]:
    """The items of one side in the split's reports, and the ids of jobs with no report."""
    out, missing = [], set()
    for job in load_manifest():
        if job.split != split:
            continue
        report = WORK / job.id / "bench" / "mrlift" / "report.json"
        if not report.exists():
            missing.add(job.id)
            continue
        for j in json.loads(report.read_text())["jobs"]:
            if j.get("driver") == job.main and not branch_taken(j.get("mode"), job.args):
                continue  # another branch of a driver that picks its job by an argument
            for h in j["hand_work"]:
                if side(h):
                    out.append({"job": job.id, "category": h["category"], "file": h["file"], "line": h["line"],
                                "reason": h["reason"]})
    return out, missing


def compare(baseline: list[dict], now: list[dict], missing: set[str]) -> list[tuple[str, dict, dict | None]]:
    at = {(i["job"], i["file"], i["line"]): i for i in now}
    out = []
    for b in baseline:
        n = at.get((b["job"], b["file"], b["line"]))
        state = "no report" if b["job"] in missing else "gone" if n is None else \
            "left" if n["reason"] == b["reason"] else "sharper"
        out.append((state, b, n))
    return out


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--side", choices=sorted(BASELINES), default="map")
    ap.add_argument("--record", action="store_true", help="write the baseline from work/ (first measurement only)")
    a = ap.parse_args(argv)
    baseline = BASELINES[a.side]
    now, missing = current_items(side=map_side if a.side == "map" else reduce_side)
    if a.record:
        baseline.write_text(json.dumps(now, indent=1) + "\n")
        print(f"{len(now)} {a.side}-side items recorded in {baseline.name}")
        return 0
    rows = compare(json.loads(baseline.read_text()), now, missing)
    for state, b, n in rows:
        print(f"{state:9} {b['job']:34} {b['file'].rsplit('/', 1)[-1]}:{b['line']}  {b['reason'][:90]}")
        if state == "sharper":
            print(f"{'':8} {'':34} now: {n['reason'][:100]}")
    done = sum(1 for s, _, _ in rows if s in ("gone", "sharper"))
    new = [i for i in now if (i["job"], i["file"], i["line"]) not in {(b["job"], b["file"], b["line"]) for _, b, _ in rows}]
    for i in new:
        print(f"{'new':8} {i['job']:34} {i['file'].rsplit('/', 1)[-1]}:{i['line']}  {i['reason'][:90]}")
    print(f"\n{done}/{len(rows)} baseline items gone or sharper ({100 * done / max(len(rows), 1):.0f}%); "
          f"{len(new)} items at other lines")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
