"""A local record of accumulators as one local per field (scalar replacement), so the fold and
map rules see plain locals:

    Tally t = new Tally();                    ->  double t_sum = 0.0; int t_count = 0;
    for (Tally v : values) t.add(v);          ->  for (Tally v : values) { t_sum += v.getSum(); t_count += v.getCount(); }
    t.addOne(x, 1);                           ->  { t_sum += x; t_count += 1; }
    ... t.getSum() / t.getCount() ...         ->  ... t_sum / t_count ...
    context.write(key, t);                    ->  context.write(key, new Tally(t_sum, t_count));

The record's class (of the repository) has only primitive number fields, a constructor without
parameters that gives each a constant (or none: Java's 0), and the methods used are getters
(`return f;`) and updaters whose statements only assign its fields (`f = e`, `f += e`, `f -= e`)
from their parameters, its fields and those of another record of the class (read through its
getters). A write needs the constructor that takes every field. Any other use of the local (passed
to a method, assigned, compared) leaves it as written.
"""
from __future__ import annotations

import copy

from javalang import tree as T

from migrate.lower.walk import is_name, line_of, name_ref, positioned, replace_nodes, statement_lists

_NUMBERS = {"int", "long", "double", "float"}
_ZERO = {"int": "0", "long": "0L", "double": "0.0", "float": "0.0f"}
_WRITES = {"write", "collect"}


def record_locals(cls, index=None) -> list[tuple[int, str]]:
    if index is None:
        return []
    done = []
    for method in cls.node.methods:
        for stmts, _ in list(statement_lists(method)):
            for s in list(stmts):
                if not (isinstance(s, T.LocalVariableDeclaration) and len(s.declarators) == 1
                        and isinstance(s.type, T.ReferenceType) and not s.type.arguments and s.type.sub_type is None):
                    continue
                d = s.declarators[0]
                init = d.initializer
                if not (isinstance(init, T.ClassCreator) and not init.arguments and init.body is None
                        and not init.selectors and init.type.name == s.type.name):
                    continue
                info = index.get(index.resolve(s.type.name, cls))
                rec = RecordClass.of(info) if info is not None and info is not cls else None
                if rec is None or not _rewrite(method, stmts, s, d.name, rec):
                    continue
                done.append((line_of(s), f"`{d.name}` ({s.type.name}) is a local per field"))
    return done


class RecordClass:
    """A record class: its fields (name → type) in order, their starting values, getters, updaters
    and the constructor that takes every field (parameter order → field)."""

    def __init__(self, name: str, fields: dict[str, str], starts: dict[str, object]):
        self.name, self.fields, self.starts = name, fields, starts
        self.getters: dict[str, str] = {}  # method → field
        # (method, number of arguments) → method; None where overloads of one arity make it ambiguous
        self.updaters: dict[tuple[str, int], T.MethodDeclaration | None] = {}
        self.full_ctor: list[str] | None = None

    @classmethod
    def of(cls, info) -> RecordClass | None:
        node = info.node
        if not isinstance(node, T.ClassDeclaration) or node.extends is not None:
            return None
        fields: dict[str, str] = {}
        for f in info.fields():
            if "static" in (f.modifiers or set()):
                continue
            if not (isinstance(f.type, T.BasicType) and f.type.name in _NUMBERS and not f.type.dimensions):
                return None
            for d in f.declarators:
                if d.initializer is not None and not _number_literal(d.initializer):
                    return None
                fields[d.name] = f.type.name
        if not fields:
            return None
        starts = {n: next((d.initializer for f in info.fields() for d in f.declarators if d.name == n), None)
                  for n in fields}
        rec = cls(info.name, fields, starts)
        ctors = [c for c in node.body if isinstance(c, T.ConstructorDeclaration)]
        no_arg = [c for c in ctors if not c.parameters]
        if ctors and not no_arg:
            return None
        for stmt in (no_arg[0].body or []) if no_arg else []:
            got = _field_assignment(stmt, fields)
            if got is None or got[1] != "=" or not _number_literal(got[2]):
                return None
            rec.starts[got[0]] = got[2]
        for c in ctors:
            params = [p.name for p in c.parameters]
            got = [_field_assignment(st, fields) for st in c.body or []]
            if len(params) == len(fields) and all(g is not None and g[1] == "=" and is_name(g[2]) for g in got) \
                    and sorted(g[2].member for g in got) == sorted(params) and {g[0] for g in got} == set(fields) \
                    and all(isinstance(p.type, T.BasicType) and p.type.name == fields[g[0]]
                            for p in c.parameters for g in got if g[2].member == p.name):
                by_param = {g[2].member: g[0] for g in got}
                rec.full_ctor = [by_param[p] for p in params]
        for m in node.methods:
            if "static" in (m.modifiers or set()):
                continue
            body = m.body or []
            if not m.parameters and len(body) == 1 and isinstance(body[0], T.ReturnStatement) \
                    and _field_name(body[0].expression, fields) is not None:
                rec.getters[m.name] = _field_name(body[0].expression, fields)
            elif m.return_type is None and body and all(_updates(st, fields, m, info.name) for st in body):
                key = (m.name, len(m.parameters))
                rec.updaters[key] = m if key not in rec.updaters else None
        # an overload of the same arity (updater or not) leaves the call to javac's choice by type: not read
        rec.updaters = {k: m for k, m in rec.updaters.items() if m is not None and
                        sum((x.name, len(x.parameters)) == k for x in node.methods) == 1}
        return rec


