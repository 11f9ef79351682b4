"""Custom Writable / WritableComparable classes used as keys or values: fields → struct columns.

Recognises: a class with role "writable" whose fields are String, Text, int, long, double,
boolean (or their Writables), all serialised by write() and read back by readFields();
constructors that only assign fields from their parameters (`this.a = a;`, `a = new Text(s);`);
getters and toString() that compute a value from the fields (inlined, like helper methods);
compareTo() as a chain of `int c = X.compareTo(o.X); if (c != 0) return c; ... return
Integer.compare(y, o.y);` (or the ternary form, or the arguments swapped for descending).
Produces: StructNew / Field expressions (jtype "struct:<fqcn>"); the key's toString() as the
output text; a sort key whose Spark order is compareTo's order (String.compareTo compares
UTF-16 code units: the field is sorted by its UTF-16BE bytes; Text compares UTF-8 bytes, which
is Spark's own string order).
Declines: fields it cannot type, fields not serialised, compareTo that skips a field (Hadoop
would group keys that differ in it), subtraction as comparison (overflows), doubles in
compareTo, descending strings.
"""
from __future__ import annotations

import copy
from dataclasses import dataclass

from javalang import tree as T

from migrate.java.index import ClassIndex, ClassInfo, node_lines
from migrate.lift.raw_comparators import raw_order
from migrate.lift.exprs import WRITABLE_OF, Scope, Unsupported, lift, widen, writable_creator
from migrate.plan import Call, Expr, Field, Lit, StructNew

STRUCT = "struct:"
_FIELD_TYPES = {"String": "String", "Text": "String", "int": "int", "long": "long", "double": "double",
                "boolean": "boolean", "IntWritable": "int", "LongWritable": "long", "DoubleWritable": "double",
                "BooleanWritable": "boolean", "Integer": "int", "Long": "long"}
_COMPARES = {("Integer", "compare"): "int", ("Long", "compare"): "long"}


def is_struct(jtype: str) -> bool:
    return jtype.startswith(STRUCT)


