"""migrate.lower: each rewrite fires where the meaning is the same, and only there.
(The behaviour of the lowered jobs against Hadoop is proven by tests/parity/test_variants.py and
the RidesPerRoute sample; these tests pin where each rule must decline.)"""
from __future__ import annotations

import pytest

from migrate.plan import dump_plan
from tests.helpers import job_source, scan_text


def _job(tmp_path, body: str, fields: str = "", extra: str = ""):
    scan = scan_text(tmp_path, {"Main.java": job_source(body, fields=fields, reducer_class=None,
                                                        extra_driver="job.setNumReduceTasks(0);").replace("public class Main {",
                                                                                     "public class Main {\n" + extra)})
    (job,) = scan.jobs
    return job


def _reasons(job) -> list[str]:
    return [h.reason for h in job.plan.hand_work]


def test_a_scratch_field_set_first_in_map_is_a_local(tmp_path):
    job = _job(tmp_path, """
      f = value.toString().split(",");
      context.write(new Text(f[0]), new IntWritable(f.length));""", fields="private String[] f;")
    assert not _reasons(job)
    assert any("set before every read" in n for n in job.plan.notes)


def test_a_field_read_before_it_is_set_keeps_state_and_is_declined(tmp_path):
    job = _job(tmp_path, """
      if (f != null) { context.write(new Text(f[0]), new IntWritable(1)); }
      f = value.toString().split(",");""", fields="private String[] f;")
    assert any("keeps state across records" in r or "not a value the converter can follow" in r
               for r in _reasons(job)), _reasons(job)


def test_a_field_set_only_under_a_condition_is_not_a_local(tmp_path):
    job = _job(tmp_path, """
      if (value.getLength() > 3) { last = value.toString(); }
      context.write(new Text(last), new IntWritable(1));""", fields="private String last = \"\";")
    assert _reasons(job), "the previous record's value would be written: must not convert"


def test_printing_a_stack_trace_in_a_catch_is_the_same_skip(tmp_path):
    job = _job(tmp_path, """
      try {
        int n = Integer.parseInt(value.toString().trim());
        context.write(new Text("n"), new IntWritable(n));
      } catch (NumberFormatException e) {
        e.printStackTrace();
        System.err.println("bad line: " + value);
      }""")
    assert not _reasons(job)


def test_logging_that_advances_a_tokenizer_is_not_dropped(tmp_path):
    job = _job(tmp_path, """
      StringTokenizer it = new StringTokenizer(value.toString());
      while (it.hasMoreTokens()) {
        System.out.println(it.nextToken());
        context.write(new Text(it.nextToken()), new IntWritable(1));
      }""")
    assert _reasons(job), "println(it.nextToken()) consumes a token: dropping it would change the output"


def test_a_counting_loop_that_reads_a_neighbour_stays_a_counting_loop(tmp_path):
    job = _job(tmp_path, """
      String[] w = value.toString().split(" ");
      for (int i = 0; i < w.length; i++) {
        context.write(new Text(w[i] + w[i + 1]), new IntWritable(1));
      }""")
    assert any("counting for-loop" in r for r in _reasons(job)), _reasons(job)


def test_a_counting_loop_over_an_array_converts_like_for_each(tmp_path):
    job = _job(tmp_path, """
      String[] w = value.toString().split(" ");
      for (int i = 0; i < w.length; i++) {
        String word = w[i];
        context.write(new Text(word), new IntWritable(1));
      }""")
    assert not _reasons(job)


def test_a_field_set_in_setup_from_constants_is_a_task_constant(tmp_path):
    job = _job(tmp_path, """
      context.write(new Text(tag + value.toString()), new IntWritable(1));""",
               fields="""private String tag;
    protected void setup(Context context) { tag = "line:"; }""")
    assert not _reasons(job)


def test_a_field_set_in_setup_from_the_context_is_not_moved(tmp_path):
    job = _job(tmp_path, """
      context.write(new Text(tag + value.toString()), new IntWritable(1));""",
               fields="""private String tag;
    protected void setup(Context context) { tag = context.getJobName(); }""")
    assert _reasons(job)


