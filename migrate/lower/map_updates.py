"""Adding to a count kept in a Map field, in the spellings authors use, as one core form:
`m.merge(k, v, Integer::sum)` (Long::sum for a Map of Longs), and the flush of such a map by
its keys as a flush by its entries. The in-mapper combining rule (lift.combining) then reads one
form.

    if (m.containsKey(k)) { m.put(k, m.get(k) + v); } else { m.put(k, v); }   (or `m.get(k) != null`)
    Integer c = m.get(k); if (c == null) { c = 0; } m.put(k, c + v);
    Integer c = m.get(k); m.put(k, c == null ? v : c + v);
    m.put(k, m.containsKey(k) ? m.get(k) + v : v);
    m.merge(k, v, (a, b) -> a + b);                   (a lambda for Integer::sum)
    m.compute(k, (key, c) -> c == null ? v : c + v);  (Map.compute javadoc: the function's value is
                                                       put; it is never null here, so nothing is removed)
    for (K x : m.keySet()) { write(f(x), g(m.get(x))); }  ->  for (Map.Entry<K, V> e : m.entrySet()) ...
                                                             (for a Map field of any value type)

All are `merge` when the map never holds null (only these updates put into it) and `k` and `v`
are names, literals or array elements at such indexes (evaluating them twice is evaluating them once): Map.merge javadoc, "If
the specified key is not already associated with a value ..., associates it with the given
non-null value. Otherwise, replaces the associated value with the results of the given
remapping function"; Integer.sum is `a + b` (int wrap-around included).
"""
from __future__ import annotations

import copy

from javalang import tree as T

from migrate.lower.walk import is_name, line_of, mentions, positioned, replace_nodes, same_code, statement_lists

_SUMS = {"Integer": "Integer", "Long": "Long"}


def map_updates(cls, index=None) -> list[tuple[int, str]]:
    maps, every = _counting_maps(cls), _map_fields(cls)
    if not every:
        return []
    done = []
    for method in cls.node.methods:
        for stmts, _ in statement_lists(method):
            i = 0
            while i < len(stmts):
                found = _update_at(stmts, i, maps, method)
                if found is not None:
                    used, merge = found
                    line = line_of(stmts[i])
                    stmts[i:i + used] = [positioned(merge, stmts[i])]
                    done.append((line, "a count added to a Map field: Map.merge(k, v, Integer::sum)"))
                elif _flush_by_keys(stmts[i], every):
                    done.append((line_of(stmts[i]), "a Map flushed by its keys: by its entries"))
                i += 1
    return done


def _counting_maps(cls) -> dict[str, tuple]:
    """Map fields of Integer or Long values: name -> (key type node, value type name)."""
    out = {}
    for f in cls.fields():
        t = f.type
        args = getattr(t, "arguments", None) or []
        if getattr(t, "name", "") in ("Map", "HashMap", "TreeMap", "LinkedHashMap") and len(args) == 2 \
                and getattr(args[1].type, "name", "") in _SUMS:
            for d in f.declarators:
                out[d.name] = (args[0].type, args[1].type.name)
    return out


def _map_fields(cls) -> dict[str, tuple]:
    """Every Map field with its type arguments: name -> (key type node, value type node). A flush by
    keys reads the same entries in the same order as a flush by entries for any of them (keySet()
    and entrySet() are views of one map, java.util.Map)."""
    out = {}
    for f in cls.fields():
        args = getattr(f.type, "arguments", None) or []
        if getattr(f.type, "name", "") in ("Map", "HashMap", "TreeMap", "LinkedHashMap", "SortedMap", "NavigableMap") \
                and len(args) == 2 and all(getattr(a, "type", None) is not None for a in args):
            for d in f.declarators:
                out[d.name] = (args[0].type, args[1].type)
    return out


