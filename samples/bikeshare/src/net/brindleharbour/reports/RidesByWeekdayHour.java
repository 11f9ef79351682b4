package net.brindleharbour.reports;

import java.io.IOException;
import java.text.ParseException;
import java.text.SimpleDateFormat;
import java.util.Calendar;
import java.util.Date;

import org.apache.hadoop.conf.Configured;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer;
import org.apache.hadoop.util.Tool;
import org.apache.hadoop.util.ToolRunner;

/**
 * Rides per (day of week, hour of day) and per start date, from the ride log's start time.
 * The app writes odd timestamps now and then; SimpleDateFormat's lenient parse has always
 * been accepted for them, and unreadable ones are counted and skipped.
 */
public class RidesByWeekdayHour extends Configured implements Tool {
    enum Clock { UNREADABLE }

    public static class ClockMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);
        private final SimpleDateFormat stamp = new SimpleDateFormat("yyyy-MM-dd HH:mm:ss");
        private final SimpleDateFormat day = new SimpleDateFormat("yyyy-MM-dd");
        private final Calendar cal = Calendar.getInstance();

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 6 || f[0].equals("ride_id")) {
                return;
            }
            Date started;
            try {
                started = stamp.parse(f[4]);
            } catch (ParseException e) {
                context.getCounter(Clock.UNREADABLE).increment(1);
                return;
            }
            cal.setTime(started);
            int weekday = cal.get(Calendar.DAY_OF_WEEK);
            int hour = cal.get(Calendar.HOUR_OF_DAY);
            long endMillis = started.getTime() + Long.parseLong(f[5]) * 1000L;
            context.write(new Text("wd" + weekday + "@" + (hour < 10 ? "0" : "") + hour), ONE);
            context.write(new Text("day " + day.format(started) + (endMillis - started.getTime() > 3600000L ? " long" : "")), ONE);
        }
    }

    @Override
    public int run(String[] args) throws Exception {
        Job job = Job.getInstance(getConf(), "rides by weekday and hour");
        job.setJarByClass(RidesByWeekdayHour.class);
        job.setMapperClass(ClockMapper.class);
        job.setCombinerClass(IntSumReducer.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        return job.waitForCompletion(true) ? 0 : 1;
    }

    public static void main(String[] args) throws Exception {
        System.exit(ToolRunner.run(new RidesByWeekdayHour(), args));
    }
}
