"""Read a mapper's setup()/configure() that loads a side file into a HashMap or HashSet field.

Recognises: the task's cache files (`context.getCacheFiles()`, `DistributedCache.getCacheFiles(conf)`,
and the local-copy variants), a reader opened on one of them (BufferedReader over FileReader,
InputStreamReader over `fs.open(new Path(uri))`, through locals), a loop over its lines
(`while ((line = in.readLine()) != null)` or the `for` form) whose body is lifted like map()
with one `map.put(key, value)` / `set.add(key)`, try-with-resources, `finally { in.close(); }`,
catches that rethrow, a guard that throws when no file was shipped, `field = new HashMap<>()`.
Produces: SideTable plans (the read steps over column `value`, one Emit for the put) and the
setup() statements they account for; task_constants() reads the rest of setup().
Caveats: a catch that swallows the error (an empty table where the file is missing), a
put under a loop over tokens into a map, reading more than the lines, or a table filled
elsewhere are not lifted, and the caller reports them as task-lifecycle hand work.
"""
from __future__ import annotations

from dataclasses import dataclass, field
from types import SimpleNamespace

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.java.literals import string_value
from migrate.lift.config import python_name
from migrate.lift.exprs import Opaque, Unsupported, write_argument
from migrate.lift.mapper import MapBodyLifter, _has_null_on_error, _and
from migrate.plan import Call, Col, Emit, Explode, Lit, SideTable, Span, walk

CACHE_GETTERS = {"getCacheFiles", "getLocalCacheFiles"}
_BOXED = {"String": "String", "Integer": "int", "Long": "long", "Double": "double", "Boolean": "boolean"}
_MAPS = {"Map", "HashMap", "LinkedHashMap", "TreeMap"}
_SETS = {"Set", "HashSet", "LinkedHashSet", "TreeSet"}
_READERS = {"BufferedReader", "FileReader", "InputStreamReader", "LineNumberReader"}


@dataclass
class SideFiles:
    """What setup() loads: the tables by field, the statements accounted for, and (line, reason) problems."""

    tables: dict[str, SideTable] = field(default_factory=dict)
    handled: set[int] = field(default_factory=set)  # id() of setup statements read here
    problems: list[tuple[int, str]] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)
    filled: set[str] = field(default_factory=set)  # table fields the side-file read fills, lifted or not


def table_fields(cls: ClassInfo) -> dict[str, tuple[str, str, str | None]]:
    """Map / Set fields with String or boxed type arguments: name -> (kind, key type, value type)."""
    out = {}
    for f in cls.fields():
        t = f.type
        args = [getattr(getattr(a, "type", None), "name", None) for a in getattr(t, "arguments", None) or []]
        if t.name in _MAPS and len(args) == 2 and all(a in _BOXED for a in args):
            kind = ("map", _BOXED[args[0]], _BOXED[args[1]])
        elif t.name in _SETS and len(args) == 1 and args[0] in _BOXED:
            kind = ("set", _BOXED[args[0]], None)
        else:
            continue
        for d in f.declarators:
            out[d.name] = kind
    return out


def read_side_files(cls: ClassInfo, index=None, constants: dict | None = None) -> SideFiles:
    """Side tables filled by setup() (new API) or configure() (old API)."""
    found = SideFiles()
    fields = table_fields(cls)
    if not fields:
        return found
    for m in cls.node.body:
        if isinstance(m, T.MethodDeclaration) and m.name in ("setup", "configure") and len(m.parameters) == 1:
            reader = _SetupReader(cls, m, fields, index, constants or {}, found)
            stmts = list(m.body or [])
            if any(_mentions_cache(s) for s in stmts):
                reader.block(stmts, top=True)
                found.filled |= {n.qualifier for _, n in m if isinstance(n, T.MethodInvocation) and n.qualifier in fields}
    return found


def _mentions_cache(node) -> bool:
    """The statement reads the cache files, or opens a file (a cache file by its `#link` name)."""
    return any(isinstance(n, T.MethodInvocation) and n.member in CACHE_GETTERS
               or isinstance(n, T.ClassCreator) and n.type.name in _READERS for _, n in node)


