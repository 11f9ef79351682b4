"""The plan (IR): frozen dataclasses for a job's dataflow and a closed set of expression nodes.

The plan knows neither javalang nor PySpark. Java semantics (integer division, split's
trailing-empty rule, StringTokenizer delimiters, trim) are already decided here: an
expression says *which* operation it is, and the generator only spells it.
"""
from __future__ import annotations

import dataclasses
from dataclasses import dataclass, field
from typing import Any

# Java value types the plan tracks. Arrays carry a trailing "[]".
JTYPES = {"int", "long", "float", "double", "boolean", "String", "String[]", "null"}
INTEGRAL = {"int", "long"}
NUMERIC = {"int", "long", "float", "double"}


@dataclass(frozen=True)
class Span:
    """Where a plan node came from in the legacy code."""

    file: str
    line_start: int
    line_end: int

    def __str__(self) -> str:
        if self.line_start == self.line_end:
            return f"{self.file}:{self.line_start}"
        return f"{self.file}:{self.line_start}-{self.line_end}"


NO_SPAN = Span("<generated>", 0, 0)


# ----------------------------------------------------------------------------- expressions


@dataclass(frozen=True)
class Expr:
    """Base of every expression node; `jtype` is the Java type of the value.

    `origin` is where the expression was written; it does not take part in equality, so two
    expressions that compute the same thing compare equal wherever they came from.
    """

    jtype: str
    origin: Span = field(default=NO_SPAN, compare=False, kw_only=True)


@dataclass(frozen=True)
class Col(Expr):
    """A column of the current DataFrame (a lifted local, the input line, a token)."""

    name: str


@dataclass(frozen=True)
class Lit(Expr):
    """A literal Java value (already converted to the Python value it denotes)."""

    value: Any


@dataclass(frozen=True)
class Call(Expr):
    """A named operation with Java semantics; the generator maps `op` to Spark code.

    `on_error` says what happens where Java would throw: "fail" (the job fails, as an
    uncaught Java exception fails the task) or "null" (inside a catch-and-skip block:
    the value becomes NULL and the row is dropped).
    """

    op: str
    args: tuple[Expr, ...]
    on_error: str = "fail"

    def __post_init__(self) -> None:
        if self.on_error not in ("fail", "null"):
            raise ValueError(f"on_error must be 'fail' or 'null', not {self.on_error!r}")


@dataclass(frozen=True)
class Arith(Expr):
    """Java arithmetic; for integral `jtype`, `/` truncates toward zero (IntDiv)."""

    op: str
    left: Expr
    right: Expr

    def __post_init__(self) -> None:
        if self.op not in ("+", "-", "*", "/", "%"):
            raise ValueError(f"unknown arithmetic operator {self.op!r}")


@dataclass(frozen=True)
class Compare(Expr):
    """A comparison; `==` on Strings here always means `equals` (see lift.exprs)."""

    op: str
    left: Expr
    right: Expr


@dataclass(frozen=True)
class BoolOp(Expr):
    """`&&`, `||` (short-circuit) or `!` over boolean expressions."""

    op: str
    args: tuple[Expr, ...]


@dataclass(frozen=True)
class Cond(Expr):
    """Java's ternary `c ? a : b`."""

    cond: Expr
    then: Expr
    other: Expr


@dataclass(frozen=True)
class Cast(Expr):
    """A widening or narrowing primitive cast, `(double) x`, `(int) d`."""

    arg: Expr


@dataclass(frozen=True)
class AggRef(Expr):
    """A reference to an aggregate computed in the Group step (used in its `output`)."""

    name: str


@dataclass(frozen=True)
class StructNew(Expr):
    """A custom Writable made from its fields (`new StationHour(s, h)`): a struct column."""

    items: tuple[tuple[str, Expr], ...]


@dataclass(frozen=True)
class Field(Expr):
    """One field of a custom Writable held in a struct column (`key.station`)."""

    base: Expr
    name: str


