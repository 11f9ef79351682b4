"""The hostile-input campaign as a test: over a thousand seeded inputs in one repository, converted
in one run. No crash, no hang (the run has a time limit), every generated file compiles (Python's
own parser), no "converted" for code that javac (JDK 17, the Hadoop client jars the pyspark wheel
ships) rejects, and no payload reaches the review page or the spreadsheet unescaped."""
from __future__ import annotations

import ast
import csv
import io
import json
import re
import shutil
import subprocess
import sys

import pytest

from tests.fuzz.campaign import build

javac = pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")


@pytest.fixture(scope="module")
def campaign(tmp_path_factory):
    root = tmp_path_factory.mktemp("hostile") / "repo"
    camp = build(root)
    out = root.parent / "out"
    # its own process with a time limit: a hang fails the test instead of stopping the suite
    p = subprocess.run([sys.executable, "-m", "migrate", "convert", str(root), "-o", str(out), "--with-tests"],
                       capture_output=True, text=True, timeout=1800)
    return camp, out, p


def test_over_a_thousand_inputs_convert_without_a_crash(campaign):
    camp, out, p = campaign
    assert camp.count >= 1000
    assert p.returncode == 0, p.stdout[-3000:] + p.stderr[-3000:]
    assert "Traceback" not in p.stdout + p.stderr
    report = json.loads((out / "report.json").read_text(encoding="utf-8"))
    assert report["summary"]["jobs"] > 0 and report["summary"]["converted"] > 0
    assert all(e["line"] is None or e["line"] > 0 for e in report["errors"])  # a real line, or the whole file


def test_every_generated_file_compiles(campaign):
    _, out, _ = campaign
    generated = sorted(out.rglob("*.py"))
    assert len(generated) > 100
    for f in generated:
        ast.parse(f.read_text(encoding="utf-8"), str(f))


def test_payloads_never_reach_the_page_or_the_spreadsheet_raw(campaign):
    _, out, _ = campaign
    page = (out / "review.html").read_text(encoding="utf-8")
    assert len(re.findall(r"<script", page)) == 2  # the index's own two: its data and its code
    pages = [page] + [p.read_text(encoding="utf-8") for p in sorted((out / "review").glob("*.html"))]
    assert len(pages) > 1
    for text in pages:
        for raw in ("<script>alert(1)</script>", "<img src=x onerror=1>"):
            assert raw not in text
    assert all(len(re.findall(r"<script", text)) == 1 for text in pages[1:])  # a job page's own code
    cells = [c for row in csv.reader(io.StringIO((out / "effort.csv").read_text(encoding="utf-8"))) for c in row]
    assert not any(c[:1] in ("=", "+", "-", "@") for c in cells)


@javac
def test_no_job_javac_rejects_is_claimed_converted(campaign):
    """convert ran javac (the default where a JDK is found); the check here runs it again over the
    files of every converted job. A file javac could only not check for a missing library must say
    so in its job's notes."""
    from migrate.verify.hadoop import compile_classpath, javac_errors

    camp, out, _ = campaign
    report = json.loads((out / "report.json").read_text(encoding="utf-8"))
    assert report["settings"]["compile_check"].startswith("javac")
    converted = [j for j in report["jobs"] if j["status"] == "converted"]
    claimed = {span.rsplit(":", 1)[0] for j in converted for span in j["files"].values()}
    assert len(claimed) > 50  # most mutants still compile and convert: the check has something to check
    rejected = javac_errors([camp.root / f for f in sorted(claimed)], compile_classpath())
    noted = {span.rsplit(":", 1)[0] for j in converted if any("javac could not check" in n for n in j["notes"])
             for span in j["files"].values()}
    wrong = {rel: errs[:2] for path, errs in rejected.items()
             if (rel := str(path.relative_to(camp.root.resolve()))) not in noted}
    assert not wrong, f"claimed converted, rejected by javac: {wrong}"
    assert set(report["settings"]["not_compiled"]) >= {str(p.relative_to(camp.root.resolve())) for p in rejected}
