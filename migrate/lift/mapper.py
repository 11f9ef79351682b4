"""Lift a mapper's map() body: evaluate it symbolically into row steps and Emits.

Recognises: locals (→ columns), `if (c) return;` guards (→ filters), nested if/else (→
guarded emits), loops over StringTokenizer / split arrays (→ explode), `continue`, several
writes per record, `try {…} catch (NumberFormatException | ArrayIndexOutOfBoundsException)`
that skips the record (→ NULL-on-error + filter), Writable fields set and written,
`if (key.get() == 0) return;` on TextInputFormat (→ drop each file's first line).
Produces: Let / Filter / Explode / Project steps. Caveats: a statement it cannot prove it
understood stops the lift there and becomes a HandWork item; state across records,
cleanup() logic is hand work in this version; counters become Count steps (lift.counters).
"""
from __future__ import annotations

from dataclasses import dataclass, field, replace

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.writables import is_struct, structs_seen_from
from migrate.lift.exprs import (BYTE_OFFSET, CATCH_ALL, NARROWING, WRITABLE_OF, HelperClass, MaybeNull, Opaque, Refused, Scope,
                                Tokenizer, Unsupported, Writable, lift, lookup_key, map_lookup, promote, refined,
                                regex_object, text_params, widen_at, writable_creator, writable_set, write_argument)
from migrate.lift import dates
from migrate.lift import regex as rx
from migrate.lift.collections import ConstMap
from migrate.lift.combining import combining_update, map_fields
from migrate.lift.counters import counter_update, is_counter_call
from migrate.lower.walk import assigned_names, mentions
from migrate.plan import (NUMERIC, BoolOp, Call, Col, Compare, Count, Emit, Explode, Expr, Filter, Finding, HandWork,
                          Let, Lit, Lookup, Project, SideTable, Span, Step, StructNew, rewrite, walk)

SKIP_NOTE = "catch: skip the record"
_DECLARED = {"int": "int", "long": "long", "double": "double", "float": "float", "boolean": "boolean",
             "String": "String", "Integer": "int", "Long": "long", "Double": "double", "Date": "Date",
             "LocalDateTime": "LocalDateTime", "LocalDate": "LocalDate"}
LOG_RECEIVERS = {"System.out", "System.err", "LOG", "log", "logger", "LOGGER"}


@dataclass
class MapResult:
    """What lifting one map() produced."""

    steps: list[Step]
    hand_work: list[HandWork]
    skip_first_line: bool = False
    notes: list[str] = field(default_factory=list)
    combining: list[str] = field(default_factory=list)  # Map fields summed in map() and flushed in cleanup()
    tables: list[SideTable] = field(default_factory=list)  # side tables map() looks keys up in
    findings: list = field(default_factory=list)  # what the original does that a reviewer should know (plan.Finding)


def _and(a: Expr | None, b: Expr | None) -> Expr | None:
    if a is None:
        return b
    if b is None:
        return a
    return BoolOp("boolean", "&&", (a, b))


def _or(a: Expr | None, b: Expr | None) -> Expr | None:
    if a is None or b is None:
        return None if a is None and b is None else (a or b)
    return BoolOp("boolean", "||", (a, b))


def _not(a: Expr) -> Expr:
    if isinstance(a, BoolOp) and a.op == "!":
        return a.args[0]
    if isinstance(a, Call) and a.op in ("is_not_null", "is_null"):
        return Call("boolean", "is_null" if a.op == "is_not_null" else "is_not_null", a.args)
    if isinstance(a, Compare):
        flip = {"<": ">=", ">=": "<", ">": "<=", "<=": ">", "==": "!=", "!=": "=="}
        if a.left.jtype not in ("double", "float"):  # NaN makes !(a < b) differ from a >= b
            return Compare("boolean", flip[a.op], a.left, a.right)
    return BoolOp("boolean", "!", (a,))


def _has_null_on_error(e) -> list[Expr]:
    """Sub-expressions that become NULL where Java would have thrown (inside catch-and-skip)."""
    # an `or_default` gives its own value where its first argument is NULL (a helper's catch)
    inner = lambda x: (x.args[1],) if isinstance(x, Call) and x.op == "or_default" else None  # noqa: E731
    return [x for x in walk(e, inner) if isinstance(x, Call) and x.on_error == "null"]


def _conjuncts(e: Expr | None) -> list[Expr]:
    if e is None:
        return []
    if isinstance(e, BoolOp) and e.op == "&&":
        return [c for a in e.args for c in _conjuncts(a)]
    return [e]


def _implies(g: Expr | None, cond: Expr) -> bool:
    """Syntactic check that guard `g` implies `cond` (every conjunct of cond appears in g)."""
    have = _conjuncts(g)
    return all(c in have for c in _conjuncts(cond))


class _Stop(Exception):
    """Lifting stops: the rest of the body is unreachable (an unguarded return)."""


class _EndIteration(Exception):
    """An unguarded `continue`: the rest of this loop body is unreachable."""


