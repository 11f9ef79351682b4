package net.brindleharbour.tickets;

import java.io.IOException;

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
import org.apache.hadoop.mapred.Reporter;

/**
 * One invoice line per repair ticket for the finance export (old mapred API, map only).
 * The hourly rate is a job setting read in configure().
 */
public class RepairCostLines {

    public static class CostMapper extends MapReduceBase implements Mapper<LongWritable, Text, Text, Text> {
        private float ratePerHour;
        private String currency;

        @Override
        public void configure(JobConf job) {
            ratePerHour = job.getFloat("repair.rate.per.hour", 18.5f);
            currency = job.get("repair.currency", "BHD");
        }

        public void map(LongWritable key, Text value, OutputCollector<Text, Text> out, Reporter reporter)
                throws IOException {
            String[] f = value.toString().split(";");
            if (f.length < 5 || f[0].equals("ticket_id")) {
                return;
            }
            int hours;
            try {
                hours = Integer.parseInt(f[4].strip());
            } catch (NumberFormatException e) {
                return;
            }
            String category = f[2].strip();
            String label = Character.toString(category.charAt(0)).toUpperCase() + category.substring(1);
            double cost = Math.round(hours * (double) ratePerHour * 100) / 100.0;
            String ticket = f[0].replace("T-", "");
            out.collect(new Text(ticket), new Text(String.format("%s|%s|%d h|%.2f %s", f[1], label, hours, cost, currency)
                    + (cost > 300 ? "|REVIEW" : "")));
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf conf = new JobConf(RepairCostLines.class);
        conf.setJobName("repair cost lines");
        conf.set("repair.currency", "BHC");
        conf.setMapperClass(CostMapper.class);
        conf.setNumReduceTasks(0);
        conf.setOutputKeyClass(Text.class);
        conf.setOutputValueClass(Text.class);
        FileInputFormat.setInputPaths(conf, new Path(args[0]));
        FileOutputFormat.setOutputPath(conf, new Path(args[1]));
        JobClient.runJob(conf);
    }
}
