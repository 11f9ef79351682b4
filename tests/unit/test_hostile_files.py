"""Hostile files and folders: nothing blocks, nothing outside the tree is read, nothing is lost.
Every file that could not be read is in every output (counts, effort, effort.csv, review page)."""
from __future__ import annotations

import csv
import io
import json
import os
import shutil
import subprocess
import sys
from pathlib import Path

import pytest

from migrate.cli import main
from tests.helpers import job_source, scan_text

GOOD = job_source("context.write(value, new IntWritable(1));", reducer_class=None)


def _convert(repo: Path, out: Path, *extra: str) -> dict:
    assert main(["convert", str(repo), "-o", str(out), *extra]) == 0
    return json.loads((out / "report.json").read_text(encoding="utf-8"))


def test_a_fifo_and_a_link_to_dev_zero_are_refused_without_blocking(tmp_path):
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD})
    os.mkfifo(repo / "Pipe.java")
    os.symlink("/dev/zero", repo / "Zero.java")
    # its own process, so that a read that blocks fails the test instead of hanging it
    p = subprocess.run([sys.executable, "-m", "migrate", "convert", str(repo), "-o", str(tmp_path / "out")],
                       capture_output=True, text=True, timeout=120)
    assert p.returncode == 0, p.stdout + p.stderr
    report = json.loads((tmp_path / "out" / "report.json").read_text())
    errors = {e["file"]: e for e in report["errors"]}
    assert "not a regular file" in errors["Pipe.java"]["message"] and errors["Pipe.java"]["line"] is None
    assert "outside the scanned folder" in errors["Zero.java"]["message"]


def test_links_out_of_the_tree_are_reported_and_never_read(tmp_path):
    secret = tmp_path / "elsewhere"
    secret.mkdir()
    (secret / "Secret.java").write_text("// TOKEN-7f3a: not for the report\npublic class Secret {}\n")
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD, "inside/Util.java": "public class Util {}\n"})
    os.symlink(secret / "Secret.java", repo / "Secret.java")
    os.symlink(secret, repo / "linked")
    os.symlink(repo / "inside" / "Util.java", repo / "Again.java")  # a link inside the tree is fine
    report = _convert(repo, tmp_path / "out")
    errors = {e["file"]: e["message"] for e in report["errors"]}
    assert "outside the scanned folder" in errors["Secret.java"] and "not followed" in errors["linked"]
    for f in (tmp_path / "out").iterdir():
        if f.is_file():
            assert "TOKEN-7f3a" not in f.read_text(encoding="utf-8", errors="replace"), f.name


def test_files_over_the_size_limit_are_listed_as_not_read(tmp_path, capsys):
    repo = tmp_path / "repo"
    big = "public class Big {\n" + "  int x;\n" * 200_000 + "}\n"  # about 1.8 MB
    scan_text(repo, {"Main.java": GOOD, "Big.java": big})
    report = _convert(repo, tmp_path / "out", "--max-file-size", "1")
    (e,) = report["errors"]
    assert e["file"] == "Big.java" and "over the limit of 1,048,576" in e["message"] and e["line"] is None
    assert report["settings"]["max_file_bytes"] == 1_048_576
    (big_entry,) = [j for j in report["jobs"] if j["status"] == "not_converted"]
    assert big_entry["sloc"]["total"] == 0  # not read, not even to count it: its size is in the message
    for bad in ("none", "-3"):
        with pytest.raises(SystemExit) as exc:
            main(["scan", str(repo), "--max-file-size", bad])
        assert exc.value.code == 2
    assert "is not a number of megabytes" in capsys.readouterr().err


