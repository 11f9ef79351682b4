"""Counting loops that only walk an array or a String: `for (int i = 0; i < a.length; i++)` whose
body reads the index only as `a[i]` (and never assigns `i` or `a`) is the for-each `for (T x : a)`;
`for (int i = 0; i < s.length(); i++)` reading only `s.charAt(i)` is `for (char c : s.toCharArray())`.
When the body starts with `T x = a[i];` (or `char c = s.charAt(i);`), that local is the loop variable.
"""
from __future__ import annotations

import copy

from javalang import tree as T

from migrate.lower.walk import line_of, mentions, name_ref, positioned, statement_lists


def counting_loops(cls, index=None) -> list[tuple[int, str]]:
    done = []
    for method in cls.node.methods:
        changed = True
        while changed:  # a rewritten loop's body is a new tree: look again for the loops inside it
            changed = False
            for stmts, _ in statement_lists(method):
                for i, s in enumerate(stmts):
                    got = _as_for_each(s, method, cls)
                    if got is not None:
                        stmts[i] = got
                        what = "an array" if isinstance(got.control.iterable, T.MemberReference) else "a String's chars"
                        done.append((line_of(s), f"a counting loop over {what} is a for-each over its elements"))
                        changed = True
                        break
                if changed:
                    break
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
    if not (isinstance(cond, T.BinaryOperation) and cond.operator == "<" and _is_name(cond.operandl, i)):
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


def _is_name(n, name) -> bool:
    return isinstance(n, T.MemberReference) and n.member == name and not n.qualifier and not n.selectors \
        and not n.prefix_operators and not n.postfix_operators


def _is_increment(update, i) -> bool:
    if not update or len(update) != 1:
        return False
    u = update[0]
    if isinstance(u, T.MemberReference) and u.member == i and not u.qualifier and \
            ((u.postfix_operators or []) + (u.prefix_operators or [])) == ["++"]:
        return True
    if isinstance(u, T.Assignment) and _is_name(u.expressionl, i):
        v = u.value
        if u.type == "+=" and isinstance(v, T.Literal) and v.value == "1":
            return True
        return u.type == "=" and isinstance(v, T.BinaryOperation) and v.operator == "+" and _is_name(v.operandl, i) \
            and isinstance(v.operandr, T.Literal) and v.operandr.value == "1"
    return False


def _element_ref(n, arr: str, i: str) -> bool:
    """`arr[i]` or `arr.charAt(i)` and nothing more."""
    if isinstance(n, T.MethodInvocation):
        return n.qualifier == arr and n.member == "charAt" and len(n.arguments or []) == 1 and not n.selectors \
            and _is_name(n.arguments[0], i) and not n.prefix_operators and not n.postfix_operators
    return isinstance(n, T.MemberReference) and n.member == arr and not n.qualifier and len(n.selectors or []) == 1 \
        and isinstance(n.selectors[0], T.ArraySelector) and _is_name(n.selectors[0].index, i)


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


def _char_of(name: str, method):
    """`char` when `name` is a String local or parameter of the method, else None."""
    types = [n.type for _, n in method if isinstance(n, (T.LocalVariableDeclaration, T.VariableDeclaration))
             for d in n.declarators if d.name == name and not d.dimensions]
    types += [n.type for _, n in method if isinstance(n, T.FormalParameter) and n.name == name]
    if len(types) != 1 or getattr(types[0], "name", "") != "String" or types[0].dimensions:
        return None
    return T.BasicType(name="char", dimensions=[])


def _element_type(arr: str, method, cls):
    """The element type of the array `arr` declared in the method (local or parameter)."""
    decls = []
    for _, n in method:
        if isinstance(n, (T.LocalVariableDeclaration, T.VariableDeclaration)):
            decls += [(n.type, d.dimensions) for d in n.declarators if d.name == arr]
        elif isinstance(n, T.FormalParameter) and n.name == arr:
            decls.append((n.type, []))
    if len(decls) != 1:  # only a local or parameter: a field could be replaced by a call in the loop
        return None
    t, extra = decls[0]
    dims = len(t.dimensions or []) + len(extra or [])
    if dims != 1:
        return None
    out = copy.copy(t)
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
    if not (isinstance(cond, T.BinaryOperation) and cond.operator in ("<", "<=") and _is_name(cond.operandl, i)):
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
