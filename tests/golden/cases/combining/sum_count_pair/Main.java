
import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

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
      c.write(k, new SumCount(s, n));
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
