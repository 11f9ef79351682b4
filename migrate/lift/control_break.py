"""A control break in reduce(): runs of one key folded on their own inside a secondary sort's group.

With a grouping comparator on the first fields of a composite key, one reduce() call reads every
key of a group in the sort order. A common reducer then keeps a marker (`currYear = 0`), and
when the value's field differs from it, adds what it folded so far to a list (`if (currYear != 0)
result.add(...)`), sets the marker and starts every accumulator over; after the loop it adds the
last run the same way and writes the list once:

    for (V v : values) {
        if (v.getYear() != currYear) {
            if (currYear != 0) { ...; result.add(item); }
            currYear = v.getYear(); sum = 0; count = 0;
        }
        sum += ...; count++;
    }
    if (currYear != 0) { ...; result.add(item); }
    context.write(key.getStation(), new Text(String.join(", ", result)));

Where the field equals the key's last sort field (the job rule proves that), each run is one key
of the group, so this is a fold per key (the flush as its write, under the flush's test) and
then, per group, the flushed items in the sort order. It is the same for every run, the first
included, when each accumulator starts from the value it is reset to and the flush's test fails
for the marker's first value (no empty first run is flushed; a run whose field is that value is
never flushed, in Java as here).
"""
from __future__ import annotations

from dataclasses import dataclass

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.exprs import GatheredList, Unsupported
from migrate.lift.reducer import FoldLifter
from migrate.lower.walk import assigned_names, is_name, mentions, name_ref, positioned, same_code
from migrate.plan import AggRef, Col, Count, Expr, Field, Group, HandWork, Lit, Runs, Span, rewrite, walk

_LISTS = {"List", "ArrayList", "LinkedList"}
_ITEM_TYPES = {"String": "String", "Integer": "int", "Long": "long"}
_MARKER_TYPES = {"int", "long"}  # `!=` on them compares values (not on Integer, and NaN on doubles)
_TESTS = {"!=": lambda a, b: a != b, ">": lambda a, b: a > b, "<": lambda a, b: a < b, ">=": lambda a, b: a >= b,
          "<=": lambda a, b: a <= b, "==": lambda a, b: a == b}
_MIRROR = {"!=": "!=", "==": "==", ">": "<", "<": ">", ">=": "<=", "<=": ">="}


@dataclass
class Shape:
    """The parts of a control-break reduce() (javalang nodes of the lowered method)."""

    marker: str
    marker_type: str
    sentinel: int
    run: object  # the expression the break test compares with the marker (over the loop's value)
    loop: T.ForStatement
    rest: list  # the loop body after the break test: the fold of one run
    kept: list  # declarations before the loop other than the marker and the list (accumulators, constants)
    guard: object  # the flush's test (over the marker)
    flush: list  # the flush: declarations, then `items.add(item)`
    items: str
    item_type: str
    after: list  # what reduce() does after the last flush: its writes of the list
    guards: list  # leading `if (test) return;` statements: tests of the key


