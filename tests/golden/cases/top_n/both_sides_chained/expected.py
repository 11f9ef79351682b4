"""TopNoteWords: note word counts → top note words

PySpark DataFrame version of the 2 chained Hadoop MapReduce jobs note word counts → top note
words, written by mrlift.

Original classes:
    driver         net.brindleharbour.notes.TopNoteWords  (TopNoteWords.java:25-137)
    job 1 mapper   net.brindleharbour.notes.TopNoteWords.WordMapper  (TopNoteWords.java:27-38)
    job 1 reducer  net.brindleharbour.notes.TopNoteWords.CountReducer  (TopNoteWords.java:40-50)
    job 2 mapper   net.brindleharbour.notes.TopNoteWords.CountLineMapper  (TopNoteWords.java:52-77)
    job 2 reducer  net.brindleharbour.notes.TopNoteWords.TopWordsReducer  (TopNoteWords.java:79-107)

What it computes: 2 jobs in a chain, each reading the output of the one before — job 1: per key:
sum of the mapper's values, sorted by key; job 2: the entries of a TreeMap kept to the 3 largest
map keys (byCount.put(count, word.toString());), written in cleanup().
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit top_note_words.py <input_path> <job_1_output> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: TopNoteWords.java:34 toLowerCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)
Note: TopNoteWords.java:59 `byCount` is set once in setup() from constants: a constant of the task, as if set at its declaration
Note: TopNoteWords.java:86 `byCount` is set once in setup() from constants: a constant of the task, as if set at its declaration

Findings (the original does this and so does this script; decide whether to keep it):
    TopNoteWords.java:65  [per-task-state]
        the mapper's TreeMap lives in one map task: the original keeps a top 3 per input split,
        which is one per file for files up to 1.1 times the split size; the script does the same
        and stops on a longer file (its split size is the job's settings, with the block size
        taken as dfs.blocksize)
    TopNoteWords.java:65  [ties-dropped]
        the TreeMap keeps one entry per map key: lines whose map keys tie overwrite each other,
        so each task keeps only its last line of each tie; the script does the same
    TopNoteWords.java:95  [ties-dropped]
        the TreeMap keeps one entry per map key: keys whose map keys tie overwrite each other,
        so the original keeps only the greatest key of each tie and may write fewer than 3
        distinct keys; the script does the same

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


def last_value_assigned(value: Column, where: str) -> Column:
    """The aggregate for `x = f(value)` in a loop over a key's values: Java keeps the last value,
    and Hadoop gives the values in no defined order, so the answer is defined only where every
    value agrees. Stop the job where a key's values differ."""
    differ = F.lit(
        f"{where}: takes different values under one key; Java keeps the last one, and Hadoop "
        "does not define which that is"
    )
    return F.when(F.count_distinct(value) > 1, F.raise_error(differ)).otherwise(F.max(value))


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def one_map_task(lines: DataFrame, split_size: Column) -> DataFrame:
    """The lines one file holds, in its order (they arrive in one partition, sorted), as the one map
    task Hadoop reads it with: `_task` and `_line`. A file longer than 1.1 times the split size would
    be cut into several tasks (FileInputFormat's SPLIT_SLOP): the job stops instead."""
    ordered = lines.select(
        "*", F.lit(0).alias("_task"), F.monotonically_increasing_id().alias("_line")
    )
    size = F.sum(F.octet_length("value") + 1).over(
        Window.partitionBy("_task")
    )  # TextOutputFormat's bytes
    cut = F.lit(
        "the folder the job before wrote is long enough for Hadoop to read it in several map tasks; "
        "the script reproduces one"
    )
    return ordered.withColumn(
        "_line", F.when(size / split_size > 1.1, F.raise_error(cut)).otherwise(F.col("_line"))
    )


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


def build_job_1(spark: SparkSession, input_path: str) -> DataFrame:
    """Job 1 of 2, "note word counts": its output rows as columns `key` and `value`."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — TopNoteWords.java
    map_output = (
        lines
        # TopNoteWords.java:32  for (String word : value.toString().split("[^A-Za-z]+")) {  (one row per element)
        .withColumn("word", F.explode(java_split(F.col("value"), "[^A-Za-z]+")))
        # TopNoteWords.java:34  context.write(new Text(word.toLowerCase()), ONE);  (map output: key, value)
        .where(~(F.length(F.col("word")) == 0)).select(
            F.lower(F.col("word")).alias("key"), F.lit(1).alias("value")
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (TopNoteWords.java:41)
    result = (
        map_output.groupBy("key").agg(
            # TopNoteWords.java:46  n += one.get();
            wrap_int(F.sum(F.col("value"))).alias("n"),
        )
        # TopNoteWords.java:48  context.write(word, new IntWritable(n));
        .select(F.col("key"), F.col("n").alias("value"))
    )
    return result


def job_1_text(result: DataFrame, in_file_order: bool) -> DataFrame:
    """Job 1's output as the lines TextOutputFormat writes (key, TAB, value): what job 2 reads."""
    # The order of the lines only matters to a map-only reader, or when the folder is written
    rows = result.repartition(1).sortWithinPartitions("key") if in_file_order else result
    return rows.where(F.col("key").isNotNull() | F.col("value").isNotNull()).select(
        F.concat_ws("\t", F.col("key").cast("string"), F.col("value").cast("string")).alias("value")
    )


