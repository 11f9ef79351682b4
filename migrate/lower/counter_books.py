"""A count per key kept through a helper object of the repository, as a Map field counted with
`merge`: the in-mapper combining rule (lift.combining) then reads one form.

    class Tally { final String word; int seen; Tally(String word) { this.word = word; } }
    class TallyBook {
        private Map<String, Tally> byWord = new HashMap<>();
        void add(String w) { Tally t = byWord.get(w); if (t == null) { t = new Tally(w); byWord.put(w, t); } t.seen++; }
        Collection<Tally> values() { return byWord.values(); }
    }
    book.add(word);                           ->  book.merge(word, 1, Integer::sum);
    for (Tally t : book.values()) { t.word, t.seen }  ->  for (Map.Entry<String, Integer> tEntry : book.entrySet())
                                                          { tEntry.getKey(), tEntry.getValue() }

with the field `TallyBook book = new TallyBook()` becoming `Map<String, Integer> book = new HashMap<>()`.
The same thing: the book maps each key to one record made with that key, whose count starts at 0
and is only stepped by add() (`++`, or `+=` a parameter); values() walks the records in the
map's order, which is the order of the entries (java.util.HashMap: both views iterate one
table). Declined (left as written): a book or record with other state, constructors that do more,
records changed or kept anywhere else, any other use of the book in the task class.
"""
from __future__ import annotations

import copy

from javalang import tree as T

from migrate.lower.map_updates import _simple
from migrate.lower.walk import is_name, line_of, mentions, positioned, replace_nodes

_MAPS = {"Map", "HashMap"}
_COUNTS = {"int": "Integer", "long": "Long"}


def counter_books(cls, index=None) -> list[tuple[int, str]]:
    if index is None:
        return []
    done = []
    for f in cls.fields():
        if len(f.declarators) != 1 or not isinstance(f.type, T.ReferenceType) or f.type.arguments \
                or f.type.sub_type is not None or "static" in (f.modifiers or set()):
            continue
        helper = index.get(index.resolve(f.type.name, cls))
        book = _book(helper, index) if helper is not None and helper is not cls else None
        if book is None:
            continue
        name = f.declarators[0].name
        uses = _uses(cls, name, f, book)
        if uses is None:
            continue
        _rewrite(f, name, book, uses)
        done.append((line_of(f), f"`{name}` ({helper.name}) counts per key: a Map counted with merge"))
    return done


class _Book:
    """What a counter book is made of: its Map field, the record class and its two fields, and
    which of its methods add (key parameter index, amount: 1 or a parameter index) or list."""

    def __init__(self, key_type, record: str, key_field: str, count_field: str, count_type: str):
        self.key_type, self.record = key_type, record
        self.key_field, self.count_field, self.count_type = key_field, count_field, count_type
        self.adds: dict[str, tuple[int, int | None]] = {}
        self.lists: set[str] = set()


def _instance_fields(cls):
    return [f for f in cls.fields() if "static" not in (f.modifiers or set())]


def _book(helper, index) -> _Book | None:
    fields = _instance_fields(helper)
    if len(fields) != 1 or len(fields[0].declarators) != 1:
        return None
    f = fields[0]
    args = getattr(f.type, "arguments", None) or []
    if helper.node.extends is not None or getattr(f.type, "name", "") not in _MAPS or len(args) != 2 \
            or any(getattr(a, "type", None) is None for a in args) or getattr(args[1].type, "arguments", None):
        return None
    m = f.declarators[0].name
    if not _made_empty(helper, m, f.declarators[0].initializer):
        return None
    record = index.get(index.resolve(args[1].type.name, helper))
    parts = _record(record, args[0].type) if record is not None and record is not helper else None
    if parts is None:
        return None
    book = _Book(args[0].type, args[1].type.name, *parts)
    for meth in helper.node.methods:
        if "static" in (meth.modifiers or set()):
            continue
        if _lists(meth, m):
            book.lists.add(meth.name)
            continue
        add = _adds(meth, m, book)
        if add is not None:
            book.adds[meth.name] = add
    return book


