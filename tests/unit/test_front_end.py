"""Front end: parsing, the class index, roles and driver reading, on the sample repository and on
small cases. Roles follow the Hadoop API docs: a mapper extends org.apache.hadoop.mapreduce.Mapper
or implements org.apache.hadoop.mapred.Mapper (old API, with MapReduceBase); the driver is the
class whose main(String[]) or Tool.run(String[]) configures a Job or JobConf."""
from __future__ import annotations

from tests.conftest import SAMPLES
from tests.helpers import HEADER, scan_text
from migrate.scan import scan_repo


def _sample():
    return scan_repo(SAMPLES)


def test_every_sample_file_parses_including_crlf_and_non_ascii():
    scan = _sample()
    assert scan.errors == []
    assert any(f.path.endswith("workshop_stats.java") for f in scan.files)  # CRLF, French/German comments


def test_roles_across_both_apis_nested_and_separate_files():
    idx = _sample().index
    roles = {c.fqcn: (c.roles, c.api) for c in idx}
    assert roles["net.brindleharbour.docks.MaxBikesPerDock.DockMapper"] == ({"mapper"}, "mapred")
    assert roles["net.brindleharbour.docks.MaxBikesPerDock.PeakReducer"] == ({"reducer", "combiner"}, "mapred")
    assert roles["net.brindleharbour.rides.StationRideMapper"] == ({"mapper"}, "mapreduce")  # its own file
    assert "partitioner" in roles["net.brindleharbour.reports.TopStationsByDestination.FirstLetterPartitioner"][0]
    assert "driver" in roles["net.brindleharbour.rides.RidesPerStation"][0]  # Tool + ToolRunner
    assert "driver" in roles["TicketsPerCategory"][0]  # default package, file name differs from the class


def test_driver_reads_classes_types_paths_and_reducer_count():
    jobs = {j.spec.driver.fqcn: j.spec for j in _sample().jobs}
    avg = jobs["net.brindleharbour.rides.AverageRideDuration"]
    assert avg.classes["mapper"] == "net.brindleharbour.rides.DurationMapper"
    assert avg.types == {"map_key": "org.apache.hadoop.io.Text", "map_value": "org.apache.hadoop.io.IntWritable",
                         "out_key": "org.apache.hadoop.io.Text", "out_value": "org.apache.hadoop.io.DoubleWritable"}
    assert [i.index for i in avg.inputs] == [0] and avg.output.index == 1  # through locals `in`, `out`
    assert avg.deletes_output  # fs.delete(out, true) before the run
    assert jobs["net.brindleharbour.rides.LongRidesFilter"].num_reduces == 0
    assert jobs["net.brindleharbour.rides.LongRidesFilter"].deletes_output  # out.getFileSystem(conf).delete(out, true)
    tool = jobs["net.brindleharbour.tickets.MinBatteryLevel"]
    assert tool.api == "mapred" and tool.method == "run"
    assert jobs["net.brindleharbour.reports.TopStationsByDestination"].num_reduces == 3


def test_hard_coded_paths_become_options_with_the_old_value():
    jobs = {j.spec.driver.fqcn: j for j in _sample().jobs}
    peak = jobs["net.brindleharbour.reports.PeakHourByStation"]
    params = {p.name: p for p in peak.plan.params}
    assert params["input_path"].default == "hdfs://bh-namenode:8020/data/rides/current"
    assert params["output_path"].default == "/srv/reports/peak_hour"
    assert peak.spec.conf["mapreduce.job.queuename"] == "reports"


def test_wildcard_imports_and_fully_qualified_names_resolve(tmp_path):
    src = """
import org.apache.hadoop.io.*;
import org.apache.hadoop.mapreduce.*;
public class W {
  static class M extends org.apache.hadoop.mapreduce.Mapper<LongWritable, Text, Text, IntWritable> {}
  static class R extends Reducer<Text, IntWritable, Text, IntWritable> {}
}
"""
    scan = scan_text(tmp_path, {"W.java": src})
    roles = {c.name: c.roles for c in scan.index}
    assert roles["M"] == {"mapper"} and roles["R"] == {"reducer"}


def test_same_package_classes_in_other_files_resolve(tmp_path):
    a = "package p;\n" + HEADER + "public class A extends Mapper<LongWritable, Text, Text, IntWritable> {}\n"
    b = "package p;\n" + HEADER + "public class B extends A {}\n"  # a mapper through its superclass
    scan = scan_text(tmp_path, {"p/A.java": a, "p/B.java": b})
    assert {c.fqcn: c.roles for c in scan.index}["p.B"] == {"mapper"}