class MapBodyLifter:
    """Symbolic evaluation of one map() method."""

    def __init__(self, cls: ClassInfo, method: T.MethodDeclaration, key_type: str, value_type: str, api: str,
                 index=None, settings: dict | None = None):
        self.cls, self.method, self.api, self.index = cls, method, api, index
        self.file = cls.file.path
        self.steps: list[Step] = []
        self.emit_list: list[Emit] = []
        self.hand: list[HandWork] = []
        self.notes: list[str] = []
        self.dead: Expr | None = None  # rows for which an earlier `return` already fired
        self.loop_depth = 0
        self.after_loop = False
        self.caught: frozenset[str] = frozenset()
        self.in_try_emitted = False
        self.skip_first_line = False
        self.columns = {"value"}
        self.loop_locals: list[set[str]] = []
        self.loop_writes: list[int] = []  # per enclosing loop: how many writes came before its body
        self.loop_starts: list[int] = []  # per enclosing loop: the index of its Explode step
        self.loop_breaks: list[list[Expr]] = []  # per enclosing loop: where each `break` fires (per element)
        self.loop_returns = False  # a `return` inside the loop being lifted (it ends the loop and the record)
        self.returned_in_loop = False  # ... in a loop already lifted: nothing after that loop may run
        self.if_nodes: list = []  # enclosing if statements (for comments on the filters they become)
        self.field_names = {d.name for f in cls.fields() for d in f.declarators}
        self.map_fields = map_fields(cls)
        self.combining: set[str] = set()  # Map fields used for in-mapper combining
        self.locals: set[str] = set()
        self.declared: list[set[str]] = []  # per enclosing block: the locals declared in it
        env: dict[str, object] = {}
        env.update(class_constants(cls, index))
        env.update(struct_fields(cls, index))  # custom key/value objects reused through setters
        env.update(settings or {})  # fields set once per task from the job configuration
        fields = dict(env)  # what a helper method of the class reads
        params = [p.name for p in method.parameters]
        self.key_param = params[0] if params else None
        if len(params) >= 2:  # a line (Text), or a chained mapper's input value
            env[params[1]] = Col(value_type, "value") if value_type != "null" else Opaque("a NullWritable")
        if key_type == "unknown" and params:
            env[params[0]] = Opaque("the key that the input format (not converted) reads")
        elif key_type not in ("offset", "null") and params:  # KeyValueTextInputFormat's key, or a chained mapper's
            env[params[0]] = Col(key_type, "key")
            self.columns.add("key")
        elif params and key_type == "offset":  # TextInputFormat's key: the line's byte offset in its file
            env[params[0]] = Col("long", BYTE_OFFSET)
        elif params:
            env[params[0]] = Opaque("a NullWritable")
        self.key_is_offset = key_type == "offset"
        self.emit_target = params[2] if len(params) >= 3 else None
        for p in params[2:]:
            env[p] = Opaque("the task context")
        self.scope = Scope(env, file=self.file, methods=helper_methods(cls, index),
                           enums=frozenset(fq.rsplit(".", 1)[-1] for fq in (index.enums if index else {})),
                           structs=structs_seen_from(cls, index), lookup=self._lookup, fields=fields,
                           shadowed=set(params) & set(fields), classes=repository_classes(cls, index),
                           resolve=type_resolver(cls, index), texts=text_params(method))
        self.guard_now: Expr | None = None  # the guard of the statement being lifted
        self.lookups: dict[tuple[str, Expr], Col] = {}
        self.tables: dict[str, SideTable] = {}
        self.tree_map = None  # a TreeMap field filled per map task (lift.topn), read when map() touches it
        self.tree_map_refused: tuple[set[str], Unsupported] | None = None  # why a TreeMap field is not one
        from migrate.lift.topn import SORTED_MAPS, task_tree_map  # topn reads class constants from here

        sorted_maps = {d.name for f in cls.fields() if getattr(f.type, "name", "") in SORTED_MAPS for d in f.declarators}
        if sorted_maps:

            try:
                self.tree_map = task_tree_map(cls)
            except Unsupported as u:
                self.tree_map_refused = sorted_maps, u

    # ------------------------------------------------------------------ driving
    def run(self, body=None, where=None) -> MapResult:
        """Lift map()'s body (or `body`, statements standing for one record, at `where`)."""
        where = where if where is not None else self.method
        try:
            self._block(self.method.body or [] if body is None else body, None)
        except _Stop:
            pass
        except Unsupported as u:
            self._hand("map-logic", u.line or self._line(where), u.reason, u.suggestion or
                       "express this step with pyspark.sql.functions by hand")
        if not self.hand and self.tree_map is not None and self.tree_map.put is not None and body is None:
            from migrate.lift.topn import lift_task_top_n

            try:
                self.steps.append(lift_task_top_n(self.cls, self.tree_map, self.emit_list, self.index))
            except Unsupported as u:
                self._hand("task-state", u.line or self._line(where), u.reason, u.suggestion or
                           "Window.partitionBy(task).orderBy(...) with row_number() <= N")
        elif not self.hand:
            if not self.emit_list and body is None and not self.method.body:
                self._hand("map-logic", self._line(where), "map() is empty: the original writes no map output, so "
                           "the job's output is empty; the code looks unfinished",
                           "find the intended mapper before migrating; an empty job needs no script")
            elif not self.emit_list:
                self._hand("map-logic", self._line(where), "map() writes nothing the converter could follow",
                           "check what the mapper emits and write the select by hand")
            else:
                self.steps.append(Project(self._span(where), "map output", tuple(self.emit_list)))
        notes = self.notes + [n for n in self.scope.notes if n not in self.notes]
        return MapResult(self.steps, self.hand, self.skip_first_line, notes, sorted(self.combining),
                         list(self.tables.values()), list(dict.fromkeys(self.scope.findings)))

    def _hand(self, category: str, line: int, reason: str, suggestion: str, profile: str = "P1") -> None:
        snippet = self.cls.file.lines[line - 1].strip() if 0 < line <= len(self.cls.file.lines) else ""
        self.hand.append(HandWork(category, Span(self.file, line, line), reason, suggestion, snippet, profile))

    def _line(self, node) -> int:
        return node_lines(node)[0]

    def _span(self, node) -> Span:
        a, b = node_lines(node)
        return Span(self.file, a, b)

    def _note(self, node) -> str:
        a, _ = node_lines(node)
        text = self.cls.file.lines[a - 1].strip() if a else ""
        return text if len(text) <= 90 else text[:87] + "..."

    def _eff(self, guard: Expr | None) -> Expr | None:
        return _and(guard, _not(self.dead)) if self.dead is not None else guard

    # ------------------------------------------------------------------ statements
    def _block(self, stmts, guard: Expr | None) -> None:
        stmts = list(stmts or [])
        for i, s in enumerate(stmts):
            if isinstance(s, T.TryStatement):
                self._try(s, guard, rest=stmts[i + 1 :])
            else:
                self._stmt(s, guard)

    def _stmt(self, s, guard: Expr | None) -> None:
        if self.returned_in_loop:
            raise Unsupported(s, "a statement after a loop that may return from map() in it is not lifted",
                              "move it before the loop, or guard it by hand")
        self.guard_now = guard
        pending = self._unattempted()
        try:
            self._statement(s, guard)
        finally:
            self._attempted_under(pending, guard)

    def _unattempted(self) -> list[rx.MatcherVar]:
        return [v for v in self.scope.env.values() if isinstance(v, rx.MatcherVar) and v.how is None]

    def _attempted_under(self, pending: list, guard) -> None:
        """A match attempt made on some rows only: group() on the other rows throws in Java."""
        g = self._eff(guard)
        for v in pending:
            if v.how is not None and not v.guarded:
                v.matched, v.guarded = (_and(g, v.matched) if g is not None else v.matched), True

    def _expr(self, node) -> Expr:
        return lift(node, self.scope)

    def _statement(self, s, guard: Expr | None) -> None:
        if self.tree_map is not None and (isinstance(s, T.StatementExpression) and self.tree_map._touches(s) or
                                          isinstance(s, T.IfStatement) and self.tree_map._touches(s.condition)):
            if self.loop_locals:
                raise Unsupported(s, f"the TreeMap `{self.tree_map.name}` is filled inside a loop",
                                  "Window.partitionBy(task).orderBy(...) with row_number() <= N")
            self.tree_map.statement(s, self._eff(guard), self)
            return
        if self.tree_map_refused is not None and any(mentions(s, name) for name in self.tree_map_refused[0]):
            raise self.tree_map_refused[1]
        if isinstance(s, T.BlockStatement):
            self._scoped(s.statements, guard)
        elif isinstance(s, T.LocalVariableDeclaration):
            for d in s.declarators:
                self._declare(s, d, guard)
        elif isinstance(s, T.StatementExpression):
            self._expression_statement(s, guard)
        elif isinstance(s, T.IfStatement):
            self._if(s, guard)
        elif isinstance(s, (T.ReturnStatement, T.ContinueStatement, T.BreakStatement)):
            self._exit(s, guard)
        elif isinstance(s, T.WhileStatement):
            self._while(s, guard)
        elif isinstance(s, T.ForStatement):
            self._for(s, guard)
        elif isinstance(s, T.TryStatement):
            self._try(s, guard, rest=[])
        elif type(s).__name__ == "Statement":  # a lone `;`
            return
        else:
            raise Unsupported(s, f"{type(s).__name__.replace('Statement', '').lower() or 'this'} statement is not lifted yet")

    def _scoped(self, stmts, guard) -> None:
        before = dict(self.scope.env)
        shadowed = set(self.scope.shadowed)
        self.declared.append(set())
        try:
            self._block(stmts, guard)
        finally:  # names declared in the block go out of scope, also when it ends early
            for name in set(self.scope.env) - set(before):
                del self.scope.env[name]
            for name in self.declared.pop() & set(before):  # a local that hid a field: the field again
                self.scope.env[name] = before[name]
            self.scope.shadowed.clear()
            self.scope.shadowed.update(shadowed)

    def _fresh(self, name: str) -> str:
        n, i = name, 2
        while n in self.columns:
            n, i = f"{name}_{i}", i + 1
        self.columns.add(n)
        return n

    def _declare(self, s, d, guard) -> None:
        self.locals.add(d.name)
        if self.declared:
            self.declared[-1].add(d.name)
        if d.name in (self.scope.fields or {}):  # a local hiding a field (javac allows it)
            self.scope.shadowed.add(d.name)
        tname = getattr(s.type, "name", "")
        dims = len(getattr(s.type, "dimensions", None) or []) + len(d.dimensions or [])
        if d.initializer is None:
            declared = _DECLARED.get(tname)
            if declared is None or dims:
                raise Unsupported(s, f"`{d.name}` of type {tname} is declared without a value")
            self.scope.env[d.name] = Lit(declared, None)  # Java's definite assignment sets it before any read
            if self.loop_locals:
                self.loop_locals[-1].add(d.name)
            return
        init = d.initializer
        if tname in ("Pattern", "Matcher", "java.util.regex.Pattern", "java.util.regex.Matcher"):
            obj = regex_object(init, self.scope)
            if not isinstance(obj, (rx.CompiledPattern, rx.MatcherVar)):
                raise Unsupported(s, f"`{d.name}` holds a {tname} the converter does not follow")
            self.scope.env[d.name] = replace(obj, name=obj.name or d.name) if isinstance(obj, rx.CompiledPattern) \
                else obj
            return
        if tname == "StringTokenizer" and isinstance(init, T.ClassCreator):
            self.scope.env[d.name] = Tokenizer(self._tokens(init))
            return
        if tname in WRITABLE_OF and isinstance(init, T.ClassCreator):
            self.scope.env[d.name] = writable_creator(init, self.scope)
            return
        if tname in self.scope.structs:  # a custom key or value object: a value that setters change
            self.scope.env[d.name] = struct_holder(init, self.scope, s)
            return
        table = self.scope.env.get(init.qualifier) if isinstance(init, T.MethodInvocation) else None
        if isinstance(table, SideTable) and init.member == "get" and not init.selectors:
            self._declare_lookup(s, d, table, tname)
            return
        if isinstance(table, ConstMap) and init.member == "get" and not init.selectors and len(init.arguments) == 1:
            if tname not in ("String", "Integer", "Long") or _DECLARED.get(tname) != table.value_type:
                raise Unsupported(s, f"`{d.name}` is a {tname}: a missing key would be unboxed (NullPointerException)"
                                     if tname in ("int", "long") else f"`{d.name}` of type {tname} from {table.name}",
                                  "use getOrDefault with a default, or declare the local as the map's value type")
            value = map_lookup(table, init.arguments[0], self.scope, s, Lit(table.value_type, None))
            self.scope.env[d.name] = MaybeNull(value, f"a value of the constant map {table.name}, null where the "
                                                      "key is missing")
            if self.loop_locals:
                self.loop_locals[-1].add(d.name)
            return
        made = date_object(init, s)
        if made is not None:
            self.scope.env[d.name] = made
            return
        e = lift(init, self.scope)
        declared = _DECLARED.get(tname)
        if tname == "var" and (e.jtype in _DECLARED.values() or e.jtype == "String[]"):
            declared, dims = e.jtype, 0  # javac gives `var` the initializer's type
        if declared is None:
            raise Unsupported(s, f"local of type {tname} is not lifted")
        if dims:
            declared += "[]"
        if e.jtype != declared:
            e = widen_at(e, declared, self.scope, s)
        if self.loop_locals:
            self.loop_locals[-1].add(d.name)
        if isinstance(e, (Col, Lit)) and not _has_null_on_error(e):
            self.scope.env[d.name] = e
            return
        self._let(d.name, e, guard, s)

    def _declare_lookup(self, s, d, table: SideTable, tname: str) -> None:
        """`String v = table.get(key);`: v is NULL where the key is missing, and only null tests may read it."""
        if table.kind != "map" or len(d.initializer.arguments or []) != 1:
            raise Unsupported(s, f"{table.field}.get(...) with other than one key")
        if _DECLARED.get(tname) != table.value_type or tname not in ("String", "Integer", "Long", "Double"):
            raise Unsupported(s, f"`{d.name}` is a {tname}: a missing key would be unboxed (NullPointerException)"
                                 if tname in ("int", "long", "double") else f"`{d.name}` of type {tname} from a side table",
                              "use getOrDefault with a default, or declare the local as the table's value type")
        key = lookup_key(table, d.initializer.arguments[0], self.scope, s)
        self.scope.env[d.name] = MaybeNull(self._lookup(table, key, d.initializer, (), name=d.name))
        if self.loop_locals:
            self.loop_locals[-1].add(d.name)

    def _lookup(self, table: SideTable, key: Expr, node, conditions: tuple, name: str | None = None) -> Col:
        """A Lookup step for `key` (NULL where the statement or expression would not have run)."""
        g = self._eff(self.guard_now)
        for c in conditions:
            g = _and(g, c)
        k = key if g is None else Call(key.jtype, "guarded", (g, key))
        if (table.name, k) not in self.lookups:
            col = self._fresh(name or f"{table.name}_found")
            self.steps.append(Lookup(self._span(node), self._note(node), col, table.name, k))
            self.lookups[(table.name, k)] = Col(table.value_type or "boolean", col)
            self.tables[table.name] = table
        return self.lookups[(table.name, k)]

    def _let(self, name: str, e: Expr, guard, node, reuse: str | None = None) -> None:
        g = self._eff(guard)
        col = reuse or self._fresh(name)
        risky = _has_null_on_error(e)
        if risky and self.in_try_emitted:
            raise Unsupported(node, "a value that may throw is computed after a write in the same try block")
        self.steps.append(Let(self._span(node), self._note(node), col, e if g is None else Call(e.jtype, "guarded", (g, e))))
        self.scope.defs[col] = e
        self.scope.env[name] = Col(e.jtype, col)
        if risky:
            present = Call("boolean", "is_not_null", (Col(e.jtype, col),))
            self.steps.append(Filter(self._span(node), SKIP_NOTE, present if g is None else _or(_not(g), present)))

    def _tokens(self, creator: T.ClassCreator) -> Expr:
        args = [lift(a, self.scope) for a in creator.arguments or []]
        if not args or args[0].jtype != "String":
            raise Unsupported(creator, "StringTokenizer over something that is not a String")
        if len(args) == 1:
            return Call("String[]", "tokens", (args[0],))
        if len(args) == 2 and isinstance(args[1], Lit) and args[1].jtype == "String":
            return Call("String[]", "tokens", (args[0], args[1]))
        raise Unsupported(creator, "StringTokenizer with returnDelims or computed delimiters")

    def _expression_statement(self, s: T.StatementExpression, guard) -> None:
        e = s.expression
        if isinstance(e, T.MethodInvocation):
            q, m = e.qualifier or "", e.member
            if q == self.emit_target and m in ("write", "collect"):
                return self._emit(s, e, guard)
            if q in LOG_RECEIVERS or q.split(".")[0] in ("System",) and m.startswith("print"):
                self.notes.append(f"{self.file}:{self._line(s)} logging call `{q}.{m}` is not carried over")
                return
            update = combining_update(e, self.map_fields)
            if update is not None:
                k, v = (lift(x, self.scope) for x in update)
                self.combining.add(q)
                self.emit_list.append(Emit(self._span(s), self._note(s) + "  (in-mapper combining)", k, v,
                                           self._eff(guard)))
                return
            if is_counter_call(e):
                cu = counter_update(e, self.scope, self.cls, self.index)
                self.steps.append(Count(self._span(s), self._note(s), cu.group, cu.name, self._eff(guard), cu.amount))
                return
            if m in ("progress", "setStatus"):
                return
            tok = self.scope.env.get(q)
            if isinstance(tok, Tokenizer) and m in ("nextToken", "nextElement") and tok.taken is not None:
                # a token skipped: the cursor moves on. Where none is left Java throws, which an unused
                # column cannot reproduce, so the statement must run only where hasMoreTokens() held.
                has = Compare("boolean", ">", Call("int", "size", (tok.tokens,)), Lit("int", tok.taken))
                if not _implies(self._eff(guard), has) and tok.current is None:
                    raise Unsupported(s, "a token skipped with nextToken() where there may be none (Java throws)",
                                      "test hasMoreTokens() first, or split the line and index the array")
                lift(e, self.scope)
                return
            target = self.scope.env.get(q)
            if isinstance(target, dates.DateFormat) and m == "setLenient" and len(e.arguments) == 1:
                raise Unsupported(s, "setLenient() inside map() changes the parser between records")
            if isinstance(target, dates.CalendarVar) and m == "setTime" and len(e.arguments) == 1:
                d = lift(e.arguments[0], self.scope)
                if d.jtype != "Date" or self._eff(guard) is not None:
                    raise Unsupported(s, "Calendar.setTime of something other than a Date, or under a condition")
                target.date = d
                return
            if isinstance(self.scope.env.get(q), Writable) and is_struct(self.scope.env[q].kind):
                return self._struct_setter(s, e, self.scope.env[q], guard)
            if q in self.scope.env and isinstance(self.scope.env[q], Writable) and m == "set" and len(e.arguments) == 1:
                w = self.scope.env[q]
                new = writable_set(w, lift(e.arguments[0], self.scope), e)
                g = self._eff(guard)
                w.content = new if g is None or w.content is None else Call(new.jtype, "if_else", (g, new, w.content))
                if g is None:
                    w.set_this_record, w.set_only_if = True, None
                elif w.field and not w.set_this_record:
                    w.set_only_if = _or(w.set_only_if, g) if w.set_only_if is not None else g
                return
            raise Unsupported(s, f"call `{(q + '.') if q else ''}{m}(...)` as a statement is not lifted",
                              "if it only has side effects outside the output, drop it by hand; otherwise rewrite it")
        if isinstance(e, T.Assignment):
            return self._assign(s, e, guard)
        if isinstance(e, T.MemberReference) and (e.postfix_operators or e.prefix_operators):
            ops = (e.postfix_operators or []) + (e.prefix_operators or [])
            one = T.Literal(value="1")
            fake = T.BinaryOperation(operator="+" if "++" in ops else "-", operandl=T.MemberReference(member=e.member, qualifier=e.qualifier, selectors=[], prefix_operators=[], postfix_operators=[]), operandr=one)
            return self._assign_value(s, e.member, fake, guard)
        raise Unsupported(s, "expression statement is not lifted")

    def _struct_setter(self, s, call: T.MethodInvocation, w: Writable, guard) -> None:
        """`key.setFirst(x)` on a custom Writable: its content with the setter's fields replaced."""
        info = self.scope.structs[w.kind]
        new = info.setter(w.content, call.member, [lift(a, self.scope) for a in call.arguments], call, self.scope)
        g = self._eff(guard)
        q = call.qualifier
        if self.loop_depth and q not in self.loop_locals[-1] and (g is not None or len(self.emit_list) > self.loop_writes[-1]):
            # the object outlives one iteration: what a later iteration writes depends on this one
            raise Unsupported(s, f"`{q}` is set inside a loop {'under a condition' if g is not None else 'after a write'}: "
                                 "the next iteration writes what this one left in it",
                              "set every field before each write, or make a new object in the loop")
        assigned = info.assigned_by(call.member, len(call.arguments))
        if g is not None:  # where g does not hold, the object keeps what it had (a field: the last record's)
            new = StructNew(new.jtype, tuple((f, v if v == old else Call(v.jtype, "if_else", (g, v, old)))
                                             for (f, v), (_, old) in zip(new.items, w.content.items)))
            for f in assigned - w.fields_set:
                w.fields_guard[f] = _or(w.fields_guard[f], g) if f in w.fields_guard else g
        else:
            w.fields_set |= assigned
        w.content = new

    def _assign(self, s, e: T.Assignment, guard) -> None:
        target = e.expressionl
        if not isinstance(target, T.MemberReference) or target.qualifier not in ("", None) or target.selectors:
            raise Unsupported(s, "assignment to something other than a local variable")
        if e.type == "=":
            value = e.value
        else:
            op = e.type[:-1]
            value = T.BinaryOperation(operator=op, operandl=T.MemberReference(member=target.member, qualifier="", selectors=[], prefix_operators=[], postfix_operators=[]), operandr=e.value)
        self._assign_value(s, target.member, value, guard)

    def _assign_value(self, s, name: str, value_node, guard) -> None:
        old = self._assignable(s, name)
        new = lift(value_node, self.scope)
        if old.jtype != "null":
            new = self._narrowed(s, name, new, old.jtype) if new.jtype in NUMERIC and old.jtype in NUMERIC \
                and promote(new.jtype, old.jtype) != old.jtype else widen_at(new, old.jtype, self.scope, s)
        self._store(s, name, new, guard)

    def _assignable(self, s, name: str) -> Expr:
        """The value of the local `name`, which `s` may assign (else Unsupported)."""
        if name in self.field_names and name not in self.locals:
            raise Unsupported(s, f"assignment to the field `{name}`: a field keeps state across records",
                              "per-record state is fine; state across records needs a window or an aggregation")
        old = self.scope.env.get(name)
        if isinstance(old, MaybeNull):  # `if (v == null) v = "other";`: a value where the lookup had none
            old = old.value
        if not isinstance(old, (Col, Lit, Call)):
            raise Unsupported(s, f"assignment to `{name}`, which is not a local the converter follows "
                                 "(a field keeps state across records)",
                              "per-record state is fine; state across records needs a window or an aggregation")
        if self.loop_locals and name not in set().union(*self.loop_locals) and self.loop_depth:
            raise Unsupported(s, f"`{name}` is carried from one loop iteration to the next",
                              "an aggregate over the exploded rows (F.aggregate, or groupBy) can replace the loop")
        return old

    def _store(self, s, name: str, new: Expr, guard) -> None:
        """Give the local `name` a new value (under the guard: where it does not hold, the old one)."""
        held = self.scope.env[name]
        old = held.value if isinstance(held, MaybeNull) else held
        g = self._eff(guard)
        value = new if g is None else Call(new.jtype, "if_else", (g, new, old))
        if g is not None and g == Call("boolean", "is_null", (old,)):  # `if (v == null) v = d;`
            value = Call(new.jtype, "or_default", (old, new))
        reuse = old.name if isinstance(old, Col) and old.name not in ("value", "key") and not isinstance(value, Col) else None
        saved = self.dead
        self.dead = None  # the guard is already inside `value`
        try:
            self._let(name, value, None, s, reuse=reuse)
        finally:
            self.dead = saved
        if isinstance(held, MaybeNull) and g is not None and g != Call("boolean", "is_null", (old,)):
            self.scope.env[name] = MaybeNull(self.scope.env[name], held.what)  # still null on some rows

    def _narrowed(self, s, name: str, new: Expr, t: str) -> Expr:
        """`x += v` where v is wider than x is `x = (T) (x + v)` (JLS 15.26.2): the cast is Java's,
        with its wrap-around or truncation; raised as a finding."""
        line = node_lines(s)[0]
        self.scope.findings.append(Finding(
            "narrowing-assignment", Span(self.file, line, line),
            f"a compound assignment stores a {new.jtype} into the {t} `{name}`: Java casts the result back to "
            f"{t} (JLS 15.26.2), {'keeping the low 32 bits' if new.jtype == 'long' else 'truncating toward zero'}"
            "; the script does the same", f"declare `{name}` a {new.jtype} if the cast was not meant"))
        return Call(t, NARROWING[(new.jtype, t)], (new,))

    def _emit(self, s, call: T.MethodInvocation, guard) -> None:
        if self.after_loop:
            raise Unsupported(s, "a write after a token loop would repeat once per token in the DataFrame version")
        if len(call.arguments) != 2:
            raise Unsupported(s, "write with other than two arguments")
        g = self._eff(guard)
        for a in call.arguments:
            w = self.scope.env.get(a.member) if isinstance(a, T.MemberReference) and not a.qualifier else None
            if isinstance(w, Writable) and w.set_only_if is not None and not _implies(g, w.set_only_if):
                raise Unsupported(s, f"`{a.member}` is a field set only under a condition; where it is not set, "
                                     "Hadoop writes the value left from the previous record",
                                  "set it on every path, or write a new Writable")
        for a in call.arguments:
            w = self.scope.env.get(a.member) if isinstance(a, T.MemberReference) and not a.qualifier else None
            if isinstance(w, Writable) and is_struct(w.kind):
                check_struct_written(w, a.member, s, self.method, self.scope.structs[w.kind], g)
        k, v = (write_argument(a, self.scope) for a in call.arguments)
        for side in (k, v):
            for risky in _has_null_on_error(side) if side is not None else []:
                g = _and(g, Call("boolean", "is_not_null", (risky,)))
        if self.caught:
            self.in_try_emitted = True
        self.emit_list.append(Emit(self._span(s), self._note(s), k, v, g))

    def _if(self, s: T.IfStatement, guard) -> None:
        if self._is_first_line_check(s):
            return
        pending = self._unattempted()
        c = lift(s.condition, self.scope)
        self._attempted_under(pending, guard)
        if c.jtype != "boolean":
            raise Unsupported(s, "if condition is not a boolean")
        then_env, else_env = refined(s.condition, self.scope.env)
        self._proved_matches(c, then_env, else_env)
        self.if_nodes.append(s)
        toks = {n: t for n, t in self.scope.env.items() if isinstance(t, Tokenizer)}
        before = {n: t.taken for n, t in toks.items()}
        try:
            self._branch(s.then_statement, _and(guard, c), then_env)
            after_then = {n: t.taken for n, t in toks.items()}
            for n, t in toks.items():
                t.taken = before[n]
            if s.else_statement is not None:
                self._branch(s.else_statement, _and(guard, _not(c)), else_env)
        finally:
            self.if_nodes.pop()
        for n, t in toks.items():  # tokens taken on one path only: the cursor is unknown after the if
            if self._leaves(s.then_statement):
                continue
            if s.else_statement is not None and self._leaves(s.else_statement):
                t.taken = after_then[n]
            elif t.taken != after_then[n]:
                t.taken = None
        if s.else_statement is None and self._leaves(s.then_statement):
            for name, v in else_env.items():  # `if (x == null) return;`: below it x holds a value
                if isinstance(self.scope.env.get(name), MaybeNull) and not isinstance(v, MaybeNull) \
                        or isinstance(v, rx.MatcherVar) and v.proved:  # `if (!m.matches()) return;`
                    self.scope.env[name] = v

    def _proved_matches(self, c: Expr, then_env: dict, else_env: dict) -> None:
        """`if (m.find())`: in the branch the match is known to have succeeded, and group() needs
        no check (and `if (!m.find())`: in the else branch, or below it when the branch returns)."""
        for name, v in self.scope.env.items():
            if isinstance(v, rx.MatcherVar) and v.attempt is not None and not v.proved:
                if c == v.attempt:
                    then_env[name] = replace(v, proved=True)
                elif c == BoolOp("boolean", "!", (v.attempt,)):
                    else_env[name] = replace(v, proved=True)

    def _find_loop(self, s: T.WhileStatement, guard, mv: rx.MatcherVar) -> None:
        """`while (m.find()) { ... m.group(k) ... }`: one row per match (regexp_extract_all walks the
        matches as repeated find() calls do), for the one group the body reads."""
        name = s.condition.qualifier
        if mv.how is not None:
            raise Unsupported(s, "a find() loop after an earlier match attempt on the same Matcher")
        reads = [n for _, n in s.body if isinstance(n, T.MethodInvocation) and n.qualifier == name]
        if any(n.member != "group" for n in reads):
            raise Unsupported(s, f"the loop calls {name}.{next(n.member for n in reads if n.member != 'group')}() "
                                 "on the Matcher it walks")
        groups = {0 if not n.arguments else int(n.arguments[0].value)
                  if isinstance(n.arguments[0], T.Literal) and n.arguments[0].value.isdigit() else None for n in reads}
        if len(groups) > 1 or None in groups:
            raise Unsupported(s, "a find() loop reading several groups (or a computed group) of each match",
                              "F.arrays_zip of one F.regexp_extract_all per group, then explode")
        k = groups.pop() if groups else 0
        rx.check_group(mv.pattern, k, s, Unsupported)
        array = Call("String[]", "regex_matches", (mv.subject, rx.applied(mv.pattern, "find"), Lit("int", k)))
        saved_dead = self.dead
        col, stmts = self._loop(s, guard, array, "match", s.body)
        current = Col("String", col)
        self.scope.env[name] = replace(mv, current=current)
        try:
            self._loop_body(stmts)
        finally:
            broke = bool(self.loop_breaks and self.loop_breaks[-1])
            # find() returned false: no match to read; after a break it holds the match it broke on
            self.scope.env[name] = Opaque(f"the Matcher `{name}` after a loop that may break") if broke \
                else replace(mv, spent=True)
            self._end_loop(saved_dead)

    def _leaves(self, stmt) -> bool:
        """The branch always ends the record (`return`), or this loop iteration where that is the scope."""
        last = stmt.statements[-1] if isinstance(stmt, T.BlockStatement) and stmt.statements else stmt
        return isinstance(last, T.ReturnStatement) or (isinstance(last, T.ContinueStatement) and not self.loop_depth)

    def _branch(self, stmt, guard, env: dict | None = None) -> None:
        known = {n: v for n, v in (env or {}).items() if self.scope.env.get(n) is not v}
        before = {n: self.scope.env[n] for n in known}
        self.scope.env.update(known)  # a local tested for null holds its value in this branch
        try:
            self._scoped(stmt.statements if isinstance(stmt, T.BlockStatement) else [stmt], guard)
        finally:
            self.scope.env.update(before)

    def _is_first_line_check(self, s: T.IfStatement) -> bool:
        """`if (key.get() == 0) return;` on TextInputFormat: skip the first line of every file."""
        c = s.condition
        body = s.then_statement
        stmts = body.statements if isinstance(body, T.BlockStatement) else [body]
        if not (isinstance(c, T.BinaryOperation) and c.operator == "==" and len(stmts) == 1
                and isinstance(stmts[0], T.ReturnStatement) and s.else_statement is None):
            return False
        left, right = c.operandl, c.operandr
        is_key = isinstance(left, T.MethodInvocation) and left.qualifier == self.key_param and left.member == "get"
        is_zero = isinstance(right, T.Literal) and right.value.rstrip("lL") == "0"
        if not (is_key and is_zero and self.key_is_offset):
            return False
        if self.steps or self.emit_list or self.dead is not None:
            raise Unsupported(s, "the first-line check is not the first thing map() does")
        self.skip_first_line = True
        return True

    def _exit(self, s, guard) -> None:
        g = self._eff(guard)
        is_continue = isinstance(s, (T.ContinueStatement, T.BreakStatement))  # a break ends this iteration too
        if isinstance(s, T.BreakStatement):
            self._break(s, g)
        if isinstance(s, T.ReturnStatement) and self.loop_depth:
            if self.loop_depth > 1:
                raise Unsupported(s, "return inside nested loops ends them all; rows per token cannot express that")
            # the loop's last pass, and nothing after the loop may run (_stmt refuses it)
            self._break(s, g)
            self.loop_returns = True
            is_continue = True
        if is_continue and not self.loop_depth:
            raise Unsupported(s, "continue outside a loop")
        if g is None:
            raise _EndIteration() if is_continue else _Stop()
        if not self.emit_list:  # nothing written yet for this row: dropping it is exact
            where = self.if_nodes[-1] if self.if_nodes else s
            self.steps.append(Filter(self._span(where), self._note(where), _not(g)))
        else:
            self.dead = _or(self.dead, g)

    def _break(self, s: T.BreakStatement, g: Expr | None) -> None:
        """`break` under the guard g: the loop visits the elements up to the first one where g holds
        (and that element's row survived the filters before the break). The test runs per element
        before the rows are exploded, so it is g with this iteration's locals spelled out."""
        if not self.loop_depth:
            raise Unsupported(s, "break outside a loop (a switch is not lifted)")
        if getattr(s, "goto", None):
            raise Unsupported(s, f"a break to the label `{s.goto}` is not lifted")
        start = self.loop_starts[-1]
        fires = g if g is not None else Lit("boolean", True)
        inner: set[str] = set()
        element = self.steps[start].name
        for st in self.steps[start + 1:]:
            if isinstance(st, Let):
                if st.name in inner | {element}:  # a column given a new value: its earlier readers saw the old one
                    raise Unsupported(s, f"a break after `{st.name}` changed in the same iteration is not lifted")
                inner.add(st.name)
            elif isinstance(st, Filter):
                fires = _and(st.cond, fires)
            elif not isinstance(st, Count):
                raise Unsupported(s, "a break after a side-table lookup or an inner loop in the same iteration")

        def spelled_out(x: Expr, within: frozenset = frozenset()) -> Expr | None:
            if isinstance(x, Col) and x.name in inner:
                if x.name not in self.scope.defs or x.name in within:  # unknown, or defined by its old value
                    raise Unsupported(s, f"the break depends on `{x.name}`, which the converter cannot spell out "
                                         "per element (a local changed in the same iteration)")
                return rewrite(self.scope.defs[x.name], lambda y: spelled_out(y, within | {x.name}))
            return None
        self.loop_breaks[-1].append(rewrite(fires, spelled_out))

    def _loop(self, s, guard, array: Expr, var: str, body) -> tuple[str, list]:
        """Start a loop over `array`: filter by the guard, explode, return the column and the body."""
        if self.emit_list:
            raise Unsupported(s, "a loop after a write: exploding the rows would repeat the earlier write")
        g = self._eff(guard)
        if g is not None:
            self.steps.append(Filter(self._span(s), "loop guard", g))
        col = self._fresh(var)
        self.steps.append(Explode(self._span(s), self._note(s), col, array))
        for t in self.scope.env.values():  # a token taken inside the loop is taken once per row
            if isinstance(t, Tokenizer):
                t.taken = None
        self.dead = None
        self.loop_depth += 1
        self.loop_locals.append(set())
        self.loop_writes.append(len(self.emit_list))
        self.loop_starts.append(len(self.steps) - 1)
        self.loop_breaks.append([])
        return col, (body.statements if isinstance(body, T.BlockStatement) else [body])

    def _loop_body(self, stmts) -> None:
        try:
            self._scoped(stmts, None)
        except _EndIteration:
            pass

    def _end_loop(self, saved_dead) -> None:
        self.loop_depth -= 1
        self.loop_locals.pop()
        self.loop_writes.pop()
        start, breaks = self.loop_starts.pop(), self.loop_breaks.pop()
        if self.loop_returns and not self.loop_depth:
            self.loop_returns, self.returned_in_loop = False, True
        if breaks:  # explode only the elements the loop reaches: up to the first that breaks
            ex = self.steps[start]
            fires = breaks[0]
            for b in breaks[1:]:
                fires = _or(fires, b)
            self.steps[start] = replace(ex, note=ex.note + "  (up to the first element that breaks the loop)",
                                        array=Call(ex.array.jtype, "until_break",
                                                   (ex.array, Col(ex.array.jtype[:-2], ex.name), fires)))
        self.dead = saved_dead
        self.after_loop = True

    def _while(self, s: T.WhileStatement, guard) -> None:
        c = s.condition
        if isinstance(c, T.MethodInvocation) and c.member == "find" and not c.arguments and not c.selectors \
                and isinstance(self.scope.env.get(c.qualifier), rx.MatcherVar):
            return self._find_loop(s, guard, self.scope.env[c.qualifier])
        tok = None
        if isinstance(c, T.MethodInvocation) and c.member in ("hasMoreTokens", "hasMoreElements") and not c.arguments:
            tok = self.scope.env.get(c.qualifier)
        if not isinstance(tok, Tokenizer):
            raise Unsupported(s, "a while loop the converter does not read: it reads loops over StringTokenizer "
                                 "tokens, `while (m.find())` over a Matcher, and `int i = 0; while (i < n) { ...; i++; }` "
                                 "where nothing before the step skips it and nothing after the loop reads i",
                              "explode an array of what each iteration handles (F.explode, F.posexplode)")
        if tok.taken != 0:
            raise Unsupported(s, "a token loop after tokens were taken one by one",
                              "split the line once; loop over F.slice of the rest")
        body = s.body
        stmts = body.statements if isinstance(body, T.BlockStatement) else [body]
        calls = [n for st in stmts for _, n in st if isinstance(n, T.MethodInvocation) and n.qualifier == c.qualifier
                 and n.member in ("nextToken", "nextElement")]
        if len(calls) != 1:
            raise Unsupported(s, "the loop does not take exactly one token per iteration")
        var = "token"
        first = stmts[0] if stmts else None
        if isinstance(first, T.LocalVariableDeclaration) and len(first.declarators) == 1 and \
                isinstance(first.declarators[0].initializer, T.MethodInvocation) and first.declarators[0].initializer.member == "nextToken":
            var = first.declarators[0].name
        saved_dead = self.dead
        col, stmts = self._loop(s, guard, tok.tokens, var, body)
        tok.current = Col("String", col)
        try:
            self._loop_body(stmts)
        finally:
            tok.current = None
            self._end_loop(saved_dead)

    def _for(self, s: T.ForStatement, guard) -> None:
        ctl = s.control
        if not isinstance(ctl, T.EnhancedForControl):
            raise Unsupported(s, "counting for-loop is not lifted yet", "use F.posexplode over the array")
        arr = lift(ctl.iterable, self.scope)
        if not arr.jtype.endswith("[]"):
            raise Unsupported(s, "for-each over something that is not an array")
        var = ctl.var.declarators[0].name
        saved_dead = self.dead
        col, stmts = self._loop(s, guard, arr, var, s.body)
        self.scope.env[var] = Col(arr.jtype[:-2], col)
        self.loop_locals[-1].add(var)
        try:
            self._loop_body(stmts)
        finally:
            self.scope.env.pop(var, None)
            self._end_loop(saved_dead)

    def _try(self, s: T.TryStatement, guard, rest) -> None:
        if s.finally_block or s.resources:
            raise Unsupported(s, "try with finally or resources is not lifted")
        if rest and self._try_default(s, guard):
            return
        kinds: set[str] = set()
        skips = True
        catch_counters: list = []  # counters bumped for every record the try block threw on
        for c in s.catches or []:
            kinds.update(n.split(".")[-1] for n in c.parameter.types)
            body = c.block or []
            for st in body:
                if isinstance(st, T.ReturnStatement):
                    continue
                if isinstance(st, T.StatementExpression) and isinstance(st.expression, T.MethodInvocation) and \
                        (st.expression.qualifier or "") in LOG_RECEIVERS:
                    self.notes.append(f"{self.file}:{self._line(st)} logging in a catch block is not carried over")
                    continue
                if isinstance(st, T.StatementExpression) and is_counter_call(st.expression):
                    catch_counters.append((st, counter_update(st.expression, self.scope, self.cls, self.index)))
                    continue
                raise Unsupported(st, "catch block does more than skip the record")
            returns = any(isinstance(st, T.ReturnStatement) for st in body)
            if not returns and any(not isinstance(x, (T.ReturnStatement,)) for x in rest) and rest:
                skips = False
        if not skips:
            raise Unsupported(s, "code after a catch block runs for records that threw; the converter cannot follow that")
        saved, self.caught = self.caught, self.caught | frozenset(kinds)
        saved_emitted, self.in_try_emitted = self.in_try_emitted, False
        self.scope.caught = self.caught
        first_step, first_emit = len(self.steps), len(self.emit_list)
        try:
            self._scoped(s.block, guard)
        finally:
            self.caught, self.in_try_emitted = saved, saved_emitted
            self.scope.caught = self.caught
        if catch_counters:
            self._count_skipped(s, catch_counters, first_step, first_emit)
        if self.caught_all(kinds):
            self.notes.append(f"{self.file}:{self._line(s)} catch of {', '.join(sorted(kinds))}: records are skipped exactly "
                              "where parsing or indexing would have thrown")

    def _try_default(self, s: T.TryStatement, guard) -> bool:
        """`try { x = E; } catch (K e) { [x = D;] [counters] [logging] }` with code after it: x is E
        where E does not throw K, else D (or the value x had); the record goes on either way, and
        a counter in the catch counts the records where E threw."""
        block = s.block or []
        st = block[0] if len(block) == 1 else None
        e = st.expression if isinstance(st, T.StatementExpression) else None
        if not (isinstance(e, T.Assignment) and e.type == "=" and isinstance(e.expressionl, T.MemberReference)
                and not e.expressionl.qualifier and not e.expressionl.selectors and len(s.catches or []) == 1):
            return False
        name = e.expressionl.member
        if name not in self.locals:
            return False
        old = self._assignable(st, name)
        if old.jtype not in _DECLARED.values():
            return False
        catch = s.catches[0]
        default, counters, where = None, [], s
        for x in catch.block or []:
            xe = x.expression if isinstance(x, T.StatementExpression) else None
            if isinstance(xe, T.MethodInvocation) and (xe.qualifier or "") in LOG_RECEIVERS:
                self.notes.append(f"{self.file}:{self._line(x)} logging in a catch block is not carried over")
            elif xe is not None and is_counter_call(xe):
                counters.append((x, counter_update(xe, self.scope, self.cls, self.index)))
            elif isinstance(xe, T.Assignment) and xe.type == "=" and default is None \
                    and isinstance(xe.expressionl, T.MemberReference) and xe.expressionl.member == name \
                    and not xe.expressionl.qualifier and not xe.expressionl.selectors:
                default, where = xe.value, x
            else:
                return False
        kinds = frozenset(n.split(".")[-1] for n in catch.parameter.types)
        saved = self.scope.caught
        self.scope.caught = self.caught | kinds
        try:
            value = lift(e.value, self.scope)
        finally:
            self.scope.caught = saved
        d = lift(default, self.scope) if default is not None else old
        if value.jtype in NUMERIC and old.jtype in NUMERIC and promote(value.jtype, old.jtype) == old.jtype:
            value = widen_at(value, old.jtype, self.scope, st)
        if d.jtype in NUMERIC and old.jtype in NUMERIC and promote(d.jtype, old.jtype) == old.jtype:
            d = widen_at(d, old.jtype, self.scope, st)
        if value.jtype != old.jtype or d.jtype != old.jtype or (isinstance(d, Lit) and d.value is None):
            return False
        g = self._eff(guard)
        if not _has_null_on_error(value):  # nothing in E throws what the catch catches: it never runs
            self._store(st, name, value, guard)
            return True
        tried = self._fresh(f"{name}_tried")
        self.steps.append(Let(self._span(st), self._note(st) + "  (NULL where it throws)", tried,
                              value if g is None else Call(value.jtype, "guarded", (g, value))))
        threw = Call("boolean", "is_null", (Col(value.jtype, tried),))
        for x, cu in counters:
            self.steps.append(Count(self._span(x), self._note(x), cu.group, cu.name, _and(g, threw), cu.amount))
        self.notes.append(f"{self.file}:{self._line(s)} catch of {', '.join(sorted(kinds))}: `{name}` takes "
                          f"{'the catch block' + chr(39) + 's value' if default is not None else 'its earlier value'} "
                          "where the try block threw, and the record goes on")
        self._store(where, name, Call(old.jtype, "or_default", (Col(value.jtype, tried), d)), guard)
        return True

    def _count_skipped(self, s, counters, first_step: int, first_emit: int) -> None:
        """A counter in the catch block counts the records the try block threw on: the rows that
        each catch-and-skip filter of that block removes."""
        if any(_has_null_on_error(e.key) or _has_null_on_error(e.value) for e in self.emit_list[first_emit:]):
            raise Unsupported(s, "a counter in the catch block of a try that also writes: not lifted yet")
        out: list[Step] = []
        for step in self.steps[first_step:]:
            if isinstance(step, Filter) and step.note == SKIP_NOTE:
                for st, cu in counters:
                    out.append(Count(self._span(st), self._note(st), cu.group, cu.name, _not(step.cond), cu.amount))
            out.append(step)
        self.steps[first_step:] = out

    @staticmethod
    def caught_all(kinds) -> bool:
        return bool(set(kinds) & CATCH_ALL)


