"""Metamorphic variants of the sample jobs: the same meaning in another author's style.

Each axis rewrites Java source text into a form with the same behaviour (javac accepts it and the
job writes the same output on Hadoop); applied to the whole sample tree, it gives a variant tree.
mrlift must give every job of a variant tree the same status as the unvaried job, and a script
whose output is byte-identical (tests/parity/test_variants.py). An axis that changes no file is
useless: the test requires each axis to change at least one job it converts.

The rewrites are textual on purpose (they are what an author would type); where they need to
know the code's structure (which lines are a map() body's locals, which names are arrays), they
read it with javalang first.
"""
from __future__ import annotations

import re
import shutil
from dataclasses import dataclass
from pathlib import Path
from typing import Callable

import javalang
from javalang import tree as T


@dataclass(frozen=True)
class Axis:
    name: str
    what: str  # the two styles
    rewrite: Callable[[str], str]


def _parse(text: str):
    try:
        return javalang.parse.parse(text)
    except (javalang.parser.JavaSyntaxError, javalang.tokenizer.LexerError):
        return None


def _on_tree(rewrite):
    """An axis that edits the lines of a file it could parse (the rewrite reads the tree, edits `lines`)."""
    def axis(text: str) -> str:
        tree = _parse(text)
        if tree is None:
            return text
        lines = text.split("\n")
        rewrite(tree, lines)
        return "\n".join(lines)
    axis.__doc__ = rewrite.__doc__
    return axis


def _map_methods(tree):
    for _, c in tree.filter(T.ClassDeclaration):
        for m in c.methods:
            if m.name in ("map", "reduce") and len(m.parameters) in (3, 4) and m.body:
                yield c, m


def _top_locals(m):
    """Local declarations at the top level of a method body: (statement, line)."""
    for s in m.body:
        if isinstance(s, T.LocalVariableDeclaration) and s.position:
            yield s


# ---------------------------------------------------------------------------------------- the axes
def catch_logs(text: str) -> str:
    """An empty-handed catch block vs one that prints the stack trace and a message first."""
    def add(m: re.Match) -> str:
        indent = m.group(1)
        var = m.group(3)
        return (f"{m.group(0)}\n{indent}    System.err.println(\"skipping a record: \" + {var}.getMessage());"
                f"\n{indent}    {var}.printStackTrace();")
    return re.sub(r"(?m)^([ \t]*)\}? ?catch \(([\w.| ]+?) (\w+)\) \{", add, text)


@_on_tree
def field_scratch(tree, lines: list[str]) -> None:
    """A `String[]` local of map() vs the same array kept in a private field set first thing in map()."""
    inserts: list[tuple[int, str]] = []
    for cls, m in _map_methods(tree):
        if m.name != "map":
            continue
        taken = {d.name for f in cls.fields for d in f.declarators}
        for s in _top_locals(m):
            d = s.declarators[0]
            if getattr(s.type, "name", "") != "String" or len(s.type.dimensions or []) != 1 or len(s.declarators) != 1 \
                    or d.name in taken or s is not m.body[0]:
                continue
            i = s.position.line - 1
            new = re.sub(r"\bString\s*\[\]\s+" + d.name + r"\s*=", d.name + " =", lines[i], count=1)
            if new == lines[i]:
                continue
            lines[i] = new
            inserts.append((_body_line(lines, cls), f"private String[] {d.name};"))
    for at, decl in sorted(inserts, reverse=True):
        indent = re.match(r"\s*", lines[at + 1]).group(0) or "        "
        lines.insert(at + 1, indent + decl)


def _body_line(lines: list[str], cls) -> int:
    """The index of the line holding the `{` that opens a class body."""
    i = cls.position.line - 1
    while "{" not in lines[i]:
        i += 1
    return i


@_on_tree
def setup_fields(tree, lines: list[str]) -> None:
    """A Writable or date-format field made at its declaration vs declared bare and made in setup()
    (a SimpleDateFormat then also configured there: `setLenient(true)`, Java's default)."""
    edits = []
    for _, cls in tree.filter(T.ClassDeclaration):
        ext = cls.extends
        if ext is None or ext.name not in ("Mapper", "Reducer") or any(m.name == "setup" for m in cls.methods):
            continue
        moved = []
        for f in cls.fields:
            if "static" in f.modifiers or len(f.declarators) != 1 or not f.position:
                continue
            d = f.declarators[0]
            i = f.position.line - 1  # a final field cannot be set in setup(): it loses `final`
            got = re.match(r"(\s*)(private |protected |)(?:final )?(\w+) (\w+) = (new \w+\([^()]*\));\s*$", lines[i])
            if got is None or got.group(4) != d.name:
                continue
            moved.append((i, got))
        if moved:
            edits.append((cls, moved))
    for cls, moved in reversed(edits):
        indent = moved[0][1].group(1)
        body = [f"{indent}@Override", f"{indent}protected void setup(Context context) {{"]
        for _, g in moved:  # a date format also gets Java's default leniency set once more (a no-op)
            body.append(f"{indent}    {g.group(4)} = {g.group(5)};")
            if g.group(3) == "SimpleDateFormat":
                body.append(f"{indent}    {g.group(4)}.setLenient(true);")
        body += [f"{indent}}}"]
        last = max(i for i, _ in moved)
        for i, g in moved:
            lines[i] = f"{g.group(1)}{g.group(2)}{g.group(3)} {g.group(4)};"
        lines[last + 1:last + 1] = body


