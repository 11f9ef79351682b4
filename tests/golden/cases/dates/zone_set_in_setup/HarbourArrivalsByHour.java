package net.saltmarshferries.arrivals;

import java.io.IOException;
import java.text.ParseException;
import java.text.SimpleDateFormat;
import java.util.Date;
import java.util.TimeZone;

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
 * Ferry arrivals per local hour. The harbour log stamps arrivals in harbour time whatever zone the
 * cluster runs in, so the formats are given the harbour's zone in setup().
 */
public class HarbourArrivalsByHour {

    public static class ArrivalMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private SimpleDateFormat stamp;
        private SimpleDateFormat hour;
        private final IntWritable one = new IntWritable(1);

        @Override
        protected void setup(Context context) {
            stamp = new SimpleDateFormat("yyyy-MM-dd HH:mm:ss");
            stamp.setTimeZone(TimeZone.getTimeZone("Europe/Lisbon"));
            stamp.setLenient(false);
            hour = new SimpleDateFormat("yyyy-MM-dd HH");
            hour.setTimeZone(TimeZone.getTimeZone("Europe/Lisbon"));
        }

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(";");
            if (f.length < 2) {
                return;
            }
            try {
                Date arrived = stamp.parse(f[1]);
                context.write(new Text(hour.format(arrived)), one);
            } catch (ParseException e) {
                context.getCounter("arrivals", "bad stamp").increment(1);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "harbour arrivals by hour");
        job.setJarByClass(HarbourArrivalsByHour.class);
        job.setMapperClass(ArrivalMapper.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