def class_constants(cls: ClassInfo, index=None) -> dict[str, object]:
    """Fields the map/reduce body may read: constants (also of outer classes) and Writable holders."""
    env: dict[str, object] = {}
    outer = index.get(cls.outer) if index is not None and cls.outer else None
    if outer is not None:
        from migrate.lift.collections import ConstCollection, ConstMap

        env.update({k: v for k, v in class_constants(outer, index).items()
                    if isinstance(v, (Lit, ConstCollection, ConstMap))})
    assigned = assigned_names(cls.node)
    from migrate.lift.collections import constant_collections, constant_maps

    env.update({k: v for k, v in constant_collections(cls).items() if k not in assigned})
    env.update({k: v for k, v in constant_maps(cls).items() if k not in assigned})
    for f in cls.fields():
        tname = getattr(f.type, "name", "")
        for d in f.declarators:
            if d.name in assigned or d.name in env:
                continue
            init = d.initializer
            if tname in WRITABLE_OF and isinstance(init, T.ClassCreator):
                try:
                    w = writable_creator(init, Scope({}))
                except Unsupported:
                    continue
                w.field = True
                env[d.name] = w
                continue
            try:
                made = date_object(init, f)
                if tname in ("Pattern", "java.util.regex.Pattern") and init is not None:
                    made = regex_object(init, Scope(dict(env)))  # a CompiledPattern, or Unsupported
                    made = replace(made, name=made.name or d.name) if isinstance(made, rx.CompiledPattern) else None
            except Unsupported as u:  # a date format the lift declines says why wherever it is used
                made = Refused(u.reason) if isinstance(init, T.ClassCreator) and init.type.name == "SimpleDateFormat" \
                    else None
            if made is not None:
                env[d.name] = made
                continue
            elif init is not None and ("final" in f.modifiers or "private" in f.modifiers and "static" not in f.modifiers):
                # a private field nothing assigns (setup() constants land here, migrate.lower) is as final
                try:
                    e = lift(init, Scope(dict(env)))
                except Unsupported:
                    continue
                e = fold_constant(e)
                if isinstance(e, Lit):
                    env[d.name] = e
    return env