def test_this_qualified_fields_and_var_locals(tmp_path):
    job = _job(tmp_path, """
      var line = value.toString();
      this.word.set(line.trim());
      context.write(this.word, new IntWritable(1));""", fields="private Text word = new Text();")
    assert not _reasons(job)


def test_a_var_read_from_an_array_local_has_its_element_type(tmp_path):
    """`var f = s.split(","); var x = f[1];`: x is a String (JLS 15.10.3, an array access has the
    array's component type), so the rules that need the declared type read it."""
    job = _job(tmp_path, """
      var f = value.toString().split(",");
      var x = f[1];
      context.write(new Text(x.trim()), new IntWritable(1));""")
    assert not _reasons(job)
    assert any("`var x` is a String" in n for n in job.plan.notes), job.plan.notes


def test_a_turkish_locale_is_declined(tmp_path):
    job = _job(tmp_path, """
      context.write(new Text(value.toString().toLowerCase(new java.util.Locale("tr"))), new IntWritable(1));""")
    assert any("locale" in r for r in _reasons(job)), _reasons(job)


KEY = """
  public static class Pair implements WritableComparable<Pair> {
    private String a = "";
    private String b = "";
    public void setA(String a) { this.a = a; }
    public void setB(String b) { this.b = b; }
    public void write(java.io.DataOutput out) throws IOException { out.writeUTF(a); out.writeUTF(b); }
    public void readFields(java.io.DataInput in) throws IOException { a = in.readUTF(); b = in.readUTF(); }
    public int compareTo(Pair o) { int c = a.compareTo(o.a); if (c != 0) { return c; } return b.compareTo(o.b); }
    public String toString() { return a + "/" + b; }
  }
"""


def test_a_key_object_set_through_its_setters_is_a_value(tmp_path):
    scan = scan_text(tmp_path, {"Main.java": job_source("""
      String[] f = value.toString().split(",");
      pair.setA(f[0]);
      pair.setB(f[1]);
      context.write(pair, new IntWritable(1));""", fields="private Pair pair = new Pair();", map_out=("Pair", "IntWritable"),
        out=("Pair", "IntWritable"), reducer_class=None,
        extra_driver="job.setNumReduceTasks(0);").replace("public class Main {", "public class Main {\n" + KEY)})
    (job,) = scan.jobs
    assert not _reasons(job)


def test_a_key_field_set_only_on_some_records_is_declined(tmp_path):
    scan = scan_text(tmp_path, {"Main.java": job_source("""
      String[] f = value.toString().split(",");
      pair.setA(f[0]);
      if (f.length > 2) { pair.setB(f[1]); }
      context.write(pair, new IntWritable(1));""", fields="private Pair pair = new Pair();", map_out=("Pair", "IntWritable"),
        out=("Pair", "IntWritable"), reducer_class=None,
        extra_driver="job.setNumReduceTasks(0);").replace("public class Main {", "public class Main {\n" + KEY)})
    (job,) = scan.jobs
    assert any("previous record" in r for r in _reasons(job)), _reasons(job)


def test_a_setter_that_assigns_its_own_parameter_is_declined(tmp_path):
    key = KEY.replace("public void setB(String b) { this.b = b; }", "public void setB(String b) { b = b; }")
    scan = scan_text(tmp_path, {"Main.java": job_source("""
      Pair p = new Pair();
      p.setB(value.toString());
      context.write(p, new IntWritable(1));""", map_out=("Pair", "IntWritable"),
        out=("Pair", "IntWritable"), reducer_class=None,
        extra_driver="job.setNumReduceTasks(0);").replace("public class Main {", "public class Main {\n" + key)})
    (job,) = scan.jobs
    assert any("assigns the parameter" in r for r in _reasons(job)), _reasons(job)