def _for_each_loops(text: str, head, suffix: str) -> str:
    """Rewrite the for-each loops over an array local or over `e.split("...")` (made a local first):
    head(indent, T, x, arr, i) writes the new loop's head, which must leave x = arr[i] bound."""
    arrays = set(re.findall(r"\b\w+\s*\[\]\s+(\w+)\s*[=;]", text))

    def loop(m: re.Match) -> str:
        t, x, arr = m.group(2), m.group(3), m.group(4)
        return head(m.group(1), t, x, arr, f"{x}{suffix}") if arr in arrays else m.group(0)
    text = re.sub(r"(?m)^(\s*)for \((?:final )?([\w.<>]+) (\w+) : (\w+)\) \{", loop, text)

    def split_loop(m: re.Match) -> str:
        indent, t, x, expr = m.group(1), m.group(2), m.group(3), m.group(4)
        return f"{indent}{t}[] {x}All = {expr};\n" + head(indent, t, x, f"{x}All", f"{x}{suffix}")
    return re.sub(r"(?m)^(\s*)for \((?:final )?(String) (\w+) : ([\w.()]+\.split\(\"[^\"]*\"\))\) \{",
                  split_loop, text)


def counting_loops(text: str) -> str:
    """`for (T x : arr)` over an array vs `for (int i = 0; i < arr.length; i++) { T x = arr[i]; ...`."""
    return _for_each_loops(text, lambda ind, t, x, arr, i: f"{ind}for (int {i} = 0; {i} < {arr}.length; {i}++) "
                                                          f"{{ {t} {x} = {arr}[{i}];", "Index")


def locale_case(text: str) -> str:
    """`toLowerCase()` vs `toLowerCase(Locale.ROOT)` (the same mapping, stated)."""
    return re.sub(r"\.to(Lower|Upper)Case\(\)", r".to\1Case(java.util.Locale.ROOT)", text)


def literal_receiver(text: str) -> str:
    """`x.equals("lit")` vs `"lit".equals(x)`."""
    return re.sub(r"(\b\w+(?:\[\d+\])?)\.equals\((\"[^\"\\]*\")\)", r"\2.equals(\1)", text)


def objects_equals(text: str) -> str:
    """`a.equals(b)` vs `Objects.equals(a, b)` where a cannot be null (a record's field)."""
    return re.sub(r"(\b\w+\[\d+\])\.equals\(([^()]*)\)", r"java.util.Objects.equals(\1, \2)", text)


def boxed_parse(text: str) -> str:
    """`Integer.parseInt(s)` vs `Integer.valueOf(s)` unboxed (and the same for Long and Double)."""
    return re.sub(r"\b(Integer\.parseInt|Long\.parseLong|Double\.parseDouble)\(",
                  lambda m: m.group(1).split(".")[0] + ".valueOf(", text)


def boxed_zero(text: str) -> str:
    """A local started at `0` / `0L` / `0.0` vs at `new Integer(0)` / `new Long(0)` / `new Double(0)`
    (the deprecated boxing constructors, unboxed into the primitive local)."""
    boxes = {"int": "Integer", "long": "Long", "double": "Double"}
    return re.sub(r"\b(int|long|double) (\w+) = (0|0L|0\.0);",
                  lambda m: f"{m[1]} {m[2]} = new {boxes[m[1]]}(0);", text)


@_on_tree
def this_fields(tree, lines: list[str]) -> None:
    """A field named bare vs through `this.` in map()/reduce()."""
    for cls, m in _map_methods(tree):
        names = {d.name for f in cls.fields if "static" not in f.modifiers for d in f.declarators}
        if not names or not m.body:
            continue
        params = {p.name for p in m.parameters}
        local = {d.name for _, s in m.filter(T.LocalVariableDeclaration) for d in s.declarators}
        names -= params | local
        start, end = m.position.line, _method_end(lines, m.position.line)
        for i in range(start, end):
            for n in names:
                lines[i] = re.sub(r"(?<![\w.\"])" + n + r"\.(set|get|put|add|clear)\(", f"this.{n}.\\1(", lines[i])
                lines[i] = re.sub(r"(write|collect)\(" + n + r",", f"\\1(this.{n},", lines[i])


def _method_end(lines: list[str], start: int) -> int:
    depth, seen = 0, False
    for i in range(start - 1, len(lines)):
        depth += lines[i].count("{") - lines[i].count("}")
        seen = seen or "{" in lines[i]
        if seen and depth <= 0:
            return i + 1
    return len(lines)


def increments(text: str) -> str:
    """`n++;` vs `n += 1;`."""
    text = re.sub(r"(?m)^(\s*)(\w+)\+\+;", r"\1\2 += 1;", text)
    return text


@_on_tree
def final_locals(tree, lines: list[str]) -> None:
    """Locals of map()/reduce() declared plain vs `final` where they are never reassigned."""
    for _, m in _map_methods(tree):
        end = _method_end(lines, m.position.line)
        body = "\n".join(lines[m.position.line:end])
        for _, s in m.filter(T.LocalVariableDeclaration):
            if not s.position or "final" in s.modifiers or len(s.declarators) != 1:
                continue
            name = s.declarators[0].name
            if len(re.findall(r"\b" + name + r"\s*(=[^=]|[-+*/%&|^]=|<<=|>>>?=|\+\+|--)", body)) != 1 or \
                    re.search(r"(\+\+|--)" + name + r"\b", body):
                continue
            i = s.position.line - 1
            lines[i] = re.sub(r"^(\s*)(?=[\w<>\[\], ]+\s" + name + r"\s*=)", r"\1final ", lines[i], count=1)


@_on_tree
def var_locals(tree, lines: list[str]) -> None:
    """`String s = ...` / `String[] f = ...` locals vs `var` (Java 10+; the type is the initializer's)."""
    for _, m in _map_methods(tree):
        for _, s in m.filter(T.LocalVariableDeclaration):
            if not s.position or len(s.declarators) != 1 or s.declarators[0].initializer is None:
                continue
            if getattr(s.type, "name", "") != "String" or s.declarators[0].dimensions:
                continue
            init = s.declarators[0].initializer
            if isinstance(init, T.Literal) and init.value == "null":
                continue
            i = s.position.line - 1
            lines[i] = re.sub(r"\bString\s*(\[\])?\s+(" + s.declarators[0].name + r")\s*=", r"var \2 =", lines[i], count=1)


