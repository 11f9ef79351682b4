"""Lifting rules: Java in, plan (IR text dump) out; and the cases a rule must decline.

Java semantics asserted here come from the Java SE API documentation: String.split(regex)
is split(regex, 0), which removes trailing empty strings; StringTokenizer's default
delimiters are " \\t\\n\\r\\f"; integer division rounds toward zero (JLS 15.17.2); int
arithmetic wraps (JLS 4.2.2); Math.min returns NaN if either argument is NaN; any comparison
with NaN is false (JLS 15.20.1)."""
from __future__ import annotations

from migrate.plan import dump_plan
from tests.helpers import job_source, scan_text

SUM_REDUCER = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
%s
    }
  }"""


def _plan(tmp_path, body, reducer="", **kw):
    scan = scan_text(tmp_path, {"Main.java": job_source(body, reducer, reducer_class="R" if reducer else None, **kw)})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job, dump_plan(job.plan)


def test_split_guard_parse_and_two_guarded_writes(tmp_path):
    job, dump = _plan(tmp_path, """
      String[] f = value.toString().split(",");
      if (f.length < 3) return;
      int n = Integer.parseInt(f[1].trim());
      if (n > 10) { context.write(new Text(f[0]), new IntWritable(n)); }
      else { context.write(new Text("small"), new IntWritable(n / 2)); }""")
    assert job.status == "converted"
    assert "Let f = split(value, ',', 0)" in dump  # Java's limit-0 split, not F.split
    assert "Filter (size(f) >= 3)" in dump
    assert "Let n = parse_int(trim(index(f, 1)))" in dump  # fails the job where Java throws
    assert "Emit index(f, 0) -> n if (n > 10)" in dump
    assert "Emit 'small' -> (n /:int 2) if (n <= 10)" in dump  # integer division is explicit


def test_catch_and_skip_turns_throwing_operations_into_null_and_filter(tmp_path):
    job, dump = _plan(tmp_path, """
      String[] f = value.toString().split(";");
      try {
        int n = Integer.parseInt(f[3]);
        context.write(new Text(f[0]), new IntWritable(n));
      } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) {
        return;
      }""")
    assert "Let n = parse_int?(index?(f, 3))" in dump  # `?`: NULL where Java throws
    assert "Filter is_not_null(n)" in dump
    assert job.status == "converted"


def test_uncaught_kind_still_fails_the_job(tmp_path):
    _, dump = _plan(tmp_path, """
      String[] f = value.toString().split(";");
      try {
        context.write(new Text(f[0]), new IntWritable(Integer.parseInt(f[3])));
      } catch (NumberFormatException e) { }""")
    # the index can throw ArrayIndexOutOfBoundsException, which this catch does not swallow
    assert "parse_int?(index(f, 3))" in dump


def test_token_loop_with_lowercase_and_continue_becomes_explode_and_filter(tmp_path):
    job, dump = _plan(tmp_path, """
      StringTokenizer it = new StringTokenizer(value.toString());
      while (it.hasMoreTokens()) {
        String w = it.nextToken().toLowerCase();
        if (w.length() < 3) continue;
        context.write(new Text(w), new IntWritable(1));
      }""", fields="")
    assert "Explode w <- tokens(value)" in dump
    assert "Filter (length(w_2) >= 3)" in dump or "Filter (length(" in dump
    assert job.status == "converted"


def test_for_each_over_split_array(tmp_path):
    _, dump = _plan(tmp_path, """
      for (String part : value.toString().split(" ")) {
        context.write(new Text(part), new IntWritable(1));
      }""")
    assert "Explode part <- split(value, ' ', 0)" in dump


def test_truncating_long_average_in_reducer(tmp_path):
    red = """  public static class R extends Reducer<Text, LongWritable, Text, LongWritable> {
    protected void reduce(Text key, Iterable<LongWritable> values, Context context) throws IOException, InterruptedException {
      long sum = 0; long count = 0;
      for (LongWritable v : values) { sum += v.get(); count++; }
      context.write(key, new LongWritable(sum / count));
    }
  }"""
    _, dump = _plan(tmp_path, "context.write(value, new LongWritable(1L));", red,
                    map_out=("Text", "LongWritable"), out=("Text", "LongWritable"))
    assert "Out key -> (@sum /:long @count)" in dump  # long / long truncates toward zero


def test_double_average_uses_exact_long_sum(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, DoubleWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      long sum = 0; int n = 0;
      for (IntWritable v : values) { sum += v.get(); n++; }
      context.write(key, new DoubleWritable((double) sum / n));
    }
  }"""
    _, dump = _plan(tmp_path, "context.write(value, new IntWritable(1));", red, out=("Text", "DoubleWritable"))
    assert "Agg sum = sum:long((long) value) init=0" in dump
    assert "Agg n = count:int(null) init=0" in dump
    assert "Out key -> ((double) @sum /:double (double) @n)" in dump


