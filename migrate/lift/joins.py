"""Read a reducer as a reduce-side join: values tagged by their input, sorted into sides, then paired.

Recognises, in reduce():
  List<String> a = new ArrayList<>();  String x = null;  (or a String default: "unknown")
  for (Text v : values) {                 // or while (values.hasNext())
      String s = v.toString();            // per-value locals
      if (s.startsWith("S|")) x = s.substring(2);          // a one-value side
      else if (s.startsWith("R|")) a.add(s.substring(2));  // a list side
  }
  for (String r : a) context.write(...);  // writes over combinations of the sides, each under
  if (x == null) ...; if (a.isEmpty()) ...  // conditions on which sides got a value
The writes decide the join: nested loops over two lists are an inner join, a loop over one list
with a default for the other side a left join, a write under `b.isEmpty()` an anti join.
Declines: a list of the Text objects themselves (Hadoop reuses one object for every value, so
the list holds the last value N times), a one-value side with no default read where it may be
null, sides filled under conditions that are not tags of the value, anything else in the loop.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.java.index import node_lines
from migrate.lift.exprs import Opaque, Unsupported
from migrate.lift.reducer import FoldLifter, _block
from migrate.lift.mapper import _and, _conjuncts, _not
from migrate.plan import BoolOp, Col, Emit, Expr, Join, JoinSide, JoinWrite, Lit, Span, walk

_LISTS = {"List", "ArrayList", "LinkedList"}


def has(name: str) -> Col:
    """The column that says a side got at least one value for the key."""
    return Col("boolean", f"_has_{name}")


class JoinLifter(FoldLifter):
    """Turns one reduce() into a Join step (or raises Unsupported)."""

    def __init__(self, *args, **kw):
        super().__init__(*args, **kw)
        self.lists: dict[str, str] = {}  # list side -> element type
        self.sides: dict[str, JoinSide] = {}
        self.loop_var: str | None = None
        self.writes: list[JoinWrite] = []
        self.loops: list[str] = []  # the list sides the statement being read iterates, outermost first

    def lift_join(self) -> Join:
        body, keys = self._key_tests(list(self.method.body or []))
        for s in body:
            self._stmt(s, None)
        if not self.sides or not self.writes:
            raise Unsupported(self.method, "reduce() does not sort its values into sides and write them")
        if self.aggs or self.emits or self.loop_emits:
            raise Unsupported(self.method, "reduce() does more than sort its values into sides and write them")
        a, b = node_lines(self.method)
        self._no_value_counters()
        return Join(Span(self.file, a, b), "reduce-side join", tuple(self.sides.values()), tuple(self.writes),
                    tuple(self.lets), keys)

    # ------------------------------------------------------------------ before the loop: the sides
    def _stmt(self, s, guard) -> None:
        if isinstance(s, T.LocalVariableDeclaration) and getattr(s.type, "name", "") in _LISTS and not self.seen_loop:
            args = getattr(s.type, "arguments", None) or []
            elem = getattr(getattr(args[0], "type", None), "name", "") if len(args) == 1 else ""
            for d in s.declarators:
                if not isinstance(d.initializer, T.ClassCreator) or d.initializer.arguments:
                    raise Unsupported(s, f"the list `{d.name}` does not start empty")
                self.lists[d.name] = elem
                self.scope.env[d.name] = Opaque(f"the list `{d.name}`")
            return
        if self.seen_loop:
            return self._after(s, guard)
        super()._stmt(s, guard)

    def _loop(self, s) -> None:
        if isinstance(s, T.ForStatement) and isinstance(s.control, T.EnhancedForControl):
            self.loop_var = s.control.var.declarators[0].name
        super()._loop(s)
        for name, side in self.sides.items():  # after the loop a side is a column of the joined rows
            self.scope.env[name] = Col(side.elem.jtype, name)

    # ------------------------------------------------------------------ inside the loop: which side a value joins
    def _update(self, st, guard: Expr | None) -> None:
        if isinstance(st, T.IfStatement) and st.else_statement is not None:
            c = self._expr(st.condition)
            for branch, cond in ((st.then_statement, c), (st.else_statement, _not(c))):
                for x in _block(branch):
                    self._update(x, _and(guard, cond))
            return
        e = st.expression if isinstance(st, T.StatementExpression) else None
        if isinstance(e, T.MethodInvocation) and e.qualifier in self.lists and e.member == "add" and len(e.arguments) == 1:
            arg = e.arguments[0]
            if self._is_reused_value(arg):
                raise Unsupported(st, f"`{e.qualifier}.add(...)` stores the value object itself: Hadoop reuses one "
                                      "object for every value of a key, so the list ends up holding the last value "
                                      "once per value (the original's output was not what it looks like)",
                                  "store a copy (value.toString()) in Java if the output was meant to list every "
                                  "value, then convert again", category="object-reuse")
            if self.lists[e.qualifier] != "String":
                raise Unsupported(st, f"a list of {self.lists[e.qualifier] or 'unknown type'}; lists of String are read")
            return self._side(st, e.qualifier, self._expr(arg), guard, many=True)
        if isinstance(e, T.Assignment) and e.type == "=" and isinstance(e.expressionl, T.MemberReference) \
                and self.accs.get(e.expressionl.member, ("",))[0] == "String":
            if self._is_reused_value(e.value):
                raise Unsupported(st, "a value object is kept past its iteration (Hadoop reuses it for the next value)",
                                  "keep value.toString() instead", category="object-reuse")
            return self._side(st, e.expressionl.member, self._expr(e.value), guard, many=False)
        super()._update(st, guard)

    def _is_reused_value(self, node) -> bool:
        plain = isinstance(node, T.MemberReference) and node.member == self.loop_var and not node.selectors
        nxt = isinstance(node, T.MethodInvocation) and node.qualifier == self.values and node.member == "next" \
            and not node.selectors
        return plain or nxt

    def _side(self, st, name: str, elem: Expr, guard: Expr | None, many: bool) -> None:
        if name in self.sides:
            raise Unsupported(st, f"`{name}` is filled in two places in the loop")
        if guard is None and not many:
            raise Unsupported(st, f"`{name}` is assigned every value: it keeps the last one, and Hadoop gives a key's "
                                  "values in no defined order", category="value-order")
        default = None if many else self.accs.pop(name)[1].value
        a, _ = node_lines(st)
        self.sides[name] = JoinSide(name, guard if guard is not None else Lit("boolean", True), elem, many, default,
                                    Span(self.file, a, a), self.cls.file.lines[a - 1].strip() if a else "")

    # ------------------------------------------------------------------ after the loop: the writes
    def _after(self, s, guard) -> None:
        if isinstance(s, T.ForStatement):
            ctl = s.control
            it = getattr(ctl, "iterable", None)
            if not (isinstance(ctl, T.EnhancedForControl) and isinstance(it, T.MemberReference) and not it.qualifier
                    and it.member in self.lists and it.member in self.sides):
                raise Unsupported(s, "a loop after the values that is not over one of the joined lists")
            self.scope.env[ctl.var.declarators[0].name] = Col(self.sides[it.member].elem.jtype, it.member)
            self.loops.append(it.member)
            for x in _block(s.body):
                self._after(x, guard)
            self.loops.pop()
            return
        if isinstance(s, T.IfStatement):
            c = self._presence(s.condition)
            for branch, cond in ((s.then_statement, c), (s.else_statement, _not(c))):
                for x in _block(branch):
                    self._after(x, _and(guard, cond))
            return
        emit = self._write(s, guard)
        if emit is None:
            if isinstance(s, T.ReturnStatement) and s.expression is None and not self.loops:
                return
            raise Unsupported(s, "a statement after the loop over values that is not a write of the joined sides")
        self._check_defaults(s, emit)
        self.writes.append(JoinWrite(tuple(self.loops), emit))

    def _presence(self, c) -> Expr:
        """A condition on which sides got a value: `a.isEmpty()`, `a.size() > 0`, `x == null`, and/or."""
        neg = "!" in (getattr(c, "prefix_operators", None) or [])
        out = None
        if isinstance(c, T.MethodInvocation) and c.qualifier in self.sides and c.member == "isEmpty" and not c.arguments:
            out = _not(has(c.qualifier))
        elif isinstance(c, T.BinaryOperation) and c.operator in ("&&", "||"):
            out = BoolOp("boolean", c.operator, (self._presence(c.operandl), self._presence(c.operandr)))
        elif isinstance(c, T.BinaryOperation) and c.operator in ("==", "!="):
            l, r = c.operandl, c.operandr
            if isinstance(r, T.MemberReference) and isinstance(l, T.Literal):
                l, r = r, l
            name = getattr(l, "member", None) if isinstance(l, T.MemberReference) and not l.qualifier else None
            side = self.sides.get(name)
            if side is not None and not side.many and side.default is None and getattr(r, "value", "") == "null":
                out = has(name) if c.operator == "!=" else _not(has(name))
            sized = isinstance(l, T.MethodInvocation) and l.qualifier in self.sides and l.member == "size"
            if sized and getattr(r, "value", "") == "0":
                out = _not(has(l.qualifier)) if c.operator == "==" else has(l.qualifier)
        elif isinstance(c, T.BinaryOperation) and c.operator == ">" and isinstance(c.operandl, T.MethodInvocation) \
                and c.operandl.qualifier in self.sides and c.operandl.member == "size" \
                and getattr(c.operandr, "value", "") == "0":
            out = has(c.operandl.qualifier)
        if out is None:
            return self._expr(c)  # a condition on the key or a one-value side
        return _not(out) if neg else out

    def _check_defaults(self, s, emit: Emit) -> None:
        """A one-value side without a default is null where no value came: Java would print "null"
        or fail; only writes that first check it are read."""
        guard = set(_conjuncts(emit.guard))
        for e in (emit.key, emit.value, emit.guard):
            for x in walk(e):
                side = self.sides.get(x.name) if isinstance(x, Col) else None
                if side is not None and not side.many and side.default is None and has(side.name) not in guard:
                    raise Unsupported(s, f"`{side.name}` is read where it may still be null (no value of its side "
                                            "came for the key)", f"write `if ({side.name} != null)` around it in Java, "
                                            "or give it a default", category="join")
