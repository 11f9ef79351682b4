"""Lift Java expressions to plan expressions, deciding Java semantics (types, division, throws).

Recognises: literals, locals and constant fields, String methods (split, trim, case, equals,
startsWith/endsWith/contains, isEmpty, length, toString), Integer/Long/Double parsing,
String.valueOf, arithmetic with binary numeric promotion, comparisons, && || !, ternaries,
widening casts, Math.max/min/abs on integers, Writable get()/toString(), array index/length.
Produces: plan Expr nodes. Caveats: anything else raises Unsupported with the node's line,
which the calling rule turns into a hand-work item; nothing is guessed.
"""
from __future__ import annotations

import dataclasses
import re
from dataclasses import dataclass, field, replace
from typing import Any

from javalang import tree as T

from migrate.java.literals import number_value, string_value
from migrate.lift import regex as rx
from migrate.plan import (INTEGRAL, NO_SPAN, NUMERIC, Arith, BoolOp, Call, Cast, Col, Compare, Cond, Expr, Lit,
                          SideTable, Span, walk)


class Unsupported(Exception):
    """A Java construct no rule understands; carries the line and a reason for the report."""

    def __init__(self, node, reason: str, suggestion: str = "", category: str = ""):
        super().__init__(reason)
        self.node, self.reason, self.suggestion, self.category = node, reason, suggestion, category

    @property
    def line(self) -> int:
        from migrate.java.index import node_lines

        return node_lines(self.node)[0] if self.node is not None else 0


# Which Java exception each throwing operation raises (for catch-and-skip blocks).
THROWS = {"parse_int": "NumberFormatException", "parse_long": "NumberFormatException",
          "parse_double": "NumberFormatException", "parse_float": "NumberFormatException",
          "index": "ArrayIndexOutOfBoundsException", "substring": "StringIndexOutOfBoundsException",
          "char_at": "StringIndexOutOfBoundsException", "date_parse": "ParseException",
          "jt_parse": "DateTimeParseException", "token_at": "NoSuchElementException",
          "div_or_null": "ArithmeticException", "regex_group": "IllegalStateException"}
CATCH_ALL = {"Exception", "RuntimeException", "Throwable", "IllegalArgumentException"}
# Each exception's superclasses up to Throwable (Java SE API docs, java.lang / java.text /
# java.time / java.util): a catch of any of them catches it. ParseException is checked: a catch of
# RuntimeException does not catch it.
_RUNTIME = {"RuntimeException", "Exception", "Throwable"}
_SUPERS = {"ParseException": {"Exception", "Throwable"},
           "DateTimeParseException": {"DateTimeException"} | _RUNTIME,
           "NumberFormatException": {"IllegalArgumentException"} | _RUNTIME,
           "ArrayIndexOutOfBoundsException": {"IndexOutOfBoundsException"} | _RUNTIME,
           "StringIndexOutOfBoundsException": {"IndexOutOfBoundsException"} | _RUNTIME,
           "NoSuchElementException": _RUNTIME, "ArithmeticException": _RUNTIME,
           "IllegalStateException": _RUNTIME}

CONSTANTS = {
    ("Integer", "MAX_VALUE"): (2147483647, "int"), ("Integer", "MIN_VALUE"): (-2147483648, "int"),
    ("Long", "MAX_VALUE"): (9223372036854775807, "long"), ("Long", "MIN_VALUE"): (-9223372036854775808, "long"),
    ("Double", "MAX_VALUE"): (1.7976931348623157e308, "double"), ("Double", "MIN_VALUE"): (5e-324, "double"),
    ("Double", "POSITIVE_INFINITY"): (float("inf"), "double"), ("Double", "NEGATIVE_INFINITY"): (float("-inf"), "double"),
}

PARSERS = {("Integer", "parseInt"): "parse_int", ("Integer", "valueOf"): "parse_int",
           ("Long", "parseLong"): "parse_long", ("Long", "valueOf"): "parse_long",
           ("Double", "parseDouble"): "parse_double", ("Double", "valueOf"): "parse_double",
           ("Float", "parseFloat"): "parse_float", ("Float", "valueOf"): "parse_float"}
PARSED_TYPE = {"parse_int": "int", "parse_long": "long", "parse_double": "double", "parse_float": "float"}
# Math.x(double) -> (result type, plan operation); Java SE API: round returns long, floor/ceil a double.
MATH_UNARY = {"abs": (None, "abs"), "round": ("long", "round"), "floor": ("double", "floor"),
              "ceil": ("double", "ceil"), "sqrt": ("double", "sqrt"), "rint": ("double", "rint")}
UNBOX = {"intValue": "int", "longValue": "long", "doubleValue": "double", "floatValue": "float"}

WRITABLE_OF = {"Text": "String", "IntWritable": "int", "LongWritable": "long", "DoubleWritable": "double",
               "FloatWritable": "float", "BooleanWritable": "boolean", "VIntWritable": "int", "VLongWritable": "long"}


@dataclass
class Writable:
    """A Hadoop Writable object held in a variable; `content` is what it currently holds.

    A Writable *field* outlives the record: where map() sets it only under a condition, a
    later write outside that condition sends the previous record's value. `set_only_if`
    keeps that condition so the lifter can refuse such writes.
    """

    kind: str
    content: Expr | None
    field: bool = False
    set_this_record: bool = False
    set_only_if: Expr | None = None
    fields_set: set = dataclasses.field(default_factory=set)  # custom Writables: fields set on every path this record
    fields_guard: dict = dataclasses.field(default_factory=dict)  # ... and those set only where a guard holds


@dataclass
class Tokenizer:
    """A java.util.StringTokenizer over `tokens` (an array expression already split)."""

    tokens: Expr
    current: Expr | None = None  # set while lifting the body of its loop
    # outside a token loop: how many tokens nextToken() has taken so far on this path (None: it
    # depends on the path, or a loop takes them, so the next token is not known here)
    taken: int | None = 0


@dataclass
class MaybeNull:
    """A local set from `map.get(key)`: NULL where the key is missing. Java throws, prints "null"
    or compares by reference where Spark would carry NULL on, so only null tests may read it;
    inside `if (x != null)` (or after `if (x == null) return;`) it is `value`."""

    value: Expr
    what: str = "a value looked up in a side table, null where the key is missing"


@dataclass
class Opaque:
    """Something bound to a name that expressions may not read (context, reporter, values...)."""

    what: str


@dataclass
class GatheredList:
    """A List a reducer filled with its values (`all.add(v.get())` in the loop), read after the loop:
    `values` is the aggregated array; `sorted` once `Collections.sort(all)` ran (before that the
    order is the values' arrival order, which Hadoop does not define)."""

    name: str
    values: Expr
    sorted: bool = False


@dataclass
class Refused:
    """A field whose value the converter declined where it was made: any use says why."""

    reason: str


@dataclass
class Scope:
    """Names visible to an expression and the exception kinds a surrounding catch swallows."""

    env: dict[str, object]
    caught: frozenset[str] = frozenset()
    file: str = ""  # the Java file, for the origin of every lifted expression
    notes: list[str] = field(default_factory=list)  # assumptions the lift made, for the report
    findings: list = field(default_factory=list)  # what the original does that a reviewer should know (Finding)
    methods: dict[str, list] = field(default_factory=dict)  # helper methods of the class, for inlining
    depth: int = 0
    enums: frozenset[str] = frozenset()  # simple names of enum types in the repository
    structs: dict = field(default_factory=dict)  # custom Writables (fqcn and simple name -> StructInfo)
    # map() only: look a key up in a side table (SideTable, key, node, conditions) -> the looked-up column
    lookup: Any = None
    conditions: tuple = ()  # `a && b`, `c ? x : y`: what holds where the sub-expression runs
    defs: dict = field(default_factory=dict)  # map(): column name -> the expression a Let gave it
    # the class's fields and constants as the class binds them (what its helper methods see; None:
    # all of env), and those of them a local or parameter of the method being lifted hides
    fields: dict | None = None
    shadowed: set = field(default_factory=set)
    # another class of the repository by the simple name used in the code -> HelperClass, or None
    classes: Any = None
    # a type name as the class's imports resolve it (javac's rules) -> fully qualified, or None
    resolve: Any = None
    # the time zones date operations ran in (None: the JVM's default); one script runs in one zone
    zones: set = field(default_factory=set)
    # parameters holding a Hadoop Text (their column is its String; their methods are Text's)
    texts: frozenset = frozenset()

    def on_error(self, op: str) -> str:
        exc = THROWS.get(op)
        if exc is None:
            return "fail"
        kinds = {exc} | _SUPERS.get(exc, set())
        return "null" if kinds & self.caught else "fail"


def promote(a: str, b: str) -> str:
    """Java binary numeric promotion (JLS 5.6.2)."""
    for t in ("double", "float", "long"):
        if t in (a, b):
            return t
    return "int"


def lift(node, scope: Scope) -> Expr:
    """Lift one Java expression node; the result carries the node's file and lines."""
    e = _lift(node, scope)
    if e.origin is NO_SPAN and scope.file:
        from migrate.java.index import node_lines

        a, b = node_lines(node)
        if a:
            e = replace(e, origin=Span(scope.file, a, b))
    return e


