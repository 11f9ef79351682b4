"""RidesByWeekdayHour: rides by weekday and hour

PySpark DataFrame version of the Hadoop MapReduce job "rides by weekday and hour", written by mrlift.

Original classes:
    driver       net.brindleharbour.reports.RidesByWeekdayHour  (RidesByWeekdayHour.java:27-75)
    mapper       net.brindleharbour.reports.RidesByWeekdayHour.ClockMapper  (RidesByWeekdayHour.java:30-56)
    combiner     org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer  (ships with Hadoop)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit rides_by_weekday_hour.py <input_path> <output_path>

Time zone: SimpleDateFormat and Calendar used the original JVM's default zone. This script uses
Spark's session zone (--time-zone; by default this JVM's own zone): run it where the old job ran,
or pass the old zone explicitly.

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: combiner IntSumReducer writes a partial sum of the values the reducer aggregates (it is the reducer itself); Spark's groupBy merges partial aggregates itself, so there is nothing to convert for it

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import re
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


def _date_regex(pattern: str, exact_widths: bool) -> tuple[str, list[str]]:
    """A regex over the numeric fields of a date pattern, and the pattern letter of each group.

    SimpleDateFormat reads any number of digits and ignores text after the pattern
    (exact_widths=False); DateTimeFormatter.ofPattern reads as many digits as there are letters
    and must consume the whole text (exact_widths=True).
    """
    regex, letters, i = "^", [], 0
    while i < len(pattern):
        c = pattern[i]
        if c == "'":
            j = pattern.index("'", i + 1)
            regex += re.escape("'" if j == i + 1 else pattern[i + 1 : j])
            i = j + 1
        elif c.isalpha():
            n = 0
            while i < len(pattern) and pattern[i] == c:
                i, n = i + 1, n + 1
            regex += r"(\d{%d})" % n if exact_widths else r"(\d+)"
            letters.append("y" if c == "u" else c)
        else:
            regex += re.escape(c)
            i += 1
    return regex + (r"\z" if exact_widths else ""), letters


def _date_fields(s: Column, regex: str, letters: list[str]) -> list[Column]:
    """Year, month, day, hour, minute, second of the text as ints (NULL where it does not match)."""

    def part(letter: str, default: int) -> Column:
        if letter not in letters:
            return F.lit(default)
        return F.regexp_extract(s, regex, letters.index(letter) + 1).try_cast("int")

    return [part("y", 1970), part("M", 1), part("d", 1), part("H", 0), part("m", 0), part("s", 0)]


def sdf_parse(
    s: Column, pattern: str, *, lenient: bool = True, skip_bad_record: bool = False
) -> Column:
    """SimpleDateFormat(pattern).parse(s) in the session time zone (the JVM's zone in Java).

    Lenient, as Java's default: out-of-range fields roll over (Feb 30 is Mar 1, 25:70 is 02:10 the
    next day) and text after the pattern is ignored; not lenient, such fields and a time the zone
    skips are errors. The wall-clock time is computed without a time zone, then placed in the
    session zone; a wall-clock time that occurs twice (the autumn DST change) is the later
    instant, as GregorianCalendar resolves it.
    """
    regex, letters = _date_regex(pattern, exact_widths=False)
    year, month, day, hour, minute, second = _date_fields(s, regex, letters)
    if lenient:  # calendar arithmetic on dates and whole seconds: no time zone takes part
        date = F.date_add(F.add_months(F.make_date(year, F.lit(1), F.lit(1)), month - 1), day - 1)
        seconds = F.unix_date(date).cast("bigint") * 86400 + hour * 3600 + minute * 60 + second
        wall = F.timestamp_seconds(seconds)
    else:
        wall = F.try_make_timestamp(year, month, day, hour, minute, second, F.lit("UTC"))
    instant = F.to_utc_timestamp(wall, F.current_timezone())
    later = instant + F.expr("INTERVAL 1 HOUR")
    same_wall_clock = F.date_format(later, "yyyy-MM-dd HH:mm:ss") == F.date_format(
        instant, "yyyy-MM-dd HH:mm:ss"
    )
    value = F.when(
        s.rlike(regex) & wall.isNotNull(), F.when(same_wall_clock, later).otherwise(instant)
    )
    if not lenient:  # a time the zone skips (spring DST gap) is an error
        value = F.when(F.from_utc_timestamp(value, F.current_timezone()) == wall, value)
    if skip_bad_record:
        return value
    return F.when(value.isNotNull(), value).otherwise(
        F.raise_error(F.concat(F.lit('ParseException: Unparseable date: "'), s, F.lit('"')))
    )


def build(
    spark: SparkSession, input_path: str, counters: HadoopCounters | None = None
) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    counters = counters if counters is not None else HadoopCounters()
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — RidesByWeekdayHour.java
    map_output = (
        lines
        # RidesByWeekdayHour.java:38  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # RidesByWeekdayHour.java:39  if (f.length < 6 || f[0].equals("ride_id")) {
        .where(~((F.size(F.col("f")) < 6) | (F.col("f")[0] == "ride_id")))
        # RidesByWeekdayHour.java:44  started = stamp.parse(f[4]);
        .withColumn(
            "started", sdf_parse(F.col("f")[4], "yyyy-MM-dd HH:mm:ss", skip_bad_record=True)
        )
        # RidesByWeekdayHour.java:46  context.getCounter(Clock.UNREADABLE).increment(1);  (counted in the same pass)
        .transform(
            counters.add(
                "net.brindleharbour.reports.RidesByWeekdayHour$Clock",
                "UNREADABLE",
                F.col("started").isNull(),
            )
        )
        # RidesByWeekdayHour.java:44  catch: skip the record
        .where(F.col("started").isNotNull())
        # RidesByWeekdayHour.java:50  int weekday = cal.get(Calendar.DAY_OF_WEEK);
        .withColumn("weekday", F.dayofweek(F.col("started")))
        # RidesByWeekdayHour.java:51  int hour = cal.get(Calendar.HOUR_OF_DAY);
        .withColumn("hour", F.hour(F.col("started")))
        # RidesByWeekdayHour.java:52  long endMillis = started.getTime() + Long.parseLong(f[5]) * 1000L;
        .withColumn(
            "endMillis",
            java_long_add(
                F.unix_millis(F.col("started")), java_long_mul(java_parse_long(F.col("f")[5]), 1000)
            ),
        )
        # 2 writes per record: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # RidesByWeekdayHour.java:53  context.write(new Text("wd" + weekday + "@" + (hour < 10 ? "0" : "") + hour), ONE);
                        F.struct(
                            F.concat(
                                F.lit("wd"),
                                F.col("weekday").cast("string"),
                                F.lit("@"),
                                F.when(F.col("hour") < 10, F.lit("0")).otherwise(F.lit("")),
                                F.col("hour").cast("string"),
                            ).alias("key"),
                            F.lit(1).alias("value"),
                        ),
                        # RidesByWeekdayHour.java:54  context.write(new Text("day " + day.format(started) + (endMillis - started.getTime() > ...
                        F.struct(
                            F.concat(
                                F.lit("day "),
                                F.date_format(F.col("started"), "yyyy-MM-dd"),
                                F.when(
                                    java_long_sub(
                                        F.col("endMillis"), F.unix_millis(F.col("started"))
                                    )
                                    > 3600000,
                                    F.lit(" long"),
                                ).otherwise(F.lit("")),
                            ).alias("key"),
                            F.lit(1).alias("value"),
                        ),
                    ),
                    lambda emitted: emitted.isNotNull(),
                )
            ).alias("emitted")
        ).select("emitted.key", "emitted.value")
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
        description="Run rides by weekday and hour on Spark (converted by mrlift)."
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
        "--time-zone",
        default=None,
        help="the time zone the original JVM ran in (SimpleDateFormat and Calendar used it); "
        "default: this JVM's own zone, which is Spark's session default",
    )
    parser.add_argument(
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    spark = (
        SparkSession.builder.appName("rides by weekday and hour (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    if (
        args.time_zone
    ):  # dates are read and printed in this zone, as the original JVM's default zone
        spark.conf.set("spark.sql.session.timeZone", args.time_zone)
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
