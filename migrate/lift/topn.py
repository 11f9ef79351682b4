"""Top-N across keys: a TreeMap field filled in reduce(), trimmed to N, written in cleanup().

Recognises (new API):
    private TreeMap<Integer, String> top = new TreeMap<>();       // Integer or Long map keys
    reduce(): <a fold> ... top.put(k(aggs, key), v(aggs, key));
              if (top.size() > N) top.remove(top.firstKey());     // or lastKey(), pollFirstEntry()...
    cleanup(): for (Map.Entry<Integer, String> e : top[.descendingMap()].entrySet())
                   context.write(f(e.getKey(), e.getValue()), g(...));
Produces: a TopN step, plus findings: map keys that tie overwrite each other (the original
drops them), and one map per reduce task.
Declines: a map keyed by String or Double (TreeMap orders by compareTo, which differs from
Spark's order for some values), a comparator, a put or trim under a condition, a trim before
the put, any other use of the map, PriorityQueue (its ties come out in an order that depends
on the heap's history).
"""
from __future__ import annotations

import re

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.exprs import Scope, Unsupported, calls_as_names, lift, widen, write_argument
from migrate.lift.mapper import class_constants
from migrate.plan import Call, Col, ConfValue, Emit, Expr, Finding, Group, Lit, Span, TaskTopN, TopN

SORTED_MAPS = ("TreeMap", "SortedMap", "NavigableMap")  # field types a top-N map is declared with
_MAP_KEYS = {"Integer": "int", "Long": "long"}
_MAP_VALUES = {"String": "String", "Integer": "int", "Long": "long"}
_TRIM = {("remove", "firstKey"): True, ("pollFirstEntry", None): True,
         ("remove", "lastKey"): False, ("pollLastEntry", None): False}


def tree_map_field(cls: ClassInfo) -> tuple[str, str, str] | None:
    """(name, key type, value type) of the class's one TreeMap field made with `new TreeMap<>()`."""
    found = []
    for f in cls.fields():
        if getattr(f.type, "name", "") not in SORTED_MAPS:
            continue
        args = f.type.arguments or []
        names = [getattr(getattr(a, "type", None), "name", "") for a in args]
        for d in f.declarators:
            init = d.initializer
            if isinstance(init, T.ClassCreator) and init.type.name == "TreeMap" and len(names) == 2:
                found.append((d.name, names[0], names[1], init, f))
    if len(found) != 1:
        return None
    name, k, v, init, f = found[0]
    if "static" in (f.modifiers or set()):
        raise Unsupported(f, "a static TreeMap is shared by every task one JVM runs (Hadoop's local runner runs them "
                             "all in one), so what each task writes depends on where the tasks ran",
                          "make the field an instance field: one map per task")
    if init.arguments:
        raise Unsupported(f, "the TreeMap is built with a comparator; its order is not read",
                          "Window.orderBy the comparator's fields, then row_number() <= N")
    if k not in _MAP_KEYS:
        raise Unsupported(f, f"a TreeMap keyed by {k}: its order (compareTo) is not proven equal to Spark's sort",
                          "orderBy + limit after checking the order of the values you have")
    if v not in _MAP_VALUES:
        raise Unsupported(f, f"TreeMap values of type {v} are not read")
    return name, _MAP_KEYS[k], _MAP_VALUES[v]


