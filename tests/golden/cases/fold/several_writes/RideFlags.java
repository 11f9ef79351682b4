import java.io.IOException;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/** Per member type: ride count, and a flag line when any ride ran over an hour (one reduce task). */
public class RideFlags {
    public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
        protected void map(LongWritable k, Text v, Context ctx) throws IOException, InterruptedException {
            String[] f = v.toString().split(",");
            if (f.length > 6 && !f[0].equals("ride_id")) ctx.write(new Text(f[6]), new IntWritable(Integer.parseInt(f[5])));
        }
    }

    public static class R extends Reducer<Text, IntWritable, Text, Text> {
        protected void reduce(Text type, Iterable<IntWritable> secs, Context ctx) throws IOException, InterruptedException {
            int n = 0;
            boolean overHour = false;
            for (IntWritable s : secs) {
                n++;
                if (s.get() > 3600) overHour = true;
            }
            ctx.write(type, new Text("rides " + n));
            if (overHour) ctx.write(new Text(type + "!"), new Text("over an hour"));
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "ride flags");
        job.setMapperClass(M.class);
        job.setReducerClass(R.class);
        job.setMapOutputKeyClass(Text.class);
        job.setMapOutputValueClass(IntWritable.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
