"""A driver that picks its job by an argument (`if (args[0].equals("sum")) ... else if ...`, or a
`switch`) is several jobs: each branch is read on its own, converted into its own script, and that
script refuses an argument the driver would have sent to another branch. Reading every branch into
one job would mix their classes (before: the last branch's reducer with every branch's mappers).
The form comes from a public driver in benchmarks/realworld (one job per mode argument)."""
from __future__ import annotations

import json
import shutil
import subprocess

import pytest

from migrate.cli import main
from migrate.java.literals import argument_equals_ignore_case, same_driver_branch
from tests.conftest import load_script
from tests.helpers import HEADER, scan_text

TASKS = """
  public static class Words extends Mapper<LongWritable, Text, Text, IntWritable> {
    protected void map(LongWritable key, Text value, Context context) throws IOException, InterruptedException {
      for (String w : value.toString().split(" ")) context.write(new Text(w), new IntWritable(w.length()));
    }
  }
  public static class Sum extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int total = new Integer(0);
      for (IntWritable v : values) total += v.get();
      context.write(key, new IntWritable(total));
    }
  }
  public static class Count extends Reducer<Text, IntWritable, Text, IntWritable> {
    protected void reduce(Text key, Iterable<IntWritable> values, Context context) throws IOException, InterruptedException {
      int n = 0;
      for (IntWritable v : values) n++;
      context.write(key, new IntWritable(n));
    }
  }
"""

SUM = "job.setReducerClass(Sum.class);"
COUNT = "job.setReducerClass(Count.class);"
USAGE = 'System.err.println("usage: sum|count <in> <out>"); System.exit(2);'

# One meaning, the spellings drivers use: args[0] "sum" runs Sum, "count" runs Count, else usage.
SPELLINGS = {
    "if-chain": f'if (args[0].equals("sum")) {{ {SUM} }} else if (args[0].equals("count")) {{ {COUNT} }} '
                f'else {{ {USAGE} }}',
    "literal-receiver": f'if ("sum".equals(args[0])) {{ {SUM} }} else if ("count".equals(args[0])) {{ {COUNT} }} '
                        f'else {{ {USAGE} }}',
    "local": f'String mode = args[0];\n    if (mode.equals("sum")) {{ {SUM} }} else if (mode.equals("count")) '
             f'{{ {COUNT} }} else {{ {USAGE} }}',
    "negated": f'if (!args[0].equals("sum")) {{ if (args[0].equals("count")) {{ {COUNT} }} else {{ {USAGE} }} }} '
               f'else {{ {SUM} }}',
    "switch": f'switch (args[0]) {{ case "sum": {SUM} break; case "count": {COUNT} break; default: {USAGE} }}',
    "switch-fall-through": f'switch (args[0]) {{ case "count": {COUNT} break; case "sum": case "total": {SUM} break; '
                           f'default: {USAGE} }}',
}


def _driver(branches: str) -> str:
    return HEADER + "public class Main {\n" + TASKS + """
  public static void main(String[] args) throws Exception {
    Job job = Job.getInstance(new Configuration(), "words");
    job.setMapperClass(Words.class);
    job.setOutputKeyClass(Text.class);
    job.setOutputValueClass(IntWritable.class);
    """ + branches + """
    FileInputFormat.addInputPath(job, new Path(args[1]));
    FileOutputFormat.setOutputPath(job, new Path(args[2]));
    System.exit(job.waitForCompletion(true) ? 0 : 1);
  }
}
"""


def _report(tmp_path, source: str) -> list[dict]:
    scan_text(tmp_path / "repo", {"Main.java": source})
    assert main(["convert", str(tmp_path / "repo"), "-o", str(tmp_path / "out"), "--no-compile-check"]) == 0
    return json.loads((tmp_path / "out" / "report.json").read_text())["jobs"]


@pytest.mark.parametrize("spelling", SPELLINGS, ids=list(SPELLINGS))
def test_each_branch_is_its_own_job_with_its_own_classes(tmp_path, spelling):
    jobs = _report(tmp_path, _driver(SPELLINGS[spelling]))
    by_value = {j["mode"]["value"]: j for j in jobs}
    assert by_value.keys() == ({"sum", "count", "total"} if spelling == "switch-fall-through" else {"sum", "count"})
    assert by_value["sum"]["classes"]["reducer"] == "Main.Sum" and by_value["count"]["classes"]["reducer"] == "Main.Count"
    assert all(j["status"] == "converted" and j["mode"]["argument"] == 0 for j in jobs)
    assert by_value["sum"]["script"] == "main_sum.py" and by_value["sum"]["name"] == "words (args[0] 'sum')"
    # the mode is the script's first positional argument; the paths keep their places
    assert [(a["name"], a["position"]) for a in by_value["sum"]["arguments"]] == \
        [("input_path", 1), ("output_path", 2), ("mode", 0)]


