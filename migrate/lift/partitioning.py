"""Which reduce task a key goes to: Hadoop's HashPartitioner or a custom getPartition().

With more than one reduce task Hadoop writes one part file per task, each sorted by key; the
files one after another are what a reader of the folder sees. Knowing the task of every key
lets the script write the same lines in the same order (and per-task state, like a top-N in
cleanup(), is kept per task as in the original).

Recognises: the default HashPartitioner, `(key.hashCode() & Integer.MAX_VALUE) % numReduceTasks`
(Hadoop's HashPartitioner source), for Text, IntWritable and LongWritable keys; and custom
partitioners whose getPartition() is `return (X & Integer.MAX_VALUE) % numPartitions;` with X
one of `key.hashCode()`, `key.toString().hashCode()`, `key.toString().charAt(0)`, `key.get()`,
and for a custom key `key.getF().hashCode()` of a String or Text field (secondary sort).
Any other getPartition() whose body reads as a value of the key (locals, ifs, returns, helper
methods: a helper method's rules) becomes that value, checked at run time as Hadoop's map task
checks it (a task number outside 0..N-1 fails the job: "Illegal partition for <key> (<n>)").
Produces: an int expression over the column `key`. Declines a partitioner that reads the value,
a field that may change, or anything the expression lift does not read.
"""
from __future__ import annotations

import operator
from dataclasses import replace

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.exprs import Unsupported
from migrate.plan import Arith, BoolOp, Call, Col, Compare, Cond, Expr, Lit, Span

_WRITABLE_HASH = {"String": "text_hash", "int": "int_hash", "long": "long_hash"}


def hash_partition(key_t: str, reduces: int, where) -> Expr:
    """HashPartitioner: the key Writable's hashCode(), made non-negative, modulo the task count."""
    op = _WRITABLE_HASH.get(key_t)
    if op is None:
        what = f"custom {key_t.rsplit('.', 1)[-1]}" if key_t.startswith("struct:") else f"{key_t}"
        raise Unsupported(where, f"Hadoop's hash of a {what} key (its hashCode()) is not reproduced, so which reduce "
                                 "task got which key is not known")
    return Call("int", "partition_of", (Call("int", op, (Col(key_t, "key"),)), Lit("int", reduces)))


def custom_partition(cls: ClassInfo, key_t: str, reduces: int, structs: dict | None = None, index=None) -> Expr:
    ms = [m for m in cls.methods("getPartition") if len(m.parameters) == 3]
    if not ms:
        raise Unsupported(cls.node, f"{cls.name} has no getPartition(key, value, numPartitions)")
    m = ms[0]
    key, _, num = (p.name for p in m.parameters)
    body = m.body or []
    ret = body[0] if len(body) == 1 else None
    e = ret.expression if isinstance(ret, T.ReturnStatement) else None
    if isinstance(e, T.BinaryOperation) and e.operator == "%" and _is_ref(e.operandr, num):
        masked = e.operandl
        if isinstance(masked, T.BinaryOperation) and masked.operator == "&" and _is_max_int(masked.operandr):
            x = _hashed(masked.operandl, key, key_t, structs or {})
            if x is not None:
                return Call("int", "partition_of", (x, Lit("int", reduces)))
    return _partition_body(cls, m, key_t, reduces, index)


def _partition_body(cls: ClassInfo, m, key_t: str, reduces: int, index) -> Expr:
    """Any other getPartition(): its body read as a value of the key (locals, ifs, returns, helpers,
    as a helper method is inlined), checked at run time the way Hadoop's map task checks it."""
    from migrate.lift.exprs import Opaque, Scope, _body_value, _widen, text_params
    from migrate.lift.mapper import class_constants, helper_methods, repository_classes, type_resolver
    from migrate.lift.writables import structs_seen_from

    key, value, num = (p.name for p in m.parameters)
    fields = dict(class_constants(cls, index))
    for f in cls.fields():
        for d in f.declarators:
            fields.setdefault(d.name, Opaque(f"the field `{d.name}` of the partitioner, which may change between calls"))
    env = {**fields, key: Col(key_t, "key"), num: Lit("int", reduces),
           value: Opaque("the map output value: the task of a key would depend on its values")}
    scope = Scope(env, file=cls.file.path, methods=helper_methods(cls, index), structs=structs_seen_from(cls, index),
                  fields=fields, shadowed={key, value, num} & set(fields), classes=repository_classes(cls, index),
                  resolve=type_resolver(cls, index), texts=text_params(m))
    try:
        task = _body_value(list(m.body or []), scope, m)
    except Unsupported as u:
        raise Unsupported(u.line or m, f"{cls.name}.getPartition() is not read: {u.reason}",
                          "compute the task number as a column and sort by it, then by key") from None
    if task.jtype not in ("int", "short", "byte", "char"):
        raise Unsupported(m, f"{cls.name}.getPartition() gives a {task.jtype}")
    where = Span(cls.file.path, *node_lines(m))
    return Call("int", "checked_partition", (_fold(_widen(task, "int")), Lit("int", reduces), Lit("String", cls.name)),
                "fail", origin=where)


