"""The survey: which Java files a scan must parse, and how they split into shards worked on apart.

Most Java in a monorepo is not MapReduce, and javalang's full parse is the slow part of reading a
file. So every file is first read with a few regular expressions (package, imports, the type names
it declares, the names it mentions). A file is parsed only if it mentions Hadoop
(`org.apache.hadoop`, which every import, wildcard or fully qualified use of a Hadoop type spells)
or is reached from such a file: a type it names (resolved as javac would look: same package, an
import, a wildcard import, a fully qualified name), a subclass of a parsed class, or a registration
of a comparator for one. A file that cannot be read as text is parsed too, so that its error is
reported as before. Everything else is counted, never parsed.

A shard is what one job's code can reach: starting at a parsed file no other parsed file names
(a driver, typically), every file reached as above. Shards may share files (a utility two jobs
call); each job is planned inside its shard, whose index holds every class a whole-repository
index would give it.
"""
from __future__ import annotations

import hashlib
import re
import sys
from dataclasses import dataclass
from pathlib import Path

from migrate.java.source import NotRead, read_limited, shown_path

_PACKAGE = re.compile(r"^\s*package\s+([\w$.]+)\s*;", re.M)
_IMPORT = re.compile(r"^\s*import\s+(static\s+)?([\w$.]+?)(\.\*)?\s*;", re.M)
_DECLARED = re.compile(r"\b(?:class|interface|enum|record)\s+([A-Za-z_$][\w$]*)")
_WORD = re.compile(r"[A-Za-z_$][\w$]*")
_SUPERS = re.compile(r"\b(?:extends|implements)\b([^{;]*)")
_DOTTED = re.compile(r"[\w$]+(?:\.[\w$]+)+")
_NOT_CODE = re.compile(r"//[^\n]*|/\*.*?\*/|\"(?:\\.|[^\"\\\n])*\"|'(?:\\.|[^'\\\n])*'", re.S)
HADOOP = "org.apache.hadoop"
REGISTERS = "WritableComparator"  # a comparator registered for a key class: WritableComparator.define(K.class, ...)


@dataclass(frozen=True)
class FileFacts:
    """What the regular expressions found in one file."""

    path: str  # relative to the scanned root, as reports show it
    digest: str  # sha256 of the bytes
    lines: int
    package: str
    declared: tuple[str, ...]  # every type declared in it, nested ones too (simple names)
    imports: tuple[str, ...]  # single-type imports (fully qualified)
    wildcards: tuple[str, ...]  # packages (or classes) imported with .*
    words: frozenset[str]  # every identifier it mentions
    supers: frozenset[str]  # names after extends / implements
    hadoop: bool  # parse it: it mentions Hadoop, or it could not be read as text (its error is reported)
    registers: bool  # it may register a comparator for a key class
    text_fq: frozenset[str]  # every dotted name it spells, and their dotted prefixes (a fully qualified use)
    top_line: int = 0  # the line of the first type declared


def _blank(m: re.Match) -> str:
    """A comment or literal as blank space, its line breaks kept (line numbers stay right)."""
    return "\n" * m.group(0).count("\n")


def _type_like(names, last: bool = False) -> frozenset[str]:
    """The names that can be a type's: Java spells types capitalised (common practice; a lowercase
    class name is not looked for, so code that names one is not reached through it). Memory: a
    monorepo's files mention far more variables and methods than types."""
    return frozenset(sys.intern(n) for n in names if not (n.rpartition(".")[2] if last else n)[:1].islower())


def _prefixes(dotted: list[str]) -> frozenset[str]:
    out = set()
    for d in dotted:
        parts = d.split(".")
        out.update(".".join(parts[:k]) for k in range(2, len(parts) + 1))
    return frozenset(out)