def find(method: T.MethodDeclaration) -> Shape | None:
    """The control break in `method`, or None where reduce() is not one. Unsupported where it is one
    but a part of it is not the form proved above."""
    params = [p.name for p in method.parameters]
    body = list(method.body or [])
    at = next((i for i, s in enumerate(body) if isinstance(s, (T.ForStatement, T.WhileStatement, T.DoStatement))), None)
    if at is None or len(params) < 3 or at + 1 >= len(body):
        return None
    loop, pre, last, after = body[at], body[:at], body[at + 1], body[at + 2:]
    guards = []  # `if (test of the key) return;` first: the fold's key tests (the job rule checks what they read)
    while pre and isinstance(pre[0], T.IfStatement) and pre[0].else_statement is None and \
            [type(x) for x in _block(pre[0].then_statement)] == [T.ReturnStatement] and not mentions(pre[0], params[1]):
        guards.append(pre.pop(0))
    ctl = getattr(loop, "control", None)
    if not (isinstance(ctl, T.EnhancedForControl) and is_name(ctl.iterable, params[1])):
        return None
    inner = _block(loop.body)
    brk = inner[0] if inner else None
    if not (isinstance(brk, T.IfStatement) and brk.else_statement is None and isinstance(brk.condition, T.BinaryOperation)
            and brk.condition.operator == "!="):
        return None
    declared = {d.name: (s, d) for s in pre if isinstance(s, T.LocalVariableDeclaration) for d in s.declarators}
    sides = (brk.condition.operandl, brk.condition.operandr)
    marker = next((x.member for x in sides if is_name(x) and x.member in declared), None)
    then = _block(brk.then_statement)
    if marker is None or not then or not isinstance(then[0], T.IfStatement) or not isinstance(last, T.IfStatement):
        return None
    run = sides[1] if is_name(sides[0], marker) else sides[0]
    flushed, guard = _block(then[0].then_statement), then[0].condition
    add = flushed[-1].expression if flushed and isinstance(flushed[-1], T.StatementExpression) else None
    if not (isinstance(add, T.MethodInvocation) and add.member == "add" and add.qualifier in declared
            and len(add.arguments or []) == 1 and not add.selectors):
        return None
    items = add.qualifier
    # from here on it is a control break: what does not fit is said, not passed over
    where = brk
    if then[0].else_statement is not None or last.else_statement is not None:
        raise Unsupported(then[0], "the flush of a run has an else branch")
    if not (same_code(last.condition, guard) and same_code(_block(last.then_statement), flushed)):
        raise Unsupported(last, "the flush after the loop is not the same as the one inside it, so the last run is "
                                "not flushed like the others")
    if any(not isinstance(s, T.LocalVariableDeclaration) for s in pre):
        raise Unsupported(next(s for s in pre if not isinstance(s, T.LocalVariableDeclaration)),
                          "reduce() does more than declare its accumulators before the loop over values")
    m_stmt, m_decl = declared[marker]
    marker_type = getattr(m_stmt.type, "name", "")
    sentinel = _int_literal(m_decl.initializer)
    if marker_type not in _MARKER_TYPES or m_stmt.type.dimensions or sentinel is None:
        raise Unsupported(m_stmt, f"the run marker `{marker}` is not an int or long that starts from a literal")
    i_stmt, i_decl = declared[items]
    init = i_decl.initializer
    item_type = _ITEM_TYPES.get(_element(i_stmt.type), "")
    if getattr(i_stmt.type, "name", "") not in _LISTS or not (isinstance(init, T.ClassCreator) and not init.arguments
                                                               and not init.selectors) or not item_type:
        raise Unsupported(i_stmt, f"`{items}` is not a new, empty List of String, Integer or Long")
    if not _sentinel_fails(guard, marker, sentinel):
        raise Unsupported(then[0], f"the flush test does not fail for the marker's first value ({sentinel}), so "
                                   "an empty first run would be flushed", category="secondary-sort")
    # the break block: the flush, then the marker set to the run's field and every accumulator reset
    kept = [s for s in pre if s is not m_stmt and s is not i_stmt]
    starts = {d.name: d.initializer for s in kept for d in s.declarators}
    rest = inner[1:]
    resets, marked = set(), False
    for s in then[1:]:
        e = s.expression if isinstance(s, T.StatementExpression) else None
        if not (isinstance(e, T.Assignment) and e.type == "=" and is_name(e.expressionl)):
            raise Unsupported(s, "the break block does more than flush, set the marker and reset accumulators",
                              category="secondary-sort")
        name = e.expressionl.member
        if name == marker and same_code(e.value, run) and not marked:
            marked = True
        elif name in starts and not mentions(e.value, marker) and _same_start(starts[name], e.value):
            resets.add(name)
        else:
            raise Unsupported(s, f"`{name}` is not started over with the value it is declared with",
                              category="secondary-sort")
    if not marked:
        raise Unsupported(where, f"the break block does not set `{marker}` to the value it tests", category="secondary-sort")
    folded = {n for s in rest for n in assigned_names(s) if n in starts}
    if folded - resets:
        raise Unsupported(where, f"`{sorted(folded - resets)[0]}` is not started over at a new run: it carries on "
                                 "across runs", category="secondary-sort")
    # what each part may read: the marker only in the flushes; the list only through the flushes' add
    # and after the loop; the loop's value never in a flush (it is already the next run's)
    value = ctl.var.declarators[0].name
    for part, what in ((rest, "the fold of a run"), (after, "the writes after the loop")):
        for name in (marker, items) if part is rest else (marker, *starts.keys() - _constants(kept, rest, then)):
            if any(mentions(s, name) for s in part):
                raise Unsupported(where, f"{what} reads `{name}`", category="secondary-sort")
    if any(mentions(s, value) for s in flushed) or any(mentions(s, params[1]) for s in flushed + after):
        raise Unsupported(then[0], "the flush reads the loop's value, which at a break is the next run's",
                          category="secondary-sort")
    if any(mentions(s, items) for s in flushed[:-1]) or mentions(add.arguments[0], items) or \
            any(mentions(s, items) for s in rest):
        raise Unsupported(then[0], f"`{items}` is read while it is being filled", category="secondary-sort")
    if any(not isinstance(s, T.LocalVariableDeclaration) for s in flushed[:-1]):
        raise Unsupported(then[0], "the flush does more than compute the item it adds", category="secondary-sort")
    if assigned_names(loop) & {marker} != {marker} or any(marker in assigned_names(s) for s in rest + after + flushed):
        raise Unsupported(where, f"`{marker}` is set outside the break block", category="secondary-sort")
    return Shape(marker, marker_type, sentinel, run, loop, rest, kept, guard, flushed, items, item_type, after, guards)


