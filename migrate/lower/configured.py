"""Objects configured where they are made: `f = new SimpleDateFormat(p); f.setTimeZone(z);
f.setLenient(false);` is one object made configured. The setter calls move into the creation (as
its selectors, the core form the lift rules read), so a format made and configured in setup() is
a constant of the task like one made at its declaration, and a local configured right after its
declaration is one value.

- The calls must follow the creation directly (nothing reads the object unconfigured in between).
- A field made at its declaration and configured in setup()/configure() is configured before the
  first record: the calls move into its declaration when setup() does nothing else with it and no
  other method assigns or configures it.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.walk import assigned_names, line_of, mentions, statement_lists

SETUP = {"setup", "configure"}
SETTERS = {"SimpleDateFormat": {"setTimeZone", "setLenient"}}  # calls that only configure the object


def configured_objects(cls, index=None) -> list[tuple[int, str]]:
    done = []
    for method in cls.node.methods:
        for stmts, _ in statement_lists(method):
            k = 0
            while k < len(stmts):
                made = _made(stmts[k])
                if made is not None:
                    name, creator = made
                    while k + 1 < len(stmts) and _setter(stmts[k + 1], name, creator):
                        creator.selectors = list(creator.selectors or []) + [stmts[k + 1].expression]
                        done.append((line_of(stmts[k + 1]), f"`{name}` is configured where it is made"))
                        del stmts[k + 1]
                k += 1
    done += _fields_configured_in_setup(cls)
    return done


def _made(s):
    """(name, creator) of `T x = new C(...)` / `x = new C(...)` for a class C with setters, else None."""
    if isinstance(s, T.LocalVariableDeclaration) and len(s.declarators) == 1:
        name, value = s.declarators[0].name, s.declarators[0].initializer
    elif isinstance(s, T.StatementExpression) and isinstance(s.expression, T.Assignment) and s.expression.type == "=" \
            and isinstance(s.expression.expressionl, T.MemberReference) and not s.expression.expressionl.qualifier:
        name, value = s.expression.expressionl.member, s.expression.value
    else:
        return None
    if isinstance(value, T.ClassCreator) and value.type.name in SETTERS and not value.body:
        return name, value
    return None


def _setter(s, name: str, creator) -> bool:
    """Is `s` the statement `name.setX(args);` for a setter of the creator's class?"""
    e = s.expression if isinstance(s, T.StatementExpression) else None
    return isinstance(e, T.MethodInvocation) and e.qualifier == name and not e.selectors \
        and e.member in SETTERS[creator.type.name] and not any(mentions(a, name) for a in e.arguments or [])


def _fields_configured_in_setup(cls) -> list[tuple[int, str]]:
    done = []
    setups = [m for m in cls.node.methods if m.name in SETUP and len(m.parameters) == 1]
    for f in cls.fields():
        for d in f.declarators:
            creator = d.initializer
            if not (isinstance(creator, T.ClassCreator) and creator.type.name in SETTERS and not creator.body):
                continue
            for m in setups:
                body = m.body or []
                calls = [s for s in body if _setter(s, d.name, creator)]
                if not calls or any(mentions(s, d.name) for s in body if s not in calls):
                    continue
                others = [o for o in cls.node.methods if o is not m and (d.name in assigned_names(o) or any(
                    _setter(s, d.name, creator) for stmts, _ in statement_lists(o) for s in stmts))]
                if others:
                    continue
                creator.selectors = list(creator.selectors or []) + [s.expression for s in calls]
                m.body = [s for s in body if s not in calls]
                done += [(line_of(s), f"`{d.name}` is configured in {m.name}(), before the first record: "
                                      "as if where it is made") for s in calls]
    return done
