"""Text from the Java sources never breaks a generated file: job names, paths and literals with
quotes, backslashes (`C:\\users`, `\\u`, `\\N{...}`), NUL or CR, and class names that are not
Python names, all give scripts and tests that compile and docstrings that read as the text itself."""
from __future__ import annotations

import ast
import json
from pathlib import Path

from migrate.cli import main
from tests.helpers import job_source, scan_text

# Java string literal bodies (as written in the .java file) and the value javac gives them
NAMES = {
    "Quotes": ('say \\"\\"\\"hi\\"\\"\\" and \\"', 'say """hi""" and "'),
    "Slashes": ("C:\\\\users\\\\etl \\\\u0041 \\\\N{BULLET} \\\\x", "C:\\users\\etl \\u0041 \\N{BULLET} \\x"),
    "Controls": ("a\\u0000b\\rc\\u2028d", "a\x00b\rc\u2028d"),
    "Tally$Job": ("dollar", "dollar"),
    "Fare€Tally": ("euro €", "euro €"),
    "_9Lives": ("digit first", "digit first"),
}


def _repo(root: Path) -> Path:
    files = {}
    for cls, (literal, _) in NAMES.items():
        body = ('      context.write(new Text("' + literal + '" + value.toString()), new IntWritable(1));')
        files[f"{cls}.java"] = (job_source(body, reducer_class=None, extra_driver=f'job.setJobName("{literal}");')
                                .replace("public class Main", f"public class {cls}"))
    scan_text(root, files)
    return root


def test_every_generated_file_compiles_and_docstrings_keep_the_text(tmp_path):
    repo = _repo(tmp_path / "repo")
    out = tmp_path / "out"
    assert main(["convert", str(repo), "-o", str(out), "--with-tests"]) == 0
    report = json.loads((out / "report.json").read_text(encoding="utf-8"))
    assert report["errors"] == [] and {j["status"] for j in report["jobs"]} == {"converted"}
    scripts = {j["driver"]: j["script"] for j in report["jobs"]}
    assert scripts["Tally$Job"] == "tally_job.py" and scripts["Fare€Tally"] == "fare_tally.py"
    assert scripts["_9Lives"] == "job_9_lives.py"
    generated = sorted(out.rglob("*.py"))
    assert len(generated) == 2 * len(NAMES)  # a script and a test per job
    for f in generated:
        tree = ast.parse(f.read_text(encoding="utf-8"), str(f))  # Python's own parser is the judge
        compile(tree, str(f), "exec")
    for driver, (_, value) in NAMES.items():
        doc = ast.get_docstring(ast.parse((out / scripts[driver]).read_text(encoding="utf-8")), clean=False)
        assert f'Hadoop MapReduce job "{value}"' in doc, driver  # the job name as Java has it, nothing lost


def test_docstring_text_round_trips_any_string():
    from migrate.gen.pyspark import docstring_text

    for text in ['"', '""', '"""', 'a"""b""""', "\\", "\\N{X}", "\\u12", "x\x00\r\x1b\u2028\U0001F600y", "end\""]:
        doc = ast.literal_eval('"""' + docstring_text(text) + '"""')
        assert doc == text, text


def test_a_giant_else_if_chain_is_declined_with_its_reason_not_formatted_for_minutes(tmp_path):
    """An else-if chain of 120 branches used to give a 343 KB expression nested 242 deep, which black
    formatted for about a minute (time grows steeply with nesting) and Python then refused to compile
    ("too many nested parentheses"). It is now refused before formatting, with the reason."""
    branches = "".join(f'      else if (s.startsWith("z{i}")) {{ zone = "a{i}"; }}\n' for i in range(1, 120))
    body = ('      String s = value.toString();\n      String zone;\n'
            '      if (s.startsWith("z0")) { zone = "a0"; }\n' + branches +
            '      else { zone = "none"; }\n      context.write(new Text(zone), new IntWritable(1));')
    repo = tmp_path / "repo"
    scan_text(repo, {"Main.java": job_source(body, reducer_class=None)})
    out = tmp_path / "out"
    assert main(["convert", str(repo), "-o", str(out)]) == 0
    report = json.loads((out / "report.json").read_text())
    (job,) = report["jobs"]
    assert job["status"] == "not_converted" and job["script"] == ""
    assert "nested" in job["hand_work"][0]["reason"] and "lookup table" in job["hand_work"][0]["reason"]
    assert not list(out.glob("*.py"))