def test_min_and_max_keep_java_nan_rules(tmp_path):
    red = """  public static class R extends Reducer<Text, DoubleWritable, Text, DoubleWritable> {
    protected void reduce(Text key, Iterable<DoubleWritable> values, Context context) throws IOException, InterruptedException {
      double lo = Double.MAX_VALUE; double hi = 0;
      for (DoubleWritable v : values) { lo = Math.min(lo, v.get()); if (v.get() > hi) hi = v.get(); }
      context.write(key, new DoubleWritable(hi - lo));
    }
  }"""
    _, dump = _plan(tmp_path, "context.write(value, new DoubleWritable(1.0));", red,
                    map_out=("Text", "DoubleWritable"), out=("Text", "DoubleWritable"))
    assert "Agg lo = min_nan:double(value)" in dump  # Math.min: NaN wins
    assert "Agg hi = max_nonnan:double(value) init=0.0" in dump  # `v > hi` is false for NaN


def test_int_sum_keeps_the_int_type_for_wraparound(tmp_path):
    red = SUM_REDUCER % """
      int s = 0;
      for (IntWritable v : values) { s += v.get(); }
      context.write(key, new IntWritable(s));"""
    _, dump = _plan(tmp_path, "context.write(value, new IntWritable(1));", red)
    assert "Agg s = sum:int(value) init=0" in dump


def test_distinct_reducer_ignores_values(tmp_path):
    red = """  public static class R extends Reducer<Text, NullWritable, Text, NullWritable> {
    protected void reduce(Text key, Iterable<NullWritable> values, Context context) throws IOException, InterruptedException {
      context.write(key, NullWritable.get());
    }
  }"""
    job, dump = _plan(tmp_path, "context.write(value, NullWritable.get());", red,
                      map_out=("Text", "NullWritable"), out=("Text", "NullWritable"))
    assert "Group by key (distinct)" in dump and "Out key -> null" in dump
    assert job.plan.sink.value_type is None  # TextOutputFormat prints the key alone


def test_string_reference_comparison_is_declined(tmp_path):
    # a split element: whether it is the interned literal depends on the JDK (test_reference_equality.py
    # covers the record's own String, which is reproduced)
    job, _ = _plan(tmp_path, """
      String s = value.toString().split(",")[0];
      if (s == "x") return;
      context.write(new Text(s), new IntWritable(1));""")
    assert job.status == "partial"
    (item,) = job.plan.hand_work
    assert "references" in item.reason and item.origin.line_start > 0


def test_state_across_records_is_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      seen = seen + 1;
      context.write(value, new IntWritable(seen));""", fields="private int seen = 0;")
    assert job.status == "partial"
    assert "state across records" in job.plan.hand_work[0].reason


def test_loop_carried_accumulator_in_map_is_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      int total = 0;
      for (String p : value.toString().split(",")) { total += Integer.parseInt(p); }
      context.write(new Text("t"), new IntWritable(total));""")
    assert job.status == "partial"


def test_first_line_skip_by_offset(tmp_path):
    job, dump = _plan(tmp_path, """
      if (key.get() == 0) return;
      context.write(value, new IntWritable(1));""")
    assert job.plan.source.skip_first_line and "skip first line" in dump


def test_combiner_that_is_not_a_partial_aggregate_is_hand_work(tmp_path):
    red = SUM_REDUCER % """
      int n = 0;
      for (IntWritable v : values) { n++; }
      context.write(key, new IntWritable(n));"""
    job, _ = _plan(tmp_path, "context.write(value, new IntWritable(1));", red,
                   extra_driver="job.setCombinerClass(R.class);")
    assert [h.category for h in job.plan.hand_work] == ["combiner"]