@dataclass(frozen=True)
class ConfValue(Expr):
    """A job setting read once per task (`conf.getInt(name, default)`): a script parameter.

    `reader` is the Configuration getter (get, getInt, getLong, getFloat, getDouble, getBoolean);
    `default` is the value the Java code falls back to, already replaced by the driver's
    `conf.set*` value when the driver sets one; `var` names the Python variable in the script.
    """

    name: str
    reader: str
    default: Any
    var: str


# ----------------------------------------------------------------------------- dataflow


@dataclass(frozen=True)
class Step:
    """Base of row-level and grouping steps; every step knows its Java origin."""

    origin: Span
    note: str  # the Java source text it stands for, shortened


@dataclass(frozen=True)
class Let(Step):
    """Add a column computed per row (a Java local variable)."""

    name: str
    expr: Expr


@dataclass(frozen=True)
class Filter(Step):
    """Keep rows where `cond` holds (a guard, an early return, a skipped bad record)."""

    cond: Expr


@dataclass(frozen=True)
class Explode(Step):
    """One row per element of an array (a loop over tokens)."""

    name: str
    array: Expr


@dataclass(frozen=True)
class Count(Step):
    """A Hadoop counter update: adds `amount` for every row where `cond` holds (None: every row).
    A group or name that is an Expr is computed from the row (a counter per value)."""

    group: str | Expr
    name: str | Expr
    cond: Expr | None
    amount: Expr


@dataclass(frozen=True)
class Emit:
    """One `context.write` / `output.collect`: key and value expressions, optional guard.

    A key or value of None stands for NullWritable (or a literal null), which
    TextOutputFormat leaves out of the line together with its separator.
    """

    origin: Span
    note: str
    key: Expr | None
    value: Expr | None
    guard: Expr | None = None


@dataclass(frozen=True)
class Project(Step):
    """The map output: one row per Emit whose guard holds, columns `key` and `value`."""

    emits: tuple[Emit, ...]

    def __post_init__(self) -> None:
        if not self.emits:
            raise ValueError("a Project needs at least one Emit")


@dataclass(frozen=True)
class TaskTopN(Project):
    """A map task's TreeMap top-N: map() puts `put.key` -> `put.value` (where `put.guard` holds) and
    trims the map to its `n` largest (smallest) map keys after every put; cleanup() writes the
    kept entries (`emits`, over the columns `tm_key` and `tm_value`). As in TopN, that leaves the
    n largest distinct map keys, each with the value of the task's last line that put it. One
    map per map task: rows carry `_task` and their order in it, `_line` (see Source.split)."""

    put: Emit = None
    n: int = 0
    keep_largest: bool = True
    descending: bool = False
    n_setting: Expr | None = None  # N read from the job's configuration: a script parameter


@dataclass(frozen=True)
class Agg:
    """One aggregate over the values of a key: sum, count, min, max, …"""

    name: str
    fn: str  # sum, count, min, max, min_nonnan, max_nonnan, min_nan, any, all, count_distinct, only, ...
    arg: Expr | None
    jtype: str  # Java type of the accumulator (decides overflow wrap)
    init: Any = None  # the accumulator's initial value, folded in when it can matter
    origin: Span = NO_SPAN
    note: str = ""


@dataclass(frozen=True)
class Group(Step):
    """The shuffle + reduce: group map output by `key`, compute `aggs`, then the reducer's writes.

    `emits` are the writes after the loop, in Java's order: key and value expressions over
    AggRef nodes and the key (None = NullWritable), each with the guard it is written under.
    `distinct` marks a reducer that ignores its values.
    """

    aggs: tuple[Agg, ...]
    emits: tuple[Emit, ...]
    distinct: bool = False
    lets: tuple[Let, ...] = ()  # locals computed per value inside the loop: columns before the shuffle
    first_keys: int | None = None  # an instance counter caps the output: only each task's first N keys write
    keys: Expr | None = None  # reduce() does its work only for keys where this test of the key holds
    counts: tuple["Count", ...] = ()  # counters updated once per reduce() call: over the keys and aggregates

    def __post_init__(self) -> None:
        if not self.emits:
            raise ValueError("a Group needs at least one write")

    @property
    def single(self) -> Emit | None:
        """The one unguarded write, when the reducer writes exactly once per key."""
        return self.emits[0] if len(self.emits) == 1 and self.emits[0].guard is None else None


