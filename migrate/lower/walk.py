"""Walking and building javalang trees for the lowering rules."""
from __future__ import annotations

from javalang import ast
from javalang import tree as T

from migrate.java.index import node_lines


def line_of(node) -> int:
    return node_lines(node)[0]


def statement_lists(method, caught: frozenset[str] = frozenset()):
    """Every list of statements in a method, with the names of the exceptions caught around it.
    The lists are the tree's own: a rule may edit them in place."""
    if method.body is not None:
        yield from _lists(method.body, caught)


def _lists(stmts: list, caught):
    yield stmts, caught
    for s in list(stmts):
        yield from _inner(s, caught)


def _inner(s, caught):
    if isinstance(s, T.BlockStatement):
        yield from _lists(s.statements, caught)
    elif isinstance(s, T.TryStatement):
        yield from _lists(s.block or [], caught)
        for c in s.catches or []:
            yield from _lists(c.block or [], caught | {c.parameter.name})
        if s.finally_block:
            yield from _lists(s.finally_block, caught)
    elif isinstance(s, T.IfStatement):
        yield from _inner(s.then_statement, caught)
        if s.else_statement is not None:
            yield from _inner(s.else_statement, caught)
    elif isinstance(s, (T.ForStatement, T.WhileStatement, T.DoStatement)):
        yield from _inner(s.body, caught)
    elif isinstance(s, T.SwitchStatement):
        for c in s.cases:
            yield from _lists(c.statements, caught)


def is_name(node, name: str | None = None) -> bool:
    """A bare simple name (`x`, no qualifier, selectors or operators), optionally that one."""
    return isinstance(node, T.MemberReference) and not node.qualifier and not node.selectors \
        and not node.prefix_operators and not node.postfix_operators and (name is None or node.member == name)


def name_ref(name: str, like=None) -> T.MemberReference:
    ref = T.MemberReference(prefix_operators=[], postfix_operators=[], qualifier="", selectors=[], member=name)
    return positioned(ref, like)


def positioned(node, like):
    """Give a new node the source position of the node it stands for."""
    if like is not None and getattr(like, "position", None) is not None:
        node._position = like.position
    return node


def mentions(node, name: str) -> bool:
    """Does `node` read or write the simple name `name` (a local or a field without `this.`)?"""
    return any(uses for uses in _uses(node, name))


def _uses(node, name):
    if not isinstance(node, (ast.Node, list, tuple)):
        return
    for _, n in (node if isinstance(node, ast.Node) else _walk_list(node)):
        q = getattr(n, "qualifier", None) or ""
        if isinstance(n, (T.MemberReference, T.MethodInvocation)) and (q == name or q.startswith(name + ".")):
            yield True  # `name.length`, `name.get()`
        elif isinstance(n, T.MemberReference) and n.member == name and q in ("", "this"):
            yield True
        elif isinstance(n, T.This) and n.selectors and isinstance(n.selectors[0], T.MemberReference) \
                and n.selectors[0].member == name:
            yield True


def _walk_list(items):
    for x in items:
        if isinstance(x, ast.Node):
            yield from x


def replace_nodes(node, swap) -> None:
    """Replace, bottom-up, every node n under `node` for which swap(n) returns a new node."""
    for attr in getattr(node, "attrs", ()):
        v = getattr(node, attr)
        if isinstance(v, list):
            for k, x in enumerate(v):
                if isinstance(x, ast.Node):
                    replace_nodes(x, swap)
                    new = swap(x)
                    if new is not None:
                        v[k] = new
        elif isinstance(v, ast.Node):
            replace_nodes(v, swap)
            new = swap(v)
            if new is not None:
                setattr(node, attr, new)


def assigned_names(node) -> set[str]:
    """The simple names `node` assigns (`x = …`, `this.x = …`, `x += …`) or steps (`x++`, `--this.x`):
    what cannot be a constant."""
    out = set()
    for _, n in node:
        steps = {"++", "--"} & set((getattr(n, "prefix_operators", None) or []) +
                                   (getattr(n, "postfix_operators", None) or []))
        target = n.expressionl if isinstance(n, T.Assignment) else n if steps else None
        if isinstance(target, T.MemberReference):
            out.add(target.member)
        elif isinstance(target, T.This) and target.selectors:
            out.add(getattr(target.selectors[0], "member", None))
    return out - {None}


def qualified(t) -> tuple[str, list]:
    """A reference type's dotted name and the type arguments of its last part (`java.util.Iterator<T>`
    is a chain of sub_types in javalang)."""
    parts = []
    while t is not None and isinstance(t, T.ReferenceType):
        parts.append(t.name)
        last, t = t, t.sub_type
    return (".".join(parts), list(last.arguments or [])) if parts else ("", [])


def same_code(a, b) -> bool:
    """The same code, wherever it is written (positions and comments aside)."""
    if isinstance(a, T.Node) and isinstance(b, T.Node):
        return type(a) is type(b) and all(same_code(getattr(a, k), getattr(b, k)) for k in a.attrs if k != "documentation")
    if isinstance(a, (list, tuple)) and isinstance(b, (list, tuple)):
        return len(a) == len(b) and all(same_code(x, y) for x, y in zip(a, b))
    if isinstance(a, set) and isinstance(b, set):
        return a == b
    return a == b