def _lift(node, scope: Scope) -> Expr:
    if node is None:
        raise Unsupported(node, "empty expression")
    pre = list(getattr(node, "prefix_operators", None) or [])
    post = list(getattr(node, "postfix_operators", None) or [])
    if post:
        raise Unsupported(node, f"postfix {post[0]} inside an expression changes state")
    if pre:
        node_copy = _without_prefix(node)
        inner = lift(node_copy, scope)
        for op in reversed(pre):
            inner = _prefix(op, inner, node)
        return inner
    sels = list(getattr(node, "selectors", None) or [])  # `"x".equals(s)`, `(a + b).trim()`, `((T) o).m()`
    if isinstance(node, T.Literal):
        return _selectors(_literal(node), sels, scope, node)
    if isinstance(node, T.MemberReference):
        base = _member(node, scope)
        return _selectors(base, node.selectors or [], scope, node)
    if isinstance(node, T.MethodInvocation):
        return _invocation(node, scope)
    if isinstance(node, T.BinaryOperation):
        return _selectors(_binary(node, scope), sels, scope, node)
    if isinstance(node, T.TernaryExpression):
        c = _bool(lift(node.condition, scope), node)
        then_env, else_env = refined(node.condition, scope.env)
        toks = _tokenizers(scope)
        a = lift(node.if_true, replace(scope, env=then_env, conditions=(*scope.conditions, c)))
        after_a = toks.taken_now()
        toks.reset()
        b = lift(node.if_false, replace(scope, env=else_env,
                                        conditions=(*scope.conditions, BoolOp("boolean", "!", (c,)))))
        toks.join(after_a)
        t = a.jtype if a.jtype == b.jtype else promote(a.jtype, b.jtype) if {a.jtype, b.jtype} <= NUMERIC else None
        if t is None:
            raise Unsupported(node, f"conditional mixes {a.jtype} and {b.jtype}")
        return _selectors(Cond(t, c, _widen(a, t), _widen(b, t)), sels, scope, node)
    if isinstance(node, T.Cast):
        if _is_input_split(node):
            return _input_file_name(node, sels)
        return _selectors(_cast(node, scope), sels, scope, node)
    if isinstance(node, T.ClassCreator) and node.type.name in scope.structs:
        info = _struct(scope, node.type.name, node)
        return _selectors(info.construct(node, scope), node.selectors or [], scope, node)
    if isinstance(node, T.ClassCreator):
        w = writable_creator(node, scope)
        if w is not None and w.content is not None:
            return _selectors(w.content, node.selectors or [], scope, node)
        raise Unsupported(node, f"`new {node.type.name}(...)` inside an expression")
    raise Unsupported(node, f"Java expression {type(node).__name__} is not lifted yet")


INPUT_FILE_NAME = "input_file_name"
BYTE_OFFSET = "byte_offset"  # TextInputFormat's key: the line's byte offset in its file (Source.offsets)


def _is_input_split(node: T.Cast) -> bool:
    e = node.expression
    return getattr(node.type, "name", "") == "FileSplit" and isinstance(e, T.MethodInvocation) \
        and e.member == "getInputSplit" and not e.arguments


def _input_file_name(node, sels) -> Expr:
    """`((FileSplit) context.getInputSplit()).getPath().getName()`: the name of the file being read."""
    names = [getattr(x, "member", None) for x in sels]
    if names == ["getPath", "getName"]:
        return Col("String", INPUT_FILE_NAME)
    raise Unsupported(node, "only the input split's file name (getPath().getName()) is lifted",
                      "F.col('_metadata.file_path') holds the full path, written as Spark writes URLs")


def _without_prefix(node):
    import copy

    c = copy.copy(node)
    c.prefix_operators = []
    return c


def _prefix(op: str, e: Expr, node) -> Expr:
    if op == "!":
        return BoolOp("boolean", "!", (_bool(e, node),))
    if op == "-" and e.jtype in NUMERIC:
        if isinstance(e, Lit):
            return Lit(e.jtype, -e.value)
        return Arith(e.jtype, "-", Lit(e.jtype, 0), e)
    if op == "+" and e.jtype in NUMERIC:
        return e
    raise Unsupported(node, f"prefix operator {op} on {e.jtype}")


def _literal(node: T.Literal) -> Expr:
    v = node.value
    if v.startswith('"'):
        return Lit("String", string_value(v))
    if v.startswith("'"):
        return Lit("char", string_value(v))
    if v in ("true", "false"):
        return Lit("boolean", v == "true")
    if v == "null":
        return Lit("null", None)
    value, jtype = number_value(v)
    return Lit(jtype, value)


def _member(node: T.MemberReference, scope: Scope) -> Expr:
    q, m = node.qualifier or "", node.member
    if q in ("", "this"):
        b = scope.env.get(m)
        if b is None:
            raise Unsupported(node, f"`{m}` is not a value the converter can follow (field, parameter or local)")
        return _binding_value(b, node, m)
    if (q, m) in CONSTANTS:
        v, t = CONSTANTS[(q, m)]
        return Lit(t, v)
    if q.split(".")[-1] in scope.enums:
        return Lit("enum", m)  # an enum constant: only its name() / toString() are used as values
    b = scope.env.get(q)
    if isinstance(b, Expr) and b.jtype in scope.structs:  # a public field of a custom Writable
        info = _struct(scope, b.jtype, node)
        if m in info.fields:
            return info.field_of(b, m)
    if b is not None and m == "length":
        arr = _binding_value(b, node, q)
        if arr.jtype.endswith("[]"):
            return Call("int", "size", (arr,))
    raise Unsupported(node, f"`{q}.{m}` is not lifted")


def _binding_value(b, node, name: str) -> Expr:
    if isinstance(b, Expr):
        return b
    if isinstance(b, Writable):
        if b.content is None:
            raise Unsupported(node, f"Writable `{name}` is read before anything was set into it")
        unset = [f for f, v in getattr(b.content, "items", ()) if isinstance(v, Lit) and v.value is None]
        if unset:  # Java would print "null" or fail where Spark would carry NULL on
            raise Unsupported(node, f"`{name}.{unset[0]}` is read before it is set (null in Java)")
        return b.content
    if isinstance(b, Refused):
        raise Unsupported(node, f"`{name}`: {b.reason}")
    if isinstance(b, MaybeNull):
        raise Unsupported(node, f"`{name}` may be null (a key missing from the side table) where it is read: Java "
                                "would throw or print \"null\"", f"test `{name}` for null first, or use getOrDefault")
    raise Unsupported(node, f"`{name}` ({getattr(b, 'what', type(b).__name__)}) is used as a value")


def _selectors(base: Expr, selectors, scope: Scope, node) -> Expr:
    e = base
    for sel in selectors:
        if isinstance(sel, T.ArraySelector):
            if not e.jtype.endswith("[]"):
                raise Unsupported(node, "indexing a value that is not an array")
            idx = lift(sel.index, scope)
            if idx.jtype not in INTEGRAL:
                raise Unsupported(node, "array index is not an integer")
            e = Call(e.jtype[:-2], "index", (e, idx), scope.on_error("index"))
        elif isinstance(sel, T.MethodInvocation):
            e = _method(e, sel, scope)
        elif isinstance(sel, T.MemberReference) and sel.member == "length" and e.jtype.endswith("[]"):
            e = Call("int", "size", (e,))
        else:
            raise Unsupported(node, f"selector {type(sel).__name__} is not lifted")
    return e


def _in_zone(scope: Scope, zone: str | None, node) -> None:
    """Record the time zone a date operation runs in: the script runs in one session zone, so dates
    in the JVM's default zone and in a zone set on a format (or in two set zones) are declined."""
    scope.zones.add(zone)
    if len(scope.zones) > 1:
        shown = ", ".join(sorted(z or "the JVM's default zone" for z in scope.zones))
        raise Unsupported(node, f"dates in more than one time zone ({shown}) are not lifted",
                          "parse and format in one zone, or convert with F.from_utc_timestamp by hand")


HADOOP_STRING_UTILS = "org.apache.hadoop.util.StringUtils"
HADOOP_SPLIT_CHARS = {"COMMA": ",", "ESCAPE_CHAR": "\\"}  # StringUtils' own constants


def _is_type(name: str, fqcn: str, scope: Scope) -> bool:
    """`name` in the code is the class `fqcn` (commons-lang has a StringUtils too, with other rules)."""
    return name == fqcn or bool(name) and scope.resolve is not None and scope.resolve(name) == fqcn


def _hadoop_split(node: T.MethodInvocation, scope: Scope) -> Expr:
    """Hadoop's StringUtils.split (checked on the JVM, tests/unit/expression_forms.py):
    split(s) is split(s, '\\', ','); split(s, esc, sep) splits where sep follows an even number of
    esc chars, keeps the escapes in the fields, drops trailing empty fields ("" gives no field);
    split(s, sep) escapes nothing and is exactly String.split of that one char."""
    s, chars = lift(node.arguments[0], scope), []
    for a in node.arguments[1:]:
        name = a.member if isinstance(a, T.MemberReference) and _is_type(a.qualifier or "", HADOOP_STRING_UTILS, scope) \
            else None
        c = Lit("char", HADOOP_SPLIT_CHARS[name]) if name in HADOOP_SPLIT_CHARS else lift(a, scope)
        if not (isinstance(c, Lit) and c.jtype == "char"):
            raise Unsupported(node, "StringUtils.split with a separator or escape char computed at run time")
        chars.append(c.value)
    if s.jtype != "String":
        raise Unsupported(node, f"StringUtils.split of a {s.jtype}")
    if len(chars) == 1:
        return Call("String[]", "split", (s, Lit("String", regex_quote(chars[0])), Lit("int", 0)))
    escape, sep = chars or ["\\", ","]
    if escape == sep:
        raise Unsupported(node, "StringUtils.split whose escape char is its separator")
    return Call("String[]", "hadoop_split", (s, Lit("char", escape), Lit("char", sep)))


