"""Read a reducer's reduce() body as a fold over the values of a key.

Recognises: accumulators declared before the loop over `values` (for-each or
`while (values.hasNext())`) and updated once per value: `acc += f(v)` (sum), `acc++`
(count), both under an `if` (conditional sum/count), `acc = Math.max/min(acc, f(v))` and
`if (f(v) > acc) acc = f(v)` (max/min), boolean flags (`if (c) flag = true`, `flag |= c`:
any/all), `set.add(f(v))` read back as `set.size()` (distinct count); then the writes after
the loop, each under its own guard (→ one output row per write); a loop that writes each
value (identity, filter, per-value map → EachValue); a reducer that ignores its values
(distinct).
Declines, with the reason: an accumulator read inside the loop (its running value), the
first/last value (Hadoop gives a key's values in no defined order), a second pass over the
values, writes both inside and after the loop.
"""
from __future__ import annotations

from dataclasses import replace

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.counters import counter_update, is_counter_call
from migrate.lift.writables import structs_seen_from
from migrate.lift.exprs import (WRITABLE_OF, GatheredList, Opaque, Scope, Unsupported, Writable, calls_as_names, lift, promote, text_params, widen,
                                widen_at, writable_creator, writable_set, write_argument)
from migrate.lift.mapper import class_constants, helper_methods, repository_classes
from migrate.plan import (NUMERIC, Agg, AggRef, BoolOp, Col, Compare, Cond, Count, EachValue, Emit, Expr, Finding, Group,
                          HandWork, Let, Lit, Span, TopPerKey, walk)

_DECLARED = {"int": "int", "long": "long", "double": "double", "float": "float", "Integer": "int", "Long": "long",
             "Double": "double", "boolean": "boolean", "String": "String"}
_SETS = {"Set", "HashSet", "TreeSet", "LinkedHashSet"}
_LISTS = {"List", "ArrayList", "LinkedList"}
_GATHERED = {"Integer": "int", "Long": "long"}  # element types whose natural order is Spark's (not String: UTF-16)
_IN_ARRIVAL_ORDER = {"List", "ArrayList", "LinkedList", "StringBuilder", "StringBuffer", "Deque", "ArrayDeque"}
_SET_ELEMENTS = {"String": "String", "Integer": "int", "Long": "long"}  # Double sets: -0.0/NaN equality differs


