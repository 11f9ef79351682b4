"""Plan → PySpark DataFrame script text (expressions built here, file laid out by templates/job.py.j2)."""
from __future__ import annotations

import functools
import keyword
import math
import re
import uuid
from dataclasses import dataclass, field, replace
from pathlib import Path

import jinja2

from migrate.gen import layout
from migrate.plan import (walk, INTEGRAL, Agg, AggRef, Arith, BoolOp, Call, Cast, Col, Compare, Cond, ConfValue, Count, EachValue, Emit, Explode, Expr, Filter, Group, HandWork, Identity, Join, Let, Lit, Lookup, Plan, Project, Runs, SideTable, Source, Stage, Step, StructNew, TaskTopN, TopN, TopPerKey, Field)

SPARK_TYPES = {"int": "int", "long": "bigint", "double": "double", "float": "float", "boolean": "boolean",
               "String": "string"}
MIN_VALUE = {"int": -2147483648, "long": -9223372036854775808}
TEMPLATES = Path(__file__).resolve().parent.parent.parent / "templates"

# Plan operations spelled directly over their spelled arguments: op -> (template, helper needed).
PLAIN_CALLS = {
    "size": ("F.size({0})", None),
    "trim": ("java_trim({0})", "java_trim"),
    "lower": ("F.lower({0})", None),
    "upper": ("F.upper({0})", None),
    "to_string": ('{0}.cast("string")', None),
    "char_string": ("{0}", None),
    "is_empty": ("(F.length({0}) == 0)", None),
    "utf8_length": ("F.octet_length({0})", None),
    "length": ("java_length({0})", "java_length"),
    "chars": ("java_chars({0})", "java_chars"),
    "or_default": ("F.coalesce({0}, {1})", None),  # a helper's value, or what its catch returns
    "greatest": ("F.greatest({0}, {1})", None),
    "least": ("F.least({0}, {1})", None),
    "index_of": ("java_index_of({0}, {1})", "java_index_of"),
    "last_index_of": ("java_last_index_of({0}, {1})", "java_last_index_of"),
    "equals_ignore_case": ("java_equals_ignore_case({0}, {1})", "java_equals_ignore_case"),
    "java_max": ("java_max({0}, {1})", "java_max_min"),
    "java_min": ("java_min({0}, {1})", "java_max_min"),
    "round": ("java_round({0})", "java_round"),
    "floor": ("java_floor({0})", "java_floor"),
    "ceil": ("java_ceil({0})", "java_ceil"),
    "sqrt": ("F.sqrt({0})", None),
    "rint": ("F.rint({0})", None),
    "pow": ("F.pow({0}, {1})", None),
    "double_to_int": ("java_double_to_int({0})", "java_double_to_integral"),
    "double_to_long": ("java_double_to_long({0})", "java_double_to_integral"),
    "long_to_int": ("wrap_int({0})", "wrap_int"),
    "double_to_float": ('{0}.cast("float")', None),
    "date_millis": ("F.unix_millis({0})", None),
    "is_not_null": ("{0}.isNotNull()", None),
    "is_null": ("{0}.isNull()", None),
    "text_hash": ("text_hash({0})", "hadoop_partition"),
    "string_hash": ("string_hash({0})", "java_code_units"),
    "compare_to": ("java_compare_to({0}, {1})", "java_compare_to"),
    "compare_to_ignore_case": ("java_compare_to_ignore_case({0}, {1})", "java_compare_to"),
    "char_code": ("java_char_code({0})", "java_char_code"),
    "first_code_unit": ("first_code_unit({0})", "hadoop_partition"),
    "int_hash": ("{0}", None),
    "long_hash": ("long_hash({0})", "hadoop_partition"),
    "partition_of": ("partition_of({0}, {1})", "hadoop_partition"),
    # String.compareTo orders UTF-16 code units; Spark orders strings by UTF-8 bytes (they differ
    # past U+FFFF): the UTF-16BE bytes of a string sort as compareTo does
    "utf16_order": ('F.encode({0}, "UTF-16BE")', None),
}


def _templates_dir() -> Path:
    """templates/ at the top of a checkout, or inside the installed wheel (shared-data)."""
    if TEMPLATES.is_dir():
        return TEMPLATES
    import sys

    return Path(sys.prefix) / "share" / "mrlift" / "templates"


_ENV = jinja2.Environment(loader=jinja2.FileSystemLoader(str(_templates_dir())), undefined=jinja2.StrictUndefined,
                          keep_trailing_newline=True, trim_blocks=True, lstrip_blocks=True, autoescape=False)


def raw_string(text: str) -> str:
    """A Python literal for a regex: raw (as the regex reads in Java, less Java's own escaping)
    where the text allows it, else an ordinary literal."""
    for q in ('"', "'"):
        if q not in text and text.isprintable() and not text.endswith("\\"):
            return f"r{q}{text}{q}"
    return repr(text)


@functools.cache
def _reserved_names() -> frozenset[str]:
    """Upper-case names a script already defines (F, the helpers' constants): a regex constant
    named after a Java field must not shadow them."""
    from migrate.gen.helpers import HELPERS

    return frozenset({"F"} | {m for _, src in HELPERS.values() for m in re.findall(r"^([A-Z][A-Z0-9_]*) =", src, re.M)})


@functools.cache
def _script_names() -> frozenset[str]:
    """Names a script defines at top level or imports (a lambda parameter must not hide them)."""
    from migrate.gen.helpers import HELPERS

    defined = {m for _, src in HELPERS.values() for m in re.findall(r"^(?:def |class )?(\w+)", src, re.M)}
    return frozenset(defined | {"F", "Column", "DataFrame", "SparkSession", "Window", "Observation", "re", "sys"})


def _snake(name: str) -> str:
    """camelCase / CamelCase -> snake_Case (the caller picks the letter case)."""
    return re.sub(r"(?<=[a-z0-9])(?=[A-Z])", "_", name)


def _claim(table: dict, name: str, value) -> str:
    """A top-level name of the script for `value`: `name`, or `name_2`, `name_3`, ... where another
    value has it already; the same value keeps its name."""
    base, i = name, 2
    while table.get(name, value) != value:
        name, i = f"{base}_{i}", i + 1
    table[name] = value
    return name