def test_a_private_field_bumped_with_plus_plus_is_not_a_constant(tmp_path):
    job = _job(tmp_path, """
      seen++;
      context.write(new Text(value.toString()), new IntWritable(seen));""", fields="private int seen = 0;")
    assert _reasons(job), "seen counts the records of the task: it is state, never the constant 0"


def test_tokens_taken_one_by_one_outside_a_loop(tmp_path):
    job = _job(tmp_path, """
      StringTokenizer itr = new StringTokenizer(value.toString());
      if (itr.hasMoreTokens()) {
        String first = itr.nextToken();
        String second = itr.hasMoreTokens() ? itr.nextToken() : "-";
        context.write(new Text(first + "/" + second), new IntWritable(1));
      }""", fields="")
    assert not _reasons(job), _reasons(job)
    dump = dump_plan(job.plan)
    assert "index(tokens(value), 0)" in dump and "index(tokens(value), 1)" in dump, dump


def test_a_token_taken_on_one_path_only_leaves_the_cursor_unknown(tmp_path):
    job = _job(tmp_path, """
      StringTokenizer itr = new StringTokenizer(value.toString());
      if (value.getLength() > 10 && itr.hasMoreTokens()) { itr.nextToken(); }
      context.write(new Text(itr.nextToken()), new IntWritable(1));""")
    assert any("depend on the path" in r for r in _reasons(job)), _reasons(job)


def test_a_token_skipped_where_there_may_be_none_is_declined(tmp_path):
    job = _job(tmp_path, """
      StringTokenizer itr = new StringTokenizer(value.toString());
      itr.nextToken();
      if (itr.hasMoreTokens()) { context.write(new Text(itr.nextToken()), new IntWritable(1)); }""")
    assert any("may be none" in r for r in _reasons(job)), _reasons(job)


def test_an_empty_map_is_named_as_such(tmp_path):
    job = _job(tmp_path, "      // to do")
    assert any("map() is empty" in r for r in _reasons(job)), _reasons(job)


def _pair_job(tmp_path, body: str, key: str = KEY, fields: str = "private Pair pair = new Pair();"):
    scan = scan_text(tmp_path, {"Main.java": job_source(body, fields=fields, map_out=("Pair", "IntWritable"),
                                                        out=("Pair", "IntWritable"), reducer_class=None,
                                                        extra_driver="job.setNumReduceTasks(0);")
                                .replace("public class Main {", "public class Main {\n" + key)})
    (job,) = scan.jobs
    return job


def test_a_key_field_set_and_written_under_the_same_guard_converts(tmp_path):
    job = _pair_job(tmp_path, """
      String[] f = value.toString().split(",");
      if (f.length > 1) {
        pair.setA(f[0]);
        pair.setB(f[1]);
        context.write(pair, new IntWritable(1));
      }""")
    assert not _reasons(job), _reasons(job)


OVERLOADED = KEY.replace("public void setA(String a) { this.a = a; }", """
    public Pair() { }
    public Pair(String a, String b) { this(new Text(a), new Text(b)); }
    public Pair(Text a, Text b) { this.a = a.toString(); this.b = b.toString(); }
    public Pair(int a, int b) { this.a = "#" + a; this.b = "#" + b; }
    public void setA(String a) { this.a = a; }""")


def test_constructor_overloads_are_picked_by_argument_type(tmp_path):
    job = _pair_job(tmp_path, """
      String[] f = value.toString().split(",");
      context.write(new Pair(f[0], f[1]), new IntWritable(1));
      context.write(new Pair(new Text(f[0]), new Text("x")), new IntWritable(2));
      context.write(new Pair(f.length, 7), new IntWritable(3));""", key=OVERLOADED, fields="")
    assert not _reasons(job), _reasons(job)
    dump = dump_plan(job.plan)
    assert "concat('#'" in dump, dump  # the (int, int) constructor for the third write


