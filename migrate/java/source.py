"""Read and parse one .java file: a ParsedFile, or a ParseFailure naming file and line."""
from __future__ import annotations

import os
import stat
from dataclasses import dataclass
from functools import cached_property
from pathlib import Path

import javalang


@dataclass(frozen=True)
class ParsedFile:
    """A parsed compilation unit and the text it came from (line endings normalised)."""

    path: str  # relative to the scanned root, with forward slashes
    text: str
    tree: javalang.tree.CompilationUnit

    @cached_property  # split once: rules read lines of the same file many times
    def lines(self) -> list[str]:
        return self.text.split("\n")


@dataclass(frozen=True)
class ParseFailure:
    """A file that could not be read or parsed; the batch goes on without it."""

    path: str
    line: int | None  # None: the whole file (it could not be read at all)
    message: str


MAX_FILE_BYTES = 4 * 1024 * 1024  # a hand-written Java file is far smaller; anything bigger is refused
SKIPPED_FOLDERS = {"target", "build", ".git", ".svn", "node_modules"}


def java_sources(root: Path) -> tuple[list[Path], list[ParseFailure]]:
    """Every .java file under root, in a stable order, and what was passed over with the reason:
    build output folders are skipped; symbolic links are not followed (a link out of the tree is
    reported; a target inside it is read as itself); folders that cannot be listed are reported. Whether each file is a regular file of acceptable size is checked when it is read."""
    if not root.is_dir():
        return [root], []
    files, problems = [], []

    def rel(p: Path) -> str:
        return shown_path(p, root)

    def walk_error(exc: OSError) -> None:
        problems.append(ParseFailure(rel(Path(exc.filename)), None, f"folder not read: {exc.strerror or exc}"))

    for dirpath, dirnames, filenames in os.walk(root, onerror=walk_error):  # links to folders are not walked
        here = Path(dirpath)
        dirnames[:] = sorted(d for d in dirnames if d not in SKIPPED_FOLDERS)
        for d in dirnames:
            link = here / d
            if link.is_symlink() and not _inside(link, root):
                problems.append(ParseFailure(rel(link), None, "a symbolic link to a folder outside the scanned "
                                             f"folder ({os.readlink(link)}): not followed"))
        for name in filenames:
            if not name.endswith(".java"):
                continue
            f = here / name
            if f.is_symlink():  # inside the tree its target is read on its own; outside, never
                if not _inside(f, root):
                    problems.append(ParseFailure(rel(f), None, "a symbolic link to a file outside the scanned "
                                                 f"folder ({os.readlink(f)}): not read"))
                continue
            files.append(f)
    files.sort(key=lambda p: p.relative_to(root).as_posix())
    problems.sort(key=lambda e: e.path)
    return files, problems


def _inside(link: Path, root: Path) -> bool:
    try:
        target = link.resolve(strict=True)
    except (OSError, RuntimeError):  # a dangling link or a loop
        return False
    return target == root.resolve() or root.resolve() in target.parents


def read_inside(root: Path, rel: str, max_bytes: int = MAX_FILE_BYTES) -> bytes:
    """A file named relative to root, read only if it really lies inside root (no link out)."""
    target = (root / rel).resolve()
    if target != root.resolve() and root.resolve() not in target.parents:
        raise NotRead(f"{rel} lies outside {root}: not read")
    return read_limited(target, max_bytes)


def find_java_files(root: Path) -> list[Path]:
    """The .java files `java_sources` accepts."""
    return java_sources(root)[0]


def shown_path(path: Path, root: Path) -> str:
    """The path relative to root as reports show it: a name that is not valid UTF-8 keeps its
    bytes visible as \\xNN escapes instead of breaking every UTF-8 output."""
    rel = path.relative_to(root).as_posix() if path != root else path.name
    return os.fsencode(rel).decode("utf-8", "backslashreplace")


class NotRead(OSError):
    """A file that is not read, with the reason."""


def read_limited(path: Path, max_bytes: int = MAX_FILE_BYTES) -> bytes:
    """A regular file's bytes, at most `max_bytes` of them: a FIFO, a device or a link to one, and
    an over-long file are refused without blocking or reading them whole."""
    try:
        fd = os.open(path, os.O_RDONLY | os.O_NONBLOCK)  # a FIFO opens at once instead of waiting for a writer
    except OSError as exc:
        raise NotRead(f"cannot read the file: {exc.strerror or exc}") from None
    with os.fdopen(fd, "rb") as f:
        st = os.fstat(fd)
        if not stat.S_ISREG(st.st_mode):
            raise NotRead("not a regular file (a pipe, a device or a socket): not read")
        if st.st_size > max_bytes:
            raise NotRead(f"{st.st_size:,} bytes, over the limit of {max_bytes:,} (--max-file-size): not read")
        try:
            data = f.read(max_bytes + 1)
        except OSError as exc:
            raise NotRead(f"cannot read the file: {exc.strerror or exc}") from None
    if len(data) > max_bytes:
        raise NotRead(f"over the limit of {max_bytes:,} bytes (--max-file-size): not read")
    return data


def read_java(path: Path, root: Path, max_bytes: int = MAX_FILE_BYTES) -> ParsedFile | ParseFailure:
    """Decode as UTF-8 (what javac uses on Linux by default), normalise CRLF/CR, parse."""
    rel = shown_path(path, root)
    try:
        data = read_limited(path, max_bytes)
    except NotRead as exc:
        return ParseFailure(rel, None, str(exc))
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
        what = getattr(exc, "description", "") or "syntax error"
        return ParseFailure(rel, _syntax_error_line(text, getattr(exc, "at", None), what),
                            f"Java syntax not understood: {what}")
    except javalang.tokenizer.LexerError as exc:
        return ParseFailure(rel, _lexer_line(str(exc)), f"Java tokens not understood: {exc}")
    except (RecursionError, IndexError, TypeError, StopIteration) as exc:  # javalang's own failure modes
        return ParseFailure(rel, None, f"the Java parser gave up on this file ({type(exc).__name__})")
    return ParsedFile(rel, text, tree)


def _syntax_error_line(text: str, at, what: str) -> int:
    """The line javac names: a missing ';' is reported at the end of the token
    before it, which may be lines above the token the parser stopped at; the end of the file
    where the parser ran out of input."""
    pos = getattr(at, "position", None)
    last_line = text.rstrip("\n").count("\n") + 1
    if pos is None:
        return last_line
    if not what.startswith("Expected ';'"):
        return pos.line
    try:
        before = [t for t in javalang.tokenizer.tokenize(text)
                  if t.position and (t.position.line, t.position.column) < (pos.line, pos.column)]
    except javalang.tokenizer.LexerError:
        return pos.line
    # back over the tokens on the stopping line: a statement that ends a line without its token
    # is where javac points
    while before and before[-1].position.line == pos.line:
        before.pop()
    if before and before[-1].value not in (";", "{", "}"):
        return before[-1].position.line + before[-1].value.count("\n")
    return pos.line


def _lexer_line(message: str) -> int | None:
    import re

    m = re.search(r"line (\d+)", message)
    return int(m.group(1)) if m else None


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
