"""RepeatedComplaints: complaint words → repeated complaint words

PySpark DataFrame version of the 2 chained Hadoop MapReduce jobs complaint words → repeated
complaint words, written by mrlift.

Original classes:
    driver         net.quillfield.feedback.RepeatedComplaints  (RepeatedComplaints.java:21-73)
    job 1 mapper   net.quillfield.feedback.RepeatedComplaints.WordMapper  (RepeatedComplaints.java:22-29)
    job 1 reducer  net.quillfield.feedback.RepeatedComplaints.Sum  (RepeatedComplaints.java:31-40)
    job 2 mapper   net.quillfield.feedback.RepeatedComplaints.Repeated  (RepeatedComplaints.java:42-50)

What it computes: 2 jobs in a chain, each reading the output of the one before — job 1: per key:
sum of the mapper's values, sorted by key; job 2: a map-only job: each input line becomes zero
or more output lines.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit repeated_complaints.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

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


TOKENIZER_DELIMITERS = "[ \\t\\n\\r\\f]+"  # java.util.StringTokenizer's default delimiters


def java_tokens(s: Column, delimiters: str = TOKENIZER_DELIMITERS) -> Column:
    """StringTokenizer: the non-empty runs between delimiter characters (no empty tokens)."""
    return F.filter(F.split(s, delimiters, -1), lambda t: t != "")


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


def build_job_1(spark: SparkSession, input_path: str) -> DataFrame:
    """Job 1 of 2, "complaint words": its output rows as columns `key` and `value`."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — RepeatedComplaints.java
    map_output = (
        lines
        # RepeatedComplaints.java:25  while (t.hasMoreTokens()) {  (one row per element)
        .withColumn("token", F.explode(java_tokens(F.col("value"))))
        # RepeatedComplaints.java:26  out.collect(new Text(t.nextToken()), new IntWritable(1));  (map output: key, value)
        .select(F.col("token").alias("key"), F.lit(1).alias("value"))
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (RepeatedComplaints.java:32)
    result = (
        map_output.groupBy("key").agg(
            # RepeatedComplaints.java:36  n += vs.next().get();
            wrap_int(F.sum(F.col("value"))).alias("n"),
        )
        # RepeatedComplaints.java:38  out.collect(k, new IntWritable(n));
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


def build(spark: SparkSession, job_1_lines: DataFrame) -> DataFrame:
    """The last job's output rows as columns `key` and `value`, before the text layout."""
    # the lines job 1 wrote to the folder this job read (passed on, not re-read)
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = job_1_lines

    # Map side: narrow, row by row (no shuffle) — RepeatedComplaints.java
    map_output = (
        lines
        # RepeatedComplaints.java:44  String[] f = line.toString().split("\t");
        .withColumn("f", java_split(F.col("value"), "\t"))
        # RepeatedComplaints.java:45  int n = Integer.parseInt(f[1]);
        .withColumn("n", java_parse_int(F.col("f")[1]))
        # RepeatedComplaints.java:47  out.collect(new Text(f[0]), new IntWritable(n));  (map output: key, value)
        .where(F.col("n") > 1).select(F.col("f")[0].alias("key"), F.col("n").alias("value"))
    )
    return map_output


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # Map-only job: rows keep their input order, one file per input partition.
    rows = result
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
        description="Run repeated complaint words on Spark (converted by mrlift)."
    )
    parser.add_argument("input_path", help="input path (args[0] of the original driver)")
    parser.add_argument("output_path", help="output folder (args[1] of the original driver)")
    parser.add_argument(
        "--job-1-output",
        dest="job_1_output",
        default="/tmp/complaint-words",
        help="output folder of job 1 (hard-coded in the original driver); job 2 gets the lines directly: written only with --keep-intermediates; default: %(default)s",
    )
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
        SparkSession.builder.appName("repeated complaint words (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    # Job 1 (RepeatedComplaints.java:61): the next job read its output folder; here the lines pass on as a DataFrame
    job_1_lines = job_1_text(build_job_1(spark, args.input_path), in_file_order=True)
    if args.keep_intermediates:
        job_1_lines = job_1_lines.cache()  # written here and read again by job 2: computed once
        if not args.dry_run:
            job_1_lines.write.mode("errorifexists").text(args.job_1_output)
    result = build(spark, job_1_lines)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
