"""A seeded campaign of hostile inputs for `mrlift convert`: mutants of the sample jobs (each in a
package of its own, so that one repository holds them all), odd bytes and odd files, inputs at
the parser's limits, and injection payloads in names, strings and comments.

`build(root, seed, mutants)` writes the repository and returns what it wrote, so that the test
can check the outputs against javac and Python's own compiler.
"""
from __future__ import annotations

import random
import re
from dataclasses import dataclass, field
from pathlib import Path

SAMPLES = Path(__file__).resolve().parents[2] / "samples" / "bikeshare" / "src"

PAYLOADS = ['</script><script>alert(1)</script>', '"""; import os; os.system("x") #', "{{ 7*7 }}{% raw %}",
            "${jndi:ldap://x}", "=cmd|' /C calc'!A0", "+SUM(1,1)", "@import", "-2+3", "\\N{BULLET}", "\\u0041",
            "C:\\\\users\\\\etl", "a\\u0000b", "line\\nbreak | pipe", "'; DROP TABLE jobs; --", "<img src=x onerror=1>",
            "\\\\x00", "%s%n%x", "../../../../etc/passwd", "\\r\\n\\t", "€ü😀"]


@dataclass
class Campaign:
    root: Path
    mutants: dict[str, str] = field(default_factory=dict)  # relative path -> mutation applied
    others: dict[str, str] = field(default_factory=dict)  # relative path -> kind (odd bytes, limits, payload)

    @property
    def count(self) -> int:
        return len(self.mutants) + len(self.others)


def single_file_jobs() -> list[Path]:
    """Sample files that hold a whole job (driver, mapper and reducer) and use no other sample class."""
    names = {p.stem for p in SAMPLES.rglob("*.java")}
    out = []
    for p in sorted(SAMPLES.rglob("*.java")):
        text = p.read_text(encoding="utf-8")
        used = set(re.findall(r"\b([A-Z]\w+)\b", text)) & names - {p.stem}
        if "void main(" in text and not used:
            out.append(p)
    return out


def _repackage(text: str, package: str) -> str:
    return re.sub(r"^package\s+[\w.]+\s*;", f"package {package};", text, count=1, flags=re.M)


def _mutate(text: str, rng: random.Random) -> tuple[str, str]:
    """One random mutation of a Java source, and its name."""
    lines = text.split("\n")
    code = [i for i, l in enumerate(lines) if l.strip() and not l.strip().startswith(("//", "*", "/*", "import",
                                                                                       "package"))]
    i = rng.choice(code)
    op = rng.choice(["delete-line", "duplicate-line", "swap-lines", "delete-char", "return-before", "override-twice",
                     "rename-use", "increment-call", "big-number", "payload-in-string", "control-in-string",
                     "flip-comparison", "duplicate-local", "not-a-statement"])
    if op == "delete-line":
        del lines[i]
    elif op == "duplicate-line":
        lines.insert(i, lines[i])
    elif op == "swap-lines" and i + 1 < len(lines):
        lines[i], lines[i + 1] = lines[i + 1], lines[i]
    elif op == "delete-char":
        spots = [k for k, c in enumerate(lines[i]) if c in ';{}()"']
        if spots:
            k = rng.choice(spots)
            lines[i] = lines[i][:k] + lines[i][k + 1:]
    elif op == "return-before":
        lines.insert(i, " " * (len(lines[i]) - len(lines[i].lstrip())) + "return;")
    elif op == "override-twice":
        at = [k for k, l in enumerate(lines) if l.strip() == "@Override"]
        if at:
            k = rng.choice(at)
            lines.insert(k, lines[k])
    elif op == "rename-use":
        words = re.findall(r"\b[a-z]\w*\b", lines[i])
        if words:
            w = rng.choice(words)
            lines[i] = re.sub(rf"\b{w}\b", w + "Gone", lines[i], count=1)
    elif op == "increment-call":
        at = [k for k, l in enumerate(lines) if re.match(r"\s*job\.set\w+\(", l)]
        if at:
            k = rng.choice(at)
            lines[k] = re.sub(r"(\s*)job\.", r"\1++ job.", lines[k], count=1)
    elif op == "big-number":
        lines[i] = re.sub(r"\b\d+\b", "2147483648", lines[i], count=1)
    elif op == "payload-in-string":
        lines[i] = lines[i].replace('"', '"' + rng.choice(PAYLOADS).replace('"', '\\"'), 1)
    elif op == "control-in-string":
        lines[i] = lines[i].replace('"', '"' + rng.choice(["\\u0000", "\\r", "\\u2028", "\\t", "\\u001b[31m"]), 1)
    elif op == "flip-comparison":
        lines[i] = lines[i].replace("==", "!=", 1) if "==" in lines[i] else lines[i].replace("<", ">", 1)
    elif op == "duplicate-local":
        m = re.match(r"(\s*)(int|long|String|double)\s+(\w+)\s*=", lines[i])
        if m:
            lines.insert(i + 1, f"{m.group(1)}{m.group(2)} {m.group(3)} = {m.group(3)};")
    elif op == "not-a-statement":
        lines.insert(i, " " * (len(lines[i]) - len(lines[i].lstrip())) + "args.length;")
    return "\n".join(lines), op


