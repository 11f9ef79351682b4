package net.brindleharbour.reports;

import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;

import org.apache.hadoop.io.WritableComparable;

/** A start station and an hour of the day: the composite key of the station-hour reports. */
public class StationHour implements WritableComparable<StationHour> {
    private String station;
    private int hour;

    public StationHour() {
    }

    public StationHour(String station, int hour) {
        this.station = station;
        this.hour = hour;
    }

    public String getStation() {
        return station;
    }

    public int getHour() {
        return hour;
    }

    @Override
    public void write(DataOutput out) throws IOException {
        out.writeUTF(station);
        out.writeInt(hour);
    }

    @Override
    public void readFields(DataInput in) throws IOException {
        station = in.readUTF();
        hour = in.readInt();
    }

    @Override
    public int compareTo(StationHour o) {
        int c = station.compareTo(o.station);
        if (c != 0) {
            return c;
        }
        return Integer.compare(hour, o.hour);
    }

    @Override
    public int hashCode() {
        return station.hashCode() * 31 + hour;
    }

    @Override
    public boolean equals(Object other) {
        return other instanceof StationHour && compareTo((StationHour) other) == 0;
    }

    @Override
    public String toString() {
        return station + "@" + hour + "h";  // not zero-padded: 7h sorts before 17h only by compareTo
    }
}
