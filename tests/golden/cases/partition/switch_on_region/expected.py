"""RegionSales: test job

PySpark DataFrame version of the Hadoop MapReduce job "test job", written by mrlift.

Original classes:
    driver       RegionSales  (RegionSales.java:12-60)
    mapper       RegionSales.M  (RegionSales.java:13-20)
    reducer      RegionSales.R  (RegionSales.java:22-28)
    partitioner  RegionSales.ByRegion  (RegionSales.java:30-46)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit region_sales.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: RegionSales.java:34 logging to System.out is not carried over

Findings (the original does this and so does this script; decide whether to keep it):
    RegionSales.java:55  [output-layout]
        Hadoop wrote 3 part files, each sorted by key; by default the script writes one file
        holding the same lines in the same order (the part files one after another); with
        --task-files it writes 3 files, each holding what one reduce task wrote

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


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def java_length(s: Column) -> Column:
    """String.length() counts UTF-16 code units (F.length counts code points)."""
    return (F.octet_length(F.encode(s, "UTF-16BE")) / 2).cast("int")


def checked_partition(task: Column, reduce_tasks: int) -> Column:
    """A custom getPartition()'s answer; the job fails outside 0..N-1, as Hadoop's map task does
    ("Illegal partition for <key> (<n>)")."""
    bad = task.isNull() | (task < 0) | (task >= reduce_tasks)
    return F.when(
        bad, F.raise_error(F.concat(F.lit("Illegal partition ("), task.cast("string"), F.lit(")")))
    ).otherwise(task)


def task_of_by_region() -> Column:
    """The reduce task (part file) of each row's `key`, as ByRegion.getPartition()
    (RegionSales.java:31) computes it; a task outside 0..2 fails the job, as in Hadoop."""
    return checked_partition(
        F.when((F.lower(F.col("key")) == "north") | (F.lower(F.col("key")) == "east"), F.lit(0))
        .when(F.lower(F.col("key")) == "south", F.lit(1))
        .when(F.lower(F.col("key")).startswith("w"), F.lit(2))
        .otherwise((java_length(F.lower(F.col("key"))) % 3)),
        3,
    )


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — RegionSales.java
    map_output = (
        lines
        # RegionSales.java:17  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # RegionSales.java:18  if (f.length > 1) context.write(new Text(f[0]), new IntWritable(Integer.parseInt(f[1].t...  (map output: key, value)
        .where(F.size(F.col("f")) > 1).select(
            F.col("f")[0].alias("key"), java_parse_int(java_trim(F.col("f")[1])).alias("value")
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (RegionSales.java:23)
    result = (
        map_output.groupBy("key").agg(
            # RegionSales.java:25  for (IntWritable v : vs) s += v.get();
            wrap_int(F.sum(F.col("value"))).alias("s"),
        )
        # RegionSales.java:26  c.write(k, new IntWritable(s));
        .select(F.col("key"), F.col("s").alias("value"), task_of_by_region().alias("_partition"))
    )
    return result


def write_text_output(
    result: DataFrame, output_path: str, *, dry_run: bool = False, task_files: bool = False
) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    if task_files:
        # One file per original reduce task, like Hadoop's part-r-00000 to part-r-00002: each row
        # goes to the file of its `_partition`, and each file is sorted as that task sorted it.
        by_task = (
            result.rdd.keyBy(lambda row: row["_partition"])
            .partitionBy(3, lambda task: task)
            .values()
        )
        rows = result.sparkSession.createDataFrame(by_task, result.schema).sortWithinPartitions(
            "key"
        )
    else:
        # The 3 part files one after another, in one file (wide: one shuffle into one partition).
        rows = result.repartition(1).sortWithinPartitions("_partition", "key")
    lines = rows.where(F.col("key").isNotNull() | F.col("value").isNotNull()).select(
        F.concat_ws("\t", F.col("key").cast("string"), F.col("value").cast("string")).alias("value")
    )
    if dry_run:
        lines.write.format("noop").mode("overwrite").save()  # run everything, write nothing
        return
    # Like Hadoop: refuse to write into an existing output folder.
    lines.write.mode("errorifexists").text(output_path)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Run test job on Spark (converted by mrlift).")
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
        "--task-files",
        action="store_true",
        help="write one file per original reduce task (3), as Hadoop did, instead of one file",
    )
    parser.add_argument(
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    spark = (
        SparkSession.builder.appName("test job (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run, task_files=args.task_files)
    return 0


if __name__ == "__main__":
    sys.exit(main())
