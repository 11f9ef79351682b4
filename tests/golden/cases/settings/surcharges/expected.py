"""LongRideSurcharges: long ride surcharges

PySpark DataFrame version of the Hadoop MapReduce job "long ride surcharges", written by mrlift.

Original classes:
    driver       net.brindleharbour.billing.LongRideSurcharges  (LongRideSurcharges.java:19-73)
    mapper       net.brindleharbour.billing.LongRideSurcharges.SurchargeMapper  (LongRideSurcharges.java:21-58)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit long_ride_surcharges.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: LongRideSurcharges.java:36 toUpperCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)

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


def java_equals_ignore_case(a: Column, b: Column) -> Column:
    """String.equalsIgnoreCase: same length and each char equal after upper- or lower-casing."""

    def char(c: Column, i: Column) -> Column:
        return F.substr(c, i, F.lit(1))

    return (F.length(a) == F.length(b)) & F.forall(
        F.sequence(F.lit(1), F.length(a)),
        lambda i: (F.upper(char(a, i)) == F.upper(char(b, i)))
        | (F.lower(char(a, i)) == F.lower(char(b, i))),
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


def hadoop_setting(conf: dict[str, str] | None, name: str, default, getter: str = "get"):
    """Configuration.get*(name, default) as Hadoop reads it: trimmed numbers, 0x hex, true/false."""
    raw = (conf or {}).get(name)
    if raw is None:
        return default
    if getter in ("getInt", "getLong"):
        text = raw.strip()
        negative = text.startswith("-")
        digits = text[1:] if negative else text
        value = int(digits[2:], 16) if digits.lower().startswith("0x") else int(digits)
        return -value if negative else value
    if getter in ("getFloat", "getDouble"):
        return float(raw.strip())
    if getter == "getBoolean":
        text = raw.strip().lower()
        return True if text == "true" else False if text == "false" else default
    return raw.strip() if getter == "getTrimmed" else raw


def settings(defines: list[str]) -> dict[str, str]:
    """`-D name=value` options, as Hadoop's GenericOptionsParser reads them."""
    out = {}
    for d in defines:
        name, sep, value = d.partition("=")
        if not sep:
            raise SystemExit(f"-D {d}: expected name=value")
        out[name] = value
    return out


def build(spark: SparkSession, input_path: str, conf: dict[str, str] | None = None) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # Job settings (Hadoop Configuration): `-D name=value` on the command line overrides the default
    cents_per_quarter = hadoop_setting(conf, "surcharge.cents.per.quarter", 75, "getLong")
    exempt_type = hadoop_setting(conf, "surcharge.exempt.type", "staff", "get")
    free_seconds = hadoop_setting(conf, "surcharge.free.seconds", 2700, "getInt")

    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — LongRideSurcharges.java
    map_output = (
        lines
        # LongRideSurcharges.java:46  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # LongRideSurcharges.java:47  if (f.length < 8 || f[0].equals("ride_id")) {
        .where(~((F.size(F.col("f")) < 8) | (F.col("f")[0] == "ride_id")))
        # LongRideSurcharges.java:50  if (f[6].equalsIgnoreCase(exemptType)) {
        .where(~(java_equals_ignore_case(F.col("f")[6], F.lower(java_trim(F.lit(exempt_type))))))
        # LongRideSurcharges.java:53  long over = Long.parseLong(f[5]) - freeSeconds;
        .withColumn(
            "over",
            java_long_sub(java_parse_long(F.col("f")[5]), F.lit(free_seconds).cast("bigint")),
        )
        # LongRideSurcharges.java:55  context.write(new Text(stationCode(f[2])), new LongWritable(quartersStarted(over) * cen...  (map output: key, value)
        .where(F.col("over") > 0).select(
            F.when(
                java_length(F.upper(java_trim(F.col("f")[2]))) > 6,
                java_substring(F.upper(java_trim(F.col("f")[2])), F.lit(0), F.lit(6)),
            )
            .otherwise(F.upper(java_trim(F.col("f")[2])))
            .alias("key"),
            java_long_mul(
                java_long_div(java_long_add(F.col("over"), 899), 900),
                F.lit(cents_per_quarter).cast("bigint"),
            ).alias("value"),
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (LongSumReducer (ships with Hadoop))
    result = (
        map_output.groupBy("key").agg(
            # LongSumReducer (ships with Hadoop)  sum of the values
            F.sum(F.col("value")).alias("sum"),
        )
        # LongSumReducer (ships with Hadoop)  write(key, sum)
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
        description="Run long ride surcharges on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("long ride surcharges (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path, conf=settings(args.defines))
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
