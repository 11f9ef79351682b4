package net.brindleharbour.rides;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.io.WritableComparable;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

/**
 * Rides per route (start station to end station), for the timetable planners. Written in another
 * hand than the other jobs: one key object reused through its setters, and a scratch array kept
 * in a field.
 */
public class RidesPerRoute {

    /** From one station to another; sorted by start, then end. */
    public static class Route implements WritableComparable<Route> {
        private String from = "";
        private String to = "";

        public void setFrom(String from) {
            this.from = from;
        }

        public void setTo(String to) {
            this.to = to;
        }

        @Override
        public void write(DataOutput out) throws IOException {
            out.writeUTF(from);
            out.writeUTF(to);
        }

        @Override
        public void readFields(DataInput in) throws IOException {
            from = in.readUTF();
            to = in.readUTF();
        }

        @Override
        public int compareTo(Route o) {
            int c = from.compareTo(o.from);
            if (c != 0) {
                return c;
            }
            return to.compareTo(o.to);
        }

        @Override
        public int hashCode() {
            return from.hashCode() * 31 + to.hashCode();
        }

        @Override
        public boolean equals(Object other) {
            return other instanceof Route && compareTo((Route) other) == 0;
        }

        @Override
        public String toString() {
            return from + " -> " + to;
        }
    }

    public static class RouteMapper extends Mapper<LongWritable, Text, Route, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);
        private final Route route = new Route();
        private String[] cols;

        @Override
        protected void map(LongWritable offset, Text value, Context context) throws IOException, InterruptedException {
            cols = value.toString().split(",");
            if (cols.length < 4 || cols[0].equals("ride_id")) {
                return;
            }
            route.setFrom(cols[2]);
            route.setTo(cols[3]);
            context.write(route, ONE);
        }
    }

    public static class RouteSumReducer extends Reducer<Route, IntWritable, Route, IntWritable> {
        private final IntWritable total = new IntWritable();

        @Override
        protected void reduce(Route route, Iterable<IntWritable> ones, Context context)
                throws IOException, InterruptedException {
            int n = 0;
            for (IntWritable one : ones) {
                n += one.get();
            }
            total.set(n);
            context.write(route, total);
        }
    }

    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "rides per route");
        job.setJarByClass(RidesPerRoute.class);
        job.setMapperClass(RouteMapper.class);
        job.setReducerClass(RouteSumReducer.class);
        job.setMapOutputKeyClass(Route.class);
        job.setMapOutputValueClass(IntWritable.class);
        job.setOutputKeyClass(Route.class);
        job.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
