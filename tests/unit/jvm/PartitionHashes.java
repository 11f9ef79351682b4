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
        List<String> sorted = new java.util.ArrayList<>();
        for (String hex : lines) {
            byte[] b = new byte[hex.length() / 2];
            for (int j = 0; j < b.length; j++) {
                b[j] = (byte) Integer.parseInt(hex.substring(2 * j, 2 * j + 2), 16);
            }
            sorted.add(new String(b, StandardCharsets.UTF_8));
        }
        java.util.Collections.sort(sorted);  // String.compareTo
        for (String s : sorted) {
            System.out.println("sorted\t" + lines.indexOf(toHex(s)));
        }
        for (String a : args[1].split(",")) {
            long v = Long.parseLong(a);
            System.out.println("long\t" + v + "\t" + new LongWritable(v).hashCode());
        }
    }

    private static String toHex(String s) {
        StringBuilder out = new StringBuilder();
        for (byte x : s.getBytes(StandardCharsets.UTF_8)) {
            out.append(String.format("%02x", x));
        }
        return out.toString();
    }
}
