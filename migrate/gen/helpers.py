"""Column helpers with Java semantics, copied into a generated script only when it uses them.

Each one is plain Column code (no Python UDF). Their behaviour is checked against the
real JVM in tests/semantics (values from ../shared/SEMANTICS.md, re-run here).
"""
from __future__ import annotations

import inspect

from migrate.java.literals import argument_equals_ignore_case, argument_test, same_driver_branch

HELPERS: dict[str, tuple[tuple[str, ...], str]] = {}


def _h(name: str, source: str, needs: tuple[str, ...] = ()) -> None:
    assert name not in HELPERS, f"helper {name} is defined twice"
    HELPERS[name] = (needs, source.strip("\n") + "\n")


_h("drop_trailing_empty", '''
def drop_trailing_empty(parts: Column) -> Column:
    """The array without its trailing empty strings (all of them where every one is empty)."""
    last = F.array_max(F.transform(parts, lambda x, i: F.when(x != "", i + 1).otherwise(0)))
    return F.slice(parts, 1, F.coalesce(last, F.lit(0)))
''')

_h("java_split", '''
def java_split(s: Column, regex: str) -> Column:
    """String.split(regex): Java drops trailing empty strings (F.split alone keeps them), except
    where the regex matched nothing: then the one piece is the whole string, "" included."""
    parts = F.split(s, regex, -1)
    return F.when(F.size(parts) == 1, parts).otherwise(drop_trailing_empty(parts))
''', ("drop_trailing_empty",))

_h("hadoop_split", r'''
def hadoop_split(s: Column, escape: str = "\\", separator: str = ",") -> Column:
    """Hadoop's StringUtils.split: a separator after an odd number of escape chars belongs to the
    field (escapes kept); trailing empty fields are dropped, so "" gives no field at all."""
    e, sep = (c if c.isalnum() else "\\" + c for c in (escape, separator))  # a backslash quotes a non-letter
    fields = F.regexp_extract_all(s, F.lit(f"((?:[^{e}{sep}]|{e}[\\s\\S]?)*)(?:{sep}|\\z)"), 1)
    return drop_trailing_empty(fields)
''', ("drop_trailing_empty",))

