"""A driver that never submits its job, or that changes files outside the job's output, is not
"converted": the script only writes the output, so that I/O is hand work at its line."""
from __future__ import annotations

import pytest

from tests.helpers import job_source, scan_text

WRITE = "      context.write(new Text(value.toString()), new IntWritable(1));"
FS = "org.apache.hadoop.fs.FileSystem"


def _job(tmp_path, driver_extra: str = "", submit: bool = True):
    src = job_source(WRITE, reducer_class=None, extra_driver=driver_extra)
    if not submit:
        src = src.replace("System.exit(job.waitForCompletion(true) ? 0 : 1);", "System.exit(0);")
    (job,) = scan_text(tmp_path, {"Main.java": src}).jobs
    return job, src


def test_a_job_that_is_never_submitted_is_not_converted(tmp_path):
    job, _ = _job(tmp_path, submit=False)
    assert job.status == "partial"
    (item,) = job.plan.hand_work
    assert item.category == "not-submitted" and "never submits" in item.reason


@pytest.mark.parametrize("code, what", [
    (f'{FS}.get(job.getConfiguration()).delete(new Path("/data/other"), true);', "a delete of /data/other"),
    ('new java.io.File("/tmp/marker").createNewFile();', "createNewFile"),
    ('new java.io.File("/tmp/x").delete();', "a delete of a file or folder"),
    (f'{FS} fs = {FS}.get(job.getConfiguration()); fs.create(new Path("/tmp/flag")).close();', "create"),
    ('java.io.PrintWriter w = new java.io.PrintWriter("/tmp/log.txt"); w.println("started"); w.close();',
     "new PrintWriter"),
    ('java.nio.file.Files.deleteIfExists(java.nio.file.Paths.get("/tmp/x"));', "deleteIfExists"),
])
def test_file_changes_outside_the_output_are_hand_work_at_their_line(tmp_path, code, what):
    job, src = _job(tmp_path, code)
    assert job.status == "partial"
    (item,) = job.plan.hand_work
    line = next(i for i, l in enumerate(src.split("\n"), 1) if code[:30] in l)
    assert item.category == "io-outside-output" and what in item.reason and item.origin.line_start == line


@pytest.mark.parametrize("code", [
    f"{FS}.get(job.getConfiguration()).delete(new Path(args[1]), true);",  # its own output: reproduced
    'StringBuilder sb = new StringBuilder(); sb.append("x"); String o = args[1].concat("");',
])
def test_deleting_the_own_output_and_string_building_stay_converted(tmp_path, code):
    job, _ = _job(tmp_path, code)
    assert job.status == "converted", [h.reason for h in job.plan.hand_work]


@pytest.mark.parametrize("code", [
    '      new java.io.File("/tmp/x").delete();\n',
    '      java.nio.file.Files.deleteIfExists(java.nio.file.Paths.get("/tmp/x"));\n',
    '      java.io.FileWriter w = new java.io.FileWriter("/tmp/log", true); w.write("x"); w.close();\n',
])
def test_file_changes_in_map_are_never_converted(tmp_path, code):
    (job,) = scan_text(tmp_path, {"Main.java": job_source(code + WRITE, reducer_class=None)}).jobs
    assert job.status != "converted" and job.plan.hand_work[0].origin.line_start > 0