def survey_file(path: Path, root: Path, max_bytes: int) -> FileFacts:
    rel = shown_path(path, root) if root.is_dir() else path.name
    try:
        data = read_limited(path, max_bytes)
    except NotRead:
        return FileFacts(rel, "", 0, "", (), (), (), frozenset(), frozenset(), True, False, frozenset())
    digest = hashlib.sha256(data).hexdigest()
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError:
        return FileFacts(rel, digest, data.count(b"\n"), "", (), (), (), frozenset(), frozenset(), True, False,
                         frozenset())
    code = _NOT_CODE.sub(_blank, text)  # names in comments and strings declare nothing
    m = _PACKAGE.search(code)
    imports, wildcards = [], []
    for static, name, star in _IMPORT.findall(code):
        if static:
            imports.append(name.rsplit(".", 1)[0] if not star else name)  # the class the members come from
        elif star:
            wildcards.append(name)
        else:
            imports.append(name)
    supers = frozenset(w for group in _SUPERS.findall(code) for w in _WORD.findall(group))
    first = _DECLARED.search(code)
    return FileFacts(rel, digest, text.count("\n") + 1, m.group(1) if m else "",
                     tuple(dict.fromkeys(_DECLARED.findall(code))), tuple(imports), tuple(wildcards),
                     _type_like(_WORD.findall(code)), supers, HADOOP in text or not text.strip(), REGISTERS in code,
                     _type_like(_prefixes(_DOTTED.findall(code)), last=True),
                     code.count("\n", 0, first.start()) + 1 if first else 0)


@dataclass
class Survey:
    facts: list[FileFacts]  # every Java file, in path order
    parse: list[str]  # paths to parse, in path order
    shards: list[list[str]]  # each a sorted list of paths; shards in the order of their first path
    duplicates: dict[str, str]  # path declaring a top-level type again -> the path that declared it first


def _names_in(f: FileFacts, others: dict[str, list[FileFacts]]) -> set[str]:
    """Paths of the files whose types `f` names, resolved as javac looks a simple name up."""
    found = set()
    imported = {i.rsplit(".", 1)[-1]: i for i in f.imports}
    for w in f.words & others.keys():
        for g in others[w]:
            if g.path == f.path:
                continue
            q = g.package
            if not q:  # the unnamed package is seen only from itself
                seen = not f.package
            else:
                seen = (q == f.package or imported.get(w, "").startswith(q + ".")
                        or any(p == q or p.startswith(q + ".") for p in f.wildcards)
                        or any(i.startswith(q + ".") and w in i.split(".") for i in f.imports)
                        or f"{q}.{w}" in f.text_fq)
            if seen:
                found.add(g.path)
    return found


def plan_survey(facts: list[FileFacts]) -> Survey:
    """The files to parse and the shards, from the facts of every file."""
    by_path = {f.path: f for f in facts}
    declared: dict[str, list[FileFacts]] = {}
    first_top: dict[tuple[str, str], str] = {}
    duplicates = {}
    for f in facts:  # path order: the first file to declare a type keeps it, as the class index does
        for name in f.declared:
            declared.setdefault(name, []).append(f)
        if f.declared:
            key = (f.package, f.declared[0])
            if key in first_top and first_top[key] != f.path:
                duplicates[f.path] = first_top[key]
            first_top.setdefault(key, f.path)
    refs: dict[str, set[str]] = {}

    def names(p: str) -> set[str]:
        if p not in refs:
            refs[p] = _names_in(by_path[p], declared)
        return refs[p]

    # reverse links: a subclass of a class, a comparator registered for it (only where they exist)
    extended_by: dict[str, set[str]] = {}
    for f in facts:
        hits = (f.supers | (f.words if f.registers else frozenset())) & declared.keys()
        for w in hits:
            for g in declared[w]:
                if g.path != f.path:
                    extended_by.setdefault(g.path, set()).add(f.path)

    def reach(p: str) -> set[str]:
        return names(p) | {q for q in extended_by.get(p, ()) if p in names(q)}

    parse = {f.path for f in facts if f.hadoop and f.path not in duplicates}
    todo = sorted(parse)
    while todo:
        p = todo.pop()
        for q in reach(p):
            if q not in parse and q not in duplicates:
                parse.add(q)
                todo.append(q)
    named = {q for p in parse for q in names(p) if q in parse}
    shards, covered = [], set()
    for root in sorted(p for p in parse if p not in named) + sorted(parse):
        if root in covered:
            continue
        shard, todo = {root}, [root]
        while todo:
            for q in reach(todo.pop()):
                if q in parse and q not in shard:
                    shard.add(q)
                    todo.append(q)
        covered |= shard
        shards.append(sorted(shard))
    shards.sort(key=lambda s: s[0])
    return Survey(facts, sorted(parse), shards, duplicates)
