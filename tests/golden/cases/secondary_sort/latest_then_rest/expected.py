"""DepartureBoard: departure board

PySpark DataFrame version of the Hadoop MapReduce job "departure board", written by mrlift.

Original classes:
    driver       net.brindleharbour.fleet.DepartureBoard  (DepartureBoard.java:24-102)
    mapper       net.brindleharbour.fleet.DepartureBoard.DepartureMapper  (DepartureBoard.java:26-35)
    reducer      net.brindleharbour.fleet.DepartureBoard.BoardReducer  (DepartureBoard.java:72-83)
    partitioner  net.brindleharbour.fleet.DepartureBoard.StationPartitioner  (DepartureBoard.java:37-42)
    sort_comparator net.brindleharbour.fleet.DepartureBoard.LatestFirst  (DepartureBoard.java:44-59)
    grouping_comparator net.brindleharbour.fleet.DepartureBoard.SameStation  (DepartureBoard.java:61-70)

What it computes: the mapper's values, each written (or filtered) by the reducer as it meets
them, sorted by key. Shapes: secondary sort, filter, parse and emit, per-value writes in the
reducer.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit departure_board.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: the values reach reduce() in the sort comparator's order; the script sorts its output by the same fields, in the same directions (values with equal keys: in no defined order)

Findings (the original does this and so does this script; decide whether to keep it):
    DepartureBoard.java:93  [output-layout]
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

    # Map side: narrow, row by row (no shuffle) — DepartureBoard.java
    map_output = (
        lines
        # DepartureBoard.java:29  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # DepartureBoard.java:30  if (f.length < 5 || f[0].equals("ride_id")) {
        .where(~((F.size(F.col("f")) < 5) | (F.col("f")[0] == "ride_id")))
        # DepartureBoard.java:33  context.write(new StationClock(f[2], f[4]), new Text(f[0] + " to " + f[3]));  (map output: key, value)
        .select(
            F.struct(F.col("f")[2].alias("station"), F.col("f")[4].alias("startedAt")).alias("key"),
            F.concat(F.col("f")[0], F.lit(" to "), F.col("f")[3]).alias("value"),
        )
    )

    # Reduce side: the reducer writes inside its loop over values (DepartureBoard.java:73);
    # the shuffle only brings the keys together: each value is written as the loop wrote it
    # one reduce() call per group of the grouping comparator, its values in the sort order
    group_order = Window.partitionBy(F.col("key")["station"]).orderBy(
        F.col("key")["station"], F.encode(F.col("key")["startedAt"], "UTF-16BE").desc()
    )
    whole_group = Window.partitionBy(F.col("key")["station"])
    # values with the same full key: if the group's first key has several, Hadoop's first is any
    same_key = Window.partitionBy(
        F.col("key")["station"], F.encode(F.col("key")["startedAt"], "UTF-16BE")
    )
    result = (
        map_output
        # each value's place in its reduce() call
        .withColumn("_place", F.row_number().over(group_order))
        .withColumn("_same_key", F.count(F.lit(1)).over(same_key))
        .withColumn(
            "_first_ties", F.max(F.when(F.col("_place") == 1, F.col("_same_key"))).over(whole_group)
        )
        # it.next() before the loop: the group's first value; the loop goes on from the second
        .withColumn(
            "first_value",
            F.when(
                F.col("_first_ties") > 1,
                F.raise_error(
                    F.lit(
                        "the first value of a group is not defined: several values share its smallest key"
                    )
                ),
            ).otherwise(F.first("value").over(group_order)),
        )
        # DepartureBoard.java:80  context.write(new Text(key.getStation() + " after " + latest), earlier);  (written only when the condition holds)
        .where(F.col("_place") > 1)
        .select(
            F.concat(F.col("key")["station"], F.lit(" after "), F.col("first_value")).alias("key"),
            F.col("value").alias("value"),
            partition_of(text_hash(F.col("key")["station"]), F.lit(2)).alias("_partition"),
            F.col("key")["station"].alias("_sort_1"),
            F.encode(F.col("key")["startedAt"], "UTF-16BE").alias("_sort_2"),
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
            "_sort_1", F.col("_sort_2").desc()
        )
    else:
        # The 2 part files one after another, in one file (wide: one shuffle into one partition).
        rows = result.repartition(1).sortWithinPartitions(
            "_partition", "_sort_1", F.col("_sort_2").desc()
        )
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
        description="Run departure board on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("departure board (mrlift)")
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
