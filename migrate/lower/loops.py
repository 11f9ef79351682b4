"""Counting loops that only walk an array or a String: `for (int i = 0; i < a.length; i++)` whose
body reads the index only as `a[i]` (and never assigns `i` or `a`) is the for-each `for (T x : a)`;
`for (int i = 0; i < s.length(); i++)` reading only `s.charAt(i)` is `for (char c : s.toCharArray())`.
When the body starts with `T x = a[i];` (or `char c = s.charAt(i);`), that local is the loop variable.
A `while` stepping a counter is a counting for loop; a loop over an Iterator (hasNext/next) is the
for-each over its Iterable.
"""
from __future__ import annotations

import copy

from javalang import tree as T

from migrate.lower.walk import (assigned_names, is_name, line_of, mentions, name_ref, positioned, qualified,
                               replace_nodes, statement_lists)


def counting_loops(cls, index=None) -> list[tuple[int, str]]:
    def at(stmts: list, k: int, method):
        got = _as_for_each(stmts[k], method, cls)
        if got is None:
            return None
        what = "an array" if isinstance(got.control.iterable, T.MemberReference) else "a String's chars"
        line, stmts[k] = line_of(stmts[k]), got
        return line, f"a counting loop over {what} is a for-each over its elements"
    return _until_none_applies(cls, at)


def _until_none_applies(cls, at) -> list[tuple[int, str]]:
    """Apply `at(stmts, k, method)` (which rewrites the list in place and says what it did, or
    returns None) at every statement of every method, until it applies nowhere: a rewritten loop's
    body is a new list, so the search starts again after each rewrite."""
    done = []
    for method in cls.node.methods:
        while True:
            note = next((n for stmts, _ in statement_lists(method) for k in range(len(stmts))
                         if (n := at(stmts, k, method)) is not None), None)
            if note is None:
                break
            done.append(note)
    return done


def _index_loop(s):
    """(index name, array name) of `for (int i = 0; i < a.length; i++)`, else None."""
    if not isinstance(s, T.ForStatement) or not isinstance(s.control, T.ForControl):
        return None
    c = s.control
    init = c.init
    if not (isinstance(init, T.VariableDeclaration) and getattr(init.type, "name", "") == "int"
            and len(init.declarators) == 1 and isinstance(init.declarators[0].initializer, T.Literal)
            and init.declarators[0].initializer.value == "0"):
        return None
    i = init.declarators[0].name
    cond = c.condition
    if not (isinstance(cond, T.BinaryOperation) and cond.operator == "<" and is_name(cond.operandl, i)):
        return None
    bound = cond.operandr
    if isinstance(bound, T.MemberReference) and bound.member == "length" and bound.qualifier \
            and "." not in bound.qualifier and not bound.selectors:
        kind = "array"
    elif isinstance(bound, T.MethodInvocation) and bound.member == "length" and not bound.arguments \
            and bound.qualifier and "." not in bound.qualifier and not bound.selectors:
        kind = "string"
    else:
        return None
    if not _is_increment(c.update, i):
        return None
    return i, bound.qualifier, kind



def _is_increment(update, i) -> bool:
    if not update or len(update) != 1:
        return False
    u = update[0]
    if isinstance(u, T.MemberReference) and u.member == i and not u.qualifier and \
            ((u.postfix_operators or []) + (u.prefix_operators or [])) == ["++"]:
        return True
    if isinstance(u, T.Assignment) and is_name(u.expressionl, i):
        v = u.value
        if u.type == "+=" and isinstance(v, T.Literal) and v.value == "1":
            return True
        return u.type == "=" and isinstance(v, T.BinaryOperation) and v.operator == "+" and is_name(v.operandl, i) \
            and isinstance(v.operandr, T.Literal) and v.operandr.value == "1"
    return False