@dataclass(frozen=True)
class EachValue(Step):
    """A reducer that writes inside its loop over values (identity, filter, per-value map).

    Each emit is evaluated per value (columns `key` and `value`); Hadoop writes them sorted by
    key, the values of one key in no defined order.
    """

    emits: tuple[Emit, ...]
    lets: tuple[Let, ...] = ()
    # reduce() took the first value before its loop (`it.next()`): the loop writes the group's other
    # values, and column `first_value` holds the first one. Only defined with a secondary sort:
    # `group` are the grouping comparator's fields, `order` the sort order, (expression, ascending).
    first_value: bool = False
    group: tuple[Expr, ...] = ()
    order: tuple[tuple[Expr, bool], ...] = ()
    # writes of reduce() before and after its loop: once per call (per group), around its values'
    before: tuple[Emit, ...] = ()
    after: tuple[Emit, ...] = ()
    keys: Expr | None = None  # reduce() does its work only for keys where this test of the key holds


@dataclass(frozen=True)
class Runs(Step):
    """A control break: one reduce() call reads a group of several keys (a grouping comparator)
    with its values in the sort order, and its loop starts its accumulators over whenever the
    last sort field changes, so each run of one key is folded on its own and flushed into a list.

    `fold` is one run's fold, grouped by the full key; its one write is the run's flush (key ->
    the item added to the list) under the test the original flushes with, which reads the run's
    field as the column `marker`. `writes` are reduce()'s writes after its loop, over the group's
    fields of `key` and AggRef(`items`): the flushed items in run order. `test` is what the break
    test compares with the marker, per value; the job rule proves it is the key's `field` and
    fills `group` (the grouping comparator's fields) and `order` (the field's sort term and
    direction: the order of the runs).
    """

    fold: Group
    marker: str
    items: str
    writes: tuple[Emit, ...]
    test: Expr
    group: tuple[Expr, ...] = ()
    field: Expr | None = None
    order: tuple[Expr, bool] | None = None


@dataclass(frozen=True)
class TopN(Step):
    """Top-N across keys: a TreeMap field filled in reduce() and written in cleanup().

    `fold` is reduce()'s fold; its one emit is the `put` (map key -> map value). A TreeMap
    keeps one entry per map key and the last put wins; reduce() runs in key order, so of the
    keys that share a map key the greatest stays. The map is trimmed to the `n` largest (or
    smallest) map keys after every put, which leaves exactly the n largest (smallest) distinct
    map keys. cleanup() runs `writes` over the columns `tm_key` and `tm_value`, walking the map
    up or down. With a custom partitioner each reduce task (`partition`, of `partitions`)
    keeps its own map.
    """

    fold: Group
    n: int  # the N the original runs with (the driver's setting, where N is one)
    keep_largest: bool
    descending: bool
    writes: tuple[Emit, ...]
    partition: Expr | None = None
    partitions: int = 1
    n_setting: Expr | None = None  # N read from the job's configuration in setup(): a script parameter


@dataclass(frozen=True)
class TopPerKey(Step):
    """Top-N per key: a TreeSet local to reduce(), trimmed to N inside the loop, then written.

    A TreeSet keeps each distinct `elem` (over `value`) once; trimming after every add leaves
    the n largest (or smallest) distinct ones; the loop after it runs `writes` over the column
    `tm_key` walking the set up or down.
    """

    elem: Expr
    n: int
    keep_largest: bool
    descending: bool
    writes: tuple[Emit, ...]
    lets: tuple[Let, ...] = ()
    keys: Expr | None = None  # reduce() does its work only for keys where this test of the key holds


@dataclass(frozen=True)
class JoinSide:
    """One side of a reduce-side join: the values whose tag `when` picks, kept as `elem`.

    `many`: a List filled with every such value (one row each); otherwise a String assigned
    from such a value, which holds `default` (None: null) when none came. Java keeps the last
    one assigned, and which is last Hadoop does not define: the script stops on a key that has
    more than one.
    """

    name: str  # the Java variable, also the column holding the element
    when: Expr
    elem: Expr
    many: bool
    default: Any = None
    origin: Span = NO_SPAN
    note: str = ""


