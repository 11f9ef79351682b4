"""DockHealthLines: dock health lines

PySpark DataFrame version of the Hadoop MapReduce job "dock health lines", written by mrlift.

Original classes:
    driver       net.brindleharbour.docks.DockHealthLines  (DockHealthLines.java:19-60)
    mapper       net.brindleharbour.docks.DockHealthLines.HealthMapper  (DockHealthLines.java:22-47)

What it computes: a map-only job: each input line becomes zero or more output lines. Shapes: map
only, filter, parse and emit.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit dock_health_lines.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: DockHealthLines.java:42 toUpperCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import sys

from pyspark.sql import Column, DataFrame, SparkSession
from pyspark.sql import functions as F


def drop_trailing_empty(parts: Column) -> Column:
    """The array without its trailing empty strings (all of them where every one is empty)."""
    last = F.array_max(F.transform(parts, lambda x, i: F.when(x != "", i + 1).otherwise(0)))
    return F.slice(parts, 1, F.coalesce(last, F.lit(0)))


def java_split(s: Column, regex: str) -> Column:
    """String.split(regex): Java drops trailing empty strings (F.split alone keeps them), except
    where the regex matched nothing: then the one piece is the whole string, "" included."""
    parts = F.split(s, regex, -1)
    return F.when(F.size(parts) == 1, parts).otherwise(drop_trailing_empty(parts))


def fail_where_java_throws(value: Column, source: Column, exception: str) -> Column:
    """Fail the job where Java would have thrown (an uncaught exception fails the Hadoop task)."""
    message = F.concat(F.lit(exception + ': For input string: "'), source, F.lit('"'))
    return F.when(value.isNotNull(), value).otherwise(F.raise_error(message))


JAVA_INT = r"^[+-]?[0-9]+\z"  # Integer.parseInt / Long.parseLong grammar (ASCII digits, no spaces)


def java_parse_int(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Integer.parseInt: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_INT), s.try_cast("int"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")


JAVA_DOUBLE = (
    r"^[\x00-\x20]*[+-]?(NaN|Infinity|((([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?)"
    r"|(0[xX]([0-9a-fA-F]+\.?[0-9a-fA-F]*|\.[0-9a-fA-F]+)[pP][+-]?[0-9]+))[fFdD]?)[\x00-\x20]*\z"
)  # Double.parseDouble grammar


def java_parse_double(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Double.parseDouble: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_DOUBLE), s.try_cast("double"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def _col(v) -> Column:
    return v if isinstance(v, Column) else F.lit(v)


def java_int_add(a, b) -> Column:
    """int + int with Java's wrap-around (Spark's ANSI mode would raise on overflow)."""
    return wrap_int(_col(a).cast("bigint") + _col(b))


def java_int_sub(a, b) -> Column:
    """int - int with Java's wrap-around."""
    return wrap_int(_col(a).cast("bigint") - _col(b))


def java_int_mul(a, b) -> Column:
    """int * int with Java's wrap-around."""
    return wrap_int(_col(a).cast("bigint") * _col(b))


def java_div_double(a: Column, b: Column) -> Column:
    """Java double division: x / 0.0 is +-Infinity or NaN, where ANSI Spark raises an error."""
    negative_zero = b.cast("string") == "-0.0"
    return F.when(
        b == 0,
        F.when(F.isnan(a) | (a == 0), F.lit(float("nan")))
        .when((a > 0) != negative_zero, F.lit(float("inf")))
        .otherwise(F.lit(float("-inf"))),
    ).otherwise(a / b)


def java_length(s: Column) -> Column:
    """String.length() counts UTF-16 code units (F.length counts code points)."""
    return (F.octet_length(F.encode(s, "UTF-16BE")) / 2).cast("int")


def java_substring(
    s: Column, begin: Column, end: Column | None = None, *, skip_bad_record: bool = False
) -> Column:
    """String.substring(begin[, end]) on UTF-16 indexes; out of range throws StringIndexOutOfBoundsException."""
    n = java_length(s)
    stop = n if end is None else end
    ok = (begin >= 0) & (stop <= n) & (begin <= stop)
    units = F.encode(s, "UTF-16BE")  # Java indexes UTF-16 code units, Spark counts code points
    value = F.decode(F.substr(units, begin * 2 + 1, (stop - begin) * 2), "UTF-16BE")
    if skip_bad_record:
        return F.when(ok, value)
    return F.when(ok, value).otherwise(
        F.raise_error(F.lit("StringIndexOutOfBoundsException in substring"))
    )