def _element_ref(n, arr: str, i: str) -> bool:
    """`arr[i]` or `arr.charAt(i)` and nothing more."""
    if isinstance(n, T.MethodInvocation):
        return n.qualifier == arr and n.member == "charAt" and len(n.arguments or []) == 1 and not n.selectors \
            and is_name(n.arguments[0], i) and not n.prefix_operators and not n.postfix_operators
    return isinstance(n, T.MemberReference) and n.member == arr and not n.qualifier and len(n.selectors or []) == 1 \
        and isinstance(n.selectors[0], T.ArraySelector) and is_name(n.selectors[0].index, i)


def _as_for_each(s, method, cls):
    got = _index_loop(s)
    if got is None:
        return None
    i, arr, kind = got
    element_type = _element_type(arr, method, cls) if kind == "array" else _char_of(arr, method)
    if element_type is None:
        return None
    body = s.body
    stmts = body.statements if isinstance(body, T.BlockStatement) else [body]
    # every use of i is arr[i]; nothing assigns arr, its elements or i
    uses = sum(1 for _, n in s.body if _mentions_name(n, i))
    uses_ok = uses == sum(1 for _, n in s.body if _element_ref(n, arr, i))
    if not uses_ok or _writes(s.body, arr) or _writes(s.body, i):
        return None
    var, rest = None, stmts
    first = stmts[0] if stmts else None
    if isinstance(first, T.LocalVariableDeclaration) and len(first.declarators) == 1 and \
            _element_ref(first.declarators[0].initializer, arr, i) and not first.declarators[0].dimensions and \
            _same_type(first.type, element_type) and not _writes(stmts[1:], first.declarators[0].name):
        var, rest = first.declarators[0].name, stmts[1:]
    if var is None:
        var = f"{arr}_{i}"
        if any(mentions(m, var) for m in cls.node.methods):
            return None
    rest = [_replace_elements(copy.deepcopy(x), arr, i, var) for x in rest]
    loop_var = T.VariableDeclaration(modifiers=set(), annotations=[], type=element_type,
                                     declarators=[T.VariableDeclarator(name=var, dimensions=[], initializer=None)])
    iterable = name_ref(arr, s) if kind == "array" else positioned(T.MethodInvocation(
        qualifier=arr, member="toCharArray", arguments=[], selectors=[], prefix_operators=[], postfix_operators=[],
        type_arguments=None), s)
    control = positioned(T.EnhancedForControl(var=loop_var, iterable=iterable), s)
    new_body = positioned(T.BlockStatement(label=None, statements=rest), body)
    return positioned(T.ForStatement(label=s.label, control=control, body=new_body), s)


def _mentions_name(n, name) -> bool:
    return isinstance(n, T.MemberReference) and n.member == name and not n.qualifier


def _writes(node, name) -> bool:
    nodes = node if isinstance(node, list) else [node]
    for top in nodes:
        for _, n in top:
            if isinstance(n, T.Assignment):
                target = n.expressionl
                if isinstance(target, T.MemberReference) and target.member == name and not target.qualifier:
                    return True
            if isinstance(n, T.MemberReference) and n.member == name and not n.qualifier and \
                    {"++", "--"} & set((n.prefix_operators or []) + (n.postfix_operators or [])):
                return True
    return False


def _replace_elements(node, arr, i, var):
    if _element_ref(node, arr, i):
        return name_ref(var, node)
    for attr in node.attrs:
        v = getattr(node, attr)
        if isinstance(v, list):
            setattr(node, attr, [_replace_elements(x, arr, i, var) if hasattr(x, "attrs") else x for x in v])
        elif hasattr(v, "attrs"):
            setattr(node, attr, _replace_elements(v, arr, i, var))
    return node


def _same_type(a, b) -> bool:
    return getattr(a, "name", None) == getattr(b, "name", None) and not getattr(a, "dimensions", None) \
        and not getattr(b, "dimensions", None)


