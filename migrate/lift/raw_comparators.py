"""Raw comparators: `compare(byte[] b1, int s1, int l1, byte[] b2, int s2, int l2)` over a custom
key's serialised form, read back as an order of the key's fields.

What the shuffle calls is the raw form (RawComparator javadoc: it compares "in their binary
representation"). `WritableComparator.compareBytes` compares bytes as unsigned numbers, first
difference first, then length (WritableComparator source, Hadoop 3). So comparing the whole
serialisation is comparing the fields that write() writes, in that order, each by the order of its
bytes; comparing the first N bytes is comparing the fields those bytes hold.

Field encodings read (DataOutput javadoc: big-endian two's complement):
  out.writeInt(f - Integer.MIN_VALUE)  4 bytes whose unsigned order is f's signed order
  out.writeLong(f - Long.MIN_VALUE)    8 bytes, the same for a long
  out.writeInt(f), writeLong(f), an IntWritable/LongWritable field's write(out)
                                       fixed width; their unsigned order puts negatives after
                                       positives, so they only serve equality (grouping)
  out.writeBoolean(f)                  1 byte, false before true
  out.writeUTF(f), a Text field's write(out)
                                       variable width (a length first): equality only, and only
                                       as the last field compared
Anything else in write(), or another body in compare(), is declined by name.
"""
from __future__ import annotations

import operator

from javalang import tree as T

from migrate.java.index import ClassInfo
from migrate.lift.exprs import Unsupported

_WIDTHS = {"writeInt": 4, "writeLong": 8, "writeBoolean": 1, "writeUTF": None}
_MIN = {"writeInt": "Integer", "writeLong": "Long"}
_WRITABLE_WIDTHS = {"IntWritable": 4, "LongWritable": 8, "Text": None}
_OPS = {"+": operator.add, "-": operator.sub, "*": operator.mul, "/": operator.floordiv}
_SIZES = {("Integer", "SIZE"): 32, ("Long", "SIZE"): 64, ("Integer", "BYTES"): 4, ("Long", "BYTES"): 8}


def serialised_fields(cls: ClassInfo) -> list[tuple[str, int | None, bool]]:
    """write()'s fields in order: (field, width in bytes or None, its bytes sort as its value does)."""
    types = {d.name: getattr(f.type, "name", "") for f in cls.fields() for d in f.declarators}
    ms = [m for m in cls.methods("write") if len(m.parameters) == 1]
    out_name = ms[0].parameters[0].name if ms else None
    fields = []
    for st in (ms[0].body or []) if ms else []:
        call = st.expression if isinstance(st, T.StatementExpression) else None
        if not isinstance(call, T.MethodInvocation) or len(call.arguments or []) != 1:
            raise Unsupported(st, f"{cls.name}.write() does more than write its fields")
        arg = call.arguments[0]
        if call.qualifier == out_name and call.member in _WIDTHS:
            name, offset = _field_minus_min(arg, _MIN.get(call.member))
            if name not in types:
                raise Unsupported(st, f"{cls.name}.write() writes something other than a field")
            fields.append((name, _WIDTHS[call.member], offset or call.member == "writeBoolean"))
        elif _is_name(arg, out_name) and call.member == "write" and types.get(call.qualifier.split(".")[-1]) \
                in _WRITABLE_WIDTHS:
            name = call.qualifier.split(".")[-1]
            fields.append((name, _WRITABLE_WIDTHS[types[name]], False))
        else:
            raise Unsupported(st, f"{cls.name}.write(): `{call.member}` is not a field encoding the converter reads")
    if not fields:
        raise Unsupported(cls.node, f"{cls.name} has no write() the converter reads")
    return fields


def raw_order(cmp: ClassInfo, key: ClassInfo, equality_only: bool) -> tuple[tuple[str, bool], ...]:
    """The fields (and directions) a raw comparator of `key` compares."""
    m = next(m for m in cmp.methods("compare") if len(m.parameters) == 6)
    b1, s1, l1, b2, s2, l2 = (p.name for p in m.parameters)
    body = m.body or []
    ret = body[0].expression if len(body) == 1 and isinstance(body[0], T.ReturnStatement) else None
    negated = ret is not None and "-" in (ret.prefix_operators or [])
    if not (isinstance(ret, T.MethodInvocation) and ret.member == "compareBytes"
            and ret.qualifier in ("", None, "WritableComparator") and len(ret.arguments) == 6):
        raise Unsupported(m, f"{cmp.name}.compare(byte[], ...) is not `return compareBytes(b1, s1, n, b2, s2, n);`")
    a = ret.arguments
    if not all(_is_name(x, n) for x, n in zip((a[0], a[1], a[3], a[4]), (b1, s1, b2, s2))):
        raise Unsupported(m, f"{cmp.name} compares bytes at other offsets than the keys' starts")
    if _is_name(a[2], l1) and _is_name(a[5], l2):
        length = None  # the whole serialised key
    else:
        length = _constant(a[2])
        if length is None or _constant(a[5]) != length:
            raise Unsupported(m, f"{cmp.name} compares a length the converter cannot read")
    fields, at = [], 0
    for name, width, ordered in serialised_fields(key):
        if length is not None and at >= length:
            break
        if width is None and (not equality_only or length is not None):
            raise Unsupported(m, f"{cmp.name} compares the bytes of `{name}`, written with its length first: that "
                                 "is not the order of its text")
        if not ordered and not equality_only:
            raise Unsupported(m, f"{cmp.name} compares the bytes of `{name}` as written (two's complement), which "
                                 "puts negative numbers after positive ones")
        fields.append((name, not negated))
        at += width or 0
    if length is not None and at != length:
        raise Unsupported(m, f"{cmp.name} compares {length} bytes, which end inside a field of {key.name}")
    return tuple(fields)


def _field_minus_min(e, kind: str | None) -> tuple[str | None, bool]:
    """`f` -> (f, False); `f - Integer.MIN_VALUE` (or + MIN_VALUE: the same bits) -> (f, True)."""
    if isinstance(e, T.BinaryOperation) and e.operator in ("-", "+") and kind is not None \
            and isinstance(e.operandr, T.MemberReference) and (e.operandr.qualifier, e.operandr.member) == (kind, "MIN_VALUE"):
        return _field_name(e.operandl), True
    return _field_name(e), False


def _field_name(e) -> str | None:
    if isinstance(e, T.MemberReference) and e.qualifier in ("", None, "this") and not e.selectors:
        return e.member
    if isinstance(e, T.This) and len(e.selectors or []) == 1 and isinstance(e.selectors[0], T.MemberReference):
        return e.selectors[0].member
    return None


def _is_name(e, name: str | None) -> bool:
    return isinstance(e, T.MemberReference) and not e.qualifier and e.member == name and not e.selectors


def _constant(e) -> int | None:
    """A small int constant: a literal, Integer.SIZE / 8, Long.BYTES, their sums and products."""
    if isinstance(e, T.Literal) and e.value.isdigit():
        return int(e.value)
    if isinstance(e, T.MemberReference):
        return _SIZES.get((e.qualifier, e.member))
    if isinstance(e, T.BinaryOperation) and e.operator in ("+", "-", "*", "/"):
        a, b = _constant(e.operandl), _constant(e.operandr)
        if a is None or b is None or (e.operator == "/" and (b == 0 or a % b)):
            return None
        return _OPS[e.operator](a, b)
    return None
