"""State a mapper keeps over its map task and writes in cleanup(): a TreeMap top-N per task.

Hadoop facts relied on (FileInputFormat and LineRecordReader source, Hadoop 3): a file becomes one
input split, so one map task, unless it is longer than 1.1 times the split size (SPLIT_SLOP); the
split size is max(minsize, min(maxsize, block size)); a task reads its split's lines in file order
and calls cleanup() once after the last. java.util.TreeMap (Java SE API docs): put() replaces the
value of an equal key; firstKey() is the smallest key. Each parity test runs the original on
Hadoop's local runner and the script on local Spark.
"""
from __future__ import annotations

import os
import subprocess
import sys

import pytest

from migrate.plan import TaskTopN
from tests.helpers import job_source, scan_text, verify_one_job

# bike,minutes: two files, so two map tasks; ties on minutes inside each file
DAY_1 = b"B1,30\nB2,12\nB3,30\nB4,7\nB5,44\nbad line\nB6,12\n"
DAY_2 = b"B2,61\nB7,5\nB1,61\nB8,9\nB3,18\n"

TASK_TOP = """
      String[] f = value.toString().split(",");
      if (f.length != 2) {
        return;
      }
      longest.put(Integer.parseInt(f[1]), f[0]);
      if (longest.size() > 3) {
        longest.remove(longest.firstKey());
      }"""
FIELDS = "private final TreeMap<Integer, String> longest = new TreeMap<>();"
CLEANUP = """
    protected void cleanup(Context context) throws IOException, InterruptedException {
      for (Map.Entry<Integer, String> e : longest.entrySet()) {
        context.write(new Text(e.getValue()), new IntWritable(e.getKey()));
      }
    }"""
COUNT = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      int tasks = 0;
      for (IntWritable v : values) {
        tasks++;
      }
      context.write(key, new IntWritable(tasks));
    }
  }"""


def _source(body: str = TASK_TOP, reducer: str = COUNT, extra_driver: str = "", cleanup: str = CLEANUP) -> str:
    return job_source(body, reducer=reducer, fields=FIELDS + cleanup, extra_driver=extra_driver)


# the put and trim only for some lines: the other lines leave the task's TreeMap as it was
GUARDED = TASK_TOP.replace("longest.put(", "if (!f[0].equals(\"B3\")) {\n      longest.put(").replace(
    "longest.firstKey());\n      }", "longest.firstKey());\n      }\n      }")


# the first line of each file (byte offset 0) skipped, as a header
NO_HEADER = "\n      if (key.get() == 0) {\n        return;\n      }" + TASK_TOP


@pytest.mark.parametrize("body", [TASK_TOP, GUARDED, NO_HEADER], ids=["every-line", "guarded", "no-header"])
def test_a_task_tree_map_is_one_top_n_per_input_file(tmp_path, body):
    (job,) = scan_text(tmp_path / "scan", {"Main.java": _source(body)}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert isinstance(job.plan.map_steps[-1], TaskTopN) and job.plan.source.split
    assert {f.category for f in job.plan.findings} >= {"per-task-state", "ties-dropped"}
    check = verify_one_job(tmp_path / "verify", _source(body), {"day1.txt": DAY_1, "day2.txt": DAY_2})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


def test_a_file_hadoop_would_split_stops_the_script(tmp_path):
    """With split.maxsize at 16 bytes Hadoop reads a 40-byte file in several map tasks, each with a
    TreeMap of its own; the script reproduces one task per file, so it stops instead."""
    setting = 'job.getConfiguration().setLong("mapreduce.input.fileinputformat.split.maxsize", 16);'
    check = verify_one_job(tmp_path, _source(extra_driver=setting), {"day1.txt": DAY_1})
    assert (check.verdict, check.detail) == ("error", "the script failed (exit 1)"), check.detail
    assert "a file Hadoop would read in several map tasks" in check.log


def test_the_split_size_is_a_script_setting(tmp_path):
    from migrate.convert import write_outputs
    from migrate.scan import scan_repo

    scan_text(tmp_path / "repo", {"Main.java": _source()})
    written = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo")
    (job,) = written.report["jobs"]
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "day1.txt").write_bytes(DAY_1)
    run = subprocess.run([sys.executable, str(tmp_path / "out" / job["script"]), str(tmp_path / "in"),
                          str(tmp_path / "result"), "-D", "dfs.blocksize=20"], capture_output=True, text=True,
                         timeout=300, env={**os.environ, "PYSPARK_PYTHON": sys.executable})
    assert run.returncode != 0 and "several map tasks" in run.stderr, run.stderr[-2000:]


@pytest.mark.parametrize("change, why", [
    (("longest.put(Integer.parseInt(f[1]), f[0]);",
      "for (String p : f) { longest.put(p.length(), p); }"), "filled inside a loop"),
    (("longest.put(Integer.parseInt(f[1]), f[0]);",
      "longest.put(Integer.parseInt(f[1]), f[0]);\n      context.write(new Text(f[0]), new IntWritable(1));"),
     "writes as well as filling the TreeMap"),
    (("if (longest.size() > 3) {", "if (longest.size() > 3 && f[0].isEmpty()) {"), "trim"),
])
def test_other_uses_of_the_task_tree_map_are_declined(tmp_path, change, why):
    (job,) = scan_text(tmp_path, {"Main.java": _source(TASK_TOP.replace(*change))}).jobs
    assert job.status != "converted"
    assert any(why in h.reason for h in job.plan.hand_work), [h.reason for h in job.plan.hand_work]


def test_a_task_tree_map_in_a_map_only_job_is_declined(tmp_path):
    src = _source(reducer="", extra_driver="job.setNumReduceTasks(0);").replace("job.setReducerClass(R.class);", "")
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    items = [h for h in job.plan.hand_work if h.category == "task-state"]
    assert items and "map-only" in items[0].reason, job.plan.hand_work


def test_a_chain_passes_lines_to_a_task_tree_map_only_from_one_ordered_file(tmp_path):
    """Job 2 of the sample reads job 1's folder: one part file when job 1 has one reduce task, which
    is one map task of job 2. With two reduce tasks the folder holds two files (two tasks of job 2),
    so the jobs stay one script each, job 2 reading the folder's files one task each."""
    from pathlib import Path

    sample = Path(__file__).resolve().parents[2] / "samples/bikeshare/src/net/brindleharbour/notes/TopNoteWords.java"
    text = sample.read_text(encoding="utf-8")
    (chained,) = scan_text(tmp_path / "one", {"TopNoteWords.java": text}).jobs
    assert chained.status == "converted" and len(chained.plan.upstream) == 1
    two = text.replace("counts.setJarByClass(TopNoteWords.class);",
                       "counts.setJarByClass(TopNoteWords.class);\n        counts.setNumReduceTasks(2);")
    jobs = scan_text(tmp_path / "two", {"TopNoteWords.java": two}).jobs
    assert len(jobs) == 2
    reasons = [h.reason for j in jobs for h in j.plan.hand_work if h.category == "chained-jobs"]
    assert reasons and all("keeps state per map task" in r for r in reasons), reasons
    assert jobs[1].plan.source.split and not jobs[1].plan.source.upstream


def test_a_static_tree_map_is_declined(tmp_path):
    """A static field outlives the task: the local runner runs every map task in one JVM."""
    src = job_source(TASK_TOP, reducer=COUNT, fields="static " + FIELDS.replace("private final ", "") + CLEANUP)
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    assert job.status != "converted"
    assert any("static TreeMap" in h.reason for h in job.plan.hand_work), [h.reason for h in job.plan.hand_work]
