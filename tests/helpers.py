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
