"""convert in shards across processes: the same output whatever the number of processes, the same as
a whole-repository scan in one process, and a re-run that redoes only what changed.

The repository is generated (benchmarks/repogen.py: varied styles, both Hadoop APIs, utilities and
plain Java between the jobs), so the check does not rest on the samples the rules were written beside.
"""
from __future__ import annotations

import importlib.util
import json
import shutil
import sys
from pathlib import Path

import pytest

from migrate.batch import convert_repository
from migrate.convert import MARKER, write_outputs
from migrate.scan import scan_repo

ROOT = Path(__file__).resolve().parents[2]


def _repogen():
    spec = importlib.util.spec_from_file_location("repogen", ROOT / "benchmarks" / "repogen.py")
    mod = importlib.util.module_from_spec(spec)
    sys.modules.setdefault("repogen", mod)  # its dataclasses look their module up
    spec.loader.exec_module(mod)
    return mod


def _files(folder: Path) -> dict[str, bytes]:
    return {p.relative_to(folder).as_posix(): p.read_bytes() for p in sorted(folder.rglob("*"))
            if p.is_file() and ".mrlift-cache" not in p.parts}


@pytest.fixture(scope="module")
def generated(tmp_path_factory):
    root = tmp_path_factory.mktemp("generated") / "repo"
    made = _repogen().generate(root, 9000, seed=11)
    assert made["jobs"] >= 15 and made["files"] > made["jobs"]
    return root


def test_one_and_two_processes_write_the_same_bytes(generated, tmp_path):
    one = convert_repository(generated, tmp_path / "one", "repo", jobs=1, compile_mode="off", cache_dir=False)
    two = convert_repository(generated, tmp_path / "two", "repo", jobs=2, compile_mode="off", cache_dir=False)
    a, b = _files(tmp_path / "one"), _files(tmp_path / "two")
    assert a.keys() == b.keys() and len(a) > 40
    assert [n for n in a if a[n] != b[n]] == []
    assert one.report["summary"]["converted"] >= 10 and one.report == two.report


def test_shards_give_what_one_whole_scan_gives(generated, tmp_path):
    convert_repository(generated, tmp_path / "batch", "repo", jobs=2, compile_mode="off", cache_dir=False)
    scan = scan_repo(generated)
    scan.compiled = "off (--no-compile-check): only mrlift's own checks of what javac would reject"
    write_outputs(scan, tmp_path / "whole", "repo")
    a, b = _files(tmp_path / "batch"), _files(tmp_path / "whole")
    assert a.keys() == b.keys()
    assert [n for n in a if a[n] != b[n]] == []


def test_an_unchanged_run_checks_hashes_and_a_changed_file_redoes_only_its_shard(generated, tmp_path):
    repo = tmp_path / "repo"
    shutil.copytree(generated, repo)
    out = tmp_path / "out"
    first = convert_repository(repo, out, "repo", jobs=2, compile_mode="off")
    before = _files(out)
    again = convert_repository(repo, out, "repo", jobs=2, compile_mode="off")
    assert again.unchanged and _files(out) == before and again.report == first.report
    # one job's driver changes: its shard is worked out again, every other shard comes from the cache
    job = next(j for j in first.report["jobs"] if j["status"] == "converted")
    driver = repo / job["files"]["driver"].rsplit(":", 1)[0]
    driver.write_text(driver.read_text(encoding="utf-8").replace("public class", "/* edited */ public class", 1),
                      encoding="utf-8")
    third = convert_repository(repo, out, "repo", jobs=2, compile_mode="off")
    assert not third.unchanged and third.stats["shards"] - third.stats["cached"] == 1
    fresh = convert_repository(repo, tmp_path / "fresh", "repo", jobs=1, compile_mode="off", cache_dir=False)
    assert _files(out) == _files(tmp_path / "fresh")  # what the cache gave is what a fresh run gives
    assert third.report == fresh.report
    # a hand edit in the output folder: not an unchanged run (the edit is kept, as always)
    script = out / job["script"]
    script.write_text(script.read_text() + "# hand work\n")
    fourth = convert_repository(repo, out, "repo", jobs=2, compile_mode="off")
    assert not fourth.unchanged and script.read_text().endswith("# hand work\n")
    assert json.loads((out / MARKER).read_text())["files"]


def test_a_cache_folder_others_may_write_to_is_refused(generated, tmp_path):
    from migrate.cache import CacheFolderError

    shared = tmp_path / "shared"
    shared.mkdir()
    shared.chmod(0o777)
    with pytest.raises(CacheFolderError):
        convert_repository(generated, tmp_path / "out", "repo", jobs=1, compile_mode="off", cache_dir=shared)


def test_a_large_report_md_lists_the_jobs_and_links_each_job_s_detail(generated, tmp_path, monkeypatch):
    from migrate.report import render

    monkeypatch.setattr(render, "INLINE_DETAIL", 3)  # as if the repository had thousands of jobs
    w = convert_repository(generated, tmp_path / "out", "repo", jobs=1, compile_mode="off", cache_dir=False)
    md = (tmp_path / "out" / "report.md").read_text()
    detailed = [(k, j) for k, j in enumerate(w.report["jobs"]) if j["hand_work"] or j["notes"] or j["aggregates"]]
    assert len(detailed) > 3 and "## " not in md.split("| job |", 1)[1]  # no job's section in the index
    for k, j in detailed:
        name = render.detail_name(j, k)
        assert f"]({name})" in md
        own = (tmp_path / "out" / name).read_text()
        assert own.startswith("[all jobs](../report.md)") and f"## {j['name']}" in own
        for h in j["hand_work"]:
            assert f"`{h['file']}:{h['line']}`" in own


def test_with_javac_a_changed_file_still_redoes_only_its_shard(generated, tmp_path):
    """javac runs again over every file (its answer depends on all of them) while the cached shards
    are taken at once; each is checked against javac's answer when it comes."""
    from migrate.verify.classpath import find_classpath
    from migrate.verify.hadoop import HadoopUnavailable

    try:
        find_classpath(None)
    except HadoopUnavailable as exc:
        pytest.skip(f"no Hadoop jars for javac: {exc}")
    repo = tmp_path / "repo"
    shutil.copytree(generated, repo)
    out = tmp_path / "out"
    first = convert_repository(repo, out, "repo", jobs=2, compile_mode="on")
    assert first.report["settings"]["compile_check"].startswith("javac with")
    job = next(j for j in first.report["jobs"] if j["status"] == "converted")
    driver = repo / job["files"]["driver"].rsplit(":", 1)[0]
    driver.write_text(driver.read_text(encoding="utf-8") + "\n// edited\n", encoding="utf-8")
    again = convert_repository(repo, out, "repo", jobs=2, compile_mode="on")
    assert again.stats["shards"] - again.stats["cached"] == 1 and not again.stats["javac_cached"]
    convert_repository(repo, tmp_path / "fresh", "repo", jobs=2, compile_mode="on", cache_dir=False)
    assert _files(out) == _files(tmp_path / "fresh")
