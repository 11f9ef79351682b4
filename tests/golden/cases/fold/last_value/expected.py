"""Main: test job

PySpark DataFrame version of the Hadoop MapReduce job "test job", written by mrlift.

Original classes:
    driver       Main  (Main.java:11-52)
    mapper       Main.M  (Main.java:12-27)
    reducer      Main.R  (Main.java:29-38)

What it computes: per key: only of the mapper's values, sorted by key. Shapes: filter, parse and
emit, the one value per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit main.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import sys

from pyspark.sql import Column, DataFrame, SparkSession
from pyspark.sql import Observation
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


class HadoopCounters:
    """Hadoop counters, computed with DataFrame.observe in the same pass as the job's own work."""

    def __init__(self) -> None:
        self._parts: list[tuple[str, str, Observation]] = []

    def add(self, group: str, name: str, rows: Column | None = None, amount=1):
        """A DataFrame.transform step adding `amount` to the counter for each row where `rows` holds."""
        observation = Observation(f"counter_{len(self._parts)}")
        self._parts.append((group, name, observation))
        value = amount if isinstance(amount, Column) else F.lit(amount)
        counted = value if rows is None else F.when(rows, value).otherwise(0)
        metric = F.coalesce(F.sum(counted), F.lit(0)).cast("bigint").alias("value")
        return lambda df: df.observe(observation, metric)

    def totals(self) -> dict[tuple[str, str], int]:
        """(group, name) -> value; read after the job's action has run."""
        out: dict[tuple[str, str], int] = {}
        for group, name, observation in self._parts:
            out[(group, name)] = out.get((group, name), 0) + int(observation.get["value"])
        return out

    def report(self, stream=None) -> None:
        """Print the counters in the layout of Hadoop's job log."""
        stream = stream or sys.stderr
        totals = self.totals()
        print(f"Counters: {len(totals)}", file=stream)
        for group in sorted({g for g, _ in totals}):
            print(f"\t{group}", file=stream)
            for (g, name), value in sorted(totals.items()):
                if g == group:
                    print(f"\t\t{name}={value}", file=stream)


def build(
    spark: SparkSession, input_path: str, counters: HadoopCounters | None = None
) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    counters = counters if counters is not None else HadoopCounters()
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — Main.java
    map_output = (
        lines
        # Main.java:16  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # Main.java:17  if (f.length != 2) return;
        .where(F.size(F.col("f")) == 2)
        # Main.java:20  rides = Integer.parseInt(f[1]);
        .withColumn("rides", java_parse_int(F.col("f")[1], skip_bad_record=True))
        # Main.java:22  context.getCounter("quality", "bad rides").increment(1);  (counted in the same pass)
        .transform(counters.add("quality", "bad rides", F.col("rides").isNull()))
        # Main.java:20  catch: skip the record
        .where(F.col("rides").isNotNull())
        # Main.java:25  context.write(new Text(f[0]), new IntWritable(rides));  (map output: key, value)
        .select(F.col("f")[0].alias("key"), F.col("rides").alias("value"))
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (Main.java:30)
    result = (
        map_output.groupBy("key").agg(
            # Main.java:34  rides = v.get();
            last_value_assigned(F.col("value"), "Main.java:34 `rides`").alias("rides"),
        )
        # Main.java:36  context.write(key, new IntWritable(rides * 10));
        .select(F.col("key"), java_int_mul(F.col("rides"), 10).alias("value"))
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
    counters = HadoopCounters()
    result = build(spark, args.input_path, counters=counters)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    counters.report()  # the same counters the Hadoop job printed, on stderr
    return 0


if __name__ == "__main__":
    sys.exit(main())