class ExprWriter:
    """Spells plan expressions as Column code and remembers which helpers they need."""

    def __init__(self) -> None:
        self.helpers: set[str] = set()
        self.settings: dict[str, ConfValue] = {}  # script variable -> the job setting it holds
        self.counters = False  # the plan updates Hadoop counters
        self.named_counters = False  # ... some named by the data (counted before the output is written)
        self.dates = False  # the plan reads or writes dates in the JVM's time zone
        self.zones: set[str | None] = set()  # ... or in zones set on its formats (the lift allows one)
        self.regexes: dict[str, str] = {}  # script constant -> regex (java.util.regex syntax)
        self.bound: dict[str, str] = {}  # column -> the lambda parameter standing for it (until_break)
        self.task_rules: dict[str, tuple[str, str]] = {}  # script function -> (docstring, code): partitioners

    def __call__(self, e: Expr | None) -> str:
        if e is None:
            return 'F.lit(None).cast("string")'
        method = getattr(self, f"visit_{type(e).__name__}", None)
        if method is None:
            raise TypeError(f"the generator has no handler for {type(e).__name__}")
        return method(e)

    def task_rule(self, e: Call) -> str:
        """A custom partitioner as a function of the script that gives each row's reduce task."""
        self.helpers.add("checked_partition")
        task, n, cls = e.args
        doc = (f"The reduce task (part file) of each row's `key`, as {cls.value}.getPartition() "
               f"({_where(e.origin)}) computes it; a task outside 0..{n.value - 1} fails the job, as in Hadoop.")
        code = f"checked_partition({self(task)}, {n.value})"
        return _claim(self.task_rules, "task_of_" + _snake(cls.value).lower(), (doc, code)) + "()"

    def regex(self, lit: Lit) -> str:
        """A regex as code: a named constant of the script where the Java Pattern had a name."""
        name = getattr(lit, "name", "")
        if not name:
            return repr(lit.value)
        name = _snake(name).upper()
        if name in _reserved_names():
            name += "_REGEX"
        return _claim(self.regexes, name, lit.value)

    def visit_Col(self, e: Col) -> str:
        if e.name in self.bound:
            return self.bound[e.name]
        return f'F.col("{e.name}")'

    def visit_ConfValue(self, e: ConfValue) -> str:
        self.settings[e.var] = e
        return f"F.lit({e.var})" + {"long": '.cast("bigint")', "float": '.cast("float")'}.get(e.jtype, "")

    def visit_StructNew(self, e: StructNew) -> str:
        return "F.struct(" + ", ".join(f'{self(v)}.alias("{k}")' for k, v in e.items) + ")"

    def visit_Field(self, e: Field) -> str:
        return f'{self(e.base)}["{e.name}"]'

    def visit_AggRef(self, e: AggRef) -> str:
        return f'F.col("{agg_column(e.name)}")'

    def visit_Lit(self, e: Lit) -> str:
        return f"F.lit({self.py(e)})" + ('.cast("bigint")' if e.jtype == "long" and abs(e.value) < 2**31 else "")

    @staticmethod
    def py(e: Lit) -> str:
        v = e.value
        if isinstance(v, float):
            if math.isnan(v):
                return 'float("nan")'
            if math.isinf(v):
                return 'float("inf")' if v > 0 else 'float("-inf")'
        return repr(v)

    def visit_Cast(self, e: Cast) -> str:
        return f'{self(e.arg)}.cast("{SPARK_TYPES[e.jtype]}")'

    def visit_Cond(self, e: Cond) -> str:
        code = f"F.when({bare(self(e.cond))}, {self(e.then)})"
        while isinstance(e.other, Cond):  # else-if chains read as one when() chain (the first that holds)
            e = e.other
            code += f".when({bare(self(e.cond))}, {self(e.then)})"
        return f"{code}.otherwise({self(e.other)})"

    def visit_BoolOp(self, e: BoolOp) -> str:
        if e.op == "!":
            return f"(~{self(e.args[0])})" if self(e.args[0]).startswith("(") else f"(~({self(e.args[0])}))"
        sym = " & " if e.op == "&&" else " | "
        return "(" + sym.join(f"({self(a)})" if isinstance(a, BoolOp) and a.op != "!" else self(a) for a in e.args) + ")"

    def operand(self, e: Expr, other: Expr) -> str:
        """A literal next to a column is written as a plain Python value (Spark coerces it)."""
        if isinstance(e, Lit) and not isinstance(other, Lit) and e.value is not None and e.jtype != "boolean":
            return self.py(e)
        return self(e)

    def visit_Compare(self, e: Compare) -> str:
        op = "==" if e.op == "==" else e.op
        left = self(e.left) if isinstance(e.left, Lit) else self.operand(e.left, e.right)
        core = f"({left} {op} {self.operand(e.right, e.left)})"
        if e.left.jtype not in ("double", "float"):
            return core
        # Java: every comparison with NaN is false (!= is true); Spark orders NaN above all numbers.
        nans = [f"F.isnan({self(x)})" for x in (e.left, e.right) if not isinstance(x, Lit)]
        if not nans:
            return core
        if e.op == "!=":
            return "(" + " | ".join(nans + [core]) + ")"
        return "(" + " & ".join([f"~{n}" for n in nans] + [core]) + ")"

    def visit_Arith(self, e: Arith) -> str:
        a, b = self(e.left), self(e.right)
        if e.jtype in INTEGRAL and e.op in "+-*/":
            return self._integral(e, a, b)
        if e.op == "/" and not (isinstance(e.right, Lit) and e.right.value not in (0, 0.0)):
            self.helpers.add("java_div_double")
            code = f"java_div_double({a}, {b})"
        else:
            left = a if isinstance(e.left, Lit) else self.operand(e.left, e.right)
            code = f"({left} {e.op} {self.operand(e.right, e.left)})"
        # Spark divides in double; Java divides floats in float (rounding the double result is exact)
        return f'{code}.cast("float")' if e.jtype == "float" and e.op == "/" else code

    def _integral(self, e: Arith, a: str, b: str) -> str:
        """int/long + - * / with Java's two's-complement wrap-around (JLS 15.17, 15.18)."""
        if isinstance(e.left, Lit) and isinstance(e.right, Lit):
            return f"F.lit({_fold(e)})"
        name = {"+": "add", "-": "sub", "*": "mul", "/": "div"}[e.op]
        helper = f"java_{e.jtype}_{name}"
        self.helpers.add(helper if e.op == "/" else f"java_{e.jtype}_arith")
        return f"{helper}({self.operand(e.left, e.right)}, {self.operand(e.right, e.left)})"

    def visit_Call(self, e: Call) -> str:
        args = e.args
        op = e.op
        if op in PLAIN_CALLS:
            template, helper = PLAIN_CALLS[op]
            if helper:
                self.helpers.add(helper)
            return template.format(*(self(a) for a in args))
        skip = ", skip_bad_record=True" if e.on_error == "null" else ""
        if op in ("split", "split_limit"):
            regex = args[1].value
            if op == "split":
                self.helpers.add("java_split")
                return f"java_split({self(args[0])}, {regex!r})"
            return f"F.split({self(args[0])}, {regex!r}, {args[2].value})"
        if op == "hadoop_split":  # org.apache.hadoop.util.StringUtils.split with an escape char
            self.helpers.add("hadoop_split")
            escape, sep = args[1].value, args[2].value
            tail = "" if (escape, sep) == ("\\", ",") else f", escape={escape!r}, separator={sep!r}"
            return f"hadoop_split({self(args[0])}{tail})"
        if op == "checked_partition":  # a custom getPartition(): a named function of the script
            return self.task_rule(e)
        if op == "until_break":  # the elements a loop visits: up to the first where its break fires
            self.helpers.add("until_break")
            element = args[1].name
            param = element if element.isidentifier() and not keyword.iskeyword(element) \
                and element not in _script_names() else "element"
            self.bound[element] = param
            try:
                fires = bare(self(args[2]))
            finally:
                del self.bound[element]
            return f"until_break({self(args[0])}, lambda {param}: {fires})"
        if op == "tokens":
            self.helpers.add("java_tokens")
            if len(args) == 1:
                return f"java_tokens({self(args[0])})"
            return f"java_tokens({self(args[0])}, {tokenizer_regex(args[1].value)!r})"
        if op == "regex_matches":  # Spark's regexp functions use java.util.regex, as RegexMapper does
            pattern = f"F.lit({self.regex(args[1])})" if isinstance(args[1], Lit) else self(args[1])
            group = args[2].value if isinstance(args[2], Lit) else self(args[2])
            return f"F.regexp_extract_all({self(args[0])}, {pattern}, {group})"
        if op == "index":
            if e.on_error == "null":
                return f"F.get({self(args[0])}, {self(args[1]) if not isinstance(args[1], Lit) else args[1].value})"
            idx = args[1].value if isinstance(args[1], Lit) else self(args[1])
            return f"{self(args[0])}[{idx}]"
        if op in ("parse_int", "parse_long", "parse_double", "parse_float"):
            self.helpers.add("java_" + op)
            return f"java_{op}({self(args[0])}{skip})"
        if op == "concat":
            def flat(a: Expr) -> list[Expr]:  # "a" + b + "c" is one concatenation
                return [p for x in a.args for p in flat(x)] if isinstance(a, Call) and a.op == "concat" else [a]

            return "F.concat(" + ", ".join(self(p) for p in flat(e)) + ")"
        if op in ("starts_with", "ends_with", "contains"):
            meth = {"starts_with": "startswith", "ends_with": "endswith", "contains": "contains"}[op]
            return f"{self(args[0])}.{meth}({self.operand(args[1], args[0])})"
        if op == "abs":
            if e.jtype in MIN_VALUE:
                self.helpers.add("java_abs")
                return f"java_abs({self(args[0])}, {MIN_VALUE[e.jtype]})"
            return f"F.abs({self(args[0])})"
        if op in ("strip", "strip_leading", "strip_trailing"):
            self.helpers.add("java_strip")
            opts = {"strip": "", "strip_leading": ", trailing=False", "strip_trailing": ", leading=False"}[op]
            return f"java_strip({self(args[0])}{opts})"
        if op == "const_lookup":  # a constant map's value for the key (NULL or the default where missing)
            key, default, *flat = args
            k = self(key)
            found = "F" + "".join(f".when({k} == {self.py(a)}, {self(b)})" for a, b in zip(flat[0::2], flat[1::2]))
            if isinstance(default, Lit) and default.value is None:
                return found if flat else f'F.lit(None).cast("{SPARK_TYPES[e.jtype]}")'
            return f"{found}.otherwise({self(default)})" if flat else self(default)
        if op == "isin":  # a constant collection's contains()
            return f"{self(args[0])}.isin({', '.join(repr(a.value) for a in args[1:])})"
        if op in ("substring", "char_at"):
            self.helpers.add("java_substring")
            s_, begin = self(args[0]), self(args[1])
            if op == "char_at":
                end = self(Arith("int", "+", args[1], Lit("int", 1))) if not isinstance(args[1], Lit) \
                    else f"F.lit({args[1].value + 1})"
                return f"java_substring({s_}, {begin}, {end}{skip})"
            end = f", {self(args[2])}" if len(args) > 2 else ""
            return f"java_substring({s_}, {begin}{end}{skip})"
        if op == "div_or_null":  # an integer division by zero throws; a catch skips the record
            div = args[0]
            return f"F.when({self(div.right)} != 0, {self(div)})"
        if op == "regex_finds":  # Matcher.find(); matches() and lookingAt() come anchored (lift.regex)
            return f"{self(args[0])}.rlike({self.regex(args[1])})"
        if op == "regex_group":  # Matcher.group(n): after a successful match (else Java throws)
            found = f"F.regexp_extract({self(args[0])}, {self.regex(args[1])}, {args[2].value})"
            if len(args) == 3:  # the match is proved where this is read
                return found
            found = f"F.when({bare(self(args[3]))}, {found})"
            if e.on_error == "null":
                return found
            return f'{found}.otherwise(F.raise_error(F.lit("IllegalStateException: No match found")))'
        if op == "char_is":  # Character.isDigit(c) and friends: the regex class defined as that method
            return f"{self(args[0])}.rlike({(chr(92) + 'A' + chr(92) + 'p{' + args[1].value + '}' + chr(92) + 'z')!r})"
        if op == "join":  # String.join(sep, a, b, ...): no part is ever null here
            return f"F.concat_ws({args[0].value!r}, {', '.join(self(a) for a in args[1:])})"
        if op == "join_array":
            return f"F.array_join({self(args[0])}, {args[1].value!r})"
        if op == "is_blank":
            return f'{self(args[0])}.rlike(r"^\\p{{javaWhitespace}}*\\z")'
        if op == "matches":
            return f"{self(args[0])}.rlike({('^(?:' + args[1].value + ')' + chr(92) + 'z')!r})"
        if op == "replace":
            if isinstance(args[1], Lit) and args[1].value == "":
                raise TypeError("replace of the empty string is not lifted")
            return f"F.replace({self(args[0])}, {self(args[1])}, {self(args[2])})"
        if op == "replace_all":
            return f"F.regexp_replace({self(args[0])}, {args[1].value!r}, {args[2].value!r})"
        if op == "format":
            return f"F.format_string({args[0].value!r}, {', '.join(self(a) for a in args[1:])})"
        if op == "date_parse":
            self.helpers.add("sdf_parse")
            self.dates = True
            self.zones.add(args[3].value if len(args) > 3 else None)
            lenient = "" if args[2].value else ", lenient=False"
            return f"sdf_parse({self(args[0])}, {args[1].value!r}{lenient}{skip})"
        if op == "jt_parse":
            self.helpers.add("jt_parse")
            kind = "" if args[2].value == "LocalDateTime" else ", date_only=True"
            return f"jt_parse({self(args[0])}, {args[1].value!r}{kind}{skip})"
        if op == "jt_field":
            fn = {"year": "F.year({})", "month_value": "F.month({})", "day": "F.dayofmonth({})", "hour": "F.hour({})",
                  "minute": "F.minute({})", "second": "F.second({})", "iso_day_of_week": "(F.weekday({}) + 1)"}
            return fn[args[1].value].format(self(args[0]))
        if op == "date_field":
            self.dates = True
            self.zones.add(None)
            fn = {"year": "F.year({})", "month": "(F.month({}) - 1)", "day": "F.dayofmonth({})", "hour": "F.hour({})",
                  "minute": "F.minute({})", "second": "F.second({})", "day_of_week": "F.dayofweek({})"}[args[1].value]
            return fn.format(self(args[0]))
        if op == "date_format":
            self.dates = True
            self.zones.add(args[2].value if len(args) > 2 else None)
            return f"F.date_format({self(args[0])}, {args[1].value!r})"
        if op == "guarded":
            return f"F.when({bare(self(args[0]))}, {self(args[1])})"
        if op == "if_else":
            return f"F.when({bare(self(args[0]))}, {self(args[1])}).otherwise({self(args[2])})"
        raise TypeError(f"the generator has no spelling for operation {op!r}")


