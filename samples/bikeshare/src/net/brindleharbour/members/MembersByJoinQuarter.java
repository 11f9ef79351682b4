package net.brindleharbour.members;

import java.io.IOException;
import java.time.LocalDate;
import java.time.format.DateTimeFormatter;
import java.time.format.DateTimeParseException;

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

/** Members per join quarter and per join weekday (java.time, newer code in the same repository). */
public class MembersByJoinQuarter {
    public static class JoinMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final DateTimeFormatter JOINED = DateTimeFormatter.ofPattern("yyyy-MM-dd");
        private static final IntWritable ONE = new IntWritable(1);

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split("\\|");
            if (f.length < 5) {
                return;
            }
            LocalDate joined;
            try {
                joined = LocalDate.parse(f[4].trim(), JOINED);
            } catch (DateTimeParseException e) {
                return;
            }
            int quarter = (joined.getMonthValue() - 1) / 3 + 1;
            context.write(new Text(joined.getYear() + "-Q" + quarter), ONE);
            context.write(new Text("weekday " + joined.getDayOfWeek().getValue()), ONE);
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "members by join quarter");
        job.setJarByClass(MembersByJoinQuarter.class);
        job.setMapperClass(JoinMapper.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