def _update_at(stmts: list, i: int, maps: dict, method):
    """(statements used, the merge statement) for an update of a counting map at stmts[i]."""
    s = stmts[i]
    if isinstance(s, T.IfStatement) and s.else_statement is not None:
        return _if_update(s, maps)
    lam = _lambda_update(s, maps)
    if lam is not None:
        return 1, _merge(*lam, maps, s)
    put = _put(s, maps)
    if put is not None:  # m.put(k, m.containsKey(k) ? m.get(k) + v : v)
        m, k, value = put
        if isinstance(value, T.TernaryExpression):
            has = _has(value.condition, m, k)
            if has is not None:
                present, absent = (value.if_true, value.if_false) if has else (value.if_false, value.if_true)
                v = _added_to_get(present, m, k)
                if v is not None and same_code(v, absent):
                    return 1, _merge(m, k, v, maps, s)
        return None
    d = s.declarators[0] if isinstance(s, T.LocalVariableDeclaration) and len(s.declarators) == 1 else None
    if d is None or not _is_get(d.initializer, maps) or getattr(s.type, "name", "") not in _SUMS:
        return None
    m, k, c = d.initializer.qualifier, d.initializer.arguments[0], d.name
    rest = stmts[i + 1:i + 3]
    # Integer c = m.get(k); if (c == null) { c = 0; } m.put(k, c + v);
    if len(rest) == 2 and isinstance(rest[0], T.IfStatement) and rest[0].else_statement is None \
            and _null_test(rest[0].condition, c) is True and _assigns_zero(rest[0].then_statement, c):
        put = _put(rest[1], maps)
        if put is not None and put[0] == m and same_code(put[1], k):
            v = _added_to(put[2], c)
            if v is not None and _used_only(method, c, 3):
                return 3, _merge(m, k, v, maps, s)
    # Integer c = m.get(k); m.put(k, c == null ? v : c + v);
    put = _put(rest[0], maps) if rest else None
    if put is not None and put[0] == m and same_code(put[1], k) and isinstance(put[2], T.TernaryExpression):
        absent_first = _null_test(put[2].condition, c)
        if absent_first is not None:
            absent, present = (put[2].if_true, put[2].if_false) if absent_first else (put[2].if_false, put[2].if_true)
            v = _added_to(present, c)
            if v is not None and same_code(v, absent) and _used_only(method, c, 3):
                return 2, _merge(m, k, v, maps, s)
    return None


def _lambda_update(s, maps: dict):
    """(map, key, amount) of `m.merge(k, v, (a, b) -> a + b)` or `m.compute(k, (x, c) -> c == null ?
    v : c + v)` (either order of the ternary and of the sum)."""
    e = s.expression if isinstance(s, T.StatementExpression) else None
    if not (isinstance(e, T.MethodInvocation) and e.qualifier in maps and not e.selectors and e.arguments
            and isinstance(e.arguments[-1], T.LambdaExpression) and _simple(e.arguments[0])):
        return None
    lam = e.arguments[-1]
    params = [getattr(p, "name", None) for p in lam.parameters or []]
    body = lam.body
    if isinstance(body, list):  # `{ return ...; }`
        body = body[0].expression if len(body) == 1 and isinstance(body[0], T.ReturnStatement) else None
    if body is None or len(params) != 2 or None in params:
        return None
    k = e.arguments[0]
    if e.member == "merge" and len(e.arguments) == 3 and _simple(e.arguments[1]):
        v = e.arguments[1]
        a, b = params
        if isinstance(body, T.BinaryOperation) and body.operator == "+" and not getattr(body, "prefix_operators", None) \
                and {getattr(body.operandl, "member", None), getattr(body.operandr, "member", None)} == {a, b} \
                and is_name(body.operandl) and is_name(body.operandr) and a != b:
            return e.qualifier, k, v
    if e.member == "compute" and len(e.arguments) == 2 and isinstance(body, T.TernaryExpression):
        c = params[1]
        absent_first = _null_test(body.condition, c)
        if absent_first is None:
            return None
        absent, present = (body.if_true, body.if_false) if absent_first else (body.if_false, body.if_true)
        v = _added_to(present, c)
        if v is not None and same_code(v, absent) and _simple(v) and not mentions(v, params[0]) and not mentions(v, c):
            return e.qualifier, k, v
    return None