def new_per_write(text: str) -> str:
    """A Text field set then written vs a new Text made in the write."""
    texts = set(re.findall(r"\bText (\w+) = new Text\(\);", text))

    def inline(m: re.Match) -> str:
        name, value, between, rest = m.group(2), m.group(3), m.group(4), m.group(5)
        if name not in texts or re.search(r"\b" + name + r"\b", between):
            return m.group(0)
        return f"{m.group(1)}{between}{rest}new Text({value}), "
    return re.sub(r"(?m)^(\s*)(\w+)\.set\(([^;]*)\);\n((?:(?!.*\bwrite\().*\n)*?)(\s*context\.write\()\2, ",
                  inline, text)


def _code_chars(text: str, start: int = 0):
    """(index, char) of the characters of Java code outside string and char literals."""
    quote, i = "", start
    while i < len(text):
        c = text[i]
        if quote:
            if c == "\\":
                i += 1
            elif c == quote:
                quote = ""
        elif c in "\"'":
            quote = c
        else:
            yield i, c
        i += 1


def _top_level_pluses(expr: str) -> list[str]:
    """`a + "," + b` -> ["a", "\",\"", "b"]: split at `+` outside brackets, strings and chars."""
    parts, depth, start = [], 0, 0
    for i, c in _code_chars(expr):
        depth += (c in "([{") - (c in ")]}")
        if c == "+" and depth == 0 and expr[i + 1:i + 2] not in ("+", "=") and expr[i - 1:i] != "+":
            parts.append(expr[start:i].strip())
            start = i + 1
    return parts + [expr[start:].strip()]


def _closing(text: str, open_at: int, pair: str = "()") -> int:
    """The index of the `)` matching the `(` at open_at (or another pair; strings and chars skipped)."""
    depth = 0
    for i, c in _code_chars(text, open_at):
        depth += (c == pair[0]) - (c == pair[1])
        if c == pair[1] and depth == 0:
            return i
    return -1


def while_loops(text: str) -> str:
    """`for (T x : arr) {` over an array vs `int i = 0; while (i < arr.length) { T x = arr[i]; i++; ...`
    (the step right after the element is read: the rest of the body never reads i)."""
    return _for_each_loops(text, lambda ind, t, x, arr, i: f"{ind}int {i} = 0;\n{ind}while ({i} < {arr}.length) "
                                                          f"{{ {t} {x} = {arr}[{i}]; {i}++;", "At")


def iterator_loops(text: str) -> str:
    """`for (T v : values) {` over a reduce() Iterable vs `Iterator<T> it = values.iterator();
    while (it.hasNext()) { T v = it.next(); ...` (what the enhanced for means: JLS 14.14.2)."""
    iterables = set(re.findall(r"\bIterable<[\w.<>, ]+>\s+(\w+)", text))

    def loop(m: re.Match) -> str:
        indent, t, v, xs = m.group(1), m.group(2), m.group(3), m.group(4)
        if xs not in iterables:
            return m.group(0)
        return (f"{indent}java.util.Iterator<{t}> {v}Iterator = {xs}.iterator();\n"
                f"{indent}while ({v}Iterator.hasNext()) {{ {t} {v} = {v}Iterator.next();")
    return re.sub(r"(?m)^(\s*)for \((?:final )?([\w.<>]+) (\w+) : (\w+)\) \{", loop, text)


def string_builder(text: str) -> str:
    """A written Text made from `a + "," + b` vs a StringBuilder appended piece by piece first.
    The pieces are appended one by one only where the first `+` is already a String concatenation
    (a string literal among the first two operands): `1 + 2 + ","` is "3,", not "12,"."""
    lines = text.split("\n")
    out, k = [], 0
    for i, line in enumerate(lines):
        m = re.match(r"^(\s*)(\w+)\.(write|collect)\(new Text\(", line)
        prev = next((x.strip() for x in reversed(out) if x.strip()), "")
        if m is None or not line.rstrip().endswith(");") or not prev.endswith((";", "{", "}")):
            out.append(line)
            continue
        open_at = m.end() - 1
        close = _closing(line, open_at)
        inner = line[open_at + 1:close] if close > 0 else ""
        pieces = _top_level_pluses(inner)
        if len(pieces) < 2:
            out.append(line)
            continue
        if not any(p.startswith('"') for p in pieces[:2]):
            pieces = [inner]
        k += 1
        sb, indent = f"built{k}", m.group(1)
        out.append(f"{indent}StringBuilder {sb} = new StringBuilder();")
        out.append(f"{indent}{sb}" + "".join(f".append({p})" for p in pieces) + ";")
        out.append(line[:open_at + 1] + f"{sb}.toString()" + line[close:])
    return "\n".join(out)


def _enum_binary_names(tree) -> dict[str, str]:
    """Simple name -> binary name (pkg.Outer$Inner) of every enum declared in a file: Hadoop names
    an enum counter's group by the enum class's getName()."""
    pkg = tree.package.name + "." if tree.package else ""
    out: dict[str, str] = {}

    def visit(decl, prefix: str) -> None:
        name = prefix + decl.name
        if isinstance(decl, T.EnumDeclaration):
            out[decl.name] = name
        for member in decl.body.declarations if isinstance(decl, T.EnumDeclaration) and decl.body else decl.body or []:
            if isinstance(member, (T.ClassDeclaration, T.EnumDeclaration, T.InterfaceDeclaration)):
                visit(member, name + "$")
    for t in tree.types:
        visit(t, pkg)
    return out


