package net.brindleharbour.docks;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.NullWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * One health line per dock status report for the sensor dashboard (map only). The arithmetic is
 * the dashboard's long-standing formula; keep it exactly as Java computes it.
 */
public class DockHealthLines {
    enum Level { OK, LOW, FULL }

    public static class HealthMapper extends Mapper<LongWritable, Text, NullWritable, Text> {
        private static final double CAPACITY_SCALE = 1.5;

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String line = value.toString();
            if (line == null || line.startsWith("dock_id") || !line.contains("\t")) {
                return;
            }
            String[] f = line.split("\t");
            float bikes = Float.parseFloat(f[3]);
            int free = Integer.parseInt(f[4]);
            double fill = bikes / (bikes + free);
            double score = Math.sqrt(Math.abs(fill - 0.5)) * 100;
            String level = fill < 0.2 ? Level.LOW.name() : fill > 0.8 ? Level.FULL.name() : Level.OK.name();
            String when = f[2].replaceAll("[-:]", "").replace("T", " ");
            int tIndex = f[2].indexOf("T");
            String slot = f[2].substring(tIndex + 1);
            boolean evening = slot.matches("1[89]:.*");
            context.write(NullWritable.get(), new Text(String.valueOf(Integer.parseInt(f[0]) * 10)
                    + "|" + f[1].toUpperCase() + "|" + when + "|" + level
                    + "|" + Math.floor(score) + "|" + Math.ceil(fill * 10) + "|" + Math.pow(free, 2)
                    + "|" + Math.max(free, (int) bikes) + "|" + Math.min(fill, 0.75) * CAPACITY_SCALE
                    + "|" + (evening ? "evening" : "day") + "|" + value.getLength()));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "dock health lines");
        job.setJarByClass(DockHealthLines.class);
        job.setMapperClass(HealthMapper.class);
        job.setNumReduceTasks(0);
        job.setOutputKeyClass(NullWritable.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
