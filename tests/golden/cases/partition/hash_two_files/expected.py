"""BikeUsageProfile: bike usage profile

PySpark DataFrame version of the Hadoop MapReduce job "bike usage profile", written by mrlift.

Original classes:
    driver       net.brindleharbour.fleet.BikeUsageProfile  (BikeUsageProfile.java:21-86)
    mapper       net.brindleharbour.fleet.BikeUsageProfile.RideMapper  (BikeUsageProfile.java:23-37)
    reducer      net.brindleharbour.fleet.BikeUsageProfile.ProfileReducer  (BikeUsageProfile.java:39-72)

What it computes: per key: any/all, count, sum of the mapper's values, 3 writes per key, sorted
by key. Shapes: filter, parse and emit, average per key, several writes per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit bike_usage_profile.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.

Findings (the original does this and so does this script; decide whether to keep it):
    BikeUsageProfile.java:79  [output-layout]
        Hadoop wrote 2 part files, each sorted by key; by default the script writes one file
        holding the same lines in the same order (the part files one after another); with
        --task-files it writes 2 files, each holding what one reduce task wrote

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


def java_long_div(a, b) -> Column:
    """Java long division: truncates toward zero; Long.MIN_VALUE / -1 wraps to Long.MIN_VALUE."""
    a, b = _col(a), _col(b)
    return F.when(b == -1, wrap_long(-a.cast("decimal(20,0)"))).otherwise(
        F.call_function("div", a, b)
    )


def _int32(u: Column) -> Column:
    """An unsigned 32-bit value (0 <= u < 2**32, bigint) as the Java int with those bits."""
    return F.when(u >= 2**31, u - 2**32).otherwise(u).cast("int")


def _fold_hash(units: Column, start: int) -> Column:
    """h = 31 * h + unit over an array of ints, with Java's 32-bit int wrap-around."""
    return _int32(
        F.aggregate(
            units, F.lit(start).cast("bigint"), lambda h, u: F.pmod(h * 31 + u, F.lit(2**32))
        )
    )


def _hex_units(s: Column, charset: str, width: int) -> Column:
    """The code units of a string in `charset`, `width` hex digits each, as unsigned ints."""
    hexed = F.hex(F.encode(s, charset))
    return F.transform(
        F.regexp_extract_all(hexed, F.lit("(" + "." * width + ")"), 1),
        lambda h: F.conv(h, 16, 10).cast("int"),
    )


def string_hash(s: Column) -> Column:
    """String.hashCode(): s[0]*31^(n-1) + ... over the UTF-16 code units, starting at 0."""
    return _fold_hash(_hex_units(s, "UTF-16BE", 4), 0)


def text_hash(s: Column) -> Column:
    """Text.hashCode(): WritableComparator.hashBytes over the UTF-8 bytes (signed), starting at 1."""
    signed = F.transform(_hex_units(s, "UTF-8", 2), lambda b: F.when(b > 127, b - 256).otherwise(b))
    return _fold_hash(signed, 1)


def first_code_unit(s: Column) -> Column:
    """s.charAt(0) as an int (a UTF-16 code unit); the job fails on "" where Java throws."""
    unit = F.element_at(_hex_units(s, "UTF-16BE", 4), 1)
    return F.when(F.length(s) > 0, unit).otherwise(
        F.raise_error(F.lit("StringIndexOutOfBoundsException"))
    )


def long_hash(v: Column) -> Column:
    """LongWritable.hashCode(): (int) value, the low 32 bits (not Long.hashCode's high-low XOR)."""
    return _int32(F.pmod(v, F.lit(2**32)))


def partition_of(hash_code: Column, reduce_tasks: int) -> Column:
    """(hashCode & Integer.MAX_VALUE) % numReduceTasks: the reduce task (part file) of a key."""
    return hash_code.bitwiseAND(F.lit(2147483647)) % reduce_tasks


