"""Main: dock flow

PySpark DataFrame version of the Hadoop MapReduce job "dock flow", written by mrlift.

Original classes:
    driver       Main  (Main.java:11-49)
    mapper       Main.M  (Main.java:12-23)
    combiner     Main.C  (Main.java:24-30)
    reducer      Main.R  (Main.java:31-40)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: parse and emit,
sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit main.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: combiner C writes a partial sum of the values the reducer aggregates; Spark's groupBy merges partial aggregates itself, so there is nothing to convert for it
Note: Main.java:15 `flow` (DockFlow) is a local per field
Note: Main.java:26 `all` (DockFlow) is a local per field
Note: Main.java:33 `all` (DockFlow) is a local per field

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


def fail_where_java_throws(value: Column, source: Column, exception: str) -> Column:
    """Fail the job where Java would have thrown (an uncaught exception fails the Hadoop task)."""
    message = F.concat(F.lit(exception + ': For input string: "'), source, F.lit('"'))
    return F.when(value.isNotNull(), value).otherwise(F.raise_error(message))


JAVA_INT = r"^[+-]?[0-9]+\z"  # Integer.parseInt / Long.parseLong grammar (ASCII digits, no spaces)


def java_parse_int(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Integer.parseInt: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_INT), s.try_cast("int"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")


def java_parse_long(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Long.parseLong: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_INT), s.try_cast("bigint"))
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


def java_long_add(a, b) -> Column:
    """long + long with Java's wrap-around (computed exactly in DECIMAL, then wrapped)."""
    return wrap_long(_col(a).cast("decimal(20,0)") + _col(b))


def java_long_sub(a, b) -> Column:
    """long - long with Java's wrap-around."""
    return wrap_long(_col(a).cast("decimal(20,0)") - _col(b))


def java_long_mul(a, b) -> Column:
    """long * long with Java's wrap-around."""
    return wrap_long(_col(a).cast("decimal(20,0)") * _col(b))


def wrap_long(c: Column) -> Column:
    """Java long overflow wraps around; c is an exact integral value (DECIMAL(38,0))."""
    offset = F.lit("9223372036854775808").cast("decimal(38,0)")
    modulus = F.lit("18446744073709551616").cast("decimal(38,0)")
    return (F.pmod(c.cast("decimal(38,0)") + offset, modulus) - offset).cast("bigint")


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — Main.java
    map_output = (
        lines
        # Main.java:14  String[] f = v.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # Main.java:17  flow.addDocked(Long.parseLong(f[2]), 1);
        .withColumn("flow_bikes", F.when(F.col("f")[1] == "in", java_parse_long(F.col("f")[2])))
        # Main.java:17  flow.addDocked(Long.parseLong(f[2]), 1);
        .withColumn(
            "flow_docked",
            F.when(F.col("f")[1] == "in", java_long_add(0, F.col("flow_bikes"))).otherwise(
                F.lit(0).cast("bigint")
            ),
        )
        # Main.java:17  flow.addDocked(Long.parseLong(f[2]), 1);
        .withColumn("flow_dockings", F.when(F.col("f")[1] == "in", F.lit(1)).otherwise(F.lit(0)))
        # Main.java:19  flow.addUndocked(Long.parseLong(f[2]), 1);
        .withColumn(
            "flow_bikes_2",
            F.when(
                (F.col("f")[1] != "in") & (F.col("f")[1] == "out"), java_parse_long(F.col("f")[2])
            ),
        )
        # Main.java:19  flow.addUndocked(Long.parseLong(f[2]), 1);
        .withColumn(
            "flow_undocked",
            F.when(
                (F.col("f")[1] != "in") & (F.col("f")[1] == "out"),
                java_long_add(0, F.col("flow_bikes_2")),
            ).otherwise(F.lit(0).cast("bigint")),
        )
        # Main.java:19  flow.addUndocked(Long.parseLong(f[2]), 1);
        .withColumn(
            "flow_undockings",
            F.when((F.col("f")[1] != "in") & (F.col("f")[1] == "out"), F.lit(1)).otherwise(
                F.lit(0)
            ),
        )
        # Main.java:21  c.write(new Text(f[0]), flow);  (map output: key, value)
        .select(
            F.col("f")[0].alias("key"),
            F.struct(
                F.col("flow_docked").alias("docked"),
                F.col("flow_dockings").alias("dockings"),
                F.col("flow_undocked").alias("undocked"),
                F.col("flow_undockings").alias("undockings"),
            ).alias("value"),
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (Main.java:32)
    result = (
        map_output.groupBy("key").agg(
            # Main.java:35  all.add(v);
            F.sum(F.col("value")["docked"]).alias("all_docked"),
            # Main.java:35  all.add(v);
            wrap_int(F.sum(F.col("value")["dockings"])).alias("all_dockings"),
            # Main.java:35  all.add(v);
            F.sum(F.col("value")["undocked"]).alias("all_undocked"),
            # Main.java:35  all.add(v);
            wrap_int(F.sum(F.col("value")["undockings"])).alias("all_undockings"),
        )
        # Main.java:38  c.write(k, new Text(in + "; " + all.getUndocked() + " out " + all.getUndockings()));
        .select(
            F.col("key"),
            F.concat(
                F.when(F.col("all_dockings") == 0, F.lit("none")).otherwise(
                    F.concat(
                        F.col("all_docked").cast("string"),
                        F.lit(" in "),
                        F.col("all_dockings").cast("string"),
                    )
                ),
                F.lit("; "),
                F.col("all_undocked").cast("string"),
                F.lit(" out "),
                F.col("all_undockings").cast("string"),
            ).alias("value"),
        )
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
    parser = argparse.ArgumentParser(description="Run dock flow on Spark (converted by mrlift).")
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
        SparkSession.builder.appName("dock flow (mrlift)")
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
