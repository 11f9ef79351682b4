"""A driver whose paths the converter cannot read (here: folders under a base taken from the
environment) gives a script that asks for them: required options, never a default it cannot know."""
from __future__ import annotations

import json
import subprocess
import sys

from migrate.cli import main
from tests.helpers import job_source, scan_text

ARRAY_PATHS = job_source("context.write(value, new IntWritable(1));", reducer_class=None).replace(
    "FileInputFormat.addInputPath(job, new Path(args[0]));\n    FileOutputFormat.setOutputPath(job, new Path(args[1]));",
    'String base = System.getenv("BIKE_DATA");\n'
    '    FileInputFormat.addInputPath(job, new Path(base + "/input4"));\n'
    '    FileOutputFormat.setOutputPath(job, new Path(base + "/output"));')


def test_unread_paths_become_required_options(tmp_path):
    assert "base + " in ARRAY_PATHS
    scan_text(tmp_path / "repo", {"Main.java": ARRAY_PATHS})
    assert main(["convert", str(tmp_path / "repo"), "-o", str(tmp_path / "out"), "--no-compile-check"]) == 0
    job = json.loads((tmp_path / "out" / "report.json").read_text())["jobs"][0]
    unread = [a["name"] for a in job["arguments"] if a["position"] is None and a["default"] is None]
    assert unread, job["arguments"]
    script = tmp_path / "out" / job["script"]
    text = script.read_text()
    assert "null" not in text and "required=True" in text
    # argparse (Python docs): a missing required option exits 2 and names it
    p = subprocess.run([sys.executable, str(script)], capture_output=True, text=True, timeout=120)
    assert p.returncode == 2, p.stderr
    assert "the following arguments are required" in p.stderr
    assert all("--" + name.replace("_", "-") in p.stderr for name in unread)
