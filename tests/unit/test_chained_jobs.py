"""Chained jobs in one script, run on the real Spark.

Hadoop's rules the script keeps: one reduce task writes one part file sorted by key (Hadoop
MapReduce tutorial, "Reducer": the output of the reduce task is not re-sorted, its input is
sorted by key); a map-only job writes its input's lines in the order it read them (common
practice: the map task reads its split front to back). So a map-only job reading the folder of
a one-reducer job sees the lines in key order, and keeps it.
"""
from __future__ import annotations

from pathlib import Path

from tests.conftest import load_script

CHAIN = Path(__file__).parents[1] / "golden" / "cases" / "chained_jobs" / "count_then_filter" / "expected.py"


def _lines(out: Path) -> list[str]:
    return "".join(p.read_text() for p in sorted(out.glob("part-*"))).splitlines()


def test_a_map_only_job_after_a_reduce_sees_the_lines_in_key_order(spark, tmp_path):
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "notes.txt").write_text("brake squeal brake\nsaddle squeal bell\n")
    script = load_script(CHAIN)
    middle = tmp_path / "middle"
    assert script.main([str(tmp_path / "in"), str(tmp_path / "out"), "--job-1-output", str(middle)]) == 0
    assert _lines(tmp_path / "out") == ["brake\t2", "squeal\t2"]
    assert not middle.exists()  # handed over in memory


def test_keep_intermediates_writes_the_first_jobs_folder(spark, tmp_path):
    (tmp_path / "in").mkdir()
    (tmp_path / "in" / "notes.txt").write_text("brake squeal brake\nsaddle squeal bell\n")
    script = load_script(CHAIN)
    middle = tmp_path / "middle"
    assert script.main([str(tmp_path / "in"), str(tmp_path / "out"), "--job-1-output", str(middle),
                        "--keep-intermediates"]) == 0
    assert _lines(middle) == ["bell\t1", "brake\t2", "saddle\t1", "squeal\t2"]
    assert _lines(tmp_path / "out") == ["brake\t2", "squeal\t2"]


# ---------------------------------------------------------------- a driver that works after the job
from tests.helpers import job_source, scan_text  # noqa: E402

MAP = '    context.write(new Text(value.toString()), new IntWritable(1));'


def test_a_driver_reading_its_output_back_is_named_at_the_line(tmp_path):
    after = ("org.apache.hadoop.fs.FileSystem fs = org.apache.hadoop.fs.FileSystem.get(job.getConfiguration());\n"
             "    java.io.BufferedReader in = new java.io.BufferedReader(new java.io.InputStreamReader(\n"
             "        fs.open(new Path(args[1], \"part-r-00000\"))));\n"
             "    System.out.println(\"first: \" + in.readLine());\n"
             "    long n = job.getCounters().findCounter(\"rides\", \"bad\").getValue();")
    src = job_source(MAP, extra_driver="job.waitForCompletion(true);\n    " + after)
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    items = [h for h in job.plan.hand_work if h.category == "after-job"]
    lines = src.splitlines()
    assert [lines[h.origin.line_start - 1].strip()[:14] for h in items] == ["fs.open(new Pa", "long n = job.g"]
    assert all("result DataFrame" in h.suggestion for h in items)
    assert not any(h.blocking for h in items)  # the job's own output is right: advisory
