"""Main: avg

PySpark DataFrame version of the Hadoop MapReduce job "avg", written by mrlift.

Original classes:
    driver       Main  (Main.java:11-40)
    mapper       Main.M  (Main.java:12-17)
    combiner     Main.C  (Main.java:18-24)
    reducer      Main.R  (Main.java:25-31)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit main.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: combiner C writes a partial sum of the values the reducer aggregates; Spark's groupBy merges partial aggregates itself, so there is nothing to convert for it

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


def java_parse_long(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Long.parseLong: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_INT), s.try_cast("bigint"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")


def java_div_double(a: Column, b: Column) -> Column:
    """Java double division: x / 0.0 is +-Infinity or NaN, where ANSI Spark raises an error."""
    negative_zero = b.cast("string") == "-0.0"
    return F.when(
        b == 0,
        F.when(F.isnan(a) | (a == 0), F.lit(float("nan")))
        .when((a > 0) != negative_zero, F.lit(float("inf")))
        .otherwise(F.lit(float("-inf"))),
    ).otherwise(a / b)


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — Main.java
    map_output = (
        lines
        # Main.java:14  String[] f = v.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # Main.java:15  c.write(new Text(f[0]), new SumCount(Long.parseLong(f[1]), 1));  (map output: key, value)
        .select(
            F.col("f")[0].alias("key"),
            F.struct(
                java_parse_long(F.col("f")[1]).alias("sum"), F.lit(1).cast("bigint").alias("count")
            ).alias("value"),
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (Main.java:26)
    result = (
        map_output.groupBy("key").agg(
            # Main.java:28  for (SumCount v : vs) { s += v.getSum(); n += v.getCount(); }
            F.sum(F.col("value")["sum"]).alias("s"),
            # Main.java:28  for (SumCount v : vs) { s += v.getSum(); n += v.getCount(); }
            F.sum(F.col("value")["count"]).alias("n"),
        )
        # Main.java:29  c.write(k, new DoubleWritable((double) s / n));
        .select(
            F.col("key"),
            java_div_double(F.col("s").cast("double"), F.col("n").cast("double")).alias("value"),
        )
    )
    return result


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # One reducer wrote one file sorted by key: the same here (wide: one shuffle into one partition).
    rows = result.repartition(1).sortWithinPartitions("key")
    lines = rows.where(F.col("key").isNotNull() | F.col("value").isNotNull()).select(
        F.concat_ws("\t", F.col("key").cast("string"), F.col("value").cast("string")).alias("value")
    )
    if dry_run:
        lines.write.format("noop").mode("overwrite").save()  # run everything, write nothing
        return
    # Like Hadoop: refuse to write into an existing output folder.
    lines.write.mode("errorifexists").text(output_path)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Run avg on Spark (converted by mrlift).")
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
        SparkSession.builder.appName("avg (mrlift)")
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