def test_every_lifted_expression_knows_its_java_line(tmp_path):
    from migrate.plan import Let

    job, _ = _plan(tmp_path, """
      String[] f = value.toString().split(",");
      int n = Integer.parseInt(f[1]);
      context.write(new Text(f[0]), new IntWritable(n));""")
    lets = {s.name: s for s in job.plan.map_steps if isinstance(s, Let)}
    src = (tmp_path / "Main.java").read_text().split("\n")
    for name, needle in (("f", "split"), ("n", "parseInt")):
        line = next(i for i, l in enumerate(src, 1) if needle in l)
        assert lets[name].expr.origin.line_start == line and lets[name].expr.origin.file == "Main.java"


def test_written_class_must_match_the_declared_map_output_class(tmp_path):
    # Hadoop's MapTask checks the key class of every write (Hadoop source: "Type mismatch in key from map")
    job, _ = _plan(tmp_path, "context.write(new IntWritable(1), new IntWritable(1));")
    assert [h.category for h in job.plan.hand_work] == ["type-mismatch"]


def test_null_key_in_a_map_only_job_prints_the_value_alone(tmp_path):
    job, dump = _plan(tmp_path, "context.write(null, value);", map_out=("NullWritable", "Text"),
                      out=("NullWritable", "Text"), extra_driver="job.setNumReduceTasks(0);")
    assert "Emit null -> value" in dump and job.status == "converted"
    assert job.plan.sink.key_type is None and not job.plan.sink.sorted_by_key


def test_reducer_post_loop_locals_and_packed_text_value(tmp_path):
    red = """  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    private final Text out = new Text();
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int sum = 0; int count = 0;
      for (IntWritable v : values) { sum += v.get(); count += 1; }
      double mean = (double) sum / count;
      out.set(sum + "," + count + "," + mean);
      context.write(key, out);
    }
  }"""
    job, dump = _plan(tmp_path, "context.write(value, new IntWritable(1));", red, out=("Text", "Text"))
    assert job.status == "converted"
    assert "Out key -> concat(concat(concat(concat(to_string(@sum), ','), to_string(@count)), ','), " \
           "to_string(((double) @sum /:double (double) @count)))" in dump


def test_writable_field_set_only_in_a_branch_is_declined(tmp_path):
    # Hadoop reuses the mapper object: the field still holds the previous record's text where it is not set.
    job, _ = _plan(tmp_path, """
      String s = value.toString();
      if (s.startsWith("a")) { word.set(s); }
      context.write(word, new IntWritable(1));""", fields="private Text word = new Text();")
    assert job.status == "partial" and "previous record" in job.plan.hand_work[0].reason


def test_writable_field_set_and_written_under_the_same_guard_is_fine(tmp_path):
    job, _ = _plan(tmp_path, """
      String s = value.toString();
      if (s.startsWith("a")) { word.set(s); context.write(word, new IntWritable(1)); }""",
                   fields="private Text word = new Text();")
    assert job.status == "converted"


def test_settings_read_in_setup_become_parameters_with_the_driver_default(tmp_path):
    job, dump = _plan(tmp_path, """
      String s = value.toString();
      if (s.length() < minLen) return;
      context.write(new Text(s.substring(0, minLen)), new IntWritable(1));""",
                      fields="""private int minLen;
    protected void setup(Context context) { minLen = context.getConfiguration().getInt("min.len", 3); }""",
                      extra_driver='job.getConfiguration().setInt("min.len", 5);')
    assert job.status == "converted"
    assert "conf.getInt('min.len', 5)" in dump  # Hadoop: the driver's set() wins over the code's default


def test_setup_doing_more_than_reading_settings_is_hand_work(tmp_path):
    job, _ = _plan(tmp_path, "context.write(value, new IntWritable(1));",
                   fields="protected void setup(Context context) { System.out.println(\"hi\"); }")
    assert [h.category for h in job.plan.hand_work] == ["task-lifecycle"]


def test_pure_helper_methods_are_inlined_and_impure_ones_are_not(tmp_path):
    job, dump = _plan(tmp_path, """
      context.write(new Text(norm(value.toString())), new IntWritable(1));""",
                      fields='private static String norm(String s) { String t = s.trim(); if (t.isEmpty()) return "-"; return t; }')
    assert "(is_empty(trim(value)) ? '-' : trim(value))" in dump and job.status == "converted"
    job, _ = _plan(tmp_path / "b", """
      context.write(new Text(log(value.toString())), new IntWritable(1));""",
                   fields='private String log(String s) { System.out.println(s); return s; }')
    assert job.status == "partial"