def java_index_of(s: Column, t: Column) -> Column:
    """String.indexOf(str): UTF-16 index of the first occurrence, -1 if absent."""
    before = F.call_function("substring_index", s, t, F.lit(1))
    return F.when(F.instr(s, t) == 0, F.lit(-1)).otherwise(java_length(before))


def java_floor(x: Column) -> Column:
    """Math.floor(double) -> double (keeps NaN, infinities, huge values and signed zero)."""
    keep = F.isnan(x) | (F.abs(x) >= F.lit(4503599627370496.0)) | (x == 0)
    return F.when(keep, x).otherwise(F.floor(x).cast("double"))


def java_ceil(x: Column) -> Column:
    """Math.ceil(double) -> double; the ceiling of a value in (-1, 0) is -0.0."""
    keep = F.isnan(x) | (F.abs(x) >= F.lit(4503599627370496.0)) | (x == 0)
    return F.when(keep, x).when((x > -1) & (x < 0), F.lit(-0.0)).otherwise(F.ceil(x).cast("double"))


def java_max(a: Column, b: Column) -> Column:
    """Math.max(double, double): NaN if either is NaN; 0.0 is greater than -0.0."""
    # for two zeros IEEE addition gives the answer (-0.0 only if both are -0.0); a CASE on -0.0 and
    # 0.0 literals would be folded away by Spark, which holds them equal
    return (
        F.when(F.isnan(a) | F.isnan(b), F.lit(float("nan")))
        .when((a == 0) & (b == 0), a + b)
        .otherwise(F.greatest(a, b))
    )


def java_min(a: Column, b: Column) -> Column:
    """Math.min(double, double): NaN if either is NaN; -0.0 is less than 0.0."""
    return (
        F.when(F.isnan(a) | F.isnan(b), F.lit(float("nan")))
        .when((a == 0) & (b == 0), -(-a - b))
        .otherwise(F.least(a, b))
    )


def java_double_to_int(x: Column) -> Column:
    """(int) of a double: truncates toward zero, NaN -> 0, saturates at the int range (JLS 5.1.3)."""
    return (
        F.when(F.isnan(x), F.lit(0))
        .when(x >= F.lit(2147483647.0), F.lit(2147483647))
        .when(x <= F.lit(-2147483648.0), F.lit(-2147483648))
        .otherwise(x.cast("int"))
    )


def java_double_to_long(x: Column) -> Column:
    """(long) of a double: truncates toward zero, NaN -> 0, saturates at the long range (JLS 5.1.3)."""
    return (
        F.when(F.isnan(x), F.lit(0).cast("bigint"))
        .when(x >= F.lit(9.223372036854775807e18), F.lit(9223372036854775807))
        .when(x <= F.lit(-9.223372036854775808e18), F.lit(-9223372036854775808))
        .otherwise(x.cast("bigint"))
    )


