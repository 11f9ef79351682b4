package net.brindleharbour.fleet;

import java.io.IOException;
import java.util.HashSet;
import java.util.Set;

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
 * One usage profile per bike for the fleet planners: ride count, long rides, stations visited,
 * mean and spread of ride time, and whether casual riders use it. Several writes per bike.
 */
public class BikeUsageProfile {

    public static class RideMapper extends Mapper<LongWritable, Text, Text, Text> {
        private final Text bike = new Text();
        private final Text ride = new Text();

        @Override
        protected void map(LongWritable offset, Text line, Context context) throws IOException, InterruptedException {
            String[] f = line.toString().split(",");
            if (f.length < 8 || f[0].equals("ride_id")) {
                return;
            }
            bike.set(f[1]);
            ride.set(f[5] + "," + f[6] + "," + f[2]);
            context.write(bike, ride);
        }
    }

    public static class ProfileReducer extends Reducer<Text, Text, Text, Text> {
        @Override
        protected void reduce(Text bike, Iterable<Text> rides, Context context) throws IOException, InterruptedException {
            int count = 0;
            long seconds = 0;
            long squares = 0;
            int longRides = 0;
            boolean casualUse = false;
            boolean allShort = true;
            Set<String> stations = new HashSet<>();
            for (Text r : rides) {
                String[] f = r.toString().split(",");
                long d = Long.parseLong(f[0]);
                count++;
                seconds += d;
                squares += d * d;
                if (d > 3600) {
                    longRides++;
                }
                if (f[1].equals("casual")) {
                    casualUse = true;
                }
                allShort &= d < 1800;
                stations.add(f[2]);
            }
            long mean = seconds / count;
            long variance = squares / count - mean * mean;
            context.write(bike, new Text("rides=" + count + " long=" + longRides + " stations=" + stations.size()));
            context.write(bike, new Text("mean_s=" + mean + " var=" + variance + (allShort ? " short-only" : "")));
            if (casualUse) {
                context.write(bike, new Text("casual riders"));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "bike usage profile");
        job.setJarByClass(BikeUsageProfile.class);
        job.setMapperClass(RideMapper.class);
        job.setReducerClass(ProfileReducer.class);
        job.setNumReduceTasks(2);  // two part files, split by the key hash
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
