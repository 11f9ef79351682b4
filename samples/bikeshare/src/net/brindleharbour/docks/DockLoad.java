package net.brindleharbour.docks;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.Writable;

/** Bikes available and docks free, summed over a number of status reports. */
public class DockLoad implements Writable {
    private long bikes;
    private long free;
    private int reports;

    public DockLoad() {
    }

    public DockLoad(long bikes, long free, int reports) {
        this.bikes = bikes;
        this.free = free;
        this.reports = reports;
    }

    /** One status report: bikes available and docks free at that moment. */
    public void report(int bikesAvailable, int docksFree) {
        bikes += bikesAvailable;
        free += docksFree;
        reports += 1;
    }

    public void add(DockLoad other) {
        this.bikes += other.bikes;
        this.free += other.free;
        this.reports += other.reports;
    }

    public long getBikes() {
        return bikes;
    }

    public long getFree() {
        return free;
    }

    public int getReports() {
        return reports;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        out.writeLong(bikes);
        out.writeLong(free);
        out.writeInt(reports);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        bikes = in.readLong();
        free = in.readLong();
        reports = in.readInt();
    }
}
