"""migrate.lift.regex: which groups take part in every match (checked on the JVM), and where a
Matcher is declined. The lifted matchers' output against Hadoop is in test_lowering_parity.py."""
from __future__ import annotations

import shutil
import subprocess

import pytest

from migrate.lift.regex import group_facts
from tests.helpers import job_source, scan_text

# (regex, groups that take part in every match); the count is checked against the JVM below
CASES = [
    ("(a)(b)?", {1}),
    ("(a|b)", {1}),
    ("a|(b)", set()),
    ("(?:(a)|b)c", set()),
    ("(a)*b", set()),
    ("(a){0,2}b", set()),
    ("(a){1,2}", {1}),
    ("(?=(a))a", set()),
    ("[(](a)", {1}),
    ("[^)(](a)[]x]", {1}),
    ("\\((a)\\)", {1}),
    ("\\Q(\\E(a)", {1}),
    ("(?<tag>x)(y)", {1, 2}),
    ("(?<=x)(a)", {1}),
    ("(?i)(a)((b)?c)", {1, 2}),
    ("((a)|(b))+", {1}),
    ("(a)??", set()),
    ("x(?:y(z))", {1}),
]
INPUTS = ["a", "b", "ab", "abc", "aab", "xa", "(a)", "(ax]", "xy", "xyz", "c", "ABC", "bc", "aa"]


def test_group_counts_and_certain_groups_agree_with_the_jvm(tmp_path):
    """java.util.regex.Matcher (Java SE API): groupCount() must equal our count, and a group we call
    certain must never be null in any match found on the inputs."""
    if shutil.which("javac") is None:
        pytest.skip("needs a JDK on PATH")
    regexes = ", ".join('"' + r.replace("\\", "\\\\").replace('"', '\\"') + '"' for r, _ in CASES)
    inputs = ", ".join(f'"{s}"' for s in INPUTS)
    (tmp_path / "Groups.java").write_text(f"""
import java.util.regex.*;
public class Groups {{
  public static void main(String[] a) {{
    String[] rs = {{{regexes}}};
    String[] in = {{{inputs}}};
    for (int i = 0; i < rs.length; i++) {{
      Pattern p = Pattern.compile(rs[i]);
      StringBuilder nulls = new StringBuilder();
      for (String s : in) {{
        Matcher m = p.matcher(s);
        while (m.find()) for (int g = 1; g <= m.groupCount(); g++) if (m.group(g) == null) nulls.append(g).append(',');
      }}
      System.out.println(i + " " + p.matcher("").groupCount() + " " + nulls);
    }}
  }}
}}""")
    subprocess.run(["javac", "-d", str(tmp_path), str(tmp_path / "Groups.java")], check=True)
    out = subprocess.run(["java", "-cp", str(tmp_path), "Groups"], check=True, capture_output=True, text=True).stdout
    seen_null = set()
    for line in out.splitlines():
        i, count, nulls = (line.split(" ") + [""])[:3]
        regex, certain = CASES[int(i)]
        got_count, got_certain = group_facts(regex)
        assert got_count == int(count), regex
        assert got_certain == certain, regex
        null_groups = {int(g) for g in nulls.split(",") if g}
        assert not (null_groups & got_certain), f"{regex}: group {null_groups & got_certain} was null on the JVM"
        seen_null |= {(regex, g) for g in null_groups}
    assert ("a|(b)", 1) in seen_null and ("(a)(b)?", 2) in seen_null  # the inputs do exercise the traps


def test_comments_mode_is_refused():
    with pytest.raises(ValueError, match="comments mode"):
        group_facts("(?x) (a) # a comment with a ( in it")


def _reasons(tmp_path, body: str, fields: str = "") -> list[str]:
    source = job_source(body, fields=fields, reducer_class=None, extra_driver="job.setNumReduceTasks(0);")
    scan = scan_text(tmp_path, {"Main.java": source.replace("import java.util.*;",
                                                            "import java.util.*;\nimport java.util.regex.*;")})
    (job,) = scan.jobs
    return [h.reason for h in job.plan.hand_work]


FIELD = 'private static final Pattern P = Pattern.compile("(\\\\w+)=(\\\\d+)?");'


def test_a_group_proved_by_the_match_converts(tmp_path):
    assert _reasons(tmp_path, """
      Matcher m = P.matcher(value.toString());
      if (m.find()) { context.write(new Text(m.group(1)), new IntWritable(1)); }""", FIELD) == []


@pytest.mark.parametrize("body, why", [
    ("""
      Matcher m = P.matcher(value.toString());
      if (m.find()) { context.write(new Text(m.group(2)), new IntWritable(1)); }""", "may take no part in a match"),
    ("""
      Matcher m = P.matcher(value.toString());
      context.write(new Text(m.group(1)), new IntWritable(1));""", "before matches()/find()"),
    ("""
      Matcher m = P.matcher(value.toString());
      if (m.find() && m.find()) { context.write(new Text(m.group(1)), new IntWritable(1)); }""", "earlier match attempt"),
    ("""
      Matcher m = P.matcher(value.toString());
      while (m.find()) { context.write(new Text(m.group(1)), new IntWritable(1)); }
      String last = m.group(1);""", "after its find() loop"),
    ("""
      Matcher m = P.matcher(value.toString());
      while (m.find()) { context.write(new Text(m.group(1) + m.group()), new IntWritable(1)); }""", "several groups"),
    ("""
      Matcher m = P.matcher(value.toString());
      if (m.matches()) { context.write(new Text(m.group(3)), new IntWritable(1)); }""", "IndexOutOfBoundsException"),
    ("""
      Matcher m = Pattern.compile(value.toString()).matcher("x");
      if (m.find()) { context.write(new Text("x"), new IntWritable(1)); }""", "not a constant"),
], ids=["optional_group", "group_before_a_match", "second_find", "group_after_the_loop", "two_groups_per_match",
        "group_past_the_count", "computed_regex"])
def test_matcher_uses_that_differ_are_declined(tmp_path, body, why):
    reasons = _reasons(tmp_path, body, FIELD)
    assert any(why in r for r in reasons), reasons
