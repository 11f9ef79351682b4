"""The real-world benchmark's own files: the manifest keeps the promises of benchmarks/realworld/README.md
(public jobs from many repositories, hashes, a split per repository, an input and an expected output for
every job that ran), and pull.py refuses a file whose sha256 differs. The jobs themselves are run by
benchmarks/realworld/run.py, by hand: their sources are not committed."""
from __future__ import annotations

import hashlib
import json
import re
import subprocess
import tomllib
from collections import defaultdict

from benchmarks.realworld import pull as pull_module
from benchmarks.realworld.build_manifest import draw_splits
from benchmarks.realworld.common import EXPECTED, INPUTS, MANIFEST, SELECTION, lay_out, load_manifest

JOBS = load_manifest()


def test_the_manifest_covers_at_least_80_jobs_from_30_repositories():
    assert len(JOBS) >= 80
    assert len({j.repo for j in JOBS}) >= 30
    assert len({j.id for j in JOBS}) == len(JOBS)


def test_every_file_is_pinned_by_commit_and_sha256():
    for j in JOBS:
        assert re.fullmatch(r"[0-9a-f]{40}", j.commit), j.id
        assert j.files and all(re.fullmatch(r"[0-9a-f]{64}", f.sha256) for f in j.files), j.id
        assert j.api in ("mapreduce", "mapred", "both")


def test_the_split_is_per_repository_and_about_half():
    side = defaultdict(set)
    for j in JOBS:
        side[j.repo].add(j.split)
    assert all(len(s) == 1 for s in side.values())
    dev = sum(j.split == "dev" for j in JOBS)
    assert abs(dev - len(JOBS) / 2) <= len(JOBS) * 0.1
    per_repo = defaultdict(int)
    for j in JOBS:
        per_repo[j.repo] += 1
    sides = {r: next(iter(s)) for r, s in side.items()}
    assert draw_splits(dict(per_repo), drawn=sides) == sides  # rebuilding the manifest keeps every side
    assert draw_splits(dict(per_repo)) == draw_splits(dict(per_repo))  # a seeded draw


def test_the_manifest_is_the_selection_plus_what_was_measured():
    selected = tomllib.loads(SELECTION.read_text(encoding="utf-8"))["job"]
    assert [s["id"] for s in selected] == [j.id for j in JOBS]
    for s, j in zip(selected, JOBS):
        assert (s["repo"], tuple(s.get("args", []))) == (j.repo, j.args)
        assert s["driver"] in {f.path for f in j.files}


def test_every_input_exists_and_every_job_has_an_expected_output_or_a_reason(tmp_path):
    status = json.loads((EXPECTED / "status.json").read_text(encoding="utf-8"))
    assert set(status) == {j.id for j in JOBS}
    for j in JOBS:
        names = [m for a in j.args for m in re.findall(r"\{in:([^}]+)\}", a)] + list(j.place.values())
        assert names, j.id
        assert all((INPUTS / n).exists() for n in names), j.id
        if status[j.id]["ran"]:
            assert all((EXPECTED / j.id / p).is_file() for p in status[j.id]["parts"]), j.id
        else:
            assert status[j.id]["why"], j.id
    args, output = lay_out(JOBS[0], tmp_path / "run")
    assert output.parent == tmp_path / "run" and all("{" not in a for a in args)


def _git(*args, cwd):
    subprocess.run(["git", *args], cwd=cwd, check=True, capture_output=True)


def test_pull_takes_only_files_whose_sha256_matches(tmp_path):
    clone = tmp_path / "clones" / "someone+jobs"
    (clone / "src").mkdir(parents=True)
    (clone / "src" / "Job.java").write_text("class Job {}\n")
    _git("init", "-q", cwd=clone)
    _git("-c", "user.name=t", "-c", "user.email=t@example.invalid", "add", ".", cwd=clone)
    _git("-c", "user.name=t", "-c", "user.email=t@example.invalid", "commit", "-qm", "x", cwd=clone)
    commit = subprocess.run(["git", "rev-parse", "HEAD"], cwd=clone, capture_output=True, text=True).stdout.strip()
    good = hashlib.sha256(b"class Job {}\n").hexdigest()

    def manifest(sha: str):
        m = tmp_path / f"manifest-{sha[:4]}.toml"
        m.write_text(f'[[job]]\nid = "j"\nrepo = "someone/jobs"\ncommit = "{commit}"\nmain = "Job"\napi = "mapreduce"\n'
                     f'split = "dev"\nfiles = [ {{ path = "src/Job.java", sha256 = "{sha}" }} ]\n')
        return m

    ok, problems = pull_module.pull(tmp_path / "clones", False, tmp_path / "cache", manifest(good))
    assert (ok, problems) == (1, []) and (tmp_path / "cache" / "someone+jobs" / "src" / "Job.java").is_file()
    ok, problems = pull_module.pull(tmp_path / "clones", False, tmp_path / "cache2", manifest("0" * 64))
    assert ok == 0 and "refused" in problems[0]
    assert not (tmp_path / "cache2" / "someone+jobs" / "src" / "Job.java").exists()


def test_the_manifest_file_is_where_the_scripts_read_it():
    assert MANIFEST.name == "manifest.toml" and MANIFEST.is_file()


def test_a_patch_edits_the_scratch_copy_never_the_cache(tmp_path, monkeypatch):
    from dataclasses import replace

    import pytest

    from benchmarks.realworld import common

    cache = tmp_path / "cache"
    (cache / "o+r" / "src").mkdir(parents=True)
    original = b'new Path("hdfs://nn:9000/data/in.txt")\n'
    (cache / "o+r" / "src" / "D.java").write_bytes(original)
    monkeypatch.setattr(common, "CACHE", cache)
    job = replace(JOBS[0], repo="o/r", files=(common.SourceFile("src/D.java", hashlib.sha256(original).hexdigest()),),
                  patches=(("src/D.java", "hdfs://nn:9000/data/", ""),))
    [copy] = common.prepared_sources(job, tmp_path / "scratch")
    assert copy.read_bytes() == b'new Path("in.txt")\n'
    assert (cache / "o+r" / "src" / "D.java").read_bytes() == original
    with pytest.raises(ValueError, match="not in src/D.java"):
        common.prepared_sources(replace(job, patches=(("src/D.java", "hdfs://other/", ""),)), tmp_path / "s2")


def test_a_new_repository_never_re_deals_the_ones_drawn():
    drawn = {"a/x": "dev", "b/y": "holdout"}
    split = draw_splits({"a/x": 5, "b/y": 1, "c/z": 2}, drawn=drawn)
    assert split["a/x"] == "dev" and split["b/y"] == "holdout" and split["c/z"] == "holdout"