def _fold(e: Arith) -> int:
    v = {"+": e.left.value + e.right.value, "-": e.left.value - e.right.value, "*": e.left.value * e.right.value,
         "/": int(e.left.value / e.right.value) if e.right.value else None}[e.op]
    if v is None:
        raise TypeError("constant division by zero")
    bits = 32 if e.jtype == "int" else 64
    return (v + (1 << (bits - 1))) % (1 << bits) - (1 << (bits - 1))


def tokenizer_regex(delims: str) -> str:
    """A Java regex character class matching runs of StringTokenizer delimiter characters."""
    return "[" + "".join("\\" + c if c in "\\[]^-&" else c for c in delims) + "]+"


def agg_column(name: str) -> str:
    return f"{name}_acc" if name in ("key", "value") else name


def agg_code(a: Agg, x: ExprWriter) -> str:
    """One aggregate with the accumulator's Java semantics (int wrap, initial value, NaN rules)."""
    arg = x(a.arg) if a.arg is not None else None
    init = Lit(a.jtype, a.init) if a.init is not None else None
    init_code = x(init) if init is not None else None
    neutral_min = a.init in (MIN_VALUE.get(a.jtype), float("-inf"))
    neutral_max = a.init in ({"int": 2147483647, "long": 9223372036854775807}.get(a.jtype), float("inf"))
    if a.fn == "sum":
        core = f"F.sum({arg})" if not a.init else f"({init_code} + F.sum({arg}))"
        if a.jtype == "int":
            x.helpers.add("wrap_int")
            return f"wrap_int({core})"
        return core
    if a.fn == "count":
        core = "F.count(F.lit(1))" if not a.init else f"({init_code} + F.count(F.lit(1)))"
        return f'{core}.cast("int")' if a.jtype == "int" else core
    if a.fn == "count_if":
        core = f"F.count_if({bare(arg)})" if not a.init else f"({init_code} + F.count_if({bare(arg)}))"
        return f'{core}.cast("int")' if a.jtype == "int" else core
    if a.fn == "count_distinct":  # set.size(): Writable values are never null, so nothing is left out
        return f'F.count_distinct({arg}).cast("int")'
    if a.fn in ("any", "all"):
        if a.init == (a.fn == "any"):  # true || ... / false && ...: decided before the first value
            return f"F.lit({a.init!r})"
        return f"F.bool_or({bare(arg)})" if a.fn == "any" else f"F.bool_and({bare(arg)})"
    if a.fn == "only":  # Java keeps the last value assigned; it is defined only when all agree
        x.helpers.add("last_value_assigned")
        return f"last_value_assigned({arg}, {f'{_where(a.origin)} `{a.name}`'!r})"
    if a.fn == "collect_list":  # only its size is read: the order does not matter
        return f"F.collect_list({arg})"
    if a.fn == "collect_sorted":  # Collections.sort: ascending, as Integer/Long compareTo
        return f"F.array_sort(F.collect_list({arg}))"
    if a.fn == "max":  # no initial value: the first value started the running max
        return f"F.max({arg})" if neutral_min or init is None else f"F.greatest({init_code}, F.max({arg}))"
    if a.fn == "min":
        return f"F.min({arg})" if neutral_max or init is None else f"F.least({init_code}, F.min({arg}))"
    if a.fn == "max_nonnan":
        return f"F.greatest({init_code}, F.max(F.when(~F.isnan({arg}), {arg})))"
    if a.fn == "min_nonnan":
        return f"F.least({init_code}, F.min(F.when(~F.isnan({arg}), {arg})))"
    if a.fn == "min_nan":
        low = f"F.min({arg})" if neutral_max else f"F.least({init_code}, F.min({arg}))"
        return f'F.when(F.bool_or(F.isnan({arg})), F.lit(float("nan"))).otherwise({low})'
    raise TypeError(f"no spelling for aggregate {a.fn!r}")


@dataclass
class ScriptParts:
    """Everything the template lays out."""

    body: list[str] = field(default_factory=list)
    helpers: str = ""
    uses_window: bool = False


def bare(code: str) -> str:
    """Drop one pair of parentheses that wraps the whole expression (`.where((a > 1))`)."""
    if not (code.startswith("(") and code.endswith(")")):
        return code
    depth = 0
    for i, ch in enumerate(code):
        depth += ch == "("
        depth -= ch == ")"
        if depth == 0 and i < len(code) - 1:
            return code
    return code[1:-1]


def _where(origin) -> str:
    name = origin.file.rsplit("/", 1)[-1]
    return f"{name}:{origin.line_start}" if origin.line_start else name


