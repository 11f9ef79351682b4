"""Recognise Hadoop counter updates: `context.getCounter(Enum.X).increment(n)`,
`context.getCounter("group", "name").increment(n)`, `reporter.incrCounter(Enum.X, n)`,
`reporter.incrCounter("group", "name", n)`.

Produces: the counter's name as Hadoop reports it (group, counter) and the amount expression;
the mapper lifter turns each update into a Count step (rows where it runs, times the amount).
A group or name computed from the record (`getCounter("Status", fields[2])`) is a String
expression: the script counts by the computed name, cut as Hadoop cuts long names (Limits:
a name over mapreduce.job.counters.counter.name.max=64 chars keeps its first 63, a group over
...group.name.max=128 its first 127; MRJobConfig defaults of Hadoop 3.5, checked on the local
runner in tests/unit/test_lowering_parity.py). Hadoop fails a job with more than
mapreduce.job.counters.max=120 counters, its own included; that is raised as a finding.
"""
from __future__ import annotations

from dataclasses import dataclass

from javalang import tree as T

from migrate.java.index import ClassIndex, ClassInfo, node_lines
from migrate.java.literals import string_value
from migrate.lift.exprs import Scope, Unsupported, lift
from migrate.plan import Expr, Finding, Lit, Span


@dataclass(frozen=True)
class CounterUpdate:
    group: str | Expr  # an Expr where the record names the counter
    name: str | Expr
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
            return _named(e, args[0], args[1], _amount(args[2], scope), scope)
        raise Unsupported(e, "incrCounter with unexpected arguments")
    inc = next(x for x in e.selectors if isinstance(x, T.MethodInvocation) and x.member == "increment")
    args = e.arguments or []
    amount = _amount(inc.arguments[0], scope) if inc.arguments else Lit("long", 1)
    if len(args) == 1:
        group, name = _enum_counter(args[0], cls, index)
    elif len(args) == 2:
        return _named(e, args[0], args[1], amount, scope)
    else:
        raise Unsupported(e, "getCounter with unexpected arguments")
    return CounterUpdate(group, name, amount)


def _amount(node, scope: Scope) -> Expr:
    v = lift(node, scope)
    if v.jtype not in ("int", "long"):
        raise Unsupported(node, "counter increment that is not an integer")
    return v


def _named(e, group_node, name_node, amount: Expr, scope: Scope) -> CounterUpdate:
    """A counter named by two Strings; one computed from the record is raised as a finding."""
    group, name = _label(group_node, scope), _label(name_node, scope)
    if not isinstance(group, str) or not isinstance(name, str):
        line = node_lines(e)[0]
        scope.findings.append(Finding(
            "counter-names-from-data", Span(scope.file, line, line),
            "the counter's name comes from the data: Hadoop fails the job once it has more than 120 counters "
            "(mapreduce.job.counters.max, its own counters included) and cuts names over 64 chars to 63; the "
            "script cuts names the same way, counts every name in a second pass over the input and warns past "
            "120 names instead of failing", "keep the set of names small and known, or count with a groupBy"))
    return CounterUpdate(group, name, amount)


def _label(node, scope: Scope) -> str | Expr:
    """A counter's group or name: the literal, else the String the record computes."""
    if isinstance(node, T.Literal) and node.value.startswith('"'):
        return string_value(node.value)
    v = lift(node, scope)
    if v.jtype != "String":
        raise Unsupported(node, f"counter group or name that is a {v.jtype}, not a String")
    return v


def counter_named(args: tuple, cls: ClassInfo, index: ClassIndex | None) -> tuple[str, str] | None:
    """The (group, name) that `findCounter(Enum.X)` or `findCounter("group", "name")` names, as the
    job's updates name it; None for anything computed."""
    try:
        if len(args) == 1:
            return _enum_counter(args[0], cls, index)
    except Unsupported:
        return None
    if len(args) == 2 and all(isinstance(a, T.Literal) and a.value.startswith('"') for a in args):
        return string_value(args[0].value), string_value(args[1].value)
    return None


def _enum_counter(node, cls: ClassInfo, index: ClassIndex | None) -> tuple[str, str]:
    """`Quality.BAD_ROW` -> (binary name of the enum, as Hadoop prints the group; constant)."""
    if not isinstance(node, T.MemberReference) or not node.qualifier:
        raise Unsupported(node, "counter that is not an enum constant")
    simple = node.qualifier.split(".")[-1]
    binary = index.enum_binary_name(simple, cls) if index is not None else None
    return (binary or node.qualifier, node.member)
