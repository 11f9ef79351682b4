"""ChainMapper / ChainReducer: each chained mapper reads what the one before wrote.

The rule (Hadoop API docs, org.apache.hadoop.mapreduce.lib.chain.ChainMapper: "The output of
the first becomes the input of the second, and so on until the last Mapper, the output of the
last Mapper will be written to the task's output") is checked on the real Spark with the golden
script, and what is not converted is checked for a precise hand-work item.
"""
from __future__ import annotations

from pathlib import Path

import pytest

from tests.conftest import load_script
from tests.helpers import scan_text

GOLDEN = Path(__file__).parents[1] / "golden" / "cases" / "chained_maps" / "two_mappers"


def test_the_second_mapper_reads_the_first_ones_output(spark, tmp_path):
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "tags.txt").write_text("B1; Squeaky \nB1;squeaky\nB2;  \nno tag here\nB2;Flat;x\n")
    script = load_script(GOLDEN / "expected.py")
    assert script.main([str(tmp_path / "in"), str(tmp_path / "out")]) == 0
    lines = "".join(p.read_text() for p in sorted((tmp_path / "out").glob("part-*"))).splitlines()
    assert lines == ["B1:squeaky\t2"]  # "B2;  " trims to nothing; "B2;Flat;x" has three fields


@pytest.mark.parametrize("change, reason", [
    ("ChainMapper.addMapper(job, CleanTag.class, Text.class, Text.class, Text.class, LongWritable.class, true,\n"
     "                new JobConf(false));",
     "gets a Configuration of its own"),
    ("ChainReducer.setReducer(job, Count.class, Text.class, LongWritable.class, Text.class, LongWritable.class, true,\n"
     "                new JobConf(false));",
     "after the chained reducer"),
])
def test_what_the_chain_does_not_convert_is_named_at_its_line(tmp_path, change, reason):
    src = (GOLDEN / "TrimmedTags.java").read_text()
    if "CleanTag" in change:  # a mapper with settings of its own
        new = change.replace("new JobConf(false)", "mapperConf")
        src = src.replace(change, "JobConf mapperConf = new JobConf(false);\n        mapperConf.set(\"tags.min\", \"2\");\n"
                          "        " + new)
    else:  # a mapper after the reducer
        src = src.replace(change, change + "\n        ChainReducer.addMapper(job, CleanTag.class, Text.class, Text.class, "
                          "Text.class, LongWritable.class, true, new JobConf(false));")
    (job,) = scan_text(tmp_path, {"TrimmedTags.java": src}).jobs
    items = [h for h in job.plan.hand_work if h.category == "chained-maps"]
    assert items and reason in items[0].reason
    line = items[0].origin.line_start
    assert "ChainMapper.addMapper(job, CleanTag" in src.splitlines()[line - 1] or \
        "ChainReducer.addMapper" in src.splitlines()[line - 1]
    assert job.status == "partial"  # blocking: the script stops at a stub until it is done
