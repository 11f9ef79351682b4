"""FirstMembersPerPostcode: first members per postcode

PySpark DataFrame version of the Hadoop MapReduce job "first members per postcode", written by mrlift.

Original classes:
    driver       net.brindleharbour.members.FirstMembersPerPostcode  (FirstMembersPerPostcode.java:21-62)
    mapper       net.brindleharbour.members.FirstMembersPerPostcode.PostcodeMapper  (FirstMembersPerPostcode.java:23-31)
    reducer      net.brindleharbour.members.FirstMembersPerPostcode.CappedReducer  (FirstMembersPerPostcode.java:33-48)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit first_members_per_postcode.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Findings (the original does this and so does this script; decide whether to keep it):
    FirstMembersPerPostcode.java:36  [per-task-state]
        an instance counter lets only the first 2 keys write: that is per reduce task (2 here),
        in key order, not a top-N by any value; the script does the same
    FirstMembersPerPostcode.java:55  [output-layout]
        Hadoop wrote 2 part files, each sorted by key; by default the script writes one file
        holding the same lines in the same order (the part files one after another); with
        --task-files it writes 2 files, each holding what one reduce task wrote

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


def java_trim(s: Column) -> Column:
    """String.trim(): strips every char <= U+0020 at both ends (F.trim strips only spaces)."""
    return F.regexp_replace(s, r"^[\x00-\x20]+|[\x00-\x20]+$", "")


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def _int32(u: Column) -> Column:
    """An unsigned 32-bit value (0 <= u < 2**32, bigint) as the Java int with those bits."""
    return F.when(u >= 2**31, u - 2**32).otherwise(u).cast("int")


def _fold_hash(units: Column, start: int) -> Column:
    """h = 31 * h + unit over an array of ints, with Java's 32-bit int wrap-around."""
    return _int32(
        F.aggregate(
            units, F.lit(start).cast("bigint"), lambda h, u: F.pmod(h * 31 + u, F.lit(2**32))
        )
    )


def _hex_units(s: Column, charset: str, width: int) -> Column:
    """The code units of a string in `charset`, `width` hex digits each, as unsigned ints."""
    hexed = F.hex(F.encode(s, charset))
    return F.transform(
        F.regexp_extract_all(hexed, F.lit("(" + "." * width + ")"), 1),
        lambda h: F.conv(h, 16, 10).cast("int"),
    )


def string_hash(s: Column) -> Column:
    """String.hashCode(): s[0]*31^(n-1) + ... over the UTF-16 code units, starting at 0."""
    return _fold_hash(_hex_units(s, "UTF-16BE", 4), 0)


def text_hash(s: Column) -> Column:
    """Text.hashCode(): WritableComparator.hashBytes over the UTF-8 bytes (signed), starting at 1."""
    signed = F.transform(_hex_units(s, "UTF-8", 2), lambda b: F.when(b > 127, b - 256).otherwise(b))
    return _fold_hash(signed, 1)


def first_code_unit(s: Column) -> Column:
    """s.charAt(0) as an int (a UTF-16 code unit); the job fails on "" where Java throws."""
    unit = F.element_at(_hex_units(s, "UTF-16BE", 4), 1)
    return F.when(F.length(s) > 0, unit).otherwise(
        F.raise_error(F.lit("StringIndexOutOfBoundsException"))
    )


def long_hash(v: Column) -> Column:
    """LongWritable.hashCode(): (int) value, the low 32 bits (not Long.hashCode's high-low XOR)."""
    return _int32(F.pmod(v, F.lit(2**32)))


def partition_of(hash_code: Column, reduce_tasks: int) -> Column:
    """(hashCode & Integer.MAX_VALUE) % numReduceTasks: the reduce task (part file) of a key."""
    return hash_code.bitwiseAND(F.lit(2147483647)) % reduce_tasks


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — FirstMembersPerPostcode.java
    map_output = (
        lines
        # FirstMembersPerPostcode.java:26  String[] f = value.toString().split("\\|");
        .withColumn("f", java_split(F.col("value"), "\\|"))
        # FirstMembersPerPostcode.java:28  context.write(new Text(f[2].trim()), new IntWritable(1));  (map output: key, value)
        .where(F.size(F.col("f")) > 2).select(
            java_trim(F.col("f")[2]).alias("key"), F.lit(1).alias("value")
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (FirstMembersPerPostcode.java:36)
    result = (
        map_output.groupBy("key")
        .agg(
            # FirstMembersPerPostcode.java:41  members += one.get();
            wrap_int(F.sum(F.col("value"))).alias("members"),
        )
        # FirstMembersPerPostcode.java:36  an instance counter lets only the first 2 keys each reduce task meets write (keys reach reduce() in sorted order)
        .withColumn(
            "_key_number",
            F.row_number().over(
                Window.partitionBy(partition_of(text_hash(F.col("key")), F.lit(2))).orderBy(
                    F.col("key")
                )
            ),
        )
        .where(F.col("_key_number") <= 2)
        # FirstMembersPerPostcode.java:44  context.write(postcode, new IntWritable(members));
        .select(
            F.col("key"),
            F.col("members").alias("value"),
            partition_of(text_hash(F.col("key")), F.lit(2)).alias("_partition"),
        )
    )
    return result


def write_text_output(
    result: DataFrame, output_path: str, *, dry_run: bool = False, task_files: bool = False
) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    if task_files:
        # One file per original reduce task, like Hadoop's part-r-00000 to part-r-00001: each row
        # goes to the file of its `_partition`, and each file is sorted as that task sorted it.
        by_task = (
            result.rdd.keyBy(lambda row: row["_partition"])
            .partitionBy(2, lambda task: task)
            .values()
        )
        rows = result.sparkSession.createDataFrame(by_task, result.schema).sortWithinPartitions(
            "key"
        )
    else:
        # The 2 part files one after another, in one file (wide: one shuffle into one partition).
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
    parser = argparse.ArgumentParser(
        description="Run first members per postcode on Spark (converted by mrlift)."
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
        "--task-files",
        action="store_true",
        help="write one file per original reduce task (2), as Hadoop did, instead of one file",
    )
    parser.add_argument(
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    spark = (
        SparkSession.builder.appName("first members per postcode (mrlift)")
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