def _declarations(name: str, method) -> list[tuple[object, int]]:
    """(type, array dimensions) of each local or parameter of the method called `name`."""
    out = []
    for _, n in method:
        if isinstance(n, (T.LocalVariableDeclaration, T.VariableDeclaration)):
            out += [(n.type, len(n.type.dimensions or []) + len(d.dimensions or [])) for d in n.declarators
                    if d.name == name]
        elif isinstance(n, T.FormalParameter) and n.name == name:
            out.append((n.type, len(n.type.dimensions or [])))
    return out


def _char_of(name: str, method):
    """`char` when `name` is a String local or parameter of the method, else None."""
    decls = _declarations(name, method)
    if len(decls) != 1 or getattr(decls[0][0], "name", "") != "String" or decls[0][1]:
        return None
    return T.BasicType(name="char", dimensions=[])


def _element_type(arr: str, method, cls):
    """The element type of the array `arr` declared in the method (local or parameter)."""
    decls = _declarations(arr, method)
    if len(decls) != 1 or decls[0][1] != 1:  # not a field: a call in the loop could replace it
        return None
    out = copy.copy(decls[0][0])
    out.dimensions = []
    return out


def while_counters(cls, index=None) -> list[tuple[int, str]]:
    """`int i = 0; while (i < n) { ...; i++; ... }` is `for (int i = 0; i < n; i++) { ... }` when the
    body steps i once, at its top level, nothing before the step jumps past it (`continue` would
    skip it in the while, not in the for), nothing after it reads i, nothing else changes i, and
    nothing after the loop reads i (the for's i ends with the loop). Moving the step to the end
    changes nothing then: every way out of an iteration after the step (continue, break, return)
    leaves i as the for does, or never reads it again. The counting-loop rule then reads the for."""
    done = []
    for method in cls.node.methods:
        for stmts, _ in list(statement_lists(method)):
            k = 0
            while k + 1 < len(stmts):
                got = _as_counting_for(stmts[k], stmts[k + 1], stmts[k + 2:])
                if got is not None:
                    stmts[k:k + 2] = [got]
                    done.append((line_of(got), "a while loop stepping a counter is a counting for loop"))
                k += 1
    return done


def _as_counting_for(decl, loop, after):
    if not (isinstance(decl, T.LocalVariableDeclaration) and getattr(decl.type, "name", "") == "int"
            and not decl.type.dimensions and len(decl.declarators) == 1 and not decl.declarators[0].dimensions
            and isinstance(loop, T.WhileStatement) and isinstance(loop.body, T.BlockStatement)
            and loop.body.statements):
        return None
    i = decl.declarators[0].name
    cond = loop.condition
    body = loop.body.statements
    if not (isinstance(cond, T.BinaryOperation) and cond.operator in ("<", "<=") and is_name(cond.operandl, i)):
        return None
    at = [j for j, x in enumerate(body) if isinstance(x, T.StatementExpression) and _is_increment([x.expression], i)]
    if len(at) != 1:
        return None
    pre, step, post = body[:at[0]], body[at[0]], body[at[0] + 1:]
    rest = pre + post
    if _writes(rest, i) or any(_steps(n, i) for x in rest for _, n in x) or _mentions(cond.operandr, i) \
            or any(isinstance(n, T.ContinueStatement) for x in pre for _, n in x) \
            or any(mentions(x, i) for x in post) or any(mentions(x, i) for x in after):
        return None
    init = T.VariableDeclaration(modifiers=decl.modifiers, annotations=decl.annotations, type=decl.type,
                                 declarators=decl.declarators)
    control = positioned(T.ForControl(init=init, condition=cond, update=[step.expression]), loop)
    new_body = positioned(T.BlockStatement(label=None, statements=rest), loop.body)
    return positioned(T.ForStatement(label=loop.label, control=control, body=new_body), loop)


def _steps(n, name) -> bool:
    return isinstance(n, T.MemberReference) and n.member == name and not n.qualifier \
        and bool({"++", "--"} & set((n.prefix_operators or []) + (n.postfix_operators or [])))


def _mentions(node, name) -> bool:
    return any(_mentions_name(n, name) for _, n in node) if hasattr(node, "__iter__") else False


