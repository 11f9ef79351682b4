"""The generated script's own command line: --dry-run writes nothing, --explain prints Spark's plan,
the positional arguments are the driver's, hard-coded paths are options with the old default."""
from __future__ import annotations

import pytest

from tests.conftest import SAMPLES, load_script


def _script(converted_samples, driver):
    out_dir, report = converted_samples
    job = next(j for j in report["jobs"] if j["driver"] == driver)
    return load_script(out_dir / job["script"]), job


def test_dry_run_executes_but_writes_nothing(converted_samples, spark, tmp_path):
    script, _ = _script(converted_samples, "net.brindleharbour.rides.RidesPerStation")
    target = tmp_path / "never"
    assert script.main([str(SAMPLES / "data" / "rides"), str(target), "--dry-run"]) == 0
    assert not target.exists()


def test_dry_run_still_fails_where_java_would_throw(converted_samples, spark, tmp_path):
    # DurationMapper parses f[5] outside any try: a bad row fails the Hadoop task, and the script.
    script, _ = _script(converted_samples, "net.brindleharbour.rides.AverageRideDuration")
    bad = tmp_path / "bad"
    bad.mkdir()
    (bad / "r.csv").write_text("ride_id,...\nR1,B1,Quayside,Old Mill,2026-11-30 07:02:11,six hundred,member,150\n")
    with pytest.raises(Exception, match="NumberFormatException"):
        script.main([str(bad), str(tmp_path / "o"), "--dry-run"])


def test_explain_prints_the_physical_plan(converted_samples, spark, tmp_path, capsys):
    script, _ = _script(converted_samples, "net.brindleharbour.rides.RidesPerStation")
    assert script.main([str(SAMPLES / "data" / "rides"), str(tmp_path / "o"), "--explain"]) == 0
    assert "Physical Plan" in capsys.readouterr().out
    assert not (tmp_path / "o").exists()


def test_hard_coded_driver_paths_are_options_with_the_old_defaults(converted_samples, capsys):
    script, job = _script(converted_samples, "net.brindleharbour.reports.PeakHourByStation")
    with pytest.raises(SystemExit):
        script.main(["--help"])
    text = " ".join(capsys.readouterr().out.split())
    assert "--input-path" in text and "default: hdfs://bh-namenode:8020/data/rides/current" in text
    assert "--output-path" in text and "default: /srv/reports/peak_hour" in text
    assert {a["name"]: a["default"] for a in job["arguments"]}["output_path"] == "/srv/reports/peak_hour"


def test_existing_output_folder_is_refused_like_hadoop(converted_samples, spark, tmp_path):
    script, _ = _script(converted_samples, "net.brindleharbour.rides.RidesPerStation")
    out = tmp_path / "exists"
    out.mkdir()
    with pytest.raises(Exception, match="already exists"):
        script.main([str(SAMPLES / "data" / "rides"), str(out)])