def java_parse_float(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Float.parseFloat: the Double.parseDouble grammar, rounded to float."""
    value = F.when(s.rlike(JAVA_DOUBLE), s.try_cast("float"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — DockHealthLines.java
    map_output = (
        lines
        # DockHealthLines.java:28  if (line == null || line.startsWith("dock_id") || !line.contains("\t")) {
        .where(~(F.col("value").startswith("dock_id") | (~(F.col("value").contains("\t")))))
        # DockHealthLines.java:31  String[] f = line.split("\t");
        .withColumn("f", java_split(F.col("value"), "\t"))
        # DockHealthLines.java:32  float bikes = Float.parseFloat(f[3]);
        .withColumn("bikes", java_parse_float(F.col("f")[3]))
        # DockHealthLines.java:33  int free = Integer.parseInt(f[4]);
        .withColumn("free", java_parse_int(F.col("f")[4]))
        # DockHealthLines.java:34  double fill = bikes / (bikes + free);
        .withColumn(
            "fill",
            java_div_double(F.col("bikes"), (F.col("bikes") + F.col("free").cast("float")))
            .cast("float")
            .cast("double"),
        )
        # DockHealthLines.java:35  double score = Math.sqrt(Math.abs(fill - 0.5)) * 100;
        .withColumn("score", (F.sqrt(F.abs((F.col("fill") - 0.5))) * 100.0))
        # DockHealthLines.java:36  String level = fill < 0.2 ? Level.LOW.name() : fill > 0.8 ? Level.FULL.name() : Level.O...
        .withColumn(
            "level",
            F.when(~F.isnan(F.col("fill")) & (F.col("fill") < 0.2), F.lit("LOW"))
            .when(~F.isnan(F.col("fill")) & (F.col("fill") > 0.8), F.lit("FULL"))
            .otherwise(F.lit("OK")),
        )
        # DockHealthLines.java:37  String when = f[2].replaceAll("[-:]", "").replace("T", " ");
        .withColumn(
            "when", F.replace(F.regexp_replace(F.col("f")[2], "[-:]", ""), F.lit("T"), F.lit(" "))
        )
        # DockHealthLines.java:38  int tIndex = f[2].indexOf("T");
        .withColumn("tIndex", java_index_of(F.col("f")[2], F.lit("T")))
        # DockHealthLines.java:39  String slot = f[2].substring(tIndex + 1);
        .withColumn("slot", java_substring(F.col("f")[2], java_int_add(F.col("tIndex"), 1)))
        # DockHealthLines.java:40  boolean evening = slot.matches("1[89]:.*");
        .withColumn("evening", F.col("slot").rlike("^(?:1[89]:.*)\\z"))
        # DockHealthLines.java:41  context.write(NullWritable.get(), new Text(String.valueOf(Integer.parseInt(f[0]) * 10)  (map output: key, value)
        .select(
            F.lit(None).cast("string").alias("key"),
            F.concat(
                java_int_mul(java_parse_int(F.col("f")[0]), 10).cast("string"),
                F.lit("|"),
                F.upper(F.col("f")[1]),
                F.lit("|"),
                F.col("when"),
                F.lit("|"),
                F.col("level"),
                F.lit("|"),
                java_floor(F.col("score")).cast("string"),
                F.lit("|"),
                java_ceil((F.col("fill") * 10.0)).cast("string"),
                F.lit("|"),
                F.pow(F.col("free").cast("double"), F.lit(2.0)).cast("string"),
                F.lit("|"),
                F.greatest(F.col("free"), java_double_to_int(F.col("bikes"))).cast("string"),
                F.lit("|"),
                (java_min(F.col("fill"), F.lit(0.75)) * 1.5).cast("string"),
                F.lit("|"),
                F.when(F.col("evening"), F.lit("evening")).otherwise(F.lit("day")),
                F.lit("|"),
                F.octet_length(F.col("value")).cast("string"),
            ).alias("value"),
        )
    )
    return map_output


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # Map-only job: rows keep their input order, one file per input partition.
    rows = result
    lines = rows.where(F.col("key").isNotNull() | F.col("value").isNotNull()).select(
        F.concat_ws("\t", F.col("key").cast("string"), F.col("value").cast("string")).alias("value")
    )
    if dry_run:
        lines.write.format("noop").mode("overwrite").save()  # run everything, write nothing
        return
    # Like Hadoop: refuse to write into an existing output folder.
    lines.write.mode("errorifexists").text(output_path)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(
        description="Run dock health lines on Spark (converted by mrlift)."
    )
    parser.add_argument("input_path", help="input path (args[0] of the original driver)")
    parser.add_argument("output_path", help="output folder (args[1] of the original driver)")
    parser.add_argument(
        "-D",
        dest="defines",
        action="append",
        default=[],
        metavar="NAME=VALUE",
        help="a job setting, as Hadoop's GenericOptionsParser takes it (settings this job does not read are ignored)",
    )
    parser.add_argument(
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    spark = (
        SparkSession.builder.appName("dock health lines (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
