"""Build manifest.toml from selection.toml (ours, written by hand) and a folder of cloned repositories.

For each selected job it records the repository's commit, the files the driver needs (javac's own
closure of the driver over its source root, so nothing is guessed), their sha256, the main class,
the API, and the split. The split is drawn once per repository, seeded, before anything is
converted: repositories in a seeded shuffle, each put on the side with fewer jobs so far.

    python benchmarks/realworld/build_manifest.py --repos /path/to/clones
"""
from __future__ import annotations

import argparse
import random
import re
import subprocess
import sys
import tempfile
import tomllib
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from benchmarks.realworld.common import MANIFEST, SELECTION, git_dir, git_show, load_manifest  # noqa: E402
from migrate.verify.hadoop import compile_classpath  # noqa: E402

SEED = 14  # the draw is made once; changing it re-deals dev and holdout


def _export_java(git: Path, commit: str, into: Path) -> None:
    """The repository's .java files at `commit` (data files are not needed, and large ones may be absent)."""
    names = subprocess.run(["git", "--git-dir", str(git), "ls-tree", "-r", "--name-only", commit],
                           capture_output=True, text=True, check=True).stdout.splitlines()
    for name in names:
        if name.endswith(".java"):
            target = into / name
            target.parent.mkdir(parents=True, exist_ok=True)
            target.write_bytes(git_show(git, commit, name))


def _package(text: str) -> str:
    m = re.search(r"^\s*package\s+([\w.]+)\s*;", text, re.M)
    return m.group(1) if m else ""


def closure(tree: Path, driver: str) -> tuple[list[str], str]:
    """The repository files javac reads to compile the driver (against the Hadoop client jars), and
    the main class's name. Raises if the driver does not compile."""
    f = tree / driver
    package = _package(f.read_text(encoding="utf-8", errors="replace"))
    root = f.parent
    for _ in package.split(".") if package else []:
        root = root.parent
    with tempfile.TemporaryDirectory() as classes:
        p = subprocess.run(["javac", "-verbose", "-nowarn", "-encoding", "UTF-8", "-proc:none", "-implicit:class",
                            "-cp", compile_classpath(), "-sourcepath", str(root), "-d", classes, str(f)],
                           capture_output=True, text=True, errors="replace")
    if p.returncode != 0:
        errors = [line for line in p.stderr.splitlines() if ": error:" in line]
        raise RuntimeError(f"{driver} does not compile against the Hadoop client jars: {errors[:2]}")
    used = {Path(m) for m in re.findall(r"\[parsing started SimpleFileObject\[(.+?)\]\]", p.stderr)}
    used |= {Path(a) / b for a, b in re.findall(r"\[parsing started DirectoryFileObject\[(.+?):(.+?)\]\]", p.stderr)}
    files = sorted(str(u.resolve().relative_to(tree.resolve())) for u in used)
    return files, (package + "." if package else "") + f.stem  # the package as declared, not the folders


def api_of(texts: list[str]) -> str:
    new = any("org.apache.hadoop.mapreduce" in t for t in texts)
    old = any(re.search(r"org\.apache\.hadoop\.mapred\.(?!lib\.input|lib\.output)", t) for t in texts)
    return "both" if new and old else "mapred" if old else "mapreduce"


def draw_splits(jobs_per_repo: dict[str, int], seed: int = SEED, drawn: dict[str, str] | None = None) -> dict[str, str]:
    """dev or holdout per repository. Repositories already `drawn` keep their side (a split is never
    re-dealt once jobs were converted); the others are shuffled with the seed and each goes to the
    side with fewer jobs so far."""
    split = {r: s for r, s in (drawn or {}).items() if r in jobs_per_repo}
    count = {"dev": 0, "holdout": 0}
    for r, s in split.items():
        count[s] += jobs_per_repo[r]
    repos = sorted(r for r in jobs_per_repo if r not in split)
    random.Random(seed).shuffle(repos)
    for r in repos:
        side = min(count, key=lambda s: (count[s], s == "holdout"))
        split[r] = side
        count[side] += jobs_per_repo[r]
    return split


