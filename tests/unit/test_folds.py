"""The fold recogniser on small reducers: what each accumulator becomes, and what it must decline.

Java facts relied on (Java SE API docs): `a || b` does not evaluate `b` once `a` is true
(JLS 15.24); `|=` and `&=` on booleans evaluate both sides (JLS 15.22.2); Set.add keeps one copy
of equal elements and size() counts them (java.util.Set); Iterator.next() moves to the next value
(java.util.Iterator). Hadoop facts (Reducer javadoc): the values of one key reach reduce() in no
defined order unless a secondary sort orders them, and can be iterated once.
"""
from __future__ import annotations

from migrate.plan import dump_plan
from tests.helpers import job_source, scan_text

TEXT_REDUCER = """  public static class R extends Reducer<Text, Text, Text, Text> {
    protected void reduce(Text key, Iterable<Text> values, Context context) throws IOException, InterruptedException {
%s
    }
  }"""
INT_REDUCER = """  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
%s
    }
  }"""


def _plan(tmp_path, reducer_body, template=INT_REDUCER):
    kv = ("Text", "Text") if template is TEXT_REDUCER else ("Text", "IntWritable")
    mapper = ("context.write(value, value);" if template is TEXT_REDUCER
              else "context.write(value, new IntWritable(1));")
    src = job_source(mapper, template % reducer_body, map_out=kv, out=kv)
    scan = scan_text(tmp_path, {"Main.java": src})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job, dump_plan(job.plan)


def _declined(job, category="reduce-logic"):
    items = [h for h in job.plan.hand_work if h.category == category]
    assert items, [(h.category, h.reason) for h in job.plan.hand_work]
    assert job.status != "converted"
    return items[0]


def test_conditional_count_and_sum_become_count_if_and_a_guarded_sum(tmp_path):
    job, dump = _plan(tmp_path, """
      int big = 0; long total = 0;
      for (IntWritable v : values) { if (v.get() > 10) { big++; total += v.get(); } }
      context.write(key, new IntWritable(big));
      context.write(key, new IntWritable((int) total));""")
    assert job.status == "converted"
    assert "Agg big = count_if:int((value > 10)) init=0" in dump
    assert "Agg total = sum:long(((value > 10) ? (long) value : 0)) init=0" in dump


def test_flags_become_any_and_all(tmp_path):
    job, dump = _plan(tmp_path, """
      boolean seenBig = false; boolean allSmall = true; boolean odd = false;
      for (IntWritable v : values) {
        if (v.get() > 100) seenBig = true;
        allSmall &= v.get() < 5;
        odd = v.get() % 2 == 1 || odd;
      }
      context.write(key, new IntWritable(seenBig ? 1 : allSmall ? 2 : odd ? 3 : 0));""")
    assert job.status == "converted"
    assert "Agg seenBig = any:boolean((value > 100)) init=False" in dump
    assert "Agg allSmall = all:boolean((value < 5)) init=True" in dump
    assert "Agg odd = any:boolean(((value %:int 2) == 1)) init=False" in dump


def test_short_circuit_flag_over_a_failing_operation_is_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      boolean bad = false;
      for (Text v : values) { bad = bad || Integer.parseInt(v.toString()) < 0; }
      context.write(key, new Text(bad ? "bad" : "ok"));""", TEXT_REDUCER)
    assert "skips the right side" in _declined(job).reason


def test_set_size_is_a_distinct_count(tmp_path):
    job, dump = _plan(tmp_path, """
      Set<String> seen = new HashSet<>();
      for (Text v : values) { seen.add(v.toString().toLowerCase()); }
      context.write(key, new Text("distinct=" + seen.size()));""", TEXT_REDUCER)
    assert job.status == "converted"
    assert "Agg seen = count_distinct:int(lower(value))" in dump


def test_a_set_of_doubles_is_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      Set<Double> seen = new HashSet<>();
      for (Text v : values) { seen.add(Double.parseDouble(v.toString())); }
      context.write(key, new Text("" + seen.size()));""", TEXT_REDUCER)
    assert "-0.0" in _declined(job).reason


def test_several_writes_per_key_keep_their_order_and_guards(tmp_path):
    job, dump = _plan(tmp_path, """
      int n = 0; int hi = 0;
      for (IntWritable v : values) { n++; hi = Math.max(hi, v.get()); }
      context.write(key, new IntWritable(n));
      if (hi > 3) { context.write(new Text("peak"), new IntWritable(hi)); } else { context.write(key, new IntWritable(-1)); }""")
    assert job.status == "converted"
    outs = [line.strip() for line in dump.splitlines() if line.strip().startswith("Out ")]
    assert outs == ["Out key -> @n", "Out 'peak' -> @hi if (@hi > 3)", "Out key -> -1 if !(@hi > 3)"]


