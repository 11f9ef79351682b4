"""Parity against the real thing: the original job on Hadoop's LocalJobRunner (hadoop-client 3.x
jars from the pyspark wheel) vs the generated script on local Spark, same input, same bytes."""
from __future__ import annotations

import pytest

from tests.conftest import SAMPLES, load_script, sample_path, run_id, sample_runs
from migrate.verify.compare import compare_bytes, compare_outputs, counter_differences, output_bytes, parse_counters
from migrate.verify.hadoop import run_job
from migrate.verify.runner import branch_taken
from migrate.plan import ADVISORY_CATEGORIES

pytestmark = pytest.mark.parity

RUNS = sample_runs()


def _job(report: dict, run: dict) -> dict:
    found = [j for j in report["jobs"] if j["driver"] == run["driver"] and branch_taken(j.get("mode"), run["args"])]
    assert found, f"mrlift found no job for driver {run['driver']} given {run['args']}"
    return found[0]


@pytest.mark.parametrize("run", RUNS, ids=[run_id(r) for r in RUNS])
def test_converted_job_matches_hadoop_output(run, converted_samples, hadoop_classes, spark, tmp_path, capsys):
    out_dir, report = converted_samples
    job = _job(report, run)
    keys_only = run.get("compare") == "keys"  # runs.json says why the values cannot be compared
    lines_only = run.get("compare") == "lines"  # ... or why the order of the lines cannot
    if job["status"] != "converted" and not (keys_only or lines_only):
        pytest.skip(f"{job['name']} is {job['status']}; see test_partial_jobs_fail_loudly")
    hadoop_out, spark_out = tmp_path / "hadoop", tmp_path / "spark"
    # "@out" is the output folder; "@tmp1", "@tmp2"... the folders where chained jobs hand over
    hadoop_args = [str(hadoop_out) if a == "@out" else str(tmp_path / f"hadoop_{a[1:]}") if a.startswith("@tmp")
                   else a for a in run["args"]]
    ran = run_job(hadoop_classes, run["driver"], hadoop_args, cwd=SAMPLES)
    assert ran.returncode == 0, ran.log[-4000:]
    script = load_script(out_dir / job["script"])
    # the same arguments as the Hadoop run, made absolute (Spark's JVM keeps its own working folder)
    spark_args = [str(spark_out) if a == "@out" else str(tmp_path / f"spark_{a[1:]}") if a.startswith("@tmp")
                  else sample_path(a) for a in run["args"]]
    assert script.main(spark_args) == 0
    for folder in run.get("intermediates", []):  # chained jobs: the script passes them on unwritten...
        assert not (tmp_path / f"spark_{folder[1:]}").exists()
    if run.get("intermediates"):  # ... and writes them when asked, the same as Hadoop's
        kept = tmp_path / "spark_kept"
        assert script.main([str(kept) if a == str(spark_out) else a for a in spark_args] + ["--keep-intermediates"]) == 0
        for folder in run["intermediates"]:
            same = compare_outputs(tmp_path / f"hadoop_{folder[1:]}", tmp_path / f"spark_{folder[1:]}")
            assert same.original_lines > 0 and same.same, f"{folder}: {same.first_difference}"
        kept_cmp = compare_outputs(hadoop_out, kept, within_key_any_order=run.get("values_order") == "undefined")
        assert kept_cmp.same, kept_cmp.first_difference
    # where the original defines no order for a key's lines, runs.json says so and why
    if keys_only:
        assert job["status"] == "partial" and all(h["category"] in ADVISORY_CATEGORIES for h in job["hand_work"])
        hadoop_keys = [line.split(b"\t")[0] for line in output_bytes(hadoop_out).splitlines()]
        spark_keys = [line.split(b"\t")[0] for line in output_bytes(spark_out).splitlines()]
        assert hadoop_keys and hadoop_keys == spark_keys
        return
    cmp = compare_outputs(hadoop_out, spark_out, within_key_any_order=run.get("values_order") == "undefined")
    if lines_only:
        assert job["status"] == "partial" and all(h["category"] in ADVISORY_CATEGORIES for h in job["hand_work"])
        assert cmp.original_lines > 0 and cmp.same_lines_any_order, cmp.first_difference
        return
    assert cmp.original_lines > 0, "the sample produced no output: the test would prove nothing"
    assert cmp.same, cmp.first_difference
    if job["task_files"]:  # --task-files: the same lines in the same part file as each Hadoop reduce task
        per_task = tmp_path / "spark_tasks"
        assert script.main([str(per_task) if a == str(spark_out) else a for a in spark_args] + ["--task-files"]) == 0
        tasks_h, tasks_s = _by_task(hadoop_out), _by_task(per_task)
        assert sorted(tasks_h) == sorted(tasks_s) and len(tasks_h) > 1
        for t in tasks_h:
            same = compare_bytes(tasks_h[t], tasks_s[t], within_key_any_order=run.get("values_order") == "undefined")
            assert same.same, f"task {t}: {same.first_difference}"
    if job["counters"]:  # the counters the job log showed, against the script's report
        hadoop_counters = parse_counters(ran.log)
        for c in job["counters"]:
            assert (c["group"], c["name"]) in hadoop_counters, f"Hadoop did not report {c}"
        assert not counter_differences(job["counters"], hadoop_counters, parse_counters(capsys.readouterr().err))


def _by_task(folder) -> dict[int, bytes]:
    """Non-empty part files by task number (Hadoop part-r-00001, Spark part-00001-<uuid>.txt)."""
    from migrate.verify.compare import part_bytes, part_files

    out = {}
    for p in part_files(folder):
        data = part_bytes(p)
        if data:
            out[int(p.name.split("-")[-1 if p.name.startswith("part-r-") else 1].split(".")[0])] = data
    return out


def test_partial_jobs_fail_loudly(converted_samples, spark, tmp_path):
    """A script with hand work left must refuse to run rather than write a partial answer."""
    out_dir, report = converted_samples
    partial = [j for j in report["jobs"] if j["status"] != "converted"]
    assert partial, "the samples are meant to include jobs that need hand work"
    blocked = [j for j in partial if any(h["category"] not in ADVISORY_CATEGORIES for h in j["hand_work"])]
    assert blocked, "the samples are meant to include jobs whose scripts must refuse to run"
    for job in blocked:
        assert job["hand_work"], f"{job['name']} is {job['status']} without a hand-work item"
        script = load_script(out_dir / job["script"])
        with pytest.raises(NotImplementedError, match="hand work needed"):
            script.build(spark, *[str(SAMPLES / "data" / "rides")] * (script.build.__code__.co_argcount - 1))


def test_at_least_eight_sample_jobs_convert(converted_samples):
    _, report = converted_samples
    converted = [j["name"] for j in report["jobs"] if j["status"] == "converted"]
    assert len(converted) >= 8, converted
    assert len(report["jobs"]) >= 10
