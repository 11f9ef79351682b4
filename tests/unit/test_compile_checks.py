"""Code javac rejects is never "converted". Each mutant below is checked against javac itself
(JDK 17 on PATH, the Hadoop client jars of the pyspark wheel): javac must reject it, and mrlift
must decline the job with a does-not-compile item at the line javac names."""
from __future__ import annotations

import re
import shutil
import subprocess

import pytest

from tests.helpers import job_source, scan_text

GOOD = job_source("      context.write(new Text(value.toString()), new IntWritable(1));", reducer_class=None)
MAP_SIG = "    protected void map(LongWritable key, Text value, Context context)"

MUTANTS = {
    "override twice": (MAP_SIG, "    @Override\n    @Override\n" + MAP_SIG),
    "variable defined twice": ("      context.write(", "      int n = 1;\n      int n = 2;\n      context.write("),
    "parameter redeclared": ("      context.write(", "      String value = \"x\";\n      context.write("),
    "unreachable statement": ("      context.write(new Text(value.toString()), new IntWritable(1));",
                              "      return;\n      context.write(new Text(value.toString()), new IntWritable(1));"),
    "increment of a call": ("    job.setMapperClass(M.class);", "    job.setMapperClass(M.class);\n    ++ job.getJobName();"),
    "not a statement": ("    job.setMapperClass(M.class);", "    job.setMapperClass(M.class);\n    args.length;"),
    "method defined twice": (MAP_SIG, "    void twice(int a) {}\n    void twice(int b) {}\n" + MAP_SIG),
    "field defined twice": (MAP_SIG, "    int f;\n    int f;\n" + MAP_SIG),
    "public class in another file": ("public class Main {", "public class Renamed {"),
    "int literal too large": ("new Path(args[1])", "new Path(args[2147483648])"),
    "loop variable shadows a local": ("      context.write(",
                                      "      int i = 0;\n      for (int i = 0; i < 2; i++) {}\n      context.write("),
}


def _mutant(name: str) -> str:
    old, new = MUTANTS[name]
    assert old in GOOD, name
    return GOOD.replace(old, new, 1)


def _javac_error_lines(tmp_path, text: str) -> set[int]:
    from migrate.verify.hadoop import compile_classpath

    src = tmp_path / "javac" / "Main.java"
    src.parent.mkdir(parents=True, exist_ok=True)
    src.write_text(text)
    p = subprocess.run(["javac", "-cp", compile_classpath(), "-d", str(tmp_path / "javac" / "c"), str(src)],
                       capture_output=True, text=True)
    assert p.returncode != 0, "javac accepted it: not a compile error"
    return {int(m) for m in re.findall(r"Main\.java:(\d+): error", p.stderr)}


@pytest.mark.parametrize("name", sorted(MUTANTS))
def test_the_mutant_is_declined_at_the_line_javac_names(tmp_path, name):
    text = _mutant(name)
    (job,) = scan_text(tmp_path / "repo", {"Main.java": text}).jobs
    assert job.status != "converted"
    items = [h for h in job.plan.hand_work if h.category == "does-not-compile"]
    assert items, [h.category for h in job.plan.hand_work]
    if shutil.which("javac") is not None:
        assert {h.origin.line_start for h in items} <= _javac_error_lines(tmp_path, text)


def test_the_original_compiles_and_is_converted(tmp_path):
    (job,) = scan_text(tmp_path / "repo", {"Main.java": GOOD}).jobs
    assert job.status == "converted"


@pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")
def test_compile_check_runs_javac_and_declines_what_it_rejects(tmp_path, capsys):
    """A missing symbol in the driver is not something the static checks see; javac does."""
    import json

    from migrate.cli import main

    broken = GOOD.replace("    job.setMapperClass(M.class);", "    job.setMapperClass(M.class);\n    job.setNumReduceTasks(tasks);")
    scan_text(tmp_path / "repo", {"Fine.java": GOOD.replace("class Main", "class Fine"),
                                  "Broken.java": broken.replace("class Main", "class Broken")})
    assert main(["convert", str(tmp_path / "repo"), "-o", str(tmp_path / "out"), "--compile-check"]) == 0
    jobs = {j["driver"]: j for j in json.loads((tmp_path / "out" / "report.json").read_text())["jobs"]}
    assert jobs["Fine"]["status"] == "converted"
    (item,) = [h for h in jobs["Broken"]["hand_work"] if h["category"] == "does-not-compile"]
    line = next(i for i, l in enumerate(broken.split("\n"), 1) if "setNumReduceTasks(tasks)" in l)
    assert item["line"] == line and "cannot find symbol" in item["reason"] and jobs["Broken"]["status"] != "converted"
