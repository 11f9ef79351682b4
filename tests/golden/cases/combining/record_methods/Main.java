import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Per dock: bikes docked and undocked (total, times), kept in a DockFlow record through its methods. */
public class Main {
  public static class M extends Mapper<LongWritable, Text, Text, DockFlow> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split(",");
      DockFlow flow = new DockFlow();
      if (f[1].equals("in")) {
        flow.addDocked(Long.parseLong(f[2]), 1);
      } else if (f[1].equals("out")) {
        flow.addUndocked(Long.parseLong(f[2]), 1);
      }
      c.write(new Text(f[0]), flow);
    }
  }
  public static class C extends Reducer<Text, DockFlow, Text, DockFlow> {
    protected void reduce(Text k, Iterable<DockFlow> vs, Context c) throws IOException, InterruptedException {
      DockFlow all = new DockFlow();
      for (DockFlow v : vs) all.add(v);
      c.write(k, all);
    }
  }
  public static class R extends Reducer<Text, DockFlow, Text, Text> {
    protected void reduce(Text k, Iterable<DockFlow> vs, Context c) throws IOException, InterruptedException {
      DockFlow all = new DockFlow();
      for (DockFlow v : vs) {
        all.add(v);
      }
      String in = all.getDockings() == 0 ? "none" : all.getDocked() + " in " + all.getDockings();
      c.write(k, new Text(in + "; " + all.getUndocked() + " out " + all.getUndockings()));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "dock flow");
    job.setMapperClass(M.class); job.setCombinerClass(C.class); job.setReducerClass(R.class);
    job.setMapOutputKeyClass(Text.class); job.setMapOutputValueClass(DockFlow.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(Text.class);
    FileInputFormat.addInputPath(job, new Path(args[0])); FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