def build_body(plan: Plan, x: ExprWriter) -> ScriptParts:
    """The statements of build(): read, map chain, reduce chain, return."""
    parts = ScriptParts()
    out = parts.body
    stub = [h for h in plan.hand_work if h.blocking]
    for t in plan.tables:
        out.extend(_side_table_code(t, x))
    if plan.branches:
        if stub:
            out.extend(_stub_lines(stub))
        for i, b in enumerate(plan.branches, 1):
            out.append("")
            out.append(f"# Input {i} of {len(plan.branches)} (MultipleInputs), mapped by {b.mapper.rsplit('.', 1)[-1]}")
            out.extend(_read_code(b.source, f"lines_{i}", x, parts))
            out.extend(_map_code(b.steps, f"lines_{i}", f"map_output_{i}", x))
        out.append("")
        out.append("# The shuffle meets the map output of every input: one DataFrame of (key, value)")
        out.append("map_output = " + ".unionByName(".join(f"map_output_{i}" for i in range(1, len(plan.branches) + 1))
                   + ")" * (len(plan.branches) - 1))
    else:
        out.extend(_read_code(plan.source, "lines", x, parts))
        if stub:
            out.append("")
            out.extend(_stub_lines(stub))
        out.extend(_map_code(plan.map_steps, "lines", "map_output", x))
    r = plan.reduce
    if isinstance(r, Group):
        out.append("")
        out.append(f"# Reduce side: wide — rows are shuffled so all values of a key meet ({_where(r.origin)})")
        out.append("result = (")
        out.append("    map_output")
        if r.distinct:
            out.extend("    " + c for c in _key_test_code(r, x))
            out.append("    .select(\"key\")")
            out.append("    .distinct()  # the reducer ignores its values: one row per key")
        else:
            out.extend("    " + c for c in _fold_code(r, x))
        for c in r.counts:  # once per reduce() call: over the rows of the grouped keys
            out.extend("    " + line for line in _step_code(c, x))
        if r.first_keys is not None:
            out.extend("    " + c for c in _first_keys_code(r, plan, x))
            parts.uses_window = True
        out.extend("    " + c for c in _reduce_writes(r.emits, x, plan.sink.partition, plan.sink.sort_terms))
        out.append(")")
        out.append("return result")
    elif isinstance(r, EachValue):
        out.append("")
        out.append(f"# Reduce side: the reducer writes inside its loop over values ({_where(r.origin)});")
        out.append("# the shuffle only brings the keys together: each value is written as the loop wrote it")
        calls = r.first_value or r.before or r.after
        if calls:
            out.extend(_call_windows(r, x))
            parts.uses_window = True
        out.append("result = (")
        out.append("    map_output")
        out.extend("    " + c for c in _key_test_code(r, x))
        if calls:
            out.extend("    " + c for c in _call_position_code(r))
        out.extend("    " + c for s in r.lets for c in _step_code(s, x))
        out.extend("    " + c for c in _reduce_writes(call_writes(r), x, plan.sink.partition, plan.sink.sort_terms))
        out.append(")")
        out.append("return result")
    elif isinstance(r, Runs):
        out.extend(_runs_code(r, plan, x))
    elif isinstance(r, TopN):
        out.extend(_top_n_code(r, x))
        parts.uses_window = True
    elif isinstance(r, TopPerKey):
        out.extend(_top_per_key_code(r, x, plan.sink.partition))
        parts.uses_window = True
    elif isinstance(r, Join):
        out.extend(_join_code(r, plan, x))
    elif isinstance(r, Identity):
        out.append("")
        out.append("# Reduce side: Hadoop's identity reducer — pairs pass through; the writer sorts by key")
        out.append("return map_output")
    else:
        out.append("return map_output")
    if x.counters:
        kind = "CountersByName" if x.named_counters else "HadoopCounters"
        out.insert(0, f"counters = counters if counters is not None else {kind}()")
    if x.settings:
        x.helpers.add("hadoop_setting")
        lines = ["# Job settings (Hadoop Configuration): `-D name=value` on the command line overrides the default"]
        for var, c in sorted(x.settings.items()):
            lines.append(f"{var} = hadoop_setting(conf, {c.name!r}, {c.default!r}, {c.reader!r})")
        out[0:0] = lines + [""]
    parts.helpers = ""
    return parts


def _read_code(src: Source, var: str, x: ExprWriter, parts: ScriptParts) -> list[str]:
    """Read one input as its InputFormat gives records: `var` with a `value` column (and `key`)."""
    out = []
    lists = src.lists or (False,) * len(src.params)
    if any(src.split_commas):
        items = [(f"*(path for arg in {p} for path in arg.split(\",\"))" if many else f"*{p}.split(\",\")")
                 if split else f"*{p}" if many else p for p, split, many in zip(src.params, src.split_commas, lists)]
        out.append(f"paths = [{', '.join(items)}]  # the driver passed a String: Hadoop reads \"a,b\" as two paths")
        read = "spark.read.text(paths)"
    elif any(lists) and len(src.params) > 1:
        read = f"spark.read.text([{', '.join(f'*{p}' if many else p for p, many in zip(src.params, lists))}])"
    elif any(lists):
        out.append("# every path the driver's loop over its arguments added")
        read = f"spark.read.text({src.params[0]})"
    else:
        paths = ", ".join(src.params)
        read = f"spark.read.text([{paths}])" if len(src.params) > 1 else f"spark.read.text({paths})"
    if src.upstream is not None and src.fmt == "pairs":
        out.append(f"# the (key, value) pairs job {src.upstream + 1} wrote to the SequenceFile this job read, as they are")
        return out + [f"{var} = job_{src.upstream + 1}_pairs"]
    if src.upstream is not None:
        read = f"job_{src.upstream + 1}_lines"
        out.append(f"# the lines job {src.upstream + 1} wrote to the folder this job read (passed on, not re-read)")
    if src.split:
        parts.uses_window = True
        low, high, block = (x(e) for e in src.split)
        out.append("# The mapper keeps state per map task: Hadoop makes one task of each input split, and the")
        out.append("# split size is max(minsize, min(maxsize, the file's block size)) (FileInputFormat)")
        out.append(f"split_size = F.greatest({low}, F.least({high}, {block}))")
        if src.upstream is not None:
            x.helpers.add("one_map_task")
            out.append(f"{var} = one_map_task({read}, split_size)  # the one file that job wrote, in its order")
        else:
            x.helpers.add("lines_by_map_task")
            items = read[len("spark.read.text("):-1] + (", file_name=True" if src.file_name else "")
            out.append(f"{var} = lines_by_map_task(spark, {items}, split_size)  # one task per file, in line order")
    elif src.fmt == "keyvalue":
        sep = src.kv_separator
        shown = "TAB" if sep == "\t" else repr(sep)
        regex = sep if sep.isalnum() or sep == "\t" else "\\" + sep  # a Java regex matching the one character
        out.append(f"# KeyValueTextInputFormat: key = text before the first {shown}, value = the rest")
        out.append(f"pair = F.split(F.col(\"value\"), {regex!r}, 2)")
        out.append(f"{var} = {read}.select(pair[0].alias(\"key\"), "
                   f"F.coalesce(F.try_element_at(pair, F.lit(2)), F.lit(\"\")).alias(\"value\"))")
    elif src.offsets:
        x.helpers.add("text_lines_with_offsets")
        parts.uses_window = True
        items = read[len("spark.read.text("):-1] if read.startswith("spark.read.text(") else read
        out.append("# TextInputFormat's records with their keys: `byte_offset` = the line's byte offset in its file")
        out.append(f"{var} = text_lines_with_offsets(spark, {items}, file_name={src.file_name})")
    else:
        out.append("# TextInputFormat: one row per line, column `value` (LF, CRLF and CR end a line)")
        out.append(f"{var} = {read}")
    if src.file_name and not src.offsets and not src.split:
        out.append("# the mapper reads its input split's file name: Spark's file metadata holds it")
        out.append(f'{var} = {var}.withColumn("input_file_name", F.col("_metadata.file_name"))')
    if src.skip_first_line and (src.offsets or src.split):
        out.append(f'{var} = {var}.where(F.col("byte_offset") != 0)  # the mapper skipped byte offset 0 of each file')
    elif src.skip_first_line:
        x.helpers.add("drop_first_line_per_file")
        parts.uses_window = True
        out.append(f"{var} = drop_first_line_per_file({var})  # the mapper skipped byte offset 0 of each file")
    return out


def _side_table_code(t: SideTable, x: ExprWriter) -> list[str]:
    """A side file read whole, as setup() read it into a HashMap / HashSet: one row per key."""
    java = "HashSet" if t.kind == "set" else "HashMap"
    out = [f"# Side file `{t.param}`: setup() reads it whole into the {java} `{t.field}` ({_where(t.origin)}).",
           "# Every map task has the whole table: here it is a small DataFrame joined with F.broadcast.",
           f"{t.name} = (", f"    spark.read.text({t.param})"]
    if t.kind == "map":
        out += ["    # the line's place in the file: where a key comes again, the last put wins",
                '    .withColumn("_line", F.monotonically_increasing_id())']
    out += ["    " + c for s in t.steps for c in _step_code(s, x)]
    e = t.put
    out.append(f"    # {_where(e.origin)}  {e.note}")
    if e.guard is not None:
        out.append(f"    .where({bare(x(e.guard))})")
    if t.kind == "set":
        out += [f'    .select({x(e.key)}.alias("key"))', "    .distinct()",
                '    .withColumn("value", F.lit(True))  # present: looked-up rows get true, the others NULL', ")"]
    else:
        out += [f'    .select({x(e.key)}.alias("key"), {x(e.value)}.alias("value"), "_line")',
                f'    .groupBy("key").agg(F.max_by("value", "_line").alias("value"))  # {java}.put replaces: the last line wins',
                ")"]
    return out


def _lookup_code(s: Lookup, x: ExprWriter, where: str) -> list[str]:
    """A broadcast left join: every row stays; `name` is NULL where the key is not in the table."""
    k = f"_{s.name}_key"
    table_cols = f'F.col("key").alias("{k}"), F.col("value").alias("{s.name}")'
    return [where, f"# a lookup in `{s.table}` (left join: NULL where the key is missing)",
            f'.withColumn("{k}", {x(s.key)})',
            f'.join(F.broadcast({s.table}.select({table_cols})), "{k}", "left")',
            f'.drop("{k}")']


def _map_code(steps: tuple[Step, ...], source: str, var: str, x: ExprWriter) -> list[str]:
    """The map steps as one chain from `source` into `var`."""
    chain = []
    for i, s in enumerate(steps):
        code = _step_code(s, x)
        if isinstance(s, Project) and i + 1 < len(steps):  # ChainMapper: the next mapper reads these rows
            code = [c.replace("(map output: key, value)", "(to the next chained mapper: key, value)") for c in code]
        chain += code
    map_file = steps[0].origin.file.rsplit("/", 1)[-1] if steps else ""
    return ["", f"# Map side: narrow, row by row (no shuffle){' — ' + map_file if map_file else ''}",
            f"{var} = (", f"    {source}", *("    " + c for c in chain), ")"]


