"""The piecewise formatter gives black's own output (black 24+, the formatter the scripts promise)."""
from __future__ import annotations

from pathlib import Path

import black
import pytest

from migrate.convert import header_for
from migrate.gen import layout, pyspark
from migrate.scan import scan_repo

ROOT = Path(__file__).resolve().parents[2]
BLACK = black.Mode(line_length=100)


def _rendered_before_black(monkeypatch) -> list[str]:
    """Every sample job's script as the template writes it, before any formatting."""
    raw: list[str] = []
    monkeypatch.setattr(pyspark, "format_code", lambda text: raw.append(text) or text)
    scan = scan_repo(ROOT / "samples")
    for job in scan.jobs:
        pyspark.render_script(job.plan, header_for(job, "job.py"), list(job.plan.hand_work))
    return raw


def test_same_as_black_on_every_sample_script(monkeypatch):
    raw = _rendered_before_black(monkeypatch)
    assert len(raw) > 40
    layout._CACHE.clear()
    layout._SAME.clear()
    for text in raw:
        assert layout.format_code(text) == black.format_str(text, mode=BLACK)


@pytest.mark.parametrize("text", [
    "x = 1\n\n\n\n\ny = 2\n",  # more blank lines than black keeps
    "import os\ndef f():\n  return 1\nclass C:\n  pass\n# last words\n",
    '"""Doc."""\nimport os\n\n# a comment\n\n# another\n@decorated\ndef f(a,b):\n  return a+b\nif __name__ == "__main__":\n  f(1,2)\n',
    "def f():\n    pass\n'a string after a def'\n",  # a bare string: handed to black whole
    "x = (1,\n)\ny=[1,2,\n3]\n",
])
def test_same_as_black_on_shapes(text):
    assert layout.format_code(text) == black.format_str(text, mode=BLACK)


def test_a_syntax_error_is_black_s_own():
    with pytest.raises(black.InvalidInput):
        layout.format_code("def f(:\n")