class TreeMapCollector:
    """The FoldLifter hook: reads `put` and the trim of the map after the loop over values. In a
    mapper (`per_row`) the put may run under a condition (a record that puts nothing), and the
    trim must run where the put does."""

    def __init__(self, name: str, key_t: str, value_t: str, per_row: bool = False):
        self.name, self.key_t, self.value_t, self.per_row = name, key_t, value_t, per_row
        self.put: Emit | None = None
        self.trim: tuple[int, bool] | None = None  # (N, keeps the largest)
        self.n_setting: Expr | None = None  # N as a job setting, when it is one
        self.put_node = self.trim_node = None

    def _touches(self, node) -> bool:
        return any(isinstance(n, (T.MethodInvocation, T.MemberReference)) and self.name in (n.qualifier, n.member)
                   for _, n in node)

    def statement(self, s, guard, lifter) -> bool:
        if not self._touches(s):
            return False
        if guard is not None and not (self.per_row and (self.put is None or guard == self.put.guard)):
            raise Unsupported(s, f"the TreeMap `{self.name}` is changed under a condition")
        e = s.expression if isinstance(s, T.StatementExpression) else None
        if isinstance(e, T.MethodInvocation) and e.qualifier == self.name and e.member == "put" and self.put is None:
            k, v = (lifter._expr(a) for a in e.arguments)
            if k.jtype not in ("int", "long") or (k.jtype == "long" and self.key_t == "int"):
                raise Unsupported(s, f"a {k.jtype} put as the TreeMap's {self.key_t} key")
            if v.jtype != self.value_t:
                raise Unsupported(s, f"a {v.jtype} put as the TreeMap's {self.value_t} value")
            a, b = node_lines(s)
            self.put = Emit(Span(lifter.file, a, b), lifter.cls.file.lines[a - 1].strip(), widen(k, self.key_t), v,
                            guard)
            self.put_node = s
            return True
        if isinstance(s, T.IfStatement) and s.else_statement is None and self.put is not None and self.trim is None:
            n, largest = self._trim(s, lifter)
            self.trim, self.trim_node = (n, largest), s
            return True
        raise Unsupported(s, f"this use of the TreeMap `{self.name}` is not the top-N pattern (put, then "
                             f"`if ({self.name}.size() > N) {self.name}.remove({self.name}.firstKey())`)",
                          "Window.orderBy(...) with row_number() <= N, or orderBy().limit(N)")

    def _trim(self, s: T.IfStatement, lifter) -> tuple[int, bool]:
        c = s.condition
        body = s.then_statement.statements if isinstance(s.then_statement, T.BlockStatement) else [s.then_statement]
        ok = (isinstance(c, T.BinaryOperation) and c.operator == ">" and isinstance(c.operandl, T.MethodInvocation)
              and c.operandl.qualifier == self.name and c.operandl.member == "size" and len(body) == 1
              and isinstance(body[0], T.StatementExpression) and isinstance(body[0].expression, T.MethodInvocation))
        if ok:
            call = body[0].expression
            arg = call.arguments[0] if len(call.arguments or []) == 1 else None
            inner = arg.member if isinstance(arg, T.MethodInvocation) and arg.qualifier == self.name else None
            largest = _TRIM.get((call.member, inner)) if call.qualifier == self.name else None
            n = lift(c.operandr, lifter.scope)
            value = n.value if isinstance(n, Lit) and n.jtype == "int" else setting_int(n)
            if largest is not None and value is not None and value >= 0:
                self.n_setting = None if isinstance(n, Lit) else n
                return value, largest
        raise Unsupported(s, f"the trim of `{self.name}` is not `if (size() > N) remove(firstKey() or lastKey())` "
                             "with N a constant or a job setting")

    def finish(self, lifter) -> list[Emit]:
        if lifter.emits:
            raise Unsupported(self.put_node, "reduce() writes as well as filling the TreeMap")
        if self.put is None or self.trim is None:
            raise Unsupported(self.put_node or lifter.method, f"the TreeMap `{self.name}` is not filled and trimmed "
                                                              "in reduce()")
        return [self.put]


def setting_int(e: Expr) -> int | None:
    """The value an int job setting has in the original run (`Integer.parseInt(conf.get("N"))`
    with the driver's conf.set value, or conf.getInt's); None when it is not one or would throw."""
    if isinstance(e, ConfValue) and e.jtype == "int" and isinstance(e.default, int):
        return e.default
    if isinstance(e, Call) and e.op == "parse_int" and len(e.args) == 1 and isinstance(e.args[0], ConfValue) \
            and isinstance(e.args[0].default, str) and re.fullmatch(r"[+-]?[0-9]+", e.args[0].default):
        v = int(e.args[0].default)  # Integer.parseInt: a sign and ASCII digits, no spaces
        return v if -2**31 <= v < 2**31 else None
    return None


def lift_task_top_n(cls: ClassInfo, collector: TreeMapCollector, emits: list[Emit], index) -> TaskTopN:
    """The mapper's per-task top-N, once map() has been read with `collector` (see task_tree_map)."""
    if emits:
        raise Unsupported(collector.put_node, "map() writes as well as filling the TreeMap")
    if collector.trim is None:
        raise Unsupported(collector.put_node, f"the TreeMap `{collector.name}` is filled but never trimmed to N "
                                              "entries in map()")
    writes, descending = cleanup_writes(cls, collector.name, collector.key_t, collector.value_t, index)
    n, largest = collector.trim
    put = collector.put
    return TaskTopN(put.origin, f"each map task's top {n} by {put.note}", writes, put=put, n=n,
                    keep_largest=largest, descending=descending, n_setting=collector.n_setting)


def task_tree_map(cls: ClassInfo) -> TreeMapCollector | None:
    """The per-row collector for a mapper's TreeMap field, or None when it has none."""
    field = tree_map_field(cls)
    return TreeMapCollector(*field, per_row=True) if field is not None else None


