package net.brindleharbour.rides;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.DoubleWritable;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer;

/**
 * One driver for two station reports; the first argument picks the job:
 * StationRideReport rides|duration <rides folder> <output folder>.
 */
public class StationRideReport {
    public static void main(String[] args) throws Exception {
        if (args.length != 3) {
            System.err.println("usage: StationRideReport rides|duration <in> <out>");
            System.exit(2);
        }
        Job job = Job.getInstance(new Configuration(), "station ride report");
        job.setJarByClass(StationRideReport.class);
        job.setOutputKeyClass(Text.class);
        String report = args[0];
        if (report.equals("rides")) {
            // rides started per station
            job.setMapperClass(StationRideMapper.class);
            job.setCombinerClass(IntSumReducer.class);
            job.setReducerClass(IntSumReducer.class);
            job.setOutputValueClass(IntWritable.class);
        } else if (report.equals("duration")) {
            // mean ride duration per start station
            job.setMapperClass(DurationMapper.class);
            job.setReducerClass(AverageDurationReducer.class);
            job.setMapOutputValueClass(IntWritable.class);
            job.setOutputValueClass(DoubleWritable.class);
        } else {
            System.err.println("unknown report " + report + ": rides or duration");
            System.exit(2);
        }
        FileInputFormat.addInputPath(job, new Path(args[1]));
        FileOutputFormat.setOutputPath(job, new Path(args[2]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
