"""Custom partitioners: when Hadoop calls them, and what the script does about them.

Hadoop fact checked here on the local runner (the hadoop-client jars of the pyspark wheel): with
one reduce task the map task never calls the job's partitioner (MapTask's output collectors, both
APIs, use a fixed partition when the job has one reduce task); with two it does, so a partitioner
that throws fails the job.
"""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.helpers import job_source, scan_text, verify_one_job

WORDS = b"quay lantern\nmill quay\n\n\xc3\x84rm lantern quay\n"

SPLIT_BODY = """
      for (String w : value.toString().split(" ")) {
        if (!w.isEmpty()) context.write(new Text(w), new IntWritable(1));
      }"""

SUM = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      int s = 0;
      for (IntWritable v : vs) s += v.get();
      c.write(k, new IntWritable(s));
    }
  }
  public static class Refuses extends Partitioner<Text, IntWritable> {
    public int getPartition(Text key, IntWritable value, int n) {
      throw new IllegalStateException("no partition for " + key);
    }
  }"""


def _job(reduces: str = ""):
    return job_source(SPLIT_BODY, reducer=SUM, extra_driver="job.setPartitionerClass(Refuses.class);" + reduces)


OLD_API = """
import java.io.IOException;
import java.util.Iterator;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapred.*;

