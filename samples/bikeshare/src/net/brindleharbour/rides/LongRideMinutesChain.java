package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.chain.ChainMapper;
import org.apache.hadoop.mapreduce.lib.chain.ChainReducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Minutes ridden on long rides, per start station, built from small chained steps: one mapper
 * parses the export (station, seconds), the next keeps rides over ten minutes and turns seconds
 * into whole minutes, and the reducer adds them up.
 */
public class LongRideMinutesChain {

    public static class ParseRide extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable offset, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 6 || f[0].equals("ride_id")) {
                return;
            }
            context.write(new Text(f[2]), new IntWritable(Integer.parseInt(f[5])));
        }
    }

    public static class LongOnly extends Mapper<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void map(Text station, IntWritable seconds, Context context) throws IOException, InterruptedException {
            if (seconds.get() > 600) {
                context.write(new Text(station.toString().toUpperCase()), new IntWritable(seconds.get() / 60));
            }
        }
    }

    public static class Minutes extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text station, Iterable<IntWritable> minutes, Context context)
                throws IOException, InterruptedException {
            int total = 0;
            for (IntWritable m : minutes) {
                total += m.get();
            }
            context.write(station, new IntWritable(total));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "long ride minutes (chained)");
        job.setJarByClass(LongRideMinutesChain.class);
        ChainMapper.addMapper(job, ParseRide.class, LongWritable.class, Text.class, Text.class, IntWritable.class,
                new Configuration(false));
        ChainMapper.addMapper(job, LongOnly.class, Text.class, IntWritable.class, Text.class, IntWritable.class,
                new Configuration(false));
        ChainReducer.setReducer(job, Minutes.class, Text.class, IntWritable.class, Text.class, IntWritable.class,
                new Configuration(false));
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
