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


OTHER = {
    "etl/daily.hql": "-- nightly facts\nCREATE EXTERNAL TABLE rides (id STRING) ROW FORMAT DELIMITED\n"
                     "LOCATION '/data/rides';\nINSERT OVERWRITE TABLE daily SELECT id FROM rides;\n",
    "etl/report.sql": "SELECT 1;\n",  # plain SQL: not Hive's by anything it says
    "etl/clean.pig": "r = LOAD '/data' USING PigStorage(',');\nSTORE r INTO '/out';\n",
    "bin/stream.sh": "hadoop jar hadoop-streaming-3.3.6.jar -input in -output out -mapper m.py -reducer 'r.py'\n",
    "wf/workflow.xml": "<workflow-app name='w'><action name='a'/><action name='b'/></workflow-app>\n",
}


def test_other_engines_job_sources_are_listed_not_converted(tmp_path):
    from migrate.convert import write_outputs
    from migrate.scan import scan_repo

    scan_text(tmp_path / "repo", {**OTHER, "DockTallies.java": AGGREGATE})
    report = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo").report
    listed = {j["name"]: j for j in report["jobs"] if j.get("kind", "").startswith("other-")}
    assert sorted(listed) == ["bin/stream.sh", "etl/clean.pig", "etl/daily.hql", "wf/workflow.xml"]
    assert listed["etl/daily.hql"]["hand_work"][0]["reason"].endswith("a Hive script of 2 statements, run by Hive: not "
                                                                      "converted by this version")
    assert "mapper m.py, reducer r.py" in listed["bin/stream.sh"]["hand_work"][0]["reason"]
    assert "2 actions" in listed["wf/workflow.xml"]["hand_work"][0]["reason"]
    assert all(j["status"] == "not_converted" and j["effort_hours"] > 0 for j in listed.values())
    assert {j["hand_work"][0]["profile"] for j in listed.values()} == {"P1", "P2"}


def test_a_second_submission_mrlift_cannot_read_is_an_entry_beside_the_job_it_read(tmp_path):
    """One job read, another submitted by a helper the reader does not follow: both are in the report."""
    source = HEADER + """
public class Twice {
  static boolean again(Configuration conf) throws Exception {
    return JobFactory.forTonight(conf).waitForCompletion(true);
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "first");
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    job.waitForCompletion(true);
    System.exit(again(new Configuration()) ? 0 : 1);
  }
}
"""
    scan = scan_text(tmp_path, {"Twice.java": source})
    assert [j.spec.name for j in scan.jobs] == ["first"]
    (entry,) = [u for u in scan.unread if u.kind == "driver"]
    line = source.split("\n").index("    return JobFactory.forTonight(conf).waitForCompletion(true);") + 1
    assert entry.error.line == line and "it read 1 job: first" in entry.error.message
