"""RidesPerExportFile: rides per export file

PySpark DataFrame version of the Hadoop MapReduce job "rides per export file", written by mrlift.

Original classes:
    driver       net.brindleharbour.rides.RidesPerExportFile  (RidesPerExportFile.java:18-52)
    mapper       net.brindleharbour.rides.RidesPerExportFile.FileTagMapper  (RidesPerExportFile.java:19-39)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit rides_per_export_file.py <input_path> <output_path>

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


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


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
    # the mapper reads its input split's file name: Spark's file metadata holds it
    lines = lines.withColumn("input_file_name", F.col("_metadata.file_name"))
    lines = drop_first_line_per_file(lines)  # the mapper skipped byte offset 0 of each file

    # Map side: narrow, row by row (no shuffle) — RidesPerExportFile.java
    map_output = (
        lines
        # RidesPerExportFile.java:33  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # 2 writes per record: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # RidesPerExportFile.java:34  context.write(new Text(exportName.replace(".csv", "")), ONE);
                        F.struct(
                            F.replace(F.col("input_file_name"), F.lit(".csv"), F.lit("")).alias(
                                "key"
                            ),
                            F.lit(1).alias("value"),
                        ),
                        # RidesPerExportFile.java:36  context.write(new Text(exportName.replace(".csv", "") + " members"), ONE);
                        F.when(
                            F.col("f")[6] == "member",
                            F.struct(
                                F.concat(
                                    F.replace(F.col("input_file_name"), F.lit(".csv"), F.lit("")),
                                    F.lit(" members"),
                                ).alias("key"),
                                F.lit(1).alias("value"),
                            ),
                        ),
                    ),
                    lambda emitted: emitted.isNotNull(),
                )
            ).alias("emitted")
        ).select("emitted.key", "emitted.value")
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (IntSumReducer (ships with Hadoop))
    result = (
        map_output.groupBy("key").agg(
            # IntSumReducer (ships with Hadoop)  sum of the values
            wrap_int(F.sum(F.col("value"))).alias("sum"),
        )
        # IntSumReducer (ships with Hadoop)  write(key, sum)
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
        description="Run rides per export file on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("rides per export file (mrlift)")
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
