package net.brindleharbour.reports;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Rides and mean minutes per start station and hour of the day (composite key, custom value). */
public class StationHourLoad {

    public static class LoadMapper extends Mapper<LongWritable, Text, StationHour, RideTally> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 6 || f[0].equals("ride_id") || f[4].length() < 13) {
                return;
            }
            try {
                int hour = Integer.parseInt(f[4].substring(11, 13));
                context.write(new StationHour(f[2], hour), new RideTally(1, Long.parseLong(f[5])));
            } catch (NumberFormatException e) {
                return;  // a start time without a two-digit hour: skip the ride
            }
        }
    }

    public static class LoadReducer extends Reducer<StationHour, RideTally, StationHour, Text> {
        @Override
        protected void reduce(StationHour slot, Iterable<RideTally> tallies, Context context)
                throws IOException, InterruptedException {
            int rides = 0;
            long seconds = 0;
            for (RideTally t : tallies) {
                rides += t.getRides();
                seconds += t.getSeconds();
            }
            context.write(slot, new Text(rides + " rides, " + (seconds / rides / 60) + " min mean"));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "station hour load");
        job.setJarByClass(StationHourLoad.class);
        job.setMapperClass(LoadMapper.class);
        job.setNumReduceTasks(3);
        job.setReducerClass(LoadReducer.class);
        job.setMapOutputKeyClass(StationHour.class);
        job.setMapOutputValueClass(RideTally.class);
        job.setOutputKeyClass(StationHour.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