def _if_update(s: T.IfStatement, maps: dict):
    """if (m.containsKey(k)) { m.put(k, m.get(k) + v); } else { m.put(k, v); } and its negations."""
    then, other = _single(s.then_statement), _single(s.else_statement)
    a, b = _put(then, maps), _put(other, maps)
    if a is None or b is None or a[0] != b[0] or not same_code(a[1], b[1]):
        return None
    m, k = a[0], a[1]
    has = _has(s.condition, m, k)
    if has is None:
        return None
    present, absent = (a[2], b[2]) if has else (b[2], a[2])
    v = _added_to_get(present, m, k)
    if v is None or not same_code(v, absent):
        return None
    return 1, _merge(m, k, v, maps, s)


def _has(cond, m: str, k) -> bool | None:
    """True for `m.containsKey(k)` / `m.get(k) != null`, False for their negations, else None."""
    neg = "!" in (getattr(cond, "prefix_operators", None) or [])
    if isinstance(cond, T.MethodInvocation) and cond.qualifier == m and cond.member == "containsKey" \
            and len(cond.arguments) == 1 and same_code(cond.arguments[0], k) and not cond.selectors:
        return not neg
    if isinstance(cond, T.BinaryOperation) and cond.operator in ("==", "!=") and not neg \
            and isinstance(cond.operandr, T.Literal) and cond.operandr.value == "null" \
            and _is_get(cond.operandl, {m: None}) and same_code(cond.operandl.arguments[0], k):
        return cond.operator == "!="
    return None


def _put(s, maps: dict):
    """(map, key, value) for `m.put(k, value);` with k a name or literal."""
    e = s.expression if isinstance(s, T.StatementExpression) else None
    if isinstance(e, T.MethodInvocation) and e.qualifier in maps and e.member == "put" and len(e.arguments) == 2 \
            and not e.selectors and _simple(e.arguments[0]):
        return e.qualifier, e.arguments[0], e.arguments[1]
    return None


def _is_get(e, maps: dict) -> bool:
    return isinstance(e, T.MethodInvocation) and e.qualifier in maps and e.member == "get" \
        and len(e.arguments) == 1 and not e.selectors and not e.prefix_operators and _simple(e.arguments[0])


def _added_to_get(e, m: str, k):
    """v for `m.get(k) + v` or `v + m.get(k)`."""
    if isinstance(e, T.BinaryOperation) and e.operator == "+":
        for get, v in ((e.operandl, e.operandr), (e.operandr, e.operandl)):
            if _is_get(get, {m: None}) and same_code(get.arguments[0], k) and _simple(v):
                return v
    return None


def _added_to(e, c: str):
    """v for `c + v` or `v + c`."""
    if isinstance(e, T.BinaryOperation) and e.operator == "+":
        for ref, v in ((e.operandl, e.operandr), (e.operandr, e.operandl)):
            if is_name(ref, c) and _simple(v):
                return v
    return None


def _null_test(cond, c: str) -> bool | None:
    """True for `c == null`, False for `c != null`."""
    if isinstance(cond, T.BinaryOperation) and cond.operator in ("==", "!=") and is_name(cond.operandl, c) \
            and isinstance(cond.operandr, T.Literal) and cond.operandr.value == "null":
        return cond.operator == "=="
    return None


def _assigns_zero(s, c: str) -> bool:
    s = _single(s)
    e = s.expression if isinstance(s, T.StatementExpression) else None
    return isinstance(e, T.Assignment) and e.type == "=" and is_name(e.expressionl, c) \
        and isinstance(e.value, T.Literal) and e.value.value.rstrip("lL") == "0"


def _used_only(method, c: str, times: int) -> bool:
    """`c` is read at most `times` times in the method (its uses in the pattern), no more."""
    return sum(1 for _, n in method if isinstance(n, T.MemberReference) and n.member == c and not n.qualifier) <= times


