"""The output folder survives interruptions and re-runs: every file is written whole, an
interrupted run is finished by a plain re-run (byte-identical to an uninterrupted one), and
verdicts of `mrlift verify` stay with jobs whose script and sources did not change."""
from __future__ import annotations

import json
import signal
import subprocess
import sys
import time
from pathlib import Path

import pytest

from migrate.cli import main
from tests.helpers import job_source, scan_text

REDUCER = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int sum = 0;
      for (IntWritable v : values) sum += v.get();
      context.write(key, new IntWritable(sum));
    }
  }
"""


def _repo(root: Path, jobs: int = 4) -> Path:
    files = {}
    for i in range(jobs):
        text = job_source("    for (String w : value.toString().split(\" \")) context.write(new Text(w), new IntWritable(1));",
                          reducer=REDUCER)
        files[f"p{i}/Count{i}.java"] = f"package p{i};\n" + text.replace("class Main", f"class Count{i}")
    scan_text(root, files)
    return root


def _files(folder: Path) -> dict[str, bytes]:
    """The output, without the cache (a record of work, not output: two runs may fill it differently)."""
    return {p.relative_to(folder).as_posix(): p.read_bytes() for p in sorted(folder.rglob("*"))
            if p.is_file() and ".mrlift-cache" not in p.parts}


@pytest.mark.parametrize("stop_after", [0, 1, 3, 5])
def test_an_interrupted_convert_is_finished_by_a_plain_rerun(tmp_path, monkeypatch, capsys, stop_after):
    repo = _repo(tmp_path / "repo")
    assert main(["convert", str(repo), "-o", str(tmp_path / "clean")]) == 0
    from migrate import convert

    real = convert.write_atomically
    calls = []

    def interrupted(target, data):
        if target.name != convert.MARKER:
            calls.append(target)
            if len(calls) > stop_after:
                raise KeyboardInterrupt  # as Ctrl-C would, between two files
        real(target, data)

    monkeypatch.setattr(convert, "write_atomically", interrupted)
    out = tmp_path / "out"
    assert main(["convert", str(repo), "-o", str(out)]) == 130
    assert "interrupted" in capsys.readouterr().out
    assert (out / convert.MARKER).exists()  # written first: the folder is known as mrlift's
    monkeypatch.setattr(convert, "write_atomically", real)
    assert main(["convert", str(repo), "-o", str(out)]) == 0  # no --force needed
    assert "kept" not in capsys.readouterr().out
    assert _files(out) == _files(tmp_path / "clean")  # nothing kept as a "hand edit", no .mrlift-new copies


def test_a_convert_killed_at_any_moment_is_finished_by_a_plain_rerun(tmp_path):
    """SIGKILL (no chance to clean up) at several moments of a real run."""
    repo = _repo(tmp_path / "repo", jobs=6)
    cmd = [sys.executable, "-m", "migrate", "convert", str(repo), "-o"]
    subprocess.run(cmd + [str(tmp_path / "clean")], check=True, capture_output=True, timeout=300)
    clean = _files(tmp_path / "clean")
    for i, delay in enumerate((0.5, 1.0, 1.5, 2.0, 3.0)):
        out = tmp_path / f"out{i}"
        p = subprocess.Popen(cmd + [str(out)], stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        time.sleep(delay)
        p.send_signal(signal.SIGKILL)
        p.wait()
        again = subprocess.run(cmd + [str(out)], capture_output=True, text=True, timeout=300)
        assert again.returncode == 0, again.stdout + again.stderr
        assert _files(out) == clean, f"killed after {delay} s"


def test_files_are_written_whole_or_not_at_all(tmp_path, monkeypatch):
    from migrate import convert

    target = tmp_path / "report.json"
    target.write_text("old, complete\n")

    class Full(OSError):
        pass

    def failing_replace(src, dst):
        raise Full("no space left")

    monkeypatch.setattr(convert.os, "replace", failing_replace)
    with pytest.raises(Full):
        convert.write_atomically(target, b"new")
    assert target.read_text() == "old, complete\n" and sorted(p.name for p in tmp_path.iterdir()) == ["report.json"]


def test_verdicts_stay_with_unchanged_jobs_across_a_reconvert(tmp_path):
    from migrate.convert import record_checks
    from migrate.verify.runner import Check

    repo = _repo(tmp_path / "repo", jobs=2)
    out = tmp_path / "out"
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    report = json.loads((out / "report.json").read_text())
    checks = [Check(j["name"], j["script"], j["driver"], "agrees", "3 lines, the same bytes in the same order",
                    mode="bytes", data="runs.json") for j in report["jobs"]]
    record_checks(out, report, checks)
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    after = json.loads((out / "report.json").read_text())
    assert [j["verification"]["verdict"] for j in after["jobs"]] == ["agrees", "agrees"]
    assert after["summary"]["verified"] == 2
    # a change in one job's Java: its verdict no longer holds; the other one's does
    java = repo / "p1" / "Count1.java"
    java.write_text(java.read_text().replace('split(" ")', 'split(",")'))
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    after = {j["script"]: j["verification"] for j in json.loads((out / "report.json").read_text())["jobs"]}
    assert after["count0.py"]["verdict"] == "agrees" and after["count1.py"] is None