def regex_quote(c: str) -> str:
    """A java.util.regex pattern matching the one char `c` (a backslash makes any non-letter literal)."""
    return c if c.isalnum() else "\\" + c


def _invocation(node: T.MethodInvocation, scope: Scope) -> Expr:
    q, m = node.qualifier or "", node.member
    args = node.arguments or []
    if (q, m) in PARSERS and len(args) == 1:
        s = lift(args[0], scope)
        if s.jtype in NUMERIC and m == "valueOf":  # boxing: Integer.valueOf(int) is the same number
            want = PARSED_TYPE[PARSERS[(q, m)]]
            return _selectors(_widen(s, want) if promote(s.jtype, want) == want else s, node.selectors or [], scope, node)
        if s.jtype != "String":
            raise Unsupported(node, f"{q}.{m} of a {s.jtype}")
        op = PARSERS[(q, m)]
        return _selectors(Call(PARSED_TYPE[op], op, (s,), scope.on_error(op)), node.selectors or [], scope, node)
    if m == "split" and _is_type(q, HADOOP_STRING_UTILS, scope) and 1 <= len(args) <= 3:
        return _selectors(_hadoop_split(node, scope), node.selectors or [], scope, node)
    if q in ("Objects", "java.util.Objects") and m == "equals" and len(args) == 2:
        a, b = (lift(x, scope) for x in args)  # lifted values are never null (MaybeNull cannot be read)
        if a.jtype == b.jtype == "String":
            return _selectors(Compare("boolean", "==", a, b), node.selectors or [], scope, node)
        raise Unsupported(node, f"Objects.equals of a {a.jtype} and a {b.jtype}")
    if (q, m) in (("String", "valueOf"), ("Integer", "toString"), ("Long", "toString"), ("Double", "toString"),
                  ("Float", "toString"), ("Boolean", "toString"), ("Character", "toString")) and len(args) == 1:
        return _selectors(to_string(lift(args[0], scope)), node.selectors or [], scope, node)
    if q in ("Pattern", "java.util.regex.Pattern") and m == "matches" and len(args) == 2:
        regex, text = lift(args[0], scope), lift(args[1], scope)  # Pattern.matches(r, s) is s.matches(r)
        if not (isinstance(regex, Lit) and regex.jtype == "String") or text.jtype != "String":
            raise Unsupported(node, "Pattern.matches of a computed regex or of something that is not a String")
        return _selectors(Call("boolean", "matches", (text, regex)), node.selectors or [], scope, node)
    if q in ("Pattern", "java.util.regex.Pattern") and m == "compile" or \
            q and "." not in q and isinstance(scope.env.get(q), (rx.CompiledPattern, rx.MatcherVar)):
        obj = regex_object(node, scope)
        if not isinstance(obj, Expr):
            raise Unsupported(node, f"a {type(obj).__name__} is used as a value")
        return obj
    if q == "Character" and m in CHAR_CLASSES and len(args) == 1:
        c = lift(args[0], scope)
        if c.jtype != "char":
            raise Unsupported(node, f"Character.{m} of a {c.jtype} (a code point) is not lifted")
        return _selectors(Call("boolean", "char_is", (c, Lit("String", CHAR_CLASSES[m]))), node.selectors or [],
                          scope, node)
    if (q, m) == ("String", "join") and len(args) == 2 and isinstance(args[1], T.MemberReference) \
            and isinstance(scope.env.get(args[1].member), GatheredList) and not args[1].qualifier:
        g = scope.env[args[1].member]  # String.join(sep, list): the list's elements in its order
        sep = lift(args[0], scope)
        if not g.sorted or g.values.jtype != "String[]" or not (isinstance(sep, Lit) and sep.jtype == "String"):
            raise Unsupported(node, f"String.join of `{g.name}`: its order is not defined, its elements are not "
                                    "Strings or the separator is computed")
        return _selectors(Call("String", "join_array", (g.values, sep)), node.selectors or [], scope, node)
    if (q, m) == ("String", "join") and len(args) >= 2:
        sep, *parts = (lift(x, scope) for x in args)
        if not (isinstance(sep, Lit) and sep.jtype == "String"):
            raise Unsupported(node, "String.join with a computed separator")
        if len(parts) == 1 and parts[0].jtype == "String[]":
            return _selectors(Call("String", "join_array", (parts[0], sep)), node.selectors or [], scope, node)
        if any(p.jtype != "String" for p in parts):
            raise Unsupported(node, "String.join of values that are not Strings")
        return _selectors(Call("String", "join", (sep, *parts)), node.selectors or [], scope, node)
    if q in ("LocalDateTime", "LocalDate") and m == "parse" and len(args) == 2:
        from migrate.lift import dates

        fmt = _formatter_argument(args[1], scope, node)
        text = lift(args[0], scope)
        return _selectors(dates.java_time_parse(q, text, fmt, scope.on_error("jt_parse")), node.selectors or [],
                          scope, node)
    if (q, m) == ("String", "format") and args:
        fmt = lift(args[0], scope)
        if not (isinstance(fmt, Lit) and fmt.jtype == "String"):
            raise Unsupported(node, "String.format with a computed format string")
        values = [lift(a, scope) for a in args[1:]]
        _check_format(fmt.value, values, node)
        from migrate.java.index import node_lines

        scope.notes.append(f"{scope.file}:{node_lines(node)[0]} String.format uses the JVM's default locale; the "
                           "script formats as an English (US) locale does (decimal point, comma grouping)")
        return _selectors(Call("String", "format", (fmt, *values)), node.selectors or [], scope, node)
    if q == "Math" and m in ("max", "min") and len(args) == 2:
        a, b = lift(args[0], scope), lift(args[1], scope)
        t = promote(a.jtype, b.jtype)
        if t not in NUMERIC:
            raise Unsupported(node, f"Math.{m} of {a.jtype} and {b.jtype}")
        op = ("greatest" if m == "max" else "least") if t in INTEGRAL else f"java_{m}"  # NaN and -0.0 rules
        return Call(t, op, (_widen(a, t), _widen(b, t)))
    if q == "Math" and m in MATH_UNARY and len(args) == 1:
        a = lift(args[0], scope)
        if a.jtype not in NUMERIC:
            raise Unsupported(node, f"Math.{m} of a {a.jtype}")
        if m == "abs":
            return Call(a.jtype, "abs", (a,))
        if m == "round" and a.jtype == "float":
            raise Unsupported(node, "Math.round(float) returns an int rounded in float precision")
        out_t, op = MATH_UNARY[m]
        return _selectors(Call(out_t, op, (_widen(a, "double"),)), node.selectors or [], scope, node)
    if (q, m) == ("Math", "pow") and len(args) == 2:
        a, b = (lift(x, scope) for x in args)
        return Call("double", "pow", (_widen(a, "double"), _widen(b, "double")))
    if q and "." not in q and q in scope.env:
        recv = scope.env[q]
        from migrate.lift import dates

        if isinstance(recv, Refused):
            raise Unsupported(node, f"`{q}`: {recv.reason}")
        if q in scope.texts and not isinstance(recv, Writable) or isinstance(recv, Writable) and recv.kind == "Text":
            base = _binding_value(recv, node, q)
            return _selectors(_text_method(base, node, scope), node.selectors or [], scope, node)
        if isinstance(recv, dates.DateFormat):
            _in_zone(scope, recv.zone, node)
            if m == "parse" and len(args) == 1:
                arg = lift(args[0], scope)
                if arg.jtype != "String":
                    raise Unsupported(node, "parse of a value that is not a String")
                return _selectors(dates.parse(recv, arg, scope.on_error("date_parse")), node.selectors or [], scope, node)
            if m == "format" and len(args) == 1:
                d = lift(args[0], scope)
                if d.jtype != "Date":
                    raise Unsupported(node, "format of something that is not a Date")
                return _selectors(dates.format_(recv, d, node), node.selectors or [], scope, node)
            raise Unsupported(node, f"SimpleDateFormat.{m}() is not lifted")
        if isinstance(recv, dates.CalendarVar):
            if m == "get" and len(args) == 1 and isinstance(args[0], T.MemberReference) and args[0].qualifier == "Calendar":
                if recv.date is None:
                    raise Unsupported(node, "Calendar read before setTime() in this record")
                _in_zone(scope, None, node)
                return dates.field(recv.date, args[0].member, node)
            raise Unsupported(node, f"Calendar.{m}() is not lifted")
        if isinstance(recv, SideTable):
            return _selectors(_table_call(recv, node, scope), node.selectors or [], scope, node)
        from migrate.lift.collections import ConstCollection, ConstMap

        if isinstance(recv, ConstMap):
            return _selectors(_map_call(recv, node, scope), node.selectors or [], scope, node)
        if isinstance(recv, ConstCollection):
            return _selectors(_collection_call(recv, node, scope), node.selectors or [], scope, node)
        if isinstance(recv, GatheredList):
            return _selectors(_gathered_call(recv, node, scope), node.selectors or [], scope, node)
        if isinstance(recv, Tokenizer):
            if m == "nextToken" and recv.current is not None:
                return _selectors(recv.current, node.selectors or [], scope, node)
            return _selectors(_token_cursor(recv, node, scope), node.selectors or [], scope, node)
        base = _binding_value(recv, node, q)
        return _selectors(_method(base, node, scope), node.selectors or [], scope, node)
    if "." in q and q.rsplit(".", 1)[0].split(".")[-1] in scope.enums:  # Kind.LONG_RIDE.name()
        return _selectors(_method(Lit("enum", q.rsplit(".", 1)[1]), node, scope), node.selectors or [], scope, node)
    if q in ("", "this") and m in scope.methods:
        return _selectors(inline_call(node, scope), node.selectors or [], scope, node)
    home = scope.classes(q) if q and "." not in q and q not in scope.env and scope.classes is not None else None
    if home is not None and m in home.methods:  # a static helper of another class of the repository
        return _selectors(inline_call(node, scope, home), node.selectors or [], scope, node)
    raise Unsupported(node, f"call `{(q + '.') if q else ''}{m}(...)` is not lifted",
                      "inline the helper by hand, or express it with pyspark.sql.functions")