def _join_code(r: Join, plan: Plan, x: ExprWriter) -> list[str]:
    """A reduce-side join: one row per key for what the writes test (which sides came, the
    one-value sides), one DataFrame per list side, and each write as a join of those."""
    out = ["", f"# Reduce side: a join by key ({_where(r.origin)}). Each value joins the side its tag picks;",
           "# each write below runs once per combination of the lists it loops over, as in Java."]
    values = "map_output"
    if r.lets or r.keys is not None:
        out += ["values = (", "    map_output", *("    " + c for c in _key_test_code(r, x)),
                *("    " + c for s in r.lets for c in _step_code(s, x)), ")"]
        values = "values"
    read = {c.name for w in r.writes for e in (w.emit.key, w.emit.value, w.emit.guard) for c in walk(e)
            if isinstance(c, Col)}
    per_key = []  # the columns of `keys`
    for side in r.sides:
        cond = bare(x(side.when))
        if f"_has_{side.name}" in read:
            per_key.append(f"# {_where(side.origin)}  {side.note}")
            per_key.append(f"(F.count_if({cond}) > 0).alias(\"_has_{side.name}\"),")
        if not side.many and side.name in read:
            picked = f"F.when({cond}, {x(side.elem)})"
            msg = (f"{_where(side.origin)}: more than one value for `{side.name}` under one key; Java keeps the "
                   "last one, and Hadoop does not define which that is")
            value = f"F.when(F.count_distinct({picked}) > 1, F.raise_error(F.lit({msg!r}))).otherwise(F.max({picked}))"
            if side.default is not None:
                value = f"F.coalesce({value}, {x(Lit(side.elem.jtype, side.default))})"
            per_key.append(f"# {_where(side.origin)}  {side.note}  (one value per key)")
            per_key.append(f"{value}.alias(\"{side.name}\"),")
    if per_key:
        out += [f"keys = {values}.groupBy(\"key\").agg(", *("    " + c for c in per_key), ")"]
    elif any(not w.loops for w in r.writes):
        out.append(f"keys = {values}.select(\"key\").distinct()")
    for side in r.sides:
        if side.many:
            out.append(f"{side.name} = {values}.where({bare(x(side.when))}).select(\"key\", "
                       f"{x(side.elem)}.alias(\"{side.name}\"))  # {_where(side.origin)}")
    names = []
    for i, w in enumerate(r.writes):
        e = w.emit
        name = f"write_{i + 1}"
        names.append(name)
        key = 'F.col("key")' if isinstance(e.key, Col) and e.key.name == "key" else f'{x(e.key)}.alias("key")'
        cols = [key, f'{x(e.value)}.alias("value")', 'F.col("key").alias("_sort_key")', f'F.lit({i}).alias("_write")']
        if plan.sink.partition is not None:
            cols.insert(2, f'{x(plan.sink.partition)}.alias("_partition")')
        first, loops = ("keys", w.loops) if per_key or not w.loops else (w.loops[0], w.loops[1:])
        start = f"    {first}" + (f"  # for each element of `{first}`" if first != "keys" else "")
        out += [f"{name} = (", start, f"    # {_where(e.origin)}  {e.note}"]
        if e.guard is not None:
            out.append(f"    .where({bare(x(e.guard))})")
        out += [f"    .join({loop}, \"key\")  # for each element of `{loop}`" for loop in loops]
        out += [f"    .select({', '.join(cols)})", ")"]
    out.append("return " + ".unionByName(".join(names) + ")" * (len(names) - 1))
    return out


def _fold_code(g: Group, x: ExprWriter) -> list[str]:
    """`.groupBy("key").agg(...)` for a fold, with the per-value columns computed before it."""
    lines = _key_test_code(g, x)
    lines += [c for s in g.lets for c in _step_code(s, x)]
    lines += ['.groupBy("key")', ".agg("]
    for a in g.aggs:
        lines.append(f"    # {_where(a.origin)}  {a.note}")
        lines.append(f"    {agg_code(a, x)}.alias(\"{agg_column(a.name)}\"),")
    return lines + [")"]


def _runs_code(r: Runs, plan: Plan, x: ExprWriter) -> list[str]:
    """A control break: a fold per key (each run of the group is one key), its flush under the
    flush's test, then per group the flushed items in the sort order and reduce()'s writes."""
    flush = r.fold.emits[0]
    term, asc = r.order
    group = ", ".join(f"{x(e)}.alias(\"_group_{i}\")" for i, e in enumerate(r.group, 1))
    run = f'F.col("{r.marker}")' if term == r.field else x(term)
    item = f'F.struct({run}.alias("_run"), {x(flush.value)}.alias("item"))'
    lines = _fold_code(r.fold, x)
    if not r.fold.aggs:  # nothing is summed: the run is only its key
        lines[-1:] = ['    F.count(F.lit(1)).alias("_values"),', ")"]
    out = ["",
           f"# Reduce side: one reduce() call per group of the grouping comparator, its values in the sort order "
           f"({_where(r.origin)});",
           f"# it starts its sums over whenever `{r.marker}` changes (a control break), so each run is one key of the "
           "group:",
           "# a fold per key, then per group the runs it flushed, in the sort order",
           "runs = (",
           "    map_output",
           *("    " + c for c in lines),
           f'    .withColumn("{r.marker}", {x(r.field)})  # the run\'s {r.marker}',
           f"    # {_where(flush.origin)}  {flush.note}  (a run is flushed where the test holds)",
           f'    .select("key", F.when({bare(x(flush.guard))}, {item}).alias("_flushed"))'
           if flush.guard is not None else f'    .select("key", {item}.alias("_flushed"))',
           ")",
           "result = (",
           "    runs",
           f"    .groupBy({group})",
           "    .agg(",
           '        # any key of the group: what reduce() writes reads only the fields they share',
           '        F.first("key").alias("key"),',
           "        # the flushed runs in the sort order (collect_list leaves out the runs not flushed)",
           f'        F.sort_array(F.collect_list("_flushed"){"" if asc else ", asc=False"}).alias("_runs"),',
           "    )",
           f'    .withColumn("{agg_column(r.items)}", F.transform("_runs", lambda run: run["item"]))',
           *("    " + c for c in _reduce_writes(r.writes, x, plan.sink.partition, plan.sink.sort_terms)),
           ")",
           "return result"]
    return out


def _walk_order(r: TopN | TopPerKey) -> str:
    """The write order of kept entries from their rank `_kept` (1 = the first one the trim keeps):
    the same when the loop walks from the kept end, reversed otherwise."""
    return 'F.col("_kept")' if r.keep_largest == r.descending else f'(F.lit({r.n} + 1) - F.col("_kept"))'


def _call_windows(r: EachValue, x: ExprWriter) -> list[str]:
    """The windows of a reducer that writes once per reduce() call (before or after its loop over
    values) or takes the call's first value before that loop: one call per group, in sort order."""
    group = ", ".join(x(e) for e in r.group)
    order = ", ".join(x(e) + ("" if asc else ".desc()") for e, asc in r.order) or "F.lit(0)"
    out = ["# one reduce() call per group" + (" of the grouping comparator, its values in the sort order"
                                              if r.order else " (key): its values in no defined order"),
           f"group_order = Window.partitionBy({group}).orderBy({order})",
           f"whole_group = Window.partitionBy({group})"]
    if r.first_value:
        out += ["# values with the same full key: if the group's first key has several, Hadoop's first is any",
                f"same_key = Window.partitionBy({', '.join(x(e) for e, _ in r.order)})"]
    return out


def _call_position_code(r: EachValue) -> list[str]:
    out = ["# each value's place in its reduce() call", '.withColumn("_place", F.row_number().over(group_order))']
    if r.after:
        out.append('.withColumn("_values", F.count(F.lit(1)).over(whole_group))')
    if r.first_value:
        out += ['.withColumn("_same_key", F.count(F.lit(1)).over(same_key))',
                '.withColumn("_first_ties", F.max(F.when(F.col("_place") == 1, F.col("_same_key"))).over(whole_group))',
                "# it.next() before the loop: the group's first value; the loop goes on from the second",
                '.withColumn(',
                '    "first_value",',
                '    F.when(F.col("_first_ties") > 1, F.raise_error(F.lit("the first value of a group is not defined: '
                'several values share its smallest key")))',
                '    .otherwise(F.first("value").over(group_order)),',
                ')']
    return out


def call_writes(r: EachValue) -> tuple[Emit, ...]:
    """Every write of one reduce() call as a per-row write: those before the loop on the call's first
    row, the loop's on each row it reads (from the second when the first was taken), those after the
    loop on its last row; in Java's order within the call."""
    place, size = Col("int", "_place"), Col("int", "_values")

    def at(emits, test):
        return tuple(replace(e, guard=test if e.guard is None else BoolOp("boolean", "&&", (test, e.guard)))
                     for e in emits)

    loop = at(r.emits, Compare("boolean", ">", place, Lit("int", 1))) if r.first_value else r.emits
    return at(r.before, Compare("boolean", "==", place, Lit("int", 1))) + loop + \
        at(r.after, Compare("boolean", "==", place, size))