def struct_fields(cls: ClassInfo, index=None) -> dict[str, Writable]:
    """Fields holding a custom Writable made at their declaration and never reassigned: map()
    sets them through setters (checked at each write by check_struct_written)."""
    structs = structs_seen_from(cls, index) if index is not None else {}
    assigned = assigned_names(cls.node)
    out = {}
    for f in cls.fields():
        for d in f.declarators:
            if getattr(f.type, "name", "") in structs and isinstance(d.initializer, T.ClassCreator) \
                    and d.name not in assigned:
                try:
                    w = struct_holder(d.initializer, Scope({}, structs=structs), f)
                except Unsupported:
                    continue
                w.field = True
                out[d.name] = w
    return out


def struct_holder(init, scope: Scope, node) -> Writable:
    """A variable holding a custom Writable made with `new K(...)`: its fields as a struct value."""
    if not isinstance(init, T.ClassCreator) or init.type.name not in scope.structs:
        raise Unsupported(node, "a custom Writable taken from somewhere other than `new`")
    info = scope.structs[init.type.name]
    if isinstance(info, Unsupported):
        raise Unsupported(node, info.reason, info.suggestion)
    content = info.construct(init, scope, unset_ok=True)
    return Writable(info.jtype, content)


def check_struct_written(w: Writable, name: str, node, method, info, guard: Expr | None = None) -> None:
    """A custom Writable is written only with every field known: a field never set is null (write()
    throws), and a field holder keeps what the previous record set in the fields not set again."""
    touched = set()
    for _, n in method:  # every setter the method calls on it, before or after this write
        if isinstance(n, T.MethodInvocation) and n.qualifier == name:
            touched |= info.assigned_by(n.member, len(n.arguments or []))
    for f, v in w.content.items:
        if isinstance(v, Lit) and v.value is None:
            raise Unsupported(node, f"`{name}.{f}` is never set before the write: the original's write() would "
                                    "fail on the null field")
        if w.field and f in touched and f not in w.fields_set and \
                not (f in w.fields_guard and _implies(guard, w.fields_guard[f])):
            raise Unsupported(node, f"`{name}` is a field whose `{f}` is set only on some records: on the others "
                                    "Hadoop writes the previous record's value")


