"""Combiners: sound when the reducer gives the same answer on their partial results (lift.combiners).

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
    "having": "int s = 0; for (IntWritable v : values) s += v.get(); if (s >= 60) context.write(key, new IntWritable(s));",
    "keyed": "int s = 0; for (IntWritable v : values) s += v.get(); "
             "if (key.toString().startsWith(\"x\")) context.write(key, new IntWritable(s));",
    "sum3": "int s = 3; for (IntWritable v : values) s += v.get(); context.write(key, new IntWritable(s));",
    "each": "for (IntWritable v : values) context.write(key, v);",
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
    assert "the reducer's `s` is the sum of `value`, but the combiner writes the max of `value`" in item.reason


def test_a_test_of_the_partial_result_in_the_combiner_loses_keys(tmp_path):
    """sum >= 60 as its own combiner: per-task sums 30 and 40 both fail the test, the total 70 passes it."""
    job = _job(tmp_path, "having", None, "R")
    (item,) = [h for h in job.plan.hand_work if h.category == "combiner"]
    assert "only when `(s >= 60)` holds of its partial result" in item.reason


def test_a_test_of_the_total_in_the_reducer_alone_is_fine(tmp_path):
    job = _job(tmp_path, "having", "sum")
    assert job.status == "converted", job.plan.hand_work


def test_a_test_of_the_key_shared_by_combiner_and_reducer_is_fine(tmp_path):
    """Keys the combiner drops are keys the reducer would not write either."""
    assert _job(tmp_path / "a", "keyed", None, "R").status == "converted"
    (item,) = [h for h in _job(tmp_path / "b", "sum", "keyed").plan.hand_work if h.category == "combiner"]
    assert "a test the reducer's writes do not share" in item.reason


def test_an_initial_value_and_writes_of_each_value_are_flagged(tmp_path):
    (item,) = [h for h in _job(tmp_path / "a", "sum3", None, "R").plan.hand_work if h.category == "combiner"]
    assert "starts its sum `s` at 3" in item.reason
    (item,) = [h for h in _job(tmp_path / "b", "each", "sum").plan.hand_work if h.category == "combiner"]
    assert "writes each value it receives" in item.reason


def test_an_average_of_averages_names_what_the_combiner_writes(tmp_path):
    (item,) = [h for h in _job(tmp_path, "avg", None, "R").plan.hand_work if h.category == "combiner"]
    assert "the combiner writes `(s / n)`, which is not a partial sum" in item.reason


def test_sum_and_count_carried_in_a_writable_combine_field_by_field(tmp_path):
    """A combiner writing new SumCount(sum of sums, sum of counts) feeds a reducer that sums each field:
    sum of partial sums per field (the (sum, count) pair of the MapReduce tutorial's averages,
    common practice)."""
    from tests.unit.combiner_pair import job_files

    scan = scan_text(tmp_path, job_files())
    (job,) = scan.jobs
    assert job.status == "converted", job.plan.hand_work
    assert any("combiner C writes a partial sum" in n for n in job.plan.notes)
    # the same combiner writing the average instead of the pair: not a partial sum
    scan = scan_text(tmp_path / "avg", job_files(combiner_writes="new SumCount(s / n, 1)"))
    (item,) = [h for h in scan.jobs[0].plan.hand_work if h.category == "combiner"]
    assert "not a partial sum" in item.reason


def test_min_and_max_combine_only_from_the_same_start(tmp_path):
    """max(I, max(J, part)...) is max(I, all) only when J cannot win: J == I, or Integer.MIN_VALUE."""
    bodies = dict(BODIES)
    BODIES["max0"] = BODIES["max"].replace("Integer.MIN_VALUE", "0")
    BODIES["max5"] = BODIES["max"].replace("Integer.MIN_VALUE", "5")
    try:
        assert _job(tmp_path / "a", "max0", "max").status == "converted"  # the combiner's start never wins
        assert _job(tmp_path / "b", "max0", "max0").status == "converted"
        (item,) = [h for h in _job(tmp_path / "c", "max0", "max5").plan.hand_work if h.category == "combiner"]
        assert "starts at 5, the reducer's at 0" in item.reason
    finally:
        BODIES.clear()
        BODIES.update(bodies)