def regex_object(node, scope: Scope):
    """A Pattern or Matcher expression (`Pattern.compile(...)`, `P.matcher(s)`, a local or field
    holding one) with its selectors applied: a CompiledPattern, a MatcherVar, or a lifted value."""
    if isinstance(node, T.MemberReference) and not node.qualifier and not node.selectors:
        obj = scope.env.get(node.member)
        if isinstance(obj, (rx.CompiledPattern, rx.MatcherVar)):
            return obj
        raise Unsupported(node, f"`{node.member}` is not a Pattern or Matcher the converter knows")
    if not isinstance(node, T.MethodInvocation):
        raise Unsupported(node, "a Pattern or Matcher made in a way the converter does not read")
    q, sels = node.qualifier or "", list(node.selectors or [])
    if q in ("Pattern", "java.util.regex.Pattern") and node.member == "compile":
        obj = rx.compile_pattern(node, scope, lift, Unsupported)
    else:
        obj = scope.env.get(q)
        sels.insert(0, node)
    while sels and isinstance(obj, (rx.CompiledPattern, rx.MatcherVar)):
        sel = sels.pop(0)
        if not isinstance(sel, T.MethodInvocation):
            raise Unsupported(node, "a Pattern or Matcher used in a way the converter does not read")
        obj = rx.pattern_call(obj, sel, scope, lift, Unsupported) if isinstance(obj, rx.CompiledPattern) \
            else rx.matcher_call(obj, sel, scope, Unsupported)
    return _selectors(obj, sels, scope, node) if isinstance(obj, Expr) else obj


class _tokenizers:
    """The StringTokenizers in scope around code that runs on some paths only (a ternary's
    branches, the right side of && and ||): where the paths took different numbers of tokens,
    the cursor is unknown afterwards."""

    def __init__(self, scope: Scope):
        self.toks = [t for t in scope.env.values() if isinstance(t, Tokenizer)]
        self.before = self.taken_now()

    def taken_now(self) -> list:
        return [t.taken for t in self.toks]

    def reset(self) -> None:
        for t, k in zip(self.toks, self.before):
            t.taken = k

    def join(self, other: list) -> None:
        for t, k in zip(self.toks, other):
            if t.taken != k:
                t.taken = None


def map_lookup(c, key_node, scope: Scope, node, default: Expr) -> Expr:
    """The value a constant map holds for a key, or `default` (a null Lit: no value)."""
    key = _map_key(c, key_node, scope, node)
    flat = [lit for k, v in c.entries for lit in (Lit(c.key_type, k), Lit(c.value_type, v))]
    return Call(c.value_type, "const_lookup", (key, default, *flat))


def _map_key(c, key_node, scope: Scope, node) -> Expr:
    """A key looked up in a constant map, of the map's key type."""
    key = lift(key_node, scope)
    if key.jtype != c.key_type:
        raise Unsupported(node, f"{c.name} looked up with a {key.jtype} key in a map of {c.key_type} keys: "
                                "equals() across boxed types is false in Java", "look up a key of the map's type")
    return key


def _map_call(c, node: T.MethodInvocation, scope: Scope) -> Expr:
    """A read of a constant map (lift.collections): getOrDefault, containsKey, size, emptiness."""
    m, args = node.member, node.arguments or []
    if m == "getOrDefault" and len(args) == 2:
        d = lift(args[1], scope)
        d = _widen(d, c.value_type) if {d.jtype, c.value_type} <= NUMERIC and promote(d.jtype, c.value_type) == \
            c.value_type else d
        if d.jtype != c.value_type:
            raise Unsupported(node, f"{c.name}.getOrDefault with a {d.jtype} default in a map of {c.value_type}")
        return map_lookup(c, args[0], scope, node, d)
    if m == "containsKey" and len(args) == 1:
        key = _map_key(c, args[0], scope, node)
        return Call("boolean", "isin", (key, *(Lit(c.key_type, k) for k, _ in c.entries)))
    if m == "size" and not args:
        return Lit("int", len(c.entries))
    if m == "isEmpty" and not args:
        return Lit("boolean", not c.entries)
    raise Unsupported(node, f"{c.name}.{m}() of a constant map: the value may be null where the key is missing"
                            if m == "get" else f"{c.name}.{m}() of a constant map is not lifted",
                      "declare it as a local (`String v = map.get(k);`) and test it for null, or use getOrDefault")


def _collection_call(c, node: T.MethodInvocation, scope: Scope) -> Expr:
    """A read of a constant collection (lift.collections): membership, size, emptiness."""
    m, args = node.member, node.arguments or []
    if m == "contains" and len(args) == 1:
        e = lift(args[0], scope)
        if e.jtype != c.jtype:
            raise Unsupported(node, f"{c.name}.contains() of a {e.jtype} in a collection of {c.jtype}: equals() "
                                    "across boxed types is false in Java", "compare values of one type")
        return Call("boolean", "isin", (e, *(Lit(c.jtype, v) for v in dict.fromkeys(c.values))))
    if m == "size" and not args:
        return Lit("int", len(set(c.values)) if c.is_set else len(c.values))
    if m == "isEmpty" and not args:
        return Lit("boolean", not c.values)
    raise Unsupported(node, f"{c.name}.{m}() of a constant collection is not lifted")


def _gathered_call(g: GatheredList, node: T.MethodInvocation, scope: Scope) -> Expr:
    """size() and isEmpty() of a list of the values; get(i) once it is sorted (List.get throws
    IndexOutOfBoundsException outside 0..size()-1: the task fails, as `index` does here)."""
    m, args = node.member, node.arguments or []
    if m == "size" and not args:
        return Call("int", "size", (g.values,))
    if m == "isEmpty" and not args:
        return Compare("boolean", "==", Call("int", "size", (g.values,)), Lit("int", 0))
    if m == "get" and len(args) == 1 and g.sorted:
        i = lift(args[0], scope)
        if i.jtype != "int":
            raise Unsupported(node, f"{g.name}.get() with a {i.jtype} index")
        return Call(g.values.jtype[:-2], "index", (g.values, i))
    if m == "get" and len(args) == 1:
        raise Unsupported(node, f"`{g.name}` holds the values in the order they reached reduce(), which Hadoop does not "
                                "define without a secondary sort, so the original's output was not deterministic",
                          "sort the list first (Collections.sort) if any order will do", category="value-order")
    raise Unsupported(node, f"{g.name}.{m}() of the list of values is not lifted")


def _token_cursor(tok: Tokenizer, node: T.MethodInvocation, scope: Scope) -> Expr:
    """StringTokenizer calls outside a token loop, where the number of tokens taken so far is
    the same on every path: the k-th nextToken() is tokens[k] (NoSuchElementException where
    there is none), hasMoreTokens() is size(tokens) > k, countTokens() is size(tokens) - k."""
    m = node.member
    if tok.current is not None or tok.taken is None or node.arguments:
        raise Unsupported(node, f"StringTokenizer.{m}() where the tokens taken before it depend on the path "
                                "or on a loop", "split the line once and index the array")
    k = Lit("int", tok.taken)
    size = Call("int", "size", (tok.tokens,))
    if m in ("hasMoreTokens", "hasMoreElements"):
        return Compare("boolean", ">", size, k)
    if m == "countTokens":
        return Arith("int", "-", size, k)
    if m in ("nextToken", "nextElement"):
        tok.taken += 1
        return Call("String", "index", (tok.tokens, k), scope.on_error("token_at"))
    raise Unsupported(node, f"StringTokenizer.{m}() is not lifted")


def lookup_key(table, arg, scope: Scope, node) -> Expr:
    """The key of a side-table lookup, of the table's key type (else Java's equals() never matches)."""
    key = lift(arg, scope)
    if key.jtype != table.key_type:
        raise Unsupported(node, f"the key is a {key.jtype} and the table holds {table.key_type} keys: Java's equals() "
                                "never matches them")
    return key


def _table_call(table, node: T.MethodInvocation, scope: Scope) -> Expr:
    """`map.containsKey(k)`, `map.getOrDefault(k, d)`, `set.contains(k)` on a side table."""
    m, args = node.member, node.arguments or []
    if scope.lookup is None:
        raise Unsupported(node, "a side table read outside map()")
    wanted = {"map": {"containsKey": 1, "getOrDefault": 2}, "set": {"contains": 1}}[table.kind]
    if m == "get" and table.kind == "map":
        raise Unsupported(node, f"`{table.field}.get(...)` inside an expression: a missing key gives null, which Java "
                                "and Spark treat differently", "assign it to a local, and test that for null")
    if wanted.get(m) != len(args):
        raise Unsupported(node, f"{'HashMap' if table.kind == 'map' else 'HashSet'}.{m}() of a side table is not lifted")
    found = scope.lookup(table, lookup_key(table, args[0], scope, node), node, scope.conditions)
    if m == "getOrDefault":
        default = lift(args[1], scope)
        if isinstance(default, Lit) and default.value is None or default.jtype != table.value_type:
            raise Unsupported(node, f"getOrDefault with a default that is not a {table.value_type}")
        return Cond(table.value_type, Call("boolean", "is_not_null", (found,)), found, default)
    return Call("boolean", "is_not_null", (found,))  # the table's values are never null