_h("until_break", '''
def until_break(items: Column, breaks) -> Column:
    """The elements a Java loop visits when it may `break`: up to and including the first element
    for which `breaks` holds. `breaks` is not tested on the elements after that one (F.when tests
    only the branch it takes), as Java never reaches them."""
    seen = F.aggregate(items, F.lit(0), lambda n, x: F.when(n < 0, n).when(breaks(x), -(n + 1)).otherwise(n + 1))
    return F.slice(items, 1, F.when(seen < 0, -seen).otherwise(F.size(items)))
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

_h("last_value_assigned", '''
def last_value_assigned(value: Column, where: str) -> Column:
    """The aggregate for `x = f(value)` in a loop over a key's values: Java keeps the last value,
    and Hadoop gives the values in no defined order, so the answer is defined only where every
    value agrees. Stop the job where a key's values differ."""
    differ = F.lit(f"{where}: takes different values under one key; Java keeps the last one, and Hadoop "
                   "does not define which that is")
    return F.when(F.count_distinct(value) > 1, F.raise_error(differ)).otherwise(F.max(value))
''')

_h("wrap_int", '''
def wrap_int(c: Column) -> Column:
    """Java int overflow wraps around (keeps the low 32 bits); Spark widens or raises instead."""
    low = c.cast("bigint").bitwiseAND(F.lit(4294967295))
    return F.when(low >= 2147483648, low - 4294967296).otherwise(low).cast("int")
''')

_h("java_int_arith", '''
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
''', ("wrap_int",))

_h("java_long_arith", '''
def java_long_add(a, b) -> Column:
    """long + long with Java's wrap-around (computed exactly in DECIMAL, then wrapped)."""
    return wrap_long(_col(a).cast("decimal(20,0)") + _col(b))


def java_long_sub(a, b) -> Column:
    """long - long with Java's wrap-around."""
    return wrap_long(_col(a).cast("decimal(20,0)") - _col(b))


def java_long_mul(a, b) -> Column:
    """long * long with Java's wrap-around."""
    return wrap_long(_col(a).cast("decimal(20,0)") * _col(b))
''', ("wrap_long", "java_int_arith"))

_h("java_int_div", '''
def java_int_div(a, b) -> Column:
    """Java int division truncates toward zero (Spark's `/` gives a double); MIN_VALUE / -1 wraps."""
    return wrap_int(F.call_function("div", _col(a), _col(b)))
''', ("wrap_int", "java_int_arith"))

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

_h("text_lines_with_offsets", '''
def text_lines_with_offsets(spark, paths, *, file_name: bool = False, keep_file: bool = False) -> DataFrame:
    """TextInputFormat's records with their keys: `byte_offset` = the byte offset of the line in its file,
    `value` = the line. As Hadoop's LineRecordReader: a line ends at LF, CR or CRLF, an empty file
    has no records, a UTF-8 byte order mark is left out of the first line (its bytes still count).
    Each file is read whole (one row per file), so a file must fit in a task's memory; compressed
    files are refused (Hadoop counts offsets in the decompressed stream). `keep_file`: also the
    file's path (`_task`) and length in bytes (`_file_length`)."""
    files = spark.read.format("binaryFile").load(paths)
    compressed = F.col("path").rlike(r"\\.(gz|bz2|deflate|lz4|snappy|zst)$")
    latin = F.decode(F.col("content"), "ISO-8859-1")  # one char per byte: char positions are byte offsets
    chunks = F.when(~compressed, F.regexp_extract_all(latin, F.lit(r"[^\\r\\n]*(?:\\r\\n|\\r|\\n)|[^\\r\\n]+\\z"), 0)) \\
        .otherwise(F.raise_error(F.lit("byte offsets of a compressed file are not read: decompress it first")))
    rows = files.select("path", "length", F.posexplode(chunks).alias("_pos", "_chunk"))
    before = Window.partitionBy("path").orderBy("_pos").rowsBetween(Window.unboundedPreceding, -1)
    line = F.regexp_replace("_chunk", r"(?:\\r\\n|\\r|\\n)\\z", "")
    line = F.when(F.col("_pos") == 0, F.regexp_replace(line, "^\\u00ef\\u00bb\\u00bf", "")).otherwise(line)
    out = rows.select(
        "path",
        F.col("path").alias("_task"),
        F.col("length").alias("_file_length"),
        F.coalesce(F.sum(F.length("_chunk")).over(before), F.lit(0)).cast("long").alias("byte_offset"),
        F.encode(line, "ISO-8859-1").cast("string").alias("value"),  # the line's own bytes, as Text holds them
    )
    if file_name:
        out = out.withColumn("input_file_name", F.url_decode(F.element_at(F.split("path", "/"), -1)))
    return out.drop("path") if keep_file else out.drop("path", "_task", "_file_length")
''')

_h("lines_by_map_task", '''
def lines_by_map_task(spark, paths, split_size: Column, *, file_name: bool = False) -> DataFrame:
    """TextInputFormat's lines with the map task that reads them: `_task` (the file) and `_line` (the
    line's byte offset: its order in the task). Hadoop makes one split of a file up to 1.1 times
    the split size (FileInputFormat's SPLIT_SLOP) and cuts a longer one into several tasks, whose
    state the script does not reproduce: such a file stops the job."""
    lines = text_lines_with_offsets(spark, paths, file_name=file_name, keep_file=True)
    split = F.col("_file_length") / split_size > 1.1
    cut = F.concat(F.lit("a file Hadoop would read in several map tasks (the script reproduces one task per "
                         "file): "), F.col("_task"))
    return lines.withColumn("_line", F.when(split, F.raise_error(cut)).otherwise(F.col("byte_offset"))).drop(
        "_file_length")
''', ("text_lines_with_offsets",))

_h("one_map_task", '''
def one_map_task(lines: DataFrame, split_size: Column) -> DataFrame:
    """The lines one file holds, in its order (they arrive in one partition, sorted), as the one map
    task Hadoop reads it with: `_task` and `_line`. A file longer than 1.1 times the split size would
    be cut into several tasks (FileInputFormat's SPLIT_SLOP): the job stops instead."""
    ordered = lines.select("*", F.lit(0).alias("_task"), F.monotonically_increasing_id().alias("_line"))
    size = F.sum(F.octet_length("value") + 1).over(Window.partitionBy("_task"))  # TextOutputFormat's bytes
    cut = F.lit("the folder the job before wrote is long enough for Hadoop to read it in several map tasks; "
                "the script reproduces one")
    return ordered.withColumn("_line", F.when(size / split_size > 1.1, F.raise_error(cut)).otherwise(F.col("_line")))
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
        "*",
        F.col("_metadata.file_path").alias("_file"),
        F.col("_metadata.file_block_start").alias("_block_start"),
        F.monotonically_increasing_id().alias("_row"),
    )
    first = F.min("_row").over(Window.partitionBy("_file", "_block_start"))
    return (
        tagged.withColumn("_first", first)
        .where(~((F.col("_block_start") == 0) & (F.col("_row") == F.col("_first"))))
        .drop("_file", "_block_start", "_row", "_first")
    )