def cleanup_writes(cls: ClassInfo, name: str, key_t: str, value_t: str, index) -> tuple[tuple[Emit, ...], bool]:
    """The writes of cleanup()'s one loop over the map's entries, and whether it walks down."""
    ms = [m for m in cls.methods("cleanup") if len(m.parameters) == 1]
    if not ms:
        raise Unsupported(cls.node, f"the TreeMap `{name}` is never written (no cleanup(Context))")
    m = ms[0]
    body = [s for s in m.body or [] if not (isinstance(s, T.StatementExpression)
                                            and isinstance(s.expression, T.SuperMethodInvocation))]
    loop = body[0] if len(body) == 1 else None
    ctl = loop.control if isinstance(loop, T.ForStatement) else None
    if not isinstance(ctl, T.EnhancedForControl):
        raise Unsupported(body[0] if body else m, "cleanup() does more than one loop over the TreeMap's entries")
    it = ctl.iterable
    descending = _walks_down(it, name)
    if descending is None:
        raise Unsupported(loop, f"cleanup() loops over something other than `{name}.entrySet()` or "
                                f"`{name}.descendingMap().entrySet()`")
    var = ctl.var.declarators[0].name
    target = m.parameters[0].name
    env = dict(class_constants(cls, index))
    env["__tm_key"], env["__tm_value"] = Col(key_t, "tm_key"), Col(value_t, "tm_value")
    scope = Scope(env, file=cls.file.path)
    writes = []
    for s in (loop.body.statements if isinstance(loop.body, T.BlockStatement) else [loop.body]):
        e = s.expression if isinstance(s, T.StatementExpression) else None
        if not (isinstance(e, T.MethodInvocation) and e.qualifier == target and e.member == "write"):
            raise Unsupported(s, "the loop in cleanup() does more than write the entries")
        k, v = (write_argument(_entry_refs(a, var), scope) for a in e.arguments)
        a, b = node_lines(s)
        writes.append(Emit(Span(cls.file.path, a, b), cls.file.lines[a - 1].strip(), k, v))
    if len(writes) != 1:
        raise Unsupported(loop, f"the loop in cleanup() writes {len(writes)} times per entry; one write is read")
    return tuple(writes), descending


def _walks_down(it, name: str) -> bool | None:
    if not (isinstance(it, T.MethodInvocation) and it.qualifier == name):
        return None
    sels = [s.member for s in it.selectors or [] if isinstance(s, T.MethodInvocation)]
    if it.member == "entrySet" and not sels:
        return False
    if it.member == "descendingMap" and sels == ["entrySet"]:
        return True
    return None


def _entry_refs(node, var: str):
    """A copy of `node` with `e.getKey()` / `e.getValue()` replaced by the names cleanup_writes binds."""
    names = {"getKey": "__tm_key", "getValue": "__tm_value"}
    return calls_as_names(node, lambda n: names.get(n.member) if n.qualifier == var else None)


def top_n_findings(step: TopN, put_origin: Span, reduces: int) -> list[Finding]:
    """What the original's top-N does that readers may not expect."""
    out = [Finding("ties-dropped", put_origin,
                   "the TreeMap keeps one entry per map key: keys whose map keys tie overwrite each other, so the "
                   f"original keeps only the greatest key of each tie and may write fewer than {step.n} distinct "
                   "keys; the script does the same",
                   "if ties should all be kept, rank with F.dense_rank() over Window.orderBy(...) instead")]
    if reduces > 1:
        out.append(Finding("per-task-state", put_origin,
                           f"the TreeMap lives in one reduce task: with {reduces} reduce tasks the original writes "
                           f"a top {step.n} per task (per partition), not one overall; the script does the same",
                           "if one overall top-N was meant, run the job with one reduce task or rank over all keys"))
    return out


def lift_top_n(rcls: ClassInfo, reduce_m, key_t: str, value_t: str, index, fold_lifter,
               settings: dict | None = None) -> TopN | None:
    """A TopN step when the reducer has the pattern; None when it has no TreeMap field at all."""
    field = tree_map_field(rcls)
    if field is None:
        return None
    name, mk, mv = field
    collector = TreeMapCollector(name, mk, mv)
    lifter = fold_lifter(rcls, reduce_m, key_t, value_t, index, collector=collector, settings=settings)
    fold = lifter._lift()
    if not isinstance(fold, Group):
        raise Unsupported(reduce_m, "reduce() writes inside its loop as well as filling the TreeMap")
    writes, descending = cleanup_writes(rcls, name, mk, mv, index)
    n, largest = collector.trim
    return TopN(fold.origin, f"top {n} by {collector.put.note}", fold, n, largest, descending, writes,
                n_setting=collector.n_setting)
