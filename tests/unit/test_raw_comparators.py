"""Raw comparators over a key's serialised bytes, read back to an order of its fields.

Facts relied on: WritableComparator.compareBytes compares unsigned bytes, first difference first
(WritableComparator source); DataOutput.writeInt/writeLong write big-endian two's complement
(DataOutput javadoc), so `f - Integer.MIN_VALUE` flips the sign bit and its unsigned order is f's
signed order; WritableComparator.define registers the comparator WritableComparator.get returns,
the job's default sort and grouping comparator (WritableComparator javadoc). The parity test runs
the job on Hadoop's local runner, with negative numbers, where a plain encoding would sort wrong.
"""
from __future__ import annotations

import pytest

from tests.helpers import HEADER, scan_text, verify_one_job

JOB = HEADER.replace("import java.io.IOException;", "import java.io.*;") + """
public class DockReadings {
  public static class DockMinute implements WritableComparable<DockMinute> {
    private int dock;
    private int minute;
    public DockMinute() {}
    public DockMinute(int dock, int minute) { this.dock = dock; this.minute = minute; }
    public int getDock() { return dock; }
    public int getMinute() { return minute; }
    public void write(DataOutput out) throws IOException {
      out.writeInt(dock - Integer.MIN_VALUE);
      out.writeInt(minute - Integer.MIN_VALUE);
    }
    public void readFields(DataInput in) throws IOException {
      dock = in.readInt() + Integer.MIN_VALUE;
      minute = in.readInt() + Integer.MIN_VALUE;
    }
    public int compareTo(DockMinute o) {
      if (dock != o.dock) return dock < o.dock ? -1 : 1;
      return minute == o.minute ? 0 : (minute < o.minute ? -1 : 1);
    }
    public int hashCode() { return dock * 157 + minute; }
    public boolean equals(Object o) { return o instanceof DockMinute && compareTo((DockMinute) o) == 0; }
    public String toString() { return dock + ":" + minute; }
    public static class Bytes extends WritableComparator {
      public Bytes() { super(DockMinute.class); }
      public int compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2) {
        return compareBytes(b1, s1, l1, b2, s2, l2);
      }
    }
    static { WritableComparator.define(DockMinute.class, new Bytes()); }
  }

  public static class SameDock implements RawComparator<DockMinute> {
    public int compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2) {
      return WritableComparator.compareBytes(b1, s1, Integer.SIZE / 8, b2, s2, Integer.SIZE / 8);
    }
    public int compare(DockMinute a, DockMinute b) { return Integer.compare(a.getDock(), b.getDock()); }
  }

  public static class M extends Mapper<LongWritable, Text, DockMinute, IntWritable> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split(" ");
      if (f.length == 3) {
        c.write(new DockMinute(Integer.parseInt(f[0]), Integer.parseInt(f[1])), new IntWritable(Integer.parseInt(f[2])));
      }
    }
  }

  public static class R extends Reducer<DockMinute, IntWritable, Text, IntWritable> {
    private static final Text RULE = new Text("-----");
    private final Text dock = new Text();
    protected void reduce(DockMinute key, Iterable<IntWritable> bikes, Context c) throws IOException, InterruptedException {
      c.write(RULE, null);
      dock.set("dock " + key.getDock());
      for (IntWritable b : bikes) {
        c.write(dock, b);
      }
    }
  }

  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "dock readings");
    job.setJarByClass(DockReadings.class);
    job.setMapperClass(M.class);
    job.setReducerClass(R.class);
    job.setGroupingComparatorClass(SameDock.class);
    job.setMapOutputKeyClass(DockMinute.class);
    job.setMapOutputValueClass(IntWritable.class);
    job.setOutputKeyClass(Text.class);
    job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""
# dock, minute, bikes: negative docks and minutes, where a plain writeInt would sort them last
READINGS = b"3 10 4\n3 -5 2\n-2 7 9\n3 0 1\n-2 -1 6\n12 5 0\n-2 7 3\nbad line\n0 2147483647 5\n0 -2147483648 8\n"


def _job(tmp_path, edit=lambda s: s):
    scan = scan_text(tmp_path, {"DockReadings.java": edit(JOB)})
    assert not scan.errors, scan.errors
    (job,) = scan.jobs
    return job


def test_a_registered_byte_comparator_and_a_byte_grouping_comparator_are_read(tmp_path):
    from migrate.plan import dump_expr

    job = _job(tmp_path)
    assert job.status == "converted", [(h.category, h.reason) for h in job.plan.hand_work]
    assert [(dump_expr(e), asc) for e, asc in job.plan.sink.sort_terms] == [("key.dock", True), ("key.minute", True)]
    assert [dump_expr(e) for e in job.plan.reduce.group] == ["key.dock"]


@pytest.mark.parametrize("edit, why", [
    (lambda s: s.replace("out.writeInt(dock - Integer.MIN_VALUE);", "out.writeInt(dock);"),
     "puts negative numbers after positive ones"),
    (lambda s: s.replace("Integer.SIZE / 8, b2, s2, Integer.SIZE / 8", "6, b2, s2, 6"), "end inside a field"),
    (lambda s: s.replace("return compareBytes(b1, s1, l1, b2, s2, l2);", "return compareBytes(b1, s1, 4, b2, s2, 4);"),
     "ignores `minute`"),
    (lambda s: s.replace("out.writeInt(minute - Integer.MIN_VALUE);", "out.writeInt(minute - Integer.MIN_VALUE);\n"
                                                                      "      out.writeUTF(\"v1\");"),
     "writes something other than a field"),
])
def test_byte_orders_that_are_not_field_orders_are_declined(tmp_path, edit, why):
    job = _job(tmp_path, edit)
    assert job.status != "converted"
    assert any(why in h.reason for h in job.plan.hand_work), [(h.category, h.reason) for h in job.plan.hand_work]


@pytest.mark.parity
def test_byte_comparators_agree_with_hadoop(tmp_path):
    check = verify_one_job(tmp_path, JOB, {"readings.txt": READINGS}, driver="DockReadings")
    assert check.verdict == "agrees", f"{check.detail}\n{check.log[-3000:]}"
