"""In-mapper combining into records: a `Map<Text, DockFlow>` made present and added to through the
record's methods in map(), written whole in cleanup(), is a record written per update; the reducer
must sum every field (as a combiner's partial sums are judged), else the job stays hand work. The
form comes from a public job in benchmarks/realworld (a Map of Writable records in the mapper)."""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.helpers import HEADER, scan_text, verify_one_job

RECORD = (Path(__file__).parents[1] / "golden" / "cases" / "combining" / "record_methods" / "DockFlow.java") \
    .read_text(encoding="utf-8")

MAPPER = """
  public static class M extends Mapper<LongWritable, Text, Text, DockFlow> {
    private Map<Text, DockFlow> byDock;
    protected void setup(Context c) { byDock = new HashMap<Text, DockFlow>(); }
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split(",");
      Text dock = new Text(f[0]);
      if (!byDock.containsKey(dock)) {
        byDock.put(dock, new DockFlow());
      }
      if (f[1].equals("in")) {
        byDock.get(dock).addDocked(Long.parseLong(f[2]), 1);
      } else if (f[1].equals("out")) {
        byDock.get(dock).addUndocked(Long.parseLong(f[2]), 1);
      }
    }
    protected void cleanup(Context c) throws IOException, InterruptedException {
      for (Map.Entry<Text, DockFlow> e : byDock.entrySet()) {
        c.write(e.getKey(), e.getValue());
      }
    }
  }
"""

SUMS = """
  public static class R extends Reducer<Text, DockFlow, Text, Text> {
    protected void reduce(Text k, Iterable<DockFlow> vs, Context c) throws IOException, InterruptedException {
      DockFlow all = new DockFlow();
      for (DockFlow v : vs) all.add(v);
      c.write(k, new Text(all.getDocked() + "/" + all.getDockings() + " " + all.getUndocked() + "/" + all.getUndockings()));
    }
  }
"""

COUNTS = """
  public static class R extends Reducer<Text, DockFlow, Text, Text> {
    protected void reduce(Text k, Iterable<DockFlow> vs, Context c) throws IOException, InterruptedException {
      int n = 0;
      for (DockFlow v : vs) n++;
      c.write(k, new Text("records " + n));
    }
  }
"""


def _job(mapper: str, reducer: str, reduces: int = 1) -> str:
    return HEADER + "public class Main {\n" + mapper + reducer + f"""
  public static void main(String[] args) throws Exception {{
    Job job = Job.getInstance(new Configuration(), "dock flow");
    job.setMapperClass(M.class); job.setReducerClass(R.class); job.setNumReduceTasks({reduces});
    job.setMapOutputKeyClass(Text.class); job.setMapOutputValueClass(DockFlow.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(Text.class);
    FileInputFormat.addInputPath(job, new Path(args[0])); FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }}
}}
"""


def test_records_combined_in_the_mapper_then_summed_match_hadoop(tmp_path):
    data = {"a.csv": b"quay,in,3\nquay,out,2\nmill,out,1\nquay,in,4\nferry,lost,1\n",
            "b.csv": b"mill,out,5\nmill,in,2\nquay,out,1\nbell,out,7\n"}
    check = verify_one_job(tmp_path, _job(MAPPER, SUMS), data, more={"DockFlow.java": RECORD})
    assert check.verdict == "agrees", check.detail


def _status(tmp_path, source: str) -> tuple[str, list[str]]:
    (job,) = scan_text(tmp_path, {"Main.java": source, "DockFlow.java": RECORD}).jobs
    return job.status, [h.reason for h in job.plan.hand_work]


def test_a_reducer_that_does_not_sum_every_field_keeps_it_hand_work(tmp_path):
    status, reasons = _status(tmp_path, _job(MAPPER, COUNTS))
    assert status != "converted" and any("does not just sum" in r for r in reasons)


@pytest.mark.parametrize("old, new", [
    # a Text key the task sets again: the Map's key objects would change under it
    ("Text dock = new Text(f[0]);", "dock.set(f[0]);"),
    ("Text dock = new Text(f[0]);", "Text dock = new Text(f[0]);\n      if (f.length > 3) dock.set(f[3]);"),
    # the Map read for something else
    ('      if (f[1].equals("in")) {', '      if (byDock.size() > 3) return;\n      if (f[1].equals("in")) {'),
    # a flush that writes a copy made some other way
    ("c.write(e.getKey(), e.getValue());", "c.write(e.getKey(), new DockFlow(e.getValue().getDocked(), 0, 0, 0));"),
])
def test_other_uses_of_the_map_are_left_as_written(tmp_path, old, new):
    assert old in MAPPER
    mapper = MAPPER.replace(old, new).replace("private Map", "private final Text dock = new Text();\n    private Map")
    scan = scan_text(tmp_path, {"Main.java": _job(mapper, SUMS), "DockFlow.java": RECORD})
    (mapper,) = [c for c in scan.index if c.name == "M"]
    assert mapper.combined_records == [] and scan.jobs[0].status != "converted"


def test_map_only_combining_into_records_is_per_task_hand_work(tmp_path):
    status, reasons = _status(tmp_path, _job(MAPPER, SUMS, reduces=0))
    assert status != "converted" and any("map-only" in r for r in reasons)


def test_an_update_that_may_come_before_the_key_is_present_is_left_as_written(tmp_path):
    """Java's get() gives null there and the task fails; a write per update would give output."""
    mapper = MAPPER.replace("      if (!byDock.containsKey(dock)) {\n        byDock.put(dock, new DockFlow());\n      }\n", "")
    mapper = mapper.replace("      } else if (f[1].equals(\"out\")) {",
                            "        byDock.putIfAbsent(dock, new DockFlow());\n      } else if (f[1].equals(\"out\")) {")
    assert mapper.count("putIfAbsent") == 1 and "containsKey" not in mapper
    scan = scan_text(tmp_path, {"Main.java": _job(mapper, SUMS), "DockFlow.java": RECORD})
    (m,) = [c for c in scan.index if c.name == "M"]
    assert m.combined_records == [] and scan.jobs[0].status != "converted"
