"""The values of a key handed to a helper method: `context.write(key, new IntWritable(total(values)))`
with `int total(Iterable<IntWritable> vs) { int s = 0; for (IntWritable v : vs) s += v.get(); return s; }`
is the helper's statements in reduce(), followed by the statement with the call replaced by the
returned expression. That is what a Java method call does when the helper's only return is its
last statement and the call is evaluated once, unconditionally (JLS 15.12.4: arguments, then the
body; `values` is one iterator, so the helper is where the values are read).

Declined (left as written): helpers with another return, recursion, a call under `&&`, `||` or
`?:` (it might not run), a call inside a loop or a nested block, arguments other than names and
literals (they would be evaluated at another time), a helper that assigns a parameter.
"""
from __future__ import annotations

import copy

from javalang import tree as T

from migrate.lower.walk import assigned_names, is_name, line_of, replace_nodes

_SHORT_CIRCUIT = ("&&", "||")


def value_helpers(cls, index=None) -> list[tuple[int, str]]:
    done = []
    helpers = {m.name: m for m in cls.node.methods if m.name not in ("reduce", "map") and m.body}
    for method in cls.node.methods:
        if method.name != "reduce" or len(method.parameters) not in (3, 4) or not method.body:
            continue
        values = method.parameters[1].name
        body = method.body
        i = 0
        while i < len(body):
            found = _helper_call(body[i], values, helpers)
            if found is None:
                i += 1
                continue
            call, helper = found
            inlined, returned = _inline(helper, call, values, _names(method) | set(helpers) | _field_names(cls))
            replace_nodes(body[i], lambda n: returned if n is call else None)
            body[i:i] = inlined
            done.append((line_of(call) or line_of(body[i + len(inlined)]),
                         f"the values handed to {helper.name}(): its statements read here"))
            i += len(inlined) + 1
    return done


def _helper_call(stmt, values: str, helpers: dict):
    """(call, helper) for the one call in a top-level statement that hands `values` to a helper."""
    if not isinstance(stmt, (T.StatementExpression, T.LocalVariableDeclaration)):
        return None
    calls = [n for _, n in stmt if isinstance(n, T.MethodInvocation) and n.member in helpers
             and not n.qualifier and any(is_name(a, values) for a in n.arguments or [])]
    if len(calls) != 1:
        return None
    call, helper = calls[0], helpers[calls[0].member]
    if len(helper.parameters) != len(call.arguments) or not _returns_last(helper) or _guarded(stmt, call) \
            or any(n.member == helper.name for _, n in helper if isinstance(n, T.MethodInvocation)) \
            or assigned_names(helper) & {p.name for p in helper.parameters} \
            or not all(isinstance(a, T.Literal) or is_name(a) for a in call.arguments):
        return None
    return call, helper


def _inline(helper, call, values: str, taken: set[str]) -> tuple[list, object]:
    """The helper's statements with its parameters bound to the call's arguments and its locals
    renamed apart from reduce()'s names; and its returned expression."""
    body = copy.deepcopy(helper.body)
    bound = {p.name: a for p, a in zip(helper.parameters, call.arguments)}
    locals_ = {n.name for _, n in helper if isinstance(n, T.VariableDeclarator)}
    renamed = {}
    for name in sorted(locals_):
        new, k = name, 1
        while new in taken or new in bound:
            new, k = f"{name}{k}", k + 1
        renamed[name] = new
        taken.add(new)

    def swap(n):
        if isinstance(n, T.MemberReference) and not n.qualifier and n.member in bound:
            arg = copy.deepcopy(bound[n.member])
            if isinstance(arg, T.MemberReference):
                arg.selectors = (arg.selectors or []) + (n.selectors or [])
            return arg
        if isinstance(n, T.MemberReference) and not n.qualifier and n.member in renamed:
            n.member = renamed[n.member]
        if isinstance(n, T.MethodInvocation) and n.qualifier in bound and is_name(bound[n.qualifier]):
            n.qualifier = bound[n.qualifier].member
        elif isinstance(n, T.MethodInvocation) and n.qualifier in renamed:
            n.qualifier = renamed[n.qualifier]
        if isinstance(n, T.VariableDeclarator) and n.name in renamed:
            n.name = renamed[n.name]
        return None

    holder = T.BlockStatement(statements=body)
    replace_nodes(holder, swap)
    return holder.statements[:-1], holder.statements[-1].expression


def _returns_last(helper) -> bool:
    returns = [n for _, n in helper if isinstance(n, T.ReturnStatement)]
    return bool(helper.body) and len(returns) == 1 and returns[0] is helper.body[-1] \
        and returns[0].expression is not None


def _guarded(stmt, call) -> bool:
    """Is `call` under a `&&`, `||` or `?:` of the statement (it might not be evaluated)?"""
    for _, n in stmt:
        if isinstance(n, T.BinaryOperation) and n.operator in _SHORT_CIRCUIT or isinstance(n, T.TernaryExpression):
            if any(x is call for _, x in n):
                return True
    return False



def _names(method) -> set[str]:
    out = {p.name for p in method.parameters}
    for _, n in method:
        if isinstance(n, T.VariableDeclarator):
            out.add(n.name)
    return out


def _field_names(cls) -> set[str]:
    return {d.name for f in cls.fields() for d in f.declarators}
