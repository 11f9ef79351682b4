package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.FileSystem;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.NullWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Map-only: keeps the raw log lines of rides longer than an hour, for the overage-billing team.
 * The output lines are the input lines unchanged (the key is NullWritable, so no TAB).
 */
public class LongRidesFilter {
    static final int ONE_HOUR = 60 * 60;

    public static class OverHourMapper extends Mapper<LongWritable, Text, NullWritable, Text> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] cols = value.toString().split(",");
            if (cols.length < 6 || cols[0].equals("ride_id")) {
                return;
            }
            long seconds = Long.parseLong(cols[5]);
            if (seconds > ONE_HOUR) {
                context.write(NullWritable.get(), value);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        Job job = Job.getInstance(conf, "long rides filter");
        job.setJarByClass(LongRidesFilter.class);
        job.setMapperClass(OverHourMapper.class);
        job.setNumReduceTasks(0);
        job.setOutputKeyClass(NullWritable.class);
        job.setOutputValueClass(Text.class);
        Path out = new Path(args[1]);
        out.getFileSystem(conf).delete(out, true);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, out);
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