def test_a_folder_that_cannot_be_listed_is_reported(tmp_path, monkeypatch):
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD, "locked/Hidden.java": "public class Hidden {}\n"})
    real = os.scandir

    def scandir(path="."):
        if isinstance(path, (str, os.PathLike)) and Path(path).name == "locked":
            raise PermissionError(13, "Permission denied", str(path))
        return real(path)

    monkeypatch.setattr(os, "scandir", scandir)  # root may read anything: refuse as a locked folder would
    report = _convert(repo, tmp_path / "out")
    (e,) = report["errors"]
    assert e["file"] == "locked" and "Permission denied" in e["message"]
    assert report["summary"]["not_read"] == 1


def test_a_file_name_that_is_not_utf8_is_shown_escaped(tmp_path):
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD})
    os.rename(repo / "Main.java", os.fsencode(repo) + b"/M\xe9in.java")
    report = _convert(repo, tmp_path / "out")
    assert report["jobs"][0]["files"]["driver"].startswith("M\\xe9in.java:")


def test_every_file_not_read_is_in_every_output(tmp_path):
    """A broken file, a file in another encoding and a driver whose Job line is damaged: each is a
    not_converted entry with its file and line in report.json, report.md, effort.csv and review.html."""
    repo = tmp_path / "repo"
    damaged = job_source("context.write(value, new IntWritable(1));", reducer_class=None) \
        .replace("public class Main", "public class Damaged") \
        .replace('Job job = Job.getInstance(new Configuration(), "test job");', "Job job = Job.getInstance(;")
    scan_text(repo, {"Main.java": GOOD, "Damaged.java": damaged,
                     "Latin.java": "// caf\xe9\npublic class Latin {}\n".encode("latin-1")})
    out = tmp_path / "out"
    report = _convert(repo, out)
    s = report["summary"]
    assert s["jobs"] == 3 and s["converted"] == 1 and s["not_converted"] == 2 and s["not_read"] == 2
    entries = {j["name"]: j for j in report["jobs"] if j["status"] == "not_converted"}
    assert set(entries) == {"Damaged.java (not read)", "Latin.java (not read)"}
    (item,) = entries["Damaged.java (not read)"]["hand_work"]
    damaged_line = next(i for i, l in enumerate(damaged.split("\n"), 1) if "getInstance(;" in l)
    assert item["category"] == "not-read" and item["line"] == damaged_line and item["file"] == "Damaged.java"
    assert entries["Latin.java (not read)"]["hand_work"][0]["line"] == 1
    assert all(e["effort_hours"] > 0 and e["sloc"]["hand"] > 0 for e in entries.values())
    assert report["effort"]["hours"] == pytest.approx(sum(j["effort_hours"] for j in report["jobs"]), abs=0.05)
    rows = list(csv.reader(io.StringIO((out / "effort.csv").read_text())))
    assert {r[1] for r in rows if r[0] == "job" and r[3] == "not_converted"} == set(entries)
    assert ["hand-work", "Damaged.java (not read)"] == rows[[r[1] for r in rows].index("Damaged.java (not read)") + 1][:2]
    md = (out / "report.md").read_text()
    assert f"`Damaged.java:{damaged_line}`" in md and "Latin.java (not read)" in md
    page = (out / "review.html").read_text()
    assert "Damaged.java (not read)" in page and "3 jobs: 1 converted, 0 partial, 2 not converted" in page
    k = [j["name"] for j in report["jobs"]].index("Damaged.java (not read)")
    own = (out / "review" / f"entry-{k}.html").read_text()  # its own page: the Java, and no script
    assert "no script: this code could not be read" in own and "Damaged.java" in own and "getInstance" in own


def test_the_output_folder_below_a_file_or_unwritable_is_a_clear_error(tmp_path, capsys, monkeypatch):
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD})
    (tmp_path / "a-file").write_text("mine\n")
    assert main(["convert", str(repo), "-o", str(tmp_path / "a-file" / "out")]) == 2
    assert "cannot write the output" in capsys.readouterr().out
    assert (tmp_path / "a-file").read_text() == "mine\n"
    from migrate import convert

    def read_only(target, data):
        raise OSError(30, "Read-only file system", str(target))

    monkeypatch.setattr(convert, "write_atomically", read_only)  # root ignores permission bits: as a RO mount
    assert main(["convert", str(repo), "-o", str(tmp_path / "ro")]) == 2
    out = capsys.readouterr().out
    assert "Read-only file system" in out and "Traceback" not in out


