"""DockLoadByStation: dock load by station

PySpark DataFrame version of the Hadoop MapReduce job "dock load by station", written by mrlift.

Original classes:
    driver       net.brindleharbour.docks.DockLoadByStation  (DockLoadByStation.java:21-72)
    mapper       net.brindleharbour.docks.DockLoadByStation.LoadMapper  (DockLoadByStation.java:23-43)
    reducer      net.brindleharbour.docks.DockLoadByStation.LoadReducer  (DockLoadByStation.java:45-57)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit dock_load_by_station.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: in-mapper combining into loads (records summed field by field, written in cleanup()) is a partial sum; the reducer sums every field again, so the script writes a record per update and lets the reducer sum them
Note: DockLoadByStation.java:24 `loads` (a Map of DockLoad) combines in the mapper: a write per update
Note: DockLoadByStation.java:34 `loads_update` (DockLoad) is a local per field
Note: DockLoadByStation.java:49 `total` (DockLoad) is a local per field

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


def java_div_double(a: Column, b: Column) -> Column:
    """Java double division: x / 0.0 is +-Infinity or NaN, where ANSI Spark raises an error."""
    negative_zero = b.cast("string") == "-0.0"
    return F.when(
        b == 0,
        F.when(F.isnan(a) | (a == 0), F.lit(float("nan")))
        .when((a > 0) != negative_zero, F.lit(float("inf")))
        .otherwise(F.lit(float("-inf"))),
    ).otherwise(a / b)


def wrap_long(c: Column) -> Column:
    """Java long overflow wraps around; c is an exact integral value (DECIMAL(38,0))."""
    offset = F.lit("9223372036854775808").cast("decimal(38,0)")
    modulus = F.lit("18446744073709551616").cast("decimal(38,0)")
    return (F.pmod(c.cast("decimal(38,0)") + offset, modulus) - offset).cast("bigint")


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — DockLoadByStation.java
    map_output = (
        lines
        # DockLoadByStation.java:28  String[] f = line.toString().split("\t");
        .withColumn("f", java_split(F.col("value"), "\t"))
        # DockLoadByStation.java:29  if (f.length < 5 || f[0].equals("dock_id")) {
        .where(~((F.size(F.col("f")) < 5) | (F.col("f")[0] == "dock_id")))
        # DockLoadByStation.java:32  String station = f[1];
        .withColumn("station", F.col("f")[1])
        # DockLoadByStation.java:34  loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
        .withColumn("loads_update_bikesAvailable", java_parse_int(F.col("f")[3]))
        # DockLoadByStation.java:34  loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
        .withColumn("loads_update_docksFree", java_parse_int(F.col("f")[4]))
        # DockLoadByStation.java:34  loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
        .withColumn(
            "loads_update_bikes",
            java_long_add(0, F.col("loads_update_bikesAvailable").cast("bigint")),
        )
        # DockLoadByStation.java:34  loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
        .withColumn(
            "loads_update_free", java_long_add(0, F.col("loads_update_docksFree").cast("bigint"))
        )
        # DockLoadByStation.java:34  loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
        .withColumn("loads_update_reports", F.lit(1))
        # 2 writes per record: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # DockLoadByStation.java:33  loads.putIfAbsent(station, new DockLoad());
                        F.struct(
                            F.col("station").alias("key"),
                            F.struct(
                                F.lit(0).cast("bigint").alias("bikes"),
                                F.lit(0).cast("bigint").alias("free"),
                                F.lit(0).alias("reports"),
                            ).alias("value"),
                        ),
                        # DockLoadByStation.java:34  loads.get(station).report(Integer.parseInt(f[3]), Integer.parseInt(f[4]));
                        F.struct(
                            F.col("station").alias("key"),
                            F.struct(
                                F.col("loads_update_bikes").alias("bikes"),
                                F.col("loads_update_free").alias("free"),
                                F.col("loads_update_reports").alias("reports"),
                            ).alias("value"),
                        ),
                    ),
                    lambda emitted: emitted.isNotNull(),
                )
            ).alias("emitted")
        ).select("emitted.key", "emitted.value")
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (DockLoadByStation.java:46)
    result = (
        map_output.groupBy("key").agg(
            # DockLoadByStation.java:51  total.add(load);
            F.sum(F.col("value")["bikes"]).alias("total_bikes"),
            # DockLoadByStation.java:51  total.add(load);
            F.sum(F.col("value")["free"]).alias("total_free"),
            # DockLoadByStation.java:51  total.add(load);
            wrap_int(F.sum(F.col("value")["reports"])).alias("total_reports"),
        )
        # DockLoadByStation.java:55  context.write(station, new Text(bikes + " bikes, " + free + " docks free (" + total.getReports() + " reports)"));
        .select(
            F.col("key"),
            F.concat(
                java_div_double(
                    F.col("total_bikes").cast("double"), F.col("total_reports").cast("double")
                ).cast("string"),
                F.lit(" bikes, "),
                java_div_double(
                    F.col("total_free").cast("double"), F.col("total_reports").cast("double")
                ).cast("string"),
                F.lit(" docks free ("),
                F.col("total_reports").cast("string"),
                F.lit(" reports)"),
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
    parser = argparse.ArgumentParser(
        description="Run dock load by station on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("dock load by station (mrlift)")
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