''')


_h("java_strip", """
def java_strip(s: Column, *, leading: bool = True, trailing: bool = True) -> Column:
    \"\"\"String.strip(): removes Character.isWhitespace chars (Java regex class \\\\p{javaWhitespace}).\"\"\"
    parts = ([r"^\\p{javaWhitespace}+"] if leading else []) + ([r"\\p{javaWhitespace}+$"] if trailing else [])
    return F.regexp_replace(s, "|".join(parts), "")
""")

_h("java_substring", """
def java_substring(s: Column, begin: Column, end: Column | None = None, *, skip_bad_record: bool = False) -> Column:
    \"\"\"String.substring(begin[, end]) on UTF-16 indexes; out of range throws StringIndexOutOfBoundsException.\"\"\"
    n = java_length(s)
    stop = n if end is None else end
    ok = (begin >= 0) & (stop <= n) & (begin <= stop)
    units = F.encode(s, "UTF-16BE")  # Java indexes UTF-16 code units, Spark counts code points
    value = F.decode(F.substr(units, begin * 2 + 1, (stop - begin) * 2), "UTF-16BE")
    if skip_bad_record:
        return F.when(ok, value)
    return F.when(ok, value).otherwise(F.raise_error(F.lit("StringIndexOutOfBoundsException in substring")))
""", ("java_length",))

_h("java_chars", """
def java_chars(s: Column) -> Column:
    \"\"\"String.toCharArray(): one string per UTF-16 code unit, in order (empty for ""). Half of a
    surrogate pair (a character beyond U+FFFF) is no string Spark can hold: the job fails there.\"\"\"
    n = java_length(s)
    units = F.transform(F.sequence(F.lit(0), F.greatest(n - 1, F.lit(0))), lambda i: java_substring(s, i, i + 1))
    whole = F.octet_length(F.encode(s, "UTF-16BE")) == F.length(s) * 2  # no surrogate pairs
    chars = F.when(whole, units).otherwise(
        F.raise_error(F.lit("a character beyond U+FFFF: Java's chars split it into halves no Spark string holds")))
    return F.when(n > 0, chars).otherwise(F.array().cast("array<string>"))
""", ("java_length", "java_substring"))

_h("java_index_of", """
def java_index_of(s: Column, t: Column) -> Column:
    \"\"\"String.indexOf(str): UTF-16 index of the first occurrence, -1 if absent.\"\"\"
    before = F.call_function("substring_index", s, t, F.lit(1))
    return F.when(F.instr(s, t) == 0, F.lit(-1)).otherwise(java_length(before))
""", ("java_length",))

_h("java_last_index_of", """
def java_last_index_of(s: Column, t: Column) -> Column:
    \"\"\"String.lastIndexOf(str): UTF-16 index of the last occurrence, -1 if absent.\"\"\"
    after = F.call_function("substring_index", s, t, F.lit(-1))
    return F.when(F.instr(s, t) == 0, F.lit(-1)).otherwise(java_length(s) - java_length(after) - java_length(t))
""", ("java_length",))

_h("java_equals_ignore_case", """
def java_equals_ignore_case(a: Column, b: Column) -> Column:
    \"\"\"String.equalsIgnoreCase: same length and each char equal after upper- or lower-casing.\"\"\"
    def char(c: Column, i: Column) -> Column:
        return F.substr(c, i, F.lit(1))

    return (F.length(a) == F.length(b)) & F.forall(
        F.sequence(F.lit(1), F.length(a)),
        lambda i: (F.upper(char(a, i)) == F.upper(char(b, i))) | (F.lower(char(a, i)) == F.lower(char(b, i))),
    )
""")

_h("java_round", """
def java_round(x: Column) -> Column:
    \"\"\"Math.round(double) -> long: floor(x + 0.5) without its rounding error; NaN -> 0; clamps to long.\"\"\"
    fl = F.floor(x)
    return (
        F.when(F.isnan(x), F.lit(0).cast("bigint"))
        .when(x >= F.lit(9.223372036854775807e18), F.lit(9223372036854775807))
        .when(x <= F.lit(-9.223372036854775808e18), F.lit(-9223372036854775808))
        .otherwise(fl + F.when(x - fl >= 0.5, 1).otherwise(0))
    )
""")

_h("java_floor", """
def java_floor(x: Column) -> Column:
    \"\"\"Math.floor(double) -> double (keeps NaN, infinities, huge values and signed zero).\"\"\"
    keep = F.isnan(x) | (F.abs(x) >= F.lit(4503599627370496.0)) | (x == 0)
    return F.when(keep, x).otherwise(F.floor(x).cast("double"))
""")

_h("java_ceil", """
def java_ceil(x: Column) -> Column:
    \"\"\"Math.ceil(double) -> double; the ceiling of a value in (-1, 0) is -0.0.\"\"\"
    keep = F.isnan(x) | (F.abs(x) >= F.lit(4503599627370496.0)) | (x == 0)
    return F.when(keep, x).when((x > -1) & (x < 0), F.lit(-0.0)).otherwise(F.ceil(x).cast("double"))
""")

_h("java_max_min", """
def java_max(a: Column, b: Column) -> Column:
    \"\"\"Math.max(double, double): NaN if either is NaN; 0.0 is greater than -0.0.\"\"\"
    # for two zeros IEEE addition gives the answer (-0.0 only if both are -0.0); a CASE on -0.0 and
    # 0.0 literals would be folded away by Spark, which holds them equal
    return F.when(F.isnan(a) | F.isnan(b), F.lit(float("nan"))).when((a == 0) & (b == 0), a + b).otherwise(
        F.greatest(a, b)
    )


def java_min(a: Column, b: Column) -> Column:
    \"\"\"Math.min(double, double): NaN if either is NaN; -0.0 is less than 0.0.\"\"\"
    return F.when(F.isnan(a) | F.isnan(b), F.lit(float("nan"))).when((a == 0) & (b == 0), -(-a - b)).otherwise(
        F.least(a, b)
    )
""")

_h("java_double_to_integral", """
def java_double_to_int(x: Column) -> Column:
    \"\"\"(int) of a double: truncates toward zero, NaN -> 0, saturates at the int range (JLS 5.1.3).\"\"\"
    return (
        F.when(F.isnan(x), F.lit(0))
        .when(x >= F.lit(2147483647.0), F.lit(2147483647))
        .when(x <= F.lit(-2147483648.0), F.lit(-2147483648))
        .otherwise(x.cast("int"))
    )


def java_double_to_long(x: Column) -> Column:
    \"\"\"(long) of a double: truncates toward zero, NaN -> 0, saturates at the long range (JLS 5.1.3).\"\"\"
    return (
        F.when(F.isnan(x), F.lit(0).cast("bigint"))
        .when(x >= F.lit(9.223372036854775807e18), F.lit(9223372036854775807))
        .when(x <= F.lit(-9.223372036854775808e18), F.lit(-9223372036854775808))
        .otherwise(x.cast("bigint"))
    )
""")

_h("wrap_long", """
def wrap_long(c: Column) -> Column:
    \"\"\"Java long overflow wraps around; c is an exact integral value (DECIMAL(38,0)).\"\"\"
    offset = F.lit("9223372036854775808").cast("decimal(38,0)")
    modulus = F.lit("18446744073709551616").cast("decimal(38,0)")
    return (F.pmod(c.cast("decimal(38,0)") + offset, modulus) - offset).cast("bigint")
""")

_h("java_long_div", """
def java_long_div(a, b) -> Column:
    \"\"\"Java long division: truncates toward zero; Long.MIN_VALUE / -1 wraps to Long.MIN_VALUE.\"\"\"
    a, b = _col(a), _col(b)
    return F.when(b == -1, wrap_long(-a.cast("decimal(20,0)"))).otherwise(F.call_function("div", a, b))
""", ("wrap_long", "java_int_arith"))

_h("java_parse_float", """
def java_parse_float(s: Column, *, skip_bad_record: bool = False) -> Column:
    \"\"\"Float.parseFloat: the Double.parseDouble grammar, rounded to float.\"\"\"
    value = F.when(s.rlike(JAVA_DOUBLE), s.try_cast("float"))
    return value if skip_bad_record else fail_where_java_throws(value, s, "NumberFormatException")
""", ("java_parse_double", "fail_where_java_throws"))


_h("hadoop_setting", """
def hadoop_setting(conf: dict[str, str] | None, name: str, default, getter: str = "get"):
    \"\"\"Configuration.get*(name, default) as Hadoop reads it: trimmed numbers, 0x hex, true/false.\"\"\"
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
    \"\"\"`-D name=value` options, as Hadoop's GenericOptionsParser reads them.\"\"\"
    out = {}
    for d in defines:
        name, sep, value = d.partition("=")
        if not sep:
            raise SystemExit(f"-D {d}: expected name=value")
        out[name] = value
    return out
""")


_h("hadoop_counters", """
class HadoopCounters:
    \"\"\"Hadoop counters, computed with DataFrame.observe in the same pass as the job's own work.\"\"\"

    def __init__(self) -> None:
        self._parts: list[tuple[str, str, Observation]] = []

    def add(self, group: str, name: str, rows: Column | None = None, amount=1):
        \"\"\"A DataFrame.transform step adding `amount` to the counter for each row where `rows` holds.\"\"\"
        observation = Observation(f"counter_{len(self._parts)}")
        self._parts.append((group, name, observation))
        value = amount if isinstance(amount, Column) else F.lit(amount)
        counted = value if rows is None else F.when(rows, value).otherwise(0)
        metric = F.coalesce(F.sum(counted), F.lit(0)).cast("bigint").alias("value")
        return lambda df: df.observe(observation, metric)

    def totals(self) -> dict[tuple[str, str], int]:
        \"\"\"(group, name) -> value; read after the job's action has run.\"\"\"
        out: dict[tuple[str, str], int] = {}
        for group, name, observation in self._parts:
            out[(group, name)] = out.get((group, name), 0) + int(observation.get["value"])
        return out

    def report(self, stream=None) -> None:
        \"\"\"Print the counters in the layout of Hadoop's job log.\"\"\"
        stream = stream or sys.stderr
        totals = self.totals()
        print(f"Counters: {len(totals)}", file=stream)
        for group in sorted({g for g, _ in totals}):
            print(f"\\t{group}", file=stream)
            for (g, name), value in sorted(totals.items()):
                if g == group:
                    print(f"\\t\\t{name}={value}", file=stream)
""")


_h("hadoop_counters_by_name", """
def _cut(name: str, limit: int) -> str:
    \"\"\"Hadoop's Limits.filterName: a name longer than `limit` UTF-16 units keeps its first limit - 1.\"\"\"
    units = name.encode("utf-16-be", "surrogatepass")
    if len(units) <= 2 * limit:
        return name
    return units[: 2 * (limit - 1)].decode("utf-16-be", "replace")


class CountersByName(HadoopCounters):
    \"\"\"Hadoop counters, some named by the data: one counter per (group, name) value. observe()
    cannot group by a value, so those are counted in a second pass, before the output is written.\"\"\"

    def __init__(self) -> None:
        super().__init__()
        self._named: list[DataFrame] = []  # (group, name, value) rows
        self._named_totals: dict[tuple[str, str], int] | None = None

    def add_named(self, group: str | Column, name: str | Column, rows: Column | None = None, amount=1):
        \"\"\"A DataFrame.transform step adding `amount` to the counter each row names, where `rows` holds.\"\"\"
        group, name, value = (x if isinstance(x, Column) else F.lit(x) for x in (group, name, amount))

        def step(df: DataFrame) -> DataFrame:
            kept = df if rows is None else df.where(rows)
            self._named.append(kept.select(group.alias("group"), name.alias("name"), value.alias("value")))
            return df

        return step

    def count_named(self) -> dict[tuple[str, str], int]:
        \"\"\"The counters named by the data, cut to Hadoop's name limits (the second pass; run once).\"\"\"
        if self._named_totals is None:
            totals: dict[tuple[str, str], int] = {}
            for counted in self._named:
                for row in counted.groupBy("group", "name").agg(F.sum("value").alias("value")).collect():
                    if row["group"] is None or row["name"] is None:
                        raise RuntimeError("NullPointerException: a counter's group or name is null")
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
            print(f"WARNING: {len(self.totals())} counters; Hadoop fails a job with more than 120", file=stream)
        super().report(stream)
""", ("hadoop_counters",))


_h("date_fields", r'''
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
''')

_h("sdf_parse", r'''
def sdf_parse(s: Column, pattern: str, *, lenient: bool = True, skip_bad_record: bool = False) -> Column:
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
    same_wall_clock = F.date_format(later, "yyyy-MM-dd HH:mm:ss") == F.date_format(instant, "yyyy-MM-dd HH:mm:ss")
    value = F.when(s.rlike(regex) & wall.isNotNull(), F.when(same_wall_clock, later).otherwise(instant))
    if not lenient:  # a time the zone skips (spring DST gap) is an error
        value = F.when(F.from_utc_timestamp(value, F.current_timezone()) == wall, value)
    if skip_bad_record:
        return value
    return F.when(value.isNotNull(), value).otherwise(F.raise_error(F.concat(F.lit('ParseException: Unparseable date: "'), s, F.lit('"'))))
