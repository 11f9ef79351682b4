package net.saltmarshferries.audit;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer;

/**
 * Passengers per sailing. The harbour office reads one counter per boarding gate and per ticket
 * status from the job log; the gate and status come from the rows themselves.
 */
public class FerryBoardingAudit {

    public static class BoardingMapper extends Mapper<LongWritable, Text, Text, LongWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split("\\|");
            if (f.length != 4) {
                context.getCounter("audit", "malformed").increment(1);
                return;
            }
            String status = f[3].trim().toLowerCase();
            context.getCounter("ticket status", status).increment(1);
            context.getCounter("gate " + f[1], "passengers").increment(Long.parseLong(f[2]));
            if (!status.equals("void")) {
                context.write(new Text(f[0]), new LongWritable(Long.parseLong(f[2])));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "ferry boarding audit");
        job.setJarByClass(FerryBoardingAudit.class);
        job.setMapperClass(BoardingMapper.class);
        job.setReducerClass(LongSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