def _struct(scope: Scope, name: str, node):
    info = scope.structs.get(name)
    if isinstance(info, Unsupported):
        raise Unsupported(node, info.reason, info.suggestion)
    return info


def text_params(method) -> frozenset:
    """Names of a method's parameters declared as Hadoop Text (for Scope.texts)."""
    return frozenset(p.name for p in method.parameters if getattr(p.type, "name", "").split(".")[-1] == "Text")


def _text_method(text: Expr, node: T.MethodInvocation, scope: Scope) -> Expr:
    """A method of a Hadoop Text object (not of the String it holds): Text works on UTF-8 bytes, so
    only the methods whose meaning is known are read (Hadoop API docs, org.apache.hadoop.io.Text)."""
    m, args = node.member, node.arguments or []
    if m == "toString" and not args:
        return text
    if m == "getLength" and not args:  # bytes of the UTF-8 encoding
        return Call("int", "utf8_length", (text,))
    if m == "hashCode" and not args:  # WritableComparator.hashBytes over the UTF-8 bytes, not String.hashCode
        return Call("int", "text_hash", (text,))
    if m == "equals" and len(args) == 1:
        return _text_equals(text, node, args[0], scope)
    why = {"equals": "Text.equals is true only for another Text (a String argument is never equal)",
           "charAt": "Text.charAt takes a byte position and gives a code point",
           "getBytes": "Text.getBytes gives the backing array, which can be longer than getLength()",
           "find": "Text.find gives a byte position"}.get(m, "Text is not a String")
    raise Unsupported(node, f"Text.{m}(...) is not lifted: {why}", "call toString() first if the String method is meant")


def _text_equals(text: Expr, node: T.MethodInvocation, arg, scope: Scope) -> Expr:
    """Text.equals(o) is true only when o is a Text with the same bytes (org.apache.hadoop.io.Text,
    BinaryComparable.equals): another Text compares as text; a String literal is never equal, which
    the original did for every record, so the script does too and says so."""
    from migrate.java.index import node_lines
    from migrate.plan import Finding

    name = arg.member if isinstance(arg, T.MemberReference) and not arg.qualifier and not arg.selectors else None
    other = scope.env.get(name) if name else None
    if name and (name in scope.texts or isinstance(other, Writable) and other.kind == "Text"):
        return Compare("boolean", "==", text, _binding_value(other, node, name))
    if isinstance(arg, T.Literal) and arg.value.startswith('"'):
        line = node_lines(node)[0]
        scope.findings.append(Finding(
            "text-equals-string", Span(scope.file, line, line),
            f"a Text is compared with the String {arg.value} by equals(): Text.equals is true only for another Text, "
            "so the test is false for every record in the original; so it is in the script",
            f"if the job meant to compare text, call toString() first: .toString().equals({arg.value}); that changes "
            "the output"))
        return Lit("boolean", False)
    raise Unsupported(node, "Text.equals(...) of something other than a Text or a String literal is not lifted: "
                            "Text.equals is true only for another Text", "call toString() first if text is meant")


def _method(recv: Expr, node: T.MethodInvocation, scope: Scope) -> Expr:
    m, args = node.member, node.arguments or []
    t = recv.jtype
    if t in scope.structs:  # getters, toString() and helpers of a custom Writable, inlined
        return _struct(scope, t, node).call(recv, m, [lift(x, scope) for x in args], node, scope)
    if t in ("LocalDateTime", "LocalDate", "DayOfWeek"):
        return _java_time_method(recv, node, scope)
    if m in ("toLowerCase", "toUpperCase") and len(args) == 1 and t == "String":
        if not _plain_locale(args[0]):
            raise Unsupported(node, f"{m}() with a locale other than a java.util.Locale constant",
                              "Turkish, Azeri and Lithuanian map some letters differently; check the locale")
        return Call("String", "lower" if m == "toLowerCase" else "upper", (recv,))
    a = [lift(x, scope) for x in args]
    if m == "toString" and not a:
        return to_string(recv)
    if m == "get" and not a and t in NUMERIC | {"boolean"}:
        return recv  # IntWritable.get() and friends
    if t == "enum" and m in ("name", "toString") and not a and isinstance(recv, Lit):
        return Lit("String", recv.value)
    if t == "Date" and m == "getTime" and not a:
        from migrate.lift import dates

        return dates.millis(recv)
    if m in UNBOX and not a and t in NUMERIC:
        want = UNBOX[m]
        if promote(t, want) != want:
            raise Unsupported(node, f"{m}() narrows a {t}")
        return _widen(recv, want)
    if t != "String":
        raise Unsupported(node, f"method {m}() on a {t} value is not lifted")
    if m == "split" and a and isinstance(a[0], Lit) and a[0].jtype == "String":
        limit = a[1] if len(a) > 1 else Lit("int", 0)
        if not isinstance(limit, Lit):
            raise Unsupported(node, "split limit is not a constant")
        # Java's limit 0 drops trailing empty strings; Spark's split never does.
        return Call("String[]", "split" if limit.value == 0 else "split_limit", (recv, a[0], limit))
    if m in ("trim", "strip", "stripLeading", "stripTrailing") and not a:
        return Call("String", {"trim": "trim", "strip": "strip", "stripLeading": "strip_leading",
                               "stripTrailing": "strip_trailing"}[m], (recv,))
    if m in ("toLowerCase", "toUpperCase") and not a:
        if not a:
            from migrate.java.index import node_lines

            scope.notes.append(f"{scope.file}:{node_lines(node)[0]} {m}() uses the JVM's default locale; the script "
                               "assumes it was not Turkish or Azeri (where I/i map differently)")
        return Call("String", "lower" if m == "toLowerCase" else "upper", (recv,))
    if m == "equals" and len(a) == 1:
        if a[0].jtype != "String":
            return Lit("boolean", False)
        # `"x".equals(s)` is `s.equals("x")` here: lifted values are never null
        return Compare("boolean", "==", *((a[0], recv) if isinstance(recv, Lit) else (recv, a[0])))
    if m == "equalsIgnoreCase" and len(a) == 1 and a[0].jtype == "String":
        return Call("boolean", "equals_ignore_case", (recv, a[0]))
    if m in ("startsWith", "endsWith", "contains") and len(a) == 1 and a[0].jtype == "String":
        return Call("boolean", {"startsWith": "starts_with", "endsWith": "ends_with", "contains": "contains"}[m], (recv, a[0]))
    if m == "isEmpty" and not a:
        return Call("boolean", "is_empty", (recv,))
    if m == "isBlank" and not a:
        return Call("boolean", "is_blank", (recv,))
    if m == "length" and not a:
        return Call("int", "length", (recv,))
    if m == "toCharArray" and not a:
        return Call("char[]", "chars", (recv,))
    if m == "getLength" and not a:  # Text.getLength(): bytes of the UTF-8 encoding
        return Call("int", "utf8_length", (recv,))
    if m == "substring" and 1 <= len(a) <= 2 and all(x.jtype in ("int",) for x in a):
        return Call("String", "substring", (recv, *a), scope.on_error("substring"))
    if m == "charAt" and len(a) == 1 and a[0].jtype == "int":
        return Call("char", "char_at", (recv, a[0]), scope.on_error("char_at"))
    if m in ("indexOf", "lastIndexOf") and len(a) == 1 and a[0].jtype in ("String", "char"):
        return Call("int", "index_of" if m == "indexOf" else "last_index_of", (recv, to_string(a[0])))
    if m == "matches" and len(a) == 1 and isinstance(a[0], Lit):
        return Call("boolean", "matches", (recv, a[0]))
    if m == "replace" and len(a) == 2 and all(x.jtype in ("String", "char") for x in a):
        return Call("String", "replace", (recv, to_string(a[0]), to_string(a[1])))
    if m in ("replaceAll", "replaceFirst") and len(a) == 2 and all(isinstance(x, Lit) for x in a):
        return Call("String", "replace_all" if m == "replaceAll" else "replace_first", (recv, a[0], a[1]))
    if m == "concat" and len(a) == 1 and a[0].jtype == "String":
        return Call("String", "concat", (recv, a[0]))
    if m == "hashCode" and not a:  # s[0]*31^(n-1) + ... over UTF-16 units, int wrap-around (Java SE API)
        return Call("int", "string_hash", (recv,))
    if m in ("compareTo", "compareToIgnoreCase") and len(a) == 1 and a[0].jtype == "String":
        return Call("int", "compare_to" if m == "compareTo" else "compare_to_ignore_case", (recv, a[0]))
    raise Unsupported(node, f"String.{m}(...) is not lifted yet")


