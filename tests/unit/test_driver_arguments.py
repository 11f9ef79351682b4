"""A driver's arguments as a small program reads them (java.driver): every argument but the last
added as an input by a loop (`for (int i = 0; i < args.length - 1; ++i)`, the form of Hadoop's own
WordCount example), the output as `args[args.length - 1]`, arrays of literal paths walked by a loop
with known bounds. The script takes the same command line: a run of inputs, then the output."""
from __future__ import annotations

import pytest

from migrate.gen.pyspark import argument_slots
from tests.helpers import HEADER, scan_text, verify_one_job

MAPPER = """
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    private final IntWritable one = new IntWritable(1);
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      for (String w : v.toString().split(" ")) {
        if (!w.isEmpty()) c.write(new Text(w), one);
      }
    }
  }
  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      int n = 0;
      for (IntWritable v : vs) n += v.get();
      c.write(k, new IntWritable(n));
    }
  }
"""

LOOP = """    for (int i = 0; i < otherArgs.length - 1; ++i) {
      FileInputFormat.addInputPath(job, new Path(otherArgs[i]));
    }
    FileOutputFormat.setOutputPath(job, new Path(otherArgs[otherArgs.length - 1]));"""


def _job(paths: str, args: str = "new GenericOptionsParser(conf, args).getRemainingArgs()") -> str:
    return HEADER + "import org.apache.hadoop.util.GenericOptionsParser;\npublic class Main {\n" + MAPPER + f"""
  public static void main(String[] args) throws Exception {{
    Configuration conf = new Configuration();
    String[] otherArgs = {args};
    if (otherArgs.length < 2) {{
      System.err.println("Usage: wordcount <in> [<in>...] <out>");
      System.exit(2);
    }}
    Job job = Job.getInstance(conf, "word count");
    job.setMapperClass(M.class); job.setReducerClass(R.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(IntWritable.class);
{paths}
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }}
}}
"""


def test_every_argument_but_the_last_as_inputs_matches_hadoop(tmp_path):
    """Three input folders, the output last: Hadoop's local runner and the script given the same arguments."""
    data = {"a/1.txt": b"the quay the mill\n", "b/2.txt": b"mill ferry\n\nthe\n", "c/3.txt": b"bell the\n"}
    check = verify_one_job(tmp_path, _job(LOOP), data, args=["data/a", "data/b", "data/c", "@out"])
    assert check.verdict == "agrees", check.detail


def _plan(tmp_path, source: str):
    (job,) = scan_text(tmp_path, {"Main.java": source}).jobs
    return job


@pytest.mark.parametrize("loop", [
    LOOP,
    LOOP.replace("i < otherArgs.length - 1", "i <= otherArgs.length - 2").replace("++i", "i += 1"),
    LOOP.replace("otherArgs.length - 1;", "-1 + otherArgs.length;").replace("++i", "i++"),
])
def test_the_script_takes_a_run_of_inputs_then_the_output(tmp_path, loop):
    job = _plan(tmp_path, _job(loop))
    assert job.status == "converted", [h.reason for h in job.plan.hand_work]
    slots = [(s.name, s.nargs) for s in argument_slots(job.plan.params)]
    assert slots == [("input_path", "+"), ("output_path", None)]
    assert job.plan.source.lists == (True,)


def test_a_loop_from_the_second_argument_keeps_the_first_by_position(tmp_path):
    loop = LOOP.replace("int i = 0", "int i = 1") + '\n    job.getConfiguration().set("label", otherArgs[0]);'
    slots = [(s.name, s.nargs, s.read) for s in argument_slots(_plan(tmp_path, _job(loop)).plan.params)]
    assert slots == [("label", None, True), ("input_path", "+", True), ("output_path", None, True)]


def test_the_output_counted_from_the_end_with_one_input_by_position(tmp_path):
    paths = ("    FileInputFormat.addInputPath(job, new Path(otherArgs[0]));\n"
             "    FileOutputFormat.setOutputPath(job, new Path(otherArgs[otherArgs.length - 1]));")
    job = _plan(tmp_path, _job(paths))
    slots = [(s.name, s.nargs, s.read) for s in argument_slots(job.plan.params)]
    assert slots == [("input_path", None, True), ("middle_args", "*", False), ("output_path", None, True)]


