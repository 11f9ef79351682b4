package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Mapper;

/** (start station, ride duration in seconds); the header line is skipped by its offset. */
public class DurationMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
    private final Text station = new Text();
    private final IntWritable seconds = new IntWritable();

    @Override
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
        if (key.get() == 0) {
            return;
        }
        String[] f = value.toString().split(",");
        station.set(f[2]);
        seconds.set(Integer.parseInt(f[5]));
        context.write(station, seconds);
    }
}