def string_counters(text: str) -> str:
    """A counter named by an enum constant vs by its group and name as Strings (Hadoop uses the
    enum class's binary name as the group and the constant's name as the counter's)."""
    tree = _parse(text)
    enums = _enum_binary_names(tree) if tree is not None else {}
    if not enums:
        return text

    def swap(m: re.Match) -> str:
        enum, const = m.group(2), m.group(3)
        return f'{m.group(1)}("{enums[enum]}", "{const}"' if enum in enums else m.group(0)
    return re.sub(r"\b(getCounter|incrCounter)\((\w+)\.(\w+)(?=[,)])", swap, text)


@_on_tree
def tool_drivers(tree, lines: list[str]) -> None:
    """A driver's work in `main` vs in `run` of a Tool started by ToolRunner (main's Configuration
    comes from getConf(); `System.exit(code)` in the body is `return code`)."""
    for cls in tree.types:
        mains = [m for m in getattr(cls, "methods", []) if m.name == "main" and "static" in m.modifiers]
        if not (isinstance(cls, T.ClassDeclaration) and len(mains) == 1 and cls.extends is None
                and not cls.implements and not cls.constructors and "public" in cls.modifiers
                and not any(m.name == "run" for m in cls.methods)):
            continue
        start = mains[0].position.line  # 1-based line of `public static void main(...)`
        end = _method_end(lines, start)  # 1-based line of its closing brace
        head, body = lines[start - 1], lines[start:end - 1]
        if "{" not in head or not body or any("return" in b for b in body):
            continue
        body = [re.sub(r"\bnew Configuration\(\)", "getConf()", b) for b in body]
        body = [re.sub(r"\bSystem\.exit\((.*)\);", r"return \1;", b) for b in body]
        indent = re.match(r"\s*", head).group(0)
        if not body[-1].strip().startswith("return"):
            body.append(f"{indent}    return 0;")
        lines[start - 1:end] = [
            re.sub(r"\)\s*(throws [\w., ]+)?\s*\{", ") throws Exception {", head, count=1),
            f"{indent}    System.exit(org.apache.hadoop.util.ToolRunner.run(new org.apache.hadoop.conf.Configuration(), "
            f"new {cls.name}(), args));",
            f"{indent}}}",
            "",
            f"{indent}@Override",
            f"{indent}public int run(String[] args) throws Exception {{",
            *body,
            f"{indent}}}",
        ]
        i = _body_line(lines, cls)
        lines[i] = re.sub(r"\bclass " + cls.name + r"\b", f"class {cls.name} extends org.apache.hadoop.conf.Configured "
                          "implements org.apache.hadoop.util.Tool", lines[i], count=1)
        return


@_on_tree
def key_text_local(tree, lines: list[str]) -> None:
    """A reducer writing its Text key as it came vs its text read into a local first thing in reduce()
    and written as `new Text(local)`."""
    for _, m in _map_methods(tree):
        if m.name != "reduce" or getattr(m.parameters[0].type, "name", "") != "Text" or not m.body:
            continue
        key, start, end = m.parameters[0].name, m.position.line, _method_end(lines, m.position.line)
        wrote = False
        for i in range(start, end):
            lines[i], n = re.subn(r"\b(write|collect)\(" + key + r",", r"\1(new Text(keyText),", lines[i])
            wrote = wrote or n > 0
        if wrote:
            first = m.body[0].position.line - 1
            indent = re.match(r"\s*", lines[first])[0]
            lines[first] = f"{indent}String keyText = {key}.toString();\n" + lines[first]


def for_has_next(text: str) -> str:
    """`while (it.hasNext()) {` vs `for (; it.hasNext(); ) {` over an iterator (the values, or a local)."""
    return re.sub(r"\bwhile \((\w+)\.hasNext\(\)\) \{", r"for (; \1.hasNext(); ) {", text)


@_on_tree
def unused_side_outputs(tree, lines: list[str]) -> None:
    """A reducer as written vs the same with a MultipleOutputs made in setup() and closed in
    cleanup() that it never writes to (what is left when side outputs are commented out)."""
    mos = "org.apache.hadoop.mapreduce.lib.output.MultipleOutputs"
    edits = []
    for _, cls in tree.filter(T.ClassDeclaration):
        ext = cls.extends
        if ext is None or ext.name != "Reducer" or any(m.name in ("setup", "cleanup") for m in cls.methods) \
                or not any(m.name == "reduce" for m in cls.methods):
            continue
        edits.append(_body_line(lines, cls))
    for i in sorted(edits, reverse=True):
        indent = re.match(r"\s*", lines[i + 1])[0] or "    "
        lines[i + 1:i + 1] = [
            f"{indent}private {mos} sideFiles;",
            f"{indent}@Override",
            f"{indent}protected void setup(Context context) {{ sideFiles = new {mos}(context); }}",
            f"{indent}@Override",
            f"{indent}protected void cleanup(Context context) throws java.io.IOException, InterruptedException {{",
            f"{indent}    sideFiles.close();",
            f"{indent}    super.cleanup(context);",
            f"{indent}}}"]


@_on_tree
def same_branches(tree, lines: list[str]) -> None:
    """A reducer's loop over values as written vs the same loop in both branches of an if on the key
    (`if (key.toString().isEmpty()) { loop } else { loop }`)."""
    found = []
    for _, m in _map_methods(tree):
        loops = [s for s in m.body or [] if isinstance(s, (T.ForStatement, T.WhileStatement)) and s.position]
        if m.name == "reduce" and len(loops) == 1:
            found.append((loops[0].position.line - 1, m.parameters[0].name))
    for start, key in sorted(found, reverse=True):  # from the end: earlier lines keep their numbers
        if not lines[start].rstrip().endswith("{"):
            continue  # a loop without braces
        stop = _method_end(lines, start + 1) - 1  # the line closing the loop's braces
        loop = lines[start:stop + 1]
        indent = re.match(r"\s*", loop[0])[0]
        lines[start:stop + 1] = [f"{indent}if ({key}.toString().isEmpty()) {{", *loop, f"{indent}}} else {{", *loop,
                                 f"{indent}}}"]


