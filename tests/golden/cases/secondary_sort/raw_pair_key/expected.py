"""DockReadings: dock readings

PySpark DataFrame version of the Hadoop MapReduce job "dock readings", written by mrlift.

Original classes:
    driver       DockReadings  (DockReadings.java:11-85)
    mapper       DockReadings.M  (DockReadings.java:50-57)
    reducer      DockReadings.R  (DockReadings.java:59-69)
    grouping_comparator DockReadings.SameDock  (DockReadings.java:43-48)

What it computes: the mapper's values, each written (or filtered) by the reducer as it meets
them, sorted by key. Shapes: secondary sort, parse and emit, per-value writes in the reducer.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit dock_readings.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: the values reach reduce() in the sort comparator's order; the script sorts its output by the same fields, in the same directions (values with equal keys: in no defined order)

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


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — DockReadings.java
    map_output = (
        lines
        # DockReadings.java:52  String[] f = v.toString().split(" ");
        .withColumn("f", java_split(F.col("value"), " "))
        # DockReadings.java:54  c.write(new DockMinute(Integer.parseInt(f[0]), Integer.parseInt(f[1])), new IntWritable...  (map output: key, value)
        .where(F.size(F.col("f")) == 3).select(
            F.struct(
                java_parse_int(F.col("f")[0]).alias("dock"),
                java_parse_int(F.col("f")[1]).alias("minute"),
            ).alias("key"),
            java_parse_int(F.col("f")[2]).alias("value"),
        )
    )

    # Reduce side: the reducer writes inside its loop over values (DockReadings.java:62);
    # the shuffle only brings the keys together: each value is written as the loop wrote it
    # one reduce() call per group of the grouping comparator, its values in the sort order
    group_order = Window.partitionBy(F.col("key")["dock"]).orderBy(
        F.col("key")["dock"], F.col("key")["minute"]
    )
    whole_group = Window.partitionBy(F.col("key")["dock"])
    result = (
        map_output
        # each value's place in its reduce() call
        .withColumn("_place", F.row_number().over(group_order))
        # 2 writes per key: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # DockReadings.java:63  c.write(RULE, null);
                        F.when(
                            F.col("_place") == 1,
                            F.struct(
                                F.lit("-----").alias("key"),
                                F.lit(None).cast("string").alias("value"),
                                F.lit(0).alias("_write"),
                            ),
                        ),
                        # DockReadings.java:66  c.write(dock, b);
                        F.struct(
                            F.concat(F.lit("dock "), F.col("key")["dock"].cast("string")).alias(
                                "key"
                            ),
                            F.col("value").cast("string").alias("value"),
                            F.lit(1).alias("_write"),
                        ),
                    ),
                    lambda written: written.isNotNull(),
                )
            ).alias("written"),
            F.col("key")["dock"].alias("_sort_1"),
            F.col("key")["minute"].alias("_sort_2"),
        ).select("written.key", "written.value", "_sort_1", "_sort_2", "written._write")
    )
    return result


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # One reducer wrote one file sorted by key: the same here (wide: one shuffle into one partition).
    rows = result.repartition(1).sortWithinPartitions("_sort_1", "_sort_2", "_write")
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
        description="Run dock readings on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("dock readings (mrlift)")
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
