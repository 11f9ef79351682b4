"""StationFareTotals: station fare totals

PySpark DataFrame version of the Hadoop MapReduce job "station fare totals", written by mrlift.

Original classes:
    driver       net.brindleharbour.rides.StationFareTotals  (StationFareTotals.java:19-58)
    mapper       net.brindleharbour.rides.StationFareTotals.FareMapper  (StationFareTotals.java:21-44)
    combiner     org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer  (ships with Hadoop)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit station_fare_totals.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: combiner LongSumReducer writes a partial sum of the values the reducer aggregates (it is the reducer itself); Spark's groupBy merges partial aggregates itself, so there is nothing to convert for it

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import sys

from pyspark.sql import Column, DataFrame, SparkSession
from pyspark.sql import functions as F


def java_trim(s: Column) -> Column:
    """String.trim(): strips every char <= U+0020 at both ends (F.trim strips only spaces)."""
    return F.regexp_replace(s, r"^[\x00-\x20]+|[\x00-\x20]+$", "")


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


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — StationFareTotals.java
    map_output = (
        lines
        # StationFareTotals.java:28  if (line.startsWith("ride_id")) return;
        .where(~(F.col("value").startswith("ride_id")))
        # StationFareTotals.java:29  String[] f = line.split(",", -1);
        .withColumn("f", F.split(F.col("value"), ",", -1))
        # StationFareTotals.java:30  long fare = Long.parseLong(f[7].trim());
        .withColumn("fare", java_parse_long(java_trim(F.col("f")[7])))
        # StationFareTotals.java:31  if (fare <= 0) {
        .where(F.col("fare") > 0)
        # 4 writes per record: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # StationFareTotals.java:36  context.write(outKey, cents);
                        F.struct(F.col("f")[2].alias("key"), F.col("fare").alias("value")),
                        # StationFareTotals.java:37  context.write(new Text("ALL"), cents);
                        F.struct(F.lit("ALL").alias("key"), F.col("fare").alias("value")),
                        # StationFareTotals.java:39  context.write(new Text("type:casual"), cents);
                        F.when(
                            F.col("f")[6] == "casual",
                            F.struct(
                                F.lit("type:casual").alias("key"), F.col("fare").alias("value")
                            ),
                        ),
                        # StationFareTotals.java:41  context.write(new Text("type:" + f[6]), cents);
                        F.when(
                            F.col("f")[6] != "casual",
                            F.struct(
                                F.concat(F.lit("type:"), F.col("f")[6]).alias("key"),
                                F.col("fare").alias("value"),
                            ),
                        ),
                    ),
                    lambda emitted: emitted.isNotNull(),
                )
            ).alias("emitted")
        ).select("emitted.key", "emitted.value")
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (LongSumReducer (ships with Hadoop))
    result = (
        map_output.groupBy("key").agg(
            # LongSumReducer (ships with Hadoop)  sum of the values
            F.sum(F.col("value")).alias("sum"),
        )
        # LongSumReducer (ships with Hadoop)  write(key, sum)
        .select(F.col("key"), F.col("sum").alias("value"))
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
        description="Run station fare totals on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("station fare totals (mrlift)")
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