def _toml_value(v) -> str:
    if isinstance(v, bool):
        return "true" if v else "false"
    if isinstance(v, str):
        return '"' + v.replace("\\", "\\\\").replace('"', '\\"') + '"'
    if isinstance(v, (list, tuple)) and v and isinstance(v[0], dict):
        return "[\n" + "".join(f"  {_toml_value(x)},\n" for x in v) + "]"
    if isinstance(v, (list, tuple)):
        return "[" + ", ".join(_toml_value(x) for x in v) + "]"
    if isinstance(v, dict):
        return "{ " + ", ".join(f"{_toml_value(k)} = {_toml_value(x)}" for k, x in v.items()) + " }"
    raise TypeError(v)


# values load_manifest() assumes when a key is absent: not written
_OMITTED = {"place": {}, "output": "{out}", "float_sums": False, "note": ""}


def write_manifest(jobs: list[dict], path: Path) -> None:
    out = ["# Public MapReduce jobs the real-world benchmark converts. Written by build_manifest.py from",
           "# selection.toml; the sources are fetched by pull.py and never committed.", ""]
    for j in jobs:
        out.append("[[job]]")
        for k in ("id", "repo", "commit", "main", "api", "split", "tags", "args", "place", "output", "float_sums", "note",
                  "patch"):
            if k in j and j[k] != _OMITTED.get(k, ""):
                out.append(f"{k} = {_toml_value(j[k])}")
        out.append("files = [")
        out += [f"  {{ path = {_toml_value(f['path'])}, sha256 = {_toml_value(f['sha256'])} }}," for f in j["files"]]
        out.append("]")
        out.append("")
    path.write_text("\n".join(out), encoding="utf-8")


def main(argv: list[str] | None = None) -> int:
    import hashlib

    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repos", type=Path, required=True, help="folder of cloned repositories (owner+name/ or owner/name/)")
    ap.add_argument("--selection", type=Path, default=SELECTION)
    ap.add_argument("--output", type=Path, default=MANIFEST)
    a = ap.parse_args(argv)
    selected = tomllib.loads(a.selection.read_text(encoding="utf-8"))["job"]
    built, failed = [], 0
    with tempfile.TemporaryDirectory(prefix="mrlift-manifest-") as tmp:
        trees: dict[str, tuple[Path, str]] = {}
        for s in selected:
            repo = s["repo"]
            git = git_dir(a.repos, repo)
            if git is None:
                print(f"{s['id']}: no clone of {repo} in {a.repos}", file=sys.stderr)
                failed += 1
                continue
            if repo not in trees:
                commit = s.get("commit") or subprocess.run(["git", "--git-dir", str(git), "rev-parse", "HEAD"],
                                                           capture_output=True, text=True, check=True).stdout.strip()
                tree = Path(tmp) / repo.replace("/", "+")
                _export_java(git, commit, tree)
                trees[repo] = (tree, commit)
            tree, commit = trees[repo]
            try:
                files, main_class = closure(tree, s["driver"])
            except RuntimeError as exc:
                print(f"{s['id']}: {exc}", file=sys.stderr)
                failed += 1
                continue
            texts = [(tree / f).read_text(encoding="utf-8", errors="replace") for f in files]
            built.append({**{k: v for k, v in s.items() if k != "driver"}, "commit": commit, "main": main_class,
                          "api": api_of(texts),
                          "files": [{"path": f, "sha256": hashlib.sha256((tree / f).read_bytes()).hexdigest()}
                                    for f in files]})
    per_repo: dict[str, int] = {}
    for j in built:
        per_repo[j["repo"]] = per_repo.get(j["repo"], 0) + 1
    drawn = {j.repo: j.split for j in load_manifest(a.output)} if a.output.is_file() else {}
    split = draw_splits(per_repo, drawn=drawn)
    for j in built:
        j["split"] = split[j["repo"]]
    write_manifest(built, a.output)
    dev = sum(1 for j in built if j["split"] == "dev")
    print(f"{len(built)} jobs from {len(per_repo)} repositories ({dev} dev, {len(built) - dev} holdout); "
          f"{failed} not built")
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main())
