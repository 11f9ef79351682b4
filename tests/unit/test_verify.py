"""`mrlift verify`: the comparison rules on crafted output folders, and whole runs of the real
Hadoop local runner and the real Spark (the samples agree; a broken script differs; Java that does
not compile, a job past its time limit and a job without data are verdicts, and the batch goes on).
"""
from __future__ import annotations

import json
import shutil
from pathlib import Path

import pytest

from migrate.verify.compare import compare_folders
from tests.conftest import SAMPLES


def _folder(path: Path, *parts: bytes) -> Path:
    path.mkdir(parents=True)
    for i, data in enumerate(parts):
        (path / f"part-r-{i:05d}").write_bytes(data)
    (path / "_SUCCESS").write_bytes(b"")
    return path


# ---------------------------------------------------------------- comparison rules (no JVM needed)

def test_bytes_mode_sees_order_and_lines_mode_does_not(tmp_path):
    a = _folder(tmp_path / "a", b"k1\t1\nk2\t2\n")
    b = _folder(tmp_path / "b", b"k2\t2\nk1\t1\n")
    v = compare_folders(a, b, "bytes")
    assert not v.agrees and (v.missing, v.extra) == (0, 0) and v.differences[0] == (1, "k1\t1", "k2\t2")
    assert compare_folders(a, b, "lines").agrees


def test_duplicates_count_as_missing_and_extra_lines(tmp_path):
    a = _folder(tmp_path / "a", b"k\t1\nk\t1\n")
    b = _folder(tmp_path / "b", b"k\t1\nk\t2\n")
    v = compare_folders(a, b, "within-key")
    assert not v.agrees and (v.missing, v.extra) == (1, 1)


def test_within_key_mode_keeps_the_key_order(tmp_path):
    a = _folder(tmp_path / "a", b"1\tx\n1\ty\n2\tz\n")
    assert compare_folders(a, _folder(tmp_path / "b", b"1\ty\n1\tx\n2\tz\n"), "within-key").agrees
    assert not compare_folders(a, _folder(tmp_path / "c", b"2\tz\n1\tx\n1\ty\n"), "within-key").agrees


def test_tolerance_is_off_by_default_and_reported_when_needed(tmp_path):
    a = _folder(tmp_path / "a", b"s\t0.30000000000000004\n")
    b = _folder(tmp_path / "b", b"s\t0.3\n")
    assert not compare_folders(a, b, "bytes").agrees
    v = compare_folders(a, b, "bytes", tolerance=1e-9)
    assert v.agrees and v.tolerance_used
    assert not compare_folders(a, _folder(tmp_path / "c", b"s\t0.31\n"), "bytes", tolerance=1e-9).agrees
    assert not compare_folders(a, _folder(tmp_path / "d", b"t\t0.3\n"), "bytes", tolerance=1e-9).agrees


def test_part_files_are_read_in_order_and_a_missing_last_newline_is_the_same_lines(tmp_path):
    a = _folder(tmp_path / "a", b"a\t1\n", b"b\t2\n")
    assert compare_folders(a, _folder(tmp_path / "b", b"a\t1\nb\t2"), "bytes").agrees


def test_part_files_mode_wants_the_lines_and_each_part_files_order(tmp_path):
    """Two reduce tasks wrote b,d and a,c,e (each sorted); one file sorted by key interleaves them."""
    a = _folder(tmp_path / "a", b"b\t1\nd\t2\n", b"a\t3\nc\t4\ne\t5\n")
    merged = _folder(tmp_path / "m", b"a\t3\nb\t1\nc\t4\nd\t2\ne\t5\n")
    assert compare_folders(a, merged, "part-files").agrees and not compare_folders(a, merged, "bytes").agrees
    swapped = compare_folders(a, _folder(tmp_path / "s", b"a\t3\nd\t2\nc\t4\nb\t1\ne\t5\n"), "part-files")
    assert not swapped.agrees and swapped.differences[0][1] == "part-r-00000 line 2: d\t2"
    assert not compare_folders(a, _folder(tmp_path / "l", b"a\t3\nb\t1\nc\t4\nd\t2\n"), "part-files").agrees
    assert not compare_folders(a, _folder(tmp_path / "x", b"a\t3\nb\t1\nc\t4\nd\t2\ne\t5\ne\t5\n"),
                               "part-files").agrees


def test_empty_outputs(tmp_path):
    empty = _folder(tmp_path / "a", b"")
    v = compare_folders(empty, _folder(tmp_path / "b"), "bytes")
    assert v.agrees and v.original_lines == 0
    v = compare_folders(empty, _folder(tmp_path / "c", b"x\t1\n"), "bytes")
    assert not v.agrees and v.extra == 1 and v.differences[0] == (1, "(no line)", "x\t1")


