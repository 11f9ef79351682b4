"""ReturnsPerDock: returns per dock

PySpark DataFrame version of the Hadoop MapReduce job "returns per dock", written by mrlift.

Original classes:
    driver       net.brindleharbour.docks.ReturnsPerDock  (ReturnsPerDock.java:23-69)
    mapper       net.brindleharbour.docks.ReturnsPerDock.ReturnMapper  (ReturnsPerDock.java:35-43)
    reducer      net.brindleharbour.docks.ReturnsPerDock.ReturnCountReducer  (ReturnsPerDock.java:45-55)

What it computes: the mapper's pairs sorted by key. Shapes: parse and emit, sort by key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit returns_per_dock.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: the values of one key come out in no defined order, in Hadoop as here

Findings (the original does this and so does this script; decide whether to keep it):
    ReturnsPerDock.java:47  [reduce-not-called]
        ReturnCountReducer.reduce() does not override Reducer.reduce (its values parameter is of
        type Iterator<IntWritable>, not Iterable<IntWritable>): Hadoop never calls it and runs
        the identity reducer, so the original writes every map output pair sorted by key; the
        script does the same
    ReturnsPerDock.java:62  [set-twice]
        `setMapperClass` is called again: Hadoop uses the last class, ReturnMapper, not
        DepartureMapper; so does the script

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


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — ReturnsPerDock.java
    map_output = (
        lines
        # ReturnsPerDock.java:38  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # ReturnsPerDock.java:40  context.write(new Text(f[3]), new IntWritable(1));  (map output: key, value)
        .where((F.size(F.col("f")) > 3) & (~(F.col("f")[0] == "ride_id"))).select(
            F.col("f")[3].alias("key"), F.lit(1).alias("value")
        )
    )

    # Reduce side: Hadoop's identity reducer — pairs pass through; the writer sorts by key
    return map_output


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
        description="Run returns per dock on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("returns per dock (mrlift)")
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
