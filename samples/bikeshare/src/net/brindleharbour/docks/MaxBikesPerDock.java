package net.brindleharbour.docks;

import java.io.IOException;
import java.util.Iterator;

import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapred.*;

/**
 * Peak number of bikes seen at each dock during the day (old mapred API, as written in 2012).
 * Dock ids are numeric keys, so the output is ordered 3, 7, 12, 21, 105.
 */
public class MaxBikesPerDock {

    public static class DockMapper extends MapReduceBase
            implements Mapper<LongWritable, Text, IntWritable, IntWritable> {
        public void map(LongWritable key, Text value, OutputCollector<IntWritable, IntWritable> output,
                        Reporter reporter) throws IOException {
            String line = value.toString();
            if (line.startsWith("dock_id")) {
                return;
            }
            String[] parts = line.split("\t");
            int dock = Integer.parseInt(parts[0]);
            int bikes = Integer.parseInt(parts[3]);
            output.collect(new IntWritable(dock), new IntWritable(bikes));
        }
    }

    public static class PeakReducer extends MapReduceBase
            implements Reducer<IntWritable, IntWritable, IntWritable, IntWritable> {
        public void reduce(IntWritable dock, Iterator<IntWritable> values,
                           OutputCollector<IntWritable, IntWritable> output, Reporter reporter) throws IOException {
            int max = Integer.MIN_VALUE;
            while (values.hasNext()) {
                int v = values.next().get();
                if (v > max) {
                    max = v;
                }
            }
            output.collect(dock, new IntWritable(max));
        }
    }

    public static void main(String[] args) throws IOException {
        JobConf conf = new JobConf(MaxBikesPerDock.class);
        conf.setJobName("max bikes per dock");
        conf.setOutputKeyClass(IntWritable.class);
        conf.setOutputValueClass(IntWritable.class);
        conf.setMapperClass(DockMapper.class);
        conf.setCombinerClass(PeakReducer.class);
        conf.setReducerClass(PeakReducer.class);
        conf.setInputFormat(TextInputFormat.class);
        conf.setOutputFormat(TextOutputFormat.class);
        FileInputFormat.setInputPaths(conf, new Path(args[0]));
        FileOutputFormat.setOutputPath(conf, new Path(args[1]));
        JobClient.runJob(conf);
    }
}
