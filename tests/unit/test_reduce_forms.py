"""Reducers written in other authors' forms, against the real thing: each job is converted, then
`mrlift verify` runs the original on Hadoop's local runner and the script on local Spark over the
same input; the outputs must agree."""
from __future__ import annotations

from pathlib import Path

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


# ---------------------------------------------------------------- the first value of a secondary sort
BOARD = Path(__file__).resolve().parent.parent / "golden" / "cases" / "secondary_sort" / "departure_board"
FOR_EACH = """            for (Text ride : rides) {
                // the key moves with the values: here it is this ride's own station and time
                context.write(new Text(key.getStation() + " " + key.getStartedAt()), ride);
            }"""
LATEST_THEN_REST = """            Iterator<Text> it = rides.iterator();
            Text latest = new Text(it.next());  // the sort puts the latest ride first
            while (it.hasNext()) {
                Text earlier = it.next();
                context.write(new Text(key.getStation() + " after " + latest), earlier);
            }"""
RIDES = ("ride_id,bike,start_station,end_station,started_at\n"
         "r1,b1,Quayside,Old Mill,2024-05-01 08:15\nr2,b2,Old Mill,Quayside,2024-05-01 08:40\n"
         "r3,b3,Quayside,Lantern Sq,2024-05-01 09:05\nr4,b4,Ærøskøbing,Quayside,2024-05-01 08:00\n"
         "r5,b5,Quayside,Old Mill,2024-05-01 07:30\nr6,b6,Old Mill,Lantern Sq,2024-05-02 23:59\n")


def _board(reducer_body: str, edit=lambda s: s) -> dict[str, str]:
    files = {p.name: p.read_text(encoding="utf-8") for p in BOARD.glob("*.java")}
    board = files["DepartureBoard.java"].replace(FOR_EACH, reducer_body)
    files["DepartureBoard.java"] = edit(board.replace("import java.io.IOException;",
                                                      "import java.io.IOException;\nimport java.util.Iterator;"))
    return files


def test_the_first_value_of_a_secondary_sort_group_is_read(tmp_path):
    (job,) = scan_text(tmp_path, _board(LATEST_THEN_REST)).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert job.plan.reduce.first_value and len(job.plan.reduce.group) == 1 and len(job.plan.reduce.order) == 2


@pytest.mark.parametrize("body, why", [
    (LATEST_THEN_REST.replace("new Text(it.next())", "it.next()"), "holds the value object itself"),
    (LATEST_THEN_REST.replace("while (it.hasNext()) {\n                Text earlier = it.next();",
                              "for (Text earlier : rides) {"), "a for-each over the values after taking the first"),
    (LATEST_THEN_REST.replace("Text earlier = it.next();", "Text earlier = it.next(); it.next();"),
     "exactly one value per iteration"),
])
def test_first_value_forms_that_are_declined(tmp_path, body, why):
    (job,) = scan_text(tmp_path, _board(body)).jobs
    assert job.status != "converted" and any(why in h.reason for h in job.plan.hand_work), job.plan.hand_work


def test_without_a_grouping_comparator_the_first_value_is_not_defined(tmp_path):
    files = _board(LATEST_THEN_REST, lambda s: s.replace("job.setGroupingComparatorClass(SameStation.class);", ""))
    (job,) = scan_text(tmp_path, files).jobs
    (item,) = [h for h in job.plan.hand_work if h.category == "value-order"]
    assert "which value is first was not defined" in item.reason


@pytest.mark.parity
def test_the_first_value_of_a_group_agrees_with_hadoop(tmp_path):
    files = _board(LATEST_THEN_REST)
    check = verify_one_job(tmp_path, files.pop("DepartureBoard.java"), {"rides.csv": RIDES.encode()},
                           driver="DepartureBoard", more=files)
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


