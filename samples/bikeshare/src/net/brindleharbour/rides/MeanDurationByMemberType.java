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
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Mean ride seconds per member type, as the pricing team has read it for years. The reducer
 * doubles as the combiner, so each map task's mean is averaged again: the published numbers
 * are a mean of means whose value depends on how the input was split into tasks.
 */
public class MeanDurationByMemberType {

    public static class TypeMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 6 && !f[0].equals("ride_id")) {
                context.write(new Text(f[6]), new IntWritable(Integer.parseInt(f[5])));
            }
        }
    }

    public static class MeanReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text type, Iterable<IntWritable> seconds, Context context)
                throws IOException, InterruptedException {
            long total = 0;
            int n = 0;
            for (IntWritable s : seconds) {
                total += s.get();
                n++;
            }
            context.write(type, new IntWritable((int) (total / n)));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "mean duration by member type");
        job.setJarByClass(MeanDurationByMemberType.class);
        job.setMapperClass(TypeMapper.class);
        job.setCombinerClass(MeanReducer.class);
        job.setReducerClass(MeanReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
