"""Read a reducer's reduce() body as a fold over the values of a key.

Recognises: accumulators declared before the loop over `values` (for-each or
`while (values.hasNext())`) and updated once per value: `acc += f(v)` (sum), `acc++`
(count), `acc = Math.max/min(acc, f(v))` and `if (f(v) > acc) acc = f(v)` (max/min),
then one write of the key and an expression over the accumulators, optionally guarded
(→ a filter after the aggregation); a reducer that ignores its values (distinct).
Produces: a Group step with Agg nodes. Caveats: several updates of one accumulator,
writes inside the loop, and anything else become HandWork (top-N, collect and secondary
sort come in later rules).
"""
from __future__ import annotations

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.exprs import (WRITABLE_OF, Opaque, Scope, Unsupported, Writable, lift, widen, writable_creator,
                                writable_set, write_argument)
from migrate.lift.mapper import class_constants, helper_methods
from migrate.plan import NUMERIC, Agg, AggRef, BoolOp, Col, Expr, Group, HandWork, Lit, Span, walk

_MIN_OF = {"int": -2147483648, "long": -9223372036854775808, "double": float("-inf"), "float": float("-inf")}
_MAX_OF = {"int": 2147483647, "long": 9223372036854775807, "double": float("inf"), "float": float("inf")}
_DECLARED = {"int": "int", "long": "long", "double": "double", "float": "float", "Integer": "int", "Long": "long",
             "Double": "double", "boolean": "boolean", "String": "String"}


