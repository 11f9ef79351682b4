"""Names in one form: `this.word` is `word` where no parameter or local of the method shadows
the field; `var x = <expr>` gets the type its initializer has when that is plain from the code
(a `new` object, a literal, a String method, a parser), as javac infers it."""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.walk import line_of, positioned, replace_nodes


def this_fields(cls, index=None) -> list[tuple[int, str]]:
    fields = {d.name for f in cls.fields() for d in f.declarators}
    done = []
    for method in cls.node.methods:
        shadow = {p.name for p in method.parameters}
        shadow |= {d.name for _, n in method if isinstance(n, (T.LocalVariableDeclaration, T.VariableDeclaration))
                   for d in n.declarators}
        shadow |= {n.name for _, n in method if isinstance(n, (T.FormalParameter, T.CatchClauseParameter))}
        names = fields - shadow

        def bare(n):
            if not (isinstance(n, T.This) and n.selectors and isinstance(n.selectors[0], T.MemberReference)
                    and n.selectors[0].member in names and not n.qualifier):
                return None
            name, rest = n.selectors[0].member, list(n.selectors[1:])
            ops = dict(prefix_operators=n.prefix_operators or [], postfix_operators=n.postfix_operators or [])
            if rest and isinstance(rest[0], T.MethodInvocation):
                call = rest[0]
                new = T.MethodInvocation(qualifier=name, member=call.member, arguments=call.arguments,
                                         type_arguments=call.type_arguments, selectors=rest[1:], **ops)
            else:
                new = T.MemberReference(qualifier="", member=name, selectors=rest, **ops)
            done.append((line_of(n), f"`this.{name}` is the field `{name}`"))
            return positioned(new, n)

        replace_nodes(method, bare)
    return done[:1] if done else []  # one note says it for the class


# What `var` stands for, read off the initializer (JLS 14.4.1: the initializer's type).
_STRING_METHODS = {"toString", "trim", "strip", "toLowerCase", "toUpperCase", "substring", "replace", "replaceAll",
                   "replaceFirst", "concat", "intern", "repeat"}
_STATIC_TYPES = {("Integer", "parseInt"): "int", ("Long", "parseLong"): "long", ("Double", "parseDouble"): "double",
                 ("Float", "parseFloat"): "float", ("Boolean", "parseBoolean"): "boolean",
                 ("Integer", "valueOf"): "Integer", ("Long", "valueOf"): "Long", ("Double", "valueOf"): "Double",
                 ("String", "valueOf"): "String", ("String", "format"): "String", ("String", "join"): "String"}


def var_types(cls, index=None) -> list[tuple[int, str]]:
    done = []
    for method in cls.node.methods:
        for _, n in method:
            if not isinstance(n, T.LocalVariableDeclaration) or getattr(n.type, "name", "") != "var" \
                    or len(n.declarators) != 1:
                continue
            init = n.declarators[0].initializer
            # in source order: `var f = s.split(",")` is typed before `var x = f[1]` reads it
            t = _type_of(init) or _element_type(init, _array_locals(method))
            if t is not None:
                n.type = t
                done.append((line_of(n), f"`var {n.declarators[0].name}` is a {_shown(t)}"))
    return done


def _shown(t) -> str:
    return t.name + "[]" * len(t.dimensions or [])


def _ref(name: str, dims: int = 0, arguments=None):
    if name in ("int", "long", "double", "float", "boolean", "char"):
        return T.BasicType(name=name, dimensions=[None] * dims)
    return T.ReferenceType(name=name, dimensions=[None] * dims, arguments=arguments, sub_type=None)


def _type_of(e):
    if e is None:
        return None
    last = e.selectors[-1] if getattr(e, "selectors", None) else None
    if isinstance(last, T.MethodInvocation):
        return _ref("String") if last.member in _STRING_METHODS else \
            _ref("String", 1) if last.member == "split" else None
    if last is not None:
        return None
    if isinstance(e, T.ClassCreator) and not e.selectors:
        return _ref(e.type.name, 0, e.type.arguments) if not _diamond(e.type) else None
    if isinstance(e, T.Literal):
        v = e.value
        if v.startswith('"'):
            return _ref("String")
        if v in ("true", "false"):
            return _ref("boolean")
        if v.isdigit():
            return _ref("int")
        return None
    if isinstance(e, T.MethodInvocation):
        if (e.qualifier, e.member) in _STATIC_TYPES:
            return _ref(_STATIC_TYPES[(e.qualifier, e.member)])
        if e.qualifier and e.member in _STRING_METHODS - {"toString"} and e.member != "substring":
            return None  # the receiver's type is not known here
        if e.member == "toString" and not e.arguments:
            return _ref("String")
    return None


def _array_locals(method) -> dict:
    """Locals and parameters declared once with an array type (`String[] f`), by name; a name declared
    twice in the method is left out (which one a use means is not read here)."""
    seen: dict = {}
    for _, n in method:
        pairs = [(d.name, n.type) for d in n.declarators] if isinstance(n, T.LocalVariableDeclaration) else \
            [(n.name, n.type)] if isinstance(n, T.FormalParameter) else []
        for name, t in pairs:
            seen[name] = None if name in seen else t
    return {k: t for k, t in seen.items() if t is not None and getattr(t, "dimensions", None)
            and getattr(t, "name", "") != "var"}


def _element_type(e, arrays: dict):
    """`f[1]` of a local declared `String[] f`: String (JLS 15.10.3: the array's component type)."""
    if not (isinstance(e, T.MemberReference) and not e.qualifier and e.member in arrays and e.selectors
            and all(isinstance(x, T.ArraySelector) for x in e.selectors)):
        return None
    t = arrays[e.member]
    dims = len(t.dimensions) - len(e.selectors)
    return _ref(t.name, dims) if dims >= 0 else None


def _diamond(t) -> bool:
    return t.arguments == [] or (t.arguments is not None and any(a is None for a in t.arguments))
