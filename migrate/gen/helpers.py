"""Column helpers with Java semantics, copied into a generated script only when it uses them.

Each one is plain Column code (no Python UDF). Their behaviour is checked against the
real JVM in tests/semantics (values from ../shared/SEMANTICS.md, re-run here).
"""
from __future__ import annotations

HELPERS: dict[str, tuple[tuple[str, ...], str]] = {}


def _h(name: str, source: str, needs: tuple[str, ...] = ()) -> None:
    HELPERS[name] = (needs, source.strip("\n") + "\n")


_h("java_split", '''
def java_split(s: Column, regex: str) -> Column:
    """String.split(regex): Java drops trailing empty strings; F.split alone keeps them."""
    parts = F.split(s, regex, -1)
    last = F.array_max(F.transform(parts, lambda x, i: F.when(x != "", i + 1).otherwise(0)))
    return F.when(F.size(parts) == 1, parts).otherwise(F.slice(parts, 1, F.coalesce(last, F.lit(0))))
''')

_h("java_tokens", '''
TOKENIZER_DELIMITERS = "[ \\\\t\\\\n\\\\r\\\\f]+"  # java.util.StringTokenizer's default delimiters


def java_tokens(s: Column, delimiters: str = TOKENIZER_DELIMITERS) -> Column:
    """StringTokenizer: the non-empty runs between delimiter characters (no empty tokens)."""
    return F.filter(F.split(s, delimiters, -1), lambda t: t != "")
''')

_h("java_trim", '''
def java_trim(s: Column) -> Column:
    """String.trim(): strips every char <= U+0020 at both ends (F.trim strips only spaces)."""
    return F.regexp_replace(s, r"^[\\x00-\\x20]+|[\\x00-\\x20]+$", "")
''')

_h("fail_where_java_throws", '''
def fail_where_java_throws(value: Column, source: Column, exception: str) -> Column:
    """Fail the job where Java would have thrown (an uncaught exception fails the Hadoop task)."""
    message = F.concat(F.lit(exception + ': For input string: "'), source, F.lit('"'))
    return F.when(value.isNotNull(), value).otherwise(F.raise_error(message))
''')

_h("java_parse_int", '''
JAVA_INT = r"^[+-]?[0-9]+\\z"  # Integer.parseInt / Long.parseLong grammar (ASCII digits, no spaces)


def java_parse_int(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Integer.parseInt: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_INT), s.try_cast("int"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")
''', ("fail_where_java_throws",))

_h("java_parse_long", '''
def java_parse_long(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Long.parseLong: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_INT), s.try_cast("bigint"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")
''', ("java_parse_int", "fail_where_java_throws"))

_h("java_parse_double", '''
JAVA_DOUBLE = (
    r"^[\\x00-\\x20]*[+-]?(NaN|Infinity|((([0-9]+\\.?[0-9]*|\\.[0-9]+)([eE][+-]?[0-9]+)?)"
    r"|(0[xX]([0-9a-fA-F]+\\.?[0-9a-fA-F]*|\\.[0-9a-fA-F]+)[pP][+-]?[0-9]+))[fFdD]?)[\\x00-\\x20]*\\z"
)  # Double.parseDouble grammar


def java_parse_double(s: Column, *, skip_bad_record: bool = False) -> Column:
    """Double.parseDouble: NULL (record skipped) or a failed job exactly where Java throws."""
    value = F.when(s.rlike(JAVA_DOUBLE), s.try_cast("double"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")
''', ("fail_where_java_throws",))

_h("wrap_int", '''
def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around; Spark's sum widens to bigint instead."""
    return (F.pmod(c.cast("bigint") + 2147483648, F.lit(4294967296)) - 2147483648).cast("int")
''')

_h("java_int_div", '''
def java_int_div(a: Column, b: Column, java_type: str = "bigint") -> Column:
    """Java integer division truncates toward zero (Spark's `/` gives a double)."""
    return F.call_function("div", a, b).cast(java_type)
''')

_h("java_div_double", '''
def java_div_double(a: Column, b: Column) -> Column:
    """Java double division: x / 0.0 is +-Infinity or NaN, where ANSI Spark raises an error."""
    negative_zero = b.cast("string") == "-0.0"
    return F.when(
        b == 0,
        F.when(F.isnan(a) | (a == 0), F.lit(float("nan")))
        .when((a > 0) != negative_zero, F.lit(float("inf")))
        .otherwise(F.lit(float("-inf"))),
    ).otherwise(a / b)
''')

_h("java_length", '''
def java_length(s: Column) -> Column:
    """String.length() counts UTF-16 code units (F.length counts code points)."""
    return (F.octet_length(F.encode(s, "UTF-16BE")) / 2).cast("int")
''')

_h("java_abs", '''
def java_abs(c: Column, minimum: int) -> Column:
    """Math.abs: the type's MIN_VALUE stays negative in Java; Spark's abs raises an overflow."""
    return F.when(c == F.lit(minimum), c).otherwise(F.abs(c))
''')

_h("drop_first_line_per_file", '''
def drop_first_line_per_file(lines: DataFrame) -> DataFrame:
    """`if (key.get() == 0) return;`: drop the line at byte offset 0 of every input file."""
    tagged = lines.select(
        "value",
        F.col("_metadata.file_path").alias("_file"),
        F.col("_metadata.file_block_start").alias("_block_start"),
        F.monotonically_increasing_id().alias("_row"),
    )
    first = F.min("_row").over(Window.partitionBy("_file", "_block_start"))
    return (
        tagged.withColumn("_first", first)
        .where(~((F.col("_block_start") == 0) & (F.col("_row") == F.col("_first"))))
        .select("value")
    )
''')


def helper_source(names: set[str]) -> str:
    """Source of the named helpers and their dependencies, in a stable order."""
    wanted: list[str] = []

    def visit(n: str) -> None:
        for dep in HELPERS[n][0]:
            visit(dep)
        if n not in wanted:
            wanted.append(n)

    for n in sorted(names):
        visit(n)
    order = list(HELPERS)
    return "\n\n".join(HELPERS[n][1] for n in sorted(wanted, key=order.index))
