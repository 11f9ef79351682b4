package net.brindleharbour.stations;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.net.URI;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.Map;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.FileSystem;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Rides per district of the start station: a map-side join. Each map task loads the station
 * list (station TAB district, shipped with the job as a cache file) into a HashMap in setup();
 * a station listed twice keeps its last district, and rides of unlisted stations count as
 * "unlisted".
 */
public class RidesPerDistrict {

    public static class DistrictMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);
        private final Map<String, String> districtOf = new HashMap<>();

        @Override
        protected void setup(Context context) throws IOException, InterruptedException {
            URI[] shipped = context.getCacheFiles();
            if (shipped == null || shipped.length == 0) {
                throw new IOException("the station list was not shipped with the job");
            }
            FileSystem fs = FileSystem.get(context.getConfiguration());
            try (BufferedReader in = new BufferedReader(
                    new InputStreamReader(fs.open(new Path(shipped[0])), StandardCharsets.UTF_8))) {
                String line;
                while ((line = in.readLine()) != null) {
                    String[] f = line.split("\t");
                    if (f.length < 2) {
                        continue;
                    }
                    districtOf.put(f[0].trim(), f[1].trim());
                }
            }
        }

        @Override
        protected void map(LongWritable offset, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 8 || f[0].equals("ride_id")) {
                return;
            }
            String district = districtOf.getOrDefault(f[2], "unlisted");
            context.write(new Text(district), ONE);
        }
    }

    public static class SumReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text district, Iterable<IntWritable> ones, Context context)
                throws IOException, InterruptedException {
            int rides = 0;
            for (IntWritable one : ones) {
                rides += one.get();
            }
            context.write(district, new IntWritable(rides));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "rides per district");
        job.setJarByClass(RidesPerDistrict.class);
        job.setMapperClass(DistrictMapper.class);
        job.setReducerClass(SumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        job.addCacheFile(new Path(args[1]).toUri());
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[2]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