class FoldLifter:
    """Turns one reduce() method into a Group step (or hand work)."""

    def __init__(self, cls: ClassInfo, method: T.MethodDeclaration, key_type: str, value_type: str, index=None):
        self.cls, self.method = cls, method
        self.file = cls.file.path
        self.key_type, self.value_type = key_type, value_type
        params = [p.name for p in method.parameters]
        env: dict[str, object] = dict(class_constants(cls, index))
        env[params[0]] = Col(key_type, "key")
        self.values = params[1]
        env[params[1]] = Opaque("the values of the key")
        self.emit_target = params[2] if len(params) > 2 else None
        for p in params[2:]:
            env[p] = Opaque("the task context")
        self.scope = Scope(env, file=self.file, methods=helper_methods(cls, index),
                           enums=frozenset(fq.rsplit(".", 1)[-1] for fq in (index.enums if index else {})))
        self.accs: dict[str, tuple[str, Lit]] = {}
        self.aggs: dict[str, Agg] = {}
        self.seen_loop = False
        self.emits: list[tuple[object, Expr | None, Expr | None, Expr | None]] = []

    def run(self) -> tuple[Group | None, list[HandWork]]:
        try:
            group = self._lift()
            return group, []
        except Unsupported as u:
            line = u.line or node_lines(self.method)[0]
            snippet = self.cls.file.lines[line - 1].strip() if line else ""
            return None, [HandWork("reduce-logic", Span(self.file, line, line), u.reason,
                                   u.suggestion or "express the fold with groupBy().agg(...) by hand", snippet, "P2")]

    def _lift(self) -> Group:
        for s in self.method.body or []:
            self._stmt(s, None)
        if len(self.emits) != 1:
            raise Unsupported(self.method, f"reduce() writes {len(self.emits)} times per key; one write is lifted")
        node, k, v, guard = self.emits[0]
        a, b = node_lines(self.method)
        if not self.seen_loop:
            if any(isinstance(x, AggRef) for x in walk(v)) or any(isinstance(x, AggRef) for x in walk(k)):
                raise Unsupported(node, "write depends on accumulators but there is no loop over values")
            return Group(Span(self.file, a, b), "distinct keys", (), k, v, distinct=True, having=guard)
        used = {x.name for e in (k, v, guard) for x in walk(e) if isinstance(x, AggRef)}
        aggs = tuple(self.aggs[n] for n in self.aggs if n in used)
        return Group(Span(self.file, a, b), "fold over values", aggs, k, v, having=guard)

    # ------------------------------------------------------------------ statements outside the loop
    def _stmt(self, s, guard) -> None:
        if isinstance(s, T.LocalVariableDeclaration):
            tname = getattr(s.type, "name", "")
            for d in s.declarators:
                if tname in WRITABLE_OF and isinstance(d.initializer, T.ClassCreator):
                    self.scope.env[d.name] = writable_creator(d.initializer, self.scope)
                    continue
                if d.initializer is None:
                    raise Unsupported(s, f"`{d.name}` declared without a value")
                e = lift(d.initializer, self.scope)
                t = _DECLARED.get(tname)
                if t is None:
                    raise Unsupported(s, f"local of type {tname} in reduce()")
                e = widen(e, t) if e.jtype != t and e.jtype in NUMERIC else e
                if not self.seen_loop:
                    if not isinstance(e, Lit):
                        raise Unsupported(s, "accumulator initialised from something other than a constant")
                    self.accs[d.name] = (t, e)
                    self.scope.env[d.name] = e
                else:
                    self.scope.env[d.name] = e
        elif isinstance(s, (T.ForStatement, T.WhileStatement)):
            if self.seen_loop:
                raise Unsupported(s, "a second loop over values: Hadoop's values can be iterated once")
            self.seen_loop = True
            self._loop(s)
            for name, (t, init) in self.accs.items():
                if name in self.aggs:
                    self.scope.env[name] = AggRef(t, name)
        elif isinstance(s, T.StatementExpression):
            e = s.expression
            if isinstance(e, T.MethodInvocation) and e.qualifier == self.emit_target and e.member in ("write", "collect"):
                k, v = (write_argument(x, self.scope) for x in e.arguments)
                self.emits.append((s, k, v, guard))
                return
            if isinstance(e, T.MethodInvocation) and e.member == "set" and isinstance(self.scope.env.get(e.qualifier), Writable):
                w = self.scope.env[e.qualifier]
                if guard is not None:
                    raise Unsupported(s, "Writable set under a condition in reduce()")
                w.content = writable_set(w, lift(e.arguments[0], self.scope), e)
                return
            raise Unsupported(s, "statement in reduce() is not lifted")
        elif isinstance(s, T.IfStatement) and self.seen_loop:
            c = lift(s.condition, self.scope)
            if s.else_statement is not None:
                raise Unsupported(s, "if/else around the reducer's write")
            body = s.then_statement.statements if isinstance(s.then_statement, T.BlockStatement) else [s.then_statement]
            for x in body:
                self._stmt(x, c if guard is None else BoolOp("boolean", "&&", (guard, c)))
        else:
            raise Unsupported(s, f"{type(s).__name__} in reduce() is not lifted")

    # ------------------------------------------------------------------ the loop over values
    def _loop(self, s) -> None:
        if isinstance(s, T.ForStatement):
            ctl = s.control
            if not (isinstance(ctl, T.EnhancedForControl) and isinstance(ctl.iterable, T.MemberReference)
                    and ctl.iterable.member == self.values and not ctl.iterable.qualifier):
                raise Unsupported(s, "loop that is not over the reducer's values")
            self.scope.env[ctl.var.declarators[0].name] = Col(self.value_type, "value")
            body = s.body.statements if isinstance(s.body, T.BlockStatement) else [s.body]
        else:
            c = s.condition
            if not (isinstance(c, T.MethodInvocation) and c.qualifier == self.values and c.member == "hasNext"):
                raise Unsupported(s, "while loop that is not `while (values.hasNext())`")
            body = s.body.statements if isinstance(s.body, T.BlockStatement) else [s.body]
            nexts = [n for st in body for _, n in st if isinstance(n, T.MethodInvocation) and n.qualifier == self.values
                     and n.member == "next"]
            if len(nexts) != 1:
                raise Unsupported(s, "the loop does not take exactly one value per iteration")
            self.scope.env["__next__"] = Col(self.value_type, "value")
        for st in body:
            self._update(st)

    def _value_expr(self, node) -> Expr:
        """Lift an expression that may contain `values.next()`."""
        import copy

        def swap(n):
            if isinstance(n, T.MethodInvocation) and n.qualifier == self.values and n.member == "next":
                m = T.MemberReference(member="__next__", qualifier="", selectors=n.selectors or [],
                                      prefix_operators=n.prefix_operators or [], postfix_operators=[])
                return m
            for attr in getattr(n, "attrs", ()):
                v = getattr(n, attr, None)
                if isinstance(v, T.Node):
                    setattr(n, attr, swap(v))
                elif isinstance(v, list):
                    setattr(n, attr, [swap(x) if isinstance(x, T.Node) else x for x in v])
            return n

        return lift(swap(copy.deepcopy(node)), self.scope)

    def _update(self, st) -> None:
        if isinstance(st, T.LocalVariableDeclaration):
            for d in st.declarators:
                e = self._value_expr(d.initializer)
                t = _DECLARED.get(getattr(st.type, "name", ""), e.jtype)
                self.scope.env[d.name] = widen(e, t) if e.jtype in NUMERIC and t in NUMERIC else e
            return
        if isinstance(st, T.StatementExpression):
            e = st.expression
            if isinstance(e, T.MemberReference) and set((e.postfix_operators or []) + (e.prefix_operators or [])) == {"++"}:
                return self._agg(st, e.member, "count", None)
            if isinstance(e, T.Assignment) and isinstance(e.expressionl, T.MemberReference):
                name = e.expressionl.member
                if e.type == "+=":
                    rhs = self._value_expr(e.value)
                    if isinstance(rhs, Lit) and rhs.value == 1:
                        return self._agg(st, name, "count", None)
                    return self._agg(st, name, "sum", rhs)
                if e.type == "=":
                    v = e.value
                    if isinstance(v, T.BinaryOperation) and v.operator == "+" and _is_ref(v.operandl, name):
                        rhs = self._value_expr(v.operandr)
                        if isinstance(rhs, Lit) and rhs.value == 1:
                            return self._agg(st, name, "count", None)
                        return self._agg(st, name, "sum", rhs)
                    if isinstance(v, T.MethodInvocation) and v.qualifier == "Math" and v.member in ("max", "min"):
                        a, b = v.arguments
                        other = b if _is_ref(a, name) else a if _is_ref(b, name) else None
                        if other is not None:
                            return self._agg(st, name, v.member, self._value_expr(other))
        if isinstance(st, T.IfStatement) and st.else_statement is None:
            body = st.then_statement.statements if isinstance(st.then_statement, T.BlockStatement) else [st.then_statement]
            c = st.condition
            if len(body) == 1 and isinstance(body[0], T.StatementExpression) and isinstance(body[0].expression, T.Assignment) \
                    and body[0].expression.type == "=" and isinstance(c, T.BinaryOperation):
                name = body[0].expression.expressionl.member
                val = self._value_expr(body[0].expression.value)
                op = c.operator
                if _is_ref(c.operandr, name):
                    lhs = self._value_expr(c.operandl)
                elif _is_ref(c.operandl, name):
                    lhs = self._value_expr(c.operandr)
                    op = {"<": ">", ">": "<", "<=": ">=", ">=": "<="}.get(op, op)
                else:
                    lhs = None
                if lhs is not None and lhs == val and op in (">", ">=", "<", "<="):
                    fn = "max" if op in (">", ">=") else "min"
                    return self._agg(st, name, fn + "_if", val)
        raise Unsupported(st, "statement in the loop over values is not a recognised accumulator update",
                          "write the aggregation by hand: groupBy('key').agg(...)")

    def _agg(self, st, name: str, fn: str, arg: Expr | None) -> None:
        if name not in self.accs:
            raise Unsupported(st, f"`{name}` is updated in the loop but was not initialised before it")
        if name in self.aggs:
            raise Unsupported(st, f"`{name}` is updated twice per value")
        t, init = self.accs[name]
        if arg is not None and arg.jtype not in NUMERIC:
            raise Unsupported(st, f"aggregate over a {arg.jtype}")
        if arg is not None and arg.jtype != t:
            from migrate.lift.exprs import promote

            if promote(arg.jtype, t) != t:
                raise Unsupported(st, f"compound assignment narrows a {arg.jtype} into the {t} `{name}`")
            arg = widen(arg, t)
        if fn == "sum" and t == "float":
            raise Unsupported(st, f"`{name}` sums floats in float precision; Spark's sum of a float column "
                                  "works in double and would print other digits",
                              "decide whether the float rounding matters; if not, declare the sum a double")
        floating = t in ("double", "float")
        if fn in ("max_if", "min_if"):
            fn = (fn[:3] + "_nonnan") if floating else fn[:3]
        elif fn == "min" and floating:
            fn = "min_nan"  # Math.min returns NaN once any value is NaN
        a, b = node_lines(st)
        snippet = self.cls.file.lines[a - 1].strip() if a else ""
        self.aggs[name] = Agg(name, fn, arg, t, init.value, Span(self.file, a, b), snippet)


def _is_ref(n, name: str) -> bool:
    return isinstance(n, T.MemberReference) and n.member == name and not n.qualifier and not n.selectors