@_on_tree
def key_guard(tree, lines: list[str]) -> None:
    """A reducer as written vs the same starting with `if (key == null) { return; }` (Hadoop never
    hands reduce() a null key), in reducers of classes without setup()/cleanup()."""
    found = []
    for c, m in _map_methods(tree):
        if m.name == "reduce" and m.body and m.body[0].position and \
                not any(x.name in ("setup", "cleanup", "configure", "close") for x in c.methods):
            found.append((m.body[0].position.line - 1, m.parameters[0].name))
    for at, key in sorted(found, reverse=True):
        indent = re.match(r"\s*", lines[at])[0]
        lines[at:at] = [f"{indent}if ({key} == null) {{", f"{indent}    return;", f"{indent}}}"]


@_on_tree
def values_helper(tree, lines: list[str]) -> None:
    """A reducer's `T x = <literal>; for (V v : values) { <updates of x> }` vs `T x = fold(values);`
    with the same lines in a private method `T fold(Iterable<V> values) { ...; return x; }`."""
    edits = []
    for c, m in _map_methods(tree):
        if m.name != "reduce" or not isinstance(m.parameters[1].type, T.ReferenceType) \
                or m.parameters[1].type.name != "Iterable":
            continue
        values, body = m.parameters[1].name, m.body
        for decl, loop in zip(body, body[1:]):
            if not (isinstance(decl, T.LocalVariableDeclaration) and len(decl.declarators) == 1
                    and isinstance(decl.declarators[0].initializer, T.Literal) and isinstance(loop, T.ForStatement)
                    and isinstance(loop.control, T.EnhancedForControl) and getattr(loop.control.iterable, "member", "")
                    == values and decl.position and loop.position):
                continue
            x = decl.declarators[0].name
            assigned = {getattr(getattr(n, "expressionl", n), "member", None) for _, n in loop.body
                        if isinstance(n, T.Assignment) or set(getattr(n, "postfix_operators", None) or []) & {"++"}}
            calls = {n.member for _, n in loop.body if isinstance(n, T.MethodInvocation)}
            if assigned - {None} == {x} and not calls & {"write", "collect"} and \
                    not any(isinstance(n, (T.ReturnStatement, T.BreakStatement)) for _, n in loop.body):
                start, stop = decl.position.line - 1, _method_end(lines, loop.position.line) - 1
                edits.append((_body_line(lines, c), start, stop, x, values, decl.type.name,
                              loop.control.var.type.name))
            break
    for cls_line, start, stop, x, values, t, v in sorted(edits, key=lambda e: -e[1]):
        indent = re.match(r"\s*", lines[start])[0]
        moved = [ln[len(indent):] if ln.startswith(indent) else ln.lstrip() for ln in lines[start:stop + 1]]
        lines[start:stop + 1] = [f"{indent}{t} {x} = fold{x[0].upper()}{x[1:]}({values});"]
        inner = re.match(r"\s*", lines[cls_line + 1])[0] or "    "
        lines[cls_line + 1:cls_line + 1] = [f"{inner}private {t} fold{x[0].upper()}{x[1:]}(Iterable<{v}> {values}) {{",
                                             *(f"{inner}    {ln}" for ln in moved), f"{inner}    return {x};",
                                             f"{inner}}}"]


def first_flag(text: str) -> str:
    """`int max = Integer.MIN_VALUE; ... if (v > max) { max = v; }` vs `int max = 0; boolean first =
    true; ... if (first || v > max) { max = v; first = false; }`."""
    return re.sub(r"(?ms)^([ \t]*)int (\w+) = Integer\.MIN_VALUE;(.*?)if \((\w+) > \2\) \{(\s*)\2 = \4;",
                  lambda m: f"{m[1]}int {m[2]} = 0;\n{m[1]}boolean first = true;{m[3]}if (first || {m[4]} > {m[2]}) "
                            f"{{{m[5]}{m[2]} = {m[4]};{m[5]}first = false;", text)


def map_updates(text: str) -> str:
    """`m.merge(k, v, Integer::sum)` and a flush by entries vs `if (m.containsKey(k)) m.put(k, m.get(k) + v);
    else m.put(k, v);` and a flush by keys (`for (String k : m.keySet()) ... m.get(k)`)."""
    text = re.sub(r"(\w+)\.merge\(([\w\[\]]+), (\w+), Integer::sum\);",
                  lambda m: f"if ({m[1]}.containsKey({m[2]})) {{ {m[1]}.put({m[2]}, {m[1]}.get({m[2]}) + {m[3]}); }} "
                            f"else {{ {m[1]}.put({m[2]}, {m[3]}); }}", text)
    for loop in reversed(list(re.finditer(r"for \(Map\.Entry<(\w+), \w+> (\w+) : (\w+)\.entrySet\(\)\) \{", text))):
        t, e, m = loop.groups()
        end = _closing(text, loop.end() - 1, "{}")  # only the loop's own body names its entry
        body = text[loop.end():end].replace(f"{e}.getKey()", f"{e}Key").replace(f"{e}.getValue()", f"{m}.get({e}Key)")
        text = text[:loop.start()] + f"for ({t} {e}Key : {m}.keySet()) {{" + body + text[end:]
    return text


