"""Metamorphic variants (tests/variants.py): the sample jobs rewritten along style axes that keep
their meaning must convert with the same status and give byte-identical output.

Per axis: the whole sample tree is rewritten and converted. For every job, the status and the
hand-work categories must equal the unvaried job's. For every converted job the axis touched, the
generated code (comments aside) must be the same, or else both scripts run on the sample data
through local Spark and their outputs must be the same bytes. For one touched job per axis, the
variant itself also runs on Hadoop's local runner (javac + LocalJobRunner, the real thing) and
must write what the variant's script writes.
"""
from __future__ import annotations

import io
import tokenize

import pytest

from migrate.convert import write_outputs
from migrate.scan import scan_repo
from migrate.verify.compare import compare_outputs, output_bytes
from migrate.verify.hadoop import compile_sources, run_job
from migrate.verify.runner import branch_taken
from tests.conftest import SAMPLES, load_script, sample_path, sample_runs
from tests.variants import AXES, write_variant

pytestmark = pytest.mark.parity

RUNS = sample_runs()


def _run_of(job: dict) -> dict | None:
    """The sample run of the job's driver that takes the job's branch."""
    return next((r for r in RUNS if r["driver"] == job["driver"] and branch_taken(job.get("mode"), r["args"])), None)
# Jobs whose drivers name fixed cluster paths: Hadoop cannot run them on the sample data, but their
# scripts take the paths as options, so a variant's script is compared with the unvaried one's.
SPARK_ONLY_RUNS = {
    "net.brindleharbour.reports.PeakHourByStation": {"args": ["--input-path", "data/rides", "--output-path", "@out",
                                                              "--time-zone", "UTC"]},
}


def code_only(path) -> str:
    """A generated script without comments and docstrings: what runs."""
    src = path.read_text(encoding="utf-8")
    out, prev = [], None
    for tok in tokenize.generate_tokens(io.StringIO(src).readline):
        if tok.type == tokenize.COMMENT:
            continue
        if tok.type == tokenize.STRING and prev in (None, tokenize.NEWLINE, tokenize.INDENT, tokenize.DEDENT, tokenize.NL):
            prev = tok.type  # a docstring (or a bare string statement): prose, not code
            continue
        if tok.type not in (tokenize.NL, tokenize.INDENT, tokenize.DEDENT, tokenize.NEWLINE):
            out.append(tok.string)
        prev = tok.type
    return " ".join(out)


def _spark_output(script_path, run, tmp, tag) -> bytes:
    out = tmp / f"spark_{tag}"
    args = [str(out) if a == "@out" else str(tmp / f"{tag}_{a[1:]}") if a.startswith("@tmp")
            else a if a.startswith("-") else sample_path(a) for a in run["args"]]
    assert load_script(script_path).main(args) == 0
    return output_bytes(out)


def _categories(job: dict) -> list[str]:
    return sorted(h["category"] for h in job["hand_work"])


@pytest.mark.parametrize("axis", AXES, ids=[a.name for a in AXES])
def test_variant_converts_the_same(axis, converted_samples, spark, tmp_path):
    base_out, base = converted_samples
    tree = tmp_path / "tree"
    changed = write_variant(SAMPLES, tree, axis)
    assert changed, f"axis {axis.name} changed no sample file: it tests nothing"
    out = tmp_path / "out"
    variant = write_outputs(scan_repo(tree), out, "bikeshare").report
    by_script = {j["script"]: j for j in variant["jobs"]}
    touched = []
    for job in base["jobs"]:
        v = by_script.get(job["script"])
        assert v is not None, f"{axis.name}: the variant lost job {job['name']}"
        assert (v["status"], _categories(v)) == (job["status"], _categories(job)), (
            f"{axis.name}: {job['name']} was {job['status']} {_categories(job)}, the variant is "
            f"{v['status']} {_categories(v)}: {[h['reason'] for h in v['hand_work']]}")
        if job["status"] == "converted" and {f.split(":")[0] for f in job["files"].values()} & set(changed):
            touched.append((job, v))
    assert touched, f"axis {axis.name} changed no file of a converted job"
    compared = 0
    for job, v in touched:
        if code_only(base_out / job["script"]) == code_only(out / v["script"]):
            continue
        run = _run_of(job) or SPARK_ONLY_RUNS.get(job["driver"])
        assert run is not None, f"{job['name']}: its code differs under {axis.name} and runs.json has no run for it"
        a = _spark_output(base_out / job["script"], run, tmp_path, f"base{compared}")
        b = _spark_output(out / v["script"], run, tmp_path, f"variant{compared}")
        assert a and a == b, f"{axis.name}: {job['name']} writes other bytes than the unvaried script"
        compared += 1
    # one touched job with a sample run goes through Hadoop itself, as the variant's author wrote it
    job, v = next(((j, v) for j, v in touched if _run_of(j) and "intermediates" not in _run_of(j)), (None, None))
    if job is None:
        return
    run = _run_of(job)
    classes = tmp_path / "classes"
    built = compile_sources(sorted(tree.joinpath("src").rglob("*.java")), classes)
    assert built.ok, built.log
    hadoop_out = tmp_path / "hadoop"
    ran = run_job(classes, job["driver"], [str(hadoop_out) if a == "@out" else a for a in run["args"]], cwd=SAMPLES)
    assert ran.returncode == 0, ran.log[-3000:]
    spark_out = tmp_path / "spark_check"
    args = [str(spark_out) if a == "@out" else sample_path(a) for a in run["args"]]
    assert load_script(out / v["script"]).main(args) == 0
    cmp = compare_outputs(hadoop_out, spark_out, within_key_any_order=run.get("values_order") == "undefined")
    assert cmp.original_lines > 0 and cmp.same, f"{axis.name}: {job['name']} on Hadoop: {cmp.first_difference}"


def test_code_only_drops_comments_not_code(tmp_path):
    a, b = tmp_path / "a.py", tmp_path / "b.py"
    a.write_text('"""doc"""\nx = 1  # why\n# note\ny = "s"\n')
    b.write_text('"""other doc"""\n\nx = 1\ny = "s"\n')
    assert code_only(a) == code_only(b)
    b.write_text('x = 1\ny = "t"\n')
    assert code_only(a) != code_only(b)
