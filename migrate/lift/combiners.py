"""Combiners judged by the algebra of the lifted reducer and combiner.

Hadoop runs a combiner zero, one or several times over parts of one map task's output for a key
(Job.setCombinerClass javadoc; MapReduce tutorial, "Combiner"), so the original job is
deterministic only when the reducer gives the same lines on the combiner's partial results as on
the raw values. With both lifted to aggregates that is an identity of the algebra, checked here:

- the combiner writes exactly one (key, v) per call with the key unchanged; a test of the key
  alone is allowed when every write of the reducer carries the same test (the same keys vanish);
- read the way the reducer reads a value, v gives, for each of the reducer's aggregates, the
  combiner's own aggregate of the same kind over the same expression of the value: a sum of
  partial sums, a min of minima, a max of maxima (also field by field through a Writable);
- the reducer may write any expression of its totals (an average computed from summed sums
  and counts is fine).

Anything else is unsound, and the reason names the step that breaks it: the reducer counts the
values it receives (it would count partial results), takes another aggregate of them, starts a
sum at a non-zero value (added once per combine), or writes each value it receives; the
combiner writes an expression of its aggregates (an average of averages), writes only when a
test of its partial result holds (a HAVING on partials drops keys), changes the key, or writes
more than once.
"""
from __future__ import annotations

import re
from dataclasses import dataclass

from migrate.plan import (AggRef, Cast, Col, Count, Emit, EachValue, Expr, Group, Identity, Let, Step,
                          resolve_fields, rewrite, walk)
from migrate.plan import dump_expr

_COMPOSABLE = ("sum", "min", "max")
# starting values that never win a max / a min (Integer/Long MIN_VALUE and MAX_VALUE, infinities)
_NEUTRAL = {"max": (-2147483648, -9223372036854775808, float("-inf")),
            "min": (2147483647, 9223372036854775807, float("inf"))}
COMBINER_COUNTERS = "combiner-counters"  # the Finding naming counters a combiner updates


def combiner_counters(combiner: Step | None) -> list[str]:
    """`group:name` of each counter the lifted combiner updates (per value or per call)."""
    counts = [c for c in getattr(combiner, "lets", ()) if isinstance(c, Count)] + list(getattr(combiner, "counts", ()))
    return list(dict.fromkeys(f"{c.group}:{c.name}" for c in counts))


@dataclass(frozen=True)
class Verdict:
    sound: bool
    why: str  # sound: what the combiner writes (a verb phrase); else what breaks the reducer's answer


