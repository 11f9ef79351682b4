import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Paths;
import java.util.List;

import org.apache.hadoop.io.IntWritable;
import org.apache.hadoop.io.LongWritable;
import org.apache.hadoop.io.Text;
import org.apache.hadoop.mapreduce.lib.partition.HashPartitioner;

/** Prints, per input string (hex UTF-8 lines), the hashes Hadoop partitions by; per long, LongWritable's. */
public class PartitionHashes {
    public static void main(String[] args) throws Exception {
        List<String> lines = Files.readAllLines(Paths.get(args[0]), StandardCharsets.US_ASCII);
        HashPartitioner<Text, IntWritable> hp = new HashPartitioner<>();
        for (int i = 0; i < lines.size(); i++) {
            String hex = lines.get(i);
            byte[] b = new byte[hex.length() / 2];
            for (int j = 0; j < b.length; j++) {
                b[j] = (byte) Integer.parseInt(hex.substring(2 * j, 2 * j + 2), 16);
            }
            String s = new String(b, StandardCharsets.UTF_8);
            Text t = new Text(s);
            String first = s.isEmpty() ? "throws" : Integer.toString(s.charAt(0));
            System.out.println(i + "\t" + t.hashCode() + "\t" + s.hashCode() + "\t" + first + "\t"
                    + hp.getPartition(t, null, 7));
        }
        for (String a : args[1].split(",")) {
            long v = Long.parseLong(a);
            System.out.println("long\t" + v + "\t" + new LongWritable(v).hashCode());
        }
    }
}