def lift_runs(cls: ClassInfo, method: T.MethodDeclaration, key_t: str, val_t: str, index,
              settings: dict) -> tuple[Runs | None, list[HandWork]]:
    """reduce() as a Runs step when it is a control break (None and no items where it is not); the
    fold's hand work, or Unsupported, says why one is not converted."""
    shape = find(method)
    if shape is None:
        return None, []
    params = [p.name for p in method.parameters]
    write = T.StatementExpression(expression=T.MethodInvocation(
        qualifier=params[2], member="write", arguments=[name_ref(params[0]), shape.flush[-1].expression.arguments[0]],
        selectors=[], prefix_operators=[], postfix_operators=[]))
    positioned(write, shape.flush[-1])
    flush = T.IfStatement(condition=shape.guard, then_statement=T.BlockStatement(statements=shape.flush[:-1] + [write]))
    positioned(flush, shape.guard)
    loop = T.ForStatement(control=shape.loop.control, body=T.BlockStatement(statements=shape.rest))
    positioned(loop, shape.loop)
    one_run = _method_like(method, shape.guards + shape.kept + [loop, flush])
    fold = FoldLifter(cls, one_run, key_t, val_t, index, settings=settings)
    fold.scope.env[shape.marker] = Col(shape.marker_type, shape.marker)
    group, items = fold.run()
    if items:
        return None, items
    if not isinstance(group, Group) or group.distinct or group.counts \
            or group.first_keys is not None or any(isinstance(s, Count) for s in group.lets) or len(group.emits) != 1:
        raise Unsupported(shape.loop, "the fold of one run is not a plain fold over its values", category="secondary-sort")
    run_value = fold.lift_in_loop(shape.run)
    if run_value.jtype not in _MARKER_TYPES:
        raise Unsupported(shape.loop, f"the run's field is a {run_value.jtype}, compared with `!=`",
                          category="secondary-sort")
    writer = FoldLifter(cls, _method_like(method, shape.after), key_t, val_t, index, settings=settings)
    listed = AggRef(f"{shape.item_type}[]", shape.items)
    writes = writer.lift_after_loop(shape.after, {shape.items: GatheredList(shape.items, listed, sorted=True)})
    if not writes:
        raise Unsupported(method, "reduce() writes nothing after its loop", category="secondary-sort")
    if group.emits[0].value is None or group.emits[0].value.jtype != shape.item_type:
        raise Unsupported(shape.flush[-1], f"the item added to `{shape.items}` is not a {shape.item_type}",
                          category="secondary-sort")
    a, b = node_lines(method)
    return Runs(Span(cls.file.path, a, b), f"a control break on `{shape.marker}`", group, shape.marker, shape.items,
                tuple(writes), run_value), []


