"""AverageRideDuration: average ride duration

PySpark DataFrame version of the Hadoop MapReduce job "average ride duration", written by mrlift.

Original classes:
    driver       net.brindleharbour.rides.AverageRideDuration  (AverageRideDuration.java:16-39)
    mapper       net.brindleharbour.rides.DurationMapper  (DurationMapper.java:11-25)
    reducer      net.brindleharbour.rides.AverageDurationReducer  (AverageDurationReducer.java:10-22)

What it computes: per key: count, sum of the mapper's values, sorted by key. Shapes: parse and
emit, average per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit average_ride_duration.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import sys

from pyspark.sql import Column, DataFrame, SparkSession
from pyspark.sql import Window
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


def java_div_double(a: Column, b: Column) -> Column:
    """Java double division: x / 0.0 is +-Infinity or NaN, where ANSI Spark raises an error."""
    negative_zero = b.cast("string") == "-0.0"
    return F.when(
        b == 0,
        F.when(F.isnan(a) | (a == 0), F.lit(float("nan")))
        .when((a > 0) != negative_zero, F.lit(float("inf")))
        .otherwise(F.lit(float("-inf"))),
    ).otherwise(a / b)


def drop_first_line_per_file(lines: DataFrame) -> DataFrame:
    """`if (key.get() == 0) return;`: drop the line at byte offset 0 of every input file."""
    tagged = lines.select(
        "*",
        F.col("_metadata.file_path").alias("_file"),
        F.col("_metadata.file_block_start").alias("_block_start"),
        F.monotonically_increasing_id().alias("_row"),
    )
    first = F.min("_row").over(Window.partitionBy("_file", "_block_start"))
    return (
        tagged.withColumn("_first", first)
        .where(~((F.col("_block_start") == 0) & (F.col("_row") == F.col("_first"))))
        .drop("_file", "_block_start", "_row", "_first")
    )


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)
    lines = drop_first_line_per_file(lines)  # the mapper skipped byte offset 0 of each file

    # Map side: narrow, row by row (no shuffle) — DurationMapper.java
    map_output = (
        lines
        # DurationMapper.java:20  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # DurationMapper.java:23  context.write(station, seconds);  (map output: key, value)
        .select(F.col("f")[2].alias("key"), java_parse_int(F.col("f")[5]).alias("value"))
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (AverageDurationReducer.java:11)
    result = (
        map_output.groupBy("key").agg(
            # AverageDurationReducer.java:17  sum += d.get();
            F.sum(F.col("value").cast("bigint")).alias("sum"),
            # AverageDurationReducer.java:18  count++;
            F.count(F.lit(1)).cast("int").alias("count"),
        )
        # AverageDurationReducer.java:20  context.write(station, new DoubleWritable((double) sum / count));
        .select(
            F.col("key"),
            java_div_double(F.col("sum").cast("double"), F.col("count").cast("double")).alias(
                "value"
            ),
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
    # The original driver deleted its output folder before running.
    lines.write.mode("overwrite").text(output_path)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(
        description="Run average ride duration on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("average ride duration (mrlift)")
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