def test_a_helper_that_returns_a_default_when_parsing_fails(tmp_path):
    scan = scan_text(tmp_path, {"Main.java": job_source("""
      context.write(new Text("n"), new IntWritable(toInt(value.toString())));""",
        fields="""static int toInt(String s) {
      try {
        return Integer.parseInt(s.trim());
      } catch (NumberFormatException e) {
        e.printStackTrace();
        return -1;
      }
    }""", reducer_class=None, extra_driver="job.setNumReduceTasks(0);")})
    (job,) = scan.jobs
    assert not _reasons(job), _reasons(job)
    assert "or_default" in dump_plan(job.plan)


def test_the_key_of_an_input_format_not_converted_is_not_a_byte_offset(tmp_path):
    scan = scan_text(tmp_path, {"Main.java": job_source("""
      context.write(new Text(key.toString()), new IntWritable(1));""", reducer_class=None,
        extra_driver="job.setNumReduceTasks(0); job.setInputFormatClass(my.FileNameInputFormat.class);")})
    (job,) = scan.jobs
    reasons = _reasons(job)
    assert any("input format (not converted)" in r for r in reasons), reasons
    assert not job.plan.source.offsets


STOP_WORDS = """private static final Set<String> STOP = new HashSet<>(Arrays.asList("a", "the", "of"));
    private static final Set<String> MORE = new HashSet<>();
    static { MORE.add("and"); Collections.addAll(MORE, "or", "nor"); }
    private static final List<String> KEEP = Arrays.asList("x", "y", "x");"""


def test_constant_sets_and_lists_become_membership_tests(tmp_path):
    job = _job(tmp_path, """
      for (String w : value.toString().split(" ")) {
        if (STOP.contains(w) || MORE.contains(w)) continue;
        context.write(new Text(w + (KEEP.contains(w) ? "!" : "") + KEEP.size()), new IntWritable(MORE.size()));
      }""", fields=STOP_WORDS)
    assert not _reasons(job), _reasons(job)
    dump = dump_plan(job.plan)
    assert "isin(" in dump and "'nor'" in dump, dump


def test_a_collection_changed_in_map_is_not_a_constant(tmp_path):
    job = _job(tmp_path, """
      if (STOP.contains(value.toString())) { STOP.remove(value.toString()); }
      context.write(new Text(value.toString()), new IntWritable(1));""", fields=STOP_WORDS.replace("final ", ""))
    assert _reasons(job)


def test_contains_of_another_type_is_declined(tmp_path):
    job = _job(tmp_path, """
      if (NUMS.contains(value.getLength())) { context.write(new Text(value.toString()), new IntWritable(1)); }""",
               fields='private static final Set<Long> NUMS = new HashSet<>(Arrays.asList(1L, 2L));')
    assert any("false in Java" in r for r in _reasons(job)), _reasons(job)


def test_a_regex_pattern_from_an_argument_is_taken_in_its_place(tmp_path):
    """RegexMapper's pattern set from args[2]: the script takes args[2] there and hands it to the job
    (Hadoop parity: tests/unit/test_driver_arguments.py)."""
    src = job_source("", reducer_class=None).replace(
        "job.setMapperClass(M.class);", "job.setMapperClass(org.apache.hadoop.mapreduce.lib.map.RegexMapper.class);")
    src = src.replace('Job job = Job.getInstance(new Configuration(), "test job");',
                      'Configuration conf = new Configuration();\n    conf.set("mapreduce.mapper.regex", args[2]);\n'
                      '    Job job = Job.getInstance(conf, "test job");')
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    assert job.status == "converted", _reasons(job)
    assert [(p.name, p.position) for p in job.plan.params if p.position == 2] == [("mapreduce_mapper_regex", 2)]
    assert job.plan.arg_settings == (("mapreduce.mapper.regex", "mapreduce_mapper_regex"),)


def test_a_key_object_set_after_the_write_inside_a_loop_is_declined(tmp_path):
    job = _pair_job(tmp_path, """
      Pair p = new Pair();
      p.setA("first");
      p.setB("-");
      for (String w : value.toString().split(" ")) {
        context.write(p, new IntWritable(1));
        p.setA(w);
      }""", fields="")
    assert any("after a write" in r for r in _reasons(job)), _reasons(job)