''', ("date_fields",))


_h("jt_parse", r'''
def jt_parse(s: Column, pattern: str, *, date_only: bool = False, skip_bad_record: bool = False) -> Column:
    """LocalDateTime.parse / LocalDate.parse with DateTimeFormatter.ofPattern(pattern), ResolverStyle.SMART.

    Fields have their exact widths and the whole text must match; SMART moves a day-of-month of
    29-31 past the month's end back to its last day and reads 24:00:00 as the next midnight.
    No time zone takes part (TIMESTAMP_NTZ / DATE, like java.time's local types).
    """
    regex, letters = _date_regex(pattern, exact_widths=True)
    year, month, day, hour, minute, second = _date_fields(s, regex, letters)
    end_of_day = (hour == 24) & (minute == 0) & (second == 0)
    ok = (s.rlike(regex) & month.between(1, 12) & day.between(1, 31) & ((hour <= 23) | end_of_day)
          & (minute <= 59) & (second <= 59))
    last_day = F.dayofmonth(F.last_day(F.make_date(year, month, F.lit(1))))
    day = F.least(day, last_day)
    if date_only:
        value = F.when(ok, F.make_date(year, month, day))
    else:
        stamp = F.make_timestamp_ntz(year, month, day, F.when(end_of_day, 0).otherwise(hour), minute, second)
        value = F.when(ok, F.when(end_of_day, stamp + F.expr("INTERVAL 1 DAY")).otherwise(stamp))
    if skip_bad_record:
        return value
    return F.when(value.isNotNull(), value).otherwise(F.raise_error(F.concat(F.lit("DateTimeParseException: Text '"), s, F.lit("' could not be parsed"))))
