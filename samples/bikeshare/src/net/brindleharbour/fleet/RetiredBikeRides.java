package net.brindleharbour.fleet;

import java.io.BufferedReader;
import java.io.File;
import java.io.FileReader;
import java.io.IOException;
import java.net.URI;
import java.util.HashSet;
import java.util.Iterator;
import java.util.Set;

import org.apache.hadoop.filecache.DistributedCache;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.NullWritable;
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
 * Rides taken on bikes the workshop has retired (old API, map-only). configure() reads the
 * retired-bike list, one id per line, from the distributed cache into a HashSet; the ids are
 * not trimmed, so a line " B412" does not match bike B412.
 */
public class RetiredBikeRides {

    public static class RetiredFilter extends MapReduceBase implements Mapper<LongWritable, Text, NullWritable, Text> {
        private Set<String> retired;

        @Override
        public void configure(JobConf job) {
            retired = new HashSet<>();
            try {
                URI[] lists = DistributedCache.getCacheFiles(job);
                BufferedReader in = new BufferedReader(new FileReader(new File(lists[0].getPath())));
                try {
                    for (String line = in.readLine(); line != null; line = in.readLine()) {
                        if (line.isEmpty()) {
                            continue;
                        }
                        retired.add(line);
                    }
                } finally {
                    in.close();
                }
            } catch (IOException e) {
                throw new RuntimeException("cannot read the retired-bike list", e);
            }
        }

        @Override
        public void map(LongWritable offset, Text value, OutputCollector<NullWritable, Text> out, Reporter reporter)
                throws IOException {
            String[] f = value.toString().split(",");
            if (f.length > 1 && retired.contains(f[1])) {
                out.collect(NullWritable.get(), value);
            }
        }
    }

    public static void main(String[] args) throws Exception {
        JobConf conf = new JobConf(RetiredBikeRides.class);
        conf.setJobName("rides on retired bikes");
        conf.setMapperClass(RetiredFilter.class);
        conf.setNumReduceTasks(0);
        conf.setOutputKeyClass(NullWritable.class);
        conf.setOutputValueClass(Text.class);
        DistributedCache.addCacheFile(new URI(args[1]), conf);
        FileInputFormat.setInputPaths(conf, new Path(args[0]));
        FileOutputFormat.setOutputPath(conf, new Path(args[2]));
        JobClient.runJob(conf);
    }
}
