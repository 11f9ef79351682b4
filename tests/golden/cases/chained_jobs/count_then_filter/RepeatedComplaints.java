package net.quillfield.feedback;

import java.io.IOException;
import java.util.StringTokenizer;

import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
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

/** Words riders used more than once (old API): a word count, then a map-only filter over its folder. */
public class RepeatedComplaints {
    public static class WordMapper extends MapReduceBase implements Mapper<LongWritable, Text, Text, IntWritable> {
        public void map(LongWritable k, Text v, OutputCollector<Text, IntWritable> out, Reporter r) throws IOException {
            StringTokenizer t = new StringTokenizer(v.toString());
            while (t.hasMoreTokens()) {
                out.collect(new Text(t.nextToken()), new IntWritable(1));
            }
        }
    }

    public static class Sum extends MapReduceBase implements Reducer<Text, IntWritable, Text, IntWritable> {
        public void reduce(Text k, java.util.Iterator<IntWritable> vs, OutputCollector<Text, IntWritable> out, Reporter r)
                throws IOException {
            int n = 0;
            while (vs.hasNext()) {
                n += vs.next().get();
            }
            out.collect(k, new IntWritable(n));
        }
    }

    public static class Repeated extends MapReduceBase implements Mapper<LongWritable, Text, Text, IntWritable> {
        public void map(LongWritable k, Text line, OutputCollector<Text, IntWritable> out, Reporter r) throws IOException {
            String[] f = line.toString().split("\t");
            int n = Integer.parseInt(f[1]);
            if (n > 1) {
                out.collect(new Text(f[0]), new IntWritable(n));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf count = new JobConf(RepeatedComplaints.class);
        count.setJobName("complaint words");
        count.setMapperClass(WordMapper.class);
        count.setReducerClass(Sum.class);
        count.setOutputKeyClass(Text.class);
        count.setOutputValueClass(IntWritable.class);
        FileInputFormat.setInputPaths(count, new Path(args[0]));
        FileOutputFormat.setOutputPath(count, new Path("/tmp/complaint-words"));
        JobClient.runJob(count);

        JobConf repeated = new JobConf(RepeatedComplaints.class);
        repeated.setJobName("repeated complaint words");
        repeated.setMapperClass(Repeated.class);
        repeated.setNumReduceTasks(0);
        repeated.setOutputKeyClass(Text.class);
        repeated.setOutputValueClass(IntWritable.class);
        FileInputFormat.setInputPaths(repeated, new Path("/tmp/complaint-words"));
        FileOutputFormat.setOutputPath(repeated, new Path(args[1]));
        JobClient.runJob(repeated);
    }
}
