"""MembersByJoinQuarter: members by join quarter

PySpark DataFrame version of the Hadoop MapReduce job "members by join quarter", written by mrlift.

Original classes:
    driver       net.brindleharbour.members.MembersByJoinQuarter  (MembersByJoinQuarter.java:20-54)
    mapper       net.brindleharbour.members.MembersByJoinQuarter.JoinMapper  (MembersByJoinQuarter.java:21-41)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.IntSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit members_by_join_quarter.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
import re
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


def java_int_div(a, b) -> Column:
    """Java int division truncates toward zero (Spark's `/` gives a double); MIN_VALUE / -1 wraps."""
    return wrap_int(F.call_function("div", _col(a), _col(b)))


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


def jt_parse(
    s: Column, pattern: str, *, date_only: bool = False, skip_bad_record: bool = False
) -> Column:
    """LocalDateTime.parse / LocalDate.parse with DateTimeFormatter.ofPattern(pattern), ResolverStyle.SMART.

    Fields have their exact widths and the whole text must match; SMART moves a day-of-month of
    29-31 past the month's end back to its last day and reads 24:00:00 as the next midnight.
    No time zone takes part (TIMESTAMP_NTZ / DATE, like java.time's local types).
    """
    regex, letters = _date_regex(pattern, exact_widths=True)
    year, month, day, hour, minute, second = _date_fields(s, regex, letters)
    end_of_day = (hour == 24) & (minute == 0) & (second == 0)
    ok = (
        s.rlike(regex)
        & month.between(1, 12)
        & day.between(1, 31)
        & ((hour <= 23) | end_of_day)
        & (minute <= 59)
        & (second <= 59)
    )
    last_day = F.dayofmonth(F.last_day(F.make_date(year, month, F.lit(1))))
    day = F.least(day, last_day)
    if date_only:
        value = F.when(ok, F.make_date(year, month, day))
    else:
        stamp = F.make_timestamp_ntz(
            year, month, day, F.when(end_of_day, 0).otherwise(hour), minute, second
        )
        value = F.when(ok, F.when(end_of_day, stamp + F.expr("INTERVAL 1 DAY")).otherwise(stamp))
    if skip_bad_record:
        return value
    return F.when(value.isNotNull(), value).otherwise(
        F.raise_error(
            F.concat(F.lit("DateTimeParseException: Text '"), s, F.lit("' could not be parsed"))
        )
    )


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — MembersByJoinQuarter.java
    map_output = (
        lines
        # MembersByJoinQuarter.java:27  String[] f = value.toString().split("\\|");
        .withColumn("f", java_split(F.col("value"), "\\|"))
        # MembersByJoinQuarter.java:28  if (f.length < 5) {
        .where(F.size(F.col("f")) >= 5)
        # MembersByJoinQuarter.java:33  joined = LocalDate.parse(f[4].trim(), JOINED);
        .withColumn(
            "joined",
            jt_parse(java_trim(F.col("f")[4]), "yyyy-MM-dd", date_only=True, skip_bad_record=True),
        )
        # MembersByJoinQuarter.java:33  catch: skip the record
        .where(F.col("joined").isNotNull())
        # MembersByJoinQuarter.java:37  int quarter = (joined.getMonthValue() - 1) / 3 + 1;
        .withColumn(
            "quarter", java_int_add(java_int_div(java_int_sub(F.month(F.col("joined")), 1), 3), 1)
        )
        # 2 writes per record: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # MembersByJoinQuarter.java:38  context.write(new Text(joined.getYear() + "-Q" + quarter), ONE);
                        F.struct(
                            F.concat(
                                F.year(F.col("joined")).cast("string"),
                                F.lit("-Q"),
                                F.col("quarter").cast("string"),
                            ).alias("key"),
                            F.lit(1).alias("value"),
                        ),
                        # MembersByJoinQuarter.java:39  context.write(new Text("weekday " + joined.getDayOfWeek().getValue()), ONE);
                        F.struct(
                            F.concat(
                                F.lit("weekday "), (F.weekday(F.col("joined")) + 1).cast("string")
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
        description="Run members by join quarter on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("members by join quarter (mrlift)")
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
