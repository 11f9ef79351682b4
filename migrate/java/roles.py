"""Classify indexed classes: driver, mapper, reducer, partitioner, comparator, writable (both APIs)."""
from __future__ import annotations

from dataclasses import dataclass

import javalang

from migrate.java.hadoop_api import KNOWN_CLASSES, MAPRED, MAPREDUCE
from migrate.java.index import ClassIndex, ClassInfo


@dataclass(frozen=True)
class TypeArgs:
    """The four generic arguments of a Mapper/Reducer: input key/value, output key/value."""

    in_key: str | None
    in_value: str | None
    out_key: str | None
    out_value: str | None


def supertypes(cls: ClassInfo, index: ClassIndex) -> list[tuple[str, javalang.tree.ReferenceType]]:
    """Direct supertypes (extends first, then implements), resolved to fully qualified names."""
    out = []
    refs = []
    if cls.node.extends is not None:
        refs.append(cls.node.extends)
    refs.extend(cls.node.implements or [])
    for ref in refs:
        name = _ref_name(ref)
        out.append((index.resolve(name, cls) or name, ref))
    return out


def _ref_name(ref) -> str:
    name, sub = ref.name, ref.sub_type
    while sub is not None:
        name, sub = f"{name}.{sub.name}", sub.sub_type
    return name


def ancestry(cls: ClassInfo, index: ClassIndex, _seen=None) -> list[tuple[str, javalang.tree.ReferenceType, ClassInfo]]:
    """All supertypes, transitively through classes of the repository."""
    seen = _seen if _seen is not None else set()
    out = []
    for fq, ref in supertypes(cls, index):
        if fq in seen:
            continue
        seen.add(fq)
        out.append((fq, ref, cls))
        parent = index.get(fq)
        if parent is not None:
            out.extend(ancestry(parent, index, seen))
    return out


def type_args(cls: ClassInfo, index: ClassIndex, base_kind: str) -> TypeArgs | None:
    """Resolved generic arguments of the Mapper/Reducer supertype, if written."""
    for fq, ref, owner in ancestry(cls, index):
        if KNOWN_CLASSES.get(fq) == base_kind and ref.arguments:
            names = []
            for a in ref.arguments:
                t = getattr(a, "type", None)
                names.append(index.resolve(_ref_name(t), owner) if t is not None else None)
            if len(names) == 4:
                return TypeArgs(*names)
    return None


def classify(index: ClassIndex) -> None:
    """Fill `roles` and `api` of every class in the index."""
    for cls in index:
        for fq, _ref, _owner in ancestry(cls, index):
            kind = KNOWN_CLASSES.get(fq)
            api = "mapred" if fq.startswith(MAPRED + ".") else "mapreduce" if fq.startswith(MAPREDUCE + ".") else None
            if kind in ("mapper-base", "lib-mapper"):
                cls.roles.add("mapper")
                cls.api = cls.api or api
            elif kind in ("reducer-base", "lib-reducer"):
                cls.roles.add("reducer")
                cls.api = cls.api or api
            elif kind == "partitioner-base":
                cls.roles.add("partitioner")
            elif kind == "comparator-base":
                cls.roles.add("comparator")
            elif kind == "writable-base":
                cls.roles.add("writable")
            elif kind == "tool":
                cls.roles.add("tool")
        if _is_driver(cls):
            cls.roles.add("driver")


def _is_driver(cls: ClassInfo) -> bool:
    """A class whose main(String[]) or Tool.run(String[]) configures a Job or JobConf."""
    candidates = cls.methods("main") + (cls.methods("run") if "tool" in cls.roles else [])
    for m in candidates:
        for _, node in m:
            if isinstance(node, javalang.tree.ReferenceType) and node.name in ("Job", "JobConf"):
                return True
            if isinstance(node, javalang.tree.MethodInvocation) and node.member in ("getInstance", "runJob", "waitForCompletion"):
                return True
    return False