def test_inputs_are_copied_whole_or_sampled_and_the_data_is_never_touched(tmp_path):
    from migrate.verify.runner import copy_inputs

    data = tmp_path / "data"
    (data / "sub").mkdir(parents=True)
    (data / "a.csv").write_bytes(b"1\n2\n3\n")
    (data / "sub" / "b.csv").write_bytes(b"x\ny")
    side = tmp_path / "side.txt"
    side.write_bytes(b"s1\ns2\ns3\n")
    args = copy_inputs((str(data), str(side), "@out"), (0, 1), tmp_path / "work", 2)
    assert args[2] == "@out"
    assert (Path(args[0]) / "a.csv").read_bytes() == b"1\n2\n" and (Path(args[0]) / "sub" / "b.csv").read_bytes() == b"x\ny"
    assert Path(args[1]).read_bytes() == b"s1\ns2\n"
    whole = copy_inputs((str(data), str(side), "@out"), (0, 1), tmp_path / "whole")
    assert (Path(whole[0]) / "a.csv").read_bytes() == b"1\n2\n3\n" and Path(whole[1]).read_bytes() == b"s1\ns2\ns3\n"
    assert Path(whole[0]) != data and tmp_path / "whole" in Path(whole[0]).parents  # a copy, never the data
    assert (data / "a.csv").read_bytes() == b"1\n2\n3\n"


def test_runs_file_paths_options_and_inputs_outside_the_data_folder(tmp_path):
    from migrate.verify.runner import VerifyError, load_runs

    here = tmp_path / "samples"
    (here / "data").mkdir(parents=True)
    (here / "data" / "a.txt").write_text("x\n")
    runs = here / "runs.json"
    runs.write_text(json.dumps({"runs": [{"driver": "p.T", "args": ["-D", "top.n=3", "-Dmode=fast", "data", "5",
                                                                     "@out"]}]}))
    (r,) = load_runs(runs).values()
    # paths are relative to the runs file's folder; Tool options and plain words are passed as they are
    assert r.args == ("-D", "top.n=3", "-Dmode=fast", str(here / "data"), "5", "@out") and r.inputs == (3,)
    (tmp_path / "elsewhere.txt").write_text("secret\n")
    runs.write_text(json.dumps({"runs": [{"driver": "p.T", "args": ["../elsewhere.txt", "@out"]}]}))
    with pytest.raises(VerifyError, match="outside the data folder"):
        load_runs(runs)


def test_a_data_folder_per_job_gives_the_arguments_it_can(tmp_path):
    from migrate.verify.runner import runs_from_folder

    report = {"jobs": [
        {"script": "one.py", "driver": "p.One", "arguments": [{"name": "input_path", "position": 0},
                                                              {"name": "output_path", "position": 1}]},
        {"script": "chain.py", "driver": "p.Chain", "arguments": [
            {"name": "input_path", "position": 0}, {"name": "job_1_output", "position": 1},
            {"name": "output_path", "position": 2}]},
        {"script": "side.py", "driver": "p.Side", "arguments": [
            {"name": "input_path", "position": 0}, {"name": "zones_file", "position": 1},
            {"name": "output_path", "position": 2}]},
        {"script": "absent.py", "driver": "p.Absent", "arguments": []}]}
    for name in ("one", "chain", "side"):
        (tmp_path / name).mkdir()
    runs, why = runs_from_folder(report, tmp_path)
    assert runs["p.One"].args == (str(tmp_path / "one"), "@out")
    assert runs["p.Chain"].args == (str(tmp_path / "chain"), "@tmp1", "@out")
    assert "p.Side" not in runs and "zones_file" in why["p.Side"] and "p.Absent" not in why


# ---------------------------------------------------------------- whole runs: Hadoop local runner and Spark

@pytest.fixture()
def converted_copy(converted_samples, tmp_path):
    """A copy of the converted samples, so that recording verdicts does not touch the shared folder."""
    out_dir, _ = converted_samples
    copy = tmp_path / "converted"
    shutil.copytree(out_dir, copy)
    return copy