_COMPARE = {"==": operator.eq, "!=": operator.ne, "<": operator.lt, "<=": operator.le, ">": operator.gt,
            ">=": operator.ge}
_ARITH = {"+": operator.add, "-": operator.sub, "*": operator.mul, "%": operator.mod}


def _fold(e: Expr) -> Expr:
    """Decide what numPartitions (a constant here) decides: `n == 9 ? a : b` is a when n is 9,
    `1 % n` is 1. Integer arithmetic is folded only over non-negative ints with an int result."""
    if not isinstance(e, (Compare, Cond, BoolOp, Arith)):
        return e
    kids = {f: _fold(getattr(e, f)) for f in ("cond", "then", "other", "left", "right") if hasattr(e, f)}
    if isinstance(e, BoolOp):
        kids["args"] = tuple(_fold(a) for a in e.args)
    e = replace(e, **kids)
    lits = isinstance(getattr(e, "left", None), Lit) and isinstance(getattr(e, "right", None), Lit) \
        and {e.left.jtype, e.right.jtype} == {"int"} and e.left.value >= 0 and e.right.value >= 0
    if isinstance(e, Compare) and lits and e.op in _COMPARE:
        return Lit("boolean", _COMPARE[e.op](e.left.value, e.right.value))
    if isinstance(e, Arith) and lits and e.op in _ARITH and (e.op != "%" or e.right.value):
        v = _ARITH[e.op](e.left.value, e.right.value)
        return Lit("int", v) if 0 <= v < 2**31 else e
    if isinstance(e, Cond) and isinstance(e.cond, Lit):
        return e.then if e.cond.value else e.other
    if isinstance(e, BoolOp) and e.op in ("&&", "||"):
        unit = e.op == "&&"  # true && x is x; false || x is x
        kept = []
        for a in e.args:
            if isinstance(a, Lit) and a.value is unit:
                continue
            kept.append(a)
            if isinstance(a, Lit):  # it decides: what follows never runs (what comes before still does)
                break
        if len(kept) == 1 or not kept:
            return kept[0] if kept else Lit("boolean", unit)
        return replace(e, args=tuple(kept))
    return e


def _hashed(n, key: str, key_t: str, structs: dict) -> Expr | None:
    """X in `(X & MAX_VALUE) % n`, over the key."""
    if not (isinstance(n, T.MethodInvocation) and n.qualifier == key):
        return None
    sels = [(s.member, [getattr(a, "value", None) for a in s.arguments or []])
            for s in n.selectors or [] if isinstance(s, T.MethodInvocation)]
    k = Col(key_t, "key")
    info = structs.get(key_t)
    if info is not None and not isinstance(info, Unsupported):  # a custom key: `key.getStation().hashCode()`
        from migrate.lift.writables import getters

        name = getters(info).get(n.member)
        if name is not None and sels == [("hashCode", [])] and info.fields[name] == "String":
            op = "text_hash" if name in info.text_fields else "string_hash"
            return Call("int", op, (info.field_of(k, name),))
        return None
    if n.member == "hashCode" and not sels and key_t in _WRITABLE_HASH:
        return Call("int", _WRITABLE_HASH[key_t], (k,))
    if n.member == "get" and not sels and key_t == "int":
        return Call("int", "int_hash", (k,))
    if n.member == "toString" and key_t == "String":
        if sels == [("hashCode", [])]:
            return Call("int", "string_hash", (k,))
        if sels == [("charAt", ["0"])]:
            return Call("int", "first_code_unit", (k,), "fail")
    return None


def _is_ref(n, name: str) -> bool:
    return isinstance(n, T.MemberReference) and n.member == name and not n.qualifier


def _is_max_int(n) -> bool:
    return isinstance(n, T.MemberReference) and n.qualifier == "Integer" and n.member == "MAX_VALUE"
