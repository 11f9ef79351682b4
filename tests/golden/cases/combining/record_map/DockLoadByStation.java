package net.brindleharbour.docks;

import java.io.IOException;
import java.util.HashMap;
import java.util.Map;

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
 * Mean bikes available and docks free per station over all status reports. Each map task sums its
 * reports per station in a DockLoad (in-mapper combining) and writes them when it ends.
 */
public class DockLoadByStation {

    public static class LoadMapper extends Mapper<LongWritable, Text, Text, DockLoad> {
        private final Map<String, DockLoad> loads = new HashMap<>();

        @Override
        protected void map(LongWritable offset, Text line, Context context) {
            String[] f = line.toString().split("\t");
            if (f.length < 5 || f[0].equals("dock_id")) {
                return;
            }
            String station = f[1];
            loads.putIfAbsent(station, new DockLoad());
            loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
        }

        @Override
        protected void cleanup(Context context) throws IOException, InterruptedException {
            for (Map.Entry<String, DockLoad> e : loads.entrySet()) {
                context.write(new Text(e.getKey()), e.getValue());
            }
        }
    }

    public static class LoadReducer extends Reducer<Text, DockLoad, Text, Text> {
        @Override
        protected void reduce(Text station, Iterable<DockLoad> loads, Context context)
                throws IOException, InterruptedException {
            DockLoad total = new DockLoad();
            for (DockLoad load : loads) {
                total.add(load);
            }
            double bikes = (double) total.getBikes() / total.getReports();
            double free = (double) total.getFree() / total.getReports();
            context.write(station, new Text(bikes + " bikes, " + free + " docks free (" + total.getReports() + " reports)"));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "dock load by station");
        job.setJarByClass(DockLoadByStation.class);
        job.setMapperClass(LoadMapper.class);
        job.setReducerClass(LoadReducer.class);
        job.setMapOutputKeyClass(Text.class);
        job.setMapOutputValueClass(DockLoad.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
