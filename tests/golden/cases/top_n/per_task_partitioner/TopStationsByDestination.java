package net.brindleharbour.reports;

import java.io.IOException;
import java.util.Map;
import java.util.TreeMap;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.conf.Configured;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Partitioner;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.util.Tool;
import org.apache.hadoop.util.ToolRunner;

/**
 * The three most popular destinations, computed per reducer and emitted in cleanup().
 * A TreeMap keyed by count (ties overwrite each other!), one per reduce task, split by a custom partitioner.
 */
public class TopStationsByDestination extends Configured implements Tool {

    public static class DestinationMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length > 3 && !f[0].equals("ride_id")) {
                context.write(new Text(f[3]), ONE);
            }
        }
    }

    public static class FirstLetterPartitioner extends Partitioner<Text, IntWritable> {
        @Override
        public int getPartition(Text key, IntWritable value, int numPartitions) {
            return (key.toString().charAt(0) & Integer.MAX_VALUE) % numPartitions;
        }
    }

    public static class TopThreeReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        private final TreeMap<Integer, String> top = new TreeMap<>();

        @Override
        protected void reduce(Text key, Iterable<IntWritable> values, Context context) {
            int sum = 0;
            for (IntWritable v : values) {
                sum += v.get();
            }
            top.put(sum, key.toString());
            if (top.size() > 3) {
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

    @Override
    public int run(String[] args) throws Exception {
        Job job = Job.getInstance(getConf(), "top destinations");
        job.setJarByClass(TopStationsByDestination.class);
        job.setMapperClass(DestinationMapper.class);
        job.setPartitionerClass(FirstLetterPartitioner.class);
        job.setReducerClass(TopThreeReducer.class);
        job.setNumReduceTasks(3);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        return job.waitForCompletion(true) ? 0 : 1;
    }

    public static void main(String[] args) throws Exception {
        System.exit(ToolRunner.run(new Configuration(), new TopStationsByDestination(), args));
    }
}
