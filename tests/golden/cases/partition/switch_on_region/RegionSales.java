
import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Sales per region; regions go to three reduce tasks by a switch. */
public class RegionSales {
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {

      String[] f = value.toString().split(",");
      if (f.length > 1) context.write(new Text(f[0]), new IntWritable(Integer.parseInt(f[1].trim())));
    }
  }

  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      int s = 0;
      for (IntWritable v : vs) s += v.get();
      c.write(k, new IntWritable(s));
    }
  }

  public static class ByRegion extends Partitioner<Text, IntWritable> {
    @Override
    public int getPartition(Text key, IntWritable value, int numPartitions) {
      String region = key.toString().toLowerCase();
      System.out.println("partitioning " + region);
      switch (region) {
        case "north":
        case "east":
          return 0;
        case "south":
          return 1 % numPartitions;
        default:
          if (numPartitions == 3 && region.startsWith("w")) return 2;
          return region.length() % numPartitions;
      }
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
    job.setPartitionerClass(ByRegion.class); job.setNumReduceTasks(3);
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
