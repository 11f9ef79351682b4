// Workshop statistics: tickets per repair category.
// Écrit par l'équipe atelier — «ne pas toucher» — Werkstatt-Statistik für die Flotte.
import java.io.IOException;

import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.Job;
import org.apache.hadoop.mapreduce.Mapper;
import org.apache.hadoop.mapreduce.Reducer;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

class CategoryMapper extends Mapper<LongWritable, Text, Text, LongWritable> {
    private static final LongWritable ONE = new LongWritable(1L);

    @Override
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
        String[] f = value.toString().split(";");
        if (f.length < 5 || f[0].equals("ticket_id")) {
            return;
        }
        // catégorie en minuscules — "Brakes" et "brakes" sont la même chose
        context.write(new Text(f[2].trim().toLowerCase()), ONE);
    }
}

class CategoryCountReducer extends Reducer<Text, LongWritable, Text, LongWritable> {
    @Override
    protected void reduce(Text key, Iterable<LongWritable> values, Context context)
            throws IOException, InterruptedException {
        long n = 0;
        for (LongWritable ignored : values) {
            n++;
        }
        context.write(key, new LongWritable(n));
    }
}

class TicketsPerCategory {
    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "tickets per category");
        job.setJarByClass(TicketsPerCategory.class);
        job.setMapperClass(CategoryMapper.class);
        job.setReducerClass(CategoryCountReducer.class);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(LongWritable.class);
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        System.exit(job.waitForCompletion(true) ? 0 : 1);
    }
}
