package net.brindleharbour.fleet;

import java.io.IOException;
import java.util.Iterator;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.io.WritableComparable;
import org.apache.hadoop.io.WritableComparator;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Partitioner;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Each station's departures, latest first, for the station boards: a secondary sort. The
 * partitioner and the grouping comparator look at the station only; the sort comparator
 * orders by station, then start time descending. Two reduce tasks.
 */
public class DepartureBoard {

    public static class DepartureMapper extends Mapper<LongWritable, Text, StationClock, Text> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 5 || f[0].equals("ride_id")) {
                return;
            }
            context.write(new StationClock(f[2], f[4]), new Text(f[0] + " to " + f[3]));
        }
    }

    public static class StationPartitioner extends Partitioner<StationClock, Text> {
        @Override
        public int getPartition(StationClock key, Text value, int numPartitions) {
            return (key.getStation().hashCode() & Integer.MAX_VALUE) % numPartitions;
        }
    }

    public static class LatestFirst extends WritableComparator {
        public LatestFirst() {
            super(StationClock.class, true);
        }

        @Override
        public int compare(WritableComparable a, WritableComparable b) {
            StationClock x = (StationClock) a;
            StationClock y = (StationClock) b;
            int c = x.getStation().compareTo(y.getStation());
            if (c != 0) {
                return c;
            }
            return y.getStartedAt().compareTo(x.getStartedAt());
        }
    }

    public static class SameStation extends WritableComparator {
        public SameStation() {
            super(StationClock.class, true);
        }

        @Override
        public int compare(WritableComparable a, WritableComparable b) {
            return ((StationClock) a).getStation().compareTo(((StationClock) b).getStation());
        }
    }

    public static class BoardReducer extends Reducer<StationClock, Text, Text, Text> {
        @Override
        protected void reduce(StationClock key, Iterable<Text> rides, Context context)
                throws IOException, InterruptedException {
            context.write(new Text("== " + key.getStation() + " from " + key.getStartedAt()), new Text(""));
            for (Text ride : rides) {
                context.write(new Text(key.getStation() + " " + key.getStartedAt()), ride);
            }
            context.write(new Text("-- " + key.getStation() + " down to " + key.getStartedAt()), new Text("end"));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "departure board");
        job.setJarByClass(DepartureBoard.class);
        job.setMapperClass(DepartureMapper.class);
        job.setPartitionerClass(StationPartitioner.class);
        job.setSortComparatorClass(LatestFirst.class);
        job.setGroupingComparatorClass(SameStation.class);
        job.setReducerClass(BoardReducer.class);
        job.setNumReduceTasks(2);
        job.setMapOutputKeyClass(StationClock.class);
        job.setMapOutputValueClass(Text.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