def _made_empty(helper, m: str, initializer) -> bool:
    """The book's Map starts empty: `new HashMap<>()` (a capacity does not matter) at its declaration,
    or in the only constructor, which does nothing else."""
    ctors = [c for c in helper.node.body if isinstance(c, T.ConstructorDeclaration)]
    no_arg = [c for c in ctors if not c.parameters]
    if ctors and not no_arg:
        return False  # `new Book()` would not compile; leave it to javac
    body = list(no_arg[0].body or []) if no_arg else []
    if initializer is not None:
        return _new_hash_map(initializer) and not body
    return len(body) == 1 and isinstance(body[0], T.StatementExpression) and isinstance(body[0].expression, T.Assignment) \
        and _field_target(body[0].expression.expressionl, m) and _new_hash_map(body[0].expression.value)


def _new_hash_map(e) -> bool:
    return isinstance(e, T.ClassCreator) and e.type.name == "HashMap" and not e.body and len(e.arguments or []) <= 1


def _field_target(e, name: str) -> bool:
    return is_name(e, name) or isinstance(e, T.This) and len(e.selectors or []) == 1 and is_name(e.selectors[0], name)


def _record(record, key_type) -> tuple[str, str, str] | None:
    """(key field, count field, count type) of a record made from its key, with a count from 0."""
    fields = _instance_fields(record)
    if record.node.extends is not None or record.node.methods or len(fields) != 2 \
            or any(len(f.declarators) != 1 for f in fields):
        return None
    keys = [f for f in fields if _same_type(f.type, key_type)]
    counts = [f for f in fields if isinstance(f.type, T.BasicType) and f.type.name in _COUNTS and not f.type.dimensions]
    if len(keys) != 1 or len(counts) != 1:
        return None
    key, count = keys[0].declarators[0], counts[0].declarators[0]
    if key.initializer is not None or count.initializer is not None and not (
            isinstance(count.initializer, T.Literal) and count.initializer.value.rstrip("lL") == "0"):
        return None
    ctors = [c for c in record.node.body if isinstance(c, T.ConstructorDeclaration)]
    if len(ctors) != 1 or len(ctors[0].parameters) != 1:
        return None
    p, body = ctors[0].parameters[0].name, list(ctors[0].body or [])
    sets_key = len(body) == 1 and isinstance(body[0], T.StatementExpression) and isinstance(
        body[0].expression, T.Assignment) and body[0].expression.type == "=" and \
        _field_target(body[0].expression.expressionl, key.name) and is_name(body[0].expression.value, p)
    return (key.name, count.name, counts[0].type.name) if sets_key else None


def _same_type(a, b) -> bool:
    return type(a) is type(b) and getattr(a, "name", None) == getattr(b, "name", None) \
        and not getattr(a, "arguments", None) and not getattr(b, "arguments", None) and not a.dimensions


def _lists(meth, m: str) -> bool:
    """`Collection<R> values() { return m.values(); }`"""
    body = meth.body or []
    return not meth.parameters and len(body) == 1 and isinstance(body[0], T.ReturnStatement) \
        and isinstance(body[0].expression, T.MethodInvocation) and body[0].expression.qualifier == m \
        and body[0].expression.member == "values" and not body[0].expression.arguments \
        and not body[0].expression.selectors


