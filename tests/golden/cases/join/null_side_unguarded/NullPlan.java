package demo.join;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.MultipleInputs;
import org.apache.hadoop.mapreduce.lib.input.TextInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Each ride with its member's plan, "none" for rides of unknown members (a left outer join). */
public class NullPlan {
    public static class MemberMapper extends Mapper<LongWritable, Text, Text, Text> {
        protected void map(LongWritable k, Text line, Context ctx) throws IOException, InterruptedException {
            String[] f = line.toString().split("\\|");
            ctx.write(new Text(f[0]), new Text("M\t" + f[3]));
        }
    }

    public static class RideMapper extends Mapper<LongWritable, Text, Text, Text> {
        protected void map(LongWritable k, Text line, Context ctx) throws IOException, InterruptedException {
            String[] f = line.toString().split(",");
            ctx.write(new Text(f[1]), new Text("R\t" + f[0]));
        }
    }

    public static class PlanJoin extends Reducer<Text, Text, Text, Text> {
        protected void reduce(Text member, Iterable<Text> values, Context ctx) throws IOException, InterruptedException {
            String plan = null;
            List<String> rides = new ArrayList<>();
            for (Text v : values) {
                String[] p = v.toString().split("\t", 2);
                if (p[0].equals("M")) {
                    plan = p[1];
                } else {
                    rides.add(p[1]);
                }
            }
            for (String ride : rides) {
                ctx.write(new Text(ride), new Text(member + "\t" + plan));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "plan of ride");
        MultipleInputs.addInputPath(job, new Path(args[0]), TextInputFormat.class, MemberMapper.class);
        MultipleInputs.addInputPath(job, new Path(args[1]), TextInputFormat.class, RideMapper.class);
        job.setReducerClass(PlanJoin.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileOutputFormat.setOutputPath(job, new Path(args[2]));
        job.waitForCompletion(true);
    }
}
