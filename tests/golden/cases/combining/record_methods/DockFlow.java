import java.io.DataInput;
import java.io.DataOutput;
import java.io.IOException;
import org.apache.hadoop.io.Writable;

/** Bikes docked and undocked at one dock: a sum and a count of each, added to through methods. */
public class DockFlow implements Writable {
  private long docked;
  private int dockings;
  private long undocked;
  private int undockings;

  public DockFlow() {
    this.docked = new Long(0);
    this.dockings = 0;
  }

  public DockFlow(long docked, int dockings, long undocked, int undockings) {
    this.docked = docked;
    this.dockings = dockings;
    this.undocked = undocked;
    this.undockings = undockings;
  }

  public void addDocked(long bikes, int times) { this.docked += bikes; this.dockings += times; }
  public void addUndocked(long bikes, int times) { undocked += bikes; undockings += times; }
  public void add(DockFlow other) {
    this.docked += other.docked;
    this.dockings += other.dockings;
    this.undocked += other.undocked;
    this.undockings += other.undockings;
  }

  public long getDocked() { return docked; }
  public int getDockings() { return dockings; }
  public long getUndocked() { return undocked; }
  public int getUndockings() { return this.undockings; }

  public void readFields(DataInput in) throws IOException {
    docked = in.readLong(); dockings = in.readInt(); undocked = in.readLong(); undockings = in.readInt();
  }
  public void write(DataOutput out) throws IOException {
    out.writeLong(docked); out.writeInt(dockings); out.writeLong(undocked); out.writeInt(undockings);
  }
}