def test_arguments_read_out_of_order_become_options(tmp_path):
    """A loop over every argument but the last that also adds args[0] by position: the command line
    cannot be laid out in the driver's order, so the script says so and takes them by name."""
    loop = LOOP + "\n    FileInputFormat.addInputPath(job, new Path(otherArgs[0]));"
    job = _plan(tmp_path, _job(loop))
    assert any("in an order the script cannot take them in" in h.reason for h in job.plan.hand_work)


def test_a_literal_array_of_paths_walked_by_a_loop(tmp_path):
    """`String[] otherArgs = {"in/a", "in/b", "out"}`: the loop's bounds are known, each path is a literal."""
    job = _plan(tmp_path, _job(LOOP, args='{"in/a", "in/b", "out/words"}'))
    assert [(p.name, p.default, p.positional) for p in job.plan.params] == \
        [("input_path_1", "in/a", False), ("input_path_2", "in/b", False), ("output_path", "out/words", False)]


def test_a_setting_taken_from_an_argument_matches_hadoop(tmp_path):
    """`conf.set("min.count", args[2])`, read in the reducer's setup(): the script takes args[2] in the
    same place and hands it to the job as that setting."""
    source = _job("    FileInputFormat.addInputPath(job, new Path(otherArgs[0]));\n"
                  "    FileOutputFormat.setOutputPath(job, new Path(otherArgs[1]));")
    source = source.replace('Configuration conf = new Configuration();',
                            'Configuration conf = new Configuration();\n    conf.set("min.count", args[2]);')
    source = source.replace("  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {",
                            "  public static class R extends Reducer<Text, IntWritable, Text, IntWritable> {\n"
                            "    private int min;\n"
                            "    protected void setup(Context c) { min = c.getConfiguration().getInt(\"min.count\", 1); }")
    source = source.replace("      c.write(k, new IntWritable(n));", "      if (n >= min) c.write(k, new IntWritable(n));")
    data = {"1.txt": b"the quay the mill\nmill ferry the\nbell\n"}
    check = verify_one_job(tmp_path, source, data, args=["data", "@out", "2"])
    assert check.verdict == "agrees", check.detail


