package net.brindleharbour.fleet;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.Text;
import org.apache.hadoop.io.WritableComparable;

/** Natural key (start station) plus the ride's start time: the key of a secondary sort. */
public class StationClock implements WritableComparable<StationClock> {
    private Text station = new Text();
    private String startedAt;

    public StationClock() {
    }

    public StationClock(String station, String startedAt) {
        this.station = new Text(station);
        this.startedAt = startedAt;
    }

    public Text getStation() {
        return station;
    }

    public String getStartedAt() {
        return startedAt;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        station.write(out);
        out.writeUTF(startedAt);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        station.readFields(in);
        startedAt = in.readUTF();
    }

    @Override
    public int compareTo(StationClock o) {
        int c = station.compareTo(o.station);
        return c != 0 ? c : startedAt.compareTo(o.startedAt);
    }

    @Override
    public String toString() {
        return station + " " + startedAt;
    }
}