''', ("date_fields",))


_h("java_code_units", '''
def _int32(u: Column) -> Column:
    """An unsigned 32-bit value (0 <= u < 2**32, bigint) as the Java int with those bits."""
    return F.when(u >= 2**31, u - 2**32).otherwise(u).cast("int")


def _fold_hash(units: Column, start: int) -> Column:
    """h = 31 * h + unit over an array of ints, with Java's 32-bit int wrap-around."""
    return _int32(F.aggregate(units, F.lit(start).cast("bigint"), lambda h, u: F.pmod(h * 31 + u, F.lit(2**32))))


def _hex_units(s: Column, charset: str, width: int) -> Column:
    """The code units of a string in `charset`, `width` hex digits each, as unsigned ints."""
    hexed = F.hex(F.encode(s, charset))
    return F.transform(F.regexp_extract_all(hexed, F.lit("(" + "." * width + ")"), 1),
                       lambda h: F.conv(h, 16, 10).cast("int"))


def string_hash(s: Column) -> Column:
    """String.hashCode(): s[0]*31^(n-1) + ... over the UTF-16 code units, starting at 0."""
    return _fold_hash(_hex_units(s, "UTF-16BE", 4), 0)

''')

_h("java_char_code", '''
def java_char_code(c: Column) -> Column:
    """A char as an int: its UTF-16 code unit (a char here is one code unit of the BMP)."""
    return F.conv(F.hex(F.encode(c, "UTF-16BE")), 16, 10).cast("int")
