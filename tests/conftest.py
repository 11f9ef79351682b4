"""Shared fixtures: one local Spark session, the converted samples, the compiled original jobs."""
from __future__ import annotations

import importlib.util
import json
import os
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
SAMPLES = ROOT / "samples" / "bikeshare"


def pytest_addoption(parser):
    parser.addoption("--regen-golden", action="store_true", default=False,
                     help="rewrite the expected files of the golden tests from the current output")


@pytest.fixture(scope="session")
def spark():
    pytest.importorskip("pyspark", reason="pyspark is part of the test extra: pip install -e '.[test]'")
    from pyspark.sql import SparkSession

    os.environ.setdefault("PYSPARK_PYTHON", sys.executable)
    session = (SparkSession.builder.master("local[2]").appName("mrlift-tests")
               .config("spark.sql.ansi.enabled", "true").config("spark.ui.enabled", "false")
               .config("spark.sql.shuffle.partitions", "4").getOrCreate())
    session.sparkContext.setLogLevel("ERROR")
    yield session
    session.stop()


@pytest.fixture(scope="session")
def converted_samples(tmp_path_factory):
    """mrlift convert samples/bikeshare -o <tmp> --jobs 2 --no-compile-check: the folder and its report."""
    from migrate.batch import convert_repository

    out = tmp_path_factory.mktemp("converted") / "bikeshare"
    written = convert_repository(SAMPLES, out, "bikeshare", jobs=2, compile_mode="off")
    return out, written.report


@pytest.fixture(scope="session")
def hadoop_classes(tmp_path_factory):
    """The sample repository compiled with javac against the Hadoop client jars."""
    from migrate.verify.hadoop import compile_sources

    classes = tmp_path_factory.mktemp("classes")
    result = compile_sources(sorted((SAMPLES / "src").rglob("*.java")), classes)
    assert result.ok, result.log
    return classes


def sample_runs() -> list[dict]:
    return json.loads((SAMPLES / "runs.json").read_text(encoding="utf-8"))["runs"]


def sample_path(arg: str) -> str:
    """A runs.json argument made absolute where it names sample files (each part of a comma list,
    a glob included); another word (a mode a driver picks its job by) as it is."""
    parts = arg.split(",")
    if not all((SAMPLES / p).exists() or any(SAMPLES.glob(p)) for p in parts):
        return arg
    return ",".join(str(SAMPLES / p) for p in parts)


def run_id(run: dict) -> str:
    """A test id for a sample run: the driver's simple name, and the first argument where one
    driver has several runs (a driver that picks its job by that argument)."""
    name = run["driver"].rsplit(".", 1)[-1]
    several = sum(r["driver"] == run["driver"] for r in sample_runs()) > 1
    return f"{name}[{run['args'][0]}]" if several else name


def load_script(path: Path):
    """Import a generated script as a module (each under its own name)."""
    name = "generated_" + path.stem
    spec = importlib.util.spec_from_file_location(name, path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module
