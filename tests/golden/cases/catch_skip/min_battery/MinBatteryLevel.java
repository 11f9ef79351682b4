package net.brindleharbour.tickets;

import java.io.IOException;
import java.util.Iterator;

import org.apache.hadoop.conf.Configured;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.DoubleWritable;
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
import org.apache.hadoop.util.Tool;
import org.apache.hadoop.util.ToolRunner;

/** Lowest battery charge reported in a repair ticket, per bike. Rows without a reading are skipped. */
public class MinBatteryLevel extends Configured implements Tool {

    static class BatteryMapper extends MapReduceBase implements Mapper<LongWritable, Text, Text, DoubleWritable> {
        @Override
        public void map(LongWritable key, Text value, OutputCollector<Text, DoubleWritable> out, Reporter reporter)
                throws IOException {
            String[] f = value.toString().split(";");
            try {
                double pct = Double.parseDouble(f[5]);
                out.collect(new Text(f[1]), new DoubleWritable(pct));
            } catch (NumberFormatException | ArrayIndexOutOfBoundsException e) {
                // header, short rows and missing readings
            }
        }
    }

    static class LowestReducer extends MapReduceBase implements Reducer<Text, DoubleWritable, Text, DoubleWritable> {
        @Override
        public void reduce(Text bike, Iterator<DoubleWritable> values, OutputCollector<Text, DoubleWritable> out,
                           Reporter reporter) throws IOException {
            double lowest = Double.MAX_VALUE;
            while (values.hasNext()) {
                lowest = Math.min(lowest, values.next().get());
            }
            out.collect(bike, new DoubleWritable(lowest));
        }
    }

    @Override
    public int run(String[] args) throws Exception {
        JobConf conf = new JobConf(getConf(), MinBatteryLevel.class);
        conf.setJobName("min battery level per bike");
        conf.setMapperClass(BatteryMapper.class);
        conf.setReducerClass(LowestReducer.class);
        conf.setOutputKeyClass(Text.class);
        conf.setOutputValueClass(DoubleWritable.class);
        FileInputFormat.setInputPaths(conf, new Path(args[0]));
        FileOutputFormat.setOutputPath(conf, new Path(args[1]));
        JobClient.runJob(conf);
        return 0;
    }

    public static void main(String[] args) throws Exception {
        System.exit(ToolRunner.run(new MinBatteryLevel(), args));
    }
}
