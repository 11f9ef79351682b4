package net.brindleharbour.docks;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Dock status lines regrouped by dock. The reducer below was written but never registered,
 * so Hadoop runs the identity reducer: every status line comes out, sorted by dock.
 */
public class ChargeLevelsByDock {

    public static class StatusMapper extends Mapper<LongWritable, Text, Text, Text> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split("\t");
            if (f.length >= 3) {
                context.write(new Text(f[0]), new Text(f[1] + " " + f[2]));
            }
        }
    }

    public static class LatestStatusReducer extends Reducer<Text, Text, Text, Text> {
        @Override
        protected void reduce(Text dock, Iterable<Text> statuses, Context context)
                throws IOException, InterruptedException {
            for (Text s : statuses) {
                context.write(dock, s);
                return;
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "charge levels by dock");
        job.setJarByClass(ChargeLevelsByDock.class);
        job.setMapperClass(StatusMapper.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
