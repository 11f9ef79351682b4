"""Helper methods are inlined the way Java resolves their names (JLS 6.4: a method body sees its
parameters, its own locals and its class's fields, never the locals of its caller)."""
from __future__ import annotations

from migrate.plan import dump_plan
from tests.helpers import job_source, scan_text


def _job(tmp_path, body: str, fields: str = "", more: dict | None = None):
    source = job_source(body, fields=fields, reducer_class=None, extra_driver="job.setNumReduceTasks(0);")
    scan = scan_text(tmp_path, {"Main.java": source, **(more or {})})
    (job,) = scan.jobs
    return job


def test_a_helper_reads_the_field_not_the_callers_local_of_that_name(tmp_path):
    job = _job(tmp_path, """
      String prefix = "local-";
      context.write(new Text(tag(value.toString())), new IntWritable(prefix.length()));""",
               fields="""private static final String prefix = "field-";
    private static String tag(String s) { return prefix + s; }""")
    assert not job.plan.hand_work
    plan = dump_plan(job.plan)
    assert "'field-'" in plan and "'local-'" not in plan.split("Emit")[1].split("->")[0], plan


UTIL = """
public class TextUtil {
  static final int WIDTH = 3;
  static String head(String s) { return s.length() > WIDTH ? s.substring(0, WIDTH) : s; }
  static String stamp(String s) { return s + System.currentTimeMillis(); }
}
"""


def test_a_static_helper_of_another_class_is_inlined_with_its_constants(tmp_path):
    job = _job(tmp_path, """
      context.write(new Text(TextUtil.head(value.toString())), new IntWritable(1));""", more={"TextUtil.java": UTIL})
    assert not job.plan.hand_work
    assert "3" in dump_plan(job.plan)


def test_a_helper_of_another_class_that_cannot_be_inlined_names_its_own_line(tmp_path):
    job = _job(tmp_path, """
      context.write(new Text(TextUtil.stamp(value.toString())), new IntWritable(1));""", more={"TextUtil.java": UTIL})
    (item,) = [h for h in job.plan.hand_work if h.category == "map-logic"]
    assert "in TextUtil.stamp() (TextUtil.java:5)" in item.reason, item.reason
    assert item.origin.file.endswith("Main.java")  # the user's line: the call


def test_a_local_that_hides_a_field_ends_with_its_block(tmp_path):
    job = _job(tmp_path, """
      if (value.getLength() > 3) {
        String tag = "inner";
        context.write(new Text(tag), new IntWritable(1));
      }
      context.write(new Text(tag), new IntWritable(2));""", fields='private static final String tag = "field";')
    assert not job.plan.hand_work
    emits = [line for line in dump_plan(job.plan).splitlines() if "Emit" in line]
    assert "'inner'" in emits[0] and "'field'" in emits[1], emits