def build(spark: SparkSession, input_path: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — BikeUsageProfile.java
    map_output = (
        lines
        # BikeUsageProfile.java:29  String[] f = line.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # BikeUsageProfile.java:30  if (f.length < 8 || f[0].equals("ride_id")) {
        .where(~((F.size(F.col("f")) < 8) | (F.col("f")[0] == "ride_id")))
        # BikeUsageProfile.java:35  context.write(bike, ride);  (map output: key, value)
        .select(
            F.col("f")[1].alias("key"),
            F.concat(F.col("f")[5], F.lit(","), F.col("f")[6], F.lit(","), F.col("f")[2]).alias(
                "value"
            ),
        )
    )

    # Reduce side: wide — rows are shuffled so all values of a key meet (BikeUsageProfile.java:40)
    result = (
        map_output
        # BikeUsageProfile.java:50  String[] f = r.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # BikeUsageProfile.java:51  long d = Long.parseLong(f[0]);
        .withColumn("d", java_parse_long(F.col("f")[0]))
        .groupBy("key")
        .agg(
            # BikeUsageProfile.java:52  count++;
            F.count(F.lit(1)).cast("int").alias("count"),
            # BikeUsageProfile.java:53  seconds += d;
            F.sum(F.col("d")).alias("seconds"),
            # BikeUsageProfile.java:54  squares += d * d;
            F.sum(java_long_mul(F.col("d"), F.col("d"))).alias("squares"),
            # BikeUsageProfile.java:56  longRides++;
            F.count_if(F.col("d") > 3600).cast("int").alias("longRides"),
            # BikeUsageProfile.java:59  casualUse = true;
            F.bool_or(F.col("f")[1] == "casual").alias("casualUse"),
            # BikeUsageProfile.java:61  allShort &= d < 1800;
            F.bool_and(F.col("d") < 1800).alias("allShort"),
            # BikeUsageProfile.java:62  stations.add(f[2]);
            F.count_distinct(F.col("f")[2]).cast("int").alias("stations"),
        )
        # 3 writes per key: one output row for each write whose condition holds, in Java's order
        .select(
            F.explode(
                F.filter(
                    F.array(
                        # BikeUsageProfile.java:66  context.write(bike, new Text("rides=" + count + " long=" + longRides + " stations=" + stations.size()));
                        F.struct(
                            F.col("key").alias("key"),
                            F.concat(
                                F.lit("rides="),
                                F.col("count").cast("string"),
                                F.lit(" long="),
                                F.col("longRides").cast("string"),
                                F.lit(" stations="),
                                F.col("stations").cast("string"),
                            ).alias("value"),
                            F.lit(0).alias("_write"),
                        ),
                        # BikeUsageProfile.java:67  context.write(bike, new Text("mean_s=" + mean + " var=" + variance + (allShort ? " short-only" : "")));
                        F.struct(
                            F.col("key").alias("key"),
                            F.concat(
                                F.lit("mean_s="),
                                java_long_div(F.col("seconds"), F.col("count").cast("bigint")).cast(
                                    "string"
                                ),
                                F.lit(" var="),
                                java_long_sub(
                                    java_long_div(F.col("squares"), F.col("count").cast("bigint")),
                                    java_long_mul(
                                        java_long_div(
                                            F.col("seconds"), F.col("count").cast("bigint")
                                        ),
                                        java_long_div(
                                            F.col("seconds"), F.col("count").cast("bigint")
                                        ),
                                    ),
                                ).cast("string"),
                                F.when(F.col("allShort"), F.lit(" short-only")).otherwise(
                                    F.lit("")
                                ),
                            ).alias("value"),
                            F.lit(1).alias("_write"),
                        ),
                        # BikeUsageProfile.java:69  context.write(bike, new Text("casual riders"));
                        F.when(
                            F.col("casualUse"),
                            F.struct(
                                F.col("key").alias("key"),
                                F.lit("casual riders").alias("value"),
                                F.lit(2).alias("_write"),
                            ),
                        ),
                    ),
                    lambda written: written.isNotNull(),
                )
            ).alias("written"),
            partition_of(text_hash(F.col("key")), F.lit(2)).alias("_partition"),
        )
        .select("written.key", "written.value", "_partition", "written._write")
    )
    return result


def write_text_output(
    result: DataFrame, output_path: str, *, dry_run: bool = False, task_files: bool = False
) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    if task_files:
        # One file per original reduce task, like Hadoop's part-r-00000 to part-r-00001: each row
        # goes to the file of its `_partition`, and each file is sorted as that task sorted it.
        by_task = (
            result.rdd.keyBy(lambda row: row["_partition"])
            .partitionBy(2, lambda task: task)
            .values()
        )
        rows = result.sparkSession.createDataFrame(by_task, result.schema).sortWithinPartitions(
            "key", "_write"
        )
    else:
        # The 2 part files one after another, in one file (wide: one shuffle into one partition).
        rows = result.repartition(1).sortWithinPartitions("_partition", "key", "_write")
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
        description="Run bike usage profile on Spark (converted by mrlift)."
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
        "--task-files",
        action="store_true",
        help="write one file per original reduce task (2), as Hadoop did, instead of one file",
    )
    parser.add_argument(
        "--dry-run", action="store_true", help="run the whole job but write nothing"
    )
    parser.add_argument(
        "--explain", action="store_true", help="print Spark's physical plan and exit"
    )
    args = parser.parse_args(argv)
    spark = (
        SparkSession.builder.appName("bike usage profile (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run, task_files=args.task_files)
    return 0


if __name__ == "__main__":
    sys.exit(main())