@dataclass
class StructInfo:
    cls: ClassInfo
    fields: dict[str, str]  # name -> Java value type, in declaration order
    text_fields: set[str]
    order: tuple[tuple[str, bool], ...] = ()  # compareTo: (field, ascending), most significant first
    no_order: str = ""  # why compareTo was not read ("" when it was)

    @property
    def jtype(self) -> str:
        return STRUCT + self.cls.fqcn

    def construct(self, node: T.ClassCreator, scope: Scope, unset_ok: bool = False) -> Expr:
        """`new K(args)` as a struct; `unset_ok`: a field the constructor leaves null is a NULL
        placeholder (a holder whose setters run before it is written) instead of an error."""
        args = [lift(a, scope) for a in node.arguments or []]
        if not args and not self.cls.node.constructors:  # the default constructor
            ctor = None
        else:
            ctor = self._constructor(node.arguments or [], args, scope, node)
        values = self._assign_fields(ctor, args, {}, scope, "constructor") if ctor is not None else {}
        for name, t in self.fields.items():  # fields the constructor leaves alone keep their initial value
            if name not in values:
                try:
                    values[name] = self._initial(name, node)
                except Unsupported:
                    if not unset_ok:
                        raise
                    values[name] = Lit(t, None)
        return StructNew(self.jtype, tuple(values.items()))

    def _constructor(self, arg_nodes: list, args: list[Expr], scope: Scope, node):
        """The constructor javac picks for these arguments (JLS 15.12.2, the cases met here: exact
        Writable classes, primitives with widening, String)."""
        ctors = [c for c in self.cls.node.constructors if len(c.parameters) == len(args)]
        if len(ctors) > 1:
            kinds = [_java_kind(n, a, scope) for n, a in zip(arg_nodes, args)]
            ctors = [c for c in ctors if all(_accepts(p.type, k) for p, k in zip(c.parameters, kinds))]
        if len(ctors) != 1:
            raise Unsupported(node, f"new {self.cls.name}(...) with {len(args)} arguments: no single constructor "
                                    "the converter could pick")
        return ctors[0]

    def setter(self, current: StructNew, name: str, args: list[Expr], node, scope: Scope) -> StructNew:
        """`k.setX(v)`: the struct after the method's field assignments (`this.x = v;`, `x.set(v)`)."""
        ms = [m for m in self.cls.methods(name) if len(m.parameters) == len(args)]
        if len(ms) != 1 or ms[0].body is None:
            raise Unsupported(node, f"{self.cls.name}.{name}() with {len(args)} arguments is not one plain method")
        values = self._assign_fields(ms[0], args, dict(current.items), scope, f"{name}()")
        return StructNew(self.jtype, tuple((f, values[f]) for f in self.fields))

    def assigned_by(self, name: str, arity: int) -> set[str]:
        """The fields a method of the class assigns (syntactically): what a setter call changes."""
        out = set()
        for m in self.cls.methods(name):
            if len(m.parameters) == arity:
                for _, n in m:
                    got = _assigned_field(n, self.fields)
                    if got is not None:
                        out.add(got)
                    elif isinstance(n, T.MethodInvocation) and n.member == "set" and \
                            (n.qualifier or "").removeprefix("this.") in self.fields:
                        out.add(n.qualifier.removeprefix("this."))
        return out

    def _assign_fields(self, method, args: list[Expr], values: dict, scope: Scope, what: str) -> dict:
        """Run a constructor or setter whose statements only assign fields (from its parameters and
        the fields' values so far); returns the fields' new values."""
        values = dict(values)
        env = {p.name: a for p, a in zip(method.parameters, args)}
        for s in method.body or []:
            e = s.expression if isinstance(s, T.StatementExpression) else None
            if isinstance(e, T.SuperConstructorInvocation) or isinstance(s, T.SuperConstructorInvocation):
                continue
            inner = Scope({**{f: v for f, v in values.items() if not (isinstance(v, Lit) and v.value is None)},
                           **env}, file=scope.file, enums=scope.enums)
            if isinstance(e, T.ExplicitConstructorInvocation):  # this(...): the other constructor's assignments
                more = [lift(a, inner) for a in e.arguments or []]
                other = self._constructor(e.arguments or [], more, inner, s)
                if other is method:
                    raise Unsupported(s, f"the {self.cls.name} constructor calls itself")
                values = self._assign_fields(other, more, values, scope, what)
                continue
            target = _assigned_field(e, self.fields)
            if target is None and isinstance(e, T.MethodInvocation) and e.member == "set" and \
                    e.qualifier in self.text_fields | {f"this.{f}" for f in self.text_fields} and len(e.arguments) == 1:
                target, v = e.qualifier.removeprefix("this."), e.arguments[0]  # `first.set(s)` on a Text field
            elif target is not None:
                lhs = e.expressionl
                if isinstance(lhs, T.MemberReference) and lhs.qualifier in ("", None) and lhs.member in env:
                    raise Unsupported(s, f"`{lhs.member} = ...` in the {self.cls.name} {what} assigns the parameter, "
                                         "not the field (Java's shadowing): the field keeps its old value")
                v = e.value
            else:
                raise Unsupported(s, f"the {self.cls.name} {what} does more than assign fields")
            if isinstance(v, T.ClassCreator) and v.type.name in WRITABLE_OF:
                got = writable_creator(v, inner).content
            else:
                got = lift(v, inner)
            values[target] = self._typed(got, target, s)
        return values

    def _initial(self, name: str, node) -> Expr:
        """A field's value before the constructor runs: its initializer, or Java's default."""
        init = next((d.initializer for f in self.cls.fields() for d in f.declarators if d.name == name), None)
        t = self.fields[name]
        if init is None and t != "String":
            return Lit(t, {"int": 0, "long": 0, "double": 0.0, "boolean": False}[t])
        if isinstance(init, T.ClassCreator) and init.type.name == "Text" and not init.arguments:
            return Lit("String", "")
        if isinstance(init, T.Literal):
            return self._typed(lift(init, Scope({})), name, node)
        raise Unsupported(node, f"`{name}` of {self.cls.name} is left null by this constructor: write() would fail")

    def _typed(self, e: Expr, name: str, node) -> Expr:
        want = self.fields[name]
        if e.jtype == want:
            return e
        if {e.jtype, want} <= {"int", "long", "double"}:
            return widen(e, want)
        raise Unsupported(node, f"a {e.jtype} assigned to the {want} field `{name}`")

    def field_of(self, base: Expr, name: str) -> Expr:
        return Field(self.fields[name], base, name)

    def call(self, base: Expr, name: str, args: list[Expr], node, scope: Scope) -> Expr:
        """A method of the class (getter, toString, helper) inlined with its fields read from `base`."""
        from migrate.lift.exprs import _body_value, _java_type

        ms = [m for m in self.cls.methods(name) if len(m.parameters) == len(args)]
        if len(ms) != 1 or ms[0].body is None:
            raise Unsupported(node, f"{self.cls.name}.{name}() with {len(args)} arguments is not one plain method")
        m = ms[0]
        env: dict[str, object] = {f: self.field_of(base, f) for f in self.fields}
        for p, a in zip(m.parameters, args):
            env[p.name] = a
        inner = Scope(env, file=self.cls.file.path, enums=scope.enums, depth=scope.depth + 1,
                      structs=scope.structs)
        out = _body_value(list(m.body), inner, m)
        rname = getattr(m.return_type, "name", "")
        want = _FIELD_TYPES.get(rname) or (_java_type(m.return_type) if m.return_type is not None else None)
        if want is None:
            raise Unsupported(node, f"{self.cls.name}.{name}() does not return a value the converter follows")
        return widen(out, want) if out.jtype != want else out

    def to_string(self, base: Expr, scope: Scope) -> Expr:
        if not self.cls.methods("toString"):
            raise Unsupported(self.cls.node, f"{self.cls.name} has no toString(): Java prints ClassName@hash, "
                                             "which no script can reproduce")
        return self.call(base, "toString", [], self.cls.node, scope)

    def sort_terms(self, base: Expr, where, order=None) -> tuple[tuple[Expr, bool], ...]:
        """(expression, ascending) terms whose Spark order is compareTo's (or the given order's)."""
        if order is None and self.no_order:
            raise Unsupported(where, self.no_order)
        terms = []
        for name, asc in (order if order is not None else self.order):
            f = self.field_of(base, name)
            # String.compareTo orders UTF-16 code units; Text orders UTF-8 bytes, which is Spark's order
            utf16 = self.fields[name] == "String" and name not in self.text_fields
            terms.append((Call("binary", "utf16_order", (f,)) if utf16 else f, asc))
        return tuple(terms)


