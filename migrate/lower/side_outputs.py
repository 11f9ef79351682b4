"""Side outputs that are never written: a `MultipleOutputs` field made in setup() and closed in
cleanup() that no code writes to adds no file (MultipleOutputs makes a record writer on the first
write to a name and close() closes the ones it made; from memory of the Hadoop source, checked by
tests/unit/test_reduce_forms.py on the local runner). Its creation and its close() are dropped,
so a setup()/cleanup() that did only that does nothing."""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.walk import line_of, qualified, statement_lists


def unused_side_outputs(cls, index=None) -> list[tuple[int, str]]:
    names = {d.name for f in cls.fields() if _simple_name(f.type) == "MultipleOutputs" for d in f.declarators}
    used = set()  # names read anywhere but in their own creation and close()
    for m in cls.node.methods:
        for stmts, _ in statement_lists(m):
            for s in stmts:
                if any(_makes_or_closes(s, n) for n in names) or isinstance(s, (T.BlockStatement, T.IfStatement,
                                                                                 T.TryStatement)):
                    continue  # a block's own statements are visited as a list of their own
                used |= {n.member for _, n in s if isinstance(n, T.MemberReference)}
                used |= {n.qualifier for _, n in s if isinstance(n, T.MethodInvocation)}
    done = []
    for name in sorted(names - used):
        for method in cls.node.methods:
            for stmts, _ in statement_lists(method):
                keep = [s for s in stmts if not _makes_or_closes(s, name)]
                if len(keep) != len(stmts):
                    done += [(line_of(s), f"the MultipleOutputs `{name}` is never written to: made and closed for "
                                          "nothing") for s in stmts if _makes_or_closes(s, name)][:1]
                    stmts[:] = keep
    return done[:1]


def _makes_or_closes(s, name: str) -> bool:
    e = s.expression if isinstance(s, T.StatementExpression) else None
    if isinstance(e, T.Assignment) and e.type == "=" and _is_field(e.expressionl, name):
        return isinstance(e.value, T.ClassCreator) and _simple_name(e.value.type) == "MultipleOutputs"
    return isinstance(e, T.MethodInvocation) and e.qualifier in (name, f"this.{name}") and e.member == "close" \
        and not e.arguments and not e.selectors


def _simple_name(t) -> str:
    """`MultipleOutputs`, also when written qualified (`org.apache...MultipleOutputs`)."""
    return qualified(t)[0].rsplit(".", 1)[-1]


def _is_field(n, name: str) -> bool:
    if isinstance(n, T.MemberReference):
        return n.member == name and n.qualifier in ("", None, "this")
    return isinstance(n, T.This) and len(n.selectors or []) == 1 and getattr(n.selectors[0], "member", None) == name
