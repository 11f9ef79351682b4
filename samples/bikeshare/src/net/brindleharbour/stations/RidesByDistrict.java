package net.brindleharbour.stations;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.MultipleInputs;
import org.apache.hadoop.mapreduce.lib.input.TextInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Each ride with the district(s) of its start station: a reduce-side join of the station list
 * (station TAB district) and the ride exports, tagged "S|" and "R|". A station listed in two
 * districts gives each ride twice; stations without rides and rides of unlisted stations drop out.
 */
public class RidesByDistrict {

    public static class StationMapper extends Mapper<LongWritable, Text, Text, Text> {
        @Override
        protected void map(LongWritable offset, Text line, Context context) throws IOException, InterruptedException {
            String[] f = line.toString().split("\t");
            if (f.length == 2) {
                context.write(new Text(f[0]), new Text("S|" + f[1]));
            }
        }
    }

    public static class RideMapper extends Mapper<LongWritable, Text, Text, Text> {
        @Override
        protected void map(LongWritable offset, Text line, Context context) throws IOException, InterruptedException {
            String[] f = line.toString().split(",");
            if (f.length > 5 && !f[0].equals("ride_id")) {
                context.write(new Text(f[2]), new Text("R|" + f[0] + "," + f[5]));
            }
        }
    }

    public static class DistrictJoin extends Reducer<Text, Text, Text, Text> {
        @Override
        protected void reduce(Text station, Iterable<Text> tagged, Context context)
                throws IOException, InterruptedException {
            List<String> districts = new ArrayList<>();
            List<String> rides = new ArrayList<>();
            for (Text t : tagged) {
                String s = t.toString();
                if (s.startsWith("S|")) {
                    districts.add(s.substring(2));
                } else if (s.startsWith("R|")) {
                    rides.add(s.substring(2));
                }
            }
            for (String district : districts) {
                for (String ride : rides) {
                    context.write(station, new Text(district + "," + ride));
                }
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "rides by district");
        job.setJarByClass(RidesByDistrict.class);
        MultipleInputs.addInputPath(job, new Path(args[0]), TextInputFormat.class, StationMapper.class);
        MultipleInputs.addInputPath(job, new Path(args[1]), TextInputFormat.class, RideMapper.class);
        job.setReducerClass(DistrictJoin.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileOutputFormat.setOutputPath(job, new Path(args[2]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