def iterator_loops(cls, index=None) -> list[tuple[int, str]]:
    """`Iterator<T> it = xs.iterator(); while (it.hasNext()) { ... it.next() ... }` (or `for (;
    it.hasNext(); )`) is `for (T v : xs) { ... v ... }`: JLS 14.14.2 defines the enhanced for over an
    Iterable as that very loop with `T v = it.next();` first in the body. next() read later in the
    body is the same loop when it runs once per iteration, unconditionally, nothing before it goes
    on to the next iteration (`continue`), and nothing before it reads an object the loop assigns
    (Hadoop reuses one value object: such a variable still holds the element next() has not
    fetched yet). `it` serves nothing else, in the loop or after it."""
    def at(stmts: list, k: int, method):
        got = _iterator_loop(stmts, k, method, cls)
        if got is None:
            return None
        j, loop = got
        stmts[j] = loop
        del stmts[k]
        return line_of(loop), "an iterator loop (hasNext/next) is a for-each over the same values"
    return _until_none_applies(cls, at)


def _iterator_loop(stmts: list, k: int, method, cls):
    """(index of the loop, the for-each replacing it) when stmts[k] declares an iterator read only
    by the loop after it, else None."""
    decl = stmts[k]
    if not isinstance(decl, T.LocalVariableDeclaration) or len(decl.declarators) != 1:
        return None
    name, args = qualified(decl.type)
    if name not in ("Iterator", "java.util.Iterator") or len(args) != 1 or args[0].pattern_type is not None \
            or args[0].type is None:
        return None
    it, element = decl.declarators[0].name, args[0].type
    iterable = _iterated(decl.declarators[0].initializer)
    later = [j for j in range(k + 1, len(stmts)) if mentions(stmts[j], it)]
    if iterable is None or not later:
        return None
    j = later[0]
    loop = stmts[j]
    if len(later) > 1 or not _has_next_loop(loop, it):
        return None
    roots = {n.member if isinstance(n, T.MemberReference) else n.qualifier for _, n in iterable
             if isinstance(n, (T.MemberReference, T.MethodInvocation))} - {None, ""}
    if any(r in assigned_names(s) for s in stmts[k + 1:j] for r in roots):
        return None  # the source changes between the iterator and the loop
    body = list(loop.body.statements) if isinstance(loop.body, T.BlockStatement) else [loop.body]
    uses = [n for s in body for _, n in s if (getattr(n, "qualifier", None) or "").split(".")[0] == it
            or isinstance(n, T.MemberReference) and n.member == it and not n.qualifier]
    if len(uses) != 1 or not _is_call(uses[0], it, "next"):
        return None
    call = uses[0]
    p = next(i for i, s in enumerate(body) if any(n is call for _, n in s))
    pre = body[:p]
    if not _always(body[p], call) or any(isinstance(n, T.ContinueStatement) for s in pre for _, n in s):
        return None
    assigned = set().union(*(assigned_names(s) for s in body))
    if any(mentions(s, name) and not _value_typed(name, method, cls) for s in pre + [body[p]] for name in assigned):
        return None  # might read the reused object before next() refills it
    first = body[0]
    if p == 0 and isinstance(first, T.LocalVariableDeclaration) and len(first.declarators) == 1 \
            and first.declarators[0].initializer is call and not call.selectors and not first.declarators[0].dimensions:
        var, var_type, rest = first.declarators[0].name, first.type, body[1:]
    else:
        var, var_type = f"{it}_next", element
        if any(mentions(m, var) for m in cls.node.methods):
            return None
        at = body[p]
        if isinstance(at, T.StatementExpression) and at.expression is call and not call.selectors:
            rest = pre + body[p + 1:]  # `it.next();` only moves on: the for-each does that
        else:
            replace_nodes(at, lambda n: _as_reference(n, var) if n is call else None)
            rest = body
    loop_var = T.VariableDeclaration(modifiers=set(), annotations=[], type=var_type,
                                     declarators=[T.VariableDeclarator(name=var, dimensions=[], initializer=None)])
    control = positioned(T.EnhancedForControl(var=loop_var, iterable=iterable), loop)
    new_body = positioned(T.BlockStatement(label=None, statements=rest), loop.body)
    return j, positioned(T.ForStatement(label=loop.label, control=control, body=new_body), loop)


