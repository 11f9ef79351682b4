package net.brindleharbour.rides;

import java.io.IOException;
import java.util.TreeSet;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** The three longest distinct ride times (minutes) from each start station, longest first. */
public class LongestRidesPerStation {

    public static class MinutesMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 5 && !f[0].equals("ride_id")) {
                context.write(new Text(f[2]), new IntWritable(Integer.parseInt(f[5]) / 60));
            }
        }
    }

    public static class TopThreeReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text station, Iterable<IntWritable> minutes, Context context)
                throws IOException, InterruptedException {
            TreeSet<Integer> longest = new TreeSet<>();
            for (IntWritable m : minutes) {
                longest.add(m.get());
                if (longest.size() > 3) {
                    longest.pollFirst();
                }
            }
            for (Integer m : longest.descendingSet()) {
                context.write(station, new IntWritable(m));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "longest rides per station");
        job.setJarByClass(LongestRidesPerStation.class);
        job.setMapperClass(MinutesMapper.class);
        job.setReducerClass(TopThreeReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
