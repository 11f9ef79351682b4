
import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

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

  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context)
        throws IOException, InterruptedException {
      int rides = -1;
      for (IntWritable v : values) {
        rides = v.get();
      }
      context.write(key, new IntWritable(rides * 10));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "test job");
    job.setMapperClass(M.class);
    job.setReducerClass(R.class);
    job.setMapOutputKeyClass(Text.class);
    job.setMapOutputValueClass(IntWritable.class);
    job.setOutputKeyClass(Text.class);
    job.setOutputValueClass(IntWritable.class);
    
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
