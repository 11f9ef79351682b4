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

import black

MODE = black.Mode(line_length=100)
_CACHE: dict[str, str] = {}
_CACHE_LIMIT = 4096  # distinct pieces kept per process (helpers repeat; job bodies rarely do)


def _black(text: str) -> str:
    return black.format_str(text, mode=MODE)


def _piece(text: str) -> str:
    got = _CACHE.get(text)
    if got is None:
        got = _black(text)
        if len(_CACHE) >= _CACHE_LIMIT:
            _CACHE.clear()
        _CACHE[text] = got
    return got


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
