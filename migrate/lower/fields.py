"""Fields that are not state: a scratch field used as a local, and a field set once in setup().

- `private String[] tokens;` assigned at the start of map() and read only after that assignment
  in the same call is a local of map(): no value crosses from one record to the next.
- `private Pattern p; setup() { p = Pattern.compile("x"); }` is a constant of the task, exactly
  as `private Pattern p = Pattern.compile("x");` is, when the value depends on nothing setup()
  reads (its parameters, the job's settings, its locals) and the field is set nowhere else.
"""
from __future__ import annotations

from javalang import tree as T

from migrate.lower.configured import SETTERS
from migrate.lower.walk import assigned_names, line_of, mentions, positioned, statement_lists

PER_RECORD = {"map", "reduce"}
SETUP = {"setup", "configure"}


def _assigned_name(stmt) -> str | None:
    """`name = ...;` (plain assignment to a simple name) -> name."""
    if not (isinstance(stmt, T.StatementExpression) and isinstance(stmt.expression, T.Assignment)):
        return None
    e = stmt.expression
    lhs = e.expressionl
    if e.type == "=" and isinstance(lhs, T.MemberReference) and lhs.qualifier in ("", None) and not lhs.selectors:
        return lhs.member
    return None


def _instance_fields(cls):
    for f in cls.fields():
        if "static" in (f.modifiers or set()) or len(f.declarators) != 1:
            continue
        yield f, f.declarators[0]


def _members(cls):
    return [m for m in cls.node.body if isinstance(m, (T.MethodDeclaration, T.ConstructorDeclaration))]


def _subclassed(cls, index) -> bool:
    if index is None:
        return True
    return any(c.node.extends is not None and c.node.extends.name.rsplit(".", 1)[-1] == cls.name for c in index)


def _this_mentions(node, name: str) -> bool:
    return any(isinstance(n, T.This) and n.selectors and getattr(n.selectors[0], "member", None) == name
               for _, n in node)


def fields_used_as_locals(cls, index=None) -> list[tuple[int, str]]:
    done = []
    if _subclassed(cls, index):
        return done
    for f, d in list(_instance_fields(cls)):
        if d.initializer is not None and not (isinstance(d.initializer, T.Literal)):
            continue  # an object made at construction may be meant to live across records
        users = [m for m in _members(cls) if mentions(m, d.name) and not _own_local(m, d.name)]
        if len(users) != 1 or not isinstance(users[0], T.MethodDeclaration) or users[0].name not in PER_RECORD \
                or _this_mentions(users[0], d.name):
            continue
        rest = [b for b in cls.node.body if b is not f and b is not users[0] and not isinstance(b, T.MethodDeclaration)
                and not isinstance(b, T.ConstructorDeclaration)]
        if any(mentions(b, d.name) for b in rest):  # a nested class or another field's initializer reads it
            continue
        method = users[0]
        found = _first_assignment(method, d.name)
        if found is None:
            continue
        stmts, i = found
        if any(mentions(s, d.name) for s in _outside(method, stmts, i)) or mentions(stmts[i].expression.value, d.name):
            continue
        decl = T.LocalVariableDeclaration(modifiers=set(), annotations=[], type=f.type, declarators=[
            T.VariableDeclarator(name=d.name, dimensions=d.dimensions or [], initializer=stmts[i].expression.value)])
        stmts[i] = positioned(decl, stmts[i])
        cls.node.body.remove(f)
        done.append((line_of(decl), f"the field `{d.name}` is set before every read in {method.name}(): "
                                    "a local of each call, no state across records"))
    return done


def _own_local(method, name: str) -> bool:
    """Every mention of `name` in the method is of its own local of that name (declared once, and
    mentioned only after the declaration in the same block)."""
    found = [(stmts, i) for stmts, _ in statement_lists(method) for i, s in enumerate(stmts)
             if isinstance(s, T.LocalVariableDeclaration) and any(d.name == name for d in s.declarators)]
    if len(found) != 1 or any(p.name == name for p in method.parameters):
        return False
    stmts, i = found[0]
    return not any(mentions(s, name) for s in _outside(method, stmts, i))


def _first_assignment(method, name):
    for stmts, _ in statement_lists(method):
        for i, s in enumerate(stmts):
            if _assigned_name(s) == name:
                return stmts, i
    return None


