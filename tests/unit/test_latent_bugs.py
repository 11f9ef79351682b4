"""Latent bugs in legacy jobs: reproduced as Hadoop runs them, and raised as findings with file and line.

Facts relied on: Java overloading (JLS 8.4.8.1: a method with other parameter types does not
override; without @Override javac accepts it); Hadoop's Job.setMapperClass/setReducerClass
store one class each in the configuration, so the last call wins (Hadoop Job javadoc); a job with
no reducer class set runs org.apache.hadoop.mapreduce.Reducer, the identity reducer (Reducer
javadoc); TextOutputFormat writes key.toString() and value.toString() whatever the declared
classes (TextOutputFormat source, LineRecordWriter.writeObject).
"""
from __future__ import annotations

from tests.helpers import job_source, scan_text


def _job(tmp_path, mapper_body, reducer="", **kw):
    scan = scan_text(tmp_path, {"Main.java": job_source(mapper_body, reducer, **kw)})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job


def _finding(job, category):
    found = [f for f in job.plan.findings if f.category == category]
    assert found, [(f.category, f.message) for f in job.plan.findings]
    return found[0]


def test_reduce_with_an_iterator_is_never_called_and_runs_as_identity(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterator<IntWritable> values, Context context) throws IOException, InterruptedException {
      int n = 0; while (values.hasNext()) { n += values.next().get(); }
      context.write(key, new IntWritable(n));
    }
  }"""
    job = _job(tmp_path, "context.write(value, new IntWritable(1));", red)
    assert type(job.plan.reduce).__name__ == "Identity"
    f = _finding(job, "reduce-not-called")
    assert "Iterator<IntWritable>" in f.message and f.origin.line_start > 0
    assert job.status == "converted"  # reproduced faithfully; the finding is for the team to decide


def test_reduce_with_another_key_type_is_never_called(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(LongWritable key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      for (IntWritable v : values) context.write(new Text("x"), v);
    }
  }"""
    job = _job(tmp_path, "context.write(value, new IntWritable(1));", red)
    assert "key parameter is a LongWritable" in _finding(job, "reduce-not-called").message


def test_a_proper_override_is_lifted_as_usual(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Reducer.Context context) throws IOException, InterruptedException {
      int n = 0; for (IntWritable v : values) n += v.get();
      context.write(key, new IntWritable(n));
    }
  }"""
    job = _job(tmp_path, "context.write(value, new IntWritable(1));", red)
    assert type(job.plan.reduce).__name__ == "Group" and not job.plan.findings


def test_map_that_does_not_override_is_hand_work(tmp_path):
    src = job_source("", "").replace(
        "protected void map(LongWritable key, Text value, Context context)",
        "protected void map(Object key, Text value, Context context)")
    scan = scan_text(tmp_path, {"Main.java": src})
    (job,) = scan.jobs
    items = [h for h in job.plan.hand_work if h.category == "map-not-called"]
    assert items and "identity mapper" in items[0].reason and items[0].blocking


def test_mapper_set_twice_keeps_the_last(tmp_path):
    src = job_source("context.write(value, new IntWritable(1));", "", reducer_class=None,
                     extra_driver="job.setMapperClass(Other.class);")
    src = src.replace("  public static void main", """  public static class Other extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      context.write(new Text("other"), new IntWritable(2));
    }
  }
  public static void main""")
    scan = scan_text(tmp_path, {"Main.java": src})
    (job,) = scan.jobs
    assert job.classes["mapper"].endswith("Other")
    assert "Emit 'other' -> 2" in __import__("migrate.plan", fromlist=["dump_plan"]).dump_plan(job.plan)
    assert "last class, Other, not M" in _finding(job, "set-twice").message


def test_reducer_class_never_registered_is_a_finding(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int n = 0; for (IntWritable v : values) n += v.get();
      context.write(key, new IntWritable(n));
    }
  }"""
    job = _job(tmp_path, "context.write(value, new IntWritable(1));", red, reducer_class=None)
    assert type(job.plan.reduce).__name__ == "Identity"
    assert "never calls setReducerClass" in _finding(job, "reducer-not-registered").message


def test_declared_output_class_that_differs_from_the_written_one(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int n = 0; for (IntWritable v : values) n++;
      context.write(key, new Text("n=" + n));
    }
  }"""
    job = _job(tmp_path, "context.write(value, new IntWritable(1));", red, out=("Text", "IntWritable"))
    f = _finding(job, "declared-type")
    assert "declares IntWritable output values but writes String" in f.message


COUNTING = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    private int written = 0;
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int n = 0; for (IntWritable v : values) n += v.get();
      %s
    }
  }"""


def test_instance_counter_cap_is_the_first_keys_of_each_task(tmp_path):
    job = _job(tmp_path, "context.write(value, new IntWritable(1));",
               COUNTING % "if (written < 3) { context.write(key, new IntWritable(n)); written++; }",
               extra_driver="job.setNumReduceTasks(2);")
    assert job.plan.reduce.first_keys == 3 and job.status == "converted"
    assert "per reduce task (2 here)" in _finding(job, "per-task-state").message
    assert job.plan.sink.partition is not None  # Text keys: Hadoop's HashPartitioner is reproduced


def test_other_state_across_keys_is_declined(tmp_path):
    job = _job(tmp_path, "context.write(value, new IntWritable(1));",
               COUNTING % "written += n; context.write(key, new IntWritable(n));")
    (item,) = [h for h in job.plan.hand_work if h.category == "task-state"]
    assert "carries state from one key to the next" in item.reason and item.blocking


def test_values_gathered_in_arrival_order_are_declined(tmp_path):
    red = """  public static class R extends Reducer<Text, Text, Text, Text> {
    protected void reduce(Text key, Iterable<Text> values, Context context) throws IOException, InterruptedException {
      StringBuilder all = new StringBuilder();
      for (Text v : values) { all.append(v.toString()).append(','); }
      context.write(key, new Text(all.toString()));
    }
  }"""
    job = _job(tmp_path, "context.write(value, value);", red, map_out=("Text", "Text"), out=("Text", "Text"))
    (item,) = [h for h in job.plan.hand_work if h.category == "value-order"]
    assert "not deterministic" in item.reason and "array_sort" in item.suggestion


def test_per_task_state_with_an_unknown_split_of_keys_blocks(tmp_path):
    src = job_source("context.write(value, new IntWritable(1));",
                     COUNTING % "if (written < 3) { context.write(key, new IntWritable(n)); written++; }",
                     extra_driver="job.setNumReduceTasks(2); job.setPartitionerClass(P.class);")
    src = src.replace("  public static void main", """  public static class P extends Partitioner<Text, IntWritable> {
    public int getPartition(Text key, IntWritable value, int n) { return (key.getLength() + value.get()) % n; }
  }
  public static void main""")
    scan = scan_text(tmp_path, {"Main.java": src})
    (job,) = scan.jobs
    items = [h for h in job.plan.hand_work if h.category == "per-task-state"]
    assert items and items[0].blocking and "which task gets which key is not known" in items[0].reason
    assert not [f for f in job.plan.findings if f.category == "per-task-state"]  # nothing claimed reproduced
