package net.brindleharbour.tickets;

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

/**
 * Whole hours a ticket stays open, averaged per category. The workshop report has always
 * shown whole hours: the division is long / long and truncates on purpose.
 */
public class AverageHoursToClose {

    public static class HoursMapper extends MapReduceBase implements Mapper<LongWritable, Text, Text, LongWritable> {
        public void map(LongWritable key, Text value, OutputCollector<Text, LongWritable> output, Reporter reporter)
                throws IOException {
            String[] f = value.toString().split(";");
            if (f.length < 5) {
                return;
            }
            long hours;
            try {
                hours = Long.parseLong(f[4]);
            } catch (NumberFormatException notANumber) {
                return; // "n/a", "-" and the header
            }
            output.collect(new Text(f[2]), new LongWritable(hours));
        }
    }

    public static class TruncatingAverageReducer extends MapReduceBase
            implements Reducer<Text, LongWritable, Text, LongWritable> {
        public void reduce(Text key, Iterator<LongWritable> values, OutputCollector<Text, LongWritable> output,
                           Reporter reporter) throws IOException {
            long total = 0;
            long tickets = 0;
            while (values.hasNext()) {
                total += values.next().get();
                tickets += 1;
            }
            output.collect(key, new LongWritable(total / tickets));
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf conf = new JobConf(AverageHoursToClose.class);
        conf.setJobName("average hours to close");
        conf.setMapperClass(HoursMapper.class);
        conf.setReducerClass(TruncatingAverageReducer.class);
        conf.setOutputKeyClass(Text.class);
        conf.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(conf, new Path(args[0]));
        FileOutputFormat.setOutputPath(conf, new Path(args[1]));
        JobClient.runJob(conf);
    }
}