_WIDER = {"int": ("int", "long", "float", "double"), "long": ("long", "float", "double"),
          "float": ("float", "double"), "double": ("double",), "char": ("char", "int", "long", "float", "double")}


def _java_kind(arg_node, lifted: Expr, scope: Scope) -> str:
    """The Java type of an argument, as overload resolution sees it: a Writable's class, or the value's type."""
    from migrate.lift.exprs import Writable

    if isinstance(arg_node, T.ClassCreator) and arg_node.type.name in WRITABLE_OF:
        return arg_node.type.name
    if isinstance(arg_node, T.MemberReference) and not arg_node.qualifier and not arg_node.selectors:
        bound = scope.env.get(arg_node.member)
        if isinstance(bound, Writable):
            return bound.kind
    return lifted.jtype


def _accepts(ptype, kind: str) -> bool:
    name = getattr(ptype, "name", "")
    if getattr(ptype, "dimensions", None):
        return False
    if name in WRITABLE_OF or kind in WRITABLE_OF:
        return name == kind
    want = {"Integer": "int", "Long": "long", "Double": "double", "Float": "float", "Boolean": "boolean",
            "Character": "char"}.get(name, name)
    if want == "String":
        return kind == "String"
    return want in _WIDER.get(kind, (kind,)) if name == want else want == kind


def _assigned_field(e, names) -> str | None:
    if not (isinstance(e, T.Assignment) and e.type == "="):
        return None
    lhs = e.expressionl
    if isinstance(lhs, T.This) and lhs.selectors and isinstance(lhs.selectors[0], T.MemberReference):
        name = lhs.selectors[0].member
    elif isinstance(lhs, T.MemberReference) and lhs.qualifier in ("", "this", None):
        name = lhs.member
    else:
        return None
    return name if name in names else None


def read_struct(cls: ClassInfo) -> StructInfo:
    """The fields of a custom Writable and what its methods mean, or Unsupported saying why not."""
    typed: dict[str, str] = {}
    text: set[str] = set()
    for f in cls.fields():
        if "static" in (f.modifiers or set()):
            continue
        tname = getattr(f.type, "name", "")
        if tname not in _FIELD_TYPES or getattr(f.type, "dimensions", None):
            raise Unsupported(f, f"{cls.name} has a field of type {tname}; fields of String, Text, int, long, "
                                 "double and boolean (or their Writables) are read", "model it as a struct column by hand")
        for d in f.declarators:
            typed[d.name] = _FIELD_TYPES[tname]
            if tname == "Text":
                text.add(d.name)
    if not typed:
        raise Unsupported(cls.node, f"{cls.name} has no fields to carry")
    for method in ("write", "readFields"):
        ms = [m for m in cls.methods(method) if len(m.parameters) == 1]
        if not ms:
            raise Unsupported(cls.node, f"{cls.name} has no {method}()")
        named = {n.member for _, n in ms[0] if isinstance(n, T.MemberReference)} | \
                {n.qualifier for _, n in ms[0] if isinstance(n, T.MethodInvocation) and n.qualifier}
        missing = [f for f in typed if f not in named]
        if missing:
            raise Unsupported(ms[0], f"{cls.name}.{method}() does not carry `{missing[0]}`: after the shuffle it "
                                     "would hold a stale or default value")
    info = StructInfo(cls, typed, text)
    try:
        info.order = _compare_order(cls, typed)
    except Unsupported as u:
        info.no_order = u.reason
    return info


def _compare_order(cls: ClassInfo, typed: dict[str, str]) -> tuple[tuple[str, bool], ...]:
    ms = [m for m in cls.methods("compareTo") if len(m.parameters) == 1]
    if not ms:
        raise Unsupported(cls.node, f"{cls.name} has no compareTo(): it cannot be a key")
    m = ms[0]
    order = compare_chain(list(m.body or []), "this", m.parameters[0].name, typed, _getters(cls, typed), cls.name, m,
                          _primitive_fields(cls))
    skipped = [f for f in typed if f not in {n for n, _ in order}]
    if skipped:
        raise Unsupported(m, f"{cls.name}.compareTo ignores `{skipped[0]}`: Hadoop would group keys that differ "
                             "only in it, and which one reduce() sees depends on the value order",
                          "a grouping comparator expresses this; group by the compared fields by hand")
    return order


def getters(info: StructInfo) -> dict[str, str]:
    return _getters(info.cls, info.fields)


def _getters(cls: ClassInfo, typed: dict[str, str]) -> dict[str, str]:
    """Getter name -> field, for methods whose body is `return field;`."""
    out = {}
    for m in cls.node.methods:
        body = m.body or []
        if not m.parameters and len(body) == 1 and isinstance(body[0], T.ReturnStatement):
            e = body[0].expression
            if isinstance(e, T.MemberReference) and e.qualifier in ("", None, "this") and e.member in typed:
                out[m.name] = e.member
            elif isinstance(e, T.This) and e.selectors and getattr(e.selectors[0], "member", None) in typed:
                out[m.name] = e.selectors[0].member
    return out


