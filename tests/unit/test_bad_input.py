"""Bad input: a clear error naming file and line, the batch goes on, exit code 0, nothing lost."""
from __future__ import annotations

import json

import pytest

from migrate.cli import main
from tests.helpers import job_source, scan_text

GOOD = job_source("context.write(value, new IntWritable(1));", reducer_class=None)


def test_unparseable_non_utf8_and_empty_files_are_errors_and_the_batch_goes_on(tmp_path, capsys):
    repo = tmp_path / "repo"
    files = {
        "Main.java": GOOD,
        "Broken.java": "import org.apache.hadoop.io.Text;\npublic class Broken {\n  void f( {\n}\n",
        "Latin1.java": "// caf\xe9\npublic class Latin1 {}\n".encode("latin-1"),
        "Empty.java": "",
    }
    scan = scan_text(repo, files)
    errors = {e.path: e for e in scan.errors}
    assert set(errors) == {"Broken.java", "Latin1.java", "Empty.java"}
    assert errors["Broken.java"].line == 3 and "syntax" in errors["Broken.java"].message
    assert errors["Latin1.java"].line == 1 and "UTF-8" in errors["Latin1.java"].message
    assert "empty" in errors["Empty.java"].message
    assert [j.status for j in scan.jobs] == ["converted"]
    out = tmp_path / "out"
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    report = json.loads((out / "report.json").read_text())
    assert {(e["file"], e["line"]) for e in report["errors"]} == {("Broken.java", 3), ("Latin1.java", 1), ("Empty.java", 1)}
    assert report["jobs"][0]["status"] == "converted"


def test_mapper_body_not_understood_is_a_hand_work_item_with_file_and_line(tmp_path):
    body = "      String s = value.toString();\n      java.util.UUID u = java.util.UUID.randomUUID();\n" \
           "      context.write(new Text(s), new IntWritable(1));"
    scan = scan_text(tmp_path, {"Main.java": job_source(body, reducer_class=None)})
    (job,) = scan.jobs
    assert job.status == "partial"
    (item,) = job.plan.hand_work
    line = next(i for i, l in enumerate(job_source(body, reducer_class=None).split("\n"), 1) if "randomUUID" in l)
    assert (item.origin.file, item.origin.line_start) == ("Main.java", line)
    assert item.reason and item.suggestion


def test_refuses_to_write_into_a_folder_it_did_not_create(tmp_path, capsys):
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD})
    out = tmp_path / "mine"
    out.mkdir()
    (out / "notes.txt").write_text("precious")
    assert main(["convert", str(repo), "-o", str(out)]) == 2
    assert "not empty" in capsys.readouterr().out
    assert sorted(p.name for p in out.iterdir()) == ["notes.txt"]
    assert (out / "notes.txt").read_text() == "precious"
    # its own output folder can be written again
    again = tmp_path / "again"
    assert main(["convert", str(repo), "-o", str(again)]) == 0
    assert main(["convert", str(repo), "-o", str(again)]) == 0


def test_exit_codes_for_usage_errors_and_unreadable_repositories(tmp_path):
    assert main(["scan", str(tmp_path / "missing")]) == 2
    (tmp_path / "only").mkdir()
    (tmp_path / "only" / "Bad.java").write_text("class {")
    assert main(["scan", str(tmp_path / "only")]) == 1  # nothing could be read
    with pytest.raises(SystemExit) as exc:
        main(["convert"])
    assert exc.value.code == 2


def test_scan_json_lists_jobs_classes_and_errors(tmp_path, capsys):
    scan_text(tmp_path, {"Main.java": GOOD, "Bad.java": "import org.apache.hadoop.io.Text;\nclass {",
                        "Plain.java": "class Plain {"})  # no Hadoop in it, named by no Hadoop file: not parsed
    assert main(["scan", str(tmp_path), "--json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["jobs"][0]["driver"] == "Main" and data["jobs"][0]["status"] == "converted"
    assert {c["class"]: c["roles"] for c in data["classes"]}["Main.M"] == ["mapper"]
    assert [e["file"] for e in data["errors"]] == ["Bad.java"]
    assert data["files"] == 3 and data["parsed"] == 1  # Main; Bad.java was read and failed


def test_reconvert_never_replaces_hand_edits_or_foreign_files(tmp_path):
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": GOOD})
    out = tmp_path / "out"
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    script = out / "main.py"
    fresh = script.read_text()
    script.write_text(fresh + "\n# hand work done here\n")
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    assert script.read_text().endswith("# hand work done here\n")  # the user's edit survives
    assert (out / "main.mrlift-new.py").read_text() == fresh
    # --force into a folder of the user's: their files stay as they were
    mine = tmp_path / "mine"
    mine.mkdir()
    (mine / "report.md").write_text("my notes")
    assert main(["convert", str(repo), "-o", str(mine), "--force"]) == 0
    assert (mine / "report.md").read_text() == "my notes"
    assert (mine / "report.mrlift-new.md").exists() and (mine / "main.py").exists()


def test_a_class_defined_twice_is_reported_not_silently_replaced(tmp_path):
    scan = scan_text(tmp_path, {"a/Main.java": GOOD, "b/Main.java": GOOD})
    assert len(scan.jobs) == 1
    (err,) = scan.errors
    assert err.path == "b/Main.java" and "defined again" in err.message and "a/Main.java" in err.message