def values_list(text: str) -> str:
    """`long n = 0; for (LongWritable v : values) { n++; }` vs the values gathered in a List, sorted,
    and counted: `List<Long> nAll = ...; nAll.add(v.get()); Collections.sort(nAll); long n = nAll.size();`."""
    box = {"IntWritable": "Integer", "LongWritable": "Long"}

    def gather(m: re.Match) -> str:
        ind, t, n, loop_ind, w, v, values, body_ind = m[1], m[2], m[3], m[4], m[5], m[6], m[7], m[8]
        return (f"{ind}List<{box[w]}> {n}All = new ArrayList<>();\n{loop_ind}for ({w} {v} : {values}) {{\n"
                f"{body_ind}{n}All.add({v}.get());\n{loop_ind}}}\n{ind}Collections.sort({n}All);\n"
                f"{ind}{t} {n} = {n}All.size();")

    new = re.sub(r"(?m)^([ \t]*)(int|long) (\w+) = 0;\n([ \t]*)for \((IntWritable|LongWritable) (\w+) : (\w+)\) \{\n"
                 r"([ \t]*)\3\+\+;\n[ \t]*\}", gather, text)
    if new != text:
        new = re.sub(r"(?m)^import ", "import java.util.ArrayList;\nimport java.util.Collections;\n"
                                      "import java.util.List;\nimport ", new, count=1)
    return new


def compare_when_equal(text: str) -> str:
    """`if (c != 0) { return c; } return next;` vs `if (c == 0) { c = next; } return c;` in a comparison."""
    return re.sub(r"if \((\w+) != 0\) \{\s*return \1;\s*\}(\s*)return ([^;]+);",
                  lambda m: f"if ({m[1]} == 0) {{{m[2]}    {m[1]} = {m[3]};{m[2]}}}{m[2]}return {m[1]};", text)


def compare_relations(text: str) -> str:
    """`return Integer.compare(a, b);` vs `if (a < b) { return -1; } return (a == b ? 0 : 1);` (int and long
    fields only, where `==` compares numbers)."""
    arg = r"[\w.]+(?:\(\))?"
    return re.sub(rf"return (?:Integer|Long)\.compare\(({arg}), ({arg})\);",
                  lambda m: f"if ({m[1]} < {m[2]}) {{ return -1; }} return ({m[1]} == {m[2]} ? 0 : 1);", text)


def own_combiner(text: str) -> str:
    """No combiner vs the reducer as its own combiner, where the reducer sums what it receives
    (`n += v.get()`, one write, no test) and writes the types it reads: a sum of partial sums."""
    if "setCombinerClass" in text:
        return text
    m = re.search(r"(?m)^([ \t]*)(\w+)\.setReducerClass\((\w+)\.class\);", text)
    c = m and re.search(rf"class {m[3]} extends Reducer<(\w+), (\w+), (\w+), (\w+)>", text)
    if not c or (c[1], c[2]) != (c[3], c[4]):
        return text
    body = text[c.end():text.find("\n    }\n", c.end())]
    if not re.search(r"\w+ \+= \w+(\.next\(\))?\.get\(\);", body) or body.count("write(") != 1 or "if (" in body:
        return text
    return text[:m.end()] + f"\n{m[1]}{m[2]}.setCombinerClass({m[3]}.class);" + text[m.end():]


def setup_setting(text: str) -> str:
    """A reducer's constant N (`static final int TOP = 4;` read as `size() > TOP`) vs the same N set by
    the driver in the job's Configuration and read in the reducer's setup()."""
    const = re.search(r"static final int (\w+) = (\d+);", text)
    use = const and re.search(rf"\.size\(\) > {const[1]}\)", text)
    job = re.search(r"(?m)^([ \t]*)Job (\w+) = Job\.getInstance\([^;]*\);\n", text)
    if not use or not job:
        return text
    reducers = list(re.finditer(r"(?m)^([ \t]*)public static class \w+ extends Reducer<[^{]*\{\n", text[:use.start()]))
    if not reducers or "setup(" in text[reducers[-1].end():]:
        return text
    head, ind, field = reducers[-1], reducers[-1][1] + "    ", f"{const[1].lower()}Setting"
    added = (f"{ind}private int {field};\n\n{ind}@Override\n{ind}protected void setup(Context context) {{\n"
             f"{ind}    {field} = Integer.parseInt(context.getConfiguration().get(\"variant.top\"));\n{ind}}}\n\n")
    setting = f'{job[1]}{job[2]}.getConfiguration().set("variant.top", "{const[2]}");\n'
    return (text[:head.end()] + added + text[head.end():use.start()] + f".size() > {field})"
            + text[use.end():job.end()] + setting + text[job.end():])


def argument_loop(text: str) -> str:
    """A driver reading `args[0]` as its input and `args[1]` as its output vs one adding every argument
    but the last as an input in a loop and taking the last as the output (Hadoop's WordCount example):
    the same job for the two arguments the samples pass."""
    add = re.search(r"(?m)^([ \t]*)FileInputFormat\.addInputPath\((\w+), new Path\((\w+)\[0\]\)\);$", text)
    if add is None:
        return text
    indent, job, args = add.groups()
    out = f"FileOutputFormat.setOutputPath({job}, new Path({args}[1]));"
    if text.count(out) != 1 or re.search(rf"\b{args}\[(?![01]\])", text) or text.count(f"{args}[0]") != 1 \
            or text.count(f"{args}[1]") != 1:
        return text
    loop = (f"{indent}for (int i = 0; i < {args}.length - 1; i++) {{\n"
            f"{indent}    FileInputFormat.addInputPath({job}, new Path({args}[i]));\n{indent}}}")
    text = text[:add.start()] + loop + text[add.end():]
    return text.replace(out, f"FileOutputFormat.setOutputPath({job}, new Path({args}[{args}.length - 1]));")


