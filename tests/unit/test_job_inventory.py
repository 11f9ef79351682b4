"""Every job a driver runs is in the inventory: a job built by Hadoop's aggregate framework is listed
(not converted, with why), and a driver that submits a job mrlift cannot read is an entry naming the
line, never a silent "0 jobs". Submission calls and ValueAggregatorJob's argument layout (input
args[0], output args[1]) as the Hadoop API docs give them (org.apache.hadoop.mapreduce.lib.aggregate)."""
from __future__ import annotations

from tests.helpers import HEADER, scan_text

AGGREGATE = HEADER + """
import org.apache.hadoop.mapreduce.lib.aggregate.ValueAggregatorBaseDescriptor;
import org.apache.hadoop.mapreduce.lib.aggregate.ValueAggregatorJob;

public class DockTallies {
  public static class Plugin extends ValueAggregatorBaseDescriptor {
    public ArrayList<Map.Entry<Text, Text>> generateKeyValPairs(Object key, Object val) {
      ArrayList<Map.Entry<Text, Text>> out = new ArrayList<Map.Entry<Text, Text>>();
      out.add(generateEntry(LONG_VALUE_SUM, val.toString().split(",")[0], ONE));
      return out;
    }
  }

  public static void main(String[] args) throws Exception {
    Job job = ValueAggregatorJob.createValueAggregatorJob(args, new Class[] {Plugin.class});
    job.setJarByClass(DockTallies.class);
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""


def test_a_job_built_by_the_aggregate_framework_is_listed_with_its_reason(tmp_path):
    (job,) = scan_text(tmp_path, {"DockTallies.java": AGGREGATE}).jobs
    assert job.status != "converted"
    assert any(h.category == "job-builder" for h in job.plan.hand_work)
    assert [(p.name, p.position) for p in job.plan.params] == [("input_path", 0), ("output_path", 1)]
    assert job.classes["reducer"] == "org.apache.hadoop.mapreduce.lib.aggregate.ValueAggregatorReducer"


def test_a_submitted_job_that_cannot_be_read_is_an_entry_with_its_line(tmp_path):
    source = HEADER + """
public class Nightly {
  public static void main(String[] args) throws Exception {
    Job job = JobFactory.forTonight(new Configuration(), args);
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""
    scan = scan_text(tmp_path, {"Nightly.java": source})
    assert scan.jobs == []
    (entry,) = [u for u in scan.unread if u.kind == "driver"]
    line = source.split("\n").index("    System.exit(job.waitForCompletion(true) ? 0 : 1);") + 1
    assert entry.name == "Nightly" and entry.error.line == line and "submits a job" in entry.error.message
