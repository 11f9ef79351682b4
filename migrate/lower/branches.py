"""An `if` whose two branches are the same statements is those statements, when its condition
can neither throw nor change anything (common practice: what a compiler's branch merging does).
Its condition is then never read by the lift rules, so a test the converter would decline (a
Text compared with a String, which is never equal) does not stop a job it cannot affect."""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.walk import line_of, same_code, statement_lists

# String / Text / Writable methods that only read and cannot throw on a non-null receiver
_SAFE_CALLS = {"equals", "equalsIgnoreCase", "contains", "startsWith", "endsWith", "isEmpty", "length", "toString",
               "get", "getLength", "hashCode", "toLowerCase", "toUpperCase", "trim"}


def same_branches(cls, index=None) -> list[tuple[int, str]]:
    done = []
    for method in cls.node.methods:
        params = {p.name for p in method.parameters}  # Hadoop never passes null keys or values
        for stmts, _ in statement_lists(method):
            for i, s in reversed(list(enumerate(stmts))):
                if isinstance(s, T.IfStatement) and s.else_statement is not None \
                        and same_code(s.then_statement, s.else_statement) and _harmless(s.condition, params):
                    then = s.then_statement
                    stmts[i:i + 1] = list(then.statements or []) if isinstance(then, T.BlockStatement) else [then]
                    done.append((line_of(s), "an if whose two branches are the same: its test cannot matter"))
    return done


def _harmless(e, params: set[str]) -> bool:
    """Reads only parameters and literals, through calls that cannot throw or change anything."""
    if isinstance(e, T.Literal):
        return True
    if isinstance(e, T.MemberReference):  # a parameter: a local could be a null Integer that unboxing throws on
        return e.member in params and not e.qualifier and not e.selectors and not e.prefix_operators \
            and not e.postfix_operators
    if isinstance(e, T.BinaryOperation):
        return e.operator not in ("/", "%") and _harmless(e.operandl, params) and _harmless(e.operandr, params)
    if isinstance(e, T.MethodInvocation):
        calls = [e] + list(e.selectors or [])
        return e.qualifier in params and all(
            isinstance(c, T.MethodInvocation) and c.member in _SAFE_CALLS and len(c.arguments or []) <= 1
            and all(_harmless(a, params) for a in c.arguments or []) for c in calls)
    return False


