package net.brindleharbour.ferry;

import java.io.IOException;

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
 * Deck load per sailing for the harbour ferry. Lines: sailing,deck,grams,vehicles
 * ("S12,B,5400000,3"). Three of Java's own traps are in it and the output keeps them:
 * the mean per vehicle is an integer division widened to a double, the deck letter becomes
 * a number by char arithmetic, and the reducer adds longs into an int total.
 */
public class DeckLoadPerSailing {

    public static class LoadMapper extends Mapper<LongWritable, Text, Text, LongWritable> {
        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 4 || f[1].isEmpty()) {
                return;
            }
            try {
                long grams = Long.parseLong(f[2]);
                int vehicles = Integer.parseInt(f[3]);
                int deck = f[1].charAt(0) - 'A';
                double perVehicle = (int) (grams / 1000) / vehicles;
                context.write(new Text(f[0] + "/deck" + deck + "/" + perVehicle), new LongWritable(grams));
            } catch (NumberFormatException | ArithmeticException e) {
                // a bad number or no vehicles: not a loading record
            }
        }
    }

    public static class TotalReducer extends Reducer<Text, LongWritable, Text, LongWritable> {
        private final LongWritable total = new LongWritable();

        @Override
        protected void reduce(Text key, Iterable<LongWritable> values, Context context)
                throws IOException, InterruptedException {
            int sum = 0;
            for (LongWritable v : values) {
                sum += v.get();
            }
            total.set(sum);
            context.write(key, total);
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "deck load per sailing");
        job.setJarByClass(DeckLoadPerSailing.class);
        job.setMapperClass(LoadMapper.class);
        job.setCombinerClass(TotalReducer.class);
        job.setReducerClass(TotalReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
