"""java.util.regex in map(): `Pattern.compile`, `Matcher` with `matches`/`find`/`lookingAt`/`group(n)`.

Spark's rlike, regexp_extract and regexp_extract_all run java.util.regex itself (Spark SQL
function docs: "a Java regular expression"), so a pattern means the same on both sides. Two
differences remain, and both are handled here:

- a group that took no part in the match is `null` in Java and "" in regexp_extract: group(n) is
  lifted only where the pattern's structure proves group n takes part in every match
  (`group_facts`: not optional, not in an alternative, not in a lookaround);
- group() after a failed match throws IllegalStateException in Java: the lifted value fails the
  job there (or skips the record inside a catch of it), never gives "".

A matcher read after a second find() (the next match) or reset is declined.
"""
from __future__ import annotations

from dataclasses import dataclass

from javalang import tree as T

from migrate.plan import Call, Expr, Lit

# Pattern's flag constants as the embedded flags the Pattern documentation gives for each.
FLAGS = {"CASE_INSENSITIVE": "i", "MULTILINE": "m", "DOTALL": "s", "UNICODE_CASE": "u", "UNIX_LINES": "d"}


@dataclass(frozen=True)
class CompiledPattern:
    """A java.util.regex.Pattern made from a constant regex (flags folded in as `(?imsud)`)."""

    regex: str
    name: str = ""  # the Java field or local holding it, for the script's constant


@dataclass
class MatcherVar:
    """`Matcher m = pattern.matcher(subject)`: after m.matches()/find()/lookingAt(), `how` names that
    call and `matched` is its result."""

    pattern: CompiledPattern
    subject: Expr
    how: str | None = None
    matched: Expr | None = None
    guarded: bool = False  # `matched` includes the condition under which the attempt ran
    attempt: Expr | None = None  # the match call's own value (what an `if` tests)
    current: Expr | None = None  # inside `while (m.find())`: the group the loop reads, per match
    spent: bool = False  # after `while (m.find())`: the last find() failed
    proved: bool = False  # here the match attempt is known to have succeeded (`if (m.find()) {...}`)


def compile_pattern(node: T.MethodInvocation, scope, lift, unsupported) -> CompiledPattern:
    """`Pattern.compile("regex")` or `Pattern.compile(REGEX, Pattern.CASE_INSENSITIVE | ...)`."""
    args = node.arguments or []
    regex = lift(args[0], scope) if args else None
    if not (isinstance(regex, Lit) and regex.jtype == "String") or len(args) > 2:
        raise unsupported(node, "Pattern.compile of a regex that is not a constant")
    flags = ""
    if len(args) == 2:
        for f in _flag_names(args[1]):
            if f not in FLAGS:
                raise unsupported(node, f"Pattern.{f} is not lifted")
            flags += FLAGS[f]
    pattern = CompiledPattern((f"(?{flags})" if flags else "") + regex.value)
    group_facts(pattern.regex, node, unsupported)  # refuses what it cannot read
    return pattern


def _flag_names(node) -> list[str]:
    if isinstance(node, T.MemberReference) and node.qualifier in ("Pattern", "java.util.regex.Pattern"):
        return [node.member]
    if isinstance(node, T.BinaryOperation) and node.operator in ("|", "+"):
        return _flag_names(node.operandl) + _flag_names(node.operandr)
    return ["(computed flags)"]


def group_facts(regex: str, node=None, unsupported=None) -> tuple[int, frozenset[int]]:
    """(number of capturing groups, the groups that take part in every match).

    A group takes part in every successful match when neither it nor a group around it is
    optional (`?`, `*`, `{0,...}`), no group around it (nor the whole pattern) has an alternative
    `|` at its level, and it is not inside a lookaround. Comments mode (`(?x)`) is refused."""
    frames = [{"group": None, "alt": False, "look": False, "children": []}]  # the whole pattern
    groups: list[dict] = []
    i, n = 0, len(regex)

    def refuse(why: str):
        if unsupported is None:
            raise ValueError(why)
        raise unsupported(node, why)

    def quantifier_optional(j: int) -> bool:
        if j < n and regex[j] in "?*":
            return True
        if j < n and regex[j] == "{":
            k = regex.find("}", j)
            return k > j and regex[j + 1:k].split(",")[0].strip() in ("0", "")
        return False

    while i < n:
        c = regex[i]
        if c == "\\":
            if regex.startswith("\\Q", i):
                end = regex.find("\\E", i + 2)
                i = n if end < 0 else end + 2
                continue
            i += 2
            continue
        if c == "[":  # a character class, nested classes included
            depth, i = 1, i + 1
            if i < n and regex[i] == "^":
                i += 1
            if i < n and regex[i] == "]":
                i += 1
            while i < n and depth:
                if regex[i] == "\\":
                    i += 2
                    continue
                depth += {"[": 1, "]": -1}.get(regex[i], 0)
                i += 1
            continue
        if c == "(":
            rest = regex[i + 1:]
            capturing = not rest.startswith("?") or (rest.startswith("?<") and not rest.startswith(("?<=", "?<!")))
            look = rest.startswith(("?=", "?!", "?<=", "?<!"))
            if rest.startswith("?") and not capturing and not look:
                flags = rest[1:].split(")")[0].split(":")[0]
                if "x" in flags.split("-")[0]:
                    refuse("a regex in comments mode (?x) is not lifted")
            frame = {"group": None, "alt": False, "look": look or frames[-1]["look"], "children": [],
                     "parent": frames[-1], "optional": False}
            if capturing:
                frame["group"] = len(groups) + 1
                groups.append(frame)
            frames[-1]["children"].append(frame)
            frames.append(frame)
            i += 1
            continue
        if c == ")":
            if len(frames) == 1:
                refuse("unbalanced ) in the regex")
            frame = frames.pop()
            frame["optional"] = quantifier_optional(i + 1)
            i += 1
            continue
        if c == "|":
            frames[-1]["alt"] = True
        i += 1
    if len(frames) != 1:
        refuse("unbalanced ( in the regex")

    def certain(frame: dict) -> bool:
        f = frame
        while "parent" in f:
            if f["optional"] or f["look"] or f["parent"]["alt"]:
                return False
            f = f["parent"]
        return True

    return len(groups), frozenset(g["group"] for g in groups if certain(g))


