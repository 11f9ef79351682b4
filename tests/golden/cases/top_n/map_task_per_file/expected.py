"""LongRideBikesPerDay: long ride bikes per day

PySpark DataFrame version of the Hadoop MapReduce job "long ride bikes per day", written by mrlift.

Original classes:
    driver       net.brindleharbour.rides.LongRideBikesPerDay  (LongRideBikesPerDay.java:24-74)
    mapper       net.brindleharbour.rides.LongRideBikesPerDay.DayTopMapper  (LongRideBikesPerDay.java:27-49)
    reducer      net.brindleharbour.rides.LongRideBikesPerDay.DaysReducer  (LongRideBikesPerDay.java:51-61)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, top-N per
map task, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit long_ride_bikes_per_day.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Findings (the original does this and so does this script; decide whether to keep it):
    LongRideBikesPerDay.java:37  [per-task-state]
        the mapper's TreeMap lives in one map task: the original keeps a top 4 per input split,
        which is one per file for files up to 1.1 times the split size; the script does the same
        and stops on a longer file (its split size is the job's settings, with the block size
        taken as dfs.blocksize)
    LongRideBikesPerDay.java:37  [ties-dropped]
        the TreeMap keeps one entry per map key: lines whose map keys tie overwrite each other,
        so each task keeps only its last line of each tie; the script does the same

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


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def _col(v) -> Column:
    return v if isinstance(v, Column) else F.lit(v)


def java_int_add(a, b) -> Column:
    """int + int with Java's wrap-around (Spark's ANSI mode would raise on overflow)."""
    return wrap_int(_col(a).cast("bigint") + _col(b))


def java_int_sub(a, b) -> Column:
    """int - int with Java's wrap-around."""
    return wrap_int(_col(a).cast("bigint") - _col(b))


def java_int_mul(a, b) -> Column:
    """int * int with Java's wrap-around."""
    return wrap_int(_col(a).cast("bigint") * _col(b))


def java_int_div(a, b) -> Column:
    """Java int division truncates toward zero (Spark's `/` gives a double); MIN_VALUE / -1 wraps."""
    return wrap_int(F.call_function("div", _col(a), _col(b)))


def text_lines_with_offsets(
    spark, paths, *, file_name: bool = False, keep_file: bool = False
) -> DataFrame:
    """TextInputFormat's records with their keys: `byte_offset` = the byte offset of the line in its file,
    `value` = the line. As Hadoop's LineRecordReader: a line ends at LF, CR or CRLF, an empty file
    has no records, a UTF-8 byte order mark is left out of the first line (its bytes still count).
    Each file is read whole (one row per file), so a file must fit in a task's memory; compressed
    files are refused (Hadoop counts offsets in the decompressed stream). `keep_file`: also the
    file's path (`_task`) and length in bytes (`_file_length`)."""
    files = spark.read.format("binaryFile").load(paths)
    compressed = F.col("path").rlike(r"\.(gz|bz2|deflate|lz4|snappy|zst)$")
    latin = F.decode(
        F.col("content"), "ISO-8859-1"
    )  # one char per byte: char positions are byte offsets
    chunks = F.when(
        ~compressed, F.regexp_extract_all(latin, F.lit(r"[^\r\n]*(?:\r\n|\r|\n)|[^\r\n]+\z"), 0)
    ).otherwise(
        F.raise_error(F.lit("byte offsets of a compressed file are not read: decompress it first"))
    )
    rows = files.select("path", "length", F.posexplode(chunks).alias("_pos", "_chunk"))
    before = Window.partitionBy("path").orderBy("_pos").rowsBetween(Window.unboundedPreceding, -1)
    line = F.regexp_replace("_chunk", r"(?:\r\n|\r|\n)\z", "")
    line = F.when(F.col("_pos") == 0, F.regexp_replace(line, "^\u00ef\u00bb\u00bf", "")).otherwise(
        line
    )
    out = rows.select(
        "path",
        F.col("path").alias("_task"),
        F.col("length").alias("_file_length"),
        F.coalesce(F.sum(F.length("_chunk")).over(before), F.lit(0))
        .cast("long")
        .alias("byte_offset"),
        F.encode(line, "ISO-8859-1")
        .cast("string")
        .alias("value"),  # the line's own bytes, as Text holds them
    )
    if file_name:
        out = out.withColumn(
            "input_file_name", F.url_decode(F.element_at(F.split("path", "/"), -1))
        )
    return out.drop("path") if keep_file else out.drop("path", "_task", "_file_length")