# Character.isX(char) -> the java.util.regex class that is defined as that very method
# (Java SE API, java.util.regex.Pattern: "java.lang.Character classes"); Spark's rlike is java.util.regex.
CHAR_CLASSES = {"isDigit": "javaDigit", "isLetter": "javaLetter", "isLetterOrDigit": "javaLetterOrDigit",
                "isWhitespace": "javaWhitespace", "isUpperCase": "javaUpperCase", "isLowerCase": "javaLowerCase",
                "isAlphabetic": "javaAlphabetic", "isSpaceChar": "javaSpaceChar"}


def char_code(e: Expr) -> Expr:
    """A char as the int of its UTF-16 code unit (JLS 5.6: a char in arithmetic is promoted to int)."""
    if isinstance(e, Lit):
        return Lit("int", ord(e.value))
    return Call("int", "char_code", (e,))


def _plain_locale(arg) -> bool:
    """`Locale.ROOT`, `Locale.US`, ...: java.util.Locale's constants name no locale whose case
    mapping differs from the root locale's (only tr, az and lt differ; Java SE API, String.toLowerCase)."""
    return isinstance(arg, T.MemberReference) and arg.qualifier in ("Locale", "java.util.Locale") \
        and arg.member.isupper() and not arg.selectors


def _java_time_formatter(call: T.MethodInvocation):
    """`DateTimeFormatter.ofPattern("...")` -> a JavaTimeFormat (other factories are declined)."""
    from migrate.lift import dates
    from migrate.java.literals import string_value

    args = call.arguments or []
    if call.member != "ofPattern" or len(args) != 1 or not (isinstance(args[0], T.Literal) and args[0].value.startswith('"')):
        raise Unsupported(call, "DateTimeFormatter other than ofPattern(\"...\") is not lifted yet")
    pattern = string_value(args[0].value)
    dates.check_java_time_pattern(pattern, call)
    return dates.JavaTimeFormat(pattern)


def _formatter_argument(arg, scope: Scope, node):
    """A DateTimeFormatter passed as an argument: a known field/local, or ofPattern("...") written inline."""
    from migrate.lift import dates

    fmt = scope.env.get(arg.member) if isinstance(arg, T.MemberReference) and not arg.qualifier else None
    if isinstance(arg, T.MethodInvocation) and arg.qualifier == "DateTimeFormatter":
        fmt = _java_time_formatter(arg)
    if not isinstance(fmt, dates.JavaTimeFormat):
        raise Unsupported(node, "a DateTimeFormatter the converter does not know")
    return fmt


def _java_time_method(recv: Expr, node: T.MethodInvocation, scope: Scope) -> Expr:
    """LocalDateTime / LocalDate getters and format(fmt); DayOfWeek.getValue() (Monday = 1)."""
    from migrate.lift import dates

    m, args = node.member, node.arguments or []
    if recv.jtype == "DayOfWeek":
        if m == "getValue" and not args:
            return Call("int", "jt_field", (recv.args[0], Lit("String", "iso_day_of_week")))
        raise Unsupported(node, f"DayOfWeek.{m}() is not lifted")
    if m in dates.JAVA_TIME_GETTERS and not args:
        if recv.jtype == "LocalDate" and m in ("getHour", "getMinute", "getSecond"):
            raise Unsupported(node, f"LocalDate has no {m}()")
        return dates.java_time_field(recv, m)
    if m == "getDayOfWeek" and not args:
        return Call("DayOfWeek", "jt_day_of_week", (recv,))
    if m == "format" and len(args) == 1:
        return dates.java_time_format(recv, _formatter_argument(args[0], scope, node), node)
    raise Unsupported(node, f"{recv.jtype}.{m}() is not lifted yet")


FORMAT_SPEC = re.compile(r"%(?:(\d+)\$)?([-#+ 0,(]*)(\d+)?(?:\.(\d+))?([a-zA-Z%])")


def _check_format(fmt: str, values: list[Expr], node) -> None:
    """Accept the format conversions whose Spark format_string output was checked against Java."""
    specs = [m for m in FORMAT_SPEC.finditer(fmt) if m.group(5) not in ("%", "n")]
    if len(specs) != len(values) or any(m.group(1) for m in specs):
        raise Unsupported(node, "String.format with a number of arguments that differs from its conversions")
    for m, v in zip(specs, values):
        conv = m.group(5)
        ok = (conv == "s") or (conv == "d" and v.jtype in INTEGRAL) or (conv == "f" and v.jtype in ("double", "float"))
        if not ok:
            raise Unsupported(node, f"String.format conversion %{conv} of a {v.jtype} is not lifted")


def to_string(e: Expr, scope: Scope | None = None) -> Expr:
    """Java's String.valueOf / toString of a value (Double.toString for doubles)."""
    if scope is not None and e.jtype in scope.structs:
        return _struct(scope, e.jtype, None).to_string(e, scope)
    if e.jtype in ("String", "char", "enum"):
        if e.jtype == "String":
            return e
        return replace(e, jtype="String") if isinstance(e, Lit) else Call("String", "char_string", (e,))
    if isinstance(e, Lit) and e.jtype in ("int", "long"):
        return Lit("String", str(e.value))
    if e.jtype in NUMERIC | {"boolean"}:
        return Call("String", "to_string", (e,))
    raise Unsupported(None, f"toString of {e.jtype}")


def _binary(node: T.BinaryOperation, scope: Scope) -> Expr:
    op = node.operator
    tested = _null_test(node, scope)
    if tested is not None:
        return tested
    l = lift(node.operandl, scope)
    if op in ("&&", "||"):  # the right side runs only where the left side did not decide
        runs = _bool(l, node) if op == "&&" else BoolOp("boolean", "!", (_bool(l, node),))
        toks = _tokenizers(scope)
        r = lift(node.operandr, replace(scope, conditions=(*scope.conditions, runs)))
        toks.join(toks.before)  # a token the right side takes is taken on some rows only
    else:
        r = lift(node.operandr, scope)
    if op in ("&&", "||"):
        l, r = _bool(l, node), _bool(r, node)
        deciding = op == "||"  # the value that ends the evaluation
        if isinstance(l, Lit):  # `s == null || ...`: the right side runs only if the left does not decide
            return l if l.value == deciding else r
        if isinstance(r, Lit) and r.value != deciding:  # `x || false` is x (x still runs, and may throw)
            return l
        return BoolOp("boolean", op, (l, r))
    if op == "+" and "String" in (l.jtype, r.jtype):
        empty = Lit("String", "")
        if empty in (l, r):  # `"" + x` is String.valueOf(x)
            return to_string(r if l == empty else l, scope)
        return Call("String", "concat", (to_string(l, scope), to_string(r, scope)))
    if op in ("+", "-", "*", "/", "%", "<", ">", "<=", ">=", "==", "!=") and "char" in (l.jtype, r.jtype) \
            and {l.jtype, r.jtype} <= NUMERIC | {"char"} and not (l.jtype == r.jtype == "char" and op not in ARITH):
        if op in ARITH:
            _char_arithmetic(node, scope)
        l, r = (char_code(x) if x.jtype == "char" else x for x in (l, r))
    if op in ARITH:
        if l.jtype not in NUMERIC or r.jtype not in NUMERIC:
            raise Unsupported(node, f"arithmetic {op} on {l.jtype} and {r.jtype}")
        t = promote(l.jtype, r.jtype)
        e = Arith(t, op, widen_at(l, t, scope, node), widen_at(r, t, scope, node))
        if t in INTEGRAL and op in ("/", "%") and not (isinstance(r, Lit) and r.value) \
                and scope.on_error("div_or_null") == "null":  # `/ 0` throws ArithmeticException, caught here
            return Call(t, "div_or_null", (e,), "null")
        return e
    if op in ("==", "!=") and "null" in (l.jtype, r.jtype) and \
            any(isinstance(x, Col) and x.name in ("key", "value") for x in (l, r)):
        return Lit("boolean", op == "!=")  # Hadoop never hands map() or reduce() a null key or value
    if op in ("<", ">", "<=", ">=", "==", "!="):
        if l.jtype == "String" or r.jtype == "String":
            if op in ("==", "!=") and "null" in (l.jtype, r.jtype):
                return Lit("boolean", op == "!=")  # values read from text lines are never null
            if op in ("==", "!="):
                return _reference_equality(node, l, r, scope)
            raise Unsupported(node, f"Strings compared with {op}: Java does not compare Strings with {op}",
                              "compare with compareTo() semantics deliberately: F.col(a) < F.col(b)")
        if l.jtype in NUMERIC and r.jtype in NUMERIC:
            t = promote(l.jtype, r.jtype)
            return Compare("boolean", op, _widen(l, t), _widen(r, t))
        if l.jtype == r.jtype and l.jtype in ("boolean", "char") and op in ("==", "!="):
            return Compare("boolean", op, l, r)
        if l.jtype == r.jtype == "char":  # one BMP char each: Spark's order (UTF-8 bytes) is the code unit order
            return Compare("boolean", op, l, r)
        if l.jtype == r.jtype == "enum" and op in ("==", "!=") and isinstance(l, Lit) and isinstance(r, Lit):
            return Lit("boolean", (l.value == r.value) == (op == "=="))
        raise Unsupported(node, f"comparison {op} of {l.jtype} and {r.jtype}")
    raise Unsupported(node, f"operator {op} is not lifted yet")


ARITH = ("+", "-", "*", "/", "%")


def _char_arithmetic(node, scope: Scope) -> None:
    from migrate.java.index import node_lines
    from migrate.plan import Finding

    line = node_lines(node)[0]
    scope.findings.append(Finding(
        "char-arithmetic", Span(scope.file, line, line),
        "arithmetic on a char works on its UTF-16 code unit number and gives an int ('a' + 1 is 98, not \"a1\" "
        "and not 'b'; JLS 5.6.2); the script does the same",
        "if text was meant, concatenate a String (\"\" + c + 1) or cast back with (char)"))


