import java.io.IOException;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer;

/** Rides per station; the first argument names the report (only "rides" is written so far). */
public class Main {
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      c.write(new Text(v.toString().split(",")[0]), new IntWritable(1));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "station report");
    String report = args[0];
    switch (report) {
      case "rides":
        job.setMapperClass(M.class);
        job.setReducerClass(IntSumReducer.class);
        break;
      default:
        System.err.println("unknown report: " + report);
        System.exit(2);
    }
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[1])); FileOutputFormat.setOutputPath(job, new Path(args[2]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