class FoldLifter:
    """Turns one reduce() method into a Group or EachValue step (or hand work)."""

    def __init__(self, cls: ClassInfo, method: T.MethodDeclaration, key_type: str, value_type: str, index=None,
                 collector=None, sorted_values: bool = False, settings: dict | None = None):
        self.cls, self.method, self.index = cls, method, index
        self.sorted_values = sorted_values  # the driver sets a sort or grouping comparator (secondary sort)
        self.collector = collector  # a rule for statements filling a field across keys (lift.topn)
        self.file = cls.file.path
        self.key_type, self.value_type = key_type, value_type
        params = [p.name for p in method.parameters]
        # setup()'s settings (lift.config) are constants of the task, like the class's constants
        env: dict[str, object] = {**class_constants(cls, index), **(settings or {})}
        fields = dict(env)  # what a helper method of the class reads
        # fields that change are state carried from one key to the next (and per reduce task)
        self.state_fields = {d.name: d for f in cls.fields() for d in f.declarators
                             if d.name not in env and "static" not in (f.modifiers or set())}
        for name in self.state_fields:
            env.setdefault(name, Opaque(f"the field `{name}`, kept from one reduce() call to the next"))
        self.cap: tuple[str, int, Span] | None = None  # `if (written < N) { ...; written++; }`
        env[params[0]] = Col(key_type, "key")
        self.values = params[1]
        env[params[1]] = Opaque("the values of the key")
        self.emit_target = params[2] if len(params) > 2 else None
        for p in params[2:]:
            env[p] = Opaque("the task context")
        self.scope = Scope(env, file=self.file, methods=helper_methods(cls, index),
                           enums=frozenset(fq.rsplit(".", 1)[-1] for fq in (index.enums if index else {})),
                           structs=structs_seen_from(cls, index), fields=fields, classes=repository_classes(cls, index),
                           texts=text_params(method))
        self.accs: dict[str, tuple[str, Lit]] = {}
        self.sets: dict[str, str] = {}  # name -> element type
        self.aggs: dict[str, Agg] = {}
        self.seen_loop = False
        self.in_loop = False
        self.iterator: str | None = None  # `Iterator<V> it = values.iterator();` before the loop
        self.first_taken = False  # `it.next()` before the loop: the group's first value
        self.first_at = self.stmt_at = None  # where it was taken; the statement being lifted
        self.emits_before_loop = 0  # how many of `emits` reduce() wrote before its loop
        self.loop_locals: dict[str, str] = {}  # locals declared in the loop body -> Java type
        self.emits: list[Emit] = []  # writes after the loop (or without one)
        self.loop_emits: list[Emit] = []  # writes inside the loop, once per value
        self.lets: list[Let | Count] = []  # locals of the loop body: per-value columns (and counters)
        self.call_counts: list[Count] = []  # counters updated once per reduce() call
        self.gathered: dict[str, str] = {}  # Lists filled with the values in the loop -> element type (joins have their own lists)
        self.tree_sets: set[str] = set()
        self.set_trim: dict[str, tuple[int, bool]] = {}  # TreeSet -> (N, keeps the largest)
        self.set_walk: tuple[str, bool, tuple[Emit, ...]] | None = None  # (set, descending, writes)

    def run(self) -> tuple[Group | EachValue | None, list[HandWork]]:
        try:
            return self._lift(), []
        except Unsupported as u:
            line = u.line or node_lines(self.method)[0]
            snippet = self.cls.file.lines[line - 1].strip() if line else ""
            return None, [HandWork(u.category or "reduce-logic", Span(self.file, line, line), u.reason,
                                   u.suggestion or "express the fold with groupBy().agg(...) by hand", snippet, "P2")]

    def _lift(self) -> Group | EachValue:
        body, keys = self._key_tests(list(self.method.body or []))
        for s in body:
            self._stmt(s, None)
        a, b = node_lines(self.method)
        span = Span(self.file, a, b)
        if self.first_taken and not self.loop_emits and not self.sorted_values:
            raise Unsupported(self.first_at or self.method, "reduce() uses the first of its values (`next()` before any loop): Hadoop "
                                           "gives the values of a key in no defined order (no secondary sort here), "
                                           "so the original's output was not deterministic",
                              "if any value will do, F.first; if one is meant, sort the values (secondary sort)",
                              category="value-order")
        if self.first_taken and not self.loop_emits:
            raise Unsupported(self.method, "reduce() takes the first value before its loop and does not write in the "
                                           "loop", category="value-order")
        if self.call_counts and (self.loop_emits or self.set_walk is not None or self.collector is not None):
            raise Unsupported(self._node_at(self.call_counts[0]),
                              "a counter updated once per reduce() call in a reducer that writes per value or keeps "
                              "a collection: not converted")
        if self.loop_emits:
            used = {x.name for e in self.emits for side in (e.key, e.value, e.guard) for x in walk(side)
                    if isinstance(x, AggRef)}
            if used:
                raise Unsupported(self.method, "reduce() writes inside its loop over values and, after it, a figure "
                                               f"of all the values (`{sorted(used)[0]}`)")
            return EachValue(span, "writes inside the loop over values", tuple(self.loop_emits), tuple(self.lets),
                             first_value=self.first_taken, before=tuple(self.emits[:self.emits_before_loop]),
                             after=tuple(self.emits[self.emits_before_loop:]), keys=keys)
        if self.set_walk is not None:
            return replace(self._top_per_key(span), keys=keys)
        if self.collector is not None:
            self.emits = self.collector.finish(self)
        if not self.emits:
            raise Unsupported(self.method, "reduce() writes nothing itself (is the output written in cleanup()?)",
                              "see the top-N rule: a structure filled in reduce() and written in cleanup()")
        refs = {x.name for e in self.emits for side in (e.key, e.value, e.guard) for x in walk(side)
                if isinstance(x, AggRef)}
        if not self.seen_loop:
            if refs:
                raise Unsupported(self.method, "write depends on accumulators but there is no loop over values")
            return Group(span, "distinct keys", (), tuple(self.emits), distinct=True,
                         first_keys=self.cap[1] if self.cap else None, keys=keys, counts=tuple(self.call_counts))
        refs |= {x.name for c in self.call_counts for side in (c.cond, c.amount) for x in walk(side)
                 if isinstance(x, AggRef)}
        aggs = tuple(self.aggs[n] for n in self.aggs if n in refs)
        return Group(span, "fold over values", aggs, tuple(self.emits), lets=tuple(self.lets),
                     first_keys=self.cap[1] if self.cap else None, keys=keys, counts=tuple(self.call_counts))

    def lift_in_loop(self, node) -> Expr:
        """An expression of the loop's value alone (after run()): what it is for each value."""
        e = self._expr(node)
        if any(isinstance(x, Col) and x.name not in ("value", "key") for x in walk(e)):
            raise Unsupported(node, "the expression reads a local of the loop, not only its value")
        return e

    def lift_after_loop(self, statements: list, bindings: dict) -> list[Emit]:
        """`statements` as if they came after the loop over values, with `bindings` in scope: their writes."""
        self.seen_loop = True
        self.scope.env.update(bindings)
        for s in statements:
            self._stmt(s, None)
        return self.emits

    def _no_value_counters(self) -> None:
        """Counters per value are converted for folds and per-value writes only."""
        c = next((c for c in self.lets if isinstance(c, Count)), None)
        if c is not None:
            raise Unsupported(self._node_at(c), "a counter updated per value in this kind of reducer is not converted")

    def _gather(self, st, name: str, e: Expr, guard: Expr | None) -> None:
        """`list.add(x)` in the loop: the list of x over the values (collect_list skips NULLs, which
        a Writable's get() never is)."""
        t = self.gathered[name]
        if name in self.aggs:
            raise Unsupported(st, f"`{name}` is filled twice per value")
        if e.jtype != t:
            raise Unsupported(st, f"a {e.jtype} added to a list of {t}")
        a, b = node_lines(st)
        arg = Cond(t, guard, e, Lit(t, None)) if guard is not None else e
        self.aggs[name] = Agg(name, "collect_list", arg, f"{t}[]", None, Span(self.file, a, b),
                              self.cls.file.lines[a - 1].strip() if a else "")

    def _count(self, st, e, guard: Expr | None) -> Count:
        """A counter update with constant names; `guard` is where it runs."""
        cu = counter_update(e, self.scope, self.cls, self.index)
        if not (isinstance(cu.group, str) and isinstance(cu.name, str)):
            raise Unsupported(st, "a counter of reduce() named by the data is not converted")
        a, b = node_lines(st)
        return Count(Span(self.file, a, b), self.cls.file.lines[a - 1].strip() if a else "", cu.group, cu.name, guard,
                     cu.amount)

    def _node_at(self, c: Count):
        return next((n for _, n in self.method if getattr(n, "position", None) and n.position.line ==
                     c.origin.line_start), self.method)

    def _key_tests(self, body: list) -> tuple[list, Expr | None]:
        """Leading tests of the key alone: `if (t) return;` before the rest, or the whole body inside
        `if (t) { ... }`. reduce() then does its work only for keys passing them, which is the same
        as dropping the other keys' rows before the shuffle (the test reads nothing else)."""
        keys = None
        while body and isinstance(body[0], T.IfStatement) and body[0].else_statement is None:
            s, then = body[0], _block(body[0].then_statement)
            bare_return = [x for x in body[1:] if not (isinstance(x, T.ReturnStatement) and x.expression is None)]
            if len(then) == 1 and isinstance(then[0], T.ReturnStatement) and then[0].expression is None:
                test, rest = self._key_test(s.condition, negate=True), body[1:]
            elif not bare_return:
                test, rest = self._key_test(s.condition), list(then)
            else:
                break
            if test is None:
                break
            keys, body = test if keys is None else BoolOp("boolean", "&&", (keys, test)), rest
        return body, keys

    def _key_test(self, cond, negate: bool = False) -> Expr | None:
        """`cond` as a test of the key alone (constants allowed), else None."""
        names = {self.values, self.iterator} - {None}
        if any(getattr(n, "qualifier", None) in names or getattr(n, "member", None) in names for _, n in cond):
            return None
        try:
            e = self._expr(cond)
        except Unsupported:
            return None
        if e.jtype != "boolean" or any(isinstance(x, (Col, AggRef)) and not (isinstance(x, Col) and x.name == "key")
                                       for x in walk(e)):
            return None
        return BoolOp("boolean", "!", (e,)) if negate else e

    # ------------------------------------------------------------------ statements outside the loop
    def _rewrite(self, node):
        """A copy of `node` with `values.next()` (or `it.next()` of `it = values.iterator()`) and
        `set.size()` replaced by names the scope binds: inside the loop the value of the row, before
        it the group's first value (taken once)."""
        def name_of(n):
            sel = n.selectors or []
            if n.qualifier == self.values and n.member == "iterator" and sel and isinstance(sel[0], T.MethodInvocation) \
                    and sel[0].member == "next" and not sel[0].arguments:  # `values.iterator().next()`
                inner = name_of(T.MethodInvocation(qualifier=self.values, member="next", arguments=[], selectors=[]))
                return (inner, 1) if inner else None
            if n.qualifier in (self.values, self.iterator) and n.member == "next":
                if self.in_loop:
                    return "__next__"
                if self.seen_loop or self.first_taken:
                    raise Unsupported(n, "reduce() takes a value outside its loop other than the first",
                                      category="value-order")
                self.first_taken = True
                self.first_at = n if node_lines(n)[0] else self.stmt_at
                self.scope.env["__first__"] = Col(self.value_type, "first_value")
                return "__first__"
            return f"__size_{n.qualifier}" if n.qualifier in self.sets and n.member == "size" and not n.selectors else None

        return calls_as_names(node, name_of)

    def _expr(self, node) -> Expr:
        return lift(self._rewrite(node), self.scope)

    def _write(self, s, guard: Expr | None) -> Emit | None:
        """A `context.write(k, v)` / `output.collect(k, v)` statement as an Emit, else None."""
        e = s.expression if isinstance(s, T.StatementExpression) else None
        if not (isinstance(e, T.MethodInvocation) and e.qualifier == self.emit_target
                and e.member in ("write", "collect")):
            return None
        k, v = (write_argument(self._rewrite(x), self.scope) for x in e.arguments)
        a, b = node_lines(s)
        return Emit(Span(self.file, a, b), self.cls.file.lines[a - 1].strip() if a else "", k, v, guard)

    def _stmt(self, s, guard) -> None:
        self.stmt_at = s
        if self.collector is not None and self.seen_loop and self.collector.statement(s, guard, self):
            return
        if isinstance(s, T.LocalVariableDeclaration):
            tname = getattr(s.type, "name", "")
            for d in s.declarators:
                init = d.initializer
                if tname == "Iterator" and isinstance(init, T.MethodInvocation) and init.qualifier == self.values \
                        and init.member == "iterator" and not init.arguments and not init.selectors \
                        and self.iterator is None and not self.seen_loop:
                    self.iterator = d.name
                    self.scope.env[d.name] = Opaque("the iterator over the values")
                    continue
                if isinstance(init, T.MethodInvocation) and init.member == "next" and not init.selectors \
                        and init.qualifier in (self.values, self.iterator) and not self.seen_loop:
                    raise Unsupported(s, f"`{d.name}` holds the value object itself, which Hadoop reuses: it changes "
                                         "to each value the loop reads next", f"copy it: new {tname}(...) or "
                                         ".toString() / .get()", category="value-order")
                if tname in WRITABLE_OF and isinstance(d.initializer, T.ClassCreator):
                    self.scope.env[d.name] = writable_creator(self._rewrite(d.initializer), self.scope)
                    continue
                if tname in _SETS and isinstance(d.initializer, T.ClassCreator) and not self.seen_loop:
                    self._declare_set(s, d)
                    continue
                if tname in _LISTS and not self.seen_loop and isinstance(init, T.ClassCreator) and not init.arguments \
                        and _element(s.type) in _GATHERED:
                    self.gathered[d.name] = _GATHERED[_element(s.type)]
                    self.scope.env[d.name] = Opaque(f"the list `{d.name}` (read only after the loop over values)")
                    continue
                if tname in _IN_ARRIVAL_ORDER and self.sorted_values:
                    raise Unsupported(s, f"`{d.name}` ({tname}) gathers the values in the order the job's sort "
                                         "comparator gives them; a collection built in sort order is not converted "
                                         "yet", "F.collect_list(F.struct(sort fields..., value)), F.array_sort, then "
                                         "F.transform to the value", category="value-order")
                if tname in _IN_ARRIVAL_ORDER:
                    raise Unsupported(s, f"`{d.name}` ({tname}) gathers the values in the order they reach reduce(), "
                                         "which Hadoop does not define without a secondary sort, so the original's "
                                         "output was not deterministic",
                                      "F.array_join(F.array_sort(F.collect_list(...)), sep) if sorted order will do",
                                      category="value-order")
                if tname == "PriorityQueue":
                    raise Unsupported(s, f"`{d.name}` is a PriorityQueue: which of equal elements it gives up first "
                                         "depends on the heap's history", "Window.orderBy(...) with row_number() <= N, "
                                                                         "with an explicit tie-breaker", category="top-n")
                self._hides(d.name)
                if d.initializer is None:
                    raise Unsupported(s, f"`{d.name}` declared without a value")
                e = self._expr(d.initializer)
                t = _DECLARED.get(tname)
                if t is None:
                    raise Unsupported(s, f"local of type {tname} in reduce()")
                e = widen_at(e, t, self.scope, s) if e.jtype != t and e.jtype in NUMERIC else e
                if not self.seen_loop and isinstance(e, Lit):
                    self.accs[d.name] = (t, e)
                elif not self.seen_loop and self._changed_later(d.name):
                    raise Unsupported(s, "accumulator initialised from something other than a constant")
                self.scope.env[d.name] = e  # else a value of the key (never changed): a column of the group
        elif isinstance(s, T.ForStatement) and self.seen_loop and self._walk_of_trimmed_set(s):
            return
        elif isinstance(s, (T.ForStatement, T.WhileStatement)):
            if self.seen_loop:
                raise Unsupported(s, "a second loop over values: Hadoop's values can be iterated once")
            self.seen_loop = self.in_loop = True
            self._loop(s)
            self.in_loop = False
            for name, (t, init) in self.accs.items():
                self.scope.env[name] = AggRef(t, name) if name in self.aggs else init
            for name, t in self.gathered.items():
                if name not in self.aggs:
                    raise Unsupported(s, f"the list `{name}` is not filled in the loop over values")
                self.scope.env[name] = GatheredList(name, AggRef(f"{t}[]", name))
            for name in self.sets:
                self.scope.env.pop(name, None)
                if name in self.aggs:
                    self.scope.env[f"__size_{name}"] = AggRef("int", name)
        elif isinstance(s, T.StatementExpression):
            emit = self._write(s, guard)
            if emit is not None:
                self.emits.append(emit)
                self.emits_before_loop += not self.seen_loop
                return
            e = s.expression
            if is_counter_call(e):  # once per reduce() call
                self.call_counts.append(self._count(s, e, guard))
                return
            if isinstance(e, T.MethodInvocation) and e.qualifier == "Collections" and e.member == "sort" \
                    and len(e.arguments or []) == 1 and isinstance(self.scope.env.get(getattr(e.arguments[0], "member",
                                                                                              None)), GatheredList) \
                    and guard is None:
                g = self.scope.env[e.arguments[0].member]  # natural order: Integer/Long compareTo
                self.scope.env[g.name] = replace(g, sorted=True)
                self.aggs[g.name] = replace(self.aggs[g.name], fn="collect_sorted")
                return
            changed = _changed_name(e)
            if changed in self.state_fields:
                raise Unsupported(s, f"`{changed}` is a field of the reducer: it carries state from one key to the "
                                     "next (across reduce() calls), and each reduce task has its own",
                                  "a window over the keys in order (Window.orderBy('key')) expresses running state",
                                  category="task-state")
            if isinstance(e, T.MethodInvocation) and e.member == "set" and isinstance(self.scope.env.get(e.qualifier), Writable):
                w = self.scope.env[e.qualifier]
                if guard is not None:
                    raise Unsupported(s, "Writable set under a condition in reduce()")
                w.content = writable_set(w, self._expr(e.arguments[0]), e)
                return
            raise Unsupported(s, "statement in reduce() is not lifted")
        elif isinstance(s, T.IfStatement) and guard is None and self._output_cap(s):
            return
        elif isinstance(s, T.IfStatement) and (self.seen_loop or not _has_loop(s)):
            c = self._expr(s.condition)
            for branch, cond in ((s.then_statement, c), (s.else_statement, BoolOp("boolean", "!", (c,)))):
                for x in _block(branch):
                    self._stmt(x, cond if guard is None else BoolOp("boolean", "&&", (guard, cond)))
        elif isinstance(s, T.ReturnStatement) and s.expression is None and s is (self.method.body or [None])[-1]:
            return
        else:
            raise Unsupported(s, f"{type(s).__name__} in reduce() is not lifted")

    def _changed_later(self, name: str) -> bool:
        """Is the local `name` assigned or stepped anywhere in reduce() after its declaration?"""
        return any(_changed_name(n) == name for _, n in self.method if isinstance(n, (T.Assignment, T.MemberReference)))

    def _output_cap(self, s: T.IfStatement) -> bool:
        """`if (written < N) { <writes>; written++; }` over a field that starts at 0: the first N keys."""
        c = s.condition
        body = _block(s.then_statement)
        if not (s.else_statement is None and isinstance(c, T.BinaryOperation) and c.operator == "<"
                and isinstance(c.operandl, T.MemberReference) and c.operandl.member in self.state_fields and body):
            return False
        name = c.operandl.member
        init = self.state_fields[name].initializer
        n = lift(c.operandr, self.scope)
        last = body[-1]
        if not (isinstance(n, Lit) and n.jtype == "int" and isinstance(last, T.StatementExpression)
                and _changed_name(last.expression) == name and _increments(last.expression)
                and (init is None or getattr(init, "value", None) == "0") and self.cap is None):
            return False
        uses = sum(1 for m in self.cls.node.methods for _, x in m if isinstance(x, T.MemberReference) and x.member == name)
        if uses != 2:  # read in the test and bumped once: nothing else looks at it
            return False
        for x in body[:-1]:
            self._stmt(x, None)
        a, _ = node_lines(s)
        self.cap = (name, n.value, Span(self.file, a, a))
        return True

    def _declare_set(self, s, d) -> None:
        args = getattr(s.type, "arguments", None) or []
        elem = getattr(getattr(args[0], "type", None), "name", "") if len(args) == 1 else ""
        if elem not in _SET_ELEMENTS or d.initializer.arguments:
            raise Unsupported(s, f"a set of {elem or 'unknown type'} in reduce(); sets of String, Integer and Long "
                                 "are read (Java's Double equality keeps -0.0 and 0.0 apart, Spark's does not)")
        self.sets[d.name] = _SET_ELEMENTS[elem]
        if getattr(d.initializer.type, "name", "") == "TreeSet":
            self.tree_sets.add(d.name)
        self.scope.env[d.name] = Opaque(f"the set `{d.name}` (only its size() is read)")

    # ------------------------------------------------------------------ top-N per key (a trimmed TreeSet)
    def _set_trim(self, st) -> bool:
        """`if (top.size() > N) top.pollFirst();` (or pollLast, remove(top.first()/last())) after the add."""
        c = st.condition
        body = _block(st.then_statement)
        if not (isinstance(c, T.BinaryOperation) and c.operator == ">" and isinstance(c.operandl, T.MethodInvocation)
                and c.operandl.qualifier in self.tree_sets and c.operandl.member == "size" and len(body) == 1
                and isinstance(body[0], T.StatementExpression)):
            return False
        name, call = c.operandl.qualifier, body[0].expression
        if not (isinstance(call, T.MethodInvocation) and call.qualifier == name):
            return False
        arg = call.arguments[0] if len(call.arguments or []) == 1 else None
        end = call.member if not call.arguments else \
            f"remove({arg.member})" if isinstance(arg, T.MethodInvocation) and arg.qualifier == name else None
        largest = {"pollFirst": True, "remove(first)": True, "pollLast": False, "remove(last)": False}.get(end)
        n = lift(c.operandr, self.scope)
        if largest is None or not isinstance(n, Lit) or n.jtype != "int" or name not in self.aggs or name in self.set_trim:
            raise Unsupported(st, f"the trim of the TreeSet `{name}` is not `if (size() > N) pollFirst()` (or "
                                  "pollLast, remove(first()), remove(last())) after its add, with a constant N",
                              category="top-n")
        self.set_trim[name] = (n.value, largest)
        return True

    def _walk_of_trimmed_set(self, s: T.ForStatement) -> bool:
        """`for (Integer d : top[.descendingSet()]) context.write(...)` after the loop over values."""
        ctl = s.control
        it = getattr(ctl, "iterable", None)
        if not isinstance(ctl, T.EnhancedForControl):
            return False
        if isinstance(it, T.MemberReference) and it.member in self.set_trim and not it.qualifier:
            name, down = it.member, False
        elif isinstance(it, T.MethodInvocation) and it.qualifier in self.set_trim and it.member == "descendingSet" \
                and not it.selectors:
            name, down = it.qualifier, True
        else:
            return False
        self.scope.env[ctl.var.declarators[0].name] = Col(self.sets[name], "tm_key")
        writes = [self._write(x, None) for x in _block(s.body)]
        if len(writes) != 1 or None in writes or self.set_walk is not None:
            raise Unsupported(s, f"the loop over the TreeSet `{name}` does more than write each element once",
                              category="top-n")
        self.set_walk = (name, down, tuple(writes))
        return True

    def _top_per_key(self, span: Span) -> TopPerKey:
        name, down, writes = self.set_walk
        others = [a for a in self.aggs if a != name]
        if others or self.emits or self.loop_emits:
            raise Unsupported(self.method, "reduce() computes more than the trimmed TreeSet it writes", category="top-n")
        n, largest = self.set_trim[name]
        self._no_value_counters()
        return TopPerKey(span, f"top {n} distinct values per key", self.aggs[name].arg, n, largest, down, writes,
                         tuple(self.lets))


    # ------------------------------------------------------------------ the loop over values
    def _loop(self, s) -> None:
        ctl = s.control if isinstance(s, T.ForStatement) else None
        if isinstance(ctl, T.EnhancedForControl):
            if not (isinstance(ctl.iterable, T.MemberReference) and ctl.iterable.member == self.values
                    and not ctl.iterable.qualifier):
                raise Unsupported(s, "loop that is not over the reducer's values")
            if self.first_taken:  # Hadoop's values.iterator() is one iterator: the loop would go on from the second
                raise Unsupported(s, "a for-each over the values after taking the first one", category="value-order")
            self.scope.env[ctl.var.declarators[0].name] = Col(self.value_type, "value")
        else:
            c = s.condition if ctl is None else ctl.condition
            if ctl is not None and (ctl.init or ctl.update):
                raise Unsupported(s, "loop that is not over the reducer's values")
            if not (isinstance(c, T.MethodInvocation) and c.qualifier in (self.values, self.iterator)
                    and c.member == "hasNext"):
                raise Unsupported(s, "while loop that is not `while (values.hasNext())`")
            nexts = [n for st in _block(s.body) for _, n in st if isinstance(n, T.MethodInvocation)
                     and n.qualifier == c.qualifier and n.member == "next"]
            if len(nexts) != 1:
                raise Unsupported(s, "the loop does not take exactly one value per iteration")
            self.scope.env["__next__"] = Col(self.value_type, "value")
        for name in self.accs:  # inside the loop an accumulator holds a running value no column has
            self.scope.env[name] = Opaque(f"the running value of `{name}` (read inside the loop over values)")
        for st in _block(s.body):
            self._update(st, None)

    def _update(self, st, guard: Expr | None) -> None:
        if isinstance(st, T.LocalVariableDeclaration):
            if guard is not None:
                raise Unsupported(st, "a local declared under a condition inside the loop over values")
            for d in st.declarators:
                self._hides(d.name)
                e = self._expr(d.initializer)
                t = _DECLARED.get(getattr(st.type, "name", ""), e.jtype)
                e = widen_at(e, t, self.scope, st) if e.jtype in NUMERIC and t in NUMERIC else e
                self.loop_locals[d.name] = t
                self._bind_row_local(st, d.name, e)
            return
        emit = self._write(st, guard)
        if emit is not None:
            self.loop_emits.append(emit)
            return
        if isinstance(st, T.StatementExpression):
            e = st.expression
            if is_counter_call(e):  # once per value: counted over the map output rows
                self.lets.append(self._count(st, e, guard))
                return
            if isinstance(e, T.MethodInvocation) and e.qualifier in self.gathered and e.member == "add" \
                    and len(e.arguments or []) == 1 and not e.selectors:
                return self._gather(st, e.qualifier, self._expr(e.arguments[0]), guard)
            if isinstance(e, T.MemberReference) and set((e.postfix_operators or []) + (e.prefix_operators or [])) == {"++"}:
                return self._agg(st, e.member, "count", None, guard)
            if isinstance(e, T.MethodInvocation) and e.qualifier in self.sets and e.member == "add" and len(e.arguments) == 1:
                if guard is not None:
                    raise Unsupported(st, "a set filled under a condition")
                return self._agg(st, e.qualifier, "count_distinct", self._expr(e.arguments[0]))
            if isinstance(e, T.Assignment) and isinstance(e.expressionl, T.MemberReference) \
                    and e.expressionl.member in self.loop_locals and not e.expressionl.qualifier:
                return self._reassign_row_local(st, e, guard)
            if isinstance(e, T.Assignment) and isinstance(e.expressionl, T.MemberReference):
                return self._assignment(st, e, guard)
        if isinstance(st, T.IfStatement):
            body = _block(st.then_statement)
            if guard is None and st.else_statement is None and self._set_trim(st):
                return
            if guard is None and st.else_statement is None and self._compare_and_keep(st, body):
                return
            if guard is None and st.else_statement is None and self._first_or_compare(st, body):
                return
            c = self._expr(st.condition)  # Spark's & evaluates its right side only where the left holds
            for branch, cond in ((body, c), (_block(st.else_statement) if st.else_statement is not None else [],
                                             BoolOp("boolean", "!", (c,)))):
                for x in branch:
                    self._update(x, cond if guard is None else BoolOp("boolean", "&&", (guard, cond)))
            return
        raise Unsupported(st, "statement in the loop over values is not a recognised accumulator update",
                          "write the aggregation by hand: groupBy('key').agg(...)")

    def _bind_row_local(self, st, name: str, e: Expr) -> None:
        """A local of the loop body: a column of the value's row (a Let), or the value itself."""
        if isinstance(e, (Col, Lit)):
            self.scope.env[name] = e
            return
        col = name if name not in ("key", "value") and name not in self.accs else f"{name}_v"
        taken = {x.name for x in self.lets if isinstance(x, Let)}
        base, n = col, 2
        while col in taken:  # a local set again in the same iteration: a new column, earlier reads keep theirs
            col, n = f"{base}_{n}", n + 1
        a, b = node_lines(st)
        self.lets.append(Let(Span(self.file, a, b), self.cls.file.lines[a - 1].strip() if a else "", col, e))
        self.scope.env[name] = Col(e.jtype, col)

    def _reassign_row_local(self, st, e: T.Assignment, guard: Expr | None) -> None:
        """`x = v` / `x += v` on a local declared in this iteration (a new value for the rest of it)."""
        name = e.expressionl.member
        if e.type == "=":
            new = self._expr(e.value)
        elif e.type in ("+=", "-=", "*=") and self.loop_locals[name] in ("String", "int", "long", "double"):
            op = T.BinaryOperation(operator=e.type[0], operandl=T.MemberReference(member=name, qualifier=""),
                                   operandr=e.value)
            new = self._expr(op)
        else:
            raise Unsupported(st, f"update `{e.type}` of the local `{name}` in the loop over values is not lifted")
        t = self.loop_locals[name]
        if new.jtype != t and not (new.jtype in NUMERIC and t in NUMERIC and promote(new.jtype, t) == t):
            raise Unsupported(st, f"`{name}` ({t}) is given a {new.jtype}")
        new = widen(new, t) if new.jtype != t else new
        if guard is not None:
            new = Cond(t, guard, new, self._expr(e.expressionl))
        self._bind_row_local(st, name, new)

    def _assignment(self, st, e: T.Assignment, guard: Expr | None) -> None:
        name = e.expressionl.member
        if name not in self.accs:
            raise Unsupported(st, f"`{name}` is assigned in the loop but was not initialised before it")
        t = self.accs[name][0]
        v = e.value
        if t == "boolean":
            return self._flag(st, name, e, guard)
        if e.type == "+=":
            rhs = self._expr(v)
            return self._agg(st, name, "count", None, guard) if _is_one(rhs) else self._agg(st, name, "sum", rhs, guard)
        if e.type == "=":
            if isinstance(v, T.BinaryOperation) and v.operator == "+" and _is_ref(v.operandl, name):
                rhs = self._expr(v.operandr)
                return self._agg(st, name, "count", None, guard) if _is_one(rhs) else self._agg(st, name, "sum", rhs, guard)
            if isinstance(v, T.MethodInvocation) and v.qualifier == "Math" and v.member in ("max", "min") and guard is None:
                a, b = v.arguments
                other = b if _is_ref(a, name) else a if _is_ref(b, name) else None
                if other is not None:
                    return self._agg(st, name, v.member, self._expr(other))
            if not any(_is_ref(n, name) for _, n in v) and self.sorted_values:
                raise Unsupported(st, f"`{name}` keeps the last value assigned in the loop: the group's last value in "
                                      "the order of the job's sort comparator; a last value in sort order is not "
                                      "converted yet", "F.max_by(value, F.struct(sort fields...))",
                                  category="value-order")
            if not any(_is_ref(n, name) for _, n in v):
                return self._last_value(st, name, self._expr(v), guard)
        raise Unsupported(st, f"update of `{name}` is not a recognised accumulator update",
                          "write the aggregation by hand: groupBy('key').agg(...)")

    def _last_value(self, st, name: str, arg: Expr, guard: Expr | None) -> None:
        """`x = f(value)` in the loop keeps the last value, and Hadoop does not define which value is
        last: the answer is the original's only where every value gives the same x, which the
        script checks at run time (as a join's one-value side)."""
        why = (f"`{name}` keeps the last value assigned in the loop; Hadoop gives the values of a key in no "
               "defined order (no secondary sort here), so the original output was not deterministic")
        if guard is not None:
            raise Unsupported(st, why + " (and the assignment is under a condition)",
                              "if any value will do, use F.max or F.min; if the order matters, sort the values "
                              "(secondary sort) and use F.max_by", category="value-order")
        if arg.jtype in ("double", "float"):  # Spark counts -0.0 and 0.0 (and NaNs) as one distinct value
            raise Unsupported(st, why + f" (a {arg.jtype}: the run-time check that all values agree would take "
                                        "-0.0 and 0.0 for one value)", "if any value will do, use F.max or F.min",
                              category="value-order")
        self._agg(st, name, "only", arg)

    def _flag(self, st, name: str, e: T.Assignment, guard: Expr | None) -> None:
        """Boolean accumulators: any (`f = true` under a guard, `f |= c`, `f = f || c`) and all."""
        v = e.value
        if isinstance(v, T.Literal) and v.value in ("true", "false") and e.type == "=" and guard is not None:
            return self._agg(st, name, "any" if v.value == "true" else "all",
                             guard if v.value == "true" else BoolOp("boolean", "!", (guard,)))
        if guard is None and e.type in ("|=", "&="):
            return self._agg(st, name, "any" if e.type == "|=" else "all", self._expr(v))
        if guard is None and e.type == "=" and isinstance(v, T.BinaryOperation) and v.operator in ("||", "&&"):
            fn = "any" if v.operator == "||" else "all"
            if _is_ref(v.operandr, name):  # c || flag: c is evaluated for every value, as in Spark
                return self._agg(st, name, fn, self._expr(v.operandl))
            if _is_ref(v.operandl, name):  # flag || c: Java stops evaluating c once the flag is set
                c = self._expr(v.operandr)
                if any(not isinstance(x, (Col, Lit, Compare, BoolOp)) for x in walk(c)):
                    raise Unsupported(st, f"`{name} {v.operator} ...` skips the right side once decided; it computes "
                                          "something that may fail where Java never evaluated it",
                                      f"write it as `if (...) {name} = ...;` if every value may be evaluated")
                return self._agg(st, name, fn, c)
        raise Unsupported(st, f"update of the flag `{name}` is not a recognised any/all accumulator")

    def _compare_and_keep(self, st, body) -> bool:
        """`if (f(v) > acc) acc = f(v);` → max (min for <)."""
        c = st.condition
        if not (len(body) == 1 and isinstance(body[0], T.StatementExpression)
                and isinstance(body[0].expression, T.Assignment) and body[0].expression.type == "="
                and isinstance(body[0].expression.expressionl, T.MemberReference) and isinstance(c, T.BinaryOperation)):
            return False
        name = body[0].expression.expressionl.member
        op = c.operator
        if _is_ref(c.operandr, name):
            side = c.operandl
        elif _is_ref(c.operandl, name):
            side = c.operandr
            op = {"<": ">", ">": "<", "<=": ">=", ">=": "<="}.get(op, op)
        else:
            return False
        if op not in (">", ">=", "<", "<=") or name not in self.accs:
            return False
        val = self._expr(body[0].expression.value)
        if self._expr(side) != val:
            return False
        self._agg(st, name, ("max" if op in (">", ">=") else "min") + "_if", val)
        return True

    def _first_or_compare(self, st, body) -> bool:
        """`if (first || f(v) > acc) { acc = f(v); first = false; }` with `boolean first = true` read
        nowhere else: the first value starts the running max (min for <), so acc's initial value
        never counts (reduce() always has at least one value)."""
        c = st.condition
        if not (isinstance(c, T.BinaryOperation) and c.operator == "||" and len(body) == 2):
            return False
        flag = next((x for x in (c.operandl, c.operandr) if isinstance(x, T.MemberReference) and not x.qualifier
                     and not x.selectors and not x.prefix_operators and x.member in self.accs
                     and self.accs[x.member] == ("boolean", Lit("boolean", True))), None)
        drop = next((b for b in body if isinstance(b, T.StatementExpression) and isinstance(b.expression, T.Assignment)
                     and b.expression.type == "=" and flag is not None and _is_ref(b.expression.expressionl, flag.member)
                     and isinstance(b.expression.value, T.Literal) and b.expression.value.value == "false"), None)
        if flag is None or drop is None:
            return False
        uses = [n for _, n in self.method if isinstance(n, T.MemberReference) and n.member == flag.member
                and not n.qualifier]
        if len(uses) != 2:  # the test and `first = false` (the declaration is not a reference)
            return False
        test = T.IfStatement(condition=c.operandr if flag is c.operandl else c.operandl, then_statement=None)
        keep = [b for b in body if b is not drop]
        target = getattr(getattr(keep[0], "expression", None), "expressionl", None)
        # a NaN first value would stay the answer of a double max: that depends on the value order
        if self.accs.get(getattr(target, "member", None), ("?",))[0] not in ("int", "long") \
                or not self._compare_and_keep(test, keep):
            return False
        name = target.member
        self.aggs[name] = replace(self.aggs[name], init=None)
        self.accs.pop(flag.member)
        return True

    def _agg(self, st, name: str, fn: str, arg: Expr | None, guard: Expr | None = None) -> None:
        if name not in self.accs and name not in self.sets:
            raise Unsupported(st, f"`{name}` is updated in the loop but was not initialised before it")
        if name in self.aggs:
            raise Unsupported(st, f"`{name}` is updated twice per value")
        t, init = self.accs.get(name) or ("int", Lit("int", 0))
        if fn in ("any", "all"):
            pass
        elif fn == "only":
            if arg.jtype != t and not (arg.jtype in NUMERIC and t in NUMERIC and promote(arg.jtype, t) == t):
                raise Unsupported(st, f"`{name}` ({t}) is given a {arg.jtype}")
            arg = widen(arg, t) if arg.jtype != t else arg
        elif fn == "count_distinct":
            if arg.jtype != self.sets[name]:
                raise Unsupported(st, f"a {arg.jtype} added to a set of {self.sets[name]}")
        elif arg is not None and arg.jtype not in NUMERIC:
            raise Unsupported(st, f"aggregate over a {arg.jtype}")
        elif arg is not None and arg.jtype != t:
            if promote(arg.jtype, t) != t:
                self._narrowing_sum(st, name, fn, arg.jtype, t)  # the long sum is kept; wrap_int narrows it
            else:
                arg = widen(arg, t)
        if fn == "sum" and t == "float":
            raise Unsupported(st, f"`{name}` sums floats in float precision; Spark's sum of a float column "
                                  "works in double and would print other digits",
                              "decide whether the float rounding matters; if not, declare the sum a double")
        if guard is not None:  # a conditional update: sum of the value where it holds, count of the rows
            if fn == "sum":
                arg = Cond(t, guard, arg, Lit(t, 0))
            elif fn == "count":
                fn, arg = "count_if", guard
            else:
                raise Unsupported(st, f"{fn} under a condition")
        floating = t in ("double", "float")
        if fn in ("max_if", "min_if"):
            fn = (fn[:3] + "_nonnan") if floating else fn[:3]
        elif fn == "min" and floating:
            fn = "min_nan"  # Math.min returns NaN once any value is NaN
        a, b = node_lines(st)
        snippet = self.cls.file.lines[a - 1].strip() if a else ""
        self.aggs[name] = Agg(name, fn, arg, "int" if fn == "count_distinct" else t, init.value, Span(self.file, a, b), snippet)


    def _hides(self, name: str) -> None:
        """A local named like a field hides it from here on; the class's helpers still see the field."""
        if name in (self.scope.fields or {}):
            self.scope.shadowed.add(name)

    def _narrowing_sum(self, st, name: str, fn: str, arg_t: str, t: str) -> None:
        """`int sum += longValue` is `sum = (int) (sum + longValue)` (JLS 15.26.2): each step keeps the
        low 32 bits, and so does the low 32 bits of the whole long sum (arithmetic modulo 2^32), which
        the script computes. Narrowing from a floating value truncates at every step: declined."""
        if not (fn == "sum" and (arg_t, t) == ("long", "int")):
            raise Unsupported(st, f"compound assignment narrows a {arg_t} into the {t} `{name}`")
        line = node_lines(st)[0]
        self.scope.findings.append(Finding(
            "narrowing-assignment", Span(self.file, line, line),
            f"`{name} += ...` adds a long into the int `{name}`: Java keeps the low 32 bits after every addition "
            "(JLS 15.26.2), so a sum past 2147483647 wraps around to a negative number; the script does the same",
            f"if the sum may be large, declare `{name}` a long in Java and drop the wrap in the script; that changes "
            "the output"))