def _primitive_fields(cls: ClassInfo) -> set[str]:
    """Fields declared `int` or `long`: `<` and `==` on them compare numbers (on a boxed Integer
    or a Writable `==` compares references)."""
    return {d.name for f in cls.fields() if getattr(f.type, "name", "") in ("int", "long")
            and not getattr(f.type, "dimensions", None) for d in f.declarators}


def compare_chain(body: list, left: str, right: str, typed: dict[str, str], getters: dict[str, str], owner: str,
                  where, primitive: set[str] = frozenset()) -> tuple[tuple[str, bool], ...]:
    """A comparison method's body as (field, ascending) terms, most significant first.

    `left`/`right` name the two objects compared ("this" for compareTo). Locals of the same
    class cast from the parameters (`Slot x = (Slot) a;`) stand for them. A `primitive` field may
    also be compared with relations: `a < b ? -1 : (a == b ? 0 : 1)`, or `if (a < b) return -1;
    if (a > b) return 1;` before the next field's comparison.
    """
    alias = {left: left, right: right}
    order: list[tuple[str, bool]] = []
    pending: dict[str, tuple[str, bool]] = {}
    ctx = (alias, typed, getters, owner, left, primitive)
    skip = 0
    for i, s in enumerate(body):
        if skip:
            skip -= 1
            continue
        last = i == len(body) - 1
        run = _relation_returns(body[i:], ctx)
        if run is not None:  # `if (a.f < b.f) return -1; if (a.f > b.f) return 1;` [`return 0;`]
            term, used, ends = run
            order.append(term)
            skip = used - 1
            if ends:
                if i + used != len(body):
                    raise Unsupported(body[i + used], f"{owner}'s comparison has statements after its last return")
                break
            continue
        if order and last and _int_literal(_return_expr(s)) == 0:
            break  # `return 0;` after the last field: equal keys
        if isinstance(s, T.LocalVariableDeclaration) and len(s.declarators) == 1:
            d = s.declarators[0]
            init = d.initializer
            if isinstance(init, T.Cast) and isinstance(init.expression, T.MemberReference) \
                    and init.expression.member in alias:
                alias[d.name] = alias[init.expression.member]
            else:
                pending[d.name] = _term(init, ctx)
            continue
        if isinstance(s, T.IfStatement) and s.else_statement is None and _is_nonzero_test(s.condition, pending):
            ret = s.then_statement.statements[0] if isinstance(s.then_statement, T.BlockStatement) \
                and len(s.then_statement.statements) == 1 else s.then_statement
            if isinstance(ret, T.ReturnStatement) and isinstance(ret.expression, T.MemberReference) \
                    and ret.expression.member == s.condition.operandl.member:
                order.append(pending.pop(ret.expression.member))
                continue
        if isinstance(s, T.IfStatement) and s.else_statement is None and _is_zero_test(s.condition, pending):
            _next_when_equal(s, ctx, pending, order)  # `if (c == 0) { c = <next>; }`
            continue
        if isinstance(s, T.ReturnStatement) and last:
            order.extend(_returned(s.expression, ctx, pending))
            break
        raise Unsupported(s, f"{owner}'s comparison is not a chain of field comparisons")
    names = [n for n, _ in order]
    if not order or len(set(names)) != len(names):
        raise Unsupported(where, f"{owner}'s comparison compares a field twice, or nothing")
    return tuple(order)


def _returned(e, ctx, pending) -> list[tuple[str, bool]]:
    if isinstance(e, T.TernaryExpression) and _is_nonzero_test(e.condition, pending) \
            and isinstance(e.if_true, T.MemberReference) and e.if_true.member == e.condition.operandl.member:
        return [pending.pop(e.if_true.member)] + _returned(e.if_false, ctx, pending)
    if isinstance(e, T.MemberReference) and e.member in pending:
        return [pending.pop(e.member)]
    return [_term(e, ctx)]


def _next_when_equal(s: T.IfStatement, ctx, pending: dict, order: list) -> None:
    """`if (c == 0) { c = <comparison>; [if (c == 0) {...}] }`: the same as `if (c != 0) return c;`
    followed by the next comparison; nested ifs of the same form go on down the chain."""
    name = s.condition.operandl.member
    order.append(pending.pop(name))
    body = list(s.then_statement.statements) if isinstance(s.then_statement, T.BlockStatement) else [s.then_statement]
    first = body[0] if body else None
    if not (isinstance(first, T.StatementExpression) and isinstance(first.expression, T.Assignment)
            and first.expression.type == "=" and isinstance(first.expression.expressionl, T.MemberReference)
            and first.expression.expressionl.member == name and not first.expression.expressionl.qualifier):
        raise Unsupported(s, f"{ctx[3]}'s comparison is not a chain of field comparisons")
    pending[name] = _term(first.expression.value, ctx)
    for rest in body[1:]:
        if not (isinstance(rest, T.IfStatement) and rest.else_statement is None and _is_zero_test(rest.condition, pending)
                and rest.condition.operandl.member == name):
            raise Unsupported(rest, f"{ctx[3]}'s comparison is not a chain of field comparisons")
        _next_when_equal(rest, ctx, pending, order)


def _is_zero_test(c, pending) -> bool:
    return (isinstance(c, T.BinaryOperation) and c.operator == "==" and isinstance(c.operandl, T.MemberReference)
            and c.operandl.member in pending and isinstance(c.operandr, T.Literal) and c.operandr.value == "0")


