package net.brindleharbour.rides;

import java.io.IOException;
import java.util.Map;
import java.util.TreeMap;

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

/**
 * How many days each bike rode one of the day's four longest rides (in whole minutes). Each day's
 * export is one small file, which Hadoop reads in one map task: the mapper keeps that task's top
 * four in a TreeMap keyed by minutes (a ride of the same minutes replaces the earlier one) and
 * writes them in cleanup(); the reducer counts the days per bike.
 */
public class LongRideBikesPerDay {
    static final int TOP = 4;

    public static class DayTopMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);
        private final TreeMap<Integer, String> longest = new TreeMap<>();

        @Override
        protected void map(LongWritable offset, Text value, Context context) {
            String[] f = value.toString().split(",");
            if (f.length < 6 || f[0].equals("ride_id")) {
                return;
            }
            longest.put(Integer.parseInt(f[5]) / 60, f[1]);
            if (longest.size() > TOP) {
                longest.remove(longest.firstKey());
            }
        }

        @Override
        protected void cleanup(Context context) throws IOException, InterruptedException {
            for (Map.Entry<Integer, String> e : longest.entrySet()) {
                context.write(new Text(e.getValue()), ONE);
            }
        }
    }

    public static class DaysReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text bike, Iterable<IntWritable> days, Context context)
                throws IOException, InterruptedException {
            int n = 0;
            for (IntWritable d : days) {
                n += d.get();
            }
            context.write(bike, new IntWritable(n));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "long ride bikes per day");
        job.setJarByClass(LongRideBikesPerDay.class);
        job.setMapperClass(DayTopMapper.class);
        job.setReducerClass(DaysReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
