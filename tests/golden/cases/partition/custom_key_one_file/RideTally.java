package net.brindleharbour.reports;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.Writable;

/** A count of rides and their total seconds, carried from map to reduce. */
public class RideTally implements Writable {
    private int rides;
    private long seconds;

    public RideTally() {
    }

    public RideTally(int rides, long seconds) {
        this.rides = rides;
        this.seconds = seconds;
    }

    public int getRides() {
        return rides;
    }

    public long getSeconds() {
        return seconds;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        out.writeInt(rides);
        out.writeLong(seconds);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        rides = in.readInt();
        seconds = in.readLong();
    }
}
