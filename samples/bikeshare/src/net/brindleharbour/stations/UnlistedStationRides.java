package net.brindleharbour.stations;

import java.io.IOException;
import java.util.ArrayList;
import java.util.List;

import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapred.FileOutputFormat;
import org.apache.hadoop.mapred.JobClient;
import org.apache.hadoop.mapred.JobConf;
import org.apache.hadoop.mapred.KeyValueTextInputFormat;
import org.apache.hadoop.mapred.MapReduceBase;
import org.apache.hadoop.mapred.Mapper;
import org.apache.hadoop.mapred.OutputCollector;
import org.apache.hadoop.mapred.Reducer;
import org.apache.hadoop.mapred.Reporter;
import org.apache.hadoop.mapred.TextInputFormat;
import org.apache.hadoop.mapred.lib.MultipleInputs;

/**
 * Old API. Rides whose start station is missing from the station list (an anti join), and the
 * number of rides of each listed station that has any, tagged by a leading letter.
 */
public class UnlistedStationRides {

    public static class ListedMapper extends MapReduceBase implements Mapper<Text, Text, Text, Text> {
        public void map(Text station, Text district, OutputCollector<Text, Text> out, Reporter reporter)
                throws IOException {
            out.collect(station, new Text("L"));
        }
    }

    public static class RideMapper extends MapReduceBase implements Mapper<LongWritable, Text, Text, Text> {
        public void map(LongWritable offset, Text line, OutputCollector<Text, Text> out, Reporter reporter)
                throws IOException {
            String[] f = line.toString().split(",");
            if (f.length > 2 && !f[0].equals("ride_id")) {
                out.collect(new Text(f[2]), new Text("R" + f[0]));
            }
        }
    }

    public static class Unlisted extends MapReduceBase implements Reducer<Text, Text, Text, Text> {
        public void reduce(Text station, java.util.Iterator<Text> values, OutputCollector<Text, Text> out,
                           Reporter reporter) throws IOException {
            String listed = null;
            List<String> rides = new ArrayList<String>();
            while (values.hasNext()) {
                String v = values.next().toString();
                if (v.charAt(0) == 'L') {
                    listed = "yes";
                } else {
                    rides.add(v.substring(1));
                }
            }
            if (listed == null) {
                for (String ride : rides) {
                    out.collect(station, new Text("unlisted ride " + ride));
                }
            } else if (!rides.isEmpty()) {
                out.collect(station, new Text("listed"));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf conf = new JobConf(UnlistedStationRides.class);
        conf.setJobName("unlisted station rides");
        MultipleInputs.addInputPath(conf, new Path(args[0]), KeyValueTextInputFormat.class, ListedMapper.class);
        MultipleInputs.addInputPath(conf, new Path(args[1]), TextInputFormat.class, RideMapper.class);
        conf.setReducerClass(Unlisted.class);
        conf.setOutputKeyClass(Text.class);
        conf.setOutputValueClass(Text.class);
        FileOutputFormat.setOutputPath(conf, new Path(args[2]));
        JobClient.runJob(conf);
    }
}
