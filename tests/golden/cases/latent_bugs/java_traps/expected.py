"""DeckLoadPerSailing: deck load per sailing

PySpark DataFrame version of the Hadoop MapReduce job "deck load per sailing", written by mrlift.

Original classes:
    driver       net.brindleharbour.ferry.DeckLoadPerSailing  (DeckLoadPerSailing.java:21-69)
    mapper       net.brindleharbour.ferry.DeckLoadPerSailing.LoadMapper  (DeckLoadPerSailing.java:23-40)
    combiner     net.brindleharbour.ferry.DeckLoadPerSailing.TotalReducer  (DeckLoadPerSailing.java:42-55)
    reducer      net.brindleharbour.ferry.DeckLoadPerSailing.TotalReducer  (DeckLoadPerSailing.java:42-55)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit deck_load_per_sailing.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: combiner TotalReducer writes a partial sum of the values the reducer aggregates (it is the reducer itself); Spark's groupBy merges partial aggregates itself, so there is nothing to convert for it

Findings (the original does this and so does this script; decide whether to keep it):
    DeckLoadPerSailing.java:33  [char-arithmetic]
        arithmetic on a char works on its UTF-16 code unit number and gives an int ('a' + 1 is
        98, not "a1" and not 'b'; JLS 5.6.2); the script does the same
    DeckLoadPerSailing.java:50  [narrowing-assignment]
        `sum += ...` adds a long into the int `sum`: Java keeps the low 32 bits after every
        addition (JLS 15.26.2), so a sum past 2147483647 wraps around to a negative number; the
        script does the same

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


def java_int_div(a, b) -> Column:
    """Java int division truncates toward zero (Spark's `/` gives a double); MIN_VALUE / -1 wraps."""
    return wrap_int(F.call_function("div", _col(a), _col(b)))


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


def java_char_code(c: Column) -> Column:
    """A char as an int: its UTF-16 code unit (a char here is one code unit of the BMP)."""
    return F.conv(F.hex(F.encode(c, "UTF-16BE")), 16, 10).cast("int")


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — DeckLoadPerSailing.java
    map_output = (
        lines
        # DeckLoadPerSailing.java:26  String[] f = value.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # DeckLoadPerSailing.java:27  if (f.length < 4 || f[1].isEmpty()) {
        .where(~((F.size(F.col("f")) < 4) | (F.length(F.col("f")[1]) == 0)))
        # DeckLoadPerSailing.java:31  long grams = Long.parseLong(f[2]);
        .withColumn("grams", java_parse_long(F.col("f")[2], skip_bad_record=True))
        # DeckLoadPerSailing.java:31  catch: skip the record
        .where(F.col("grams").isNotNull())
        # DeckLoadPerSailing.java:32  int vehicles = Integer.parseInt(f[3]);
        .withColumn("vehicles", java_parse_int(F.col("f")[3], skip_bad_record=True))
        # DeckLoadPerSailing.java:32  catch: skip the record
        .where(F.col("vehicles").isNotNull())
        # DeckLoadPerSailing.java:33  int deck = f[1].charAt(0) - 'A';
        .withColumn(
            "deck",
            java_int_sub(java_char_code(java_substring(F.col("f")[1], F.lit(0), F.lit(1))), 65),
        )
        # DeckLoadPerSailing.java:34  double perVehicle = (int) (grams / 1000) / vehicles;
        .withColumn(
            "perVehicle",
            F.when(
                F.col("vehicles") != 0,
                java_int_div(wrap_int(java_long_div(F.col("grams"), 1000)), F.col("vehicles")),
            ).cast("double"),
        )
        # DeckLoadPerSailing.java:34  catch: skip the record
        .where(F.col("perVehicle").isNotNull())
        # DeckLoadPerSailing.java:35  context.write(new Text(f[0] + "/deck" + deck + "/" + perVehicle), new LongWritable(gram...  (map output: key, value)
        .select(
            F.concat(
                F.col("f")[0],
                F.lit("/deck"),
                F.col("deck").cast("string"),
                F.lit("/"),
                F.col("perVehicle").cast("string"),
            ).alias("key"),
            F.col("grams").alias("value"),
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (DeckLoadPerSailing.java:45)
    result = (
        map_output.groupBy("key").agg(
            # DeckLoadPerSailing.java:50  sum += v.get();
            wrap_int(F.sum(F.col("value"))).alias("sum"),
        )
        # DeckLoadPerSailing.java:53  context.write(key, total);
        .select(F.col("key"), F.col("sum").cast("bigint").alias("value"))
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
        description="Run deck load per sailing on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("deck load per sailing (mrlift)")
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
