"""Read and parse one .java file: a ParsedFile, or a ParseFailure naming file and line."""
from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

import javalang


@dataclass(frozen=True)
class ParsedFile:
    """A parsed compilation unit and the text it came from (line endings normalised)."""

    path: str  # relative to the scanned root, with forward slashes
    text: str
    tree: javalang.tree.CompilationUnit

    @property
    def lines(self) -> list[str]:
        return self.text.split("\n")


@dataclass(frozen=True)
class ParseFailure:
    """A file that could not be read or parsed; the batch goes on without it."""

    path: str
    line: int
    message: str


def find_java_files(root: Path) -> list[Path]:
    """Every .java file under root, in a stable order; build output folders are skipped."""
    if root.is_file():
        return [root]
    skip = {"target", "build", ".git", ".svn", "node_modules"}
    files = [p for p in root.rglob("*.java") if not (set(p.relative_to(root).parts[:-1]) & skip)]
    return sorted(files, key=lambda p: p.relative_to(root).as_posix())


def read_java(path: Path, root: Path) -> ParsedFile | ParseFailure:
    """Decode as UTF-8 (what javac uses on Linux by default), normalise CRLF/CR, parse."""
    rel = path.relative_to(root).as_posix() if path != root else path.name
    try:
        data = path.read_bytes()
    except OSError as exc:
        return ParseFailure(rel, 0, f"cannot read the file: {exc.strerror or exc}")
    if data.startswith(b"\xef\xbb\xbf"):
        data = data[3:]
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as exc:
        line = data[: exc.start].count(b"\n") + 1
        return ParseFailure(rel, line, f"not valid UTF-8 (byte 0x{data[exc.start]:02X} at offset {exc.start}); "
                                       "re-encode the file as UTF-8 or convert it by hand")
    text = text.replace("\r\n", "\n").replace("\r", "\n")
    if not text.strip():
        return ParseFailure(rel, 1, "the file is empty: no class to read")
    try:
        tree = javalang.parse.parse(text)
    except javalang.parser.JavaSyntaxError as exc:
        pos = getattr(getattr(exc, "at", None), "position", None)
        line = pos.line if pos else 0
        what = getattr(exc, "description", "") or "syntax error"
        return ParseFailure(rel, line, f"Java syntax not understood: {what}")
    except javalang.tokenizer.LexerError as exc:
        return ParseFailure(rel, _lexer_line(str(exc)), f"Java tokens not understood: {exc}")
    except (RecursionError, IndexError, TypeError, StopIteration) as exc:  # javalang's own failure modes
        return ParseFailure(rel, 0, f"the Java parser gave up on this file ({type(exc).__name__})")
    return ParsedFile(rel, text, tree)


def _lexer_line(message: str) -> int:
    import re

    m = re.search(r"line (\d+)", message)
    return int(m.group(1)) if m else 0


def logical_sloc(lines: list[str]) -> int:
    """Non-blank, non-comment lines (the SLOC count EFFORT.md asks for)."""
    count, in_block = 0, False
    for raw in lines:
        s = raw.strip()
        code = ""
        i = 0
        while i < len(s):
            if in_block:
                end = s.find("*/", i)
                if end < 0:
                    i = len(s)
                    break
                in_block, i = False, end + 2
                continue
            if s.startswith("/*", i):
                in_block, i = True, i + 2
                continue
            if s.startswith("//", i):
                break
            code += s[i]
            i += 1
        if code.strip():
            count += 1
    return count
