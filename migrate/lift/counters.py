"""Recognise Hadoop counter updates: `context.getCounter(Enum.X).increment(n)`,
`context.getCounter("group", "name").increment(n)`, `reporter.incrCounter(Enum.X, n)`,
`reporter.incrCounter("group", "name", n)`.

Produces: the counter's name as Hadoop reports it (group, counter) and the amount expression;
the mapper lifter turns each update into a Count step (rows where it runs, times the amount).
Caveats: counters whose name or group is computed at run time are declined.
"""
from __future__ import annotations

from dataclasses import dataclass

from javalang import tree as T

from migrate.java.index import ClassIndex, ClassInfo
from migrate.java.literals import string_value
from migrate.lift.exprs import Scope, Unsupported, lift
from migrate.plan import Expr, Lit


@dataclass(frozen=True)
class CounterUpdate:
    group: str
    name: str
    amount: Expr


def is_counter_call(e) -> bool:
    return isinstance(e, T.MethodInvocation) and (
        e.member == "incrCounter" or (e.member == "getCounter" and any(
            isinstance(x, T.MethodInvocation) and x.member == "increment" for x in e.selectors or [])))


def counter_update(e: T.MethodInvocation, scope: Scope, cls: ClassInfo, index: ClassIndex | None) -> CounterUpdate:
    """Read one counter statement; raises Unsupported for computed names."""
    if e.member == "incrCounter":
        args = e.arguments or []
        if len(args) == 2:
            group, name = _enum_counter(args[0], cls, index)
            return CounterUpdate(group, name, _amount(args[1], scope))
        if len(args) == 3:
            return CounterUpdate(_literal(args[0]), _literal(args[1]), _amount(args[2], scope))
        raise Unsupported(e, "incrCounter with unexpected arguments")
    inc = next(x for x in e.selectors if isinstance(x, T.MethodInvocation) and x.member == "increment")
    args = e.arguments or []
    amount = _amount(inc.arguments[0], scope) if inc.arguments else Lit("long", 1)
    if len(args) == 1:
        group, name = _enum_counter(args[0], cls, index)
    elif len(args) == 2:
        group, name = _literal(args[0]), _literal(args[1])
    else:
        raise Unsupported(e, "getCounter with unexpected arguments")
    return CounterUpdate(group, name, amount)


def _amount(node, scope: Scope) -> Expr:
    v = lift(node, scope)
    if v.jtype not in ("int", "long"):
        raise Unsupported(node, "counter increment that is not an integer")
    return v


def _literal(node) -> str:
    if isinstance(node, T.Literal) and node.value.startswith('"'):
        return string_value(node.value)
    raise Unsupported(node, "counter group or name computed at run time")


def _enum_counter(node, cls: ClassInfo, index: ClassIndex | None) -> tuple[str, str]:
    """`Quality.BAD_ROW` -> (binary name of the enum, as Hadoop prints the group; constant)."""
    if not isinstance(node, T.MemberReference) or not node.qualifier:
        raise Unsupported(node, "counter that is not an enum constant")
    simple = node.qualifier.split(".")[-1]
    binary = index.enum_binary_name(simple, cls) if index is not None else None
    return (binary or node.qualifier, node.member)
