"""A StringBuilder local that is only appended to and read is a String: `sb.append(a).append(b);`
is `sb = sb + a + b;` (append(x) adds String.valueOf(x), exactly as `+` converts x: Java SE API,
StringBuilder.append and JLS 15.18.1), `sb.setLength(0);` is `sb = "";` and `sb.toString()` is sb.
Reads that a String has too (length, charAt, indexOf, substring, isEmpty) stay as they are.

The rule fires only when every use of the local is one of these; anything else (insert, reverse,
append with a range, the builder passed to a method or stored) leaves the code as written. It
starts empty or from a String: `new StringBuilder(n)` with a number is a capacity, not text, and
only a literal or a call that returns a String is taken as the initial text.
"""
from __future__ import annotations

from javalang import ast
from javalang import tree as T

from migrate.lower.walk import line_of, name_ref, positioned, replace_nodes, statement_lists

BUILDERS = {"StringBuilder", "StringBuffer", "java.lang.StringBuilder", "java.lang.StringBuffer"}
STRING_READS = {"length", "charAt", "indexOf", "lastIndexOf", "substring", "isEmpty"}
_LOOPS = (T.ForStatement, T.WhileStatement, T.DoStatement)
_RETURNS_STRING = {"toString", "trim", "strip", "toLowerCase", "toUpperCase", "substring", "replace", "concat"}


def builders_as_strings(cls, index=None) -> list[tuple[int, str]]:
    done = []
    for method in cls.node.methods:
        for stmts, _ in list(statement_lists(method)):
            for s in list(stmts):
                name = _builder_local(s)
                if name is None or not _only_string_uses(method, name, s):
                    continue
                _rewrite(method, name, s)
                done.append((line_of(s), f"the StringBuilder `{name}` is only appended to and read: a String"))
    return done


def _builder_local(s) -> str | None:
    if not (isinstance(s, T.LocalVariableDeclaration) and getattr(s.type, "name", "") in BUILDERS
            and not s.type.dimensions and len(s.declarators) == 1):
        return None
    init = s.declarators[0].initializer
    if not (isinstance(init, T.ClassCreator) and init.type.name in BUILDERS and not init.selectors
            and not init.body):
        return None
    args = init.arguments or []
    if len(args) > 1 or args and not _is_string(args[0]):
        return None
    return s.declarators[0].name


def _is_string(e) -> bool:
    if isinstance(e, T.Literal):
        return e.value.startswith('"')
    last = e.selectors[-1] if getattr(e, "selectors", None) else e
    return isinstance(last, T.MethodInvocation) and last.member in _RETURNS_STRING


def _only_string_uses(method, name: str, decl) -> bool:
    """Every mention of `name` in the method is an append statement, setLength(0), a String read,
    or an operand of `+` / String.valueOf."""
    appends, resets = set(), set()
    for path, x in method:
        if isinstance(x, T.StatementExpression) and (_append_chain(x, name) or _reset(x, name)):
            if any(isinstance(p, _LOOPS) and not any(y is decl for _, y in p) for p in path):
                return False  # text carried from one iteration to the next: left for the loop rules
            (appends if _append_chain(x, name) else resets).add(id(x.expression))
    for path, n in method:
        if n is decl:
            continue
        if isinstance(n, T.MethodInvocation) and n.qualifier == name:
            if id(n) in appends or id(n) in resets:
                continue
            if (n.member == "toString" or n.member in STRING_READS) and (n.member != "toString" or not n.arguments):
                continue
            return False
        if isinstance(n, T.MemberReference) and (n.qualifier or "").split(".")[0] == name:
            return False
        if isinstance(n, T.MemberReference) and n.member == name and n.qualifier in ("", None):
            parent = next((p for p in reversed(path) if isinstance(p, ast.Node)), None)
            concat = isinstance(parent, T.BinaryOperation) and parent.operator == "+"
            value_of = isinstance(parent, T.MethodInvocation) and parent.qualifier == "String" \
                and parent.member == "valueOf"
            if n.selectors or n.prefix_operators or n.postfix_operators or not (concat or value_of):
                return False
        if isinstance(n, (T.VariableDeclarator, T.FormalParameter)) and n.name == name and n is not decl.declarators[0]:
            return False  # another variable of the same name
    return True


def _append_chain(st: T.StatementExpression, name: str) -> list | None:
    """The arguments of `name.append(a).append(b)...;`, else None."""
    e = st.expression
    if not (isinstance(e, T.MethodInvocation) and e.qualifier == name and e.member == "append"
            and len(e.arguments or []) == 1):
        return None
    args = [e.arguments[0]]
    for sel in e.selectors or []:
        if not (isinstance(sel, T.MethodInvocation) and sel.member == "append" and len(sel.arguments or []) == 1
                and not sel.selectors):
            return None
        args.append(sel.arguments[0])
    return args


def _reset(st: T.StatementExpression, name: str) -> bool:
    e = st.expression
    return isinstance(e, T.MethodInvocation) and e.qualifier == name and e.member == "setLength" \
        and len(e.arguments or []) == 1 and isinstance(e.arguments[0], T.Literal) and e.arguments[0].value == "0" \
        and not e.selectors


def _string_literal(text: str, like) -> T.Literal:
    return positioned(T.Literal(value=text, prefix_operators=[], postfix_operators=[], qualifier=None, selectors=[]),
                      like)


def _rewrite(method, name: str, decl) -> None:
    d = decl.declarators[0]
    args = d.initializer.arguments or []
    d.initializer = args[0] if args else _string_literal('""', d.initializer)
    decl.type = positioned(T.ReferenceType(name="String", dimensions=[], arguments=None, sub_type=None), decl.type)
    for _, st in list(method):
        if not isinstance(st, T.StatementExpression):
            continue
        parts = _append_chain(st, name)
        if parts is not None:
            value = name_ref(name, st)
            for p in parts:
                value = positioned(T.BinaryOperation(operator="+", operandl=value, operandr=p), st)
        elif _reset(st, name):
            value = _string_literal('""', st)
        else:
            continue
        st.expression = positioned(T.Assignment(expressionl=name_ref(name, st), type="=", value=value), st.expression)

    def read(n):
        if isinstance(n, T.MethodInvocation) and n.qualifier == name and n.member == "toString":
            ref = name_ref(name, n)
            ref.selectors = list(n.selectors or [])
            ref.prefix_operators = list(n.prefix_operators or [])
            return ref
        return None

    replace_nodes(method, read)
