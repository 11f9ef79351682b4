"""Small helpers for tests: scan Java text written to a temporary folder."""
from __future__ import annotations

from pathlib import Path

from migrate.scan import RepoScan, scan_repo

HEADER = """
import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
"""


# main() of a job whose mapper class is M and whose reducer is Hadoop's IntSumReducer (in-mapper combining tests)
SUM_WORDS_MAIN = """  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "words");
    job.setMapperClass(M.class);
    job.setReducerClass(org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0])); FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
"""


def scan_text(tmp_path: Path, files: dict[str, str | bytes]) -> RepoScan:
    for name, text in files.items():
        p = tmp_path / name
        p.parent.mkdir(parents=True, exist_ok=True)
        if isinstance(text, bytes):
            p.write_bytes(text)
        else:
            p.write_text(text, encoding="utf-8")
    return scan_repo(tmp_path)


def job_source(mapper_body: str, reducer: str = "", extra_driver: str = "", map_out=("Text", "IntWritable"),
               out=("Text", "IntWritable"), reducer_class: str | None = "R", fields: str = "") -> str:
    """A one-file job: mapper M with the given map() body, optional reducer R, driver Main."""
    k, v = map_out
    red = f"job.setReducerClass({reducer_class}.class);" if reducer_class else ""
    return HEADER + f"""
public class Main {{
  public static class M extends Mapper<LongWritable, Text, {k}, {v}> {{
    {fields}
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {{
{mapper_body}
    }}
  }}
{reducer}
  public static void main(String[] args) throws Exception {{
    Job job = Job.getInstance(new Configuration(), "test job");
    job.setMapperClass(M.class);
    {red}
    job.setMapOutputKeyClass({k}.class);
    job.setMapOutputValueClass({v}.class);
    job.setOutputKeyClass({out[0]}.class);
    job.setOutputValueClass({out[1]}.class);
    {extra_driver}
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }}
}}
"""


def verify_one_job(tmp_path: Path, source: str, data: dict[str, bytes], driver: str = "Main",
                   more: dict[str, str] | None = None, status: str = "converted", args: list[str] | None = None):
    """Convert a one-job repository (checking its status), then `mrlift verify` it: the original on
    Hadoop's local runner and the script on local Spark over `data` (file names may hold a folder),
    with the driver's arguments `args` (default: the data folder, then the output). Returns verify's check."""
    import json

    from migrate.convert import write_outputs
    from migrate.verify.runner import load_runs, verify

    scan_text(tmp_path / "repo", {f"{driver}.java": source, **(more or {})})
    written = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo")
    (job,) = written.report["jobs"]
    assert job["status"] == status, job["hand_work"]
    (tmp_path / "data").mkdir()
    for name, content in data.items():
        (tmp_path / "data" / name).parent.mkdir(parents=True, exist_ok=True)
        (tmp_path / "data" / name).write_bytes(content)
    run = {"driver": job["driver"], "args": args or ["data", "@out"]}
    (tmp_path / "runs.json").write_text(json.dumps({"runs": [run]}))
    (check,), _ = verify(tmp_path / "out", load_runs(tmp_path / "runs.json"), timeout=180)
    return check
