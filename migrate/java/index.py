"""The class index: every class of the scanned repository, across files, with name resolution."""
from __future__ import annotations

from dataclasses import dataclass, field

import javalang

from migrate.java.hadoop_api import JAVA_LANG, KNOWN_CLASSES, SIMPLE_TO_FQCN, WILDCARD_PACKAGES, WRITABLE_TYPES
from migrate.java.source import ParsedFile, logical_sloc
from migrate.plan import Span


@dataclass(eq=False)
class ClassInfo:
    """One class declaration (top-level or nested) and where it lives."""

    name: str
    fqcn: str
    package: str
    file: ParsedFile
    node: javalang.tree.ClassDeclaration
    outer: str | None
    line_start: int
    line_end: int
    roles: set[str] = field(default_factory=set)
    api: str | None = None  # "mapreduce" | "mapred"
    lowered: list[tuple[int, str]] = field(default_factory=list)  # (line, what) rewrites of migrate.lower
    # (Map field, record class) of in-mapper combining into records, lowered to a write per update
    combined_records: list[tuple[str, str]] = field(default_factory=list)

    @property
    def span(self) -> Span:
        return Span(self.file.path, self.line_start, self.line_end)

    @property
    def sloc(self) -> int:
        return logical_sloc(self.file.lines[self.line_start - 1 : self.line_end])

    def methods(self, name: str) -> list[javalang.tree.MethodDeclaration]:
        return [m for m in self.node.body if isinstance(m, javalang.tree.MethodDeclaration) and m.name == name]

    def fields(self) -> list[javalang.tree.FieldDeclaration]:
        return [f for f in self.node.body if isinstance(f, javalang.tree.FieldDeclaration)]


def node_lines(node) -> tuple[int, int]:
    """First and last source line of a javalang node (javalang only positions some nodes)."""
    lines = []
    if getattr(node, "position", None):
        lines.append(node.position.line)
    if isinstance(node, javalang.ast.Node):
        for _, child in node:
            p = getattr(child, "position", None)
            if p:
                lines.append(p.line)
    if not lines:
        return (0, 0)
    return (min(lines), max(lines))


def _binary(fqcn: str, pkg: str) -> str:
    """pkg.Outer.Inner -> pkg.Outer$Inner (the JVM's binary class name)."""
    rest = fqcn[len(pkg) + 1:] if pkg else fqcn
    return (pkg + "." if pkg else "") + rest.replace(".", "$")


def _class_end(file: ParsedFile, start: int, fallback: int) -> int:
    """The line of the class's closing brace: brace-count from its declaration line."""
    depth, seen = 0, False
    for i, line in enumerate(file.lines[start - 1 :], start):
        code = line.split("//", 1)[0]
        for ch in code:
            if ch == "{":
                depth, seen = depth + 1, True
            elif ch == "}":
                depth -= 1
                if seen and depth == 0:
                    return i
    return fallback


class ClassIndex:
    """Classes by fully qualified name, with Java-like resolution of simple names."""

    def __init__(self, files: list[ParsedFile]):
        self.classes: dict[str, ClassInfo] = {}
        self.imports: dict[str, list[javalang.tree.Import]] = {}
        self.enums: dict[str, str] = {}  # fully qualified name -> binary name (Outer$Inner), for counters
        self.duplicates: list[tuple[ClassInfo, ClassInfo]] = []  # (kept, ignored) same name in two files
        for f in files:
            pkg = f.tree.package.name if f.tree.package else ""
            for t in f.tree.types:
                if isinstance(t, javalang.tree.ClassDeclaration):
                    self._add(f, pkg, t, None)
                elif isinstance(t, javalang.tree.EnumDeclaration):
                    fq = f"{pkg}.{t.name}" if pkg else t.name
                    self.enums[fq] = fq

    def _add(self, f: ParsedFile, pkg: str, node, outer: ClassInfo | None) -> None:
        fq = f"{outer.fqcn}.{node.name}" if outer else (f"{pkg}.{node.name}" if pkg else node.name)
        start = node.position.line if node.position else node_lines(node)[0]
        end = _class_end(f, start, node_lines(node)[1])
        info = ClassInfo(node.name, fq, pkg, f, node, outer.fqcn if outer else None, start, end)
        if fq in self.classes:  # e.g. two build modules with the same class: keep the first, report the other
            self.duplicates.append((self.classes[fq], info))
            return
        self.classes[fq] = info
        self.imports[fq] = list(f.tree.imports)
        for member in node.body:
            if isinstance(member, javalang.tree.ClassDeclaration):
                self._add(f, pkg, member, info)
            elif isinstance(member, javalang.tree.EnumDeclaration):
                self.enums[f"{fq}.{member.name}"] = f"{_binary(fq, pkg)}${member.name}"

    def __iter__(self):
        return iter(sorted(self.classes.values(), key=lambda c: (c.file.path, c.line_start)))

    def get(self, fqcn: str | None) -> ClassInfo | None:
        return self.classes.get(fqcn) if fqcn else None

    def resolve(self, name: str, ctx: ClassInfo) -> str | None:
        """Resolve a type name as javac would from inside `ctx` (nested, imports, package, wildcards)."""
        if name in self.classes or name in KNOWN_CLASSES or name in WRITABLE_TYPES:
            return name
        head, _, rest = name.partition(".")
        base = self._resolve_simple(head, ctx)
        if base is None:
            return None
        return f"{base}.{rest}" if rest else base

    def enum_binary_name(self, simple: str, ctx: ClassInfo) -> str | None:
        """The binary name (pkg.Outer$Enum) of an enum visible from ctx, as Hadoop names counter groups."""
        c: ClassInfo | None = ctx
        while c is not None:
            if f"{c.fqcn}.{simple}" in self.enums:
                return self.enums[f"{c.fqcn}.{simple}"]
            c = self.get(c.outer)
        for fq, binary in sorted(self.enums.items()):
            if fq.rsplit(".", 1)[-1] == simple and (fq.startswith(ctx.package + ".") or not ctx.package):
                return binary
        return None

    def _resolve_simple(self, name: str, ctx: ClassInfo) -> str | None:
        c: ClassInfo | None = ctx
        while c is not None:  # nested classes of this class and its outer classes
            if c.name == name:
                return c.fqcn
            if f"{c.fqcn}.{name}" in self.classes:
                return f"{c.fqcn}.{name}"
            c = self.get(c.outer)
        imports = self.imports.get(ctx.fqcn, [])
        for imp in imports:
            if not imp.wildcard and not imp.static and imp.path.rsplit(".", 1)[-1] == name:
                return imp.path
        same_pkg = f"{ctx.package}.{name}" if ctx.package else name
        if same_pkg in self.classes:
            return same_pkg
        for imp in imports:
            if imp.wildcard and not imp.static:
                cand = f"{imp.path}.{name}"
                if cand in self.classes or cand in KNOWN_CLASSES or cand in WRITABLE_TYPES:
                    return cand
                if imp.path in WILDCARD_PACKAGES and cand in [*SIMPLE_TO_FQCN.get(name, [])]:
                    return cand
        if name in JAVA_LANG:
            return f"java.lang.{name}"
        return None
