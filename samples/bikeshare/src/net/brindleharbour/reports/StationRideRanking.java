package net.brindleharbour.reports;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.input.KeyValueTextInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Start stations ranked by their number of rides, in two chained jobs: the first counts rides
 * per station into a folder (station TAB rides), the second reads that folder and groups the
 * stations by their count, fewest rides first.
 */
public class StationRideRanking {

    public static class StartMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);

        @Override
        protected void map(LongWritable offset, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 2 && !f[0].equals("ride_id")) {
                context.write(new Text(f[2]), ONE);
            }
        }
    }

    public static class CountReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text station, Iterable<IntWritable> ones, Context context)
                throws IOException, InterruptedException {
            int n = 0;
            for (IntWritable one : ones) {
                n += one.get();
            }
            context.write(station, new IntWritable(n));
        }
    }

    public static class ByCountMapper extends Mapper<Text, Text, IntWritable, Text> {
        @Override
        protected void map(Text station, Text rides, Context context) throws IOException, InterruptedException {
            context.write(new IntWritable(Integer.parseInt(rides.toString())), station);
        }
    }

    public static class StationsReducer extends Reducer<IntWritable, Text, IntWritable, Text> {
        @Override
        protected void reduce(IntWritable rides, Iterable<Text> stations, Context context)
                throws IOException, InterruptedException {
            for (Text station : stations) {
                context.write(rides, station);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        Job counts = Job.getInstance(conf, "rides per start station");
        counts.setJarByClass(StationRideRanking.class);
        counts.setMapperClass(StartMapper.class);
        counts.setReducerClass(CountReducer.class);
        counts.setOutputKeyClass(Text.class);
        counts.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(counts, new Path(args[0]));
        FileOutputFormat.setOutputPath(counts, new Path(args[1]));
        if (!counts.waitForCompletion(true)) {
            System.exit(1);
        }

        Job ranking = Job.getInstance(conf, "stations by ride count");
        ranking.setJarByClass(StationRideRanking.class);
        ranking.setInputFormatClass(KeyValueTextInputFormat.class);
        ranking.setMapperClass(ByCountMapper.class);
        ranking.setReducerClass(StationsReducer.class);
        ranking.setOutputKeyClass(IntWritable.class);
        ranking.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(ranking, new Path(args[1]));
        FileOutputFormat.setOutputPath(ranking, new Path(args[2]));
        System.exit(ranking.waitForCompletion(true) ? 0 : 1);
    }
}
