"""Combiners: sound when they are a partial form of the reducer's aggregate, flagged otherwise.

Hadoop facts (MapReduce tutorial, "Combiner"; Job.setCombinerClass javadoc): the combiner runs
on map output zero or more times, so a job is only deterministic when applying it any number
of times leaves the reducer's answer unchanged: sums of partial sums, max of partial maxima.
Counting values, or averaging averages, is not such a form (common practice).
"""
from __future__ import annotations

from tests.helpers import job_source, scan_text

SUM = """  public static class %s extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      %s
    }
  }"""
BODIES = {
    "sum": "int s = 0; for (IntWritable v : values) s += v.get(); context.write(key, new IntWritable(s));",
    "max": "int m = Integer.MIN_VALUE; for (IntWritable v : values) m = Math.max(m, v.get()); "
           "context.write(key, new IntWritable(m));",
    "count": "int n = 0; for (IntWritable v : values) n++; context.write(key, new IntWritable(n));",
    "avg": "int s = 0; int n = 0; for (IntWritable v : values) { s += v.get(); n++; } "
           "context.write(key, new IntWritable(s / n));",
}


def _job(tmp_path, reducer: str, combiner: str | None, combiner_class: str = "C"):
    classes = SUM % ("R", BODIES[reducer])
    if combiner and combiner_class == "C":
        classes += "\n" + SUM % ("C", BODIES[combiner])
    src = job_source("context.write(value, new IntWritable(1));", classes,
                     extra_driver=f"job.setCombinerClass({combiner_class}.class);")
    scan = scan_text(tmp_path, {"Main.java": src})
    (job,) = scan.jobs
    return job


def test_the_reducer_as_its_own_combiner_is_fine_for_a_sum(tmp_path):
    job = _job(tmp_path, "sum", None, "R")
    assert job.status == "converted"
    assert any("partial sum" in n and "nothing to convert" in n for n in job.plan.notes)


def test_a_separate_combiner_with_the_same_aggregate_is_fine(tmp_path):
    job = _job(tmp_path, "max", "max")
    assert job.status == "converted" and any("partial max" in n for n in job.plan.notes)


def test_hadoop_int_sum_reducer_as_combiner_of_a_summing_reducer(tmp_path):
    job = _job(tmp_path, "sum", None, "org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer")
    assert job.status == "converted"


def test_counting_reducer_as_its_own_combiner_is_flagged(tmp_path):
    job = _job(tmp_path, "count", None, "R")
    (item,) = [h for h in job.plan.hand_work if h.category == "combiner"]
    assert "split and spilled" in item.reason and not item.blocking  # the script computes the true count
    assert job.status == "partial"


def test_averaging_averages_is_flagged(tmp_path):
    job = _job(tmp_path, "avg", None, "R")
    assert [h.category for h in job.plan.hand_work] == ["combiner"]


def test_a_combiner_with_another_aggregate_is_flagged(tmp_path):
    job = _job(tmp_path, "sum", "max")
    (item,) = [h for h in job.plan.hand_work if h.category == "combiner"]
    assert "it computes the max" in item.reason and "the reducer computes the sum" in item.reason