def _merge(m: str, k, v, maps: dict, like) -> T.StatementExpression:
    total = T.MethodReference(expression=T.MemberReference(member=_SUMS[maps[m][1]], qualifier="", selectors=[]),
                              method=T.MemberReference(member="sum", qualifier="", selectors=[]))
    call = T.MethodInvocation(qualifier=m, member="merge", arguments=[copy.deepcopy(k), copy.deepcopy(v), total],
                              selectors=[], prefix_operators=[], postfix_operators=[], type_arguments=None)
    return T.StatementExpression(expression=positioned(call, like))


def _flush_by_keys(s, maps: dict) -> bool:
    """`for (K x : m.keySet()) { ... m.get(x) ... }` -> `for (Map.Entry<K, V> e : m.entrySet())` with
    x -> e.getKey() and m.get(x) -> e.getValue(), in place. The body must not change the map."""
    if not (isinstance(s, T.ForStatement) and isinstance(s.control, T.EnhancedForControl)):
        return False
    it = s.control.iterable
    if not (isinstance(it, T.MethodInvocation) and it.qualifier in maps and it.member == "keySet"
            and not it.arguments and not it.selectors):
        return False
    m, x = it.qualifier, s.control.var.declarators[0].name
    if any(isinstance(n, T.MethodInvocation) and n.qualifier == m and n.member not in ("get",) for _, n in s.body) \
            or any(isinstance(n, T.Assignment) and is_name(n.expressionl, x) for _, n in s.body):
        return False
    entry = f"{x}Entry"

    def value(n):
        if _is_get(n, {m: None}) and is_name(n.arguments[0], x):
            return positioned(T.MethodInvocation(qualifier=entry, member="getValue", arguments=[], selectors=[],
                                                 prefix_operators=n.prefix_operators or [], postfix_operators=[],
                                                 type_arguments=None), n)
        return None

    def key(n):
        if is_name(n, x):
            return positioned(T.MethodInvocation(qualifier=entry, member="getKey", arguments=[], selectors=[],
                                                 prefix_operators=n.prefix_operators or [], postfix_operators=[],
                                                 type_arguments=None), n)
        return None

    holder = T.BlockStatement(statements=[copy.deepcopy(s.body)])
    replace_nodes(holder, value)  # m.get(x) first: replacing x first would hide it
    replace_nodes(holder, key)
    if mentions(holder, x) or mentions(s.body, entry):  # x used some other way; the entry's name taken
        return False
    key_t, value_t = maps[m]
    entry_t = T.ReferenceType(name="Map", dimensions=[], arguments=None, sub_type=T.ReferenceType(
        name="Entry", dimensions=[], sub_type=None,
        arguments=[T.TypeArgument(type=copy.deepcopy(key_t)), T.TypeArgument(type=copy.deepcopy(value_t))]))
    s.body = holder.statements[0]
    s.control.var = T.VariableDeclaration(type=entry_t, modifiers=set(), annotations=[],
                                          declarators=[T.VariableDeclarator(name=entry, dimensions=[], initializer=None)])
    s.control.iterable = positioned(T.MethodInvocation(qualifier=m, member="entrySet", arguments=[], selectors=[],
                                                       prefix_operators=[], postfix_operators=[], type_arguments=None),
                                    it)
    return True


def _single(s):
    if isinstance(s, T.BlockStatement) and len(s.statements or []) == 1:
        return s.statements[0]
    return s


def _simple(e) -> bool:
    """A literal, a name, or an element of a named array at a literal or named index: reading it
    again gives the same value, and it throws (if at all) on its first reading."""
    if isinstance(e, T.MemberReference) and not e.qualifier and not e.prefix_operators and not e.postfix_operators \
            and e.selectors and all(isinstance(x, T.ArraySelector) and _simple(x.index) for x in e.selectors):
        return True
    return isinstance(e, T.Literal) and not e.prefix_operators or is_name(e)

