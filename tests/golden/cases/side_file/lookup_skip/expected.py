"""ZoneOfDock: zone of dock

PySpark DataFrame version of the Hadoop MapReduce job "zone of dock", written by mrlift.

Original classes:
    driver       net.quillfield.docks.ZoneOfDock  (ZoneOfDock.java:19-56)
    mapper       net.quillfield.docks.ZoneOfDock.ZoneMapper  (ZoneOfDock.java:20-43)

What it computes: a map-only job: each input line becomes zero or more output lines. Shapes: map
only, map-side join (zones: HashMap), filter, parse and emit.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit zone_of_dock.py <input_path> <output_path> <zones_file>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: ZoneOfDock.java:25 the side file is decoded with the JVM's default charset; the script reads it as UTF-8 (the same for ASCII files)
Note: ZoneOfDock.java:41 toLowerCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)

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


def build(spark: SparkSession, input_path: str, zones_file: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    # Side file `zones_file`: setup() reads it whole into the HashMap `zones` (ZoneOfDock.java:27).
    # Every map task has the whole table: here it is a small DataFrame joined with F.broadcast.
    zones = (
        spark.read.text(zones_file)
        # the line's place in the file: where a key comes again, the last put wins
        .withColumn("_line", F.monotonically_increasing_id())
        # ZoneOfDock.java:28  String[] kv = line.split(",", 2);
        .withColumn("kv", F.split(F.col("value"), ",", 2))
        # ZoneOfDock.java:29  zones.put(kv[0], kv[1]);
        .select(F.col("kv")[0].alias("key"), F.col("kv")[1].alias("value"), "_line")
        .groupBy("key")
        .agg(F.max_by("value", "_line").alias("value"))  # HashMap.put replaces: the last line wins
    )
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — ZoneOfDock.java
    map_output = (
        lines
        # ZoneOfDock.java:36  String[] f = value.toString().split("\t");
        .withColumn("f", java_split(F.col("value"), "\t"))
        # ZoneOfDock.java:37  String zone = zones.get(f[0]);
        # a lookup in `zones` (left join: NULL where the key is missing)
        .withColumn("_zone_key", F.col("f")[0])
        .join(
            F.broadcast(
                zones.select(F.col("key").alias("_zone_key"), F.col("value").alias("zone"))
            ),
            "_zone_key",
            "left",
        )
        .drop("_zone_key")
        # ZoneOfDock.java:38  if (zone == null) {
        .where(F.col("zone").isNotNull())
        # ZoneOfDock.java:41  context.write(new Text(zone), new Text(f[0] + ":" + zone.toLowerCase()));  (map output: key, value)
        .select(
            F.col("zone").alias("key"),
            F.concat(F.col("f")[0], F.lit(":"), F.lower(F.col("zone"))).alias("value"),
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
    parser = argparse.ArgumentParser(description="Run zone of dock on Spark (converted by mrlift).")
    parser.add_argument("input_path", help="input path (args[0] of the original driver)")
    parser.add_argument("output_path", help="output folder (args[1] of the original driver)")
    parser.add_argument(
        "zones_file", help="side file read into zones in setup() (args[2] of the original driver)"
    )
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
        SparkSession.builder.appName("zone of dock (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path, args.zones_file)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