def _is_nonzero_test(c, pending) -> bool:
    return (isinstance(c, T.BinaryOperation) and c.operator == "!=" and isinstance(c.operandl, T.MemberReference)
            and c.operandl.member in pending and isinstance(c.operandr, T.Literal) and c.operandr.value == "0")


def _term(e, ctx) -> tuple[str, bool]:
    """One comparison of a field of the left object with the same field of the right: (field, ascending)."""
    alias, typed, getters, owner = ctx[:4]
    if isinstance(e, T.TernaryExpression):
        return _three_way(e, ctx)
    negated = "-" in (getattr(e, "prefix_operators", None) or [])
    if isinstance(e, T.BinaryOperation) and e.operator == "-":
        raise Unsupported(e, f"{owner} subtracts fields to compare them: that overflows for large values, so its "
                             "order is not a sort order", "use Integer.compare / Long.compare")
    pair = None
    if isinstance(e, T.MethodInvocation) and (e.qualifier, e.member) in _COMPARES and len(e.arguments) == 2:
        pair = e.arguments
    elif isinstance(e, T.MethodInvocation) and e.member == "compareTo" and len(e.arguments) == 1:
        q = e.qualifier or ""
        if q:  # `station.compareTo(o.station)` / `x.station.compareTo(...)` / `x.getStation().compareTo(...)`
            recv = T.MemberReference(member=q.split(".")[-1], qualifier=q.rsplit(".", 1)[0] if "." in q else "")
        else:  # `x.getStation().compareTo(...)` parses as a selector chain on the invocation
            recv = None
        pair = [recv, e.arguments[0]] if recv is not None else None
    if pair is None and isinstance(e, (T.MethodInvocation, T.Cast)) and e.selectors:
        sel = e.selectors[-1]
        if isinstance(sel, T.MethodInvocation) and sel.member == "compareTo" and len(sel.arguments) == 1:
            head = copy.copy(e)
            head.selectors = e.selectors[:-1]
            pair = [head, sel.arguments[0]]
    if pair is None:
        raise Unsupported(e, f"{owner} compares something other than fields")
    a, b = (_side(x, ctx) for x in pair)
    if a is None or b is None or a[0] != b[0] or a[1] == b[1]:
        raise Unsupported(e, f"{owner} does not compare one field of one object with the same field of the other")
    name, is_left = a
    if typed[name] in ("double", "boolean"):
        raise Unsupported(e, f"{owner} orders the {typed[name]} `{name}`; that order is not proven equal to Spark's")
    return name, is_left != negated


# A relation's truth when the left object's field is less than, equal to, greater than the right's.
_HOLDS = {"<": (True, False, False), "<=": (True, True, False), ">": (False, False, True),
          ">=": (False, True, True), "==": (False, True, False), "!=": (True, False, True)}
_MIRROR = {"<": ">", ">": "<", "<=": ">=", ">=": "<=", "==": "==", "!=": "!="}


def _relation(c, ctx) -> tuple[str, tuple[bool, bool, bool]] | None:
    """`x.f < y.f` (any relation, either object first) over a primitive field: (f, truth in the
    three cases), else None."""
    if not (isinstance(c, T.BinaryOperation) and c.operator in _HOLDS) or getattr(c, "prefix_operators", None):
        return None
    a, b = _side(c.operandl, ctx), _side(c.operandr, ctx)
    if a is None or b is None or a[0] != b[0] or a[1] == b[1] or a[0] not in ctx[5]:
        return None
    return a[0], _HOLDS[c.operator if a[1] else _MIRROR[c.operator]]


def _int_literal(e) -> int | None:
    if not isinstance(e, T.Literal) or e.selectors or set(e.prefix_operators or []) - {"-", "+"}:
        return None
    try:
        v = int(e.value.rstrip("lL"))
    except ValueError:
        return None
    return -v if (e.prefix_operators or []).count("-") % 2 else v


def _as_term(owner: str, field: str, signs: tuple, where) -> tuple[str, bool]:
    """(field, ascending) from the sign returned when the left field is less, equal, greater."""
    if signs == (-1, 0, 1):
        return field, True
    if signs == (1, 0, -1):
        return field, False
    raise Unsupported(where, f"{owner}'s comparison of `{field}` is not an order (it returns {signs} for less, "
                             "equal, greater)")


def _case_value(n, case: int, ctx, fields: set[str]) -> int | None:
    """The int a conditional expression of relations and literals gives in one of the three cases
    (0: left field less, 1: equal, 2: greater), noting the fields it tests; None if it is not one."""
    if isinstance(n, T.TernaryExpression):
        r = _relation(n.condition, ctx)
        if r is None:
            return None
        fields.add(r[0])
        return _case_value(n.if_true if r[1][case] else n.if_false, case, ctx, fields)
    return _int_literal(n)


def _three_way(e: T.TernaryExpression, ctx) -> tuple[str, bool]:
    """`a.f < b.f ? -1 : (a.f == b.f ? 0 : 1)` and its other spellings: evaluated in the three cases."""
    fields: set[str] = set()
    values = [_case_value(e, c, ctx, fields) for c in range(3)]
    if None in values:
        raise Unsupported(e, f"{ctx[3]} compares something other than fields")
    if len(fields) != 1:
        raise Unsupported(e, f"{ctx[3]} tests several fields in one conditional expression")
    return _as_term(ctx[3], fields.pop(), tuple((v > 0) - (v < 0) for v in values), e)


