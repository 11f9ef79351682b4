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
Produces: an int expression over the column `key` (Call "partition_of"). Declines anything else.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.java.index import ClassInfo
from migrate.lift.exprs import Unsupported
from migrate.plan import Call, Col, Expr, Lit

_WRITABLE_HASH = {"String": "text_hash", "int": "int_hash", "long": "long_hash"}


def hash_partition(key_t: str, reduces: int, where) -> Expr:
    """HashPartitioner: the key Writable's hashCode(), made non-negative, modulo the task count."""
    op = _WRITABLE_HASH.get(key_t)
    if op is None:
        what = f"custom {key_t.rsplit('.', 1)[-1]}" if key_t.startswith("struct:") else f"{key_t}"
        raise Unsupported(where, f"Hadoop's hash of a {what} key (its hashCode()) is not reproduced, so which reduce "
                                 "task got which key is not known")
    return Call("int", "partition_of", (Call("int", op, (Col(key_t, "key"),)), Lit("int", reduces)))


def custom_partition(cls: ClassInfo, key_t: str, reduces: int, structs: dict | None = None) -> Expr:
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
    raise Unsupported(ret or m, f"{cls.name}.getPartition() is not `(X & Integer.MAX_VALUE) % numPartitions` over "
                                "the key's hashCode(), its text's hashCode() or its first character",
                      "compute the task number as a column and sort by it, then by key")


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
