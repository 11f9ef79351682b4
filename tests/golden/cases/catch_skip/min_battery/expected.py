"""MinBatteryLevel: min battery level per bike

PySpark DataFrame version of the Hadoop MapReduce job "min battery level per bike", written by mrlift.

Original classes:
    driver       net.brindleharbour.tickets.MinBatteryLevel  (MinBatteryLevel.java:24-69)
    mapper       net.brindleharbour.tickets.MinBatteryLevel.BatteryMapper  (MinBatteryLevel.java:26-38)
    reducer      net.brindleharbour.tickets.MinBatteryLevel.LowestReducer  (MinBatteryLevel.java:40-50)

What it computes: per key: min of the mapper's values, sorted by key. Shapes: filter, parse and
emit, min per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit min_battery_level.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

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


JAVA_DOUBLE = (
    r"^[\x00-\x20]*[+-]?(NaN|Infinity|((([0-9]+\.?[0-9]*|\.[0-9]+)([eE][+-]?[0-9]+)?)"
    r"|(0[xX]([0-9a-fA-F]+\.?[0-9a-fA-F]*|\.[0-9a-fA-F]+)[pP][+-]?[0-9]+))[fFdD]?)[\x00-\x20]*\z"
)  # Double.parseDouble grammar


def java_parse_double(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Double.parseDouble: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_DOUBLE), s.try_cast("double"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — MinBatteryLevel.java
    map_output = (
        lines
        # MinBatteryLevel.java:30  String[] f = value.toString().split(";");
        .withColumn("f", java_split(F.col("value"), ";"))
        # MinBatteryLevel.java:32  double pct = Double.parseDouble(f[5]);
        .withColumn("pct", java_parse_double(F.get(F.col("f"), 5), skip_bad_record=True))
        # MinBatteryLevel.java:32  catch: skip the record
        .where(F.col("pct").isNotNull())
        # MinBatteryLevel.java:33  out.collect(new Text(f[1]), new DoubleWritable(pct));  (map output: key, value)
        .where(F.get(F.col("f"), 1).isNotNull()).select(
            F.get(F.col("f"), 1).alias("key"), F.col("pct").alias("value")
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (MinBatteryLevel.java:41)
    result = (
        map_output.groupBy("key").agg(
            # MinBatteryLevel.java:46  lowest = Math.min(lowest, values.next().get());
            F.when(F.bool_or(F.isnan(F.col("value"))), F.lit(float("nan")))
            .otherwise(F.least(F.lit(1.7976931348623157e308), F.min(F.col("value"))))
            .alias("lowest"),
        )
        # MinBatteryLevel.java:48  out.collect(bike, new DoubleWritable(lowest));
        .select(F.col("key"), F.col("lowest").alias("value"))
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
    parser = argparse.ArgumentParser(
        description="Run min battery level per bike on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("min battery level per bike (mrlift)")
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