''')

_h("java_compare_to", '''
def _compare_units(ua: Column, ub: Column) -> Column:
    """String.compareTo over code unit arrays: the first difference, else the difference in length."""
    n = F.least(F.size(ua), F.size(ub))
    diffs = F.filter(F.zip_with(F.slice(ua, 1, n), F.slice(ub, 1, n), lambda x, y: x - y), lambda d: d != 0)
    return F.when(F.size(diffs) > 0, F.element_at(diffs, 1)).otherwise(F.size(ua) - F.size(ub))


def java_compare_to(a: Column, b: Column) -> Column:
    """String.compareTo(b): compares UTF-16 code units (Spark's own order is by UTF-8 bytes)."""
    return _compare_units(_hex_units(a, "UTF-16BE", 4), _hex_units(b, "UTF-16BE", 4))


def java_compare_to_ignore_case(a: Column, b: Column) -> Column:
    """String.compareToIgnoreCase(b) over ASCII text: each char folded to lower case. Java folds any
    char through Character.toUpperCase then toLowerCase, which is not reproduced: the job fails on
    a char beyond ASCII instead of ordering it differently."""
    def folded(s: Column) -> Column:
        return F.transform(_hex_units(s, "UTF-16BE", 4), lambda u: F.when((u >= 65) & (u <= 90), u + 32)
                           .when(u < 128, u).otherwise(F.raise_error(F.lit("compareToIgnoreCase of a char beyond "
                                                                            "ASCII is not reproduced"))))

    return _compare_units(folded(a), folded(b))