def _relation_returns(body: list, ctx) -> tuple[tuple[str, bool], int, bool] | None:
    """Leading `if (rel) return k;` statements (else-if chains too) over one primitive field:
    ((field, ascending), statements used, whether every case returns). The equal case falls
    through to what follows, or returns (a final else, or a `return` right after, of a literal or
    a conditional expression over the same field)."""
    tests: list[tuple[tuple[bool, bool, bool], object]] = []  # (holds in each case, returned)
    field, used = None, 0
    for s in body:
        if not isinstance(s, T.IfStatement) or (r := _relation(s.condition, ctx)) is None \
                or field not in (None, r[0]):
            break
        field = r[0]
        while isinstance(s, T.IfStatement):  # one statement: an if / else-if chain
            r = _relation(s.condition, ctx)
            k = _return_expr(s.then_statement)
            if r is None or k is None or r[0] != field:
                raise Unsupported(s, f"{ctx[3]}'s comparison is not a chain of field comparisons")
            tests.append((r[1], k))
            s = s.else_statement
        used += 1
        if s is not None:  # a final else
            k = _return_expr(s)
            if k is None:
                raise Unsupported(s, f"{ctx[3]}'s comparison is not a chain of field comparisons")
            tests.append(((True, True, True), k))
            break
    if not tests:
        return None
    if used < len(body) and tests[-1][0] != (True, True, True) and (k := _return_expr(body[used])) is not None \
            and _case_value(k, 1, ctx, seen := set()) is not None and seen <= {field}:
        tests.append(((True, True, True), k))
        used += 1

    def result(case: int) -> int | None:
        fields: set[str] = set()
        k = next((k for holds, k in tests if holds[case]), None)
        v = _case_value(k, case, ctx, fields) if k is not None else None
        if k is not None and (v is None or fields - {field}):
            raise Unsupported(body[0], f"{ctx[3]}'s comparison of `{field}` returns something other than numbers")
        return v

    lt, eq, gt = (result(c) for c in range(3))
    if lt is None or gt is None or eq not in (None, 0):
        raise Unsupported(body[0], f"{ctx[3]}'s comparison of `{field}` does not return for both less and greater, "
                                   "or returns non-zero when equal")
    signs = ((lt > 0) - (lt < 0), 0, (gt > 0) - (gt < 0))
    return _as_term(ctx[3], field, signs, body[0]), used, eq is not None


def _return_expr(s):
    """The expression of `return e;` or `{ return e; }`, else None."""
    if isinstance(s, T.BlockStatement) and len(s.statements or []) == 1:
        s = s.statements[0]
    return s.expression if isinstance(s, T.ReturnStatement) else None


def _side(n, ctx) -> tuple[str, bool] | None:
    """(field, is the left object) for `f`, `this.f`, `x.f`, `x.getF()`."""
    alias, typed, getters, _, left = ctx[:5]

    def who(q: str | None) -> str | None:
        return alias.get(q) if q and q != "this" else ("this" if "this" in alias else None)

    if isinstance(n, T.MemberReference) and n.member in typed:
        w = who(n.qualifier)
        return (n.member, w == left) if w is not None else None
    if isinstance(n, T.MethodInvocation) and not n.arguments and n.member in getters and not n.selectors:
        w = who(n.qualifier)
        return (getters[n.member], w == left) if w is not None else None
    if isinstance(n, T.This) and n.selectors and isinstance(n.selectors[0], T.MemberReference):
        name = n.selectors[0].member
        return (name, "this" == left) if name in typed else None
    if isinstance(n, T.Cast) and isinstance(n.expression, T.MemberReference) and len(n.selectors or []) == 1:
        w, sel = alias.get(n.expression.member), n.selectors[0]  # `((Slot) a).getStation()`, `((Slot) a).station`
        name = getters.get(sel.member) if isinstance(sel, T.MethodInvocation) and not sel.arguments else \
            sel.member if isinstance(sel, T.MemberReference) and sel.member in typed else None
        return (name, w == left) if w is not None and name is not None else None
    return None


# Comparators that ship with Hadoop for its own key types: True = the key's natural order.
_LIBRARY_COMPARATORS = {"LongWritable.DecreasingComparator": False, "LongWritable.Comparator": True,
                        "IntWritable.Comparator": True, "Text.Comparator": True}
_KEY_WRITABLES = {"int": "IntWritable", "long": "LongWritable", "String": "Text"}


