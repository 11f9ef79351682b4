package net.brindleharbour.rides;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer;

/**
 * Fare revenue in cents per start station, plus a grand total under "ALL" and a total per
 * member type under "type:casual" / "type:member". Free rides (0 cents) are not counted.
 */
public class StationFareTotals {

    public static class FareMapper extends Mapper<LongWritable, Text, Text, LongWritable> {
        private final Text outKey = new Text();
        private final LongWritable cents = new LongWritable();

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String line = value.toString();
            if (line.startsWith("ride_id")) return;
            String[] f = line.split(",", -1);
            long fare = Long.parseLong(f[7].trim());
            if (fare <= 0) {
                return;
            }
            cents.set(fare);
            outKey.set(f[2]);
            context.write(outKey, cents);
            context.write(new Text("ALL"), cents);
            if (f[6].equals("casual")) {
                context.write(new Text("type:casual"), cents);
            } else {
                context.write(new Text("type:" + f[6]), cents);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "station fare totals");
        job.setJarByClass(StationFareTotals.class);
        job.setMapperClass(FareMapper.class);
        job.setCombinerClass(LongSumReducer.class);
        job.setReducerClass(LongSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