def test_a_branch_on_an_argument_that_configures_nothing_is_not_a_mode(tmp_path):
    jobs = _report(tmp_path, _driver('if (args[0].equals("-v")) { System.out.println("verbose"); }\n    ' + SUM))
    (job,) = jobs
    assert job["mode"] is None and job["script"] == "main.py"


def test_an_else_that_configures_a_job_is_the_branch_for_every_other_value(tmp_path):
    jobs = _report(tmp_path, _driver(f'if (args[0].equalsIgnoreCase("count")) {{ {COUNT} }} else {{ {SUM} }}'))
    by_value = {j["mode"]["value"]: j for j in jobs}
    assert set(by_value) == {"count", None}
    other = by_value[None]
    assert other["classes"]["reducer"] == "Main.Sum" and other["script"] == "main_other.py"
    tests = (("count", True),)
    assert same_driver_branch("sum", None, tests) and not same_driver_branch("COUNT", None, tests)
    assert same_driver_branch("Count", "count", tests)


def test_both_branches_match_hadoop_and_a_script_refuses_the_other_branch(tmp_path):
    """Hadoop's local runner runs the driver with each mode; `mrlift verify` picks, for each
    branch's script, the run whose arguments take that branch (two runs of one driver)."""
    from migrate.convert import write_outputs
    from migrate.scan import scan_repo
    from migrate.verify.runner import load_runs, verify

    scan_text(tmp_path / "repo", {"Main.java": _driver(SPELLINGS["if-chain"])})
    written = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo")
    (tmp_path / "data").mkdir()
    (tmp_path / "data" / "a.txt").write_bytes(b"ferry ferry quay\nquay lantern ferry\n")
    runs = [{"driver": "Main", "args": [mode, "data", "@out"]} for mode in ("count", "sum")]
    (tmp_path / "runs.json").write_text(json.dumps({"runs": runs}))
    checks, _ = verify(tmp_path / "out", load_runs(tmp_path / "runs.json"), timeout=180)
    assert sorted((c.script, c.verdict) for c in checks) == [("main_count.py", "agrees"), ("main_sum.py", "agrees")]
    assert [j["status"] for j in written.report["jobs"]] == ["converted", "converted"]
    script = load_script(tmp_path / "out" / "main_sum.py")
    with pytest.raises(SystemExit) as refused:
        script.main(["count", str(tmp_path / "data"), str(tmp_path / "never")])
    assert refused.value.code == 2 and not (tmp_path / "never").exists()


JAVA_CASES = [("nocombiner", "NoCombiner"), ("sum", "SUM "), ("\u00df", "SS"), ("\u01c5", "\u01c6"),
              ("\u0130", "i"), ("\u212a", "k"), ("\u03c3", "\u03c2"), ("stra\u00dfe", "STRASSE"),
              ("\u1fb3", "\u1fbc"), ("\u1f80", "\u1f88"), ("\ufb00", "FF"), ("\u01f0", "\u01f0".upper()[0])]


@pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")
def test_equals_ignore_case_answers_as_the_jvm_does(tmp_path):
    """The script's check of the mode argument against String.equalsIgnoreCase on this JVM (Java 17)."""
    pairs = ", ".join(f'{{"{a}", "{b}"}}' for a, b in JAVA_CASES)
    (tmp_path / "Eq.java").write_text(
        "public class Eq { public static void main(String[] x) { String[][] p = {" + pairs + "};\n"
        "  for (String[] q : p) System.out.println(q[0].equalsIgnoreCase(q[1])); } }\n", encoding="utf-8")
    subprocess.run(["javac", "-encoding", "UTF-8", "-d", str(tmp_path), str(tmp_path / "Eq.java")], check=True)
    out = subprocess.run(["java", "-cp", str(tmp_path), "Eq"], check=True, capture_output=True, text=True).stdout
    assert out.split() == [str(argument_equals_ignore_case(a, b)).lower() for a, b in JAVA_CASES]


@pytest.mark.parametrize("test", ["args.length > 3", 'job.getConfiguration().getBoolean("counting", false)'])
def test_settings_under_a_test_that_is_not_read_block_the_claim(tmp_path, test):
    """Both branches cannot run; following either would be a guess (before: the last class set won,
    with a finding, and the job was called converted)."""
    (job,) = _report(tmp_path, _driver(f"if ({test}) {{ {COUNT} }} else {{ {SUM} }}"))
    assert job["status"] != "converted"
    (item,) = [h for h in job["hand_work"] if h["category"] == "conditional-settings"]
    assert "does not evaluate" in item["reason"]
