"""Read a mapper's or reducer's setup()/configure()/constructor into per-task constants.

Recognises: `field = conf.get/getInt/getLong/getFloat/getDouble/getBoolean(name[, default])`
where conf is `context.getConfiguration()` (new API) or the JobConf passed to configure()
(old API), possibly through a local, and pure expressions over such values (parsing,
trim, case); fields set to constants in a constructor; `super.setup(context)`.
Produces: field name -> plan expression (ConfValue leaves), which the map/reduce lifter reads
like any constant; the driver's `conf.set*` values become the defaults.
Caveats: anything else in these methods (I/O, side files, state) is left to the caller,
which reports it as task-lifecycle hand work.
"""
from __future__ import annotations

import re

from javalang import tree as T

from migrate.java.index import ClassInfo, node_lines
from migrate.lift.collections import ConstMap
from migrate.lift.exprs import Opaque, Scope, Unsupported, lift
from migrate.plan import ConfValue, Expr, Lit

GETTERS = {"get": "String", "getTrimmed": "String", "getInt": "int", "getLong": "long", "getFloat": "float",
           "getDouble": "double", "getBoolean": "boolean"}


class ConfReader:
    """Lifts `conf.getX(name, default)` calls; the rest of the expression goes through lift()."""

    def __init__(self, conf_vars: set[str], driver_conf: dict[str, str], file: str):
        self.conf_vars, self.driver_conf, self.file = conf_vars, driver_conf, file

    def is_conf(self, q: str, node) -> bool:
        return q in self.conf_vars

    def read(self, node: T.MethodInvocation, field: str) -> Expr:
        m, args = node.member, node.arguments or []
        if m not in GETTERS or not args or not isinstance(args[0], T.Literal) or not args[0].value.startswith('"'):
            raise Unsupported(node, f"configuration call {m}(...) with a computed name is not lifted")
        from migrate.java.literals import string_value

        name = string_value(args[0].value)
        jtype = GETTERS[m]
        default = None
        if len(args) > 1:
            d = lift(args[1], Scope({}))
            if not isinstance(d, Lit):
                raise Unsupported(node, "configuration default that is not a constant")
            default = d.value
        if name in self.driver_conf and not self.driver_conf[name].startswith("<"):
            default = _typed(self.driver_conf[name], jtype)
        if default is None and jtype != "String":
            raise Unsupported(node, f"{m}({name!r}) without a default")
        return ConfValue(jtype, name, m, default, python_name(field))


def _typed(text: str, jtype: str):
    """The driver's conf.set value as the getter would read it (Hadoop Configuration semantics)."""
    if jtype in ("int", "long"):
        t = text.strip()
        return int(t, 16) if t.lower().startswith(("0x", "-0x")) else int(t)
    if jtype in ("float", "double"):
        return float(text.strip())
    if jtype == "boolean":
        return text.strip().lower() == "true"
    return text


def python_name(java: str) -> str:
    """camelCase field -> snake_case variable for the script."""
    return re.sub(r"(?<=[a-z0-9])(?=[A-Z])", "_", java).lower()


def task_constants(cls: ClassInfo, driver_conf: dict[str, str], base_env: dict[str, object],
                   skip: set[int] = frozenset()) -> tuple[dict[str, Expr], list[tuple[int, str]]]:
    """Fields set in setup()/configure()/constructors, and (line, reason) for what could not be read.
    `skip`: id() of statements another reader accounts for (a side file read, lift.sidefiles)."""
    out: dict[str, Expr] = {}
    problems: list[tuple[int, str]] = []
    methods = [m for m in cls.node.body if isinstance(m, (T.MethodDeclaration, T.ConstructorDeclaration))
               and (isinstance(m, T.ConstructorDeclaration) or m.name in ("setup", "configure"))]
    for m in methods:
        params = [p.name for p in m.parameters]
        conf_vars = set()
        env: dict[str, object] = dict(base_env)
        if isinstance(m, T.MethodDeclaration) and m.name == "configure" and params:
            conf_vars.add(params[0])  # old API: configure(JobConf job)
        for p in params:
            env.setdefault(p, Opaque("the task context"))
        reader = ConfReader(conf_vars, driver_conf, cls.file.path)
        for st in m.body or []:
            if id(st) in skip:
                continue
            try:
                _statement(st, env, reader, out, params, cls)
            except Unsupported as u:
                problems.append((u.line or node_lines(st)[0], u.reason))
    return out, problems


