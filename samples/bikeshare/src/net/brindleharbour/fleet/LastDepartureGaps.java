package net.brindleharbour.fleet;

import java.io.IOException;
import java.util.Iterator;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * For the depot crews: each station's last departure of the sample, then every earlier departure
 * listed against it. The secondary sort of the departure board (latest first) hands reduce() the
 * last departure as its first value; one reduce task.
 */
public class LastDepartureGaps {

    public static class DepartureMapper extends Mapper<LongWritable, Text, StationClock, Text> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 5 || f[0].equals("ride_id")) {
                return;
            }
            context.write(new StationClock(f[2], f[4]), new Text(f[0] + "@" + f[4]));
        }
    }

    public static class GapReducer extends Reducer<StationClock, Text, Text, Text> {
        private final Text last = new Text();

        @Override
        protected void reduce(StationClock key, Iterable<Text> departures, Context context)
                throws IOException, InterruptedException {
            Iterator<Text> it = departures.iterator();
            last.set(it.next());  // the latest departure: the sort comparator puts it first
            while (it.hasNext()) {
                Text earlier = it.next();
                context.write(new Text(key.getStation() + " before " + last), earlier);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "last departure gaps");
        job.setJarByClass(LastDepartureGaps.class);
        job.setMapperClass(DepartureMapper.class);
        job.setSortComparatorClass(DepartureBoard.LatestFirst.class);
        job.setGroupingComparatorClass(DepartureBoard.SameStation.class);
        job.setReducerClass(GapReducer.class);
        job.setMapOutputKeyClass(StationClock.class);
        job.setMapOutputValueClass(Text.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
