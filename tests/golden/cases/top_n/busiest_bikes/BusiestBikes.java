package net.brindleharbour.fleet;

import java.io.IOException;
import java.util.Map;
import java.util.TreeMap;

import org.apache.hadoop.conf.Configuration;
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
 * The bikes that rode the most twenty-minute blocks, for the workshop's service rota: a TreeMap keyed by
 * total seconds, trimmed to the top entries, written in cleanup(). One reduce task.
 * (Two bikes with the same total keep only one entry: the later key overwrites the earlier.)
 */
public class BusiestBikes {
    static final int TOP = 4;

    public static class SecondsMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 6 || f[0].equals("ride_id")) {
                return;
            }
            context.write(new Text(f[1]), new IntWritable(Integer.parseInt(f[5]) / 1200));
        }
    }

    public static class TopBikesReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        private final TreeMap<Integer, String> top = new TreeMap<>();

        @Override
        protected void reduce(Text bike, Iterable<IntWritable> twentyMinuteBlocks, Context context) {
            int blocks = 0;
            for (IntWritable b : twentyMinuteBlocks) {
                blocks += b.get();
            }
            top.put(blocks, bike.toString());
            if (top.size() > TOP) {
                top.remove(top.firstKey());
            }
        }

        @Override
        protected void cleanup(Context context) throws IOException, InterruptedException {
            for (Map.Entry<Integer, String> e : top.descendingMap().entrySet()) {
                context.write(new Text(e.getValue()), new IntWritable(e.getKey()));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "busiest bikes");
        job.setJarByClass(BusiestBikes.class);
        job.setMapperClass(SecondsMapper.class);
        job.setReducerClass(TopBikesReducer.class);
        job.setNumReduceTasks(1);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