class _SetupReader:
    """Walks setup(): binds locals to cache files and readers, lifts the read loop."""

    def __init__(self, cls: ClassInfo, method, fields, index, constants: dict, found: SideFiles):
        self.cls, self.method, self.fields, self.index, self.found = cls, method, fields, index, found
        self.constants = constants
        self.params = {p.name for p in method.parameters}
        self.cache_vars: set[str] = set()  # URI[] / Path[] of the cache files
        self.files: dict[str, int] = {}  # local -> cache file index (a Path, File, name or reader on it)
        self.readers: dict[str, int] = {}
        self.line_vars: set[str] = set()  # `String line;` declared for the loop

    def block(self, stmts, top: bool = False) -> None:
        for s in stmts or []:
            try:
                if self.statement(s):
                    self.found.handled.add(id(s))
                elif not top:
                    raise Unsupported(s, "statement beside the side-file read is not lifted")
            except Unsupported as u:
                self.found.handled.add(id(s))
                self.found.problems.append((u.line or node_lines(s)[0], u.reason))

    def statement(self, s) -> bool:
        """True: the statement belongs to the side-file read and is accounted for."""
        if isinstance(s, T.LocalVariableDeclaration):
            return all(self.declare(s, d) for d in s.declarators)
        if isinstance(s, T.StatementExpression):
            return self.expression(s)
        if isinstance(s, T.IfStatement):
            return self.guard(s)
        if isinstance(s, T.TryStatement):
            return self.try_(s)
        if isinstance(s, (T.WhileStatement, T.ForStatement)):
            reader = self.loop_reader(s)
            if reader is None:
                return False
            self.loop(s, reader)
            return True
        if isinstance(s, T.BlockStatement):
            self.block(s.statements)
            return True
        return False

    # -- locals: cache files, paths on them, readers
    def declare(self, s, d) -> bool:
        init, tname = d.initializer, getattr(s.type, "name", "")
        if init is None:
            if tname == "String":
                self.line_vars.add(d.name)
                return True
            return False
        if _calls(init, CACHE_GETTERS) and not _indexes(init):
            self.cache_vars.add(d.name)
            return True
        if tname == "FileSystem":
            return True
        i = self.file_index(init)
        if i is None:
            return False
        if tname in _READERS:
            self.readers[d.name] = i
            self.charset_note(s, init)
        else:
            self.files[d.name] = i
        return True

    def file_index(self, node) -> int | str | None:
        """Which cache file an expression opens or names (`uris[0]`, a local bound to one), or the
        link name it opens (`new FileReader("zones")` for a file shipped as `…#zones`)."""
        for _, n in node:
            if isinstance(n, T.ClassCreator) and n.type.name in ("FileReader", "File") and n.arguments and \
                    isinstance(n.arguments[0], T.Literal) and n.arguments[0].value.startswith('"'):
                return string_value(n.arguments[0].value)
            if isinstance(n, T.MemberReference) and not n.qualifier:
                if n.member in self.cache_vars:
                    sel = (n.selectors or [None])[0]
                    if isinstance(sel, T.ArraySelector) and isinstance(sel.index, T.Literal):
                        return int(sel.index.value)
                    raise Unsupported(n, "a cache file picked by a computed index")
                if n.member in self.files or n.member in self.readers:
                    return self.files.get(n.member, self.readers.get(n.member))
            if isinstance(n, T.MethodInvocation) and n.member in CACHE_GETTERS and n.selectors:
                sel = n.selectors[0]
                if isinstance(sel, T.ArraySelector) and isinstance(sel.index, T.Literal):
                    return int(sel.index.value)
        return None

    def charset_note(self, s, init) -> None:
        named = any(isinstance(n, (T.MemberReference, T.Literal)) and ("UTF" in str(getattr(n, "member", ""))
                                                                      or "UTF" in str(getattr(n, "value", "")).upper())
                    for _, n in init)
        if not named:
            self.found.notes.append(f"{self.cls.file.path}:{node_lines(s)[0]} the side file is decoded with the JVM's "
                                    "default charset; the script reads it as UTF-8 (the same for ASCII files)")

    # -- statements around the read
    def expression(self, s) -> bool:
        e = s.expression
        if isinstance(e, T.MethodInvocation):
            if (e.qualifier in self.readers and e.member == "close") or (e.qualifier in self.fields and e.member == "clear"):
                return True
            return False
        if isinstance(e, T.Assignment) and e.type == "=":
            target = _field_target(e.expressionl)
            if target in self.fields and isinstance(e.value, T.ClassCreator) and not e.value.arguments:
                return True  # `districts = new HashMap<>();`
            if isinstance(e.expressionl, T.MemberReference) and not e.expressionl.qualifier:
                name = e.expressionl.member
                if _calls(e.value, CACHE_GETTERS):
                    self.cache_vars.add(name)
                    return True
                i = self.file_index(e.value)
                if i is not None and name in self.readers:
                    self.readers[name] = i
                    return True
        return False

    def guard(self, s: T.IfStatement) -> bool:
        """`if (uris == null || uris.length == 0) throw …;` or `if (uris != null && …) { read }`."""
        names = {n.qualifier or n.member for _, n in s.condition if isinstance(n, T.MemberReference)}
        if not names or not names <= self.cache_vars:
            return False
        if _throws(s.then_statement) and s.else_statement is None:
            return True
        if s.else_statement is None:
            raise Unsupported(s, "the side file is read only when it was shipped: without it Java leaves the table "
                                 "empty, and the script fails instead")
        return False

    def try_(self, s: T.TryStatement) -> bool:
        for r in s.resources or []:
            i = self.file_index(r.value)
            if i is None:
                return False
            self.readers[r.name] = i
            self.charset_note(r, r.value)
        for c in s.catches or []:
            if not _throws(T.BlockStatement(statements=c.block)):
                raise Unsupported(self.catch_line(c), "a catch that goes on without the side file: Java keeps an empty or partial "
                                     "table, and the script fails instead", )
        for st in s.finally_block or []:
            if not (isinstance(st, T.StatementExpression) and self.expression(st)) and not self.closes(st):
                raise Unsupported(st, "finally block does more than close the reader")
        if not any(_mentions_reader(st, self) or _mentions_cache(st) for st in s.block or []):
            return False
        self.block(s.block)
        return True

    def catch_line(self, c):
        """javalang gives a catch clause no position: the `catch` line above its first statement."""
        line = node_lines(c)[0]
        while line > 1 and "catch" not in self.cls.file.lines[line - 1]:
            line -= 1
        return SimpleNamespace(position=SimpleNamespace(line=line))

    def closes(self, st) -> bool:
        return (isinstance(st, T.IfStatement) and st.else_statement is None
                and all(isinstance(x, T.StatementExpression) and self.expression(x)
                        for x in (st.then_statement.statements if isinstance(st.then_statement, T.BlockStatement)
                                  else [st.then_statement])))

    # -- the read loop
    def loop_reader(self, s) -> tuple[str, str, list] | None:
        """(reader, line variable, body) of `while ((line = r.readLine()) != null)` or the `for` form."""
        if isinstance(s, T.WhileStatement):
            c = s.condition
            if (isinstance(c, T.BinaryOperation) and c.operator == "!=" and isinstance(c.operandr, T.Literal)
                    and c.operandr.value == "null" and isinstance(c.operandl, T.Assignment)):
                a = c.operandl
                var, call = getattr(a.expressionl, "member", None), a.value
                if var in self.line_vars and _read_line(call, self.readers):
                    return call.qualifier, var, _body(s.body)
            return None
        ctl = s.control
        if not isinstance(ctl, T.ForControl) or not isinstance(ctl.init, T.VariableDeclaration):
            return None
        (d,) = ctl.init.declarators
        upd = ctl.update or []
        ok_cond = (isinstance(ctl.condition, T.BinaryOperation) and ctl.condition.operator == "!="
                   and getattr(ctl.condition.operandl, "member", None) == d.name)
        ok_upd = (len(upd) == 1 and isinstance(upd[0], T.Assignment) and getattr(upd[0].expressionl, "member", None) == d.name
                  and _read_line(upd[0].value, self.readers))
        if _read_line(d.initializer, self.readers) and ok_cond and ok_upd:
            return d.initializer.qualifier, d.name, _body(s.body)
        return None

    def loop(self, s, found: tuple[str, str, list]) -> None:
        reader, var, body = found
        lifter = _LineLifter(self.cls, self.method, var, self.fields, self.index, self.constants)
        res = lifter.run(body, s)
        if res.hand_work:
            self.found.problems.extend((h.origin.line_start, h.reason) for h in res.hand_work)
            return
        if len(lifter.puts) != 1:
            raise Unsupported(s, "the loop over the side file's lines fills other than one table with one put")
        (target, emit) = lifter.puts[0]
        kind, key_t, val_t = self.fields[target]
        if kind == "map" and any(isinstance(x, Explode) for x in res.steps):
            raise Unsupported(s, "puts inside a loop over each line's tokens: which put wins depends on token order")
        for e, want in ((emit.key, key_t), (emit.value, val_t) if kind == "map" else (None, None)):
            if e is not None and (e.jtype != want or any(isinstance(x, Lit) and x.value is None for x in walk(e))):
                raise Unsupported(s, f"a put of a {e.jtype} (or a null) into a table of {want}")
        a, b = node_lines(s)
        table = SideTable(target, python_name(target), kind, key_t, val_t, self.readers[reader],
                          Span(self.cls.file.path, a, b), tuple(res.steps[:-1]), emit)
        if target in self.found.tables:
            raise Unsupported(s, f"`{target}` is filled by two loops")
        self.found.tables[target] = table
        self.found.notes.extend(res.notes)