def test_old_api_reporter_counters_are_counted(tmp_path):
    src = HEADER_OLD + """
public class OldJob {
  enum Bad { SHORT }
  public static class M extends MapReduceBase implements Mapper<LongWritable, Text, Text, IntWritable> {
    public void map(LongWritable k, Text v, OutputCollector<Text, IntWritable> out, Reporter reporter) throws IOException {
      String[] f = v.toString().split(",");
      if (f.length < 2) { reporter.incrCounter(Bad.SHORT, 1); return; }
      reporter.incrCounter("rows", "good", 1);
      out.collect(new Text(f[0]), new IntWritable(1));
    }
  }
  public static void main(String[] args) throws Exception {
    JobConf conf = new JobConf(OldJob.class);
    conf.setMapperClass(M.class);
    conf.setNumReduceTasks(0);
    conf.setOutputKeyClass(Text.class);
    conf.setOutputValueClass(IntWritable.class);
    FileInputFormat.setInputPaths(conf, new Path(args[0]));
    FileOutputFormat.setOutputPath(conf, new Path(args[1]));
    JobClient.runJob(conf);
  }
}
"""
    from tests.helpers import scan_text

    scan = scan_text(tmp_path, {"OldJob.java": src})
    (job,) = scan.jobs
    dump = dump_plan(job.plan)
    assert job.status == "converted"
    assert "Count OldJob$Bad:SHORT += 1 where (size(f) < 2)" in dump  # Hadoop names the group by the enum's binary name
    assert "Count rows:good += 1 where null" in dump


HEADER_OLD = """
import java.io.IOException;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapred.*;
"""


def test_selectors_on_literals_parentheses_and_casts_are_not_dropped(tmp_path):
    # javalang hangs `.equals(...)` of `"x".equals(s)` and `.trim()` of `(a + b).trim()` on the literal or
    # the parenthesised node; a lifter that ignored them would silently compute something else.
    job, dump = _plan(tmp_path, """
      String s = value.toString();
      if ("skip".equals(s)) return;
      String t = (s + " ").trim();
      context.write(new Text(t), new IntWritable("abc".length()));""")
    assert "Filter (value != 'skip')" in dump
    assert "Let t = trim(concat(value, ' '))" in dump
    assert "Emit t -> length('abc')" in dump


def test_in_mapper_combining_is_exact_only_before_a_summing_reducer(tmp_path):
    fields = """private final Map<String, Integer> seen = new HashMap<>();
    protected void cleanup(Context context) throws IOException, InterruptedException {
      for (Map.Entry<String, Integer> e : seen.entrySet()) { context.write(new Text(e.getKey()), new IntWritable(e.getValue())); }
    }"""
    body = "      seen.merge(value.toString(), 1, Integer::sum);"
    summing = SUM_REDUCER % """
      int s = 0;
      for (IntWritable v : values) { s += v.get(); }
      context.write(key, new IntWritable(s));"""
    job, dump = _plan(tmp_path, body, summing, fields=fields)
    assert job.status == "converted" and "Emit value -> 1" in dump
    counting = SUM_REDUCER % """
      int n = 0;
      for (IntWritable v : values) { n++; }
      context.write(key, new IntWritable(n));"""
    job, _ = _plan(tmp_path / "b", body, counting, fields=fields)
    assert [h.category for h in job.plan.hand_work] == ["task-state"]  # counts of partial sums depend on the split


def test_enum_constant_names_are_literals(tmp_path):
    from tests.helpers import HEADER

    text = HEADER + """
public class E {
  enum Kind { SHORT_RIDE, LONG_RIDE }
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      Kind k = value.getLength() > 10 ? Kind.LONG_RIDE : Kind.SHORT_RIDE;
      context.write(new Text(Kind.LONG_RIDE.name() + "/" + String.valueOf(Kind.SHORT_RIDE)), new IntWritable(1));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "e");
    job.setMapperClass(M.class);
    job.setNumReduceTasks(0);
    job.setOutputKeyClass(Text.class);
    job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    job.waitForCompletion(true);
  }
}
"""
    from tests.helpers import scan_text

    scan = scan_text(tmp_path, {"E.java": text})
    (job,) = scan.jobs
    # an enum-typed local (not a constant) is declined; the constants' names are plain strings
    assert job.status != "converted" and job.plan.hand_work[0].origin.line_start > 0
    text2 = text.replace("      Kind k = value.getLength() > 10 ? Kind.LONG_RIDE : Kind.SHORT_RIDE;\n", "")
    scan = scan_text(tmp_path / "b", {"E.java": text2})
    (job,) = scan.jobs
    assert job.status == "converted"
    assert "Emit 'LONG_RIDE/SHORT_RIDE'" in dump_plan(job.plan) or "concat(concat('LONG_RIDE', '/'), 'SHORT_RIDE')" in dump_plan(job.plan)


