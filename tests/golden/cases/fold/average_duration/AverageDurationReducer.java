package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.io.DoubleWritable;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Reducer;

public class AverageDurationReducer extends Reducer<Text, IntWritable, Text, DoubleWritable> {
    @Override
    protected void reduce(Text station, Iterable<IntWritable> durations, Context context)
            throws IOException, InterruptedException {
        long sum = 0;
        int count = 0;
        for (IntWritable d : durations) {
            sum += d.get();
            count++;
        }
        context.write(station, new DoubleWritable((double) sum / count));
    }
}