def test_a_key_object_set_before_each_write_inside_a_loop_converts(tmp_path):
    job = _pair_job(tmp_path, """
      for (String w : value.toString().split(" ")) {
        pair.setA(w);
        pair.setB(value.toString());
        context.write(pair, new IntWritable(1));
      }""")
    assert not _reasons(job), _reasons(job)


def test_a_string_builder_only_appended_and_read_is_a_string(tmp_path):
    job = _job(tmp_path, """
      String[] f = value.toString().split(",");
      StringBuilder sb = new StringBuilder(f[0].trim());
      sb.append('|').append(f.length);
      if (f.length > 1) { sb.setLength(0); sb.append(f[1]); }
      context.write(new Text(sb.toString()), new IntWritable(sb.length()));""")
    assert not _reasons(job)
    assert any("StringBuilder `sb`" in n for n in job.plan.notes)


@pytest.mark.parametrize("body", [
    # a number given to the constructor is a capacity, not text
    """
      StringBuilder sb = new StringBuilder(16);
      sb.append(value.toString());
      context.write(new Text(sb.toString()), new IntWritable(1));""",
    # insert/reverse are not String operations
    """
      StringBuilder sb = new StringBuilder(value.toString());
      sb.reverse();
      context.write(new Text(sb.toString()), new IntWritable(1));""",
    # appended across loop iterations: the text is carried from one iteration to the next
    """
      StringBuilder sb = new StringBuilder();
      for (String w : value.toString().split(" ")) { sb.append(w); }
      context.write(new Text(sb.toString()), new IntWritable(1));""",
], ids=["capacity", "reverse", "appended_in_a_loop"])
def test_a_string_builder_used_otherwise_stays_a_builder(tmp_path, body):
    job = _job(tmp_path, body)
    assert not any("StringBuilder" in n and "a String" in n for n in job.plan.notes)
    assert _reasons(job)


def test_a_while_loop_stepping_an_index_is_a_for_each(tmp_path):
    job = _job(tmp_path, """
      String[] words = value.toString().split(" ");
      int i = 0;
      while (i < words.length) {
        String w = words[i];
        i++;
        if (w.isEmpty()) continue;
        context.write(new Text(w), new IntWritable(1));
      }""")
    assert not _reasons(job)
    assert any("while loop stepping a counter" in n for n in job.plan.notes)


@pytest.mark.parametrize("body", [
    # a continue before the step skips it in the while (here: forever), not in a for
    """
      String[] words = value.toString().split(" ");
      int i = 0;
      while (i < words.length) {
        if (words[i].isEmpty()) continue;
        context.write(new Text(words[i]), new IntWritable(1));
        i++;
      }""",
    # the counter is read after the loop
    """
      String[] words = value.toString().split(" ");
      int i = 0;
      while (i < words.length) { context.write(new Text(words[i]), new IntWritable(1)); i++; }
      context.write(new Text("n"), new IntWritable(i));""",
    # stepped twice
    """
      String[] words = value.toString().split(" ");
      int i = 0;
      while (i < words.length) { context.write(new Text(words[i]), new IntWritable(1)); i += 1; i++; }""",
], ids=["continue_before_the_step", "read_after_the_loop", "stepped_twice"])
def test_a_while_loop_that_is_not_a_plain_counter_is_left(tmp_path, body):
    job = _job(tmp_path, body)
    assert not any("while loop stepping a counter" in n for n in job.plan.notes)


def test_a_catch_that_gives_a_default_lets_the_record_go_on(tmp_path):
    job = _job(tmp_path, """
      int n = 0;
      try { n = Integer.parseInt(value.toString().trim()); } catch (NumberFormatException e) { n = -1; }
      context.write(new Text("n"), new IntWritable(n));""")
    assert not _reasons(job)
    assert any("takes the catch block's value where the try block threw" in n for n in job.plan.notes)


