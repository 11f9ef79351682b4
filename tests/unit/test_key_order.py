"""Sort comparators over Text, IntWritable and LongWritable keys: the keys' own order or its reverse.

Facts relied on: LongWritable.DecreasingComparator sorts longs largest first (its javadoc: "A
decreasing Comparator optimized for LongWritable"); a WritableComparator built with
createInstances=true deserialises both keys and calls compare(a, b) (WritableComparator javadoc);
IntWritable/LongWritable/Text compareTo is their number's / bytes' order (their javadoc). Each
reading is also run against Hadoop's local runner below.
"""
from __future__ import annotations

from tests.helpers import job_source, scan_text, verify_one_job

DESC = """  public static class Desc extends WritableComparator {
    protected Desc() { super(IntWritable.class%s); }
    %s
  }
"""
OBJECTS = "public int compare(WritableComparable a, WritableComparable b) { %s }"
RAW = "public int compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2) { %s }"
MAP = """      String[] f = value.toString().split(",");
      context.write(new IntWritable(Integer.parseInt(f[1])), new Text(f[0]));"""


def _job(tmp_path, compare: str, create: str = ", true", comparator: str = "Desc.class", key="IntWritable"):
    src = job_source(MAP.replace("IntWritable", key).replace("Integer.parseInt", "Long.parseLong" if key ==
                                                                 "LongWritable" else "Integer.parseInt"),
                     DESC % (create, compare) if comparator == "Desc.class" else "",
                     extra_driver=f"job.setSortComparatorClass({comparator});", map_out=(key, "Text"),
                     out=(key, "Text"), reducer_class=None)
    return src.replace("import java.util.*;", "import java.util.*;\nimport org.apache.hadoop.io.*;")


def _order(tmp_path, *args, **kw):
    (job,) = scan_text(tmp_path, {"Main.java": _job(tmp_path, *args, **kw)}).jobs
    items = [h.reason for h in job.plan.hand_work if h.category == "secondary-sort"]
    return [asc for _, asc in job.plan.sink.sort_terms] if not items else items[0]


def test_reverse_and_natural_orders_are_read_in_their_spellings(tmp_path):
    forms = {
        OBJECTS % "return b.compareTo(a);": [False],
        OBJECTS % "return -1 * a.compareTo(b);": [False],
        OBJECTS % "return -super.compare(a, b);": [False],
        OBJECTS % "IntWritable x = (IntWritable) a; IntWritable y = (IntWritable) b; return y.compareTo(x);": [False],
        OBJECTS % "return ((IntWritable) a).compareTo((IntWritable) b);": [],  # the natural order: nothing to do
        RAW % "return -super.compare(b1, s1, l1, b2, s2, l2);": [False],
        RAW % "return super.compare(b2, s2, l2, b1, s1, l1);": [False],
    }
    for i, (body, want) in enumerate(forms.items()):
        assert _order(tmp_path / str(i), body) == want, body


def test_comparators_that_do_not_read_as_an_order_of_the_key_are_declined(tmp_path):
    # without createInstances the shuffle's byte compare has no key objects to fill
    assert "createInstances" in _order(tmp_path / "a", OBJECTS % "return b.compareTo(a);", create="")
    # comparing the serialised bytes of an int is not its numeric order (sign byte)
    assert "not one comparison" in _order(tmp_path / "b", RAW % "return compareBytes(b1, s1, l1, b2, s2, l2);")
    assert "not one comparison" in _order(tmp_path / "c", OBJECTS % "return a.hashCode() - b.hashCode();")


def test_hadoops_decreasing_comparator_is_the_reverse_order(tmp_path):
    assert _order(tmp_path / "a", "", comparator="LongWritable.DecreasingComparator.class", key="LongWritable") == [False]
    assert "compares LongWritable keys" in _order(tmp_path / "b", "",
                                                  comparator="LongWritable.DecreasingComparator.class")


COUNTS = b"quay,12\nmill,-3\nbell,7\nlantern,0\nharbour,250\nferry,-40\n"


def test_reverse_orders_agree_with_hadoop(tmp_path):
    """Hadoop's local runner and local Spark: identity reduce, keys largest first (negative keys too)."""
    check = verify_one_job(tmp_path / "a", _job(tmp_path, OBJECTS % "return -1 * a.compareTo(b);"),
                           {"counts.txt": COUNTS})
    assert check.verdict == "agrees", check
    check = verify_one_job(tmp_path / "b", _job(tmp_path, "", comparator="LongWritable.DecreasingComparator.class",
                                                key="LongWritable"), {"counts.txt": COUNTS})
    assert check.verdict == "agrees", check