''', ("java_code_units",))

_h("hadoop_partition", '''
def text_hash(s: Column) -> Column:
    """Text.hashCode(): WritableComparator.hashBytes over the UTF-8 bytes (signed), starting at 1."""
    signed = F.transform(_hex_units(s, "UTF-8", 2), lambda b: F.when(b > 127, b - 256).otherwise(b))
    return _fold_hash(signed, 1)


def first_code_unit(s: Column) -> Column:
    """s.charAt(0) as an int (a UTF-16 code unit); the job fails on "" where Java throws."""
    unit = F.element_at(_hex_units(s, "UTF-16BE", 4), 1)
    return F.when(F.length(s) > 0, unit).otherwise(F.raise_error(F.lit("StringIndexOutOfBoundsException")))


def long_hash(v: Column) -> Column:
    """LongWritable.hashCode(): (int) value, the low 32 bits (not Long.hashCode's high-low XOR)."""
    return _int32(F.pmod(v, F.lit(2**32)))


def partition_of(hash_code: Column, reduce_tasks: int) -> Column:
    """(hashCode & Integer.MAX_VALUE) % numReduceTasks: the reduce task (part file) of a key."""
    return hash_code.bitwiseAND(F.lit(2147483647)) % reduce_tasks
''', ("java_code_units",))

_h("checked_partition", '''
def checked_partition(task: Column, reduce_tasks: int) -> Column:
    """A custom getPartition()'s answer; the job fails outside 0..N-1, as Hadoop's map task does
    ("Illegal partition for <key> (<n>)")."""
    bad = task.isNull() | (task < 0) | (task >= reduce_tasks)
    return F.when(bad, F.raise_error(F.concat(F.lit("Illegal partition ("), task.cast("string"), F.lit(")")))) \\
        .otherwise(task)
''')


# Plain Python (not Column code): the check of the argument a driver picks its job by.
_h("argument_equals_ignore_case", inspect.getsource(argument_equals_ignore_case))
_h("argument_test", inspect.getsource(argument_test), ("argument_equals_ignore_case",))
_h("same_driver_branch", inspect.getsource(same_driver_branch), ("argument_test",))


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