def _adds(meth, m: str, book: _Book) -> tuple[int, int | None] | None:
    """(key parameter, amount parameter or None for 1) of
    `R c = m.get(k); if (c == null) { c = new R(k); m.put(k, c); } c.count++;` (or `+= n`)."""
    body, params = list(meth.body or []), [p.name for p in meth.parameters]
    if len(body) != 3 or not isinstance(body[0], T.LocalVariableDeclaration) or len(body[0].declarators) != 1:
        return None
    c, got = body[0].declarators[0].name, body[0].declarators[0].initializer
    if getattr(body[0].type, "name", "") != book.record or not _call(got, m, "get", 1) \
            or not is_name(got.arguments[0]) or got.arguments[0].member not in params:
        return None
    k = got.arguments[0].member
    test, fill = body[1], body[1].then_statement if isinstance(body[1], T.IfStatement) else None
    fills = fill.statements if isinstance(fill, T.BlockStatement) else None
    if fills is None or body[1].else_statement is not None or not _is_null_test(test.condition, c) or len(fills) != 2:
        return None
    made, put = (s.expression if isinstance(s, T.StatementExpression) else None for s in fills)
    if not (isinstance(made, T.Assignment) and made.type == "=" and is_name(made.expressionl, c)
            and isinstance(made.value, T.ClassCreator) and made.value.type.name == book.record
            and len(made.value.arguments or []) == 1 and is_name(made.value.arguments[0], k) and not made.value.body):
        return None
    if not (_call(put, m, "put", 2) and is_name(put.arguments[0], k) and is_name(put.arguments[1], c)):
        return None
    step = body[2].expression if isinstance(body[2], T.StatementExpression) else None
    counted = isinstance(step, T.MemberReference) and step.qualifier == c and step.member == book.count_field \
        and not step.selectors and (step.postfix_operators or step.prefix_operators or []) == ["++"]
    if counted:
        return params.index(k), None
    if isinstance(step, T.Assignment) and step.type == "+=" and isinstance(step.expressionl, T.MemberReference) \
            and step.expressionl.qualifier == c and step.expressionl.member == book.count_field \
            and is_name(step.value) and step.value.member in params and step.value.member != k \
            and getattr(meth.parameters[params.index(step.value.member)].type, "name", "") == book.count_type:
        return params.index(k), params.index(step.value.member)  # an amount of the count's own type
    return None


def _call(e, q: str, member: str, n: int) -> bool:
    return isinstance(e, T.MethodInvocation) and e.qualifier == q and e.member == member \
        and len(e.arguments or []) == n and not e.selectors


def _is_null_test(cond, c: str) -> bool:
    return isinstance(cond, T.BinaryOperation) and cond.operator == "==" and (
        is_name(cond.operandl, c) and isinstance(cond.operandr, T.Literal) and cond.operandr.value == "null"
        or is_name(cond.operandr, c) and isinstance(cond.operandl, T.Literal) and cond.operandl.value == "null")


def _uses(cls, name: str, field, book: _Book):
    """Where the task class uses the book: (its creation in setup, add statements, values loops), or
    None when it uses it any other way."""
    created, adds, loops = [], [], []
    init = field.declarators[0].initializer
    if init is not None and not _new_book(init):
        return None
    for meth in cls.node.methods:
        for _, n in meth:
            if isinstance(n, T.StatementExpression) and isinstance(n.expression, T.Assignment) \
                    and _field_target(n.expression.expressionl, name):
                if meth.name not in ("setup", "configure") or init is not None or not _new_book(n.expression.value):
                    return None
                created.append(n)
            elif isinstance(n, T.StatementExpression) and isinstance(n.expression, T.MethodInvocation) \
                    and n.expression.qualifier == name and n.expression.member in book.adds:
                args = n.expression.arguments or []
                kept = [i for i in book.adds[n.expression.member] if i is not None]
                # merge() reads the arguments add() uses, once and in order; one it drops must not throw
                if n.expression.selectors or not all(_simple(a) if i in kept else is_name(a) or isinstance(a, T.Literal)
                                                     for i, a in enumerate(args)):
                    return None
                adds.append(n)
            elif isinstance(n, T.ForStatement) and isinstance(n.control, T.EnhancedForControl) \
                    and getattr(n.control.iterable, "member", None) in book.lists \
                    and _call(n.control.iterable, name, n.control.iterable.member, 0):
                loops.append(n)
    if len(created) + (init is not None) != 1:
        return None
    counted = {id(x) for s in created + adds + [loop.control.iterable for loop in loops] for _, x in s}
    for meth in cls.node.methods:  # nothing else reads or writes the book
        for _, n in meth:
            if id(n) not in counted and isinstance(n, (T.MemberReference, T.MethodInvocation)) and \
                    (n.qualifier == name or isinstance(n, T.MemberReference) and n.member == name
                     and n.qualifier in ("", None, "this")):
                return None
    for loop in loops:
        if not _reads_record_only(loop, book):
            return None
    return created, adds, loops


def _new_book(e) -> bool:
    return isinstance(e, T.ClassCreator) and not e.arguments and not e.body


