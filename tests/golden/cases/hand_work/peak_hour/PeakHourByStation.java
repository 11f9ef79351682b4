package net.brindleharbour.reports;

import java.io.IOException;
import java.text.ParseException;
import java.text.SimpleDateFormat;
import java.util.Calendar;
import java.util.Date;

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
 * Rides per (station, hour of day). Runs on the production cluster against fixed paths.
 * Needs hand work: date parsing with SimpleDateFormat and a counter of unparseable rows.
 */
public class PeakHourByStation {
    enum Quality { BAD_TIMESTAMP }

    public static class HourMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);
        private final SimpleDateFormat format = new SimpleDateFormat("yyyy-MM-dd HH:mm:ss");
        private final Calendar calendar = Calendar.getInstance();

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f[0].equals("ride_id")) {
                return;
            }
            Date started;
            try {
                started = format.parse(f[4]);
            } catch (ParseException e) {
                context.getCounter(Quality.BAD_TIMESTAMP).increment(1);
                return;
            }
            calendar.setTime(started);
            int hour = calendar.get(Calendar.HOUR_OF_DAY);
            context.write(new Text(f[2] + "@" + hour), ONE);
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        conf.set("mapreduce.job.queuename", "reports");
        Job job = Job.getInstance(conf, "peak hour by station");
        job.setJarByClass(PeakHourByStation.class);
        job.setMapperClass(HourMapper.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path("hdfs://bh-namenode:8020/data/rides/current"));
        FileOutputFormat.setOutputPath(job, new Path("/srv/reports/peak_hour"));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