@pytest.mark.parametrize("body", [
    # two assignments: where the second throws, the first has happened
    """
      int a = 0, b = 0;
      try { a = Integer.parseInt(value.toString()); b = a * 2; } catch (NumberFormatException e) { }
      context.write(new Text("n"), new IntWritable(a + b));""",
    # the catch does something that is not a default, a counter or logging
    """
      int a = 0;
      try { a = Integer.parseInt(value.toString()); } catch (NumberFormatException e) { context.write(new Text("bad"), new IntWritable(1)); }
      context.write(new Text("n"), new IntWritable(a));""",
], ids=["two_assignments", "catch_writes"])
def test_a_catch_that_does_more_than_a_default_is_not_read_as_one(tmp_path, body):
    job = _job(tmp_path, body)
    assert not any("where the try block threw" in n for n in job.plan.notes)
    assert _reasons(job)


MAPS = """private static final Map<String, Integer> W = new HashMap<>();
    static { W.put("a", 1); W.put("b", 2); }"""


@pytest.mark.parametrize("body, fields, why", [
    ("context.write(new Text(\"x\" + W.get(value.toString())), new IntWritable(1));", MAPS, "may be null"),
    ("int w = W.get(value.toString());\n      context.write(new Text(\"x\"), new IntWritable(w));", MAPS, "unboxed"),
    ("context.write(new Text(\"x\"), new IntWritable(W.getOrDefault(value.toString(), 0)));",
     MAPS + "\n    static { W.remove(\"a\"); }", "collection kept across records"),
    ("context.write(new Text(\"x\"), new IntWritable(W.getOrDefault(7L, 0)));", MAPS, "equals() across boxed types"),
], ids=["get_read_as_a_value", "get_unboxed", "changed_after_filling", "key_of_another_type"])
def test_constant_map_reads_that_differ_are_declined(tmp_path, body, fields, why):
    job = _job(tmp_path, "      " + body, fields=fields)
    assert any(why in r for r in _reasons(job)), _reasons(job)


def test_a_missing_key_given_a_default_by_a_null_test_converts(tmp_path):
    job = _job(tmp_path, """
      String k = KINDS.get(value.toString());
      if (k == null) { k = "other"; }
      context.write(new Text(k), new IntWritable(W.getOrDefault(k, 0) + W.size()));""",
               fields=MAPS + '\n    private static final Map<String, String> KINDS = Map.of("a", "x", "b", "y");')
    assert not _reasons(job)


def _reducer_job(tmp_path, reduce_body: str, fields: str = ""):
    reducer = f"""
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {{
    {fields}
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {{
{reduce_body}
    }}
  }}"""
    scan = scan_text(tmp_path, {"Main.java": job_source(
        'context.write(new Text(value.toString()), new IntWritable(1));', reducer=reducer)})
    (job,) = scan.jobs
    return job


@pytest.mark.parametrize("body, agg", [
    ("""
      int total = 0;
      Iterator<IntWritable> it = values.iterator();
      while (it.hasNext()) {
        total += it.next().get();
      }
      context.write(key, new IntWritable(total));""", "sum"),
    ("""
      int n = 0;
      Iterator<IntWritable> it = values.iterator();
      for (; it.hasNext(); ) {
        n++;
        it.next();
      }
      context.write(key, new IntWritable(n));""", "count"),
    ("""
      Iterator<IntWritable> it = values.iterator();
      int best = Integer.MIN_VALUE;
      while (it.hasNext()) {
        IntWritable v = it.next();
        if (v.get() > best) best = v.get();
      }
      context.write(key, new IntWritable(best));""", "max"),
], ids=["next_in_an_expression", "next_only_moves_on", "next_into_a_local"])
def test_an_iterator_loop_over_the_values_is_a_for_each(tmp_path, body, agg):
    """JLS 14.14.2: the enhanced for over an Iterable is the hasNext()/next() loop."""
    job = _reducer_job(tmp_path, body)
    assert not _reasons(job), _reasons(job)
    assert any("iterator loop" in n for n in job.plan.notes)
    assert f"= {agg}" in dump_plan(job.plan), dump_plan(job.plan)


