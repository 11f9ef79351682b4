"""Fill the local cache (benchmarks/realworld/cache/, ignored by git) with the manifest's source files.

The files are other people's code and are never committed. They come from a folder of cloned
repositories (--repos: owner+name/ or owner/name/, each a clone or a git snapshot), or, where the
network allows, from `git clone` of https://github.com/OWNER/NAME. Every file is checked against
the manifest's sha256; a file that differs is refused (not written) and reported.

    python benchmarks/realworld/pull.py --repos /path/to/clones
    python benchmarks/realworld/pull.py --clone        # needs the network
"""
from __future__ import annotations

import argparse
import hashlib
import subprocess
import sys
import tempfile
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))
from benchmarks.realworld.common import CACHE, MANIFEST, git_dir, git_show, load_manifest, repo_folder  # noqa: E402


def _clone(repo: str, into: Path) -> Path | None:
    target = into / repo_folder(repo)
    p = subprocess.run(["git", "clone", "--quiet", "--bare", f"https://github.com/{repo}.git", str(target)],
                       capture_output=True, text=True)
    return target if p.returncode == 0 else None


def pull(repos: Path | None, clone: bool, cache: Path = CACHE, manifest: Path = MANIFEST) -> tuple[int, list[str]]:
    """Write every manifest file into `cache`; returns (files written or already right, problems)."""
    jobs = load_manifest(manifest)
    problems: list[str] = []
    ok = 0
    with tempfile.TemporaryDirectory(prefix="mrlift-pull-") as tmp:
        gits: dict[str, Path | None] = {}
        for job in jobs:
            for f in job.files:
                target = cache / repo_folder(job.repo) / f.path
                if target.is_file() and hashlib.sha256(target.read_bytes()).hexdigest() == f.sha256:
                    ok += 1
                    continue
                if job.repo not in gits:
                    gits[job.repo] = (git_dir(repos, job.repo) if repos else None) or \
                        (_clone(job.repo, Path(tmp)) if clone else None)
                git = gits[job.repo]
                if git is None:
                    problems.append(f"{job.id}: no copy of {job.repo} (give --repos with a clone of it, or --clone)")
                    break
                try:
                    data = git_show(git, job.commit, f.path)
                except FileNotFoundError as exc:
                    problems.append(f"{job.id}: {exc}")
                    continue
                digest = hashlib.sha256(data).hexdigest()
                if digest != f.sha256:
                    problems.append(f"{job.id}: {job.repo}:{f.path} has sha256 {digest}, the manifest says "
                                    f"{f.sha256}: refused")
                    continue
                target.parent.mkdir(parents=True, exist_ok=True)
                target.write_bytes(data)
                ok += 1
    return ok, sorted(set(problems))


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--repos", type=Path, help="folder of cloned repositories (owner+name/ or owner/name/)")
    ap.add_argument("--clone", action="store_true", help="git clone what --repos does not have (network)")
    ap.add_argument("--cache", type=Path, default=CACHE)
    a = ap.parse_args(argv)
    if a.repos is None and not a.clone:
        ap.error("give --repos DIR, --clone, or both")
    ok, problems = pull(a.repos, a.clone, a.cache)
    for p in problems:
        print(p, file=sys.stderr)
    print(f"{ok} files in {a.cache} match the manifest; {len(problems)} problems")
    return 1 if problems else 0


if __name__ == "__main__":
    sys.exit(main())
