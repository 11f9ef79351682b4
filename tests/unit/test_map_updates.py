"""In-mapper combining written in other spellings of "add v to the count of k" (migrate/lower/map_updates.py):
each is Map.merge(k, v, Integer::sum) (Map.merge javadoc; Integer.sum is `a + b`), and a flush by
keys is a flush by entries. Checked against Hadoop's local runner over two input files (two map
tasks, so two per-task maps that the reducer sums)."""
from __future__ import annotations

import pytest

from tests.helpers import HEADER, SUM_WORDS_MAIN, scan_text, verify_one_job

JOB = HEADER + """
public class Main {
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    private Map<String, Integer> counts = new HashMap<>();
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      for (String w : value.toString().split(" ")) {
        %s
      }
    }
    protected void cleanup(Context context) throws IOException, InterruptedException {
      %s
    }
  }
""" + SUM_WORDS_MAIN + """}
"""
UPDATES = {
    "contains-key": "if (counts.containsKey(w)) { counts.put(w, counts.get(w) + 1); } else { counts.put(w, 1); }",
    "not-null": "if (counts.get(w) == null) counts.put(w, 1); else counts.put(w, 1 + counts.get(w));",
    "null-to-zero": "Integer c = counts.get(w); if (c == null) { c = 0; } counts.put(w, c + 1);",
    "ternary": "Integer c = counts.get(w); counts.put(w, c != null ? c + 1 : 1);",
    "put-ternary": "counts.put(w, !counts.containsKey(w) ? 1 : counts.get(w) + 1);",
    "merge-lambda": "counts.merge(w, 1, (a, b) -> b + a);",
    "compute": "counts.compute(w, (k, c) -> c == null ? 1 : c + 1);",
    "compute-block": "counts.compute(w, (k, c) -> { return c != null ? 1 + c : 1; });",
}
BY_ENTRIES = ("for (Map.Entry<String, Integer> e : counts.entrySet()) "
              "{ context.write(new Text(e.getKey()), new IntWritable(e.getValue())); }")
BY_KEYS = "for (String k : counts.keySet()) { context.write(new Text(k), new IntWritable(counts.get(k))); }"


@pytest.mark.parametrize("spelling", sorted(UPDATES))
def test_each_spelling_of_a_count_update_is_in_mapper_combining(tmp_path, spelling):
    (job,) = scan_text(tmp_path, {"Main.java": JOB % (UPDATES[spelling], BY_KEYS)}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert any("Map.merge(k, v, Integer::sum)" in n for n in job.plan.notes)
    assert any("flushed by its keys" in n for n in job.plan.notes)


@pytest.mark.parametrize("update", [
    "counts.merge(w, 1, (a, b) -> a * b);",  # not a sum
    "counts.compute(w, (k, c) -> c == null ? 1 : c + k.length());",  # the amount reads the key parameter
    "counts.compute(w, (k, c) -> c == null ? 0 : c + 1);",  # a first count that is not the amount
])
def test_other_lambdas_are_not_read_as_a_sum(tmp_path, update):
    (job,) = scan_text(tmp_path, {"Main.java": JOB % (update, BY_ENTRIES)}).jobs
    assert job.status != "converted" and not any("Map.merge" in n for n in job.plan.notes)


def test_a_key_computed_twice_is_not_rewritten(tmp_path):
    """`w.trim()` evaluated in the test and again in the put: left as written (declined)."""
    update = UPDATES["contains-key"].replace("(w", "(w.trim()").replace(", w", ", w.trim()")
    (job,) = scan_text(tmp_path, {"Main.java": JOB % (update, BY_ENTRIES)}).jobs
    assert job.status != "converted"
    assert not any("Map.merge" in n for n in job.plan.notes)


@pytest.mark.parametrize("spelling", ["null-to-zero", "compute"])
def test_in_mapper_combining_by_keys_agrees_with_hadoop_over_two_map_tasks(tmp_path, spelling):
    src = JOB % (UPDATES[spelling], BY_KEYS)
    data = {"a.txt": b"quay mill quay\nbell quay\n", "b.txt": b"mill mill lantern\nquay\n"}
    assert verify_one_job(tmp_path, src, data).verdict == "agrees"