@dataclass(frozen=True)
class JoinWrite:
    """A write after the loop, run once per combination of the `loops` (list sides, outermost
    first); its guard is over `_has_<side>` columns (the side got a value for this key)."""

    loops: tuple[str, ...]
    emit: Emit


@dataclass(frozen=True)
class Join(Step):
    """A reduce-side join: reduce() sorts each value into a side by its tag, then writes
    combinations of the sides (an inner join, a lookup with a default, an anti join …)."""

    sides: tuple[JoinSide, ...]
    writes: tuple[JoinWrite, ...]
    lets: tuple[Let, ...] = ()
    keys: Expr | None = None  # reduce() does its work only for keys where this test of the key holds


@dataclass(frozen=True)
class SideTable:
    """A side file that setup() reads whole into a HashMap (or HashSet) field, one put per line.

    `steps` and `put` are over the file's lines (column `value`), like map steps; a key put
    again replaces the earlier value, so the last line wins. A set holds keys only.
    """

    field: str  # the Java field
    name: str  # the DataFrame variable in the script
    kind: str  # "map" | "set"
    key_type: str
    value_type: str | None
    cache_file: int | str  # which of the job's cache files: getCacheFiles()[i], or the `#link` name it was opened by
    origin: Span  # the read loop in setup()
    steps: tuple[Step, ...]
    put: Emit
    param: str = ""  # the script parameter holding the path (set when the driver's cache file is known)


@dataclass(frozen=True)
class Lookup(Step):
    """Look `key` up in a side table: column `name` holds the value, or NULL where the key is missing
    (for a set: true or NULL). A broadcast left join: every row stays."""

    name: str
    table: str  # SideTable.name
    key: Expr


@dataclass(frozen=True)
class Identity(Step):
    """Hadoop's identity reducer: every map output pair passes through, sorted by key."""


# Hand work that leaves the script unable to compute the original's output: the generated
# script stops with NotImplementedError until it is done. Other items (counters, file layout,
# chaining) leave the output right but the job incomplete; an unsound combiner leaves the script
# computing the true answer where the original's depended on how often the combiner ran.
ADVISORY_CATEGORIES = {"counter", "output-layout", "partitioner", "chained-jobs", "driver", "input-output-options",
                       "combiner", "after-job"}  # the script computes the reducer over all values: the true answer


@dataclass(frozen=True)
class HandWork:
    """Something the converter did not prove it understood: a visible stub + a report item."""

    category: str
    origin: Span
    reason: str
    suggestion: str
    snippet: str = ""
    profile: str = "P1"  # EFFORT.md adaptation profile: P1 re-express, P2 partial, P3 full redesign
    sloc: int = 0

    @property
    def blocking(self) -> bool:
        return self.category not in ADVISORY_CATEGORIES


@dataclass(frozen=True)
class Finding:
    """What the original does that a reviewer should know: the script reproduces it (that is
    parity), and the team decides whether to keep it (a latent bug: ties dropped, state that is
    right only with one reduce task, a reduce() Hadoop never calls)."""

    category: str
    origin: Span
    message: str
    suggestion: str


@dataclass(frozen=True)
class Source:
    """The job's input: text lines (TextInputFormat) or key/value lines (KeyValueTextInputFormat)."""

    params: tuple[str, ...]  # script parameters holding the path(s)
    fmt: str = "text"  # "text" | "keyvalue"
    skip_first_line: bool = False  # `if (key.get() == 0) return;`: drop each file's first line
    split_commas: tuple[bool, ...] = ()  # per param: FileInputFormat's String overloads split on commas
    file_name: bool = False  # the mapper reads its input split's file name
    origin: Span = NO_SPAN
    kv_separator: str = "\t"  # KeyValueTextInputFormat: the line is split at its first occurrence
    upstream: int | None = None  # a chained job: reads the lines of Plan.upstream[i] (params is empty)
    offsets: bool = False  # the mapper reads TextInputFormat's key: each line's byte offset in its file
    # the mapper keeps state per map task: rows carry `_task` and `_line`; these settings (minsize,
    # maxsize, block size) say how long a file may be and still be one task
    split: tuple[Expr, ...] = ()
    lists: tuple[bool, ...] = ()  # per param: it holds several paths (a loop over the driver's arguments)


