package net.quillfield.tags;

import java.io.IOException;
import java.util.Iterator;

import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapred.FileInputFormat;
import org.apache.hadoop.mapred.FileOutputFormat;
import org.apache.hadoop.mapred.JobClient;
import org.apache.hadoop.mapred.JobConf;
import org.apache.hadoop.mapred.MapReduceBase;
import org.apache.hadoop.mapred.Mapper;
import org.apache.hadoop.mapred.OutputCollector;
import org.apache.hadoop.mapred.Reducer;
import org.apache.hadoop.mapred.Reporter;
import org.apache.hadoop.mapred.lib.ChainMapper;
import org.apache.hadoop.mapred.lib.ChainReducer;

/** Tag counts per bike, old API: one mapper splits "bike;tag", the next trims and lower-cases the tag. */
public class TrimmedTags {
    public static class SplitTag extends MapReduceBase implements Mapper<LongWritable, Text, Text, Text> {
        public void map(LongWritable k, Text v, OutputCollector<Text, Text> out, Reporter r) throws IOException {
            String[] f = v.toString().split(";");
            if (f.length == 2) {
                out.collect(new Text(f[0]), new Text(f[1]));
            }
        }
    }

    public static class CleanTag extends MapReduceBase implements Mapper<Text, Text, Text, LongWritable> {
        public void map(Text bike, Text tag, OutputCollector<Text, LongWritable> out, Reporter r) throws IOException {
            String t = tag.toString().trim().toLowerCase();
            if (!t.isEmpty()) {
                out.collect(new Text(bike + ":" + t), new LongWritable(1));
            }
        }
    }

    public static class Count extends MapReduceBase implements Reducer<Text, LongWritable, Text, LongWritable> {
        public void reduce(Text k, Iterator<LongWritable> vs, OutputCollector<Text, LongWritable> out, Reporter r)
                throws IOException {
            long n = 0;
            while (vs.hasNext()) {
                n += vs.next().get();
            }
            out.collect(k, new LongWritable(n));
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf job = new JobConf(TrimmedTags.class);
        job.setJobName("trimmed tags");
        ChainMapper.addMapper(job, SplitTag.class, LongWritable.class, Text.class, Text.class, Text.class, true,
                new JobConf(false));
        ChainMapper.addMapper(job, CleanTag.class, Text.class, Text.class, Text.class, LongWritable.class, true,
                new JobConf(false));
        ChainReducer.setReducer(job, Count.class, Text.class, LongWritable.class, Text.class, LongWritable.class, true,
                new JobConf(false));
        FileInputFormat.setInputPaths(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        JobClient.runJob(job);
    }
}