@pytest.mark.parametrize("group_set, args", [
    ("conf.set(RegexMapper.GROUP, args[3]);", ["dock-([0-9]+)", "1"]),
    # Hadoop's Grep example: the group only when a fourth argument is given (RegexMapper's default: 0)
    ("if (args.length == 4)\n      conf.set(RegexMapper.GROUP, args[3]);", ["dock-([0-9]+)", "1"]),
    ("if (args.length == 4)\n      conf.set(RegexMapper.GROUP, args[3]);", ["dock-([0-9]+)"]),
])
def test_a_regex_mapper_pattern_taken_from_an_argument_matches_hadoop(tmp_path, group_set, args):
    """Hadoop's RegexMapper with its pattern and group the driver's arguments (as Hadoop's Grep example
    sets them); Spark's regexp functions use java.util.regex as RegexMapper does."""
    source = HEADER + """import org.apache.hadoop.mapreduce.lib.map.RegexMapper;
import org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer;
public class Main {
  public static void main(String[] args) throws Exception {
    Configuration conf = new Configuration();
    conf.set(RegexMapper.PATTERN, args[2]);
    GROUP_SET
    Job job = Job.getInstance(conf, "dock codes");
    job.setMapperClass(RegexMapper.class);
    job.setCombinerClass(LongSumReducer.class);
    job.setReducerClass(LongSumReducer.class);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(LongWritable.class);
    FileInputFormat.setInputPaths(job, args[0]);
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""
    data = {"1.txt": b"dock-12 to dock-7, dock-12 again\nno docks here\ndock-7dock-9\n"}
    check = verify_one_job(tmp_path, source.replace("GROUP_SET", group_set), data, args=["data", "@out", *args])
    assert check.verdict == "agrees", check.detail


TWO_JOBS = HEADER + """
public class Main {
  public static class Words extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      for (String w : v.toString().split(" ")) {
        if (!w.isEmpty()) c.write(new Text(w), new IntWritable(1));
      }
    }
  }
  public static class Sum extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text k, Iterable<IntWritable> vs, Context c) throws IOException, InterruptedException {
      int n = 0;
      for (IntWritable v : vs) n += v.get();
      c.write(k, new IntWritable(n));
    }
  }
  public static class Repeated extends Mapper<LongWritable, Text, Text, Text> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split("\\t");
      if (Integer.parseInt(f[1]) > 1) c.write(new Text(f[0]), new Text(f[1]));
    }
  }
  public static void main(String[] args) throws Exception {
    Configuration conf = new Configuration();
    MIDDLE
    Job count = Job.getInstance(conf, "count");
    count.setMapperClass(Words.class); count.setReducerClass(Sum.class);
    count.setOutputKeyClass(Text.class); count.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(count, new Path(args[0]));
    FileOutputFormat.setOutputPath(count, middle);
    if (!count.waitForCompletion(true)) System.exit(1);
    Job repeated = Job.getInstance(conf, "repeated");
    repeated.setMapperClass(Repeated.class); repeated.setNumReduceTasks(0);
    repeated.setOutputKeyClass(Text.class); repeated.setOutputValueClass(Text.class);
    FileInputFormat.addInputPath(repeated, middle);
    FileOutputFormat.setOutputPath(repeated, new Path(args[1]));
    boolean ok = repeated.waitForCompletion(true);
    FileSystem.get(conf).delete(middle, true);
    System.exit(ok ? 0 : 1);
  }
}
"""


@pytest.mark.parametrize("middle", [
    'Path middle = new Path(args[1] + "_words");',  # a folder named after an argument
    'Path middle = new Path("words-" + System.currentTimeMillis());',  # a temporary folder named by the time
])
def test_jobs_chained_through_a_computed_folder_match_hadoop(tmp_path, middle):
    """Two jobs through a folder the driver makes at run time (and deletes): one script, the first
    job's lines handed to the second in memory."""
    source = TWO_JOBS.replace("MIDDLE", middle).replace("import java.util.*;", "import java.util.*;\nimport org.apache.hadoop.fs.FileSystem;")
    data = {"1.txt": b"the quay the mill\nmill ferry the\nbell\n"}
    check = verify_one_job(tmp_path, source, data)
    assert check.verdict == "agrees", check.detail
    (job,) = scan_text(tmp_path / "again", {"Main.java": source}).jobs
    assert len(job.plan.upstream) == 1 and [p.name for p in job.plan.params if p.positional] == \
        ["input_path", "output_path"]


SEARCH_THEN_SORT = HEADER + """import org.apache.hadoop.fs.FileSystem;
import org.apache.hadoop.mapreduce.lib.input.SequenceFileInputFormat;
import org.apache.hadoop.mapreduce.lib.output.SequenceFileOutputFormat;
import org.apache.hadoop.mapreduce.lib.map.InverseMapper;
import org.apache.hadoop.mapreduce.lib.map.RegexMapper;
import org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer;
public class Main {
  public static void main(String[] args) throws Exception {
    Path tempDir = new Path("dock-search-" + Integer.toString(new Random().nextInt(Integer.MAX_VALUE)));
    Configuration conf = new Configuration();
    conf.set(RegexMapper.PATTERN, args[2]);
    if (args.length == 4)
      conf.set(RegexMapper.GROUP, args[3]);
    Job search = Job.getInstance(conf, "dock-search");
    try {
      FileInputFormat.setInputPaths(search, args[0]);
      search.setMapperClass(RegexMapper.class);
      search.setCombinerClass(LongSumReducer.class);
      search.setReducerClass(LongSumReducer.class);
      FileOutputFormat.setOutputPath(search, tempDir);
      search.setOutputFormatClass(SequenceFileOutputFormat.class);
      search.setOutputKeyClass(Text.class);
      search.setOutputValueClass(LongWritable.class);
      search.waitForCompletion(true);
      Job sort = Job.getInstance(conf, "dock-sort");
      FileInputFormat.setInputPaths(sort, tempDir);
      sort.setInputFormatClass(SequenceFileInputFormat.class);
      sort.setMapperClass(InverseMapper.class);
      sort.setNumReduceTasks(1);
      FileOutputFormat.setOutputPath(sort, new Path(args[1]));
      sort.setSortComparatorClass(LongWritable.DecreasingComparator.class);
      sort.waitForCompletion(true);
    } finally {
      FileSystem.get(conf).delete(tempDir, true);
    }
  }
}
"""


