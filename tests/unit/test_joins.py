"""Reduce-side joins: the one-value side's rule, run on the real Spark.

Java keeps the last value assigned to a one-value side, and Hadoop gives a key's values in no
defined order (Hadoop MapReduce tutorial, "Reducer": the values are grouped, not ordered, unless
a secondary sort is set up). So the script must stop where a key has two different such values,
and go on where they are all equal (the last one is then known).
"""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.conftest import load_script

LOOKUP = Path(__file__).parents[1] / "golden" / "cases" / "join" / "lookup_default" / "expected.py"


def _run(tmp_path: Path, members: str, rides: str) -> list[str]:
    (tmp_path / "members").mkdir()
    (tmp_path / "rides").mkdir()
    (tmp_path / "members" / "m.txt").write_text(members)
    (tmp_path / "rides" / "r.csv").write_text(rides)
    out = tmp_path / "out"
    script = load_script(LOOKUP)
    assert script.main([str(tmp_path / "members"), str(tmp_path / "rides"), str(out)]) == 0
    return sorted("".join(p.read_text() for p in sorted(out.glob("part-*"))).splitlines())


def test_one_value_side_with_default_is_a_left_join(spark, tmp_path):
    lines = _run(tmp_path, "M1|Ada|BH1|annual\n", "R1,M1\nR2,M9\n")
    assert lines == ["R1\tM1\tannual", "R2\tM9\tnone"]  # M9 is unknown: the Java default "none"


def test_equal_values_on_the_one_value_side_are_kept(spark, tmp_path):
    lines = _run(tmp_path, "M1|Ada|BH1|annual\nM1|Ada|BH1|annual\n", "R1,M1\n")
    assert lines == ["R1\tM1\tannual"]


def test_two_different_values_on_the_one_value_side_stop_the_script(spark, tmp_path):
    with pytest.raises(Exception, match="more than one value for `plan`"):
        _run(tmp_path, "M1|Ada|BH1|annual\nM1|Ada|BH1|monthly\n", "R1,M1\n")


# ---------------------------------------------------------------- driver features still left to hand work
from migrate.plan import ADVISORY_CATEGORIES  # noqa: E402
from tests.helpers import job_source, scan_text  # noqa: E402

MAP = '    context.write(new Text(value.toString()), new IntWritable(1));'


@pytest.mark.parametrize("call, category, advice", [
    ("job.addCacheFile(new java.net.URI(\"hdfs:///ref/stations.tsv\"));", "side-files", "F.broadcast"),
    ("ChainReducer.addMapper(job, M.class, Text.class, IntWritable.class, Text.class, IntWritable.class, "
     "new Configuration(false));", "chained-maps", "a select after the groupBy"),
    ("MultipleOutputs.addNamedOutput(job, \"late\", TextOutputFormat.class, Text.class, IntWritable.class);",
     "named-outputs", "<output>/<name>"),
    ("job.setInputFormatClass(SequenceFileInputFormat.class);", "input-format", "sequenceFile("),
])
def test_unconverted_driver_features_are_precise_hand_work(tmp_path, call, category, advice):
    src = job_source(MAP, extra_driver=call)
    line = next(i for i, text in enumerate(src.splitlines(), 1) if call in text)
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    items = [h for h in job.plan.hand_work if h.category == category]
    assert items and items[0].origin.file.endswith("Main.java") and items[0].origin.line_start == line
    assert advice in items[0].suggestion
    assert job.status == "partial" or category in ADVISORY_CATEGORIES


def test_plain_input_paths_beside_multiple_inputs_are_hand_work(tmp_path):
    src = job_source(MAP, reducer_class=None,
                     extra_driver="MultipleInputs.addInputPath(job, new Path(args[2]), TextInputFormat.class, M.class);")
    src = src.replace("import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;",
                      "import org.apache.hadoop.mapreduce.lib.input.FileInputFormat;\n"
                      "import org.apache.hadoop.mapreduce.lib.input.MultipleInputs;\n"
                      "import org.apache.hadoop.mapreduce.lib.input.TextInputFormat;")
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    line = next(i for i, text in enumerate(src.splitlines(), 1) if "MultipleInputs.addInputPath" in text)
    assert [(h.category, h.origin.line_start) for h in job.plan.hand_work] == [("multiple-inputs", line)]
    assert job.status == "partial"  # blocking: the script stops until it is done
    assert [p.name for p in job.plan.params] == ["input_path_1", "input_path_2", "output_path"]
