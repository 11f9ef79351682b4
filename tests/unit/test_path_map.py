"""`mrlift convert --path-map`: old storage prefixes in hard-coded driver paths mapped to new ones."""
from __future__ import annotations

import json
from pathlib import Path

from migrate.cli import main
from migrate.pathmap import PathMap, PathMapError, load_path_map

SAMPLES = Path(__file__).resolve().parent.parent.parent / "samples" / "bikeshare"


def test_longest_prefix_wins(tmp_path):
    f = tmp_path / "map.toml"
    f.write_text('[paths]\n"hdfs://nn/" = "/mnt/a/"\n"hdfs://nn/data/" = "s3a://lake/"\n', encoding="utf-8")
    pm = load_path_map(f)
    assert pm.apply("hdfs://nn/data/rides") == "s3a://lake/rides"
    assert pm.apply("hdfs://nn/tmp/x") == "/mnt/a/tmp/x"
    assert pm.apply("file:///x") is None


def test_bad_toml_names_the_file_and_line(tmp_path, capsys):
    f = tmp_path / "map.toml"
    f.write_text('[paths]\n"hdfs://nn/" = \n', encoding="utf-8")
    try:
        load_path_map(f)
    except PathMapError as exc:
        assert str(f) in str(exc) and "line 2" in str(exc)
    else:
        raise AssertionError("a broken path map must be refused")
    out = tmp_path / "out"
    assert main(["convert", str(SAMPLES), "-o", str(out), "--path-map", str(f)]) == 2
    assert not out.exists()  # nothing written when the map is unusable


def test_a_map_without_paths_table_is_refused(tmp_path):
    f = tmp_path / "map.toml"
    f.write_text('title = "x"\n', encoding="utf-8")
    try:
        load_path_map(f)
    except PathMapError as exc:
        assert "[paths]" in str(exc)
    else:
        raise AssertionError


def test_convert_maps_hard_coded_paths_into_script_defaults_and_the_report(tmp_path):
    out = tmp_path / "out"
    assert main(["convert", str(SAMPLES), "-o", str(out), "--path-map", str(SAMPLES / "path-map.toml")]) == 0
    report = json.loads((out / "report.json").read_text(encoding="utf-8"))
    (peak,) = [j for j in report["jobs"] if j["driver"].endswith("PeakHourByStation")]
    defaults = {a["name"]: a["default"] for a in peak["arguments"]}
    assert defaults["input_path"] == "s3a://brindle-lake/raw/rides/current"
    assert any("path map: input_path hdfs://" in n for n in peak["notes"])
    script = (out / peak["script"]).read_text(encoding="utf-8")
    assert '"s3a://brindle-lake/raw/rides/current"' in script


def test_unmapped_remote_paths_are_noted():
    from migrate.pathmap import map_job_paths
    from migrate.scan import scan_repo

    scan = scan_repo(SAMPLES)
    (peak,) = [j for j in scan.jobs if j.spec.driver.fqcn.endswith("PeakHourByStation")]
    mapped = map_job_paths(peak, PathMap((("hdfs://elsewhere/", "/x/"),)))
    assert any(n.startswith("path map: no rule covers input_path hdfs://") for n in mapped.plan.notes)
    assert mapped.plan.params == peak.plan.params  # nothing matched, nothing changed