def test_spreadsheet_formulas_and_line_breaks_cannot_come_through_the_reports(tmp_path):
    from migrate.report.render import to_csv, to_markdown

    evil = {"name": "=HYPERLINK(\"x\")\n| broken", "script": "@evil.py", "status": "converted",
            "driver": "-2+3", "hand_work": [{"category": "x", "file": "+A.java", "line": None, "profile": "P1",
                                             "sloc": 1, "reason": "=1+1", "suggestion": "", "snippet": ""}],
            "sloc": {"total": 1}, "effort_hours": 1.0, "shapes": [], "verification": None, "notes": [],
            "counters": [], "findings": [], "aggregates": [], "inputs": [], "side_tables": [], "chain": [],
            "join": None}
    report = {"repository": "r", "warning": "w", "summary": {"jobs": 1, "converted": 1, "partial": 0,
                                                            "not_converted": 0, "errors": 0},
              "jobs": [evil], "errors": [], "effort": {"hours": 1.0, "range_hours": [0.8, 1.25], "model": "m",
                                                       "caveat": "c", "constants": [], "pert": {"categories": {}}}}
    cells = [c for row in csv.reader(io.StringIO(to_csv(report))) for c in row]
    assert not any(c[:1] in ("=", "+", "-", "@") for c in cells)  # OWASP: CSV injection
    assert "whole file" in cells
    table = [l for l in to_markdown(report).split("\n") if l.startswith("| =HYPERLINK")]
    assert len(table) == 1 and "\\| broken" in table[0]  # one row: no line break, the pipe escaped


@pytest.mark.skipif(shutil.which("javac") is None, reason="javac (JDK 17+) names the line to match")
def test_a_missing_semicolon_is_reported_at_the_line_javac_names(tmp_path):
    """The reference is javac itself (JDK 17): it reports a missing ';' at the end of the token before."""
    from migrate.java.source import read_java

    src = tmp_path / "Syn.java"
    src.write_text("public class Syn {\n  void f() {\n    int x = 1\n\n    // a comment\n\n    int y = 2;\n  }\n}\n")
    p = subprocess.run(["javac", "-d", str(tmp_path / "c"), str(src)], capture_output=True, text=True)
    javac_line = int(p.stderr.split("Syn.java:")[1].split(":")[0])
    assert read_java(src, tmp_path).line == javac_line == 3


def test_reports_stand_on_their_own_and_tables_are_not_cut_when_piped(tmp_path):
    """report.md names its sources in words (no pointer to a file of this repository, no [P]/[S]
    markers); the console tables keep whole cells when the output is a pipe or a CI log."""
    long_name = "rides per start station with a deliberately long job name for the table"
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD.replace('"test job"', f'"{long_name}"')})
    p = subprocess.run([sys.executable, "-m", "migrate", "convert", str(repo), "-o", str(tmp_path / "out")],
                       capture_output=True, text=True, timeout=300)
    assert p.returncode == 0 and long_name in p.stdout and "…" not in p.stdout
    md = (tmp_path / "out" / "report.md").read_text()
    assert "EFFORT.md" not in md and "[P]" not in md and "[S]" not in md
    assert "COCOMO II Model Definition Manual" in md


def test_a_tolerance_is_named_where_it_was_needed():
    from migrate.verify.compare import Verdict
    from migrate.verify.runner import _summary

    v = Verdict(True, "bytes", 3, 3, 0, 0, (), tolerance_used=True)
    text = _summary(v, [], 1e-9)
    assert "within a relative tolerance of 1e-09" in text and "the same lines in the same order" in text
    assert "bytes" not in text  # "the same bytes … some numbers differ" would contradict itself
