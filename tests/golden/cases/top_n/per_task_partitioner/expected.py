"""TopStationsByDestination: top destinations

PySpark DataFrame version of the Hadoop MapReduce job "top destinations", written by mrlift.

Original classes:
    driver       net.brindleharbour.reports.TopStationsByDestination  (TopStationsByDestination.java:26-88)
    mapper       net.brindleharbour.reports.TopStationsByDestination.DestinationMapper  (TopStationsByDestination.java:28-38)
    reducer      net.brindleharbour.reports.TopStationsByDestination.TopThreeReducer  (TopStationsByDestination.java:47-68)
    partitioner  net.brindleharbour.reports.TopStationsByDestination.FirstLetterPartitioner  (TopStationsByDestination.java:40-45)

What it computes: the entries of a TreeMap kept to the 3 largest map keys per reduce task
(top.put(sum, key.toString());), written in cleanup(). Shapes: parse and emit, top-N per reduce
task.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit top_stations_by_destination.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Findings (the original does this and so does this script; decide whether to keep it):
    TopStationsByDestination.java:56  [ties-dropped]
        the TreeMap keeps one entry per map key: keys whose map keys tie overwrite each other,
        so the original keeps only the greatest key of each tie and may write fewer than 3
        distinct keys; the script does the same
    TopStationsByDestination.java:56  [per-task-state]
        the TreeMap lives in one reduce task: with 3 reduce tasks the original writes a top 3
        per task (per partition), not one overall; the script does the same
    TopStationsByDestination.java:77  [output-layout]
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

    # Map side: narrow, row by row (no shuffle) — TopStationsByDestination.java
    map_output = (
        lines
        # TopStationsByDestination.java:33  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # TopStationsByDestination.java:35  context.write(new Text(f[3]), ONE);  (map output: key, value)
        .where((F.size(F.col("f")) > 3) & (~(F.col("f")[0] == "ride_id"))).select(
            F.col("f")[3].alias("key"), F.lit(1).alias("value")
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (TopStationsByDestination.java:50)
    per_key = (
        map_output.groupBy("key").agg(
            # TopStationsByDestination.java:54  sum += v.get();
            wrap_int(F.sum(F.col("value"))).alias("sum"),
        )
        # TopStationsByDestination.java:56  top.put(sum, key.toString());  (the TreeMap entry of this key)
        .select(
            "key",
            F.col("sum").alias("tm_key"),
            F.col("key").alias("tm_value"),
            partition_of(first_code_unit(F.col("key")), F.lit(3)).alias("_partition"),
        )
    )
    # A TreeMap keeps one entry per map key and a later put replaces it. reduce() meets the keys
    # in sorted order, so of keys that tie on the map key only the greatest stays, as in the original.
    entries = per_key.groupBy("_partition", "tm_key").agg(
        F.max_by("tm_value", "key").alias("tm_value")
    )
    # trimmed after every put: each reduce task's 3 largest map keys remain; cleanup() writes them from the largest down
    kept = Window.partitionBy("_partition").orderBy(F.col("tm_key").desc())
    result = (
        entries.withColumn("_kept", F.row_number().over(kept)).where(F.col("_kept") <= 3)
        # TopStationsByDestination.java:65  context.write(new Text(e.getValue()), new IntWritable(e.getKey()));
        .select(
            F.col("tm_value").alias("key"),
            F.col("tm_key").alias("value"),
            "_partition",
            F.col("_kept").alias("_write"),
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
        # One file per original reduce task, like Hadoop's part-r-00000 to part-r-00002: each row
        # goes to the file of its `_partition`, and each file is sorted as that task sorted it.
        by_task = (
            result.rdd.keyBy(lambda row: row["_partition"])
            .partitionBy(3, lambda task: task)
            .values()
        )
        rows = result.sparkSession.createDataFrame(by_task, result.schema).sortWithinPartitions(
            "_write"
        )
    else:
        # The 3 part files one after another, in one file (wide: one shuffle into one partition).
        rows = result.repartition(1).sortWithinPartitions("_partition", "_write")
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
        description="Run top destinations on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("top destinations (mrlift)")
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
