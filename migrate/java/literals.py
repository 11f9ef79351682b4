"""Java literal values as the JVM reads them (string escapes, numeric suffixes, radix)."""
from __future__ import annotations

_ESC = {"b": "\b", "t": "\t", "n": "\n", "f": "\f", "r": "\r", "s": " ", '"': '"', "'": "'", "\\": "\\"}


def string_value(token: str) -> str:
    """The value of a Java string or char literal token, quotes included in `token`."""
    body, out, i = token[1:-1], [], 0
    while i < len(body):
        ch = body[i]
        if ch != "\\":
            out.append(ch)
            i += 1
            continue
        nxt = body[i + 1]
        if nxt in _ESC:
            out.append(_ESC[nxt])
            i += 2
        elif nxt == "u":
            j = i + 1
            while body[j] == "u":
                j += 1
            out.append(chr(int(body[j : j + 4], 16)))
            i = j + 4
        elif nxt in "01234567":
            j = i + 1
            while j < len(body) and j < i + 4 and body[j] in "01234567":
                j += 1
            out.append(chr(int(body[i + 1 : j], 8)))
            i = j
        else:
            raise ValueError(f"unknown escape \\{nxt} in {token}")
    return "".join(out)


def number_value(token: str) -> tuple[object, str]:
    """(value, Java type) of a numeric literal: 12 → int, 12L → long, 1.5 → double, 2f → float."""
    t = token.replace("_", "")
    low = t.lower()
    if low.startswith("0x") and not any(c in low for c in ".p"):
        is_long = low.endswith("l")
        v = int(low[2:].rstrip("l"), 16)
        return (_wrap(v, 64 if is_long else 32), "long" if is_long else "int")
    if low.startswith("0b"):
        is_long = low.endswith("l")
        return (_wrap(int(low[2:].rstrip("l"), 2), 64 if is_long else 32), "long" if is_long else "int")
    if low.endswith("l"):
        return (int(low[:-1], 8) if len(low) > 2 and low[0] == "0" else int(low[:-1]), "long")
    if low.endswith("f"):
        return (float(low[:-1]), "float")
    if low.endswith("d"):
        return (float(low[:-1]), "double")
    if any(c in low for c in ".e") or low.startswith("0x"):
        return (float.fromhex(low) if low.startswith("0x") else float(low), "double")
    if len(low) > 1 and low[0] == "0":
        return (int(low, 8), "int")
    return (int(low), "int")


def _wrap(v: int, bits: int) -> int:
    """Hex/binary literals denote two's-complement bit patterns (0xFFFFFFFF is -1)."""
    if v >= 1 << (bits - 1):
        v -= 1 << bits
    return v


def argument_equals_ignore_case(a: str, b: str) -> bool:
    """String.equalsIgnoreCase (Java SE 17 API docs): the same length, and each pair of chars equal,
    or equal after Character.toUpperCase, or after Character.toLowerCase of that. Character's
    mappings are one char to one char; where Python's maps to several, the one-char mapping is the
    title case (`ᾳ` → `ᾼ`), the first char (`İ` → `i`), or none (`ß` stays `ß`)."""
    def upper(c: str) -> str:
        u = c.upper()
        if len(u) == 1:
            return u
        return c.title() if len(c.title()) == 1 else c

    def lower(c: str) -> str:
        return c.lower()[0]
    return len(a) == len(b) and all(x == y or upper(x) == upper(y) or lower(upper(x)) == lower(upper(y))
                                    for x, y in zip(a, b))


def argument_test(value: str | None, literal: str, ignore_case: bool) -> bool:
    """`value.equals(literal)`, or equalsIgnoreCase where the flag is set; None is a value no test accepts."""
    if value is None:
        return False
    return argument_equals_ignore_case(value, literal) if ignore_case else value == literal


def same_driver_branch(arg: str, value: str | None, tests: tuple[tuple[str, bool], ...]) -> bool:
    """Whether the original driver's tests of this argument (literal, ignore_case) all answer as they
    do for `value`, the value this script's branch was converted from (None: one no test accepts)."""
    return all(argument_test(arg, lit, ic) == argument_test(value, lit, ic) for lit, ic in tests)
