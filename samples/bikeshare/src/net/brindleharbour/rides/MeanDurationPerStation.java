package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.DoubleWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Mean ride seconds per start station. Unlike the member-type report, the combiner passes on
 * (seconds, rides) tallies instead of means, so the answer does not depend on the input split.
 */
public class MeanDurationPerStation {

    public static class StationMapper extends Mapper<LongWritable, Text, Text, RideTally> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 5 && !f[0].equals("ride_id")) {
                context.write(new Text(f[2]), new RideTally(Long.parseLong(f[5]), 1));
            }
        }
    }

    public static class TallyCombiner extends Reducer<Text, RideTally, Text, RideTally> {
        @Override
        protected void reduce(Text station, Iterable<RideTally> tallies, Context context)
                throws IOException, InterruptedException {
            long seconds = 0;
            long rides = 0;
            for (RideTally t : tallies) {
                seconds += t.getSeconds();
                rides += t.getRides();
            }
            context.write(station, new RideTally(seconds, rides));
        }
    }

    public static class MeanReducer extends Reducer<Text, RideTally, Text, DoubleWritable> {
        @Override
        protected void reduce(Text station, Iterable<RideTally> tallies, Context context)
                throws IOException, InterruptedException {
            long seconds = 0;
            long rides = 0;
            for (RideTally t : tallies) {
                seconds += t.getSeconds();
                rides += t.getRides();
            }
            context.write(station, new DoubleWritable((double) seconds / rides));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "mean duration per station");
        job.setJarByClass(MeanDurationPerStation.class);
        job.setMapperClass(StationMapper.class);
        job.setCombinerClass(TallyCombiner.class);
        job.setReducerClass(MeanReducer.class);
        job.setMapOutputKeyClass(Text.class);
        job.setMapOutputValueClass(RideTally.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(DoubleWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
