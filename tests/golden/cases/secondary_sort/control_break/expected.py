"""StationDayDigest: station day digest

PySpark DataFrame version of the Hadoop MapReduce job "station day digest", written by mrlift.

Original classes:
    driver       net.brindleharbour.fleet.StationDayDigest  (StationDayDigest.java:25-94)
    mapper       net.brindleharbour.fleet.StationDayDigest.DayMapper  (StationDayDigest.java:27-37)
    reducer      net.brindleharbour.fleet.StationDayDigest.DigestReducer  (StationDayDigest.java:50-78)
    grouping_comparator net.brindleharbour.fleet.StationDayDigest.SameStation  (StationDayDigest.java:39-48)

What it computes: per group of the grouping comparator, a fold of each run of one key (a control
break), the runs collected in the sort order and written once per group. Shapes: secondary sort,
filter, parse and emit, control break (a fold per run of one key, collected per group).
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit station_day_digest.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: the values reach reduce() in the sort comparator's order; the script sorts its output by the same fields, in the same directions (values with equal keys: in no defined order)

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

    # Map side: narrow, row by row (no shuffle) — StationDayDigest.java
    map_output = (
        lines
        # StationDayDigest.java:30  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # StationDayDigest.java:31  if (f.length < 6 || !f[4].matches("\\d{4}-\\d{2}-\\d{2} .*")) {
        .where(
            ~(
                (F.size(F.col("f")) < 6)
                | (~(F.col("f")[4].rlike("^(?:\\d{4}-\\d{2}-\\d{2} .*)\\z")))
            )
        )
        # StationDayDigest.java:34  int day = Integer.parseInt(f[4].substring(0, 10).replace("-", ""));
        .withColumn(
            "day",
            java_parse_int(
                F.replace(java_substring(F.col("f")[4], F.lit(0), F.lit(10)), F.lit("-"), F.lit(""))
            ),
        )
        # StationDayDigest.java:35  context.write(new StationDay(f[2], day), new DayRide(day, Integer.parseInt(f[5])));  (map output: key, value)
        .select(
            F.struct(F.col("f")[2].alias("station"), F.col("day").alias("day")).alias("key"),
            F.struct(
                F.col("day").alias("day"), java_parse_int(F.col("f")[5]).alias("seconds")
            ).alias("value"),
        )
    )

    # Reduce side: one reduce() call per group of the grouping comparator, its values in the sort order (StationDayDigest.java:51);
    # it starts its sums over whenever `day` changes (a control break), so each run is one key of the group:
    # a fold per key, then per group the runs it flushed, in the sort order
    runs = (
        map_output.groupBy("key")
        .agg(
            # StationDayDigest.java:69  count++;
            F.count(F.lit(1)).cast("int").alias("count"),
            # StationDayDigest.java:70  seconds += ride.getSeconds();
            F.sum(F.col("value")["seconds"].cast("bigint")).alias("seconds"),
        )
        .withColumn("day", F.col("key")["day"])  # the run's day
        # StationDayDigest.java:63  days.add(day + ":" + count + "x" + mean + "s");  (a run is flushed where the test holds)
        .select(
            "key",
            F.when(
                F.col("day") != 0,
                F.struct(
                    F.col("day").alias("_run"),
                    F.concat(
                        F.col("day").cast("string"),
                        F.lit(":"),
                        F.col("count").cast("string"),
                        F.lit("x"),
                        java_long_div(F.col("seconds"), F.col("count").cast("bigint")).cast(
                            "string"
                        ),
                        F.lit("s"),
                    ).alias("item"),
                ),
            ).alias("_flushed"),
        )
    )
    result = (
        runs.groupBy(F.col("key")["station"].alias("_group_1"))
        .agg(
            # any key of the group: what reduce() writes reads only the fields they share
            F.first("key").alias("key"),
            # the flushed runs in the sort order (collect_list leaves out the runs not flushed)
            F.sort_array(F.collect_list("_flushed")).alias("_runs"),
        )
        .withColumn("days", F.transform("_runs", lambda run: run["item"]))
        # StationDayDigest.java:76  context.write(new Text(key.getStation()), new Text(String.join(" ", days)));
        .select(
            F.col("key")["station"].alias("key"),
            F.array_join(F.col("days"), " ").alias("value"),
            F.col("key")["station"].alias("_sort_1"),
        )
    )
    return result


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # One reducer wrote one file sorted by key: the same here (wide: one shuffle into one partition).
    rows = result.repartition(1).sortWithinPartitions("_sort_1")
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
        description="Run station day digest on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("station day digest (mrlift)")
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