@dataclass(frozen=True)
class Sink:
    """The job's output in TextOutputFormat layout: key TAB value, one line a record."""

    param: str
    key_type: str | None  # None = NullWritable (not printed)
    value_type: str | None
    sorted_by_key: bool
    overwrite: bool
    separator: str = "\t"
    origin: Span = NO_SPAN
    partition: Expr | None = None  # with several reduce tasks: the task (part file) of a key, over `key`
    # a custom key's order (compareTo or a sort comparator): (expression over `key`, ascending), most
    # significant first
    sort_terms: tuple[tuple[Expr, bool], ...] = ()
    compression: str | None = None  # FileOutputFormat.setCompressOutput: the same codec, by Spark's name


@dataclass(frozen=True)
class Branch:
    """One input of a job with several (MultipleInputs): its source and its own mapper's steps."""

    source: Source
    steps: tuple[Step, ...]
    mapper: str  # the mapper class, fully qualified


@dataclass(frozen=True)
class Param:
    """A script parameter: positional (from `args[i]`) or an option with the old default."""

    name: str
    help: str
    position: int | None = None  # index in the original driver's args
    default: str | None = None
    many: bool = False  # a run of arguments (a loop over them): args[position .. length - 1 - from_end]
    from_end: int | None = None  # with `many` the run's end, else args[length - from_end] (position None)
    optional: bool = False  # the driver reads it only when it is given (`if (args.length > i)`): the last one
    # a path the driver makes from its arguments (`args[0] + "/input"`): the pieces, ("arg", i) or ("str", text)
    derived: tuple[tuple[str, object], ...] = ()

    @property
    def positional(self) -> bool:
        """Taken from the command line in the driver's order (not an option)."""
        return self.position is not None or self.from_end is not None


@dataclass(frozen=True)
class ModeCheck:
    """The driver picks its job by one argument: this script is the branch for `value` (None: a
    value none of the tests accepts), and refuses an argument that the driver's tests would send
    to another branch."""

    param: str  # the script parameter holding that argument
    value: str | None
    tests: tuple[tuple[str, bool], ...]  # (literal, ignore_case), every test of the argument in the driver
    origin: Span


@dataclass(frozen=True)
class Stage:
    """An earlier job of a chain in one driver: its plan, and the folder the driver wrote its
    output to and the next job read (the script passes the lines on; it writes the folder only
    when asked to keep intermediates)."""

    plan: Plan
    output: Param
    origin: Span  # the driver line that submits the job
    readers: int = 1  # how many later jobs read this output


@dataclass(frozen=True)
class Plan:
    """A whole job: source → map steps → optional group → sink, plus what needs hand work."""

    job_name: str
    source: Source
    map_steps: tuple[Step, ...]
    reduce: Step | None
    sink: Sink
    params: tuple[Param, ...]
    hand_work: tuple[HandWork, ...] = ()
    shapes: tuple[str, ...] = ()
    notes: tuple[str, ...] = ()
    findings: tuple[Finding, ...] = ()
    branches: tuple[Branch, ...] = ()  # MultipleInputs: each input with its own mapper (map_steps is empty)
    tables: tuple[SideTable, ...] = ()  # side files the mappers look rows up in
    upstream: tuple["Stage", ...] = ()  # chained jobs: the earlier jobs of the driver, in order
    mode: ModeCheck | None = None  # a driver that picks its job by an argument: the branch this job is
    # job settings the driver sets from its arguments (`conf.set(name, args[i])`): (setting, param)
    arg_settings: tuple[tuple[str, str], ...] = ()
    # what the driver prints after the job from the job's counters: (where, pieces, ends the line); a
    # piece is ("str", text) or ("counter", group, name)
    prints: tuple[tuple[Span, tuple, bool], ...] = ()
    # the driver's check of its arguments: where, the stream and text it prints, and its exit code
    usage: tuple[Span, str, str, int] | None = None

    def __post_init__(self) -> None:
        if not self.map_steps or not isinstance(self.map_steps[-1], Project):
            if not self.hand_work and not self.branches:
                raise ValueError("map steps must end in a Project unless hand work stands in for them")
        if self.reduce is not None and not isinstance(self.reduce, (Group, Identity, EachValue, Runs, TopN, TopPerKey,
                                                                    Join)):
            raise ValueError("reduce must be a Group, EachValue, Runs, TopN, TopPerKey, Join or Identity step")


