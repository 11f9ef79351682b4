"""A second job the driver runs is never dropped: configured inside `if (job.waitForCompletion(true))`
it is read like any other; where it cannot be read (in a loop), the job is not called converted.
(Both forms come from public drivers in benchmarks/realworld.)"""
from __future__ import annotations

import json

from migrate.cli import main
from migrate.verify.runner import runnable
from tests.helpers import HEADER, scan_text

MAPPERS = """
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      context.write(value, new IntWritable(1));
    }
  }
  public static class Flip extends Mapper<LongWritable, Text, Text, Text> {
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      String[] kv = value.toString().split("\\t");
      context.write(new Text(kv[1]), new Text(kv[0]));
    }
  }
"""


def _driver(body: str, first_output: str = 'args[1] + "_tmp"') -> str:
    return HEADER + "public class Main {\n" + MAPPERS + """
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "count");
    job.setMapperClass(M.class);
    job.setNumReduceTasks(0);
    job.setOutputKeyClass(Text.class);
    job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(""" + first_output + """));
""" + body + "\n  }\n}\n"


SECOND = """
      Job job2 = Job.getInstance(new Configuration(), "flip");
      job2.setMapperClass(Flip.class);
      job2.setNumReduceTasks(0);
      job2.setOutputKeyClass(Text.class);
      job2.setOutputValueClass(Text.class);
      FileInputFormat.addInputPath(job2, new Path(args[1] + "_tmp"));
      FileOutputFormat.setOutputPath(job2, new Path(args[1]));
"""


def _report(tmp_path, source: str) -> list[dict]:
    scan_text(tmp_path / "repo", {"Main.java": source})
    assert main(["convert", str(tmp_path / "repo"), "-o", str(tmp_path / "out"), "--no-compile-check"]) == 0
    return json.loads((tmp_path / "out" / "report.json").read_text())["jobs"]


def test_a_job_run_after_the_first_succeeds_is_read(tmp_path):
    jobs = _report(tmp_path, _driver("    if (job.waitForCompletion(true)) {\n" + SECOND +
                                     "      System.exit(job2.waitForCompletion(true) ? 0 : 1);\n    }\n"
                                     "    System.exit(1);"))
    # the second job reads the folder the first one makes from args[1]: one script, both jobs in it
    assert [j["name"] for j in jobs] == ["count → flip"]
    assert jobs[0]["chain"] and jobs[0]["status"] == "converted"


def test_a_usage_branch_is_still_skipped(tmp_path):
    jobs = _report(tmp_path, _driver('    if (args.length != 2) {\n      System.err.println("usage: in out");\n'
                                     "      System.exit(2);\n    }\n    System.exit(job.waitForCompletion(true) ? 0 : 1);",
                                     first_output="args[1]"))
    assert len(jobs) == 1 and jobs[0]["status"] == "converted"


def test_a_job_the_reader_cannot_follow_blocks_the_claim(tmp_path):
    looped = "    job.waitForCompletion(true);\n    for (int i = 0; i < 1; i++) {\n" + SECOND + \
             "      job2.waitForCompletion(true);\n    }"
    jobs = _report(tmp_path, _driver(looped))
    # the job read, and an entry for the submission in the loop that was not
    assert [j.get("kind") for j in jobs] == [None, "not-read-driver"]
    assert "submits a job" in jobs[1]["hand_work"][0]["reason"]
    job = jobs[0]
    assert job["status"] != "converted" and runnable(job) is not None
    item = next(h for h in job["hand_work"] if h["category"] == "unread-jobs")
    assert "creates 2 jobs and 1 of them could be read" in item["reason"]
    source = _driver(looped).splitlines()  # the file as written
    assert source[item["line"] - 1].strip().startswith("Job job2 = Job.getInstance")
