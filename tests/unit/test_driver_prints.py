"""What a driver prints after its job from the job's counters: the script prints the same lines.
Checked against the real JVM: the original runs on Hadoop's local runner and its printed lines are
read from its output; a counter only Hadoop keeps (its built-in ones) is hand work, never a 0."""
from __future__ import annotations

from migrate.convert import write_outputs
from migrate.scan import scan_repo
from migrate.verify.hadoop import compile_sources, run_job
from tests.conftest import load_script
from tests.helpers import HEADER, scan_text

SOURCE = HEADER + """
public class Main {
  enum Quality { BAD, SHORT }
  public static class M extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable k, Text v, Context c) throws IOException, InterruptedException {
      String[] f = v.toString().split(",");
      if (f.length < 2) { c.getCounter(Quality.BAD).increment(1); return; }
      if (f[1].length() < 3) c.getCounter(Quality.SHORT).increment(1);
      c.getCounter("rides", "good").increment(1);
      c.write(new Text(f[0]), new IntWritable(1));
    }
  }
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "ride check");
    job.setMapperClass(M.class); job.setNumReduceTasks(0);
    job.setOutputKeyClass(Text.class); job.setOutputValueClass(IntWritable.class);
    FileInputFormat.addInputPath(job, new Path(args[0]));
    FileOutputFormat.setOutputPath(job, new Path(args[1]));
    boolean ok = job.waitForCompletion(true);
    Counters counters = job.getCounters();
    long bad = counters.findCounter(Quality.BAD).getValue();
    System.out.println("bad records: " + bad);
    System.out.print("good rides: ");
    System.out.println("" + counters.findCounter("rides", "good").getValue() + " (short " +
        counters.findCounter(Quality.SHORT).getValue() + ")");
    System.exit(ok ? 0 : 1);
  }
}
"""
PRINTED = ("bad records: ", "good rides: ")


def test_counters_printed_after_the_job_match_the_jvm(tmp_path, capsys):
    (tmp_path / "repo").mkdir()
    (tmp_path / "repo" / "Main.java").write_text(SOURCE)
    data = tmp_path / "data"
    data.mkdir()
    (data / "rides.csv").write_text("quay,long ride\nmill\nbell,ok\nferry,fine one\n\n")
    built = compile_sources([tmp_path / "repo" / "Main.java"], tmp_path / "classes")
    assert built.ok, built.log
    ran = run_job(tmp_path / "classes", "Main", [str(data), str(tmp_path / "hadoop")], cwd=tmp_path)
    assert ran.returncode == 0, ran.log[-2000:]
    java = [line for line in ran.log.splitlines() if line.startswith(PRINTED)]
    written = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo")
    (job,) = written.report["jobs"]
    assert job["status"] == "converted", job["hand_work"]
    capsys.readouterr()
    assert load_script(tmp_path / "out" / job["script"]).main([str(data), str(tmp_path / "spark")]) == 0
    script = [line for line in capsys.readouterr().out.splitlines() if line.startswith(PRINTED)]
    assert java == ["bad records: 2", "good rides: 3 (short 1)"] and script == java


def test_a_counter_hadoop_keeps_itself_is_hand_work(tmp_path):
    source = SOURCE.replace('long bad = counters.findCounter(Quality.BAD).getValue();',
                            'long bad = counters.findCounter(TaskCounter.MAP_INPUT_RECORDS).getValue();')
    (job,) = scan_text(tmp_path, {"Main.java": source}).jobs
    assert any(h.category == "after-job" and "does not update" in h.reason for h in job.plan.hand_work)


def test_counters_used_for_something_else_stay_hand_work(tmp_path):
    source = SOURCE.replace('    System.exit(ok ? 0 : 1);', '    if (bad > 0) System.exit(3);\n    System.exit(ok ? 0 : 1);')
    (job,) = scan_text(tmp_path, {"Main.java": source}).jobs
    assert any(h.category == "after-job" for h in job.plan.hand_work)


def test_a_print_under_a_test_the_reader_does_not_decide_is_not_repeated(tmp_path):
    source = SOURCE.replace('    System.out.println("bad records: " + bad);',
                            '    if (!ok) System.out.println("failed after " + bad + " bad records");')
    (job,) = scan_text(tmp_path, {"Main.java": source}).jobs
    assert any(h.category == "after-job" for h in job.plan.hand_work)
    assert all("failed" not in piece[1] for _, pieces, _ in job.plan.prints for piece in pieces if piece[0] == "str")