# ----------------------------------------------------------------------------- text dump


def rewrite(e: Expr, swap) -> Expr:
    """`e` with every sub-expression x for which swap(x) gives an expression replaced by it (the
    replacement is not searched again)."""
    new = swap(e)
    if new is not None:
        return new
    changes = {}
    for f in dataclasses.fields(e):
        v = getattr(e, f.name)
        if isinstance(v, Expr):
            changes[f.name] = rewrite(v, swap)
        elif isinstance(v, tuple) and v and all(isinstance(x, Expr) for x in v):
            changes[f.name] = tuple(rewrite(x, swap) for x in v)
        elif isinstance(v, tuple) and v and all(isinstance(x, tuple) and len(x) == 2 and isinstance(x[1], Expr)
                                                 for x in v):
            changes[f.name] = tuple((k, rewrite(x, swap)) for k, x in v)
    return dataclasses.replace(e, **changes) if changes else e


def resolve_fields(e: Expr) -> Expr:
    """`e` with each field read of a Writable made in place (`{a: x, b: y}.b`) replaced by that field's value."""
    def swap(x):
        if isinstance(x, Field):
            base = resolve_fields(x.base)
            if isinstance(base, StructNew):
                return dict(base.items).get(x.name)
        return None
    return rewrite(e, swap)


def walk(e: Expr | None, inner=None):
    """The expression and every sub-expression in it, depth first; `inner(x)`, when given, names the
    sub-expressions of x to visit (instead of all)."""
    if e is None:
        return
    yield e
    if inner is not None and inner(e) is not None:
        for sub in inner(e):
            yield from walk(sub, inner)
        return
    for a in getattr(e, "args", ()) or ():
        yield from walk(a, inner)
    for _, item in getattr(e, "items", ()) or ():
        yield from walk(item, inner)
    for name in ("left", "right", "arg", "cond", "then", "other", "base"):
        sub = getattr(e, name, None)
        if isinstance(sub, Expr):
            yield from walk(sub, inner)


def dump_expr(e: Expr | None) -> str:
    """A compact, stable text form of an expression (used by rule tests)."""
    if e is None:
        return "null"
    if isinstance(e, Col):
        return e.name
    if isinstance(e, Lit):
        return repr(e.value)
    if isinstance(e, AggRef):
        return f"@{e.name}"
    if isinstance(e, ConfValue):
        return f"conf.{e.reader}({e.name!r}, {e.default!r})"
    if isinstance(e, Call):
        tail = "?" if e.on_error == "null" else ""
        return f"{e.op}{tail}({', '.join(dump_expr(a) for a in e.args)})"
    if isinstance(e, (Arith, Compare)):
        return f"({dump_expr(e.left)} {e.op}{':' + e.jtype if isinstance(e, Arith) else ''} {dump_expr(e.right)})"
    if isinstance(e, BoolOp):
        if e.op == "!":
            return f"!{dump_expr(e.args[0])}"
        return "(" + f" {e.op} ".join(dump_expr(a) for a in e.args) + ")"
    if isinstance(e, Cond):
        return f"({dump_expr(e.cond)} ? {dump_expr(e.then)} : {dump_expr(e.other)})"
    if isinstance(e, Cast):
        return f"({e.jtype}) {dump_expr(e.arg)}"
    if isinstance(e, StructNew):
        return "{" + ", ".join(f"{k}: {dump_expr(v)}" for k, v in e.items) + "}"
    if isinstance(e, Field):
        return f"{dump_expr(e.base)}.{e.name}"
    raise TypeError(f"no dump for {type(e).__name__}")


