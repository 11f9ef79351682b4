"""Constant collections: sets and lists of literals that a task class fills once and only reads.

Recognises: a `static final` (or private, never reassigned) field of type Set/List/Collection
(HashSet, TreeSet, LinkedHashSet, ArrayList, LinkedList, or the interface) made from literals:
`Arrays.asList(...)`, `List.of(...)`, `Set.of(...)`, `new HashSet<>(Arrays.asList(...))`, or made
empty and filled with `X.add(literal)` / `Collections.addAll(X, literals...)` in an initializer
block; elements are Strings, ints or longs, all of one type.
Produces: a ConstCollection binding, which map()/reduce() read: `X.contains(e)` → e IN (...)
(String.equals / Integer.equals on the same type; a contains() whose argument has another type is
false in Java and is declined rather than guessed), `X.size()` and `X.isEmpty()` → literals.
Caveats: anything else that touches the field (another add, remove, clear, passing it on, a loop
over it) leaves the field out, and the lift rules report its use as before.
"""
from __future__ import annotations

from dataclasses import dataclass

from javalang import tree as T

from migrate.java.literals import number_value, string_value

COLLECTION_TYPES = {"Set", "HashSet", "TreeSet", "LinkedHashSet", "List", "ArrayList", "LinkedList", "Collection"}
_FACTORIES = {("Arrays", "asList"), ("List", "of"), ("Set", "of"), ("Collections", "unmodifiableSet"),
              ("Collections", "unmodifiableList")}
READS = {"contains", "size", "isEmpty"}
MAP_TYPES = {"Map", "HashMap", "TreeMap", "LinkedHashMap"}
MAP_READS = {"get", "getOrDefault", "containsKey", "size", "isEmpty"}


@dataclass(frozen=True)
class ConstCollection:
    """A set or list of literal values fixed before the first record."""

    name: str
    jtype: str  # the element type: "String" | "int" | "long"
    values: tuple
    is_set: bool  # a Set holds each value once (size() counts distinct values)


def constant_collections(cls) -> dict[str, ConstCollection]:
    out = {}
    statics = [b for b in cls.node.body if isinstance(b, list)]  # static and instance initializer blocks
    for f in cls.fields():
        if getattr(f.type, "name", "").rsplit(".", 1)[-1] not in COLLECTION_TYPES or len(f.declarators) != 1:
            continue
        d = f.declarators[0]
        if "final" not in f.modifiers and "private" not in f.modifiers:
            continue
        values = _made(d.initializer)
        if values is None:
            continue
        fills = [s for holder in statics for s in holder if _mentions(s, d.name)]
        for s in fills:
            more = _filled(s, d.name)
            if more is None:
                values = None
                break
            values = values + more
        if values is None or not values:
            continue
        # every other use of the field is a read: contains/size/isEmpty
        if not _only_reads(cls, d.name, fills):
            continue
        types = {t for t, _ in values}
        if len(types) != 1:
            continue
        if (getattr(d.initializer, "qualifier", ""), getattr(d.initializer, "member", "")) == ("Set", "of") \
                and len(set(values)) != len(values):
            continue  # Set.of with a duplicate throws IllegalArgumentException when the class loads
        is_set = "Set" in getattr(f.type, "name", "") or isinstance(d.initializer, T.ClassCreator) \
            and "Set" in d.initializer.type.name or isinstance(d.initializer, T.MethodInvocation) \
            and d.initializer.member == "unmodifiableSet" or (getattr(d.initializer, "qualifier", ""), getattr(
                d.initializer, "member", "")) == ("Set", "of")
        out[d.name] = ConstCollection(d.name, types.pop(), tuple(v for _, v in values), is_set)
    return out


@dataclass(frozen=True)
class ConstMap:
    """A map from literal keys to literal values fixed before the first record."""

    name: str
    key_type: str  # "String" | "int" | "long"
    value_type: str
    entries: tuple  # ((key, value), ...): a later put() replaces an earlier one