@_on_tree
def run_marker(tree, lines: list[str]) -> None:
    """A control break tested as `v.getF() != m` with `m = v.getF();` first in its block vs tested as
    `m != key.getF()` with `m = key.getF();` after the resets. Hadoop moves the key with the values
    (ReduceContext deserializes each value's key before handing the value over), and the samples'
    mappers write the same F into key and value, so both read the same number."""
    for _, m in _map_methods(tree):
        if m.name != "reduce":
            continue
        key = m.parameters[0].name
        for _, loop in m.filter(T.ForStatement):
            if not isinstance(loop.control, T.EnhancedForControl) or not isinstance(loop.body, T.BlockStatement):
                continue
            var = loop.control.var.declarators[0].name
            brk = loop.body.statements[0] if loop.body.statements else None
            cond = getattr(brk, "condition", None)
            if not (isinstance(cond, T.BinaryOperation) and cond.operator == "!="
                    and isinstance(cond.operandl, T.MethodInvocation) and cond.operandl.qualifier == var
                    and isinstance(cond.operandr, T.MemberReference)):
                continue
            getter, marker = cond.operandl.member, cond.operandr.member
            block = brk.then_statement.statements
            sets = [x for x in block if isinstance(x, T.StatementExpression) and isinstance(x.expression, T.Assignment)]
            mark = next((x for x in sets if getattr(x.expression.expressionl, "member", None) == marker), None)
            if mark is None or mark is sets[-1]:
                continue
            at, last = mark.position.line - 1, sets[-1].position.line - 1
            test = brk.position.line - 1
            lines[test] = lines[test].replace(f"{var}.{getter}() != {marker}", f"{marker} != {key}.{getter}()", 1)
            moved = lines[at].replace(f"{var}.{getter}()", f"{key}.{getter}()")
            lines[at:last + 1] = lines[at + 1:last + 1] + [moved]


def record_methods(text: str) -> str:
    """Two long sums folded into locals and written as `new Tally(a, b)` vs a Tally made empty, added
    to by a method of its own (`t.add(v)`) and written as it is; the value class gains the `add`
    method (a Writable of two long fields, each with a getter, and a constructor taking both)."""
    cls = re.search(r"public class (\w+) implements Writable \{\n\s*private long (\w+);\n\s*private long (\w+);\n", text)
    if cls and f"public {cls[1]}(long {cls[2]}, long {cls[3]})" in text and "void add(" not in text:
        end = text.rindex("}")
        return (text[:end] + f"\n    public void add({cls[1]} other) {{\n        {cls[2]} += other.{cls[2]};\n"
                f"        {cls[3]} += other.{cls[3]};\n    }}\n" + text[end:])
    fold = re.compile(r"(?m)^([ \t]*)long (\w+) = 0;\n\1long (\w+) = 0;\n\1for \((\w+) (\w+) : (\w+)\) \{\n"
                      r"\s*\2 \+= \5\.get\w+\(\);\n\s*\3 \+= \5\.get\w+\(\);\n\1\}\n")

    def folded(m: re.Match) -> str:
        ind, a, b, t, v, vs = m.groups()
        return f"{ind}{t} sum = new {t}();\n{ind}for ({t} {v} : {vs}) {{\n{ind}    sum.add({v});\n{ind}}}\n"

    out, pos = [], 0
    for m in fold.finditer(text):
        getters = re.findall(rf"{m[5]}\.(get\w+)\(\)", m[0])
        rest_end = text.find("\n    }\n", m.end())
        rest = text[m.end():rest_end]
        rest = re.sub(rf"new {m[4]}\({m[2]}, {m[3]}\)", "sum", rest)
        rest = re.sub(rf"\b{m[2]}\b", f"sum.{getters[0]}()", rest)
        rest = re.sub(rf"\b{m[3]}\b", f"sum.{getters[1]}()", rest)
        out += [text[pos:m.start()], folded(m), rest]
        pos = rest_end
    return "".join(out) + text[pos:]


def presence_test(text: str) -> str:
    """`m.putIfAbsent(k, new R());` vs `if (!m.containsKey(k)) { m.put(k, new R()); }` (java.util.Map:
    both put a new R only where k has no entry)."""
    return re.sub(r"(?m)^([ \t]*)(\w+)\.putIfAbsent\((\w+), (new \w+\(\))\);",
                  lambda m: f"{m[1]}if (!{m[2]}.containsKey({m[3]})) {{\n{m[1]}    {m[2]}.put({m[3]}, {m[4]});\n{m[1]}}}",
                  text)


def tree_map_trim(text: str) -> str:
    """A TreeMap trimmed with `m.remove(m.firstKey())` vs `m.pollFirstEntry()` (and lastKey / pollLastEntry):
    both remove the entry with the smallest (largest) key (java.util.TreeMap)."""
    return re.sub(r"(\w+)\.remove\(\1\.(first|last)Key\(\)\);",
                  lambda m: f"{m[1]}.poll{m[2].capitalize()}Entry();", text)


_BOOK = """
    static class {rec} {{
        final {k} name;
        int seen;

        {rec}({k} name) {{
            this.name = name;
        }}
    }}

    static class {rec}Book {{
        private final Map<{k}, {rec}> byName = new HashMap<>();

        void add({k} name, int n) {{
            {rec} r = byName.get(name);
            if (r == null) {{
                r = new {rec}(name);
                byName.put(name, r);
            }}
            r.seen += n;
        }}

        Collection<{rec}> records() {{
            return byName.values();
        }}
    }}
"""