class _LineLifter(MapBodyLifter):
    """The body of the read loop, lifted like map(): the line is column `value`, a put is the write."""

    def __init__(self, cls: ClassInfo, method, line_var: str, fields, index, constants: dict):
        super().__init__(cls, method, "offset", "String", cls.api or "mapreduce", index, constants)
        for p in method.parameters:
            self.scope.env[p.name] = Opaque("the task context")
        self.scope.env[line_var] = Col("String", "value")
        self.scope.lookup = None
        self.emit_target = None
        self.fields = fields
        self.puts: list[tuple[str, Emit]] = []

    def _expression_statement(self, s, guard) -> None:
        e = s.expression
        if isinstance(e, T.MethodInvocation) and e.qualifier in self.fields and e.member in ("put", "add"):
            kind = self.fields[e.qualifier][0]
            if (kind, e.member, len(e.arguments or [])) not in (("map", "put", 2), ("set", "add", 1)):
                raise Unsupported(s, f"{e.qualifier}.{e.member}(...) is not a put of one entry")
            args = [write_argument(a, self.scope) for a in e.arguments]
            key, value = args[0], (args[1] if kind == "map" else Lit("boolean", True))
            g = self._eff(guard)
            for side in (key, value):
                for risky in _has_null_on_error(side) if side is not None else []:
                    g = _and(g, Call("boolean", "is_not_null", (risky,)))
            emit = Emit(self._span(s), self._note(s), key, value, g)
            self.puts.append((e.qualifier, emit))
            self.emit_list.append(emit)
            return
        super()._expression_statement(s, guard)

    def _exit(self, s, guard) -> None:
        if isinstance(s, T.ReturnStatement):
            raise Unsupported(s, "return inside the loop over the side file's lines stops reading the file")
        if isinstance(s, T.ContinueStatement) and not self.loop_depth and not s.goto:
            skip = T.ReturnStatement(expression=None)  # the next line: like a return from map()
            skip._position = s.position
            return super()._exit(skip, guard)
        super()._exit(s, guard)


