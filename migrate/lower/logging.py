"""Logging statements carry nothing into the output: `System.out/err.print*`, a logger's
`info/debug/warn/error/trace`, `e.printStackTrace()` on a caught exception. They are dropped
when their arguments cannot change anything (no call that advances an iterator or a tokenizer,
no assignment, no ++/--), so `catch (Exception e) { e.printStackTrace(); }` is the same
catch-and-skip as an empty catch block. Only map(), reduce() and getPartition() are lowered: the
side-file reader of setup() names the line of a catch's logging in its own findings.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.walk import statement_lists, line_of

LOGGERS = {"LOG", "log", "logger", "LOGGER", "Log", "Logger"}
LOG_LEVELS = {"info", "debug", "warn", "error", "trace", "fatal", "warning", "fine", "finer", "finest", "severe"}
# calls that only read: what a log line may contain and still be dropped (common practice)
PURE_CALLS = {"toString", "get", "getMessage", "getLength", "length", "size", "trim", "toLowerCase", "toUpperCase",
              "valueOf", "format", "getClass", "getName", "getSimpleName", "getLocalizedMessage", "substring",
              "charAt", "isEmpty", "getBytes", "equals", "contains", "indexOf", "split", "join", "asList"}


def is_logging(stmt, caught: set[str]) -> str | None:
    """What the statement logs to ("stdout", "a logger", ...), or None when it is not only logging."""
    if not isinstance(stmt, T.StatementExpression) or not isinstance(stmt.expression, T.MethodInvocation):
        return None
    call = stmt.expression
    q, m = call.qualifier or "", call.member
    if q in ("System.out", "System.err") and m in ("println", "print", "printf", "format") and not call.selectors:
        where = q
    elif q in LOGGERS and m in LOG_LEVELS and not call.selectors:
        where = "a logger"
    elif q in caught and m == "printStackTrace" and not call.arguments and not call.selectors:
        where = "System.err"
    else:
        return None
    if not all(_pure(a) for a in call.arguments or []):
        return None
    return where


def _pure(node) -> bool:
    for _, n in node:
        if isinstance(n, T.MethodInvocation) and n.member not in PURE_CALLS:
            return False
        if isinstance(n, (T.Assignment, T.ClassCreator, T.LambdaExpression)):
            return False
        if isinstance(n, T.MemberReference) and (n.prefix_operators or n.postfix_operators) and \
                {"++", "--"} & set((n.prefix_operators or []) + (n.postfix_operators or [])):
            return False
    return True


def drop_logging(cls, index=None) -> list[tuple[int, str]]:
    done = []
    for method in [m for m in cls.node.methods if m.name in ("map", "reduce", "getPartition")]:  # not setup()
        for stmts, caught in statement_lists(method):
            keep = []
            for s in stmts:
                where = is_logging(s, caught)
                if where is None:
                    keep.append(s)
                else:
                    done.append((line_of(s), f"logging to {where} is not carried over"))
            stmts[:] = keep
    return done