def pattern_call(p: CompiledPattern, node: T.MethodInvocation, scope, lift, unsupported) -> Expr | MatcherVar:
    """`p.matcher(s)` (a MatcherVar), `p.matcher(s).matches()` and friends, `p.split(s)`."""
    m, args = node.member, node.arguments or []
    if m == "matcher" and len(args) == 1:
        subject = lift(args[0], scope)
        if subject.jtype != "String":
            raise unsupported(node, "a Matcher over something that is not a String")
        return MatcherVar(p, subject)
    if m == "split" and len(args) == 1:  # Pattern.split(input) is String.split(regex): limit 0 (Java SE API)
        return Call("String[]", "split", (lift(args[0], scope), Lit("String", p.regex), Lit("int", 0)))
    raise unsupported(node, f"Pattern.{m}() is not lifted")


APPLIED = {"matches": "\\A(?:{})\\z", "lookingAt": "\\A(?:{})", "find": "{}"}


def matcher_call(mv: MatcherVar, node: T.MethodInvocation, scope, unsupported) -> Expr:
    """A call on a Matcher: a match attempt (boolean), group(n), groupCount()."""
    m, args = node.member, node.arguments or []
    if mv.current is not None:  # inside its find() loop (MapLifter._find_loop checked the reads)
        if m == "group":
            return mv.current
        raise unsupported(node, f"Matcher.{m}() inside its find() loop is not lifted")
    if mv.spent:
        raise unsupported(node, f"Matcher.{m}() after its find() loop is not lifted (the last find() failed: "
                                "group() would throw)")
    if m in APPLIED and not args:
        if mv.how is not None and (m == "find" or mv.how != m):
            raise unsupported(node, f"{m}() after an earlier match attempt on the same Matcher (find() moves on to "
                                    "the next match) is not lifted", "use a second Matcher")
        mv.how = m
        mv.attempt = mv.matched = Call("boolean", "regex_finds", (mv.subject, applied(mv.pattern, m)))
        return mv.attempt
    if m == "groupCount" and not args:
        return Lit("int", group_facts(mv.pattern.regex)[0])
    if m == "group" and len(args) <= 1:
        k = 0
        if args:
            arg = args[0]
            if not (isinstance(arg, T.Literal) and arg.value.isdigit()):
                raise unsupported(node, "group() of a computed or named group is not lifted")
            k = int(arg.value)
        if mv.how is None:
            raise unsupported(node, "group() before matches()/find(): Java throws IllegalStateException")
        check_group(mv.pattern, k, node, unsupported)
        regex = applied(mv.pattern, mv.how)
        if mv.proved:
            return Call("String", "regex_group", (mv.subject, regex, Lit("int", k)))
        return Call("String", "regex_group", (mv.subject, regex, Lit("int", k), mv.matched),
                    scope.on_error("regex_group"))
    raise unsupported(node, f"Matcher.{m}() is not lifted")


def check_group(p: CompiledPattern, k: int, node, unsupported) -> None:
    """Refuse group(k) where Java and Spark would differ: past the group count, or a group that
    may take no part in a match."""
    count, certain = group_facts(p.regex)
    if k > count:
        raise unsupported(node, f"group({k}) of a regex with {count} groups: Java throws IndexOutOfBoundsException")
    if k and k not in certain:
        raise unsupported(node, f"group({k}) may take no part in a match (it is optional, in an alternative or in "
                                "a lookaround): Java gives null there, Spark's regexp_extract gives \"\"",
                          "test it for null in Java, then F.when(...) in the script")


SUFFIX = {"matches": "_WHOLE", "lookingAt": "_AT_START", "find": ""}


def applied(p: CompiledPattern, how: str) -> "RegexLit":
    """The regex as a match call (`how`) applies it, named for the script's constant after the Pattern."""
    return RegexLit("String", APPLIED[how].format(p.regex), name=(p.name + SUFFIX[how]) if p.name else "")


@dataclass(frozen=True)
class RegexLit(Lit):
    """A regex literal the script declares once as a constant named after the Java Pattern."""

    name: str = ""