def _top_per_key_code(r: TopPerKey, x: ExprWriter, partition: Expr | None) -> list[str]:
    """Distinct values per key → the N kept by the trimmed TreeSet → the writes of the loop over it."""
    order = Call("binary", "utf16_order", (Col("String", "tm_key"),)) if r.elem.jtype == "String" else Col(r.elem.jtype, "tm_key")
    order_code = x(order) + (".desc()" if r.keep_largest else "")
    walk = _walk_order(r)
    (w,) = r.writes
    hidden = _hidden_sort((w,), ())
    extra = [f'{x(partition)}.alias("_partition")'] if partition is not None else []
    if hidden != [("key", True)]:
        extra.append('F.col("key").alias("_sort_key")')
    cols = [f'{x(w.key)}.alias("key")', f'{x(w.value)}.alias("value")', *extra, f'{walk}.alias("_write")']
    lines = ["", f"# Reduce side: wide — rows are shuffled so all values of a key meet ({_where(r.origin)})",
             "# a TreeSet keeps each distinct value once, in sorted order",
             "entries = (", "    map_output", *("    " + c for c in _key_test_code(r, x))]
    lines += ["    " + c for s in r.lets for c in _step_code(s, x)]
    lines += [f'    .select("key", {x(r.elem)}.alias("tm_key"))', "    .distinct()", ")",
              f"# trimmed after every add: the {r.n} {'largest' if r.keep_largest else 'smallest'} distinct values "
              f"of each key remain; the loop writes them {'from the largest down' if r.descending else 'from the smallest up'}",
              f'kept = Window.partitionBy("key").orderBy({order_code})',
              "result = (", "    entries",
              '    .withColumn("_kept", F.row_number().over(kept))', f'    .where(F.col("_kept") <= {r.n})',
              f"    # {_where(w.origin)}  {w.note}",
              f"    .select({', '.join(cols)})", ")", "return result"]
    return lines


def _key_test_code(r: Group | EachValue | TopPerKey | Join, x: ExprWriter) -> list[str]:
    """reduce() works only for keys passing a test of the key: the other keys' rows are dropped."""
    if r.keys is None:
        return []
    return [f".where({x(r.keys)})  # reduce() does nothing for the other keys"]


def _first_keys_code(r: Group, plan: Plan, x: ExprWriter) -> list[str]:
    """An instance counter in the reducer: only the first N keys each reduce task meets may write."""
    order = [f"{x(e)}{'' if asc else '.desc()'}" for e, asc in plan.sink.sort_terms] or ['F.col("key")']
    window = "Window" + (f".partitionBy({x(plan.sink.partition)})" if plan.sink.partition is not None else "")
    task = "each reduce task" if plan.sink.partition is not None else "the reduce task"
    return [f"# {_where(r.origin)}  an instance counter lets only the first {r.first_keys} keys {task} meets "
            "write (keys reach reduce() in sorted order)",
            f'.withColumn("_key_number", F.row_number().over({window}.orderBy({", ".join(order)})))',
            f'.where(F.col("_key_number") <= {r.first_keys})']


def _top_n_limit(r: TopN | TaskTopN, x: ExprWriter) -> str:
    """N: a number, or the job setting it is read from (a script parameter)."""
    return str(r.n) if r.n_setting is None else x(r.n_setting)


def _top_n_code(r: TopN, x: ExprWriter) -> list[str]:
    """Per-key fold → one entry per map key (the last put wins) → the N kept entries → cleanup()'s writes."""
    put = r.fold.emits[0]
    part = r.partition is not None
    by = '"_partition", "tm_key"' if part else '"tm_key"'
    task = "each reduce task's" if part else "the"
    lines = ["", f"# Reduce side: wide — rows are shuffled so all values of a key meet ({_where(r.fold.origin)})",
             "per_key = (", "    map_output"]
    lines += ["    " + c for c in _fold_code(r.fold, x)]
    lines.append(f"    # {_where(put.origin)}  {put.note}  (the TreeMap entry of this key)")
    cols = ['"key"', f'{x(put.key)}.alias("tm_key")', f'{x(put.value)}.alias("tm_value")']
    if part:
        cols.append(f'{x(r.partition)}.alias("_partition")')
    lines += [f"    .select({', '.join(cols)})", ")",
              "# A TreeMap keeps one entry per map key and a later put replaces it. reduce() meets the keys",
              "# in sorted order, so of keys that tie on the map key only the greatest stays, as in the original.",
              f'entries = per_key.groupBy({by}).agg(F.max_by("tm_value", "key").alias("tm_value"))',
              f"# trimmed after every put: {task} {r.n} {'largest' if r.keep_largest else 'smallest'} map keys remain; "
              f"cleanup() writes them {'from the largest down' if r.descending else 'from the smallest up'}"]
    order = 'F.col("tm_key").desc()' if r.keep_largest else 'F.col("tm_key")'
    window = (f'Window.partitionBy("_partition").orderBy({order})' if part else f"Window.orderBy({order})")
    rank = "F.row_number().over(kept)"
    walk = _walk_order(r)
    (w,) = r.writes
    lines += [f"kept = {window}", "result = (", "    entries",
              f'    .withColumn("_kept", {rank})', f'    .where(F.col("_kept") <= {_top_n_limit(r, x)})',
              f"    # {_where(w.origin)}  {w.note}",
              f'    .select({x(w.key)}.alias("key"), {x(w.value)}.alias("value"), '
              + ('"_partition", ' if part else "") + f'{walk}.alias("_write"))', ")", "return result"]
    return lines


def _hidden_sort(emits: tuple[Emit, ...], terms: tuple) -> list[tuple[str, bool]]:
    """Names (and directions) of the hidden columns the reduce output is sorted by, after `_partition`.

    Hadoop writes a reducer's output in reduce-key order: `key` itself when it is written as is;
    `_sort_key` (the reduce key) when another expression is written; `_sort_1`, `_sort_2`, ... when
    the key is a custom Writable sorted by its compareTo() or a sort comparator.
    """
    if terms:
        return [(f"_sort_{i}", asc) for i, (_, asc) in enumerate(terms, 1)]
    if all(isinstance(e.key, Col) and e.key.name == "key" for e in emits):
        return [("key", True)]
    return [("_sort_key", True)]


def _reduce_writes(emits: tuple[Emit, ...], x: ExprWriter, partition: Expr | None = None,
                   terms: tuple = ()) -> list[str]:
    """The reducer's writes as a select: `key`, `value`, plus the hidden sort columns the writer uses.

    Hadoop writes a reducer's output in reduce-key order, and the writes of one reduce() call in
    the order they ran: `_sort_key` keeps the reduce key when the written key is another
    expression, `_write` numbers the writes when there are several.
    """
    hidden = _hidden_sort(emits, terms)
    keeps_key = hidden == [("key", True)]
    if terms:  # a custom key sorts as its compareTo() or sort comparator does, not as Spark orders the struct
        sort = [f'{x(e)}.alias("{name}")' for (e, _), (name, _) in zip(terms, hidden)]
    else:
        sort = [] if keeps_key else ['F.col("key").alias("_sort_key")']
    if partition is not None:  # the reduce task (part file) each key went to, as Hadoop chose it
        sort.insert(0, f'{x(partition)}.alias("_partition")')
    if len(emits) == 1:
        e = emits[0]
        lines = [f"# {_where(e.origin)}  {e.note}" + ("  (written only when the condition holds)" if e.guard is not None else "")]
        if e.guard is not None:
            lines.append(f".where({bare(x(e.guard))})")
        key_code = 'F.col("key")' if keeps_key else f'{x(e.key)}.alias("key")'
        cols = [key_code, x(e.value) + '.alias("value")'] + sort
        lines.append(f".select({', '.join(cols)})")
        return lines
    lines = [f"# {len(emits)} writes per key: one output row for each write whose condition holds, in Java's order",
             ".select(", "    F.explode(", "        F.filter(", "            F.array("]
    for i, e in enumerate(emits):
        # each write prints its own class's toString(), so the values meet as text
        k, v = _typed(x, e.key, "String" if not keeps_key else e.key.jtype), _typed(x, e.value, "String")
        struct = f"F.struct({k}.alias(\"key\"), {v}.alias(\"value\"), F.lit({i}).alias(\"_write\"))"
        lines.append(f"                # {_where(e.origin)}  {e.note}")
        lines.append(f"                F.when({bare(x(e.guard))}, {struct}),"
                     if e.guard is not None else f"                {struct},")
    lines += ["            ),", "            lambda written: written.isNotNull(),", "        )",
              "    ).alias(\"written\"),", *("    " + c + "," for c in sort), ")",
              ".select(" + ", ".join(['"written.key"', '"written.value"']
                                     + ([f'"{n}"' for n, _ in hidden] if not keeps_key else [])
                                     + (['"_partition"'] if partition is not None else [])
                                     + ['"written._write"']) + ")"]
    return lines


