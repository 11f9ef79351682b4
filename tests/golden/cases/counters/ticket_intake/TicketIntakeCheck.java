package net.brindleharbour.tickets;

import java.io.IOException;

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
 * Workshop hours per bike, with intake counters the workshop lead reads from the job log every
 * morning: malformed rows, tickets without hours, accepted tickets and the total hours seen.
 */
public class TicketIntakeCheck {
    enum Intake { MALFORMED, NO_HOURS, ACCEPTED }

    public static class IntakeMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(";");
            if (f.length < 5) {
                context.getCounter(Intake.MALFORMED).increment(1);
                return;
            }
            if (f[0].equals("ticket_id")) {
                return;
            }
            try {
                int hours = Integer.parseInt(f[4].trim());
                context.getCounter("workshop", "hours seen").increment(hours);
                context.write(new Text(f[1]), new IntWritable(hours));
            } catch (NumberFormatException e) {
                context.getCounter(Intake.NO_HOURS).increment(1);
                return;
            }
            context.getCounter(Intake.ACCEPTED).increment(1);
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "ticket intake check");
        job.setJarByClass(TicketIntakeCheck.class);
        job.setMapperClass(IntakeMapper.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