def date_object(init, node):
    """`new SimpleDateFormat("...")` or `Calendar.getInstance()` -> a date binding, else None."""
    if isinstance(init, T.ClassCreator) and init.type.name == "SimpleDateFormat":
        args = init.arguments or []
        if len(args) != 1 or not (isinstance(args[0], T.Literal) and args[0].value.startswith('"')):
            raise Unsupported(node, "SimpleDateFormat with a locale or a computed pattern is not lifted yet")
        from migrate.java.literals import string_value

        pattern = string_value(args[0].value)
        dates.check_parse_pattern(pattern, node)
        return dates.configured(dates.DateFormat(pattern), init.selectors or [], node)
    if isinstance(init, T.MethodInvocation) and init.qualifier == "Calendar" and init.member == "getInstance" \
            and not init.arguments:
        return dates.CalendarVar()
    if isinstance(init, T.MethodInvocation) and init.qualifier == "DateTimeFormatter":
        from migrate.lift.exprs import _java_time_formatter

        return _java_time_formatter(init)
    return None


def fold_constant(e: Expr) -> Expr:
    """Fold arithmetic on literals (`60 * 60`) with Java's int/long wrap-around."""
    from migrate.plan import Arith

    if isinstance(e, Arith):
        l, r = fold_constant(e.left), fold_constant(e.right)
        if isinstance(l, Lit) and isinstance(r, Lit) and e.op in "+-*" and None not in (l.value, r.value):
            v = {"+": l.value + r.value, "-": l.value - r.value, "*": l.value * r.value}[e.op]
            if e.jtype in ("int", "long"):
                bits = 32 if e.jtype == "int" else 64
                v = (v + (1 << (bits - 1))) % (1 << bits) - (1 << (bits - 1))
            return Lit(e.jtype, v)
    return e