def judge(reducer: Step | None, combiner: Step | None, combiner_unread: str = "") -> Verdict:
    """Whether running `combiner` on partial groups leaves `reducer`'s output unchanged.
    `combiner_unread` says why the combiner's reduce() was not lifted (then `combiner` is None)."""
    if isinstance(combiner, Identity):
        return Verdict(True, "passes the pairs on unchanged")
    if reducer is None:
        return Verdict(False, "the reducer itself is not converted (see its own item), so the combiner could not be "
                              "checked against it")
    if isinstance(reducer, (Identity, EachValue)):
        return Verdict(False, "the reducer writes each value it receives, so the original's output holds the "
                              "combiner's per-task partial results, which depend on how the input was split and "
                              "spilled")
    if not isinstance(reducer, Group):
        return Verdict(False, "the reducer is not an aggregate of the values")
    if combiner is None:
        return Verdict(False, f"the combiner's reduce() is not read ({combiner_unread or 'no rule lifts it'})")
    if not isinstance(combiner, Group):
        return Verdict(False, "the combiner is not an aggregate of the values")
    if combiner.keys is not None and combiner.keys != reducer.keys:
        return Verdict(False, f"the combiner drops the keys failing {_text(combiner.keys)}, which the reducer would "
                              "aggregate")
    if reducer.distinct:
        ok = combiner.distinct and combiner.single is not None
        return Verdict(ok, "passes on each key once, as the reducer does" if ok else
                       "the reducer passes on each key once, the combiner does something else")
    if combiner.first_keys is not None:
        return Verdict(False, f"the combiner writes only the first {combiner.first_keys} keys of each task it runs in")
    write, why = _one_write(combiner, reducer)
    if write is None:
        return Verdict(False, why)
    read, comb = _aggregate_args(reducer), _aggregate_args(combiner)
    parts = []
    for a in reducer.aggs:
        fn = a.fn.split("_")[0]
        if fn == "count":
            return Verdict(False, f"the reducer counts the values it receives (`{a.name}`): after the combiner those "
                                  "are partial results, so it would count them, not the values")
        if fn == "only":
            return Verdict(False, f"the reducer keeps the last value it receives (`{a.name}`), which after the "
                                  "combiner is a partial result, not one of the values")
        if fn not in _COMPOSABLE:
            return Verdict(False, f"the reducer takes the {a.fn} of the values (`{a.name}`), which partial results "
                                  "do not compose into")
        if fn == "sum" and a.init not in (None, 0, 0.0):
            return Verdict(False, f"the reducer starts its sum `{a.name}` at {a.init}, which a combiner would add "
                                  "once per run")
        seen = resolve_fields(rewrite(read[a.name], lambda e: write.value if isinstance(e, Col) and e.name == "value"
                                 else None))
        inner = seen.arg if isinstance(seen, Cast) else seen
        partial = next((c for c in combiner.aggs if isinstance(inner, AggRef) and c.name == inner.name), None)
        if partial is None:
            return Verdict(False, f"the combiner writes {_text(write.value)}, which is not a partial {fn} the "
                                  f"reducer's `{a.name}` can take the {fn} of (a {fn} of such results is not the "
                                  f"{fn} of the values)")
        # the same aggregate (min_nan keeps NaN, min_nonnan drops it: not the same) of the same expression
        if (partial.fn != a.fn and not (fn == "sum" and partial.fn.split("_")[0] == "sum")) or \
                comb[partial.name] != read[a.name] and not _same_value(comb[partial.name], read[a.name]):
            return Verdict(False, f"the reducer's `{a.name}` is the {a.fn} of {_text(read[a.name])}, but the combiner "
                                  f"writes the {partial.fn} of {_text(comb[partial.name])}")
        if fn == "sum" and partial.init not in (None, 0, 0.0):
            return Verdict(False, f"the combiner starts its sum at {partial.init}, added once per run")
        if fn != "sum" and partial.init not in (None, a.init) and partial.init not in _NEUTRAL[fn]:
            return Verdict(False, f"the combiner's {fn} starts at {partial.init}, the reducer's at {a.init}: the "
                                  "combiner's start would count as a value")
        narrow = fn == "sum" and partial.jtype == "int" and a.jtype == "long"
        parts.append(f"a partial {fn}" + (" (added in int: a per-task sum past 2^31 would wrap in the original)"
                                          if narrow else ""))
    return Verdict(True, f"writes {', '.join(dict.fromkeys(parts))} of the values the reducer aggregates")


def _one_write(combiner: Group, reducer: Group) -> tuple[Emit | None, str]:
    """The combiner's one write per call, or None and why it is not one."""
    if len(combiner.emits) != 1:
        return None, f"the combiner writes {len(combiner.emits)} times per call"
    e = combiner.emits[0]
    if not (isinstance(e.key, Col) and e.key.name == "key"):
        return None, f"the combiner writes the key {_text(e.key)}, not the key it was given"
    if e.guard is not None:
        if any(isinstance(x, AggRef) for x in walk(e.guard)):
            return None, (f"the combiner writes (line {e.origin.line_start}) only when {_text(e.guard)} holds of its "
                          "partial result: a key whose partial results all fail the test is lost even when its total "
                          "would pass")
        if not all(e.guard in _conjuncts(r.guard) for r in reducer.emits):
            return None, f"the combiner writes only when {_text(e.guard)}, a test the reducer's writes do not share"
    return e, ""


def _conjuncts(g: Expr | None) -> list[Expr]:
    if g is None:
        return []
    if getattr(g, "op", None) == "&&" and hasattr(g, "args"):
        return [c for a in g.args for c in _conjuncts(a)]
    return [g]


def _aggregate_args(g: Group) -> dict[str, Expr]:
    """Each aggregate's argument, in terms of the value itself."""
    return {a.name: _inline_arg(g, a.arg) for a in g.aggs}


def _inline_arg(g: Group, arg: Expr | None) -> Expr | None:
    """An aggregate's argument with the loop's per-value locals replaced by their expressions."""
    if arg is None:
        return None
    lets = {l.name: l.expr for l in g.lets if isinstance(l, Let)}
    for _ in range(len(lets) + 1):
        new = rewrite(arg, lambda e: lets.get(e.name) if isinstance(e, Col) and e.name in lets else None)
        if new == arg:
            break
        arg = new
    return arg


def _same_value(a: Expr | None, b: Expr | None) -> bool:
    """The same expression of the value up to a widening cast (an int value summed as a long)."""
    strip = (lambda x: x.arg if isinstance(x, Cast) else x)
    return a is not None and b is not None and strip(a) == strip(b)


def _text(e: Expr | None) -> str:
    """An expression as the report shows it: the plan's dump without its type marks."""
    if e is None:
        return "nothing"
    return "`" + re.sub(r"([-+*/%]):\w+", r"\1", dump_expr(e)).replace("@", "") + "`"
