"""PlanOfRide: plan of ride

PySpark DataFrame version of the Hadoop MapReduce job "plan of ride", written by mrlift.

Original classes:
    driver       demo.join.PlanOfRide  (PlanOfRide.java:19-62)
    mapper 1     demo.join.PlanOfRide.MemberMapper  (PlanOfRide.java:20-25)
    mapper 2     demo.join.PlanOfRide.RideMapper  (PlanOfRide.java:27-32)
    reducer      demo.join.PlanOfRide.PlanJoin  (PlanOfRide.java:34-50)

What it computes: a reduce-side join (lookup with a default: left outer) of the inputs' values,
told apart by their tags (plan, rides), written per key, sorted by key. Shapes: 2 inputs, one
mapper each, reduce-side join (lookup with a default: left outer).
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit plan_of_ride.py <input_path_1> <input_path_2> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: a join writes the combinations of one key's values in the order they reached reduce(), which Hadoop does not define: the lines of one key may come in another order here

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


def build(spark: SparkSession, input_path_1: str, input_path_2: str) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""

    # Input 1 of 2 (MultipleInputs), mapped by MemberMapper
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines_1 = spark.read.text(input_path_1)

    # Map side: narrow, row by row (no shuffle) — PlanOfRide.java
    map_output_1 = (
        lines_1
        # PlanOfRide.java:22  String[] f = line.toString().split("\\|");
        .withColumn("f", java_split(F.col("value"), "\\|"))
        # PlanOfRide.java:23  ctx.write(new Text(f[0]), new Text("M\t" + f[3]));  (map output: key, value)
        .select(F.col("f")[0].alias("key"), F.concat(F.lit("M\t"), F.col("f")[3]).alias("value"))
    )

    # Input 2 of 2 (MultipleInputs), mapped by RideMapper
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines_2 = spark.read.text(input_path_2)

    # Map side: narrow, row by row (no shuffle) — PlanOfRide.java
    map_output_2 = (
        lines_2
        # PlanOfRide.java:29  String[] f = line.toString().split(",");
        .withColumn("f", java_split(F.col("value"), ","))
        # PlanOfRide.java:30  ctx.write(new Text(f[1]), new Text("R\t" + f[0]));  (map output: key, value)
        .select(F.col("f")[1].alias("key"), F.concat(F.lit("R\t"), F.col("f")[0]).alias("value"))
    )

    # The shuffle meets the map output of every input: one DataFrame of (key, value)
    map_output = map_output_1.unionByName(map_output_2)

    # Reduce side: a join by key (PlanOfRide.java:35). Each value joins the side its tag picks;
    # each write below runs once per combination of the lists it loops over, as in Java.
    values = (
        map_output
        # PlanOfRide.java:39  String[] p = v.toString().split("\t", 2);
        .withColumn("p", F.split(F.col("value"), "\t", 2))
    )
    keys = values.groupBy("key").agg(
        # PlanOfRide.java:41  plan = p[1];  (one value per key)
        F.coalesce(
            F.when(
                F.count_distinct(F.when(F.col("p")[0] == "M", F.col("p")[1])) > 1,
                F.raise_error(
                    F.lit(
                        "PlanOfRide.java:41: more than one value for `plan` under one key; Java keeps the last one, and Hadoop does not define which that is"
                    )
                ),
            ).otherwise(F.max(F.when(F.col("p")[0] == "M", F.col("p")[1]))),
            F.lit("none"),
        ).alias("plan"),
    )
    rides = values.where(F.col("p")[0] != "M").select(
        "key", F.col("p")[1].alias("rides")
    )  # PlanOfRide.java:43
    write_1 = (
        keys
        # PlanOfRide.java:47  ctx.write(new Text(ride), new Text(member + "\t" + plan));
        .join(rides, "key").select(  # for each element of `rides`
            F.col("rides").alias("key"),
            F.concat(F.col("key"), F.lit("\t"), F.col("plan")).alias("value"),
            F.col("key").alias("_sort_key"),
            F.lit(0).alias("_write"),
        )
    )
    return write_1


def write_text_output(result: DataFrame, output_path: str, *, dry_run: bool = False) -> None:
    """Lay rows out as Hadoop's TextOutputFormat: key, TAB, value as Java's toString prints them.

    A NULL side (NullWritable) is left out together with its separator.
    """
    # One reducer wrote one file sorted by key: the same here (wide: one shuffle into one partition).
    rows = result.repartition(1).sortWithinPartitions("_sort_key", "_write")
    lines = rows.where(F.col("key").isNotNull() | F.col("value").isNotNull()).select(
        F.concat_ws("\t", F.col("key").cast("string"), F.col("value").cast("string")).alias("value")
    )
    if dry_run:
        lines.write.format("noop").mode("overwrite").save()  # run everything, write nothing
        return
    # Like Hadoop: refuse to write into an existing output folder.
    lines.write.mode("errorifexists").text(output_path)


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description="Run plan of ride on Spark (converted by mrlift).")
    parser.add_argument("input_path_1", help="input path (args[0] of the original driver)")
    parser.add_argument("input_path_2", help="input path (args[1] of the original driver)")
    parser.add_argument("output_path", help="output folder (args[2] of the original driver)")
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
        SparkSession.builder.appName("plan of ride (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    result = build(spark, args.input_path_1, args.input_path_2)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    return 0


if __name__ == "__main__":
    sys.exit(main())
