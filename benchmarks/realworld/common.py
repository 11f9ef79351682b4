"""What the real-world benchmark's scripts share: the manifest, the cache of sources, and how a job's
arguments and inputs are laid out in the folder it runs in (the same for Hadoop and for Spark)."""
from __future__ import annotations

import hashlib
import re
import shutil
import tomllib
from dataclasses import dataclass, field
from pathlib import Path

HERE = Path(__file__).resolve().parent
MANIFEST = HERE / "manifest.toml"
SELECTION = HERE / "selection.toml"
INPUTS = HERE / "inputs"
EXPECTED = HERE / "expected"
CACHE = HERE / "cache"  # other people's code: ignored by git, filled by pull.py
WORK = HERE / "work"  # scratch runs: ignored by git


@dataclass(frozen=True)
class SourceFile:
    path: str
    sha256: str


@dataclass(frozen=True)
class Job:
    """One public MapReduce job: where its sources are, how to run it, which split it is in."""

    id: str
    repo: str
    commit: str
    main: str
    files: tuple[SourceFile, ...]
    args: tuple[str, ...]
    api: str
    tags: tuple[str, ...]
    split: str
    place: dict[str, str] = field(default_factory=dict)  # folder the job reads by a fixed relative path -> input
    output: str = "{out}"  # where the job writes its final output (a fixed relative path, or {out})
    float_sums: bool = False  # the job sums floating-point numbers: a tolerance is allowed, counted apart
    note: str = ""
    patches: tuple[tuple[str, str, str], ...] = ()  # (path, old, new): the smallest edit that lets it run locally

    @property
    def cache_dir(self) -> Path:
        return CACHE / repo_folder(self.repo)


def repo_folder(repo: str) -> str:
    """owner/name -> owner+name: one flat folder per repository."""
    return repo.replace("/", "+")


def sha256(path: Path) -> str:
    return hashlib.sha256(path.read_bytes()).hexdigest()


def load_manifest(path: Path = MANIFEST) -> list[Job]:
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    jobs = []
    for j in data["job"]:
        jobs.append(Job(
            id=j["id"], repo=j["repo"], commit=j["commit"], main=j["main"],
            files=tuple(SourceFile(f["path"], f["sha256"]) for f in j["files"]),
            args=tuple(j.get("args", [])), api=j["api"], tags=tuple(j.get("tags", [])), split=j["split"],
            place=dict(j.get("place", {})), output=j.get("output", "{out}"), float_sums=j.get("float_sums", False),
            note=j.get("note", ""),
            patches=tuple((p["path"], p["old"], p["new"]) for p in j.get("patch", []))))
    return jobs


def lay_out(job: Job, cwd: Path) -> tuple[list[str], Path]:
    """Copy the job's inputs into `cwd` (its own copies, for each run) and return the arguments with
    the placeholders filled in, and the folder its final output will be in.
    {in:NAME} is inputs/NAME copied to cwd/in/NAME; {out} is cwd/out; {tmp} is cwd/tmp."""
    cwd.mkdir(parents=True, exist_ok=True)
    for rel, name in job.place.items():
        _copy(INPUTS / name, cwd / rel)
    def copied(m: re.Match) -> str:
        _copy(INPUTS / m[1], cwd / "in" / m[1])
        return str(cwd / "in" / m[1])

    args = [re.sub(r"\{in:([^}]+)\}", copied, a).replace("{out}", str(cwd / "out")).replace("{tmp}", str(cwd / "tmp"))
            for a in job.args]
    output = cwd / job.output.replace("{out}", "out")
    return args, output


def _copy(src: Path, dst: Path) -> None:
    if dst.exists():
        return
    dst.parent.mkdir(parents=True, exist_ok=True)
    if src.is_dir():
        shutil.copytree(src, dst)
    else:
        shutil.copyfile(src, dst)


def source_files(job: Job, root: Path | None = None) -> list[Path]:
    """The job's files in the cache (or under `root`), in manifest order."""
    base = root or job.cache_dir
    return [base / f.path for f in job.files]


def git_dir(repos: Path, repo: str) -> Path | None:
    """The git directory of `repo` in a folder of cloned repositories: owner+name/ (a clone, or a
    snapshot holding repo/ or repo/.git) or owner/name/."""
    owner, name = repo.split("/", 1)
    for base in (repos / repo_folder(repo), repos / owner / name):
        for g in (base / "repo" / ".git", base / "repo", base / ".git", base):
            if (g / "HEAD").is_file() and (g / "objects").is_dir():
                return g
    return None


def git_show(git: Path, commit: str, path: str) -> bytes:
    import subprocess

    p = subprocess.run(["git", "--git-dir", str(git), "show", f"{commit}:{path}"], capture_output=True)
    if p.returncode != 0:
        raise FileNotFoundError(f"{git}: no {path} at {commit[:12]} ({p.stderr.decode(errors='replace').strip()})")
    return p.stdout


def prepared_sources(job: Job, into: Path) -> list[Path]:
    """The job's files copied from the cache into `into` (at their repository paths), with the
    manifest's patches applied to the copies; the cache is never edited."""
    out = []
    for f, src in zip(job.files, source_files(job)):
        text = src.read_bytes()
        for path, old, new in job.patches:
            if path == f.path:
                if old.encode() not in text:
                    raise ValueError(f"{job.id}: the patch's text is not in {path}: {old!r}")
                text = text.replace(old.encode(), new.encode())
        target = into / f.path
        target.parent.mkdir(parents=True, exist_ok=True)
        target.write_bytes(text)
        out.append(target)
    return out