def constant_maps(cls) -> dict[str, ConstMap]:
    """Map fields made by `Map.of(k, v, ...)`, or made empty and filled with `X.put(k, v)` in an
    initializer block or at the top of setup()/configure(), then only read (get, getOrDefault,
    containsKey, size, isEmpty)."""
    out = {}
    blocks = [b for b in cls.node.body if isinstance(b, list)]
    blocks += [m.body or [] for m in cls.node.methods if m.name in ("setup", "configure")]
    for f in cls.fields():
        if getattr(f.type, "name", "").rsplit(".", 1)[-1] not in MAP_TYPES or len(f.declarators) != 1 \
                or "final" not in f.modifiers and "private" not in f.modifiers:
            continue
        d = f.declarators[0]
        pairs = _map_made(d.initializer)
        fills = [s for block in blocks for s in block if _mentions(s, d.name)]
        for s in fills:
            e = s.expression if isinstance(s, T.StatementExpression) else None
            kv = _literals(e.arguments) if isinstance(e, T.MethodInvocation) and e.qualifier == d.name \
                and e.member == "put" and len(e.arguments or []) == 2 and not e.selectors else None
            if kv is None or pairs is None:
                pairs = None
                break
            pairs = pairs + [tuple(kv)]
        if not pairs or not _only_reads(cls, d.name, fills, MAP_READS):
            continue
        key_types, value_types = {k[0] for k, _ in pairs}, {v[0] for _, v in pairs}
        if len(key_types) != 1 or len(value_types) != 1:
            continue
        entries = dict((k[1], v[1]) for k, v in pairs)
        out[d.name] = ConstMap(d.name, key_types.pop(), value_types.pop(), tuple(entries.items()))
    return out


def _map_made(init) -> list | None:
    """`Map.of(k1, v1, ...)` (distinct keys: a duplicate throws when the class loads) or an empty map."""
    if isinstance(init, T.MethodInvocation) and (init.qualifier, init.member) == ("Map", "of") and not init.selectors:
        lits = _literals(init.arguments)
        if lits is None or len(lits) % 2:
            return None
        pairs = list(zip(lits[0::2], lits[1::2]))
        return pairs if len({k for k, _ in pairs}) == len(pairs) else None
    if isinstance(init, T.ClassCreator) and init.type.name.rsplit(".", 1)[-1] in MAP_TYPES and not init.body \
            and not init.arguments:
        return []
    return None


def constant_fields(cls) -> set[str]:
    """The fields of `cls` that hold constant collections or maps."""
    return set(constant_collections(cls)) | set(constant_maps(cls))


def _literal(n):
    if isinstance(n, T.Literal) and not n.prefix_operators:
        if n.value.startswith('"'):
            return ("String", string_value(n.value))
        if n.value.rstrip("lL").isdigit():
            value, jtype = number_value(n.value)
            return (jtype, value)
    return None


def _literals(args) -> list | None:
    got = [_literal(a) for a in args or []]
    return None if any(g is None for g in got) else got


def _made(init) -> list | None:
    """The values a field initializer puts in the collection, or None when it is not literals."""
    if isinstance(init, T.MethodInvocation) and (init.qualifier, init.member) in _FACTORIES and not init.selectors:
        if len(init.arguments or []) == 1 and not isinstance(init.arguments[0], T.Literal):
            return _made(init.arguments[0])
        return _literals(init.arguments)
    if isinstance(init, T.ArrayCreator) and init.initializer is not None:
        return _literals(init.initializer.initializers)
    if isinstance(init, T.ClassCreator) and init.type.name.rsplit(".", 1)[-1] in COLLECTION_TYPES and not init.body:
        args = init.arguments or []
        if not args:
            return []
        if len(args) == 1:
            return _made(args[0])
    return None


def _filled(s, name: str) -> list | None:
    """`name.add(lit);` or `Collections.addAll(name, lits...);`: the values added, else None."""
    e = s.expression if isinstance(s, T.StatementExpression) else None
    if isinstance(e, T.MethodInvocation) and e.qualifier == name and e.member == "add" and len(e.arguments) == 1:
        return _literals(e.arguments)
    if isinstance(e, T.MethodInvocation) and e.qualifier in ("Collections", "java.util.Collections") \
            and e.member == "addAll" and e.arguments \
            and isinstance(e.arguments[0], T.MemberReference) and e.arguments[0].member == name:
        return _literals(e.arguments[1:])
    return None


def _mentions(node, name: str) -> bool:
    from migrate.lower.walk import mentions

    return mentions(node, name) or any(isinstance(n, T.MemberReference) and n.member == name for _, n in node)


def _only_reads(cls, name: str, fills: list, reads: set = READS) -> bool:
    """Every use of the field outside the statements that fill it is one of `reads`."""
    skip = {id(n) for s in fills for _, n in s}
    for member in cls.node.body:
        if isinstance(member, T.FieldDeclaration):
            continue
        for top in member if isinstance(member, list) else [member]:
            for _, n in top:
                if id(n) in skip:
                    continue
                if isinstance(n, T.MethodInvocation) and n.qualifier == name and n.member not in reads:
                    return False
                if isinstance(n, T.MemberReference) and n.member == name and n.qualifier in ("", None, "this"):
                    return False  # passed on, assigned, looped over
    return True
