"""java.time parsing with DateTimeFormatter.ofPattern (ResolverStyle.SMART): the real JVM
(tests/unit/jvm/JavaTimeParse.java) against the jt_parse helper generated scripts use.
Java SE API: DateTimeFormatter (SMART resolves day-of-month 29-31 to the month's last day and
24:00 to the next midnight), LocalDateTime.getDayOfWeek (Monday = 1)."""
from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

from migrate.gen.helpers import helper_source

pytestmark = pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")

CASES = [
    ("datetime", "yyyy-MM-dd HH:mm:ss", ["2024-01-05 10:20:30", "2024-02-30 10:00:00", "2024-02-31 10:00:00",
                                        "2023-02-29 10:00:00", "2024-02-32 10:00:00", "2024-13-01 10:00:00",
                                        "2024-1-5 07:03:09", "2024-01-05 24:00:00", "2024-01-05 24:30:00",
                                        "2024-01-05 23:59:60", "2024-01-05 10:20:30x", " 2024-01-05 10:20:30",
                                        "2024-04-31 00:00:00", "1999-12-31 23:59:59", ""]),
    ("date", "yyyy-MM-dd", ["2024-01-05", "2024-02-30", "2024-04-31", "2024-00-10", "20240105", "2024-12-31"]),
    ("date", "dd/MM/yyyy", ["05/01/2024", "31/02/2023", "5/1/2024", "05/01/2024 ", "29/02/2024"]),
    ("datetime", "yyyy-MM-dd'T'HH:mm", ["2024-01-05T10:20", "2024-01-05 10:20", "2024-06-30T24:00"]),
]


@pytest.fixture(scope="module")
def compiled(tmp_path_factory):
    d = tmp_path_factory.mktemp("javatime")
    subprocess.run(["javac", "-d", str(d), str(Path(__file__).parent / "jvm" / "JavaTimeParse.java")], check=True)
    return d


@pytest.mark.parametrize("kind,pattern,inputs", CASES, ids=[f"{k}:{p}" for k, p, _ in CASES])
def test_jt_parse_matches_the_jvm(kind, pattern, inputs, compiled, spark, tmp_path):
    import re

    from pyspark.sql import Column
    from pyspark.sql import functions as F

    f = tmp_path / "in.txt"
    f.write_text("\n".join(inputs) + "\n", encoding="utf-8")
    want = subprocess.run(["java", "-cp", str(compiled), "JavaTimeParse", kind, pattern, str(f)], check=True,
                          capture_output=True, text=True).stdout.splitlines()
    ns = {"F": F, "Column": Column, "re": re}
    exec(helper_source({"jt_parse"}), ns)
    t = ns["jt_parse"](F.col("s"), pattern, date_only=kind == "date", skip_bad_record=True)
    df = spark.createDataFrame([(i, s) for i, s in enumerate(inputs)], "i int, s string")
    hms = [F.lit(0)] * 3 if kind == "date" else [F.hour(t), F.minute(t), F.second(t)]
    line = F.concat_ws(" ", F.year(t), F.month(t), F.dayofmonth(t), *hms, F.weekday(t) + 1, F.date_format(t, pattern))
    rows = df.select("i", F.when(t.isNull(), F.lit("THROWS")).otherwise(line).alias("r")).orderBy("i").collect()
    got = [r["r"] for r in rows]
    assert got == want, [(s, g, w) for s, g, w in zip(inputs, got, want) if g != w]
