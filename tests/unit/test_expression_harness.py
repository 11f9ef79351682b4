"""Differential harness: every supported Java expression form, evaluated by the real JVM (a class
generated here, compiled with javac) and by the Spark code mrlift generates for it, on the same rows.

Source of truth: the JVM on PATH (OpenJDK 17) and the Java SE API documentation it implements.
The Spark side is the real pipeline: the form is parsed by javalang, lifted by migrate.lift.exprs,
spelled by migrate.gen.pyspark, and run on local Spark. Forms are lifted as if inside
`try { ... } catch (Exception e) { skip }`, so a Java exception must come out as NULL (the record
would be dropped); a Spark error instead counts as a mismatch, except for ArithmeticException,
which mrlift leaves failing the job (a loud difference, never a silent one).
"""
from __future__ import annotations

import os
import shutil
import subprocess

import javalang
import pytest

from migrate.gen.helpers import helper_source
from migrate.gen.pyspark import ExprWriter
from migrate.lift.exprs import Scope, Unsupported, lift, to_string
from migrate.plan import Col
from migrate.verify.classpath import find_classpath
from tests.unit.expression_forms import FORMS, ROWS

pytestmark = pytest.mark.skipif(shutil.which("javac") is None, reason="needs a JDK on PATH")

VARS = [("s", "String"), ("t", "String"), ("a", "int"), ("b", "int"), ("l", "long"), ("m", "long"),
        ("x", "double"), ("y", "double")]
SPARK = {"String": "string", "int": "int", "long": "bigint", "double": "double"}
KNOWN_GAPS = {  # ../shared/SEMANTICS.md section 14: no faithful native translation exists
    ("equals_ignore_case", 7),  # "İstanbul,Ünye" vs "istanbul": Java maps case per UTF-16 char
}
FAILS_LOUDLY = {  # rows where the script must fail (a Spark error) instead of giving another value
    # "😀abc,def": Java cuts the emoji's surrogate pair and keeps a lone surrogate, which a Spark
    # string cannot hold (MALFORMED_CHARACTER_CODING)
    ("substring_from1", 8), ("substring_1_3", 8), ("char_at_0", 8),
    ("char_is_digit", 8), ("char_is_letter", 8), ("char_is_whitespace", 8), ("char_is_upper", 8),
    ("char_minus_char", 8), ("char_plus_int", 8), ("char_lt_char", 8), ("char_ge_int", 8), ("char_cast_int", 8),
    ("char_arith_text", 8),
    # compareToIgnoreCase folds non-ASCII chars one by one (Character.toUpperCase, then toLowerCase),
    # which java_compare_to_ignore_case does not reproduce
    ("compare_to_ignore_case", 6), ("compare_to_ignore_case", 7), ("compare_to_ignore_case", 8),
}


def _java_source() -> str:
    params = ", ".join(f"{t} {n}" for n, t in VARS)
    methods = "\n".join(f"    static Object f{i}({params}) {{ return {expr}; }}" for i, (_, expr) in enumerate(FORMS))
    calls = "\n".join(f"            case {i}: return f{i}({', '.join(n for n, _ in VARS)});" for i in range(len(FORMS)))
    return f"""
import java.nio.charset.StandardCharsets;
import java.nio.file.*;
import java.util.*;

public class ExprHarness {{
{methods}

    static Object call(int i, {params}) {{
        switch (i) {{
{calls}
            default: throw new IllegalStateException();
        }}
    }}

    static String show(Object o) {{
        if (o instanceof String[]) {{
            String[] arr = (String[]) o;
            return String.join("|", arr) + "#" + arr.length;
        }}
        return String.valueOf(o);
    }}

    static String unhex(String h) {{
        byte[] b = new byte[h.length() / 2];
        for (int i = 0; i < b.length; i++) b[i] = (byte) Integer.parseInt(h.substring(2 * i, 2 * i + 2), 16);
        return new String(b, StandardCharsets.UTF_8);
    }}

    static String hex(String s) {{
        StringBuilder sb = new StringBuilder();
        for (byte x : s.getBytes(StandardCharsets.UTF_8)) sb.append(String.format("%02X", x));
        return sb.toString();
    }}

    public static void main(String[] args) throws Exception {{
        List<String> lines = Files.readAllLines(Paths.get(args[0]));
        for (int r = 0; r < lines.size(); r++) {{
            String[] f = lines.get(r).split("\\t", -1);
            String s = unhex(f[0]), t = unhex(f[1]);
            int a = Integer.parseInt(f[2]), b = Integer.parseInt(f[3]);
            long l = Long.parseLong(f[4]), m = Long.parseLong(f[5]);
            double x = Double.longBitsToDouble(Long.parseLong(f[6])), y = Double.longBitsToDouble(Long.parseLong(f[7]));
            for (int i = 0; i < {len(FORMS)}; i++) {{
                String out;
                try {{ out = "=" + show(call(i, s, t, a, b, l, m, x, y)); }}
                catch (RuntimeException e) {{ out = "!" + e.getClass().getSimpleName(); }}
                System.out.println(i + "\\t" + r + "\\t" + hex(out));
            }}
        }}
    }}
}}
"""


