package net.brindleharbour.fleet;

import java.io.IOException;
import java.util.Iterator;

import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapred.FileInputFormat;
import org.apache.hadoop.mapred.FileOutputFormat;
import org.apache.hadoop.mapred.JobClient;
import org.apache.hadoop.mapred.JobConf;
import org.apache.hadoop.mapred.MapReduceBase;
import org.apache.hadoop.mapred.Mapper;
import org.apache.hadoop.mapred.OutputCollector;
import org.apache.hadoop.mapred.Reducer;
import org.apache.hadoop.mapred.Reporter;

/** Every ride over 20 minutes, listed under its start station in minutes (old API; filtering reducer). */
public class LongRideLog {

    public static class StationDurationMapper extends MapReduceBase
            implements Mapper<LongWritable, Text, Text, IntWritable> {
        public void map(LongWritable key, Text value, OutputCollector<Text, IntWritable> out, Reporter reporter)
                throws IOException {
            String[] f = value.toString().split(",");
            if (f.length > 5 && !f[0].equals("ride_id")) {
                out.collect(new Text(f[2]), new IntWritable(Integer.parseInt(f[5])));
            }
        }
    }

    public static class OverTwentyMinutes extends MapReduceBase
            implements Reducer<Text, IntWritable, Text, IntWritable> {
        public void reduce(Text station, Iterator<IntWritable> durations, OutputCollector<Text, IntWritable> out,
                           Reporter reporter) throws IOException {
            while (durations.hasNext()) {
                int seconds = durations.next().get();
                if (seconds > 1200) {
                    out.collect(station, new IntWritable(seconds / 60));
                }
            }
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf conf = new JobConf(LongRideLog.class);
        conf.setJobName("long ride log");
        conf.setMapperClass(StationDurationMapper.class);
        conf.setReducerClass(OverTwentyMinutes.class);
        conf.setNumReduceTasks(3);
        conf.setOutputKeyClass(Text.class);
        conf.setOutputValueClass(IntWritable.class);
        FileInputFormat.setInputPaths(conf, new Path(args[0]));
        FileOutputFormat.setOutputPath(conf, new Path(args[1]));
        JobClient.runJob(conf);
    }
}