def sort_columns(plan: Plan) -> list[str]:
    """The writer's sort of one reducer's output, as code (see _hidden_sort)."""
    r = plan.reduce
    if isinstance(r, TopN):  # cleanup() wrote in map order, one reduce task after another
        return ['"_partition"', '"_write"'] if r.partition is not None else ['"_write"']
    if isinstance(r, Join):  # reduce key order, then the writes in Java's order
        return (['"_partition"'] if plan.sink.partition is not None else []) + ['"_sort_key"', '"_write"']
    if isinstance(r, TopPerKey):  # reduce() writes its kept values in set order, key after key
        cols = [f'"{n}"' for n, _ in _hidden_sort(r.writes, ())] + ['"_write"']
        return (['"_partition"'] if plan.sink.partition is not None else []) + cols
    emits = r.emits if isinstance(r, Group) else call_writes(r) if isinstance(r, EachValue) else \
        r.writes if isinstance(r, Runs) else ()
    cols = [f'"{n}"' if asc else f'F.col("{n}").desc()' for n, asc in _hidden_sort(emits, plan.sink.sort_terms)] \
        if emits else ['"key"']
    if not emits and plan.sink.sort_terms and all(isinstance(e, Col) and e.name == "key" for e, _ in plan.sink.sort_terms):
        cols = ['"key"' if asc else 'F.col("key").desc()' for _, asc in plan.sink.sort_terms]  # pairs as they came
    if len(emits) > 1:
        cols.append('"_write"')
    return (['"_partition"'] if plan.sink.partition is not None else []) + cols


def _stub_lines(items: list[HandWork]) -> list[str]:
    lines = ["# HAND WORK: this job is not complete. Until the items below are written by hand the",
             "# script refuses to run; the steps after this are only the part mrlift could lift."]
    for h in items:
        lines.append(f"# {_where(h.origin)}  {h.snippet}")
        lines.append(f"#   why: {h.reason}")
        lines.append(f"#   try: {h.suggestion}")
    reasons = "; ".join(f"{_where(h.origin)} {h.reason}" for h in items)
    lines.append(f"raise NotImplementedError({('hand work needed: ' + reasons)!r})")
    return lines


def _step_code(s: Step, x: ExprWriter) -> list[str]:
    where = f"# {_where(s.origin)}  {s.note}" if s.note else f"# {_where(s.origin)}"
    if isinstance(s, Let):
        return [where, f".withColumn(\"{s.name}\", {x(s.expr)})"]
    if isinstance(s, Filter):
        return [where, f".where({bare(x(s.cond))})"]
    if isinstance(s, Lookup):
        return _lookup_code(s, x, where)
    if isinstance(s, Explode):
        return [where + "  (one row per element)", f".withColumn(\"{s.name}\", F.explode({x(s.array)}))"]
    if isinstance(s, TaskTopN):
        return _task_top_n_code(s, x)
    if isinstance(s, Project):
        return _project_code(s, x)
    if isinstance(s, Count):
        x.helpers.add("hadoop_counters")
        x.counters = True
        rows = f", {bare(x(s.cond))}" if s.cond is not None else ", None"
        amount = "" if isinstance(s.amount, Lit) and s.amount.value == 1 else f", {x.operand(s.amount, s.amount)}"
        if isinstance(s.group, str) and isinstance(s.name, str):
            return [where + "  (counted in the same pass)",
                    f".transform(counters.add({s.group!r}, {s.name!r}{rows}{amount}))"]
        group, name = (repr(v) if isinstance(v, str) else bare(x(v)) for v in (s.group, s.name))
        x.named_counters = True
        x.helpers.add("hadoop_counters_by_name")
        return [where + "  (a counter per name the data gives: counted in a second pass over the input)",
                f".transform(counters.add_named({group}, {name}{rows}{amount}))"]
    raise TypeError(f"the generator has no handler for {type(s).__name__}")


def _time_zone(writers) -> str | None:
    """The zone every date operation of the job ran in when the formats set it (setTimeZone), else
    None: the JVM's default zone, which the script takes as an option."""
    zones = set().union(*(w.zones for w in writers))
    if len(zones) > 1:  # the lift declines this (migrate.lift.exprs._in_zone)
        raise ValueError(f"dates in several time zones reached the generator: {zones}")
    return next(iter(zones)) if zones else None


def _task_top_n_code(s: TaskTopN, x: ExprWriter) -> list[str]:
    """Each map task's TreeMap: its last put per map key, trimmed to N map keys, then cleanup()'s writes."""
    put = s.put
    order = 'F.col("tm_key").desc()' if s.keep_largest else 'F.col("tm_key")'
    lines = [f"# {_where(put.origin)}  {put.note}  (into this map task's TreeMap)"]
    if put.guard is not None:
        lines.append(f".where({bare(x(put.guard))})")
    lines += [f'.select("_task", "_line", {x(put.key)}.alias("tm_key"), {x(put.value)}.alias("tm_value"))',
              "# a TreeMap keeps one entry per map key and a later put replaces it: the task's last line wins",
              '.groupBy("_task", "tm_key").agg(F.max_by("tm_value", "_line").alias("tm_value"))',
              f"# trimmed after every put: each task keeps its {s.n} {'largest' if s.keep_largest else 'smallest'} "
              "map keys, and cleanup() writes them (the shuffle sorts them again)",
              f'.withColumn("_kept", F.row_number().over(Window.partitionBy("_task").orderBy({order})))',
              f'.where(F.col("_kept") <= {_top_n_limit(s, x)})']
    return lines + _project_code(Project(s.origin, s.note, s.emits), x)


def _project_code(p: Project, x: ExprWriter) -> list[str]:
    ems = p.emits
    if len(ems) == 1:
        e = ems[0]
        lines = [f"# {_where(e.origin)}  {e.note}  (map output: key, value)"]
        if e.guard is not None:
            lines.append(f".where({bare(x(e.guard))})")
        lines.append(f".select({x(e.key)}.alias(\"key\"), {x(e.value)}.alias(\"value\"))")
        return lines
    key_t = _common([e.key for e in ems])
    val_t = _common([e.value for e in ems])
    lines = [f"# {len(ems)} writes per record: one output row for each write whose condition holds, in Java's order"]
    lines.append(".select(")
    lines.append("    F.explode(")
    lines.append("        F.filter(")
    lines.append("            F.array(")
    for e in ems:
        k = _typed(x, e.key, key_t)
        v = _typed(x, e.value, val_t)
        struct = f"F.struct({k}.alias(\"key\"), {v}.alias(\"value\"))"
        lines.append(f"                # {_where(e.origin)}  {e.note}")
        lines.append(f"                F.when({bare(x(e.guard))}, {struct}),"
                     if e.guard is not None else f"                {struct},")
    lines.append("            ),")
    lines.append("            lambda emitted: emitted.isNotNull(),")
    lines.append("        )")
    lines.append("    ).alias(\"emitted\")")
    lines.append(")")
    lines.append(".select(\"emitted.key\", \"emitted.value\")")
    return lines


def _common(exprs: list[Expr | None]) -> str | None:
    types = {e.jtype for e in exprs if e is not None}
    if len(types) <= 1:
        return types.pop() if types else None
    from migrate.lift.exprs import promote

    if types <= {"int", "long", "double", "float"}:
        t = "int"
        for u in types:
            t = promote(t, u)
        return t
    return "String"


def _typed(x: ExprWriter, e: Expr | None, t: str | None) -> str:
    if e is None:
        return f'F.lit(None).cast("{SPARK_TYPES.get(t or "String", "string")}")'
    code = x(e)
    return code if e.jtype == t or t is None else f'{code}.cast("{SPARK_TYPES[t]}")'


def _script_names_of(writers: list[ExprWriter], attr: str, what: str) -> dict:
    """The top-level names the stages' writers gave (regex constants, partitioner functions), merged:
    one name, one meaning."""
    merged: dict = {}
    for w in writers:
        for k, v in getattr(w, attr).items():
            if merged.setdefault(k, v) != v:
                raise TypeError(f"two {what} named {k} in one script")
    return merged


def render_script(plan: Plan, header: dict, hand_work: list[HandWork]) -> str:
    """The whole script, formatted by black."""
    x = ExprWriter()
    parts = build_body(plan, x)
    from migrate.gen.helpers import helper_source

    stages = [_stage(st, i, plan.upstream[i].plan if i + 1 < len(plan.upstream) else plan)
              for i, st in enumerate(plan.upstream)]
    writers = [x, *(st["x"] for st in stages)]
    used = set().union(*(w.helpers for w in writers), {"same_driver_branch"} if plan.mode else set())
    helpers = helper_source(used) if used else ""
    regexes = _script_names_of(writers, "regexes", "regexes")
    task_rules = _script_names_of(writers, "task_rules", "partitioner functions")
    slots = argument_slots(plan.params)
    build_args, build_call = _signature(plan, x)
    doc_end = f"<mrlift-docstring-end-{uuid.uuid4().hex}>"  # unguessable: Java text cannot fake the end
    text = _ENV.get_template("job.py.j2").render(
        doc_end=doc_end, plan=plan, header=header, body=parts.body, helpers=helpers,
        regexes=[(k, raw_string(v)) for k, v in regexes.items()], task_rules=sorted(task_rules.items()),
        uses_window=parts.uses_window or any(st["uses_window"] for st in stages),
        slots=slots, options=[p for p in plan.params if not p.positional and not p.derived], sink=plan.sink,
        mode=_mode(plan), derived=[*_same_argument(plan.params),
                                   *((p.name, _derived_code(p, plan.params), "as the original driver made it from "
                                      "its arguments") for p in plan.params if p.derived)],
        prints=[(_print_code(pieces), end, _where(where)) for where, pieces, end in plan.prints],
        usage={"where": _where(plan.usage[0]), "stream": plan.usage[1], "text": repr(plan.usage[2]), "code": plan.usage[3]}
        if plan.usage else None,
        build_args=build_args, build_call=build_call, hand_work=hand_work, stages=stages,
        counters=any(w.counters for w in writers), dates=any(w.dates for w in writers),
        named_counters=any(w.named_counters for w in writers), time_zone=_time_zone(writers),
        sort_columns=sort_columns(plan),
        tasks=_tasks(plan),
        sort_note=("cleanup() wrote the kept entries in map order, one reduce task after another: the same here"
                   if isinstance(plan.reduce, TopN) else "One reducer wrote one file sorted by key: the same here"),
    )
    doc, _, code = text.partition(doc_end)
    check_size(code)
    return format_code('"""' + docstring_text(doc[3:]) + code)


