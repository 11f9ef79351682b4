package net.quillfield.docks;

import java.io.BufferedReader;
import java.io.FileReader;
import java.io.IOException;
import java.net.URI;
import java.util.HashMap;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Each dock report with its zone; a dock missing from the zone list keeps its id (pass-through). */
public class ZoneOrDock {
    public static class ZoneMapper extends Mapper<LongWritable, Text, Text, Text> {
        private HashMap<String, String> zones = new HashMap<>();

        @Override
        protected void setup(Context context) throws IOException {
            BufferedReader in = new BufferedReader(new FileReader("zones"));
            String line;
            while ((line = in.readLine()) != null) {
                String[] kv = line.split(",", 2);
                zones.put(kv[0], kv[1]);
            }
            in.close();
        }

        @Override
        protected void map(LongWritable offset, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split("\t");
            String zone = zones.get(f[0]);
            context.write(new Text(zone != null ? zone : f[0]), new Text(zones.containsKey(f[0]) ? "listed" : "unlisted"));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "zone of dock");
        job.setMapperClass(ZoneMapper.class);
        job.setNumReduceTasks(0);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        job.addCacheFile(new URI(args[2] + "#zones"));
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
