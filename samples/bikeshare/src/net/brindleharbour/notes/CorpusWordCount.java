package net.brindleharbour.notes;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer;
import org.apache.hadoop.util.GenericOptionsParser;

/**
 * Words of four letters or more across every free-text source we keep. The first argument may be
 * a comma-separated list of folders; the second is one more folder; the third is the output.
 */
public class CorpusWordCount {
    public static class LongWordMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            for (String raw : value.toString().split("[^A-Za-z0-9']+")) {
                String w = raw.toLowerCase();
                if (w.length() < 4) {
                    continue;
                }
                context.write(new Text(w), ONE);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        String[] rest = new GenericOptionsParser(conf, args).getRemainingArgs();
        if (rest.length != 3) {
            System.err.println("usage: CorpusWordCount <dirs,comma,separated> <more dir> <out>");
            System.exit(2);
        }
        Job job = Job.getInstance(conf, "corpus word count");
        job.setJarByClass(CorpusWordCount.class);
        job.setMapperClass(LongWordMapper.class);
        job.setCombinerClass(IntSumReducer.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.setInputPaths(job, rest[0]);
        FileInputFormat.addInputPath(job, new Path(rest[1]));
        FileOutputFormat.setOutputPath(job, new Path(rest[2]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