def _print_code(pieces) -> str:
    """A driver's print of literals and counter values (Java prints a long as Python prints an int)."""
    return " + ".join(repr(p[1]) if p[0] == "str" else f"str(counts.get(({p[1]!r}, {p[2]!r}), 0))" for p in pieces)


def _same_argument(params) -> list[tuple[str, str]]:
    """Parameters the driver reads from an argument another one already holds: the same value."""
    first: dict[tuple, str] = {}
    out = []
    for p in params:
        place = ("at", p.position) if p.position is not None and not p.many else \
            ("end", p.from_end) if p.from_end is not None and not p.many else None
        if place is None:
            continue
        if place in first:
            out.append((p.name, f"args.{first[place]}", "the driver reads the same argument for both"))
        else:
            first[place] = p.name
    return out


def _derived_code(p, params) -> str:
    """A path made from the driver's arguments, as the driver makes it (`args[0] + "/input"`)."""
    holder = {q.position: q.name for q in params if q.position is not None and not q.many}
    return " + ".join(f"args.{holder[i]}" if kind == "arg" else repr(i) for kind, i in p.derived)


@dataclass(frozen=True)
class Slot:
    """One positional argument of the script: the driver's args[i] (or a run of them) it stands for."""

    name: str
    help: str
    nargs: str | None = None  # "+": a run of arguments; "*": arguments the job does not read
    read: bool = True  # the job reads it


def argument_slots(params) -> list[Slot]:
    """The script's positional arguments in the driver's order: args[0], args[1], ..., then a run of
    arguments a loop reads (or, where only arguments counted from the end follow, those between,
    unread), then the arguments counted from the end (args[args.length - k] ... args[args.length - 1])."""
    head, tail = {}, {}  # the first parameter at each place (the others take its value: _same_argument)
    for p in params:
        if p.position is not None and not p.many:
            head.setdefault(p.position, p)
        elif p.from_end is not None and not p.many:
            tail.setdefault(p.from_end, p)
    run = next((p for p in params if p.many), None)

    def unused(label: str, name: str) -> Slot:
        return Slot(name, f"{label} of the original driver (not used by this job)", read=False)

    slots = [Slot(p.name, p.help, "?" if p.optional else None) if p is not None else unused(f"args[{i}]", f"arg{i}")
             for i, p in ((i, head.get(i)) for i in range(run.position if run else max(head, default=-1) + 1))]
    if run is not None:
        slots.append(Slot(run.name, run.help, "+"))
    elif tail:
        slots.append(Slot("middle_args", "the arguments between those read by position and those counted from the "
                                         "end (not used by this job)", "*", read=False))
    for k in range((run.from_end if run else max(tail, default=0)), 0, -1):
        p = tail.get(k)
        slots.append(Slot(p.name, p.help) if p is not None else unused(f"args[args.length - {k}]", f"arg_end_{k}"))
    return slots


MAX_NESTING = 40  # brackets inside brackets: the samples' deepest script has 15
MAX_SCRIPT_BYTES = 256 * 1024  # the samples' largest script has 17 KB


class ScriptTooLarge(ValueError):
    """A script too large or too deeply nested to read (and for black, whose time grows steeply with nesting)."""


def check_size(code: str) -> None:
    """Refuse a script no reviewer could read: the job is then reported, not converted."""
    depth = deepest = 0
    for c in code:
        if c in "([{":
            depth += 1
            deepest = max(deepest, depth)
        elif c in ")]}":
            depth -= 1
    if deepest > MAX_NESTING or len(code) > MAX_SCRIPT_BYTES:
        raise ScriptTooLarge(
            f"the script would be {len(code):,} characters with expressions nested {deepest} deep (limits: "
            f"{MAX_SCRIPT_BYTES:,} and {MAX_NESTING}); a long if/else-if chain is the usual cause: rewrite it as a "
            "lookup table (a small DataFrame joined on the key, or F.create_map) by hand")


def docstring_text(text: str) -> str:
    """Text from the Java sources made safe inside a triple-quoted (non-raw) docstring: backslashes
    doubled (a Windows path, `\\u`, `\\N{...}`), every third quote of a run and a closing quote
    escaped, control characters (NUL, CR) written as escapes. It then reads as the text itself."""
    out, quotes = [], 0
    for i, c in enumerate(text):
        quotes = quotes + 1 if c == '"' else 0
        if c == "\\":
            out.append("\\\\")
        elif c == '"' and (quotes == 3 or i == len(text) - 1):
            out.append('\\"')
            quotes = 0
        elif c in "\n\t" or (c.isprintable() and c not in "\u2028\u2029"):
            out.append(c)
        else:
            out.append(f"\\x{ord(c):02x}" if ord(c) < 0x100 else f"\\u{ord(c):04x}" if ord(c) < 0x10000
                       else f"\\U{ord(c):08x}")
    return "".join(out)


def _signature(plan: Plan, x: ExprWriter) -> tuple[str, str]:
    """build()'s parameters and the call main() makes: input paths (or the previous job's lines),
    side files, settings, counters."""
    paths = (*plan.source.params, *(t.param for t in plan.tables))
    handed = "pairs" if plan.source.fmt == "pairs" else "lines"
    upstream = [f"job_{plan.source.upstream + 1}_{handed}"] if plan.source.upstream is not None else []
    many = dict(zip(plan.source.params, plan.source.lists))
    args = ", ".join([*(f"{u}: DataFrame" for u in upstream),
                      *(f"{p}: list[str]" if many.get(p) else f"{p}: str" for p in paths)])
    call = ", ".join([*upstream, *(f"args.{p}" for p in paths)])
    if x.settings:
        optional = {p.name for p in plan.params if p.optional}
        given = "".join(f", **({{{name!r}: args.{param}}} if args.{param} is not None else {{}})" if param in optional
                        else f", {name!r}: args.{param}" for name, param in plan.arg_settings)
        conf = f"{{**settings(args.defines){given}}}" if given else "settings(args.defines)"
        args, call = args + ", conf: dict[str, str] | None = None", call + f", conf={conf}"
    if x.counters:
        args, call = args + ", counters: HadoopCounters | None = None", call + ", counters=counters"
    return args, call


def _stage(st: Stage, i: int, reader: Plan) -> dict:
    """What the template needs for job i+1 of a chain: its build() and the lines it hands on."""
    x = ExprWriter()
    parts = build_body(st.plan, x)
    args, call = _signature(st.plan, x)
    sink = st.plan.sink
    order = f"result.repartition(1).sortWithinPartitions({', '.join(sort_columns(st.plan))})" \
        if sink.sorted_by_key else "result"
    return {"n": i + 1, "plan": st.plan, "body": parts.body, "x": x, "uses_window": parts.uses_window,
            "build_args": args, "build_call": call, "output": st.output.name, "sink": sink, "order": order,
            "computed": st.output.default == "" and not st.output.positional,
            # a map-only reader writes lines in input order; a mapper with per-task state reads them in order
            "where": _where(st.origin), "in_order": not reader.sink.sorted_by_key or bool(reader.source.split),
            "pairs": reader.source.fmt == "pairs"}


def _mode(plan: Plan) -> dict | None:
    """The check that the argument a driver picks its job by selects this script's branch."""
    m = plan.mode
    if m is None:
        return None
    out = {"param": m.param, "value": repr(m.value), "tests": repr(m.tests), "where": _where(m.origin),
            "index": next(p.position for p in plan.params if p.name == m.param),
            "shown": repr(m.value) if m.value is not None else "none of " + ", ".join(
                dict.fromkeys(repr(lit) for lit, _ in m.tests))}
    out["refusal"] = repr(f": this script runs only the original driver's branch for {out['shown']}; "
                          "mrlift wrote one script per branch")
    return out


def _tasks(plan: Plan) -> int:
    """The original's reduce task count when the script knows the task of every row (else 0)."""
    r = plan.reduce
    if plan.sink.partition is None:
        return 0
    if isinstance(r, TopN):
        return r.partitions
    call = plan.sink.partition  # partition_of(hash, Lit(n)) or checked_partition(task, Lit(n))
    return int(call.args[1].value)


def format_code(text: str) -> str:
    return layout.format_code(text)