def _has_loop(st) -> bool:
    return any(isinstance(n, (T.ForStatement, T.WhileStatement, T.DoStatement)) for _, n in st)


def _block(st) -> list:
    if st is None:
        return []
    return list(st.statements) if isinstance(st, T.BlockStatement) else [st]


def _changed_name(e) -> str | None:
    """The plain name an expression statement assigns or increments, if any."""
    if isinstance(e, T.Assignment) and isinstance(e.expressionl, T.MemberReference):
        return e.expressionl.member
    if isinstance(e, T.Assignment) and isinstance(e.expressionl, T.This) and e.expressionl.selectors:
        return getattr(e.expressionl.selectors[0], "member", None)
    if isinstance(e, T.MemberReference) and {"++", "--"} & set((e.postfix_operators or []) + (e.prefix_operators or [])):
        return e.member
    return None


def _increments(e) -> bool:
    return (isinstance(e, T.MemberReference) and "++" in (e.postfix_operators or []) + (e.prefix_operators or [])) or \
        (isinstance(e, T.Assignment) and e.type == "+=" and getattr(e.value, "value", None) == "1")


def _is_one(e: Expr) -> bool:
    return isinstance(e, Lit) and e.value == 1


def _is_ref(n, name: str) -> bool:
    return isinstance(n, T.MemberReference) and n.member == name and not n.qualifier and not n.selectors


def _element(t) -> str:
    """The element type name of `List<E>`."""
    args = getattr(t, "arguments", None) or []
    return getattr(getattr(args[0], "type", None), "name", "") if len(args) == 1 else ""