@pytest.mark.parametrize("body", [
    # the first value is taken before the loop: the iterator serves two readers
    """
      Iterator<IntWritable> it = values.iterator();
      int first = it.next().get();
      while (it.hasNext()) { first += it.next().get(); }
      context.write(key, new IntWritable(first));""",
    # a continue before next() would read the same value again in Java
    """
      int total = 0, i = 0;
      Iterator<IntWritable> it = values.iterator();
      while (it.hasNext()) { i++; if (i > 100) continue; total += it.next().get(); }
      context.write(key, new IntWritable(total));""",
    # next() only on some iterations
    """
      int total = 0;
      Iterator<IntWritable> it = values.iterator();
      while (it.hasNext()) { total += total > 10 ? 0 : it.next().get(); }
      context.write(key, new IntWritable(total));""",
    # the previous value object is read before next() refills it (Hadoop reuses it)
    """
      int total = 0;
      IntWritable prev = null;
      Iterator<IntWritable> it = values.iterator();
      while (it.hasNext()) { if (prev != null) total += prev.get(); prev = it.next(); }
      context.write(key, new IntWritable(total));""",
    # the iterator is used after the loop
    """
      int total = 0;
      Iterator<IntWritable> it = values.iterator();
      while (it.hasNext()) { total += it.next().get(); }
      context.write(key, new IntWritable(total + (it.hasNext() ? 1 : 0)));""",
], ids=["first_taken_before", "continue_before_next", "conditional_next", "reused_object_read_first",
        "iterator_read_after"])
def test_an_iterator_loop_that_is_not_a_for_each_is_left(tmp_path, body):
    job = _reducer_job(tmp_path, body)
    assert not any("iterator loop" in n for n in job.plan.notes)


def test_a_date_format_configured_in_setup_is_a_task_constant(tmp_path):
    job = _job(tmp_path, """
      try {
        Date when = fmt.parse(value.toString());
        SimpleDateFormat day = new SimpleDateFormat("yyyy-MM-dd");
        day.setTimeZone(TimeZone.getTimeZone("Europe/Berlin"));
        context.write(new Text(day.format(when)), new IntWritable(1));
      } catch (java.text.ParseException e) {
        return;
      }""", fields="""private SimpleDateFormat fmt;
    protected void setup(Context context) {
      fmt = new SimpleDateFormat("yyyy-MM-dd HH:mm");
      fmt.setTimeZone(TimeZone.getTimeZone("Europe/Berlin"));
      fmt.setLenient(false);
    }""")
    assert not _reasons(job), _reasons(job)
    assert any("configured" in n for n in job.plan.notes), job.plan.notes
    assert "date_parse?(value, 'yyyy-MM-dd HH:mm', False, 'Europe/Berlin')" in dump_plan(job.plan), dump_plan(job.plan)


@pytest.mark.parametrize("fields, body, why", [
    ("""private SimpleDateFormat fmt = new SimpleDateFormat("yyyy-MM-dd");
    protected void setup(Context context) { fmt.setTimeZone(TimeZone.getTimeZone("EST")); }""",
     "try { context.write(new Text(fmt.format(fmt.parse(value.toString()))), new IntWritable(1)); } "
     "catch (java.text.ParseException e) { return; }", "three-letter"),
    ("""private SimpleDateFormat fmt = new SimpleDateFormat("yyyy-MM-dd");
    private Calendar cal = Calendar.getInstance();
    protected void setup(Context context) { fmt.setTimeZone(TimeZone.getTimeZone("UTC")); }""",
     "try { cal.setTime(fmt.parse(value.toString())); context.write(new Text(\"y\"), new IntWritable(cal.get(Calendar.YEAR))); } "
     "catch (java.text.ParseException e) { return; }", "more than one time zone"),
], ids=["three_letter_zone", "calendar_in_the_default_zone"])
def test_date_formats_in_zones_the_script_cannot_run_in_are_declined(tmp_path, fields, body, why):
    job = _job(tmp_path, body, fields=fields)
    assert any(why in r for r in _reasons(job)), _reasons(job)