def _statement(st, env, reader: ConfReader, out: dict[str, Expr], params: list[str], cls: ClassInfo) -> None:
    if isinstance(st, T.StatementExpression) and isinstance(st.expression, T.SuperMethodInvocation):
        return
    if isinstance(st, T.LocalVariableDeclaration) and getattr(st.type, "name", "") in ("Configuration", "JobConf"):
        for d in st.declarators:
            if _is_get_configuration(d.initializer, params):
                reader.conf_vars.add(d.name)
                continue
            raise Unsupported(st, "a Configuration that is not the task's")
        return
    if isinstance(st, T.LocalVariableDeclaration):
        for d in st.declarators:
            env[d.name] = _value(d.initializer, env, reader, d.name, params)
        return
    if isinstance(st, T.StatementExpression) and isinstance(st.expression, T.Assignment) and st.expression.type == "=":
        target = st.expression.expressionl
        name = None
        if isinstance(target, T.MemberReference) and target.qualifier in ("", None, "this") and not target.selectors:
            name = target.member
        elif isinstance(target, T.This) and target.selectors and isinstance(target.selectors[0], T.MemberReference):
            name = target.selectors[0].member
        if name is None:
            raise Unsupported(st, "assignment in setup() to something other than a field")
        out[name] = _value(st.expression.value, {**env, **out}, reader, name, params)
        return
    e = st.expression if isinstance(st, T.StatementExpression) else None
    if isinstance(e, T.MethodInvocation) and e.member == "put" and isinstance(env.get(e.qualifier), ConstMap):
        return  # a constant map filled before the first record (lift.collections read it)
    raise Unsupported(st, "statement in setup()/configure() is not a setting read")


def _is_get_configuration(e, params: list[str]) -> bool:
    return isinstance(e, T.MethodInvocation) and e.member == "getConfiguration" and (e.qualifier or "") in params


def _value(e, env, reader: ConfReader, field: str, params: list[str]) -> Expr:
    """Lift a value; configuration getters become ConfValue leaves (one level of nesting)."""
    found = _conf_call(e, reader, params)
    if found is not None:
        call, rest = found
        return _apply_selectors(reader.read(call, field), rest, env)
    if isinstance(e, T.MethodInvocation) and e.arguments and len(e.arguments) == 1:
        inner = _conf_call(e.arguments[0], reader, params)
        if inner is not None:  # Integer.parseInt(conf.get("x", "5")) and friends
            call, rest = inner
            key = f"__conf_{field}"
            env = {**env, key: _apply_selectors(reader.read(call, field), rest, env)}
            import copy

            e = copy.deepcopy(e)
            e.arguments = [T.MemberReference(member=key, qualifier="", selectors=[], prefix_operators=[], postfix_operators=[])]
    return lift(e, Scope(env, file=reader.file))


def _conf_call(e, reader: ConfReader, params: list[str]):
    """(getter call, selectors after it) for `conf.getInt(..)` or `context.getConfiguration().getInt(..)`."""
    if not isinstance(e, T.MethodInvocation):
        return None
    if reader.is_conf(e.qualifier or "", e) and e.member in GETTERS:
        return e, list(e.selectors or [])
    if e.member == "getConfiguration" and (e.qualifier or "") in params and e.selectors:
        first = e.selectors[0]
        if isinstance(first, T.MethodInvocation) and first.member in GETTERS:
            return first, list(e.selectors[1:])
    return None


def _apply_selectors(value: Expr, selectors: list, env) -> Expr:
    """`conf.get("x").trim()`: the calls after the getter, lifted over the setting."""
    if not selectors:
        return value
    key = "__conf_value"
    ref = T.MemberReference(member=key, qualifier="", selectors=selectors, prefix_operators=[], postfix_operators=[])
    return lift(ref, Scope({**env, key: value}))
