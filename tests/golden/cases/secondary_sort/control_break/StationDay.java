package net.brindleharbour.fleet;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.Text;
import org.apache.hadoop.io.WritableComparable;

/** A start station and a day written as yyyymmdd: stations in order, each station's days in order. */
public class StationDay implements WritableComparable<StationDay> {
    private Text station = new Text();
    private int day;

    public StationDay() {
    }

    public StationDay(String station, int day) {
        this.station = new Text(station);
        this.day = day;
    }

    public Text getStation() {
        return station;
    }

    public int getDay() {
        return day;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        station.write(out);
        out.writeInt(day);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        station.readFields(in);
        day = in.readInt();
    }

    @Override
    public int compareTo(StationDay o) {
        int c = station.compareTo(o.station);
        return c != 0 ? c : Integer.compare(day, o.day);
    }

    @Override
    public int hashCode() {
        return station.hashCode() * 31 + day;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof StationDay && compareTo((StationDay) o) == 0;
    }

    @Override
    public String toString() {
        return station + "/" + day;
    }
}
