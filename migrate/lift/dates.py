"""Dates: SimpleDateFormat parse/format, Date.getTime(), Calendar fields.

Recognises: `new SimpleDateFormat("<numeric pattern>")` held in a field or local (lenient, as
Java's default, or after `setLenient(false)`), `fmt.parse(s)` inside a try that catches
ParseException, `d.getTime()`, `Calendar.getInstance()` + `cal.setTime(d)` + `cal.get(Calendar.X)`
for YEAR, MONTH, DAY_OF_MONTH/DATE, HOUR_OF_DAY, MINUTE, SECOND, DAY_OF_WEEK, and
`fmt.format(d)` for the same pattern letters.
Produces: plan calls date_parse / date_millis / date_field / date_format; the script pins
Spark's session time zone to a setting that defaults to the JVM's own zone, which is what the
original JVM used when it ran on the same machine.
Caveats: only the pattern letters y M d H m s (and S for format) with separators between
numeric fields; text fields (MMM, EEE, a, z) and abutting numbers are declined. Julian-calendar
dates before 1582 are not reproduced (Spark is proleptic Gregorian).
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from javalang import tree as T

from migrate.lift.exprs import Unsupported
from migrate.plan import Call, Expr, Lit

PARSE_LETTERS = set("yMdHms")
FORMAT_LETTERS = set("yMdHmsS")
CALENDAR_FIELDS = {"YEAR": "year", "MONTH": "month", "DAY_OF_MONTH": "day", "DATE": "day", "HOUR_OF_DAY": "hour",
                   "MINUTE": "minute", "SECOND": "second", "DAY_OF_WEEK": "day_of_week"}


@dataclass
class DateFormat:
    """A java.text.SimpleDateFormat object: its pattern, whether parsing is lenient, and the time
    zone set on it (None: the JVM's default zone, the script's session zone)."""

    pattern: str
    lenient: bool = True
    zone: str | None = None


# Zone IDs TimeZone.getTimeZone and Spark read alike: region IDs, UTC/GMT and GMT offsets. An ID
# Java does not know silently means GMT there (Java SE API, TimeZone.getTimeZone); Spark fails on
# it. Three-letter IDs (EST, CST, IST) are declined: they name different zones in different APIs.
ZONE_ID = re.compile(r"UTC|GMT|GMT[+-]\d{1,2}(:?\d{2})?|[A-Z][A-Za-z]+(/[A-Za-z0-9_+-]+)+")


def configured(fmt: DateFormat, setters: list, node) -> DateFormat:
    """The format after the setter calls made where it was made (migrate.lower.configured)."""
    from migrate.java.literals import string_value

    for call in setters:
        args = call.arguments or []
        if call.member == "setLenient" and len(args) == 1 and isinstance(args[0], T.Literal) \
                and args[0].value in ("true", "false"):
            fmt.lenient = args[0].value == "true"
        elif call.member == "setTimeZone" and len(args) == 1 and isinstance(args[0], T.MethodInvocation) \
                and args[0].qualifier in ("TimeZone", "java.util.TimeZone") and args[0].member == "getTimeZone" \
                and len(args[0].arguments or []) == 1 and isinstance(args[0].arguments[0], T.Literal) \
                and args[0].arguments[0].value.startswith('"') and not args[0].selectors:
            zone = string_value(args[0].arguments[0].value)
            if not ZONE_ID.fullmatch(zone):
                raise Unsupported(node, f"time zone ID {zone!r}: Java reads an ID it does not know as GMT, and "
                                        "three-letter IDs name different zones in different APIs",
                                  "use a region ID such as Europe/Paris, or UTC")
            fmt.zone = zone
        else:
            raise Unsupported(node, f"SimpleDateFormat.{call.member}() with these arguments is not lifted")
    return fmt


@dataclass
class CalendarVar:
    """A java.util.Calendar object and the Date it was last set to in this record."""

    date: Expr | None = None


def pattern_tokens(pattern: str) -> list[tuple[str, str]]:
    """SimpleDateFormat pattern -> [("field", "yyyy") | ("text", "-")], quotes resolved."""
    out, i = [], 0
    while i < len(pattern):
        c = pattern[i]
        if c == "'":
            j = pattern.find("'", i + 1)
            if j < 0:
                raise ValueError("unclosed quote")
            out.append(("text", "'" if j == i + 1 else pattern[i + 1 : j]))
            i = j + 1
        elif c.isalpha():
            j = i
            while j < len(pattern) and pattern[j] == c:
                j += 1
            out.append(("field", pattern[i:j]))
            i = j
        else:
            out.append(("text", c))
            i += 1
    return out


def check_parse_pattern(pattern: str, node) -> None:
    tokens = pattern_tokens(pattern)
    prev_field = False
    for kind, v in tokens:
        if kind == "field":
            if v[0] not in PARSE_LETTERS:
                raise Unsupported(node, f"date pattern letter {v[0]!r} in {pattern!r} is not lifted yet",
                                  "parse with F.to_timestamp(col, pattern) by hand and check a sample")
            if prev_field:
                raise Unsupported(node, f"date pattern {pattern!r} has numbers without a separator; Java's "
                                        "lenient parse reads those by width", "check a sample by hand")
            prev_field = True
        else:
            prev_field = False
    if not any(k == "field" and v[0] == "y" for k, v in tokens):
        raise Unsupported(node, f"date pattern {pattern!r} without a year is not lifted")


def check_format_pattern(pattern: str, node) -> None:
    for kind, v in pattern_tokens(pattern):
        if kind == "field" and v[0] not in FORMAT_LETTERS:
            raise Unsupported(node, f"date format letter {v[0]!r} in {pattern!r} is not lifted yet")


def spark_format_pattern(pattern: str) -> str:
    """SimpleDateFormat pattern -> Spark datetime pattern for the supported letters (same meaning)."""
    out = []
    for kind, v in pattern_tokens(pattern):
        if kind == "field":
            out.append(v)
        elif re.fullmatch(r"[-:/ .,T_]", v) or v == "":
            out.append(v)
        else:
            out.append("'" + v.replace("'", "''") + "'")
    return "".join(out)


def parse(fmt: DateFormat, s: Expr, on_error: str) -> Expr:
    zone = (Lit("String", fmt.zone),) if fmt.zone else ()
    return Call("Date", "date_parse", (s, Lit("String", fmt.pattern), Lit("boolean", fmt.lenient), *zone), on_error)


def millis(d: Expr) -> Expr:
    return Call("long", "date_millis", (d,))


def field(d: Expr, name: str, node) -> Expr:
    if name not in CALENDAR_FIELDS:
        raise Unsupported(node, f"Calendar.{name} is not lifted yet")
    return Call("int", "date_field", (d, Lit("String", CALENDAR_FIELDS[name])))


def format_(fmt: DateFormat, d: Expr, node) -> Expr:
    check_format_pattern(fmt.pattern, node)
    zone = (Lit("String", fmt.zone),) if fmt.zone else ()
    return Call("String", "date_format", (d, Lit("String", spark_format_pattern(fmt.pattern)), *zone))


# ----------------------------------------------------------------------------- java.time

JAVA_TIME_LETTERS = {"y": 4, "u": 4, "M": 2, "d": 2, "H": 2, "m": 2, "s": 2}
JAVA_TIME_GETTERS = {"getYear": "year", "getMonthValue": "month_value", "getDayOfMonth": "day", "getHour": "hour",
                     "getMinute": "minute", "getSecond": "second"}


@dataclass
class JavaTimeFormat:
    """A java.time.format.DateTimeFormatter built with ofPattern (ResolverStyle.SMART)."""

    pattern: str


def check_java_time_pattern(pattern: str, node) -> None:
    """Numeric fields of the widths DateTimeFormatter.ofPattern parses exactly (yyyy MM dd HH mm ss)."""
    for kind, v in pattern_tokens(pattern):
        if kind == "field" and (v[0] not in JAVA_TIME_LETTERS or len(v) != JAVA_TIME_LETTERS[v[0]]):
            raise Unsupported(node, f"DateTimeFormatter pattern field {v!r} in {pattern!r} is not lifted yet",
                              "parse with F.to_timestamp by hand and check a sample")


def java_time_parse(kind: str, s: Expr, fmt: JavaTimeFormat, on_error: str) -> Expr:
    return Call(kind, "jt_parse", (s, Lit("String", fmt.pattern), Lit("String", kind)), on_error)


def java_time_field(t: Expr, getter: str) -> Expr:
    return Call("int", "jt_field", (t, Lit("String", JAVA_TIME_GETTERS[getter])))


def java_time_format(t: Expr, fmt: JavaTimeFormat, node) -> Expr:
    for kind, v in pattern_tokens(fmt.pattern):
        if kind == "field" and t.jtype == "LocalDate" and v[0] in "Hms":
            raise Unsupported(node, "formatting a LocalDate with a time field throws in Java")
    return Call("String", "date_format", (t, Lit("String", spark_format_pattern(fmt.pattern))))