def test_a_first_key_shared_by_two_values_stops_the_script(spark):
    """Hadoop would take either of them; the script refuses to pick one (a later tie is fine)."""
    from pyspark.sql import Window
    from pyspark.sql import functions as F

    from migrate.gen.pyspark import _call_position_code
    from migrate.plan import NO_SPAN, EachValue

    def run(rows):
        df = spark.createDataFrame(rows, "key struct<station:string,at:string>, value string")
        station, at = F.col("key")["station"], F.col("key")["at"]
        scope = {"F": F, "group_order": Window.partitionBy(station).orderBy(at.desc()),
                 "same_key": Window.partitionBy(station, at), "whole_group": Window.partitionBy(station),
                 "map_output": df}
        lines = _call_position_code(EachValue(NO_SPAN, "", (), first_value=True))
        code = "".join(line.strip() for line in lines if not line.strip().startswith("#"))
        rows = eval("map_output" + code, scope).where(F.col("_place") > 1)  # the loop's rows: from the second
        return sorted((r["first_value"], r["value"]) for r in rows.collect())

    assert run([(("Quay", "09:00"), "r1"), (("Quay", "08:00"), "r2"), (("Quay", "08:00"), "r3")]) == [
        ("r1", "r2"), ("r1", "r3")]
    with pytest.raises(Exception, match="first value of a group is not defined"):
        run([(("Quay", "09:00"), "r1"), (("Quay", "09:00"), "r2"), (("Quay", "08:00"), "r3")])


# ---------------------------------------------------------------- writes once per reduce() call
AROUND_THE_RIDES = """            context.write(new Text("== " + key.getStation() + " from " + key.getStartedAt()), new Text(""));
            for (Text ride : rides) {
                context.write(new Text(key.getStation() + " " + key.getStartedAt()), ride);
            }
            context.write(new Text("-- " + key.getStation() + " down to " + key.getStartedAt()), new Text("end"));"""

PER_KEY_LIST = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      context.write(new Text("[" + key + "]"), new Text("rides listed below"));
      for (IntWritable v : values) {
        if (v.get() > 2) context.write(key, new Text("ride of " + v.get()));
      }
      context.write(new Text("[/" + key + "]"), new Text(""));
    }
  }"""


def test_writes_before_and_after_the_loop_are_once_per_call(tmp_path):
    (job,) = scan_text(tmp_path, _board(AROUND_THE_RIDES)).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    r = job.plan.reduce
    assert (len(r.before), len(r.emits), len(r.after)) == (1, 1, 1) and not r.first_value


def test_a_figure_of_all_values_written_after_a_writing_loop_is_declined(tmp_path):
    body = PER_KEY_LIST.replace('context.write(new Text("[/" + key + "]"), new Text(""));',
                                'context.write(new Text("[/" + key + "]"), new Text("" + n));').replace(
        "for (IntWritable v : values) {", "int n = 0;\n      for (IntWritable v : values) {\n        n++;")
    (job,) = scan_text(tmp_path, {"Main.java": _source(body)}).jobs
    assert any("a figure of all the values" in h.reason for h in job.plan.hand_work), job.plan.hand_work


@pytest.mark.parity
def test_writes_around_the_loop_of_a_secondary_sort_agree_with_hadoop(tmp_path):
    files = _board(AROUND_THE_RIDES)
    check = verify_one_job(tmp_path, files.pop("DepartureBoard.java"), {"rides.csv": RIDES.encode()},
                           driver="DepartureBoard", more=files)
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


@pytest.mark.parity
def test_writes_around_the_loop_of_a_plain_key_agree_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, _source(PER_KEY_LIST), {"rides.txt": DOCKS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


# ---------------------------------------------------------------- side outputs made and closed, never written
SIDE_OUTPUTS = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    private org.apache.hadoop.mapreduce.lib.output.MultipleOutputs<Text, Text> byDay;
    @Override
    protected void setup(Context context) throws IOException, InterruptedException {
      byDay = new org.apache.hadoop.mapreduce.lib.output.MultipleOutputs<>(context);
      super.setup(context);
    }
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      int total = 0;
      for (IntWritable v : values) total += v.get();
      context.write(key, new Text("" + total));
      // byDay.write(key, new Text("" + total), "days");
    }
    @Override
    protected void cleanup(Context context) throws IOException, InterruptedException {
      this.byDay.close();
      super.cleanup(context);
    }
  }"""


def test_side_outputs_never_written_leave_setup_and_cleanup_empty(tmp_path):
    (job,) = scan_text(tmp_path, {"Main.java": _source(SIDE_OUTPUTS)}).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert any("never written to" in n for n in job.notes)


def test_side_outputs_that_are_written_stay_hand_work(tmp_path):
    written = SIDE_OUTPUTS.replace("// byDay.write", "byDay.write")
    (job,) = scan_text(tmp_path, {"Main.java": _source(written)}).jobs
    assert job.status != "converted"
    assert {h.category for h in job.plan.hand_work} & {"task-lifecycle", "reduce-logic"}