def _number_literal(e) -> bool:
    return isinstance(e, T.Literal) and not e.selectors and e.value[:1].isdigit() and not e.postfix_operators \
        and set(e.prefix_operators or []) <= {"-"}


def _field_name(e, fields) -> str | None:
    """`f` or `this.f` for a field of the record."""
    if is_name(e) and e.member in fields:
        return e.member
    if isinstance(e, T.This) and not e.prefix_operators and len(e.selectors or []) == 1 \
            and is_name(e.selectors[0]) and e.selectors[0].member in fields:
        return e.selectors[0].member
    return None


def _field_assignment(stmt, fields):
    """(field, operator, value) of `f = e;`, `this.f += e;`, or None."""
    if not (isinstance(stmt, T.StatementExpression) and isinstance(stmt.expression, T.Assignment)):
        return None
    a = stmt.expression
    f = _field_name(a.expressionl, fields)
    return (f, a.type, a.value) if f is not None and a.type in ("=", "+=", "-=") else None


def _updates(stmt, fields, m, record: str) -> bool:
    """An updater's statement: a field assigned from parameters, fields and another record's fields."""
    got = _field_assignment(stmt, fields)
    if got is None:
        return False
    params = {p.name for p in m.parameters}
    own = {p.name for p in m.parameters if getattr(p.type, "name", "") == record}
    for _, n in got[2]:
        steps = {"++", "--"} & {*(getattr(n, "prefix_operators", None) or []), *(getattr(n, "postfix_operators", None) or [])}
        if steps or isinstance(n, (T.MethodInvocation, T.Assignment, T.ClassCreator, T.LambdaExpression, T.This)):
            return False
        if isinstance(n, T.MemberReference):
            if n.qualifier and not (n.qualifier in own and n.member in fields and not n.selectors):
                return False
            if not n.qualifier and n.member not in set(fields) | params:
                return False
    return True


def _rewrite(method, stmts: list, decl, name: str, rec: RecordClass) -> bool:
    """Replace the local `name` by a local per field, or change nothing when a use is not understood."""
    at = next(i for i, s in enumerate(stmts) if s is decl)
    scope = stmts[at + 1:]
    taken = {d.name for _, n in method if isinstance(n, (T.LocalVariableDeclaration, T.VariableDeclaration))
             for d in n.declarators} | {n.name for _, n in method if isinstance(n, T.FormalParameter)}
    locals_ = {f: f"{name}_{f}" for f in rec.fields}
    if set(locals_.values()) & taken:
        return False
    taken |= set(locals_.values())
    nodes = [n for s in scope for _, n in s]
    calls = [n for n in nodes if isinstance(n, T.MethodInvocation) and (n.qualifier or "").split(".")[0] == name]
    updates = [n for n in nodes if isinstance(n, T.StatementExpression) and _updater_call(n, name, rec)]
    if any(c.qualifier != name or c.selectors or not (c.member in rec.getters and not c.arguments)
           for c in calls if c not in [u.expression for u in updates]):
        return False  # another method, a chained call, or an updater whose (void) value is used
    if not all(_can_inline(u.expression, rec) for u in updates):
        return False
    if any(isinstance(n, T.MemberReference) and (n.qualifier or "").split(".")[0] == name for n in nodes):
        return False  # a field of the record read or set directly
    bare = [n for n in nodes if isinstance(n, T.MemberReference) and n.member == name and not n.qualifier]
    written = {id(a) for n in nodes if isinstance(n, T.MethodInvocation) and n.member in _WRITES
               for a in n.arguments or [] if is_name(a, name)}
    if any(id(b) not in written or b.selectors or b.prefix_operators or b.postfix_operators for b in bare) \
            or bare and rec.full_ctor is None:
        return False  # the record passed on, assigned or compared: left as written
    stmts[at:at + 1] = [_declaration(locals_[f], t, rec.starts.get(f), decl) for f, t in rec.fields.items()]

    def swap(n):
        if isinstance(n, T.MethodInvocation) and n.qualifier == name and n.member in rec.getters:
            return name_ref(locals_[rec.getters[n.member]], n)
        if isinstance(n, T.MemberReference) and id(n) in written:
            args = [name_ref(locals_[f], n) for f in rec.full_ctor]
            return positioned(T.ClassCreator(type=T.ReferenceType(name=rec.name, dimensions=[], arguments=None,
                                                                  sub_type=None),
                                             arguments=args, body=None, selectors=[], qualifier=None,
                                             prefix_operators=[], postfix_operators=[]), n)
        if isinstance(n, T.StatementExpression) and _updater_call(n, name, rec):
            return _inlined(n, rec, locals_, taken)
        return None

    holder = T.BlockStatement(statements=stmts)  # so that a statement of the list itself is replaced too
    replace_nodes(holder, swap)
    for block_stmts, _ in list(statement_lists(method)):  # an inlined body in a list of statements: its statements
        block_stmts[:] = [x for st in block_stmts
                          for x in (st.statements if getattr(st, "_inlined", False) else [st])]
    return True


