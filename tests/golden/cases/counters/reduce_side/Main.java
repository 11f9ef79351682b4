
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
for (String w : value.toString().split(" ")) context.write(new Text(w), new IntWritable(1));
    }
  }
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      if (key.toString().startsWith("a")) {
        context.getCounter("words", "starting with a").increment(1);
      }
      int s = 0;
      for (IntWritable v : values) {
        s += v.get();
        if (v.get() > 1) context.getCounter("words", "values above one").increment(1);
      }
      if (s > 2) context.getCounter("words", "frequent").increment(1);
      context.write(key, new IntWritable(s));
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
