"""Main: station report

PySpark DataFrame version of the Hadoop MapReduce job "station report", written by mrlift.

Original classes:
    driver       Main  (Main.java:11-33)
    mapper       Main.M  (Main.java:12-16)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit main_rides.py <mode> <input_path> <output_path>

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


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def argument_equals_ignore_case(a: str, b: str) -> bool:
    """String.equalsIgnoreCase (Java SE 17 API docs): the same length, and each pair of chars equal,
    or equal after Character.toUpperCase, or after Character.toLowerCase of that. Character's
    mappings are one char to one char; where Python's maps to several, the one-char mapping is the
    title case (`ᾳ` → `ᾼ`), the first char (`İ` → `i`), or none (`ß` stays `ß`)."""

    def upper(c: str) -> str:
        u = c.upper()
        if len(u) == 1:
            return u
        return c.title() if len(c.title()) == 1 else c

    def lower(c: str) -> str:
        return c.lower()[0]

    return len(a) == len(b) and all(
        x == y or upper(x) == upper(y) or lower(upper(x)) == lower(upper(y)) for x, y in zip(a, b)
    )


def argument_test(value: str | None, literal: str, ignore_case: bool) -> bool:
    """`value.equals(literal)`, or equalsIgnoreCase where the flag is set; None is a value no test accepts."""
    if value is None:
        return False
    return argument_equals_ignore_case(value, literal) if ignore_case else value == literal


def same_driver_branch(arg: str, value: str | None, tests: tuple[tuple[str, bool], ...]) -> bool:
    """Whether the original driver's tests of this argument (literal, ignore_case) all answer as they
    do for `value`, the value this script's branch was converted from (None: one no test accepts).
    """
    return all(argument_test(arg, lit, ic) == argument_test(value, lit, ic) for lit, ic in tests)


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — Main.java
    map_output = (
        lines
        # Main.java:14  c.write(new Text(v.toString().split(",")[0]), new IntWritable(1));  (map output: key, value)
        .select(java_split(F.col("value"), ",")[0].alias("key"), F.lit(1).alias("value"))
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
        description="Run station report on Spark (converted by mrlift)."
    )
    parser.add_argument(
        "mode",
        help="args[0] of the original driver, which picks the job to run (rides); this script runs one branch, so it must be rides",
    )
    parser.add_argument("input_path", help="input path (args[1] of the original driver)")
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
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    # The driver tests args[0] (Main.java:20) to pick the job it runs: this script is the
    # branch for 'rides'. Another value would have run another branch.
    if not same_driver_branch(args.mode, "rides", (("rides", False),)):
        parser.error(
            f"args[0] is {args.mode!r}"
            ": this script runs only the original driver's branch for 'rides'; mrlift wrote one script per branch"
        )
    spark = (
        SparkSession.builder.appName("station report (mrlift)")
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
