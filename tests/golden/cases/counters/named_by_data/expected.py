"""FerryBoardingAudit: ferry boarding audit

PySpark DataFrame version of the Hadoop MapReduce job "ferry boarding audit", written by mrlift.

Original classes:
    driver       net.saltmarshferries.audit.FerryBoardingAudit  (FerryBoardingAudit.java:19-49)
    mapper       net.saltmarshferries.audit.FerryBoardingAudit.BoardingMapper  (FerryBoardingAudit.java:21-36)
    reducer      org.apache.hadoop.mapreduce.lib.reduce.LongSumReducer  (ships with Hadoop)

What it computes: per key: sum of the mapper's values, sorted by key. Shapes: filter, parse and
emit, sum per key.
Status: converted.

Usage (the same positional arguments as the original driver):
    spark-submit ferry_boarding_audit.py <input_path> <output_path>

Semantics kept from Java/Hadoop: see the helper docstrings. Java int/long overflow in
row arithmetic raises an error here (ANSI mode) instead of wrapping silently.
Note: FerryBoardingAudit.java:29 toLowerCase() uses the JVM's default locale; the script assumes it was not Turkish or Azeri (where I/i map differently)

Findings (the original does this and so does this script; decide whether to keep it):
    FerryBoardingAudit.java:30  [counter-names-from-data]
        the counter's name comes from the data: Hadoop fails the job once it has more than 120
        counters (mapreduce.job.counters.max, its own counters included) and cuts names over 64
        chars to 63; the script cuts names the same way, counts every name in a second pass over
        the input and warns past 120 names instead of failing
    FerryBoardingAudit.java:31  [counter-names-from-data]
        the counter's name comes from the data: Hadoop fails the job once it has more than 120
        counters (mapreduce.job.counters.max, its own counters included) and cuts names over 64
        chars to 63; the script cuts names the same way, counts every name in a second pass over
        the input and warns past 120 names instead of failing

Verify this script on real data before it replaces the production job: compare its
output with the original job's output on a representative sample of real data.
"""

from __future__ import annotations

import argparse
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


def _cut(name: str, limit: int) -> str:
    """Hadoop's Limits.filterName: a name longer than `limit` UTF-16 units keeps its first limit - 1."""
    units = name.encode("utf-16-be", "surrogatepass")
    if len(units) <= 2 * limit:
        return name
    return units[: 2 * (limit - 1)].decode("utf-16-be", "replace")


class CountersByName(HadoopCounters):
    """Hadoop counters, some named by the data: one counter per (group, name) value. observe()
    cannot group by a value, so those are counted in a second pass, before the output is written."""

    def __init__(self) -> None:
        super().__init__()
        self._named: list[DataFrame] = []  # (group, name, value) rows
        self._named_totals: dict[tuple[str, str], int] | None = None

    def add_named(
        self, group: str | Column, name: str | Column, rows: Column | None = None, amount=1
    ):
        """A DataFrame.transform step adding `amount` to the counter each row names, where `rows` holds."""
        group, name, value = (
            x if isinstance(x, Column) else F.lit(x) for x in (group, name, amount)
        )

        def step(df: DataFrame) -> DataFrame:
            kept = df if rows is None else df.where(rows)
            self._named.append(
                kept.select(group.alias("group"), name.alias("name"), value.alias("value"))
            )
            return df

        return step

    def count_named(self) -> dict[tuple[str, str], int]:
        """The counters named by the data, cut to Hadoop's name limits (the second pass; run once)."""
        if self._named_totals is None:
            totals: dict[tuple[str, str], int] = {}
            for counted in self._named:
                for row in (
                    counted.groupBy("group", "name").agg(F.sum("value").alias("value")).collect()
                ):
                    if row["group"] is None or row["name"] is None:
                        raise RuntimeError(
                            "NullPointerException: a counter's group or name is null"
                        )
                    key = (_cut(row["group"], 128), _cut(row["name"], 64))
                    totals[key] = totals.get(key, 0) + int(row["value"])
            self._named_totals = totals
        return self._named_totals

    def totals(self) -> dict[tuple[str, str], int]:
        out = super().totals()
        for key, value in self.count_named().items():
            out[key] = out.get(key, 0) + value
        return out

    def report(self, stream=None) -> None:
        stream = stream or sys.stderr
        if len(self.totals()) > 120:  # mapreduce.job.counters.max (Hadoop's own counters count too)
            print(
                f"WARNING: {len(self.totals())} counters; Hadoop fails a job with more than 120",
                file=stream,
            )
        super().report(stream)


def build(
    spark: SparkSession, input_path: str, counters: HadoopCounters | None = None
) -> DataFrame:
    """The job's output rows as columns `key` and `value`, before the text layout."""
    counters = counters if counters is not None else CountersByName()
    # TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)
    lines = spark.read.text(input_path)

    # Map side: narrow, row by row (no shuffle) — FerryBoardingAudit.java
    map_output = (
        lines
        # FerryBoardingAudit.java:24  String[] f = value.toString().split("\\|");
        .withColumn("f", java_split(F.col("value"), "\\|"))
        # FerryBoardingAudit.java:26  context.getCounter("audit", "malformed").increment(1);  (counted in the same pass)
        .transform(counters.add("audit", "malformed", F.size(F.col("f")) != 4))
        # FerryBoardingAudit.java:25  if (f.length != 4) {
        .where(F.size(F.col("f")) == 4)
        # FerryBoardingAudit.java:29  String status = f[3].trim().toLowerCase();
        .withColumn("status", F.lower(java_trim(F.col("f")[3])))
        # FerryBoardingAudit.java:30  context.getCounter("ticket status", status).increment(1);  (a counter per name the data gives: counted in a second pass over the input)
        .transform(counters.add_named("ticket status", F.col("status"), None))
        # FerryBoardingAudit.java:31  context.getCounter("gate " + f[1], "passengers").increment(Long.parseLong(f[2]));  (a counter per name the data gives: counted in a second pass over the input)
        .transform(
            counters.add_named(
                F.concat(F.lit("gate "), F.col("f")[1]),
                "passengers",
                None,
                java_parse_long(F.col("f")[2]),
            )
        )
        # FerryBoardingAudit.java:33  context.write(new Text(f[0]), new LongWritable(Long.parseLong(f[2])));  (map output: key, value)
        .where(~(F.col("status") == "void")).select(
            F.col("f")[0].alias("key"), java_parse_long(F.col("f")[2]).alias("value")
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
        description="Run ferry boarding audit on Spark (converted by mrlift)."
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
        SparkSession.builder.appName("ferry boarding audit (mrlift)")
        .config("spark.sql.ansi.enabled", "true")  # errors where Java throws, never silent NULLs
        .getOrCreate()
    )
    counters = CountersByName()
    result = build(spark, args.input_path, counters=counters)
    if args.explain:
        result.explain(mode="formatted")
        return 0
    counters.count_named()  # before the output is written: a record that fails a counter fails the job first
    write_text_output(result, args.output_path, dry_run=args.dry_run)
    counters.report()  # the same counters the Hadoop job printed, on stderr
    return 0


if __name__ == "__main__":
    sys.exit(main())