def test_chained_jobs_in_one_driver_become_one_pipeline(tmp_path):
    src = HEADER + """
public class Two {
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      c.write(v, new IntWritable(1));
    }
  }
  public static void main(String[] args) throws Exception {
    Job first = Job.getInstance(new Configuration(), "first");
    first.setMapperClass(M.class);
    first.setOutputKeyClass(Text.class);
    first.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(first, new Path(args[0]));
    FileOutputFormat.setOutputPath(first, new Path(args[1]));
    first.waitForCompletion(true);
    Job second = Job.getInstance(new Configuration(), "second");
    second.setMapperClass(M.class);
    second.setOutputKeyClass(Text.class);
    second.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(second, new Path(args[1]));
    FileOutputFormat.setOutputPath(second, new Path(args[2]));
    second.waitForCompletion(true);
  }
}
"""
    scan = scan_text(tmp_path, {"Two.java": src})
    assert [j.spec.name for j in scan.jobs] == ["first → second"]  # the second reads the first's folder
    (job,) = scan.jobs
    assert [st.plan.job_name for st in job.plan.upstream] == ["first"] and job.plan.source.upstream == 0
    assert [(p.name, p.position) for p in job.plan.params] == [("input_path", 0), ("job_1_output", 1),
                                                              ("output_path", 2)]
    assert not any(h.category == "chained-jobs" for h in job.plan.hand_work)
    # the identity mapper passes on TextInputFormat's byte offsets, which only files have: no chain
    scan = scan_text(tmp_path, {"Two.java": src.replace("    second.setMapperClass(M.class);\n", "")})
    assert [j.spec.name for j in scan.jobs] == ["first", "second"]
    assert any("byte offsets" in h.reason for h in scan.jobs[1].plan.hand_work if h.category == "chained-jobs")
    # a folder computed at run time is not followed: one script per job, and the item says why
    scan = scan_text(tmp_path, {"Two.java": src.replace("new Path(args[1]));\n    first", "new Path(args[1] + \"_t\"));\n    first")})
    assert [j.spec.name for j in scan.jobs] == ["first", "second"]
    for j in scan.jobs:
        (item,) = [h for h in j.plan.hand_work if h.category == "chained-jobs"]
        assert "job 2 does not read exactly the folder job 1 writes" in item.reason


def test_custom_writable_value_is_read_and_a_mismatched_write_is_named(tmp_path):
    pair = "import java.io.*;\nimport org.apache.hadoop.io.*;\n" \
           "public class Pair implements Writable {\n  int a;\n" \
           "  public void write(DataOutput out) throws IOException { out.writeInt(a); }\n" \
           "  public void readFields(DataInput in) throws IOException { a = in.readInt(); }\n}\n"
    from tests.helpers import job_source

    src = job_source("context.write(value, new IntWritable(1));", reducer_class=None, map_out=("Text", "Pair"))
    scan = scan_text(tmp_path, {"Pair.java": pair, "Main.java": src})
    roles = {c.fqcn: c.roles for c in scan.index}
    assert roles["Pair"] == {"writable"}
    (job,) = scan.jobs
    # Pair is read as a struct; the mapper writes an IntWritable where Pair is declared, which
    # Hadoop rejects at run time ("Type mismatch in value from map")
    items = [h for h in job.plan.hand_work if h.category == "type-mismatch"]
    assert items and "where the driver declares Pair" in items[0].reason


def test_generic_options_parser_args_and_comma_separated_input_paths():
    # Hadoop javadoc: FileInputFormat.setInputPaths(Job, String commaSeparatedPaths) splits on commas;
    # addInputPath(Job, Path) takes one path. GenericOptionsParser.getRemainingArgs() = args without -D etc.
    jobs = {j.spec.driver.fqcn: j for j in _sample().jobs}
    corpus = jobs["net.brindleharbour.notes.CorpusWordCount"]
    assert [(r.index, r.split_commas) for r in corpus.spec.inputs] == [(0, True), (1, False)]
    assert corpus.spec.output.index == 2
    assert [p.position for p in corpus.plan.params] == [0, 1, 2]
    assert corpus.plan.source.split_commas == (True, False)
