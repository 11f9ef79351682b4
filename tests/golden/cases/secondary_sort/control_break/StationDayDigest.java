package net.brindleharbour.fleet;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.io.WritableComparable;
import org.apache.hadoop.io.WritableComparator;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * The kiosk digest: one line per start station listing each day's rides and mean duration,
 * days in order. A secondary sort hands reduce() a station's rides day by day; it starts its
 * sums over at each new day. Kiosks that lost their clock export 0000-00-00, day 0, which the
 * digest leaves out.
 */
public class StationDayDigest {

    public static class DayMapper extends Mapper<LongWritable, Text, StationDay, DayRide> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 6 || !f[4].matches("\\d{4}-\\d{2}-\\d{2} .*")) {
                return;
            }
            int day = Integer.parseInt(f[4].substring(0, 10).replace("-", ""));
            context.write(new StationDay(f[2], day), new DayRide(day, Integer.parseInt(f[5])));
        }
    }

    public static class SameStation extends WritableComparator {
        public SameStation() {
            super(StationDay.class, true);
        }

        @Override
        public int compare(WritableComparable a, WritableComparable b) {
            return ((StationDay) a).getStation().compareTo(((StationDay) b).getStation());
        }
    }

    public static class DigestReducer extends Reducer<StationDay, DayRide, Text, Text> {
        @Override
        protected void reduce(StationDay key, Iterable<DayRide> rides, Context context)
                throws IOException, InterruptedException {
            List<String> days = new ArrayList<>();
            int day = 0;
            int count = 0;
            long seconds = 0;
            for (DayRide ride : rides) {
                if (ride.getDay() != day) {
                    // a new day: list the one before (day 0 is the lost clock, never listed)
                    if (day != 0) {
                        long mean = seconds / count;
                        days.add(day + ":" + count + "x" + mean + "s");
                    }
                    day = ride.getDay();
                    count = 0;
                    seconds = 0;
                }
                count++;
                seconds += ride.getSeconds();
            }
            if (day != 0) {
                long mean = seconds / count;
                days.add(day + ":" + count + "x" + mean + "s");
            }
            context.write(new Text(key.getStation()), new Text(String.join(" ", days)));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "station day digest");
        job.setJarByClass(StationDayDigest.class);
        job.setMapperClass(DayMapper.class);
        job.setGroupingComparatorClass(SameStation.class);
        job.setReducerClass(DigestReducer.class);
        job.setMapOutputKeyClass(StationDay.class);
        job.setMapOutputValueClass(DayRide.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