def _outside(method, stmts, i):
    """The statements of `method` that may run before stmts[i] or without it: all but stmts[i:]
    and what they contain, and the statements enclosing `stmts` (whose lists are visited apart)."""
    after = {id(n) for s in stmts[i:] for _, n in s}
    out = []
    for lst, _ in statement_lists(method):
        for s in lst:
            if id(s) in after:
                continue
            if _contains_list(s, stmts):  # an enclosing statement: only its condition runs before
                out += [getattr(s, a) for a in ("condition", "control", "expression") if hasattr(s, a)
                        and getattr(s, a) is not None]
                continue
            out.append(s)
    return out


def _contains_list(node, stmts) -> bool:
    for _, n in node:
        for attr in getattr(n, "attrs", ()):
            if getattr(n, attr) is stmts:
                return True
    return False


# What a task constant may be made of: literals, static calls and new objects of library classes.
_CONSTANT_NODES = (T.Literal, T.ClassCreator, T.MethodInvocation, T.MemberReference, T.BinaryOperation,
                   T.ReferenceType, T.BasicType, T.TypeArgument, T.ArrayCreator, T.ArrayInitializer, T.Cast)


def setup_constants(cls, index=None) -> list[tuple[int, str]]:
    done = []
    statics = {d.name for f in cls.fields() if "static" in (f.modifiers or set()) and "final" in (f.modifiers or set())
               for d in f.declarators}
    for method in [m for m in cls.node.methods if m.name in SETUP and len(m.parameters) == 1]:
        body = method.body or []
        for s in list(body):
            name = _assigned_name(s)
            if name is None:
                continue
            field = next(((f, d) for f, d in _instance_fields(cls) if d.name == name), None)
            if field is None:
                continue
            f, d = field
            if d.initializer is not None and not (isinstance(d.initializer, T.Literal) and d.initializer.value == "null"):
                continue
            others = [m for m in _members(cls) if m is not method and name in assigned_names(m)]
            earlier = body[: body.index(s)]
            later = body[body.index(s) + 1:]  # filled or configured later: not a plain constant
            if others or any(mentions(x, name) for x in earlier + later):
                continue
            value = s.expression.value
            if not _constant(value, statics, _writables(index)):
                continue
            d.initializer = value
            body.remove(s)
            done.append((line_of(s), f"`{name}` is set once in {method.name}() from constants: "
                                     "a constant of the task, as if set at its declaration"))
    return done


# Library classes whose static calls and new objects depend on nothing but their arguments.
CONSTANT_CLASSES = {"Pattern", "Integer", "Long", "Double", "Float", "Boolean", "String", "Arrays", "Set", "List",
                    "Map", "Collections", "TimeZone", "ZoneId", "ZoneOffset", "Locale", "DateTimeFormatter",
                    "Character", "SimpleDateFormat", "DecimalFormat", "Text", "IntWritable", "LongWritable",
                    "DoubleWritable", "FloatWritable", "BooleanWritable", "NullWritable", "HashSet", "TreeSet",
                    "LinkedHashSet", "ArrayList", "LinkedList", "HashMap", "TreeMap", "LinkedHashMap",
                    "Random"}  # a Random made in setup() or at its declaration: once per task either way


def _writables(index) -> set[str]:
    """The repository's own Writable classes: their constructors only set fields (or the lift
    rules refuse them later, wherever they are made)."""
    return {c.name for c in index if "writable" in c.roles} if index is not None else set()


def _constant(value, statics: set[str], writables: set[str] = frozenset()) -> bool:
    setters = {id(x) for _, n in value if isinstance(n, T.ClassCreator) for x in n.selectors or []
               if isinstance(x, T.MethodInvocation) and x.member in SETTERS.get(n.type.name, ())}
    for _, n in value:
        if id(n) in setters:  # `new SimpleDateFormat(p)` configured where made (migrate.lower.configured)
            continue
        if isinstance(n, T.ClassCreator) and n.type.name.rsplit(".", 1)[-1] not in CONSTANT_CLASSES | writables:
            return False
        if isinstance(n, T.MethodInvocation) and n.qualifier and n.qualifier.split(".")[0] not in CONSTANT_CLASSES:
            return False
        if not isinstance(n, _CONSTANT_NODES):
            return False
        if isinstance(n, T.MemberReference) and not n.qualifier and n.member not in statics:
            return False  # a local, a parameter or an instance field
        if isinstance(n, T.MemberReference) and n.qualifier and not n.qualifier[:1].isupper():
            return False  # conf.x, context.y
        if isinstance(n, T.MethodInvocation) and (not n.qualifier or not n.qualifier[:1].isupper()):
            return False  # only static calls of classes (Pattern.compile, Integer.parseInt, Arrays.asList)
    return True
