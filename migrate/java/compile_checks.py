"""What javac would reject in a parsed file, found without javac.

javalang parses more than the Java language allows: a file it reads may still not compile, and
mrlift cannot promise parity for code that never ran. This module finds the compile errors
that real code (and a mutation of it) most often has, each with its line, as javac names them
(JLS 17):

- a non-repeatable annotation given twice on one declaration (`@Override @Override`, JLS 9.7.5);
- a local variable or parameter declared again while the first is in scope (JLS 6.4);
- a method declared twice with the same parameter types, a field declared twice (JLS 8.3, 8.4.2);
- a public top-level class in a file not named after it (JLS 7.6);
- a decimal integer literal out of its type's range (JLS 3.10.1);
- a statement right after `return`, `throw`, `break` or `continue` in the same block (JLS 14.22);
- an expression statement that is not a statement: `++` / `--` on something that is not a
  variable (`++ job.setX(1);`), or an operator applied to a call used as a statement (JLS 14.8).

Undefined names and types are left to `convert --compile-check`, which runs javac itself.
"""
from __future__ import annotations

from dataclasses import dataclass

from javalang import tree as T

from migrate.java.index import node_lines

# java.lang annotations that may appear once per declaration (none is @Repeatable)
SINGLE_ANNOTATIONS = {"Override", "Deprecated", "SuppressWarnings", "FunctionalInterface", "SafeVarargs"}


@dataclass(frozen=True)
class CompileProblem:
    line: int
    message: str


def compile_problems(tree: T.CompilationUnit, file_stem: str | None = None) -> list[CompileProblem]:
    """Every problem found in one compilation unit (the file `file_stem`.java), in line order."""
    found: list[CompileProblem] = []
    for t in tree.types or []:
        if file_stem is not None and "public" in (t.modifiers or set()) and t.name != file_stem:
            found.append(CompileProblem(_line(t), f"class {t.name} is public, should be declared in a file named "
                                                  f"{t.name}.java"))
    for _, node in tree:  # one walk over the tree, each node to the checks that concern it
        if isinstance(node, T.Declaration):
            _annotations(node, found)
        if isinstance(node, (T.ClassDeclaration, T.EnumDeclaration)):
            _members(node, found)
        elif isinstance(node, T.Literal):
            _number_range(node, found)
        elif isinstance(node, (T.MethodDeclaration, T.ConstructorDeclaration)):
            _Scopes(found).method(node)
    return sorted(set(found), key=lambda p: (p.line, p.message))


def _line(node, default: int = 0) -> int:
    if getattr(node, "position", None):
        return node.position.line
    try:
        return node_lines(node)[0]
    except (AttributeError, TypeError, IndexError):
        return default


def _number_range(lit: T.Literal, found: list[CompileProblem]) -> None:
    """A decimal int literal over 2147483647 (2147483648 only after a minus), or a long one over
    9223372036854775807 (…808 only after a minus): javac's "integer number too large" (JLS 3.10.1)."""
    text = (lit.value or "").replace("_", "")
    long_ = text[-1:] in ("l", "L")
    digits = text[:-1] if long_ else text
    if not digits.isdigit() or (len(digits) > 1 and digits.startswith("0")):
        return  # not decimal (hex, octal, binary, floating, string, char)
    limit = 2**63 if long_ else 2**31
    negated = "-" in (lit.prefix_operators or [])
    if int(digits) > limit or int(digits) == limit and not negated:
        found.append(CompileProblem(_line(lit), f"integer number too large: {digits}"))


def _annotations(node, found: list[CompileProblem]) -> None:
    seen: set[str] = set()
    for a in getattr(node, "annotations", None) or []:
        name = a.name.rsplit(".", 1)[-1]
        if name in seen and name in SINGLE_ANNOTATIONS:
            found.append(CompileProblem(_line(a, _line(node)), f"@{name} is not a repeatable annotation type"))
        seen.add(name)


def _type_key(t) -> str:
    if t is None:
        return "?"
    name = t.name
    sub = t
    while getattr(sub, "sub_type", None) is not None:
        sub = sub.sub_type
        name += "." + sub.name
    return name.rsplit(".", 1)[-1] + "[]" * len(getattr(t, "dimensions", None) or [])


def _members(cls, found: list[CompileProblem]) -> None:
    fields: dict[str, int] = {}  # names seen so far
    methods: dict[tuple, int] = {}
    for member in cls.body or []:
        if isinstance(member, T.FieldDeclaration):
            for d in member.declarators:
                if d.name in fields:
                    found.append(CompileProblem(_line(member), f"variable {d.name} is already defined in class "
                                                               f"{cls.name}"))
                fields.setdefault(d.name, 0)
        elif isinstance(member, T.MethodDeclaration):
            sig = (member.name, tuple(_type_key(p.type) + ("..." if p.varargs else "") for p in member.parameters))
            if sig in methods:
                found.append(CompileProblem(_line(member), f"method {member.name}({', '.join(sig[1])}) is already "
                                                           f"defined in class {cls.name}"))
            methods.setdefault(sig, 0)


