package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Mapper;

/** Emits (start station, 1) for every ride in the nightly ride log. */
public class StationRideMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
    private static final IntWritable ONE = new IntWritable(1);
    private static final String HEADER_PREFIX = "ride_id";

    @Override
    public void map(LongWritable offset, Text line, Context context) throws IOException, InterruptedException {
        String row = line.toString();
        if (row.startsWith(HEADER_PREFIX)) {
            return; // the export repeats its header in every file
        }
        String[] cols = row.split(",");
        if (cols.length < 8) {
            return;
        }
        context.write(new Text(cols[2]), ONE);
    }
}
