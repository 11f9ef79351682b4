package net.brindleharbour.billing;

import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;
import org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer;

/**
 * Surcharge (cents) owed per start station for rides over the free period. The free period and
 * the per-started-quarter-hour rate are job settings; the driver pins the free period.
 */
public class LongRideSurcharges {

    public static class SurchargeMapper extends Mapper<LongWritable, Text, Text, LongWritable> {
        private int freeSeconds;
        private long centsPerQuarter;
        private String exemptType;

        @Override
        protected void setup(Context context) throws IOException, InterruptedException {
            super.setup(context);
            Configuration conf = context.getConfiguration();
            freeSeconds = conf.getInt("surcharge.free.seconds", 1800);
            centsPerQuarter = conf.getLong("surcharge.cents.per.quarter", 75L);
            exemptType = conf.get("surcharge.exempt.type", "staff").trim().toLowerCase();
        }

        private static String stationCode(String name) {
            String cleaned = name.trim().toUpperCase();
            return cleaned.length() > 6 ? cleaned.substring(0, 6) : cleaned;
        }

        private static long quartersStarted(long seconds) {
            return (seconds + 899) / 900;
        }

        @Override
        protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
            String[] f = value.toString().split(",");
            if (f.length < 8 || f[0].equals("ride_id")) {
                return;
            }
            if (f[6].equalsIgnoreCase(exemptType)) {
                return;
            }
            long over = Long.parseLong(f[5]) - freeSeconds;
            if (over > 0) {
                context.write(new Text(stationCode(f[2])), new LongWritable(quartersStarted(over) * centsPerQuarter));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        conf.setInt("surcharge.free.seconds", 2700);
        Job job = Job.getInstance(conf, "long ride surcharges");
        job.setJarByClass(LongRideSurcharges.class);
        job.setMapperClass(SurchargeMapper.class);
        job.setReducerClass(LongSumReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
