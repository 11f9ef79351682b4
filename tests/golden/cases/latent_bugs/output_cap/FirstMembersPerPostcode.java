package net.brindleharbour.members;

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
 * "The two busiest postcodes" for the membership newsletter. In fact the reducer writes the
 * first two postcodes it meets, in postcode order, with their member counts: an instance
 * counter caps the output, once per reduce task (two here).
 */
public class FirstMembersPerPostcode {

    public static class PostcodeMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split("\\|");
            if (f.length > 2) {
                context.write(new Text(f[2].trim()), new IntWritable(1));
            }
        }
    }

    public static class CappedReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        private int written = 0;

        @Override
        protected void reduce(Text postcode, Iterable<IntWritable> ones, Context context)
                throws IOException, InterruptedException {
            int members = 0;
            for (IntWritable one : ones) {
                members += one.get();
            }
            if (written < 2) {
                context.write(postcode, new IntWritable(members));
                written++;
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "first members per postcode");
        job.setJarByClass(FirstMembersPerPostcode.class);
        job.setMapperClass(PostcodeMapper.class);
        job.setReducerClass(CappedReducer.class);
        job.setNumReduceTasks(2);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