@pytest.fixture(scope="module")
def jvm_results(tmp_path_factory):
    import struct

    d = tmp_path_factory.mktemp("harness")
    (d / "ExprHarness.java").write_text(_java_source(), encoding="utf-8")
    hadoop = str(find_classpath())  # for org.apache.hadoop.util.StringUtils
    subprocess.run(["javac", "-encoding", "UTF-8", "-cp", hadoop, "-d", str(d), str(d / "ExprHarness.java")], check=True)

    def bits(v: float) -> str:
        return str(struct.unpack(">q", struct.pack(">d", v))[0])

    rows = "\n".join("\t".join([r["s"].encode().hex(), r["t"].encode().hex(), str(r["a"]), str(r["b"]), str(r["l"]),
                                str(r["m"]), bits(r["x"]), bits(r["y"])]) for r in ROWS)
    (d / "rows.tsv").write_text(rows + "\n", encoding="ascii")
    out = subprocess.run(["java", "-Duser.language=en", "-Duser.country=US", "-Duser.timezone=UTC", "-cp", f"{d}{os.pathsep}{hadoop}",
                          "ExprHarness", str(d / "rows.tsv")], check=True, capture_output=True, text=True).stdout
    res = {}
    for line in out.splitlines():
        i, r, h = line.split("\t")
        res[(int(i), int(r))] = bytes.fromhex(h).decode("utf-8")
    return res


def _lift_form(expr: str):
    tree = javalang.parse.parse(f"class H {{ Object f() {{ return {expr}; }} }}")
    node = tree.types[0].body[0].body[0].expression
    env = {n: Col(t, n) for n, t in VARS}
    return lift(node, Scope(env, caught=frozenset({"Exception"})))


@pytest.fixture(scope="module")
def frame(spark):
    schema = ", ".join(f"{n} {SPARK[t]}" for n, t in VARS)
    return spark.createDataFrame([tuple(r[n] for n, _ in VARS) + (i,) for i, r in enumerate(ROWS)],
                                 schema + ", row int")


def _shown(e, writer: ExprWriter) -> str:
    """Spark code that renders the value as the Java harness prints it."""
    if e.jtype == "String[]":
        code = writer(e)
        return f'F.concat(F.array_join({code}, "|"), F.lit("#"), F.size({code}).cast("string"))'
    return writer(to_string(e))


def test_the_harness_is_big_enough():
    assert len(FORMS) >= 80 and len(ROWS) >= 5


@pytest.mark.parametrize("index", range(len(FORMS)), ids=[f[0] for f in FORMS])
def test_form_matches_the_jvm(index, jvm_results, frame, spark):
    from pyspark.sql import Column, DataFrame, Window
    from pyspark.sql import functions as F

    name, expr = FORMS[index]
    try:
        e = _lift_form(expr)
    except Unsupported as u:
        pytest.fail(f"{name}: `{expr}` is not lifted: {u.reason}")
    writer = ExprWriter()
    code = _shown(e, writer)
    ns = {"F": F, "Column": Column, "DataFrame": DataFrame, "Window": Window}
    exec(helper_source(writer.helpers), ns) if writer.helpers else None
    col = eval(code, ns)
    got = {}
    try:
        for r in frame.select("row", col.alias("v")).collect():
            got[r["row"]] = r["v"]
    except Exception:  # some row fails the query: find which, one row at a time
        for i in range(len(ROWS)):
            try:
                got[i] = frame.where(F.col("row") == i).select(col.alias("v")).collect()[0]["v"]
            except Exception as exc:
                got[i] = f"!SparkError:{type(exc).__name__}"
    bad = []
    for i in range(len(ROWS)):
        if (name, i) in KNOWN_GAPS:
            continue
        want = jvm_results[(index, i)]
        have = got[i]
        if (name, i) in FAILS_LOUDLY:
            ok = str(have).startswith("!SparkError")
        elif want.startswith("!"):
            ok = have is None or (want == "!ArithmeticException" and str(have).startswith("!SparkError"))
        else:
            ok = have == want[1:]
        if not ok:
            bad.append(f"row {i} {ROWS[i]['s']!r}/{ROWS[i]['a']}/{ROWS[i]['x']}: java {want!r}, spark {have!r}")
    assert not bad, f"{name}: `{expr}` -> {code}\n" + "\n".join(bad)