@pytest.mark.parity
def test_side_outputs_never_written_agree_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, _source(SIDE_OUTPUTS), {"rides.txt": DOCKS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


# ---------------------------------------------------------------- if/else in the loop; keys of the values
IF_ELSE = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      for (IntWritable v : values) {
        String[] parts = key.toString().split(" ");
        if (v.get() > 3) {
          if (parts.length > 2) context.write(new Text(parts[2] + "#" + v.get()), new Text("busy " + parts[0]));
        } else
          context.write(new Text(parts[0] + "#" + v.get()), new Text("quiet"));
      }
    }
  }"""


def test_if_else_in_the_loop_and_keys_made_from_values_compare_as_lines(tmp_path):
    from migrate.report.render import comparison_of

    (job,) = scan_text(tmp_path, {"Main.java": _source(IF_ELSE)}).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    # one key's lines come in no defined order and each has a key of its own value: only a multiset is defined
    assert comparison_of(job) == "lines"
    (job,) = scan_text(tmp_path / "k", {"Main.java": _source(KEY_LOCALS)}).jobs
    assert comparison_of(job) == "bytes"


@pytest.mark.parity
def test_if_else_in_the_loop_agrees_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, _source(IF_ELSE), {"rides.txt": DOCKS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


# ---------------------------------------------------------------- the same statements in both branches
SAME_BRANCHES = KEY_LOCALS.replace("""      for (IntWritable v : values) {
        total += v.get();
      }""", """      if (key.equals("Quay North 2024-05-01")) {  // a Text never equals a String; both branches agree anyway
        for (IntWritable v : values) {
          total += v.get();
        }
      } else {
        for (IntWritable v : values) {
          total += v.get();
        }
      }""")


def test_an_if_with_the_same_branches_is_its_branch(tmp_path):
    (job,) = scan_text(tmp_path, {"Main.java": _source(SAME_BRANCHES)}).jobs
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    differ = SAME_BRANCHES.replace("} else {\n        for (IntWritable v : values) {\n          total += v.get();",
                                   "} else {\n        for (IntWritable v : values) {\n          total += 2 * v.get();")
    (job,) = scan_text(tmp_path / "d", {"Main.java": _source(differ)}).jobs
    assert job.status != "converted"  # the test matters then, and Text.equals(String) is declined


@pytest.mark.parity
def test_the_same_branches_agree_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, _source(SAME_BRANCHES), {"rides.txt": DOCKS})
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"


def test_the_first_value_without_a_secondary_sort_is_declined_at_its_line(tmp_path):
    """`values.iterator().next()` is whichever value Hadoop hands over first: no defined order
    without a secondary sort (Reducer javadoc: the framework groups values by key, their order
    within a key is not defined unless a secondary sort sets it)."""
    body = "context.write(values.iterator().next(), key);"
    src = job_source("context.write(new IntWritable(1), value);",
                     "  public static class R extends Reducer<IntWritable, Text, Text, IntWritable> {\n"
                     "    protected void reduce(IntWritable key, Iterable<Text> values, Context context)\n"
                     "        throws IOException, InterruptedException {\n"
                     f"      {body}\n    }}\n  }}",
                     map_out=("IntWritable", "Text"), out=("Text", "IntWritable"))
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    (item,) = [h for h in job.plan.hand_work if h.category == "value-order"]
    assert "no defined order" in item.reason and item.snippet == body, item


KEY_TESTS = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      if (key.toString().startsWith("#")) {
        return;
      }
      if (key.getLength() > 4) {
        int rides = 0;
        for (IntWritable v : values) {
          rides += v.get();
        }
        context.write(key, new IntWritable(rides));
      }
    }
  }"""


def test_tests_of_the_key_before_the_work_keep_only_those_keys(tmp_path):
    """`if (t) return;` first, or the whole body inside `if (t)`: reduce() does nothing for keys
    failing a test that reads only the key, as if their rows never reached it (Hadoop parity)."""
    src = job_source(MAP_DOCK_DAY, KEY_TESTS)
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    assert job.status == "converted", job.plan.hand_work
    from migrate.plan import dump_expr

    assert dump_expr(job.plan.reduce.keys).count("&&") == 1
    data = DOCKS + b"#Quay North 2024-05-01,9\n#x,1\nMill,3\n"
    assert verify_one_job(tmp_path / "verify", src, {"rides.txt": data}).verdict == "agrees"