def _iterated(init):
    """`xs.iterator()` -> xs; `a.b().iterator()` -> a.b(); else None."""
    if not isinstance(init, T.MethodInvocation) or init.prefix_operators or init.postfix_operators:
        return None
    if init.member == "iterator" and not init.arguments and not init.selectors and init.qualifier \
            and "." not in init.qualifier:
        return name_ref(init.qualifier, init)
    sels = init.selectors or []
    if sels and isinstance(sels[-1], T.MethodInvocation) and sels[-1].member == "iterator" and not sels[-1].arguments \
            and not sels[-1].selectors:
        out = copy.deepcopy(init)
        out.selectors = out.selectors[:-1]
        return out
    return None


def _is_call(n, qualifier: str, member: str) -> bool:
    return isinstance(n, T.MethodInvocation) and n.qualifier == qualifier and n.member == member \
        and not n.arguments and not n.prefix_operators and not n.postfix_operators


def _has_next_loop(loop, it: str) -> bool:
    if isinstance(loop, T.WhileStatement):
        cond = loop.condition
    elif isinstance(loop, T.ForStatement) and isinstance(loop.control, T.ForControl) \
            and loop.control.init is None and not loop.control.update:
        cond = loop.control.condition
    else:
        return False
    return _is_call(cond, it, "hasNext") and not cond.selectors


def _always(node, target) -> bool:
    """Does running `node` (a statement or an expression) always evaluate `target`, once?"""
    if node is target:
        return True
    if isinstance(node, T.StatementExpression):
        return _always(node.expression, target)
    if isinstance(node, T.LocalVariableDeclaration):
        return any(_always(d.initializer, target) for d in node.declarators if d.initializer is not None)
    if isinstance(node, T.IfStatement):
        return _always(node.condition, target)
    if isinstance(node, (T.Statement, T.LambdaExpression, T.MethodReference)):
        return False
    if isinstance(node, T.TernaryExpression):
        return _always(node.condition, target)
    if isinstance(node, T.BinaryOperation) and node.operator in ("&&", "||"):
        return _always(node.operandl, target)
    for attr in getattr(node, "attrs", ()):
        v = getattr(node, attr)
        for x in v if isinstance(v, list) else [v]:
            if hasattr(x, "attrs") and _always(x, target):
                return True
    return False


def _as_reference(call, var: str):
    """`it.next()` with its selectors (`.get()`, `.field`) read from the loop variable instead."""
    sels = list(call.selectors or [])
    if sels and isinstance(sels[0], T.MethodInvocation):
        first = sels[0]
        return positioned(T.MethodInvocation(qualifier=var, member=first.member, arguments=first.arguments,
                                             selectors=sels[1:], prefix_operators=[], postfix_operators=[],
                                             type_arguments=first.type_arguments), call)
    if sels and isinstance(sels[0], T.MemberReference):
        return positioned(T.MemberReference(qualifier=var, member=sels[0].member, selectors=sels[1:],
                                            prefix_operators=[], postfix_operators=[]), call)
    ref = name_ref(var, call)
    ref.selectors = sels
    return ref


def _value_typed(name: str, method, cls) -> bool:
    """Is every declaration of `name` (method locals and parameters, else fields) a primitive or a
    String: a value no other variable can share?"""
    decls = _declarations(name, method) or [(f.type, len(f.type.dimensions or []) + len(d.dimensions or []))
                                           for f in cls.fields() for d in f.declarators if d.name == name]
    return bool(decls) and all((isinstance(t, T.BasicType) or getattr(t, "name", "") == "String") and not dims
                               for t, dims in decls)