def _calls(node, names) -> bool:
    return any(isinstance(n, T.MethodInvocation) and n.member in names for _, n in node)


def _indexes(node) -> bool:
    return any(isinstance(n, T.MethodInvocation) and n.member in CACHE_GETTERS and n.selectors for _, n in node)


def _read_line(call, readers) -> bool:
    return (isinstance(call, T.MethodInvocation) and call.member == "readLine" and not call.arguments
            and call.qualifier in readers)


def _mentions_reader(st, reader: _SetupReader) -> bool:
    return any(isinstance(n, T.MemberReference) and n.member in reader.readers for _, n in st) or \
        any(isinstance(n, T.MethodInvocation) and n.qualifier in reader.readers for _, n in st)


def _field_target(e) -> str | None:
    if isinstance(e, T.MemberReference) and e.qualifier in ("", None, "this") and not e.selectors:
        return e.member
    if isinstance(e, T.This) and e.selectors and isinstance(e.selectors[0], T.MemberReference):
        return e.selectors[0].member
    return None


def _throws(stmt) -> bool:
    stmts = stmt.statements if isinstance(stmt, T.BlockStatement) else [stmt]
    return bool(stmts) and isinstance(stmts[-1], T.ThrowStatement)


def _body(stmt) -> list:
    return list(stmt.statements) if isinstance(stmt, T.BlockStatement) else [stmt]