def lines_by_map_task(spark, paths, split_size: Column, *, file_name: bool = False) -> DataFrame:
    """TextInputFormat's lines with the map task that reads them: `_task` (the file) and `_line` (the
    line's byte offset: its order in the task). Hadoop makes one split of a file up to 1.1 times
    the split size (FileInputFormat's SPLIT_SLOP) and cuts a longer one into several tasks, whose
    state the script does not reproduce: such a file stops the job."""
    lines = text_lines_with_offsets(spark, paths, file_name=file_name, keep_file=True)
    split = F.col("_file_length") / split_size > 1.1
    cut = F.concat(
        F.lit(
            "a file Hadoop would read in several map tasks (the script reproduces one task per "
            "file): "
        ),
        F.col("_task"),
    )
    return lines.withColumn(
        "_line", F.when(split, F.raise_error(cut)).otherwise(F.col("byte_offset"))
    ).drop("_file_length")


def hadoop_setting(conf: dict[str, str] | None, name: str, default, getter: str = "get"):
    """Configuration.get*(name, default) as Hadoop reads it: trimmed numbers, 0x hex, true/false."""
    raw = (conf or {}).get(name)
    if raw is None:
        return default
    if getter in ("getInt", "getLong"):
        text = raw.strip()
        negative = text.startswith("-")
        digits = text[1:] if negative else text
        value = int(digits[2:], 16) if digits.lower().startswith("0x") else int(digits)
        return -value if negative else value
    if getter in ("getFloat", "getDouble"):
        return float(raw.strip())
    if getter == "getBoolean":
        text = raw.strip().lower()
        return True if text == "true" else False if text == "false" else default
    return raw.strip() if getter == "getTrimmed" else raw


def settings(defines: list[str]) -> dict[str, str]:
    """`-D name=value` options, as Hadoop's GenericOptionsParser reads them."""
    out = {}
    for d in defines:
        name, sep, value = d.partition("=")
        if not sep:
            raise SystemExit(f"-D {d}: expected name=value")
        out[name] = value
    return out


def build(spark: SparkSession, input_path: str, conf: dict[str, str] | None = None) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # Job settings (Hadoop Configuration): `-D name=value` on the command line overrides the default
    block_size_setting = hadoop_setting(conf, "dfs.blocksize", 134217728, "getLong")
    maxsize_setting = hadoop_setting(
        conf, "mapreduce.input.fileinputformat.split.maxsize", 9223372036854775807, "getLong"
    )
    minsize_setting = hadoop_setting(
        conf, "mapreduce.input.fileinputformat.split.minsize", 1, "getLong"
    )

    # The mapper keeps state per map task: Hadoop makes one task of each input split, and the
    # split size is max(minsize, min(maxsize, the file's block size)) (FileInputFormat)
    split_size = F.greatest(
        F.lit(minsize_setting).cast("bigint"),
        F.least(F.lit(maxsize_setting).cast("bigint"), F.lit(block_size_setting).cast("bigint")),
    )
    lines = lines_by_map_task(spark, input_path, split_size)  # one task per file, in line order

    # Map side: narrow, row by row (no shuffle) — LongRideBikesPerDay.java
    map_output = (
        lines
        # LongRideBikesPerDay.java:33  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # LongRideBikesPerDay.java:34  if (f.length < 6 || f[0].equals("ride_id")) {
        .where(~((F.size(F.col("f")) < 6) | (F.col("f")[0] == "ride_id")))
        # LongRideBikesPerDay.java:37  longest.put(Integer.parseInt(f[5]) / 60, f[1]);  (into this map task's TreeMap)
        .select(
            "_task",
            "_line",
            java_int_div(java_parse_int(F.col("f")[5]), 60).alias("tm_key"),
            F.col("f")[1].alias("tm_value"),
        )
        # a TreeMap keeps one entry per map key and a later put replaces it: the task's last line wins
        .groupBy("_task", "tm_key")
        .agg(F.max_by("tm_value", "_line").alias("tm_value"))
        # trimmed after every put: each task keeps its 4 largest map keys, and cleanup() writes them (the shuffle sorts them again)
        .withColumn(
            "_kept",
            F.row_number().over(Window.partitionBy("_task").orderBy(F.col("tm_key").desc())),
        )
        .where(F.col("_kept") <= 4)
        # LongRideBikesPerDay.java:46  context.write(new Text(e.getValue()), ONE);  (map output: key, value)
        .select(F.col("tm_value").alias("key"), F.lit(1).alias("value"))
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (LongRideBikesPerDay.java:52)
    result = (
        map_output.groupBy("key").agg(
            # LongRideBikesPerDay.java:57  n += d.get();
            wrap_int(F.sum(F.col("value"))).alias("n"),
        )
        # LongRideBikesPerDay.java:59  context.write(bike, new IntWritable(n));
        .select(F.col("key"), F.col("n").alias("value"))
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
        description="Run long ride bikes per day on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("long ride bikes per day (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path, conf=settings(args.defines))
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