# Where a lifted String comes from Text.toString() of the record (the line, or the key of a
# KeyValueTextInputFormat line): Hadoop's Text.decode makes a new String object every time.
_FRESH_STRINGS = {"value", "key"}


def _reference_equality(node: T.BinaryOperation, l: Expr, r: Expr, scope: Scope) -> Expr:
    """`s == "x"` on Strings compares references. A String made from the record at run time is a
    new object, never the interned literal, so the original's answer is false (`!=`: true) for
    every record; that is reproduced and raised as a finding. Anything else is declined."""
    from migrate.java.index import node_lines
    from migrate.plan import Finding

    def fresh(e: Expr) -> bool:
        return isinstance(e, Col) and e.jtype == "String" and e.name in _FRESH_STRINGS

    def literal(e: Expr) -> bool:
        return isinstance(e, Lit) and e.jtype == "String" and e.value is not None

    def cut(e: Expr, depth: int = 0) -> bool:  # made by substring/split/trim, which may return the interned ""
        return depth < 20 and any(
            isinstance(x, Call) and x.op in ("substring", "split", "split_limit", "trim", "strip")
            or isinstance(x, Col) and x.name in scope.defs and cut(scope.defs[x.name], depth + 1) for x in walk(e))

    empty = Lit("String", "")
    if (l == empty and cut(r)) or (r == empty and cut(l)):
        raise Unsupported(node, f"a String cut from the line is compared with \"\" by reference ({node.operator}): "
                                "on Java 9 and later an empty substring, split piece or trim result is the interned "
                                "\"\" (so the test is true exactly when it is empty; checked on Java 17), on Java 8 "
                                "it is a new object (never equal); the output depends on the JVM the job ran on",
                          "ask which Java ran the job; then write isEmpty() in Java and F.length(c) == 0 in the script")
    if not (fresh(l) and literal(r) or literal(l) and fresh(r)):
        raise Unsupported(node, "Strings compared with ==: Java compares references (is it the same object?), not "
                                "text, and which objects these are depends on how each String was made",
                          "find out what the original really did before choosing: `.equals()` semantics "
                          "(F.col(a) == F.col(b)) give different output wherever the references differed")
    line = node_lines(node)[0]
    text = r.value if literal(r) else l.value
    scope.findings.append(Finding(
        "reference-equality", Span(scope.file, line, line),
        f"`{node.operator} \"{text}\"` compares references: the String read from the record is a new object for every "
        f"record, never the interned literal, so the comparison is {'false' if node.operator == '==' else 'true'} "
        "for every record in the original; so it is in the script",
        "if the job meant to compare text, use equals() in Java and == in the script; that changes the output"))
    return Lit("boolean", node.operator == "!=")


def _null_test(node: T.BinaryOperation, scope: Scope) -> Expr | None:
    """`x == null` / `x != null` of a local that may hold null (MaybeNull)."""
    if node.operator not in ("==", "!="):
        return None
    name = maybe_null_name(node.operandl, scope.env) if _is_null(node.operandr) else \
        maybe_null_name(node.operandr, scope.env) if _is_null(node.operandl) else None
    if name is None:
        return None
    return Call("boolean", "is_null" if node.operator == "==" else "is_not_null", (scope.env[name].value,))


def _is_null(node) -> bool:
    return isinstance(node, T.Literal) and node.value == "null"


def maybe_null_name(node, env: dict) -> str | None:
    if (isinstance(node, T.MemberReference) and node.qualifier in ("", None) and not node.selectors
            and not getattr(node, "prefix_operators", None) and isinstance(env.get(node.member), MaybeNull)):
        return node.member
    return None


def refined(cond, env: dict) -> tuple[dict, dict]:
    """The names bound where `cond` holds and where it does not: a local tested for null
    (`x != null`, `x != null && …`, `x == null || …`) holds its value on the side it is not null."""
    then_env, else_env = env, env
    if not isinstance(cond, T.BinaryOperation) or getattr(cond, "prefix_operators", None):
        return then_env, else_env
    op = cond.operator
    if op in ("==", "!="):
        name = maybe_null_name(cond.operandl, env) if _is_null(cond.operandr) else \
            maybe_null_name(cond.operandr, env) if _is_null(cond.operandl) else None
        if name is not None:
            known = {**env, name: env[name].value}
            return (known, env) if op == "!=" else (env, known)
    if op == "&&":  # both sides hold in the then-branch
        a, _ = refined(cond.operandl, env)
        b, _ = refined(cond.operandr, a)
        return b, else_env
    if op == "||":  # neither side holds in the else-branch
        _, a = refined(cond.operandl, env)
        _, b = refined(cond.operandr, a)
        return then_env, b
    return then_env, else_env


def _cast(node: T.Cast, scope: Scope) -> Expr:
    target = getattr(node.type, "name", "")
    e = lift(node.expression, scope)
    if target == e.jtype:
        return e
    widening = {("int", "long"), ("int", "double"), ("long", "double"), ("int", "float"), ("float", "double"),
                ("long", "float")}
    if (e.jtype, target) in widening:
        return _widen(e, target)
    if e.jtype == "char" and target in NUMERIC:
        return _widen(char_code(e), target)
    if (e.jtype, target) in NARROWING:
        return Call(target, NARROWING[(e.jtype, target)], (e,))
    raise Unsupported(node, f"cast ({target}) of a {e.jtype} is not lifted", "check the value range, then cast explicitly")


# JLS 5.1.3: double -> int/long truncates toward zero, NaN -> 0, saturates; long -> int keeps the low 32 bits.
NARROWING = {("double", "int"): "double_to_int", ("double", "long"): "double_to_long",
             ("float", "int"): "double_to_int", ("float", "long"): "double_to_long", ("long", "int"): "long_to_int",
             ("double", "float"): "double_to_float"}


def _widen(e: Expr, t: str) -> Expr:
    if e.jtype == t:
        return e
    if isinstance(e, Lit) and t in NUMERIC and e.jtype in NUMERIC:
        return Lit(t, float(e.value) if t in ("double", "float") else e.value)
    return Cast(t, e)


def _bool(e: Expr, node) -> Expr:
    if e.jtype != "boolean":
        raise Unsupported(node, f"a {e.jtype} used as a condition")
    return e


def writable_creator(node: T.ClassCreator, scope: Scope) -> Writable | None:
    """`new Text(s)`, `new IntWritable(n)` … → a Writable holding the lifted argument."""
    kind = node.type.name.split(".")[-1]
    if kind not in WRITABLE_OF:
        return None
    args = node.arguments or []
    if not args:  # a fresh Writable holds its type's zero value
        zero = {"String": "", "int": 0, "long": 0, "double": 0.0, "float": 0.0, "boolean": False}[WRITABLE_OF[kind]]
        return Writable(kind, Lit(WRITABLE_OF[kind], zero))
    v = lift(args[0], scope)
    want = WRITABLE_OF[kind]
    if want == "String":
        return Writable(kind, to_string(v))
    if v.jtype in NUMERIC and want in NUMERIC and promote(v.jtype, want) == want:
        return Writable(kind, _widen(v, want))
    if v.jtype == want:
        return Writable(kind, v)
    raise Unsupported(node, f"new {kind}(...) of a {v.jtype}")


def writable_set(w: Writable, value: Expr, node) -> Expr:
    """The content after `w.set(value)`, converted as the Writable's setter would."""
    want = WRITABLE_OF[w.kind]
    if want == "String":
        if value.jtype != "String":
            raise Unsupported(node, f"Text.set of a {value.jtype}")
        return value
    if value.jtype in NUMERIC and want in NUMERIC and promote(value.jtype, want) == want:
        return _widen(value, want)
    raise Unsupported(node, f"{w.kind}.set of a {value.jtype}")


def widen(e: Expr, t: str) -> Expr:
    return _widen(e, t)


def widen_at(e: Expr, t: str, scope: Scope, node) -> Expr:
    """`widen`, raising a finding where an integer division is widened to a floating value: Java
    divided first and truncated (`double avg = sum / n` with int sum and n), and so does the script."""
    if t in ("double", "float") and isinstance(e, Arith) and e.op in ("/", "%") and e.jtype in INTEGRAL:
        from migrate.java.index import node_lines
        from migrate.plan import Finding

        line = node_lines(node)[0]
        scope.findings.append(Finding(
            "integer-division", Span(scope.file, line, line),
            f"an {e.jtype} division is used as a {t}: Java divides the integers first and drops the fraction "
            f"(7 / 2 is 3, so the {t} is 3.0; JLS 15.17.2); the script does the same",
            f"if the fraction was meant, cast an operand to {t} before dividing; that changes the output"))
    return _widen(e, t)


def write_argument(a, scope: Scope) -> Expr | None:
    """A key or value passed to `context.write` / `output.collect`; None for null and NullWritable."""
    if isinstance(a, T.Literal) and a.value == "null":
        return None
    if isinstance(a, T.MethodInvocation) and a.qualifier == "NullWritable" and a.member == "get":
        return None
    if isinstance(a, T.MemberReference) and not a.qualifier and isinstance(scope.env.get(a.member), Writable):
        return scope.env[a.member].content
    if isinstance(a, T.ClassCreator) and a.type.name.split(".")[-1] in WRITABLE_OF:
        return writable_creator(a, scope).content
    return lift(a, scope)


