package net.brindleharbour.docks;

import java.io.IOException;
import java.util.HashMap;
import java.util.Map;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer;

/**
 * Status reports per station, tallied inside the mapper (in-mapper combining) and flushed in
 * cleanup(). The HashMap stands for a count per station, which the reducer sums again.
 */
public class DockReportTally {
    public static class TallyMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private final Map<String, Integer> tally = new HashMap<>();

        @Override
        protected void map(LongWritable key, Text value, Context context) {
            String[] f = value.toString().split("\t");
            if (f.length > 1 && !f[0].equals("dock_id")) {
                tally.merge(f[1], 1, Integer::sum);
            }
        }

        @Override
        protected void cleanup(Context context) throws IOException, InterruptedException {
            for (Map.Entry<String, Integer> e : tally.entrySet()) {
                context.write(new Text(e.getKey()), new IntWritable(e.getValue()));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "dock report tally");
        job.setJarByClass(DockReportTally.class);
        job.setMapperClass(TallyMapper.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