def _method_like(method: T.MethodDeclaration, body: list) -> T.MethodDeclaration:
    m = T.MethodDeclaration(name=method.name, parameters=method.parameters, body=body, modifiers=method.modifiers,
                            annotations=method.annotations, return_type=method.return_type,
                            type_parameters=method.type_parameters, throws=method.throws,
                            documentation=None)
    return positioned(m, method)


def _constants(kept: list, rest: list, then: list) -> set[str]:
    """Declarations before the loop that nothing assigns: constants the writes after it may read."""
    changed = {n for s in rest + then for n in assigned_names(s)}
    return {d.name for s in kept for d in s.declarators if d.name not in changed}


def _block(st) -> list:
    if st is None:
        return []
    return list(st.statements) if isinstance(st, T.BlockStatement) else [st]


def _element(t) -> str:
    args = getattr(t, "arguments", None) or []
    return getattr(getattr(args[0], "type", None), "name", "") if len(args) == 1 else ""


def _int_literal(node) -> int | None:
    """An integer literal (optionally negated), as its value."""
    neg = isinstance(node, T.Literal) and (node.prefix_operators or []) == ["-"]
    if not isinstance(node, T.Literal) or (node.prefix_operators or []) not in ([], ["-"]) or node.selectors:
        return None
    text = node.value.rstrip("lL").replace("_", "")
    try:
        v = int(text, 16) if text.lower().startswith("0x") else int(text, 8) if len(text) > 1 and text.startswith("0") \
            else int(text)
    except ValueError:
        return None
    return -v if neg else v


def _number(node) -> float | None:
    """A numeric literal's value (ints and decimals; hex and octal as integers)."""
    i = _int_literal(node)
    if i is not None:
        return i
    if not isinstance(node, T.Literal) or (node.prefix_operators or []) not in ([], ["-"]):
        return None
    try:
        v = float(node.value.rstrip("dDfF").replace("_", ""))
    except ValueError:
        return None
    return -v if node.prefix_operators else v


def _same_start(init, reset) -> bool:
    """Does `reset` give the accumulator the value its declaration gave it?"""
    if same_code(init, reset):
        return True
    a, b = _number(init), _number(reset)
    # 0 and 0.0 are one double; -0.0 is another (a sum over no values prints it)
    return a is not None and b is not None and a == b and str(a).startswith("-") == str(b).startswith("-")


def _sentinel_fails(guard, marker: str, sentinel: int) -> bool:
    """Is the flush test `marker OP literal` (either way round) false when the marker holds `sentinel`?"""
    if not (isinstance(guard, T.BinaryOperation) and guard.operator in _TESTS):
        return False
    op, left, right = guard.operator, guard.operandl, guard.operandr
    if is_name(right, marker):
        op, left, right = _MIRROR[op], right, left
    other = _int_literal(right)
    return is_name(left, marker) and other is not None and not _TESTS[op](sentinel, other)


def reads_only(e: Expr | None, names: set[str]) -> bool:
    """Does `e` read the key only through the fields `names` (those every key of a group shares)?"""
    if e is None:
        return True
    shared = rewrite(e, lambda x: Lit(x.jtype, None) if isinstance(x, Field) and isinstance(x.base, Col)
                     and x.base.name == "key" and x.name in names else None)
    return not any(isinstance(x, Col) and x.name == "key" for x in walk(shared))