@pytest.mark.parametrize("body, why", [
    ("""
      String[] words = value.toString().split(" ");
      outer:
      for (String w : words) {
        for (String v : words) { if (v.equals(w)) break outer; }
        context.write(new Text(w), new IntWritable(1));
      }""", "label"),
    ("""
      String[] words = value.toString().split(" ");
      for (String w : words) {
        String t = w;
        t = t.trim();
        if (t.isEmpty()) break;
        context.write(new Text(t), new IntWritable(1));
      }""", "changed in the same iteration"),
], ids=["labelled_break", "break_after_a_local_changed"])
def test_a_break_the_converter_cannot_test_per_element_is_declined(tmp_path, body, why):
    job = _job(tmp_path, body)
    assert any(why in r for r in _reasons(job)), _reasons(job)


@pytest.mark.parametrize("cond, merged", [
    ('value.toString().startsWith("x")', True),
    ('key.get() > 3 && value.toString().isEmpty()', True),
    ('f[3].equals("x")', False),  # may throw where Java indexes past the end
    ('value.toString().length() / 0 > 1', False),  # divides
    ('value.toString().charAt(0) == \'x\'', False),  # charAt throws on an empty line
])
def test_an_if_with_the_same_branches_is_merged_only_when_its_test_cannot_throw(tmp_path, cond, merged):
    job = _job(tmp_path, f"""
      String[] f = value.toString().split(",");
      if ({cond}) {{
        context.write(new Text(f[0]), new IntWritable(1));
      }} else {{
        context.write(new Text(f[0]), new IntWritable(1));
      }}""")
    notes = [n for n in job.plan.notes if "branches are the same" in n]
    assert bool(notes) == merged, (notes, _reasons(job))


def test_boxing_constructors_are_value_of_except_where_compared_by_reference(tmp_path):
    """`new Integer(x)` gives the value Integer.valueOf(x) gives (Java SE 17 API docs: "in exactly
    the manner used by the parseInt method" for a String); only its identity is new, so an operand of
    `==` keeps its form (and the job is not called converted on it)."""
    body = ('      int n = new Integer(0);\n      double d = new Double(value.toString().length());\n'
            '      n += new Integer("7");\n      context.write(new Text("k" + d), new IntWritable(n));')
    (job,) = scan_text(tmp_path / "a", {"Main.java": job_source(body, reducer_class=None)}).jobs
    assert job.status == "converted", job.plan.hand_work
    for k, body in enumerate([
            '      Integer n = new Integer(value.getLength());\n      if (n == new Integer(3)) return;\n'
            '      context.write(value, new IntWritable(n));',
            # two new objects are never ==, whatever their values (Integer.valueOf's may be the same object)
            '      Integer a = new Integer(value.getLength());\n      Integer b = new Integer(value.getLength());\n'
            '      if (a == b) return;\n      context.write(value, new IntWritable(a));']):
        (job,) = scan_text(tmp_path / f"b{k}", {"Main.java": job_source(body, reducer_class=None)}).jobs
        assert job.status != "converted"


def test_a_lowering_rule_that_fails_leaves_the_class_as_written(tmp_path, monkeypatch):
    """A rule meeting a shape it was not written for must not stop the batch or half-rewrite a class."""
    import migrate.lower as lower

    def broken(cls, index=None):
        cls.node.methods[0].body = None  # a half-done rewrite, then a failure
        raise KeyError("unforeseen")

    monkeypatch.setattr(lower, "RULES", (lower.RULES[0], broken, *lower.RULES[1:]))
    body = "      context.write(new Text(value.toString().trim()), new IntWritable(1));"
    scan = scan_text(tmp_path, {"Main.java": job_source(body, reducer_class=None)})
    (mapper,) = [c for c in scan.index if c.name == "M"]
    assert mapper.lowered == [(mapper.line_start, "not lowered (test_lowering: KeyError)")]
    assert mapper.node.methods[0].body and scan.jobs[0].status == "converted"
