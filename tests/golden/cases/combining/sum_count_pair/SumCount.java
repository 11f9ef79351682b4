
import java.io.*;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

public class SumCount implements Writable {
  private long sum; private long count;
  public SumCount() {}
  public SumCount(long s, long c) { sum = s; count = c; }
  public long getSum() { return sum; }
  public long getCount() { return count; }
  public void write(DataOutput out) throws IOException { out.writeLong(sum); out.writeLong(count); }
  public void readFields(DataInput in) throws IOException { sum = in.readLong(); count = in.readLong(); }
  public String toString() { return sum + "," + count; }
}
