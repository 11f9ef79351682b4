package net.brindleharbour.docks;

import java.io.IOException;
import java.util.Iterator;

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
 * Meant to count bike returns per end station. It has two long-standing bugs that the
 * reports built on it have come to depend on: the reduce() below takes an Iterator (the old
 * API's type), so it never overrides Reducer.reduce and Hadoop runs the identity reducer; and
 * the driver sets the mapper twice (the second, return-side mapper is the one that runs).
 */
public class ReturnsPerDock {

    public static class DepartureMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 2 && !f[0].equals("ride_id")) {
                context.write(new Text(f[2]), new IntWritable(1));
            }
        }
    }

    public static class ReturnMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 3 && !f[0].equals("ride_id")) {
                context.write(new Text(f[3]), new IntWritable(1));
            }
        }
    }

    public static class ReturnCountReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        // no @Override: javac accepts this overload, and Hadoop never calls it
        protected void reduce(Text dock, Iterator<IntWritable> ones, Context context)
                throws IOException, InterruptedException {
            int n = 0;
            while (ones.hasNext()) {
                n += ones.next().get();
            }
            context.write(dock, new IntWritable(n));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "returns per dock");
        job.setJarByClass(ReturnsPerDock.class);
        job.setMapperClass(DepartureMapper.class);
        job.setReducerClass(ReturnCountReducer.class);
        job.setMapperClass(ReturnMapper.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