def dump_plan(plan: Plan) -> str:
    """An indented, one-node-a-line text form of a plan."""
    out = [f"Plan {plan.job_name}", f"  Source {plan.source.fmt} <- {', '.join(plan.source.params)}"
           + (" (skip first line of each file)" if plan.source.skip_first_line else "")]
    for i, st in enumerate(plan.upstream, 1):
        out.append(f"  Job {i} of the chain -> {st.output.name}")
        out.extend("  " + line for line in dump_plan(st.plan).splitlines())
    if plan.source.upstream is not None:
        out.append(f"  Reads the lines of job {plan.source.upstream + 1}")
    for t in plan.tables:
        out.append(f"  SideTable {t.name} ({t.kind} {t.key_type}->{t.value_type}) <- cache file {t.cache_file!r}"
                   + (f" ({t.param})" if t.param else ""))
        out.extend("    " + _dump_step(s) for s in t.steps)
        g = f" if {dump_expr(t.put.guard)}" if t.put.guard is not None else ""
        out.append(f"    Put {dump_expr(t.put.key)} -> {dump_expr(t.put.value)}{g}")
    for s in plan.map_steps:
        out.append("  " + _dump_step(s))
    for i, b in enumerate(plan.branches, 1):
        out.append(f"  Input {i} {b.source.fmt} <- {', '.join(b.source.params)} mapper {b.mapper.rsplit('.', 1)[-1]}")
        out.extend("    " + _dump_step(s) for s in b.steps)
    if plan.reduce is not None:
        out.append("  " + _dump_step(plan.reduce))
    k = plan.sink
    out.append(f"  Sink {k.param} key={k.key_type} value={k.value_type} sorted={k.sorted_by_key} overwrite={k.overwrite}")
    for h in plan.hand_work:
        out.append(f"  HandWork {h.category} @{h.origin}: {h.reason}")
    for f in plan.findings:
        out.append(f"  Finding {f.category} @{f.origin}: {f.message}")
    return "\n".join(out) + "\n"