def test_a_test_that_reads_the_values_is_not_a_key_test(tmp_path):
    body = KEY_TESTS.replace('key.toString().startsWith("#")', "values.iterator().hasNext()")
    (job,) = scan_text(tmp_path, {"Main.java": job_source(MAP_DOCK_DAY, body)}).jobs
    assert job.status != "converted"


COUNTING = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      if (key.toString().startsWith("Old")) {
        context.getCounter("docks", "old town").increment(1);
      }
      int rides = 0;
      for (IntWritable v : values) {
        rides += v.get();
        if (v.get() > 3) {
          context.getCounter("docks", "busy hours").increment(1);
        }
      }
      if (rides > 5) {
        context.getCounter("docks", "busy days").increment(rides);
      }
      context.write(key, new IntWritable(rides));
    }
  }"""


def test_counters_of_reduce_agree_with_hadoops_job_log(tmp_path):
    """Once per key before the loop, once per value in it, once per key after it on the total:
    mrlift verify compares the script's counter report with the counters in Hadoop's job log."""
    src = job_source(MAP_DOCK_DAY, COUNTING)
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert len(job.plan.reduce.counts) == 2
    check = verify_one_job(tmp_path / "verify", src, {"rides.txt": DOCKS})
    assert check.verdict == "agrees" and not check.counters, check


def test_counters_a_combiner_updates_too_are_named_and_not_compared(tmp_path):
    """The reducer as its own combiner: Hadoop's counts include the combiner's runs, whose number
    is not defined; the job converts (its lines are the same) with a finding."""
    src = job_source(MAP_DOCK_DAY, COUNTING, extra_driver="job.setCombinerClass(R.class);")
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    (f,) = [f for f in job.plan.findings if f.category == "combiner-counters"]
    assert "docks:old town" in f.message and "docks:busy hours" in f.message
    check = verify_one_job(tmp_path / "verify", src, {"rides.txt": DOCKS})
    assert check.verdict == "agrees", check


HELPERS = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    private int busy(Iterable<IntWritable> rides, int above) {
      int n = 0;
      Iterator<IntWritable> it = rides.iterator();
      while (it.hasNext()) {
        if (it.next().get() > above) {
          n++;
        }
      }
      return n;
    }

    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      int n = 100;
      int hours = busy(values, 3);
      context.write(key, new Text(hours + "/" + n));
    }
  }"""


def test_values_handed_to_a_helper_read_as_its_statements_in_reduce(tmp_path):
    """The helper's loop is reduce()'s loop: its parameters bound to the call's arguments, its
    local `n` renamed apart from reduce()'s own `n` (Hadoop parity)."""
    src = job_source(MAP_DOCK_DAY, HELPERS, out=("Text", "Text"))
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert any("the values handed to busy()" in n for n in job.plan.notes)
    assert verify_one_job(tmp_path / "verify", src, {"rides.txt": DOCKS}).verdict == "agrees"


@pytest.mark.parametrize("call", ["key.getLength() > 0 ? busy(values, 3) : 0", "busy(values, n)"])
def test_a_helper_call_that_may_not_run_or_reads_a_local_later_stays_as_written(tmp_path, call):
    body = HELPERS.replace("int hours = busy(values, 3);", f"int hours = {call};")
    if "values, n)" in call:  # an argument that is a local is fine; make the helper return early instead
        body = body.replace("      return n;\n", "      if (n > 1) { return 1; }\n      return n;\n")
    (job,) = scan_text(tmp_path, {"Main.java": job_source(MAP_DOCK_DAY, body, out=("Text", "Text"))}).jobs
    assert job.status != "converted"
    assert not any("the values handed to" in n for n in job.plan.notes)


