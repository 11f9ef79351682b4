"""black, one top-level statement at a time, each distinct statement formatted once per process.

A generated script is mostly the same helper functions and boilerplate as the script before it, and
black's cost grows with the text it reads. So the script is cut at its top-level statements (each
with the comments and blank lines before it), every piece is formatted on its own through a cache,
and the blank lines between pieces are the ones black puts between stand-ins of the same kinds (a
one-line def for a def, the same import, the same comments), found by formatting that short
skeleton. Inside a top-level statement black's work does not depend on its neighbours; between
them only the kinds and the comments count. tests/unit/test_layout.py compares the result with
black on the whole text for every golden and sample script.
"""
from __future__ import annotations

import ast
import io
import re
import tokenize

import black

MODE = black.Mode(line_length=100)
_CACHE: dict[str, str] = {}  # masked piece -> black's output for it
_SAME: dict[str, str] = {}  # piece -> its formatted text
_CACHE_LIMIT = 4096  # distinct pieces kept per process (helpers repeat; job bodies rarely do)


def _black(text: str) -> str:
    return black.format_str(text, mode=MODE)


def _piece(text: str) -> str:
    """black's output for one top-level statement. Two statements that differ only in the letters and
    digits inside plain strings and comments (a job's name, a Java line quoted in a comment) are laid
    out alike: black decides by lengths and keeps such strings and comments as they are. So the layout
    is cached with those letters and digits masked, and the originals are put back in their places
    (black keeps the order of the strings, and of the comments)."""
    same = _SAME.get(text)  # helpers and boilerplate recur as they are: no need to mask them
    if same is not None:
        return same
    masked, originals = _masked(text)
    got = _CACHE.get(masked)
    if got is None:
        got = _black(masked)
        if len(_CACHE) >= _CACHE_LIMIT:
            _CACHE.clear()
        _CACHE[masked] = got
    back = got if masked == text else _unmasked(got, originals)
    if back is None:
        back = _black(text)
    if len(_SAME) >= _CACHE_LIMIT:
        _SAME.clear()
    _SAME[text] = back
    return back


_PLAIN = re.compile(r"[ -~]*")  # printable ASCII: no tab, no wide character, one column per character
_LETTERS = re.compile(r"[A-Za-z0-9]")
_KINDS = (tokenize.STRING, tokenize.COMMENT)


def _maskable(t) -> bool:
    """A one-line string black leaves as it is (no prefix, no escape, no quote inside), or a comment
    already spelled as black spells it."""
    s = t.string
    if t.start[0] != t.end[0] or not _PLAIN.fullmatch(s) or s != s.rstrip():
        return False
    if t.type == tokenize.COMMENT:
        return s.startswith("# ") and not s[2:].startswith(("type:", "fmt:", "noqa"))
    q = s[:1]
    return q in "\"'" and len(s) >= 2 and s[-1] == q and "\\" not in s and "'" not in s[1:-1] \
        and '"' not in s[1:-1]


def _tokens(text: str):
    try:
        return [t for t in tokenize.generate_tokens(io.StringIO(text).readline) if t.type in _KINDS]
    except (tokenize.TokenError, IndentationError, SyntaxError):
        return None


def _replace(text: str, edits: list) -> str:
    lines = text.splitlines(keepends=True)
    for (row, col), (_, end), new in reversed(edits):
        line = lines[row - 1]
        lines[row - 1] = line[:col] + new + line[end:]
    return "".join(lines)


def _masked(text: str) -> tuple[str, dict]:
    """The text with letters and digits in plain strings and comments as `a`, and what was there:
    {(kind, n-th token of that kind): original}."""
    toks = _tokens(text)
    if toks is None:
        return text, {}
    edits, originals, seen = [], {}, {tokenize.STRING: 0, tokenize.COMMENT: 0}
    for t in toks:
        n = seen[t.type]
        seen[t.type] += 1
        if _maskable(t):
            new = _LETTERS.sub("a", t.string)
            if new != t.string:
                edits.append((t.start, t.end, new))
                originals[(t.type, n)] = t.string
    return _replace(text, edits), originals


def _unmasked(text: str, originals: dict) -> str | None:
    """black's output with the originals back (None where the tokens do not line up one for one)."""
    toks = _tokens(text)
    if toks is None:
        return None
    edits, seen = [], {tokenize.STRING: 0, tokenize.COMMENT: 0}
    for t in toks:
        n = seen[t.type]
        seen[t.type] += 1
        old = originals.get((t.type, n))
        if old is None:
            continue
        if len(t.string) != len(old) or _LETTERS.sub("a", old)[1:-1] != t.string[1:-1]:
            return None
        new = old if t.type == tokenize.COMMENT else t.string[0] + old[1:-1] + t.string[-1]
        edits.append((t.start, t.end, new))
    return _replace(text, edits) if len(edits) == len(originals) else None


def _stand_in(node: ast.stmt, k: int) -> str:
    """A one-line statement of the same kind as far as black's blank lines go."""
    if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef, ast.ClassDef)):
        deco = "".join(f"@d{k}_{i}\n" for i in range(len(node.decorator_list)))
        word = {"FunctionDef": "def", "AsyncFunctionDef": "async def", "ClassDef": "class"}[type(node).__name__]
        tail = ":" if word == "class" else "():"
        return f"{deco}{word} f{k}{tail}\n    pass\n"
    if isinstance(node, (ast.Import, ast.ImportFrom)):
        return ast.unparse(node) + "\n"
    if isinstance(node, (ast.If, ast.For, ast.While, ast.With, ast.Try)):
        return f"if x{k}:\n    pass\n"
    if isinstance(node, ast.Expr) and isinstance(node.value, ast.Constant) and isinstance(node.value.value, str):
        return '"""d"""\n'
    return f"x{k} = 0\n"


def format_code(text: str) -> str:
    """The text as black formats it (line length 100)."""
    try:
        tree = ast.parse(text)
    except SyntaxError:
        return _black(text)  # black says what is wrong
    lines = text.splitlines(keepends=True)
    if not tree.body or any(n.col_offset for n in tree.body):
        return _black(text)
    pieces, skeleton, prev_end = [], [], 0
    for k, node in enumerate(tree.body):
        if k and isinstance(node, ast.Expr) and isinstance(node.value, ast.Constant):
            return _black(text)  # a bare string black would read as a docstring when alone
        start = min([node.lineno] + [d.lineno for d in getattr(node, "decorator_list", [])]) - 1
        lead = lines[prev_end:start]  # blank lines and comments before the statement
        if any(line.strip() and not line.lstrip().startswith("#") for line in lead):
            return _black(text)  # something between statements the cut does not understand
        pieces.append("".join(lines[start:node.end_lineno]))
        skeleton.append("".join(lead) + _stand_in(node, k))
        prev_end = node.end_lineno
    tail = lines[prev_end:]
    if any(line.strip() and not line.lstrip().startswith("#") for line in tail):
        return _black(text)
    laid = _piece("".join(skeleton) + "".join(tail)).splitlines(keepends=True)  # the same skeleton recurs
    out, i = [], 0
    for k, body in enumerate(pieces):
        stand = _piece(_stand_in(tree.body[k], k)).splitlines(keepends=True)
        try:
            at = laid.index(stand[0], i)
        except ValueError:
            return _black(text)
        between = laid[i:at]  # the blank lines and comments black put before the statement
        if any(line.strip() and not line.lstrip().startswith("#") for line in between):
            return _black(text)
        out += between
        out.append(_piece(body))
        i = at + len(stand)
    out.extend(laid[i:])  # comments after the last statement
    return "".join(out)