def _dump_step(s: Step) -> str:
    if isinstance(s, Let):
        return f"Let {s.name} = {dump_expr(s.expr)}"
    if isinstance(s, Filter):
        return f"Filter {dump_expr(s.cond)}"
    if isinstance(s, Explode):
        return f"Explode {s.name} <- {dump_expr(s.array)}"
    if isinstance(s, Lookup):
        return f"Lookup {s.name} = {s.table}[{dump_expr(s.key)}]"
    if isinstance(s, Count):
        group, name = (x if isinstance(x, str) else f"[{dump_expr(x)}]" for x in (s.group, s.name))
        return f"Count {group}:{name} += {dump_expr(s.amount)} where {dump_expr(s.cond)}"
    if isinstance(s, TaskTopN):
        g = f" if {dump_expr(s.put.guard)}" if s.put.guard is not None else ""
        lines = [f"Per map task: TreeMap put {dump_expr(s.put.key)} -> {dump_expr(s.put.value)}{g}",
                 f"    Keep {s.n} {'largest' if s.keep_largest else 'smallest'} map keys, "
                 f"written {'descending' if s.descending else 'ascending'}"]
        lines += [f"    Write {dump_expr(e.key)} -> {dump_expr(e.value)}" for e in s.emits]
        return "\n".join(lines)
    if isinstance(s, Project):
        lines = ["Project"]
        for e in s.emits:
            g = f" if {dump_expr(e.guard)}" if e.guard is not None else ""
            lines.append(f"    Emit {dump_expr(e.key)} -> {dump_expr(e.value)}{g}")
        return "\n".join(lines)
    if isinstance(s, Group):
        lines = ["Group by key" + (" (distinct)" if s.distinct else "")
                 + (f" (first {s.first_keys} keys of each task)" if s.first_keys is not None else "")
                 + (f" (keys where {dump_expr(s.keys)})" if s.keys is not None else "")]
        lines += [f"    {_dump_step(x)}" for x in s.lets]
        for a in s.aggs:
            lines.append(f"    Agg {a.name} = {a.fn}:{a.jtype}({dump_expr(a.arg)}) init={a.init!r}")
        lines += [f"    Per call: {_dump_step(c)}" for c in s.counts]
        for e in s.emits:
            having = f" if {dump_expr(e.guard)}" if e.guard is not None else ""
            lines.append(f"    Out {dump_expr(e.key)} -> {dump_expr(e.value)}{having}")
        return "\n".join(lines)
    if isinstance(s, EachValue):
        lines = ["For each value (sorted by key)" + (f" (keys where {dump_expr(s.keys)})" if s.keys is not None else "")]
        lines += [f"    {_dump_step(x)}" for x in s.lets]
        if s.group:
            order = ", ".join(f"{dump_expr(e)}{'' if asc else ' desc'}" for e, asc in s.order)
            lines.append(f"    Call per group ({', '.join(dump_expr(e) for e in s.group)}) ordered by ({order})"
                         + (", first value taken before the loop" if s.first_value else ""))
        for label, emits in (("Before", s.before), ("Emit", s.emits), ("After", s.after)):
            for e in emits:
                g = f" if {dump_expr(e.guard)}" if e.guard is not None else ""
                lines.append(f"    {label} {dump_expr(e.key)} -> {dump_expr(e.value)}{g}")
        return "\n".join(lines)
    if isinstance(s, Runs):
        order = f"{dump_expr(s.order[0])}{'' if s.order[1] else ' desc'}" if s.order is not None else "?"
        lines = [f"Runs per group ({', '.join(dump_expr(e) for e in s.group)}), a run per {dump_expr(s.field)} "
                 f"({s.marker}, tested as {dump_expr(s.test)}), runs in the order of {order}",
                 *("    " + x for x in _dump_step(s.fold).replace("Group by key", "Fold of one run").splitlines()),
                 f"    Flushed into {s.items}, in run order"]
        lines += [f"    Write {dump_expr(e.key)} -> {dump_expr(e.value)}" for e in s.writes]
        return "\n".join(lines)
    if isinstance(s, TopN):
        part = f" per reduce task ({s.partitions}, by {dump_expr(s.partition)})" if s.partition is not None else ""
        lines = [_dump_step(s.fold).replace("Group by key", "TopN fold per key"),
                 f"    Keep {s.n} {'largest' if s.keep_largest else 'smallest'} map keys{part}, "
                 f"written {'descending' if s.descending else 'ascending'}"]
        for e in s.writes:
            lines.append(f"    Write {dump_expr(e.key)} -> {dump_expr(e.value)}")
        return "\n".join(lines)
    if isinstance(s, TopPerKey):
        lines = ["TopPerKey" + (f" (keys where {dump_expr(s.keys)})" if s.keys is not None else "")]
        lines += [f"    {_dump_step(x)}" for x in s.lets]
        lines.append(f"    Keep {s.n} {'largest' if s.keep_largest else 'smallest'} distinct {dump_expr(s.elem)}, "
                     f"written {'descending' if s.descending else 'ascending'}")
        lines += [f"    Write {dump_expr(e.key)} -> {dump_expr(e.value)}" for e in s.writes]
        return "\n".join(lines)
    if isinstance(s, Join):
        lines = ["Join by key" + (f" (keys where {dump_expr(s.keys)})" if s.keys is not None else "")]
        lines += [f"    {_dump_step(x)}" for x in s.lets]
        for side in s.sides:
            kind = "list" if side.many else f"one value, default {side.default!r}"
            lines.append(f"    Side {side.name} ({kind}) = {dump_expr(side.elem)} where {dump_expr(side.when)}")
        for w in s.writes:
            g = f" if {dump_expr(w.emit.guard)}" if w.emit.guard is not None else ""
            over = f" for each {' x '.join(w.loops)}" if w.loops else ""
            lines.append(f"    Out {dump_expr(w.emit.key)} -> {dump_expr(w.emit.value)}{over}{g}")
        return "\n".join(lines)
    if isinstance(s, Identity):
        return "Identity (sorted by key)"
    raise TypeError(f"no dump for {type(s).__name__}")
