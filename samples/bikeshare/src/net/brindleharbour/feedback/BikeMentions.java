package net.brindleharbour.feedback;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.map.RegexMapper;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer;

/** How often each bike id (B + three digits) is mentioned in rider feedback and mechanic notes. */
public class BikeMentions {
    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        conf.set(RegexMapper.PATTERN, "B[0-9]{3}");
        Job job = Job.getInstance(conf, "bike mentions");
        job.setJarByClass(BikeMentions.class);
        job.setMapperClass(RegexMapper.class);
        job.setReducerClass(LongSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
