"""A job averaging with a (sum, count) Writable and a combiner that sums both fields."""
from tests.helpers import HEADER

PAIR = HEADER.replace("import java.io.IOException;", "import java.io.*;") + """
public class SumCount implements Writable {
  private long sum; private long count;
  public SumCount() {}
  public SumCount(long s, long c) { sum = s; count = c; }
  public long getSum() { return sum; }
  public long getCount() { return count; }
  public void write(DataOutput out) throws IOException { out.writeLong(sum); out.writeLong(count); }
  public void readFields(DataInput in) throws IOException { sum = in.readLong(); count = in.readLong(); }
  public String toString() { return sum + "," + count; }
}
"""
JOB = HEADER + """
public class Main {
  public static class M extends Mapper<LongWritable, Text, Text, SumCount> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split(",");
      c.write(new Text(f[0]), new SumCount(Long.parseLong(f[1]), 1));
    }
  }
  public static class C extends Reducer<Text, SumCount, Text, SumCount> {
    protected void reduce(Text k, Iterable<SumCount> vs, Context c) throws IOException, InterruptedException {
      long s = 0; long n = 0;
      for (SumCount v : vs) { s += v.getSum(); n += v.getCount(); }
      c.write(k, %COMBINED%);
    }
  }
  public static class R extends Reducer<Text, SumCount, Text, DoubleWritable> {
    protected void reduce(Text k, Iterable<SumCount> vs, Context c) throws IOException, InterruptedException {
      long s = 0; long n = 0;
      for (SumCount v : vs) { s += v.getSum(); n += v.getCount(); }
      c.write(k, new DoubleWritable((double) s / n));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "avg");
    job.setMapperClass(M.class); job.setCombinerClass(C.class); job.setReducerClass(R.class);
    job.setMapOutputKeyClass(Text.class); job.setMapOutputValueClass(SumCount.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(DoubleWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0])); FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""


def job_files(combiner_writes: str = "new SumCount(s, n)") -> dict[str, str]:
    return {"SumCount.java": PAIR, "Main.java": JOB.replace("%COMBINED%", combiner_writes)}