def test_jobs_chained_through_a_sequence_file_match_hadoop(tmp_path):
    """The form of Hadoop's Grep example: a search job writes (match, count) to a SequenceFile in a
    temporary folder; a second job swaps each pair (InverseMapper) and sorts by count, largest first.
    The pairs pass from one job to the next as typed columns."""
    data = {"1.txt": b"dock-12 to dock-7, dock-12 again\nno docks here\ndock-7dock-9 dock-12\n"}
    check = verify_one_job(tmp_path, SEARCH_THEN_SORT, data, args=["data", "@out", "dock-([0-9]+)", "1"])
    assert check.verdict == "agrees", check.detail


def test_an_input_made_from_an_argument_matches_hadoop(tmp_path):
    """`new Path(args[0] + "/in")`: the script takes args[0] and makes the same path from it."""
    paths = ('    FileInputFormat.addInputPath(job, new Path(otherArgs[0] + "/in"));\n'
             "    FileOutputFormat.setOutputPath(job, new Path(otherArgs[1]));")
    check = verify_one_job(tmp_path, _job(paths), {"in/1.txt": b"the quay the mill\n", "other.txt": b"not read\n"})
    assert check.verdict == "agrees", check.detail


def test_arguments_that_do_not_fit_print_the_drivers_usage_and_exit_code(tmp_path, capsys):
    """`if (otherArgs.length < 2) { System.err.println("Usage: ..."); System.exit(2); }`: given one
    argument, the JVM and the script print the same text to stderr and exit 2."""
    from migrate.convert import write_outputs
    from migrate.scan import scan_repo
    from migrate.verify.hadoop import compile_sources, run_job
    from tests.conftest import load_script

    source = _job(LOOP).replace('System.exit(2);', 'System.exit(3);')
    (tmp_path / "repo").mkdir()
    (tmp_path / "repo" / "Main.java").write_text(source)
    built = compile_sources([tmp_path / "repo" / "Main.java"], tmp_path / "classes")
    assert built.ok, built.log
    ran = run_job(tmp_path / "classes", "Main", ["only-one"], cwd=tmp_path)
    assert ran.returncode == 3 and "Usage: wordcount <in> [<in>...] <out>" in ran.log.splitlines()
    (job,) = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo").report["jobs"]
    with pytest.raises(SystemExit) as stop:
        load_script(tmp_path / "out" / job["script"]).main(["only-one"])
    assert stop.value.code == 3 and capsys.readouterr().err == "Usage: wordcount <in> [<in>...] <out>\n"


def test_one_argument_read_twice_matches_hadoop(tmp_path):
    """args[0] added twice as an input: Hadoop lists the folder's files twice and counts every line
    twice; the script takes args[0] once and reads it for both."""
    paths = ("    FileInputFormat.addInputPath(job, new Path(otherArgs[0]));\n"
             "    FileInputFormat.addInputPath(job, new Path(otherArgs[0]));\n"
             "    FileOutputFormat.setOutputPath(job, new Path(otherArgs[1]));")
    check = verify_one_job(tmp_path, _job(paths), {"1.txt": b"the quay the mill\n"})
    assert check.verdict == "agrees", check.detail


def test_arguments_replaced_only_when_none_are_given_stay_the_scripts_arguments(tmp_path):
    """`if (args.length == 0) args = new String[] {...}`: the driver's fallback when run without
    arguments; given arguments are what it reads, so the script takes them in the same places."""
    source = _job("    FileInputFormat.addInputPath(job, new Path(otherArgs[0]));\n"
                  "    FileOutputFormat.setOutputPath(job, new Path(otherArgs[1]));",
                  args="args").replace("    if (otherArgs.length < 2) {",
                                       '    if (otherArgs.length == 0) {\n'
                                       '      otherArgs = new String[] {"testdata/in", "testdata/out"};\n    }\n'
                                       "    if (otherArgs.length < 2) {")
    job = _plan(tmp_path, source)
    assert [(s.name, s.read) for s in argument_slots(job.plan.params)] == [("input_path", True), ("output_path", True)]
