"""Map-side joins: a side file read into a HashMap / HashSet in setup(), looked up in map().

Java's rules the scripts must keep, with their sources:
- HashMap.put: "If the map previously contained a mapping for the key, the old value is
  replaced" (Java SE 17 API, java.util.HashMap.put) — the last line of the file wins.
- HashMap.get returns null for a missing key (java.util.HashMap.get); getOrDefault returns the
  default (java.util.Map.getOrDefault).
- `a && b` evaluates b only when a is true (JLS 17, 15.23): a lookup on the right of a length
  check must not fail on the lines the check rejects.
"""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.conftest import SAMPLES, load_script
from tests.helpers import scan_text

GOLDEN = Path(__file__).parents[1] / "golden" / "cases" / "side_file"


def _lines(out: Path) -> list[str]:
    return "".join(p.read_text() for p in sorted(out.glob("part-*"))).splitlines()


def _zone_job(tmp_path, case: str, reports: str, zones: str) -> list[str]:
    """Run a golden zone script: dock reports (id TAB ...) and a zones side file (id,zone)."""
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "r.tsv").write_text(reports)
    (tmp_path / "zones.csv").write_text(zones)
    script = load_script(GOLDEN / case / "expected.py")
    assert script.main([str(tmp_path / "in"), str(tmp_path / "out"), str(tmp_path / "zones.csv")]) == 0
    return _lines(tmp_path / "out")


def test_a_key_repeated_in_the_side_file_keeps_its_last_value(spark, tmp_path):
    lines = _zone_job(tmp_path, "lookup_skip", "7\tx\n8\ty\n", "7,North\n8,East\n7,South\n")
    assert lines == ["South\t7:south", "East\t8:east"]


def test_a_missing_key_passes_through_where_java_tests_for_null(spark, tmp_path):
    lines = _zone_job(tmp_path, "pass_through", "7\tx\n9\ty\n", "7,North\n")
    assert lines == ["North\tlisted", "9\tunlisted"]


def test_a_lookup_behind_a_length_check_runs_only_where_the_check_holds(spark, tmp_path, converted_samples):
    out_dir, report = converted_samples
    (job,) = [j for j in report["jobs"] if j["driver"] == "net.brindleharbour.fleet.RetiredBikeRides"]
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "r.csv").write_text("R1,B233,Quayside\nno commas here\nR2,B444\nR3,B1\n")
    (tmp_path / "retired.txt").write_text("B233\n\nB444\nB233\n")
    script = load_script(out_dir / job["script"])
    assert script.main([str(tmp_path / "in"), str(tmp_path / "retired.txt"), str(tmp_path / "out")]) == 0
    assert _lines(tmp_path / "out") == ["R1,B233,Quayside", "R2,B444"]


MAPPER = """
import java.io.*;
import java.net.URI;
import java.util.*;
import org.apache.hadoop.conf.Configuration;
import org.apache.hadoop.fs.Path;
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.FileOutputFormat;

public class Main {
    public static class M extends Mapper<LongWritable, Text, Text, Text> {
        private Map<String, Integer> docks = new HashMap<>();
        protected void setup(Context context) throws IOException {
            URI[] files = context.getCacheFiles();
            BufferedReader in = new BufferedReader(new FileReader(files[0].getPath()));
            String line;
            while ((line = in.readLine()) != null) {
                String[] f = line.split(",");
                docks.put(f[0], Integer.parseInt(f[1]));
            }
            in.close();
        }
        protected void map(LongWritable k, Text value, Context context) throws IOException, InterruptedException {
            String id = value.toString();
            MAP_BODY
        }
    }
    public static void main(String[] args) throws Exception {
        Job job = Job.getInstance(new Configuration(), "docks");
        job.setMapperClass(M.class);
        job.setNumReduceTasks(0);
        job.setOutputKeyClass(Text.class);
        job.setOutputValueClass(Text.class);
        CACHE_CALL
        FileInputFormat.addInputPath(job, new Path(args[0]));
        FileOutputFormat.setOutputPath(job, new Path(args[1]));
        job.waitForCompletion(true);
    }
}
"""


def _job(tmp_path, body: str, cache: str = "job.addCacheFile(new URI(args[2]));"):
    src = MAPPER.replace("MAP_BODY", body).replace("CACHE_CALL", cache)
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    return job, src


@pytest.mark.parametrize("cache, position", [
    ("job.addCacheFile(new URI(args[2]));", 2),
    ("job.addCacheFile(URI.create(args[3]));", 3),
    ("job.addCacheFile(new Path(args[2]).toUri());", 2),
    ("job.addCacheFile(new URI(args[2] + \"#docks\"));", 2),
    ("org.apache.hadoop.filecache.DistributedCache.addCacheFile(new URI(args[2]), job.getConfiguration());", 2),
])
def test_the_shipped_file_becomes_a_script_argument_in_the_drivers_place(tmp_path, cache, position):
    job, _ = _job(tmp_path, 'context.write(new Text(id), new Text(String.valueOf(docks.getOrDefault(id, 0))));', cache)
    assert job.plan.hand_work == ()
    (table,) = job.plan.tables
    assert (table.field, table.kind, table.key_type, table.value_type) == ("docks", "map", "String", "int")
    param = [p for p in job.plan.params if p.name == table.param]
    assert param and param[0].position == position


@pytest.mark.parametrize("body, reason", [
    ("int n = docks.get(id);\n context.write(new Text(id), new Text(String.valueOf(n)));", "NullPointerException"),
    ("Integer n = docks.get(id);\n context.write(new Text(id), new Text(\"\" + n));", "may be null"),
    ("context.write(new Text(id), new Text(\"\" + docks.get(id)));", "inside an expression"),
    ("Integer n = docks.get(7);\n if (n == null) return;\n context.write(new Text(id), new Text(\"x\"));",
     "never matches"),
])
def test_null_prone_lookups_are_declined_at_their_line(tmp_path, body, reason):
    job, src = _job(tmp_path, body)
    first = body.split("\n")[0].strip()
    line = next(i for i, text in enumerate(src.splitlines(), 1) if first in text)
    items = [h for h in job.plan.hand_work if h.blocking]
    assert items and items[0].origin.line_start in (line, line + 1) and reason in items[0].reason, items
    assert job.status != "converted"


def test_a_catch_that_swallows_the_read_error_is_declined(tmp_path):
    src = (GOLDEN / "swallowed_error" / "ZoneSwallowed.java").read_text()
    (job,) = scan_text(tmp_path, {"ZoneSwallowed.java": src}).jobs
    catch_line = next(i for i, text in enumerate(src.splitlines(), 1) if "catch (IOException" in text)
    (item,) = [h for h in job.plan.hand_work if h.category == "task-lifecycle"]
    assert item.origin.line_start == catch_line and "empty or partial table" in item.reason
    assert not job.plan.tables


def test_sample_side_file_jobs_are_converted(converted_samples):
    _, report = converted_samples
    for driver in ("net.brindleharbour.stations.RidesPerDistrict", "net.brindleharbour.fleet.RetiredBikeRides"):
        (job,) = [j for j in report["jobs"] if j["driver"] == driver]
        assert job["status"] == "converted", job["hand_work"]
    assert (SAMPLES / "data" / "fleet_lists" / "retired_bikes.txt").exists()