public class Main {
  public static class M extends MapReduceBase implements Mapper<LongWritable, Text, Text, IntWritable> {
    public void map(LongWritable k, Text v, OutputCollector<Text, IntWritable> out, Reporter r) throws IOException {
      for (String w : v.toString().split(" ")) {
        if (!w.isEmpty()) out.collect(new Text(w), new IntWritable(1));
      }
    }
  }
  public static class R extends MapReduceBase implements Reducer<Text, IntWritable, Text, IntWritable> {
    public void reduce(Text k, Iterator<IntWritable> vs, OutputCollector<Text, IntWritable> out, Reporter r)
        throws IOException {
      int s = 0;
      while (vs.hasNext()) s += vs.next().get();
      out.collect(k, new IntWritable(s));
    }
  }
  public static class Refuses implements Partitioner<Text, IntWritable> {
    public void configure(JobConf conf) {}
    public int getPartition(Text key, IntWritable value, int n) {
      throw new IllegalStateException("no partition for " + key);
    }
  }
  public static void main(String[] args) throws Exception {
    JobConf conf = new JobConf(Main.class);
    conf.setMapperClass(M.class);
    conf.setReducerClass(R.class);
    conf.setPartitionerClass(Refuses.class);
    conf.setOutputKeyClass(Text.class);
    conf.setOutputValueClass(IntWritable.class);
    FileInputFormat.setInputPaths(conf, new Path(args[0]));
    FileOutputFormat.setOutputPath(conf, new Path(args[1]));
    JobClient.runJob(conf);
  }
}
"""


def test_a_partitioner_with_one_reduce_task_is_a_finding_not_hand_work(tmp_path):
    scan = scan_text(tmp_path, {"Main.java": _job()})
    (job,) = scan.jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    (f,) = [f for f in job.plan.findings if f.category == "partitioner-not-called"]
    assert "Refuses is never called" in f.message


@pytest.mark.parametrize("count", ["job.setNumReduceTasks(2);", "job.setNumReduceTasks(Integer.parseInt(args[2]));",
                                   'job.getConfiguration().setInt("mapreduce.job.reduces", 3);'])
def test_a_partitioner_that_may_run_stays_hand_work(tmp_path, count):
    scan = scan_text(tmp_path, {"Main.java": _job(count)})
    (job,) = scan.jobs
    assert "partitioner" in [h.category for h in job.plan.hand_work]
    assert not [f for f in job.plan.findings if f.category == "partitioner-not-called"]


def test_old_api_partitioner_with_one_reduce_task_is_a_finding(tmp_path):
    (job,) = scan_text(tmp_path, {"Main.java": OLD_API}).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert [f for f in job.plan.findings if f.category == "partitioner-not-called"]


@pytest.mark.parity
@pytest.mark.parametrize("source", [_job(), OLD_API], ids=["new API", "old API"])
def test_hadoop_never_calls_the_partitioner_of_one_reduce_task(tmp_path, source):
    check = verify_one_job(tmp_path, source, {"words.txt": WORDS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


@pytest.mark.parity
def test_hadoop_calls_it_with_two_reduce_tasks(tmp_path):
    """The control: the same partitioner with two reduce tasks fails the original job."""
    check = verify_one_job(tmp_path, _job("job.setNumReduceTasks(2);"), {"words.txt": WORDS}, status="partial")
    assert check.verdict == "error" and "original job failed" in check.detail, check.detail
    assert "no partition for" in check.log



def _by_region(body: str) -> str:
    """A sum per region with three reduce tasks and the partitioner `body` (getPartition's)."""
    partitioner = """
  public static class ByRegion extends Partitioner<Text, IntWritable> {
    @Override
    public int getPartition(Text key, IntWritable value, int numPartitions) {%s
    }
  }""" % body
    source = job_source("""
      String[] f = value.toString().split(",");
      if (f.length > 1) context.write(new Text(f[0]), new IntWritable(Integer.parseInt(f[1].trim())));""",
                        reducer=SUM.split("  public static class Refuses")[0] + partitioner,
                        extra_driver="job.setPartitionerClass(ByRegion.class); job.setNumReduceTasks(3);")
    return source


SWITCH = """
      String region = key.toString().toLowerCase();
      System.out.println("partitioning " + region);
      switch (region) {
        case "north":
        case "east":
          return 0;
        case "south":
          return 1 % numPartitions;
        default:
          if (numPartitions == 3 && region.startsWith("w")) return 2;
          return region.length() % numPartitions;
      }"""

REGIONS = "north,4\nSouth,2\nwest,7\neast,1\nnorth,3\nmid lands,5\nwest,1\nÖstra,9\nsouth,8\nzone,2\n".encode()


def test_a_partitioner_read_as_an_expression_reproduces_the_task_of_each_key(tmp_path):
    from migrate.plan import dump_expr

    (job,) = scan_text(tmp_path, {"Main.java": _by_region(SWITCH)}).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert dump_expr(job.plan.sink.partition).startswith("checked_partition((((lower(key) == 'north') || ")


@pytest.mark.parametrize("body", ["return value.get() % numPartitions;", "return (int) (Math.random() * 3);",
                                  "calls++; return calls % numPartitions;"])
def test_a_partitioner_that_reads_the_value_or_state_is_declined(tmp_path, body):
    source = _by_region(body).replace("public int getPartition", "int calls = 0;\n    public int getPartition")
    (job,) = scan_text(tmp_path, {"Main.java": source}).jobs
    (item,) = [h for h in job.plan.hand_work if h.category == "output-layout"]
    assert "getPartition() is not read" in item.reason


@pytest.mark.parity
def test_a_switch_partitioner_agrees_with_hadoop_part_file_by_part_file(tmp_path):
    check = verify_one_job(tmp_path, _by_region(SWITCH), {"sales.csv": REGIONS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


@pytest.mark.parity
def test_a_task_number_out_of_range_fails_both_jobs(tmp_path):
    """Hadoop's map task refuses a partition outside 0..N-1 ("Illegal partition"); so does the script."""
    import subprocess
    import sys

    source = _by_region("return key.toString().length() % 5;")
    check = verify_one_job(tmp_path, source, {"sales.csv": REGIONS})
    assert check.verdict == "error" and "Illegal partition" in check.log, check.detail
    (script,) = (tmp_path / "out").glob("*.py")
    p = subprocess.run([sys.executable, str(script), str(tmp_path / "data"), str(tmp_path / "spark-out")],
                       capture_output=True, text=True, timeout=300)
    assert p.returncode != 0 and "Illegal partition" in p.stderr, p.stderr[-2000:]


@pytest.mark.parity
def test_math_abs_of_the_text_hash_agrees_with_hadoop(tmp_path):
    """`key.hashCode()` of a Text is WritableComparator.hashBytes over its UTF-8 bytes, not
    String.hashCode; the two differ on every key, so a wrong hash puts lines in other part files."""
    source = _by_region("return Math.abs(key.hashCode() % numPartitions);")
    (job,) = scan_text(tmp_path / "scan", {"Main.java": source}).jobs
    from migrate.plan import dump_expr

    assert "text_hash(key)" in dump_expr(job.plan.sink.partition)
    check = verify_one_job(tmp_path, source, {"sales.csv": REGIONS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


STATION_HOUR = Path(__file__).resolve().parent.parent / "golden" / "cases" / "custom_writable" / "station_hour"
RIDES = ("ride_id,bike,start_station,end_station,started_at,seconds\n"
         "r1,b1,Quayside,Old Mill,2024-05-01 08:15:00,600\nr2,b2,Old Mill,Quayside,2024-05-01 08:40:00,900\n"
         "r3,b3,Quayside,Lantern Sq,2024-05-01 09:05:00,1200\nr4,b4,Ærøskøbing Pier,Quayside,2024-05-01 08:00:00,300\n"
         "r5,b5,Lantern Sq,Old Mill,2024-05-01 17:30:00,2400\nr6,b6,Quayside,Old Mill,2024-05-01 08:55:00,660\n"
         "bad,b7,Quayside,Old Mill,2024-05-01 xx:00:00,60\nr8,b8,Old Mill,Lantern Sq,2024-05-02 23:59:00,3000\n")


def _station_hour(edit=lambda s: s) -> dict[str, str]:
    files = {p.name: p.read_text(encoding="utf-8") for p in STATION_HOUR.glob("*.java")}
    files["StationHourLoad.java"] = files["StationHourLoad.java"].replace(
        "job.setMapperClass(LoadMapper.class);", "job.setMapperClass(LoadMapper.class);\n        job.setNumReduceTasks(3);")
    files["StationHour.java"] = edit(files["StationHour.java"])
    return files


def test_a_custom_key_over_several_tasks_is_converted_with_its_layout_reported(tmp_path):
    from migrate.report.render import comparison_of, layout_of

    scan = scan_text(tmp_path, _station_hour())
    (job,) = scan.jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert (layout_of(job), comparison_of(job)) == ("one file", "part-files")
    assert [f for f in job.plan.findings if f.category == "output-layout" and "not reproduced" in f.message]


def test_a_custom_key_without_its_own_hash_code_is_not(tmp_path):
    """Object.hashCode is the object's identity: equal keys go to different reduce tasks."""
    import re

    def no_hash(s: str) -> str:
        return re.sub(r"@Override\s+public int hashCode\(\) \{[^}]*\}", "", s)

    files = _station_hour(no_hash)
    assert "hashCode" not in files["StationHour.java"]
    (job,) = scan_text(tmp_path, files).jobs
    assert "output-layout" in [h.category for h in job.plan.hand_work]


@pytest.mark.parity
def test_a_custom_key_over_three_tasks_agrees_with_hadoop_part_file_by_part_file(tmp_path):
    files = _station_hour()
    check = verify_one_job(tmp_path, files.pop("StationHourLoad.java"), {"rides.csv": RIDES.encode()},
                           driver="StationHourLoad", more=files)
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"
    assert check.mode == "part-files"
