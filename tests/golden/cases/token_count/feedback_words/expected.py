"""RiderFeedbackWordCount: rider feedback word count

PySpark DataFrame version of the Hadoop MapReduce job "rider feedback word count", written by mrlift.

Original classes:
    driver       net.brindleharbour.feedback.RiderFeedbackWordCount  (RiderFeedbackWordCount.java:20-68)
    mapper       net.brindleharbour.feedback.RiderFeedbackWordCount.FeedbackTokenMapper  (RiderFeedbackWordCount.java:22-34)
    combiner     net.brindleharbour.feedback.RiderFeedbackWordCount.WordSumReducer  (RiderFeedbackWordCount.java:36-49)
    reducer      net.brindleharbour.feedback.RiderFeedbackWordCount.WordSumReducer  (RiderFeedbackWordCount.java:36-49)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: token count, sum
per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit rider_feedback_word_count.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: RiderFeedbackWordCount.java:30 toLowerCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)
Note: combiner WordSumReducer writes a partial sum of the values the reducer aggregates (it is the reducer itself); Spark's groupBy merges partial aggregates itself, so there is nothing to convert for it

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import sys

from pyspark.sql import Column, DataFrame, SparkSession
from pyspark.sql import functions as F

TOKENIZER_DELIMITERS = "[ \\t\\n\\r\\f]+"  # java.util.StringTokenizer's default delimiters


def java_tokens(s: Column, delimiters: str = TOKENIZER_DELIMITERS) -> Column:
    """StringTokenizer: the non-empty runs between delimiter characters (no empty tokens)."""
    return F.filter(F.split(s, delimiters, -1), lambda t: t != "")


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — RiderFeedbackWordCount.java
    map_output = (
        lines
        # RiderFeedbackWordCount.java:29  while (tokens.hasMoreTokens()) {  (one row per element)
        .withColumn("token", F.explode(java_tokens(F.col("value"))))
        # RiderFeedbackWordCount.java:31  context.write(word, ONE);  (map output: key, value)
        .select(F.lower(F.col("token")).alias("key"), F.lit(1).alias("value"))
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (RiderFeedbackWordCount.java:39)
    result = (
        map_output.groupBy("key").agg(
            # RiderFeedbackWordCount.java:44  sum += c.get();
            wrap_int(F.sum(F.col("value"))).alias("sum"),
        )
        # RiderFeedbackWordCount.java:47  context.write(key, total);
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


class DriverArguments(argparse.ArgumentParser):
    """Arguments that do not fit: the original driver's text and exit code
    (RiderFeedbackWordCount.java:52)."""

    def error(self, message: str) -> None:
        print("usage: RiderFeedbackWordCount <feedback dir> <out dir>\n", end="", file=sys.stderr)
        sys.exit(2)


def main(argv: list[str] | None = None) -> int:
    parser = DriverArguments(
        description="Run rider feedback word count on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("rider feedback word count (mrlift)")
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
