
import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Rides per dock and day, summed the same way on both sides of a test that never holds. */
public class Main {
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {

      String[] f = value.toString().split(",");
      if (f.length != 2) return;
      int rides;
      try {
        rides = Integer.parseInt(f[1]);
      } catch (NumberFormatException e) {
        context.getCounter("quality", "bad rides").increment(1);
        return;
      }
      context.write(new Text(f[0]), new IntWritable(rides));
    }
  }

  public static class R extends Reducer<Text, IntWritable, Text, Text> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      String[] parts = key.toString().split(" ");
      String day = parts[parts.length - 1];
      int total = 0;
      if (key.equals("Quay North 2024-05-01")) {  // a Text never equals a String; both branches agree anyway
        for (IntWritable v : values) {
          total += v.get();
        }
      } else {
        for (IntWritable v : values) {
          total += v.get();
        }
      }
      context.write(new Text(day), new Text(parts[0] + " " + total));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "test job");
    job.setMapperClass(M.class);
    job.setReducerClass(R.class);
    job.setMapOutputKeyClass(Text.class);
    job.setMapOutputValueClass(IntWritable.class);
    job.setOutputKeyClass(Text.class);
    job.setOutputValueClass(Text.class);
    
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
