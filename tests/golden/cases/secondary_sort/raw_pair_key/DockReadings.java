
import java.io.*;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

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
