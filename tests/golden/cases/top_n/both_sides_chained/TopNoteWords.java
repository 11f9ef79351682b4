package net.brindleharbour.notes;

import java.io.IOException;
import java.util.Map;
import java.util.TreeMap;

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

/**
 * The words the workshop's mechanics write most often, in two chained jobs: the first counts the
 * words of the notes (word TAB count), the second reads those lines and keeps the top words by
 * count in a TreeMap trimmed to N entries and written in cleanup(): each map task keeps its own
 * top N, and the one reducer the top N of those, fewest first. N is the setting notes.top. Words
 * with the same count share one entry: the later word replaces it.
 */
public class TopNoteWords {

    public static class WordMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private static final IntWritable ONE = new IntWritable(1);

        @Override
        protected void map(LongWritable offset, Text value, Context context) throws IOException, InterruptedException {
            for (String word : value.toString().split("[^A-Za-z]+")) {
                if (!word.isEmpty()) {
                    context.write(new Text(word.toLowerCase()), ONE);
                }
            }
        }
    }

    public static class CountReducer extends Reducer<Text, IntWritable, Text, IntWritable> {
        @Override
        protected void reduce(Text word, Iterable<IntWritable> ones, Context context)
                throws IOException, InterruptedException {
            int n = 0;
            for (IntWritable one : ones) {
                n += one.get();
            }
            context.write(word, new IntWritable(n));
        }
    }

    public static class CountLineMapper extends Mapper<LongWritable, Text, Text, IntWritable> {
        private int top;
        private TreeMap<Integer, String> byCount;

        @Override
        protected void setup(Context context) {
            top = Integer.parseInt(context.getConfiguration().get("notes.top"));
            byCount = new TreeMap<Integer, String>();
        }

        @Override
        protected void map(LongWritable offset, Text value, Context context) {
            String[] f = value.toString().split("\t");
            byCount.put(Integer.parseInt(f[1]), f[0]);
            if (byCount.size() > top) {
                byCount.remove(byCount.firstKey());
            }
        }

        @Override
        protected void cleanup(Context context) throws IOException, InterruptedException {
            for (Map.Entry<Integer, String> e : byCount.entrySet()) {
                context.write(new Text(e.getValue()), new IntWritable(e.getKey()));
            }
        }
    }

    public static class TopWordsReducer extends Reducer<Text, IntWritable, IntWritable, Text> {
        private int top;
        private TreeMap<Integer, String> byCount;

        @Override
        protected void setup(Context context) {
            top = Integer.parseInt(context.getConfiguration().get("notes.top"));
            byCount = new TreeMap<Integer, String>();
        }

        @Override
        protected void reduce(Text word, Iterable<IntWritable> counts, Context context) {
            int count = 0;
            for (IntWritable c : counts) {
                count = c.get(); // one line per word: the count the first job wrote
            }
            byCount.put(count, word.toString());
            if (byCount.size() > top) {
                byCount.remove(byCount.firstKey());
            }
        }

        @Override
        protected void cleanup(Context context) throws IOException, InterruptedException {
            for (Map.Entry<Integer, String> e : byCount.entrySet()) {
                context.write(new IntWritable(e.getKey()), new Text(e.getValue()));
            }
        }
    }

    public static void main(String[] args) throws Exception {
        Configuration conf = new Configuration();
        conf.set("notes.top", "3");

        Job counts = Job.getInstance(conf, "note word counts");
        counts.setJarByClass(TopNoteWords.class);
        counts.setMapperClass(WordMapper.class);
        counts.setReducerClass(CountReducer.class);
        counts.setOutputKeyClass(Text.class);
        counts.setOutputValueClass(IntWritable.class);
        FileInputFormat.addInputPath(counts, new Path(args[0]));
        FileOutputFormat.setOutputPath(counts, new Path(args[1]));
        if (!counts.waitForCompletion(true)) {
            System.exit(1);
        }

        Job top = Job.getInstance(conf, "top note words");
        top.setJarByClass(TopNoteWords.class);
        top.setMapperClass(CountLineMapper.class);
        top.setReducerClass(TopWordsReducer.class);
        top.setMapOutputKeyClass(Text.class);
        top.setMapOutputValueClass(IntWritable.class);
        top.setOutputKeyClass(IntWritable.class);
        top.setOutputValueClass(Text.class);
        FileInputFormat.addInputPath(top, new Path(args[1]));
        FileOutputFormat.setOutputPath(top, new Path(args[2]));
        System.exit(top.waitForCompletion(true) ? 0 : 1);
    }
}
