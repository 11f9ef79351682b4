"""Which reduce task a key goes to: the script's hashes against Hadoop's own classes on the JVM.

Java side: org.apache.hadoop.io.Text.hashCode, String.hashCode, String.charAt, LongWritable.hashCode
and org.apache.hadoop.mapreduce.lib.partition.HashPartitioner, from the hadoop-client jars in the
pyspark wheel (tests/unit/jvm/PartitionHashes.java). Spark side: migrate/gen/helpers.py.
"""
from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

from migrate.gen.helpers import helper_source

STRINGS = ["Quayside", "Old Mill", "", "a", "Lantern Sq", "Ærøskøbing", "日本橋", "😀 dock", "\u0000", "zz" * 40,
           "Straße", "İ", "\uffff", "a\tb", "\ue000x", "\U0001f6b2 bike", "B"]
LONGS = [0, 1, -1, 2**31, -(2**31) - 1, 2**63 - 1, -(2**63), 1234567890123]


@pytest.fixture(scope="module")
def jvm_hashes(tmp_path_factory):
    if shutil.which("javac") is None:
        pytest.skip("needs a JDK on PATH")
    from migrate.verify.hadoop import compile_classpath, spark_jars

    d = tmp_path_factory.mktemp("hashes")
    src = Path(__file__).parent / "jvm" / "PartitionHashes.java"
    cp = compile_classpath()
    subprocess.run(["javac", "-encoding", "UTF-8", "-cp", cp, "-d", str(d), str(src)], check=True)
    inp = d / "in.hex"
    inp.write_text("\n".join(s.encode("utf-8").hex() for s in STRINGS) + "\n", encoding="ascii")
    out = subprocess.run(["java", "-cp", f"{d}:{spark_jars()}/*", "PartitionHashes", str(inp), ",".join(map(str, LONGS))],
                         check=True, capture_output=True, text=True).stdout
    strings, longs, order = {}, {}, []
    for line in out.splitlines():
        f = line.split("\t")
        if f[0] == "sorted":
            order.append(int(f[1]))
        elif f[0] == "long":
            longs[int(f[1])] = int(f[2])
        else:
            strings[int(f[0])] = (int(f[1]), int(f[2]), f[3], int(f[4]))
    return strings, longs, order


@pytest.fixture(scope="module")
def ns(spark):
    from pyspark.sql import Column
    from pyspark.sql import functions as F

    scope = {"F": F, "Column": Column}
    exec(helper_source({"hadoop_partition"}), scope)
    return scope


def test_text_and_string_hashes_and_hash_partitioner_match_hadoop(spark, ns, jvm_hashes):
    from pyspark.sql import functions as F

    strings, _, _ = jvm_hashes
    df = spark.createDataFrame(list(enumerate(STRINGS)), "i int, s string")
    rows = df.select("i", ns["text_hash"](F.col("s")).alias("text"), ns["string_hash"](F.col("s")).alias("string"),
                     ns["partition_of"](ns["text_hash"](F.col("s")), 7).alias("task")).collect()
    got = {r["i"]: (r["text"], r["string"], r["task"]) for r in rows}
    for i, (text, string, _first, task) in strings.items():
        assert got[i] == (text, string, task), STRINGS[i]


def test_first_code_unit_matches_char_at_and_fails_on_empty(spark, ns, jvm_hashes):
    from pyspark.sql import functions as F

    strings, _, _ = jvm_hashes
    nonempty = [(i, s) for i, s in enumerate(STRINGS) if s]
    df = spark.createDataFrame(nonempty, "i int, s string")
    got = {r["i"]: r["u"] for r in df.select("i", ns["first_code_unit"](F.col("s")).alias("u")).collect()}
    for i, _ in nonempty:
        assert str(got[i]) == strings[i][2], STRINGS[i]
    assert strings[STRINGS.index("")][2] == "throws"
    with pytest.raises(Exception, match="StringIndexOutOfBounds"):
        spark.createDataFrame([("",)], "s string").select(ns["first_code_unit"](F.col("s"))).collect()


def test_long_writable_hash_matches_hadoop(spark, ns, jvm_hashes):
    from pyspark.sql import functions as F

    _, longs, _ = jvm_hashes
    df = spark.createDataFrame([(v,) for v in LONGS], "v bigint")
    got = {r["v"]: r["h"] for r in df.select("v", ns["long_hash"](F.col("v")).alias("h")).collect()}
    assert got == longs


def test_utf16_sort_key_orders_strings_as_string_compare_to(spark, jvm_hashes):
    """Spark orders strings by UTF-8 bytes; String.compareTo by UTF-16 units (they differ past U+FFFF)."""
    from pyspark.sql import functions as F

    _, _, java_order = jvm_hashes
    df = spark.createDataFrame(list(enumerate(STRINGS)), "i int, s string")
    spark_order = [r["i"] for r in df.orderBy(F.encode(F.col("s"), "UTF-16BE")).collect()]
    assert spark_order == java_order
    plain = [r["i"] for r in df.orderBy("s").collect()]
    assert plain != java_order  # the samples include a case where Spark's own order differs
