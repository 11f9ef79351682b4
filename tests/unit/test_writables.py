"""Custom Writable keys and values: struct columns, toString() as the output text, compareTo()
as the output order; and the classes the reader must decline.

Facts relied on: Hadoop sorts map output keys with the key class's compareTo() when no raw
comparator is registered, and groups keys for which it returns 0 (WritableComparator javadoc);
a Writable carries across the shuffle only what write() writes and readFields() reads (Writable
javadoc); TextOutputFormat prints toString() (TextOutputFormat source); String.compareTo compares
UTF-16 code units (String javadoc); Text compares bytes (Text.Comparator).
"""
from __future__ import annotations

from migrate.plan import dump_plan
from tests.helpers import HEADER, scan_text

KEY = HEADER + """
public class Slot implements WritableComparable<Slot> {
  private String station; private int hour;
  public Slot() {}
  public Slot(String s, int h) { this.station = s; this.hour = h; }
  public void write(DataOutput out) throws IOException { out.writeUTF(station); out.writeInt(hour); }
  public void readFields(DataInput in) throws IOException { station = in.readUTF(); hour = in.readInt(); }
  public int compareTo(Slot o) { %s }
  public String toString() { return station + "/" + hour; }
}
""".replace("import java.io.IOException;", "import java.io.*;")
JOB = HEADER + """
public class Main {
  public static class M extends Mapper<LongWritable, Text, Slot, IntWritable> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split(",");
      c.write(new Slot(f[0], Integer.parseInt(f[1])), new IntWritable(1));
    }
  }
  public static class R extends Reducer<Slot, IntWritable, Slot, IntWritable> {
    protected void reduce(Slot k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      int n = 0; for (IntWritable v : vs) n += v.get();
      c.write(k, new IntWritable(n));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "slots");
    job.setMapperClass(M.class); job.setReducerClass(R.class);
    job.setOutputKeyClass(Slot.class); job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0])); FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""
CHAIN = "int c = station.compareTo(o.station); if (c != 0) return c; return Integer.compare(hour, o.hour);"


def _job(tmp_path, compare=CHAIN, key=KEY):
    scan = scan_text(tmp_path, {"Slot.java": key % compare, "Main.java": JOB})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job


def test_composite_key_becomes_a_struct_printed_by_to_string_and_sorted_by_compare_to(tmp_path):
    job = _job(tmp_path)
    assert job.status == "converted", job.plan.hand_work
    dump = dump_plan(job.plan)
    assert "Emit {station: index(f, 0), hour: parse_int(index(f, 1))} -> 1" in dump
    assert "Out concat(concat(key.station, '/'), to_string(key.hour)) -> @n" in dump
    # String.compareTo: UTF-16 order, then the hour as a number
    from migrate.plan import dump_expr

    assert [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms] == [("utf16_order(key.station)", True),
                                                                            ("key.hour", True)]


def test_descending_and_ternary_chains_are_read(tmp_path):
    job = _job(tmp_path, "int c = station.compareTo(o.station); return c != 0 ? c : Integer.compare(o.hour, hour);")
    from migrate.plan import dump_expr

    assert [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms] == [("utf16_order(key.station)", True),
                                                                            ("key.hour", False)]


def test_the_next_comparison_assigned_when_equal_is_the_same_chain(tmp_path):
    """`if (c == 0) c = next; return c;` orders exactly as `if (c != 0) return c; return next;`."""
    from migrate.plan import dump_expr

    for body in ("int c = station.compareTo(o.station); if (c == 0) { c = -Integer.compare(hour, o.hour); } return c;",
                 "int c = station.compareTo(o.station); if (c == 0) c = Integer.compare(o.hour, hour); return c;"):
        job = _job(tmp_path / str(len(body)), body)
        assert [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms] == [("utf16_order(key.station)", True),
                                                                                ("key.hour", False)]
    _declined(_job(tmp_path / "x", "int c = station.compareTo(o.station); if (c == 0) { c = 1; } return c;"),
              "compares something other than fields")


def test_relations_on_a_primitive_field_are_read_by_their_value_in_the_three_cases(tmp_path):
    """`a < b ? -1 : (a == b ? 0 : 1)` and `if (a < b) return -1; if (a > b) return 1; return 0;`
    order as Integer.compare(a, b) (Integer.compare javadoc: "the value 0 if x == y; a value less
    than 0 if x < y; and a value greater than 0 if x > y"); each spelling is evaluated for the
    left field less, equal and greater, so swapped operands and mirrored tests need no rule."""
    from migrate.plan import dump_expr

    head = "int c = station.compareTo(o.station); "
    cases = {
        head + "if (c == 0) { c = (hour < o.hour ? -1 : (hour == o.hour ? 0 : 1)); } return c;": True,
        head + "if (c != 0) return c; return o.hour > hour ? -1 : o.hour < hour ? 1 : 0;": True,
        head + "if (c != 0) return c; return hour > o.hour ? -1 : (hour < o.hour ? 1 : 0);": False,
        head + "if (c != 0) return c; if (hour < o.hour) return -1; if (hour > o.hour) return 1; return 0;": True,
        head + "if (c != 0) { return c; } if (hour > o.hour) { return -5; } else if (hour == o.hour) { return 0; } "
               "else { return 5; }": False,
        head + "if (c != 0) return c; if (hour < o.hour) { return -1; } return hour == o.hour ? 0 : 1;": True,
        "if (hour < o.hour) return -1; else if (o.hour < hour) return 1; return station.compareTo(o.station);": True,
    }
    for i, (body, ascending) in enumerate(cases.items()):
        job = _job(tmp_path / str(i), body)
        terms = [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms]
        want = ("key.hour", ascending)
        assert want in terms and len(terms) == 2, (body, terms, job.plan.hand_work)
    assert [dump_expr(e) for e, _ in _job(tmp_path / "first", list(cases)[-1]).plan.sink.sort_terms] == \
        ["key.hour", "utf16_order(key.station)"]


def test_relations_that_are_not_an_order_or_not_on_numbers_are_declined(tmp_path):
    head = "int c = station.compareTo(o.station); if (c != 0) return c; "
    # equal hours compare as less: not an order
    _declined(_job(tmp_path / "a", head + "return hour <= o.hour ? -1 : 1;"), "is not an order")
    # greater compares as equal
    _declined(_job(tmp_path / "b", head + "if (hour < o.hour) return -1; return 0;"), "returns (-1, 0, 0)")
    # equal hours compare as greater
    _declined(_job(tmp_path / "d", head + "if (hour == o.hour) return 1; return -1;"), "returns non-zero when equal")
    # a boxed Integer field: `==` would compare references
    boxed = KEY.replace("private int hour;", "private Integer hour;")
    _declined(_job(tmp_path / "c", head + "return hour < o.hour ? -1 : (hour == o.hour ? 0 : 1);", key=boxed),
              "compares something other than fields")


def test_a_key_with_a_registered_raw_comparator_is_not_sorted_by_compare_to(tmp_path):
    """WritableComparator.define(Slot.class, ...) makes WritableComparator.get(Slot.class), the job's
    default sort and grouping comparator, that comparator (WritableComparator javadoc)."""
    raw = KEY.replace("public Slot() {}", """public Slot() {}
  public static class Raw extends WritableComparator {
    public Raw() { super(Slot.class); }
    public int compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2) { return -compareBytes(b1, s1, l1, b2, s2, l2); }
  }
  static { WritableComparator.define(Slot.class, new Raw()); }""")
    _declined(_job(tmp_path, key=raw), "registers its own comparator (WritableComparator.define at Slot.java:")


def _declined(job, text):
    items = [h for h in job.plan.hand_work if h.category == "custom-writable"]
    assert items and text in items[0].reason, [(h.category, h.reason) for h in job.plan.hand_work]
    assert job.status != "converted"


def test_compare_to_that_ignores_a_field_is_declined(tmp_path):
    _declined(_job(tmp_path, "return station.compareTo(o.station);"), "ignores `hour`")


def test_compare_by_subtraction_is_declined(tmp_path):
    _declined(_job(tmp_path, "int c = station.compareTo(o.station); if (c != 0) return c; return hour - o.hour;"),
              "subtracts fields")


def test_a_field_that_is_not_serialised_is_declined(tmp_path):
    key = KEY.replace("out.writeInt(hour);", "")
    _declined(_job(tmp_path, key=key), "write() does not carry `hour`")


def test_a_key_without_to_string_is_declined(tmp_path):
    key = KEY.replace('public String toString() { return station + "/" + hour; }', "")
    _declined(_job(tmp_path, key=key), "no toString()")


def test_a_string_field_left_null_by_the_constructor_is_declined(tmp_path):
    # DataOutput.writeUTF(null) throws NullPointerException (DataOutputStream javadoc)
    key = KEY.replace("public Slot(String s, int h) { this.station = s; this.hour = h; }",
                      "public Slot(String s, int h) { this.hour = h; }")
    job = _job(tmp_path, key=key)
    assert job.status != "converted"
    assert any("left null" in h.reason for h in job.plan.hand_work), [h.reason for h in job.plan.hand_work]


def test_a_simple_class_name_resolves_as_javac_does_when_two_packages_share_it(tmp_path):
    """Two repository Writables named Slot: the job's own package wins (JLS 6.4.1, a type in the
    same package shadows nothing imported on demand; no import names the other one)."""
    other = ("package elsewhere;\n" + KEY % CHAIN).replace("private String station; private int hour;",
                                                           "private int hour; private String station;") \
        .replace("public Slot(String s, int h) { this.station = s; this.hour = h; }",
                 "public Slot(int h, String s) { this.station = s; this.hour = h; }")
    own = "package here;\n" + KEY % CHAIN
    scan = scan_text(tmp_path, {"elsewhere/Slot.java": other, "here/Slot.java": own,
                                "here/Main.java": "package here;\n" + JOB})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    assert job.status == "converted", job.plan.hand_work
    assert "struct:here.Slot" in {e.key.jtype for p in job.plan.map_steps for e in getattr(p, "emits", ())}
