package net.brindleharbour.rides;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.Writable;

/** Seconds ridden and rides counted: a partial result that adds up field by field. */
public class RideTally implements Writable {
    private long seconds;
    private long rides;

    public RideTally() {
    }

    public RideTally(long seconds, long rides) {
        this.seconds = seconds;
        this.rides = rides;
    }

    public long getSeconds() {
        return seconds;
    }

    public long getRides() {
        return rides;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        out.writeLong(seconds);
        out.writeLong(rides);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        seconds = in.readLong();
        rides = in.readLong();
    }

    @Override
    public String toString() {
        return seconds + "/" + rides;
    }
}
