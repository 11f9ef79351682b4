"""SimpleDateFormat's lenient parse, getTime() and Calendar fields: the real JVM (tests/unit/jvm/
DateParse.java) against the sdf_parse helper that generated scripts use, in UTC and in a zone with
daylight saving time. Inputs follow ../shared/SEMANTICS.md section 10 (roll-over, trailing text,
one-digit fields, the DST gap and the repeated hour)."""
from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

from migrate.gen.helpers import helper_source

pytestmark = pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")

INPUTS = {
    "yyyy-MM-dd HH:mm:ss": ["2024-01-05 10:20:30", "2024-02-30 10:00:00", "2024-13-01 25:61:00", "2024-1-5 7:03:09",
                            "2024-01-05 10:20:30xyz", "2024-01-05 10:20:30.999", "2024-03-10 02:30:00",
                            "2024-11-03 01:30:00", "2024-07-01 12:00:00", "garbage", "", "2024-01-05",
                            "2026-11-31 23:59:60", "1999-12-31 23:59:59"],
    "yyyy-MM-dd": ["2024-01-05", "2024-02-30", "2024-1-5", "2024-01-05 10:00", "x2024-01-05", "2024/01/05"],
}
ZONES = ["UTC", "America/Los_Angeles"]


@pytest.fixture(scope="module")
def compiled(tmp_path_factory):
    d = tmp_path_factory.mktemp("dates")
    subprocess.run(["javac", "-d", str(d), str(Path(__file__).parent / "jvm" / "DateParse.java")], check=True)
    return d


def _java(compiled: Path, zone: str, pattern: str, inputs: list[str], format_zone: str | None = None,
          lenient: bool = True) -> list[str]:
    f = compiled / "inputs.txt"
    f.write_text("\n".join(inputs) + "\n", encoding="utf-8")
    out = subprocess.run(["java", "-cp", str(compiled), "DateParse", zone, pattern, str(f), format_zone or "-",
                          "lenient" if lenient else "strict"], check=True, capture_output=True, text=True).stdout
    return out.splitlines()


@pytest.mark.parametrize("lenient", [True, False], ids=["lenient", "strict"])
@pytest.mark.parametrize("zone", ZONES)
@pytest.mark.parametrize("pattern", sorted(INPUTS))
def test_sdf_parse_matches_the_jvm(zone, pattern, lenient, compiled, spark):
    from pyspark.sql import Column
    from pyspark.sql import functions as F
    import re

    ns = {"F": F, "Column": Column, "re": re}
    exec(helper_source({"sdf_parse"}), ns)
    inputs = INPUTS[pattern]
    want = _java(compiled, zone, pattern, inputs, lenient=lenient)
    old = spark.conf.get("spark.sql.session.timeZone")
    spark.conf.set("spark.sql.session.timeZone", zone)
    try:
        df = spark.createDataFrame([(i, s) for i, s in enumerate(inputs)], "i int, s string")
        ts = ns["sdf_parse"](F.col("s"), pattern, lenient=lenient, skip_bad_record=True)
        rows = df.select("i", F.unix_millis(ts).alias("ms"), F.hour(ts).alias("h"), F.dayofweek(ts).alias("w")) \
            .orderBy("i").collect()
    finally:
        spark.conf.set("spark.sql.session.timeZone", old)
    got = ["THROWS" if r["ms"] is None else f"{r['ms']} {r['h']} {r['w']}" for r in rows]
    assert got == want, [(s, g, w) for s, g, w in zip(inputs, got, want) if g != w]


@pytest.mark.parametrize("lenient", [True, False], ids=["lenient", "strict"])
@pytest.mark.parametrize("zone, format_zone", [("UTC", "America/Los_Angeles"), ("America/Los_Angeles", "UTC"),
                                               ("UTC", "GMT+05:30"), ("Asia/Tokyo", "Europe/Berlin")])
def test_a_format_with_its_own_zone_matches_the_jvm(zone, format_zone, lenient, compiled, spark):
    """fmt.setTimeZone(z) parses and formats in z whatever the JVM's default zone (Java SE API,
    DateFormat.setTimeZone): the script's session runs in z (migrate.gen.pyspark._time_zone), with
    the same helpers."""
    from pyspark.sql import Column
    from pyspark.sql import functions as F
    import re

    from migrate.lift.dates import spark_format_pattern

    ns = {"F": F, "Column": Column, "re": re}
    exec(helper_source({"sdf_parse"}), ns)
    pattern = "yyyy-MM-dd HH:mm:ss"
    inputs = INPUTS[pattern]
    want = [" ".join(w.split(" ")[:1] + w.split(" ")[3:]) for w in _java(compiled, zone, pattern, inputs, format_zone,
                                                                       lenient)]
    old = spark.conf.get("spark.sql.session.timeZone")
    spark.conf.set("spark.sql.session.timeZone", format_zone)
    try:
        df = spark.createDataFrame([(i, s) for i, s in enumerate(inputs)], "i int, s string")
        ts = ns["sdf_parse"](F.col("s"), pattern, lenient=lenient, skip_bad_record=True)
        rows = df.select("i", F.unix_millis(ts).alias("ms"), F.date_format(ts, spark_format_pattern(pattern)).alias("f")) \
            .orderBy("i").collect()
    finally:
        spark.conf.set("spark.sql.session.timeZone", old)
    got = ["THROWS" if r["ms"] is None else f"{r['ms']} {r['f']}" for r in rows]
    assert got == want, [(s, g, w) for s, g, w in zip(inputs, got, want) if g != w]