class _Scopes:
    """Walks one method body with its nested scopes (JLS 6.3): a local may not be declared again
    while another of the same name is in scope; a statement may not follow one that never completes."""

    def __init__(self, found: list[CompileProblem]):
        self.found = found
        self.stack: list[set[str]] = []

    def method(self, m) -> None:
        self.stack = [set()]
        for p in m.parameters or []:
            self.declare(p.name, _line(p, _line(m)))
        self.block(m.body or [], new_scope=False)

    def declare(self, name: str, line: int) -> None:
        if any(name in s for s in self.stack):
            self.found.append(CompileProblem(line, f"variable {name} is already defined in this method"))
        self.stack[-1].add(name)

    def block(self, statements, new_scope: bool = True) -> None:
        if new_scope:
            self.stack.append(set())
        ended = None
        for s in statements or []:
            if ended is not None:
                self.found.append(CompileProblem(_line(s, ended), "unreachable statement"))
                ended = None  # javac reports the first one
            self.statement(s)
            if isinstance(s, (T.ReturnStatement, T.ThrowStatement, T.BreakStatement, T.ContinueStatement)):
                ended = _line(s)
        if new_scope:
            self.stack.pop()

    def statement(self, s) -> None:
        if s is None:
            return
        if isinstance(s, T.LocalVariableDeclaration):
            for d in s.declarators:
                self.expressions(d.initializer)
                self.declare(d.name, _line(s))
        elif isinstance(s, T.BlockStatement):
            self.block(s.statements)
        elif isinstance(s, T.StatementExpression):
            self.expression_statement(s)
        elif isinstance(s, T.IfStatement):
            self.expressions(s.condition)
            self.scoped(s.then_statement)
            self.scoped(s.else_statement)
        elif isinstance(s, (T.WhileStatement, T.DoStatement)):
            self.expressions(s.condition)
            self.scoped(s.body)
        elif isinstance(s, T.ForStatement):
            self.stack.append(set())
            c = s.control
            if isinstance(c, T.EnhancedForControl):
                self.expressions(c.iterable)
                for d in c.var.declarators:
                    self.declare(d.name, _line(s))
            elif isinstance(c, T.ForControl):
                if isinstance(c.init, T.VariableDeclaration):
                    for d in c.init.declarators:
                        self.expressions(d.initializer)
                        self.declare(d.name, _line(s))
            self.scoped(s.body)
            self.stack.pop()
        elif isinstance(s, T.TryStatement):
            self.stack.append(set())
            for r in s.resources or []:
                self.expressions(r.value)
                self.declare(r.name, _line(r, _line(s)))
            self.block(s.block)
            self.stack.pop()
            for c in s.catches or []:
                self.stack.append(set())
                self.declare(c.parameter.name, _line(c, _line(s)))
                self.block(c.block, new_scope=False)
                self.stack.pop()
            if s.finally_block:
                self.block(s.finally_block)
        elif isinstance(s, T.SwitchStatement):
            self.expressions(s.expression)
            self.stack.append(set())  # the cases of one switch block share one scope
            for case in s.cases or []:
                self.block(case.statements, new_scope=False)
            self.stack.pop()
        elif isinstance(s, T.SynchronizedStatement):
            self.block(s.block)
        elif isinstance(s, (T.ReturnStatement, T.ThrowStatement)):
            self.expressions(s.expression)

    def scoped(self, s) -> None:
        """A statement in a branch or a loop body: its declarations end with it."""
        if s is None:
            return
        self.stack.append(set())
        self.statement(s)
        self.stack.pop()

    def expressions(self, e) -> None:
        """Lambdas inside an expression: their parameters may not shadow locals either (those in
        the body of an anonymous class may: it is a scope of its own)."""
        if e is None or not isinstance(e, T.Node):
            return
        for path, lam in e.filter(T.LambdaExpression):
            if any(isinstance(p, T.ClassCreator) and p.body for p in path if isinstance(p, T.Node)):
                continue
            self.stack.append(set())
            for p in lam.parameters or []:
                name = getattr(p, "name", None) or getattr(p, "member", None)
                if isinstance(name, str):
                    self.declare(name, _line(lam))
            if isinstance(lam.body, list):
                self.block(lam.body, new_scope=False)
            self.stack.pop()

    def expression_statement(self, s: T.StatementExpression) -> None:
        e = s.expression
        self.expressions(e)
        ops = set(getattr(e, "prefix_operators", None) or []) | set(getattr(e, "postfix_operators", None) or [])
        line = _line(s)
        if ops & {"++", "--"}:
            selectors = getattr(e, "selectors", None) or []
            if isinstance(e, T.MethodInvocation) or any(isinstance(x, T.MethodInvocation) for x in selectors[-1:]):
                self.found.append(CompileProblem(line, "unexpected type: ++ or -- needs a variable, not a method "
                                                       "call"))
        elif ops and isinstance(e, T.MethodInvocation):
            self.found.append(CompileProblem(line, "not a statement"))
        elif isinstance(e, (T.Literal, T.BinaryOperation, T.MemberReference)) and not ops:
            self.found.append(CompileProblem(line, "not a statement"))
