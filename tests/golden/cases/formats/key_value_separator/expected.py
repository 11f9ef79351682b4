"""MembersPerPlan: members per plan

PySpark DataFrame version of the Hadoop MapReduce job "members per plan", written by mrlift.

Original classes:
    driver       net.brindleharbour.members.MembersPerPlan  (MembersPerPlan.java:20-48)
    mapper       net.brindleharbour.members.MembersPerPlan.PlanMapper  (MembersPerPlan.java:22-32)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit members_per_plan.py <input_path> <output_path>

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


def java_trim(s: Column) -> Column:
    """String.trim(): strips every char <= U+0020 at both ends (F.trim strips only spaces)."""
    return F.regexp_replace(s, r"^[\x00-\x20]+|[\x00-\x20]+$", "")


def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")


def java_length(s: Column) -> Column:
    """String.length() counts UTF-16 code units (F.length counts code points)."""
    return (F.octet_length(F.encode(s, "UTF-16BE")) / 2).cast("int")


def java_substring(
    s: Column, begin: Column, end: Column | None = None, *, skip_bad_record: bool = False
) -> Column:
    """String.substring(begin[, end]) on UTF-16 indexes; out of range throws StringIndexOutOfBoundsException."""
    n = java_length(s)
    stop = n if end is None else end
    ok = (begin >= 0) & (stop <= n) & (begin <= stop)
    units = F.encode(s, "UTF-16BE")  # Java indexes UTF-16 code units, Spark counts code points
    value = F.decode(F.substr(units, begin * 2 + 1, (stop - begin) * 2), "UTF-16BE")
    if skip_bad_record:
        return F.when(ok, value)
    return F.when(ok, value).otherwise(
        F.raise_error(F.lit("StringIndexOutOfBoundsException in substring"))
    )


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # KeyValueTextInputFormat: key = text before the first '|', value = the rest
    pair = F.split(F.col("value"), "\\|", 2)
    lines = spark.read.text(input_path).select(
        pair[0].alias("key"), F.coalesce(F.try_element_at(pair, F.lit(2)), F.lit("")).alias("value")
    )

    # Map side: narrow, row by row (no shuffle) — MembersPerPlan.java
    map_output = (
        lines
        # MembersPerPlan.java:27  String[] f = rest.toString().split("\\|");
        .withColumn("f", java_split(F.col("value"), "\\|"))
        # MembersPerPlan.java:29  context.write(new Text(memberId.toString().trim().substring(0, 1) + ":" + f[2].trim()),...  (map output: key, value)
        .where(F.size(F.col("f")) > 2).select(
            F.concat(
                java_substring(java_trim(F.col("key")), F.lit(0), F.lit(1)),
                F.lit(":"),
                java_trim(F.col("f")[2]),
            ).alias("key"),
            F.lit(1).alias("value"),
        )
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
        description="Run members per plan on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("members per plan (mrlift)")
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
