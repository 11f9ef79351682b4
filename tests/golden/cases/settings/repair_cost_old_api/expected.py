"""RepairCostLines: repair cost lines

PySpark DataFrame version of the Hadoop MapReduce job "repair cost lines", written by mrlift.

Original classes:
    driver       net.brindleharbour.tickets.RepairCostLines  (RepairCostLines.java:21-66)
    mapper       net.brindleharbour.tickets.RepairCostLines.CostMapper  (RepairCostLines.java:23-52)

What it computes: a map-only job: each input line becomes zero or more output lines. Shapes: map
only, filter, parse and emit.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit repair_cost_lines.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: RepairCostLines.java:46 toUpperCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)
Note: RepairCostLines.java:49 String.format uses the JVM's default locale; the script formats as an English (US) locale does (decimal point, comma grouping)

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


def java_length(s: Column) -> Column:
    """String.length() counts UTF-16 code units (F.length counts code points)."""
    return (F.octet_length(F.encode(s, "UTF-16BE")) / 2).cast("int")


def java_strip(s: Column, *, leading: bool = True, trailing: bool = True) -> Column:
    """String.strip(): removes Character.isWhitespace chars (Java regex class \\p{javaWhitespace})."""
    parts = ([r"^\p{javaWhitespace}+"] if leading else []) + (
        [r"\p{javaWhitespace}+$"] if trailing else []
    )
    return F.regexp_replace(s, "|".join(parts), "")


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


def java_round(x: Column) -> Column:
    """Math.round(double) -> long: floor(x + 0.5) without its rounding error; NaN -> 0; clamps to long."""
    fl = F.floor(x)
    return (
        F.when(F.isnan(x), F.lit(0).cast("bigint"))
        .when(x >= F.lit(9.223372036854775807e18), F.lit(9223372036854775807))
        .when(x <= F.lit(-9.223372036854775808e18), F.lit(-9223372036854775808))
        .otherwise(fl + F.when(x - fl >= 0.5, 1).otherwise(0))
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
    currency = hadoop_setting(conf, "repair.currency", "BHC", "get")
    rate_per_hour = hadoop_setting(conf, "repair.rate.per.hour", 18.5, "getFloat")

    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — RepairCostLines.java
    map_output = (
        lines
        # RepairCostLines.java:35  String[] f = value.toString().split(";");
        .withColumn("f", java_split(F.col("value"), ";"))
        # RepairCostLines.java:36  if (f.length < 5 || f[0].equals("ticket_id")) {
        .where(~((F.size(F.col("f")) < 5) | (F.col("f")[0] == "ticket_id")))
        # RepairCostLines.java:41  hours = Integer.parseInt(f[4].strip());
        .withColumn("hours", java_parse_int(java_strip(F.col("f")[4]), skip_bad_record=True))
        # RepairCostLines.java:41  catch: skip the record
        .where(F.col("hours").isNotNull())
        # RepairCostLines.java:45  String category = f[2].strip();
        .withColumn("category", java_strip(F.col("f")[2]))
        # RepairCostLines.java:46  String label = Character.toString(category.charAt(0)).toUpperCase() + category.substrin...
        .withColumn(
            "label",
            F.concat(
                F.upper(java_substring(F.col("category"), F.lit(0), F.lit(1))),
                java_substring(F.col("category"), F.lit(1)),
            ),
        )
        # RepairCostLines.java:47  double cost = Math.round(hours * (double) ratePerHour * 100) / 100.0;
        .withColumn(
            "cost",
            (
                java_round(
                    (
                        (
                            F.col("hours").cast("double")
                            * F.lit(rate_per_hour).cast("float").cast("double")
                        )
                        * 100.0
                    )
                ).cast("double")
                / 100.0
            ),
        )
        # RepairCostLines.java:48  String ticket = f[0].replace("T-", "");
        .withColumn("ticket", F.replace(F.col("f")[0], F.lit("T-"), F.lit("")))
        # RepairCostLines.java:49  out.collect(new Text(ticket), new Text(String.format("%s|%s|%d h|%.2f %s", f[1], label,...  (map output: key, value)
        .select(
            F.col("ticket").alias("key"),
            F.concat(
                F.format_string(
                    "%s|%s|%d h|%.2f %s",
                    F.col("f")[1],
                    F.col("label"),
                    F.col("hours"),
                    F.col("cost"),
                    F.lit(currency),
                ),
                F.when(
                    ~F.isnan(F.col("cost")) & (F.col("cost") > 300.0), F.lit("|REVIEW")
                ).otherwise(F.lit("")),
            ).alias("value"),
        )
    )
    return map_output


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # Map-only job: rows keep their input order, one file per input partition.
    rows = result
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
        description="Run repair cost lines on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("repair cost lines (mrlift)")
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