def plain_key_order(fq: str, cls: ClassInfo | None, key_t: str) -> bool:
    """A sort comparator over a Text, IntWritable or LongWritable key: True when it orders keys as
    the key class does (Spark's order of the column), False when in reverse; Unsupported else.
    Equal keys stay equal either way, so as a grouping comparator it changes nothing."""
    writable = _KEY_WRITABLES.get(key_t)
    short = ".".join(fq.split(".")[-2:])
    if short in _LIBRARY_COMPARATORS:
        if not short.startswith(f"{writable}."):
            raise Unsupported(None, f"{short} compares {short.split('.')[0]} keys, the map output key is {key_t}")
        return _LIBRARY_COMPARATORS[short]
    if writable is None or cls is None:
        raise Unsupported(None, f"a comparator over {key_t} keys is not read (only comparators of Text, IntWritable, "
                                "LongWritable and custom keys are)")
    supers = [n for _, n in cls.node.filter(T.SuperConstructorInvocation)]
    keyed = [n for n in supers if n.arguments and isinstance(n.arguments[0], T.ClassReference)]
    if not keyed or keyed[0].arguments[0].type.name != writable:
        raise Unsupported(cls.node, f"{cls.name} is not constructed for {writable} keys (`super({writable}.class, "
                                    "true)`)")
    raw = [m for m in cls.methods("compare") if len(m.parameters) == 6]
    objects = [m for m in cls.methods("compare") if len(m.parameters) == 2]
    if raw and objects or len(raw) > 1 or len(objects) > 1 or not (raw or objects):
        raise Unsupported(cls.node, f"{cls.name} does not override exactly one compare()")
    m = (raw or objects)[0]
    if objects and not (len(keyed[0].arguments) == 2 and getattr(keyed[0].arguments[1], "value", "") == "true"):
        raise Unsupported(m, f"{cls.name} compares deserialised keys but is built without createInstances "
                             f"(`super({writable}.class, true)`): the shuffle's byte comparison has no keys to fill")
    params = [p.name for p in m.parameters]
    first, second = (params[0], params[3]) if raw else (params[0], params[1])
    alias = {first: 1, second: -1}
    body = list(m.body or [])
    for st in body[:-1]:  # `IntWritable x = (IntWritable) a;`
        d = st.declarators[0] if isinstance(st, T.LocalVariableDeclaration) and len(st.declarators) == 1 else None
        init = d.initializer if d is not None else None
        if not (isinstance(init, T.Cast) and isinstance(init.expression, T.MemberReference)
                and init.expression.member in alias and not getattr(init, "selectors", None)):
            raise Unsupported(st, f"{cls.name}.compare() is not one comparison of the two keys")
        alias[d.name] = alias[init.expression.member]
    if not body or not isinstance(body[-1], T.ReturnStatement):
        raise Unsupported(m, f"{cls.name}.compare() is not one comparison of the two keys")
    sign = _key_comparison_sign(body[-1].expression, alias, raw, params)
    if sign is None:
        raise Unsupported(body[-1], f"{cls.name}.compare() is not one comparison of the two keys")
    return sign > 0


def _key_comparison_sign(e, alias: dict[str, int], raw: bool, params: list[str]) -> int | None:
    """+1 when `e` compares the first key with the second as the key class does, -1 when reversed."""
    flip = -1 if (getattr(e, "prefix_operators", None) or []).count("-") % 2 else 1
    if isinstance(e, T.BinaryOperation) and e.operator == "*":
        for lit, other in ((e.operandl, e.operandr), (e.operandr, e.operandl)):
            if _int_literal(lit) in (1, -1):
                inner = _key_comparison_sign(other, alias, raw, params)
                return None if inner is None else inner * _int_literal(lit) * flip
        return None

    def who(n) -> int | None:  # which key a reference or a cast of one names
        n = n.expression if isinstance(n, T.Cast) and not getattr(n, "selectors", None) else n
        if isinstance(n, T.MemberReference) and not n.qualifier and not n.selectors:
            return alias.get(n.member)
        return None

    if raw:
        names = [getattr(a, "member", None) for a in (e.arguments or [])] \
            if isinstance(e, T.SuperMethodInvocation) and e.member == "compare" else []
        if names == params:
            return flip
        if names == params[3:] + params[:3]:
            return -flip
        return None
    pair = None
    if isinstance(e, T.SuperMethodInvocation) and e.member == "compare" and len(e.arguments) == 2:
        pair = e.arguments
    elif isinstance(e, T.MethodInvocation) and e.member == "compareTo" and len(e.arguments) == 1 and not e.selectors:
        pair = [T.MemberReference(member=e.qualifier, qualifier="", selectors=[]), e.arguments[0]] \
            if e.qualifier and "." not in e.qualifier else None
    elif isinstance(e, T.Cast) and len(getattr(e, "selectors", None) or []) == 1:
        sel = e.selectors[0]
        if isinstance(sel, T.MethodInvocation) and sel.member == "compareTo" and len(sel.arguments) == 1:
            pair = [e.expression, sel.arguments[0]]
    if pair is None:
        return None
    a, b = who(pair[0]), who(pair[1])
    if a is None or b is None or a == b:
        return None
    return a * flip


