"""Mapper and reducer classes that ship with Hadoop, recognised by name instead of by source.

Recognises: TokenCounterMapper / TokenCountMapper, InverseMapper, RegexMapper, identity
Mapper / IdentityMapper, IntSumReducer, LongSumReducer, identity Reducer / IdentityReducer.
Produces: the same plan steps a lifted body would. Caveats: the identity and inverse
mappers read the input key, which on TextInputFormat is the byte offset (Source.offsets).
"""
from __future__ import annotations

import re

from migrate.java.hadoop_api import MAPRED, MAPREDUCE
from migrate.plan import Agg, AggRef, Call, Col, ConfValue, Emit, Explode, Group, Identity, Lit, Project, Span, Step
from migrate.lift.exprs import BYTE_OFFSET

TOKEN_MAPPERS = {f"{MAPREDUCE}.lib.map.TokenCounterMapper", f"{MAPRED}.lib.TokenCountMapper"}
INVERSE_MAPPERS = {f"{MAPREDUCE}.lib.map.InverseMapper", f"{MAPRED}.lib.InverseMapper"}
IDENTITY_MAPPERS = {f"{MAPREDUCE}.Mapper", f"{MAPRED}.lib.IdentityMapper", None}
REGEX_MAPPERS = {f"{MAPREDUCE}.lib.map.RegexMapper": ("mapreduce.mapper.regex", "mapreduce.mapper.regexmapper..group"),
                 f"{MAPRED}.lib.RegexMapper": ("mapred.mapper.regex", "mapred.mapper.regex.group")}
SUM_REDUCERS = {f"{MAPREDUCE}.lib.reduce.IntSumReducer": "int", f"{MAPREDUCE}.lib.reduce.LongSumReducer": "long",
                f"{MAPRED}.lib.LongSumReducer": "long"}
IDENTITY_REDUCERS = {f"{MAPREDUCE}.Reducer", f"{MAPRED}.lib.IdentityReducer", None}

LIB = Span("<ships with Hadoop>", 0, 0)


def library_mapper(fqcn: str | None, input_fmt: str, conf: dict[str, str],
                   pairs: tuple[str, str] | None = None) -> tuple[list[Step] | None, str]:
    """Steps for a Hadoop library mapper, or (None, reason) when it cannot be expressed. `pairs`: the
    (key, value) types the job before wrote (input format "pairs")."""
    LIB = Span(f"{(fqcn or 'Mapper').rsplit('.', 1)[-1]} (ships with Hadoop)", 0, 0)
    value = Col("String", "value")
    if input_fmt == "pairs" and fqcn not in INVERSE_MAPPERS | IDENTITY_MAPPERS and (pairs or ("", ""))[1] != "String":
        return None, f"{(fqcn or 'Mapper').rsplit('.', 1)[-1]} reads its value as text; the job before writes other values"
    if fqcn in TOKEN_MAPPERS:
        tokens = Call("String[]", "tokens", (value,))
        return [Explode(LIB, "StringTokenizer over the line", "token", tokens),
                Project(LIB, "emit (token, 1)", (Emit(LIB, "write(token, one)", Col("String", "token"), Lit("int", 1)),))], ""
    if fqcn in REGEX_MAPPERS:
        pattern_key, group_key = REGEX_MAPPERS[fqcn]
        source, group_text = conf.get(pattern_key, ""), conf.get(group_key, "0")
        if pattern_key not in conf or source.startswith("<") and not _argument(source):
            return None, f"RegexMapper needs `{pattern_key}`, which the driver does not set to a constant"
        # a pattern (or group) the driver takes from its arguments is a job setting the script is given
        pattern = ConfValue("String", pattern_key, "get", None, "regex_pattern") if _argument(source) \
            else Lit("String", source)
        if group_text.startswith("<") and not _argument(group_text) or \
                not group_text.startswith("<") and not group_text.strip().isdigit():
            return None, f"RegexMapper's group `{group_key}` is not a number the driver sets"
        group = ConfValue("int", group_key, "getInt", 0, "regex_group") if _argument(group_text) \
            else Lit("int", int(group_text))
        matches = Call("String[]", "regex_matches", (value, pattern, group))
        shown = repr(source) if isinstance(pattern, Lit) else f"the pattern given as {source[1:-1]}"
        return [Explode(LIB, f"every match of {shown}", "match", matches),
                Project(LIB, "emit (match, 1L)", (Emit(LIB, "write(match, 1L)", Col("String", "match"), Lit("long", 1)),))], ""
    if fqcn in INVERSE_MAPPERS or fqcn in IDENTITY_MAPPERS:
        if input_fmt == "other":
            return None, ("the mapper passes on the input key, which is what the input format (not converted) "
                          "reads; convert the input first")
        # TextInputFormat's key is the line's byte offset (Source.offsets reads it)
        k = Col("String", "key") if input_fmt == "keyvalue" else Col("long", BYTE_OFFSET)
        v = Col("String", "value")
        if input_fmt == "pairs" and pairs is not None:  # the pairs as the job before wrote them
            k, v = Col(pairs[0], "key"), Col(pairs[1], "value")
        pair = (v, k) if fqcn in INVERSE_MAPPERS else (k, v)
        return [Project(LIB, "emit the pair unchanged" if pair[0] is k else "emit (value, key)",
                        (Emit(LIB, "write", pair[0], pair[1]),))], ""
    return None, f"{fqcn} is not a Hadoop library mapper the converter knows"


def _argument(text: str) -> bool:
    """A driver's `conf.set` value that is one of its arguments (`<args[i]>`)."""
    return re.fullmatch(r"<args\[\d+\]>", text) is not None


def library_reducer(fqcn: str | None, key_type: str, value_type: str) -> Step | None:
    """A Group/Identity step for a Hadoop library reducer, or None."""
    if fqcn in SUM_REDUCERS:
        t = SUM_REDUCERS[fqcn]
        where = Span(f"{fqcn.rsplit('.', 1)[1]} (ships with Hadoop)", 0, 0)
        agg = Agg("sum", "sum", Col(value_type, "value"), t, 0, where, "sum of the values")
        return Group(where, "sum of values per key", (agg,), (Emit(where, "write(key, sum)", Col(key_type, "key"), AggRef(t, "sum")),))
    if fqcn in IDENTITY_REDUCERS:
        return Identity(LIB, "identity reduce: pairs pass through sorted by key")
    return None