def test_trailing_continue_ends_only_the_iteration(tmp_path):
    job, dump = _plan(tmp_path, """
      for (String w : value.toString().split(" ")) {
        if (w.isEmpty()) { continue; }
        context.write(new Text(w), new IntWritable(1));
        continue;
      }""")
    assert job.status == "converted" and "Emit w -> 1" in dump


def test_fields_set_in_the_constructor_are_constants(tmp_path):
    job, dump = _plan(tmp_path, "context.write(new Text(prefix + value.toString()), new IntWritable(1));",
                      fields='private final String prefix; public M() { prefix = "bh:"; }')
    assert job.status == "converted" and "concat('bh:', value)" in dump


def test_packed_values_split_again_in_the_reducer(tmp_path):
    red = """  public static class R extends Reducer<Text, Text, Text, Text> {
    protected void reduce(Text key, Iterable<Text> values, Context context) throws IOException, InterruptedException {
      long sum = 0; long n = 0;
      for (Text v : values) { sum += Long.parseLong(v.toString().split(",")[0]); n += Long.parseLong(v.toString().split(",")[1]); }
      context.write(key, new Text(sum + "," + n));
    }
  }"""
    job, dump = _plan(tmp_path, 'context.write(new Text("k"), new Text(value.toString() + ",1"));', red,
                      map_out=("Text", "Text"), out=("Text", "Text"))
    assert job.status == "converted"
    assert "Agg sum = sum:long(parse_long(index(split(value, ',', 0), 0)))" in dump


def test_side_effects_the_plan_cannot_express_are_named_hand_work(tmp_path):
    cases = {
        "wall-clock": "long now = System.currentTimeMillis();\n      context.write(value, new IntWritable((int) now));",
        "io-in-task": "java.io.BufferedReader r = new java.io.BufferedReader(new java.io.FileReader(\"/etc/x\"));\n"
                      "      context.write(value, new IntWritable(1));",
        "randomness": "int r = new java.util.Random().nextInt(3);\n      context.write(value, new IntWritable(r));",
    }
    for i, (category, body) in enumerate(cases.items()):
        job, _ = _plan(tmp_path / str(i), body)
        assert job.status != "converted"
        (item,) = job.plan.hand_work
        assert item.category == category and item.origin.line_start > 0 and item.suggestion, item
    # static mutable state: a static counter bumped per record
    job, _ = _plan(tmp_path / "s", "seen++;\n      context.write(value, new IntWritable(seen));",
                   fields="private static int seen = 0;")
    assert "state across records" in job.plan.hand_work[0].reason


def test_float_sum_in_a_reducer_is_declined(tmp_path):
    red = """  public static class R extends Reducer<Text, FloatWritable, Text, FloatWritable> {
    protected void reduce(Text key, Iterable<FloatWritable> values, Context context) throws IOException, InterruptedException {
      float s = 0;
      for (FloatWritable v : values) { s += v.get(); }
      context.write(key, new FloatWritable(s));
    }
  }"""
    job, _ = _plan(tmp_path, "context.write(value, new FloatWritable(0.1f));", red,
                   map_out=("Text", "FloatWritable"), out=("Text", "FloatWritable"))
    assert job.status == "partial" and "float precision" in job.plan.hand_work[0].reason


def test_double_keys_are_declined_for_grouping(tmp_path):
    # Hadoop source: DoubleWritable.compareTo uses Double.compare, so -0.0 and 0.0 are two keys
    job, _ = _plan(tmp_path, "context.write(new DoubleWritable(1.0), new IntWritable(1));",
                   map_out=("DoubleWritable", "IntWritable"), out=("DoubleWritable", "IntWritable"))
    assert "key-semantics" in [h.category for h in job.plan.hand_work]


def test_every_plan_expression_node_has_a_generator_handler():
    import migrate.plan as P
    from migrate.gen.pyspark import ExprWriter

    nodes = [c for c in vars(P).values() if isinstance(c, type) and issubclass(c, P.Expr) and c is not P.Expr]
    missing = [c.__name__ for c in nodes if not hasattr(ExprWriter, f"visit_{c.__name__}")]
    assert nodes and not missing, missing
