package net.brindleharbour.fleet;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.Writable;

/** One ride's day (yyyymmdd) and duration in seconds. */
public class DayRide implements Writable {
    private int day;
    private int seconds;

    public DayRide() {
    }

    public DayRide(int day, int seconds) {
        this.day = day;
        this.seconds = seconds;
    }

    public int getDay() {
        return day;
    }

    public int getSeconds() {
        return seconds;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        out.writeInt(day);
        out.writeInt(seconds);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        day = in.readInt();
        seconds = in.readInt();
    }
}