def counter_book(text: str) -> str:
    """A count per key in a `Map<String, Integer>` field (`m.merge(k, v, Integer::sum)`, flushed by its
    entries) vs the same counts kept through helper classes: a book of records made with their key,
    whose count add() steps, flushed over the records."""
    field = re.search(r"(?m)^([ \t]*)private final Map<String, Integer> (\w+) = new HashMap<>\(\);\n", text)
    if not field:
        return text
    m = field[2]
    rec = m[0].upper() + m[1:] + "Record"
    text = re.sub(rf"\b{m}\.merge\(([^,]+), ([^,]+), Integer::sum\);", lambda x: f"{m}.add({x[1]}, {x[2]});", text)
    loop = re.search(rf"for \(Map\.Entry<String, Integer> (\w+) : {m}\.entrySet\(\)\) \{{", text)
    if not loop or ".merge(" in text:
        return text
    e = loop[1]
    end = _closing(text, loop.end() - 1, "{}")
    body = text[loop.end():end].replace(f"{e}.getKey()", f"{e}.name").replace(f"{e}.getValue()", f"{e}.seen")
    text = text[:loop.start()] + f"for ({rec} {e} : {m}.records()) {{" + body + text[end:]
    text = text.replace(field[0], f"{field[1]}private final {rec}Book {m} = new {rec}Book();\n")
    cls = re.search(r"(?m)^public class \w+ \{\n", text)
    text = text[:cls.end()] + _BOOK.format(rec=rec, k="String") + text[cls.end():]
    return re.sub(r"(?m)^import java\.util\.HashMap;", "import java.util.Collection;\nimport java.util.HashMap;", text,
                  count=1)


AXES = (
    Axis("catch-logs", "empty catch vs logging then skipping", catch_logs),
    Axis("field-scratch", "array local vs scratch field", field_scratch),
    Axis("setup-fields", "field made at declaration vs in setup()", setup_fields),
    Axis("counting-loops", "for-each over an array vs a counting loop", counting_loops),
    Axis("locale-case", "toLowerCase() vs toLowerCase(Locale.ROOT)", locale_case),
    Axis("literal-receiver", "x.equals(\"lit\") vs \"lit\".equals(x)", literal_receiver),
    Axis("objects-equals", "a.equals(b) vs Objects.equals(a, b)", objects_equals),
    Axis("boxed-parse", "Integer.parseInt vs Integer.valueOf", boxed_parse),
    Axis("boxed-zero", "a local started at 0 vs at new Integer(0) (and Long, Double)", boxed_zero),
    Axis("this-fields", "field vs this.field", this_fields),
    Axis("increments", "n++ vs n += 1", increments),
    Axis("final-locals", "plain locals vs final locals", final_locals),
    Axis("var-locals", "String locals vs var", var_locals),
    Axis("new-per-write", "reused Text vs new Text per write", new_per_write),
    Axis("string-builder", "a + b written vs a StringBuilder appended first", string_builder),
    Axis("while-loops", "for-each over an array vs a while loop stepping an index", while_loops),
    Axis("string-counters", "enum counters vs counters named by group and name Strings", string_counters),
    Axis("tool-drivers", "work in main vs in a Tool's run() started by ToolRunner", tool_drivers),
    Axis("iterator-loops", "for-each over the values vs a hasNext()/next() loop", iterator_loops),
    Axis("key-text-local", "the Text key written as it came vs its text read into a local first",
         key_text_local),
    Axis("for-has-next", "while (it.hasNext()) vs for (; it.hasNext(); )", for_has_next),
    Axis("unused-side-outputs", "a reducer vs the same with a MultipleOutputs made and closed, never written",
         unused_side_outputs),
    Axis("same-branches", "a reducer's loop vs the same loop in both branches of an if on the key", same_branches),
    Axis("compare-when-equal", "return the first difference vs assign the next comparison when equal",
         compare_when_equal),
    Axis("compare-relations", "Integer.compare(a, b) vs a < b / a == b tests returning -1, 0, 1", compare_relations),
    Axis("own-combiner", "no combiner vs a summing reducer set as its own combiner", own_combiner),
    Axis("key-guard", "a reducer vs the same returning first when its key is null", key_guard),
    Axis("first-flag", "a max started at Integer.MIN_VALUE vs one started by a first-value flag", first_flag),
    Axis("map-updates", "Map.merge and a flush by entries vs containsKey/get/put and a flush by keys", map_updates),
    Axis("values-list", "a count of the values vs the size of a sorted List of them", values_list),
    Axis("values-helper", "a fold over the values in reduce() vs the same loop in a helper handed the values",
         values_helper),
    Axis("setup-setting", "a reducer's constant N vs N set by the driver and read in setup()", setup_setting),
    Axis("record-methods", "sums in locals written as a new Writable vs a Writable added to by its own method",
         record_methods),
    Axis("presence-test", "putIfAbsent(k, new R()) vs a containsKey test then put", presence_test),
    Axis("tree-map-trim", "remove(firstKey()) vs pollFirstEntry() on a TreeMap", tree_map_trim),
    Axis("argument-loop", "input args[0] and output args[1] vs a loop over every argument but the last, then the "
         "last", argument_loop),
    Axis("run-marker", "a control break testing the value's field, marker set first vs the key's field, set last",
         run_marker),
    Axis("counter-book", "a Map counted with merge vs the counts kept through a helper book of records",
         counter_book),
)


def write_variant(src: Path, dst: Path, axis: Axis) -> list[str]:
    """Copy the tree `src` to `dst` with `axis` applied to every .java file; the files it changed."""
    if dst.exists():
        shutil.rmtree(dst)
    shutil.copytree(src, dst)
    changed = []
    for p in sorted(dst.rglob("*.java")):
        text = p.read_text(encoding="utf-8")
        new = axis.rewrite(text)
        if new != text:
            p.write_text(new, encoding="utf-8")
            changed.append(str(p.relative_to(dst)))
    return changed