def _reads_record_only(loop, book: _Book) -> bool:
    """Does the loop only read the record's key and count (`c.key`, `c.count`)?"""
    c = loop.control.var.declarators[0].name
    if getattr(loop.control.var.type, "name", "") != book.record or mentions(loop.body, f"{c}Entry"):
        return False
    for _, n in loop.body:
        if isinstance(n, T.MemberReference) and n.qualifier == c and (
                n.member not in (book.key_field, book.count_field) or n.selectors or n.prefix_operators
                or n.postfix_operators):
            return False  # another field, or a step
        if isinstance(n, T.Assignment) and isinstance(n.expressionl, T.MemberReference) and n.expressionl.qualifier == c:
            return False  # a record changed
        if isinstance(n, T.MethodInvocation) and n.qualifier == c or is_name(n, c):
            return False  # the record itself handed on, or a method of it
    return True


def _rewrite(field, name: str, book: _Book, uses) -> None:
    created, adds, loops = uses
    boxed = _COUNTS[book.count_type]
    counts = T.ReferenceType(name=boxed, dimensions=[], arguments=None, sub_type=None)
    field.type = T.ReferenceType(name="Map", dimensions=[], sub_type=None, arguments=[
        T.TypeArgument(type=copy.deepcopy(book.key_type)), T.TypeArgument(type=counts)])
    empty = T.ClassCreator(type=T.ReferenceType(name="HashMap", dimensions=[], arguments=[], sub_type=None),
                           arguments=[], body=None, selectors=[], qualifier=None, constructor_type_arguments=None,
                           prefix_operators=[], postfix_operators=[])
    if field.declarators[0].initializer is not None:
        field.declarators[0].initializer = positioned(empty, field.declarators[0].initializer)
    for s in created:
        s.expression.value = positioned(copy.deepcopy(empty), s.expression.value)
    for s in adds:
        call = s.expression
        k_at, amount_at = book.adds[call.member]
        amount = copy.deepcopy(call.arguments[amount_at]) if amount_at is not None else \
            T.Literal(value="1L" if boxed == "Long" else "1", prefix_operators=[], postfix_operators=[], qualifier=None,
                      selectors=[])
        total = T.MethodReference(expression=T.MemberReference(member=boxed, qualifier="", selectors=[],
                                                               prefix_operators=[], postfix_operators=[]),
                                  method=T.MemberReference(member="sum", qualifier="", selectors=[],
                                                           prefix_operators=[], postfix_operators=[]),
                                  type_arguments=[])
        s.expression = positioned(T.MethodInvocation(qualifier=name, member="merge", selectors=[], type_arguments=None,
                                                     arguments=[copy.deepcopy(call.arguments[k_at]), amount, total],
                                                     prefix_operators=[], postfix_operators=[]), call)
    for loop in loops:
        c = loop.control.var.declarators[0].name
        entry = f"{c}Entry"
        getters = {book.key_field: "getKey", book.count_field: "getValue"}

        def read(n, c=c, entry=entry, getters=getters):
            if isinstance(n, T.MemberReference) and n.qualifier == c and n.member in getters:
                return positioned(T.MethodInvocation(qualifier=entry, member=getters[n.member], arguments=[],
                                                     selectors=[], type_arguments=None, prefix_operators=[],
                                                     postfix_operators=[]), n)
            return None

        replace_nodes(loop.body, read)
        loop.control.var = T.VariableDeclaration(
            type=T.ReferenceType(name="Map", dimensions=[], arguments=None, sub_type=T.ReferenceType(
                name="Entry", dimensions=[], sub_type=None, arguments=[
                    T.TypeArgument(type=copy.deepcopy(book.key_type)), T.TypeArgument(type=copy.deepcopy(counts))])),
            modifiers=set(), annotations=[], declarators=[T.VariableDeclarator(name=entry, dimensions=[],
                                                                               initializer=None)])
        loop.control.iterable = positioned(T.MethodInvocation(qualifier=name, member="entrySet", arguments=[],
                                                              selectors=[], type_arguments=None, prefix_operators=[],
                                                              postfix_operators=[]), loop.control.iterable)
