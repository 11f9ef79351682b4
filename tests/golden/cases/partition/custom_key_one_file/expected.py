"""StationHourLoad: station hour load

PySpark DataFrame version of the Hadoop MapReduce job "station hour load", written by mrlift.

Original classes:
    driver       net.brindleharbour.reports.StationHourLoad  (StationHourLoad.java:16-62)
    mapper       net.brindleharbour.reports.StationHourLoad.LoadMapper  (StationHourLoad.java:18-32)
    reducer      net.brindleharbour.reports.StationHourLoad.LoadReducer  (StationHourLoad.java:34-46)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit station_hour_load.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Findings (the original does this and so does this script; decide whether to keep it):
    StationHourLoad.java:52  [output-layout]
        Hadoop wrote 3 part files, each sorted by key; the script writes one file sorted by key:
        the same lines, each part file's lines in their order (Hadoop's hash of a custom
        StationHour key (its hashCode()) is not reproduced, so which reduce task got which key
        is not known)

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


def wrap_long(c: Column) -> Column:
    """Java long overflow wraps around; c is an exact integral value (DECIMAL(38,0))."""
    offset = F.lit("9223372036854775808").cast("decimal(38,0)")
    modulus = F.lit("18446744073709551616").cast("decimal(38,0)")
    return (F.pmod(c.cast("decimal(38,0)") + offset, modulus) - offset).cast("bigint")


def java_long_div(a, b) -> Column:
    """Java long division: truncates toward zero; Long.MIN_VALUE / -1 wraps to Long.MIN_VALUE."""
    a, b = _col(a), _col(b)
    return F.when(b == -1, wrap_long(-a.cast("decimal(20,0)"))).otherwise(
        F.call_function("div", a, b)
    )


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — StationHourLoad.java
    map_output = (
        lines
        # StationHourLoad.java:21  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # StationHourLoad.java:22  if (f.length < 6 || f[0].equals("ride_id") || f[4].length() < 13) {
        .where(
            ~(
                (((F.size(F.col("f")) < 6) | (F.col("f")[0] == "ride_id")))
                | (java_length(F.col("f")[4]) < 13)
            )
        )
        # StationHourLoad.java:26  int hour = Integer.parseInt(f[4].substring(11, 13));
        .withColumn(
            "hour",
            java_parse_int(
                java_substring(F.col("f")[4], F.lit(11), F.lit(13)), skip_bad_record=True
            ),
        )
        # StationHourLoad.java:26  catch: skip the record
        .where(F.col("hour").isNotNull())
        # StationHourLoad.java:27  context.write(new StationHour(f[2], hour), new RideTally(1, Long.parseLong(f[5])));  (map output: key, value)
        .where(java_parse_long(F.col("f")[5], skip_bad_record=True).isNotNull()).select(
            F.struct(F.col("f")[2].alias("station"), F.col("hour").alias("hour")).alias("key"),
            F.struct(
                F.lit(1).alias("rides"),
                java_parse_long(F.col("f")[5], skip_bad_record=True).alias("seconds"),
            ).alias("value"),
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (StationHourLoad.java:35)
    result = (
        map_output.groupBy("key").agg(
            # StationHourLoad.java:41  rides += t.getRides();
            wrap_int(F.sum(F.col("value")["rides"])).alias("rides"),
            # StationHourLoad.java:42  seconds += t.getSeconds();
            F.sum(F.col("value")["seconds"]).alias("seconds"),
        )
        # StationHourLoad.java:44  context.write(slot, new Text(rides + " rides, " + (seconds / rides / 60) + " min mean"));
        .select(
            F.concat(
                F.col("key")["station"], F.lit("@"), F.col("key")["hour"].cast("string"), F.lit("h")
            ).alias("key"),
            F.concat(
                F.col("rides").cast("string"),
                F.lit(" rides, "),
                java_long_div(
                    java_long_div(F.col("seconds"), F.col("rides").cast("bigint")), 60
                ).cast("string"),
                F.lit(" min mean"),
            ).alias("value"),
            F.encode(F.col("key")["station"], "UTF-16BE").alias("_sort_1"),
            F.col("key")["hour"].alias("_sort_2"),
        )
    )
    return result


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # One reducer wrote one file sorted by key: the same here (wide: one shuffle into one partition).
    rows = result.repartition(1).sortWithinPartitions("_sort_1", "_sort_2")
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
        description="Run station hour load on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("station hour load (mrlift)")
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