def build(
    spark: SparkSession, job_1_lines: DataFrame, conf: dict[str, str] | None = None
) -> DataFrame:
    """The last job's output rows as columns `key` and `value`, before the text layout."""
    # Job settings (Hadoop Configuration): `-D name=value` on the command line overrides the default
    block_size_setting = hadoop_setting(conf, "dfs.blocksize", 134217728, "getLong")
    maxsize_setting = hadoop_setting(
        conf, "mapreduce.input.fileinputformat.split.maxsize", 9223372036854775807, "getLong"
    )
    minsize_setting = hadoop_setting(
        conf, "mapreduce.input.fileinputformat.split.minsize", 1, "getLong"
    )
    top = hadoop_setting(conf, "notes.top", "3", "get")

    # the lines job 1 wrote to the folder this job read (passed on, not re-read)
    # The mapper keeps state per map task: Hadoop makes one task of each input split, and the
    # split size is max(minsize, min(maxsize, the file's block size)) (FileInputFormat)
    split_size = F.greatest(
        F.lit(minsize_setting).cast("bigint"),
        F.least(F.lit(maxsize_setting).cast("bigint"), F.lit(block_size_setting).cast("bigint")),
    )
    lines = one_map_task(job_1_lines, split_size)  # the one file that job wrote, in its order

    # Map side: narrow, row by row (no shuffle) — TopNoteWords.java
    map_output = (
        lines
        # TopNoteWords.java:64  String[] f = value.toString().split("\t");
        .withColumn("f", java_split(F.col("value"), "\t"))
        # TopNoteWords.java:65  byCount.put(Integer.parseInt(f[1]), f[0]);  (into this map task's TreeMap)
        .select(
            "_task",
            "_line",
            java_parse_int(F.col("f")[1]).alias("tm_key"),
            F.col("f")[0].alias("tm_value"),
        )
        # a TreeMap keeps one entry per map key and a later put replaces it: the task's last line wins
        .groupBy("_task", "tm_key")
        .agg(F.max_by("tm_value", "_line").alias("tm_value"))
        # trimmed after every put: each task keeps its 3 largest map keys, and cleanup() writes them (the shuffle sorts them again)
        .withColumn(
            "_kept",
            F.row_number().over(Window.partitionBy("_task").orderBy(F.col("tm_key").desc())),
        )
        .where(F.col("_kept") <= java_parse_int(F.lit(top)))
        # TopNoteWords.java:74  context.write(new Text(e.getValue()), new IntWritable(e.getKey()));  (map output: key, value)
        .select(F.col("tm_value").alias("key"), F.col("tm_key").alias("value"))
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (TopNoteWords.java:89)
    per_key = (
        map_output.groupBy("key").agg(
            # TopNoteWords.java:93  count = c.get(); // one line per word: the count the first job wrote
            last_value_assigned(F.col("value"), "TopNoteWords.java:93 `count`").alias("count"),
        )
        # TopNoteWords.java:95  byCount.put(count, word.toString());  (the TreeMap entry of this key)
        .select("key", F.col("count").alias("tm_key"), F.col("key").alias("tm_value"))
    )
    # A TreeMap keeps one entry per map key and a later put replaces it. reduce() meets the keys
    # in sorted order, so of keys that tie on the map key only the greatest stays, as in the original.
    entries = per_key.groupBy("tm_key").agg(F.max_by("tm_value", "key").alias("tm_value"))
    # trimmed after every put: the 3 largest map keys remain; cleanup() writes them from the smallest up
    kept = Window.orderBy(F.col("tm_key").desc())
    result = (
        entries.withColumn("_kept", F.row_number().over(kept)).where(
            F.col("_kept") <= java_parse_int(F.lit(top))
        )
        # TopNoteWords.java:104  context.write(new IntWritable(e.getKey()), new Text(e.getValue()));
        .select(
            F.col("tm_key").alias("key"),
            F.col("tm_value").alias("value"),
            (F.lit(3 + 1) - F.col("_kept")).alias("_write"),
        )
    )
    return result


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # cleanup() wrote the kept entries in map order, one reduce task after another: the same here (wide: one shuffle into one partition).
    rows = result.repartition(1).sortWithinPartitions("_write")
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
        description="Run top note words on Spark (converted by mrlift)."
    )
    parser.add_argument("input_path", help="input path (args[0] of the original driver)")
    parser.add_argument(
        "job_1_output",
        help="output folder of job 1 (args[1] of the original driver); job 2 gets the lines directly: written only with --keep-intermediates",
    )
    parser.add_argument("output_path", help="output folder (args[2] of the original driver)")
    parser.add_argument(
        "-D",
        dest="defines",
        action="append",
        default=[],
        metavar="NAME=VALUE",
        help="a job setting, as Hadoop's GenericOptionsParser takes it (settings this job does not read are ignored)",
    )
    parser.add_argument(
        "--keep-intermediates",
        action="store_true",
        help="also write each earlier job's output folder, as the original driver did, for checking",
    )
    parser.add_argument(
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    spark = (
        SparkSession.builder.appName("top note words (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    # Job 1 (TopNoteWords.java:121): the next job read its output folder; here the lines pass on as a DataFrame
    job_1_lines = job_1_text(build_job_1(spark, args.input_path), in_file_order=True)
    if args.keep_intermediates:
        job_1_lines = job_1_lines.cache()  # written here and read again by job 2: computed once
        if not args.dry_run:
            job_1_lines.write.mode("errorifexists").text(args.job_1_output)
    result = build(spark, job_1_lines, conf=settings(args.defines))
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
