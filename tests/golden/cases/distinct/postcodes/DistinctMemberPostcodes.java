package net.brindleharbour.members;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** The set of postcodes our members live in (for the outreach mailing). */
public class DistinctMemberPostcodes {

    public static class PostcodeMapper extends Mapper<LongWritable, Text, Text, NullWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split("\\|");
            if (f.length >= 3) {
                String postcode = f[2].trim();
                if (!postcode.isEmpty()) {
                    context.write(new Text(postcode), NullWritable.get());
                }
            }
        }
    }

    public static class UniqueReducer extends Reducer<Text, NullWritable, Text, NullWritable> {
        @Override
        protected void reduce(Text postcode, Iterable<NullWritable> ignored, Context context)
                throws IOException, InterruptedException {
            context.write(postcode, NullWritable.get());
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "distinct member postcodes");
        job.setJarByClass(DistinctMemberPostcodes.class);
        job.setMapperClass(PostcodeMapper.class);
        job.setCombinerClass(UniqueReducer.class);
        job.setReducerClass(UniqueReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(NullWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
