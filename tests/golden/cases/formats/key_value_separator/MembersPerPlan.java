package net.brindleharbour.members;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.input.KeyValueTextInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer;

/**
 * Members per plan from the pipe-separated member register: KeyValueTextInputFormat with "|"
 * as the key/value separator, so the key is the member id and the value the rest of the line.
 */
public class MembersPerPlan {

    public static class PlanMapper extends Mapper<Text, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);

        @Override
        protected void map(Text memberId, Text rest, Context context) throws IOException, InterruptedException {
            String[] f = rest.toString().split("\\|");
            if (f.length > 2) {
                context.write(new Text(memberId.toString().trim().substring(0, 1) + ":" + f[2].trim()), ONE);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        conf.set("mapreduce.input.keyvaluelinerecordreader.key.value.separator", "|");
        Job job = Job.getInstance(conf, "members per plan");
        job.setJarByClass(MembersPerPlan.class);
        job.setInputFormatClass(KeyValueTextInputFormat.class);
        job.setMapperClass(PlanMapper.class);
        job.setReducerClass(IntSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
