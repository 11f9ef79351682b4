"""`==` between Strings compares references in Java. A String read from the record (Text.toString())
is a new object every time, never the interned literal: `line == "the"` is false for every record.
The script reproduces that and says so as a finding; other String `==` stay hand work."""
from __future__ import annotations

import json
import shutil
import subprocess

import pytest

from tests.helpers import job_source, scan_text

BODY = ('      String line = value.toString();\n'
        '      if (line == "the") { context.write(new Text("never"), new IntWritable(1)); return; }\n'
        '      if (value.toString() != "a") context.write(new Text(line), new IntWritable(1));')


def test_a_record_string_compared_by_reference_is_reproduced_and_raised(tmp_path):
    scan = scan_text(tmp_path, {"Main.java": job_source(BODY, reducer_class=None)})
    (job,) = scan.jobs
    assert job.status == "converted"
    assert [f.category for f in job.plan.findings] == ["reference-equality", "reference-equality"]
    assert "false for every record" in job.plan.findings[0].message
    assert "true for every record" in job.plan.findings[1].message


def test_other_string_reference_comparisons_stay_hand_work_without_a_misleading_fix(tmp_path):
    body = ('      String[] f = value.toString().split(",");\n      if (f[0] == "") return;\n'
            '      context.write(new Text(f[0]), new IntWritable(1));')
    (job,) = scan_text(tmp_path, {"Main.java": job_source(body, reducer_class=None)}).jobs
    (item,) = job.plan.hand_work
    assert "by reference" in item.reason and "Java 9 and later" in item.reason and "Java 8" in item.reason
    body = ('      String s = value.toString().trim();\n      if (s == "x") return;\n'
            '      context.write(new Text(s), new IntWritable(1));')
    (job,) = scan_text(tmp_path / "other", {"Main.java": job_source(body, reducer_class=None)}).jobs
    (item,) = job.plan.hand_work
    assert "references" in item.reason and "different output" in item.suggestion


CUT = """
public class Cut {
    public static void main(String[] args) {
        String line = new String("ab,");
        System.out.println((line.substring(3) == "") + "\t" + (line.split(",", -1)[1] == "")
                           + "\t" + (new String("  ").trim() == "") + "\t" + (line.substring(1) == "b,"));
    }
}
"""


@pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")
def test_the_jvm_says_an_empty_cut_is_the_interned_empty_string(tmp_path):
    """Why a cut String compared with "" is declined, not reproduced: on this JVM (Java 17) an empty
    substring, split piece or trim result IS the literal "" (Java 8 made a new object)."""
    (tmp_path / "Cut.java").write_text(CUT)
    subprocess.run(["javac", "-d", str(tmp_path), str(tmp_path / "Cut.java")], check=True)
    out = subprocess.run(["java", "-cp", str(tmp_path), "Cut"], check=True, capture_output=True, text=True).stdout
    assert out.split() == ["true", "true", "true", "false"]


JAVA = """
import org.apache.hadoop.io.Text;
public class RefEq {
    public static void main(String[] args) {
        String[] lines = {"the", "a", "", "x y"};
        for (String s : lines) {
            Text t = new Text(s);
            System.out.println(s + "\\t" + (t.toString() == "the") + "\\t" + (t.toString() != "a")
                               + "\\t" + (t.toString() == ""));
        }
    }
}
"""


@pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")
def test_the_jvm_says_a_text_to_string_is_never_the_literal(tmp_path):
    """The reference: the real JVM with Hadoop's Text (the client jars the pyspark wheel ships)."""
    from migrate.verify.hadoop import compile_classpath, spark_jars

    (tmp_path / "RefEq.java").write_text(JAVA)
    subprocess.run(["javac", "-cp", compile_classpath(), "-d", str(tmp_path), str(tmp_path / "RefEq.java")],
                   check=True)
    out = subprocess.run(["java", "-cp", f"{tmp_path}:{spark_jars()}/*", "RefEq"], check=True, capture_output=True,
                         text=True).stdout
    rows = [line.split("\t") for line in out.splitlines()]
    assert [r[1:] for r in rows] == [["false", "true", "false"]] * 4  # even for "the", "a" and ""


@pytest.mark.parity
def test_hadoop_and_the_script_agree_on_a_reference_comparison(tmp_path):
    from migrate.convert import write_outputs
    from migrate.scan import scan_repo
    from migrate.verify.runner import load_runs, verify

    scan_text(tmp_path / "repo", {"Main.java": job_source(BODY, reducer_class=None)})
    written = write_outputs(scan_repo(tmp_path / "repo"), tmp_path / "out", "repo")
    assert written.report["jobs"][0]["status"] == "converted"
    (tmp_path / "data").mkdir()
    (tmp_path / "data" / "words.txt").write_text("the\na\nb\nthe\n")
    (tmp_path / "runs.json").write_text(json.dumps({"runs": [{"driver": "Main", "args": ["data", "@out"]}]}))
    (check,), _ = verify(tmp_path / "out", load_runs(tmp_path / "runs.json"), timeout=120)
    assert check.verdict == "agrees", f"{check.detail}\n{check.log}"


def test_text_equals_a_string_literal_is_false_for_every_record_and_a_finding(tmp_path):
    """org.apache.hadoop.io.Text.equals(Object) is true only for a Text (Hadoop API docs)."""
    scan = scan_text(tmp_path, {"Main.java": job_source(
        'if (value.equals("q")) context.write(new Text("never"), new IntWritable(1));', reducer_class=None)})
    (job,) = scan.jobs
    assert job.status == "converted", job.plan.hand_work
    (f,) = [f for f in job.plan.findings if f.category == "text-equals-string"]
    assert "false for every record" in f.message