LIFECYCLE_METHODS = {"map", "reduce", "setup", "cleanup", "configure", "close", "run"}


def repository_classes(cls: ClassInfo, index=None):
    """Simple class name, as `cls` would resolve it -> HelperClass (its static methods and its
    constants), for static helpers written in another class of the repository."""
    cache: dict[str, HelperClass | None] = {}

    def find(name: str) -> HelperClass | None:
        if name not in cache:
            other = index.get(index.resolve(name, cls)) if index is not None else None
            if other is None or other is cls:
                cache[name] = None
            else:
                statics = {n: [m for m in ms if "static" in m.modifiers]
                           for n, ms in helper_methods(other, index).items()}
                cache[name] = HelperClass(other.name, other.file.path, {n: ms for n, ms in statics.items() if ms},
                                          class_constants(other, index), type_resolver(other, index))
        return cache[name]
    return find


def type_resolver(cls: ClassInfo, index=None):
    """A type name in `cls`'s code -> the class javac would pick (its imports, package, nesting)."""
    return (lambda name: index.resolve(name, cls)) if index is not None else None


def helper_methods(cls: ClassInfo, index=None) -> dict[str, list]:
    """Methods of the class (and static ones of its outer classes) that a body may call and inline."""
    out: dict[str, list] = {}
    c: ClassInfo | None = cls
    first = True
    while c is not None:
        for m in c.node.body:
            if isinstance(m, T.MethodDeclaration) and m.name not in LIFECYCLE_METHODS and (first or "static" in m.modifiers):
                out.setdefault(m.name, []).append(m)
        c = index.get(c.outer) if index is not None and c.outer else None
        first = False
    return out
