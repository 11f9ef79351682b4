"""Boxing in one form: `new Integer(x)` unboxed into a primitive is `Integer.valueOf(x)` (and so for
Long, Double, Float); `new Integer(0)` is the literal `0` (`0L`, `0.0`, `0.0f` for the others).

The constructors (deprecated since Java 9) give the value valueOf gives, from a number or from a
String (Java SE 17 API docs, Integer(String): "in exactly the manner used by the parseInt method";
Double(String): "as if by the valueOf method"). Only the object's identity differs (`==` on two of
them is false), so only a new object that is unboxed at once is rewritten: the value of a primitive
local or field (declared, assigned or compound-assigned) or an operand of arithmetic."""
from __future__ import annotations

import re

from javalang import tree as T

from migrate.lower.walk import line_of, positioned, replace_nodes

BOXES = ("Integer", "Long", "Double", "Float")
PRIMITIVES = {"int", "long", "double", "float", "short", "byte", "char"}
ARITHMETIC = {"+", "-", "*", "/", "%"}


def boxing_constructors(cls, index=None) -> list[tuple[int, str]]:
    fields = _primitive_names(cls.node.fields if hasattr(cls.node, "fields") else [], set())
    done = []
    for member in [*getattr(cls.node, "fields", []), *getattr(cls.node, "constructors", []), *cls.node.methods]:
        names = fields if isinstance(member, T.FieldDeclaration) else _primitive_names([member], fields)
        unboxed = {id(x) for x in _unboxed_values(member, names)}

        def boxed(n):
            if id(n) not in unboxed or not isinstance(n, T.ClassCreator) or n.body is not None \
                    or n.type.name not in BOXES or n.type.sub_type is not None or len(n.arguments or []) != 1 \
                    or n.selectors:
                return None
            box = n.type.name
            done.append((line_of(n), f"`new {box}(...)` is `{box}.valueOf(...)`"))
            (arg,) = n.arguments
            if isinstance(arg, T.Literal) and re.fullmatch(r"\d{1,9}", arg.value) and not arg.selectors \
                    and not (arg.prefix_operators or arg.postfix_operators):
                # a small whole number: the literal of the box's type (a constant the rules read as one)
                suffix = {"Integer": "", "Long": "L", "Double": ".0", "Float": ".0f"}[box]
                return positioned(T.Literal(value=arg.value + suffix, selectors=[],
                                            prefix_operators=n.prefix_operators or [], postfix_operators=[]), n)
            return positioned(T.MethodInvocation(qualifier=box, member="valueOf", arguments=n.arguments,
                                                 type_arguments=None, selectors=[],
                                                 prefix_operators=n.prefix_operators or [], postfix_operators=[]), n)

        replace_nodes(member, boxed)
    return done[:1] if done else []  # one note says it for the class


def _primitive_names(nodes, outer: set[str]) -> set[str]:
    """Names declared with a primitive type in `nodes` (a name declared both ways is left out), over
    those of `outer` (the class's fields) that no declaration here hides."""
    prim, other = set(), set()
    for node in nodes:
        for _, n in node:
            if isinstance(n, (T.LocalVariableDeclaration, T.FieldDeclaration, T.VariableDeclaration)):
                target = prim if isinstance(n.type, T.BasicType) and n.type.name in PRIMITIVES \
                    and not n.type.dimensions else other
                target.update(d.name for d in n.declarators)
            elif isinstance(n, T.FormalParameter):
                (prim if isinstance(n.type, T.BasicType) and not n.type.dimensions else other).add(n.name)
    return ((outer - other) | prim) - (prim & other)


def _unboxed_values(node, names: set[str]):
    """Expressions whose object is unboxed at once: the value of a primitive declared or assigned by
    name (`x`, `this.x`), or an operand of arithmetic."""
    for _, n in node:
        if isinstance(n, (T.LocalVariableDeclaration, T.FieldDeclaration)) and \
                all(d.name in names for d in n.declarators):
            yield from (d.initializer for d in n.declarators if d.initializer is not None)
        elif isinstance(n, T.Assignment) and _target(n.expressionl) in names:
            yield n.value
        elif isinstance(n, T.BinaryOperation) and n.operator in ARITHMETIC:
            yield from (n.operandl, n.operandr)


def _target(e) -> str | None:
    if isinstance(e, T.MemberReference) and not e.selectors and e.qualifier in ("", None, "this"):
        return e.member
    if isinstance(e, T.This) and len(e.selectors or []) == 1 and isinstance(e.selectors[0], T.MemberReference):
        return e.selectors[0].member
    return None