def test_locals_of_the_loop_become_columns_before_the_shuffle(tmp_path):
    job, dump = _plan(tmp_path, """
      long total = 0;
      for (Text v : values) { String[] f = v.toString().split(":"); long c = Long.parseLong(f[1]); total += c; }
      context.write(key, new Text("" + total));""", TEXT_REDUCER)
    assert "    Let f = split(value, ':', 0)" in dump
    assert "    Let c = parse_long(index(f, 1))" in dump
    assert "Agg total = sum:long(c) init=0" in dump


def test_writes_inside_the_loop_are_per_value(tmp_path):
    job, dump = _plan(tmp_path, """
      for (IntWritable v : values) { if (v.get() % 2 == 0) { context.write(key, new IntWritable(v.get() / 2)); } }""")
    assert job.status == "converted"
    assert "For each value (sorted by key)" in dump
    assert "Emit key -> (value /:int 2) if ((value %:int 2) == 0)" in dump


def test_identity_loop_is_per_value(tmp_path):
    job, dump = _plan(tmp_path, "      for (IntWritable v : values) context.write(key, v);")
    assert "Emit key -> value" in dump and job.status == "converted"


def test_writes_inside_and_a_figure_after_the_loop_are_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      int n = 0;
      for (IntWritable v : values) { n++; context.write(key, v); }
      context.write(key, new IntWritable(n));""")
    assert "a figure of all the values (`n`)" in _declined(job).reason


def test_reading_an_accumulator_inside_the_loop_is_declined(tmp_path):
    # `sum * 2` inside the loop reads a running value no aggregate has
    job, _ = _plan(tmp_path, """
      int sum = 0; int weird = 0;
      for (IntWritable v : values) { sum += v.get(); weird += sum * 2; }
      context.write(key, new IntWritable(weird));""")
    assert "running value of `sum`" in _declined(job).reason


def test_last_value_is_the_one_value_of_the_key_checked_at_run_time(tmp_path):
    """Java keeps the last value assigned; with no defined order that is defined only where every
    value agrees, which the script checks (tests/unit/test_reduce_forms.py runs both sides)."""
    job, dump = _plan(tmp_path, """
      int last = 0;
      for (IntWritable v : values) { last = v.get(); }
      context.write(key, new IntWritable(last));""")
    assert job.status == "converted", job.plan.hand_work
    assert [(a.name, a.fn) for a in job.plan.reduce.aggs] == [("last", "only")]


def test_last_value_under_a_condition_is_declined_as_order_dependent(tmp_path):
    job, _ = _plan(tmp_path, """
      int last = 0;
      for (IntWritable v : values) { if (v.get() > 1) { last = v.get(); } }
      context.write(key, new IntWritable(last));""")
    item = _declined(job, "value-order")
    assert "no defined order" in item.reason and item.blocking


def test_values_iterated_twice_are_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      int n = 0; int s = 0;
      for (IntWritable v : values) { n++; }
      for (IntWritable v : values) { s += v.get(); }
      context.write(key, new IntWritable(s / n));""")
    assert "iterated once" in _declined(job).reason


def test_loop_with_side_effects_is_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      int n = 0;
      for (IntWritable v : values) { n++; System.setProperty("last", v.toString()); }
      context.write(key, new IntWritable(n));""")
    assert "not a recognised accumulator update" in _declined(job).reason


def test_logging_in_the_loop_is_not_a_side_effect_on_the_output(tmp_path):
    job, _ = _plan(tmp_path, """
      int n = 0;
      for (IntWritable v : values) { n++; System.out.println(v); }
      context.write(key, new IntWritable(n));""")
    assert job.status == "converted"
    assert any("logging to System.out is not carried over" in n for n in job.plan.notes)


def test_trimmed_tree_set_is_a_top_n_per_key(tmp_path):
    job, dump = _plan(tmp_path, """
      TreeSet<Integer> low = new TreeSet<>();
      for (IntWritable v : values) { low.add(v.get()); if (low.size() > 2) low.remove(low.last()); }
      for (int x : low) context.write(key, new IntWritable(x));""")
    assert job.status == "converted"
    assert "Keep 2 smallest distinct value, written ascending" in dump and "Write key -> tm_key" in dump


def test_tree_set_trimmed_by_a_computed_size_is_declined(tmp_path):
    job, _ = _plan(tmp_path, """
      TreeSet<Integer> top = new TreeSet<>();
      for (IntWritable v : values) { top.add(v.get()); if (top.size() > v.get()) top.pollFirst(); }
      for (Integer x : top) context.write(key, new IntWritable(x));""")
    assert "constant N" in _declined(job, "top-n").reason


def test_priority_queue_is_declined_for_its_ties(tmp_path):
    job, _ = _plan(tmp_path, """
      PriorityQueue<Integer> q = new PriorityQueue<>();
      for (IntWritable v : values) { q.add(v.get()); }
      context.write(key, new IntWritable(q.size()));""")
    assert "heap's history" in _declined(job, "top-n").reason
