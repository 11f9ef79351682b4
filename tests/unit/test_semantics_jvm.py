"""The Column helpers that generated scripts use, checked against the real JVM (OpenJDK on PATH).

Inputs come from ../shared/SEMANTICS.md (sections 1-5), where each was observed on JDK 17 and
PySpark 4.3; here the Java side is re-run by tests/unit/jvm/Semantics.java on this machine
and the Spark side by the helpers in migrate/gen/helpers.py, so both are checked for real.
"""
from __future__ import annotations

import shutil
import subprocess
from pathlib import Path

import pytest

from migrate.gen.helpers import HELPERS, helper_source

INPUTS = ["a,b,,c,,", ",a,b", "", ",,,", "a|b|c", "a,b", "  hello \t world\n foo  ", "   ", "a\u000bb c",
          "a\u00a0b c", "a,,b,", "a;b,,c;", "\t abc \n", "\u0000abc\u001f", "\u00a0abc\u2003", " 12", "12 ", "+5",
          "-0", "0012", "1_000", "1e3", "0x10", "12.0", "NaN", "Infinity", "inf", "1d", "2147483648",
          "9223372036854775807", "9223372036854775808", "\u0661\u0662", "0x1p3", "İstanbul", "Straße", "😀abc"]
# Known Java/Spark differences documented in SEMANTICS.md section 14 (no faithful native form):
KNOWN_GAPS = {("parse_int", INPUTS.index("\u0661\u0662")), ("parse_long", INPUTS.index("\u0661\u0662"))}

jvm = pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")


@pytest.fixture(scope="module")
def java_results(tmp_path_factory):
    d = tmp_path_factory.mktemp("jvm")
    src = Path(__file__).parent / "jvm" / "Semantics.java"
    subprocess.run(["javac", "-encoding", "UTF-8", "-d", str(d), str(src)], check=True)
    inp = d / "inputs.hex"
    inp.write_text("\n".join(s.encode("utf-8").hex().upper() for s in INPUTS) + "\n", encoding="ascii")
    out = subprocess.run(["java", "-Duser.language=en", "-Duser.country=US", "-cp", str(d), "Semantics", str(inp)],
                         check=True, capture_output=True, text=True).stdout
    results = {}
    for line in out.splitlines():
        op, i, h = line.split("\t")
        results[(op, int(i))] = bytes.fromhex(h).decode("utf-8")
    return results


@pytest.fixture(scope="module")
def helpers(spark):
    from pyspark.sql import Column, DataFrame, Window
    from pyspark.sql import functions as F

    ns = {"F": F, "Column": Column, "DataFrame": DataFrame, "Window": Window}
    exec(helper_source(set(HELPERS)), ns)
    return ns


def _spark_strings(spark, helpers, make):
    from pyspark.sql import functions as F

    df = spark.createDataFrame([(i, s) for i, s in enumerate(INPUTS)], "i int, s string")
    rows = df.select("i", make(F.col("s"), helpers).alias("r")).orderBy("i").collect()
    return {r["i"]: r["r"] for r in rows}


def _joined(arr_col):
    from pyspark.sql import functions as F

    return F.concat(F.array_join(arr_col, "|"), F.lit("#"), F.size(arr_col).cast("string"))


CASES = {
    "split_comma": lambda s, h: _joined(h["java_split"](s, ",")),
    "split_pipe_escaped": lambda s, h: _joined(h["java_split"](s, r"\|")),
    "tokens": lambda s, h: _joined(h["java_tokens"](s)),
    "tokens_delims": lambda s, h: _joined(h["java_tokens"](s, "[,;]+")),
    "trim": lambda s, h: h["java_trim"](s),
    "length": lambda s, h: h["java_length"](s).cast("string"),
}


@jvm
@pytest.mark.parametrize("op", sorted(CASES))
def test_string_helpers_match_the_jvm(op, java_results, helpers, spark):
    got = _spark_strings(spark, helpers, CASES[op])
    for i, s in enumerate(INPUTS):
        assert got[i] == java_results[(op, i)], f"{op}({s!r})"


@jvm
def test_split_with_negative_limit_is_plain_spark_split(java_results, spark):
    from pyspark.sql import functions as F

    got = _spark_strings(spark, {}, lambda s, h: _joined(F.split(s, ",", -1)))
    assert all(got[i] == java_results[("split_comma_limit", i)] for i in range(len(INPUTS)))


@jvm
def test_lower_is_spark_lower_for_the_default_locale(java_results, spark):
    from pyspark.sql import functions as F

    got = _spark_strings(spark, {}, lambda s, h: F.lower(s))
    assert all(got[i] == java_results[("lower", i)] for i in range(len(INPUTS)))


@jvm
@pytest.mark.parametrize("op,helper", [("parse_int", "java_parse_int"), ("parse_long", "java_parse_long"),
                                       ("parse_double", "java_parse_double")])
def test_number_parsing_is_null_exactly_where_java_throws(op, helper, java_results, helpers, spark):
    got = _spark_strings(spark, helpers, lambda s, h: h[helper](s, skip_bad_record=True).cast("string"))
    for i, s in enumerate(INPUTS):
        if (op, i) in KNOWN_GAPS:
            continue
        want = java_results[(op, i)]
        assert (got[i] is None) == (want == "THROWS"), f"{op}({s!r}): java {want}, spark {got[i]}"
        if want != "THROWS":
            assert got[i] == want, f"{op}({s!r})"


@jvm
def test_parse_fails_the_job_outside_a_catch(helpers, spark):
    from pyspark.sql import functions as F

    df = spark.createDataFrame([("12",), ("x",)], "s string")
    with pytest.raises(Exception, match="NumberFormatException"):
        df.select(helpers["java_parse_int"](F.col("s"))).collect()


@jvm
def test_integer_division_wrap_and_double_division(java_results, helpers, spark):
    from pyspark.sql import functions as F

    pairs = [(-7, 2), (7, -2), (7, 2), (-7, -2), (0, 5), (9223372036854775807, 3), (-9, 4)]
    df = spark.createDataFrame(pairs, "a bigint, b bigint")
    rows = df.select(helpers["java_long_div"](F.col("a"), F.col("b")).alias("d"), (F.col("a") % F.col("b")).alias("m")).collect()
    for i, r in enumerate(rows):
        assert str(r["d"]) == java_results[("long_div", i)] and str(r["m"]) == java_results[("long_mod", i)]
    sums = spark.createDataFrame([(2147483647, 1), (-2147483648, -1), (100000, 100000)], "a bigint, b bigint")
    rows = sums.select(helpers["wrap_int"](F.col("a") + F.col("b")).alias("w")).collect()
    assert [str(r["w"]) for r in rows] == [java_results[("int_wrap_sum", i)] for i in range(3)]
    divs = spark.createDataFrame([(7.0, 0.0), (-7.0, 0.0), (0.0, 0.0), (7.0, -0.0), (1.0, 3.0)], "x double, y double")
    rows = divs.select(helpers["java_div_double"](F.col("x"), F.col("y")).cast("string").alias("q")).collect()
    assert [r["q"] for r in rows] == [java_results[("double_div", i)] for i in range(5)]