FIRST_FLAG = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      boolean first = true;
      int fewest = 0;
      for (IntWritable v : values) {
        if (first || v.get() < fewest) {
          fewest = v.get();
          first = false;
        }
      }
      context.write(key, new IntWritable(fewest));
    }
  }"""


def test_a_first_value_flag_starts_the_running_min(tmp_path):
    """`boolean first = true; ... if (first || v < min) { min = v; first = false; }`: the initial 0
    never counts, so all-positive values give their own minimum (Hadoop parity)."""
    src = job_source(MAP_DOCK_DAY, FIRST_FLAG)
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    assert job.status == "converted", job.plan.hand_work
    (agg,) = job.plan.reduce.aggs
    assert (agg.fn, agg.init) == ("min", None)
    assert verify_one_job(tmp_path / "verify", src, {"rides.txt": DOCKS}).verdict == "agrees"
    # read anywhere else, the flag is not just "the first value"
    other = FIRST_FLAG.replace("context.write(key, new IntWritable(fewest));",
                               "if (!first) context.write(key, new IntWritable(fewest));")
    (job,) = scan_text(tmp_path / "other", {"Main.java": job_source(MAP_DOCK_DAY, other)}).jobs
    assert job.status != "converted" or job.plan.reduce.aggs[0].init is not None


MEDIAN = """
  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      List<Integer> rides = new ArrayList<>();
      for (IntWritable v : values) {
        rides.add(v.get());
      }
      Collections.sort(rides);
      int n = rides.size();
      double median = n % 2 == 1 ? rides.get(n / 2) : (rides.get(n / 2 - 1) + rides.get(n / 2)) / 2.0;
      context.write(key, new Text(n + " " + median + " " + rides.get(0) + ".." + rides.get(n - 1)));
    }
  }"""


def test_values_gathered_in_a_list_then_sorted_give_a_median(tmp_path):
    """A List of the values sorted with Collections.sort (Integer's natural order, Collections.sort
    javadoc) is the sorted array of the values: size, get(i) and the median agree with Hadoop."""
    src = job_source(MAP_DOCK_DAY, MEDIAN, out=("Text", "Text"))
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert [a.fn for a in job.plan.reduce.aggs] == ["collect_sorted"]
    data = DOCKS + b"Old Mill 2024-05-02,-4\nOld Mill 2024-05-02,9\nQuay North 2024-05-01,2\n"
    assert verify_one_job(tmp_path / "verify", src, {"rides.txt": data}).verdict == "agrees"


def test_a_list_of_values_read_by_position_without_sorting_is_not_deterministic(tmp_path):
    body = MEDIAN.replace("      Collections.sort(rides);\n", "")
    (job,) = scan_text(tmp_path, {"Main.java": job_source(MAP_DOCK_DAY, body, out=("Text", "Text"))}).jobs
    assert [h.category for h in job.plan.hand_work] == ["value-order"]


# ---------------------------------------------------------------- the last value assigned in the loop
LAST_VALUE = """
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      int rides = -1;
      for (IntWritable v : values) {
        rides = v.get();
      }
      context.write(key, new IntWritable(rides * 10));
    }
  }"""


def test_the_last_value_assigned_is_the_keys_one_value_checked_at_run_time(tmp_path):
    """`x = v.get()` keeps the last value, and Hadoop defines no order of a key's values (Reducer
    javadoc: values are sorted only with a secondary sort): the script takes the value where all
    of a key's values agree, and stops where they differ. Hadoop's local runner agrees on the first."""
    src = job_source(MAP_DOCK_DAY, LAST_VALUE)
    (job,) = scan_text(tmp_path / "scan", {"Main.java": src}).jobs
    assert job.status == "converted", job.plan.hand_work
    assert [a.fn for a in job.plan.reduce.aggs] == ["only"]
    one_each = b"Quay North 2024-05-01,4\nOld Mill 2024-05-02,7\nQuay North 2024-05-01,4\nbad\nLantern,x\n"
    assert verify_one_job(tmp_path / "agree", src, {"rides.txt": one_each}).verdict == "agrees"
    check = verify_one_job(tmp_path / "differ", src, {"rides.txt": DOCKS})  # Old Mill: 7 and 2
    assert (check.verdict, check.detail) == ("error", "the script failed (exit 1)"), check.detail
    assert "Main.java:" in check.log and "Main.java:34 `rides`: takes different values under one key" in check.log


@pytest.mark.parametrize("change", ["if (v.get() > 0) { rides = v.get(); }", "rides = v.get() / 2.0;"])
def test_a_last_value_under_a_condition_or_of_a_double_stays_declined(tmp_path, change):
    body = LAST_VALUE.replace("rides = v.get();", change)
    if "2.0" in change:
        body = body.replace("int rides = -1;", "double rides = -1;").replace("rides * 10", "(int) rides")
    (job,) = scan_text(tmp_path, {"Main.java": job_source(MAP_DOCK_DAY, body)}).jobs
    assert [h.category for h in job.plan.hand_work] == ["value-order"], job.plan.hand_work
    assert "keeps the last value" in job.plan.hand_work[0].reason
