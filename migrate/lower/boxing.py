"""Boxing in one form: `new Integer(x)` is `Integer.valueOf(x)` (and so for Long, Double, Float).

The constructors (deprecated since Java 9) give the value valueOf gives, from a number or from a
String (Java SE 17 API docs, Integer(String): "in exactly the manner used by the parseInt method";
Double(String): "as if by the valueOf method"). Only the object's identity differs, so an operand
of `==` / `!=` is left as written."""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.walk import line_of, positioned, replace_nodes

BOXES = ("Integer", "Long", "Double", "Float")


def boxing_constructors(cls, index=None) -> list[tuple[int, str]]:
    compared = {id(x) for _, n in cls.node if isinstance(n, T.BinaryOperation) and n.operator in ("==", "!=")
                for x in (n.operandl, n.operandr)}
    done = []

    def boxed(n):
        if not (isinstance(n, T.ClassCreator) and n.type.name in ("java.lang." + b for b in BOXES) or
                isinstance(n, T.ClassCreator) and n.type.name in BOXES and n.type.sub_type is None) \
                or len(n.arguments or []) != 1 or n.body is not None or id(n) in compared:
            return None
        box = n.type.name.rsplit(".", 1)[-1]
        done.append((line_of(n), f"`new {box}(...)` is `{box}.valueOf(...)`"))
        return positioned(T.MethodInvocation(qualifier=box, member="valueOf", arguments=n.arguments,
                                             type_arguments=None, selectors=n.selectors or [],
                                             prefix_operators=n.prefix_operators or [],
                                             postfix_operators=n.postfix_operators or []), n)

    replace_nodes(cls.node, boxed)
    return done[:1] if done else []  # one note says it for the class
