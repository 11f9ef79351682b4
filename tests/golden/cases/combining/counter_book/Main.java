
import java.io.IOException;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

public class Main {
  static class Tally {
    final String word;
    int seen = 0;
    Tally(String word) { this.word = word; }
  }

  static class TallyBook {
    private final Map<String, Tally> byWord;
    TallyBook() { byWord = new HashMap<String, Tally>(); }
    void add(String w, int n) {
      Tally t = byWord.get(w);
      if (t == null) {
        t = new Tally(w);
        byWord.put(w, t);
      }
      t.seen++;
    }
    Collection<Tally> all() { return byWord.values(); }
    int size() { return byWord.size(); }
  }

  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    private TallyBook book;
    protected void setup(Context context) { book = new TallyBook(); }
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      for (String w : value.toString().split(" ")) {
        int n = w.length();
        book.add(w, n);
      }
    }
    protected void cleanup(Context context) throws IOException, InterruptedException {
      Text word = new Text();
      IntWritable count = new IntWritable();
      for (Tally t : book.all()) {
        word.set(t.word);
        count.set(t.seen);
        context.write(word, count);
      }
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "words");
    job.setMapperClass(M.class);
    job.setReducerClass(org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0])); FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