def test_sample_jobs_agree_and_the_verdicts_go_into_the_report(converted_copy, capsys):
    from migrate.cli import main

    assert main(["verify", str(converted_copy), "--runs", str(SAMPLES / "runs.json"), "--job", "no_such_job"]) == 2
    rc = main(["verify", str(converted_copy), "--runs", str(SAMPLES / "runs.json"),
               "--job", "rides_per_station", "--job", "rides_by_district", "--job", "station_ride_ranking",
               "--job", "mean_duration_by_member_type", "--job", "dock_sampler"])
    assert rc == 0, capsys.readouterr().out
    report = json.loads((converted_copy / "report.json").read_text())
    checked = {j["script"]: j["verification"] for j in report["jobs"] if j["verification"]}
    assert {s: v["verdict"] for s, v in checked.items()} == {
        "rides_per_station.py": "agrees", "rides_by_district.py": "agrees", "station_ride_ranking.py": "agrees",
        "mean_duration_by_member_type.py": "agrees",  # advisory hand work: compared on its keys only
        "dock_sampler.py": "skipped"}  # random sampling: the script refuses to run, nothing to compare
    assert checked["mean_duration_by_member_type.py"]["mode"] == "keys"
    assert checked["rides_by_district.py"]["mode"] == "within-key"  # a join's lines per key: no defined order
    assert checked["station_ride_ranking.py"]["intermediates"][0]["agrees"]  # the chained folder too
    md = (converted_copy / "report.md").read_text()
    assert "| rides per station |" in md and "agrees (" in md and "unverified" in md  # the others
    assert report["summary"]["verified"] == 4
    page = (converted_copy / "review.html").read_text()  # the review carries the verdicts too
    assert "4 checked against Hadoop with the same output" in page and "<td>agrees (" in page
    own = (converted_copy / "review" / "rides_per_station.html").read_text()
    assert "checked against Hadoop: agrees (" in own
    assert "agrees" in (converted_copy / "effort.csv").read_text()


def test_a_broken_script_differs_and_shows_the_first_rows(converted_copy, capsys):
    from migrate.cli import main

    script = converted_copy / "rides_per_station.py"
    text = script.read_text()
    assert "F.sum(" in text
    script.write_text(text.replace("F.sum(", "F.max(", 1))  # a deliberate bug: max instead of sum
    rc = main(["verify", str(converted_copy), "--runs", str(SAMPLES / "runs.json"), "--job", "rides_per_station"])
    out = capsys.readouterr().out
    assert rc == 1 and "differs" in out and "first differences" in out
    report = json.loads((converted_copy / "report.json").read_text())
    (v,) = [j["verification"] for j in report["jobs"] if j["script"] == "rides_per_station.py"]
    assert v["verdict"] == "differs" and v["comparison"]["differences"] and v["comparison"]["missing"] > 0


JOB = """package p;
import java.io.IOException;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

public class NAME {
    public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
        protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
            c.write(new Text(v.toString()), new IntWritable(1));
        }
    }
    public static void main(String[] args) throws Exception {
        EXTRA
        Job job = Job.getInstance(new Configuration(), "NAME");
        job.setJarByClass(NAME.class);
        job.setMapperClass(M.class);
        job.setNumReduceTasks(0);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
"""


