"""In-mapper combining: a Map field accumulated in map() and flushed in cleanup().

Recognises: `tally.merge(k, v, Integer::sum)` (or Long::sum) and
`tally.put(k, tally.getOrDefault(k, 0) + v)` in map(), and a cleanup() that writes every entry
(`for (Map.Entry<K, V> e : tally.entrySet()) context.write(new Text(e.getKey()), new IntWritable(e.getValue()))`).
Produces: one Emit (k, v) per update; the job rule accepts this only where the reducer sums
the values, because then per-task partial sums cannot change the result.
Caveats: anything else done with the map (reads, removals, size checks, other flushes) is
hand work: it would make the output depend on how Hadoop split the input into tasks.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.java.index import ClassInfo

MAP_TYPES = {"Map", "HashMap", "TreeMap", "LinkedHashMap"}


def map_fields(cls: ClassInfo) -> set[str]:
    """Fields declared as a java.util Map (candidates for in-mapper combining)."""
    return {d.name for f in cls.fields() if getattr(f.type, "name", "") in MAP_TYPES for d in f.declarators}


def combining_update(e: T.MethodInvocation, fields: set[str]):
    """(key node, amount node) for a summing update of a Map field, else None."""
    q, args = e.qualifier or "", e.arguments or []
    if q not in fields:
        return None
    if e.member == "merge" and len(args) == 3 and isinstance(args[2], T.MethodReference):
        ref = args[2]
        owner = getattr(ref.expression, "member", "")
        if owner in ("Integer", "Long") and getattr(ref.method, "member", "") == "sum":
            return args[0], args[1]
    if e.member == "put" and len(args) == 2 and isinstance(args[1], T.BinaryOperation) and args[1].operator == "+":
        get = args[1].operandl
        if isinstance(get, T.MethodInvocation) and get.qualifier == q and get.member == "getOrDefault" \
                and len(get.arguments) == 2 and _same(get.arguments[0], args[0]) \
                and isinstance(get.arguments[1], T.Literal) and get.arguments[1].value.rstrip("lL") == "0":
            return args[0], args[1].operandr
    return None


def _same(a, b) -> bool:
    return isinstance(a, T.MemberReference) and isinstance(b, T.MemberReference) and a.member == b.member \
        and a.qualifier == b.qualifier and not a.selectors and not b.selectors


def flushes_all_entries(cleanup: T.MethodDeclaration | None, field: str) -> bool:
    """cleanup() is exactly: for each entry of `field`, write (entry key, entry value)."""
    if cleanup is None:
        return False
    body = [s for s in cleanup.body or [] if not (isinstance(s, T.StatementExpression)
                                                 and isinstance(s.expression, T.SuperMethodInvocation))]
    scratch = set()  # `Text word = new Text();` before the loop: a Writable set then written in it
    while body and isinstance(body[0], T.LocalVariableDeclaration) and len(body[0].declarators) == 1 \
            and _empty_writable(body[0].declarators[0].initializer):
        scratch.add(body.pop(0).declarators[0].name)
    if len(body) != 1 or not isinstance(body[0], T.ForStatement):
        return False
    ctl = body[0].control
    if not isinstance(ctl, T.EnhancedForControl):
        return False
    it = ctl.iterable
    if not (isinstance(it, T.MethodInvocation) and it.qualifier == field and it.member == "entrySet"):
        return False
    var = ctl.var.declarators[0].name
    loop = body[0].body.statements if isinstance(body[0].body, T.BlockStatement) else [body[0].body]
    if not loop or not all(isinstance(x, T.StatementExpression) for x in loop):
        return False
    *sets, w = [x.expression for x in loop]
    held = {}  # scratch Writable -> what this pass of the loop set it to
    for c in sets:
        if not (isinstance(c, T.MethodInvocation) and c.qualifier in scratch and c.member == "set"
                and len(c.arguments or []) == 1 and not c.selectors and c.qualifier not in held):
            return False
        held[c.qualifier] = c.arguments[0]
    if not (isinstance(w, T.MethodInvocation) and w.member in ("write", "collect") and len(w.arguments) == 2):
        return False
    k, v = (held.get(a.member, a) if isinstance(a, T.MemberReference) and not a.qualifier and not a.selectors else a
            for a in w.arguments)
    return _reads(k, var, "getKey") and _reads(v, var, "getValue")


def _empty_writable(e) -> bool:
    return isinstance(e, T.ClassCreator) and e.type.name in ("Text", "IntWritable", "LongWritable") \
        and not e.arguments and not e.body


def _reads(arg, var: str, getter: str) -> bool:
    """`new Text(e.getKey())`, `e.getKey()` and the like."""
    inner = arg.arguments[0] if isinstance(arg, T.ClassCreator) and len(arg.arguments or []) == 1 else arg
    return isinstance(inner, T.MethodInvocation) and inner.qualifier == var and inner.member == getter \
        and not inner.selectors
