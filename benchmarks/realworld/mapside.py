"""Map-side hand work of the dev split, against the first measurement (mapside-baseline.json).

    python benchmarks/realworld/run.py --split dev     # converts every dev job into work/
    python benchmarks/realworld/mapside.py             # what is left of the baseline's items
    python benchmarks/realworld/mapside.py --record    # write the baseline (once, at the first measurement)

An item is map side when the mapper's code causes it: map-logic and dates items, and task-lifecycle
items that are not the reducer's. Each baseline item is `gone` (that line of that job has no
map-side item any more), `sharper` (an item remains at the line with another reason) or `left`.
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

BASELINE = HERE / "mapside-baseline.json"
MAP_CATEGORIES = {"map-logic", "dates"}


def map_side(item: dict) -> bool:
    if item["category"] in MAP_CATEGORIES:
        return True
    return item["category"] == "task-lifecycle" and "of the reducer" not in item["reason"]


def current_items(split: str = "dev") -> tuple[list[dict], set[str]]:
    """The map-side items of the split's converted jobs, and the ids of jobs with no report."""
    out, missing = [], set()
    for job in load_manifest():
        if job.split != split:
            continue
        report = WORK / job.id / "bench" / "mrlift" / "report.json"
        if not report.exists():
            missing.add(job.id)
            continue
        for j in json.loads(report.read_text())["jobs"]:
            for h in j["hand_work"]:
                if map_side(h):
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
    ap.add_argument("--record", action="store_true", help="write the baseline from work/ (first measurement only)")
    a = ap.parse_args(argv)
    now, missing = current_items()
    if a.record:
        BASELINE.write_text(json.dumps(now, indent=1) + "\n")
        print(f"{len(now)} map-side items recorded in {BASELINE.name}")
        return 0
    rows = compare(json.loads(BASELINE.read_text()), now, missing)
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