def test_compile_errors_time_limits_and_missing_data_are_verdicts(tmp_path, monkeypatch):
    from migrate.convert import write_outputs
    from migrate.scan import scan_repo
    from migrate.verify.runner import load_runs, verify

    repo = tmp_path / "repo" / "p"
    repo.mkdir(parents=True)
    (repo / "Broken.java").write_text(JOB.replace("NAME", "Broken").replace("EXTRA", 'int x = "not a number";'))
    (repo / "Slow.java").write_text(JOB.replace("NAME", "Slow").replace("EXTRA", "Thread.sleep(600000);"))
    (repo / "Fine.java").write_text(JOB.replace("NAME", "Fine").replace("EXTRA", ""))
    (repo / "NoData.java").write_text(JOB.replace("NAME", "NoData").replace("EXTRA", ""))
    # a job whose driver, through a helper the converter does not follow, deletes its input
    (repo / "Vandal.java").write_text(JOB.replace("NAME", "Vandal").replace("EXTRA", "Tidy.up(args[0]);"))
    (repo / "Tidy.java").write_text("package p;\npublic class Tidy {\n  public static void up(String dir) {\n"
                                    "    new java.io.File(dir, \"lines.txt\").delete();\n  }\n}\n")
    scan = scan_repo(tmp_path / "repo")
    out = tmp_path / "out"
    written = write_outputs(scan, out, "repo", with_tests=True)
    assert {j["status"] for j in written.report["jobs"]} == {"converted"}
    data = tmp_path / "data"
    data.mkdir()
    (data / "lines.txt").write_text("a\nb\n")
    runs_file = tmp_path / "runs.json"
    runs_file.write_text(json.dumps({"runs": [{"driver": f"p.{n}", "args": ["data", "@out"]}
                                              for n in ("Broken", "Slow", "Fine", "Vandal")]}))
    monkeypatch.chdir(tmp_path)  # the output folder named relative to the current folder, as the README does
    checks, _ = verify(Path("out"), load_runs(runs_file), timeout=60)  # long enough for Spark on a busy machine
    by = {c.driver: c for c in checks}
    assert by["p.Broken"].verdict == "error" and "does not compile" in by["p.Broken"].detail
    assert "incompatible types" in by["p.Broken"].log
    assert by["p.Slow"].verdict == "error" and "time limit" in by["p.Slow"].detail
    assert by["p.Fine"].verdict == "agrees", by["p.Fine"]
    assert by["p.NoData"].verdict == "skipped" and "no sample data" in by["p.NoData"].detail
    # it ran on its own copy of the input: the data is intact, the deletion is reported, no "agrees"
    assert by["p.Vandal"].verdict == "error" and "outside its output folder" in by["p.Vandal"].detail
    assert any(w.startswith("removed: ") and w.endswith("lines.txt") for w in by["p.Vandal"].writes_outside)
    assert by["p.Fine"].arguments == ["data", "@out"] and by["p.Fine"].writes_outside == []
    from migrate.convert import record_checks

    record_checks(out, json.loads((out / "report.json").read_text()), checks)
    md = (out / "report.md").read_text()  # the tool's output is kept with the verdict
    assert "checked against Hadoop: error**: the original Java does not compile" in md and "incompatible types" in md
    (broken,) = [j for j in json.loads((out / "report.json").read_text())["jobs"] if j["driver"] == "p.Broken"]
    assert "incompatible types" in broken["verification"]["log"]
    assert sorted(p.name for p in data.iterdir()) == ["lines.txt"]  # nothing written into the data folder

    # convert --with-tests: a pytest file per job that runs the same check, for the team's own CI
    skeleton = json.loads((out / "tests" / "runs.json").read_text())
    assert skeleton["runs"] == [] and skeleton["data"] == "." and {"driver": "p.Fine", "args": ["<input_path: a sample file or folder>", "@out"]} \
        in skeleton["todo"]
    (out / "tests" / "runs.json").write_text(json.dumps({"data": "../../data", "runs": [{"driver": "p.Fine", "args": ["../../data", "@out"]}]}))
    import subprocess
    import sys

    ran = subprocess.run([sys.executable, "-m", "pytest", "-q", "-p", "no:cacheprovider", str(out / "tests")],
                         capture_output=True, text=True, cwd=tmp_path, timeout=600)
    assert ran.returncode == 0 and "1 passed, 4 skipped" in ran.stdout, ran.stdout + ran.stderr


def test_the_hadoop_classpath_comes_from_the_user_then_hadoop_home_then_the_wheel(tmp_path):
    from migrate.verify.classpath import find_classpath, repository_jars

    assert find_classpath("/opt/a.jar:/opt/b/*").entries == ("/opt/a.jar", "/opt/b/*")
    home = tmp_path / "hadoop-3.4.1"  # the layout of Hadoop's binary tarball
    for d in ("common/lib", "hdfs", "mapreduce", "yarn/lib"):
        (home / "share" / "hadoop" / d).mkdir(parents=True)
    cp = find_classpath(None, env={"HADOOP_HOME": str(home)})
    share = home / "share" / "hadoop"
    assert cp.entries == tuple(f"{share}/{d}/*" for d in ("common", "hdfs", "mapreduce", "yarn")) + \
        (f"{share}/common/lib/*", f"{share}/yarn/lib/*")
    assert cp.origin.startswith("HADOOP_HOME")
    wheel = find_classpath(None, env={"PATH": ""})
    assert "pyspark" in wheel.origin and wheel.entries[0].endswith("jars/*")
    (tmp_path / "lib").mkdir()
    (tmp_path / "lib" / "legacy-utils.jar").write_bytes(b"")
    assert repository_jars(tmp_path) == (str(tmp_path / "lib" / "legacy-utils.jar"),)


def test_keys_mode_compares_each_key_once(tmp_path):
    """An identity reducer after a combiner: how many lines a key has depended on how often the combiner
    ran; the keys, in order, are what the original defined."""
    original, script = tmp_path / "original", tmp_path / "script"
    for folder, text in ((original, "bell\t2\nquay\t3\n"), (script, "bell\t1\nbell\t1\nquay\t1\nquay\t2\n")):
        folder.mkdir()
        (folder / "part-r-00000").write_text(text)
    assert compare_folders(original, script, "keys").agrees
    (script / "part-r-00000").write_text("bell\t1\nmill\t1\nquay\t3\n")
    assert not compare_folders(original, script, "keys").agrees