def read_comparator(cls: ClassInfo, structs: dict, equality_only: bool = False
                    ) -> tuple[StructInfo, tuple[tuple[str, bool], ...]]:
    """A comparator over a custom key: the key it compares and its order. A grouping comparator
    only decides which neighbours are equal (`equality_only`): a raw one may then compare bytes
    whose order is not the fields' order."""
    if any(len(m.parameters) == 6 for m in cls.methods("compare")):
        # the shuffle calls compare(byte[], int, int, byte[], int, int): the object form is not what runs
        info = _compared_struct(cls, structs)
        if info is None:
            raise Unsupported(cls.node, f"{cls.name} compares the serialised bytes of a key the converter did not "
                                        "read", "express the order with orderBy over the key's fields")
        return info, raw_order(cls, info.cls, equality_only)
    ms = [m for m in cls.methods("compare") if len(m.parameters) == 2]
    if not ms:
        raise Unsupported(cls.node, f"{cls.name} has no compare(a, b) over deserialised keys (raw byte comparators "
                                    "are not read)", "express the order with orderBy over the key's fields")
    m = ms[0]
    casts = [n.type.name for _, n in m if isinstance(n, T.Cast) and n.type.name in structs]
    ptypes = [p.type.name for p in m.parameters if p.type.name in structs]
    names = set(casts) | set(ptypes)
    info = structs.get(next(iter(names))) if len(names) == 1 else None
    if not isinstance(info, StructInfo):
        raise Unsupported(m, f"{cls.name}.compare() does not compare one custom key class the converter read")
    a, b = (p.name for p in m.parameters)
    order = compare_chain(list(m.body or []), a, b, info.fields, _getters(info.cls, info.fields), cls.name, m,
                          _primitive_fields(info.cls))
    return info, order


def _compared_struct(cls: ClassInfo, structs: dict) -> StructInfo | None:
    """The key a raw comparator is for: `super(K.class, ...)`, `implements RawComparator<K>`, or the
    parameter types of its compare(K, K)."""
    names = [n.arguments[0].type.name for _, n in cls.node.filter(T.SuperConstructorInvocation)
             if n.arguments and isinstance(n.arguments[0], T.ClassReference)]
    for t in getattr(cls.node, "implements", None) or []:
        names += [a.type.name for a in (t.arguments or []) if getattr(a, "type", None) is not None]
    names += [p.type.name for m in cls.methods("compare") if len(m.parameters) == 2 for p in m.parameters]
    found = {id(i): i for i in (structs.get(n.split(".")[-1]) for n in names) if isinstance(i, StructInfo)}
    return next(iter(found.values())) if len(found) == 1 else None


def struct_infos(index: ClassIndex) -> dict[str, StructInfo | Unsupported]:
    """Every custom Writable in the repository, read or with the reason it was not."""
    out: dict[str, StructInfo | Unsupported] = {}
    raw = _raw_comparators(index)
    for c in index:
        if "writable" in c.roles:
            try:
                out[c.fqcn] = read_struct(c)
            except Unsupported as u:
                out[c.fqcn] = u
                continue
            if c.name in raw:  # WritableComparator.get(key class) returns it: the job's default order
                _registered_order(out[c.fqcn], *raw[c.name], index)
    return out


def _registered_order(info: StructInfo, where: str, comparator: str | None, index: ClassIndex) -> None:
    """The order of a key whose class registers a comparator (WritableComparator.define): that
    comparator's, read where it can be, else no order with the reason."""
    found = [c for c in index if c.name == comparator and c.file.path == info.cls.file.path] or \
        [c for c in index if c.name == comparator]
    why = "it is not in the repository"
    if len(found) == 1:
        try:
            order = read_comparator(found[0], {info.cls.name: info})[1]
            missing = [f for f in info.fields if f not in {n for n, _ in order}]
            if not missing:
                info.order, info.no_order = order, ""
                return
            why = f"it ignores `{missing[0]}`"
        except Unsupported as u:
            why = u.reason
    info.order, info.no_order = (), (f"{info.cls.name} registers its own comparator (WritableComparator.define at "
                                     f"{where}), which Hadoop sorts and groups with instead of compareTo(): {why}")


def _raw_comparators(index: ClassIndex) -> dict[str, tuple[str, str | None]]:
    """Simple names of the classes some code registers a comparator for: where it does so, and the
    simple name of the comparator's class (`define(K.class, new C())`), if it is made there."""
    out = {}
    for c in index:
        for _, n in c.node.filter(T.MethodInvocation):
            args = n.arguments or []
            if n.member == "define" and (n.qualifier or "").endswith("WritableComparator") and len(args) == 2 \
                    and isinstance(args[0], T.ClassReference):
                line = n.position.line if n.position else node_lines(c.node)[0]
                made = args[1].type.name.split(".")[-1] if isinstance(args[1], T.ClassCreator) else None
                out.setdefault(args[0].type.name.split(".")[-1], (f"{c.file.path.rsplit('/', 1)[-1]}:{line}", made))
    return out


def structs_seen_from(cls: ClassInfo, index: ClassIndex | None) -> dict:
    """structs_of(index) with simple names resolved as `cls`'s code resolves them (its imports,
    package, nesting): two repository classes may share a simple name."""
    base = structs_of(index)
    view = dict(base)
    for name in {n for n in base if "." not in n and ":" not in n}:
        fq = index.resolve(name, cls)
        if fq in base:
            view[name] = base[fq]
    return view


def structs_of(index: ClassIndex | None) -> dict:
    """Lookup of custom Writables by fqcn, simple name and struct jtype (what Scope.structs holds); cached."""
    if index is None:
        return {}
    cached = getattr(index, "_structs", None)
    if cached is None:
        cached = {}
        for fq, info in struct_infos(index).items():
            cached[fq] = info
            cached.setdefault(fq.rsplit(".", 1)[-1], info)
            if isinstance(info, StructInfo):
                cached[info.jtype] = info
        index._structs = cached
    return cached
