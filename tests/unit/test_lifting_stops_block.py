"""Where lifting stops inside map(), the rest of map() is missing from the script, so the item is
blocking whatever API it names: a counter the converter cannot read (group from a constant of
another class) used to be filed as an advisory "counter" item, and the script ran without the
writes that followed it. (Found by benchmarks/realworld: an old-API mapper that only counts.)"""
from __future__ import annotations

import json

from migrate.cli import main
from migrate.verify.runner import runnable
from tests.helpers import job_source, scan_text

NAMES = "public class Names {\n  public static final String GROUP = \"images\";\n}\n"


def _job(tmp_path, body: str) -> dict:
    scan_text(tmp_path / "repo", {"Main.java": job_source(body, reducer_class=None), "Names.java": NAMES})
    assert main(["convert", str(tmp_path / "repo"), "-o", str(tmp_path / "out"), "--no-compile-check"]) == 0
    return json.loads((tmp_path / "out" / "report.json").read_text())["jobs"][0]


def test_a_counter_that_stops_lifting_blocks_the_script(tmp_path):
    job = _job(tmp_path, '      context.getCounter(Names.GROUP, "seen").increment(1);\n'
                         "      context.write(value, new IntWritable(1));")
    assert job["status"] == "partial"
    assert runnable(job) is not None
    item = next(h for h in job["hand_work"] if "counter update the converter could not read" in h["reason"])
    assert item["category"] == "map-logic"


def test_a_counter_with_literal_names_still_converts(tmp_path):
    job = _job(tmp_path, '      context.getCounter("images", "seen").increment(1);\n'
                         "      context.write(value, new IntWritable(1));")
    assert job["status"] == "converted" and runnable(job) is None