JAVA_TYPES = {"int": "int", "long": "long", "double": "double", "float": "float", "boolean": "boolean",
              "String": "String", "Integer": "int", "Long": "long", "Double": "double", "Float": "float",
              "Boolean": "boolean", "char": "char"}


def _java_type(t) -> str | None:
    name = JAVA_TYPES.get(getattr(t, "name", ""))
    if name and getattr(t, "dimensions", None):
        return name + "[]"
    return name


@dataclass(frozen=True)
class HelperClass:
    """Another class of the repository whose static methods a task calls: they are inlined with
    that class's constants in scope, never the caller's locals."""

    name: str
    file: str
    methods: dict
    env: dict
    resolve: Any = None  # type names as that class's imports resolve them


def inline_call(node: T.MethodInvocation, scope: Scope, home: HelperClass | None = None) -> Expr:
    """A call of a helper method, inlined: its body must be locals, ifs and returns. The helper sees
    its own class's fields and constants and its parameters, never the caller's locals."""
    methods = home.methods if home is not None else scope.methods
    candidates = [d for d in methods[node.member] if len(d.parameters) == len(node.arguments or [])]
    if len(candidates) != 1:
        raise Unsupported(node, f"helper {node.member}() has no single overload with {len(node.arguments or [])} arguments")
    decl = candidates[0]
    if scope.depth > 8:
        raise Unsupported(node, f"helper {node.member}() calls itself too deeply to inline")
    visible = home.env if home is not None else dict(scope.env) if scope.fields is None else \
        {k: v if k in scope.shadowed else scope.env.get(k, v) for k, v in scope.fields.items()}
    env = dict(visible)
    for p, a in zip(decl.parameters, node.arguments or []):
        want = _java_type(p.type)
        v = lift(a, scope)
        if want is None:
            raise Unsupported(node, f"helper {decl.name}() takes a {getattr(p.type, 'name', '?')}")
        env[p.name] = _widen(v, want) if v.jtype != want and {v.jtype, want} <= NUMERIC else v
    inner = replace(scope, env=env, depth=scope.depth + 1, fields=dict(visible),
                    shadowed={p.name for p in decl.parameters} & set(visible))
    if home is not None:
        inner = replace(inner, methods=home.methods, file=home.file, defs={}, conditions=(), resolve=home.resolve)
        try:
            result = _body_value(list(decl.body or []), inner, decl)
        except Unsupported as u:  # the user's line is the call; the reason names the helper's line
            raise Unsupported(node, f"in {home.name}.{decl.name}() ({home.file.rsplit('/', 1)[-1]}:{u.line or '?'}): "
                                    f"{u.reason}", u.suggestion) from None
    else:
        result = _body_value(list(decl.body or []), inner, decl)
    want = _java_type(decl.return_type) if decl.return_type is not None else None
    if want is None:
        raise Unsupported(node, f"helper {decl.name}() does not return a value the converter follows")
    return _widen(result, want) if result.jtype != want and {result.jtype, want} <= NUMERIC else result


def _body_value(stmts: list, scope: Scope, decl) -> Expr:
    """The value a helper returns: locals are bound, `if (c) return a; ... return b;` becomes c ? a : b."""
    for i, st in enumerate(stmts):
        if isinstance(st, T.LocalVariableDeclaration):
            for d in st.declarators:
                if d.initializer is None:
                    raise Unsupported(st, f"helper {decl.name}(): local without a value")
                v = lift(d.initializer, scope)
                want = _java_type(st.type) or v.jtype
                scope.env[d.name] = _widen(v, want) if v.jtype != want and {v.jtype, want} <= NUMERIC else v
            continue
        if isinstance(st, T.ReturnStatement) and st.expression is not None:
            return lift(st.expression, scope)
        if isinstance(st, T.IfStatement):
            c = lift(st.condition, scope)
            then = _body_value(_block_of(st.then_statement), replace(scope, env=dict(scope.env)), decl)
            rest = _block_of(st.else_statement) if st.else_statement is not None else stmts[i + 1:]
            other = _body_value(rest, replace(scope, env=dict(scope.env)), decl)
            t = then.jtype if then.jtype == other.jtype else promote(then.jtype, other.jtype) \
                if {then.jtype, other.jtype} <= NUMERIC else None
            if t is None:
                raise Unsupported(st, f"helper {decl.name}() returns different types on its branches")
            return Cond(t, c, _widen(then, t), _widen(other, t))
        if isinstance(st, T.TryStatement):
            return _try_value(st, scope, decl)
        if isinstance(st, T.SwitchStatement):
            return _switch_value(st, stmts[i + 1:], scope, decl)
        raise Unsupported(st, f"helper {decl.name}() does more than compute a value (pure helpers are inlined)",
                          "inline it by hand, or keep it as a Python function over Columns")
    raise Unsupported(decl, f"helper {decl.name}() can end without returning a value")


def _switch_value(st: T.SwitchStatement, after: list, scope: Scope, decl) -> Expr:
    """`switch (x) { case a: case b: return v; ... default: return d; }` as an if-else chain over
    x.equals(label) (JLS 14.11: a String switch compares with equals, an int or char one by value);
    with no default the statements after the switch give the value. Every case group must return:
    a fall-through into the next group, or a break, is declined."""
    subject = lift(st.expression, scope)
    arms: list[tuple[Expr, Expr]] = []
    default = None
    for group in st.cases:
        body = list(group.statements or [])
        if not body or not isinstance(body[-1], T.ReturnStatement):
            raise Unsupported(group.statements[-1] if body else st, f"helper {decl.name}(): a switch case that does "
                              "not end in return (fall-through or break)")
        value = _body_value(body, replace(scope, env=dict(scope.env)), decl)
        labels = [c for c in group.case or [] if c != "default"]
        if len(labels) < len(group.case or []) or not group.case:
            default = value
        if labels:
            test = None
            for label in labels:
                one = Compare("boolean", "==", subject, lift(label, scope))
                test = one if test is None else BoolOp("boolean", "||", (test, one))
            arms.append((test, value))
    other = default if default is not None else _body_value(after, replace(scope, env=dict(scope.env)), decl)
    types = {v.jtype for _, v in arms} | {other.jtype}
    t = types.pop() if len(types) == 1 else None
    if t is None:
        raise Unsupported(st, f"helper {decl.name}() returns different types from its switch cases")
    for test, value in reversed(arms):
        other = Cond(t, test, value, other)
    return other


def _try_value(st: T.TryStatement, scope: Scope, decl) -> Expr:
    """`try { ...; return v; } catch (E e) { [logging] return d; }` in a helper: v where nothing in
    the try block threw one of the caught exceptions, else d (the throwing operations become NULL
    where they would throw, exactly as in a catch-and-skip block)."""
    from migrate.lower.logging import is_logging

    if st.finally_block or st.resources:
        raise Unsupported(st, f"helper {decl.name}(): try with finally or resources")
    kinds: set[str] = set()
    default = None
    for c in st.catches or []:
        kinds.update(n.split(".")[-1] for n in c.parameter.types)
        body = [x for x in c.block or [] if is_logging(x, {c.parameter.name}) is None]
        if len(body) != 1 or not isinstance(body[0], T.ReturnStatement) or body[0].expression is None:
            raise Unsupported(c, f"helper {decl.name}(): a catch block that does more than return a value")
        d = lift(body[0].expression, scope)
        if default is not None and d != default:
            raise Unsupported(c, f"helper {decl.name}(): catch blocks that return different values")
        default = d
    if default is None:
        raise Unsupported(st, f"helper {decl.name}(): try without a catch")
    inner = replace(scope, env=dict(scope.env), caught=scope.caught | frozenset(kinds))
    v = _body_value(list(st.block or []), inner, decl)
    if not any(isinstance(x, Call) and x.on_error == "null" for x in walk(v)):
        return v  # nothing in it can throw what is caught
    t = v.jtype if v.jtype == default.jtype else promote(v.jtype, default.jtype) \
        if {v.jtype, default.jtype} <= NUMERIC else None
    if t is None:
        raise Unsupported(st, f"helper {decl.name}() returns a {v.jtype} or, when it catches, a {default.jtype}")
    return Call(t, "or_default", (_widen(v, t), _widen(default, t)))



def _block_of(st) -> list:
    return list(st.statements) if isinstance(st, T.BlockStatement) else [st]


def calls_as_names(node, name_of):
    """A copy of `node` where each argument-less call `name_of` names (it returns a name or None)
    becomes a reference to that name, keeping the call's selectors and prefix operators: how
    `values.next()` or `e.getKey()` are bound in a Scope like any local. `name_of` may return
    (name, k): the call and its first k selectors are that name (`values.iterator().next()`)."""
    import copy

    def swap(n):
        name = name_of(n) if isinstance(n, T.MethodInvocation) and not n.arguments else None
        name, used = name if isinstance(name, tuple) else (name, 0)
        if name:
            return T.MemberReference(member=name, qualifier="", selectors=(n.selectors or [])[used:],
                                     prefix_operators=n.prefix_operators or [], postfix_operators=[])
        for attr in getattr(n, "attrs", ()):
            v = getattr(n, attr, None)
            if isinstance(v, T.Node):
                setattr(n, attr, swap(v))
            elif isinstance(v, list):
                setattr(n, attr, [swap(x) if isinstance(x, T.Node) else x for x in v])
        return n

    return swap(copy.deepcopy(node))
