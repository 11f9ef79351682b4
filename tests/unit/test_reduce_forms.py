"""Reducers written in other authors' forms, against the real thing: each job is converted, then
`mrlift verify` runs the original on Hadoop's local runner and the script on local Spark over the
same input; the outputs must agree."""
from __future__ import annotations

import pytest

from tests.helpers import job_source, scan_text, verify_one_job

# dock,date,rides: a key made of two fields, which reducers split again
DOCKS = ("Quay North 2024-05-01,4\nQuay North 2024-05-01,3\nOld Mill 2024-05-02,7\nÄrm 2024-05-01,1\n"
         "Old Mill 2024-05-02,2\nbad\nLantern 2024-05-03,x\nLantern 2024-05-03,5\n").encode()

MAP_DOCK_DAY = """
      String[] f = value.toString().split(",");
      if (f.length != 2) return;
      int rides;
      try {
        rides = Integer.parseInt(f[1]);
      } catch (NumberFormatException e) {
        context.getCounter("quality", "bad rides").increment(1);
        return;
      }
      context.write(new Text(f[0]), new IntWritable(rides));"""

KEY_LOCALS = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      String[] parts = key.toString().split(" ");
      String day = parts[parts.length - 1];
      int total = 0;
      for (IntWritable v : values) {
        total += v.get();
      }
      context.write(new Text(day), new Text(parts[0] + " " + total));
    }
  }"""


def _source(reducer: str) -> str:
    return job_source(MAP_DOCK_DAY, reducer=reducer, out=("Text", "Text"))


def test_locals_of_the_key_before_the_loop_are_values_of_the_group(tmp_path):
    (job,) = scan_text(tmp_path, {"Main.java": _source(KEY_LOCALS)}).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]


def test_a_local_of_the_key_that_the_loop_changes_is_still_declined(tmp_path):
    changed = KEY_LOCALS.replace("total += v.get();", "total += v.get();\n        day = day + \"!\";")
    (job,) = scan_text(tmp_path, {"Main.java": _source(changed)}).jobs
    assert job.status != "converted"


@pytest.mark.parity
def test_locals_of_the_key_agree_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, _source(KEY_LOCALS), {"rides.txt": DOCKS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"