def _declaration(local: str, jtype: str, start, like):
    value = copy.deepcopy(start) if start is not None else \
        T.Literal(value=_ZERO[jtype], selectors=[], prefix_operators=[], postfix_operators=[])
    return _all_at(T.LocalVariableDeclaration(
        modifiers=set(), annotations=[], type=T.BasicType(name=jtype, dimensions=[]),
        declarators=[T.VariableDeclarator(name=local, dimensions=[], initializer=value)]), like)


def _all_at(node, like):
    """The node with every part placed at `like`'s line: code copied from the record's class stands
    where the task class calls it (its comments and hand work point there)."""
    for _, n in node:
        positioned(n, like)
    return node


def _updater_call(stmt, name: str, rec: RecordClass) -> bool:
    e = stmt.expression
    return isinstance(e, T.MethodInvocation) and e.qualifier == name \
        and (e.member, len(e.arguments or [])) in rec.updaters and not e.selectors and not e.prefix_operators


def _can_inline(call, rec: RecordClass) -> bool:
    """Arguments the inlined body may read in their place: a name or literal for a number (reading it
    again gives the same value), a name for a record whose every field read has a getter."""
    m = rec.updaters[(call.member, len(call.arguments))]
    read = {(n.qualifier, n.member) for st in m.body for _, n in st if isinstance(n, T.MemberReference)}
    getters = set(rec.getters.values())
    for p, arg in zip(m.parameters, call.arguments):
        if getattr(p.type, "name", "") == rec.name:
            if not is_name(arg) or any(q == p.name and f not in getters for q, f in read):
                return False
        elif not (isinstance(p.type, T.BasicType) and p.type.name in _NUMBERS and not p.type.dimensions):
            return False  # a number parameter takes any argument (bound to a local first where not simple)
    return True


def _inlined(stmt, rec: RecordClass, locals_: dict[str, str], taken: set[str]):
    """The updater's body with its fields as the locals and its parameters as the arguments (a
    record parameter's fields read through its getters). An argument that is not a name or a
    literal is computed once, first, into a local of the parameter's type, as Java does."""
    call = stmt.expression
    m = rec.updaters[(call.member, len(call.arguments))]
    getter_of = {f: g for g, f in rec.getters.items()}
    by_param = dict(zip((p.name for p in m.parameters), call.arguments))
    own = {p.name for p in m.parameters if getattr(p.type, "name", "") == rec.name}
    body = []
    for p in m.parameters:
        arg = by_param[p.name]
        if p.name in own or is_name(arg) or isinstance(arg, T.Literal) and not arg.selectors:
            continue
        local, k = f"{call.qualifier}_{p.name}", 2
        while local in taken:
            local, k = f"{call.qualifier}_{p.name}_{k}", k + 1
        taken.add(local)
        body.append(_declaration(local, p.type.name, arg, stmt))
        by_param[p.name] = name_ref(local, stmt)

    def swap(n):
        if isinstance(n, T.MemberReference) and n.qualifier in own:
            return positioned(T.MethodInvocation(qualifier=by_param[n.qualifier].member, member=getter_of[n.member],
                                                 arguments=[], selectors=[], prefix_operators=n.prefix_operators or [],
                                                 postfix_operators=[], type_arguments=None), stmt)
        if is_name(n) and n.member in by_param:
            arg = copy.deepcopy(by_param[n.member])
            arg.prefix_operators = list(n.prefix_operators or []) + list(arg.prefix_operators or [])
            return positioned(arg, stmt)
        f = _field_name(n, rec.fields)
        return name_ref(locals_[f], stmt) if f is not None else None

    for st in m.body:
        f, op, value = _field_assignment(st, rec.fields)
        new = T.StatementExpression(expression=T.Assignment(expressionl=name_ref(locals_[f], stmt), type=op,
                                                            value=copy.deepcopy(value)))
        holder = T.BlockStatement(statements=[new])
        replace_nodes(new.expression, swap)
        replaced = swap(new.expression.value)
        if replaced is not None:
            new.expression.value = replaced
        body.append(positioned(holder.statements[0], stmt))
    block = _all_at(T.BlockStatement(statements=body), stmt)
    # where it stands in a list of statements it is spliced in (a local it declares is new to the method)
    block._inlined = True
    return block
