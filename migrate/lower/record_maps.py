"""In-mapper combining into records: a Map field whose values are records of sums (lower.record_locals'
kind), made present and added to in map() and written whole in cleanup(), as a write per update:

    if (!byDock.containsKey(dock)) byDock.put(dock, new Flow());   ->  context.write(dock, new Flow());
    byDock.get(dock).addIn(n, 1);                                  ->  Flow byDock_update = new Flow();
                                                                       byDock_update.addIn(n, 1);
                                                                       context.write(dock, byDock_update);
    cleanup: for (Map.Entry<K, Flow> e : byDock.entrySet()) context.write(e.getKey(), e.getValue());  -> (gone)

The task's entry for a key is the field-wise sum of those records (each field starts at its
constant and is only added to), so a reducer that sums every field gets the same totals either
way; the job rule checks that (`combined_records` on the class) as it checks a combiner. Any other
use of the Map leaves it as written.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.lift.combining import flushes_all_entries
from migrate.lower.record_locals import RecordClass
from migrate.lower.walk import is_name, line_of, mentions, name_ref, positioned, statement_lists

_MAPS = {"Map", "HashMap", "LinkedHashMap", "TreeMap"}


def record_maps(cls, index=None) -> list[tuple[int, str]]:
    if index is None or "mapper" not in cls.roles:
        return []
    maps = [m for m in cls.node.methods if m.name == "map" and len(m.parameters) == 3 and m.body]
    cleanups = [m for m in cls.node.methods if m.name == "cleanup" and len(m.parameters) == 1]
    if len(maps) != 1 or len(cleanups) != 1:
        return []
    done = []
    for f in cls.fields():
        args = getattr(f.type, "arguments", None) or []
        if len(f.declarators) != 1 or getattr(f.type, "name", "") not in _MAPS or len(args) != 2 \
                or "static" in (f.modifiers or set()) or any(getattr(a, "type", None) is None for a in args):
            continue
        name = f.declarators[0].name
        info = index.get(index.resolve(args[1].type.name, cls))
        rec = RecordClass.of(info) if info is not None and not args[1].type.arguments else None
        key_type = args[0].type.name
        if rec is None or key_type not in ("Text", "String") or not flushes_all_entries(cleanups[0], name) \
                or not _writes_records_whole(cleanups[0], key_type):
            continue
        if not _only_updates(cls, f, name, rec, maps[0], cleanups[0]) or not _fresh_keys(maps[0], name, key_type):
            continue
        _rewrite(cls, f, name, rec, maps[0], cleanups[0], key_type)
        cls.combined_records.append((name, info.fqcn))
        done.append((line_of(f), f"`{name}` (a Map of {rec.name}) combines in the mapper: a write per update"))
    return done


def _writes_records_whole(cleanup, key_type: str) -> bool:
    """The flush writes each entry's record itself, and its key as a Text (`new Text(e.getKey())`
    for a String key)."""
    writes = [n for _, n in cleanup if isinstance(n, T.MethodInvocation) and n.member in ("write", "collect")]
    if len(writes) != 1:
        return False
    k, v = writes[0].arguments
    if not (isinstance(v, T.MethodInvocation) and v.member == "getValue" and not v.arguments):
        return False
    wrapped = isinstance(k, T.ClassCreator) and k.type.name == "Text"
    return wrapped == (key_type == "String") and (not wrapped or len(k.arguments) == 1)


def _ensures(s, name: str, rec: RecordClass):
    """The key of `if (!m.containsKey(k)) { m.put(k, new R()); }` or `m.putIfAbsent(k, new R());`."""
    if isinstance(s, T.IfStatement) and s.else_statement is None:
        c = s.condition
        then = s.then_statement.statements if isinstance(s.then_statement, T.BlockStatement) else [s.then_statement]
        if isinstance(c, T.MethodInvocation) and c.qualifier == name and c.member == "containsKey" \
                and c.prefix_operators == ["!"] and not c.selectors and len(c.arguments) == 1 and is_name(c.arguments[0]) \
                and len(then) == 1 and _put_new(then[0], name, rec, "put") == c.arguments[0].member:
            return c.arguments[0].member
        return None
    return _put_new(s, name, rec, "putIfAbsent")


def _put_new(s, name: str, rec: RecordClass, method: str) -> str | None:
    e = s.expression if isinstance(s, T.StatementExpression) else None
    if isinstance(e, T.MethodInvocation) and e.qualifier == name and e.member == method and not e.selectors \
            and len(e.arguments) == 2 and is_name(e.arguments[0]) and isinstance(e.arguments[1], T.ClassCreator) \
            and e.arguments[1].type.name == rec.name and not e.arguments[1].arguments and e.arguments[1].body is None:
        return e.arguments[0].member
    return None


def _update(s, name: str, rec: RecordClass):
    """(key name, updater call) of `m.get(k).upd(args);`."""
    e = s.expression if isinstance(s, T.StatementExpression) else None
    if isinstance(e, T.MethodInvocation) and e.qualifier == name and e.member == "get" and len(e.arguments) == 1 \
            and is_name(e.arguments[0]) and len(e.selectors or []) == 1 and isinstance(e.selectors[0], T.MethodInvocation):
        call = e.selectors[0]
        if (call.member, len(call.arguments or [])) in rec.updaters and not call.selectors:
            return e.arguments[0].member, call
    return None


def _only_updates(cls, f, name: str, rec: RecordClass, mapper, cleanup) -> bool:
    """The Map starts empty and serves nothing but presence, updates and the flush."""
    init = f.declarators[0].initializer
    if init is not None and not _new_empty_map(init):
        return False
    for m in cls.node.methods:
        if m is cleanup or not mentions(m, name):
            continue
        if m.name == "setup" and all(_made_empty(s, name) or not mentions(s, name) for s in m.body or []):
            continue
        if m is not mapper:
            return False
        inside = {id(n) for _, s in m for _, n in s if isinstance(s, T.IfStatement) and _ensures(s, name, rec)
                  and n is not s}  # the put of a presence test is read with it
        for stmts, _ in statement_lists(m):
            for s in stmts:
                if id(s) in inside:
                    continue
                if isinstance(s, (T.BlockStatement, T.IfStatement, T.TryStatement, T.ForStatement,
                                  T.WhileStatement, T.DoStatement, T.SwitchStatement)) and _ensures(s, name, rec) is None:
                    if isinstance(s, (T.ForStatement, T.WhileStatement, T.DoStatement)) and mentions(s, name):
                        return False  # several updates per record: still a write per update, but kept simple
                    if isinstance(s, T.IfStatement) and mentions(s.condition, name):
                        return False
                    continue  # its own statements are lists of their own
                if mentions(s, name) and _ensures(s, name, rec) is None and _update(s, name, rec) is None:
                    return False
        if not _present_before_updates(m, name, rec):
            return False
    return True


def _present_before_updates(mapper, name: str, rec: RecordClass) -> bool:
    """Every update comes after the key was made present, on every path: a statement making it
    present stands in a list before the statement holding the update (else Java's get() gives null
    and the task fails, which a write per update would not)."""
    def present_before(u) -> bool:
        key = _update(u, name, rec)[0]
        return any(_ensures(s, name, rec) == key and any(u is n for later in stmts[i + 1:] for _, n in later)
                   for stmts, _ in statement_lists(mapper) for i, s in enumerate(stmts))

    return all(present_before(n) for _, n in mapper if isinstance(n, T.StatementExpression) and _update(n, name, rec))


def _fresh_keys(mapper, name: str, key_type: str) -> bool:
    """Every key is a local of map() that holds a String, or a Text made for this record (`new
    Text(...)`): a Text the task sets again later would change a key already in the Map."""
    keys = set()
    for _, n in mapper:
        if isinstance(n, T.MethodInvocation) and n.qualifier == name and n.arguments:
            keys.add(n.arguments[0].member)
    decls = {d.name: (n.type, d.initializer) for _, n in mapper if isinstance(n, T.LocalVariableDeclaration)
             for d in n.declarators}
    assigned = {n.expressionl.member for _, n in mapper if isinstance(n, T.Assignment) and is_name(n.expressionl)}
    assigned |= {n.qualifier for _, n in mapper if isinstance(n, T.MethodInvocation)
                 and n.member in ("set", "append", "clear", "readFields")}  # a Text changed in place
    for k in keys:
        if k not in decls or k in assigned or getattr(decls[k][0], "name", "") != key_type:
            return False
        init = decls[k][1]
        if key_type == "Text" and not (isinstance(init, T.ClassCreator) and init.type.name == "Text" and not init.selectors):
            return False
    return True


def _new_empty_map(e) -> bool:
    return isinstance(e, T.ClassCreator) and e.type.name in _MAPS and not e.arguments and e.body is None


def _made_empty(s, name: str) -> bool:
    e = s.expression if isinstance(s, T.StatementExpression) else None
    return isinstance(e, T.Assignment) and e.type == "=" and _new_empty_map(e.value) and (
        is_name(e.expressionl, name) or isinstance(e.expressionl, T.This) and len(e.expressionl.selectors or []) == 1
        and is_name(e.expressionl.selectors[0], name))


def _rewrite(cls, f, name: str, rec: RecordClass, mapper, cleanup, key_type: str) -> None:
    context = mapper.parameters[2].name
    record_type = T.ReferenceType(name=rec.name, dimensions=[], arguments=None, sub_type=None)

    def new_record():
        return T.ClassCreator(type=record_type, arguments=[], body=None, selectors=[], qualifier=None,
                              prefix_operators=[], postfix_operators=[])

    def write(key: str, value, like):
        k = name_ref(key, like)
        if key_type == "String":  # the flush wrote `new Text(e.getKey())`
            k = T.ClassCreator(type=T.ReferenceType(name="Text", dimensions=[], arguments=None, sub_type=None),
                               arguments=[k], body=None, selectors=[], qualifier=None, prefix_operators=[],
                               postfix_operators=[])
        return positioned(T.StatementExpression(expression=T.MethodInvocation(
            qualifier=context, member="write", arguments=[k, value], selectors=[],
            prefix_operators=[], postfix_operators=[], type_arguments=None)), like)

    taken = {d.name for _, n in mapper if isinstance(n, (T.LocalVariableDeclaration, T.VariableDeclaration))
             for d in n.declarators}
    for stmts, _ in list(statement_lists(mapper)):
        for k, s in enumerate(stmts):
            key = _ensures(s, name, rec)
            if key is not None:  # the entry a task starts a key with: a record of starting values
                stmts[k] = write(key, new_record(), s)
                continue
            got = _update(s, name, rec)
            if got is not None:
                key, call = got
                local, n = f"{name}_update", 2  # one name per update: each becomes locals of its own
                while any(t == local or t.startswith(local + "_") for t in taken):
                    local, n = f"{name}_update{n}", n + 1
                taken.add(local)
                decl = positioned(T.LocalVariableDeclaration(
                    modifiers=set(), annotations=[], type=record_type,
                    declarators=[T.VariableDeclarator(name=local, dimensions=[], initializer=new_record())]), s)
                upd = positioned(T.StatementExpression(expression=T.MethodInvocation(
                    qualifier=local, member=call.member, arguments=call.arguments, selectors=[], prefix_operators=[],
                    postfix_operators=[], type_arguments=None)), s)
                stmts[k] = positioned(T.BlockStatement(statements=[decl, upd, write(key, name_ref(local, s), s)]), s)
    cleanup.body = [s for s in cleanup.body or [] if not mentions(s, name)]
    for m in cls.node.methods:
        if m.name == "setup":
            m.body = [s for s in m.body or [] if not _made_empty(s, name)]
    cls.node.body = [b for b in cls.node.body if b is not f]