def _odd_files(rng: random.Random, n: int) -> dict[str, bytes]:
    """Odd bytes, files at the parser's limits and payloads in names and comments."""
    out: dict[str, bytes] = {}
    kinds = ["random-bytes", "nul-bytes", "bom-only", "latin1", "lone-surrogate", "crlf-cr", "deep-parens",
             "long-line", "many-classes", "payload-class", "unterminated-comment", "unterminated-string",
             "empty", "whitespace", "deep-blocks", "huge-literal"]
    for k in range(n):
        kind = kinds[k % len(kinds)]
        name = f"odd/o{k:04d}/Odd{k}.java"
        cls = f"Odd{k}"
        if kind == "random-bytes":
            data = bytes(rng.randrange(256) for _ in range(rng.randrange(1, 400)))
        elif kind == "nul-bytes":
            data = f"public class {cls} {{ String s = \"a\0b\"; }}\n".encode()
        elif kind == "bom-only":
            data = b"\xef\xbb\xbf"
        elif kind == "latin1":
            data = f"// caf\xe9\npublic class {cls} {{}}\n".encode("latin-1")
        elif kind == "lone-surrogate":
            data = f"public class {cls} {{ String s = \"".encode() + b"\xed\xa0\x80" + b"\"; }\n"
        elif kind == "crlf-cr":
            data = f"public class {cls} {{\r\n  int a;\r  int b;\n}}\r\n".encode()
        elif kind == "deep-parens":
            depth = rng.randrange(50, 400)
            data = f"public class {cls} {{ int x = {'(' * depth}1{')' * depth}; }}\n".encode()
        elif kind == "long-line":
            data = f"public class {cls} {{ String s = \"{'x' * rng.randrange(10_000, 200_000)}\"; }}\n".encode()
        elif kind == "many-classes":
            data = "\n".join(f"class {cls}_{j} {{ int f{j}; }}" for j in range(rng.randrange(50, 400))).encode()
        elif kind == "payload-class":
            p = rng.choice(PAYLOADS).replace("*/", "")
            data = f"/* {p} */\n// {p}\npublic class {cls} {{ String s = \"{p.replace(chr(34), '')}\"; }}\n".encode()
        elif kind == "unterminated-comment":
            data = f"public class {cls} {{ /* never closed\n".encode()
        elif kind == "unterminated-string":
            data = f"public class {cls} {{ String s = \"open;\n}}\n".encode()
        elif kind == "empty":
            data = b""
        elif kind == "whitespace":
            data = b" \n\t\r\n" * rng.randrange(1, 50)
        elif kind == "deep-blocks":
            depth = rng.randrange(50, 300)
            data = f"public class {cls} {{ void f() {{ {'{' * depth} {'}' * depth} }} }}\n".encode()
        else:  # huge-literal
            data = f"public class {cls} {{ long x = {'9' * rng.randrange(20, 5000)}L; }}\n".encode()
        out[name] = data
    return out


def build(root: Path, seed: int = 20261203, mutants: int = 700, odd: int = 320) -> Campaign:
    """Write the hostile repository under root."""
    rng = random.Random(seed)
    camp = Campaign(root)
    bases = single_file_jobs()
    for k in range(mutants):
        base = bases[k % len(bases)]
        package = f"fuzz.m{k:04d}"
        text, op = _mutate(_repackage(base.read_text(encoding="utf-8"), package), rng)
        rel = f"{package.replace('.', '/')}/{base.name}"
        (root / rel).parent.mkdir(parents=True, exist_ok=True)
        (root / rel).write_text(text, encoding="utf-8")
        camp.mutants[rel] = op
    for rel, data in _odd_files(rng, odd).items():
        (root / rel).parent.mkdir(parents=True, exist_ok=True)
        (root / rel).write_bytes(data)
        camp.others[rel] = "odd"
    return camp
